"""The resonance engine against textbook closed forms and limiting cases.

Sources, named per check:
- Alexander & Sadiku, Fundamentals of Electric Circuits, 5th ed., section 14.5 (series RLC:
  half-power frequencies f1,2 = f0(√(1 + 1/(4Q²)) ∓ 1/(2Q)), bandwidth R/(2πL)) —
  section number from memory.
- E. Hughes, Electrical and Electronic Technology, chapter on parallel resonance (lossy coil
  in parallel with C: f_upf = f0 √(1 − r²C/L); dynamic resistance L/(Cr)) — from memory.
- scipy.optimize.brentq on an impedance written out independently in this file.
The ngspice comparison lives in tests/engine/test_resonance_ngspice.py.
"""

import math

import numpy as np
import pytest
from scipy.optimize import brentq, minimize_scalar

from sheetgen.engine import resonance
from tests.support import assert_close

TIGHT = 1e-9  # bisection to ~1e-15 in ln f; 1e-9 leaves room for float round-off

SERIES = [  # L, rL, C, rC, Rs, RL  (invented)
    (10e-3, 20.0, 1e-6, 1.0, 25.0, 4.0),      # Q ≈ 2
    (220e-6, 3.0, 1e-9, 0.5, 50.0, None),
    (1.5e-6, 0.9, 180e-12, 0.1, None, 0.83),
    (0.1e-6, 0.15, 10e-12, 0.05, None, None),  # Q ≈ 500
]


@pytest.mark.parametrize("L, r_l, C, r_c, r_s, r_load", SERIES)
def test_series_half_power_points_match_the_closed_form(L, r_l, C, r_c, r_s, r_load):
    """Alexander & Sadiku §14.5: f1,2 = f0(√(1 + 1/(4Q²)) ∓ 1/(2Q)), Q = ω0L/R."""
    circuit = resonance.Circuit("series", L, r_l, C, r_c, r_s, r_load)
    got = resonance.analyse(circuit)
    resistance = r_l + r_c + (r_s or 0.0) + (r_load or 0.0)
    f0 = 1 / (2 * math.pi * math.sqrt(L * C))
    q = 2 * math.pi * f0 * L / resistance
    root = math.sqrt(1 + 1 / (4 * q * q))
    assert_close(got.f0_hz, f0, rel=1e-12, what="f0")
    assert_close(got.f_peak_hz, f0, rel=TIGHT, what="f_peak")
    assert_close(got.f_low_hz, f0 * (root - 1 / (2 * q)), rel=TIGHT, what="f_low")
    assert_close(got.f_high_hz, f0 * (root + 1 / (2 * q)), rel=TIGHT, what="f_high")
    assert_close(got.bandwidth_hz, resistance / (2 * math.pi * L), rel=1e-8, what="bandwidth")
    assert_close(got.q_loaded, q, rel=1e-8, what="loaded Q")
    assert_close(got.impedance_at_peak_ohm, resistance - (r_s or 0.0), rel=1e-9,
                 what="|Z| at resonance is the loop's resistance")


@pytest.mark.parametrize("q", np.geomspace(0.005, 1000.0, 23))
def test_series_half_power_points_wherever_they_are(q):
    """Alexander & Sadiku §14.5: f1,2 = f0(√(1 + 1/(4Q²)) ∓ 1/(2Q)), evaluated with mpmath at
    40 digits (no cancellation at small Q). At Q ≤ 0.02 the edges lie beyond 50·f0 and f0/50,
    and still exist: the loop current keeps falling on both sides."""
    mpmath = pytest.importorskip("mpmath")
    mpmath.mp.dps = 40
    L, f0 = 4.7e-6, 1.0e6  # invented
    C = 1 / ((2 * math.pi * f0) ** 2 * L)
    f0 = 1 / (2 * math.pi * math.sqrt(L * C))
    resistance = 2 * math.pi * f0 * L / q
    got = resonance.analyse(resonance.Circuit("series", L, 0.75 * resistance, C, 0.25 * resistance))
    qm = mpmath.mpf(2 * math.pi * f0 * L) / mpmath.mpf(resistance)
    root = mpmath.sqrt(1 + 1 / (4 * qm * qm))
    assert got.f_low_hz is not None and got.f_high_hz is not None, f"Q = {q:.4g}: no edges"
    assert_close(got.f_low_hz, float(f0 * (root - 1 / (2 * qm))), rel=TIGHT, what="f_low")
    assert_close(got.f_high_hz, float(f0 * (root + 1 / (2 * qm))), rel=TIGHT, what="f_high")
    assert_close(got.bandwidth_hz, resistance / (2 * math.pi * L), rel=1e-8, what="bandwidth")


PARALLEL_LOSSY_COIL = [  # L, rL, C (invented); rC = 0, no source or load resistance
    (1e-3, 40.0, 10e-9),
    (47e-3, 30.0, 220e-9),
    (2.7e-6, 0.5, 220e-12),
    (10e-6, 30.0, 100e-12),  # Q ≈ 10.5: the three frequencies part visibly
]


