"""sheetgen.engine.limits.settled_monte_carlo: a Monte Carlo that stops once its windows settle.

Source: Thomson's formula f0 = 1/(2π√(LC)) with only C varying, C = C0(1 + δ), δ uniform
on ±t: f0 falls as δ rises, so the central interval at coverage c is exactly
f0(δ = +t·c) … f0(δ = −t·c) (the quantiles of a uniform distribution, mapped through a
monotonic function). The standard error of a sample quantile, √(p(1 − p)/N)/pdf (Stuart &
Ord, Kendall's Advanced Theory of Statistics, vol. 1, §10.10) is far below one 1 kHz step
at 10,000 trials, so the stopped window must sit within one step of the exact one.
Circuit values are invented.
"""

import math

from sheetgen.engine import limits
from sheetgen.engine.resonance import Circuit, resonant_frequency_hz
from sheetgen.engine.variation import Spread, VariationSpec

SERIES = Circuit("series", 10e-6, 2.0, 100e-12, 0.1, 5.0, 3.0)  # ~5.03 MHz
STEP_HZ = 1e3


def _spec(trials):
    return VariationSpec(capacitance=Spread(0.05), trials=trials, coverage=0.99, seed=7)


def test_stops_early_with_the_exact_window_within_one_step():
    spec = _spec(100_000)
    variation = limits.settled_monte_carlo(SERIES, spec, STEP_HZ, block=10_000)
    assert variation.trials < spec.trials and variation.trials % 10_000 == 0
    window = limits.test_limits(variation, resolution_hz=STEP_HZ)
    assert window.trials == variation.trials
    L, C = SERIES.inductance_h, SERIES.capacitance_f
    low = float(resonant_frequency_hz(L, C * (1 + 0.05 * 0.99)))
    high = float(resonant_frequency_hz(L, C * (1 - 0.05 * 0.99)))
    assert abs(window.f0_min_hz - math.floor(low / STEP_HZ) * STEP_HZ) <= STEP_HZ
    assert abs(window.f0_max_hz - math.ceil(high / STEP_HZ) * STEP_HZ) <= STEP_HZ


def test_never_runs_beyond_the_trials_asked_and_keeps_the_seed():
    spec = _spec(15_000)
    first = limits.settled_monte_carlo(SERIES, spec, 1e-3, block=10_000)  # cannot settle
    assert first.trials == 15_000
    again = limits.settled_monte_carlo(SERIES, spec, 1e-3, block=10_000)
    assert (first.f0_hz == again.f0_hz).all() and first.seed == 7
