"""Vectorised root finding shared by the response-feature finders."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

MAX_ITERATIONS = 200
TOLERANCE_LN = 1e-14  # in ln f: the relative precision the features are refined to


def safe_newton(function, low, high, guess):
    """Vectorised Newton's method kept inside a bracket, bisecting where Newton would leave it
    (the 'rtsafe' scheme, Press et al., Numerical Recipes, 3rd ed., section 9.4).

    `function(x)` returns (f, df/dx) for the whole array. Where f(low) and f(high) do not
    differ in sign there is no root to find: that element is left at `guess` and not
    iterated. Bisection halves the bracket each step, so every element stops within
    ~log2(width/tolerance) steps.
    """
    at_low = function(np.asarray(low, dtype=float))  # its shape is the elements' shape too
    shape = np.broadcast_shapes(np.shape(low), np.shape(high), np.shape(guess),
                                np.shape(at_low[0]))
    x_full = np.array(np.broadcast_to(np.asarray(guess, dtype=float), shape))
    first = [True]

    def on(index, x):
        if first[0]:  # safe_newton_active evaluates the lower bracket first: reuse it
            first[0] = False
            return tuple(np.broadcast_to(v, shape).ravel()[index] for v in at_low)
        x_full.flat[index] = x
        f, df = function(x_full)
        return np.ravel(f)[index], np.ravel(df)[index]

    low = np.broadcast_to(np.asarray(low, dtype=float), shape)
    return safe_newton_active(on, low, high, guess)


def safe_newton_active(evaluate: Callable, low, high, guess) -> np.ndarray:
    """safe_newton evaluating only the elements still iterating: `evaluate(index, x)` returns
    (f, df/dx) of the elements at the flat `index`, given their x. Where each evaluation costs
    a solve per element, the elements that converged early cost nothing more."""
    shape = np.broadcast_shapes(np.shape(low), np.shape(high), np.shape(guess))
    low = np.broadcast_to(np.asarray(low, dtype=float), shape).ravel().copy()
    high = np.broadcast_to(np.asarray(high, dtype=float), shape).ravel().copy()
    x = np.broadcast_to(np.asarray(guess, dtype=float), shape).ravel().copy()
    every = np.arange(x.size)
    f_low, _ = evaluate(every, low)
    f_high, _ = evaluate(every, high)
    done = np.sign(f_low) == np.sign(f_high)
    for _ in range(MAX_ITERATIONS):
        index = np.flatnonzero(~done)
        if index.size == 0:
            break
        xi, lo, hi, f_lo = x[index], low[index], high[index], f_low[index]
        f, df = evaluate(index, xi)
        below = np.sign(f) == np.sign(f_lo)
        lo, f_lo = np.where(below, xi, lo), np.where(below, f, f_lo)
        hi = np.where(below, hi, xi)
        with np.errstate(divide="ignore", invalid="ignore"):
            newton = xi - f / df
        scale = TOLERANCE_LN * (1.0 + np.abs(xi))
        small_step = np.abs(newton - xi) <= scale
        inside = (newton > np.minimum(lo, hi)) & (newton < np.maximum(lo, hi))
        x[index] = np.where(inside | small_step, newton, 0.5 * (lo + hi))
        low[index], high[index], f_low[index] = lo, hi, f_lo
        done[index] = small_step | (np.abs(hi - lo) <= scale) | (f == 0)
    return x.reshape(shape)
