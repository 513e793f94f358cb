"""Rows the sheet shows beyond tables.py: the parts list and the values tables.py leaves out.

Formatted with the same helpers as tables.py (tables.q, quantities.format_number), so a
value reads the same on the sheet, in the terminal summary and in the tests. Nothing here
computes physics.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..design import Design
from ..quantities import format_number
from ..tables import Row, q

NO_DATA = "—"


@dataclass(frozen=True)
class PartRow:
    """One line of the parts list; NO_DATA where the job gives nothing."""

    designator: str
    part: str
    value: str
    tolerance: str = NO_DATA
    rating: str = NO_DATA
    material: str = NO_DATA
    quantity: str = "1"
    notes: str = ""


PART_COLUMNS = ("Ref.", "Part", "Value", "Tolerance", "Rating", "Dielectric or material",
                "Qty", "Notes")


def part_rows(design: Design) -> list[PartRow]:
    """The coil (and a link), the capacitor(s) as fitted, the source and load resistances,
    named by design.designators."""
    c = design.circuit
    names = design.designators
    derived = {d.field: d.reason for d in design.derived}
    coil = design.coil
    rows = [_coil_row(design)]
    rows += _capacitor_rows(design)
    if names.link is not None and coil is not None:
        rows.append(PartRow(names.link, "Link winding", f"{coil.link_turns} turn"
                            + ("s" if coil.link_turns != 1 else ""),
                            material=f"on {names.coil}'s core",
                            notes=f"insulated wire over the cold (earthy) end of {names.coil}; "
                                  f"its ends go to {names.load_resistor}"))
    if names.source_resistor is not None:
        rows.append(PartRow(names.source_resistor, "Resistance of the source",
                            q(c.source_resistance_ohm, "Ω"), quantity=NO_DATA,
                            notes="not fitted: the driving stage's own resistance; the bench "
                                  "test makes it up (procedure step 5)"))
    origin = (f"computed: {derived['load.resistance']}" if "load.resistance" in derived
              else "as given")
    if names.load_resistor is not None and names.link is not None and coil is not None:
        rows.append(PartRow(names.load_resistor, "Load resistance",
                            q(coil.link_resistance_ohm, "Ω"), quantity=NO_DATA,
                            notes=f"across {names.link}; presents {q(c.load_resistance_ohm, 'Ω')}"
                                  f" across the tank ({origin}); fit this value for the bench "
                                  "test"))
    elif names.load_resistor is not None:
        rows.append(PartRow(names.load_resistor, "Load resistance",
                            q(c.load_resistance_ohm, "Ω"), quantity=NO_DATA,
                            notes=f"{origin}; the stage the circuit feeds: fit this value for "
                                  "the bench test"))
    return rows


def _coil_row(design: Design) -> PartRow:
    c, r = design.circuit, design.resonance
    coil = design.coil
    name = design.designators.coil
    tolerance = design.assessment.inductance_tolerance
    shown_tolerance = f"±{format_number(tolerance * 100, 3)} %" if tolerance else NO_DATA
    if coil is None:
        return PartRow(name, "Coil", q(c.inductance_h, "H"), tolerance=shown_tolerance,
                       notes=f"coil Q {format_number(r.q_inductor, 4)} at f0 "
                             f"(loss {q(c.inductor_resistance_ohm, 'Ω')} in series)")
    built = coil.result
    where = f" on {coil.core_name}" if coil.core_name else " on its former (air core)"
    return PartRow(name, f"Coil, {coil.form}", q(built.inductance_built_h, "H"),
                   tolerance=shown_tolerance,
                   material=coil.material_name or ("air core" if coil.form == "solenoid"
                                                   else NO_DATA),
                   notes=f"{built.turns} turns of {built.wire.name} "
                         f"({q(built.wire.diameter_m, 'm', 3)} copper){where}; coil Q "
                         f"{format_number(coil.q_used, 4)} at f0 "
                         f"({'estimated' if coil.q_source == 'estimate' else 'from the job'})")


def _capacitor_rows(design: Design) -> list[PartRow]:
    choice = design.capacitor_choice
    names = design.designators
    pair = choice.pair
    tolerance = design.assessment.capacitor_tolerance
    shown_tolerance = f"±{format_number(tolerance * 100, 3)} %" if tolerance else NO_DATA
    fixed = names.fixed_capacitors
    if not choice.from_standard_parts:
        rows = [PartRow(fixed[0], "Capacitor", q(choice.fixed_f, "F"), shown_tolerance,
                        notes="as the job gives it")]
    elif pair.second is None:
        rows = [PartRow(fixed[0], "Capacitor", q(pair.first, "F", 3), shown_tolerance,
                        notes=f"{choice.series} value; {q(choice.required_f, 'F')} required")]
    else:
        rows = [PartRow(fixed[0], "Capacitor", q(pair.first, "F", 3), shown_tolerance,
                        notes=f"{choice.series}; with {fixed[1]} in parallel "
                              f"{q(pair.total, 'F')}, {q(choice.required_f, 'F')} required"),
                PartRow(fixed[1], "Capacitor", q(pair.second, "F", 3), shown_tolerance,
                        notes=f"{choice.series}; in parallel with {fixed[0]}")]
    trimmer = design.job.capacitor.trimmer
    if names.trimmer is not None and trimmer is not None:
        state = "" if choice.trimmer_in_range else "; OUT OF RANGE: choose another trimmer"
        rows.append(PartRow(names.trimmer, "Trimmer capacitor",
                            f"{q(trimmer.minimum, 'F', 3)} to {q(trimmer.maximum, 'F', 3)}",
                            notes=f"in parallel; set to about {q(choice.trimmer_setting_f, 'F')}"
                                  f"{state}"))
    return rows


def extra_coil_rows(design: Design) -> list[Row]:
    """Coil values of the results that tables.coil_rows does not show: the core's effective
    parameters (IEC 60205), areas and volumes in mm² and mm³ (µ would scale the metre)."""
    coil = design.coil
    effective = getattr(coil.result, "effective", None) if coil is not None else None
    if effective is None:
        return []
    return [Row("Effective magnetic path length le", q(effective.le_m, "m"), "IEC 60205"),
            Row("Effective area Ae", format_number(effective.ae_m2 * 1e6, 4) + " mm²",
                "IEC 60205"),
            Row("Effective volume Ve", format_number(effective.ve_m3 * 1e9, 4) + " mm³",
                "IEC 60205")]


def extra_stress_rows(design: Design) -> list[Row]:
    """Stress values of the results that tables.stress_rows does not show."""
    return [Row("Load voltage", q(design.stress.load_voltage_rms_v, "V") + " rms")]


def headline(design: Design) -> str:
    """One line under the title: topology, f0, bandwidth and loaded Q."""
    r = design.resonance
    parts = [f"{design.circuit.topology.capitalize()} tuned circuit",
             f"f0 {q(r.f0_hz, 'Hz')}"]
    if r.bandwidth_hz is not None:
        parts.append(f"bandwidth (−3 dB) {q(r.bandwidth_hz, 'Hz')}")
    if r.q_loaded is not None:
        parts.append(f"loaded Q {format_number(r.q_loaded, 4)}")
    return " · ".join(parts)
