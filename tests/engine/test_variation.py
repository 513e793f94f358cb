"""sheetgen.engine.variation checked against closed forms and statistics outside the code.

Sources (see tests/reference/variation.md):
- Thomson's formula f0 = 1/(2π√(LC)) and the series-RLC bandwidth B = R/(2πL), with
  Q = √(L/C)/R and the half-power points f0(√(1 + 1/4Q²) ± 1/2Q): Alexander & Sadiku,
  Fundamentals of Electric Circuits, 5th ed., §14.5.
- The dynamic resistance of a high-Q parallel tank, R_d = L/(C r): Hughes, Electrical and
  Electronic Technology, 10th ed., ch. 15 (the parallel resonance section).
- First-order propagation of uncertainty, u²(f) = Σ (∂f/∂x_i)² u²(x_i), and its second-order
  mean term: JCGM 100:2008 (GUM) §5.1.2; for f ∝ L^(-1/2) C^(-1/2),
  δf/f = −½(δL/L + δC/C) and E[f]/f0 ≈ 1 + (3/8)(σL² + σC²).
- A rectangular (uniform) band ±b has σ = b/√3: GUM §4.3.7. A normal band given as ±3σ
  has σ = b/3 (common practice); P(|Z| > 3) from scipy.stats.norm.
- EIA-198 class 2 code X7R: ±15 % over −55 … 125 °C (from memory).

All circuit values are invented.
"""

import dataclasses
import math

import numpy as np
import pytest
from scipy import stats

from sheetgen.engine.resonance import Circuit, resonant_frequency_hz
from sheetgen.engine.variation import (
    DIELECTRICS,
    Spread,
    TemperatureBand,
    TemperatureCoefficient,
    VariationSpec,
    dielectric,
    monte_carlo,
    worst_case,
)
from tests.support import assert_close

SERIES = Circuit("series", 10e-6, 2.0, 253.3e-12, 0.1, 5.0, 3.0)  # ~3.16 MHz, Q ≈ 19
PARALLEL_HIGH_Q = Circuit("parallel", 10e-6, 1.0, 253.3e-12, 0.0, None, None)  # Q ≈ 199


def _f0(circuit: Circuit) -> float:
    return float(resonant_frequency_hz(circuit.inductance_h, circuit.capacitance_f))


def _sigma(band: float, distribution: str) -> float:
    """GUM §4.3.7 rectangular u = b/√3; a normal band of ±3σ, u = b/3 (common practice)."""
    return band / math.sqrt(3.0) if distribution == "uniform" else band / 3.0


# (distribution, band of L, band of C, trials, rel. tolerance on the mean, on σ).
# Mean: the GUM second-order term (3/8)(σL² + σC²) is included; the tolerance is about
# 5 standard errors σ_f/√N. σ: the sample σ has a relative standard error ≈ 1/√(2N).
FIRST_ORDER = [
    pytest.param("uniform", 0.01, 0.01, 40_000, 1e-4, 0.02, id="uniform-1%-1%"),
    pytest.param("normal", 0.01, 0.01, 40_000, 1e-4, 0.02, id="normal-1%-1%"),
    pytest.param("uniform", 0.02, 0.005, 40_000, 1.5e-4, 0.02, id="uniform-2%-0.5%"),
    pytest.param("normal", 0.05, 0.02, 40_000, 2.5e-4, 0.02, id="normal-5%-2%"),
]


@pytest.mark.parametrize("distribution, band_l, band_c, trials, rel_mean, rel_sigma",
                         FIRST_ORDER)
