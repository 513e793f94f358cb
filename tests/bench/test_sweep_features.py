"""sweep_features against closed forms, and the refusals that say which sweep to run.

Sources:
- [AS] Alexander & Sadiku, Fundamentals of Electric Circuits, 5th ed., §14.5 (section
  number from memory): a series RLC driven by a voltage source has its current maximum
  |I| = V/R at f0 = 1/(2π√(LC)), Q = ω0L/R, half-power points
  f1,2 = f0·(√(1 + 1/(4Q²)) ∓ 1/(2Q)), bandwidth f0/Q, and the current's phase is zero at f0.
- MIN_POINTS_IN_BAND = 10 and the ± 3 bandwidth span are common practice (see
  sheetgen/bench/sweep.py); the first test below checks the accuracy the module's comment
  claims for them.
The circuit values are invented.
"""

import math
import re

import numpy as np
import pytest

from sheetgen.bench.sweep import MIN_POINTS_IN_BAND, sweep_features
from sheetgen.bench.sweep_files import MeasuredSweep
from sheetgen.errors import InputError
from sheetgen.quantities import FREQUENCY, parse_quantity
from tests.support import assert_close

L_H = 10e-6
C_F = 100e-12
F0_HZ = 1.0 / (2.0 * math.pi * math.sqrt(L_H * C_F))  # 5.03 MHz


def _textbook(q):
    """[AS] §14.5 for the series RLC with Q = q: (R, f1, f2)."""
    r_ohm = 2.0 * math.pi * F0_HZ * L_H / q
    root = math.sqrt(1.0 + 1.0 / (4.0 * q * q))
    return r_ohm, F0_HZ * (root - 1.0 / (2.0 * q)), F0_HZ * (root + 1.0 / (2.0 * q))


def _series_sweep(q, frequency_hz, noise_db=0.0, seed=0):
    """The current of a series RLC per 1 V, |I| = 1/|R + j(ωL − 1/ωC)| [AS], as a sweep."""
    r_ohm = _textbook(q)[0]
    w = 2.0 * math.pi * frequency_hz
    current = 1.0 / (r_ohm + 1j * (w * L_H - 1.0 / (w * C_F)))
    magnitude = np.abs(current)
    if noise_db:
        magnitude = magnitude * 10.0 ** (np.random.default_rng(seed).normal(0.0, noise_db,
                                                                            magnitude.size) / 20.0)
    return MeasuredSweep("series.csv", frequency_hz, magnitude,
                         np.angle(current, deg=True), "synthesised", "magnitude")


def _grid(f_start_hz, f_stop_hz, step_hz, offset=0.37):
    """A linear grid whose samples do not fall on the features (offset in steps)."""
    return np.arange(f_start_hz + offset * step_hz, f_stop_hz, step_hz)


@pytest.mark.parametrize("q", [0.8, 2.0, 5.0, 50.0, 500.0])
@pytest.mark.parametrize("points_per_bandwidth", [10.5, 20.0, 50.0])
def test_series_rlc_against_textbook(q, points_per_bandwidth):
    """[AS] f0, f1, f2, bandwidth, Q and zero phase from a sweep with ≥ 10 points in band.

    Tolerances: the peak fit is exact for a series RLC (1e-9 relative); each half-power
    point within 0.05 step (the accuracy sweep.py states for 10 points in band)."""
    r_ohm, f1_hz, f2_hz = _textbook(q)
    bandwidth_hz = f2_hz - f1_hz
    step_hz = bandwidth_hz / points_per_bandwidth
    got = sweep_features(_series_sweep(q, _grid(max(F0_HZ - 3 * bandwidth_hz, step_hz),
                                                F0_HZ + 3 * bandwidth_hz, step_hz)))
    assert got.points_in_band >= MIN_POINTS_IN_BAND
    ref = f"[AS] §14.5, Q={q}"
    assert_close(got.f_peak_hz, F0_HZ, rel=1e-9, what=f"f_peak ({ref})")
    assert_close(got.response_peak, 1.0 / r_ohm, rel=1e-9, what=f"|I| peak = 1/R ({ref})")
    assert_close(got.f_low_hz, f1_hz, abs=0.05 * step_hz, what=f"f1 ({ref})")
    assert_close(got.f_high_hz, f2_hz, abs=0.05 * step_hz, what=f"f2 ({ref})")
    assert_close(got.bandwidth_hz, F0_HZ / q, abs=0.1 * step_hz, what=f"bandwidth f0/Q ({ref})")
    assert_close(got.q_loaded, q, rel=0.1 / points_per_bandwidth, what=f"Q ({ref})")
    assert_close(got.f_centre_hz, 0.5 * (f1_hz + f2_hz), abs=0.05 * step_hz,
                 what=f"centre ({ref})")
    assert_close(got.f_zero_phase_hz, F0_HZ, abs=0.05 * step_hz, what=f"zero phase ({ref})")
    assert_close(got.step_hz, step_hz, rel=1e-9, what="step reported")


