"""Safety cautions for the sheet, worded from the computed stresses.

Each caution has a signal word (ISO 3864-2 and ANSI Z535.4: DANGER, WARNING, CAUTION;
NOTICE for information), a short code of our own and a sentence or two that states the
computed figure ("1.42 kV peak on C1"), the usual precautions, and defers to local codes
and licensed practice. The level follows the computed figure through one table of
thresholds, `THRESHOLDS`, each with its source.

Voltages: the limits are rms values for a sinusoidal voltage; the RF on a part is
sinusoidal, so rms = peak/√2 and both are stated. A capacitor disconnected at a crest
keeps the peak as a DC voltage; that is compared with the DC limits.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from typing import TYPE_CHECKING, Literal

from sheetgen.engine.insulation import (
    CLEARANCE_MM_PER_KV_PEAK,
    KILOVOLT_POINT_V,
    InsulationDistances,
    insulation_distances,
)
from sheetgen.engine.ratings import (
    EXTRA_LOW_VOLTAGE_RMS_V,
    discharge_time_s,
    stored_charge_c,
    stored_energy_j,
)
from sheetgen.engine.resonance import Circuit
from sheetgen.engine.stress import DcFeed, Stress, WorstCase
from sheetgen.quantities import format_quantity
from sheetgen.report.formatting import condition_text

if TYPE_CHECKING:
    from sheetgen.design.records import Design

Level = Literal["danger", "warning", "caution", "notice"]
SEVERITY: Mapping[str, int] = {"notice": 0, "caution": 1, "warning": 2, "danger": 3}

DEFERRAL = ("Follow local codes and licensed practice; this sheet does not replace a "
            "qualified safety review.")


@dataclass(frozen=True)
class Threshold:
    """A level that applies when `measure` is above `above` (strictly, in `unit`).

    `meaning` words the limit; {limit} in it stands for the formatted value (and {peak}
    for the peak of an rms voltage).
    """

    measure: Literal["voltage_rms_v", "held_voltage_v", "stored_charge_c", "stored_energy_j",
                     "surface_temperature_c", "rf_power_w", "dc_voltage_v"]
    above: float
    unit: str
    level: Level
    meaning: str
    source: str

    def describe(self) -> str:
        return self.meaning.format(limit=format_quantity(self.above, self.unit),
                                   peak=format_quantity(self.above * math.sqrt(2.0), self.unit))


THRESHOLDS: tuple[Threshold, ...] = (
    Threshold("voltage_rms_v", 25.0, "V", "caution",
              "{limit} rms ({peak} peak), up to which IEC 61140 and IEC 60364-4-41 need no "
              "protection against direct contact in dry conditions",
              "IEC 61140 extra-low voltage with IEC 60364-4-41 §414.4.5: 25 V a.c. rms or "
              "60 V ripple-free d.c. in normal dry conditions; from memory"),
    Threshold("voltage_rms_v", EXTRA_LOW_VOLTAGE_RMS_V, "V", "warning",
              "the {limit} rms ({peak} peak) extra-low-voltage limit of IEC 61140",
              "IEC 61140: extra-low voltage up to 50 V a.c. rms or 120 V ripple-free d.c., "
              "the same as IEC 60449 band I; from memory"),
    Threshold("voltage_rms_v", 1000.0, "V", "danger",
              "the {limit} rms upper limit of low voltage in IEC 61140",
              "IEC 61140 and IEC 60449: low voltage up to 1000 V a.c. rms or 1500 V d.c.; "
              "from memory"),
    # the same dry-conditions DC limit for a capacitor left charged and for a DC supply
    *(Threshold(measure, 60.0, "V", "caution",
                "the {limit} ripple-free DC limit of IEC 61140 for dry conditions",
                "IEC 61140 with IEC 60364-4-41 §414.4.5; from memory")
      for measure in ("held_voltage_v", "dc_voltage_v")),
    Threshold("dc_voltage_v", 120.0, "V", "warning",
              "the {limit} ripple-free DC extra-low-voltage limit of IEC 61140",
              "IEC 61140: extra-low voltage up to 120 V ripple-free d.c.; from memory"),
    Threshold("dc_voltage_v", 1500.0, "V", "danger",
              "the {limit} DC upper limit of low voltage in IEC 61140",
              "IEC 61140: low voltage up to 1500 V d.c.; from memory"),
    Threshold("stored_charge_c", 45e-6, "C", "warning",
              "the {limit} of stored charge that IEC 61010-1 counts as hazardous",
              "IEC 61010-1 §6.3: 45 µC at 60 V … 15 kV; from memory"),
    Threshold("stored_energy_j", 0.35, "J", "warning",
              "the {limit} of stored energy that IEC 61010-1 counts as hazardous",
              "IEC 61010-1 §6.3: 350 mJ (given there above 15 kV, used here at any "
              "voltage); from memory"),
    Threshold("surface_temperature_c", 51.0, "°C", "caution",
              "{limit}, where bare metal burns skin in a one-minute touch (ISO 13732-1)",
              "ISO 13732-1 burn threshold, uncoated metal, 1 min contact; from memory"),
    Threshold("surface_temperature_c", 65.0, "°C", "warning",
              "{limit}, where bare metal burns skin in a one-second touch (ISO 13732-1)",
              "ISO 13732-1 burn threshold, uncoated metal, 1 s contact; from memory"),
    Threshold("rf_power_w", 10.0, "W", "caution",
              "{limit}, where the near field of an unscreened coil is strong",
              "common practice"),
)

THRESHOLDS_BY_MEASURE: Mapping[str, Threshold] = {t.measure: t for t in reversed(THRESHOLDS)}
"""The least severe threshold of each measure."""

# Above about 100 kHz body current heats rather than stimulates nerves: a touch burns
# before it is felt as a shock (ICNIRP 1998 uses 100 kHz as the boundary between its
# stimulation and heating restrictions; from memory).
RF_BURN_FROM_HZ = 100e3
SRF_MARGIN = 3.0  # keep the coil's self-resonance at least this many times f0 (common practice)
FLUX_WARNING_SHARE = 0.8  # warn above this share of the material's flux limit (common practice)
ENCLOSURE_FROM_W = 10.0  # RF power from which a test needs covers and interlocks (common practice)
SAFE_HELD_VOLTAGE_V = 60.0  # a capacitor is taken as discharged below this (held_voltage_v)


@dataclass(frozen=True)
class Caution:
    """One caution for the sheet: level (lower case), our code, and the text."""

    level: Level
    code: str
    text: str

    @property
    def signal_word(self) -> str:
        return self.level.upper()


@dataclass(frozen=True)
class PartHazard:
    """What a part carries at the worst credible case (RF peak voltage, RMS current), and
    for a capacitor its capacitance and any bleeder; temperature rise above ambient if
    known. condition names that case ("load open"; None: the given drive) and
    nominal_peak_v the peak as driven; dc_across_v is the DC across the part and
    dc_to_chassis_v the DC its conductors sit at against the chassis."""

    designator: str
    kind: Literal["capacitor", "inductor"]
    voltage_peak_v: float
    current_rms_a: float
    capacitance_f: float | None = None
    bleeder_resistance_ohm: float | None = None
    temperature_rise_k: float | None = None
    holds_charge: bool = True  # False when the coil discharges the capacitor (parallel tank)
    several: bool = False  # the designator names more than one part ("C1 and C2")
    condition: str | None = None
    nominal_peak_v: float | None = None
    dc_across_v: float = 0.0
    dc_to_chassis_v: float = 0.0

    @property
    def peak_to_chassis_v(self) -> float:
        """The highest voltage on the part's conductors against the chassis: DC + RF peak."""
        return self.dc_to_chassis_v + self.voltage_peak_v


