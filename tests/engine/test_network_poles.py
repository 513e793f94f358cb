"""The pole–residue form of a network's response (engine/network_poles.py) against the
exact MNA solve it replaces in the root finders, and its refusals."""

from __future__ import annotations

import numpy as np

from sheetgen.engine.network import (
    Capacitor,
    Coil,
    MutualCoupling,
    Network,
    Resistor,
    Response,
    Source,
    TurnsRatio,
    solve,
)
from sheetgen.engine.network_poles import pole_residue


def _node(network, name):
    c = np.zeros(network.index.size)
    c[network.index.nodes[name]] = 1.0
    return c


def test_coupled_tanks_with_a_tap_match_the_solve_across_the_band():
    """Two coupled tanks (k), the second loaded through an ideal 1:4 tap (an algebraic
    branch the form eliminates), 50 trials: H = Σ r/(s+λ) + d equals the exact solve to
    1e-10 from a decade below to a decade above resonance."""
    rng = np.random.default_rng(3)
    l = 10e-6 * (1 + 0.02 * rng.standard_normal(50))
    parts = (Coil("L1", "p", "0", l, 1.5), Capacitor("C1", "p", "0", 50e-12, 0.1),
             Coil("L2", "s", "0", 10e-6, 1.5), Capacitor("C2", "s", "0", 50e-12),
             MutualCoupling("K1", "L1", "L2", 0.02), TurnsRatio("T1", "s", "0", "o", "0", 4.0),
             Resistor("RL", "o", "0", 50.0))
    network = Network(parts, Source("p", "voltage", 5e3), Response("voltage", "RL"), "RL")
    form = pole_residue(network, _node(network, "o"), 0.0, 7.1e6)
    assert form is not None
    for f in np.geomspace(0.7e6, 70e6, 23):
        exact = solve(network, f).part_voltage("RL")
        np.testing.assert_allclose(form.at(np.full(50, f))[0], exact, rtol=1e-10)


def test_derivatives_match_the_solve_and_finite_differences():
    """H' and H'' of the form against the solver's own (x' = −A⁻¹(jA1)x, x'' = −2A⁻¹(jA1)x',
    a different computation) to 1e-9, and H' against a central difference of the solve
    (relative step 1e-7: truncation ~(1e-7·Q)², round-off ~1e-9; allowed 1e-5)."""
    parts = (Coil("L1", "t", "0", 2e-6, 0.3), Capacitor("C1", "t", "0", 250e-12, 0.05),
             Resistor("R2", "t", "0", 5e3))
    network = Network(parts, Source("t", "current"), Response("voltage", "L1"), "R2")
    form = pole_residue(network, _node(network, "t"), 0.0, 7e6)
    f = 7.05e6
    exact = solve(network, f, derivatives=2)
    _, h1, h2 = form.at(np.array(f), 2)
    np.testing.assert_allclose(complex(h1), complex(exact.node_voltage("t", 1)), rtol=1e-9)
    np.testing.assert_allclose(complex(h2), complex(exact.node_voltage("t", 2)), rtol=1e-9)
    step = 1e-7 * f
    h = [complex(solve(network, f + k * step).node_voltage("t")) for k in (-1, 1)]
    np.testing.assert_allclose(complex(h1), (h[1] - h[0]) / (2 * 2 * np.pi * step), rtol=1e-5)


def test_a_network_without_reactive_parts_has_no_form():
    parts = (Resistor("R1", "a", "b", 10.0), Resistor("R2", "b", "0", 10.0))
    network = Network(parts, Source("a", "voltage", 50.0), Response("voltage", "R2"), "R2")
    assert pole_residue(network, _node(network, "b"), 0.0, 1e6) is None


def test_without_the_form_the_features_are_the_same(monkeypatch):
    """Where the form is refused (here: forced, by an agreement no form can meet) the
    features are found by solving each trial's network, with the same result."""
    import sheetgen.engine.network_poles as poles
    from sheetgen.engine.network_features import extremum, half_power_points
    parts = (Coil("L1", "t", "0", 2e-6, 0.3), Capacitor("C1", "t", "0", 250e-12, 0.05),
             Resistor("R2", "t", "0", 5e3))
    network = Network(parts, Source("t", "current"), Response("voltage", "L1"), "R2")
    with_form = half_power_points(network, extremum(network, 1e6, 50e6))
    monkeypatch.setattr(poles, "AGREEMENT", -1.0)
    assert pole_residue(network, _node(network, "t"), 0.0, 7e6) is None
    without = half_power_points(network, extremum(network, 1e6, 50e6))
    np.testing.assert_allclose(without.f_low_hz, with_form.f_low_hz, rtol=1e-12)
    np.testing.assert_allclose(without.f_high_hz, with_form.f_high_hz, rtol=1e-12)
