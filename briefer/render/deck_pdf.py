"""The instructor deck as one PDF: per scenario a student page, then its answer page.

Drawn with the kneeboard card's own pieces (briefer.render.pdf and briefer.render.card_layout),
so the deck and the card print the same numbers the same way:

* the answer page IS the card (`card_layout(brief)` drawn by `draw_card_page`), titled
  "ANSWER n/N", with three more sections in the card's style: the sight-picture trap in large
  figures, why the case exercises its emphasis, and the grading tolerances;
* the student page uses the card's header, section bars and rows, and its plan view of the chart
  (runways, obstacles, not-authorised sectors, the final approach course; no protected area and no
  plan, which are answers), drawn by `scene_to_primitives` like every plan view.

The document's creation date is fixed, so the same deck gives the same bytes.

The student page uses the card's painter (`briefer.render.pdf.CardPainter`)
for its header, bars, rows and plan view, so that both pages share one typography.
"""

from __future__ import annotations

from dataclasses import replace
from os import PathLike
from pathlib import Path
from typing import Any

import numpy as np

from briefer.errors import BriefingError
from briefer.render import pdf as card_pdf
from briefer.render.card_layout import Figure, Row, Section, card_layout, legend_lines, num
from briefer.render.scene import Bounds, Marker, Polygon, Polyline, Role, Scene
from briefer.instructor.deck import (
    EMPHASIS_PROMPTS,
    PRACTICE_LINE,
    WHAT_TO_BRIEF,
    Deck,
    DeckCase,
    grading_tolerances,
)
from briefer.instructor.scenario_format import EMPHASIS_TITLES

DECK_PAGE_SIZES_MM: dict[str, tuple[float, float]] = {
    "letter": (215.9, 279.4),
    "a4": (210.0, 297.0),
    "half-letter": card_pdf.PAGE_SIZES_MM["half-letter"],
    "a5": card_pdf.PAGE_SIZES_MM["a5"],
}
REPORT_PT = 11.0
NOTE_STEP_MM = 7.0


# --------------------------------------------------------------------------------------------
# The answer page: the card, then the trap, why, and the tolerances
# --------------------------------------------------------------------------------------------
def answer_sections(case: DeckCase) -> tuple[Section, ...]:
    """The sections the answer page adds below the card."""
    b = case.brief
    s = b.sight_picture
    if s.familiar_possible and s.familiar_bank_required_deg is not None:
        need = Figure(label="IT NEEDS", value=num(s.familiar_bank_required_deg, ".0f", "°"),
                      note=("BEYOND THE LIMIT" if s.familiar_exceeds_bank_limit else f"limit "
                            f"{b.performance.bank_limit_deg:.0f}°") + f", {num(s.familiar_load_factor, '.2f', ' g')}")
    else:
        need = Figure(label="IT NEEDS", value="NO BANK", note="the wing stalls first")
    trap = Section(key="trap", title="THE SIGHT-PICTURE TRAP", figures=(
        Figure(label="USUAL PICTURE", value=num(s.familiar_depression_deg, ".1f", "°"),
               note=f"{s.familiar_height_ft:.0f} ft, {s.familiar_offset_nm:.2f} NM out"),
        Figure(label="AT CIRCLING HEIGHT", value=num(s.familiar_offset_at_circling_nm, ".2f", " NM"),
               note=f"out, at {s.circling_height_ft:.0f} ft" + (f" (plan {s.planned_offset_nm:.2f} NM)" if s.planned_offset_nm == s.planned_offset_nm else " (no plan)")),
        need,
        Figure(label="OR OVERSHOOT", value=num(s.overshoot_nm, ".2f", " NM"), note="holding the planned bank"),
    ))
    why_rows = tuple(Row(label="Why" if i == 0 else "", text=t) for i, t in enumerate(case.checks))
    why = Section(key="why", title=f"WHY THIS CASE: {EMPHASIS_TITLES[case.scenario.emphasis].upper()}",
                  rows=why_rows or (Row(label="Notes", text=case.scenario.notes or "-"),))
    tol = grading_tolerances(b)
    grading = Section(key="grading", title="GRADING TOLERANCES",
                      status=f"altitude, airspeed and bank bands: {tol[0].source}",
                      rows=tuple(Row(label=t.item, text=t.band + ("" if "common practice" in t.source
                                                                 else f" ({t.source})")) for t in tol))
    return (trap, why, grading)