def threshold_for(measure: str, value: float) -> Threshold | None:
    """The most severe threshold of `measure` that `value` is above, or None."""
    passed = [t for t in THRESHOLDS if t.measure == measure and value > t.above]
    return max(passed, key=lambda t: SEVERITY[t.level], default=None)


def level_for(measure: str, value: float) -> Level | None:
    """The level `value` of `measure` calls for, or None below every threshold."""
    threshold = threshold_for(measure, value)
    return None if threshold is None else threshold.level


def _most_severe(*levels: Level | None) -> Level | None:
    present = [level for level in levels if level is not None]
    return max(present, key=SEVERITY.__getitem__, default=None)


def _text(*sentences: str) -> str:
    """A caution's sentences; the deferral to local codes is printed once for the whole box."""
    return " ".join(sentences)


def names_text(designators: Iterable[str]) -> str:
    """('C1',) → 'C1'; ('C1', 'C2', 'C3') → 'C1, C2 and C3'."""
    names = list(designators)
    return names[0] if len(names) == 1 else f"{', '.join(names[:-1])} and {names[-1]}"


def _possessive(part: PartHazard) -> str:
    return "their" if part.several else "its"


def _volts(peak_v: float) -> str:
    return (f"{format_quantity(peak_v, 'V')} peak "
            f"({format_quantity(peak_v / math.sqrt(2.0), 'V')} rms)")


