"""Component ratings: each stress on a part against its rating, derated, with a remedy.

A check passes when actual ≤ allowed = rating × derating. A failed check can be accepted
by an explicit written reason; it then stays in the results, marked accepted. Every
failed check carries the numbers of its remedy (`RatingRemedy`); report/advice.py words them.

Stresses scale with the drive: in a linear circuit every voltage and current goes with
√P_drive, every power with P_drive, which is how the drive that would pass is found.
Also here: the energy, charge and discharge time of a capacitor left charged.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from sheetgen.engine.stress import Drive
from sheetgen.engine.wire import current_density_a_per_m2

CheckQuantity = Literal["peak voltage", "RF current", "power in ESR", "flux density", "surface temperature", "power",
                        "working voltage"]
# The thermal class of the usual polyurethane and polyester-imide magnet-wire enamels
# (IEC 60317, from memory): the hottest a winding may run.
WINDING_MAX_TEMPERATURE_C = 155.0
# Natural convection: ΔT ∝ P^0.833 (magnetics.temperature_rise_k, common practice).
CONVECTION_EXPONENT = 0.833

# Common practice: ceramic and mica capacitors run at no more than half their rated
# voltage in high-reliability work (e.g. the derating tables of NASA EEE-INST-002 for
# ceramic capacitors, from memory); the voltage rating is compared with the peak of the
# RF voltage (plus any DC), as the trade reads a DC-rated part.
DEFAULT_VOLTAGE_DERATING = 0.5
# Common practice: RF current held to 80 % of the maker's RF current rating.
DEFAULT_CURRENT_DERATING = 0.8
# Common practice: 4 A/mm² for enamelled copper windings cooled by free air (figures of
# 3 … 5 A/mm² are the usual range); shown beside the winding's current density as a
# reference, not a limit (the winding's temperature is the criterion).
DEFAULT_CURRENT_DENSITY_LIMIT_A_PER_M2 = 4.0e6
# Common practice: a resistor dissipates at most half its rated power (it then runs cool
# enough to keep its value and its neighbours' temperature).
DEFAULT_RESISTOR_POWER_DERATING = 0.5


@dataclass(frozen=True)
class RatingRemedy:
    """The numbers behind a failed check's advice (None where a remedy does not apply).

    required_rating: the rating that would pass at the same derating (actual / derating);
    parts_needed: that many of the present part in `arrangement` share the stress;
    drive_power_max_w: the power into the circuit at which the check just passes;
    drive_max / drive_kind: the job's own drive quantity at which it just passes (V rms
    open-circuit, A rms or W available: a voltage or current drive scales the stress in
    proportion, an available power as its square root).
    """

    required_rating: float
    parts_needed: int | None = None
    arrangement: Literal["series", "parallel"] | None = None
    drive_power_max_w: float | None = None
    esr_max_ohm: float | None = None
    core_area_factor: float | None = None
    drive_max: float | None = None
    drive_kind: str | None = None


@dataclass(frozen=True)
class RatingCheck:
    """One stress on one part against its derated rating.

    margin = (allowed − actual)/allowed: the share of the allowed value left unused,
    negative when over. accepted is True for a failed check with a written reason.
    """

    part: str
    quantity: CheckQuantity
    unit: str
    actual: float
    rating: float
    derating: float
    allowed: float
    margin: float
    passed: bool
    accepted: bool
    acceptance_reason: str | None
    remedy: RatingRemedy | None

    @property
    def status(self) -> Literal["pass", "accepted", "fail"]:
        return "pass" if self.passed else ("accepted" if self.accepted else "fail")


# IEC 61140: extra-low voltage is up to 50 V a.c. rms (from memory); the RF on a part is
# sinusoidal, so its peak is √2 times that, about 70.7 V. report/cautions.py words it.
EXTRA_LOW_VOLTAGE_RMS_V = 50.0
EXTRA_LOW_VOLTAGE_PEAK_V = EXTRA_LOW_VOLTAGE_RMS_V * math.sqrt(2.0)


@dataclass(frozen=True)
class UnratedCheck:
    """A stress on a part whose rating the job does not give: never a pass.

    Where the part's peak voltage is within the extra-low-voltage limit it is a warning
    ("not rated"); above it a failure, unless accepted with a written reason. Has the
    fields of a RatingCheck, None where there is no rating.
    """

    part: str
    quantity: CheckQuantity
    unit: str
    actual: float
    peak_voltage_v: float
    acceptance_reason: str | None = None
    rating: None = None
    derating: None = None
    allowed: None = None
    margin: None = None
    remedy: None = None
    passed: bool = False

    @property
    def hazardous(self) -> bool:
        """The part's peak voltage is above the extra-low-voltage limit."""
        return self.peak_voltage_v > EXTRA_LOW_VOLTAGE_PEAK_V

    @property
    def accepted(self) -> bool:
        return self.hazardous and self.acceptance_reason is not None

    @property
    def status(self) -> Literal["not rated", "accepted", "fail"]:
        if not self.hazardous:
            return "not rated"
        return "accepted" if self.accepted else "fail"


