"""Job file coil sections + parts library → the engine's coil inputs, and the coil designed.

Resolves a core or material named in the job against the parts library, turns the
validated job values into the engine's frozen specs (engine/coil.py), and runs the
designer. Pure: the library is passed in, already loaded.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from sheetgen.design.records import CoilCurve, CoilDesign, Coupling, Leads
from sheetgen.engine import coil as coil_engine
from sheetgen.engine.coil import SolenoidCoil, ToroidCoil
from sheetgen.engine.magnetics import CoreLossTable, link_turns, toroid_turn_length_m
from sheetgen.engine.resonance import Circuit, capacitance_for_f0, resonant_frequency_hz
from sheetgen.engine.wire import (
    COPPER_REFERENCE_TEMPERATURE_C,
    Wire,
    straight_wire_inductance_h,
    wire_from_designation,
)
from sheetgen.errors import FieldError
from sheetgen.inputs.library import LibraryEntry, PartsLibrary
from sheetgen.inputs.model import CoreSpec, Job, MaterialSpec, SolenoidInductor, ToroidInductor

AIR_CORE_TOLERANCE = 0.05  # hand-wound single-layer coils, set by turn spacing (common practice)


@dataclass(frozen=True)
class ResolvedToroid:
    """The toroid's core and material as the engine takes them, with their library names."""

    core_name: str
    material_name: str
    core: coil_engine.ToroidCore
    material: coil_engine.CoreMaterial
    material_spec: MaterialSpec
    core_spec: CoreSpec


def resolve_toroid(inductor: ToroidInductor, library: PartsLibrary | None) -> ResolvedToroid:
    """Look up the core (and its material) by name, or take them inline."""
    if isinstance(inductor.core, str):
        core_spec = _lookup(library, "cores", inductor.core, "inductor.core")
        core_name = inductor.core
    else:  # inline: named by what the job says it is, else by its size
        core_spec = inductor.core
        core_name = core_spec.description or f"ring core {ring_size_text(core_spec)}"
    if isinstance(core_spec.material, str):
        material_spec = _lookup(library, "materials", core_spec.material,
                                "inductor.core" if isinstance(inductor.core, str)
                                else "inductor.core.material")
        material_name = core_spec.material
    else:
        material_spec = core_spec.material
        material_name = material_spec.description or f"material of µi {material_spec.mu_i:g}"
    rows = material_spec.loss
    kind = "loss_factor" if rows[0].loss_factor is not None else "material_q"
    table = CoreLossTable(tuple(r.f for r in rows),
                          tuple(r.loss_factor if kind == "loss_factor" else r.q for r in rows),
                          kind)
    steinmetz = material_spec.steinmetz
    material = coil_engine.CoreMaterial(
        mu_i=material_spec.mu_i, loss_table=table,
        flux_density_max_t=material_spec.flux_density_max,
        steinmetz_k=steinmetz.k if steinmetz else None,
        steinmetz_alpha=steinmetz.alpha if steinmetz else None,
        steinmetz_beta=steinmetz.beta if steinmetz else None)
    core = coil_engine.ToroidCore(core_spec.outer_diameter, core_spec.inner_diameter,
                                  core_spec.height, core_spec.chamfer, core_spec.al)
    return ResolvedToroid(core_name, material_name, core, material, material_spec, core_spec)


def ring_size_text(core: CoreSpec) -> str:
    """A ring core's size as a storeman reads it: "18 × 9.5 × 6.5 mm" (OD × ID × height)."""
    return " × ".join(f"{v * 1e3:.3g}" for v in (core.outer_diameter, core.inner_diameter,
                                                 core.height)) + " mm"


def _lookup(library: PartsLibrary | None, kind: str, name: str, field: str):
    table = getattr(library, kind) if library is not None else {}
    if name in table:
        return table[name]
    where = f"the parts library in {library.folder}" if library is not None else "no library"
    known = ", ".join(sorted(table)) or "none"
    singular = kind[:-1]
    raise FieldError(field, f"no {singular} named {name!r} in {where}; known {kind}: {known}")


