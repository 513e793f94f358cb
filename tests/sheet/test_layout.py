"""Layout under stress: long titles and notes, many parts, Letter paper, chosen sections.

Read back with poppler (pdftotext -bbox for word boxes) and pypdf; page sizes from
ISO 216 (A4, 210 × 297 mm) and ANSI/ASME Y14.1 (Letter, 8.5 × 11 in).
"""

from __future__ import annotations

import io
import re

import pytest
from pypdf import PdfReader

from sheetgen.design.pipeline import design_from_file
from sheetgen.inputs.style import style_from_text
from sheetgen.report.parts import PartRow
from sheetgen.report.results import results_json
from sheetgen.sheet import render_sheet, sections
from tests.sheet.test_tools import (
    LETTER_PT,
    SHARED,
    TEMPLATES,
    body_text,
    build,
    need,
    overlapping_words,
    page_count,
    page_text,
    page_words,
    words_outside,
)
from tests.support import assert_close

pytestmark = pytest.mark.pdf

MARGIN_PT = 14 / 25.4 * 72 - 1.0
WORDS = ("tank coil capacitor bench trimmer winding enamel ferrite powder-iron ring former "
         "lead solder varnish screen enclosure probe generator receiver sweep").split()


def _words(count: int, seed: int) -> str:
    return " ".join(WORDS[(seed * 7 + i * 3) % len(WORDS)] for i in range(count))


def _job_with(replacements: dict[str, str]) -> str:
    text = (TEMPLATES / "series.yaml").read_text(encoding="utf-8")
    for old, new in replacements.items():
        assert old in text
        text = text.replace(old, new)
    return text


def _assert_clean(pdf_path):
    for number, page in enumerate(page_words(pdf_path), 1):
        outside = words_outside(page, MARGIN_PT)
        assert not outside, f"page {number}: text in the margin: {outside[:5]}"
        overlaps = overlapping_words(page.words)
        assert not overlaps, f"page {number}: overlapping words: {overlaps[:5]}"


def _render(job_path, style_text: str | None = None, **replace_rows) -> bytes:
    d = design_from_file(job_path, SHARED)
    style = style_from_text(style_text, "style.yaml", job_path.parent) if style_text else None
    return render_sheet(d, job_text=job_path.read_text(encoding="utf-8"),
                        results_text=results_json(d), job_dir=job_path.parent, style=style)


def test_long_title_names_and_notes_wrap_and_continue(tmp_path):
    need("pdftotext")
    # as long as the title block can print whole, with one unbreakable 60-letter token
    title = _words(8, 1) + " " + "X" * 60
    notes = "\n\n".join(_words(160, n) for n in range(12))
    designer = "A. " + _words(10, 3)
    job = _job_with({
        "title: 13.56 MHz series-tuned band-pass, 50 Ω line": f"title: {title}",
        "designer: Your Name": f"designer: {designer}\n  checker: C. {_words(10, 4)}\n"
                               f"  approver: D. {_words(10, 5)}\n  notes: |\n"
                               + "\n".join("    " + line if line else "" for line in
                                           notes.splitlines()),
    })
    built = build(tmp_path, job)
    text = body_text(built.pdf_path)
    assert _words(8, 1) in text, "the whole title is printed in the body"
    for paragraph in notes.split("\n\n"):
        assert paragraph in text, "every paragraph of the notes is printed"
    assert page_count(built.pdf_path) >= 6
    _assert_clean(built.pdf_path)