@pytest.mark.parametrize("L, r, C", PARALLEL_LOSSY_COIL)
def test_parallel_unity_power_factor_frequency(L, r, C):
    """Hughes: f_upf = f0 √(1 − r²C/L), and the phase of Z is zero there (brentq on
    Z = (r + jωL) ∥ 1/(jωC) written out here)."""
    got = resonance.analyse(resonance.Circuit("parallel", L, r, C, 0.0, None, None))
    f0 = 1 / (2 * math.pi * math.sqrt(L * C))
    assert_close(got.f_unity_pf_hz, f0 * math.sqrt(1 - r * r * C / L), rel=1e-12,
                 what="f_upf closed form")

    def phase(f):
        w = 2 * math.pi * f
        z = 1 / (1 / (r + 1j * w * L) + 1j * w * C)
        return math.atan2(z.imag, z.real)

    zero = brentq(phase, 0.5 * f0, 1.5 * f0, xtol=1e-6, rtol=1e-14)
    assert_close(got.f_unity_pf_hz, zero, rel=1e-10, what="phase zero by brentq")


@pytest.mark.parametrize("L, r, C", PARALLEL_LOSSY_COIL)
def test_parallel_peak_is_the_maximum_of_the_impedance(L, r, C):
    """The frequency of maximum |Z| found by scipy's bounded minimiser on -|Z| (written
    out here), and |Z| there; for high Q, |Z| → L/(Cr) (Hughes)."""
    got = resonance.analyse(resonance.Circuit("parallel", L, r, C, 0.0, None, None))
    f0 = 1 / (2 * math.pi * math.sqrt(L * C))

    def minus_z(u):
        w = 2 * math.pi * f0 * math.exp(u)
        return -abs(1 / (1 / (r + 1j * w * L) + 1j * w * C))

    best = minimize_scalar(minus_z, bounds=(-0.5, 0.5), method="bounded",
                           options={"xatol": 1e-12})
    assert_close(got.f_peak_hz, f0 * math.exp(best.x), rel=1e-6, what="f_peak")
    assert_close(got.impedance_at_peak_ohm, -best.fun, rel=1e-10, what="|Z| at the peak")
    q = 2 * math.pi * f0 * L / r
    assert_close(got.impedance_at_peak_ohm, L / (C * r), rel=2 / q**2, what="L/(Cr), high Q")


def test_parallel_frequencies_part_at_low_q():
    """At Q ≈ 3 the unity-pf frequency lies below f0 and the |Z| maximum between them
    (Hughes; the ordering is the textbook's, the values from the cases above)."""
    got = resonance.analyse(resonance.Circuit("parallel", 10e-6, 60.0, 100e-12, 0.0, None, None))
    assert got.f_unity_pf_hz < got.f_peak_hz < got.f0_hz
    assert (got.f0_hz - got.f_unity_pf_hz) / got.f0_hz > 0.01


def test_lossless_limit():
    """rL = rC = 0 and no resistances: Q is unbounded and reported as not applicable."""
    got = resonance.analyse(resonance.Circuit("series", 1e-6, 0.0, 1e-9, 0.0, None, 10.0))
    assert got.q_unloaded is None and got.q_inductor is None
    assert_close(got.q_loaded, 2 * math.pi * got.f0_hz * 1e-6 / 10.0, rel=1e-8, what="Q")


def test_vectorised_equals_one_at_a_time():
    """Arrays in, one result per element, each equal to the scalar analysis."""
    L = np.array([1e-6, 2e-6, 4e-6])
    circuit = resonance.Circuit("parallel", L, 0.2, 100e-12, 0.01, 20e3, None)
    features = resonance.response_features(circuit)
    for i, inductance in enumerate(L):
        single = resonance.analyse(resonance.Circuit("parallel", float(inductance), 0.2, 100e-12, 0.01,
                                       20e3, None))
        assert_close(features.f_peak_hz[i], single.f_peak_hz, rel=1e-12, what="f_peak")
        assert_close(features.f_high_hz[i], single.f_high_hz, rel=1e-12, what="f_high")


def test_no_resonance_is_reported():
    """A coil whose loss dwarfs its reactance (rL = 10 kΩ ≫ X0 = 316 Ω): |Z| only falls
    with frequency, so there is no maximum to report."""
    with pytest.raises(resonance.NoResonanceError):
        resonance.analyse(resonance.Circuit("parallel", 10e-6, 10e3, 100e-12, 0.0, None, None))


