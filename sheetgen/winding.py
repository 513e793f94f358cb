"""Winding instructions for the technician: numbered steps worded from the designed coil.

Words and formatted numbers only; every figure comes from the Design. The measuring
frequency follows a rule of thumb (common practice): the highest of the usual LCR-meter
test frequencies that is no higher than f0 and at most a tenth of the coil's
self-resonance, so the meter reads the inductance rather than the self-capacitance.
"""

from __future__ import annotations

from dataclasses import dataclass

from .design import CoilDesign, Design
from .quantities import format_number, format_quantity

LCR_TEST_FREQUENCIES_HZ = (100.0, 1e3, 10e3, 100e3, 1e6)  # usual bench meters (common practice)


@dataclass(frozen=True)
class Step:
    """One numbered instruction."""

    number: int
    text: str


@dataclass(frozen=True)
class CoilCheck:
    """What the wound coil must measure before assembly."""

    inductance_h: float
    tolerance: float | None  # fraction, ± ; None when the job gives no tolerance
    measure_at_hz: float


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
    return CoilCheck(r.inductance_built_h, coil.inductance_tolerance,
                     measuring_frequency_hz(design.resonance.f0_hz, r.srf_hz))


def winding_steps(design: Design) -> list[Step]:
    """The numbered steps to wind, finish and check the coil (empty for a given coil)."""
    coil = design.coil
    if coil is None:
        return []
    texts = _toroid_texts(coil) if coil.form == "toroid" else _solenoid_texts(coil)
    check = coil_check(design)
    tolerance = (f" ± {format_number(check.tolerance * 100, 2)} %"
                 if check.tolerance is not None else "")
    texts.append(
        f"Check the wound coil before assembly: measure its inductance at "
        f"{format_quantity(check.measure_at_hz, 'Hz', 3)} with nothing connected. Expect "
        f"{format_quantity(check.inductance_h, 'H', 4)}{tolerance}. Record the reading on the "
        "test record.")
    return [Step(i + 1, text) for i, text in enumerate(texts)]


def _toroid_texts(coil: CoilDesign) -> list[str]:
    r = coil.result
    lead = format_quantity(coil.lead_length_m, "m", 3)
    texts = [
        f"Cut {format_quantity(r.wire_length_m, 'm', 3)} of {r.wire.name} enamelled copper "
        f"wire (grade {r.wire.grade}, {format_quantity(r.wire.overall_diameter_m, 'm', 3)} over "
        f"the enamel). This includes {lead} for each lead.",
        f"Hold {lead} of wire as the start lead and pass the wire through the centre of the "
        f"core ({coil.core_name}). Each pass through the centre counts as one turn.",
        f"Wind {r.turns} turns in one layer, pulling each turn snug against the core without "
        "nicking the enamel on its edges. Count the passes through the centre, not the turns "
        "seen on the outside.",
        f"Spread the {r.turns} turns evenly over {format_number(r.winding_angle_deg, 3)}° of "
        f"the core (about {format_number(r.winding_angle_deg / r.turns, 3)}° per turn), "
        f"leaving a gap of about {format_number(360 - r.winding_angle_deg, 3)}° between the "
        f"start and finish leads so that they do not touch.",
    ]
    if coil.link_turns is not None:
        texts.append(
            f"Wind the link: {coil.link_turns} turn{'s' if coil.link_turns != 1 else ''} of "
            f"insulated wire over the tank winding, spread over the end of the winding at "
            f"the cold (earthy) lead. The link's two ends go to the "
            f"{format_quantity(coil.link_resistance_ohm, 'Ω', 3)} connection.")
    texts.append(
        f"Leave {lead} for the finish lead. Secure the turns with a low-loss RF coil varnish "
        "or wax (not a general-purpose glue) and let it cure before measuring.")
    texts.append("Strip the enamel from the last 5 mm of each lead (scrape or use a solder pot "
                 "hot enough to burn through it) and tin both ends.")
    return texts


def _solenoid_texts(coil: CoilDesign) -> list[str]:
    r = coil.result
    lead = format_quantity(coil.lead_length_m, "m", 3)
    close = r.pitch_m <= r.wire.overall_diameter_m * 1.001
    spacing = ("close-wound, turns touching" if close else
               f"at a pitch of {format_quantity(r.pitch_m, 'm', 3)} centre to centre "
               f"(a gap of {format_quantity(r.pitch_m - r.wire.overall_diameter_m, 'm', 3)} "
               "between turns)")
    former = format_quantity(r.diameter_m - r.wire.overall_diameter_m, "m", 3)
    return [
        f"Cut {format_quantity(r.wire_length_m, 'm', 3)} of {r.wire.name} enamelled copper "
        f"wire (grade {r.wire.grade}). This includes {lead} for each lead.",
        f"Wind {r.turns} turns in a single layer on the {former} diameter former, {spacing}, "
        f"over a winding length of {format_quantity(r.length_m, 'm', 3)}.",
        f"Leave {lead} for each lead. Secure the winding with low-loss RF coil varnish or "
        "wax, and strip and tin the last 5 mm of each lead.",
        "If the inductance reads high, spread the turns slightly; if low, compress them. "
        "Re-secure after any adjustment.",
    ]
