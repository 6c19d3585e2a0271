"""The kneeboard card (issue 6): PDF and text from one CardLayout, written atomically.

The PDF is read back with pypdf (a reference reader independent of fpdf2). Numbers are checked
against the Brief the card was made from (wiring, STYLE F: the card must repeat the Brief's
numbers, not recompute them), so no expected value here needs a published source.
"""

from __future__ import annotations

import dataclasses
import io
import os
import re
import subprocess
import sys
from pathlib import Path

import pytest
from pypdf import PdfReader

from briefer.brief import build_brief, demo_request
from briefer.cautions import CAUTIONS
from briefer.cli import main
from briefer.errors import BriefingError
from briefer.io import catalog
from briefer.model import BriefRequest
from briefer.render.card import card_format, card_pdf_bytes, card_text, write_card
from briefer.render.card_layout import card_layout, printable_text
from briefer.render.card_text import layout_text
from briefer.result import Finding

BRIEFED = "2000-01-01 12:00Z"

# Page sizes in PostScript points (1/72 in): half-letter 5.5 x 8.5 in = 396 x 612 (hand-derived:
# 5.5 * 72, 8.5 * 72); ISO 216 A5 148 x 210 mm = 419.53 x 595.28 (148 / 25.4 * 72, 210 / 25.4 * 72).
HALF_LETTER_PT = (396.0, 612.0)
A5_PT = (419.53, 595.28)


@pytest.fixture(scope="module")
def demo_brief():
    return build_brief(demo_request(), computed_utc=BRIEFED)


@pytest.fixture(scope="module")
def demo_pdf(demo_brief) -> bytes:
    return card_pdf_bytes(demo_brief)


def flat(text: str) -> str:
    """Whitespace (no-break spaces and line ends included) folded to single spaces."""
    return " ".join(text.split())


def pdf_pages(data: bytes):
    return PdfReader(io.BytesIO(data)).pages


def pdf_text(data: bytes) -> str:
    """The text of every page (the front page, then the detail pages), whitespace folded."""
    return flat(" ".join(p.extract_text() for p in pdf_pages(data)))


def front_text(data: bytes) -> str:
    return flat(pdf_pages(data)[0].extract_text())


def text_card_flat(text: str) -> str:
    """The text card without the box characters of the cautions box, whitespace folded."""
    return flat(text.replace("|", " "))


def text_card_boxes(text: str) -> list[str]:
    """The figure boxes of the text card, each as 'LABEL value note' (whitespace folded)."""
    boxes: list[str] = []
    columns: list[list[str]] = []
    for line in text.splitlines():
        if line.startswith(" +-"):
            boxes += [flat(" ".join(c)) for c in columns if flat(" ".join(c))]
            columns = []
        elif line.startswith(" |"):
            cells = line.split("|")[1:-1]
            columns = columns or [[] for _ in cells]
            for col, cell in zip(columns, cells):
                col.append(cell)
    return boxes


def key_numbers(brief) -> dict[str, str]:
    """The numbers the card must show, formatted as the card formats them."""
    m, p = brief.minimums, brief.plan
    return {
        "MDA": f"{m.mda_ft:.0f} ft",
        "HAA": f"{m.height_above_airport_ft:.0f} ft",
        "offset": f"{p.offset_nm:.2f} NM",
        "timing": f"{p.abeam_to_roll_in_s:.0f} s",
        "bank": f"{p.bank_deg:.0f}°",
        "bank limit": f"limit {brief.performance.bank_limit_deg:.0f}°",
        "roll out": f"{p.roll_out_distance_nm:.2f} NM",
        "visibility": "2 1/2 SM",            # as the chart prints it (issue 11 item 10)
        "missed": brief.missed_approach.turn_direction.upper(),
    }


# --- the PDF --------------------------------------------------------------------------------


def test_pdf_half_letter_pages(demo_pdf, demo_brief):
    """A front page and the detail pages, all half-letter; without the details, one page."""
    pages = pdf_pages(demo_pdf)
    assert 2 <= len(pages) <= 3
    for page in pages:
        box = page.mediabox
        assert (float(box.width), float(box.height)) == pytest.approx(HALF_LETTER_PT, abs=0.01)
    assert len(pdf_pages(card_pdf_bytes(demo_brief, detail=False))) == 1


def test_pdf_a5_page(demo_brief):
    pages = pdf_pages(card_pdf_bytes(demo_brief, page="a5"))
    assert 2 <= len(pages) <= 3
    for page in pages:
        box = page.mediabox
        assert (float(box.width), float(box.height)) == pytest.approx(A5_PT, abs=0.01)