def unrated_check(part: str, quantity: CheckQuantity, unit: str, actual: float,
                  peak_voltage_v: float, acceptance: str | None = None) -> UnratedCheck:
    """The check of a stress whose rating is not given (see UnratedCheck)."""
    if acceptance is not None and not acceptance.strip():
        raise ValueError(f"{part}: an acceptance needs a written reason")
    return UnratedCheck(part, quantity, unit, actual, peak_voltage_v,
                        acceptance.strip() if acceptance is not None else None)


def _validate(part: str, actual: float, rating: float, derating: float,
              acceptance: str | None) -> None:
    if not part.strip():
        raise ValueError("a check needs a part designator such as C1 or L1")
    if not (math.isfinite(actual) and actual >= 0.0):
        raise ValueError(f"{part}: the stress must be a finite value ≥ 0, not {actual!r}")
    if not (math.isfinite(rating) and rating > 0.0):
        raise ValueError(f"{part}: a rating must be positive and finite, not {rating!r}")
    if not 0.0 < derating <= 1.0:
        raise ValueError(f"{part}: a derating factor must lie in (0, 1], not {derating!r}")
    if acceptance is not None and not acceptance.strip():
        raise ValueError(f"{part}: an acceptance needs a written reason")


def _drive_scaled(drive_power_w: float | None, ratio: float, exponent: float) -> float | None:
    """Drive power at which a stress ∝ P^(1/exponent) falls to the allowed value."""
    if drive_power_w is None:
        return None
    return drive_power_w * ratio**exponent


def _drive_limit(drive: Drive | None, ratio: float, exponent: float) -> dict:
    """The job's drive at which a stress ∝ P^(1/exponent) falls to the allowed value: a
    power scales by ratio^exponent, a voltage or current (∝ √P) by ratio^(exponent/2)."""
    if drive is None:
        return {}
    power = drive.kind == "available_power"
    value = drive.value * ratio ** (exponent if power else exponent / 2.0)
    return {"drive_max": value, "drive_kind": drive.kind}


def _make(part: str, quantity: CheckQuantity, unit: str, actual: float, rating: float,
          derating: float, acceptance: str | None, remedy_for) -> RatingCheck:
    _validate(part, actual, rating, derating, acceptance)
    allowed = rating * derating
    passed = actual <= allowed
    remedy = None if passed else remedy_for(allowed)
    reason = acceptance.strip() if acceptance is not None else None
    return RatingCheck(part=part, quantity=quantity, unit=unit, actual=actual, rating=rating,
                       derating=derating, allowed=allowed, margin=1.0 - actual / allowed,
                       passed=passed, accepted=(not passed) and reason is not None,
                       acceptance_reason=reason, remedy=remedy)


def capacitor_voltage_check(part: str, peak_voltage_v: float, rated_voltage_v: float, *,
                            derating: float = DEFAULT_VOLTAGE_DERATING,
                            drive_power_w: float | None = None,
                            acceptance: str | None = None,
                            drive: Drive | None = None, dc_v: float = 0.0) -> RatingCheck:
    """Peak voltage on a capacitor, the RF peak V̂ plus any DC across it, against its
    rated voltage × derating.

    Remedies: a part rated ≥ (V̂ + V_dc)/derating; n = ⌈(V̂ + V_dc)/allowed⌉ equal parts in
    series, each of n times the capacitance (equal capacitors in series share the RF
    equally, and the DC too with equal resistors across them); or the drive at which the
    RF peak fits in what the DC leaves, P·((allowed − V_dc)/V̂)² (none where the DC alone
    takes it all).
    """
    if not (math.isfinite(dc_v) and dc_v >= 0.0):
        raise ValueError(f"{part}: the DC across it must be a finite value ≥ 0, not {dc_v!r}")
    total = peak_voltage_v + dc_v

    def remedy(allowed):
        room = max(allowed - dc_v, 0.0)
        scale = room / peak_voltage_v if peak_voltage_v > 0 and room > 0 else None
        return RatingRemedy(required_rating=total / derating,
                            parts_needed=math.ceil(total / allowed), arrangement="series",
                            drive_power_max_w=(_drive_scaled(drive_power_w, scale, 2.0)
                                               if scale is not None else None),
                            **(_drive_limit(drive, scale, 2.0) if scale is not None else {}))
    return _make(part, "peak voltage", "V", total, rated_voltage_v, derating,
                 acceptance, remedy)


