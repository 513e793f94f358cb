"""The page frame prints every identity field whole: wrapped and shrunk inside its own cell,
never cut short with "…", never over a border, a caption or another field.

The frame is drawn on a canvas that only records what is drawn (strings with their font,
rectangles and lines), and the boxes are measured with reportlab's font metrics; the
PDF tests read the words back with poppler.
"""

from __future__ import annotations

from dataclasses import dataclass

import pytest
from reportlab.lib.pagesizes import A4, letter
from reportlab.pdfbase.pdfmetrics import getAscentDescent, stringWidth

from sheetgen.errors import FieldError, InputError
from sheetgen.sheet import fonts, layout
from tests.sheet.test_tools import TEMPLATES, build, need, overlapping_words, page_words

LONG = {
    "organisation": "Northern Regional Radio-Frequency Heating and Test Laboratories, Bench 4",
    "sheet_id": "TS-1356-BANDPASS-PROTOTYPE-0042",
    "title": "13.56 MHz series-tuned band-pass for the fifty-ohm heating line, second "
             "prototype with the wider copper strap and the revised trimmer mounting",
    "revision": "C.12-draft",
    "date": "2026-12-01",
    "designer": "Maximiliana Eleonora Wolkenstein-Oberhausen (RF group)",
    "checker": "Bartholomew Featherstonehaugh-Cholmondeley",
    "approver": "Dr. Anneliese Krzyżanowska-Vandersteen, Quality",
    "note": "Check the revision against the work order before use; keep with the unit.",
}
SHORT = {"organisation": "Bench", "sheet_id": "T-1", "title": "Tank", "revision": "A",
         "date": "2026-12-01", "designer": "Ann", "checker": "", "approver": "", "note": ""}


@dataclass(frozen=True)
class Box:
    x0: float
    y0: float
    x1: float
    y1: float
    text: str = ""

    def overlaps(self, other: Box) -> bool:
        return (min(self.x1, other.x1) > max(self.x0, other.x0)
                and min(self.y1, other.y1) > max(self.y0, other.y0))

    def inside(self, other: Box) -> bool:
        return (self.x0 >= other.x0 and self.x1 <= other.x1 and self.y0 >= other.y0
                and self.y1 <= other.y1)


class RecordingCanvas:
    """Just enough of a reportlab canvas for the page frame: it keeps what is drawn."""

    def __init__(self):
        self.strings: list[Box] = []
        self.sizes: list[float] = []
        self.cells: list[Box] = []
        self.rules: list[Box] = []
        self._font, self._size, self._width, self._dx, self._dy = fonts.REGULAR, 10.0, 1.0, 0, 0

    def setFont(self, font, size):
        self._font, self._size = font, size

    def setLineWidth(self, width):
        self._width = width

    def stringWidth(self, text, font, size):
        return stringWidth(text, font, size)

    def drawString(self, x, y, text):
        ascent, descent = getAscentDescent(self._font, self._size)
        x, y = x + self._dx, y + self._dy
        self.sizes.append(self._size)
        self.strings.append(Box(x, y + descent, x + stringWidth(text, self._font, self._size),
                                y + ascent, text))

    def drawRightString(self, x, y, text):
        self.drawString(x - stringWidth(text, self._font, self._size), y, text)

    def rect(self, x, y, width, height, **_):
        self.cells.append(Box(x, y, x + width, y + height))

    def line(self, x1, y1, x2, y2):  # the frame's rules are horizontal, with butt ends
        half = self._width / 2
        self.rules.append(Box(min(x1, x2), min(y1, y2) - half, max(x1, x2), max(y1, y2) + half))

    def translate(self, dx, dy):
        self._dx, self._dy = self._dx + dx, self._dy + dy

    def saveState(self):
        self._saved = (self._dx, self._dy)

    def restoreState(self):
        self._dx, self._dy = self._saved

    def getPageNumber(self):
        return 12

    def doForm(self, _name):  # the page total: "of 12" stands in for it
        self.drawString(0, 0, "12")

    def setStrokeColor(self, _color):
        pass

    setFillColor = setStrokeColor


def _drawn(fields: dict[str, str], page_size=A4) -> RecordingCanvas:
    fonts.register_fonts()
    canvas = RecordingCanvas()
    layout._draw_page_frame(canvas, layout._Identity(**fields, logo=None), page_size)
    return canvas


def _cell_of(box: Box, cells: list[Box]) -> Box | None:
    """The smallest cell holding `box` clear of its border (half the 0.6 pt line)."""
    holding = [c for c in cells if box.inside(Box(c.x0 + 0.3, c.y0 + 0.3, c.x1 - 0.3,
                                                  c.y1 - 0.3))]
    return min(holding, key=lambda c: (c.x1 - c.x0) * (c.y1 - c.y0), default=None)


@pytest.mark.parametrize("page_size", [A4, letter], ids=["A4", "Letter"])
@pytest.mark.parametrize("fields", [LONG, SHORT], ids=["long", "short"])
def test_frame_text_never_overlaps_a_border_a_rule_or_other_text(fields, page_size):
    canvas = _drawn(fields, page_size)
    strings = canvas.strings
    for index, a in enumerate(strings):
        for b in strings[index + 1:]:
            assert not a.overlaps(b), f"{a.text!r} overlaps {b.text!r}"
        for rule in canvas.rules:
            assert not a.overlaps(rule), f"{a.text!r} crosses a rule at y={rule.y0:.1f}"
        assert a.y1 <= page_size[1] - layout.MARGIN and a.x1 <= page_size[0] - layout.MARGIN
        if a.y1 < layout.MARGIN + layout.BLOCK_HEIGHT:  # in the title block: inside a cell
            assert _cell_of(a, canvas.cells) is not None, f"{a.text!r} runs over a border"


