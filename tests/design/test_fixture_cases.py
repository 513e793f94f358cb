"""Test set-ups that can be built at the test frequency: four practitioners' cases (jobs
invented for this test) whose old fixture was an E96 metal-film resistor whatever its value
and frequency.

Sources: a resistor's parasitics as a lumped model, leads' L in series with R ∥ C, with
~0.2 pF and 5-10 nH for a leaded 0.25 W metal-film part with short leads (common
practice); X_C = 1/(ωC) and X_L = ωL; a series RC's parallel equivalent
R_p = R(1 + Q²), Q = 1/(ωCR) (any circuits textbook); the voltage divider into a 50 Ω
input; ngspice AC analysis of the unit built on the set-up the sheet prescribes, with
every fixture part as stated (tests/design/as_built.py).
"""

from __future__ import annotations

import math

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.procedure import procedure
from sheetgen.report.results import results_document
from tests import spice
from tests.design.as_built import as_built_bench, assert_inside_windows

HEAD = "sheet: {id: FX-%s, title: %s, revision: A, designer: Test Bench, date: 2026-12-01}\n"
CASES = {
    # an antenna trap: a parallel tank in series with the wire, no load of its own
    "trap-7mhz": HEAD % ("7", "7 MHz antenna trap") + """
circuit: {topology: parallel, targets: {f0: 7.05 MHz}}
inductor: {form: given, inductance: 5 uH, q: 200}
capacitor: {dissipation_factor: 0.05 %, preferred_series: E24, dielectric: C0G, rated_voltage: 1 kV}
source: {current: 10 mA}
""",
    # a receiving loop tuned by a series capacitor, read for its current
    "loop-20khz": HEAD % ("20K", "20 kHz receiving loop") + """
circuit: {topology: series, targets: {f0: 20 kHz}}
inductor: {form: given, inductance: 1 mH, q: 90}
capacitor: {dissipation_factor: 0.1 %, preferred_series: E24, dielectric: C0G, rated_voltage: 100 V}
source: {voltage: 1 mV}
""",
    # a harmonic trap: a series LC from a 25 Ω point to ground
    "trap-14mhz": HEAD % ("14", "14 MHz harmonic trap") + """
circuit: {topology: series, targets: {f0: 14.1 MHz}}
inductor: {form: given, inductance: 1.5 uH, q: 150}
capacitor: {dissipation_factor: 0.05 %, preferred_series: E24, dielectric: C0G, rated_voltage: 500 V}
source: {resistance: 25 ohm, voltage: 1 V}
""",
    # a VHF tank of a few turns, fed from a 2 kΩ stage
    "tank-145mhz": HEAD % ("145", "145 MHz tank") + """
circuit: {topology: parallel, targets: {f0: 145 MHz}}
inductor: {form: given, inductance: 63 nH, q: 150}
capacitor: {dissipation_factor: 0.05 %, preferred_series: E24, dielectric: C0G, rated_voltage: 100 V}
source: {resistance: 2 kohm, voltage: 1 V}
""",
}
LEADED_C, LEADED_L = 0.2e-12, 10e-9  # leaded metal film, short leads (common practice)


def _design(tmp_path, case):
    path = tmp_path / f"{case}.yaml"
    path.write_text(CASES[case], encoding="utf-8")
    return design_from_file(path)


def _resistor_change(r, f):
    """|Z/R − 1| of R with LEADED_L in series and LEADED_C across (lumped model)."""
    w = 2 * math.pi * f
    return abs((1j * w * LEADED_L + r / (1 + 1j * w * r * LEADED_C)) / r - 1)


