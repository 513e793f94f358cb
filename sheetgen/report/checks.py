"""The design's pass/fail checks, worded: a failed one makes `sheetgen` exit with code 1.

Each failure says which part, by how much, and what to change, from the Design's numbers.
"""

from __future__ import annotations

from dataclasses import dataclass

from sheetgen.design import plausibility as bounds
from sheetgen.design.plausibility import Finding
from sheetgen.design.records import Design
from sheetgen.quantities import format_number, format_quantity
from sheetgen.report.advice import rating_advice


@dataclass(frozen=True)
class CheckFailure:
    """One failed check: a short code of our own, the job field to change, the sentence."""

    code: str
    field: str
    text: str


def failed_checks(design: Design) -> list[CheckFailure]:
    """Every check the design fails (empty when all pass); accepted ratings do not fail."""
    failures = [CheckFailure("implausible", f.field, plausibility_text(design, f))
                for f in design.plausibility]
    failures += _coil_failures(design)
    for check in design.assessment.ratings:
        if check.status == "fail" and check.rating is None:
            failures.append(CheckFailure("rating-not-given", _unrated_field(design, check),
                                         _unrated_text(design, check)))
        elif check.status == "fail":
            failures.append(CheckFailure("rating", _rating_field(design, check), rating_advice(check)))
    trim = design.assessment.trimmer
    if trim is not None and not trim.covers and design.capacitor_choice.trimmer_in_range:
        failures.append(CheckFailure("trimmer-coverage", "capacitor.trimmer",
                                     _trimmer_coverage_text(trim)))
    a = design.assessment
    if a.must_trim and not a.tuned:
        failures.append(CheckFailure(
            "untrimmed-spread", "capacitor.trimmer",
            f"as assembled, f0 spreads over {format_quantity(a.untrimmed_f0_min_hz, 'Hz', 4)} "
            f"to {format_quantity(a.untrimmed_f0_max_hz, 'Hz', 4)}, wider than the "
            f"{format_quantity(a.limits.bandwidth_min_hz, 'Hz', 3)} bandwidth, and there is no "
            f"trimmer: add a trimmer of at least {format_quantity(a.trim_range_needed_f, 'F', 3)}"
            " range (capacitor.trimmer), or choose closer-tolerance parts"))
    offset = design.target_offset
    if offset is not None and offset.misses:
        failures.append(CheckFailure("target-offset", "capacitor", _offset_text(design)))
    choice = design.capacitor_choice
    band = design.assessment.band
    if band is not None and not band.covers:
        failures.append(CheckFailure("band-coverage", "capacitor.trimmer", _band_text(band)))
    if choice.trimmer_in_range is False:
        trimmer = design.job.capacitor.trimmer
        needed = choice.required_f - choice.fixed_f
        span = (f"{format_quantity(trimmer.minimum, 'F', 3)} to "
                f"{format_quantity(trimmer.maximum, 'F', 3)}")
        text = (f"the trimmer must supply {format_quantity(needed, 'F', 3)} but its range is "
                f"{span}; choose a trimmer whose range includes it" if needed > 0 else
                f"the fixed part(s) alone already exceed the capacitance for f0 by "
                f"{format_quantity(-needed, 'F', 3)}, which no trimmer ({span}) can take "
                "away; choose a smaller fixed part, or check the f0 target and the inductance")
        failures.append(CheckFailure("trimmer-range", "capacitor.trimmer", text))
    return failures


def _offset_text(design: Design) -> str:
    """The built f0 misses its target: by how much, and the changes that would meet it."""
    o = design.target_offset
    low, high = o.window_hz
    how = (f"{format_number(abs(o.bandwidths), 3)} bandwidths "
           if o.bandwidths is not None else "")
    text = (f"the parts as chosen resonate at {format_quantity(o.built_hz, 'Hz', 4)}, "
            f"{how}{'below' if o.offset_hz < 0 else 'above'} the "
            f"{format_quantity(o.target_hz, 'Hz', 4)} target (f0 window "
            f"{format_quantity(low, 'Hz', 4)} to {format_quantity(high, 'Hz', 4)})")
    fixes = [_remedy_text(design, r) for r in o.remedies]
    if fixes:
        text += "; to meet it: " + "; or ".join(fixes)
    return text


