"""What every part of a network carries at one frequency and drive, from one exact solve.

The solution is per unit drive (1 V EMF or 1 A); a linear network scales with the drive,
so each figure is |per-unit phasor| × the drive's RMS value. Peak = √2 · RMS (sinusoid).
Power is I²R in each resistance: a resistor's, a capacitor's ESR, a coil's series loss.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sheetgen.engine.network import Capacitor, Coil, MutualCoupling, Network, Resistor, solve

SQRT2 = math.sqrt(2.0)


@dataclass(frozen=True)
class PartDuty:
    """One part's voltage across it, current through it and power lost in it."""

    name: str
    kind: str  # "resistor", "capacitor", "coil", "turns_ratio" or "source_resistance"
    value: float  # Ω, F, H or the turns ratio
    voltage_peak_v: float
    current_rms_a: float
    power_w: float


def part_duties(network: Network, drive_rms: float, f_hz: float) -> tuple[PartDuty, ...]:
    """Every part's duty at f_hz with the source at drive_rms (V EMF or A), in the order of
    the network's parts, the source's own resistance last where it is named."""
    solution = solve(network, float(f_hz))
    duties = []
    for part in network.parts:
        if isinstance(part, MutualCoupling):
            continue
        v = abs(complex(solution.part_voltage(part.name))) * drive_rms
        i = abs(complex(solution.part_current(part.name))) * drive_rms
        if isinstance(part, Resistor):
            kind, value, loss = "resistor", part.resistance_ohm, part.resistance_ohm
        elif isinstance(part, Capacitor):
            kind, value, loss = "capacitor", part.capacitance_f, part.esr_ohm
        elif isinstance(part, Coil):
            kind, value, loss = "coil", part.inductance_h, part.resistance_ohm
        else:
            kind, value, loss = "turns_ratio", part.ratio, 0.0
        duties.append(PartDuty(part.name, kind, float(value), SQRT2 * v, i,
                               i * i * float(loss)))
    source = network.source
    if source.name is not None and source.resistance_ohm is not None:
        i = abs(complex(solution.source_resistor_current())) * drive_rms
        r = float(source.resistance_ohm)
        duties.append(PartDuty(source.name, "source_resistance", r, SQRT2 * i * r, i,
                               i * i * r))
    return tuple(duties)


def worse_duties(nominal: tuple[PartDuty, ...],
                 other: tuple[PartDuty, ...] | None) -> tuple[PartDuty, ...]:
    """Each part's voltage, current and power the larger of two cases (parts missing from
    `other`, e.g. an open load, keep their nominal duty)."""
    if other is None:
        return nominal
    by_name = {d.name: d for d in other}
    worse = []
    for d in nominal:
        o = by_name.get(d.name)
        worse.append(d if o is None else PartDuty(
            d.name, d.kind, d.value, max(d.voltage_peak_v, o.voltage_peak_v),
            max(d.current_rms_a, o.current_rms_a), max(d.power_w, o.power_w)))
    return tuple(worse)
