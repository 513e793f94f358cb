
"""A job chooses its house style: by name from the team library or the shipped templates, or
by path; an unknown name is bad input at sheet.style. Page sizes: ANSI Letter 612 × 792 pt,
ISO 216 A4 595.3 × 841.9 pt (from memory)."""

import shutil
from pathlib import Path

import pytest
from pypdf import PdfReader

from sheetgen.cli import main

pytestmark = pytest.mark.pdf

ROOT = Path(__file__).resolve().parents[2]
SERIES = (ROOT / "templates" / "series.yaml").read_text(encoding="utf-8")
DEFAULT_STYLE = (ROOT / "templates" / "style-default.yaml").read_text(encoding="utf-8")


def _job(folder: Path, style_line: str) -> Path:
    job = folder / "job.yaml"
    job.write_text(SERIES.replace("  date: 2026-12-01", f"  date: 2026-12-01\n  {style_line}"),
                   encoding="utf-8")
    return job


def _letter_style(path: Path, organisation: str) -> None:
    path.write_text(DEFAULT_STYLE.replace("Tuned Circuits Bench", organisation)
                    .replace("page_size: A4 ", "page_size: Letter"), encoding="utf-8")


def _media_and_text(pdf: Path) -> tuple[list[float], str]:
    reader = PdfReader(pdf)
    return [float(v) for v in reader.pages[0].mediabox], reader.pages[0].extract_text()


def test_style_by_name_from_the_team_library(tmp_path, capsys):
    team = tmp_path / "shared"
    team.mkdir()
    for name in ("cores.yaml", "materials.yaml"):
        shutil.copy(ROOT / "shared" / name, team)
    _letter_style(team / "style-shop.yaml", "Example Radio Works")
    out = tmp_path / "out.pdf"
    assert main(["build", str(_job(tmp_path, "style: shop")), "-o", str(out)]) == 0
    media, text = _media_and_text(out)
    assert media == [0.0, 0.0, 612.0, 792.0] and "Example Radio Works" in text


def test_style_by_path_and_unknown_name(tmp_path, capsys):
    _letter_style(tmp_path / "mine.yaml", "Bench Nine")
    out = tmp_path / "out.pdf"
    assert main(["build", str(_job(tmp_path, "style: mine.yaml")), "-o", str(out)]) == 0
    assert "Bench Nine" in _media_and_text(out)[1]
    out.unlink()
    capsys.readouterr()
    assert main(["build", str(_job(tmp_path, "style: nowhere")), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert f"{tmp_path / 'job.yaml'}:9:10 sheet.style: no house style named 'nowhere'" in err
    assert not out.exists()


def test_a_toroid_job_beside_a_team_style_file_builds(tmp_path, capsys):
    """The parts library loader reads the team folder's parts files, not the house styles
    kept beside them (this failed with `organisation: unknown key`, exit 2)."""
    team = tmp_path / "shared"
    team.mkdir()
    for name in ("cores.yaml", "materials.yaml"):
        shutil.copy(ROOT / "shared" / name, team)
    _letter_style(team / "style-shop.yaml", "Example Radio Works")
    toroid = (ROOT / "templates" / "toroid.yaml").read_text(encoding="utf-8")
    job = tmp_path / "job.yaml"
    job.write_text(toroid.replace("  date: 2026-12-01", "  date: 2026-12-01\n  style: shop"),
                   encoding="utf-8")
    assert "style: shop" in job.read_text(encoding="utf-8")
    out = tmp_path / "out.pdf"
    assert main(["check", str(job)]) == 0, capsys.readouterr().err
    assert main(["build", str(job), "-o", str(out)]) == 0, capsys.readouterr().err
    assert "Example Radio Works" in _media_and_text(out)[1]