def test_many_parts_continue_on_a_new_page(tmp_path, monkeypatch):
    need("pdftotext")
    job = tmp_path / "job.yaml"
    job.write_text((TEMPLATES / "series.yaml").read_text(encoding="utf-8"), encoding="utf-8")
    parts = [PartRow(f"X{i}", "Resistor", f"{i}.00 kΩ", notes=_words(12, i)) for i in range(1, 151)]
    monkeypatch.setattr(sections, "part_rows", lambda _design: parts)
    pdf = tmp_path / "many.pdf"
    pdf.write_bytes(_render(job))
    text = body_text(pdf)
    for i in (1, 75, 100, 150):
        assert f"X{i} Resistor {i}.00 kΩ" in text
    pages_with_header = [n for n in range(1, page_count(pdf) + 1)
                         if "Tolerance" in page_text(pdf, n) and "Qty" in page_text(pdf, n)]
    assert len(pages_with_header) >= 3, "the parts list's header repeats on each page it spans"
    _assert_clean(pdf)


def test_letter_paper(tmp_path):
    need("pdftotext")
    job = tmp_path / "job.yaml"
    job.write_text((TEMPLATES / "demo.yaml").read_text(encoding="utf-8"), encoding="utf-8")
    pdf = tmp_path / "letter.pdf"
    pdf.write_bytes(_render(job, "organisation: Letter Works\npage_size: Letter\n"))
    for page in PdfReader(io.BytesIO(pdf.read_bytes())).pages:
        assert_close(float(page.mediabox.width), LETTER_PT[0], abs=0.01, what="Letter width, pt")
        assert_close(float(page.mediabox.height), LETTER_PT[1], abs=0.01,
                     what="Letter height, pt")
    assert "Letter Works" in page_text(pdf, 1)
    _assert_clean(pdf)


def test_sections_chosen_by_the_style(tmp_path):
    need("pdftotext")
    job = tmp_path / "job.yaml"
    job.write_text((TEMPLATES / "demo.yaml").read_text(encoding="utf-8"), encoding="utf-8")
    pdf = tmp_path / "short.pdf"
    pdf.write_bytes(_render(job, "organisation: Short Works\nsections: [parts, record]\n"))
    text = page_text(pdf)
    assert "1 Parts list" in text and "2 Test record" in text
    for absent in ("Schematic", "Expected performance", "Response against frequency",
                   "Test procedure"):
        assert absent not in text
    assert sorted(PdfReader(io.BytesIO(pdf.read_bytes())).get_fields())  # the form is there


def _body_lines(pdf_path, page):
    """The non-empty text lines of one page between its header and its title block."""
    import subprocess

    from tests.sheet.test_tools import need
    info = subprocess.run([need("pdfinfo"), "-f", str(page), "-l", str(page), str(pdf_path)],
                          capture_output=True, text=True, check=True).stdout
    width, height = map(float, re.search(r"Page\s+\d+ size:\s+([\d.]+) x ([\d.]+)",
                                         info).groups())
    top, bottom = 0.085 * height, 0.845 * height
    out = subprocess.run([need("pdftotext"), "-layout", "-enc", "UTF-8", "-f", str(page), "-l",
                          str(page), "-x", "0", "-y", str(int(top)), "-W", str(int(width)),
                          "-H", str(int(bottom - top)), str(pdf_path), "-"],
                         capture_output=True, check=True).stdout.decode("utf-8")
    return [line.strip() for line in out.splitlines() if line.strip()]


@pytest.mark.parametrize("name", ["series", "parallel", "toroid", "solenoid", "power-tank",
                                  "demo"])
def test_no_heading_ends_a_page_and_no_page_is_nearly_empty(tmp_path, name):
    """Read as laid out by poppler: a section heading ("3 Parts list") is never the last
    line of its page, and no page after the first holds only a line or two."""
    from tests.sheet.test_tools import page_count
    built = build(tmp_path, (TEMPLATES / f"{name}.yaml").read_text(encoding="utf-8"), name)
    heading = re.compile(r"^\d{1,2}\s+[A-Z][A-Za-z ()−-]+$")
    for page in range(1, page_count(built.pdf_path) + 1):
        lines = _body_lines(built.pdf_path, page)
        assert lines, f"{name} page {page} is empty"
        assert not heading.match(lines[-1]), f"{name} page {page} ends with {lines[-1]!r}"
        if page > 1:
            assert len(lines) > 3, f"{name} page {page} holds only {lines}"
