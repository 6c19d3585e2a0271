"""The wind-envelope views (render/envelope_view.py): a pure renderable taking an Envelope.

Envelopes are built by hand here (the verdicts are the core's job, tested in test_envelope), so
each check is a hand-derived position on the character grid: with ``radius_rows = 12`` and a
fastest wind of 40 kt, one text row is 40 / 12 = 3.33 kt, so the 10 kt ring is 3 rows from the
centre, and one row is two columns wide.
"""

from __future__ import annotations

import io

import numpy as np
import pytest
from rich.console import Console

from briefer.core.manoeuvre.envelope import (
    DOES_NOT_FIT,
    FITS,
    MARGINAL,
    REASON_AREA,
    REASON_BANK,
    REASON_VISIBILITY,
    REASON_WIND,
    Envelope,
)
from briefer.render.envelope_view import (
    GLYPHS,
    OUTSIDE,
    EnvelopeTable,
    EnvelopeView,
    direction_label,
    polar_grid,
    reason_letters,
    speed_bands,
)

DIRS = np.arange(0.0, 360.0, 10.0)
SPEEDS = np.arange(0.0, 41.0, 1.0)
R = 12                     # radius_rows; 40 kt / 12 rows = 3.33 kt per row


def envelope(status, reasons=None, dirs=DIRS, speeds=SPEEDS) -> Envelope:
    status = np.broadcast_to(np.asarray(status, dtype=np.int64), (len(dirs), len(speeds))).copy()
    reasons = np.zeros_like(status) if reasons is None else np.broadcast_to(reasons, status.shape).copy()
    nan_where_nofit = np.where(status == DOES_NOT_FIT, np.nan, 25.0)
    return Envelope(wind_from_relative_deg=np.asarray(dirs, dtype=float), wind_speed_kt=np.asarray(speeds, dtype=float),
                    candidates=(("break-and-return", "right"),), status=status, reasons=reasons,
                    bank_needed_deg=nan_where_nofit, best_candidate=np.zeros_like(status),
                    area_margin_m=np.full(status.shape, 500.0), max_distance_from_runway_m=np.full(status.shape, 3000.0),
                    bank_deg=25.0, bank_limit_deg=30.0, visibility_m=5000.0, area_radius_m=6000.0)


def one_direction_blocked(relative_deg: float) -> Envelope:
    status = np.full((len(DIRS), len(SPEEDS)), FITS)
    status[list(DIRS).index(relative_deg), :] = DOES_NOT_FIT
    return envelope(status)


def render(view, width: int = 80) -> str:
    buf = io.StringIO()
    Console(file=buf, width=width, color_system=None, legacy_windows=False).print(view)
    return buf.getvalue()


# --- the polar grid --------------------------------------------------------------------------------
def test_grid_shape_and_centre():
    g = polar_grid(envelope(FITS), runway_course_deg_true=90.0, radius_rows=R)
    assert g.status.shape == (2 * R + 1, 4 * R + 1)     # two columns per row
    assert g.centre == (R, 2 * R)
    assert g.kt_per_row == pytest.approx(40.0 / R)
    assert g.speed_kt[g.centre] == 0.0
    assert g.status[0, 0] == OUTSIDE                     # the corner is beyond 40 kt


@pytest.mark.parametrize(("rows_up", "ring"), [(3, True), (6, True), (9, True), (12, True), (2, False), (5, False)])
def test_rings_every_10_kt(rows_up, ring):
    """10 kt = 3 rows (hand: 10 / 3.33), 20 kt = 6, 30 kt = 9, 40 kt = 12; 2 and 5 rows are not rings."""
    g = polar_grid(envelope(FITS), runway_course_deg_true=0.0, radius_rows=R)
    r0, c0 = g.centre
    assert bool(g.ring[r0 - rows_up, c0]) is ring
    assert bool(g.ring[r0, c0 + 2 * rows_up]) is ring     # same ring on the horizontal axis


@pytest.mark.parametrize(("relative_deg", "where"), [
    pytest.param(0.0, "up", id="headwind-up"), pytest.param(90.0, "right", id="from-right-right"),
    pytest.param(180.0, "down", id="tailwind-down"), pytest.param(270.0, "left", id="from-left-left"),
])
def test_relative_directions_are_drawn_from_the_runway(relative_deg, where):
    g = polar_grid(one_direction_blocked(relative_deg), runway_course_deg_true=264.0, radius_rows=R)
    r0, c0 = g.centre
    cell = {"up": (r0 - R, c0), "right": (r0, c0 + 2 * R), "down": (r0 + R, c0), "left": (r0, c0 - 2 * R)}
    for name, rc in cell.items():
        assert g.status[rc] == (DOES_NOT_FIT if name == where else FITS), name