def _remedy_text(design: Design, remedy) -> str:
    f0 = format_quantity(remedy.f0_hz, "Hz", 4)
    parts = " + ".join(format_quantity(v, "F", 3) for v in remedy.parts_f)
    if remedy.kind == "pair":
        return f"fit {parts} ({remedy.series}) in parallel, f0 {f0}"
    if remedy.kind == "series":
        return (f"fit {parts} from {remedy.series} (capacitor.preferred_series: "
                f"{remedy.series}), f0 {f0}")
    if remedy.kind == "turns":
        return f"wind {remedy.turns} turns instead of {design.coil.result.turns}, f0 {f0}"
    c = remedy.capacitance_f
    if c >= 0:
        return (f"add a trimmer across C that supplies about {format_quantity(c, 'F', 3)} "
                "at mid-range (capacitor.trimmer)")
    return (f"fit a fixed part about {format_quantity(-c, 'F', 3)} smaller with a trimmer "
            "that makes up the rest (capacitor.trimmer)")


def _trimmer_coverage_text(trim) -> str:
    """Why the trimmer does not tune every build, never as a negative capacitance."""
    share = "all" if trim.coverage is None else f"{trim.coverage * 100:.2f} %"
    spans = (f"the trimmer spans {format_quantity(trim.trimmer_min_f, 'F', 3)} to "
             f"{format_quantity(trim.trimmer_max_f, 'F', 3)} (it tunes "
             f"{trim.fraction_tunable * 100:.1f} % of builds)")
    if trim.needed_min_f < 0:
        over = float((trim.needed_f < 0).mean()) * 100
        smaller = trim.trimmer_min_f - trim.needed_min_f
        span = trim.needed_max_f - trim.needed_min_f
        return (f"to tune {share} of builds to f0: in {over:.1f} % of builds the fixed "
                "capacitors alone already exceed the capacitance for f0, by up to "
                f"{format_quantity(-trim.needed_min_f, 'F', 3)}, which no trimmer can take "
                f"away; {spans}; choose a smaller fixed part (about "
                f"{format_quantity(smaller, 'F', 3)} less) with a trimmer spanning at least "
                f"{format_quantity(span, 'F', 3)}, or closer-tolerance parts")
    return (f"to tune {share} of builds to f0 the trimmer must span "
            f"{format_quantity(trim.needed_min_f, 'F', 3)} to "
            f"{format_quantity(trim.needed_max_f, 'F', 3)}, but {spans}; choose a wider "
            "trimmer or a closer-tolerance capacitor and coil")


def _band_text(band) -> str:
    """Which edge of the band the variable capacitor misses, and what would reach it."""
    low, high = band.low_edge, band.high_edge
    needed_span = low.needed_max_f - high.needed_min_f
    have = f"{format_quantity(low.trimmer_min_f, 'F', 3)} to {format_quantity(low.trimmer_max_f, 'F', 3)}"
    missed = []
    if not low.covers:
        missed.append(f"at {format_quantity(band.low_hz, 'Hz', 4)} builds need up to "
                      f"{format_quantity(low.needed_max_f, 'F', 3)}")
    if not high.covers:
        missed.append(f"at {format_quantity(band.high_hz, 'Hz', 4)} builds need as little as "
                      f"{format_quantity(high.needed_min_f, 'F', 3)}")
    remedy = (f"use a variable capacitor spanning at least {format_quantity(needed_span, 'F', 3)}"
              if needed_span > 0 else "no variable capacitor can reach both edges")
    return (f"the variable capacitor ({have}) does not tune every build across the band: "
            f"{'; '.join(missed)}; {remedy} (the fixed padder is re-chosen to centre it), or "
            "closer-tolerance parts, or a narrower band")


def _unrated_field(design: Design, check) -> str:
    if check.part == design.designators.trimmer:
        return "capacitor.trimmer.rated_voltage"
    return "capacitor.rated_voltage" if check.quantity == "peak voltage" else "capacitor.rated_power"


