"""The instructor's deck: per scenario a student page and an answer page.

* Student page: the situation (airfield, approach, runway to land on, aircraft, weight), the
  weather report exactly as the student reads it, and what to brief (the standard items and the
  questions of the scenario's emphasis).
* Answer page: the brief's numbers and plan view (the kneeboard card's own layout, reused), the
  sight-picture trap figures, why the case exercises its emphasis, and grading tolerances.

`student_text` / `answer_text` give both pages as plain text (the CLI and the app's preview);
`build_deck` generates N varied scenarios from one seed and `briefer.render.deck_pdf.deck_pdf_bytes` prints them, the same
bytes for the same seed (the document date is fixed).
"""

from __future__ import annotations

import random
import textwrap
from collections.abc import Sequence
from briefer._dataclass import dataclass
from os import PathLike
from pathlib import Path
from typing import Any

from briefer.errors import BriefingError, DomainError
from briefer.instructor.scenario_format import EMPHASES, EMPHASIS_TITLES, LoadedScenario, Scenario

TEXT_WIDTH = 78
PRACTICE_LINE = "PRACTICE SCENARIO - invented data for training, not for navigation"

WHAT_TO_BRIEF: tuple[str, ...] = (
    "The approach category at today's circling speed, and the minimums that go with it (MDA, HAA, "
    "visibility); can you start the approach?",
    "The protected area: its radius, the sectors where circling is not authorised, the controlling obstacle.",
    "The plan in today's wind: which side, which shape, offset, timing from abeam, bank; where you leave the MDA.",
    "The missed approach from the circle: the first turn, and then the published procedure.",
    "The sight picture at circling height, against your everyday pattern.",
)

EMPHASIS_PROMPTS: dict[str, tuple[str, ...]] = {
    "tailwind-on-base": ("Where does the wind carry you in the turn to final? What bank will the base "
                         "turn need, and what do you do if you overshoot the centreline?",),
    "low-visibility": ("Is the reported visibility enough to start? Where in the circle could you lose "
                       "sight of the runway, and what then?",),
    "reciprocal": ("How do you get from the arrival to a downwind for the reciprocal runway: break-off "
                   "heading, timing, and which side?",),
    "hot-high": ("What is your true airspeed in the circle? What does it do to the turn radius and to "
                 "the area you need?",),
    "cold": ("What correction do you apply to the MDA (and to the other altitudes), and why?",),
    "familiar-picture": ("What does the runway look like from the right downwind at circling height? "
                         "What happens if you fly your everyday picture instead?",),
    "gusty-category": ("Which category applies with the gust additive, and which minimums and area go "
                       "with it?",),
}

# Grading tolerances: common practice in check flights, not a published standard (said on the page).
ALTITUDE_ABOVE_MDA_FT = 100.0
AIRSPEED_TOLERANCE_KT = 5.0
BANK_TOLERANCE_DEG = 5.0
TOLERANCE_SOURCE = "common practice for practice checks (not a published standard)"


# --------------------------------------------------------------------------------------------
# The pages as text
# --------------------------------------------------------------------------------------------
def student_lines(scenario: Scenario, brief: Any) -> list[str]:
    """The student page, line by line (no answers on it)."""
    h = brief.header
    lines = [PRACTICE_LINE, "", scenario.title, ""]
    lines.append(f"Airfield      {h.airfield_ident} {h.airfield_name}, elevation {h.airfield_elevation_ft:.0f} ft")
    lines.append(f"Approach      {h.approach_name}, then circle to land runway {h.landing_runway}")
    lines.append(f"Aircraft      {h.profile_name}, {h.configuration_name}, landing weight {h.weight_lb:.0f} lb")
    lines.append(f"Criteria      {h.criteria}")
    lines.append("")
    lines.append("Weather report")
    lines.extend(textwrap.wrap(scenario.weather.report or "(values only: see the answer page)", width=TEXT_WIDTH,
                               initial_indent="  ", subsequent_indent="    "))
    lines.append("")
    lines.append("Brief the circle:")
    items = WHAT_TO_BRIEF + EMPHASIS_PROMPTS.get(scenario.emphasis, ())
    for i, text in enumerate(items, 1):
        lines.extend(textwrap.wrap(text, width=TEXT_WIDTH, initial_indent=f"  {i}. ", subsequent_indent="     "))
    lines.append("")
    seed = "" if scenario.seed is None else f", seed {scenario.seed}"
    lines.append(f"Emphasis: {EMPHASIS_TITLES[scenario.emphasis]}{seed}")
    return lines