def test_pdf_text_has_the_key_numbers(demo_brief, demo_pdf):
    text = front_text(demo_pdf)          # the numbers to fly are on the front page
    for name, value in key_numbers(demo_brief).items():
        assert value in text, name
    assert re.search(rf"CATEGORY {demo_brief.category.category}\b", text)
    assert demo_brief.header.airfield_ident in text
    assert demo_brief.header.approach_name in text
    assert f"circle to land runway {demo_brief.header.landing_runway}" in text
    assert BRIEFED in text
    assert demo_brief.missed_approach.instruction in text


def test_pdf_text_has_every_caution(demo_pdf):
    text = pdf_text(demo_pdf)
    assert "CAUTIONS" in text
    for caution in CAUTIONS:
        assert flat(caution) in text


def test_pdf_text_has_every_warning_most_severe_first(demo_brief, demo_pdf):
    text = pdf_text(demo_pdf)
    positions = [text.index(flat(printable_text(f.text, "latin-1"))) for f in demo_brief.warnings]
    assert positions == sorted(positions)
    for f in demo_brief.warnings:
        word = {"danger": "!! DANGER", "warning": "! WARNING", "info": "i NOTE"}[f.severity]
        assert f"{word} {flat(printable_text(f.text, 'latin-1'))}" in text


def test_pdf_and_text_card_show_the_same_layout(demo_brief, demo_pdf):
    """Every figure and every row of the shared layout is on both cards (so they cannot drift)."""
    layout = card_layout(demo_brief)
    pdf = pdf_text(demo_pdf)
    text = layout_text(layout)
    txt = text_card_flat(text)
    boxes = text_card_boxes(text)
    for sec in layout.sections():
        for fig in sec.figures:
            assert flat(f"{fig.label} {fig.value} {fig.note}") in pdf, fig.label
            assert flat(f"{fig.label} {fig.value} {fig.note}") in boxes, fig.label
        for row in sec.rows:
            assert f"{row.label} {flat(row.text)}" in pdf, row.label
            assert flat(row.text) in txt, row.label
    for row in layout.side_view.rows:
        assert f"{row.label} {flat(row.text)}" in pdf, row.label
        assert flat(row.text) in txt, row.label


def test_pdf_reproducible_bytes(demo_brief, demo_pdf):
    assert card_pdf_bytes(demo_brief) == demo_pdf
    later = dataclasses.replace(demo_brief, computed_utc="2000-01-02 12:00Z")
    assert card_pdf_bytes(later) != demo_pdf        # the brief's time is the creation date


def test_pdf_creation_date_is_the_brief_time(demo_pdf):
    info = PdfReader(io.BytesIO(demo_pdf)).metadata
    assert info["/CreationDate"].startswith("D:20000101120000")


def test_pdf_unknown_page_size(demo_brief):
    with pytest.raises(BriefingError, match="unknown page size 'legal'; expected one of half-letter, a5"):
        card_pdf_bytes(demo_brief, page="legal")


def test_pdf_text_outside_latin1(demo_brief):
    """Core fonts are Latin-1: a name with an em dash, an arrow or another script still prints."""
    header = dataclasses.replace(demo_brief.header, airfield_name="Vale \u2014 north \u2192 Ést \u05d0")
    text = pdf_text(card_pdf_bytes(dataclasses.replace(demo_brief, header=header)))
    assert "Vale - north -> Ést ?" in text


def test_many_warnings_flow_onto_the_detail_pages(demo_brief):
    """The type never shrinks to make room: the front page says how many warnings it left for
    the detail pages, which list them all (as many pages as they need), then every caution; the
    text card lists them all too."""
    extra = tuple(Finding(severity="warning", code=f"w{i}", text=f"Invented warning number {i} " + "x " * 60)
                  for i in range(30))
    brief = dataclasses.replace(demo_brief, findings=demo_brief.findings + extra)
    data = card_pdf_bytes(brief)
    assert re.search(r"\.\.\. and \d+ more warnings and \d+ notes on page 2\.", front_text(data))
    text = pdf_text(data)
    assert all(f"Invented warning number {i} " in text for i in range(30))
    for caution in CAUTIONS:
        assert flat(caution) in text
    card = card_text(brief)
    assert all(f"Invented warning number {i} " in card for i in range(30))


