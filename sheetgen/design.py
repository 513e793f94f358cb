"""Job → Design: run the engine once over a validated job and keep every result, frozen.

This is the only place that knows both the job file's sections and the engine's
functions; it does no I/O and formats nothing.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from .engine import resonance as rz
from .engine.standard_values import StandardPair, best_parallel_pair, nearest_standard
from .assessment import SERIES_TOLERANCE, Assessment, UnknownAcceptance, assess
from .designators import Designators, designators
from .engine.stress import Drive, DriveError, Stress, part_stress
from .library import PartsLibrary
from .model import Job


class DesignError(ValueError):
    """The job is well-formed but asks for something the circuit cannot do."""

    def __init__(self, field: str, message: str):
        self.field = field
        super().__init__(f"{field}: {message}" if field else message)


@dataclass(frozen=True)
class CapacitorChoice:
    """Standard parts for the capacitance the design needs (IEC 60063), and what is fitted.

    With a trimmer, the fixed part is picked for the required capacitance less the
    trimmer's mid-range, and the trimmer is set to make up the rest.
    """

    required_f: float
    series: str
    nearest_f: float
    pair: StandardPair
    fixed_f: float
    trimmer_setting_f: float | None
    trimmer_in_range: bool | None
    built_f: float
    from_standard_parts: bool

    @property
    def fixed_parts_f(self) -> tuple[float, ...]:
        """The fixed capacitors to fit: the standard part(s), or the job's own value."""
        if not self.from_standard_parts:
            return (self.fixed_f,)
        return tuple(v for v in (self.pair.first, self.pair.second) if v is not None)


@dataclass(frozen=True)
class Derivation:
    """A value sheetgen computed rather than read from the job, and from what."""

    field: str
    value: float
    unit: str
    reason: str


@dataclass(frozen=True)
class CoilCurve:
    """The designed coil's estimated Q against frequency."""

    f_hz: np.ndarray
    q: np.ndarray


@dataclass(frozen=True)
class CoilDesign:
    """The coil sheetgen designed: the engine's result and what the design made of it."""

    form: str
    result: object  # engine.coil.ToroidCoil or SolenoidCoil
    core_name: str | None
    material_name: str | None
    target_inductance_h: float
    f0_with_whole_turns_hz: float | None  # before the capacitor re-centres it
    link_turns: int | None
    link_resistance_ohm: float | None
    tap_turns: int | None  # counted from the start (cold) end
    tap_resistance_ohm: float | None
    flux_density_max_t: float | None
    inductance_tolerance: float | None  # ± fraction of the built inductance
    inductance_tc: float | None  # 1/K
    lead_length_m: float
    core_outer_diameter_m: float | None  # toroid only
    core_inner_diameter_m: float | None
    core_height_m: float | None
    q_used: float
    q_source: str  # "estimate" or "job"
    q_curve: CoilCurve


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
    coil: CoilDesign | None
    designators: Designators
    assessment: Assessment


_LOAD_GRID_POINTS = 64  # RL grid per round when solving for a loaded-Q target
_LOAD_GRID_ROUNDS = 8  # 27.6 (ln of 12 decades) / 63^8 < 1e-13
WIRE_TEMPERATURE_C = 20.0  # copper resistivity reference of IEC 60028
AIR_CORE_TOLERANCE = 0.05  # hand-wound single-layer coils, set by turn spacing (common practice)