def _worst_volts(part: PartHazard) -> str:
    """The part's RF peak at the worst case, with the case named and the peak as driven
    beside it when the two differ: '1.21 kV peak (854 V rms) with the load open (616 V
    peak as driven)'."""
    if part.condition is None:
        return _volts(part.voltage_peak_v)
    driven = ("" if part.nominal_peak_v is None else
              f" ({format_quantity(part.nominal_peak_v, 'V')} peak as driven)")
    return f"{_volts(part.voltage_peak_v)} {condition_text(part.condition)}{driven}"


def parts_from_stress(circuit: Circuit, stress: Stress, *, capacitors: tuple[str, ...] = ("C1",),
                      inductor: str = "L1", bleeder_resistance_ohm: float | None = None,
                      capacitor_rise_k: float | None = None,
                      inductor_rise_k: float | None = None,
                      dc_blocked: bool = False, worst: WorstCase | None = None,
                      dc: DcFeed | None = None) -> tuple[PartHazard, ...]:
    """The capacitor(s) and the coil of one circuit, from its computed stresses at the
    worst credible case (`worst`; else `stress`, the given drive) and the DC they sit at.
    In a parallel tank the coil is across the capacitor and discharges it for DC unless a
    blocking capacitor is in the way; in a series loop nothing does."""
    rated = worst.stress if worst is not None else stress
    named = worst is not None and worst.condition != "as driven"
    condition = worst.condition if named else None
    return (
        PartHazard(names_text(capacitors), "capacitor", rated.capacitor_voltage_peak_v,
                   rated.capacitor_current_rms_a, circuit.capacitance_f,
                   bleeder_resistance_ohm, capacitor_rise_k,
                   holds_charge=circuit.topology == "series" or dc_blocked,
                   several=len(capacitors) > 1, condition=condition,
                   nominal_peak_v=stress.capacitor_voltage_peak_v if named else None,
                   dc_across_v=dc.across_capacitor_v if dc else 0.0,
                   dc_to_chassis_v=dc.to_chassis_v if dc else 0.0),
        PartHazard(inductor, "inductor", rated.inductor_voltage_peak_v,
                   rated.inductor_current_rms_a, temperature_rise_k=inductor_rise_k,
                   condition=condition,
                   nominal_peak_v=stress.inductor_voltage_peak_v if named else None,
                   dc_to_chassis_v=dc.to_chassis_v if dc else 0.0),
    )


def _voltage_caution(part: PartHazard, f_hz: float) -> Caution | None:
    threshold = threshold_for("voltage_rms_v", part.voltage_peak_v / math.sqrt(2.0))
    if threshold is None:
        return None
    code = "hv-capacitor" if part.kind == "capacitor" else "hv-coil"
    return Caution(threshold.level, code, _text(
        f"{_worst_volts(part)} on {part.designator} at "
        f"{format_quantity(f_hz, 'Hz')}, above {threshold.describe()}.",
        f"Do not touch {part.designator} or {_possessive(part)} connections while the drive "
        "is on; "
        f"use insulated tools and probes rated for the voltage."))