def student_text(scenario: Scenario, brief: Any) -> str:
    """The student page as plain text."""
    return "\n".join(student_lines(scenario, brief)) + "\n"


@dataclass(frozen=True, slots=True, kw_only=True)
class Tolerance:
    """One grading tolerance: what is graded, the band, and where the band comes from."""

    item: str
    band: str
    source: str


def grading_tolerances(brief: Any) -> tuple[Tolerance, ...]:
    """The tolerances to grade the circle against, from the brief's own numbers.

    Altitude MDA -0/+100 ft, airspeed the planned circling IAS +/-5 kt, bank the target +/-5 deg
    but never beyond the limit: common practice, flagged as such on the page. Staying inside the
    protected area (and out of not-authorised sectors) is the criteria's own limit.
    """
    m, pf, a = brief.minimums, brief.performance, brief.area
    out = []
    if m.mda_ft is not None:
        out.append(Tolerance(item="Altitude",
                             band=f"{m.mda_ft:.0f} to {m.mda_ft + ALTITUDE_ABOVE_MDA_FT:.0f} ft "
                                  f"(MDA -0/+{ALTITUDE_ABOVE_MDA_FT:.0f}); never below the MDA until in a position "
                                  "to land", source=TOLERANCE_SOURCE))
        if m.cold is not None:
            out.append(Tolerance(item="Cold alt",
                                 band=f"{m.cold.corrected_mda_ft:.0f} to "
                                      f"{m.cold.corrected_mda_ft + ALTITUDE_ABOVE_MDA_FT:.0f} ft",
                                 source=TOLERANCE_SOURCE))
    out.append(Tolerance(item="Airspeed", band=f"{pf.ias_kt - AIRSPEED_TOLERANCE_KT:.0f} to "
                                                f"{pf.ias_kt + AIRSPEED_TOLERANCE_KT:.0f} kt IAS "
                                                f"(planned {pf.ias_kt:.0f} +/-{AIRSPEED_TOLERANCE_KT:.0f})",
                         source=TOLERANCE_SOURCE))
    target = brief.plan.bank_deg if brief.plan.feasible else pf.bank_target_deg
    low = max(0.0, target - BANK_TOLERANCE_DEG)
    high = min(pf.bank_limit_deg, target + BANK_TOLERANCE_DEG)
    out.append(Tolerance(item="Bank", band=f"{low:.0f} to {high:.0f} deg (target {target:.0f} +/-"
                                           f"{BANK_TOLERANCE_DEG:.0f}, never beyond the {pf.bank_limit_deg:.0f} "
                                           "deg limit)", source=TOLERANCE_SOURCE))
    sectors = "; out of the not-authorised sectors" if a.sector_texts else ""
    out.append(Tolerance(item="Position", band=f"inside {a.radius_nm:.2f} NM of every runway threshold{sectors}",
                         source=f"the {a.criteria} protected area ({a.provenance})"))
    return tuple(out)


def trap_lines(brief: Any) -> list[str]:
    """The sight-picture trap in figures."""
    s = brief.sight_picture
    out = [f"Planned: runway {s.planned_depression_deg:.1f} deg below the horizon at {s.planned_offset_nm:.2f} NM, "
           f"{s.circling_height_ft:.0f} ft up." if s.planned_offset_nm == s.planned_offset_nm
           else "Planned: none: no plan, so no planned picture.",
           f"Everyday: {s.familiar_depression_deg:.1f} deg at {s.familiar_offset_nm:.2f} NM, "
           f"{s.familiar_height_ft:.0f} ft up.",
           f"The trap: that picture at circling height puts you {s.familiar_offset_at_circling_nm:.2f} NM out."]
    if s.familiar_possible and s.familiar_bank_required_deg is not None:
        beyond = " - BEYOND THE BANK LIMIT" if s.familiar_exceeds_bank_limit else ""
        from briefer.wording import stall_margin_words

        margin = "" if s.familiar_stall_margin_pct is None else f", {stall_margin_words(s.familiar_stall_margin_pct)}"
        out.append(f"It needs {s.familiar_bank_required_deg:.0f} deg bank, {s.familiar_load_factor:.2f} g{margin}{beyond}.")
    else:
        out.append("It needs a turn no bank can give at this speed: the wing stalls first.")
    out.append(f"Or hold the planned bank and overshoot the centreline by {s.overshoot_nm:.2f} NM.")
    return out


