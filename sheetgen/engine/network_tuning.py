"""Adjusting a part as the technician does, every Monte Carlo trial at once.

A trimmer, a variable capacitor or a slug-tuned coil is not a random part: each built
unit is set until a measured feature (the response maximum, as a rule) reaches its
target. `adjust` solves that setting per trial on the exact network, by regula falsi with
the Illinois modification (Dowell & Jarratt, BIT 11:168, 1971), in the logarithm of the
part's value and of the feature, so that both ends of a wide range converge alike.
A trial whose target lies beyond the part's range is left at the nearer end (`reached`
says which trials made it).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from sheetgen.engine.network import Network
from sheetgen.engine.network_features import extremum

MAX_ITERATIONS = 60
TOLERANCE_LN = 1e-12  # relative precision of the feature at the setting


@dataclass(frozen=True)
class Adjustment:
    """The part's value per trial, the feature it gives, and whether the target was met."""

    value: np.ndarray
    feature: np.ndarray
    reached: np.ndarray


def peak_frequency(low_hz, high_hz) -> Callable[[Network], np.ndarray]:
    """The feature 'frequency of the response maximum between low_hz and high_hz'."""
    def measure(network: Network) -> np.ndarray:
        return extremum(network, low_hz, high_hz).f_hz
    return measure


def adjust(network: Network, part: str, lowest: float, highest: float, target,
           measure: Callable[[Network], np.ndarray]) -> Adjustment:
    """The value of `part` within [lowest, highest] at which measure(network) = target, for
    every trial of the network (its part values arrays of one shape); the feature must move
    monotonically with the value over the range."""
    shape = np.broadcast_shapes(np.shape(measure(network)), np.shape(target))
    lo = np.full(shape, np.log(lowest))
    hi = np.full(shape, np.log(highest))
    goal = np.log(np.broadcast_to(np.asarray(target, dtype=float), shape))

    def error(u):
        return np.log(measure(network.with_values(**{part: np.exp(u)}))) - goal

    e_lo, e_hi = error(lo), error(hi)
    inside = np.sign(e_lo) != np.sign(e_hi)
    side = 0 * lo
    u = np.where(np.abs(e_lo) < np.abs(e_hi), lo, hi)
    for _ in range(MAX_ITERATIONS):
        if not np.any(inside):
            break
        with np.errstate(divide="ignore", invalid="ignore"):
            trial = (lo * e_hi - hi * e_lo) / (e_hi - e_lo)
        trial = np.where(np.isfinite(trial), trial, 0.5 * (lo + hi))
        e = error(np.where(inside, trial, u))
        u = np.where(inside, trial, u)
        same_as_lo = np.sign(e) == np.sign(e_lo)
        # Illinois: halve the value kept at the end that stays twice in a row
        e_hi = np.where(inside & same_as_lo & (side == 1), 0.5 * e_hi, e_hi)
        e_lo = np.where(inside & ~same_as_lo & (side == -1), 0.5 * e_lo, e_lo)
        lo, e_lo = np.where(inside & same_as_lo, u, lo), np.where(inside & same_as_lo, e, e_lo)
        hi, e_hi = np.where(inside & ~same_as_lo, u, hi), np.where(inside & ~same_as_lo, e, e_hi)
        side = np.where(same_as_lo, 1, -1)
        inside = inside & (np.abs(e) > TOLERANCE_LN) & (np.abs(hi - lo) > 1e-15)
    value = np.exp(u)
    feature = measure(network.with_values(**{part: value}))
    reached = np.abs(np.log(feature) - goal) <= 1e-9
    return Adjustment(value, feature, reached)