def _unrated_text(design: Design, check) -> str:
    """A stress above extra-low voltage on a part whose rating the job does not give."""
    from sheetgen.engine.ratings import EXTRA_LOW_VOLTAGE_PEAK_V
    elv = (f"{format_quantity(check.peak_voltage_v, 'V', 3)} peak is on it, above the "
           f"{format_quantity(EXTRA_LOW_VOLTAGE_PEAK_V, 'V', 3)} peak extra-low-voltage "
           "limit of IEC 61140")
    field = _unrated_field(design, check)
    if check.quantity == "peak voltage":
        derating = design.job.ratings.voltage_derating
        need = format_quantity(check.actual / derating, "V", 3)
        return (f"{check.part}: no voltage rating is given and {elv}; give {field} (at least "
                f"{need} at the {derating * 100:g} % derating)")
    return (f"{check.part}: no power rating is given for the "
            f"{format_quantity(check.actual, 'W', 3)} in its ESR and {elv}; give {field}")


def _rating_field(design: Design, check) -> str:
    """The job field to change for a failed rating check."""
    if check.quantity in ("flux density", "surface temperature") and check.part == design.designators.coil:
        return "inductor"
    return "capacitor.trimmer" if check.part == design.designators.trimmer else "capacitor"


def _coil_failures(design: Design) -> list[CheckFailure]:
    coil = design.coil
    if coil is None:
        return []
    r = coil.result
    failures = _coupling_failures(coil)
    if coil.al_agreement is not None and not coil.al_agreement.agrees:
        failures.append(CheckFailure("al-mismatch", _al_field(design),
                                     al_mismatch_text(design)))
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


def _al_field(design: Design) -> str:
    named = isinstance(design.job.inductor.core, str)
    return "inductor.core" if named else "inductor.core.al"


def al_mismatch_text(design: Design) -> str:
    """A stated AL that µi and the ring's size cannot give: the turns are counted from the
    AL, so an AL off by a factor misses the inductance by that factor and f0 by its root."""
    from sheetgen.engine.magnetics import AL_GEOMETRY_ALLOWANCE
    coil = design.coil
    a = coil.al_agreement
    size = " × ".join(f"{d * 1e3:.4g}" for d in (
        coil.core_outer_diameter_m, coil.core_inner_diameter_m, coil.core_height_m))
    core = coil.core_name if coil.core_name != "inline core" else "the core"
    named = "" if coil.material_name == "inline material" else f"{coil.material_name}, "
    mu = format_number(a.mu_i, 3)
    return (f"{core} states AL {format_quantity(a.al_stated_h_per_turn2, 'H/turn²', 3)} "
            f"± {a.al_tolerance * 100:g} %, but its material ({named}µi {mu} "
            f"± {a.mu_tolerance * 100:g} %) on a {size} mm ring gives AL = µ0·µi·Ae/le = "
            f"{format_quantity(a.al_geometry_h_per_turn2, 'H/turn²', 3)} (IEC 60205); the "
            f"stated AL stands for µ ≈ {format_number(a.mu_implied, 3)}, beyond both "
            f"tolerances and {AL_GEOMETRY_ALLOWANCE * 100:g} % for the core's size, so turns "
            "counted from it would miss the inductance by that ratio; check the AL's unit "
            "(nH/turn², µH/100 turns, mH/1000 turns) and the core's material, or leave al "
            "out to wind from the AL of the geometry")


def _q(finding: Finding) -> str:
    return (format_quantity(finding.value, finding.unit, 3) if finding.unit
            else format_number(finding.value, 3))


def _span(low: float, high: float, unit: str) -> str:
    return f"{format_quantity(low, unit, 3)} to {format_quantity(high, unit, 3)}"


