"""Voltages and currents on every part at the operating point, against ngspice and the
textbook resonance relations.

Sources: ngspice AC analysis (tests/spice.py), the drive at its real amplitude, each part's
voltage and current measured by ngspice's own `meas ... FIND ... AT`; Alexander & Sadiku,
Fundamentals of Electric Circuits, 5th ed., §14.5-14.6 (series: |V_C| = Q·V at f0;
parallel: the circulating current is Q times the line current) — section from memory.
"""

import math
from dataclasses import replace
from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine.resonance import Circuit, analyse
from sheetgen.engine.stress import Drive, open_circuit_voltage_rms, part_stress
from tests import spice
from tests.support import assert_close

pytestmark = pytest.mark.ngspice

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"
REL = 1e-5  # ngspice's meas keeps 7 digits (tests/reference/ngspice.md)


def _ngspice_stress(c: Circuit, drive: Drive, f_hz: float) -> dict[str, float]:
    """RMS magnitudes at f_hz: ngspice's AC source amplitude is the RMS drive."""
    if c.topology == "series":
        if drive.kind == "current":  # Norton: the source's resistance across it
            lines = [f"idrive 0 a dc 0 ac {drive.value!r}"]
            if c.source_resistance_ohm is not None:
                lines.append(f"rsource a 0 {c.source_resistance_ohm!r}")
        else:
            v = open_circuit_voltage_rms(drive, c.source_resistance_ohm)
            lines = [f"vdrive src 0 dc 0 ac {v!r}",
                     f"rsource src a {c.source_resistance_ohm or 1e-9!r}"]
        lines += ["vsense a a1 dc 0", f"lcoil a1 b {c.inductance_h!r}",
                  f"rcoil b c {c.inductor_resistance_ohm or 1e-12!r}",
                  f"ccap c d {c.capacitance_f!r}", f"rcap d e {c.capacitor_esr_ohm or 1e-12!r}",
                  f"rload e 0 {c.load_resistance_ohm or 1e-12!r}"]
        lets = {"vl": "vm(a1,c)", "vc": "vm(c,e)", "il": "mag(i(vsense))",
                "ic": "mag(i(vsense))"}
    else:
        if drive.kind == "current":  # Norton: the source's resistance across it
            lines = [f"idrive 0 out dc 0 ac {drive.value!r}"]
            if c.source_resistance_ohm is not None:
                lines.append(f"rsource out 0 {c.source_resistance_ohm!r}")
        else:
            v = open_circuit_voltage_rms(drive, c.source_resistance_ohm)
            lines = [f"vdrive src 0 dc 0 ac {v!r}",
                     f"rsource src out {c.source_resistance_ohm!r}"]
        lines += ["vlsense out l1 dc 0", f"lcoil l1 x {c.inductance_h!r}",
                  f"rcoil x 0 {c.inductor_resistance_ohm or 1e-12!r}",
                  "vcsense out c1 dc 0", f"ccap c1 y {c.capacitance_f!r}",
                  f"rcap y 0 {c.capacitor_esr_ohm or 1e-12!r}"]
        if c.load_resistance_ohm is not None:
            lines.append(f"rload out 0 {c.load_resistance_ohm!r}")
        lets = {"vl": "vm(out)", "vc": "vm(out)", "il": "mag(i(vlsense))",
                "ic": "mag(i(vcsense))"}
    sweep = spice.Sweep("lin", 3, f_hz * (1 - 1e-9), f_hz * (1 + 1e-9))
    measures = {name: f"FIND {name} AT={f_hz!r}" for name in lets}
    return spice.ac_measure("\n".join(lines), sweep, lets, measures)


JOBS = ["series.yaml", "parallel.yaml", "power-tank.yaml", "demo.yaml", "toroid.yaml"]


@pytest.mark.parametrize("name", JOBS)
def test_part_stress_agrees_with_ngspice(name):
    d = design_from_file(TEMPLATES / name)
    got = d.stress
    measured = _ngspice_stress(d.circuit, d.drive, got.f_hz)
    where = f"{name} vs {spice.ngspice_version()}"
    assert_close(got.capacitor_voltage_rms_v, measured["vc"], rel=REL, what=f"{where} V_C")
    assert_close(got.inductor_voltage_rms_v, measured["vl"], rel=REL, what=f"{where} V_L")
    assert_close(got.capacitor_current_rms_a, measured["ic"], rel=REL, what=f"{where} I_C")
    assert_close(got.inductor_current_rms_a, measured["il"], rel=REL, what=f"{where} I_L")
    assert_close(got.capacitor_voltage_peak_v, math.sqrt(2) * measured["vc"], rel=REL,
                 what="peak = √2 · rms for a sine")


def test_series_capacitor_carries_q_times_the_drive():
    """Alexander & Sadiku §14.5: at f0, |V_C| = Q·V with Q = ω0L/R (lossless capacitor)."""
    c = Circuit("series", 10e-6, 2.0, 100e-12, 0.0, 50.0, None)
    stress = part_stress(c, Drive("voltage", 3.0), analyse(c).f0_hz)
    q = 2 * math.pi * analyse(c).f0_hz * 10e-6 / 52.0
    assert_close(stress.capacitor_voltage_rms_v, q * 3.0, rel=1e-12, what="V_C = Q·V")


def test_parallel_circulating_current_is_q_times_the_line_current():
    """Alexander & Sadiku §14.6: I_C ≈ Q·I_line in a high-Q tank (to order 1/Q²)."""
    c = Circuit("parallel", 10e-6, 0.5, 100e-12, 0.0, None, None)
    r = analyse(c)
    stress = part_stress(c, Drive("current", 0.01), r.f_unity_pf_hz)
    q = r.reactance_ohm / 0.5
    assert_close(stress.capacitor_current_rms_a / 0.01, q, rel=2 / q**2, what="I_C / I_line")


def test_available_power_reaches_a_matched_load():
    """Maximum power transfer: a 50 Ω load on a 50 Ω source at series resonance with a
    lossless tank takes all the available power (P_av = V²/4Rs)."""
    c = Circuit("series", 1e-6, 0.0, 1e-9, 0.0, 50.0, 50.0)
    stress = part_stress(c, Drive("available_power", 2.0), analyse(c).f0_hz)
    assert_close(stress.load_power_w, 2.0, rel=1e-12, what="load power")


NORTON_CASES = {  # a current source with its resistance across it (Norton)
    "parallel": Circuit("parallel", 220e-6, 6.99, 556e-12, 0.63, 47e3, 84.2e3),
    "series": Circuit("series", 10e-6, 3.2, 13.8e-12, 0.05, 50.0, 50.0),
}


@pytest.mark.parametrize("topology", sorted(NORTON_CASES))
def test_current_drive_with_source_resistance_agrees_with_ngspice(topology):
    """ngspice: `idrive` with `rsource` across it; the stress at the response maximum."""
    c = NORTON_CASES[topology]
    drive = Drive("current", 1e-3)
    got = part_stress(c, drive, analyse(c).f_peak_hz)
    measured = _ngspice_stress(c, drive, got.f_hz)
    assert_close(got.capacitor_voltage_rms_v, measured["vc"], rel=REL, what=f"{topology} V_C")
    assert_close(got.inductor_current_rms_a, measured["il"], rel=REL, what=f"{topology} I_L")
    ideal = part_stress(replace(c, source_resistance_ohm=None), drive, got.f_hz)
    assert abs(ideal.capacitor_voltage_rms_v - measured["vc"]) > 100 * REL * measured["vc"], \
        "the comparison tells a source with Rs across from one without"