def used_library_entries(parts: ResolvedToroid | None,
                         library: PartsLibrary | None) -> tuple[LibraryEntry, ...]:
    """The library entries a toroid's core and material came from (inline ones are in the
    job itself): what a sheet records so its design can be made again anywhere."""
    if parts is None or library is None:
        return ()
    found = (library.entry("cores", parts.core_name), library.entry("materials", parts.material_name))
    return tuple(entry for entry in found if entry is not None)


def resolve_wire(text: str, grade: int, field: str) -> Wire:
    """The wire of a designation such as "AWG 24" or "0.50 mm"."""
    try:
        return wire_from_designation(text, grade)
    except ValueError as error:
        raise FieldError(field, str(error)) from None


def with_self_capacitance(coil, capacitance_f: float, f_hz: float):
    """The coil with a known self-capacitance: its self-resonance 1/(2π√(L·C)) and its Q at
    f_hz with that capacitance across it (engine.coil.coil_q_sweep)."""
    model = replace(coil.loss_model, self_capacitance_f=capacitance_f)
    return replace(coil, loss_model=model, self_capacitance_f=capacitance_f,
                   srf_hz=float(resonant_frequency_hz(coil.inductance_built_h, capacitance_f)),
                   srf_basis="job", q_estimated=float(coil_engine.coil_q_sweep(model, f_hz)))


def design_coil(inductor: ToroidInductor | SolenoidInductor, parts: ResolvedToroid | None,
                inductance_h: float, f_hz: float, voltage_rms_v: float | None,
                temperature_c: float = COPPER_REFERENCE_TEMPERATURE_C
                ) -> ToroidCoil | SolenoidCoil:
    """The designed coil (engine result) for a toroid (its core and material resolved) or a
    solenoid inductor section."""
    wire = resolve_wire(inductor.wire, inductor.enamel_grade, "inductor.wire")
    try:
        if inductor.form == "toroid":
            coil = coil_engine.design_toroid(inductance_h, f_hz, parts.core, parts.material,
                                             wire, inductor.lead_length, voltage_rms_v,
                                             temperature_c)
            if inductor.self_capacitance is None:
                return coil
            return with_self_capacitance(coil, inductor.self_capacitance, f_hz)
        former = coil_engine.SolenoidFormer(inductor.former_diameter, inductor.former_length)
        return coil_engine.design_solenoid(inductance_h, f_hz, former, wire,
                                           pitch_m=inductor.pitch, length_m=inductor.length,
                                           lead_length_m=inductor.lead_length,
                                           temperature_c=temperature_c)
    except FieldError:
        raise
    except ValueError as error:
        raise FieldError("inductor", str(error)) from None


def coil_at_voltage(coil: ToroidCoil | SolenoidCoil, parts: ResolvedToroid | None,
                    voltage_rms_v: float, f_hz: float) -> ToroidCoil | SolenoidCoil:
    """The designed coil carrying its stress at the coil's rms voltage: current, heat and
    temperature rise (and a ring core's flux density)."""
    if isinstance(coil, SolenoidCoil):
        return coil_engine.solenoid_at_voltage(coil, voltage_rms_v, f_hz)
    return coil_engine.toroid_at_voltage(coil, parts.core, parts.material, voltage_rms_v, f_hz)


def coil_loss(inductor: ToroidInductor | SolenoidInductor, coil: ToroidCoil | SolenoidCoil,
              x0: float, f0: float) -> tuple[float, float, str]:
    """A designed coil's series loss resistance at f0, its Q, and whether the job (a
    measured Q) or the estimate gave it (Q = X/r)."""
    if inductor.q is not None:
        return x0 / inductor.q, inductor.q, "job"
    q = float(coil_engine.coil_q_sweep(coil, f0))
    if not q > 0:  # at or above its self-resonance the coil is no longer an inductor
        raise FieldError("inductor", f"the coil's estimated Q at f0 ({f0:.4g} Hz) is 0: f0 is "
                         "at or above its self-resonance; use fewer turns or a lower f0")
    return x0 / q, q, "estimate"


