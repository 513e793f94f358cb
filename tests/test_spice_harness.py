"""Self-checks of the ngspice harness (tests/spice.py) against sources outside the project.

References:
- [AS] Alexander & Sadiku, Fundamentals of Electric Circuits, 5th ed., §14.5 (series
  resonance: ω1,2 = ∓R/2L + √((R/2L)² + 1/LC), Z(ω0) = R) and §14.6 (parallel resonance:
  ω1,2 = ∓1/2RC + √((1/2RC)² + 1/LC), Z(ω0) = R) (section numbers from memory).
- [TANK] Two-branch tank (rL + jωL) ∥ (rC + 1/jωC) is resistive where
  ω = ω0 √((L/C − rL²)/(L/C − rC²)); with rC = 0, f0 √(1 − rL²C/L)
  (classic result, e.g. Hayt & Kemmerly, Engineering Circuit Analysis, the "practical
  parallel resonant circuit"; from memory).
- [SCIPY] scipy.optimize.minimize_scalar / brentq applied to the circuit's complex
  impedance written out with numpy, for circuits without a closed form.

The harness's own tolerance: ngspice's interactive meas keeps 7 significant digits
(±5e-7 relative), and the fine sweeps add well under 1e-6; HARNESS_REL covers both.
"""

import math

import numpy as np
import pytest
from scipy.optimize import brentq, minimize_scalar

from tests import spice
from tests.support import assert_close

pytestmark = pytest.mark.ngspice

HARNESS_REL = 2e-6  # meas rounding (5e-7) + sweep grid and linear interpolation of WHEN


def _f0_hz(inductance_h, capacitance_f):
    return 1.0 / (2.0 * math.pi * math.sqrt(inductance_h * capacitance_f))


# (L, rL, C, rC, Rs, RL): invented values, Q_loaded = X0 / (sum of loop resistances)
SERIES_CASES = [
    pytest.param(1e-3, 5.0, 1e-6, 0.5, 10.0, None, id="audio-Q2"),
    pytest.param(2.2e-6, 0.4, 47e-12, 0.05, None, 1.0, id="vhf-Q150"),
    pytest.param(100e-6, 0.8, 2.5e-9, 0.2, 25.0, 50.0, id="mf-Q2.6"),
]


@pytest.mark.parametrize("L, r_l, C, r_c, r_s, r_load", SERIES_CASES)
def test_series_matches_textbook_closed_form(L, r_l, C, r_c, r_s, r_load):
    """[AS] §14.5: current peak at f0, half-power points in closed form, |Z(f0)| = R."""
    bench = spice.series_netlist(L, r_l, C, r_c, r_s, r_load)
    got = spice.measure_bench(bench)
    r_loop = r_l + r_c + (r_s or 0.0) + (r_load or 0.0)
    alpha = r_loop / (2.0 * L)
    root = math.sqrt(alpha**2 + 1.0 / (L * C))
    ref = "Alexander & Sadiku 5th ed. §14.5 vs " + got.ngspice_version
    assert_close(got.f_peak_hz, _f0_hz(L, C), rel=HARNESS_REL, what=f"f_peak ({ref})")
    assert_close(got.f_low_hz, (root - alpha) / (2 * math.pi), rel=HARNESS_REL,
                 what=f"f_low ({ref})")
    assert_close(got.f_high_hz, (root + alpha) / (2 * math.pi), rel=HARNESS_REL,
                 what=f"f_high ({ref})")
    # |Z| the source terminals see, Rs excluded; at the peak the reactances cancel.
    assert_close(got.impedance_at_peak_ohm, r_loop - (r_s or 0.0), rel=HARNESS_REL,
                 what=f"|Z(f0)| ({ref})")
    # peak current = 1 V / total loop resistance
    assert_close(got.response_peak, 1.0 / r_loop, rel=HARNESS_REL, what=f"I_peak ({ref})")


# (L, C, R): ideal parts, R across the node, driven by 1 A
PARALLEL_IDEAL_CASES = [
    pytest.param(10e-3, 100e-9, 2.2e3, id="audio-Q7"),
    pytest.param(1e-6, 250e-12, 20e3, id="hf-Q316"),
]