def capacitor_current_check(part: str, current_rms_a: float, rated_current_rms_a: float, *,
                            derating: float = DEFAULT_CURRENT_DERATING,
                            drive_power_w: float | None = None,
                            acceptance: str | None = None,
                            drive: Drive | None = None) -> RatingCheck:
    """RF current through a capacitor against its RF current rating × derating.

    Remedies: a part rated ≥ I/derating; n = ⌈I/allowed⌉ equal parts in parallel, each of
    1/n of the capacitance; or the drive P·(allowed/I)².
    """
    def remedy(allowed):
        return RatingRemedy(required_rating=current_rms_a / derating,
                      parts_needed=math.ceil(current_rms_a / allowed), arrangement="parallel",
                      drive_power_max_w=_drive_scaled(drive_power_w, allowed / current_rms_a, 2.0),
                      **_drive_limit(drive, allowed / current_rms_a, 2.0))
    return _make(part, "RF current", "A", current_rms_a, rated_current_rms_a, derating,
                 acceptance, remedy)


def esr_power_check(part: str, power_w: float, rated_power_w: float, *,
                    esr_ohm: float | None = None, derating: float = 1.0,
                    drive_power_w: float | None = None,
                    acceptance: str | None = None,
                    drive: Drive | None = None) -> RatingCheck:
    """Power dissipated in a capacitor's ESR (I²·ESR) against a power rating × derating.

    Remedies: at the same current the power goes with the ESR, so an ESR ≤
    ESR·allowed/P; a part rated ≥ P/derating; or the drive P_drive·allowed/P.
    """
    def remedy(allowed):
        ratio = allowed / power_w
        return RatingRemedy(required_rating=power_w / derating,
                      esr_max_ohm=None if esr_ohm is None else esr_ohm * ratio,
                      drive_power_max_w=_drive_scaled(drive_power_w, ratio, 1.0),
                      **_drive_limit(drive, ratio, 1.0))
    return _make(part, "power in ESR", "W", power_w, rated_power_w, derating, acceptance,
                 remedy)


@dataclass(frozen=True)
class CurrentDensity:
    """The winding's current density, shown as information beside its reference; the
    winding's heating is judged by its temperature (surface_temperature_check).

    actual: I over the crowded cross-section A_ac = (π d²/4)·R_dc/R_ac, A/m²;
    reference: the DC figure of common practice raised to the same heat per metre in that
    area, J_ref·√(R_ac/R_dc); dc_reference: J_ref itself.
    """

    current_rms_a: float
    actual_a_per_m2: float
    reference_a_per_m2: float
    dc_reference_a_per_m2: float
    ac_to_dc_resistance: float


def winding_current_density(current_rms_a: float, diameter_m: float, *,
                            ac_to_dc_resistance: float = 1.0,
                            reference_a_per_m2: float = DEFAULT_CURRENT_DENSITY_LIMIT_A_PER_M2
                            ) -> CurrentDensity:
    """Current density in the winding wire at the working frequency, and its reference.

    The RF current flows in A_ac = (π d²/4)·R_dc/R_ac, the cross-section whose DC
    resistance equals the wire's AC resistance (skin and proximity effect), so
    J = I/A_ac. The reference is a DC heating figure (common practice): the same heat per
    metre, I²R_ac = J_ref²·ρ·(π d²/4), allows J_ref·√(R_ac/R_dc) in the smaller area. It is
    a rule for windings in general, not a limit of this one: a coil with a large surface
    per watt runs cool above it, which the temperature check decides.
    """
    if not diameter_m > 0.0:
        raise ValueError("the wire diameter must be positive")
    if not ac_to_dc_resistance >= 1.0 - 1e-9:
        raise ValueError("R_ac/R_dc cannot be below 1")
    crowding = max(1.0, ac_to_dc_resistance)
    density = float(current_density_a_per_m2(current_rms_a, diameter_m)) * crowding
    return CurrentDensity(current_rms_a, density, reference_a_per_m2 * math.sqrt(crowding),
                          reference_a_per_m2, crowding)


