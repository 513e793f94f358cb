"""End couplings (engine/couplings.py) checked on the exact network they describe: each
design, built as parts and solved by the MNA engine (itself held to textbook forms and
ngspice in test_network*.py), presents the resistance it was designed for at f0."""

from __future__ import annotations

import math

import pytest

from sheetgen.engine.couplings import (
    CouplingError,
    l_section,
    series_capacitor,
    tapped_capacitor,
    tapped_capacitor_shortcut_ohm,
)
from sheetgen.engine.network import Capacitor, Coil, Network, Resistor, Response, Source, solve
from tests.support import assert_close

F0 = 7.1e6
W0 = 2 * math.pi * F0


def _impedance(parts, node="a"):
    network = Network(tuple(parts), Source(node, "current"), Response("voltage", parts[0].name))
    return complex(solve(network, F0).input_impedance())


@pytest.mark.parametrize("r_high, r_low", [(2000.0, 50.0), (200.0, 50.0), (50.0, 12.5)])
def test_l_section_presents_the_high_resistance(r_high, r_low):
    """Low-pass L: a coil X = Q·R_low in series with R_low, a capacitor X = R_high/Q across:
    Z_in = R_high, real, at f0 (Q = √(R_high/R_low − 1))."""
    section = l_section(r_high, r_low)
    assert_close(section.q, math.sqrt(r_high / r_low - 1), rel=1e-15, what="Q")
    parts = [Capacitor("CS", "a", "0", -1 / (W0 * section.x_shunt_ohm)),
             Coil("LS", "a", "b", section.x_series_ohm / W0), Resistor("RL", "b", "0", r_low)]
    z = _impedance(parts)
    assert_close(z.real, r_high, rel=1e-12, what="Re Z_in")
    assert_close(z.imag, 0.0, abs=1e-9 * r_high, what="Im Z_in")


def test_series_capacitor_into_a_resonator():
    """A 50 Ω port behind Ce presents 10 kΩ in parallel with Cp across the resonator at f0:
    the branch's admittance 1/(R0 + 1/(jωCe)) has real part 1/Rp and imaginary part ωCp."""
    coupling = series_capacitor(10e3, 50.0, F0)
    parts = [Capacitor("CE", "a", "b", coupling.capacitance_f), Resistor("R0", "b", "0", 50.0)]
    y = 1 / _impedance(parts)
    assert_close(1 / y.real, 10e3, rel=1e-12, what="presented resistance")
    assert_close(y.imag / W0, coupling.shunt_equivalent_f, rel=1e-12, what="shunt C")


@pytest.mark.parametrize("tank, load", [(10e3, 50.0), (2e3, 300.0), (20e3, 1e3)])
def test_tapped_capacitor_tunes_and_presents_the_tank_resistance(tank, load):
    """The divider across a lossless 2.2 µH coil: at f0 the tank is resonant (Z real) and
    presents `tank` ohms (the exact design of ../shared/NETWORKS.md)."""
    l = 2.2e-6
    divider = tapped_capacitor(tank, load, l, F0)
    parts = [Coil("L1", "a", "0", l), Capacitor("C1", "a", "tap", divider.c1_f),
             Capacitor("C2", "tap", "0", divider.c2_f), Resistor("R2", "tap", "0", load)]
    z = _impedance(parts)
    assert_close(z.real, tank, rel=1e-9, what="presented resistance")
    assert_close(z.imag, 0.0, abs=1e-9 * tank, what="resonant at f0")


def test_the_shortcut_is_a_high_q_approximation():
    """R2·(1 + C2/C1)² is off by about 5 % when the tap's Q is about 3.4 (../shared/NETWORKS.md
    says ~5 % at 3.6, from memory) and under 1 % when it is 10: the exact design is the one
    to use."""
    l = 2.2e-6
    low_q = tapped_capacitor(2e3, 60.0, l, F0)
    high_q = tapped_capacitor(20e3, 50.0, l, F0)
    assert 3 < low_q.q_tap < 4 and high_q.q_tap > 9
    error_low = tapped_capacitor_shortcut_ohm(60.0, low_q.c1_f, low_q.c2_f) / 2e3 - 1
    error_high = tapped_capacitor_shortcut_ohm(50.0, high_q.c1_f, high_q.c2_f) / 20e3 - 1
    assert 0.04 < abs(error_low) < 0.07 and abs(error_high) < 0.01


def test_impossible_steps_are_refused():
    with pytest.raises(CouplingError):
        l_section(50.0, 200.0)
    with pytest.raises(CouplingError):
        series_capacitor(40.0, 50.0, F0)
    with pytest.raises(CouplingError):
        tapped_capacitor(10e3, 1e-3, 2.2e-6, F0)
