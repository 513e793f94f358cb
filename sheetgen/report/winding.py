"""Winding instructions for the technician: numbered steps worded from the designed coil.

Words and formatted numbers only; every figure comes from the Design. The measuring
frequency follows a rule of thumb (common practice): the highest of the usual LCR-meter
test frequencies that is no higher than f0 and at most a tenth of the coil's
self-resonance, so the meter reads the inductance rather than the self-capacitance.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sheetgen.design.designators import Designators
from sheetgen.design.records import CoilDesign, Design
from sheetgen.quantities import format_number, format_quantity
from sheetgen.report.formatting import condition_text, plural, tolerance_text

LCR_TEST_FREQUENCIES_HZ = (100.0, 1e3, 10e3, 100e3, 1e6)  # usual bench meters (common practice)
# An ordinary LCR meter holds its basic accuracy from about 10 Ω of |Z| up (common
# practice, from memory); a coil of less reactance at its highest usable frequency is
# measured on an impedance or network analyser nearer the frequency of use.
LCR_REACTANCE_MIN_OHM = 10.0


@dataclass(frozen=True)
class WindingStep:
    """One numbered instruction."""

    number: int
    text: str


@dataclass(frozen=True)
class CoilCheck:
    """What the wound coil must measure before assembly."""

    inductance_h: float  # the winding and, where counted, its leads
    tolerance: float | None  # fraction, ± ; None when the job gives no tolerance
    measure_at_hz: float
    method: str = "lcr"  # "lcr" (an LCR meter) or "analyser" (impedance/network analyser)


def measuring_frequency_hz(f0_hz: float, srf_hz: float | None) -> float:
    """The LCR-meter frequency to check the coil at (rule in the module docstring)."""
    ceiling = min(f0_hz, srf_hz / 10.0) if srf_hz else f0_hz
    usable = [f for f in LCR_TEST_FREQUENCIES_HZ if f <= ceiling]
    return usable[-1] if usable else LCR_TEST_FREQUENCIES_HZ[0]


def coil_check(design: Design) -> CoilCheck | None:
    """Expected inductance of the wound coil, its tolerance and the frequency to measure at."""
    coil = design.coil
    if coil is None:
        return None
    r = coil.result
    leads = coil.leads
    inductance = r.inductance_built_h + (leads.inductance_h if leads and leads.counted else 0)
    f0 = design.resonance.f0_hz
    at = measuring_frequency_hz(f0, r.srf_hz)
    if 2.0 * math.pi * at * inductance >= LCR_REACTANCE_MIN_OHM:
        return CoilCheck(inductance, coil.inductance_tolerance, at)
    return CoilCheck(inductance, coil.inductance_tolerance,
                     analyser_frequency_hz(f0, r.srf_hz), "analyser")


def analyser_frequency_hz(f0_hz: float, srf_hz: float | None) -> float:
    """The analyser frequency for a small coil: the largest 1-2-5 value no higher than f0
    and a tenth of the self-resonance (the module's rule, carried past the LCR meter)."""
    ceiling = min(f0_hz, srf_hz / 10.0) if srf_hz else f0_hz
    decade = 10.0 ** math.floor(math.log10(ceiling))
    return max(m * decade for m in (1.0, 2.0, 5.0) if m * decade <= ceiling)


def coil_measuring_text(check: CoilCheck) -> str:
    """How to measure the coil: the instrument, frequency and fixture, and what the
    reading holds."""
    at = format_quantity(check.measure_at_hz, "Hz", 3)
    if check.method == "lcr":
        return f"measure its inductance at {at} with nothing connected"
    return (f"its reactance is too small for an LCR meter's basic accuracy at 1 MHz, so "
            f"measure its inductance on an impedance or network analyser at {at}, in a "
            "short fixture compensated open and short at its clips, the leads cut to length "
            "and clipped at their ends (the reading then holds the winding and its leads; "
            "subtract nothing else)")


def winding_steps(design: Design) -> list[WindingStep]:
    """The numbered steps to wind, finish and check the coil (empty for a given coil)."""
    coil = design.coil
    if coil is None:
        return []
    names = design.designators
    finish = coil_finish_text(design)
    cut_m = cutting_list(design)[0].length_m
    texts = (_toroid_texts(coil, names, finish, cut_m) if coil.form == "toroid"
             else _solenoid_texts(coil, names, design.job.inductor.former_length, finish, cut_m))
    check = coil_check(design)
    tolerance = (f" {tolerance_text(check.tolerance)}"
                 if check.tolerance is not None else "")
    texts.append(
        f"Check the wound coil before assembly: {coil_measuring_text(check)}. Expect "
        f"{format_quantity(check.inductance_h, 'H', 4)}{tolerance}. Record the reading on the "
        "test record.")
    return [WindingStep(i + 1, text) for i, text in enumerate(texts)]


def _toroid_texts(coil: CoilDesign, names: Designators, finish: str,
                  cut_m: float) -> list[str]:
    r = coil.result
    lead = format_quantity(coil.lead_length_m, "m", 3)
    stop = [] if r.fits else [
        f"STOP: close-wound, the {plural(r.turns, 'turn')} need "
        f"{format_number(r.close_wound_angle_deg, 3)}° of the hole's circumference, more than "
        "one layer with a lead gap allows. Do not cut wire or wind this coil until the design "
        "is changed (see the failed checks)."]
    spread = (f"Space the {plural(r.turns, 'turn')} evenly: turn 1 to turn {r.turns} covers "
              f"{format_number(r.winding_angle_deg, 3)}° of the core, "
              f"{format_number(r.winding_angle_deg / (r.turns - 1), 3)}° from each turn to the "
              f"next ({r.turns - 1} spaces), leaving a gap of "
              f"{format_number(360 - r.winding_angle_deg, 3)}° between the start and finish "
              "leads so that they do not touch." if r.turns > 1 else
              "Leave the start and finish leads apart so that they do not touch.")
    texts = stop + [
        f"Cut the wire as the cutting list says: {names.coil} is "
        f"{format_quantity(cut_m, 'm', 3)} of {r.wire.name} enamelled copper wire (grade "
        f"{r.wire.grade}, {format_quantity(r.wire.overall_diameter_m, 'm', 3)} over the enamel), "
        f"with {lead} for each lead and a spare end to trim.",
        f"Hold {lead} of wire as the start lead and pass the wire through the centre of the "
        f"core ({coil.core_name}). Each pass through the centre counts as one turn.",
        f"Wind {plural(r.turns, 'turn')} of {names.coil} in one layer, pulling each turn snug "
        "against the core without nicking the enamel on its edges. Count the passes through "
        "the centre, not the turns seen on the outside.",
    ] + ([spread] if r.fits else [])
    if coil.tap_turns is not None:
        texts.insert(len(stop) + 2, _tap_text(coil, names))  # made while winding
    if coil.link_turns is not None:
        texts.append(
            f"Wind the link {names.link} from its cut length: "
            f"{plural(coil.link_turns, 'turn')} of insulated wire "
            f"over the start end of {names.coil}; {names.coil}'s start lead goes to the cold "
            f"(earthy) side of the tank. The link's two ends go to {names.load_resistor} "
            f"({format_quantity(coil.link_resistance_ohm, 'Ω', 3)}).")
    texts.append(f"Leave {lead} for the finish lead. {finish}")
    texts.append("Strip the enamel from the last 5 mm of each lead (scrape or use a solder pot "
                 "hot enough to burn through it) and tin both ends.")
    return texts


def _tap_text(coil: CoilDesign, names: Designators) -> str:
    """Where and how to make the tap (a twisted loop of the winding wire itself)."""
    return (f"Make the tap as you wind: after turn {coil.tap_turns}, counted from the start "
            "lead, twist a loop of about 10 mm in the wire, then carry on winding. Scrape and "
            f"tin the loop; {names.load_resistor} "
            f"({format_quantity(coil.tap_resistance_ohm, 'Ω', 3)}) connects between the tap "
            "and the start (cold, earthy) lead.")


SPARE_M = 0.05  # extra on every cut, to hold while winding and to trim off (common practice)
TAP_LOOP_M = 0.02  # the twisted tap loop of about 10 mm takes twice its length of wire


@dataclass(frozen=True)
class Cut:
    """One length of wire to cut before winding."""

    piece: str
    wire: str
    length_m: float
    made_of: str


def cutting_list(design: Design) -> tuple[Cut, ...]:
    """Every wire to cut for the coil: the winding (with a tap's loop), the link, each with
    its two leads and a spare allowance (empty for a given coil)."""
    coil = design.coil
    if coil is None:
        return ()
    r, names = coil.result, design.designators
    lead = format_quantity(coil.lead_length_m, "m", 3)
    spare = format_quantity(SPARE_M, "m", 3)
    loop = TAP_LOOP_M if coil.tap_turns is not None else 0.0
    cuts = [Cut(f"{names.coil} winding", f"{r.wire.name} enamelled copper, grade {r.wire.grade}",
                r.wire_length_m + loop + SPARE_M,
                f"{plural(r.turns, 'turn')}, two leads of {lead}"
                + (f", the tap loop ({format_quantity(loop, 'm', 2)})" if loop else "")
                + f" and {spare} spare")]
    if coil.link_wire is not None and coil.link_wire_length_m is not None:
        cuts.append(Cut(f"{names.link} link", f"{coil.link_wire.name}, insulated",
                        coil.link_wire_length_m + SPARE_M,
                        f"{plural(coil.link_turns, 'turn')} over {names.coil}, two leads of "
                        f"{lead} and {spare} spare"))
    return tuple(cuts)


def coil_finish_text(design: Design) -> str:
    """How to secure the turns, from the heat the coil makes (common practice: wax softens
    from about 50 °C (from memory), so it suits coils that stay cool; a coil that dissipates
    more gets a varnish rated above its surface temperature, or ties and no coating)."""
    worst = design.coil_at_worst or design.coil.result  # the finish must stand the worst case
    rise = getattr(worst, "temperature_rise_k", None)
    stress = design.worst.stress if design.worst is not None else design.stress
    power_w = stress.inductor_loss_w
    hottest_c = design.job.variation.temperature.maximum + rise if rise is not None else None
    case = ("" if design.worst is None or design.worst.condition == "as driven"
            else f" {condition_text(design.worst.condition)}")
    if (hottest_c is not None and hottest_c > WAX_MAX_SURFACE_C) or power_w > WAX_MAX_POWER_W:
        heat = (f"up to {format_quantity(hottest_c, '°C', 3)} at its surface{case} (a "
                f"{format_quantity(design.job.variation.temperature.maximum, '°C', 3)} ambient "
                f"and {format_quantity(rise, 'K', 2)} of its own heat)"
                if hottest_c is not None else
                f"{format_quantity(power_w, 'W', 3)} of heat{case or ' at the design drive'}")
        return (f"{design.designators.coil} reaches {heat}: do not use wax. Secure the turns "
                "with a low-loss RF varnish rated for at least that temperature (or with "
                "PTFE cord ties and no coating), and let it cure before measuring.")
    return ("Secure the turns with a low-loss RF coil varnish or wax (not a general-purpose "
            "glue) and let it cure before measuring.")


WAX_MAX_SURFACE_C = 50.0  # coil wax softens from about here (from memory; common practice)
WAX_MAX_POWER_W = 0.25  # above this a small coil warms noticeably (common practice)


def _solenoid_texts(coil: CoilDesign, names: Designators, former_length_m: float | None,
                    finish: str, cut_m: float) -> list[str]:
    r = coil.result
    lead = format_quantity(coil.lead_length_m, "m", 3)
    close = r.pitch_m <= r.wire.overall_diameter_m * 1.001
    spacing = ("close-wound, turns touching" if close else
               f"at a pitch of {format_quantity(r.pitch_m, 'm', 3)} centre to centre "
               f"(a gap of {format_quantity(r.pitch_m - r.wire.overall_diameter_m, 'm', 3)} "
               "between turns)")
    former = format_quantity(r.former_diameter_m, "m", 3)
    reasons = []
    if r.pitch_m < r.wire.overall_diameter_m:
        reasons.append("its pitch is below the wire's overall diameter")
    if former_length_m is not None and r.length_m > former_length_m:
        reasons.append(f"it is longer than the {format_quantity(former_length_m, 'm', 3)}"
                       " former")
    stop = [] if r.fits else [
        f"STOP: as designed the winding does not fit ({' and '.join(reasons) or 'see below'}). "
        "Do not cut wire or wind this coil until the design is changed (see the failed "
        "checks)."]
    if former_length_m is not None and r.length_m <= former_length_m:
        margin = format_quantity((former_length_m - r.length_m) / 2.0, "m", 3)
        place = (f"centred on the {format_quantity(former_length_m, 'm', 3)} former: start "
                 f"the first turn {margin} from one end, so that the last turn ends {margin} "
                 "from the other")
    else:
        place = "centred on the former"
    return stop + [
        f"Use a former of {former} diameter made of a low-loss insulating material "
        "(dissipation factor of 0.001 or less at the working frequency, e.g. PTFE or "
        "ceramic; common practice): a lossy former lowers the coil's Q.",
        f"Cut {format_quantity(cut_m, 'm', 3)} of {r.wire.name} enamelled copper wire (grade "
        f"{r.wire.grade}) for {names.coil}, as the cutting list says: {lead} for each lead and a "
        "spare end to trim.",
        f"Wind {plural(r.turns, 'turn')} of {names.coil} in a single layer, {spacing}, over a "
        f"winding length of {format_quantity(r.length_m, 'm', 3)}, {place}.",
    ] + ([_tap_text(coil, names)] if coil.tap_turns is not None else []) + [
        "Anchor each end of the winding so that it keeps its pitch: pass the wire through "
        "two small holes in the former, or hold it with a turn of PTFE tape.",
        f"Leave {lead} for each lead. {finish} Strip and tin the last 5 mm of each lead.",
        "If the inductance reads high, spread the turns slightly; if low, compress them. "
        "Re-secure after any adjustment.",
    ]