def surface_temperature_check(part: str, ambient_max_c: float, rise_k: float, *,
                              limit_c: float = WINDING_MAX_TEMPERATURE_C,
                              drive_power_w: float | None = None,
                              acceptance: str | None = None) -> RatingCheck:
    """The hottest surface, ambient + rise, against a temperature limit.

    The rise goes with the dissipated power as P^0.833 (natural convection, common
    practice) and the power with the drive, so the drive that just passes is
    P·((limit − ambient)/rise)^(1/0.833).
    """
    surface_c = ambient_max_c + rise_k

    def remedy(allowed):
        headroom = max(allowed - ambient_max_c, 0.0)
        return RatingRemedy(required_rating=surface_c,
                            drive_power_max_w=_drive_scaled(drive_power_w, headroom / rise_k,
                                                            1.0 / CONVECTION_EXPONENT)
                            if rise_k > 0 else None)
    return _make(part, "surface temperature", "°C", surface_c, limit_c, 1.0, acceptance, remedy)


def flux_density_check(part: str, flux_density_peak_t: float, limit_t: float, *,
                       derating: float = 1.0, drive_power_w: float | None = None,
                       acceptance: str | None = None,
                       drive: Drive | None = None) -> RatingCheck:
    """Peak flux density in a core against the material's limit × derating.

    B̂ = √2 V/(ω N Ae) (Faraday's law), so at the same voltage and turns a core of
    B̂/allowed times the cross-section Ae passes; or the drive P·(allowed/B̂)².
    """
    def remedy(allowed):
        return RatingRemedy(required_rating=flux_density_peak_t / derating,
                      core_area_factor=flux_density_peak_t / allowed,
                      drive_power_max_w=_drive_scaled(drive_power_w, allowed / flux_density_peak_t, 2.0),
                      **_drive_limit(drive, allowed / flux_density_peak_t, 2.0))
    return _make(part, "flux density", "T", flux_density_peak_t, limit_t, derating,
                 acceptance, remedy)


def resistor_power(voltage_peak_v: float, resistance_ohm: float) -> float:
    """P = V̂²/(2R): the power a resistor dissipates with a sinusoidal voltage of peak V̂."""
    return voltage_peak_v * voltage_peak_v / (2.0 * resistance_ohm)


def resistor_power_check(part: str, power_w: float, rated_power_w: float, *,
                         derating: float = DEFAULT_RESISTOR_POWER_DERATING,
                         drive_power_w: float | None = None, acceptance: str | None = None,
                         drive: Drive | None = None) -> RatingCheck:
    """Power in a resistor against its rating × derating; remedies: a part rated ≥
    P/derating, or the drive scaled so that P (∝ drive power) falls to the allowed value."""
    def remedy(allowed):
        return RatingRemedy(required_rating=power_w / derating,
                            drive_power_max_w=_drive_scaled(drive_power_w, allowed / power_w, 1.0),
                            **_drive_limit(drive, allowed / power_w, 1.0))
    return _make(part, "power", "W", power_w, rated_power_w, derating, acceptance, remedy)


def resistor_voltage_check(part: str, peak_voltage_v: float, rated_voltage_v: float, *,
                           derating: float = 1.0, drive_power_w: float | None = None,
                           acceptance: str | None = None,
                           drive: Drive | None = None) -> RatingCheck:
    """Peak voltage on a resistor against its working-voltage rating; remedies: a part rated
    ≥ V̂/derating, n = ⌈V̂/allowed⌉ equal resistors in series (each R/n), or the drive."""
    def remedy(allowed):
        return RatingRemedy(required_rating=peak_voltage_v / derating,
                            parts_needed=math.ceil(peak_voltage_v / allowed),
                            arrangement="series",
                            drive_power_max_w=_drive_scaled(drive_power_w,
                                                            allowed / peak_voltage_v, 2.0),
                            **_drive_limit(drive, allowed / peak_voltage_v, 2.0))
    return _make(part, "working voltage", "V", peak_voltage_v, rated_voltage_v, derating,
                 acceptance, remedy)


def stored_energy_j(capacitance_f: float, voltage_v: float) -> float:
    """W = ½ C V², the energy in a capacitor charged to V."""
    return 0.5 * capacitance_f * voltage_v * voltage_v


def stored_charge_c(capacitance_f: float, voltage_v: float) -> float:
    """Q = C V."""
    return capacitance_f * voltage_v


def discharge_time_s(capacitance_f: float, resistance_ohm: float, from_v: float,
                     to_v: float) -> float:
    """t = R C ln(V0/V1), the time an RC discharge V0·e^(−t/RC) takes to fall to V1
    (0 when already there)."""
    if not (capacitance_f > 0.0 and resistance_ohm > 0.0 and to_v > 0.0):
        raise ValueError("discharge needs C > 0, R > 0 and a positive end voltage")
    if from_v <= to_v:
        return 0.0
    return resistance_ohm * capacitance_f * math.log(from_v / to_v)
