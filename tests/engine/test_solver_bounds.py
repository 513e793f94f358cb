"""The safeguarded Newton solver stops: a bracket without a root is not iterated, and a
bracketed root is found within the bisection bound.

Source: Press et al., Numerical Recipes, 3rd ed., §9.4 (rtsafe): bisection halves the
bracket each step, so ⌈log2(width/tolerance)⌉ steps bound the search (about 60 for a
bracket of width 8 and a tolerance of 1e-14 in ln f, which is what resonance.py uses).
"""

import numpy as np

from sheetgen.engine import resonance, roots


def _counted(function):
    calls = [0]

    def wrapped(x):
        calls[0] += 1
        return function(x)
    return wrapped, calls


def test_no_root_in_the_bracket_is_not_iterated():
    """x² + 1 has no real root: the solver must give up at once, not spend its budget."""
    function, calls = _counted(lambda x: (x * x + 1.0, 2.0 * x))
    low, high = np.full(1000, -4.0), np.full(1000, 4.0)
    roots.safe_newton(function, low, high, np.zeros(1000))
    assert calls[0] <= 3, calls[0]


def test_a_root_newton_cannot_reach_is_found_by_bisection_within_its_bound():
    """tanh(x − 1) = 0 at x = 1; Newton from x = 3.9 overshoots out of [−4, 4] (its step is
    sinh·cosh, ≈ 90), so the solver must bisect, and must stop within the bisection bound."""
    function, calls = _counted(lambda x: (np.tanh(x - 1.0), 1.0 / np.cosh(x - 1.0) ** 2))
    x = roots.safe_newton(function, np.array([-4.0]), np.array([4.0]), np.array([3.9]))
    assert abs(float(x[0]) - 1.0) < 1e-12
    assert calls[0] <= 1 + 2 + 60, calls[0]


def test_default_sweep_spans_the_peak_even_far_from_f0():
    """A heavily loaded parallel tank can peak far from Thomson's f0 (its peak moves with the
    losses); the default sweep must still be a range (start below stop) holding the peak."""
    fields = dict(f0_hz=726.0, f_peak_hz=3000.0, f_unity_pf_hz=None, reactance_ohm=1.0,
                  q_inductor=None, q_capacitor=None, q_unloaded=None, q_loaded=None,
                  bandwidth_hz=None, f_low_hz=None, f_high_hz=None, impedance_at_peak_ohm=1.0,
                  dynamic_resistance_ohm=None)
    low, high = resonance.default_sweep_range_hz(resonance.Resonance(**fields))
    assert low < 3000.0 < high and low < 726.0 < high