def test_noisy_sweep_within_a_step():
    """[AS] with 0.05 dB of seeded Gaussian noise: every figure within one step."""
    q = 40.0
    _, f1_hz, f2_hz = _textbook(q)
    step_hz = (f2_hz - f1_hz) / 20.0
    for seed in range(5):
        got = sweep_features(_series_sweep(q, _grid(F0_HZ - 3 * (f2_hz - f1_hz),
                                                    F0_HZ + 3 * (f2_hz - f1_hz), step_hz),
                                           noise_db=0.05, seed=seed))
        assert_close(got.f_peak_hz, F0_HZ, abs=step_hz, what=f"f_peak, seed {seed} ([AS])")
        assert_close(got.f_low_hz, f1_hz, abs=step_hz, what=f"f1, seed {seed} ([AS])")
        assert_close(got.f_high_hz, f2_hz, abs=step_hz, what=f"f2, seed {seed} ([AS])")


def test_detuned_circuit_is_told_apart():
    """The comparison can fail: a circuit whose C is 1 % high peaks 0.5 % (about 5 steps)
    low [AS], far outside the tolerances above (1e-9 relative; one step with noise)."""
    q = 50.0
    _, f1_hz, f2_hz = _textbook(q)
    step_hz = (f2_hz - f1_hz) / 20.0
    f_hz = _grid(F0_HZ - 3 * (f2_hz - f1_hz), F0_HZ + 3 * (f2_hz - f1_hz), step_hz)
    r_ohm = _textbook(q)[0]
    w = 2 * math.pi * f_hz
    current = 1.0 / (r_ohm + 1j * (w * L_H - 1.0 / (w * 1.01 * C_F)))
    got = sweep_features(MeasuredSweep("d.csv", f_hz, np.abs(current), None, "", "m"))
    assert abs(got.f_peak_hz - F0_HZ) > 4 * step_hz
    assert_close(got.f_peak_hz, F0_HZ / math.sqrt(1.01), rel=1e-9, what="detuned f0 ([AS])")
    assert got.f_zero_phase_hz is None  # no phase column given


# --------------------------------------------------------------------------- refusals


_ADVICE = re.compile(r"a sweep from (\S+ \S+) to (\S+ \S+) \(f_peak ± 3 bandwidths, span "
                     r"\S+ \S+\) in steps of (\S+ \S+) or finer \((\d+) points or more\)")


def _refusal(sweep, resolution_hz=None):
    with pytest.raises(InputError) as caught:
        sweep_features(sweep, bandwidth_resolution_hz=resolution_hz)
    (problem,) = caught.value.problems
    assert (problem.path, problem.line, problem.column) == (sweep.path, 1, 1)
    return problem


