"""A capacitance the job states is the capacitance analysed (issue 16, item 3).

Reference values are Thomson's formula f0 = 1/(2π√(LC)), worked by hand in each test.
"""

import math

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.quantities import format_quantity
from sheetgen.report.rows import component_rows
from tests.support import assert_close

SERIES = """\
sheet: {id: T-1, title: textbook series, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: series}
inductor: {form: given, inductance: 50 uH, resistance: 0 ohm}
capacitor: {capacitance: 40 pF, esr: 0 ohm, dielectric: C0G%s}
source: {resistance: 22 ohm, voltage: 1 V}
"""
PARALLEL = """\
sheet: {id: T-2, title: textbook parallel, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: parallel}
inductor: {form: given, inductance: 50 uH, resistance: 33 ohm}
capacitor: {capacitance: 10 pF, esr: 0 ohm, dielectric: C0G}
source: {current: 1 mA}
"""
DESIGNED = """\
sheet: {id: T-3, title: designed series, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: series, targets: {f0: 3.5 MHz}}
inductor: {form: given, inductance: 50 uH, resistance: 1 ohm}
capacitor: {esr: 0 ohm, dielectric: C0G, preferred_series: E192, tolerance: 0.1 %}
source: {resistance: 22 ohm, voltage: 1 V}
"""


def _design(tmp_path, text):
    path = tmp_path / "job.yaml"
    path.write_text(text, encoding="utf-8")
    return design_from_file(path)


def _rows(design):
    return {row.label: row for row in component_rows(design)}


def test_series_textbook_case_is_analysed_at_the_stated_40_pf(tmp_path):
    """22 Ω, 50 µH, 40 pF: f0 = 1/(2π√(50e-6 · 40e-12)) = 1/(2π · 4.4721e-8) = 3.5588 MHz
    (Thomson's formula, worked by hand)."""
    design = _design(tmp_path, SERIES % "")
    assert_close(design.circuit.capacitance_f, 40e-12, rel=1e-12, what="C analysed")
    assert_close(design.resonance.f0_hz, 3.5588e6, rel=2e-4, what="f0")
    rows = _rows(design)
    assert rows["Capacitance C"].value == "40.00 pF"
    assert not any(label.startswith("Nearest") for label in rows), rows


def test_parallel_textbook_case_is_analysed_at_the_stated_10_pf(tmp_path):
    """33 Ω, 50 µH, 10 pF: f0 = 1/(2π√(50e-6 · 10e-12)) = 1/(2π · 2.2361e-8) = 7.1176 MHz;
    the unity-power-factor point is f0·√(1 − R²C/L) = f0·√(1 − 33² · 10e-12/50e-6),
    7.1176 MHz · (1 − 1.1e-4) = 7.1168 MHz (textbook closed form, by hand)."""
    design = _design(tmp_path, PARALLEL)
    assert_close(design.resonance.f0_hz, 7.1176e6, rel=2e-4, what="f0")
    assert_close(design.resonance.f_unity_pf_hz, 7.1168e6, rel=2e-4, what="f at zero phase")


def test_a_written_stray_is_added_to_the_stated_capacitance(tmp_path):
    """capacitor.stray: 2 pF on 40 pF: f0 = 1/(2π√(50e-6 · 42e-12)) = 3.4730 MHz (by hand)."""
    design = _design(tmp_path, SERIES % ", stray: 2 pF")
    assert_close(design.resonance.f0_hz, 3.4730e6, rel=2e-4, what="f0 with the stray")
    rows = _rows(design)
    assert "capacitor.stray" in rows["Capacitance already across C"].remark
    assert "added to" in rows["Capacitance already across C"].remark


def test_design_mode_subtracts_the_default_stray_and_says_so(tmp_path):
    """With no capacitance given, sheetgen picks the parts and counts a 2 pF stray (common
    practice): the parts total is C(3.5 MHz) − 2 pF, C = 1/((2π·3.5e6)²·50e-6) = 41.35 pF
    (Thomson's formula solved for C, by hand)."""
    design = _design(tmp_path, DESIGNED)
    c_total = 1.0 / ((2 * math.pi * 3.5e6) ** 2 * 50e-6)
    assert_close(c_total, 41.355e-12, rel=1e-4, what="hand C")
    assert_close(design.capacitor_choice.required_f, c_total - 2e-12, rel=1e-9,
                 what="capacitance to fit")
    remark = _rows(design)["Capacitance already across C"].remark
    assert "default" in remark and "common practice" in remark, remark


@pytest.mark.parametrize("unit, expected", [("F", "0 pF"), ("H", "0 nH"), ("Ω", "0 Ω"),
                                            ("W", "0 W")])
def test_zero_is_written_as_a_plain_zero(unit, expected):
    """A zero carries no figures that are not there: '0 pF', never '0.000 F'."""
    assert format_quantity(0.0, unit, 4) == expected
