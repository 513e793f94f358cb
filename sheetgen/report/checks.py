"""The design's pass/fail checks, worded: a failed one makes `sheetgen` exit with code 1.

Each failure says which part, by how much, and what to change, from the Design's numbers.
"""

from __future__ import annotations

from dataclasses import dataclass

from sheetgen.design.records import Design
from sheetgen.quantities import format_quantity
from sheetgen.report.advice import rating_advice


@dataclass(frozen=True)
class CheckFailure:
    """One failed check: a short code of our own, the job field to change, the sentence."""

    code: str
    field: str
    text: str


def failed_checks(design: Design) -> list[CheckFailure]:
    """Every check the design fails (empty when all pass); accepted ratings do not fail."""
    failures = _coil_failures(design)
    for check in design.assessment.ratings:
        if check.status == "fail":
            failures.append(CheckFailure("rating", _rating_field(design, check), rating_advice(check)))
    trim = design.assessment.trimmer
    if trim is not None and not trim.covers and design.capacitor_choice.trimmer_in_range:
        share = "all" if trim.coverage is None else f"{trim.coverage * 100:.2f} %"
        failures.append(CheckFailure(
            "trimmer-coverage", "capacitor.trimmer",
            f"to tune {share} of builds to f0 the trimmer must span "
            f"{format_quantity(trim.needed_min_f, 'F', 3)} to "
            f"{format_quantity(trim.needed_max_f, 'F', 3)}, but it spans "
            f"{format_quantity(trim.trimmer_min_f, 'F', 3)} to "
            f"{format_quantity(trim.trimmer_max_f, 'F', 3)} (it tunes "
            f"{trim.fraction_tunable * 100:.1f} % of builds); choose a wider trimmer or a "
            "closer-tolerance capacitor and coil"))
    a = design.assessment
    if a.must_trim and not a.tuned:
        failures.append(CheckFailure(
            "untrimmed-spread", "capacitor.trimmer",
            f"as assembled, f0 spreads over {format_quantity(a.untrimmed_f0_min_hz, 'Hz', 4)} "
            f"to {format_quantity(a.untrimmed_f0_max_hz, 'Hz', 4)}, wider than the "
            f"{format_quantity(a.limits.bandwidth_min_hz, 'Hz', 3)} bandwidth, and there is no "
            f"trimmer: add a trimmer of at least {format_quantity(a.trim_range_needed_f, 'F', 3)}"
            " range (capacitor.trimmer), or choose closer-tolerance parts"))
    choice = design.capacitor_choice
    if choice.trimmer_in_range is False:
        trimmer = design.job.capacitor.trimmer
        needed = choice.required_f - choice.fixed_f
        failures.append(CheckFailure(
            "trimmer-range", "capacitor.trimmer",
            f"the trimmer must supply {format_quantity(needed, 'F', 3)} but its range is "
            f"{format_quantity(trimmer.minimum, 'F', 3)} to "
            f"{format_quantity(trimmer.maximum, 'F', 3)}; choose a trimmer whose range "
            "includes it"))
    return failures


def _rating_field(design: Design, check) -> str:
    """The job field to change for a failed rating check."""
    if check.quantity in ("flux density", "current density"):
        return "inductor"
    return "capacitor.trimmer" if check.part == design.designators.trimmer else "capacitor"


def _coil_failures(design: Design) -> list[CheckFailure]:
    coil = design.coil
    if coil is None:
        return []
    r = coil.result
    failures = _coupling_failures(coil)
    if not r.fits and coil.form == "toroid":
        remedy = {
            "thinner_wire": f"use {r.remedy_wire.name} wire, which fits in one layer"
            if r.remedy_wire else "use a thinner wire",
            "two_layers": "wind two layers (Q and self-capacitance suffer), or use a larger core",
            "larger_core": "use a core with an inner diameter of at least "
                           f"{format_quantity(r.remedy_inner_diameter_m, 'm', 3)}",
        }[r.remedy]
        failures.append(CheckFailure(
            "winding-fit", "inductor.wire",
            f"{r.turns} turns of {r.wire.name} need {r.close_wound_angle_deg:.0f}° of the "
            f"core's inner circumference, more than one layer allows; {remedy}"))
    if not r.fits and coil.form == "solenoid":
        failures.append(CheckFailure(
            "winding-fit", "inductor.pitch",
            f"{r.turns} turns of {r.wire.name} at a pitch of {format_quantity(r.pitch_m, 'm', 3)} "
            f"over {format_quantity(r.length_m, 'm', 3)} do not fit: the pitch must be at least "
            f"the wire's overall diameter {format_quantity(r.wire.overall_diameter_m, 'm', 3)} "
            "and the length within the former's; use a thinner wire or a longer former"))
    return failures


def _coupling_failures(coil) -> list[CheckFailure]:
    """A link or tap that cannot present the tank's load: too many turns, or so few ohms
    that the tank's Q falls below 1."""
    c = coil.coupling
    if c is None:
        return []
    field = f"inductor.{c.kind}"
    failures = []
    if c.too_many_turns:
        failures.append(CheckFailure(
            "coupling-turns", field,
            f"the {c.kind} needs {c.turns_exact:.3g} turns to present "
            f"{format_quantity(c.aimed_ohm, 'Ω', 4)} from {format_quantity(c.resistance_ohm, 'Ω', 4)}, "
            f"more than the {c.tank_turns}-turn tank winding: it would step the load up; connect "
            f"the load across the tank, or make the load resistance at most "
            f"{format_quantity(c.aimed_ohm, 'Ω', 3)}"))
    if c.swamps_tank:
        failures.append(CheckFailure(
            "coupling-load", field,
            f"the {c.kind} at {c.turns} of {c.tank_turns} turns presents "
            f"{format_quantity(c.presented_ohm, 'Ω', 3)} to the tank, below its reactance "
            f"{format_quantity(c.reactance_ohm, 'Ω', 3)} (loaded Q under 1); the "
            f"{c.kind} needs a resistance of at least {format_quantity(c.resistance_min_ohm, 'Ω', 3)} "
            "at these turns, or the tank a higher load resistance"))
    return failures