def _advice(problem):
    """The advised sweep read back from the message with the project's parser."""
    match = _ADVICE.search(problem.expected)
    assert match, problem.expected
    start, stop, step = (parse_quantity(match.group(k).replace(" ", ""), FREQUENCY)
                         for k in (1, 2, 3))
    return start, stop, step, int(match.group(4))


def _check_advice_works(problem, q, resolution_hz=None):
    """The advised sweep covers the textbook band with margin, and sweep_features accepts it."""
    start, stop, step, points = _advice(problem)
    _, f1_hz, f2_hz = _textbook(q)
    bandwidth_hz = f2_hz - f1_hz
    assert start <= f1_hz - 2 * bandwidth_hz and stop >= f2_hz + 2 * bandwidth_hz, (start, stop)
    assert step <= bandwidth_hz / MIN_POINTS_IN_BAND
    if resolution_hz:
        assert step <= resolution_hz
    assert points >= (stop - start) / step
    got = sweep_features(_series_sweep(q, _grid(start, stop, step, offset=0.0)),
                         bandwidth_resolution_hz=resolution_hz)
    assert_close(got.bandwidth_hz, bandwidth_hz, abs=step, what="bandwidth from the advised sweep")


def test_too_coarse_refused_with_span_and_step():
    """5 points across the band (fewer than 10): refused; the advice then works."""
    q = 30.0
    _, f1_hz, f2_hz = _textbook(q)
    step_hz = (f2_hz - f1_hz) / 5.0
    problem = _refusal(_series_sweep(q, _grid(F0_HZ - 4 * (f2_hz - f1_hz),
                                              F0_HZ + 4 * (f2_hz - f1_hz), step_hz)))
    assert "too coarse" in problem.message and "inside the −3 dB band (at least 10" in problem.message
    _check_advice_works(problem, q)


def test_step_coarser_than_the_resolution_refused():
    """Enough points in band, but a step above the resolution asked for."""
    q = 30.0
    _, f1_hz, f2_hz = _textbook(q)
    bandwidth_hz = f2_hz - f1_hz
    resolution_hz = bandwidth_hz / 40.0
    sweep = _series_sweep(q, _grid(F0_HZ - 3 * bandwidth_hz, F0_HZ + 3 * bandwidth_hz,
                                   bandwidth_hz / 20.0))
    problem = _refusal(sweep, resolution_hz)
    assert "step across it (the bandwidth is to be resolved to" in problem.message
    _check_advice_works(problem, q, resolution_hz)
    sweep_features(sweep, bandwidth_resolution_hz=bandwidth_hz / 10.0)  # a looser one is met


@pytest.mark.parametrize("low_bw, high_bw, sides", [
    (0.2, 0.2, "low and high sides"),   # neither half-power point inside
    (0.2, 3.0, "low side"),             # only the high one
    (3.0, 0.3, "high side"),            # only the low one
])
def test_too_narrow_refused_with_span_and_step(low_bw, high_bw, sides):
    """A sweep that does not fall 3 dB on both sides: refused, and the advice (bandwidth
    estimated from what was measured) works."""
    q = 30.0
    _, f1_hz, f2_hz = _textbook(q)
    bandwidth_hz = f2_hz - f1_hz
    sweep = _series_sweep(q, _grid(F0_HZ - low_bw * bandwidth_hz, F0_HZ + high_bw * bandwidth_hz,
                                   bandwidth_hz / 50.0))
    problem = _refusal(sweep)
    assert "does not fall 3.01 dB below its peak" in problem.message
    assert f"on the {sides} within the sweep" in problem.message
    _check_advice_works(problem, q)


def test_peak_at_the_sweeps_end_refused():
    q = 30.0
    _, f1_hz, _ = _textbook(q)
    sweep = _series_sweep(q, np.linspace(0.5 * F0_HZ, f1_hz, 200))  # rising all the way
    problem = _refusal(sweep)
    assert "is at the sweep's end" in problem.message
    assert "falls more than 3.01 dB below it on both sides" in problem.expected
