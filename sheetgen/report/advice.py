"""Failed rating checks in words: which part, by how much, and what to change.

The numbers come from the engine's `RatingCheck` and its `RatingRemedy`; this module only words
them (engine/ratings.py computes, this says).
"""

from __future__ import annotations

from sheetgen.engine.ratings import RatingCheck, RatingRemedy
from sheetgen.quantities import format_number, format_quantity
from sheetgen.report.formatting import percent, stress_text


def rating_advice(check: RatingCheck) -> str | None:
    """The sentence for a failed check (None when it passes)."""
    if check.passed or check.remedy is None:
        return None
    over = check.actual / check.allowed - 1.0
    derated = ("" if check.derating == 1.0 else
               f" ({percent(check.derating)} of its {stress_text(check.rating, check.unit)} "
               "rating)")
    return (f"{check.part}: {check.quantity} {stress_text(check.actual, check.unit)} is "
            f"{percent(over)} over the allowed {stress_text(check.allowed, check.unit)}"
            f"{derated}. {_REMEDIES[check.quantity](check.remedy)}.")


_DRIVE_WORDS = {"voltage": ("V", " rms open-circuit"), "current": ("A", " rms"),
                "available_power": ("W", " available")}


def _or_drive(remedy: RatingRemedy) -> str:
    """The drive that passes, in the job's own drive quantity when it is known."""
    if remedy.drive_max is not None:
        unit, words = _DRIVE_WORDS[remedy.drive_kind]
        return f", or lower the drive to at most {format_quantity(remedy.drive_max, unit)}{words}"
    if remedy.drive_power_max_w is None:
        return ""
    return (f", or lower the drive to at most {format_quantity(remedy.drive_power_max_w, 'W')}"
            " into the circuit")


def _peak_voltage(r: RatingRemedy) -> str:
    return (f"Fit a capacitor rated at least {format_quantity(r.required_rating, 'V')}, "
            f"or {r.parts_needed} of the present rating in series, each of "
            f"{r.parts_needed}× the capacitance{_or_drive(r)}")


def _rf_current(r: RatingRemedy) -> str:
    return (f"Fit a capacitor rated for at least {format_quantity(r.required_rating, 'A')}"
            f" rms, or {r.parts_needed} in parallel, each of 1/{r.parts_needed} of the "
            f"capacitance{_or_drive(r)}")


def _esr_power(r: RatingRemedy) -> str:
    esr = ("" if r.esr_max_ohm is None else
           f"Fit a capacitor with an ESR of at most {format_quantity(r.esr_max_ohm, 'Ω')} "
           f"at this frequency, or one ")
    start = esr or "Fit a capacitor "
    return (f"{start}rated to dissipate at least "
            f"{format_quantity(r.required_rating, 'W')}{_or_drive(r)}")


def _flux_density(r: RatingRemedy) -> str:
    return (f"Use a core with at least {format_number(r.core_area_factor, 3)}× the "
            f"cross-section Ae, or a material rated for at least "
            f"{format_quantity(r.required_rating, 'T')}{_or_drive(r)}")


def _surface_temperature(r: RatingRemedy) -> str:
    drive = _or_drive(r)
    return ("Use thicker wire or a larger former (less loss per area of surface), spread "
            f"the turns, or cool it with moving air{drive}")


def _resistor_power(r: RatingRemedy) -> str:
    return (f"Fit a resistor rated for at least {format_quantity(r.required_rating, 'W')}"
            f"{_or_drive(r)}")


def _working_voltage(r: RatingRemedy) -> str:
    return (f"Fit a resistor rated for at least {format_quantity(r.required_rating, 'V')} "
            f"peak, or {r.parts_needed} in series, each of 1/{r.parts_needed} of the "
            f"resistance{_or_drive(r)}")


_REMEDIES = {"peak voltage": _peak_voltage, "RF current": _rf_current,
             "power in ESR": _esr_power,
             "flux density": _flux_density, "surface temperature": _surface_temperature,
             "power": _resistor_power, "working voltage": _working_voltage}
