"""Grading measured sweeps synthesised by ngspice against the sheet's windows.

Source: ngspice (tests/spice.py, `ac lin` written with `wrdata`) simulating the circuit as
designed — the components the sheet's attached results give (L with its loss resistance,
C with its ESR, source and load resistance) — over the sweep the sheet prescribes (start,
stop and step from the bench procedure). Files are written as Touchstone by scikit-rf
(`Network.write_touchstone`) or as CSV. The same circuit detuned by twice the f0 window's
width (C scaled by (f0 / (f0 + 2·width))², from f0 = 1/(2π√(LC))) must fail.

- Series starter in its 50 Ω line: the loop driven through Rs = 50 Ω into RL = 50 Ω is the
  through fixture, S21 = 2·V(RL)/Vs = 2·RL·I for a 1 V source, S11 = (Zin − 50)/(Zin + 50)
  (standard definitions for equal 50 Ω references; from memory).
- Parallel starter: the tank (L + rL) ∥ (C + rC) ∥ RL fed from 1 V through Rs; the response
  is V(tank)/V(source), written as CSV in dB with phase.
"""

from __future__ import annotations

import functools
import json
import math
import re
import shutil
import subprocess

import numpy as np
import pytest

from sheetgen.bench.grade import bandwidth_resolution_hz, grade_sheet
from sheetgen.bench.sheet_file import read_sheet
from sheetgen.cli import main
from sheetgen.design.pipeline import design_from_file
from sheetgen.report.procedure import procedure
from tests import spice
from tests.bench.test_grade import IDENTITY, REPO, build_sheet, fill, fonts_not_embedded

pytestmark = [pytest.mark.ngspice, pytest.mark.pdf]
Z0_OHM = 50.0


@functools.cache
def _sheet(folder, starter):
    pdf = build_sheet(folder, starter)
    return pdf, read_sheet(pdf).results


@pytest.fixture(scope="module")
def root(tmp_path_factory):
    return tmp_path_factory.mktemp("gradesweep")


def _window(results, quantity):
    row = next(v for v in results["test_record"]["values"] if v["quantity"] == quantity)
    return row["min"], row["max"]


def _simulate(results, start_hz, stop_hz, step_hz, capacitance_scale=1.0):
    """ngspice's complex response and port impedance of the designed circuit."""
    c = results["components"]
    values = dict(inductance_h=c["inductance_h"],
                  inductor_resistance_ohm=c["inductor_resistance_ohm"],
                  capacitance_f=c["capacitance_f"] * capacitance_scale,
                  capacitor_esr_ohm=c["capacitor_esr_ohm"],
                  source_resistance_ohm=c["source_resistance_ohm"],
                  load_resistance_ohm=c["load_resistance_ohm"])
    build = spice.series_netlist if results["topology"] == "series" else spice.parallel_netlist
    bench = build(**values)
    points = int(round((stop_hz - start_hz) / step_hz)) + 1
    data = spice.ac_sweep(bench.body, spice.Sweep("lin", points, start_hz,
                                                  start_hz + (points - 1) * step_hz), {
        "rre": f"real({bench.response})", "rim": f"imag({bench.response})",
        "vre": f"real({bench.port_voltage})", "vim": f"imag({bench.port_voltage})",
        "ire": f"real({bench.port_current})", "iim": f"imag({bench.port_current})"})
    v = data.vectors
    response = v["rre"] + 1j * v["rim"]
    impedance = (v["vre"] + 1j * v["vim"]) / (v["ire"] + 1j * v["iim"])
    return data.frequency_hz, response, impedance, c["load_resistance_ohm"]


def _touchstone(path, frequency_hz, current, impedance, load_ohm):
    import skrf
    s = np.empty((frequency_hz.size, 2, 2), dtype=complex)
    s[:, 1, 0] = s[:, 0, 1] = 2.0 * load_ohm * current
    s[:, 0, 0] = s[:, 1, 1] = (impedance - Z0_OHM) / (impedance + Z0_OHM)
    network = skrf.Network(frequency=skrf.Frequency.from_f(frequency_hz, unit="hz"), s=s)
    network.write_touchstone(str(path.with_suffix("")))
    return path.with_suffix(".s2p")


def _csv(path, frequency_hz, response):
    rows = ["frequency (Hz),magnitude (dB),phase (deg)"]
    rows += [f"{f!r},{20 * math.log10(abs(r))!r},{math.degrees(np.angle(r))!r}"
             for f, r in zip(frequency_hz.tolist(), response.tolist())]
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


def _sheet_sweep(starter):
    sweep = procedure(design_from_file(REPO / "templates" / f"{starter}.yaml", None)).sweep
    return sweep.start_hz, sweep.stop_hz, sweep.step_hz


def _record(path):
    return json.loads(path.read_text(encoding="utf-8"))


