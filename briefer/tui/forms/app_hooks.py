"""The app's two entry points to the forms: open one ("new" or "edit" on the aircraft or
airfield step), and use what it saved at once (catalog, lists, inputs, a new brief)."""

from __future__ import annotations

import re
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from rich.text import Text

from briefer.model import KIND_AIRFIELD, KIND_PROFILE
from briefer.tui.forms.check import Checker, Verdict
from briefer.tui.forms.screen import FormScreen, Saved
from briefer.tui.state import AppCatalog, CatalogItem

if TYPE_CHECKING:
    from briefer.tui.app import BriefingApp

STEP_KINDS = {"aircraft": KIND_PROFILE, "airfield": KIND_AIRFIELD}


def _loose(text: str) -> str:
    return re.sub(r"[^a-z0-9]", "", text.lower())


def _spec(kind: str):
    if kind == KIND_PROFILE:
        from briefer.tui.forms.profile_form import PROFILE_FORM

        return PROFILE_FORM
    from briefer.tui.forms.airfield_form import AIRFIELD_FORM

    return AIRFIELD_FORM


def _painter(kind: str):
    if kind == KIND_PROFILE:
        return profile_side
    from briefer.tui.forms.airfield_form import airfield_side

    return airfield_side


def form_for(app: BriefingApp, kind: str, *, edit: bool) -> FormScreen | str:
    """The form screen for a kind, empty or holding the chosen profile/airfield; or why not."""
    mapping = source = None
    builtin = False
    checker = None
    if edit:
        catalog = app.catalog
        items = catalog.profiles if kind == KIND_PROFILE else catalog.airfields
        name = app.inputs.profile if kind == KIND_PROFILE else app.inputs.airfield
        item = next((i for i in items if _loose(i.name) == _loose(name)), None)
        model = catalog.profile(name) if kind == KIND_PROFILE else catalog.airfield(name)
        if item is None or model is None:
            return f"'{name}' cannot be read, so it cannot be edited; fix the file or start a new one (F2)"
        mapping = model.to_mapping()
        checker = Checker(_spec(kind))
        lost = form_loses(_spec(kind), mapping, model, checker=checker)
        if lost:
            return (f"the form cannot show everything {item.source or name} holds ({lost}), so it would not "
                    f"save it back unchanged; edit the file by hand, or start a new one (F2)")
        source, builtin = item.source, item.builtin or not item.source
    on_import = None
    if kind == KIND_AIRFIELD:
        from briefer.tui.forms.import_dialog import ask_import

        on_import = ask_import
    return FormScreen(_spec(kind), mapping=mapping, source=source, builtin=builtin, side=_painter(kind),
                      ascii=bool(getattr(app, "ascii", False)), on_import=on_import, checker=checker)


def form_loses(spec: Any, mapping: dict[str, Any], model: Any, *, checker: Checker | None = None) -> str:
    """What a form would change of a file it opens ('' when nothing): the form's texts for the
    file must read back to the very same model, so saving without an edit changes nothing.
    `checker`: the form's own (it then knows every field's message when the form opens)."""
    from briefer.tui.forms.spec import to_texts

    verdict = (checker or Checker(spec)).check(to_texts(spec, mapping))
    if verdict.model == model:
        return ""
    problem = verdict.first_problem()
    if problem is None:
        return "a value the form has no field for"
    where = ".".join(str(p) for p in problem[0]) if problem[0] else ""
    return f"{where}: {problem[1]}" if where else problem[1]


def open_form(app: BriefingApp, *, edit: bool) -> None:
    """F2 / F3 on the aircraft or airfield step: open its form."""
    from textual.widgets import TabbedContent

    step = app.main.node("#steps", TabbedContent).active
    kind = STEP_KINDS.get(step)
    if kind is None:
        app.notify("New and edit work on step 1 (aircraft) and step 2 (airfield).", timeout=5)
        return
    try:
        screen = form_for(app, kind, edit=edit)
    except Exception as exc:  # never lose the app to a form that cannot open
        app.notify(f"the form cannot open: {type(exc).__name__}: {exc}", severity="error", timeout=8)
        return
    if isinstance(screen, str):
        app.notify(screen, severity="error", timeout=8)
        return
    app.push_screen(screen, lambda saved: use_saved(app, saved))


