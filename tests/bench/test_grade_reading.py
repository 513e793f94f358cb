"""Grading reads the bench right: typed values checked against each other, the
technician's own ticks kept.

Reproductions (each was a plain PASS before): a bandwidth that is not f_high − f_low, a
loaded Q that is not f0 / bandwidth, and a tick of the technician that the computed
verdict overwrote without a word. The demo sheet's windows are read back with poppler
(tests/bench/test_grade.printed_windows); the arithmetic is written here, and the loaded
Q of a resonance is f0 / bandwidth (IEEE Std 100, "quality factor"; from memory). The
bench reads a frequency to one sweep step, the sheet's limits.sweep_step_hz (1 kHz on the
demo, as the sheet's procedure prints it).
"""

from __future__ import annotations

import csv
import json
from decimal import Decimal
from pathlib import Path

import pytest

from sheetgen.cli import main
from tests.bench.test_grade import IDENTITY, build_sheet, fill, printed_windows

pikepdf = pytest.importorskip("pikepdf")
pytestmark = pytest.mark.pdf


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    pdf = build_sheet(tmp_path_factory.mktemp("reading"), "demo")
    windows = printed_windows(pdf)
    # printed to the windows' 1 kHz resolution, no finer (issue 21)
    assert windows["measured.f_low_hz"] == ("7.009", "7.043", "MHz")
    assert windows["measured.f_high_hz"] == ("7.159", "7.193", "MHz")
    assert windows["measured.bandwidth_hz"] == ("136", "163", "kHz")
    assert windows["measured.q_loaded"] == ("43.60", "52.10", "")
    return pdf


PARTS = {"measured.inductance_h": "2.3 uH", "measured.capacitance_f": "195 pF"}


def _grade(pdf: Path, values: dict[str, str], tmp_path: Path, capsys, ticks=None):
    filled = fill(pdf, {**PARTS, **IDENTITY, **values}, tmp_path / "filled.pdf")
    if ticks:
        filled = tick(filled, ticks, tmp_path / "ticked.pdf")
    record, log = tmp_path / "record.json", tmp_path / "record.csv"
    capsys.readouterr()
    code = main(["grade", str(filled), "--json", str(record), "--csv", str(log)])
    out = capsys.readouterr().out
    (row,) = csv.DictReader(log.read_text(encoding="utf-8").splitlines())
    return code, out, json.loads(record.read_text(encoding="utf-8")), row


def tick(pdf: Path, states: dict[str, str], out: Path) -> Path:
    """Tick radio groups as a viewer does (ISO 32000-1 12.7.4.2.4): the group's /V names the
    state, each kid's /AS is that state where it has one, else /Off."""
    with pikepdf.open(pdf) as doc:
        for field in doc.Root.AcroForm.Fields:
            name = str(field.get("/T", ""))
            if name not in states:
                continue
            state = pikepdf.Name("/" + states[name])
            field.V = state
            for kid in field.get("/Kids", []):
                kid.AS = state if state in kid.AP.N.keys() else pikepdf.Name("/Off")
        doc.save(out)
    return out


CONSISTENT = {"measured.f0_hz": "7.1 MHz", "measured.f_low_hz": "7.0185 MHz",
              "measured.f_high_hz": "7.1815 MHz", "measured.bandwidth_hz": "163 kHz",
              "measured.q_loaded": "43.6"}


def test_a_consistent_record_passes(demo, tmp_path, capsys):
    # 7.1815 − 7.0185 MHz = 163 kHz; 7100 / 163 = 43.56, typed 43.6
    code, out, record, _ = _grade(demo, CONSISTENT, tmp_path, capsys)
    assert code == 0 and record["verdict"] == "pass" and record["consistency"] == []
    assert record["resolution_hz"] == 1000.0


