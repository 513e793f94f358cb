"""sheetgen.engine.limits: test windows and the trimmer range.

Sources (see tests/reference/variation.md):
- Thomson's formula f0 = 1/(2π√(LC)), solved for C: C = 1/(ω² L); series bandwidth
  B = R/(2πL): Alexander & Sadiku, Fundamentals of Electric Circuits, 5th ed., §14.5.
- The central interval of a normal distribution at coverage c is ±z σ with
  z = Φ⁻¹((1 + c)/2), from scipy.stats.norm; first-order propagation of the tolerances
  (JCGM 100:2008 §5.1.2) makes f0 normal with σ_f/f = ½√(σL² + σC²) for small normal bands.
- The standard error of a sample quantile, √(p(1 − p)/N)/pdf(z) (e.g. Stuart & Ord,
  Kendall's Advanced Theory of Statistics, vol. 1, §10.10), sets the tolerances.

Circuit values are invented.
"""

import math

import numpy as np
import pytest
from scipy import stats

from sheetgen.engine import limits
from sheetgen.engine.resonance import Circuit, resonant_frequency_hz
from sheetgen.engine.variation import Spread, VariationSpec, monte_carlo, worst_case
from tests.support import assert_close

SERIES = Circuit("series", 10e-6, 2.0, 100e-12, 0.1, 5.0, 3.0)  # ~5.03 MHz


def test_worst_case_windows_are_the_corners_rounded_outward():
    spec = VariationSpec(inductance=Spread(0.05), capacitance=Spread(0.05),
                         inductor_resistance=Spread(0.1))
    result = limits.test_limits(worst_case(SERIES, spec), resolution_hz=1e3)
    L, C = SERIES.inductance_h, SERIES.capacitance_f
    f_low = float(resonant_frequency_hz(L * 1.05, C * 1.05))  # Thomson: 4.793 MHz
    f_high = float(resonant_frequency_hz(L * 0.95, C * 0.95))  # 5.298 MHz
    assert result.method == "worst-case" and result.coverage is None and result.seed is None
    assert result.f0_min_hz == math.floor(f_low / 1e3) * 1e3
    assert result.f0_max_hz == math.ceil(f_high / 1e3) * 1e3
    assert result.f_peak_min_hz == result.f0_min_hz  # series: the peak is at f0
    # B = R/(2πL), widest with the most resistance and the least inductance
    r_max, r_min = 5.0 + 2.2 + 0.1 + 3.0, 5.0 + 1.8 + 0.1 + 3.0
    assert result.bandwidth_max_hz == math.ceil(r_max / (2 * math.pi * L * 0.95) / 1e3) * 1e3
    assert result.bandwidth_min_hz == math.floor(r_min / (2 * math.pi * L * 1.05) / 1e3) * 1e3
    q_min = math.sqrt(L * 0.95 / (C * 1.05)) / r_max
    assert_close(result.q_loaded_min, math.floor(q_min * 10) / 10, abs=1e-12,
                 what="lowest loaded Q, rounded down to 0.1")


@pytest.mark.parametrize("coverage, rel", [
    # the edge's quantile standard error, √(p(1−p)/N)/pdf(z)·σ_f, is ~3e-5 of f0 at
    # N = 100 000; 2.5e-4 allows that, the second-order skew and 1 Hz rounding
    pytest.param(0.9973, 2.5e-4, id="3-sigma"),
    pytest.param(0.90, 1.5e-4, id="90%"),
    pytest.param(0.50, 1.5e-4, id="50%"),
])
def test_monte_carlo_window_matches_the_normal_central_interval(coverage, rel):
    band = 0.01
    spec = VariationSpec(inductance=Spread(band, "normal"), capacitance=Spread(band, "normal"),
                         trials=100_000, seed=2)
    result = limits.test_limits(monte_carlo(SERIES, spec), coverage, resolution_hz=1.0)
    f0 = float(resonant_frequency_hz(SERIES.inductance_h, SERIES.capacitance_f))
    sigma_rel = 0.5 * math.hypot(band / 3, band / 3)  # GUM §5.1.2, normal band = ±3σ
    z = stats.norm.ppf((1.0 + coverage) / 2.0)
    assert result.method == "monte-carlo" and result.coverage == coverage
    assert result.trials == 100_000 and result.seed == 2
    assert_close(result.f0_min_hz, f0 * (1 - z * sigma_rel), rel=rel, what="f0 window low")
    assert_close(result.f0_max_hz, f0 * (1 + z * sigma_rel), rel=rel, what="f0 window high")


def test_windows_hold_at_least_the_coverage_of_the_trials():
    spec = VariationSpec(inductance=Spread(0.05), capacitance=Spread(0.02, "normal"),
                         inductor_resistance=Spread(0.2), trials=20_000, seed=4)
    variation = monte_carlo(SERIES, spec)
    result = limits.test_limits(variation, 0.95, resolution_hz=1e3)
    inside = ((variation.f0_hz >= result.f0_min_hz) & (variation.f0_hz <= result.f0_max_hz))
    assert inside.mean() >= 0.95
    bw = variation.bandwidth_hz
    assert ((bw >= result.bandwidth_min_hz) & (bw <= result.bandwidth_max_hz)).mean() >= 0.95
    q = variation.q_loaded
    assert ((q >= result.q_loaded_min) & (q <= result.q_loaded_max)).mean() >= 0.95
    for value in (result.f0_min_hz, result.f0_max_hz, result.bandwidth_min_hz,
                  result.bandwidth_max_hz):
        assert value % 1e3 == 0.0  # on the instrument's 1 kHz steps


