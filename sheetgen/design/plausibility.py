"""Plausibility bounds: values no lumped tuned circuit can be built or tested with.

A design can be self-consistent and still absurd (a 10 MH coil tuned by an 8e-24 F
capacitor, a "resonance" with a loaded Q of 0.001). Each bound below names its basis; the
evaluation returns findings (the job field at fault, the value and the bound crossed) and
report/checks.py words them as failed checks. Pure: numbers only, no words for people.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from sheetgen.engine.resonance import Circuit, Resonance
from sheetgen.engine.stress import Stress
from sheetgen.inputs.model import Job

# Common practice: lumped LC tanks are built from audio/VLF (a few kHz) up to UHF. Below
# 1 kHz the parts become henries and hundreds of microfarads (power-line filters, not tuned
# circuits); above 1 GHz a part of a few millimetres is a sizeable share of the wavelength
# (300 mm at 1 GHz) and resonators are built as lines or cavities instead.
F0_MIN_HZ = 1e3
F0_MAX_HZ = 1e9
# Common practice: a straight wire has about 1 nH per millimetre (from memory), so below
# 1 nH the leads alone outweigh the coil; above 1 H an inductor is an iron-cored choke
# whose loss and self-resonance make it no tuning inductor.
INDUCTANCE_MIN_H = 1e-9
INDUCTANCE_MAX_H = 1.0
# Common practice: pads, leads and a probe add stray capacitance of the order of 0.1 pF to
# 1 pF, so a tuning capacitance (or one fixed part) below 0.1 pF is swamped by strays. Above
# 100 µF only electrolytic parts exist, whose loss and tolerance rule out a tuned circuit.
CAPACITANCE_MIN_F = 0.1e-12
CAPACITANCE_MAX_F = 100e-6
# Textbook second-order response: Q = ½ is critical damping; below it the poles are real
# (overdamped) and the circuit does not resonate in any useful sense.
LOADED_Q_MIN = 0.5
# The breakdown field of air is about 3 MV/m at sea level over a small gap (from memory);
# across a part's terminals some 10 mm apart (common practice for large RF parts) that is
# 30 kV, which is also of the order of the highest ratings of vacuum capacitors (from
# memory). No part on a bench tank withstands more.
AIR_BREAKDOWN_V_PER_M = 3e6
TERMINAL_GAP_M = 10e-3
PEAK_VOLTAGE_MAX_V = AIR_BREAKDOWN_V_PER_M * TERMINAL_GAP_M

Quantity = Literal["f0", "inductance", "capacitance", "fixed capacitance", "loaded Q",
                   "peak voltage"]


@dataclass(frozen=True)
class Finding:
    """One value beyond a plausibility bound.

    field: the job field to change; value: the design's value (SI); bound: the bound
    crossed; side: "below" the minimum or "above" the maximum; derived: the value was
    computed by sheetgen (from the field named) rather than written in the job.
    """

    quantity: Quantity
    field: str
    value: float
    bound: float
    unit: str
    side: Literal["below", "above"]
    derived: bool


def _within(quantity: Quantity, field: str, value: float, low: float | None,
            high: float | None, unit: str, derived: bool) -> list[Finding]:
    if low is not None and not value >= low:
        return [Finding(quantity, field, value, low, unit, "below", derived)]
    if high is not None and not value <= high:
        return [Finding(quantity, field, value, high, unit, "above", derived)]
    return []


def plausibility_findings(job: Job, circuit: Circuit, resonance: Resonance, stress: Stress,
                          fixed_parts_f: tuple[float, ...] = (),
                          capacitance_f: float | None = None) -> tuple[Finding, ...]:
    """Every plausibility bound the design crosses, in the order f0, L, C, Q, voltage.

    `capacitance_f`: the tank capacitance the design needs (default: the circuit's)."""
    targets = job.circuit.targets
    f0_target = targets.f0_wanted if targets is not None else None
    l_given = job.inductor.inductance is not None
    c_given = job.capacitor.capacitance is not None
    c_field = "capacitor.capacitance" if c_given else "inductor.inductance"
    l_field = "inductor.inductance" if l_given else "capacitor.capacitance"
    findings: list[Finding] = []
    findings += _within("f0", "circuit.targets.f0" if f0_target is not None else c_field,
                        f0_target if f0_target is not None else resonance.f0_hz,
                        F0_MIN_HZ, F0_MAX_HZ, "Hz", f0_target is None)
    findings += _within("inductance", l_field, circuit.inductance_h, INDUCTANCE_MIN_H,
                        INDUCTANCE_MAX_H, "H", not l_given)
    needed_c = capacitance_f if capacitance_f is not None else circuit.capacitance_f
    capacitance = _within("capacitance", c_field, needed_c, CAPACITANCE_MIN_F,
                          CAPACITANCE_MAX_F, "F", not c_given)
    findings += capacitance
    if not capacitance and fixed_parts_f:
        findings += _within("fixed capacitance", "capacitor.preferred_series",
                            min(fixed_parts_f), CAPACITANCE_MIN_F, None, "F", True)
    findings += _loaded_q(job, circuit, resonance)
    peak = max(stress.capacitor_voltage_peak_v, stress.inductor_voltage_peak_v)
    findings += _within("peak voltage", _drive_field(job), peak, None, PEAK_VOLTAGE_MAX_V,
                        "V", True)
    return tuple(findings)


def _closed_form_loaded_q(circuit: Circuit, resonance: Resonance) -> float:
    """Q = X0/ΣR of a series loop, R∥/X0 of a parallel tank (R∥ the source, load and the
    tank's dynamic resistance X0²/(rL + rC) in parallel); textbook closed forms."""
    x0 = resonance.reactance_ohm
    loss = circuit.inductor_resistance_ohm + circuit.capacitor_esr_ohm
    if circuit.topology == "series":
        total = loss + sum(r for r in (circuit.source_resistance_ohm,
                                       circuit.load_resistance_ohm) if r is not None)
        return x0 / total if total > 0 else math.inf
    conductance = loss / (x0 * x0) + sum(1.0 / r for r in (circuit.source_resistance_ohm,
                                                           circuit.load_resistance_ohm)
                                         if r is not None)
    return 1.0 / (conductance * x0) if conductance > 0 else math.inf


def _loaded_q(job: Job, circuit: Circuit, resonance: Resonance) -> list[Finding]:
    targets = job.circuit.targets
    if targets is not None and targets.loaded_q is not None:
        return _within("loaded Q", "circuit.targets.loaded_q", targets.loaded_q,
                       LOADED_Q_MIN, None, "", False)
    if targets is not None and targets.bandwidth is not None:
        f0 = targets.f0_wanted or resonance.f0_hz
        return _within("loaded Q", "circuit.targets.bandwidth", f0 / targets.bandwidth,
                       LOADED_Q_MIN, None, "", True)
    q = resonance.q_loaded
    if q is None:  # no half-power points within 50 × f0: take the textbook closed form
        q = _closed_form_loaded_q(circuit, resonance)
    if not math.isfinite(q):
        return []
    field = ("load.resistance" if job.load is not None and job.load.resistance is not None
             else "source.resistance" if job.source.resistance is not None
             else "inductor")
    return _within("loaded Q", field, q, LOADED_Q_MIN, None, "", True)


def _drive_field(job: Job) -> str:
    source = job.source
    for name in ("available_power", "voltage", "current"):
        if getattr(source, name) is not None:
            return f"source.{name}"
    return "source"
