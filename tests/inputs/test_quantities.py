"""Engineering notation in and out.

Sources: SI prefixes and unit symbols, BIPM SI Brochure, 9th ed. (2019), table 7; the inch
(25.4 mm exactly) by the 1959 international yard and pound agreement; dBm as power relative
to 1 mW (IEC 60027-3, logarithmic quantities); AL in nH/turn², µH/100 turns and mH/1000 turns
as used in core catalogues (common practice: L = AL·N²).
"""

import math

import pytest

from sheetgen import quantities
from tests.support import assert_close

PARSED = [
    ("4.7 uH", quantities.INDUCTANCE, 4.7e-6), ("4.7 µH", quantities.INDUCTANCE, 4.7e-6),
    ("4.7 μH", quantities.INDUCTANCE, 4.7e-6), ("150pF", quantities.CAPACITANCE, 150e-12),
    ("7.1 MHz", quantities.FREQUENCY, 7.1e6), ("2.2 kohm", quantities.RESISTANCE, 2200.0),
    ("2.2 kΩ", quantities.RESISTANCE, 2200.0), ("2.2 kΩ", quantities.RESISTANCE, 2200.0),  # ohm sign U+2126
    ("100 mohm", quantities.RESISTANCE, 0.1), ("5 %", quantities.FRACTION, 0.05),
    ("0.1 %", quantities.FRACTION, 0.001), ("1e-6 F", quantities.CAPACITANCE, 1e-6),
    ("1 T", quantities.FLUX_DENSITY, 1.0), ("200 G", quantities.FLUX_DENSITY, 0.02),
    ("20 mT", quantities.FLUX_DENSITY, 0.02), ("10 mil", quantities.LENGTH, 254e-6),
    ("0.5 in", quantities.LENGTH, 0.0127), ("12.5 mm", quantities.LENGTH, 0.0125),
    ("30 dBm", quantities.POWER, 1.0), ("0 dBm", quantities.POWER, 1e-3), ("5 W", quantities.POWER, 5.0),
    ("-30 ppm/K", quantities.TEMPERATURE_COEFFICIENT, -30e-6), ("-40 °C", quantities.TEMPERATURE, -40.0),
    ("63 nH/turn²", quantities.INDUCTANCE_FACTOR, 63e-9),
    ("4.9 µH/100 turns", quantities.INDUCTANCE_FACTOR, 4.9e-10),
    ("49 mH/1000 turns", quantities.INDUCTANCE_FACTOR, 49e-9),
    (150, quantities.DIMENSIONLESS, 150.0), (2200, quantities.RESISTANCE, 2200.0),
]


@pytest.mark.parametrize("text, dimension, expected", PARSED)
def test_parse(text, dimension, expected):
    assert_close(quantities.parse_quantity(text, dimension), expected, rel=1e-12, what=str(text))


def test_al_units_agree_with_each_other():
    """Common practice: 1 mH/1000 turns = 1 nH/turn², 1 µH/100 turns = 0.1 nH/turn²."""
    one = quantities.parse_quantity("1 nH/turn²", quantities.INDUCTANCE_FACTOR)
    assert_close(quantities.parse_quantity("1 mH/1000 turns", quantities.INDUCTANCE_FACTOR), one, rel=1e-12)
    assert_close(quantities.parse_quantity("10 µH/100 turns", quantities.INDUCTANCE_FACTOR), one, rel=1e-12)


@pytest.mark.parametrize("text, dimension, fragment", [
    ("40 pH", quantities.CAPACITANCE, '"40 pH" is not a capacitance (expected farads, e.g. 40 pF)'),
    ("1 T", quantities.FREQUENCY, "is not a frequency"),
    ("1 mil", quantities.FREQUENCY, "is not a frequency"),
    ("banana", quantities.RESISTANCE, '"banana" is not a resistance'),
    (True, quantities.RESISTANCE, "True is not a resistance"),
    (float("nan"), quantities.RESISTANCE, "not a finite resistance"),
    ("1e999 F", quantities.CAPACITANCE, "not a finite capacitance"),
    (49, quantities.INDUCTANCE_FACTOR, "has no unit"),
])
def test_refused(text, dimension, fragment):
    with pytest.raises(quantities.QuantityError) as caught:
        quantities.parse_quantity(text, dimension)
    assert fragment in str(caught.value)


@pytest.mark.parametrize("value, unit, digits, expected", [
    (4.7e-6, "H", 3, "4.70 µH"), (150e-12, "F", 3, "150 pF"), (2200.0, "Ω", 3, "2.20 kΩ"),
    (7.1e6, "Hz", 4, "7.100 MHz"), (0.02, "T", 3, "20.0 mT"), (None, "V", 3, "—"),
])
def test_format(value, unit, digits, expected):
    assert quantities.format_quantity(value, unit, digits) == expected


@pytest.mark.parametrize("value, expected", [(180.0, "180"), (47.3333, "47.3"), (0.5, "0.500"),
                                             (4907.2, "4907"), (None, "—")])
def test_format_number(value, expected):
    assert quantities.format_number(value, 3) == expected


def test_round_trip_of_formatted_values():
    """What the sheet prints, a job file can read back (within the printed precision)."""
    for value, dimension in [(4.7e-6, quantities.INDUCTANCE), (228.4e-12, quantities.CAPACITANCE),
                             (17.67e3, quantities.RESISTANCE), (7.1e6, quantities.FREQUENCY)]:
        text = quantities.format_quantity(value, dimension.si_unit, 4)
        assert math.isclose(quantities.parse_quantity(text, dimension), value, rel_tol=5e-4), text



@pytest.mark.parametrize("text, expected", [("1 THz", 1e12), ("2 PHz", 2e15), ("1e12 Hz", 1e12),
                                            ("13.56 Mhz", 13.56e6), ("455 khz", 455e3),
                                            ("10 mHz", 10e-3)])
def test_frequency_prefixes_up_to_peta(text, expected):
    """BIPM SI Brochure table 7: T = 10¹², P = 10¹⁵; a frequency takes them as 1e12 Hz is
    taken (plausibility judges the value, not the parser)."""
    assert_close(quantities.parse_quantity(text, quantities.FREQUENCY), expected, rel=1e-12, what=text)


@pytest.mark.parametrize("text, dimension", [("100 PF", quantities.CAPACITANCE), ("1 TH", quantities.INDUCTANCE)])
def test_large_prefixes_stay_refused_where_they_are_a_typo(text, dimension):
    """"100 PF" is a mistyped 100 pF far more often than 0.1 EF: only frequency takes T and P."""
    with pytest.raises(quantities.QuantityError):
        quantities.parse_quantity(text, dimension)


def test_lower_case_mhz_is_refused_as_ambiguous():
    """"mhz" reads as millihertz by the SI letter case (BIPM table 7) but is almost always a
    mistyped MHz: refused with both readings offered."""
    with pytest.raises(quantities.QuantityError) as caught:
        quantities.parse_quantity("13.56 mhz", quantities.FREQUENCY)
    message = str(caught.value)
    assert "did you mean 13.56 MHz?" in message and "mHz for millihertz" in message
