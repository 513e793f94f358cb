"""The few ways a value is written for people, used by every row, step and label.

Engineering notation itself lives in sheetgen/quantities.py; these helpers fix the
conventions on top of it (4 figures on the sheet, ± tolerances, signed margins, A/mm²).
"""

from __future__ import annotations

import math

from sheetgen.quantities import format_number, format_quantity

SHEET_DIGITS = 4  # significant figures of a computed value on the sheet and the summary


def quantity_text(value_si: float, unit: str, digits: int = SHEET_DIGITS) -> str:
    """Engineering notation with its unit: quantity_text(1.5e-10, 'F') → '150.0 pF'."""
    return format_quantity(value_si, unit, digits)


def range_text(low_si: float, high_si: float, unit: str, digits: int = SHEET_DIGITS) -> str:
    """A window as written on the sheet: '3.540 MHz to 3.560 MHz'."""
    return f"{quantity_text(low_si, unit, digits)} to {quantity_text(high_si, unit, digits)}"


def resolved_text(value_si: float, resolution_si: float, unit: str) -> str:
    """A measured value to the resolution the bench reads it at, no finer: the last digit
    printed is the resolution's leading digit (3.544 MHz at 1 kHz, 12.86 MHz at 10 kHz)."""
    if (value_si is None or not math.isfinite(value_si) or value_si == 0
            or not resolution_si or not math.isfinite(resolution_si) or resolution_si <= 0):
        return quantity_text(value_si, unit)  # "—" for a value that is not a number
    digits = math.floor(math.log10(abs(value_si))) - math.floor(math.log10(resolution_si)) + 1
    return quantity_text(value_si, unit, max(digits, 1))


def resolved_range_text(low_si: float, high_si: float, resolution_si: float, unit: str) -> str:
    """A window to the bench's resolution (see resolved_text)."""
    return (f"{resolved_text(low_si, resolution_si, unit)} to "
            f"{resolved_text(high_si, resolution_si, unit)}")


PART_WINDOW_DIGITS = 4  # significant figures of a part's window as printed


def printed_part_window(window: tuple[float, float] | None) -> tuple[float, float] | None:
    """A part's window (its tolerance and the meter's accuracy) with each edge rounded
    inward to PART_WINDOW_DIGITS figures, so the window printed (in the record and the
    limits table alike) and the window graded are the same numbers."""
    if window is None:
        return None
    low, high = window
    return (_round_to_figures(low, PART_WINDOW_DIGITS, up=True),
            _round_to_figures(high, PART_WINDOW_DIGITS, up=False))


def _round_to_figures(value: float, digits: int, up: bool) -> float:
    """`value` rounded up (or down) to `digits` significant figures."""
    step = 10.0 ** (math.floor(math.log10(abs(value))) - digits + 1)
    units = value / step
    return float(f"{(math.ceil(units - 1e-9) if up else math.floor(units + 1e-9)) * step:.{digits}g}")


def signed(value: float, decimals: int) -> str:
    """A number with its sign always shown, the minus as U+2212 (−) as typeset text wants;
    a value that rounds to zero is written without a sign ('0.00', never '−0.00')."""
    text = f"{value:+.{decimals}f}"
    if float(text) == 0.0:
        return f"{0.0:.{decimals}f}"
    return text.replace("-", "\u2212")


def percent(fraction: float, digits: int = 3) -> str:
    """0.125 → '12.5 %'."""
    return f"{format_number(100.0 * fraction, digits)} %"


def percent_change(value: float, reference: float) -> str:
    """(value − reference)/reference as a signed percentage, e.g. '+0.31 %'."""
    return f"{signed(100.0 * (value / reference - 1.0), 2)} %"


def tolerance_text(fraction: float) -> str:
    """0.05 → '± 5 %'."""
    return f"± {percent(fraction)}"


def plural(count: int, word: str) -> str:
    """'1 turn', '3 turns'."""
    return f"{count} {word}{'' if count == 1 else 's'}"


def stress_text(value_si: float, unit: str, digits: int = 3) -> str:
    """A stress in the trade's units: current density in plain A/mm² (no prefix), the rest
    in SI with a prefix."""
    if unit == "A/m²":
        return f"{format_number(value_si * 1e-6, digits)} A/mm²"
    return format_quantity(value_si, unit, digits)


def condition_text(condition: str | None) -> str:
    """The drive case a worst-case figure is for, as words after the figure."""
    return "with the load open" if condition == "load open" else "at the given drive"