def test_a_bandwidth_that_is_not_f_high_minus_f_low_is_flagged(demo, tmp_path, capsys):
    """Every value inside its window, but 7.159 − 7.042 MHz = 117 kHz, not the 163 kHz typed:
    46 kHz apart, beyond the 3 kHz that three readings to ±1 kHz explain."""
    values = {**CONSISTENT, "measured.f_low_hz": "7.042 MHz", "measured.f_high_hz": "7.159 MHz"}
    code, out, record, row = _grade(demo, values, tmp_path, capsys)
    assert all(v["verdict"] == "pass" for v in record["values"] if v["field"] in values)
    assert code == 1 and record["verdict"] == "inconsistent"
    (finding,) = [f for f in record["consistency"] if f["quantity"] == "bandwidth_hz"]
    assert finding["implied"] == pytest.approx(117e3, abs=1e-3)
    assert finding["stated"] == 163e3 and finding["allowed"] == 3e3
    assert "bandwidth_hz typed 163.00 kHz, but f_high − f_low gives 117.00 kHz" in out
    assert "frequencies read to ±1.000 kHz" in out and "Overall: INCONSISTENT" in out
    assert row["verdict"] == "inconsistent" and "f_high − f_low" in row["consistency"]


def test_a_q_that_is_not_f0_over_bandwidth_is_flagged(demo, tmp_path, capsys):
    """Q 52.1 (inside its window) with 7.1 MHz / 163 kHz = 43.56: 8.5 apart, beyond the
    43.56 × (2/163 + 1/7100 + 0.005) = 0.76 that the readings explain."""
    code, out, record, _ = _grade(demo, {**CONSISTENT, "measured.q_loaded": "52.1"},
                                  tmp_path, capsys)
    assert code == 1 and record["verdict"] == "inconsistent"
    (finding,) = record["consistency"]
    assert finding["quantity"] == "q_loaded"
    assert finding["implied"] == pytest.approx(7.1e6 / 163e3, rel=1e-12)
    assert finding["allowed"] == pytest.approx(7.1e6 / 163e3 * (2 / 163 + 1 / 7100 + 0.005),
                                               rel=1e-9)


def test_the_technicians_ticks_are_kept_and_disagreements_shown(demo, tmp_path, capsys):
    """f0 typed inside its window but ticked FAIL; the overall ticked FAIL on a passing unit."""
    code, out, record, row = _grade(demo, CONSISTENT, tmp_path, capsys,
                                    ticks={"verdict.f0": "fail", "verdict.bandwidth": "pass",
                                           "verdict.overall": "fail"})
    assert code == 0 and record["verdict"] == "pass"
    values = {v["field"]: v for v in record["values"]}
    assert values["measured.f0_hz"]["ticked"] == "fail"
    assert values["measured.f0_hz"]["tick_agrees"] is False
    assert values["measured.bandwidth_hz"]["ticked"] == "pass"
    assert values["measured.bandwidth_hz"]["tick_agrees"] is True
    assert values["measured.f_low_hz"]["ticked"] is None
    assert record["ticked_verdict"] == "fail"
    assert record["disagreements"] == ["verdict.f0", "verdict.overall"]
    assert "f0_hz: the technician ticked FAIL, graded PASS" in out
    assert "Overall: PASS (technician ticked FAIL)" in out
    assert row["measured.f0_hz.ticked"] == "fail" and row["ticked_verdict"] == "fail"
    assert row["disagreements"] == "verdict.f0 verdict.overall"


def test_an_older_log_gets_lines_of_its_own_columns(demo, tmp_path, capsys):
    """A log begun before the added columns keeps its header; its new lines match it."""
    from sheetgen.bench.record import CSV_HEADER, FIRST_HEADER
    log = tmp_path / "log.csv"
    old_header = ",".join(FIRST_HEADER) + "\n"
    log.write_text(old_header, encoding="utf-8")
    filled = fill(demo, {**PARTS, **IDENTITY, **CONSISTENT}, tmp_path / "filled.pdf")
    assert main(["grade", str(filled), "--append", str(log)]) == 0
    lines = list(csv.reader(log.read_text(encoding="utf-8").splitlines()))
    assert len(lines) == 2 and len(lines[1]) == len(FIRST_HEADER) < len(CSV_HEADER)
    assert dict(zip(lines[0], lines[1]))["verdict"] == "pass"
    assert Decimal(dict(zip(lines[0], lines[1]))["measured.f0_hz"]) == Decimal("7100000.0")