def _stored_energy_caution(part: PartHazard) -> Caution | None:
    if part.kind != "capacitor" or part.capacitance_f is None or not part.holds_charge:
        return None
    held_v = part.voltage_peak_v + part.dc_across_v  # broken at a crest, on its DC
    level = level_for("held_voltage_v", held_v)
    if level is None:
        return None
    energy = stored_energy_j(part.capacitance_f, held_v)
    charge = stored_charge_c(part.capacitance_f, held_v)
    hazardous = (threshold_for("stored_charge_c", charge)
                 or threshold_for("stored_energy_j", energy))
    if hazardous is None:
        # Below IEC 61010-1's charge and energy levels a touch gives a startling, not a
        # harmful, shock: the reflex is the hazard, so CAUTION.
        severity = (f"That is below {THRESHOLDS_BY_MEASURE['stored_charge_c'].describe()} and "
                    f"{THRESHOLDS_BY_MEASURE['stored_energy_j'].describe()}, but the jolt it "
                    f"gives can cause a fall or a slip of the hand.")
    else:
        level = _most_severe(level, hazardous.level)
        severity = f"That is above {hazardous.describe()}."
    name = part.designator
    if part.bleeder_resistance_ohm:
        time = discharge_time_s(part.capacitance_f, part.bleeder_resistance_ohm, held_v,
                                SAFE_HELD_VOLTAGE_V)
        discharge = (f"Through the {format_quantity(part.bleeder_resistance_ohm, 'Ω')} bleeder "
                     f"across {name} the voltage falls below {format_quantity(SAFE_HELD_VOLTAGE_V, 'V')} in "
                     f"{format_quantity(time, 's')}; wait that long, then discharge it with an "
                     f"insulated shorting tool and check with a meter before touching.")
    else:
        discharge = (f"No bleeder is given: discharge {name} with an insulated shorting tool "
                     f"and check with a meter before touching.")
    charged = (f"{'are' if part.several else 'is'} charged to the "
               f"{format_quantity(part.dc_across_v, 'V')} DC supply and "
               if part.dc_across_v else "")
    return Caution(level, "stored-energy", _text(
        f"{name} {charged}can keep up to {format_quantity(held_v, 'V')} DC if the circuit is "
        f"broken at a crest of the RF: {format_quantity(energy, 'J')} and "
        f"{format_quantity(charge, 'C')} stored (½CV², Q = CV).", severity, discharge))


def _rf_burn_caution(parts: Iterable[PartHazard], f_hz: float,
                     level: Level | None) -> Caution | None:
    if f_hz < RF_BURN_FROM_HZ or level is None:
        return None
    parts = tuple(parts)
    highest = max(parts, key=lambda p: p.voltage_peak_v)
    hottest = max(parts, key=lambda p: p.current_rms_a)
    return Caution(_most_severe("caution", min(level, "warning", key=SEVERITY.__getitem__)),
                   "rf-burn", _text(
        f"Radio frequency at {format_quantity(f_hz, 'Hz')}: {_worst_volts(highest)} "
        f"on {highest.designator} and {format_quantity(hottest.current_rms_a, 'A')} rms "
        f"through {hottest.designator}"
        f"{' ' + condition_text(hottest.condition) if hottest.condition else ''}.",
        "RF current may not be felt as a shock yet burns deep under the skin, and it arcs "
        "from high-voltage points; keep hands, rings and tools off live parts while driven."))


def _hot_caution(part: PartHazard, ambient_max_c: float) -> Caution | None:
    if part.temperature_rise_k is None:
        return None
    surface_c = ambient_max_c + part.temperature_rise_k
    threshold = threshold_for("surface_temperature_c", surface_c)
    if threshold is None:
        return None
    code = "hot-core" if part.kind == "inductor" else "hot-capacitor"
    case = f" {condition_text(part.condition)}" if part.condition else ""
    return Caution(threshold.level, code, _text(
        f"{part.designator} runs {format_quantity(part.temperature_rise_k, 'K')} above "
        f"ambient{case}: "
        f"up to {format_quantity(surface_c, '°C')} in a "
        f"{format_quantity(ambient_max_c, '°C')} ambient, above {threshold.describe()}.",
        f"Let {part.designator} cool before handling and keep cables and plastics clear of it."))


def _exposure_caution(rf_power_w: float) -> Caution | None:
    threshold = threshold_for("rf_power_w", rf_power_w)
    if threshold is None:
        return None
    return Caution(threshold.level, "rf-exposure", _text(
        f"{format_quantity(rf_power_w, 'W')} of RF in the circuit, above "
        f"{threshold.describe()}.",
        "Assess the fields near the coil against the applicable exposure limits, keep the "
        "circuit screened while driven and keep people clear while testing."))


