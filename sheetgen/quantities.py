"""Engineering notation at the edges: "4.7 uH" in, "4.70 µH" out.

Inside sheetgen every quantity is a float in SI units. This module is the one place that
turns text with units into SI floats (and the one place for unit conversions, AL's
trade units included) and SI floats back into engineering notation for people.

Output uses quantiphy. Input is split here into number, SI prefix and unit so that each
dimension accepts only its own units: a general parser reads "1 T" as tera and "1 mil"
as milli-"il", which a job file must not silently accept.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field

from quantiphy import Quantity

SI_PREFIXES: Mapping[str, float] = {
    "f": 1e-15, "p": 1e-12, "n": 1e-9, "u": 1e-6, "\u00b5": 1e-6, "\u03bc": 1e-6,
    "m": 1e-3, "k": 1e3, "M": 1e6, "G": 1e9,
}

_NUMBER = re.compile(r"^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")


class QuantityError(ValueError):
    """A value that is not a quantity of the expected dimension; the message says what is."""


@dataclass(frozen=True)
class Dimension:
    """What a field holds: its SI unit, the spellings accepted, and an example for messages.

    `units` take SI prefixes ("pF", "kΩ"); `whole_units` do not ("mil", "%", "ppm/K") and
    map to a converter from the written number to SI.
    """

    name: str
    si_unit: str
    unit_name: str
    example: str
    units: Mapping[str, float] = field(default_factory=dict)
    whole_units: Mapping[str, Callable[[float], float]] = field(default_factory=dict)
    allow_bare_number: bool = True
    large_prefixes: Mapping[str, float] = field(default_factory=dict)


def _scale(factor: float) -> Callable[[float], float]:
    return lambda number: number * factor


def dbm_to_w(dbm: float) -> float:
    """Power in watts from dBm: P = 1 mW · 10^(dBm/10)."""
    return 1e-3 * 10.0 ** (dbm / 10.0)


OHM_SPELLINGS = {"\u03a9": 1.0, "\u2126": 1.0, "ohm": 1.0, "ohms": 1.0, "Ohm": 1.0, "Ohms": 1.0, "R": 1.0}

INDUCTANCE = Dimension("inductance", "H", "henries", "4.7 µH", {"H": 1.0})
CAPACITANCE = Dimension("capacitance", "F", "farads", "150 pF", {"F": 1.0})
RESISTANCE = Dimension("resistance", "Ω", "ohms", "2.2 kΩ", OHM_SPELLINGS)
# Only a frequency takes tera and peta (BIPM SI Brochure table 7): "100 PF" or "1 TH" is
# far likelier a slip of the shift key than a real value.
FREQUENCY = Dimension("frequency", "Hz", "hertz", "7.1 MHz", {"Hz": 1.0, "hz": 1.0},
                      large_prefixes={"T": 1e12, "P": 1e15})
VOLTAGE = Dimension("voltage", "V", "volts", "10 V", {"V": 1.0, "Vrms": 1.0})
CURRENT = Dimension("current", "A", "amperes", "100 mA", {"A": 1.0, "Arms": 1.0})
POWER = Dimension("power", "W", "watts", "5 W (or 37 dBm)", {"W": 1.0}, {"dBm": dbm_to_w})
LENGTH = Dimension(
    "length", "m", "metres", "12.5 mm", {"m": 1.0},
    {"in": _scale(0.0254), "inch": _scale(0.0254), "mil": _scale(25.4e-6)},
)
FLUX_DENSITY = Dimension(
    "flux density", "T", "teslas", "20 mT (or 200 G)", {"T": 1.0, "G": 1e-4, "gauss": 1e-4}
)
TEMPERATURE = Dimension("temperature", "°C", "degrees Celsius", "25 °C",
                        {}, {"°C": _scale(1.0), "degC": _scale(1.0), "C": _scale(1.0)})
FRACTION = Dimension(
    "fraction", "", "a plain number or a percentage", "5 %", {},
    {"%": _scale(0.01), "ppm": _scale(1e-6)},
)
TEMPERATURE_COEFFICIENT = Dimension(
    "temperature coefficient", "1/K", "ppm/K", "-30 ppm/K", {},
    {"ppm/K": _scale(1e-6), "ppm/°C": _scale(1e-6), "ppm/degC": _scale(1e-6),
     "%/K": _scale(1e-2), "%/°C": _scale(1e-2), "1/K": _scale(1.0)},
)
# AL, the inductance factor, in each unit the trade uses (common practice):
# nH/turn² (= nH/N²), µH per 100 turns (L = AL·(N/100)²) and mH per 1000 turns.
INDUCTANCE_FACTOR = Dimension(
    "inductance factor", "H/turn²", "henries per turn²", "63 nH/turn²",
    {"H/turn²": 1.0, "H/turn^2": 1.0, "H/N²": 1.0, "H/N^2": 1.0, "H/t²": 1.0, "H/t^2": 1.0},
    {"µH/100 turns": _scale(1e-6 / 100**2), "uH/100 turns": _scale(1e-6 / 100**2),
     "µH/100t": _scale(1e-6 / 100**2), "uH/100t": _scale(1e-6 / 100**2),
     "mH/1000 turns": _scale(1e-3 / 1000**2), "mH/1000t": _scale(1e-3 / 1000**2)},
    allow_bare_number=False,
)
DIMENSIONLESS = Dimension("number", "", "a plain number", "150", {}, {})


def parse_quantity(value: object, dimension: Dimension) -> float:
    """Return `value` in SI units as a finite float, or raise QuantityError saying why.

    Accepts a YAML number (taken in SI units, except where the dimension needs its unit)
    or text: a number, optional space, optional SI prefix, unit ("150pF", "2.2 kΩ").
    """
    if isinstance(value, bool) or not isinstance(value, (int, float, str)):
        raise QuantityError(f"{shown_input(value)} is not a {dimension.name} "
                            f"(expected {dimension.unit_name}, e.g. {dimension.example})")
    if isinstance(value, (int, float)):
        if not dimension.allow_bare_number:
            raise QuantityError(f"{value!r} has no unit (expected {dimension.unit_name}, "
                                f"e.g. {dimension.example})")
        return _finite(float(value), value, dimension)
    match = _NUMBER.match(value.replace("\u03bc", "\u00b5").replace("\u2126", "\u03a9"))
    if not match:
        raise QuantityError(f"{shown_input(value)} is not a {dimension.name} "
                            f"(expected {dimension.unit_name}, e.g. {dimension.example})")
    number, unit = float(match.group(1)), match.group(2)
    if unit in dimension.whole_units:
        return _finite(dimension.whole_units[unit](number), value, dimension)
    if unit == "":
        if not dimension.allow_bare_number:
            raise QuantityError(f"{shown_input(value)} has no unit (expected {dimension.unit_name}, "
                                f"e.g. {dimension.example})")
        return _finite(number, value, dimension)
    if unit in dimension.units:
        return _finite(number * dimension.units[unit], value, dimension)
    prefix, rest = unit[0], unit[1:]
    if dimension is FREQUENCY and unit == "mhz":
        raise QuantityError(f"{shown_input(value)} is ambiguous: did you mean "
                            f"{match.group(1)} MHz? write mHz for millihertz")
    factor = SI_PREFIXES.get(prefix, dimension.large_prefixes.get(prefix))
    if factor is not None and rest in dimension.units:
        return _finite(number * factor * dimension.units[rest], value, dimension)
    raise QuantityError(f"{shown_input(value)} is not a {dimension.name} "
                        f"(expected {dimension.unit_name}, e.g. {_example(match, dimension)})")


def _example(match: re.Match, dimension: Dimension) -> str:
    """The user's own number with the right unit where henries and farads were swapped."""
    number, unit = match.group(1), match.group(2)
    swapped = {"F", "H"}
    if dimension.si_unit in swapped and unit[:1] in SI_PREFIXES and unit[1:] in swapped:
        return f"{number} {unit[0]}{dimension.si_unit}"
    return dimension.example


