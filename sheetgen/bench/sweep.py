"""What a measured band-pass sweep says: peak, half-power (−3 dB) points, bandwidth, loaded Q.

`sweep_features` reads a response with one maximum (a series circuit's through
transmission, a tank's voltage driven through a source resistance). It refuses to guess:
a sweep that does not fall below the half-power level on both sides of its peak, or that
is too coarse to resolve the bandwidth, is an `InputError` that says which sweep to run
(span and step in engineering notation).

Methods:
- Peak: for the second-order band-pass H = K·s/(s² + s·ω0/Q + ω0²) (a series RLC's loop
  current is exactly this; a tank fed through a source resistance nearly), ω²/|H|² is a
  quadratic in ω². A least-squares quadratic through the samples within PEAK_FIT_DB of
  the largest therefore gives the peak frequency and height without bias at any Q or
  step, and averages noise over several samples; where the samples are not of that shape,
  the vertex of a parabola in dB against ln f through the top three samples (the usual
  interpolation of a sampled maximum, common practice).
- Half-power points: where the response crosses peak − 10·log10(2) dB (−3.0103 dB,
  |H| = peak/√2), nearest the peak on each side, by linear interpolation of dB against f
  between the two bracketing samples. At the half-power points of a single-tuned response,
  −10·log10(1 + x²) has an inflection (x = ±1), so linear interpolation in dB errs only
  at third order in the step.
- Loaded Q = f_peak / bandwidth; f_centre is the midpoint of the half-power points.
- Zero phase: the crossing of zero (not a ±180° wrap) nearest the peak, linear in f.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sheetgen.bench.sweep_files import MeasuredSweep
from sheetgen.errors import InputError, Problem
from sheetgen.quantities import format_number, format_quantity

HALF_POWER_DB = 10.0 * math.log10(2.0)  # 3.0103 dB: |H| = peak/√2
PEAK_FIT_DB = 1.0  # samples within 1 dB of the largest take part in the peak fit
# At least 10 points strictly inside the −3 dB band (common practice for resonance
# measurements on a network analyser). With 10, a noise-free series RLC gives each
# half-power point within 0.05 of a step (bandwidth within 0.4 %, Q = 0.8; 0.01 % for
# Q ≥ 5), checked in tests/bench/test_sweep_features.py.
MIN_POINTS_IN_BAND = 10
# Advised span: f_peak ± 3 bandwidths. A single-tuned response is down 15.7 dB there
# (10·log10(1 + 6²)), so both half-power points stay well inside the sweep even when the
# unit is detuned by a bandwidth (common practice).
SPAN_BANDWIDTHS = 3.0


@dataclass(frozen=True)
class SweepPlan:
    """A linear sweep that resolves the response: start, stop, largest step, points."""

    f_start_hz: float
    f_stop_hz: float
    step_hz: float
    points: int

    def describe(self) -> str:
        digits = self.digits()
        return (f"a sweep from {format_quantity(self.f_start_hz, 'Hz', digits)} to "
                f"{format_quantity(self.f_stop_hz, 'Hz', digits)} "
                f"(f_peak ± {SPAN_BANDWIDTHS:g} bandwidths, span "
                f"{format_quantity(self.f_stop_hz - self.f_start_hz, 'Hz')}) in steps of "
                f"{format_quantity(self.step_hz, 'Hz', 2)} or finer ({self.points} points or more)")


    def digits(self) -> int:
        """Significant figures that show the ends to about one step."""
        return max(3, math.floor(math.log10(self.f_stop_hz))
                   - math.floor(math.log10(self.step_hz)) + 1)


@dataclass(frozen=True)
class SweepFeatures:
    """The response's figures; `response_peak` is linear, in the sweep's own magnitude."""

    f_peak_hz: float
    response_peak: float
    response_peak_db: float
    f_low_hz: float
    f_high_hz: float
    bandwidth_hz: float
    f_centre_hz: float
    q_loaded: float
    f_zero_phase_hz: float | None
    step_hz: float  # largest sample spacing across the band (bracketing samples included)
    points_in_band: int  # samples strictly between f_low and f_high


def sweep_plan(f_peak_hz: float, bandwidth_hz: float,
               bandwidth_resolution_hz: float | None = None) -> SweepPlan:
    """f_peak ± SPAN_BANDWIDTHS·bandwidth (ends rounded outward), with a step that puts
    MIN_POINTS_IN_BAND + 2 points across the bandwidth (margin for rounding and an estimated
    bandwidth) and is no coarser than the resolution, rounded down to two figures."""
    step_hz = bandwidth_hz / (MIN_POINTS_IN_BAND + 2)
    if bandwidth_resolution_hz is not None:
        step_hz = min(step_hz, bandwidth_resolution_hz)
    scale = 10.0 ** (math.floor(math.log10(step_hz)) - 1)
    step_hz = math.floor(step_hz / scale * (1 + 1e-12)) * scale
    f_start_hz = max(f_peak_hz - SPAN_BANDWIDTHS * bandwidth_hz, step_hz)
    f_stop_hz = f_peak_hz + SPAN_BANDWIDTHS * bandwidth_hz
    # ends rounded outward to the figures SweepPlan.describe shows, so the span is kept
    shown = SweepPlan(f_start_hz, f_stop_hz, step_hz, 0).digits()
    unit = 10.0 ** (math.floor(math.log10(f_stop_hz)) - shown + 1)
    f_start_hz = max(math.floor(f_start_hz / unit) * unit, step_hz)
    f_stop_hz = math.ceil(f_stop_hz / unit) * unit
    points = math.ceil((f_stop_hz - f_start_hz) / step_hz - 1e-9) + 1
    return SweepPlan(f_start_hz, f_stop_hz, step_hz, points)


def sweep_features(sweep: MeasuredSweep,
                   bandwidth_resolution_hz: float | None = None) -> SweepFeatures:
    """Peak, half-power points, bandwidth, loaded Q and zero-phase frequency of `sweep`.

    With `bandwidth_resolution_hz` (e.g. the half-width of the sheet's bandwidth window)
    the sample spacing across the band must not exceed it. Raises InputError naming the
    sweep needed when the response does not fall below −3 dB on both sides of its peak,
    or when fewer than MIN_POINTS_IN_BAND samples lie inside the band."""
    if bandwidth_resolution_hz is not None and not (
            math.isfinite(bandwidth_resolution_hz) and bandwidth_resolution_hz > 0.0):
        raise ValueError(f"bandwidth_resolution_hz must be positive, not {bandwidth_resolution_hz!r}")
    f_hz = np.asarray(sweep.frequency_hz, dtype=float)
    db = 20.0 * np.log10(np.asarray(sweep.magnitude, dtype=float))
    top = int(np.argmax(db))
    if top == 0 or top == f_hz.size - 1:
        side = "start" if top == 0 else "end"
        _refuse(sweep, f"the largest response ({format_number(float(db[top]))} dB) is at the "
                f"sweep's {side}, {format_quantity(float(f_hz[top]), 'Hz', 6)}: the peak is not "
                f"inside {_span(f_hz)}",
                "a sweep that contains the peak and falls more than 3.01 dB below it on both "
                "sides")
    f_peak_hz, peak_db, estimate_hz = _peak(f_hz, db, top)
    level_db = peak_db - HALF_POWER_DB
    low = _crossing(f_hz, db, level_db, top, -1)
    high = _crossing(f_hz, db, level_db, top, +1)
    if low is None or high is None:
        sides = " and ".join(name for name, found in (("low", low), ("high", high)) if found is None)
        if low is not None or high is not None:  # one side measured: assume a symmetric band
            estimate_hz = 2.0 * abs((low or high)[0] - f_peak_hz)
        plan = (sweep_plan(f_peak_hz, estimate_hz, bandwidth_resolution_hz).describe()
                + " (bandwidth estimated from the part measured)" if estimate_hz
                else "a wider sweep that falls more than 3.01 dB below the peak on both sides")
        _refuse(sweep, f"the response does not fall 3.01 dB below its peak "
                f"({format_number(peak_db)} dB at {format_quantity(f_peak_hz, 'Hz', 6)}) on the "
                f"{sides} side{'s' if ' and ' in sides else ''} within {_span(f_hz)}", plan)
    (f_low_hz, i_low), (f_high_hz, i_high) = low, high
    bandwidth_hz = f_high_hz - f_low_hz
    step_hz = float(np.max(np.diff(f_hz[i_low:i_high + 1])))
    inside = int(np.count_nonzero((f_hz > f_low_hz) & (f_hz < f_high_hz)))
    coarse = []
    if inside < MIN_POINTS_IN_BAND:
        coarse.append(f"{inside} point{'s' if inside != 1 else ''} inside the −3 dB band "
                      f"(at least {MIN_POINTS_IN_BAND} needed)")
    if bandwidth_resolution_hz is not None and step_hz > bandwidth_resolution_hz:
        coarse.append(f"a {format_quantity(step_hz, 'Hz')} step across it (the bandwidth is "
                      f"to be resolved to {format_quantity(bandwidth_resolution_hz, 'Hz')})")
    if coarse:
        _refuse(sweep, f"the sweep is too coarse for a {format_quantity(bandwidth_hz, 'Hz')} "
                f"bandwidth: " + " and ".join(coarse),
                sweep_plan(f_peak_hz, bandwidth_hz, bandwidth_resolution_hz).describe())
    return SweepFeatures(
        f_peak_hz=f_peak_hz,
        response_peak=10.0 ** (peak_db / 20.0),
        response_peak_db=peak_db,
        f_low_hz=f_low_hz,
        f_high_hz=f_high_hz,
        bandwidth_hz=bandwidth_hz,
        f_centre_hz=0.5 * (f_low_hz + f_high_hz),
        q_loaded=f_peak_hz / bandwidth_hz,
        f_zero_phase_hz=_zero_phase(f_hz, sweep.phase_deg, f_peak_hz),
        step_hz=step_hz,
        points_in_band=inside,
    )


def _refuse(sweep: MeasuredSweep, message: str, expected: str):
    raise InputError([Problem(sweep.path, 1, 1, sweep.parameter, message, expected)])


def _span(f_hz: np.ndarray) -> str:
    return (f"the sweep ({format_quantity(float(f_hz[0]), 'Hz', 6)} to "
            f"{format_quantity(float(f_hz[-1]), 'Hz', 6)})")


def _peak(f_hz: np.ndarray, db: np.ndarray, top: int) -> tuple[float, float, float | None]:
    """(f_peak_hz, peak dB, bandwidth estimate or None) from the samples within
    PEAK_FIT_DB of the largest (at least the largest and its two neighbours).

    For H = K·s/(s² + s·ω0/Q + ω0²), ω²/|H|² is a quadratic in ω², so a least-squares
    quadratic in t = (f/f_top)² − 1 fitted to y = (f²/|H|²)/(f_top²/|H_top|²) is exact:
    |H|²/|H_top|² = (1 + t)/P(t), largest where A·t² + 2A·t + (B − C) = 0. Where the fit is
    not a single-tuned shape (A ≤ 0, no real root, vertex outside the window), the vertex of
    a parabola in dB against ln f through the top three samples is used instead."""
    first, last = top, top
    while first > 0 and db[first - 1] >= db[top] - PEAK_FIT_DB:
        first -= 1
    while last < f_hz.size - 1 and db[last + 1] >= db[top] - PEAK_FIT_DB:
        last += 1
    first, last = min(first, top - 1), max(last, top + 1)
    window = slice(first, last + 1)
    t = (f_hz[window] / f_hz[top]) ** 2 - 1.0
    y = (1.0 + t) * 10.0 ** ((db[top] - db[window]) / 10.0)
    a, b, c = np.polyfit(t, y, 2)
    root = 1.0 - (b - c) / a if a > 0.0 else -1.0
    if root > 0.0 and t[0] <= math.sqrt(root) - 1.0 <= t[-1]:
        t_peak = math.sqrt(root) - 1.0
        gain = (1.0 + t_peak) / (a * t_peak**2 + b * t_peak + c)  # |H_peak|²/|H_top|²
        f_peak_hz = float(f_hz[top] * math.sqrt(1.0 + t_peak))
        # half-power: (1 + t)/P(t) = gain/2, i.e. gain·A·t² + (gain·B − 2)·t + gain·C − 2 = 0
        half = np.roots([gain * a, gain * b - 2.0, gain * c - 2.0])
        estimate_hz = None
        if np.all(np.isreal(half)) and np.all(half.real > -1.0):
            t_low, t_high = sorted(half.real)
            estimate_hz = float(f_hz[top] * (math.sqrt(1.0 + t_high) - math.sqrt(1.0 + t_low)))
        return f_peak_hz, float(db[top] + 10.0 * math.log10(gain)), estimate_hz
    u = np.log(f_hz[top - 1:top + 2] / f_hz[top])
    a, b, c = np.polyfit(u, db[top - 1:top + 2], 2)
    if a < 0.0:
        vertex = float(np.clip(-b / (2.0 * a), u[0], u[-1]))
        estimate_hz = 2.0 * f_hz[top] * math.exp(vertex) * math.sinh(math.sqrt(HALF_POWER_DB / -a))
        return float(f_hz[top] * math.exp(vertex)), float(c - b * b / (4.0 * a)), float(estimate_hz)
    return float(f_hz[top]), float(db[top]), None  # a flat top: the largest sample


def _crossing(f_hz, db, level_db, top: int, direction: int) -> tuple[float, int] | None:
    """(crossing, index) of the first sample below level_db walking from the peak in
    `direction` (−1 low side, +1 high side); the crossing lies between it and its
    neighbour towards the peak, linear in dB against f."""
    i = top + direction
    while 0 <= i < f_hz.size:
        if db[i] < level_db:
            j = i - direction
            fraction = (level_db - db[i]) / (db[j] - db[i])
            return float(f_hz[i] + fraction * (f_hz[j] - f_hz[i])), i
        i += direction
    return None


def _zero_phase(f_hz, phase_deg, f_peak_hz) -> float | None:
    if phase_deg is None:
        return None
    phase = np.asarray(phase_deg, dtype=float)
    crossings = []
    for i in range(phase.size - 1):
        p, q = phase[i], phase[i + 1]
        if p == 0.0:
            crossings.append(float(f_hz[i]))
        elif p * q < 0.0 and abs(q - p) < 180.0:  # a sign change that is not a ±180° wrap
            crossings.append(float(f_hz[i] + p / (p - q) * (f_hz[i + 1] - f_hz[i])))
    if phase[-1] == 0.0:
        crossings.append(float(f_hz[-1]))
    return min(crossings, key=lambda f: abs(f - f_peak_hz)) if crossings else None