def _enclosure_caution(parts: Iterable[PartHazard], level: Level | None,
                       rf_power_w: float) -> Caution | None:
    """Covers and interlocks: for power equipment (from ENCLOSURE_FROM_W) with voltages above
    the extra-low-voltage limit, or for any circuit above the low-voltage limit."""
    if level is None or SEVERITY[level] < SEVERITY["warning"]:
        return None
    if level != "danger" and rf_power_w < ENCLOSURE_FROM_W:
        return None
    highest = max(parts, key=lambda p: p.peak_to_chassis_v)
    if highest.dc_to_chassis_v:
        case = f" {condition_text(highest.condition)}" if highest.condition else ""
        driven = (f" ({format_quantity(highest.nominal_peak_v, 'V')} as driven)"
                  if highest.condition and highest.nominal_peak_v else "")
        figure = (f"{format_quantity(highest.peak_to_chassis_v, 'V')} peak on "
                  f"{highest.designator} against the chassis{case}: the "
                  f"{format_quantity(highest.dc_to_chassis_v, 'V')} DC supply plus "
                  f"{format_quantity(highest.voltage_peak_v, 'V')} RF peak{driven}")
    else:
        case = f" {condition_text(highest.condition)}" if highest.condition else ""
        driven = (f" ({format_quantity(highest.nominal_peak_v, 'V')} peak as driven)"
                  if highest.condition and highest.nominal_peak_v else "")
        figure = f"{_volts(highest.voltage_peak_v)} on {highest.designator}{case}{driven}"
    return Caution(level, "covers-interlocks", _text(
        f"Up to {figure}: test inside a "
        f"screened enclosure with its covers fitted and its interlocks working, never defeat "
        f"an interlock to tune, and switch the drive off and discharge before opening."))


def _dc_supply_caution(dc_voltage_v: float, parts: tuple[PartHazard, ...] = (),
                       dc: DcFeed | None = None) -> Caution:
    """The supply on the tank, and which parts see it: across them, or against the chassis."""
    threshold = threshold_for("dc_voltage_v", dc_voltage_v)
    above = f", above {threshold.describe()}" if threshold else ""
    where = ""
    capacitor = next((p for p in parts if p.kind == "capacitor"), None)
    coil = next((p for p in parts if p.kind == "inductor"), None)
    if dc is not None and capacitor is not None and coil is not None:
        peak = max(p.peak_to_chassis_v for p in parts)
        where = (" " + dc_feed_text(dc, capacitor.designator, coil.designator,
                                    capacitor.several)
                 + f" Up to {format_quantity(peak, 'V')} peak against the chassis, DC plus RF.")
    return Caution(threshold.level if threshold else "notice", "dc-supply", _text(
        f"The tank carries {format_quantity(dc_voltage_v, 'V')} DC from its supply{above}."
        + where,
        "It is live whenever the supply is on, with or without RF drive: switch the supply "
        "off, discharge its filter capacitors and check with a meter before touching."))


def dc_feed_text(dc: DcFeed, capacitors: str, coil: str, several: bool) -> str:
    """Which parts see the DC supply, for the feed arrangement the job describes."""
    supply = format_quantity(dc.supply_v, "V")
    them, are = ("them", "are") if several else ("it", "is")
    if dc.across_blocking_v is not None:
        return (f"{capacitors} and the blocking capacitor in series with {coil} are charged "
                f"to it ({coil} no longer discharges {them}): the rating check of "
                f"{capacitors} counts the {supply} plus the RF peak; the blocking capacitor "
                f"is not on this sheet's parts list: rate it for the {supply} plus the RF "
                "across it.")
    if dc.across_capacitor_v:
        return (f"{capacitors} {are} the only part{'s' if several else ''} in the loop that "
                f"block{'' if several else 's'} it and take{'' if several else 's'} the whole "
                f"{supply} plus the RF peak; the rating check counts both.")
    return (f"It is fed through {coil}, which holds both ends of {capacitors} at it: "
            f"{capacitors} {are} rated for the RF alone across {them}, but every conductor "
            "of the tank sits at the supply against the chassis.")


def _no_hazard_notice(parts: Iterable[PartHazard]) -> Caution:
    highest = max(parts, key=lambda p: p.voltage_peak_v)
    limit = THRESHOLDS[0]
    case = ("at the given drive, nor with the load open" if highest.condition == "load open"
            else "at the given drive")
    return Caution("notice", "no-hazardous-voltage", _text(
        f"No hazardous voltage was computed {case}: the highest is "
        f"{_worst_volts(highest)} on {highest.designator}, within {limit.describe()}.",
        ("A higher drive or a fault can give more (the load-open case is already the worst "
         "mistune); check before raising the drive." if highest.condition == "load open" else
         "A higher drive, a fault or mistuning can give more; check before raising the "
         "drive.")))