def test_true_directions_turn_by_the_runway_course():
    """Landing course 090 T: a wind from 090 relative comes from 180 T, drawn at the bottom."""
    g = polar_grid(one_direction_blocked(90.0), runway_course_deg_true=90.0, directions="true", radius_rows=R)
    r0, c0 = g.centre
    assert g.status[r0 + R, c0] == DOES_NOT_FIT          # south
    assert g.status[r0, c0 + 2 * R] == FITS              # east (relative 000)


def test_speed_is_the_distance_from_the_centre():
    """Marginal from 20 kt: 6 rows up is 20 kt (marginal); 5 rows up is 16.7 kt, nearest 17 (fits)."""
    status = np.where(SPEEDS[None, :] >= 20.0, MARGINAL, FITS) * np.ones((len(DIRS), 1), dtype=int)
    g = polar_grid(envelope(status), runway_course_deg_true=0.0, radius_rows=R)
    r0, c0 = g.centre
    assert g.status[r0 - 6, c0] == MARGINAL
    assert g.status[r0 - 5, c0] == FITS


def test_bad_arguments():
    with pytest.raises(ValueError, match="directions"):
        polar_grid(envelope(FITS), runway_course_deg_true=0.0, directions="magnetic")
    with pytest.raises(ValueError, match="radius_rows"):
        polar_grid(envelope(FITS), runway_course_deg_true=0.0, radius_rows=1)


# --- the picture -----------------------------------------------------------------------------------
def test_picture_glyphs_tell_the_verdicts_apart_without_colour():
    status = np.full((len(DIRS), len(SPEEDS)), FITS)
    status[:, 30:] = MARGINAL
    status[:9, 35:] = DOES_NOT_FIT
    for ascii_ in (False, True):
        g = GLYPHS[ascii_]
        assert len({g.fits, g.marginal, g.does_not_fit, g.ring, g.landing, g.today}) == 6
        text = "\n".join(EnvelopeView(envelope(status), runway_course_deg_true=0.0, ascii=ascii_).lines())
        for glyph in (g.fits, g.marginal, g.does_not_fit, g.ring, g.landing):
            assert glyph in text


def test_ascii_picture_is_plain_ascii():
    view = EnvelopeView(one_direction_blocked(90.0), runway_course_deg_true=264.0, ascii=True, today=(240.0, 10.0))
    out = render(view)
    assert out.isascii()
    assert "#" in out and "." in out and ":" in out and "X" in out and "*" in out


def test_landing_direction_marked_on_the_rim():
    """Relative: up. True with course 270: left (west), one ring outside the outer ring."""
    g = GLYPHS[True]
    rel = EnvelopeView(envelope(FITS), runway_course_deg_true=270.0, ascii=True, radius_rows=R)
    lines = rel.lines()
    pad, top = 7, 2                                    # label columns, label + marker rows
    assert lines[1][pad + 2 * R] == g.landing          # the marker row, centre column
    true = EnvelopeView(envelope(FITS), runway_course_deg_true=270.0, ascii=True, radius_rows=R, directions="true")
    row = true.lines()[top + R]
    assert row[pad + 2 * R - 2 * (R + 1)] == g.landing
    assert row.strip().startswith("W")


def test_todays_wind_is_marked():
    """Wind from the landing course at 20 kt (relative 000): 6 rows straight up."""
    view = EnvelopeView(envelope(FITS), runway_course_deg_true=264.0, ascii=True, today=(264.0, 20.0), radius_rows=R)
    lines = view.lines()
    assert lines[2 + R - 6][7 + 2 * R] == "X"
    assert "today's wind" in "\n".join(view.legend_lines())
    no_today = EnvelopeView(envelope(FITS), runway_course_deg_true=264.0, ascii=True)
    assert "X" not in "\n".join(no_today.lines())


def test_axis_labels():
    rel = "\n".join(EnvelopeView(envelope(FITS), runway_course_deg_true=0.0).lines())
    assert all(label in rel for label in ("000", "090", "180", "270"))
    true = EnvelopeView(envelope(FITS), runway_course_deg_true=0.0, directions="true").lines()
    assert true[0].strip() == "N" and true[-1].strip() == "S"


