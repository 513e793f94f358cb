"""Small coils at VHF (issue 16, item 9): the leads' inductance is counted where it is a
measurable share of the coil's, and a coil too small for an LCR meter is measured on an
analyser near its frequency of use.

Reference: the inductance of a straight round wire, Rosa (1908) and Grover, "Inductance
Calculations" (1946): L = (µ0·l/2π)·(ln(2l/r) − 1) at high frequency and
(µ0·l/2π)·(ln(2l/r) − 3/4) at DC, worked by hand below (µ0/2π = 2e-7 H/m).
"""

import math

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine.wire import straight_wire_inductance_h
from sheetgen.report.procedure import procedure
from sheetgen.report.winding import coil_check
from tests.support import assert_close


@pytest.mark.parametrize("length_m, diameter_m, high_frequency, expected_h", [
    # 5 mm of 1 mm wire: 2l/r = 20, ln 20 = 2.99573; 2e-7 · 0.005 · 1.99573 = 1.9957 nH
    (0.005, 1.0e-3, True, 1.9957e-9),
    # the same at DC: 2e-7 · 0.005 · 2.24573 = 2.2457 nH (µ0·l/8π = 0.25 nH more inside)
    (0.005, 1.0e-3, False, 2.2457e-9),
    # 100 mm of 1 mm wire: 2l/r = 400, ln 400 = 5.99146; 2e-8 · 4.99146 = 99.83 nH
    (0.100, 1.0e-3, True, 99.83e-9),
])
def test_straight_wire_inductance_matches_rosa_and_grover(length_m, diameter_m,
                                                          high_frequency, expected_h):
    got = straight_wire_inductance_h(length_m, diameter_m, high_frequency)
    assert_close(got, expected_h, rel=2e-4, what="straight-wire inductance")


JOB = """\
sheet: {id: T-145, title: 145 MHz tank, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: parallel, targets: {f0: 145 MHz, loaded_q: 40}}
inductor: {form: solenoid, inductance: 63 nH, former_diameter: 5 mm, wire: AWG 18,
           pitch: 2 mm, lead_length: %s}
capacitor: {dissipation_factor: 0.05 %%, dielectric: C0G, preferred_series: E24,
            trimmer: {minimum: 2 pF, maximum: 10 pF}}
source: {resistance: 20 kohm, voltage: 1 V}
"""


def _design(tmp_path, lead):
    path = tmp_path / "job.yaml"
    path.write_text(JOB % lead, encoding="utf-8")
    return design_from_file(path)


def test_the_leads_of_a_vhf_coil_are_counted(tmp_path):
    """Two 5 mm leads of AWG 18 (1.024 mm, ASTM B258): 2l/r = 10/0.512 = 19.53,
    ln 19.53 = 2.972, so 2 · 2e-7 · 0.005 · 1.972 = 3.944 nH, about 5.6 % of a ~70 nH
    winding: counted in the coil's inductance."""
    design = _design(tmp_path, "5 mm")
    coil = design.coil
    assert_close(coil.leads.inductance_h, 3.944e-9, rel=2e-3, what="two leads")
    assert coil.leads.counted
    assert_close(design.circuit.inductance_h,
                 coil.result.inductance_built_h + 3.944e-9, rel=1e-3, what="L with leads")
    # no leads, nothing added
    bare = _design(tmp_path, "0 mm")
    assert bare.coil.leads.inductance_h == 0.0
    assert bare.circuit.inductance_h == bare.coil.result.inductance_built_h


def test_a_vhf_coil_is_measured_on_an_analyser_near_its_frequency(tmp_path):
    """At an LCR meter's top 1 MHz, 74 nH is 2π · 1e6 · 74e-9 = 0.47 Ω, under the ~10 Ω
    where such meters keep their basic accuracy (common practice): the sheet asks for an
    analyser at 100 MHz (below f0 = 145 MHz and a tenth of the self-resonance)."""
    design = _design(tmp_path, "5 mm")
    check = coil_check(design)
    assert 2 * math.pi * 1e6 * check.inductance_h < 10.0
    assert check.method == "analyser"
    assert check.measure_at_hz == 100e6
    (step,) = [s for s in procedure(design).steps if s.title == "Measure the coil"]
    assert "analyser at 100 MHz" in step.text and "with an LCR meter" not in step.text