def _catalog_with(catalog: AppCatalog, saved: Saved) -> AppCatalog:
    model = saved.model
    if saved.kind == KIND_PROFILE:
        item = CatalogItem(name=model.name, title=model.description, source=str(saved.path), builtin=False,
                           model=model)
        rest = tuple(i for i in catalog.profiles if _loose(i.name) != _loose(model.name))
        return replace(catalog, profiles=(item,) + rest)
    item = CatalogItem(name=model.ident, title=model.name, source=str(saved.path), builtin=False, model=model)
    rest = tuple(i for i in catalog.airfields if _loose(i.name) != _loose(model.ident))
    return replace(catalog, airfields=(item,) + rest)


def use_saved(app: BriefingApp, saved: Saved | None) -> None:
    """Put a saved profile or airfield in the catalog, choose it, and brief with it."""
    if saved is None:
        return
    before = getattr(app.catalog, "catalog", app.catalog)     # a LazyCatalog reads itself here
    catalog = _catalog_with(before, saved)
    cur = app.inputs
    model = saved.model
    if saved.kind == KIND_PROFILE:
        names = [c.name.lower() for c in model.configurations]
        cfg = cur.configuration if cur.configuration and cur.configuration.lower() in names else None
        new = replace(cur, profile=model.name, configuration=cfg)
    else:
        approaches = [a.name for a in model.approaches]
        old = before.airfield(model.ident)     # None: new, or a file that did not read
        added = [a for a in approaches if old is not None and a not in {x.name for x in old.approaches}]
        if added:                   # an approach added to an airfield: brief it
            approach = added[-1]
        elif cur.airfield.upper() == model.ident and cur.approach in approaches:
            approach = cur.approach
        else:
            approach = approaches[0]
        designators = [t.designator for t in model.thresholds]
        runway = cur.landing_runway
        if runway not in designators:
            ap = model.approach(approach)
            runway = next((d for d in designators if d != ap.runway), designators[0])
        new = replace(cur, airfield=model.ident, approach=approach, landing_runway=runway)
    app.use_catalog(catalog, new)
    app.notify(f"Saved {saved.path}; the brief now uses it.", timeout=6)


# --------------------------------------------------------------------------------------------
# The aircraft form's side panel
# --------------------------------------------------------------------------------------------
def profile_side(verdict: Verdict, width: int, height: int, ascii: bool) -> Text:
    """What the entered profile gives (approach category, the stall speed in the planned bank),
    or what is still missing."""
    t = Text()
    t.append("WHAT IT GIVES\n", style="bold underline")
    p = verdict.model
    if p is None:
        n = len(verdict.errors)
        t.append(f"{n} to fix\n" if n else "")
        t.append(f"{len(verdict.required)} still empty\n" if verdict.required else "")
        t.append("\nComplete the form to see the category and the speeds the brief will use.")
        return t
    from briefer.core.criteria import category_from_speed
    from briefer.core.turn import stall_speed_in_turn_kt

    cat_kt = p.approach_category_speed_kt()
    t.append(f"Category {category_from_speed(cat_kt)}", style="bold")
    t.append(f" ({cat_kt:.0f} kt at MLW)\n")
    ratio = p.max_landing_weight_lb / p.reference_weight_lb
    for c in p.configurations:
        vs = float(stall_speed_in_turn_kt(c.vs1g_kt, c.bank_target_deg, weight_ratio=ratio))
        mark = " (default)" if c.name.lower() == p.default_configuration.lower() else ""
        t.append(f"\n{c.name}{mark}\n", style="bold")
        t.append(f" circles {c.circling_speed_kt:.0f} kt at {c.bank_target_deg:.0f}°\n")
        t.append(f" stall in that bank {vs:.0f} kt at MLW\n")
    t.append("\nThe brief uses it once saved.", style="dim")
    return t