def test_draw_card_page_with_extra_sections(demo_brief):
    """The public hook for documents of several cards (the instructor deck): each page fitted with
    its extra sections, the cautions still on it."""
    from fpdf import FPDF

    from briefer.render.card_layout import Row, Section
    from briefer.render.pdf import MARGIN_MM, PAGE_SIZES_MM, draw_card_page

    layout = card_layout(demo_brief)
    extra = (Section(key="extra", title="INVENTED EXTRA", rows=(Row(label="Note", text="an added line of text"),)),)
    pdf = FPDF(unit="mm", format=PAGE_SIZES_MM["half-letter"])
    pdf.set_auto_page_break(False)
    pdf.set_margins(MARGIN_MM, MARGIN_MM, MARGIN_MM)
    widths: dict = {}
    counts = []
    for _ in range(2):
        pdf.add_page()
        counts.append(draw_card_page(pdf, layout, extra=extra, widths=widths))
    pages = pdf_pages(bytes(pdf.output()))
    assert len(pages) == sum(counts) and counts[0] == counts[1] >= 2
    for first in (0, counts[0]):
        text = flat(" ".join(p.extract_text() for p in pages[first:first + counts[0]]))
        assert "INVENTED EXTRA Note an added line of text" in text
        assert text.index("EVERY WARNING AND NOTE") < text.index("INVENTED EXTRA") < text.index("CAUTIONS")
        for caution in CAUTIONS:
            assert flat(caution) in text


# --- the text card ----------------------------------------------------------------------------


def test_text_card_fits_80_columns_ascii_plus_degree(demo_brief):
    text = card_text(demo_brief)
    assert text.endswith("\n")
    lines = text.splitlines()
    assert max(len(line) for line in lines) <= 80
    assert set(text) <= {chr(c) for c in range(32, 127)} | {"\n", "°"}


def test_text_card_has_the_numbers_and_cautions(demo_brief):
    text = text_card_flat(card_text(demo_brief))
    for name, value in key_numbers(demo_brief).items():
        assert value in text, name
    assert f"CATEGORY MDA HAA VISIBILITY {demo_brief.category.category} " in text
    for caution in CAUTIONS:
        assert flat(caution) in text
    for f in demo_brief.warnings:
        assert flat(f.text) in text


def test_text_card_plan_view_is_ascii(demo_brief):
    text = card_text(demo_brief)
    plan = text.split("== PLAN VIEW")[1].split("== SIGHT PICTURE")[0]
    assert "#" in plan and "*" in plan        # the runway and the planned track (ASCII canvas)
    assert "NM" in plan                       # the scale bar


def test_text_card_never_splits_a_number_from_its_unit(demo_brief):
    for line in card_text(demo_brief).splitlines():
        assert not re.match(r"^\s*(ft|kt|NM|SM)\b", line.strip("| ")), line


def test_card_text_is_the_layout_text(demo_brief):
    assert card_text(demo_brief) == layout_text(card_layout(demo_brief))


@pytest.mark.parametrize(("text", "charset", "expected"), [
    pytest.param("a \u2014 b \u2013 c", "latin-1", "a - b - c", id="dashes"),
    pytest.param("x \u2192 y \u2248 z", "latin-1", "x -> y ~ z", id="arrow-approx"),
    pytest.param("241° M", "ascii+degree", "241° M", id="degree-kept"),
    pytest.param("Ést", "latin-1", "Ést", id="latin1-letter-kept"),
    pytest.param("Ést", "ascii+degree", "Est", id="accent-dropped"),
    pytest.param("\u2800\u28ff", "ascii+degree", "  ", id="braille-blank"),
    pytest.param("\u05d0\u4e2d", "latin-1", "??", id="other-scripts"),
    pytest.param("\u00d7 \u00b1", "ascii+degree", "x +/-", id="latin1-symbols-in-ascii"),
])
def test_printable_text(text, charset, expected):
    assert printable_text(text, charset) == expected


# --- every demo case --------------------------------------------------------------------------


def _demo_cases():
    for entry in catalog.list_airfields(use_config=False):
        af = catalog.find_airfield(entry.name, use_config=False)
        for ap in af.approaches:
            yield pytest.param(af, ap.name, id=f"{af.ident}-{ap.name}")


