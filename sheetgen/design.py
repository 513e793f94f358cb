"""Job → Design: run the engine once over a validated job and keep every result, frozen.

This is the only place that knows both the job file's sections and the engine's
functions; it does no I/O and formats nothing.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np
from scipy.optimize import brentq

from .engine import resonance as rz
from .engine.standard_values import StandardPair, best_parallel_pair, nearest_standard
from .engine.stress import Drive, DriveError, Stress, part_stress
from .model import Job


class DesignError(ValueError):
    """The job is well-formed but asks for something the circuit cannot do."""

    def __init__(self, field: str, message: str):
        self.field = field
        super().__init__(f"{field}: {message}" if field else message)


@dataclass(frozen=True)
class CapacitorChoice:
    """Standard parts for the capacitance the design needs (IEC 60063)."""

    required_f: float
    series: str
    nearest_f: float
    pair: StandardPair


@dataclass(frozen=True)
class Derivation:
    """A value sheetgen computed rather than read from the job, and from what."""

    field: str
    value: float
    unit: str
    reason: str


@dataclass(frozen=True)
class Design:
    """Everything computed for one job; the results, the sheet and the CLI read only this."""

    job: Job
    circuit: rz.Circuit
    drive: Drive
    resonance: rz.Resonance
    stress: Stress
    sweep: rz.Sweep
    capacitor_choice: CapacitorChoice
    derived: tuple[Derivation, ...]


def design(job: Job) -> Design:
    """Compute the whole design of a job (pure: the same job always gives the same Design)."""
    derived: list[Derivation] = []
    inductance, capacitance = _reactive_parts(job, derived)
    f0 = float(rz.resonant_frequency_hz(inductance, capacitance))
    x0 = float(rz.reactance_ohm(inductance, f0))
    coil_r = job.inductor.resistance if job.inductor.resistance is not None else x0 / job.inductor.q
    esr = (job.capacitor.esr if job.capacitor.esr is not None
           else job.capacitor.dissipation_factor * x0)  # ESR = D / (ωC) and 1/(ω0 C) = X0
    load_r = job.load.resistance if job.load is not None else None
    circuit = rz.Circuit(job.circuit.topology, inductance, coil_r, capacitance, esr,
                         job.source.resistance, load_r)
    targets = job.circuit.targets
    wanted_q = _wanted_loaded_q(targets, f0)
    if wanted_q is not None:
        if load_r is not None:
            raise DesignError("load.resistance", "is given and so is a bandwidth or loaded Q "
                              "target; remove one of them")
        circuit = _with_load_for_q(circuit, wanted_q)
        derived.append(Derivation("load.resistance", circuit.load_resistance_ohm, "Ω",
                                  f"gives loaded Q {wanted_q:.4g}"))
    try:
        resonance = rz.analyse(circuit)
    except rz.NoResonanceError as error:
        raise DesignError("", str(error)) from None
    drive = _drive(job)
    try:
        stress = part_stress(circuit, drive, resonance.f_peak_hz)
    except DriveError as error:
        raise DesignError("source", str(error)) from None
    start, stop = rz.default_sweep_range_hz(resonance)
    start = job.sweep.start if job.sweep.start is not None else start
    stop = job.sweep.stop if job.sweep.stop is not None else stop
    if stop <= start:
        raise DesignError("sweep", f"start {start:.6g} Hz must be below stop {stop:.6g} Hz")
    response = rz.sweep(circuit, np.linspace(start, stop, job.sweep.points))
    series = job.capacitor.preferred_series
    choice = CapacitorChoice(capacitance, series, nearest_standard(capacitance, series),
                             best_parallel_pair(capacitance, series))
    return Design(job, circuit, drive, resonance, stress, response, choice, tuple(derived))


def _reactive_parts(job: Job, derived: list[Derivation]) -> tuple[float, float]:
    """L and C, computing the one left out from the f0 target (Thomson's formula)."""
    inductance, capacitance = job.inductor.inductance, job.capacitor.capacitance
    f0 = job.circuit.targets.f0 if job.circuit.targets else None
    if inductance is not None and capacitance is not None:
        if f0 is not None:
            raise DesignError("circuit.targets.f0", "inductance and capacitance are both given; "
                              "leave one out for sheetgen to compute, or drop the f0 target")
        return inductance, capacitance
    if f0 is None:
        missing = "inductor.inductance" if inductance is None else "capacitor.capacitance"
        raise DesignError(missing, "is missing; give it, or give circuit.targets.f0 and the "
                          "other reactive part")
    if inductance is None and capacitance is None:
        raise DesignError("inductor.inductance", "give the inductance or the capacitance; "
                          "an f0 target alone does not fix both")
    if capacitance is None:
        capacitance = float(rz.capacitance_for_f0(f0, inductance))
        derived.append(Derivation("capacitor.capacitance", capacitance, "F", "for the f0 target"))
    else:
        inductance = float(rz.inductance_for_f0(f0, capacitance))
        derived.append(Derivation("inductor.inductance", inductance, "H", "for the f0 target"))
    return inductance, capacitance


def _wanted_loaded_q(targets, f0_hz: float) -> float | None:
    if targets is None:
        return None
    if targets.loaded_q is not None:
        return targets.loaded_q
    if targets.bandwidth is not None:
        return f0_hz / targets.bandwidth
    return None


def _with_load_for_q(circuit: rz.Circuit, wanted_q: float) -> rz.Circuit:
    """The circuit with the load resistance that gives loaded Q = f0/bandwidth = wanted_q.

    Solved on the exact response (brentq over ln RL); the loaded Q moves monotonically with
    RL, down as a series load grows and up as a parallel load grows.
    """
    def q_with(load_ohm: float) -> float:
        try:
            result = rz.analyse(replace(circuit, load_resistance_ohm=load_ohm))
        except rz.NoResonanceError:
            return 0.0
        return result.q_loaded or 0.0

    x0 = float(rz.reactance_ohm(circuit.inductance_h,
                                rz.resonant_frequency_hz(circuit.inductance_h, circuit.capacitance_f)))
    low, high = x0 * 1e-6, x0 * 1e6
    q_low, q_high = q_with(low), q_with(high)
    reachable = (min(q_low, q_high), max(q_low, q_high))
    if not reachable[0] < wanted_q < reachable[1]:
        raise DesignError("circuit.targets", f"a loaded Q of {wanted_q:.4g} cannot be reached with "
                          f"a load resistance: the losses and source allow {reachable[0]:.3g} to "
                          f"{reachable[1]:.3g}")
    load = math.exp(brentq(lambda u: q_with(math.exp(u)) - wanted_q, math.log(low),
                           math.log(high), xtol=1e-12, rtol=1e-12))
    return replace(circuit, load_resistance_ohm=load)


def _drive(job: Job) -> Drive:
    source = job.source
    if source.voltage is not None:
        return Drive("voltage", source.voltage)
    if source.current is not None:
        return Drive("current", source.current)
    return Drive("available_power", source.available_power)