def _finite(si_value: float, written: object, dimension: Dimension) -> float:
    if not math.isfinite(si_value):
        raise QuantityError(f"{shown_input(written)} is not a finite {dimension.name}")
    return si_value


ECHO_LIMIT = 60  # characters of a user's value a message quotes


def shortened(text: str, limit: int = ECHO_LIMIT) -> str:
    """`text` cut to `limit` characters, saying how long it was: a message never echoes a
    megabyte a hostile file or form field holds."""
    if len(text) <= limit:
        return text
    return f"{text[:limit]}… ({len(text):,} characters)"


def shown_input(value: object) -> str:
    """What the user wrote, as a message quotes it: text in quotes, numbers as written
    (either cut to ECHO_LIMIT characters)."""
    return f'"{shortened(value)}"' if isinstance(value, str) else shortened(repr(value))


class _Engineering(Quantity):
    """quantiphy with sheetgen's house rules: µ not u, trailing zeros kept."""


_Engineering.set_prefs(map_sf=Quantity.map_sf_to_greek, strip_zeros=False, spacer=" ",
                       prec=2, known_units=["Ω", "H", "F", "Hz", "V", "A", "W", "T", "m"])


# A zero is written bare, in the unit a part of that kind is usually written in (a
# capacitance in pF, a small inductance in nH): "0 pF", never "0.000 F".
_ZERO_UNIT_PREFIX = {"F": "p", "H": "n"}


def format_quantity(value_si: float | None, unit: str, digits: int = 3) -> str:
    """Engineering notation with `digits` significant figures: 4.7e-6, "H" → "4.70 µH".

    None (a value that does not apply) is shown as an em dash; zero as "0 pF".
    """
    if value_si is None or (isinstance(value_si, float) and math.isnan(value_si)):
        return "—"
    if not math.isfinite(value_si):
        return "∞" if value_si > 0 else "−∞"
    if value_si == 0:
        return f"0 {_ZERO_UNIT_PREFIX.get(unit, '')}{unit}".rstrip()
    return _Engineering(value_si, unit).render(prec=max(digits - 1, 0))


def format_number(value: float | None, digits: int = 3) -> str:
    """A plain number (Q, a ratio) to `digits` significant figures, no exponent when sane."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "—"
    if not math.isfinite(value):
        return "∞"
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    if -3 <= magnitude < 6:
        decimals = max(digits - 1 - magnitude, 0)
        return f"{value:.{decimals}f}"
    return f"{value:.{digits - 1}e}"
