"""Insulation distances for the kilovolt points of a tank: creepage along surfaces and
clearance through air, with the altitude correction.

Creepage: IEC 60664-1 Table F.5 (values from memory), by the rms working voltage, the
pollution degree and the insulating material's group; between the tabulated voltages the
next higher row is used, as the standard directs. Clearance for RF: no table of IEC
60664-1 covers steady RF directly (IEC 60664-4 deals with frequencies above 30 kHz and
warns that breakdown falls as the frequency rises), so the clearance follows the
common-practice rule stated at CLEARANCE_MM_PER_KV_PEAK; above 2000 m it is multiplied by the altitude
correction factor of IEC 60664-1 Table A.2 (from memory).
"""

from __future__ import annotations

import bisect
from dataclasses import dataclass
from typing import Literal

MaterialGroup = Literal["I", "II", "III"]

# IEC 60664-1 Table F.5, creepage in mm (from memory): rms voltage →
# (pollution degree 1 any group, PD2 group I, II, III, PD3 group I, II, III).
_CREEPAGE_ROWS_V = (250.0, 400.0, 500.0, 630.0, 800.0, 1000.0, 1250.0, 1600.0, 2000.0,
                    2500.0, 3200.0, 4000.0, 5000.0, 6300.0, 8000.0, 10000.0)
_CREEPAGE_MM = {
    (1, None): (0.56, 1.0, 1.3, 1.8, 2.4, 3.2, 4.2, 5.6, 7.5, 10.0, 12.5, 16.0, 20.0, 25.0,
                32.0, 40.0),
    (2, "I"): (1.25, 2.0, 2.5, 3.2, 4.0, 5.0, 6.3, 8.0, 10.0, 12.5, 16.0, 20.0, 25.0, 32.0,
               40.0, 50.0),
    (2, "II"): (1.8, 2.8, 3.6, 4.5, 5.6, 7.1, 9.0, 11.0, 14.0, 18.0, 22.0, 28.0, 36.0, 45.0,
                56.0, 71.0),
    (2, "III"): (2.5, 4.0, 5.0, 6.3, 8.0, 10.0, 12.5, 16.0, 20.0, 25.0, 32.0, 40.0, 50.0,
                 63.0, 80.0, 100.0),
    (3, "I"): (3.2, 5.0, 6.3, 8.0, 10.0, 12.5, 16.0, 20.0, 25.0, 32.0, 40.0, 50.0, 63.0,
               80.0, 100.0, 125.0),
    (3, "II"): (3.6, 5.6, 7.1, 9.0, 11.0, 14.0, 18.0, 22.0, 28.0, 36.0, 45.0, 56.0, 71.0,
                90.0, 110.0, 140.0),
    (3, "III"): (4.0, 6.3, 8.0, 10.0, 12.5, 16.0, 20.0, 25.0, 32.0, 40.0, 50.0, 63.0, 80.0,
                 100.0, 125.0, 160.0),
}
# Clearance through air for a steady RF peak voltage: 2 mm per kV peak, twice the ~1 mm/kV
# that a gap between wires and solder joints (an uneven field) withstands at RF; air in a
# uniform field withstands about 3 kV/mm at sea level (from memory). Common practice.
CLEARANCE_MM_PER_KV_PEAK = 2.0
# IEC 60664-1 Table A.2 (from memory): altitude, m → multiplication factor for clearances.
_ALTITUDE_M = (2000.0, 3000.0, 4000.0, 5000.0, 6000.0, 7000.0, 8000.0)
_ALTITUDE_FACTOR = (1.00, 1.14, 1.29, 1.48, 1.70, 1.95, 2.25)
DEFAULT_POLLUTION_DEGREE = 2  # ordinary indoor equipment (IEC 60664-1, from memory)
DEFAULT_MATERIAL_GROUP: MaterialGroup = "III"  # the worst group: any board or plastic
DEFAULT_ALTITUDE_M = 2000.0  # up to which IEC 60664-1 needs no correction
KILOVOLT_POINT_V = 1000.0  # from this peak voltage the sheet states the distances


@dataclass(frozen=True)
class InsulationDistances:
    """Distances to keep around one high-voltage point (mm), and how they were found."""

    voltage_peak_v: float
    voltage_rms_v: float
    creepage_mm: float | None  # None: beyond Table F.5's 10 kV
    clearance_mm: float
    altitude_factor: float
    pollution_degree: int
    material_group: MaterialGroup


def altitude_factor(altitude_m: float) -> float:
    """IEC 60664-1 Table A.2 factor, linear between the rows, 1 up to 2000 m."""
    if altitude_m <= _ALTITUDE_M[0]:
        return 1.0
    if altitude_m >= _ALTITUDE_M[-1]:
        return _ALTITUDE_FACTOR[-1]
    i = bisect.bisect_right(_ALTITUDE_M, altitude_m)
    x0, x1 = _ALTITUDE_M[i - 1], _ALTITUDE_M[i]
    y0, y1 = _ALTITUDE_FACTOR[i - 1], _ALTITUDE_FACTOR[i]
    return y0 + (y1 - y0) * (altitude_m - x0) / (x1 - x0)


def creepage_mm(voltage_rms_v: float, pollution_degree: int,
                material_group: MaterialGroup) -> float | None:
    """Table F.5's creepage for the next tabulated voltage at or above voltage_rms_v."""
    if pollution_degree not in (1, 2, 3):
        raise ValueError("pollution degree must be 1, 2 or 3")
    row = bisect.bisect_left(_CREEPAGE_ROWS_V, voltage_rms_v * (1 - 1e-12))
    if row >= len(_CREEPAGE_ROWS_V):
        return None
    key = (1, None) if pollution_degree == 1 else (pollution_degree, material_group)
    return _CREEPAGE_MM[key][row]


def insulation_distances(voltage_peak_v: float, *, pollution_degree: int = DEFAULT_POLLUTION_DEGREE,
                         material_group: MaterialGroup = DEFAULT_MATERIAL_GROUP,
                         altitude_m: float = DEFAULT_ALTITUDE_M,
                         dc_v: float = 0.0) -> InsulationDistances:
    """Creepage and clearance around a point at voltage_peak_v of sinusoidal RF riding on
    dc_v of DC: the clearance by the whole peak, V_dc + V̂; the creepage by the rms working
    voltage √(V_dc² + (V̂/√2)²) (the rms of a DC plus a sine), as Table F.5 is read."""
    rms = (dc_v * dc_v + voltage_peak_v * voltage_peak_v / 2.0) ** 0.5
    peak = voltage_peak_v + dc_v
    factor = altitude_factor(altitude_m)
    return InsulationDistances(peak, rms, creepage_mm(rms, pollution_degree, material_group),
                               CLEARANCE_MM_PER_KV_PEAK * peak / 1e3 * factor,
                               factor, pollution_degree, material_group)
