"""Preferred number series E6 … E192 (IEC 60063) and picking parts from them."""

from __future__ import annotations

import math
from dataclasses import dataclass

# IEC 60063 lists E3…E24 explicitly; their values are not all the rounding of 10^(i/n).
_TABULATED = {
    6: (1.0, 1.5, 2.2, 3.3, 4.7, 6.8),
    12: (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2),
    24: (1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
         3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1),
}
SERIES_NAMES = ("E6", "E12", "E24", "E48", "E96", "E192")


def series_values(name: str) -> tuple[float, ...]:
    """The mantissas of one decade of series `name` ("E12"), from 1.00 up.

    E48, E96 and E192 are 10^(i/n) rounded to three figures, with the one exception
    IEC 60063 makes: 9.20 in E192 where the rounding gives 9.19.
    """
    if name not in SERIES_NAMES:
        raise ValueError(f"unknown series {name!r}; expected one of {', '.join(SERIES_NAMES)}")
    count = int(name[1:])
    if count in _TABULATED:
        return _TABULATED[count]
    values = [round(10 ** (i / count), 2) for i in range(count)]
    if count == 192:
        values[values.index(9.19)] = 9.20
    return tuple(values)


def nearest_standard(value: float, name: str = "E24") -> float:
    """The value of series `name` nearest to `value` on a logarithmic scale."""
    if not value > 0:
        raise ValueError("a standard value needs a positive target")
    decade = math.floor(math.log10(value))
    candidates = [m * 10.0 ** (decade + shift) for shift in (-1, 0, 1)
                  for m in series_values(name)]
    return _clean(min(candidates, key=lambda c: abs(math.log(c / value))))


def _clean(value: float) -> float:
    """Remove binary noise from m·10^k so that 4.7e-12 prints as 4.7e-12."""
    return float(f"{value:.6g}")


# Smallest second part worth fitting in parallel: below about half a picofarad the strays
# of the layout and the leads (a few tenths of a pF) dominate it (common practice).
MIN_SECOND_PART_F = 0.5e-12

# Wiring and layout capacitance across a tuning capacitor that sheetgen chooses: about
# 2 pF for short point-to-point wiring (common practice). A capacitance the job states is
# taken as the tank's own; this default is never added to it.
DEFAULT_STRAY_CAPACITANCE_F = 2e-12


@dataclass(frozen=True)
class StandardPair:
    """Two standard parts whose sum (capacitors in parallel) approaches a target."""

    first: float
    second: float | None
    total: float
    error_rel: float


def best_parallel_pair(target: float, name: str = "E12", tolerance_rel: float = 0.0,
                       min_second: float = MIN_SECOND_PART_F) -> StandardPair:
    """Best one or two standard capacitors in parallel for `target` (C adds in parallel).

    The pair replaces the nearest single part only when it comes closer to the target by
    more than the parts' own ± tolerance_rel, and its smaller part is at least min_second;
    otherwise a second part buys nothing a technician could measure.
    """
    single = nearest_standard(target, name)
    best = StandardPair(single, None, single, single / target - 1.0)
    needed = abs(best.error_rel) - tolerance_rel
    decade = math.floor(math.log10(target))
    larger = [m * 10.0 ** (decade + k) for k in (-3, -2, -1, 0) for m in series_values(name)]
    for first in (_clean(v) for v in larger):
        remainder = target - first  # compared after rounding: m·10^k carries binary noise
        if remainder < 0.5 * min_second:
            continue
        second = nearest_standard(remainder, name)
        if second > first or second < min_second:
            continue
        total = first + second
        error = total / target - 1.0
        if abs(error) < needed - 1e-12 and abs(error) < abs(best.error_rel) - 1e-12:
            best = StandardPair(first, second, total, error)
    return best


# IEC 60063 pairs each series with a tolerance (from memory): the default for a fixed part.
SERIES_TOLERANCE = {"E6": 0.20, "E12": 0.10, "E24": 0.05, "E48": 0.02, "E96": 0.01,
                    "E192": 0.005}