@pytest.mark.parametrize(("airfield", "approach"), list(_demo_cases()))
def test_every_demo_approach_renders(airfield, approach):
    """Each landing runway, each demo aircraft: one page, 80 columns, and a card that says so when
    circling is not authorised or no plan can be flown."""
    for rw in airfield.runways:
        for landing in (rw.threshold_a.designator, rw.threshold_b.designator):
            for profile in ("demo-bizjet", "demo-twin", "demo-trainer"):
                req = BriefRequest(profile=catalog.find_profile(profile, use_config=False), airfield=airfield,
                                   approach=approach, landing_runway=landing)
                brief = build_brief(req, computed_utc=BRIEFED)
                pdf = pdf_text(card_pdf_bytes(brief))
                txt = card_text(brief)
                assert max(len(line) for line in txt.splitlines()) <= 80
                flat_txt = text_card_flat(txt)
                for caution in CAUTIONS:
                    assert flat(caution) in pdf and flat(caution) in flat_txt
                assert "more not shown here" not in pdf      # every demo card shows every warning
                if not brief.minimums.authorised:
                    assert "CIRCLING NOT AUTHORISED" in pdf and "CIRCLING NOT AUTHORISED" in flat_txt
                if not brief.plan.feasible:
                    assert "NO FLYABLE PLAN" in pdf and "NO FLYABLE PLAN" in flat_txt
                else:
                    assert f"{brief.plan.offset_nm:.2f} NM" in pdf


# --- writing the card -------------------------------------------------------------------------


@pytest.mark.parametrize(("name", "fmt", "expected"), [
    ("card.pdf", None, "pdf"), ("card.TXT", None, "txt"), ("card", "pdf", "pdf"), ("card.out", "txt", "txt"),
    ("card.pdf", "PDF", "pdf"),
])
def test_card_format(name, fmt, expected):
    assert card_format(name, fmt) == expected


@pytest.mark.parametrize(("name", "fmt", "message"), [
    ("card.doc", None, "cannot tell the card format of card.doc: name it .pdf or .txt, or give the format"),
    ("card", None, "cannot tell the card format of card: name it .pdf or .txt, or give the format"),
    ("card.pdf", "txt", "cannot write card.pdf: the name ends in .pdf but the format asked for is txt"),
    ("card.pdf", "svg", "unknown card format 'svg'; expected one of pdf, txt"),
])
def test_card_format_errors(name, fmt, message):
    with pytest.raises(BriefingError) as exc:
        card_format(name, fmt)
    assert str(exc.value) == message


@pytest.mark.parametrize("suffix", ["pdf", "txt"])
def test_write_card_writes_and_returns_the_path(tmp_path, demo_brief, suffix):
    path = write_card(demo_brief, tmp_path / f"card.{suffix}")
    assert path == tmp_path / f"card.{suffix}"
    data = path.read_bytes()
    if suffix == "pdf":
        assert data.startswith(b"%PDF-")
        assert data == card_pdf_bytes(demo_brief)
    else:
        assert data.decode("utf-8") == card_text(demo_brief)
    assert sorted(p.name for p in tmp_path.iterdir()) == [f"card.{suffix}"]


def test_write_card_a5(tmp_path, demo_brief):
    path = write_card(demo_brief, tmp_path / "card.pdf", page="a5")
    box = pdf_pages(path.read_bytes())[0].mediabox
    assert (float(box.width), float(box.height)) == pytest.approx(A5_PT, abs=0.01)
    assert main(["brief", "--demo", "--out", str(path), "--force", "--front-only"]) == 0
    assert len(pdf_pages(path.read_bytes())) == 1


def test_write_card_same_brief_same_bytes(tmp_path, demo_brief):
    a = write_card(demo_brief, tmp_path / "a.pdf").read_bytes()
    b = write_card(demo_brief, tmp_path / "b.pdf").read_bytes()
    assert a == b


def test_write_card_refuses_to_overwrite(tmp_path, demo_brief):
    path = tmp_path / "card.pdf"
    path.write_bytes(b"old card")
    with pytest.raises(BriefingError) as exc:
        write_card(demo_brief, path)
    assert str(exc.value) == f"cannot write {path}: the file already exists; not overwritten (overwrite it with --force)"
    assert path.read_bytes() == b"old card"
    write_card(demo_brief, path, overwrite=True)
    assert path.read_bytes() == card_pdf_bytes(demo_brief)


def test_failed_replace_keeps_the_old_card(tmp_path, demo_brief, monkeypatch):
    path = tmp_path / "card.pdf"
    path.write_bytes(b"old card")

    def broken_replace(src, dst):
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(os, "replace", broken_replace)
    with pytest.raises(BriefingError, match=re.escape(f"cannot write {path}: Input/output error")):
        write_card(demo_brief, path, overwrite=True)
    assert path.read_bytes() == b"old card"
    assert [p.name for p in tmp_path.iterdir()] == ["card.pdf"]     # no temporary file left