@pytest.mark.parametrize("L, C, R", PARALLEL_IDEAL_CASES)
def test_parallel_ideal_matches_textbook_closed_form(L, C, R):
    """[AS] §14.6: voltage peak at f0, half-power points in closed form, |Z(f0)| = R."""
    bench = spice.parallel_netlist(L, 0.0, C, 0.0, None, R)
    got = spice.measure_bench(bench)
    a = 1.0 / (2.0 * R * C)
    root = math.sqrt(a**2 + 1.0 / (L * C))
    ref = "Alexander & Sadiku 5th ed. §14.6 vs " + got.ngspice_version
    assert_close(got.f_peak_hz, _f0_hz(L, C), rel=HARNESS_REL, what=f"f_peak ({ref})")
    assert_close(got.f_low_hz, (root - a) / (2 * math.pi), rel=HARNESS_REL,
                 what=f"f_low ({ref})")
    assert_close(got.f_high_hz, (root + a) / (2 * math.pi), rel=HARNESS_REL,
                 what=f"f_high ({ref})")
    assert_close(got.impedance_at_peak_ohm, R, rel=HARNESS_REL, what=f"|Z(f0)| ({ref})")
    assert_close(got.f_zero_phase_hz, _f0_hz(L, C), rel=HARNESS_REL,
                 what=f"zero phase ({ref})")


# (L, rL, C, rC): lossy tank, the zero-phase frequency moves away from f0
TANK_CASES = [
    pytest.param(47e-6, 12.0, 1e-9, 0.0, id="coil-loss-only"),
    pytest.param(47e-6, 12.0, 1e-9, 40.0, id="both-lossy"),
    pytest.param(330e-6, 3.0, 4.7e-9, 6.0, id="esr-larger"),
]


@pytest.mark.parametrize("L, r_l, C, r_c", TANK_CASES)
def test_zero_phase_of_lossy_tank(L, r_l, C, r_c):
    """[TANK] closed form for where the two-branch tank is purely resistive."""
    got = spice.measure_bench(spice.parallel_netlist(L, r_l, C, r_c, 1e3, None))
    z0 = L / C
    expected = _f0_hz(L, C) * math.sqrt((z0 - r_l**2) / (z0 - r_c**2))
    assert_close(got.f_zero_phase_hz, expected, rel=HARNESS_REL,
                 what=f"zero-phase frequency (two-branch tank closed form vs "
                      f"{got.ngspice_version})")


def _tank_impedance(f_hz, L, r_l, C, r_c, r_load):
    w = 2 * np.pi * f_hz
    y = 1 / (r_l + 1j * w * L) + 1 / (r_c + 1 / (1j * w * C))
    if r_load is not None:
        y = y + 1 / r_load
    return 1 / y


# (L, rL, C, rC, Rs, RL): lossy tank driven through Rs, loaded; no closed form for the peak
SCIPY_CASES = [
    pytest.param(22e-6, 9.0, 2.2e-9, 1.5, 4.7e3, 10e3, id="q~4"),
    pytest.param(0.5e-6, 0.15, 30e-12, 0.3, 50e3, None, id="vhf-q~100"),
]


@pytest.mark.parametrize("L, r_l, C, r_c, r_s, r_load", SCIPY_CASES)
def test_parallel_driven_through_source_matches_scipy(L, r_l, C, r_c, r_s, r_load):
    """[SCIPY]: peak, half-power points and |Z| of V(out) = Z/(Rs + Z) found numerically."""
    got = spice.measure_bench(spice.parallel_netlist(L, r_l, C, r_c, r_s, r_load))
    f0 = _f0_hz(L, C)

    def gain(f_hz):
        z = _tank_impedance(f_hz, L, r_l, C, r_c, r_load)
        return abs(z / (r_s + z))

    # optimise in ln f for conditioning; xatol 1e-10 is far below the tolerance
    best = minimize_scalar(lambda u: -gain(f0 * math.exp(u)), bounds=(-0.5, 0.5),
                           method="bounded", options={"xatol": 1e-10})
    f_peak = f0 * math.exp(best.x)
    level = gain(f_peak) / math.sqrt(2.0)
    f_low = brentq(lambda f: gain(f) - level, f0 / 10, f_peak, xtol=1e-12 * f0)
    f_high = brentq(lambda f: gain(f) - level, f_peak, f0 * 10, xtol=1e-12 * f0)
    ref = f"scipy.optimize vs {got.ngspice_version}"
    # the peak of a low-Q response is flat: ngspice's grid and scipy's optimiser both
    # locate it to ~1e-6, so the tolerance here is the harness's, not tighter
    assert_close(got.f_peak_hz, f_peak, rel=HARNESS_REL, what=f"f_peak ({ref})")
    assert_close(got.f_low_hz, f_low, rel=HARNESS_REL, what=f"f_low ({ref})")
    assert_close(got.f_high_hz, f_high, rel=HARNESS_REL, what=f"f_high ({ref})")
    assert_close(got.impedance_at_peak_ohm,
                 abs(_tank_impedance(f_peak, L, r_l, C, r_c, r_load)), rel=HARNESS_REL,
                 what=f"|Z(f_peak)| ({ref})")
    assert_close(got.response_peak, gain(f_peak), rel=HARNESS_REL, what=f"gain ({ref})")