def test_parallel_csv_over_the_sheets_sweep_passes(root, tmp_path, capsys):
    pdf, results = _sheet(root, "parallel")
    frequency_hz, response, _, _ = _simulate(results, *_sheet_sweep("parallel"))
    sweep = _csv(tmp_path / "tank.csv", frequency_hz, response)
    filled = fill(pdf, IDENTITY, tmp_path / "filled.pdf")
    record = tmp_path / "r.json"
    code = main(["grade", str(filled), "--sweep", str(sweep), "--json", str(record)])
    data = _record(record)
    assert code == 1  # the parts were not measured: incomplete, yet every sweep figure passes
    got = {v["field"]: v for v in data["values"]}
    for field in ("measured.f0_hz", "measured.f_low_hz", "measured.f_high_hz",
                  "measured.bandwidth_hz", "measured.q_loaded"):
        assert got[field]["verdict"] == "pass", got[field]
        assert got[field]["typed"].startswith("sweep: ")
    assert data["verdict"] == "incomplete" and data["unit"]["serial"] == "SN-0042"
    # the f0 reported is ngspice's response maximum to within a step of the sheet's sweep
    top = float(frequency_hz[int(np.argmax(np.abs(response)))])
    assert abs(got["measured.f0_hz"]["measured"] - top) <= _sheet_sweep("parallel")[2]
    assert "Overall: INCOMPLETE" in capsys.readouterr().out


def test_parallel_detuned_by_twice_the_f0_window_fails(root, tmp_path):
    pdf, results = _sheet(root, "parallel")
    low, high = _window(results, "f0_hz")
    f0 = results["resonance"]["f_peak_hz"]
    detuned = f0 + 2.0 * (high - low)
    _, _, step = _sheet_sweep("parallel")
    bandwidth = results["resonance"]["bandwidth_hz"]
    frequency_hz, response, _, _ = _simulate(results, detuned - 6 * bandwidth,
                                             detuned + 6 * bandwidth, step,
                                             capacitance_scale=(f0 / detuned) ** 2)
    sweep = _csv(tmp_path / "detuned.csv", frequency_hz, response)
    grading = _grade(pdf, sweep)
    verdicts = {v.field: v.verdict for v in grading.as_left}
    assert verdicts["measured.f0_hz"] == "fail" and grading.verdict == "fail"


def _grade(pdf, sweep_path):
    from sheetgen.bench.sweep import sweep_features
    from sheetgen.bench.sweep_files import read_sweep
    sheet = read_sheet(pdf)
    features = sweep_features(read_sweep(sweep_path), bandwidth_resolution_hz(sheet.results))
    return grade_sheet(sheet, features, str(sweep_path))


def _series_fine(results):
    """f_peak ± 3 bandwidths in steps of a quarter of the bandwidth window's width."""
    low, high = _window(results, "bandwidth_hz")
    f0, bandwidth = results["resonance"]["f_peak_hz"], results["resonance"]["bandwidth_hz"]
    return f0 - 3 * bandwidth, f0 + 3 * bandwidth, (high - low) / 4


def _fitted_pf(results) -> str:
    """The fixed capacitors as fitted (the parts list's value), typed as a meter shows it."""
    return f"{results['components']['capacitor_build']['fixed_total_f'] * 1e12:.2f} pF"


def test_series_touchstone_passes_and_the_report_is_written(root, tmp_path, capsys):
    pdf, results = _sheet(root, "series")
    frequency_hz, current, impedance, load = _simulate(results, *_series_fine(results))
    sweep = _touchstone(tmp_path / "unit.s2p", frequency_hz, current, impedance, load)
    # the starter's coil is ±5 %: L has a window now, so the record needs its reading
    inductance = f"{results['components']['inductance_h'] * 1e6:.3f} µH"
    values = {"measured.capacitance_f": _fitted_pf(results),
              "measured.inductance_h": inductance, **IDENTITY}
    filled = fill(pdf, values, tmp_path / "filled.pdf")
    report = tmp_path / "report.pdf"
    assert main(["grade", str(filled), "--sweep", str(sweep), "-o", str(report)]) == 0
    out = capsys.readouterr().out
    assert "Overall: PASS" in out
    if shutil.which("pdftotext"):
        text = " ".join(subprocess.run(["pdftotext", str(report), "-"], capture_output=True,
                                       text=True, check=True).stdout.split())
        assert "TS-1356" in text and "SN-0042" in text and "Verdicts" in text
        from sheetgen.quantities import format_quantity
        low, high = _window(results, "f0_hz")
        assert f"f0 min {format_quantity(low, 'Hz', 6)}" in text
        assert f"f0 max {format_quantity(high, 'Hz', 6)}" in text
    assert fonts_not_embedded(report) == []
    from pypdf import PdfReader
    reader = PdfReader(report)
    assert 1 <= len(reader.pages) <= 2
    attached = reader.attachments
    assert attached["unit.s2p"][0] == sweep.read_bytes()
    record = json.loads(attached["record.json"][0])
    assert record["format"] == "sheetgen.record/1" and record["verdict"] == "pass"


