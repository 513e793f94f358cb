"""Coupling a resonator's end to a port: the exact designs of the usual matching sections.

Each function turns the resistance a resonator needs across it (or in series with it) and
a port's resistance into part values at f0; `design/kinds` builds them into the network,
so that the design is re-analysed exactly as built (rounded to standard values). Pure:
SI floats, no words.

* L-network (two reactances): Q = √(R_high/R_low − 1), series X = Q·R_low on the low side,
  shunt X = R_high/Q across the high side (e.g. Bowick, RF Circuit Design, ch. 4, and the
  radio handbooks' L-section, from memory).
* Series capacitor into a resonator (a port R0 in series with Ce presents Rp across the
  resonator): Qs = √(Rp/R0 − 1), Ce = 1/(ω0·R0·Qs), its shunt equivalent
  Cp = Ce·Qs²/(1 + Qs²) (the series-to-parallel conversion at f0).
* Tapped capacitor (capacitive divider) across a tank of inductance L: exact design
  (../shared/NETWORKS.md): Cp = 1/(ω0²L), Qp = ω0·Cp·Rp, Rs = Rp/(1 + Qp²),
  C_T = 1/(ω0·Rs·Qp), Q2 = √(R2/Rs − 1), C2 = Q2/(ω0·R2), C2s = C2(1 + Q2²)/Q2²,
  C1 = C_T·C2s/(C2s − C_T): C1 from the top of the tank to the tap, C2 from the tap to
  ground, the load R2 across C2.
"""

from __future__ import annotations

import math
from dataclasses import dataclass


class CouplingError(ValueError):
    """The section cannot make that transformation (e.g. a step the wrong way)."""


@dataclass(frozen=True)
class LSection:
    """Two reactances that match r_low (in series with x_series) to r_high (across
    x_shunt). Signs: a low-pass section has x_series > 0 (a coil) and x_shunt < 0 (a
    capacitor); the high-pass one the opposite."""

    q: float
    x_series_ohm: float
    x_shunt_ohm: float


def l_section(r_high_ohm: float, r_low_ohm: float, low_pass: bool = True) -> LSection:
    """The L-section that makes r_low look like r_high: Q = √(R_high/R_low − 1),
    |X_series| = Q·R_low, |X_shunt| = R_high/Q."""
    if not r_high_ohm > r_low_ohm > 0:
        raise CouplingError("an L-section steps a lower resistance up to a higher one")
    q = math.sqrt(r_high_ohm / r_low_ohm - 1.0)
    sign = 1.0 if low_pass else -1.0
    return LSection(q, sign * q * r_low_ohm, -sign * r_high_ohm / q)


@dataclass(frozen=True)
class SeriesCapacitor:
    """A series capacitor from a port into a resonator: its value and what it adds across
    the resonator at f0 (the part of the tuning capacitance it takes up)."""

    capacitance_f: float
    q: float
    shunt_equivalent_f: float


def series_capacitor(presented_ohm: float, port_ohm: float, f0_hz: float) -> SeriesCapacitor:
    """Ce that makes a port of port_ohm present presented_ohm across a resonator at f0:
    Qs = √(Rp/R0 − 1), Ce = 1/(ω0·R0·Qs), Cp = Ce·Qs²/(1 + Qs²)."""
    if not presented_ohm > port_ohm > 0:
        raise CouplingError("a series capacitor presents a port as a higher resistance only")
    q = math.sqrt(presented_ohm / port_ohm - 1.0)
    ce = 1.0 / (2.0 * math.pi * f0_hz * port_ohm * q)
    return SeriesCapacitor(ce, q, ce * q * q / (1.0 + q * q))


@dataclass(frozen=True)
class TappedCapacitor:
    """The divider across a tank: C1 from the top to the tap, C2 from the tap to ground (the
    load across C2); their series combination tunes the tank with the load."""

    c1_f: float
    c2_f: float
    q_tank: float
    q_tap: float


def tapped_capacitor(tank_ohm: float, load_ohm: float, inductance_h: float,
                     f0_hz: float) -> TappedCapacitor:
    """C1, C2 that tune L to f0 and present load_ohm as tank_ohm across the tank (exact
    design at f0; module notes)."""
    w = 2.0 * math.pi * f0_hz
    cp = 1.0 / (w * w * inductance_h)
    qp = w * cp * tank_ohm
    rs = tank_ohm / (1.0 + qp * qp)
    if not load_ohm > rs:
        raise CouplingError("the load is below what the divider can step up from; "
                            "a tap or link suits a lower load")
    ct = 1.0 / (w * rs * qp)
    q2 = math.sqrt(load_ohm / rs - 1.0)
    c2 = q2 / (w * load_ohm)
    c2s = c2 * (1.0 + q2 * q2) / (q2 * q2)
    if not c2s > ct:
        raise CouplingError("no positive C1 makes this divider")
    return TappedCapacitor(ct * c2s / (c2s - ct), c2, qp, q2)


def tapped_capacitor_shortcut_ohm(load_ohm: float, c1_f: float, c2_f: float) -> float:
    """The usual approximation of what a divider presents: R2·(1 + C2/C1)² (the turns ratio
    of an ideal capacitive transformer; good only when Q2 is high)."""
    return load_ohm * (1.0 + c2_f / c1_f) ** 2
