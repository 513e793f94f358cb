"""Insulation distances of kilovolt points.

Sources: IEC 60664-1 Table F.5 (creepage by rms working voltage, pollution degree and
material group; a voltage between rows takes the next higher row) and Table A.2 (altitude
correction of clearances: 1.14 at 3000 m, 1.48 at 5000 m) — all figures from memory. The
RF clearance rule (2 mm per kV peak) is common practice, stated in engine/insulation.py.
"""

import math

import pytest

from sheetgen.engine.insulation import altitude_factor, creepage_mm, insulation_distances
from tests.support import assert_close


@pytest.mark.parametrize("rms_v, degree, group, expected_mm", [
    (250.0, 2, "III", 2.5),   # the row itself
    (250.1, 2, "III", 4.0),   # just above: the next row, 400 V
    (1000.0, 2, "III", 10.0),
    (1000.0, 2, "I", 5.0),
    (1000.0, 3, "III", 16.0),
    (1000.0, 1, "III", 3.2),  # pollution degree 1: one column for every group
])
def test_creepage_takes_the_next_row_of_table_f5(rms_v, degree, group, expected_mm):
    assert creepage_mm(rms_v, degree, group) == expected_mm


def test_creepage_beyond_the_table_is_not_guessed():
    assert creepage_mm(10_000.1, 2, "III") is None


@pytest.mark.parametrize("altitude_m, factor", [(0.0, 1.0), (2000.0, 1.0), (3000.0, 1.14),
                                                (5000.0, 1.48), (2500.0, 1.07)])
def test_altitude_factor_of_table_a2(altitude_m, factor):
    assert_close(altitude_factor(altitude_m), factor, abs=1e-9, what=f"factor at {altitude_m} m")


def test_clearance_grows_with_the_peak_and_the_altitude():
    low = insulation_distances(2000.0)
    high = insulation_distances(2000.0, altitude_m=3000.0)
    assert_close(low.clearance_mm, 4.0, rel=1e-12, what="2 kV peak at 2 mm/kV (common practice)")
    assert_close(high.clearance_mm, 4.0 * 1.14, rel=1e-12, what="the same at 3000 m")
    assert_close(low.voltage_rms_v, 2000.0 / math.sqrt(2.0), rel=1e-12, what="rms of the peak")