def as_built_coupling(inductor, tank_turns: int, circuit: Circuit) -> Coupling | None:
    """The job's link or tap rounded to whole turns (engine.magnetics.link_turns), and the
    resistance R·(N/M)² it presents to the tank (ideal transformer); None without one."""
    link = getattr(inductor, "link", None)  # a solenoid has no link, only a tap
    kind, coupling = ("link", link) if link is not None else ("tap", inductor.tap)
    if coupling is None:
        return None
    if circuit.topology != "parallel" or circuit.load_resistance_ohm is None:
        raise FieldError(f"inductor.{kind}", f"a {kind} couples a load to a parallel tank: "
                         "it needs topology parallel and a load resistance (given or "
                         "computed from a bandwidth target)")
    aimed = circuit.load_resistance_ohm
    turns = link_turns(tank_turns, aimed, coupling.resistance)
    exact = tank_turns * float(np.sqrt(coupling.resistance / aimed))
    presented = coupling.resistance * (tank_turns / turns) ** 2
    x0 = float(np.sqrt(circuit.inductance_h / circuit.capacitance_f))  # X0 = √(L/C)
    return Coupling(kind, turns, exact, tank_turns, coupling.resistance, aimed, presented, x0)


def coil_tolerance(inductor: ToroidInductor | SolenoidInductor,
                   parts: ResolvedToroid | None) -> float | None:
    """The wound coil's ± tolerance: the job's, else a ring core's AL (or µi) tolerance,
    else AIR_CORE_TOLERANCE for a solenoid."""
    if inductor.tolerance is not None:
        return inductor.tolerance
    if inductor.form == "toroid":
        return (parts.core_spec.al_tolerance if parts.core_spec.al_tolerance is not None
                else parts.material_spec.mu_i_tolerance)
    return AIR_CORE_TOLERANCE


def lead_inductance(inductor: ToroidInductor | SolenoidInductor,
                    coil: ToroidCoil | SolenoidCoil, parts: ResolvedToroid | None,
                    lcr_accuracy: float) -> Leads:
    """Two straight leads of inductor.lead_length in the coil's wire, at high frequency
    (engine.wire.straight_wire_inductance_h, Rosa 1908 / Grover 1946; the leads' mutual
    inductance neglected). Our rule: they are counted in the coil's inductance when their
    share is measurable — above the LCR meter's accuracy and above half the coil's own
    tolerance band (below that they shift nothing a unit's window can show)."""
    leads = 0.0  # the formula holds for l ≫ r; a stub shorter than that adds nothing here
    if inductor.lead_length > coil.wire.diameter_m:
        each = float(straight_wire_inductance_h(inductor.lead_length, coil.wire.diameter_m))
        leads = 2.0 * max(each, 0.0)
    share = leads / coil.inductance_built_h
    threshold = max(lcr_accuracy, 0.5 * (coil_tolerance(inductor, parts) or 0.0))
    return Leads(leads, share, threshold, share > threshold)