def design(job: Job, library: PartsLibrary | None = None) -> Design:
    """Compute the whole design of a job (pure: the same job always gives the same Design).

    `library` is the parts library that named cores and materials are looked up in.
    """
    derived: list[Derivation] = []
    target_l, required_c = _reactive_parts(job, derived)
    targets = job.circuit.targets
    f0_target = targets.f0 if targets else None
    f_design = f0_target or float(rz.resonant_frequency_hz(target_l, required_c))
    coil = None
    if job.inductor.form == "given":
        inductance = target_l
    else:
        coil = _design_coil(job, library, target_l, f_design, None)
        inductance = coil.inductance_built_h
        if job.capacitor.capacitance is None:  # re-centre f0 on the whole-turn coil
            required_c = float(rz.capacitance_for_f0(f0_target, inductance))
            _replace_derivation(derived, "capacitor.capacitance", required_c,
                                "for the f0 target with the whole-turn coil")
    choice = _capacitor_choice(job, required_c)
    capacitance = choice.built_f
    f0 = float(rz.resonant_frequency_hz(inductance, capacitance))
    x0 = float(rz.reactance_ohm(inductance, f0))
    coil_r, q_used, q_source = _coil_loss(job, coil, x0, f0)
    esr = (job.capacitor.esr if job.capacitor.esr is not None
           else job.capacitor.dissipation_factor * x0)  # ESR = D / (ωC) and 1/(ω0 C) = X0
    load_r = job.load.resistance if job.load is not None else None
    circuit = rz.Circuit(job.circuit.topology, inductance, coil_r, capacitance, esr,
                         job.source.resistance, load_r)
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
    coil_design = None
    if coil is not None:
        loaded_coil = _design_coil(job, library, target_l, f_design,
                                   stress.inductor_voltage_rms_v)
        coil_design = _coil_design(job, library, loaded_coil, target_l, circuit,
                                   q_used, q_source, f0)
    fixed = choice.fixed_parts_f
    names = designators(len(fixed), choice.trimmer_setting_f is not None,
                        circuit.source_resistance_ohm is not None,
                        circuit.load_resistance_ohm is not None,  # a link or tap needs one
                        coil_design is not None and coil_design.link_turns is not None)
    try:
        assessment = _assess(job, circuit, resonance, stress, response, names, choice, fixed,
                             coil_design, f0_target)
    except UnknownAcceptance as error:
        raise DesignError(error.field, str(error)) from None
    except ValueError as error:  # e.g. an operating range beyond a dielectric's rating
        raise DesignError("variation", str(error)) from None
    return Design(job, circuit, drive, resonance, stress, response, choice, tuple(derived),
                  coil_design, names, assessment)


def _assess(job, circuit, resonance, stress, response, names, choice, fixed, coil, f0_target):
    """The limits, checks and cautions, with the coil's tolerance and temperature data."""
    if coil is None:
        tolerance = job.inductor.tolerance
        tc = job.inductor.temperature_coefficient
        return assess(job, circuit, resonance, stress, response, names,
                      f0_target_hz=f0_target, fixed_capacitance_f=choice.fixed_f,
                      inductance_tolerance=tolerance, inductance_tc=tc, fixed_parts_f=fixed)
    r = coil.result
    return assess(job, circuit, resonance, stress, response, names, f0_target_hz=f0_target,
                  fixed_capacitance_f=choice.fixed_f,
                  inductance_tolerance=coil.inductance_tolerance,
                  inductance_tc=coil.inductance_tc, coil=r,
                  flux_limit_t=coil.flux_density_max_t, wire_diameter_m=r.wire.diameter_m,
                  coil_temperature_rise_k=getattr(r, "temperature_rise_k", None),
                  fixed_parts_f=fixed)


def _design_coil(job: Job, library, inductance_h: float, f_hz: float, voltage_rms_v):
    # The coil modules (and scipy.special) are imported only for jobs that design a coil.
    from .coil_parts import PartError, design_coil
    try:
        return design_coil(job.inductor, library, inductance_h, f_hz, voltage_rms_v,
                           WIRE_TEMPERATURE_C)
    except PartError as error:
        raise DesignError(error.field, str(error)) from None


def _replace_derivation(derived: list[Derivation], field: str, value: float, reason: str):
    derived[:] = [d for d in derived if d.field != field]
    derived.append(Derivation(field, value, "F", reason))


