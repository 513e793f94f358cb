"""Voltages, currents and powers on every part at the operating frequency.

Phasor analysis of the circuits defined in resonance.py at one frequency (normally the
response maximum): series, I = V / (Rs + Z); parallel, V = I_N / Y with the Norton
current I_N = V/Rs (or the given current) and Y including 1/Rs — a current source's own
resistance is across it (Norton's theorem), so it loads the tank exactly as it does in
the response. All figures are RMS unless named peak; peak = √2 · RMS for the sinusoidal
drive.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from sheetgen.engine.resonance import Circuit

DriveKind = Literal["voltage", "current", "available_power"]
SQRT2 = math.sqrt(2.0)


@dataclass(frozen=True)
class Drive:
    """The source: open-circuit RMS voltage behind Rs, RMS current, or available power."""

    kind: DriveKind
    value: float  # V rms, A rms or W


@dataclass(frozen=True)
class Stress:
    """RMS voltages and currents on each part, powers in each resistance, at f_hz."""

    f_hz: float
    drive_power_w: float
    source_voltage_rms_v: float | None
    capacitor_voltage_rms_v: float
    capacitor_voltage_peak_v: float
    capacitor_current_rms_a: float
    inductor_voltage_rms_v: float
    inductor_voltage_peak_v: float
    inductor_current_rms_a: float
    load_voltage_rms_v: float
    load_power_w: float
    inductor_loss_w: float
    capacitor_loss_w: float
    circulating_current_ratio: float


class DriveError(ValueError):
    """A drive that this circuit cannot take (e.g. available power with no source resistance)."""


def open_circuit_voltage_rms(drive: Drive, source_resistance_ohm: float | None) -> float:
    """EMF behind Rs; for available power P_av = V²/(4 Rs), V = 2√(P_av·Rs)."""
    if drive.kind == "voltage":
        return drive.value
    if drive.kind == "available_power":
        if not source_resistance_ohm:
            raise DriveError("available power needs a source resistance (P = V²/4Rs)")
        return 2.0 * math.sqrt(drive.value * source_resistance_ohm)
    raise DriveError("a current drive has no open-circuit voltage")


def part_stress(circuit: Circuit, drive: Drive, f_hz: float) -> Stress:
    """Phasor currents and voltages of every part at f_hz for the given drive."""
    omega = 2.0 * math.pi * f_hz
    z_coil = complex(circuit.inductor_resistance_ohm, omega * circuit.inductance_h)
    z_cap = complex(circuit.capacitor_esr_ohm, -1.0 / (omega * circuit.capacitance_f))
    rs = circuit.source_resistance_ohm
    rl = circuit.load_resistance_ohm
    source_v = None if drive.kind == "current" else open_circuit_voltage_rms(drive, rs)
    if circuit.topology == "series":
        loop = z_coil + z_cap + (rl or 0.0)
        if drive.kind == "current" and rs:  # Norton I with Rs across = Thévenin I·Rs behind Rs
            current = drive.value * rs / abs(rs + loop)
        elif drive.kind == "current":
            current = drive.value
        else:
            current = source_v / abs((rs or 0.0) + loop)
        i_coil = i_cap = current
        v_coil, v_cap = current * abs(z_coil), current * abs(z_cap)
        v_load = current * (rl or 0.0)
        line_current = current
    else:
        y_parts = 1.0 / z_coil + 1.0 / z_cap + (1.0 / rl if rl else 0.0)
        if drive.kind == "current":  # the source's resistance is across it (Norton)
            norton, y_total = drive.value, y_parts + (1.0 / rs if rs else 0.0)
        else:
            if not rs:
                raise DriveError("a parallel tank driven by a voltage needs a source "
                                 "resistance; give the drive as a current instead")
            norton, y_total = source_v / rs, y_parts + 1.0 / rs
        v_node = norton / abs(y_total)
        v_coil = v_cap = v_load = v_node
        i_coil, i_cap = v_node / abs(z_coil), v_node / abs(z_cap)
        line_current = v_node * abs(y_parts)
    inductor_loss = i_coil**2 * circuit.inductor_resistance_ohm
    capacitor_loss = i_cap**2 * circuit.capacitor_esr_ohm
    load_power = v_load**2 / rl if rl else 0.0
    return Stress(
        f_hz=f_hz,
        drive_power_w=inductor_loss + capacitor_loss + load_power,
        source_voltage_rms_v=source_v,
        capacitor_voltage_rms_v=v_cap,
        capacitor_voltage_peak_v=SQRT2 * v_cap,
        capacitor_current_rms_a=i_cap,
        inductor_voltage_rms_v=v_coil,
        inductor_voltage_peak_v=SQRT2 * v_coil,
        inductor_current_rms_a=i_coil,
        load_voltage_rms_v=v_load,
        load_power_w=load_power,
        inductor_loss_w=inductor_loss,
        capacitor_loss_w=capacitor_loss,
        circulating_current_ratio=(max(i_coil, i_cap) / line_current
                                   if line_current > 0 else float(np.inf)),
    )


def open_load_stress(circuit: Circuit, drive: Drive) -> Stress | None:
    """The same drive with a parallel tank's load disconnected, at the response maximum of
    the unloaded tank (the worst mistune too: with the drive's EMF behind Rs, the tank
    voltage is largest at that peak). None for a series circuit (an open load opens the
    loop) or a tank with no load."""
    from dataclasses import replace

    from sheetgen.engine.resonance import analyse
    if circuit.topology != "parallel" or circuit.load_resistance_ohm is None:
        return None
    unloaded = replace(circuit, load_resistance_ohm=None)
    return part_stress(unloaded, drive, analyse(unloaded).f_peak_hz)


def worse_stress(nominal: Stress, other: Stress | None) -> Stress:
    """Each part voltage, current and loss the larger of the two cases (the frequency, drive
    power and load figures stay the nominal ones)."""
    if other is None:
        return nominal
    from dataclasses import replace
    fields = ("capacitor_voltage_rms_v", "capacitor_voltage_peak_v", "capacitor_current_rms_a",
              "inductor_voltage_rms_v", "inductor_voltage_peak_v", "inductor_current_rms_a",
              "inductor_loss_w", "capacitor_loss_w")
    return replace(nominal, **{f: max(getattr(nominal, f), getattr(other, f)) for f in fields})


WorstCondition = Literal["as driven", "load open"]


@dataclass(frozen=True)
class WorstCase:
    """The worst credible case of the drive: each part's figure the larger of the nominal
    operating point and the load-open case (for a parallel tank, the load disconnected is
    also the worst mistune: see open_load_stress), and which case set the tank's voltage."""

    stress: Stress
    condition: WorstCondition