def coil_design(job: Job, parts: ResolvedToroid | None, coil: ToroidCoil | SolenoidCoil,
                target_l: float, circuit: Circuit, q_used: float, q_source: str,
                f0: float, as_built: Coupling | None = None,
                leads: Leads | None = None) -> CoilDesign:
    """What the design made of the engine's coil: tolerances, coupling turns, Q curve."""
    inductor = job.inductor
    core_name = material_name = flux_limit = None
    core_size = (None, None, None)
    tolerance = coil_tolerance(inductor, parts)
    tc = inductor.temperature_coefficient
    if inductor.form == "toroid":
        core_name, material_name = parts.core_name, parts.material_name
        flux_limit = parts.material.flux_density_max_t
        core_size = (parts.core.outer_diameter_m, parts.core.inner_diameter_m,
                     parts.core.height_m)
        if tc is None:
            tc = parts.material_spec.mu_tc  # AL ∝ µ, so L follows µ's coefficient
    link_turns_n = link_r = tap_turns_n = tap_r = None
    link = getattr(inductor, "link", None)  # a solenoid has no link, only a tap
    kind, coupling = ("link", link) if link is not None else ("tap", inductor.tap)
    if coupling is not None:
        field = f"inductor.{kind}"
        if circuit.topology != "parallel" or circuit.load_resistance_ohm is None:
            raise FieldError(field, f"a {kind} couples a load to a parallel tank: it "
                              "needs topology parallel and a load resistance (given or "
                              "computed from a bandwidth target)")
        # Ideal transformer: a resistance R at M of N turns looks like R·(N/M)² across the tank.
        turns = link_turns(coil.turns, circuit.load_resistance_ohm, coupling.resistance)
        if kind == "link":
            link_turns_n, link_r = turns, coupling.resistance
        else:
            if turns >= coil.turns:
                raise FieldError(field, f"a tap for {coupling.resistance:.4g} Ω would sit at "
                                  f"or beyond the end of the {coil.turns}-turn winding: a tap "
                                  "matches only a resistance below the tank's load resistance "
                                  f"({circuit.load_resistance_ohm:.4g} Ω)")
            tap_turns_n, tap_r = turns, coupling.resistance
    f0_whole = None
    if job.capacitor.capacitance is None:
        f0_whole = float(resonant_frequency_hz(
            coil.inductance_built_h, capacitance_for_f0(job.circuit.targets.f0_wanted, target_l)))
    high = min(20.0 * f0, 0.98 * coil.srf_hz) if coil.srf_hz else 20.0 * f0
    f_curve = np.geomspace(f0 / 20.0, high, 241)
    link_wire = link_length = None
    if link_turns_n is not None and parts is not None:
        link_wire = resolve_wire(link.wire or inductor.wire, inductor.enamel_grade,
                                 "inductor.link.wire")
        core = parts.core  # the link lies over the tank winding: its second layer
        turn = toroid_turn_length_m(core.outer_diameter_m, core.inner_diameter_m,
                                    core.height_m, link_wire.overall_diameter_m,
                                    core.chamfer_m, layer=2)
        link_length = link_turns_n * turn + 2.0 * inductor.lead_length
    stock = None
    if parts is not None:  # what the storeman picks: size, material, the library's words
        words = [f"ring {ring_size_text(parts.core_spec)}",
                 f"µi {parts.material_spec.mu_i:g}"]
        said = parts.core_spec.description or parts.material_spec.description
        if said and said not in (core_name, material_name):
            words.append(said)
        stock = ", ".join(words)
    elif inductor.form == "solenoid":
        stock = (f"former Ø {inductor.former_diameter * 1e3:.3g} mm"
                 + (f", at least {inductor.former_length * 1e3:.3g} mm long"
                    if inductor.former_length else ""))
    return CoilDesign(inductor.form, coil, core_name, material_name, target_l, f0_whole,
                      link_turns_n, link_r, tap_turns_n, tap_r, flux_limit, tolerance, tc,
                      inductor.lead_length,
                      *core_size,
                      q_used, q_source,
                      CoilCurve(f_curve, np.asarray(coil_engine.coil_q_sweep(coil, f_curve))),
                      as_built, link_wire, link_length,
                      _al_agreement(parts) if inductor.form == "toroid" else None, stock, leads)


def _al_agreement(parts: ResolvedToroid):
    """A stated AL against µ0·µi·Ae/le of the ring (None when the AL is computed)."""
    if parts.core.al_h_per_turn2 is None:
        return None
    from sheetgen.engine.magnetics import al_agreement, toroid_effective_parameters
    core, mu_tolerance = parts.core, parts.material_spec.mu_i_tolerance or 0.0
    al_tolerance = parts.core_spec.al_tolerance
    effective = toroid_effective_parameters(core.outer_diameter_m, core.inner_diameter_m,
                                            core.height_m, core.chamfer_m)
    return al_agreement(core.al_h_per_turn2, mu_tolerance if al_tolerance is None
                        else al_tolerance, parts.material.mu_i, mu_tolerance,
                        effective.le_m, effective.ae_m2)