def _coil_loss(job: Job, coil, x0: float, f0: float) -> tuple[float, float, str]:
    """The coil's series loss resistance at f0, its Q, and whether the job or the estimate
    gave it (Q = X/r)."""
    inductor = job.inductor
    if inductor.form == "given":
        if inductor.resistance is not None:
            r = inductor.resistance
            return r, (x0 / r if r > 0 else float("inf")), "job"
        return x0 / inductor.q, inductor.q, "job"
    if inductor.q is not None:
        return x0 / inductor.q, inductor.q, "job"
    from .engine.coil import coil_q_sweep
    q = float(coil_q_sweep(coil, f0))
    return x0 / q, q, "estimate"


def _coil_design(job: Job, library, coil, target_l: float, circuit: rz.Circuit,
                 q_used: float, q_source: str, f0: float) -> CoilDesign:
    from .coil_parts import resolve_toroid
    from .engine.coil import coil_q_sweep
    from .engine.magnetics import link_turns
    inductor = job.inductor
    core_name = material_name = flux_limit = None
    core_size = (None, None, None)
    tolerance = inductor.tolerance
    tc = inductor.temperature_coefficient
    if inductor.form == "toroid":
        parts = resolve_toroid(inductor, library)
        core_name, material_name = parts.core_name, parts.material_name
        flux_limit = parts.material.flux_density_max_t
        core_size = (parts.core.outer_diameter_m, parts.core.inner_diameter_m,
                     parts.core.height_m)
        if tolerance is None:
            tolerance = (parts.core_spec.al_tolerance if parts.core_spec.al_tolerance is not None
                         else parts.material_spec.mu_i_tolerance)
        if tc is None:
            tc = parts.material_spec.mu_tc  # AL ∝ µ, so L follows µ's coefficient
    elif tolerance is None:
        tolerance = AIR_CORE_TOLERANCE
    link_turns_n = link_r = tap_turns_n = tap_r = None
    link = getattr(inductor, "link", None)  # a solenoid has no link, only a tap
    kind, coupling = ("link", link) if link is not None else ("tap", inductor.tap)
    if coupling is not None:
        field = f"inductor.{kind}"
        if circuit.topology != "parallel" or circuit.load_resistance_ohm is None:
            raise DesignError(field, f"a {kind} couples a load to a parallel tank: it "
                              "needs topology parallel and a load resistance (given or "
                              "computed from a bandwidth target)")
        # Ideal transformer: a resistance R at M of N turns looks like R·(N/M)² across the tank.
        turns = link_turns(coil.turns, circuit.load_resistance_ohm, coupling.resistance)
        if kind == "link":
            link_turns_n, link_r = turns, coupling.resistance
        else:
            if turns >= coil.turns:
                raise DesignError(field, f"a tap for {coupling.resistance:.4g} Ω would sit at "
                                  f"or beyond the end of the {coil.turns}-turn winding: a tap "
                                  "matches only a resistance below the tank's load resistance "
                                  f"({circuit.load_resistance_ohm:.4g} Ω)")
            tap_turns_n, tap_r = turns, coupling.resistance
    f0_whole = None
    if job.capacitor.capacitance is None:
        f0_whole = float(rz.resonant_frequency_hz(
            coil.inductance_built_h, rz.capacitance_for_f0(job.circuit.targets.f0, target_l)))
    high = min(20.0 * f0, 0.98 * coil.srf_hz) if coil.srf_hz else 20.0 * f0
    f_curve = np.geomspace(f0 / 20.0, high, 241)
    return CoilDesign(inductor.form, coil, core_name, material_name, target_l, f0_whole,
                      link_turns_n, link_r, tap_turns_n, tap_r, flux_limit, tolerance, tc,
                      inductor.lead_length,
                      *core_size,
                      q_used, q_source,
                      CoilCurve(f_curve, np.asarray(coil_q_sweep(coil, f_curve))))