def test_legend_explains_glyphs_rings_and_orientation():
    legend = "\n".join(EnvelopeView(envelope(FITS), runway_course_deg_true=264.0).legend_lines())
    for words in ("fits", "marginal", "does not fit", "ring every 10 kt", "10 20 30 40 kt", "landing direction (264T)",
                  "headwind"):
        assert words in legend


def test_renders_in_80_columns():
    out = render(EnvelopeView(one_direction_blocked(0.0), runway_course_deg_true=264.0), width=80)
    lines = out.splitlines()
    assert max(len(x) for x in lines) <= 80
    assert len(lines) == (2 * R + 1) + 4 + 4           # grid, label rows, legend


def test_a_small_grid_still_draws():
    """Four directions x three speeds (what a coarse CLI run gives)."""
    env = envelope(np.array([[FITS, MARGINAL, DOES_NOT_FIT]] * 4), dirs=[0.0, 90.0, 180.0, 270.0],
                   speeds=[0.0, 20.0, 40.0])
    text = render(EnvelopeView(env, runway_course_deg_true=90.0, radius_rows=6))
    assert GLYPHS[False].does_not_fit in text and GLYPHS[False].marginal in text


# --- the table -------------------------------------------------------------------------------------
def test_reason_letters():
    assert reason_letters(0) == ""
    assert reason_letters(REASON_BANK | REASON_VISIBILITY) == "BV"
    assert reason_letters(REASON_BANK | REASON_AREA | REASON_VISIBILITY | REASON_WIND) == "BAVW"


def test_speed_bands():
    bands = speed_bands(SPEEDS, 5.0)
    assert [label for label, _ in bands] == ["0-4", "5-9", "10-14", "15-19", "20-24", "25-29", "30-34", "35-39", "40"]
    assert sum(len(idx) for _, idx in bands) == len(SPEEDS)
    with pytest.raises(ValueError):
        speed_bands(SPEEDS, 0.0)


@pytest.mark.parametrize(("relative", "course", "label"), [
    (0.0, 264.0, "000 head (264T)"), (90.0, 264.0, "090 right (354T)"), (180.0, 264.0, "180 tail (084T)"),
    (270.0, 264.0, "270 left (174T)"), (40.0, 0.0, "040 head-right (040T)"), (200.0, 0.0, "200 tail-left (200T)"),
])
def test_direction_label(relative, course, label):
    assert direction_label(relative, course) == label


def test_band_cell_is_the_worst_verdict_with_its_reasons():
    """Band 20-24 kt of direction 000: 20-21 marginal (area), 22 does not fit (bank), 23-24 fit:
    the cell shows does-not-fit with the reasons of the does-not-fit cells only (B)."""
    status = np.full((len(DIRS), len(SPEEDS)), FITS)
    reasons = np.zeros_like(status)
    status[0, 20:22], reasons[0, 20:22] = MARGINAL, REASON_AREA
    status[0, 22], reasons[0, 22] = DOES_NOT_FIT, REASON_BANK
    table = EnvelopeTable(envelope(status, reasons), runway_course_deg_true=264.0)
    label, cells = next(table.rows())
    assert label == "000 head (264T)"
    assert cells[4] == (DOES_NOT_FIT, "B")             # band 20-24
    assert cells[3] == (FITS, "")                      # band 15-19


def test_table_renders_with_legend():
    status = np.full((len(DIRS), len(SPEEDS)), FITS)
    status[3, 30:] = MARGINAL
    out = render(EnvelopeTable(envelope(status, np.where(status == MARGINAL, REASON_AREA, 0)), runway_course_deg_true=264.0,
                               ascii=True))
    assert out.isascii()
    assert "030 head-right (294T)" in out and "+A" in out
    for words in ("fits", "marginal", "does not fit", "B bank", "A area", "V visibility", "W wind"):
        assert words in out
    assert len(out.splitlines()) >= len(DIRS)


def test_views_take_a_real_envelope():
    """A coarse envelope of the demo from the core renders in both views."""
    from briefer.brief import demo_request, envelope_for

    env = envelope_for(demo_request(), wind_from_relative_deg=[0.0, 90.0, 180.0, 270.0], wind_speed_kt=[0.0, 20.0, 40.0])
    assert render(EnvelopeView(env, runway_course_deg_true=264.0, radius_rows=6))
    assert "000 head" in render(EnvelopeTable(env, runway_course_deg_true=264.0))