def test_failed_write_leaves_no_partial_file(tmp_path, demo_brief, monkeypatch):
    """The data are written to a temporary file first: a failure while writing leaves nothing."""
    real_fdopen = os.fdopen

    class FullDisk(io.RawIOBase):
        def __init__(self, fd):
            self.fh = real_fdopen(fd, "wb")

        def write(self, data):
            self.fh.write(bytes(data)[:100])
            raise OSError(28, "No space left on device")

        def close(self):
            self.fh.close()

    monkeypatch.setattr(os, "fdopen", lambda fd, mode="r": FullDisk(fd))
    path = tmp_path / "card.txt"
    with pytest.raises(BriefingError, match=re.escape(f"cannot write {path}: no space left on the device")):
        write_card(demo_brief, path)
    assert list(tmp_path.iterdir()) == []


def test_missing_directory(tmp_path, demo_brief):
    path = tmp_path / "nowhere" / "card.pdf"
    with pytest.raises(BriefingError, match=re.escape(f"cannot write {path}: no such directory")):
        write_card(demo_brief, path)


@pytest.mark.skipif(os.name != "posix" or os.geteuid() == 0, reason="permissions do not bind root")
def test_read_only_directory(tmp_path, demo_brief):
    folder = tmp_path / "ro"
    folder.mkdir()
    (folder / "card.pdf").write_bytes(b"old card")
    folder.chmod(0o500)
    try:
        with pytest.raises(BriefingError, match="permission denied"):
            write_card(demo_brief, folder / "card.pdf", overwrite=True)
        assert (folder / "card.pdf").read_bytes() == b"old card"
        assert [p.name for p in folder.iterdir()] == ["card.pdf"]
    finally:
        folder.chmod(0o700)


def test_unwritable_directory_any_user(tmp_path, demo_brief, monkeypatch):
    """As root the read-only test above cannot bind: refuse the temporary file's creation instead."""
    path = tmp_path / "card.pdf"
    path.write_bytes(b"old card")
    real_open = os.open

    def no_create(file, flags, *args, **kwargs):
        if flags & os.O_CREAT:
            raise PermissionError(13, "Permission denied")
        return real_open(file, flags, *args, **kwargs)

    monkeypatch.setattr(os, "open", no_create)
    with pytest.raises(BriefingError) as exc:
        write_card(demo_brief, path, overwrite=True)
    assert str(exc.value) == f"cannot write {path}: permission denied"
    assert path.read_bytes() == b"old card"
    assert [p.name for p in tmp_path.iterdir()] == ["card.pdf"]


def test_unwritable_target_is_a_directory(tmp_path, demo_brief):
    (tmp_path / "card.pdf").mkdir()
    with pytest.raises(BriefingError, match="it is a directory"):
        write_card(demo_brief, tmp_path / "card.pdf", overwrite=True)


def test_unknown_page_is_refused_before_writing(tmp_path, demo_brief):
    with pytest.raises(BriefingError, match="unknown page size 'b5'"):
        write_card(demo_brief, tmp_path / "card.pdf", page="b5")
    assert list(tmp_path.iterdir()) == []


def test_text_card_does_not_import_fpdf(tmp_path):
    """fpdf costs about 0.3 s to import: the text card never needs it."""
    code = ("import sys\nfrom briefer.brief import build_brief, demo_request\n"
            "from briefer.render.card import write_card\n"
            f"write_card(build_brief(demo_request()), {str(tmp_path / 'c.txt')!r})\n"
            "print('fpdf' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.strip() == "False"


# --- the command ------------------------------------------------------------------------------


def test_cli_writes_the_card_and_refuses_to_overwrite(tmp_path, capsys):
    path = tmp_path / "x.pdf"
    assert main(["brief", "--demo", "--out", str(path)]) == 0
    out, err = capsys.readouterr()
    assert f"card written to {path}" in out
    assert len(pdf_pages(path.read_bytes())) >= 2          # the front page and the detail pages
    first = path.read_bytes()
    assert main(["brief", "--demo", "--out", str(path)]) == 2
    out, err = capsys.readouterr()
    assert err.strip() == (f"briefer brief: error: cannot write {path}: the file already exists; not "
                           "overwritten (overwrite it with --force)")
    assert path.read_bytes() == first
    assert main(["brief", "--demo", "--out", str(path), "--force", "--page", "a5"]) == 0
    box = pdf_pages(path.read_bytes())[0].mediabox
    assert (float(box.width), float(box.height)) == pytest.approx(A5_PT, abs=0.01)


def test_cli_text_card(tmp_path, capsys):
    path = tmp_path / "card.txt"
    assert main(["brief", "--demo", "--out", str(path)]) == 0
    capsys.readouterr()
    text = path.read_text(encoding="utf-8")
    assert max(len(line) for line in text.splitlines()) <= 80
    assert Path(path).stat().st_size > 0