def test_series_detuned_by_twice_the_f0_window_fails(root, tmp_path):
    pdf, results = _sheet(root, "series")
    low, high = _window(results, "f0_hz")
    f0 = results["resonance"]["f_peak_hz"]
    detuned = f0 + 2.0 * (high - low)
    start, stop, step = _series_fine(results)
    frequency_hz, current, impedance, load = _simulate(
        results, start + (detuned - f0), stop + (detuned - f0), step,
        capacitance_scale=(f0 / detuned) ** 2)
    sweep = _touchstone(tmp_path / "detuned.s2p", frequency_hz, current, impedance, load)
    filled = fill(pdf, {"measured.capacitance_f": _fitted_pf(results), **IDENTITY},
                  tmp_path / "f.pdf")
    assert main(["grade", str(filled), "--sweep", str(sweep)]) == 1
    grading = _grade(filled, sweep)
    assert {v.field: v.verdict for v in grading.as_left}["measured.f0_hz"] == "fail"


def test_series_sheets_own_step_resolves_its_windows(root, tmp_path, capsys):
    """The windows include the sweep step the sheet prints (half of it on each edge), so the
    sheet's own sweep resolves them: graded, not refused as too coarse."""
    pdf, results = _sheet(root, "series")
    frequency_hz, current, impedance, load = _simulate(results, *_sheet_sweep("series"))
    sweep = _touchstone(tmp_path / "own.s2p", frequency_hz, current, impedance, load)
    assert main(["grade", str(pdf), "--sweep", str(sweep)]) in (0, 1)
    assert "too coarse" not in capsys.readouterr().err
    low, high = _window(results, "bandwidth_hz")
    step = frequency_hz[1] - frequency_hz[0]
    assert step <= (high - low) / 2, "the sheet's step fits the bandwidth window"


def test_a_sweep_coarser_than_the_windows_is_refused(root, tmp_path, capsys):
    """A sweep stepped at the whole bandwidth window's width cannot resolve it: refused,
    naming the span and the step needed."""
    pdf, results = _sheet(root, "series")
    low, high = _window(results, "bandwidth_hz")
    f0, bandwidth = results["resonance"]["f_peak_hz"], results["resonance"]["bandwidth_hz"]
    frequency_hz, current, impedance, load = _simulate(results, f0 - 3 * bandwidth,
                                                       f0 + 3 * bandwidth, 2.0 * (high - low))
    sweep = _touchstone(tmp_path / "coarse.s2p", frequency_hz, current, impedance, load)
    assert main(["grade", str(pdf), "--sweep", str(sweep)]) == 2
    err = capsys.readouterr().err
    assert "too coarse" in err or "points" in err
    step = re.search(r"in steps of ([\d.]+ \S*Hz) or finer", err)
    span = re.search(r"span ([\d.]+ \S*Hz)", err)
    assert step and span, err
    from sheetgen.quantities import FREQUENCY, parse_quantity
    assert parse_quantity(step.group(1), FREQUENCY) <= (high - low) / 2
    assert parse_quantity(span.group(1), FREQUENCY) >= 6 * bandwidth


def test_a_typed_value_a_sweep_replaces_is_kept_and_graded(root, tmp_path, capsys):
    """The form says f_high is one unit of its last printed digit above the window (fail);
    the sweep's f_high (ngspice) passes. Both are shown; the verdict uses the sweep's."""
    pdf, results = _sheet(root, "parallel")
    frequency_hz, response, _, _ = _simulate(results, *_sheet_sweep("parallel"))
    sweep = _csv(tmp_path / "tank.csv", frequency_hz, response)
    from tests.bench.test_grade import nudged, printed_windows, typed
    _, high, unit = printed_windows(pdf)["measured.f_high_hz"]
    too_high = typed(nudged(high, +1), unit)
    filled = fill(pdf, {**IDENTITY, "measured.f_high_hz": too_high}, tmp_path / "filled.pdf")
    record, report = tmp_path / "r.json", tmp_path / "report.pdf"
    capsys.readouterr()
    main(["grade", str(filled), "--sweep", str(sweep), "--json", str(record), "-o", str(report)])
    out = capsys.readouterr().out
    value = next(v for v in _record(record)["values"] if v["field"] == "measured.f_high_hz")
    assert value["verdict"] == "pass" and value["typed"].startswith("sweep: ")
    assert value["form"]["typed"] == too_high and value["form"]["verdict"] == "fail"
    assert f"f_high_hz: the form says {too_high} (fail), the sweep " in out
    assert "the verdict uses the sweep's" in out
    text = " ".join(subprocess.run(["pdftotext", str(report), "-"], capture_output=True,
                                   text=True, check=True).stdout.split())
    assert "typed in the form" in text and "not used: the sweep's is" in text