def test_f0_spread_follows_first_order_propagation(distribution, band_l, band_c, trials,
                                                   rel_mean, rel_sigma):
    spec = VariationSpec(inductance=Spread(band_l, distribution),
                         capacitance=Spread(band_c, distribution), trials=trials, seed=7)
    result = monte_carlo(SERIES, spec)
    f0 = _f0(SERIES)
    s_l, s_c = _sigma(band_l, distribution), _sigma(band_c, distribution)
    # GUM §5.1.2: δf/f = −½(δL/L + δC/C) → σ_f/f = ½√(σL² + σC²)
    assert_close(result.summary.f0_hz.std, f0 * 0.5 * math.hypot(s_l, s_c), rel=rel_sigma,
                 what="σ of f0 vs first-order propagation")
    assert_close(result.summary.f0_hz.mean, f0 * (1.0 + 0.375 * (s_l**2 + s_c**2)),
                 rel=rel_mean, what="mean of f0 vs second-order propagation")
    # the series peak is at f0 exactly (Alexander & Sadiku §14.5)
    assert_close(result.summary.f_peak_hz.std, result.summary.f0_hz.std, rel=1e-6,
                 what="σ of the series peak vs σ of f0")


def test_temperature_coefficient_shifts_and_spreads_f0():
    # α_C = +100 ppm/K over 25 … 85 °C drawn uniformly: δC/C uniform on [0, 6e-3], so by
    # first-order propagation (GUM §5.1.2, §4.3.7) δf/f has mean −1.5e-3, σ = ½·6e-3/√12.
    spec = VariationSpec(capacitor_temperature=TemperatureCoefficient(100e-6),
                         temperature_min_c=25.0, temperature_max_c=85.0, trials=40_000)
    result = monte_carlo(SERIES, spec)
    f0 = _f0(SERIES)
    assert_close(result.summary.f0_hz.mean / f0 - 1.0, -1.5e-3, rel=0.01,
                 what="mean δf/f from the temperature coefficient")
    assert_close(result.summary.f0_hz.std / f0, 0.5 * 6e-3 / math.sqrt(12.0), rel=0.02,
                 what="σ of δf/f from a uniform temperature")


def test_inductance_temperature_coefficient_moves_f0_the_other_way():
    # α_L = −200 ppm/K at a fixed 75 °C: L·(1 − 0.01), f0 = Thomson at that L, exactly.
    spec = VariationSpec(inductance_temperature=TemperatureCoefficient(-200e-6),
                         temperature_min_c=75.0, temperature_max_c=75.0, trials=10)
    result = monte_carlo(SERIES, spec)
    expected = float(resonant_frequency_hz(SERIES.inductance_h * 0.99, SERIES.capacitance_f))
    assert_close(float(result.f0_hz.max()), expected, rel=1e-12, what="f0 at 75 °C")
    assert_close(float(result.f0_hz.min()), expected, rel=1e-12, what="f0 at 75 °C")


def test_worst_case_f0_is_thomson_at_the_extreme_parts():
    spec = VariationSpec(inductance=Spread(0.05, "normal"), capacitance=Spread(0.10),
                         inductance_temperature=TemperatureCoefficient(200e-6),
                         temperature_min_c=0.0, temperature_max_c=50.0)
    result = worst_case(SERIES, spec)
    assert result.trials == 2**3  # temperature ends × L band × C band
    assert result.method == "worst-case" and result.seed is None and result.coverage is None
    L, C = SERIES.inductance_h, SERIES.capacitance_f
    l_max, l_min = L * 1.05 * (1 + 200e-6 * 25.0), L * 0.95 * (1 - 200e-6 * 25.0)
    # Thomson's formula at the largest L and C, and at the smallest
    assert_close(result.summary.f0_hz.low, float(resonant_frequency_hz(l_max, C * 1.10)),
                 rel=1e-12, what="lowest f0 of the corners")
    assert_close(result.summary.f0_hz.high, float(resonant_frequency_hz(l_min, C * 0.90)),
                 rel=1e-12, what="highest f0 of the corners")