def test_heavily_shunted_tank_has_its_half_power_points_far_out():
    """Shunted by 1 Ω the tank's response barely moves near f0; it falls by 3 dB only where
    the coil (low f) or the capacitor (high f) itself shorts the node, hundreds of times
    away from f0. Check: brentq on the node admittance written out here,
    D = 1/Rs + 1/(rL + jωL) + jωC, for |D|² = 2·|D|² at the unity-power-factor frequency
    (Hughes), |D|'s minimum. So flat a response (|D| within 1e-5 of 1/Rs over a decade)
    has its maximum located only to that level, hence 1e-4 on the edges."""
    L, r, C, r_s = 10e-6, 1.0, 100e-12, 1.0
    got = resonance.analyse(resonance.Circuit("parallel", L, r, C, 0.0, r_s, None))

    def d2(f):
        w = 2 * math.pi * f
        return abs(1 / r_s + 1 / (r + 1j * w * L) + 1j * w * C) ** 2

    f0 = 1 / (2 * math.pi * math.sqrt(L * C))
    target = 2 * d2(f0 * math.sqrt(1 - r * r * C / L))
    low = brentq(lambda f: d2(f) - target, f0 / 1e4, f0, rtol=1e-14)
    high = brentq(lambda f: d2(f) - target, f0, f0 * 1e4, rtol=1e-14)
    assert low < f0 / 50 and high > 50 * f0, "beyond the old ±50× search"
    assert_close(got.f_low_hz, low, rel=1e-4, what="f_low")
    assert_close(got.f_high_hz, high, rel=1e-4, what="f_high")


def test_half_power_points_absent_where_the_response_never_falls_3_db():
    """A tank across an ideal current source (no Rs) with a very lossy coil: at low
    frequency |Z| tends to rL, so with rL ≥ |Z_peak|/√2 there is no lower half-power point
    at any frequency; the search reports none rather than one at its far end."""
    # rL = 400 Ω > X0 (316 Ω): |Z| at dc is 400 Ω, its maximum about 448 Ω (|Z| written out).
    L, r, C = 10e-6, 400.0, 100e-12
    got = resonance.response_features(resonance.Circuit("parallel", L, r, C, 0.0, None, None))
    f = np.geomspace(1.0, 1e12, 200001)
    z = np.abs(1 / (1 / (r + 2j * np.pi * f * L) + 2j * np.pi * f * C))
    assert z[0] > z.max() / math.sqrt(2), "premise: dc |Z| above the half-power level"
    assert z.max() > 1.05 * z[0] and not np.isnan(got.f_peak_hz), "premise: a maximum"
    assert np.isnan(got.f_low_hz) and not np.isnan(got.f_high_hz)


def test_sweep_is_zero_db_at_the_peak_and_minus_3_at_the_edges():
    """−10·log10(2) = −3.0103 dB at the half-power points (definition)."""
    circuit = resonance.Circuit("series", 1e-6, 1.0, 1e-9, 0.0, 50.0, None)
    got = resonance.analyse(circuit)
    sweep = resonance.sweep(circuit, np.array([got.f_low_hz, got.f_peak_hz, got.f_high_hz]))
    assert_close(sweep.response_db[1], 0.0, abs=1e-9, what="peak")
    for edge in (0, 2):
        assert_close(sweep.response_db[edge], -10 * math.log10(2), abs=1e-7, what="edge")


@pytest.mark.parametrize("q, share_l", [(2.0, 0.5), (2.0, 0.8), (5.0, 0.3), (100.0, 0.5)])
def test_dynamic_resistance_is_the_tank_impedance_at_zero_phase(q, share_l):
    """Dynamic resistance: |Z| of the tank where its phase is zero. Reference: the branch
    impedances written out here, Z = 1/(1/(rL + jωL) + 1/(rC + 1/(jωC))), numpy, its zero of
    Im Z found by brentq. At Q = 2 with both losses the textbook X0²/(rL + rC) (Hughes) is
    several per cent off; at Q = 100 it agrees to ~1/Q²."""
    L, C = 1e-6, 25.33e-9  # invented, f0 ≈ 1 MHz
    f0 = 1 / (2 * math.pi * math.sqrt(L * C))
    x0 = 2 * math.pi * f0 * L
    r_l, r_c = share_l * x0 / q, (1 - share_l) * x0 / q

    def z(f):
        w = 2 * np.pi * f
        return 1 / (1 / (r_l + 1j * w * L) + 1 / (r_c + 1 / (1j * w * C)))

    zero = brentq(lambda f: z(f).imag, 0.3 * f0, 3 * f0, xtol=1e-9, rtol=1e-15)
    exact = abs(z(zero))
    got = resonance.analyse(resonance.Circuit("parallel", L, r_l, C, r_c, None, 1e9))
    assert_close(got.dynamic_resistance_ohm, exact, rel=1e-9, what="|Z| at zero phase")
    approximation = x0 * x0 / (r_l + r_c)
    if q == 2.0 and share_l == 0.5:
        assert abs(approximation / exact - 1) > 0.05, "premise: X0²/(rL + rC) is > 5 % off"