def test_trap_7mhz_no_megohm_pickup(tmp_path):
    """The old set-up: 100 × |Z| (about 4 MΩ) in series with each port. At 7 MHz its own
    0.2 pF is 1/(ωC) ≈ 114 kΩ, so the 'resistor' is a capacitor, and the signal into 50 Ω
    through 4 MΩ is 20·log10(50/4 MΩ) ≈ −98 dB. Now: a coupling capacitor from the
    generator and an active probe at the tank."""
    d = _design(tmp_path, "trap-7mhz")
    f, z = d.resonance.f_peak_hz, d.resonance.impedance_at_peak_ohm
    old = 100 * z
    assert 1 / (2 * math.pi * f * LEADED_C) < 0.05 * old, "the old resistor is a capacitor"
    assert 20 * math.log10(50 / old) < -90
    bench = d.bench
    assert bench.source.kind == "coupling_capacitor"
    assert bench.receiver.hookup.kind == "probe"
    # the probe's 1 pF is in the tank the windows are for (C + 1 pF)
    assert math.isclose(bench.circuit.capacitance_f, d.circuit.capacitance_f + 1e-12,
                        rel_tol=1e-12)
    assert bench.readable


def test_loop_20khz_no_milliohm_resistors(tmp_path):
    """The old set-up: 1/100 of the loop's ~1.5 Ω, ~15 mΩ, across each port — a
    current-sense part, not metal film. Now: a current transformer at each end, the loop's
    wire once through a ring and N turns to the port, presenting 50/N² (ideal
    transformer), N = √(50/R) rounded."""
    d = _design(tmp_path, "loop-20khz")
    bench = d.bench
    for hookup in (bench.source, bench.receiver.hookup):
        assert hookup.wanted_ohm < 0.1, "the old rule asks for milliohms"
        assert hookup.kind == "transformer"
        one, n = hookup.turns
        assert one == 1 and n == round(math.sqrt(50 / hookup.wanted_ohm))
        assert math.isclose(hookup.presented_ohm, 50 / n ** 2, rel_tol=1e-12)
    assert bench.readable


def test_trap_14mhz_no_sub_ohm_sense_resistor(tmp_path):
    """The old sense resistor: 1/100 of the ~26 Ω loop, 261 mΩ; 10 nH of lead is
    ωL = 0.89 Ω at 14 MHz, more than the resistance. Now a current transformer; the
    25 Ω source stays a 49.9 Ω metal-film part across the port, whose parasitics change
    its impedance by under 10 % (worked here by the lumped model)."""
    d = _design(tmp_path, "trap-14mhz")
    bench, f = d.bench, d.resonance.f_peak_hz
    assert 2 * math.pi * f * LEADED_L > bench.receiver.hookup.wanted_ohm
    assert bench.receiver.hookup.kind == "transformer"
    assert bench.source.kind == "shunt_resistor" and bench.source.resistor_ohm == 49.9
    assert _resistor_change(49.9, f) < 0.10


def test_tank_145mhz_chip_feed_and_probe(tmp_path):
    """The old feed: 1.96 kΩ leaded at 145 MHz: ωRC = 0.36, its impedance changed by a
    third. A chip part (~0.05 pF, ~1 nH, common practice) is a resistor there within 10 %;
    the old 787 kΩ pickup is no resistor at all: an active probe instead."""
    d = _design(tmp_path, "tank-145mhz")
    bench, f = d.bench, d.resonance.f_peak_hz
    assert _resistor_change(1960.0, f) > 0.3
    assert bench.source.kind == "series_resistor" and bench.source.resistor_ohm == 1960.0
    assert "chip" in bench.source.style.name
    w = 2 * math.pi * f
    chip = abs((1j * w * 1e-9 + 1960 / (1 + 1j * w * 1960 * 0.05e-12)) / 1960 - 1)
    assert chip < 0.10
    assert bench.receiver.hookup.kind == "probe"
    settings = dict(next(s for s in procedure(d).steps if s.key == "connect").all_settings)
    assert settings["Generator hookup"].startswith("R2 1.96 kΩ")
    assert "0603 chip" in settings["Generator hookup"]
    assert "active probe" in settings["Receiver hookup"]


def test_a_receiver_below_its_noise_floor_is_said_so(tmp_path):
    """A receiver floor of −60 dBm/Hz (a deliberately poor one): the 20 kHz loop's
    half-power points (about −55 dBm) in a 10 Hz receiver bandwidth (−50 dBm floor) are
    under the 20 dB margin, and the sheet says what to do."""
    path = tmp_path / "poor.yaml"
    path.write_text(CASES["loop-20khz"] + "test: {receiver_noise_floor: -60}\n",
                    encoding="utf-8")
    d = design_from_file(path)
    assert not d.bench.readable
    settings = dict(next(s for s in procedure(d).steps if s.key == "connect").all_settings)
    assert "less than the 20 dB needed" in settings["Receiver reading"]


