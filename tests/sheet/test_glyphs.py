"""Text the sheet's font cannot draw is bad input at its field, never an empty box.

Outside check: the DejaVu Sans coverage is read from the font file itself with fontTools
(a different reader from reportlab's): CJK ideographs are not in it, µ, Ω and ° are."""

from pathlib import Path

import pytest
from fontTools.ttLib import TTFont

from sheetgen.cli import main
from sheetgen.sheet import fonts
from sheetgen.sheet.glyphs import missing_glyphs

ROOT = Path(__file__).resolve().parents[2]


def _cmap() -> dict:
    return TTFont(str(fonts.font_folder() / "DejaVuSans.ttf")).getBestCmap()


@pytest.mark.parametrize("character", ["濾", "器", "µ", "Ω", "°", "±", "é", "Ж"])
def test_missing_glyphs_agree_with_the_font_file(character):
    assert (character in missing_glyphs(character)) == (ord(character) not in _cmap())


def test_a_title_in_cjk_is_bad_input_naming_the_field_and_character(tmp_path, capsys):
    text = (ROOT / "templates" / "series.yaml").read_text(encoding="utf-8")
    job = tmp_path / "job.yaml"
    title_line = next(line for line in text.splitlines() if line.strip().startswith("title:"))
    job.write_text(text.replace(title_line, "  title: 13.56 MHz 濾波器"), encoding="utf-8")
    out = tmp_path / "job.pdf"
    assert main(["build", str(job), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    line = text.splitlines().index(title_line) + 1
    assert f"{job}:{line}:10 sheet.title: '濾' (U+6FFE" in err and "no glyph" in err
    assert not out.exists()
