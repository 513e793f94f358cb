"""`sheetgen limits`: a stable machine key per row, nominals at the window's resolution,
the part windows the record uses, whether the design passed, and no limits for a design
that fails unless asked (exit 1 either way, as DESIGN.md's exit codes say)."""

import csv
import io
import math
from pathlib import Path

from sheetgen.cli import main
from sheetgen.design.pipeline import design_from_file
from sheetgen.report.procedure import procedure

ROOT = Path(__file__).resolve().parents[2]
TEMPLATES = ROOT / "templates"


def _rows(text):
    return {row["key"]: row for row in csv.DictReader(io.StringIO(text))}


def test_csv_has_keys_rounded_nominals_part_windows_and_the_verdict(capsys):
    assert main(["limits", str(TEMPLATES / "solenoid.yaml")]) == 0
    rows = _rows(capsys.readouterr().out)
    assert {"f0_hz", "bandwidth_hz", "q_loaded", "inductance_h", "capacitance_f"} <= set(rows)
    assert all(row["design_passed"] == "yes" for row in rows.values())
    resolution = design_from_file(TEMPLATES / "solenoid.yaml").assessment.resolution_hz
    for key in ("f0_hz", "bandwidth_hz", "f_low_hz", "f_high_hz"):
        nominal = float(rows[key]["nominal"])
        assert math.isclose(nominal / resolution, round(nominal / resolution), abs_tol=1e-6), (
            key, nominal)
    q = float(rows["q_loaded"]["nominal"])
    assert math.isclose(q * 10, round(q * 10), abs_tol=1e-6), q  # Q windows step 0.1
    design = design_from_file(TEMPLATES / "solenoid.yaml")
    record = {r.measurement.key: r.limits for r in procedure(design).record}
    low, high = float(rows["inductance_h"]["minimum"]), float(rows["inductance_h"]["maximum"])
    a, b = design.assessment.inductance_window
    assert low <= a and b <= high and (high - low) < 1.01 * (b - a)
    assert "and the meter" in record["inductance"]


def test_failing_design_gets_no_limits_unless_allowed(tmp_path, capsys):
    text = (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8").replace(
        "    resistance: 50 ohm\n", "    resistance: 0.1 ohm\n")
    job = tmp_path / "job.yaml"
    job.write_text(text, encoding="utf-8")
    out = tmp_path / "limits.csv"
    assert main(["limits", str(job), "-o", str(out)]) == 1
    captured = capsys.readouterr()
    assert not out.exists()
    assert "limits not written" in captured.err and "--allow-failing" in captured.err
    assert main(["limits", str(job), "--allow-failing"]) == 1
    rows = _rows(capsys.readouterr().out)
    assert rows and all(row["design_passed"] == "no" for row in rows.values())


def test_csv_numbers_carry_no_float_noise():
    """Binary floating point (IEEE 754) cannot hold 0.1 exactly: 0.1 + 0.2 is
    0.30000000000000004 and a window edge computed as 4.021e-10 can come out as
    4.0210000000000004e-10. The CSV prints the shortest text of the value rounded to 12
    significant figures; reading it back gives that rounded value (Python's float/repr
    round-trip guarantee)."""
    from sheetgen.report.results import _csv_number
    assert _csv_number(0.1 + 0.2) == "0.3"
    assert _csv_number(4.0210000000000004e-10) == "4.021e-10"
    assert _csv_number(455000.00000000006) == "455000.0"
    assert _csv_number(1.23456789012e-7) == "1.23456789012e-07"  # 12 figures kept whole
    assert _csv_number(None) == "" and _csv_number(math.nan) == ""


def test_every_starters_csv_number_has_at_most_twelve_figures(capsys):
    for starter in ("series", "parallel", "toroid", "solenoid", "power-tank", "demo"):
        main(["limits", str(TEMPLATES / f"{starter}.yaml"), "--allow-failing"])
        for row in _rows(capsys.readouterr().out).values():
            for column in ("nominal", "minimum", "maximum", "coverage"):
                if row[column]:
                    value = float(row[column])
                    assert float(f"{value:.12g}") == value, (starter, column, row[column])
                    assert repr(value) == row[column], (starter, column, row[column])


def test_limits_json_names_its_own_documented_format(capsys):
    """The limits JSON is not a results document (no resonance, stress, ...): it carries
    its own format name, and docs/results.md documents that name and its keys."""
    import json
    assert main(["limits", str(TEMPLATES / "series.yaml"), "--format", "json"]) == 0
    document = json.loads(capsys.readouterr().out)
    assert document["format"] == "sheetgen.limits/1"
    assert set(document) == {"format", "tool_version", "sheet", "design_passed", "limits"}
    docs = (ROOT / "docs" / "results.md").read_text(encoding="utf-8")
    assert "# Limits contract (`sheetgen.limits/1`)" in docs