def test_worst_case_bandwidth_and_q_of_a_series_circuit_are_closed_forms():
    circuit = Circuit("series", 22e-6, 4.0, 470e-12, 0.3, 10.0, 12.0)
    spec = VariationSpec(inductance=Spread(0.05), capacitance=Spread(0.05),
                         inductor_resistance=Spread(0.2), capacitor_esr=Spread(0.5),
                         load_resistance=Spread(0.01))
    result = worst_case(circuit, spec)
    assert result.trials == 2**5
    L, C = circuit.inductance_h, circuit.capacitance_f
    r_max = 10.0 + 4.0 * 1.2 + 0.3 * 1.5 + 12.0 * 1.01
    r_min = 10.0 + 4.0 * 0.8 + 0.3 * 0.5 + 12.0 * 0.99
    # Alexander & Sadiku §14.5: B = R/(2πL) exactly; Q = √(L/C)/R
    assert_close(result.summary.bandwidth_hz.high, r_max / (2 * math.pi * L * 0.95), rel=1e-9,
                 what="widest bandwidth")
    assert_close(result.summary.bandwidth_hz.low, r_min / (2 * math.pi * L * 1.05), rel=1e-9,
                 what="narrowest bandwidth")
    assert_close(result.summary.q_loaded.low, math.sqrt(L * 0.95 / (C * 1.05)) / r_max,
                 rel=1e-9, what="lowest loaded Q")
    assert_close(result.summary.q_loaded.high, math.sqrt(L * 1.05 / (C * 0.95)) / r_min,
                 rel=1e-9, what="highest loaded Q")
    # |Z| at the series peak is the loop resistance without the source's own
    assert_close(result.summary.impedance_at_peak_ohm.high, r_max - 10.0, rel=1e-9,
                 what="largest terminal |Z| at the peak")


def test_source_resistance_spread_moves_a_series_bandwidth_by_its_share():
    """A bench fixture's source tolerance: B = R_loop/(2πL) exactly (Alexander & Sadiku
    §14.5), so a ±10 % source of 10 Ω in a loop of 26 Ω moves B by ±1 Ω/26 Ω; with no
    source spread the source stays nominal in every trial."""
    circuit = Circuit("series", 22e-6, 4.0, 470e-12, 0.0, 10.0, 12.0)
    result = worst_case(circuit, VariationSpec(source_resistance=Spread(0.10)))
    assert result.trials == 2
    L = circuit.inductance_h
    assert_close(result.summary.bandwidth_hz.high, 27.0 / (2 * math.pi * L), rel=1e-9)
    assert_close(result.summary.bandwidth_hz.low, 25.0 / (2 * math.pi * L), rel=1e-9)
    fixed = monte_carlo(circuit, VariationSpec(load_resistance=Spread(0.01), trials=50))
    assert fixed.parts.source_resistance_ohm is None
    assert np.ptp(fixed.bandwidth_hz) < 0.13 / (2 * math.pi * L) * 2


def test_uniform_trials_stay_inside_the_worst_case_corners():
    spec = VariationSpec(inductance=Spread(0.03), capacitance=Spread(0.05),
                         inductor_resistance=Spread(0.1), trials=20_000, seed=3)
    mc, wc = monte_carlo(SERIES, spec), worst_case(SERIES, spec)
    # f0 is monotonic in L and C (Thomson), so a band-limited draw cannot leave the corners
    assert wc.summary.f0_hz.low <= mc.summary.f0_hz.minimum
    assert mc.summary.f0_hz.maximum <= wc.summary.f0_hz.high
    # and a uniform band is reached: the extremes come within 1 % of the band's edge
    band_reached = (mc.parts.inductance_h.max() / SERIES.inductance_h - 1.0) / 0.03
    assert_close(band_reached, 1.0, abs=0.01, what="uniform draw reaches the band edge")


def test_normal_band_is_three_sigma():
    n = 200_000
    spec = VariationSpec(capacitance=Spread(0.05, "normal"), trials=n, seed=11)
    result = monte_carlo(SERIES, spec)
    deviation = result.parts.capacitance_f / SERIES.capacitance_f - 1.0
    outside = int(np.count_nonzero(np.abs(deviation) > 0.05))
    p = 2.0 * stats.norm.sf(3.0)  # scipy: P(|Z| > 3) = 0.0026998
    # binomial: the count outside ±3σ is n·p ± 4 standard deviations
    assert_close(outside, n * p, abs=4.0 * math.sqrt(n * p * (1 - p)),
                 what="trials outside the ±3σ band")


