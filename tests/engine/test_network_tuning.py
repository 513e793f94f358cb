"""Adjusting a part per trial (engine/network_tuning.py), checked on the closed forms of
engine/resonance.py (themselves held to ngspice): each trial's setting puts the response
maximum on the target, and a target beyond the part's range is reported, not met."""

from __future__ import annotations

import numpy as np

from sheetgen.engine import resonance
from sheetgen.engine.network import Capacitor, Coil, Network, Resistor, Response, Source
from sheetgen.engine.network_tuning import adjust, peak_frequency


def tank_with_trimmer(inductance_h):
    parts = (Coil("L1", "t", "0", inductance_h, 1.0), Capacitor("C1", "t", "0", 40e-12),
             Capacitor("C3", "t", "0", 10e-12), Resistor("R2", "t", "0", 20e3))
    return Network(parts, Source("t", "current", None), Response("voltage", "L1"), "R2")


def test_each_trial_is_set_to_the_target():
    rng = np.random.default_rng(11)
    inductance = 10e-6 * (1 + 0.03 * rng.standard_normal(50))
    result = adjust(tank_with_trimmer(inductance), "C3", 2e-12, 30e-12, 7.1e6,
                    peak_frequency(5e6, 10e6))
    assert result.reached.all()
    check = resonance.response_features(resonance.Circuit(
        "parallel", inductance, 1.0, 40e-12 + result.value, 0.0, None, 20e3))
    np.testing.assert_allclose(check.f_peak_hz, 7.1e6, rtol=1e-9)
    # the lossless estimate, Thomson's formula: C ≈ 1/((2πf)²L) − 40 pF, within the loss's pull
    thomson = 1 / ((2 * np.pi * 7.1e6) ** 2 * inductance) - 40e-12
    np.testing.assert_allclose(result.value, thomson, rtol=1e-3)


def test_a_target_beyond_the_range_is_not_reached():
    inductance = np.array([10e-6, 14e-6])  # the second would need −4.1 pF (Thomson)
    result = adjust(tank_with_trimmer(inductance), "C3", 2e-12, 30e-12, 7.1e6,
                    peak_frequency(5e6, 10e6))
    assert result.reached.tolist() == [True, False]
    assert abs(result.value[1] / 2e-12 - 1) < 1e-12  # left at the nearer end of its range