def answer_lines(scenario: Scenario, brief: Any, *, checks: Sequence[str] = ()) -> list[str]:
    """The answer key: the card's text, the trap, why this case, the grading tolerances."""
    from briefer.render.card import card_text

    lines = [PRACTICE_LINE, "", f"ANSWER - {scenario.title}", ""]
    lines.extend(card_text(brief).rstrip("\n").splitlines())
    lines += ["", "SIGHT-PICTURE TRAP"]
    lines.extend(f"  {t}" for t in trap_lines(brief))
    why = list(checks) or ([scenario.notes] if scenario.notes else [])
    if why:
        lines += ["", f"WHY THIS CASE ({EMPHASIS_TITLES[scenario.emphasis]})"]
        lines.extend(f"  {t}" for t in why)
    lines += ["", "GRADING TOLERANCES"]
    for t in grading_tolerances(brief):
        lines.append(f"  {t.item}: {t.band} [{t.source}]")
    return lines


def answer_text(scenario: Scenario, brief: Any, *, checks: Sequence[str] = ()) -> str:
    """The answer page as plain text."""
    return "\n".join(answer_lines(scenario, brief, checks=checks)) + "\n"


# --------------------------------------------------------------------------------------------
# The deck
# --------------------------------------------------------------------------------------------
@dataclass(frozen=True, slots=True, kw_only=True)
class DeckCase:
    """One scenario of a deck, with its brief and checks."""

    scenario: Scenario
    loaded: LoadedScenario
    brief: Any
    checks: tuple[str, ...]

    @property
    def final_approach_xy_m(self) -> tuple[tuple[float, float], tuple[float, float]]:
        """The final approach course as the student page draws it: the FAF and the MAP in the
        brief's local frame (metres east, north)."""
        from briefer.core.airfield_geometry import AirfieldGeometry

        req = self.loaded.request
        faf, map_fix = AirfieldGeometry(req.airfield).fixes_xy_m(req.selected_approach())
        return (float(faf[0]), float(faf[1])), (float(map_fix[0]), float(map_fix[1]))

    def chart_sectors_xy_m(self, reach_m: float) -> tuple[tuple[tuple[float, float], ...], ...]:
        """The approach's not-authorised sectors as the student page draws them: each out to
        `reach_m` from its apex (not clipped at the protected area, whose radius is an answer)."""
        import numpy as np

        from briefer.core.airfield_geometry import AirfieldGeometry

        req = self.loaded.request
        out = []
        for sector in AirfieldGeometry(req.airfield).sectors(req.selected_approach()):
            poly = np.asarray(sector.polygon(reach_m), dtype=float).reshape(-1, 2)
            out.append(tuple((float(x), float(y)) for x, y in poly if np.isfinite(x) and np.isfinite(y)))
        return tuple(p for p in out if len(p) >= 3)


@dataclass(frozen=True, slots=True, kw_only=True)
class Deck:
    """A deck of scenarios drawn from one seed.

    Attributes:
        seed: the deck's seed.
        cases: the scenarios, in page order.
        skipped: combinations that could not exercise their emphasis (why), for the record.
    """

    seed: int
    cases: tuple[DeckCase, ...]
    skipped: tuple[str, ...] = ()


