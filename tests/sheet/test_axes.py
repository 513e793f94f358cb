"""A frequency axis for any range: labels in an SI prefix (BIPM SI Brochure table 7), ticks
inside the range, never an exception (the millihertz sweep of a mistyped "mhz" used to raise
StopIteration here)."""

import pytest

from sheetgen.sheet.plots import frequency_axis


@pytest.mark.parametrize("low, high, title", [
    (12.2e-3, 14.9e-3, "Frequency (mHz)"),
    (1e-15, 3e-15, "Frequency (fHz)"),
    (0.5, 0.9, "Frequency (mHz)"),
    (12.2e6, 14.9e6, "Frequency (MHz)"),
    (0.9e12, 1.1e12, "Frequency (THz)"),
    (2e15, 3e15, "Frequency (PHz)"),
])
def test_axis_for_any_decade(low, high, title):
    axis = frequency_axis(low, high, 5)
    assert axis.title == title
    assert 2 <= len(axis.ticks) <= 12, axis.ticks
    assert all(low <= t <= high * (1 + 1e-12) for t in axis.ticks), axis.ticks
    assert len(set(axis.labels)) == len(axis.labels), axis.labels


@pytest.mark.parametrize("low, high", [(5e6, 5e6), (0.0, 0.0), (3.0, 1.0)])
def test_degenerate_range_still_gives_an_axis(low, high):
    axis = frequency_axis(low, high, 5)
    assert axis.high > axis.low and axis.ticks
