"""Test limits for the work order, and the trimmer range, from a variation analysis.

A window is the central interval of the Monte Carlo trials at the stated coverage (or
the span of the worst-case corners), rounded outward to the resolution of the instrument
the technician reads it with, so a good unit is never failed by rounding.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sheetgen.engine.resonance import capacitance_for_f0
from sheetgen.engine.variation import (
    MONTE_CARLO_BLOCK,
    Method,
    SampledParts,
    VariationResult,
    central_interval,
    monte_carlo_blocks,
)

DEFAULT_Q_RESOLUTION = 0.1  # loaded Q is read from f0/bandwidth; one decimal place (ours)
# What the bench cannot tell apart (common practice; job-settable under test:):
DEFAULT_FREQUENCY_ACCURACY = 10e-6  # a bench generator's or analyser's crystal, ±10 ppm
DEFAULT_LCR_ACCURACY = 0.01  # a bench LCR meter's (or analyser's |Z|) accuracy, ±1 %
DEFAULT_TUNING_FRACTION = 0.05  # a trimmed unit is set to within ±5 % of its bandwidth


@dataclass(frozen=True)
class BenchAllowance:
    """What the instruments cannot resolve, added to every window before it is rounded.

    A frequency read off a stepped sweep is within ±step/2 of the true one and the
    instrument's time base within ±frequency_accuracy (relative); a bandwidth, the
    difference of two such readings, within ±step (the time-base error scales it by the
    same fraction). Q = f/bandwidth carries the bandwidth's relative error. |Z|, L and C
    within ±lcr_accuracy. A trimmed unit is set only to within ±tuning_hz of its target.
    """

    step_hz: float = 0.0
    frequency_accuracy: float = 0.0
    lcr_accuracy: float = 0.0
    tuning_hz: float = 0.0


def round_down(value: float, step: float) -> float:
    """The largest multiple of `step` not above `value` (a multiple stays as it is)."""
    return _multiple(value, step, math.floor)


def round_up(value: float, step: float) -> float:
    """The smallest multiple of `step` not below `value` (a multiple stays as it is)."""
    return _multiple(value, step, math.ceil)


def _multiple(value: float, step: float, direction) -> float:
    if not step > 0.0:
        raise ValueError("a resolution must be positive")
    if not math.isfinite(value):
        return value
    count = value / step
    nearest = round(count)
    # A value that is a multiple but for floating-point error is taken as that multiple.
    if math.isclose(count, nearest, rel_tol=1e-9, abs_tol=1e-9):
        count = nearest
    else:
        count = direction(count)
    return float(f"{count * step:.12g}")


@dataclass(frozen=True)
class TestLimits:
    """Pass windows for the bench test, rounded outward (NaN where no trial gave a value).

    f0 is Thomson's 1/(2π√(LC)) of the parts; f_peak is the maximum of the response,
    which is what the bench finds (the two coincide for a series circuit).
    coverage and seed are None for a worst case.
    """

    __test__ = False  # not a pytest test class

    method: Method
    coverage: float | None
    trials: int
    seed: int | None
    nan_trials: int
    resolution_hz: float
    q_resolution: float
    f0_min_hz: float
    f0_max_hz: float
    f_peak_min_hz: float
    f_peak_max_hz: float
    bandwidth_min_hz: float
    bandwidth_max_hz: float
    q_loaded_min: float
    q_loaded_max: float
    f_low_min_hz: float
    f_low_max_hz: float
    f_high_min_hz: float
    f_high_max_hz: float
    q_unloaded_min: float
    q_unloaded_max: float
    impedance_min_ohm: float
    impedance_max_ohm: float
    f_centre_min_hz: float = math.nan  # midpoint of the −3 dB points (broad peaks)
    f_centre_max_hz: float = math.nan
    allowance: BenchAllowance | None = None


IMPEDANCE_DIGITS = 3  # |Z| windows are rounded outward to 3 significant figures (ours)


def round_outward_significant(low: float, high: float, digits: int) -> tuple[float, float]:
    """[low, high] widened to the nearest `digits`-significant-figure values outside it."""
    if not (math.isfinite(low) and math.isfinite(high)) or low <= 0.0:
        return low, high
    step = 10.0 ** (math.floor(math.log10(high)) - digits + 1)
    return round_down(low, step), round_up(high, step)


def unloaded_q_trials(variation: VariationResult) -> np.ndarray:
    """X0/(rL + rC) of every trial, X0 = 2π f0 L (reactance over the tank's own loss)."""
    parts = variation.parts
    loss = parts.inductor_resistance_ohm + parts.capacitor_esr_ohm
    with np.errstate(divide="ignore", invalid="ignore"):
        return 2.0 * np.pi * variation.f0_hz * parts.inductance_h / loss


def test_limits(variation: VariationResult, coverage: float | None = None,
                resolution_hz: float = 1.0, *,
                q_resolution: float = DEFAULT_Q_RESOLUTION,
                allowance: BenchAllowance | None = None) -> TestLimits:
    """Windows of f0, f_peak, bandwidth and loaded Q at `coverage` (default: the
    variation's own), widened by what the bench cannot resolve (`allowance`), each rounded
    outward to resolution_hz (q_resolution for Q).

    For a worst case the windows span every corner and `coverage` is not used.
    """
    if variation.method == "worst-case":
        coverage = None
    elif coverage is None:
        coverage = variation.coverage
    if coverage is not None and not 0.0 < coverage < 1.0:
        raise ValueError("coverage must lie strictly between 0 and 1")
    bench = allowance or BenchAllowance()

    def frequency(values):
        interval = central_interval(values, coverage)
        pad = 0.5 * bench.step_hz + bench.tuning_hz
        low = interval.low * (1.0 - bench.frequency_accuracy) - pad
        high = interval.high * (1.0 + bench.frequency_accuracy) + pad
        return round_down(low, resolution_hz), round_up(high, resolution_hz)

    bw = central_interval(variation.bandwidth_hz, coverage)
    bandwidth = (round_down(bw.low * (1.0 - bench.frequency_accuracy) - bench.step_hz,
                            resolution_hz),
                 round_up(bw.high * (1.0 + bench.frequency_accuracy) + bench.step_hz,
                          resolution_hz))
    q_share = (bench.step_hz / bw.low + bench.frequency_accuracy
               if math.isfinite(bw.low) and bw.low > 0 else 0.0)

    def q_window(values):
        interval = central_interval(values, coverage)
        return (round_down(interval.low * (1.0 - q_share), q_resolution),
                round_up(interval.high * (1.0 + q_share), q_resolution))

    f0 = frequency(variation.f0_hz)
    f_peak = frequency(variation.f_peak_hz)
    q = q_window(variation.q_loaded)
    f_low = frequency(variation.f_low_hz)
    f_high = frequency(variation.f_high_hz)
    f_centre = frequency(0.5 * (variation.f_low_hz + variation.f_high_hz))
    q_unloaded = q_window(unloaded_q_trials(variation))
    impedance = central_interval(variation.impedance_at_peak_ohm, coverage)
    impedance = round_outward_significant(impedance.low * (1.0 - bench.lcr_accuracy),
                                          impedance.high * (1.0 + bench.lcr_accuracy),
                                          IMPEDANCE_DIGITS)
    return TestLimits(
        method=variation.method, coverage=coverage, trials=variation.trials,
        seed=variation.seed, nan_trials=variation.nan_trials, resolution_hz=resolution_hz,
        q_resolution=q_resolution, f0_min_hz=f0[0], f0_max_hz=f0[1],
        f_peak_min_hz=f_peak[0], f_peak_max_hz=f_peak[1],
        bandwidth_min_hz=bandwidth[0], bandwidth_max_hz=bandwidth[1],
        q_loaded_min=q[0], q_loaded_max=q[1], f_low_min_hz=f_low[0], f_low_max_hz=f_low[1],
        f_high_min_hz=f_high[0], f_high_max_hz=f_high[1], q_unloaded_min=q_unloaded[0],
        q_unloaded_max=q_unloaded[1], impedance_min_ohm=impedance[0],
        impedance_max_ohm=impedance[1], f_centre_min_hz=f_centre[0],
        f_centre_max_hz=f_centre[1], allowance=allowance)


def part_window(nominal: float, tolerance: float | None, accuracy: float) -> tuple[float, float]:
    """A part's window as a meter of relative `accuracy` reads it: nominal·(1 ± tolerance),
    widened by the meter's ±accuracy."""
    tol = tolerance or 0.0
    return nominal * (1.0 - tol) * (1.0 - accuracy), nominal * (1.0 + tol) * (1.0 + accuracy)


test_limits.__test__ = False  # not a pytest test function


@dataclass(frozen=True)
class TrimmerCheck:
    """The trimmer capacitance the trials need to reach the target f0, and whether the
    chosen trimmer spans it. Margins are positive when the trimmer has room to spare:
    margin_low_f = needed_min_f − trimmer_min_f, margin_high_f = trimmer_max_f − needed_max_f.
    needed_f holds every trial's value (read-only)."""

    method: Method
    coverage: float | None
    target_f0_hz: float
    fixed_capacitance_f: float
    trimmer_min_f: float
    trimmer_max_f: float
    nominal_needed_f: float
    needed_min_f: float
    needed_max_f: float
    covers: bool
    margin_low_f: float
    margin_high_f: float
    fraction_tunable: float
    needed_f: np.ndarray


def trimmer_check(variation: VariationResult | SampledParts, target_f0_hz: float,
                  fixed_capacitance_f: float, trimmer_min_f: float, trimmer_max_f: float,
                  coverage: float | None = None,
                  other_capacitance_f: float = 0.0) -> TrimmerCheck:
    """C_needed = 1/(ω_target² L_trial) − C_fixed_trial − C_other for every trial (Thomson's
    formula solved for C; C_other the coil's self-capacitance, strays and probe already
    across the trimmer), its range at `coverage` (default: the variation's own; all
    corners for a worst case), and whether [trimmer_min_f, trimmer_max_f] covers it.

    The variation's capacitance factor (tolerance and temperature) applies to the fixed
    capacitor; the trimmer is the part being set, so its own drift is not included.
    """
    if not (target_f0_hz > 0.0 and fixed_capacitance_f >= 0.0
            and 0.0 <= trimmer_min_f < trimmer_max_f):
        raise ValueError("need f0 > 0, fixed capacitance ≥ 0 and 0 ≤ trimmer min < max")
    if variation.method == "worst-case":
        coverage = None
    elif coverage is None:
        coverage = variation.coverage
    parts = variation.parts
    needed = (capacitance_for_f0(target_f0_hz, parts.inductance_h)
              - fixed_capacitance_f * parts.capacitance_factor - other_capacitance_f)
    needed = np.ascontiguousarray(needed, dtype=float)
    needed.setflags(write=False)
    interval = central_interval(needed, coverage)
    nominal = float(capacitance_for_f0(target_f0_hz, variation.nominal.inductance_h)
                    - fixed_capacitance_f - other_capacitance_f)
    tunable = (needed >= trimmer_min_f) & (needed <= trimmer_max_f)
    fraction = float(tunable.mean())
    inside = bool(trimmer_min_f <= interval.low and interval.high <= trimmer_max_f)
    # Monte Carlo: covered when at least the coverage share of builds can be tuned (the
    # central interval may poke out of one end while the other end has room to spare)
    covers = inside if coverage is None else (inside or fraction >= coverage)
    return TrimmerCheck(
        method=variation.method, coverage=coverage, target_f0_hz=target_f0_hz,
        fixed_capacitance_f=fixed_capacitance_f, trimmer_min_f=trimmer_min_f,
        trimmer_max_f=trimmer_max_f, nominal_needed_f=nominal,
        needed_min_f=interval.low, needed_max_f=interval.high,
        covers=covers,
        margin_low_f=interval.low - trimmer_min_f, margin_high_f=trimmer_max_f - interval.high,
        fraction_tunable=fraction, needed_f=needed)



def settled_monte_carlo(circuit, spec, resolution_hz: float, *,
                        q_resolution: float = DEFAULT_Q_RESOLUTION,
                        block: int = MONTE_CARLO_BLOCK) -> VariationResult:
    """A Monte Carlo run in blocks of `block` trials that stops when two successive
    estimates of every window edge (test_limits) agree within that window's resolution
    (resolution_hz, q_resolution, the |Z| window's 3-figure step), never beyond
    spec.trials. The same seed gives the same trials, so the result is that of
    monte_carlo with the trials used."""
    def edges(variation):
        lim = test_limits(variation, resolution_hz=resolution_hz, q_resolution=q_resolution)
        high = lim.impedance_max_ohm
        z_step = (10.0 ** (math.floor(math.log10(high)) - IMPEDANCE_DIGITS + 1)
                  if math.isfinite(high) and high > 0.0 else 0.0)
        steps = {"hz": resolution_hz, "q": q_resolution, "ohm": z_step}
        return [(getattr(lim, name), steps["hz" if name.endswith("_hz") else
                                          "ohm" if name.endswith("_ohm") else "q"])
                for name in ("f0_min_hz", "f0_max_hz", "f_peak_min_hz", "f_peak_max_hz",
                             "bandwidth_min_hz", "bandwidth_max_hz", "f_low_min_hz",
                             "f_low_max_hz", "f_high_min_hz", "f_high_max_hz", "q_loaded_min",
                             "q_loaded_max", "q_unloaded_min", "q_unloaded_max",
                             "impedance_min_ohm", "impedance_max_ohm")]

    def agree(a, b, step):
        if math.isnan(a) or math.isnan(b):
            return math.isnan(a) and math.isnan(b)
        return abs(a - b) <= step * (1.0 + 1e-9)

    previous = None
    for variation in monte_carlo_blocks(circuit, spec, block):
        now = edges(variation)
        if previous is not None and all(agree(a, b, step) for (a, step), (b, _)
                                        in zip(now, previous)):
            break
        previous = now
    return variation