def _capacitor_choice(job: Job, required_c: float) -> CapacitorChoice:
    """What to fit: the given part, or standard parts (and a trimmer setting) for required_c."""
    series = job.capacitor.preferred_series
    trimmer = job.capacitor.trimmer
    nearest = nearest_standard(required_c, series)
    tolerance = (job.capacitor.tolerance if job.capacitor.tolerance is not None
                 else SERIES_TOLERANCE[series])
    pair = best_parallel_pair(required_c, series, tolerance)
    if job.capacitor.capacitance is not None:
        return CapacitorChoice(required_c, series, nearest, pair, required_c, None, None,
                               required_c, False)
    if trimmer is None:
        return CapacitorChoice(required_c, series, nearest, pair, pair.total, None, None,
                               pair.total, True)
    middle = 0.5 * (trimmer.minimum + trimmer.maximum)
    if required_c - middle <= 0:
        raise DesignError("capacitor.trimmer", f"the trimmer's mid-range ({middle:.4g} F) "
                          f"exceeds the whole capacitance needed ({required_c:.4g} F); "
                          "choose a smaller trimmer")
    fixed = best_parallel_pair(required_c - middle, series, tolerance)
    setting = required_c - fixed.total
    in_range = trimmer.minimum <= setting <= trimmer.maximum
    clamped = min(max(setting, trimmer.minimum), trimmer.maximum)
    return CapacitorChoice(required_c, series, nearest, fixed, fixed.total, clamped, in_range,
                           fixed.total + clamped, True)


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


def _loaded_q(circuit: rz.Circuit, loads_ohm: np.ndarray) -> np.ndarray:
    """f0/bandwidth of the circuit with each of the load resistances (0 where no −3 dB
    points), all in one vectorised evaluation of the exact response."""
    features = rz.response_features(replace(circuit, load_resistance_ohm=loads_ohm))
    with np.errstate(invalid="ignore", divide="ignore"):
        q = features.f0_hz / (features.f_high_hz - features.f_low_hz)
    return np.nan_to_num(q, nan=0.0)


def _with_load_for_q(circuit: rz.Circuit, wanted_q: float) -> rz.Circuit:
    """The circuit with the load resistance that gives loaded Q = f0/bandwidth = wanted_q.

    Solved on the exact response: the loaded Q moves monotonically with RL (down as a
    series load grows, up as a parallel load grows), so a grid of RL over twelve decades
    brackets the answer and each finer grid inside the bracket narrows it 63-fold.
    """
    x0 = float(rz.reactance_ohm(circuit.inductance_h,
                                rz.resonant_frequency_hz(circuit.inductance_h, circuit.capacitance_f)))
    low_u, high_u = math.log(x0 * 1e-6), math.log(x0 * 1e6)
    ends = _loaded_q(circuit, np.exp(np.array([low_u, high_u])))
    if not min(ends) < wanted_q < max(ends):
        raise DesignError("circuit.targets", f"a loaded Q of {wanted_q:.4g} cannot be reached with "
                          f"a load resistance: the losses and source allow {min(ends):.3g} to "
                          f"{max(ends):.3g}")
    rising = ends[1] > ends[0]
    for _ in range(_LOAD_GRID_ROUNDS):
        grid = np.linspace(low_u, high_u, _LOAD_GRID_POINTS)
        below = (_loaded_q(circuit, np.exp(grid)) < wanted_q) == rising
        index = int(np.count_nonzero(below))  # grid[:index] lie on the low side
        index = min(max(index, 1), _LOAD_GRID_POINTS - 1)
        low_u, high_u = grid[index - 1], grid[index]
    return replace(circuit, load_resistance_ohm=math.exp(0.5 * (low_u + high_u)))


def _drive(job: Job) -> Drive:
    source = job.source
    if source.voltage is not None:
        return Drive("voltage", source.voltage)
    if source.current is not None:
        return Drive("current", source.current)
    return Drive("available_power", source.available_power)