def _answer_page(pdf: Any, case: DeckCase, index: int, total: int, widths: dict) -> None:
    """The card itself (the card module's own painter, fitted to this page) with the answer
    sections after its warnings."""
    layout = replace(card_layout(case.brief), title=f"ANSWER {index}/{total}",
                     briefed=f"scenario seed {case.scenario.seed}" if case.scenario.seed is not None else "scenario")
    card_pdf.draw_card_page(pdf, layout, extra=answer_sections(case), widths=widths)   # adds its detail pages


# --------------------------------------------------------------------------------------------
# The student page
# --------------------------------------------------------------------------------------------
def _xy(arr: Any) -> list[tuple[float, float]]:
    a = np.asarray(arr, dtype=float).reshape(-1, 2)
    a = a[np.all(np.isfinite(a), axis=1)]
    return [(float(x), float(y)) for x, y in a]


ANSWER_ROLES = frozenset({Role.PROTECTED_AREA, Role.PLANNED_TRACK, Role.ROLL_IN, Role.DESCENT_POINT,
                          Role.FAMILIAR_TRACK, Role.MISSED_APPROACH})
"""What the answer's plan view shows and the student's chart must not: the area and the plan."""

CHART_MARGIN_NM = 1.0
"""Air around the runways and obstacles on the student's chart."""
CHART_MIN_HALF_NM = 2.5
"""The chart shows at least this far from the runways' middle (a small field still has a frame)."""


def chart_scene(case: DeckCase) -> Scene:
    """What the student's chart shows, and nothing the student must find: the runways, every
    obstacle labelled with its elevation, the not-authorised sectors and the final approach course
    from the FAF to the MAP.

    Nothing on it depends on the answer: the frame is set by the runways and the obstacles (not by
    the protected area, whose size follows the category), and the sectors are drawn from the
    chart's own geometry out to beyond the frame (not clipped at the answer's area radius).
    """
    from briefer.render.brief_scene import scene_from_brief
    from briefer.units import NM_TO_M

    b = case.brief
    scene = scene_from_brief(b, familiar=False)
    elevation = {tuple(_xy(ob.xy_m)[0]): ob.elevation_ft for ob in b.obstacles}
    thresholds: dict[str, tuple[float, float]] = {}
    for rw in b.runways:
        des_a, des_b = rw.designator.split("/")
        thresholds[des_a], thresholds[des_b] = _xy(rw.a_xy_m)[0], _xy(rw.b_xy_m)[0]
    pts = list(thresholds.values()) + [p for p in elevation]
    xs, ys = [p[0] for p in pts], [p[1] for p in pts]
    cx, cy = (min(xs) + max(xs)) / 2, (min(ys) + max(ys)) / 2
    half = max(max(abs(x - cx) for x in xs), max(abs(y - cy) for y in ys)) + CHART_MARGIN_NM * NM_TO_M
    half = max(half, CHART_MIN_HALF_NM * NM_TO_M)
    items: list[Any] = []
    for item in scene.items:
        if item.role in ANSWER_ROLES or item.role is Role.EXCLUDED_SECTOR:
            continue
        if isinstance(item, Marker) and item.role is Role.OBSTACLE and item.point in elevation:
            item = replace(item, label=f"{elevation[item.point]:.0f}")
        items.append(item)
    for poly in case.chart_sectors_xy_m(half * 3.0):
        items.append(Polygon(points=poly, role=Role.EXCLUDED_SECTOR, filled=True))
    items.append(Polyline(points=case.final_approach_xy_m, role=Role.FINAL_APPROACH))
    return replace(scene, items=tuple(items), bounds=Bounds(cx - half, cy - half, cx + half, cy + half))


def _chart_rows(case: DeckCase) -> tuple[Row, ...]:
    req = case.loaded.request
    af, appr = req.airfield, req.selected_approach()
    rows = [Row(label="Approach", text=(f"{appr.name}: final course {appr.final_course_deg_mag:03.0f}° M, FAF "
                                        f"{appr.faf.name} at {appr.faf.altitude_ft:.0f} ft, MAP {appr.map_fix.name}; "
                                        f"criteria {appr.criteria}"))]
    lines = []
    for m in appr.circling:
        if m.not_authorised:
            lines.append(f"{m.category}: NA")
        else:
            v = f"{m.visibility_sm:g} SM" if m.visibility_sm is not None else f"{m.visibility_m:.0f} m"
            lines.append(f"{m.category}: {m.mda_ft:.0f} ft / {v}")
    rows.append(Row(label="Circling", text="; ".join(lines)))
    for s in appr.not_authorised_sectors:
        where = (f"from threshold {s.threshold}, {s.from_deg_mag:03.0f}°-{s.to_deg_mag:03.0f}° M"
                 if s.kind == "bearings" else f"{s.side} of runway {s.runway}")
        rows.append(Row(label="Sector", text=f"circling not authorised {where}"))
    if appr.missed_approach:
        rows.append(Row(label="Missed appr", text=appr.missed_approach))
    rows.append(Row(label="Elevation", text=(f"airfield {af.elevation_ft:.0f} ft; magnetic variation "
                                             f"{abs(af.magnetic_variation_deg):.1f}° "
                                             f"{'E' if af.magnetic_variation_deg >= 0 else 'W'}")))
    return tuple(rows)


