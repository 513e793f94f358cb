"""Preferred values against IEC 60063:2015 (lists typed from the standard's tables; the E48
and E96 rows are from memory) and the best parallel pair against exhaustive search."""

import itertools

import pytest

from sheetgen.engine.standard_values import best_parallel_pair, nearest_standard, series_values
from tests.support import assert_close

IEC_60063 = {
    "E6": "1.0 1.5 2.2 3.3 4.7 6.8",
    "E12": "1.0 1.2 1.5 1.8 2.2 2.7 3.3 3.9 4.7 5.6 6.8 8.2",
    "E24": "1.0 1.1 1.2 1.3 1.5 1.6 1.8 2.0 2.2 2.4 2.7 3.0 3.3 3.6 3.9 4.3 4.7 5.1 5.6 "
           "6.2 6.8 7.5 8.2 9.1",
    "E48": "1.00 1.05 1.10 1.15 1.21 1.27 1.33 1.40 1.47 1.54 1.62 1.69 1.78 1.87 1.96 2.05 "
           "2.15 2.26 2.37 2.49 2.61 2.74 2.87 3.01 3.16 3.32 3.48 3.65 3.83 4.02 4.22 4.42 "
           "4.64 4.87 5.11 5.36 5.62 5.90 6.19 6.49 6.81 7.15 7.50 7.87 8.25 8.66 9.09 9.53",
}


@pytest.mark.parametrize("name", sorted(IEC_60063))
def test_series_lists(name):
    assert series_values(name) == tuple(float(v) for v in IEC_60063[name].split())


def test_e192_has_the_920_exception_and_contains_e96():
    """IEC 60063: E192 lists 9.20 (not the rounded 9.19); each E96 value is in E192."""
    e192 = series_values("E192")
    assert 9.20 in e192 and 9.19 not in e192 and len(e192) == 192
    assert set(series_values("E96")) <= set(e192)


@pytest.mark.parametrize("value, name, expected", [
    (228.4e-12, "E12", 220e-12), (4.6e-6, "E6", 4.7e-6), (9.6e-9, "E24", 10e-9),
    (1.0e-12, "E12", 1.0e-12), (3.55, "E24", 3.6), (138e-12, "E96", 137e-12),
])
def test_nearest_standard(value, name, expected):
    assert_close(nearest_standard(value, name), expected, rel=1e-12, what="nearest")


@pytest.mark.parametrize("target", [228.4e-12, 13.78e-12, 556.2e-12, 1.234e-9, 47.0e-12])
def test_best_pair_is_the_exhaustive_optimum(target):
    """Brute force over every pair of E12 values from 1 pF to 10 nF: none beats the pick."""
    values = [m * 10.0 ** k for k in range(-12, -8) for m in series_values("E12")]
    best = min([abs(v / target - 1) for v in values]
               + [abs((a + b) / target - 1) for a, b in itertools.combinations_with_replacement(values, 2)])
    pick = best_parallel_pair(target, "E12")
    assert abs(pick.total / target - 1) <= best + 1e-9
    assert_close(pick.total, pick.first + (pick.second or 0.0), rel=1e-12, what="sum")


# Every value of E6 … E48 (the lists above, typed from IEC 60063) over fourteen decades,
# 1 pF … 10 mF: 90 (series, value) entries a decade, 1 260 in all.
EVERY_LISTED_VALUE = [(name, float(m) * 10.0 ** k) for name, text in IEC_60063.items()
                      for m in text.split() for k in range(-12, 2)]


def test_every_listed_standard_value_is_its_own_single_part():
    """A target that is itself a standard value is fitted as that one part (IEC 60063: it is
    in the list), exact, with no second part; m·10^k's binary noise must not ask for a
    second part of zero."""
    assert len(EVERY_LISTED_VALUE) == 1260
    for name, target in EVERY_LISTED_VALUE:  # m·10^k as computed, binary noise and all
        pick = best_parallel_pair(target, name, 0.0)
        assert pick.second is None, (name, target, pick)
        assert_close(pick.total, target, rel=1e-12, what=f"{name} {target!r}")


@pytest.mark.parametrize("tolerance", [0.0, 0.02, 0.10])
def test_pair_only_when_it_beats_the_single_part_by_more_than_the_tolerance(tolerance):
    """Brute force over E12 pairs from 0.1 pF: the pick is the single nearest part unless some
    pair with a second part of at least 0.5 pF (below that strays dominate, common practice)
    comes closer by more than the parts' tolerance, and then no such pair beats the pick."""
    values = [m * 10.0 ** k for k in range(-13, -8) for m in series_values("E12")]
    for target in [1.37e-12, 2.05e-12, 13.78e-12, 228.4e-12, 556.2e-12, 1.234e-9, 4.3e-9]:
        single = nearest_standard(target, "E12")
        single_error = abs(single / target - 1)
        pairs = [abs((a + b) / target - 1) for a, b in itertools.combinations_with_replacement(
            values, 2) if min(a, b) >= 0.5e-12]
        best_pair = min(pairs)
        pick = best_parallel_pair(target, "E12", tolerance)
        if single_error - best_pair > tolerance + 1e-9:
            assert pick.second is not None and pick.second >= 0.5e-12
            assert abs(pick.total / target - 1) <= best_pair + 1e-9
        elif single_error - best_pair < tolerance - 1e-9:
            assert pick.second is None and pick.first == single


def test_second_part_never_below_half_a_picofarad():
    """Targets a fraction of a picofarad above a standard value: the remainder is not worth
    a part (strays of a few tenths of a pF, common practice), so no second part under 0.5 pF."""
    for target in [10.2e-12, 100.3e-12, 1.0004e-9, 47.4e-12]:
        pick = best_parallel_pair(target, "E24")
        assert pick.second is None or pick.second >= 0.5e-12, (target, pick)