@pytest.mark.ngspice
@pytest.mark.parametrize("case", sorted(CASES))
def test_built_on_its_fixture_the_unit_meets_its_windows(tmp_path, case):
    """The unit built as the sheet says, on the set-up it prescribes (fixture resistors
    with their stated parasitics, the transformers, the coupling capacitor, the probe),
    measured by ngspice at the receiver's input: every feature inside the windows."""
    got = results_document(_design(tmp_path, case))
    measured = spice.measure_bench(as_built_bench(got), zero_phase=False)
    assert_inside_windows(measured, got["limits"], f"{case} vs {spice.ngspice_version()}")


@pytest.mark.ngspice
def test_the_check_fails_without_the_probes_loading(tmp_path):
    """The comparison can fail: the 7 MHz trap built without the probe's 1 MΩ (the tank's
    own dynamic resistance is ~44 kΩ, so 1 MΩ widens it by ~4 %) has a bandwidth outside
    its window. The coil's Q is stated exact here (q_tolerance 0 %, tolerance 1 %), so that
    the window is the set-up's and not the ±20 % default spread of a maker's Q."""
    path = tmp_path / "trap-exact.yaml"
    path.write_text(CASES["trap-7mhz"].replace(
        "inductor: {form: given, inductance: 5 uH, q: 200}",
        "inductor: {form: given, inductance: 5 uH, q: 200, q_tolerance: 0 %, tolerance: 1 %}"),
        encoding="utf-8")
    got = results_document(design_from_file(path))
    bench = as_built_bench(got)
    body = "\n".join(line for line in bench.body.splitlines() if not line.startswith("rprobe"))
    measured = spice.measure_bench(spice.BenchCircuit(
        bench.topology, body, bench.response, bench.port_voltage, bench.port_current,
        bench.f_start_hz, bench.f_stop_hz), zero_phase=False)
    lim = got["limits"]
    assert not lim["bandwidth_min_hz"] <= measured.bandwidth_hz <= lim["bandwidth_max_hz"]


def test_the_noise_floor_is_scaled_to_the_receiver_bandwidth_the_sheet_sets(tmp_path):
    """−130 dBm/Hz in the receiver bandwidth printed in the instrument step: a floor per
    hertz scales with 10·log10(B) (thermal-noise arithmetic), and the margin is the −3 dB
    reading (peak − 3.01 dB) less that floor."""
    d = _design(tmp_path, "trap-14mhz")
    plan = procedure(d)
    rbw = plan.sweep.receiver_bandwidth_hz
    floor = -130.0 + 10 * math.log10(rbw)
    assert math.isclose(d.bench.noise_floor_dbm, floor, abs_tol=1e-9)
    assert math.isclose(d.bench.half_power_margin_db,
                        d.bench.drive.received_dbm - 3.0103 - floor, abs_tol=1e-3)


def test_a_resistor_with_no_alternative_is_not_called_a_resistor(tmp_path):
    """A 145 MHz tank with a 20 kΩ load: even a chip part (~0.05 pF) is 1/(ωC) ≈ 22 kΩ of
    reactance there, its impedance changed by far more than 10 %, and no other hookup
    makes a loaded tank's load: the sheet says so instead of calling it a resistor."""
    path = tmp_path / "vhf-load.yaml"
    path.write_text(CASES["tank-145mhz"].replace(
        "source: {resistance: 2 kohm, voltage: 1 V}",
        "source: {resistance: 50 ohm, voltage: 1 V}\nload: {resistance: 20 kohm}"),
        encoding="utf-8")
    d = design_from_file(path)
    assert 1 / (2 * math.pi * d.resonance.f_peak_hz * 0.05e-12) < 25e3
    assert not d.bench.receiver_effect.negligible
    settings = dict(next(s for s in procedure(d).steps if s.key == "connect").all_settings)
    assert "more than allowed" in settings["Fixture resistors"]
    assert "so each is a resistor" not in settings["Fixture resistors"]
