"""Job → Design: run the engine once over a validated job and keep every result, frozen.

This is the only room that knows both the job file's sections and the engine's
functions; it does no I/O and writes no text for people (report/ does).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from sheetgen.design.assessment import assess, bleeder_duty, job_drive
from sheetgen.design.capacitors import capacitance_across, capacitor_choice, target_offset
from sheetgen.design.designators import designators
from sheetgen.design.kinds import duties_of
from sheetgen.design.kinds.tank import tank_model
from sheetgen.design.plausibility import CAPACITANCE_MIN_F, LOADED_Q_MIN, plausibility_findings
from sheetgen.design.records import CoilDesign, Derivation, Design
from sheetgen.engine import resonance
from sheetgen.engine.stress import (
    DriveError,
    dc_feed,
    open_circuit_voltage_rms,
    open_load_stress,
    part_stress,
    worst_case,
)
from sheetgen.engine.variation import BOUGHT_COIL_TOLERANCE
from sheetgen.errors import FieldError
from sheetgen.inputs.library import PartsLibrary
from sheetgen.inputs.model import Job

BAND_SEARCH = 1.5  # the response maximum is looked for within f/1.5 … 1.5·f of each point


def compute_design(job: Job, library: PartsLibrary | None = None) -> Design:
    """Compute the whole design of a job (pure: the same job always gives the same Design).

    `library` is the parts library that named cores and materials are looked up in.
    """
    # The coil modules (and scipy.special) are imported only for jobs that design a coil.
    derived: list[Derivation] = []
    target_l, required_c = _reactive_parts(job, derived)
    targets = job.circuit.targets
    f0_target = targets.f0_wanted if targets else None
    band = targets.band if targets else None
    if band is not None and job.capacitor.trimmer is None:
        raise FieldError("circuit.targets.band", "a band is tuned with a variable capacitor: "
                         "give capacitor.trimmer (its minimum and maximum)")
    f_design = f0_target or float(resonance.resonant_frequency_hz(target_l, required_c))
    coil = parts = leads = None
    library_entries = ()
    if job.inductor.form == "given":
        inductance = target_l
    else:
        from sheetgen.design.coil import (
            design_coil,
            lead_inductance,
            resolve_toroid,
            used_library_entries,
        )
        if job.inductor.form == "toroid":
            parts = resolve_toroid(job.inductor, library)
            library_entries = used_library_entries(parts, library)
        coil = design_coil(job.inductor, parts, target_l, f_design, None)
        leads = lead_inductance(job.inductor, coil, parts, job.test.lcr_accuracy)
        inductance = coil.inductance_built_h + (leads.inductance_h if leads.counted else 0.0)
        if job.capacitor.capacitance is None:  # re-centre f0 on the whole-turn coil
            required_c = float(resonance.capacitance_for_f0(f0_target, inductance))
            _replace_derivation(derived, "capacitor.capacitance", required_c,
                                "for the f0 target with the whole-turn coil")
    others = capacitance_across(job, coil)
    if job.capacitor.capacitance is None:  # fit the total less what is already across it
        fit_c = required_c - others.total_f
        if fit_c <= 0.0 and required_c < CAPACITANCE_MIN_F:
            fit_c = required_c  # beyond what can be built at all: the plausibility check says so
        elif fit_c <= 0.0:
            raise FieldError("capacitor", f"the coil's self-capacitance and the strays "
                             f"({others.total_f:.4g} F) already exceed the "
                             f"{required_c:.4g} F the f0 target needs; use a smaller coil "
                             "(fewer turns) and a larger capacitor")
        if others.total_f > 0.0:
            reason = next(d.reason for d in derived if d.field == "capacitor.capacitance")
            _replace_derivation(derived, "capacitor.capacitance", fit_c,
                                f"{reason}, less the capacitance already across it")
    else:
        fit_c = required_c
    derived.append(Derivation("capacitor.across", others.total_f, "F",
                              "coil self-capacitance and strays, counted in C"))
    band_fit = None
    if band is not None:  # the capacitance to fit at each edge of the band
        band_fit = tuple(float(resonance.capacitance_for_f0(f, inductance)) - others.total_f
                         for f in (band.high, band.low))
    choice = capacitor_choice(job, fit_c, others, band_fit)
    capacitance = choice.built_f + others.total_f
    f0 = float(resonance.resonant_frequency_hz(inductance, capacitance))
    x0 = float(resonance.reactance_ohm(inductance, f0))
    coil_r, q_used, q_source = _coil_loss(job, coil, x0, f0)
    esr = (job.capacitor.esr if job.capacitor.esr is not None
           else float(resonance.esr_from_dissipation_factor_ohm(
               job.capacitor.dissipation_factor, capacitance, f0)))
    load_r = job.load.resistance if job.load is not None else None
    circuit = resonance.Circuit(job.circuit.topology, inductance, coil_r, capacitance, esr,
                                job.source.resistance, load_r)
    wanted_q = _wanted_loaded_q(targets, f0)
    if wanted_q is not None and wanted_q < LOADED_Q_MIN:
        wanted_q = None  # no resonance to load down to it: the plausibility check says so
    if wanted_q is not None:
        if load_r is not None:
            raise FieldError("load.resistance", "is given and so is a bandwidth or loaded Q "
                             "target; remove one of them")
        try:
            load_r = resonance.load_for_loaded_q(circuit, wanted_q)
        except resonance.LoadedQUnreachable as error:
            raise FieldError("circuit.targets", str(error)) from None
        circuit = resonance.Circuit(circuit.topology, inductance, coil_r, capacitance, esr,
                                    job.source.resistance, load_r)
        derived.append(Derivation("load.resistance", load_r, "Ω",
                                  f"gives loaded Q {wanted_q:.4g}"))
    coupled = coupling = None
    if coil is not None:  # a link or tap of whole turns presents R·(N/M)², not the aim
        from sheetgen.design.coil import as_built_coupling
        coupling = as_built_coupling(job.inductor, coil.turns, circuit)
        if coupling is not None and not math.isclose(coupling.presented_ohm, load_r,
                                                     rel_tol=1e-12):
            coupled = coupling.kind
            load_r = coupling.presented_ohm
            circuit = replace(circuit, load_resistance_ohm=load_r)
            derived[:] = [d for d in derived if d.field != "load.resistance"]
            derived.append(Derivation(
                "load.resistance", load_r, "Ω",
                f"as built: R·(N/M)² with the {coupling.kind} at {coupling.turns} of "
                f"{coil.turns} turns"))
    try:
        analysed = resonance.analyse(circuit)
    except resonance.NoResonanceError as error:
        raise FieldError("", str(error)) from None
    if coupled:  # what the rounded coupling does to the selectivity the job asked for
        aim = (f"; target {targets.bandwidth / 1e3:.6g} kHz" if targets and targets.bandwidth
               else f"; target loaded Q {targets.loaded_q:.4g}" if targets and targets.loaded_q
               else "")
        derived.append(Derivation("resonance.bandwidth", analysed.bandwidth_hz, "Hz",
                                  f"as built with the whole-turn {coupled}{aim}"))
        derived.append(Derivation("resonance.q_loaded", analysed.q_loaded, "",
                                  f"as built with the whole-turn {coupled}"))
    drive = job_drive(job)
    try:
        stress = part_stress(circuit, drive, analysed.f_peak_hz)
        open_stress = open_load_stress(circuit, drive)
    except DriveError as error:
        raise FieldError("source", str(error)) from None
    except resonance.NoResonanceError:
        open_stress = None
    worst = worst_case(stress, open_stress)  # what the parts are rated and judged at
    dc = dc_feed(circuit.topology, job.circuit.dc_voltage, job.circuit.dc_blocked)
    start, stop = resonance.default_sweep_range_hz(analysed)
    start = job.sweep.start if job.sweep.start is not None else start
    stop = job.sweep.stop if job.sweep.stop is not None else stop
    if stop <= start:
        raise FieldError("sweep", f"start {start:.6g} Hz must be below stop {stop:.6g} Hz")
    response = resonance.sweep(circuit, np.linspace(start, stop, job.sweep.points))
    coil_result = coil_at_worst = None
    if coil is not None:
        from sheetgen.design.coil import coil_at_voltage, coil_design
        loaded_coil = coil_at_voltage(coil, parts, stress.inductor_voltage_rms_v, f_design)
        coil_at_worst = (coil_at_voltage(coil, parts, worst.stress.inductor_voltage_rms_v,
                                         f_design)  # heat and flux are judged here
                         if worst.stress is not stress else loaded_coil)
        coil_result = coil_design(job, parts, loaded_coil, target_l, circuit, q_used, q_source,
                                  f0, coupling, leads)
    fixed = choice.fixed_parts_f
    names = designators(len(fixed), choice.trimmer_setting_f is not None,
                        circuit.source_resistance_ohm is not None,
                        circuit.load_resistance_ohm is not None,  # a link or tap needs one
                        coil_result is not None and coil_result.link_turns is not None,
                        job.capacitor.bleeder is not None)
    bench = _bench(job, circuit, analysed, stress, coil_result)
    model = tank_model(circuit, names, choice, coupling, drive.kind)
    duties = duties_of(model, _drive_rms(drive, circuit), analysed.f_peak_hz, f0)
    band_settings = _band_settings(job, model, names) if band is not None else ()
    try:
        assessment = _assess(job, circuit, analysed, stress, response, names, choice, fixed,
                             coil_result, f0_target, worst, dc, bench, coil_at_worst,
                             band_settings)
    except FieldError:
        raise
    except ValueError as error:  # e.g. an operating range beyond a dielectric's rating
        raise FieldError("variation", str(error)) from None
    offset = None
    if f0_target is not None:
        lim = assessment.limits
        offset = target_offset(job, choice, inductance, f0_target, analysed.f0_hz,
                               analysed.bandwidth_hz, (lim.f0_min_hz, lim.f0_max_hz),
                               coil.turns if coil is not None else None)
    return Design(job, circuit, drive, analysed, stress, response, choice, tuple(derived),
                  coil_result, names, assessment,
                  plausibility=plausibility_findings(job, circuit, analysed, stress, fixed,
                                                     capacitance_f=required_c),
                  stress_open_load=open_stress,
                  bleeder=bleeder_duty(job, worst.stress, dc), bench=bench, worst=worst, dc=dc,
                  coil_at_worst=coil_at_worst, model=model, duties=duties,
                  library_entries=library_entries, target_offset=offset)


def _drive_rms(drive, circuit) -> float:
    """The source's RMS EMF (volts) or current (amperes) that the network's unit drive scales to."""
    if drive.kind == "current":
        return drive.value
    return open_circuit_voltage_rms(drive, circuit.source_resistance_ohm)


def _bench(job: Job, circuit, analysed, stress, coil: CoilDesign | None):
    """The bench set-up: the receiver on the link's or tap's load resistor when the coil
    has one (the circuit's own 50 Ω-like port), else on the load."""
    from sheetgen.engine.bench import bench_setup
    coupled, at_port = None, None
    if coil is not None and coil.link_turns is not None:
        coupled, at_port = "link", coil.link_resistance_ohm
    elif coil is not None and coil.tap_turns is not None:
        coupled, at_port = "tap", coil.tap_resistance_ohm
    try:
        return bench_setup(circuit, analysed, stress, coupled=coupled,
                           port_resistor_ohm=at_port,
                           port_tolerance=job.test.port_tolerance,
                           noise_floor_dbm_per_hz=job.test.receiver_noise_floor)
    except resonance.NoResonanceError as error:
        raise FieldError("", str(error)) from None


def _coil_loss(job: Job, coil, x0: float, f0: float) -> tuple[float, float, str]:
    """The coil's series loss resistance at f0 and its Q, from the job or the coil design."""
    if coil is None:
        inductor = job.inductor
        if inductor.resistance is not None:
            r = inductor.resistance
            return r, (x0 / r if r > 0 else float("inf")), "job"
        return x0 / inductor.q, inductor.q, "job"
    from sheetgen.design.coil import coil_loss
    return coil_loss(job.inductor, coil, x0, f0)


def _band_settings(job: Job, model, names) -> tuple[float | None, ...]:
    """The variable capacitor's setting at the band's edges and middle for the nominal unit
    as built, solved on its network (response maximum on each frequency; None where the
    range does not reach it)."""
    from sheetgen.design.assessment import band_points_hz
    from sheetgen.engine.network_tuning import adjust, peak_frequency
    trimmer = job.capacitor.trimmer
    points = np.array(band_points_hz(job.circuit.targets.band))
    found = adjust(model.network, names.trimmer, trimmer.minimum, trimmer.maximum, points,
                   peak_frequency(points / BAND_SEARCH, points * BAND_SEARCH))
    return tuple(float(v) if ok else None for v, ok in zip(found.value, found.reached,
                                                           strict=True))


def _assess(job, circuit, analysed, stress, response, names, choice, fixed,
            coil: CoilDesign | None, f0_target, worst, dc=None, bench=None,
            coil_at_worst=None, band_settings=()):
    """The limits and rating checks, with the coil's tolerance and temperature data."""
    if coil is None:  # a bought coil: never exact unless the job says so
        tolerance = (job.inductor.tolerance if job.inductor.tolerance is not None
                     else BOUGHT_COIL_TOLERANCE)
        tc = job.inductor.temperature_coefficient
        return assess(job, circuit, analysed, stress, response, names,
                      f0_target_hz=f0_target, fixed_capacitance_f=choice.fixed_f,
                      inductance_tolerance=tolerance, inductance_tc=tc, fixed_parts_f=fixed,
                      other_capacitance_f=_across(choice), worst=worst, dc=dc,
                      bench=bench, band_settings_f=band_settings)
    r = coil.result
    return assess(job, circuit, analysed, stress, response, names, f0_target_hz=f0_target,
                  fixed_capacitance_f=choice.fixed_f,
                  inductance_tolerance=coil.inductance_tolerance,
                  inductance_tc=coil.inductance_tc, coil=coil_at_worst or r,
                  flux_limit_t=coil.flux_density_max_t, wire_diameter_m=r.wire.diameter_m,
                  ac_to_dc_resistance=max(1.0, r.ac_resistance_ohm / r.dc_resistance_ohm),
                  fixed_parts_f=fixed, other_capacitance_f=_across(choice),
                  worst=worst, dc=dc, bench=bench, band_settings_f=band_settings)


def _across(choice) -> float:
    return choice.across.total_f if choice.across is not None else 0.0


def _replace_derivation(derived: list[Derivation], field: str, value: float, reason: str):
    derived[:] = [d for d in derived if d.field != field]
    derived.append(Derivation(field, value, "F", reason))


def _reactive_parts(job: Job, derived: list[Derivation]) -> tuple[float, float]:
    """L and C, computing the one left out from the f0 target (Thomson's formula)."""
    inductance, capacitance = job.inductor.inductance, job.capacitor.capacitance
    f0 = job.circuit.targets.f0_wanted if job.circuit.targets else None
    if inductance is not None and capacitance is not None:
        if f0 is not None:
            raise FieldError("circuit.targets.f0", "inductance and capacitance are both given; "
                              "leave one out for sheetgen to compute, or drop the f0 target")
        return inductance, capacitance
    if f0 is None:
        missing = "inductor.inductance" if inductance is None else "capacitor.capacitance"
        raise FieldError(missing, "is missing; give it, or give circuit.targets.f0 and the "
                          "other reactive part")
    if inductance is None and capacitance is None:
        raise FieldError("inductor.inductance", "give the inductance or the capacitance; "
                          "an f0 target alone does not fix both")
    if capacitance is None:
        capacitance = float(resonance.capacitance_for_f0(f0, inductance))
        derived.append(Derivation("capacitor.capacitance", capacitance, "F", "for the f0 target"))
    else:
        inductance = float(resonance.inductance_for_f0(f0, capacitance))
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