def _load_all(kind: str, names: Sequence[str] | None, dirs: Sequence[Any]) -> list[Any]:
    from briefer.io import catalog

    if names:
        find = catalog.find_airfield if kind == "airfield" else catalog.find_profile
        out = []
        for n in names:                       # names, files, or models already loaded
            model = find(n, dirs=dirs) if isinstance(n, (str, PathLike)) else n
            if all(m is not model and m != model for m in out):
                out.append(model)
        return out
    listing = catalog.list_airfields(dirs=dirs) if kind == "airfield" else catalog.list_profiles(dirs=dirs)
    out, seen = [], set()
    for entry in listing:
        if entry.error is None and entry.name not in seen:
            seen.add(entry.name)
            find = catalog.find_airfield if kind == "airfield" else catalog.find_profile
            out.append(find(entry.source if not entry.builtin else entry.name, dirs=dirs))
    if not out:
        raise DomainError(f"no {kind} found to draw scenarios from")
    return out


def _preferred(emphasis: str, airfields: list[Any]) -> list[Any]:
    """Airfields in the order an emphasis prefers them: the highest first for hot-high, the
    nearest the pole first for cold; others as drawn."""
    if emphasis == "hot-high":
        return sorted(airfields, key=lambda a: -a.elevation_ft)
    if emphasis == "cold":
        return sorted(airfields, key=lambda a: -abs(a.reference_point.lat_deg) if a.reference_point else 0.0)
    return airfields


def build_deck(*, count: int, seed: int, airfields: Sequence[Any] | None = None,
               profiles: Sequence[Any] | None = None, emphases: Sequence[str] | None = None,
               profile_dirs: Sequence[Any] = (), airfield_dirs: Sequence[Any] = ()) -> Deck:
    """N varied scenarios from one seed: the emphases in turn (shuffled), each on an airfield
    and profile that can exercise it (the highest field for hot-high, the coldest for cold).

    Each scenario has its own seed, drawn from the deck's, so that `briefer scenario new` with
    that airfield, profile, emphasis and seed makes it again. `airfields` and `profiles` are
    names, files or models already loaded (default: every one the catalog finds).

    Raises:
        DomainError: for a count outside 1-50, an unknown emphasis, or when no combination can
            exercise any of the emphases asked for.
    """
    from briefer.instructor.generation import generate_scenario

    if not 1 <= count <= 50:
        raise DomainError(f"count must be 1 to 50; got {count}")
    emph = list(dict.fromkeys(emphases)) if emphases else list(EMPHASES)
    for e in emph:
        if e not in EMPHASES:
            raise DomainError(f"unknown emphasis {e!r}; expected one of {', '.join(EMPHASES)}")
    rng = random.Random(seed)
    fields = _load_all("airfield", airfields, airfield_dirs)
    profs = _load_all("profile", profiles, profile_dirs)
    cases: list[DeckCase] = []
    skipped: list[str] = []
    dead: set[str] = set()
    order: list[str] = []
    while len(cases) < count:
        if not order:
            order = [e for e in emph if e not in dead]
            if not order:
                raise DomainError("no airfield and profile given can exercise the emphases asked for: "
                                  + "; ".join(skipped[-3:]))
            rng.shuffle(order)
        emphasis = order.pop()
        combos = [(a, p) for a in _preferred(emphasis, rng.sample(fields, len(fields)))
                  for p in rng.sample(profs, len(profs))]
        child_seed = rng.randrange(1_000_000)
        for a, p in combos:
            try:
                gen = generate_scenario(airfield=a, profile=p, emphasis=emphasis, seed=child_seed)
            except DomainError as exc:
                skipped.append(f"{emphasis} at {a.ident} with {p.name}: {exc}")
                continue
            cases.append(DeckCase(scenario=gen.scenario, loaded=gen.loaded, brief=gen.brief, checks=gen.checks))
            break
        else:
            dead.add(emphasis)
    return Deck(seed=seed, cases=tuple(cases), skipped=tuple(skipped))


__all__ = [
    "Deck",
    "DeckCase",
    "EMPHASIS_PROMPTS",
    "Tolerance",
    "WHAT_TO_BRIEF",
    "answer_text",
    "build_deck",
    "grading_tolerances",
    "student_text",
    "trap_lines",
]