def test_default_coverage_is_the_variations_own():
    spec = VariationSpec(capacitance=Spread(0.02), trials=2_000, coverage=0.8)
    result = limits.test_limits(monte_carlo(SERIES, spec), resolution_hz=1.0)
    assert result.coverage == 0.8


@pytest.mark.parametrize("value, step, down, up", [
    (4_793_260.4, 1e3, 4_793_000.0, 4_794_000.0),
    (7_100_000.0, 1e3, 7_100_000.0, 7_100_000.0),  # a multiple stays put
    (12.345, 0.1, 12.3, 12.4),
    (0.30000000000000004, 0.1, 0.3, 0.3),  # 3 × 0.1 in binary is a multiple
])
def test_rounding_is_outward_to_the_resolution(value, step, down, up):
    assert limits.round_down(value, step) == down
    assert limits.round_up(value, step) == up


def test_test_limits_is_not_collected_as_a_test():
    assert limits.test_limits.__test__ is False
    assert limits.TestLimits.__test__ is False


def _needed_f(f_hz, inductance_h, fixed_f):
    """Thomson's formula solved for C, less the fixed capacitance."""
    return 1.0 / ((2 * math.pi * f_hz) ** 2 * inductance_h) - fixed_f


def test_trimmer_range_worst_case_is_thomson_at_the_extremes():
    # target 5.0 MHz: 10 µH ±5 % with 82 pF ±5 % fixed and a trimmer of 5 … 40 pF
    circuit = Circuit("series", 10e-6, 2.0, 100e-12, 0.1, 5.0, 3.0)
    spec = VariationSpec(inductance=Spread(0.05), capacitance=Spread(0.05))
    check = limits.trimmer_check(worst_case(circuit, spec), 5.0e6, 82e-12, 5e-12, 40e-12)
    needed_max = _needed_f(5.0e6, 10e-6 * 0.95, 82e-12 * 0.95)  # least L, least C_fixed
    needed_min = _needed_f(5.0e6, 10e-6 * 1.05, 82e-12 * 1.05)
    assert_close(check.needed_max_f, needed_max, rel=1e-12, what="most trim needed")
    assert_close(check.needed_min_f, needed_min, rel=1e-12, what="least trim needed")
    assert_close(check.nominal_needed_f, _needed_f(5.0e6, 10e-6, 82e-12), rel=1e-12,
                 what="nominal trim")
    assert check.covers
    assert_close(check.margin_low_f, needed_min - 5e-12, rel=1e-9, what="room below")
    assert_close(check.margin_high_f, 40e-12 - needed_max, rel=1e-9, what="room above")
    assert check.fraction_tunable == 1.0


def test_trimmer_too_small_is_reported_with_its_shortfall():
    circuit = Circuit("series", 10e-6, 2.0, 100e-12, 0.1, 5.0, 3.0)
    spec = VariationSpec(inductance=Spread(0.05), capacitance=Spread(0.05), trials=20_000)
    variation = monte_carlo(circuit, spec)
    check = limits.trimmer_check(variation, 5.0e6, 82e-12, 10e-12, 25e-12, coverage=0.99)
    needed_max = _needed_f(5.0e6, 10e-6 * 0.95, 82e-12 * 0.95)  # ≈ 33.6 pF
    assert not check.covers
    assert check.margin_high_f < 0.0
    # uniform bands: no trial needs more than the worst corner, and the 99 % edge is near
    assert check.needed_max_f <= needed_max
    assert_close(check.needed_max_f, needed_max, rel=0.1, what="99 % edge of the trim")
    # the share of trials the trimmer can tune is the share needing 10 … 25 pF
    needed = _needed_f(5.0e6, variation.parts.inductance_h,
                       82e-12 * variation.parts.capacitance_factor)
    assert_close(check.fraction_tunable, float(np.mean((needed >= 10e-12) & (needed <= 25e-12))),
                 abs=1e-12, what="fraction tunable")


def test_sampled_parts_are_the_monte_carlo_draws():
    """sample_parts gives the very trials monte_carlo evaluates (same seed, same streams),
    so a trimmer check on either agrees."""
    from sheetgen.engine.resonance import Circuit
    from sheetgen.engine.variation import Spread, VariationSpec, monte_carlo, sample_parts
    circuit = Circuit("parallel", 2.2e-6, 0.5, 228e-12, 0.02, 10e3, 17e3)
    spec = VariationSpec(capacitance=Spread(0.02), inductance=Spread(0.05), trials=500, seed=3)
    full, parts = monte_carlo(circuit, spec), sample_parts(circuit, spec, "monte-carlo")
    assert (full.parts.inductance_h == parts.parts.inductance_h).all()
    assert (full.parts.capacitance_f == parts.parts.capacitance_f).all()
