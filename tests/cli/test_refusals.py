"""Inputs that used to crash or be answered wrongly: each is now one located message.

The expectations are the project's error contract (DESIGN.md): FILE:LINE:COLUMN field: what
is wrong; what is expected; exit 2; never a traceback.
"""

import pytest

from tests.cli.test_bad_input import LOCATED, _edit, _run, _write


def _located(lines, job):
    assert len(lines) == 1, lines
    match = LOCATED.match(lines[0])
    assert match and match["file"] == str(job), lines
    return int(match["line"]), int(match["column"]), match["rest"]


def test_nul_character_is_refused_at_its_place(tmp_path, capsys):
    """YAML 1.1 §5.1 allows no C0 control character but tab, LF and CR in a stream."""
    job = _write(tmp_path, _edit("designer: Your Name", "designer: Your\x00Name"))
    code, lines = _run(capsys, "check", job)
    assert code == 2
    line, column, rest = _located(lines, job)
    assert (line, column) == (7, 17), lines
    assert "U+0000" in rest and "control character" in rest


@pytest.mark.parametrize("written, fragment", [
    ("2026-13-45", "month must be in 1..12"),
    ("yesterday", '"yesterday" is not a date'),
    ("2026-02-30", "day is out of range for month"),
])
def test_a_date_that_is_no_date_is_bad_input(tmp_path, capsys, written, fragment):
    """ISO 8601 calendar dates YYYY-MM-DD (the Gregorian calendar has 12 months, February
    at most 29 days)."""
    job = _write(tmp_path, _edit("date: 2026-12-01", f"date: {written}"))
    code, lines = _run(capsys, "check", job)
    assert code == 2
    line, column, rest = _located(lines, job)
    assert (line, column) == (8, 9) and rest.startswith("sheet.date: "), lines
    assert fragment in rest and "YYYY-MM-DD" in rest, rest


def test_output_naming_a_folder_says_so_and_leaves_nothing(tmp_path, capsys):
    """An output path that is a folder is a usage error naming the folder, not a temporary file."""
    job = _write(tmp_path, _edit("date: 2026-12-01", "date: 2026-12-01"))
    folder = tmp_path / "out"
    folder.mkdir()
    code, lines = _run(capsys, "limits", job, "-o", folder)
    assert code == 2
    assert lines == [f"sheetgen: cannot write {folder}: it is a folder; give a file name "
                     "inside it"], lines
    assert ".part" not in lines[0]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["job.yaml", "out"]
    assert list(folder.iterdir()) == []