def test_class_2_band_reaches_its_limits_at_the_rated_ends_only():
    x7r = dielectric("X7R")
    assert x7r.dielectric_class == 2
    f0 = _f0(SERIES)
    full = worst_case(SERIES, VariationSpec(capacitor_temperature=x7r.temperature,
                                            temperature_min_c=-55.0, temperature_max_c=125.0))
    # EIA-198 X7R: ΔC/C within ±15 % (from memory); Thomson at C·(1 ∓ 0.15)
    assert_close(full.summary.f0_hz.high, f0 / math.sqrt(0.85), rel=1e-12,
                 what="f0 with C at −15 %")
    assert_close(full.summary.f0_hz.low, f0 / math.sqrt(1.15), rel=1e-12,
                 what="f0 with C at +15 %")
    at_reference = monte_carlo(SERIES, VariationSpec(capacitor_temperature=x7r.temperature,
                                                     trials=100))
    # at the reference temperature a class 2 part has no temperature change at all
    assert_close(float(np.ptp(at_reference.f0_hz)), 0.0, abs=1e-9 * f0,
                 what="spread of f0 at 25 °C")


def test_class_2_band_beyond_its_rated_range_is_refused():
    with pytest.raises(ValueError, match="rated range"):
        VariationSpec(capacitor_temperature=dielectric("X5R").temperature,
                      temperature_min_c=-40.0, temperature_max_c=105.0)


def test_dielectric_table_holds_the_standard_figures():
    # EIA-198 / IEC 60384-8 and -9 letter codes (from memory)
    assert dielectric("np0") is DIELECTRICS["C0G"]
    c0g = DIELECTRICS["C0G"].temperature
    assert isinstance(c0g, TemperatureCoefficient)
    assert_close(c0g.per_kelvin, 0.0, abs=1e-12, what="C0G nominal TC")
    assert_close(c0g.band_per_kelvin, 30e-6, rel=1e-12, what="C0G TC band")
    y5v = DIELECTRICS["Y5V"].temperature
    assert isinstance(y5v, TemperatureBand)
    assert (y5v.change_low, y5v.change_high, y5v.rated_min_c, y5v.rated_max_c) == (
        -0.82, 0.22, -30.0, 85.0)
    with pytest.raises(ValueError, match="unknown dielectric"):
        dielectric("Z9Q")


def test_same_seed_gives_identical_trials_and_another_seed_does_not():
    spec = VariationSpec(inductance=Spread(0.05, "normal"), capacitance=Spread(0.02),
                         capacitor_esr=Spread(0.3), temperature_min_c=-10.0,
                         temperature_max_c=60.0,
                         capacitor_temperature=TemperatureCoefficient(0.0, 30e-6),
                         trials=5_000, seed=42)
    first, second = monte_carlo(SERIES, spec), monte_carlo(SERIES, spec)
    for name in ("f0_hz", "f_peak_hz", "bandwidth_hz", "q_loaded", "impedance_at_peak_ohm"):
        assert getattr(first, name).tobytes() == getattr(second, name).tobytes(), name
    assert first.summary == second.summary
    other = monte_carlo(SERIES, dataclasses.replace(spec, seed=43))
    assert not np.array_equal(first.f0_hz, other.f0_hz)


def test_each_quantity_draws_from_its_own_stream():
    base = VariationSpec(capacitance=Spread(0.05), trials=1_000, seed=5)
    more = VariationSpec(capacitance=Spread(0.05), capacitor_esr=Spread(0.5), trials=1_000,
                         seed=5)
    # adding an ESR spread must not change the capacitance drawn for each trial
    assert np.array_equal(monte_carlo(SERIES, base).parts.capacitance_f,
                          monte_carlo(SERIES, more).parts.capacitance_f)