_ORDER = ("covers-interlocks", "hv-capacitor", "hv-coil", "insulation-distances", "dc-supply",
          "stored-energy", "rf-burn", "hot-core", "hot-capacitor", "rf-exposure", "flux-near-limit", "srf-near-f0",
          "core-data-extrapolated",
          "no-hazardous-voltage")


def cautions(parts: Iterable[PartHazard], f_hz: float, rf_power_w: float, *,
             ambient_max_c: float = 25.0, dc_voltage_v: float | None = None,
             dc: DcFeed | None = None) -> tuple[Caution, ...]:
    """Every caution the computed stresses call for, most severe first.

    parts: what each part carries at the operating frequency f_hz, at the worst credible
    case; rf_power_w: the RF power the drive puts into the circuit; ambient_max_c: the
    highest ambient, to which a part's temperature rise is added; dc: where the supply of
    dc_voltage_v sits.
    """
    parts = tuple(parts)
    if not parts:
        raise ValueError("cautions need at least one part")
    rf_level = _most_severe(*(level_for("voltage_rms_v", p.voltage_peak_v / math.sqrt(2.0))
                              for p in parts))
    voltage_level = _most_severe(rf_level, level_for("dc_voltage_v", dc_voltage_v or 0.0))
    found = [_voltage_caution(p, f_hz) for p in parts]
    found += [_stored_energy_caution(p) for p in parts]
    found.append(_rf_burn_caution(parts, f_hz, rf_level))
    found += [_hot_caution(p, ambient_max_c) for p in parts]
    found.append(_exposure_caution(rf_power_w))
    found.append(_enclosure_caution(parts, voltage_level, rf_power_w))
    if dc_voltage_v:
        found.append(_dc_supply_caution(dc_voltage_v, parts, dc))
    if voltage_level is None:
        found.append(_no_hazard_notice(parts))
    kept = [caution for caution in found if caution is not None]
    return tuple(sorted(kept, key=lambda c: (-SEVERITY[c.level], _ORDER.index(c.code))))


def _capacitor_rise_k(design: Design) -> float | None:
    """The hottest fixed capacitor's rise above ambient at the worst case, ΔT = P·Rθ, with
    the ESR loss shared in proportion to capacitance (None without a thermal resistance in
    the job)."""
    r_theta = design.job.capacitor.thermal_resistance
    if r_theta is None:
        return None
    share = max(design.capacitor_choice.fixed_parts_f) / design.circuit.capacitance_f
    stress = design.worst.stress if design.worst is not None else design.stress
    return stress.capacitor_loss_w * share * r_theta


def design_cautions(design: Design) -> tuple[Caution, ...]:
    """Every caution of a design, most severe first: the stresses on its parts, its DC
    supply, and its coil's."""
    names = design.designators
    coil = design.coil
    result = design.coil_at_worst if coil is not None else None  # heat and flux judged there
    parts = parts_from_stress(design.circuit, design.stress, capacitors=names.capacitors,
                              inductor=names.coil,
                              bleeder_resistance_ohm=design.job.capacitor.bleeder,
                              capacitor_rise_k=_capacitor_rise_k(design),
                              inductor_rise_k=getattr(result, "temperature_rise_k", None),
                              dc_blocked=design.job.circuit.dc_blocked,
                              worst=design.worst, dc=design.dc)
    found = cautions(parts, design.stress.f_hz, design.stress.drive_power_w,
                     ambient_max_c=design.job.variation.temperature.maximum,
                     dc_voltage_v=design.job.circuit.dc_voltage, dc=design.dc)
    found += coil_cautions(result, design.resonance.f0_hz, names.coil,
                           coil.flux_density_max_t if coil is not None else None,
                           condition=design.worst.condition if design.worst else None)
    found += insulation_cautions(design)
    return tuple(sorted(found, key=lambda c: (-SEVERITY[c.level], _ORDER.index(c.code))))


def kilovolt_distances(design: Design) -> tuple[str, InsulationDistances] | None:
    """The highest point of the design against the chassis at the worst credible case (RF
    peak plus the DC the tank sits at) and the distances it needs, from 1 kV peak."""
    stress = design.worst.stress if design.worst is not None else design.stress
    names = design.designators
    part, peak = max(((names_text(names.capacitors), stress.capacitor_voltage_peak_v),
                      (names.coil, stress.inductor_voltage_peak_v)), key=lambda p: p[1])
    dc_v = design.dc.to_chassis_v if design.dc is not None else 0.0
    if peak + dc_v < KILOVOLT_POINT_V:
        return None
    where = design.job.insulation
    return part, insulation_distances(peak, pollution_degree=where.pollution_degree,
                                      material_group=where.material_group,
                                      altitude_m=where.altitude, dc_v=dc_v)