def worst_case(nominal: Stress, open_load: Stress | None) -> WorstCase:
    """The worst credible case (worse_stress) and the condition that gives its voltage."""
    worse = open_load is not None and (open_load.capacitor_voltage_peak_v
                                       > nominal.capacitor_voltage_peak_v)
    return WorstCase(worse_stress(nominal, open_load), "load open" if worse else "as driven")


@dataclass(frozen=True)
class DcFeed:
    """Where a DC supply the tank carries sits, in volts (0 where a part sees none).

    across_capacitor_v: across the tuning capacitor(s) and anything across them;
    to_chassis_v: between the tank's conductors and the chassis (ground);
    across_blocking_v: across the blocking capacitor, None where there is none.
    """

    supply_v: float
    across_capacitor_v: float
    to_chassis_v: float
    across_blocking_v: float | None


def dc_feed(topology: str, supply_v: float | None, blocked: bool) -> DcFeed | None:
    """Which parts of the tank see a DC supply (None without one).

    Parallel tank, supply fed through the coil: the coil is across the capacitor and holds
    both its ends at the supply, so the capacitor sees only the RF across it while every
    conductor of the tank sits at the supply against the chassis. Parallel tank with a
    blocking capacitor in series with the coil: the coil no longer shorts the tuning
    capacitor for DC, so it is charged to the supply, as is the blocking capacitor.
    Series loop: the capacitor is the only part that blocks DC in the loop and takes the
    whole supply. In every arrangement the tank's hot end is at the supply plus the RF
    peak against the chassis.
    """
    if not supply_v:
        return None
    if topology == "series":
        return DcFeed(supply_v, supply_v, supply_v, None)
    if blocked:
        return DcFeed(supply_v, supply_v, supply_v, supply_v)
    return DcFeed(supply_v, 0.0, supply_v, None)
