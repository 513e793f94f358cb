"""Vectorised root finding shared by the response-feature finders."""

from __future__ import annotations

import numpy as np

MAX_ITERATIONS = 200
TOLERANCE_LN = 1e-14  # in ln f: the relative precision the features are refined to


def safe_newton(function, low, high, guess):
    """Vectorised Newton's method kept inside a bracket, bisecting where Newton would leave it
    (the 'rtsafe' scheme, Press et al., Numerical Recipes, 3rd ed., section 9.4).

    `function(x)` returns (f, df/dx). Where f(low) and f(high) do not differ in sign there
    is no root to find: that element is left at `guess` and not iterated. Bisection halves
    the bracket each step, so every element stops within ~log2(width/tolerance) steps.
    """
    f_low, _ = function(low)
    f_high, _ = function(high)
    done = np.sign(f_low) == np.sign(f_high)
    x = np.array(guess, dtype=float, copy=True)
    for _ in range(MAX_ITERATIONS):
        if np.all(done):
            break
        f, df = function(x)
        below = np.sign(f) == np.sign(f_low)
        low, f_low = np.where(below, x, low), np.where(below, f, f_low)
        high = np.where(below, high, x)
        with np.errstate(divide="ignore", invalid="ignore"):
            newton = x - f / df
        scale = TOLERANCE_LN * (1.0 + np.abs(x))
        small_step = np.abs(newton - x) <= scale
        inside = (newton > np.minimum(low, high)) & (newton < np.maximum(low, high))
        step = np.where(inside | small_step, newton, 0.5 * (low + high))
        x = np.where(done, x, step)
        done = done | small_step | (np.abs(high - low) <= scale) | (f == 0)
    return x