def insulation_cautions(design: Design) -> tuple[Caution, ...]:
    """Creepage, clearance and corona for a kilovolt point (IEC 60664-1; common practice)."""
    found = kilovolt_distances(design)
    if found is None:
        return ()
    part, d = found
    worst = design.worst
    case = (f" {condition_text(worst.condition)}" if worst is not None
            and worst.condition != "as driven" else "")
    dc_v = design.dc.to_chassis_v if design.dc is not None else 0.0
    figure = (f"{format_quantity(d.voltage_peak_v, 'V')} peak against the chassis on {part} "
              f"({format_quantity(dc_v, 'V')} DC plus the RF peak{case})" if dc_v else
              f"{_volts(d.voltage_peak_v)} on {part}{case}")
    creepage = (f"at least {format_quantity(d.creepage_mm * 1e-3, 'm', 2)} along insulating "
                f"surfaces (creepage, IEC 60664-1 for {format_quantity(d.voltage_rms_v, 'V')} "
                f"rms, pollution degree {d.pollution_degree}, material group "
                f"{d.material_group})" if d.creepage_mm is not None else
                "creepage beyond IEC 60664-1's tables: have the layout reviewed")
    altitude = (f", ×{d.altitude_factor:.2f} for the altitude" if d.altitude_factor > 1 else "")
    return (Caution("warning", "insulation-distances", _text(
        f"{figure}: keep {creepage}, and at least "
        f"{format_quantity(d.clearance_mm * 1e-3, 'm', 2)} through air to every other "
        f"conductor (clearance, {CLEARANCE_MM_PER_KV_PEAK:g} mm per kV peak at RF, common "
        f"practice{altitude}).",
        "Above about 1 kV peak, sharp wire ends and pointed solder joints can glow (corona) "
        "and erode insulation: round the joints, trim wire ends flush and keep the high-"
        "voltage leads short and clear of other parts.")),)


def coil_cautions(coil, f0_hz: float, designator: str,
                  flux_limit_t: float | None = None,
                  condition: str | None = None) -> tuple[Caution, ...]:
    """NOTICEs (harm to the equipment, not to people) for a coil whose self-resonance is not
    well above f0, or whose core runs near its flux density limit (over the limit is a
    failed rating check instead)."""
    found = []
    srf = getattr(coil, "srf_hz", None) if coil is not None else None
    if srf is not None and srf < SRF_MARGIN * f0_hz:
        found.append(Caution(
            "notice", "srf-near-f0",
            f"{designator} self-resonates at {format_quantity(srf, 'Hz')}, only "
            f"{srf / f0_hz:.1f} times f0 (keep it above {SRF_MARGIN:g}×, common practice): its "
            "self-capacitance detunes the circuit and its Q falls. Use a longer winding pitch "
            "or fewer turns on a larger former."))
    flux = getattr(coil, "flux_density_peak_t", None) if coil is not None else None
    if flux is not None and flux_limit_t and FLUX_WARNING_SHARE * flux_limit_t < flux <= flux_limit_t:
        found.append(Caution(
            "notice", "flux-near-limit",
            f"The core of {designator} runs at {format_quantity(flux, 'T', 3)} peak"
            f"{' ' + condition_text(condition) if condition == 'load open' else ''}, "
            f"{flux / flux_limit_t * 100:.0f} % of its material's "
            f"{format_quantity(flux_limit_t, 'T', 3)} limit: it heats and its Q falls as the "
            "drive rises. Keep the drive at the design level or use a larger core."))
    if getattr(coil, "core_loss_table_extrapolated", False):
        found.append(Caution(
            "notice", "core-data-extrapolated",
            f"The core material's loss data do not reach f0 ({format_quantity(f0_hz, 'Hz')}): "
            f"the core loss and the Q of {designator} are extrapolated from the nearest rows. "
            "Measure the wound coil's Q at f0 before relying on the bandwidth window, or use "
            "a material specified at this frequency."))
    return tuple(found)
