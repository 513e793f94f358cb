"""Inputs that used to crash or be answered wrongly: each is now one located message.

The expectations are the project's error contract (DESIGN.md): FILE:LINE:COLUMN field: what
is wrong; what is expected; exit 2; never a traceback.
"""

import pytest

from tests.cli.test_bad_input import GOOD, LOCATED, TEMPLATES, _edit, _run, _write


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


TOROID = (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8")


@pytest.mark.parametrize("text, field, line, fragment", [
    (_edit("  esr: 0.05 ohm", "  esr: 0.05 ohm\n  tolerance: 100 %"), "capacitor.tolerance", 22,
     '"100 %" must be below 100 %'),
    (_edit("  esr: 0.05 ohm", "  esr: 0.05 ohm\n  tolerance: 150 %"), "capacitor.tolerance", 22,
     "must be below 100 %"),
    (GOOD + "ratings:\n  voltage_derating: 200 %\n", "ratings.voltage_derating", 33,
     '"200 %" must be at most 100 %'),
    (GOOD + "ratings:\n  current_derating: 0 %\n", "ratings.current_derating", 33,
     "must be greater than 0"),
    (TOROID.replace("lead_length: 30 mm", "lead_length: 5 m"), "inductor.lead_length", 21,
     '"5 m" must be at most 300 mm'),
], ids=["tolerance 100 %", "tolerance 150 %", "derating 200 %", "derating 0 %", "lead 5 m"])
def test_out_of_range_value_is_reported_at_its_own_field(tmp_path, capsys, text, field, line,
                                                         fragment):
    """A tolerance of ±100 % lets a part be zero (a spread must stay below it); a derating
    is a share of the rating, in (0, 100 %]; a lead is centimetres (common practice)."""
    job = _write(tmp_path, text)
    code, lines = _run(capsys, "check", job)
    assert code == 2, lines
    row, _, rest = _located(lines, job)
    assert row == line and rest.startswith(f"{field}: ") and fragment in rest, lines


def test_tolerance_too_wide_for_a_normal_band_is_reported_at_the_tolerance(tmp_path, capsys):
    """A band read as normal is ±3σ; the engine takes at most ±50 % (σ ≈ 16.7 %, zero 6σ
    away, about 1e-9 of draws; engine/variation.py Spread). ±60 % is refused at the
    tolerance the user wrote, not at the variation section."""
    text = _edit("  esr: 0.05 ohm", "  esr: 0.05 ohm\n  tolerance: 60 %") + (
        "variation:\n  distribution: normal\n")
    job = _write(tmp_path, text)
    code, lines = _run(capsys, "check", job)
    assert code == 2
    row, column, rest = _located(lines, job)
    assert (row, column) == (22, 14) and rest.startswith("capacitor.tolerance: "), lines
    assert "50 %" in rest and "normal" in rest