def _aircraft_rows(case: DeckCase) -> tuple[Row, ...]:
    req = case.loaded.request
    prof, cfg = req.profile, req.selected_configuration()
    f = prof.weight_speed_factor(req.landing_weight_lb)
    wa, fp = prof.wind_additive, prof.familiar_pattern
    usual = (f"{fp.height_ft:.0f} ft, downwind {fp.offset_nm:.2f} NM out" if fp.offset_nm is not None else
             f"{fp.height_ft:.0f} ft, a continuous 180° turn at {fp.speed_kt:.0f} kt and {fp.bank_deg:.0f}° bank")
    return (
        Row(label="Aircraft", text=prof.name),   # not the description: it may give the category away
        Row(label="Weight", text=f"{req.landing_weight_lb:.0f} lb (maximum landing {prof.max_landing_weight_lb:.0f} lb)"),
        Row(label="Speeds", text=(f"{cfg.name}: VREF {cfg.vref_kt * f:.0f} kt, circling {cfg.circling_speed_kt * f:.0f} kt "
                                  f"at this weight; category speed {prof.approach_category_speed_kt():.0f} kt")),
        Row(label="Wind additive", text=(f"{wa.headwind_fraction:g} x headwind + {wa.gust_fraction:g} x gust increment, "
                                         f"{wa.min_kt:.0f} to {wa.max_kt:.0f} kt")),
        Row(label="Bank", text=f"target {cfg.bank_target_deg:.0f}°, limit {cfg.bank_limit_deg:.0f}°"),
        Row(label="Usual pattern", text=usual),
    )


def _student_page(pdf: Any, case: DeckCase, index: int, total: int, page_w: float, page_h: float,
                  widths: dict) -> None:
    sc = case.scenario
    chart = chart_scene(case)
    layout = replace(card_layout(case.brief), title=f"STUDENT PAGE {index}/{total}",
                     briefed=f"emphasis: {EMPHASIS_TITLES[sc.emphasis]}", plan_view=chart,
                     legend=legend_lines(chart))     # the chart's own roles, not the answer's
    c = card_pdf.CardPainter(pdf, layout, page_w, page_h, widths)
    c.draw = True
    pdf.set_text_color(0)
    pdf.set_draw_color(0)
    flow = card_pdf.Flow(c, 1, "continued")
    y = c.header(card_pdf.MARGIN_MM)
    y += c.paragraph(c.x0, y, c.w, sc.title, "B", card_pdf.SUBTITLE_PT) + 0.6
    # the weather report, large and in a fixed-pitch face, as a report is read
    y = c.bar(c.x0, y, c.w, "WEATHER REPORT")
    saved = (pdf.font_family, pdf.font_style, pdf.font_size_pt)   # the painter remembers its font
    pdf.set_font("Courier", "B", REPORT_PT)
    report = card_pdf._t(sc.weather.report or "(no report: values only)")
    words, line, lines = report.split(" "), "", []
    for w in words:
        cand = f"{line} {w}".strip()
        if pdf.get_string_width(cand) > c.w - 2.0 and line:
            lines.append(line)
            line = w
        else:
            line = cand
    lines.append(line)
    lh = REPORT_PT / pdf.k * card_pdf.LINE_SPACING
    for i, ln in enumerate(lines):
        pdf.text(c.x0 + 1.0, y + (i + 0.8) * lh, ln)
    pdf.set_font(*saved)
    y += len(lines) * lh + 1.5
    # the chart: the plan view (full width, nothing on it the student must find), then its data
    y = c.bar(c.x0, y, c.w, "THE CHART (invented)")
    plan_h = min(c.w * 0.75, page_h * 0.36)
    c.plan_view((c.x0, y, c.w, plan_h))
    y = c.legend(c.x0, y + plan_h + 0.6, c.w)
    flow._top = card_pdf.MARGIN_MM
    y = c.rows(y, _chart_rows(case), flow=flow)
    y = flow.need(y, c.lh(card_pdf.SECTION_PT) + 2 * c.lh(card_pdf.BODY_PT))
    y = c.bar(c.x0, y, c.w, "THE AIRCRAFT")
    y = c.rows(y, _aircraft_rows(case), flow=flow)
    y = flow.need(y, c.lh(card_pdf.SECTION_PT) + 2 * c.lh(card_pdf.BODY_PT))
    y = c.bar(c.x0, y, c.w, "BRIEF THE CIRCLE")
    items = WHAT_TO_BRIEF + EMPHASIS_PROMPTS.get(sc.emphasis, ())
    y = c.rows(y, tuple(Row(label=f"{i}.", text=t) for i, t in enumerate(items, 1)), flow=flow)
    # room for notes, down to the caution
    caution_h = c.measure_caution(layout.cautions, "CAUTIONS")
    bottom = page_h - card_pdf.MARGIN_MM - c.footer_height() - card_pdf.GAP_MM - caution_h
    if bottom - y > 3 * NOTE_STEP_MM:
        y = c.bar(c.x0, y, c.w, "NOTES")
        with pdf.local_context(line_width=0.15, draw_color=170):
            yy = y + NOTE_STEP_MM
            while yy < bottom - 1.0:
                pdf.line(c.x0, yy, c.x0 + c.w, yy)
                yy += NOTE_STEP_MM
    y = flow.need(max(y, bottom), caution_h)
    c.caution_box(y + 0.5, layout.cautions, "CAUTIONS")
    flow.end_page()