def test_bad_netlist_fails_with_ngspice_messages():
    """A netlist ngspice rejects raises SpiceError quoting what ngspice said."""
    with pytest.raises(spice.SpiceError, match=r"(?s)ngspice failed.*stderr.*qbogus"):
        spice.ac_measure("qbogus a b c nosuchmodel\nr1 a 0 1", spice.Sweep("dec", 10, 1, 1e3),
                         {"x": "mag(v(a))"}, {"xmax": "MAX x"})


def test_failed_measurement_is_reported():
    """A WHEN level the response never reaches is a SpiceError, never a silent number."""
    body = "v1 a 0 dc 0 ac 1\nr1 a b 1k\nc1 b 0 1u"
    with pytest.raises(spice.SpiceError, match="(?i)measure"):
        spice.ac_measure(body, spice.Sweep("dec", 10, 1, 1e3), {"x": "mag(v(b))"},
                         {"never": "WHEN x=5 CROSS=1"})


def test_sweep_that_misses_the_resonance_is_rejected():
    """The harness refuses to report a 'peak' sitting on the sweep's edge."""
    bench = spice.series_netlist(1e-3, 5.0, 1e-6, 0.5, 10.0, None)  # f0 ≈ 5.03 kHz
    with pytest.raises(spice.SpiceError, match="widen the sweep"):
        spice.measure_resonance(bench.body, bench.response, port_voltage=bench.port_voltage,
                                port_current=bench.port_current, f_start_hz=10.0,
                                f_stop_hz=1e3)


def test_time_out_is_reported():
    """A run longer than the time-out is stopped and reported (1 ms is far below start-up)."""
    bench = spice.series_netlist(1e-3, 5.0, 1e-6, 0.5, 10.0, None)
    with pytest.raises(spice.SpiceError, match="did not finish"):
        spice.ac_sweep(bench.body, spice.Sweep("dec", 100, 1e2, 1e5), {"x": "mag(v(src))"},
                       timeout_s=1e-3)


def test_wrdata_sweep_matches_voltage_divider():
    """ac_sweep returns ngspice's vectors: RC low-pass |H| = 1/√(1 + (ωRC)²) (textbook)."""
    body = "v1 a 0 dc 0 ac 1\nr1 a b 1k\nc1 b 0 1u"
    data = spice.ac_sweep(body, spice.Sweep("dec", 20, 1, 1e5), {"h": "mag(v(b))"})
    w = 2 * np.pi * data.frequency_hz
    expected = 1 / np.sqrt(1 + (w * 1e3 * 1e-6) ** 2)
    assert data.frequency_hz.size == 101
    for f_hz, h, h_ref in zip(data.frequency_hz, data.vectors["h"], expected):
        assert_close(h, h_ref, rel=1e-7, what=f"|H| at {f_hz:.4g} Hz")


def test_version_banner():
    assert spice.ngspice_version().startswith("ngspice-")


def test_builders_leave_out_absent_resistors():
    """None or 0 Ω means a wire: no zero-valued resistor reaches ngspice."""
    series = spice.series_netlist(1e-3, 0.0, 1e-6, 0.0, None, None).body
    assert [line.split()[0] for line in series.splitlines()] == [
        "vdrive", "vsense", "lcoil", "ccap"]
    tank = spice.parallel_netlist(1e-3, 1.0, 1e-6, 0.0, None, None).body
    assert [line.split()[0] for line in tank.splitlines()] == [
        "idrive", "vsense", "lcoil", "rcoil", "ccap"]
    with pytest.raises(ValueError):
        spice.series_netlist(1e-3, -1.0, 1e-6, 0.0)
