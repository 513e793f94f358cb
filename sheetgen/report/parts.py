"""Rows the sheet shows beyond tables.py: the parts list and the headline.

Formatted with the same helpers as tables.py (tables.q, quantities.format_number), so a
value reads the same on the sheet, in the terminal summary and in the tests. Nothing here
computes physics.
"""

from __future__ import annotations

from dataclasses import dataclass

from sheetgen.design.records import Design
from sheetgen.engine.variation import dielectric
from sheetgen.quantities import format_number
from sheetgen.report.formatting import (
    condition_text,
    plural,
    quantity_text,
    range_text,
    signed,
    tolerance_text,
)

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
    named by design.designators, with the ratings, dielectric and tolerances the job gives."""
    c = design.circuit
    names = design.designators
    derived = {d.field: d.reason for d in design.derived}
    coil = design.coil
    rows = [_coil_row(design)]
    rows += _capacitor_rows(design)
    if names.link is not None and coil is not None:
        link = design.job.inductor.link
        wire = link.wire if link is not None and link.wire else coil.result.wire.name
        rows.append(PartRow(names.link, "Link winding", plural(coil.link_turns, "turn"),
                            material=f"insulated {wire} wire, over {names.coil} on its core",
                            notes=f"over the start (cold, earthy) end of {names.coil}; its ends "
                                  f"go to {names.load_resistor}"))
    rows += _bleeder_rows(design)
    if names.source_resistor is not None:
        rows.append(PartRow(names.source_resistor, "Resistance of the source",
                            quantity_text(c.source_resistance_ohm, "Ω"), quantity=NO_DATA,
                            notes="not fitted: the driving stage's own resistance; the bench "
                                  "test makes it up (procedure step 5)"))
    origin = (f"computed: {derived['load.resistance']}" if "load.resistance" in derived
              else "as given")
    load = design.job.load
    load_tolerance = _tolerance(load.tolerance if load is not None else None)
    if names.load_resistor is not None and names.link is not None and coil is not None:
        rows.append(PartRow(names.load_resistor, "Load resistance",
                            quantity_text(coil.link_resistance_ohm, "Ω"), load_tolerance, quantity=NO_DATA,
                            notes=f"across {names.link}; presents {quantity_text(c.load_resistance_ohm, 'Ω')}"
                                  f" across the tank ({origin}); not fitted: the bench test "
                                  "makes it up (procedure step 5)"))
    elif names.load_resistor is not None and coil is not None and coil.tap_turns is not None:
        rows.append(PartRow(names.load_resistor, "Load resistance",
                            quantity_text(coil.tap_resistance_ohm, "Ω"), load_tolerance, quantity=NO_DATA,
                            notes=f"from the tap at turn {coil.tap_turns} of {names.coil} to its "
                                  f"cold end; presents {quantity_text(c.load_resistance_ohm, 'Ω')} across "
                                  f"the tank ({origin}); not fitted: the bench test makes it "
                                  "up (procedure step 5)"))
    elif names.load_resistor is not None:
        rows.append(PartRow(names.load_resistor, "Load resistance",
                            quantity_text(c.load_resistance_ohm, "Ω"), load_tolerance, quantity=NO_DATA,
                            notes=f"{origin}; not fitted: the stage the circuit feeds; the "
                                  "bench test makes it up (procedure step 5)"))
    return rows


def _bleeder_rows(design: Design) -> list[PartRow]:
    """The bleeder across the capacitor: its value, the power and voltage it must take (at
    the tank's RF peak, the load-open case included) and the rating the job gives, or the
    least rating to buy."""
    duty, name = design.bleeder, design.designators.bleeder
    if duty is None or name is None:
        return []
    cap = design.job.capacitor
    given = []
    if cap.bleeder_rated_power is not None:
        given.append(quantity_text(cap.bleeder_rated_power, "W", 3))
    if cap.bleeder_rated_voltage is not None:
        given.append(quantity_text(cap.bleeder_rated_voltage, "V", 3) + " peak")
    buy = (f"buy at least {quantity_text(duty.power_rating_min_w, 'W', 3)} and "
           f"{quantity_text(duty.voltage_rating_min_v, 'V', 3)} peak working voltage")
    across = ", ".join(design.designators.capacitors)
    return [PartRow(name, "Bleeder resistor", quantity_text(duty.resistance_ohm, "Ω"),
                    rating="; ".join(given) or buy,
                    notes=f"across {across}; dissipates {quantity_text(duty.power_w, 'W', 3)} "
                          f"at {_bleeder_case(design)}{'' if not given else '; ' + buy}")]


def _bleeder_case(design: Design) -> str:
    """The voltage the bleeder's duty is for: the worst-case RF peak and any DC across it."""
    duty, dc, worst = design.bleeder, design.dc, design.worst
    case = (f" {condition_text(worst.condition)}" if worst is not None
            and worst.condition != "as driven" else "")
    if dc is not None and dc.across_capacitor_v:
        rf = duty.voltage_peak_v - dc.across_capacitor_v
        return (f"the {quantity_text(rf, 'V', 3)} RF peak{case} on "
                f"{quantity_text(dc.across_capacitor_v, 'V', 3)} DC (V̂²/2R + V²/R)")
    return f"the {quantity_text(duty.voltage_peak_v, 'V', 3)} RF peak{case} (V̂²/2R)"


def _tolerance(fraction: float | None, source: str | None = None) -> str:
    """± x % (and where it came from), or NO_DATA when there is none."""
    if not fraction:
        return NO_DATA
    shown = tolerance_text(fraction)
    return f"{shown} ({source.removeprefix('the ')})" if source else shown


def _coil_row(design: Design) -> PartRow:
    c, r = design.circuit, design.resonance
    coil = design.coil
    name = design.designators.coil
    tolerance = _tolerance(design.assessment.inductance_tolerance)
    if coil is None:
        said = design.job.inductor.description
        return PartRow(name, "Coil", quantity_text(c.inductance_h, "H"), tolerance=tolerance,
                       notes=(f"{said}; " if said else "bought coil of this inductance; ")
                       + f"coil Q {format_number(r.q_inductor, 4)} at f0 "
                         f"(loss {quantity_text(c.inductor_resistance_ohm, 'Ω')} in series)")
    built = coil.result
    wire = (f"{built.wire.name} ({quantity_text(built.wire.diameter_m, 'm', 3)} copper), grade "
            f"{built.wire.grade} enamel")
    if coil.form == "toroid":
        material = f"{coil.material_name} core ({coil.stock}); {wire}"
        rating = (f"core flux {quantity_text(coil.flux_density_max_t, 'T', 3)} peak"
                  if coil.flux_density_max_t else NO_DATA)
        where = f" on {coil.core_name}"
    else:
        material, rating, where = (f"air core ({coil.stock}); {wire}", NO_DATA,
                                   " on its former (air core)")
    return PartRow(name, f"Coil, {coil.form}", quantity_text(built.inductance_built_h, "H"),
                   tolerance=tolerance, rating=rating, material=material,
                   notes=f"{plural(built.turns, 'turn')}{where}; coil Q "
                         f"{format_number(coil.q_used, 4)} at f0 "
                         f"({'estimated' if coil.q_source == 'estimate' else 'from the job'}); "
                         "wind it as the winding section shows")


def _fixed_capacitor_rating(design: Design) -> str:
    """What the job rates each fixed part for: peak voltage, RMS current, power in its ESR."""
    cap = design.job.capacitor
    ratings = []
    if cap.rated_voltage is not None:
        ratings.append(quantity_text(cap.rated_voltage, "V", 3) + " peak")
    if cap.rated_current is not None:
        ratings.append(quantity_text(cap.rated_current, "A", 3) + " rms")
    if cap.rated_power is not None:
        ratings.append(quantity_text(cap.rated_power, "W", 3) + " in its ESR")
    return "; ".join(ratings) or NO_DATA


def _dielectric(design: Design) -> str:
    """The job's dielectric with its class (EIA-198 / IEC 60384-8, -9), or its temperature
    coefficient."""
    cap = design.job.capacitor
    if cap.dielectric is not None:
        return f"{cap.dielectric} (class {dielectric(cap.dielectric).dielectric_class})"
    if cap.temperature_coefficient is not None:
        return f"class 1, {signed(cap.temperature_coefficient * 1e6, 0)} ppm/K"
    return NO_DATA


def _capacitor_rows(design: Design) -> list[PartRow]:
    choice = design.capacitor_choice
    names = design.designators
    pair = choice.pair
    a = design.assessment
    fixed_part = dict(tolerance=_tolerance(a.capacitor_tolerance, a.capacitor_tolerance_source),
                      rating=_fixed_capacitor_rating(design), material=_dielectric(design))
    fixed = names.fixed_capacitors
    said = design.job.capacitor.description
    if said:
        fixed_part["part"] = f"Capacitor, {said}"
    if not choice.from_standard_parts:
        rows = [PartRow(fixed[0], fixed_part.pop("part", "Capacitor"),
                        quantity_text(choice.fixed_f, "F"), **fixed_part,
                        notes="as the job gives it")]
    elif pair.second is None:
        rows = [PartRow(fixed[0], fixed_part.pop("part", "Capacitor"),
                        quantity_text(pair.first, "F", 3), **fixed_part,
                        notes=f"{choice.series} value; {quantity_text(choice.required_f, 'F')} required")]
    else:
        part = fixed_part.pop("part", "Capacitor")
        rows = [PartRow(fixed[0], part, quantity_text(pair.first, "F", 3), **fixed_part,
                        notes=f"{choice.series}; with {fixed[1]} in parallel "
                              f"{quantity_text(pair.total, 'F')}, {quantity_text(choice.required_f, 'F')} required"),
                PartRow(fixed[1], part, quantity_text(pair.second, "F", 3), **fixed_part,
                        notes=f"{choice.series}; in parallel with {fixed[0]}")]
    trimmer = design.job.capacitor.trimmer
    if names.trimmer is not None and trimmer is not None:
        state = "" if choice.trimmer_in_range else "; OUT OF RANGE: choose another trimmer"
        rows.append(PartRow(names.trimmer, "Trimmer capacitor"
                            + (f", {trimmer.description}" if trimmer.description else ""),
                            range_text(trimmer.minimum, trimmer.maximum, 'F', 3),
                            rating=(quantity_text(trimmer.rated_voltage, "V", 3) + " peak"
                                    if trimmer.rated_voltage is not None else NO_DATA),
                            notes=f"in parallel; set to about {quantity_text(choice.trimmer_setting_f, 'F')}"
                                  f"{state}"))
    return rows


def headline(design: Design) -> str:
    """One line under the title: topology, f0, bandwidth and loaded Q."""
    r = design.resonance
    parts = [f"{design.circuit.topology.capitalize()} tuned circuit",
             f"f0 {quantity_text(r.f0_hz, 'Hz')}"]
    if r.bandwidth_hz is not None:
        parts.append(f"bandwidth (−3 dB) {quantity_text(r.bandwidth_hz, 'Hz')}")
    if r.q_loaded is not None:
        parts.append(f"loaded Q {format_number(r.q_loaded, 4)}")
    return " · ".join(parts)


def library_notices(design: Design) -> list[str]:
    """A NOTICE for each library entry the design used from a local library that reuses a
    shipped entry's name with other data: which file it came from, which it shadows."""
    return [f"NOTICE: {entry.kind}.{entry.name} taken from {entry.origin}; the shipped "
            f"library's {entry.name!r} ({entry.shadows}) has other data and was not used"
            for entry in design.library_entries if entry.shadows]
