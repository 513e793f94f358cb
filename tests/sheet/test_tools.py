"""Helpers for the sheet tests (no tests here): build sheets through the CLI, read PDFs.

Nothing here knows how the sheet is laid out: text and word boxes come from poppler's
pdftotext, attachments, fields and metadata from pypdf.
"""

from __future__ import annotations

import html
import json
import re
import shutil
import subprocess
from dataclasses import dataclass
from pathlib import Path

import pytest

from sheetgen.cli import main

REPO = Path(__file__).resolve().parents[2]
TEMPLATES = REPO / "templates"
SHARED = REPO / "shared"  # the parts library the starters name
# ISO 216 A4 is 210 mm × 297 mm; ANSI Letter is 8.5 in × 11 in; 1 pt = 1/72 in (from memory).
A4_PT = (210 / 25.4 * 72, 297 / 25.4 * 72)
LETTER_PT = (8.5 * 72, 11 * 72)


@dataclass(frozen=True)
class Built:
    """A sheet built by `sheetgen build`, with the results it wrote and the job it read."""

    pdf_path: Path
    pdf: bytes
    job_text: str
    results_text: str
    results: dict


def build(tmp_path: Path, job_text: str, name: str = "job") -> Built:
    """Write `job_text` to tmp_path, run `sheetgen build` on it, return what it wrote."""
    tmp_path.mkdir(parents=True, exist_ok=True)
    job = tmp_path / f"{name}.yaml"
    job.write_text(job_text, encoding="utf-8")
    pdf, results = tmp_path / f"{name}.pdf", tmp_path / f"{name}.json"
    code = main(["build", str(job), "-o", str(pdf), "--results", str(results)])
    assert code in (0, 1), f"sheetgen build exited {code}"
    text = results.read_text(encoding="utf-8")
    return Built(pdf, pdf.read_bytes(), job_text, text, json.loads(text))


def need(tool: str) -> str:
    path = shutil.which(tool)
    if path is None:
        pytest.skip(f"{tool} is not installed (Debian: apt-get install "
                    f"{'qpdf' if tool == 'qpdf' else 'poppler-utils'})")
    return path


def page_count(pdf_path: Path) -> int:
    info = subprocess.run([need("pdfinfo"), str(pdf_path)], capture_output=True, text=True,
                          check=True).stdout
    return int(re.search(r"^Pages:\s+(\d+)", info, re.M).group(1))


def page_text(pdf_path: Path, page: int | None = None) -> str:
    """poppler's text of one page (or all), whitespace collapsed to single spaces."""
    command = [need("pdftotext"), "-enc", "UTF-8"]
    if page is not None:
        command += ["-f", str(page), "-l", str(page)]
    out = subprocess.run(command + [str(pdf_path), "-"], capture_output=True, check=True).stdout
    return " ".join(out.decode("utf-8").split())


def body_text(pdf_path: Path) -> str:
    """The text of every page without the page frame: each page cropped to the band between
    its header (top 8.5 %) and its title block (bottom 15.5 %), pages joined, whitespace
    collapsed, so text that runs on over a page break reads as one."""
    pages = []
    for page in range(1, page_count(pdf_path) + 1):
        info = subprocess.run([need("pdfinfo"), "-f", str(page), "-l", str(page),
                               str(pdf_path)], capture_output=True, text=True, check=True).stdout
        width, height = map(float, re.search(r"Page\s+\d+ size:\s+([\d.]+) x ([\d.]+)",
                                             info).groups())
        top, bottom = 0.085 * height, 0.845 * height
        out = subprocess.run([need("pdftotext"), "-enc", "UTF-8", "-f", str(page), "-l",
                              str(page), "-x", "0", "-y", str(int(top)), "-W", str(int(width)),
                              "-H", str(int(bottom - top)), str(pdf_path), "-"],
                             capture_output=True, check=True).stdout
        pages.append(out.decode("utf-8"))
    return " ".join(" ".join(pages).split())


@dataclass(frozen=True)
class Word:
    x_min: float
    y_min: float
    x_max: float
    y_max: float
    text: str


@dataclass(frozen=True)
class PageWords:
    width: float
    height: float
    words: tuple[Word, ...]


def page_words(pdf_path: Path) -> list[PageWords]:
    """Every word's box on every page (pdftotext -bbox; y grows downwards)."""
    out = subprocess.run([need("pdftotext"), "-bbox", str(pdf_path), "-"], capture_output=True,
                         check=True).stdout.decode("utf-8")
    pages = []
    for page in re.finditer(r'<page width="([\d.]+)" height="([\d.]+)">(.*?)</page>', out, re.S):
        words = tuple(
            Word(float(a), float(b), float(c), float(d), html.unescape(t))
            for a, b, c, d, t in re.findall(r'<word xMin="([\d.]+)" yMin="([\d.]+)" '
                                            r'xMax="([\d.]+)" yMax="([\d.]+)">(.*?)</word>',
                                            page.group(3)))
        pages.append(PageWords(float(page.group(1)), float(page.group(2)), words))
    return pages


def overlapping_words(words: tuple[Word, ...], share: float = 0.1) -> list[tuple[Word, Word]]:
    """Pairs of words whose boxes overlap by more than `share` of the smaller box."""
    found = []
    ordered = sorted(words, key=lambda w: w.x_min)
    for index, a in enumerate(ordered):
        for b in ordered[index + 1:]:
            if b.x_min >= a.x_max:
                break
            dx = min(a.x_max, b.x_max) - max(a.x_min, b.x_min)
            dy = min(a.y_max, b.y_max) - max(a.y_min, b.y_min)
            if dx > 0 and dy > 0:
                smaller = min((a.x_max - a.x_min) * (a.y_max - a.y_min),
                              (b.x_max - b.x_min) * (b.y_max - b.y_min))
                if dx * dy > share * smaller:
                    found.append((a, b))
    return found


def words_outside(page: PageWords, margin_pt: float) -> list[Word]:
    """Words that reach into the page's margin (or off the page)."""
    return [w for w in page.words
            if w.x_min < margin_pt or w.y_min < margin_pt or w.x_max > page.width - margin_pt
            or w.y_max > page.height - margin_pt]