# --------------------------------------------------------------------------------------------
# The document
# --------------------------------------------------------------------------------------------
def _deck_pdf(deck: Deck, *, page: str = "letter") -> bytes:
    """Student page then answer page for every case; fixed metadata, so reproducible."""
    from fpdf import FPDF   # imported only when a PDF is made

    page_w, page_h = DECK_PAGE_SIZES_MM[page]
    pdf = FPDF(orientation="P", unit="mm", format=(page_w, page_h))
    pdf.set_auto_page_break(False)
    pdf.set_margins(card_pdf.MARGIN_MM, card_pdf.MARGIN_MM, card_pdf.MARGIN_MM)
    pdf.set_creation_date(card_pdf.FIXED_DATE)
    pdf.set_title(card_pdf._t(f"briefer practice deck, seed {deck.seed}, {len(deck.cases)} scenarios"))
    pdf.set_subject(card_pdf._t(PRACTICE_LINE))
    pdf.set_creator("briefer")
    widths: dict = {}
    total = len(deck.cases)
    for i, case in enumerate(deck.cases, 1):
        pdf.add_page()
        _student_page(pdf, case, i, total, page_w, page_h, widths)
        pdf.add_page()
        _answer_page(pdf, case, i, total, widths)
    return bytes(pdf.output())


DECK_PAGES = ("letter", "a4", "half-letter", "a5")


def deck_pdf_bytes(deck: Deck, *, page: str = "letter") -> bytes:
    """The deck as one PDF (see `briefer.render` for the drawing); the same deck gives the same bytes."""
    if page not in DECK_PAGES:
        raise BriefingError(f"unknown page size {page!r}; expected one of {', '.join(DECK_PAGES)}")
    return _deck_pdf(deck, page=page)


def check_deck_target(path: str | PathLike[str], *, page: str = "letter", overwrite: bool = False) -> Path:
    """The deck's file, checked before the work of making it: a .pdf name, a known page size, and
    no existing file unless `overwrite`."""
    import os

    from briefer.io.atomic import FileWriteError

    target = Path(os.path.expanduser(os.fspath(path)))
    if target.suffix.lower() != ".pdf":
        raise BriefingError(f"cannot write {path}: a deck is a PDF; name it .pdf")
    if page not in DECK_PAGES:
        raise BriefingError(f"unknown page size {page!r}; expected one of {', '.join(DECK_PAGES)}")
    if not overwrite and os.path.lexists(target) and not target.is_dir():
        raise FileWriteError(target, "the file already exists; not overwritten (overwrite it with --force)")
    return target


def write_deck(path: str | PathLike[str], deck: Deck, *, page: str = "letter", overwrite: bool = False) -> Path:
    """Write the deck PDF atomically (refuses to overwrite unless asked)."""
    from briefer.io.atomic import write_bytes_atomic

    target = check_deck_target(path, page=page, overwrite=overwrite)
    return write_bytes_atomic(target, deck_pdf_bytes(deck, page=page), overwrite=overwrite)


__all__ = ["DECK_PAGES", "DECK_PAGE_SIZES_MM", "answer_sections", "chart_scene", "check_deck_target",
           "deck_pdf_bytes", "write_deck"]