def _text_in_cell_with(canvas: RecordingCanvas, caption: str) -> str:
    """The words drawn in the cell whose caption is `caption`, read top to bottom."""
    cell = _cell_of(next(s for s in canvas.strings if s.text == caption), canvas.cells)
    inside = [s for s in canvas.strings if s.text != caption and _cell_of(s, canvas.cells) == cell]
    return " ".join(s.text for s in sorted(inside, key=lambda s: (-s.y0, s.x0)))


@pytest.mark.parametrize("caption, field", [("TITLE", "title"), ("REV.", "revision"),
                                            ("DESIGNED", "designer"), ("CHECKED", "checker"),
                                            ("APPROVED", "approver")])
def test_each_long_field_is_printed_whole_in_its_cell(caption, field):
    text = _text_in_cell_with(_drawn(LONG), caption)
    for word in ("signature", "date"):
        text = text.replace(word, "").strip()
    assert text.split() == LONG[field].split()
    assert "…" not in text


def test_a_long_sheet_id_is_printed_whole_even_when_it_must_be_cut():
    text = _text_in_cell_with(_drawn(LONG), "SHEET")
    assert text.replace(" ", "") == LONG["sheet_id"]


def test_long_text_shrinks_but_never_below_the_legible_floor():
    sizes = _drawn(LONG).sizes
    assert min(sizes) >= 5.5
    assert min(sizes) < 6.5, "the long fields were not made smaller than the captions"


def test_organisation_and_the_header_line_are_whole():
    top = A4[1] - layout.MARGIN - layout.HEADER_HEIGHT
    header = sorted((s for s in _drawn(LONG).strings if s.y0 > top), key=lambda s: -s.y0)
    left = " ".join(s.text for s in header if s.x0 < A4[0] / 2)
    right = " ".join(s.text for s in header if s.x0 >= A4[0] / 2)
    assert left.split() == LONG["organisation"].split()
    assert right.split() == f"{LONG['sheet_id']} rev {LONG['revision']} build-and-test " \
                            "sheet".split()


def test_fit_text_keeps_every_word_within_its_box():
    fonts.register_fonts()
    text = "tank coil capacitor bench trimmer winding enamel " * 3 + "Y" * 120
    lines, size = layout.fit_text(text, fonts.BOLD, 200.0, 40.0, 9.0)
    assert " ".join(lines).replace(" ", "") == text.replace(" ", "")
    assert 5.5 <= size < 9.0 and len(lines) * size * 1.18 <= 40.0
    assert all(stringWidth(line, fonts.BOLD, size) <= 200.0 for line in lines)


def test_fit_text_prefers_shrinking_to_cutting_a_word():
    fonts.register_fonts()
    word = "C.12-draft"
    width = stringWidth(word, fonts.BOLD, 7.0) + 0.1
    assert layout.fit_text(word, fonts.BOLD, width, 30.0, 9.0) == ([word], 7.0)


def test_fit_text_says_when_even_the_floor_is_too_big():
    fonts.register_fonts()
    assert layout.fit_text("word " * 200, fonts.BOLD, 200.0, 21.5, 9.0) is None


def test_frame_misfits_names_only_the_field_too_long_for_its_cell():
    texts = {"title": "a b " * 150, "revision": "B", "designer": "Ann", "note": ""}
    assert layout.frame_misfits(texts, A4) == ["title"]


def _job_with(**sheet) -> str:
    text = (TEMPLATES / "series.yaml").read_text(encoding="utf-8")
    for key, value in sheet.items():
        line = next(line for line in text.splitlines() if line.startswith(f"  {key}:"))
        text = text.replace(line, f"  {key}: {value}")
    return text


def test_a_title_too_long_even_at_the_floor_is_refused_at_its_line(tmp_path):
    from sheetgen.design.pipeline import design_from_file
    from sheetgen.sheet import render_sheet
    job = tmp_path / "job.yaml"
    job.write_text(_job_with(title="band-pass " * 40), encoding="utf-8")
    design = design_from_file(job, TEMPLATES.parent / "shared")
    with pytest.raises(InputError) as refused:
        layout.check_frame_fits(design.job, job)
    [problem] = refused.value.problems
    assert (problem.field, problem.line, problem.column) == ("sheet.title", 5, 10)
    with pytest.raises(FieldError, match="sheet.title"):
        render_sheet(design, job.read_text(encoding="utf-8"), "{}", tmp_path)


def test_the_starters_fit():
    from sheetgen.design.pipeline import design_from_file
    for name in ("series", "parallel", "toroid", "solenoid", "power-tank", "demo"):
        job = TEMPLATES / f"{name}.yaml"
        layout.check_frame_fits(design_from_file(job, TEMPLATES.parent / "shared").job, job)


@pytest.mark.pdf
def test_long_fields_read_back_whole_and_apart_from_the_pdf(tmp_path):
    need("pdftotext")
    built = build(tmp_path, _job_with(id=LONG["sheet_id"], title=LONG["title"],
                                      revision=LONG["revision"],
                                      designer=f"{LONG['designer']}\n  checker: {LONG['checker']}"
                                               f"\n  approver: {LONG['approver']}"))
    page = page_words(built.pdf_path)[0]
    block = [w for w in page.words if w.y_min > page.height - (layout.MARGIN
                                                               + layout.BLOCK_HEIGHT)]
    words = [w.text for w in sorted(block, key=lambda w: (round(w.y_min), w.x_min))]
    for field in ("title", "designer", "checker", "approver"):
        expected = LONG[field].split()
        assert all(word in words for word in expected), f"{field} is not all in the block"
    assert not any("…" in w for w in words)
    assert not overlapping_words(tuple(block))