def plausibility_text(design: Design, finding: Finding) -> str:
    """The sentence for a value beyond what a tuned circuit can be built with, with its remedy."""
    value = _q(finding)
    bound = (format_quantity(finding.bound, finding.unit, 3) if finding.unit
             else format_number(finding.bound, 3))
    kind = finding.quantity
    if kind == "f0":
        where = ("the highest frequency a lumped LC tank is built for; above it resonators "
                 "are lines or cavities" if finding.side == "above" else
                 "the lowest frequency a tuned LC circuit is built for; below it the parts "
                 "are henries and hundreds of microfarads")
        return (f"f0 {value} is {finding.side} {bound}, {where} (common practice); choose an "
                f"f0 within {_span(bounds.F0_MIN_HZ, bounds.F0_MAX_HZ, 'Hz')} — check the "
                "unit prefix")
    if kind == "inductance":
        what = ("the inductance computed for f0 from the capacitance" if finding.derived
                else "the inductance")
        why = ("the leads alone have about 1 nH per millimetre (common practice, from memory)"
               if finding.side == "below" else
               "beyond any tuning inductor; such a coil is an iron-cored choke (common practice)")
        fix = ("choose a capacitance that gives" if finding.derived else "give")
        return (f"{what}, {value}, is {finding.side} {bound}: {why}; {fix} an inductance within "
                f"{_span(bounds.INDUCTANCE_MIN_H, bounds.INDUCTANCE_MAX_H, 'H')} — check the "
                "unit prefix (a bare number is in henries)")
    if kind in ("capacitance", "fixed capacitance"):
        if kind == "fixed capacitance":
            what = "the smallest fixed capacitor of the pair"
            fix = "choose another preferred_series, or fit one part and a trimmer"
        elif finding.derived:
            what = "the capacitance computed for f0 with this inductance"
            fix = (f"choose an inductance that needs a capacitance within "
                   f"{_span(bounds.CAPACITANCE_MIN_F, bounds.CAPACITANCE_MAX_F, 'F')}")
        else:
            what = "the capacitance"
            fix = (f"give a capacitance within "
                   f"{_span(bounds.CAPACITANCE_MIN_F, bounds.CAPACITANCE_MAX_F, 'F')}")
        why = ("pad, lead and probe strays of 0.1 pF to 1 pF swamp it (common practice)"
               if finding.side == "below" else
               "only electrolytic parts are that large, too lossy and loose for a tuned "
               "circuit (common practice)")
        return f"{what}, {value}, is {finding.side} {bound}: {why}; {fix} — check the unit prefix"
    if kind == "loaded Q":
        return _loaded_q_text(design, finding, value, bound)
    return (f"the peak RF voltage {value} is above {bound}: air breaks down at about "
            f"{format_quantity(bounds.AIR_BREAKDOWN_V_PER_M * 1e-3, 'V', 2)}/mm at sea level "
            f"(from memory), {bound} across terminals "
            f"{format_quantity(bounds.TERMINAL_GAP_M, 'm', 2)} apart, and no listed part "
            "withstands more; lower the drive, or check its unit")


def _loaded_q_text(design: Design, finding: Finding, value: str, bound: str) -> str:
    why = (f"below {bound}, critical damping, a second-order circuit is overdamped and "
           "does not resonate (textbook)")
    if finding.field == "circuit.targets.loaded_q":
        return f"a loaded Q of {value} is asked for; {why}; ask for a loaded Q of at least {bound}"
    f0 = design.resonance.f0_hz
    if finding.field == "circuit.targets.bandwidth":
        widest = format_quantity(f0 / bounds.LOADED_Q_MIN, "Hz", 3)
        return (f"the bandwidth asked for gives a loaded Q of {value} (f0/bandwidth); {why}; "
                f"ask for a bandwidth of at most {widest} at this f0 — check the unit prefix")
    x0 = format_quantity(design.resonance.reactance_ohm, "Ω", 3)
    if design.circuit.topology == "series":
        fix = (f"the resistances in the loop swamp the reactance X0 = {x0}: lower the source "
               "or load resistance, or raise the reactance (more inductance, less capacitance)")
    else:
        fix = (f"the source and load resistances across the tank are low beside the reactance "
               f"X0 = {x0}: raise them, or lower the reactance (less inductance, more "
               "capacitance)")
    return f"the loaded Q is {value}; {why}; {fix}"


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