def test_result_arrays_are_read_only():
    result = monte_carlo(SERIES, VariationSpec(capacitance=Spread(0.01), trials=10))
    with pytest.raises(ValueError):
        result.f0_hz[0] = 0.0


def test_heavily_damped_series_trials_keep_their_bandwidth():
    # f_high = f0(√(1 + 1/4Q²) + 1/2Q) (Alexander & Sadiku §14.5) passes 50·f0 when
    # Q < 0.020008; the edges are still there and the bandwidth is R/(2πL) exactly.
    L, C = 1e-6, 1e-9
    x0 = math.sqrt(L / C)
    a = (50.0**2 - 1.0) / (2 * 50.0)
    circuit = Circuit("series", L, x0 * 2.0 * a, C, 0.0, None, None)
    result = monte_carlo(circuit, VariationSpec(inductor_resistance=Spread(0.2), trials=4_000))
    assert result.nan_trials == 0 and result.summary.bandwidth_hz.nan_trials == 0
    assert_close(result.summary.bandwidth_hz.maximum,
                 float(result.parts.inductor_resistance_ohm.max()) / (2 * math.pi * L),
                 rel=1e-8, what="widest bandwidth vs R/(2πL)")


def test_trials_without_half_power_points_are_counted():
    # A tank on an ideal current source whose coil loss rL is near X0: |Z| tends to rL at
    # low frequency, so there is no lower half-power point when rL ≥ max|Z|/√2. Reference:
    # |Z| = |1/(1/(rL + jωL) + jωC)| written out here on a fine grid, per trial.
    L, C = 10e-6, 100e-12
    circuit = Circuit("parallel", L, 322.0, C, 0.0, None, None)
    result = monte_carlo(circuit, VariationSpec(inductor_resistance=Spread(0.15), trials=400))
    f = np.geomspace(5e4, 5e8, 20001)
    r = result.parts.inductor_resistance_ohm[:, None]
    z_max = np.abs(1 / (1 / (r + 2j * np.pi * f * L) + 2j * np.pi * f * C)).max(axis=1)
    expected = int(np.count_nonzero(r[:, 0] >= z_max / math.sqrt(2)))
    assert 50 < expected < 350  # the spread straddles the boundary
    assert result.summary.bandwidth_hz.nan_trials == expected
    assert result.summary.bandwidth_hz.finite_trials == 400 - expected


def test_parallel_tank_spread_of_dynamic_resistance_and_peak():
    spec = VariationSpec(inductance=Spread(0.02), capacitance=Spread(0.02),
                         inductor_resistance=Spread(0.1), trials=40_000, seed=9)
    result = monte_carlo(PARALLEL_HIGH_Q, spec)
    L, C, r = 10e-6, 253.3e-12, 1.0
    s = _sigma(0.02, "uniform")
    # Hughes ch. 15: R_d = L/(C r) for high Q; first order σ_R/R = √(σL² + σC² + σr²)
    assert_close(result.summary.impedance_at_peak_ohm.median, L / (C * r), rel=2e-3,
                 what="median |Z| at the peak vs L/(Cr)")
    assert_close(result.summary.impedance_at_peak_ohm.std / (L / (C * r)),
                 math.sqrt(2 * s**2 + _sigma(0.1, "uniform") ** 2), rel=0.03,
                 what="σ of |Z| at the peak vs first-order propagation")
    # the high-Q tank peaks within 1/Q² of f0 (Hughes), so its spread is f0's
    assert_close(result.summary.f_peak_hz.std / _f0(PARALLEL_HIGH_Q), 0.5 * math.hypot(s, s),
                 rel=0.02, what="σ of the parallel peak vs first-order propagation")


@pytest.mark.parametrize("relative, distribution", [(-0.01, "uniform"), (1.0, "uniform"),
                                                    (0.6, "normal"), (0.1, "gaussian")])
def test_invalid_spreads_are_refused(relative, distribution):
    with pytest.raises(ValueError):
        Spread(relative, distribution)
