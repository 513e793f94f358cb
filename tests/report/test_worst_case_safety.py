"""Safety states the worst case: the cautions, the insulation distances and every rating
use the load-open case the sheet computes, plus the DC each part actually sits at.

Sources: hand-worked arithmetic below (a voltage divider of the source resistance and the
tank's dynamic resistance; the open-load tank voltage itself is checked against ngspice in
tests/design/test_as_built_ngspice.py); IEC 60664-1 Table F.5 creepage (values from
memory); the clearance rule of 2 mm per kV peak (common practice); IEC 61140's 1500 V DC
upper limit of low voltage (from memory).
"""

import math
from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine.ratings import capacitor_voltage_check
from sheetgen.engine.stress import dc_feed
from sheetgen.report.cautions import design_cautions
from sheetgen.report.rows import rating_rows
from tests.support import assert_close

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"


def _tank(tmp_path, circuit_lines: str = ""):
    text = (TEMPLATES / "power-tank.yaml").read_text(encoding="utf-8")
    if circuit_lines:
        text = text.replace("circuit:\n", "circuit:\n" + circuit_lines, 1)
    path = tmp_path / "tank.yaml"
    path.write_text(text, encoding="utf-8")
    return design_from_file(path)


def _by_code(found):
    return {c.code: c for c in found}


def test_the_headline_is_the_load_open_peak(tmp_path):
    """Reproduction: the cautions said "Up to 616 V peak" while the ratings checked the
    capacitors at 1.21 kV peak with the load open. By hand: 100 W available from 2 kΩ is
    an EMF of 2√(100·2000) = 894.4 V rms; with the load open the tank is its dynamic
    resistance Rd at the peak, so V = 894.4·Rd/(2000 + Rd) (Rd ≈ 42.85 kΩ: 854.5 V rms,
    1.208 kV peak)."""
    d = _tank(tmp_path)
    rd = d.resonance.dynamic_resistance_ohm
    peak = math.sqrt(2) * 2 * math.sqrt(100 * 2000) * rd / (2000 + rd)
    assert_close(peak, 1208.0, rel=2e-3, what="hand-worked open-load peak")
    first = design_cautions(d)[0]
    assert first.code == "covers-interlocks"
    assert first.text.startswith("Up to 1.21 kV peak (855 V rms) on C1, C2 and C3 with the "
                                 "load open (616 V peak as driven)"), first.text
    rated = {c.part: c.actual for c in d.assessment.ratings if c.quantity == "peak voltage"}
    assert_close(rated["C1"], peak, rel=2e-3, what="C1 rated at the same case")
    assert "with the load open" in rating_rows(d)[0].remark


def test_a_kilovolt_load_open_peak_gets_its_clearances(tmp_path):
    """1.208 kV peak = 854.5 V rms with the load open: IEC 60664-1 Table F.5 (from memory),
    the 1000 V row, pollution degree 2, material group III: 10 mm; clearance 2 mm/kV peak
    (common practice): 2.4 mm. As driven (616 V peak) nothing would be said."""
    found = _by_code(design_cautions(_tank(tmp_path)))
    text = found["insulation-distances"].text
    assert "with the load open" in text
    assert "at least 10 mm along insulating surfaces" in text
    assert "at least 2.4 mm through air" in text


@pytest.mark.parametrize("blocked, capacitor_peak_kv", [(False, 1.21), (True, 4.21)])
def test_a_dc_supply_is_in_the_ratings_and_the_clearance(tmp_path, blocked,
                                                         capacitor_peak_kv):
    """3 kV DC on the tank. Fed through the coil (no blocking capacitor) the coil holds
    both ends of C1 at the supply: C1 sees the RF alone (1.21 kV peak); with a blocking
    capacitor in series with the coil C1 is charged to the supply: 3 kV + 1.21 kV =
    4.21 kV peak. Either way the tank is at 4.21 kV peak against the chassis: clearance
    2 mm/kV × 4.21 = 8.4 mm (common practice); creepage by the rms working voltage
    √(3000² + 854²) = 3119 V → Table F.5's 3200 V row, PD2, group III: 32 mm (from
    memory). 3 kV DC is above IEC 61140's 1500 V: DANGER."""
    lines = "  dc_voltage: 3 kV\n" + ("  dc_blocked: true\n" if blocked else "")
    d = _tank(tmp_path, lines)
    rated = {c.part: c for c in d.assessment.ratings if c.quantity == "peak voltage"}
    assert_close(rated["C1"].actual / 1e3, capacitor_peak_kv, abs=0.006, what="C1 peak, kV")
    assert_close(rated["C3"].actual / 1e3, capacitor_peak_kv, abs=0.006, what="trimmer peak")
    found = _by_code(design_cautions(d))
    distances = found["insulation-distances"].text
    assert "4.21 kV peak against the chassis" in distances
    assert "at least 32 mm along insulating surfaces" in distances
    assert "at least 8.4 mm through air" in distances
    assert found["dc-supply"].level == "danger"
    assert found["covers-interlocks"].text.startswith("Up to 4.21 kV peak on C1, C2 and C3 "
                                                       "against the chassis with the load open")
    said = found["dc-supply"].text
    assert ("blocking capacitor" in said) == blocked
    assert ("RF alone" in said) == (not blocked)


def test_which_parts_see_the_dc_for_each_feed():
    """By the arrangement the job describes (circuit.dc_voltage, circuit.dc_blocked)."""
    through_coil = dc_feed("parallel", 3000.0, False)
    assert (through_coil.across_capacitor_v, through_coil.to_chassis_v,
            through_coil.across_blocking_v) == (0.0, 3000.0, None)
    blocked = dc_feed("parallel", 3000.0, True)
    assert (blocked.across_capacitor_v, blocked.across_blocking_v) == (3000.0, 3000.0)
    assert dc_feed("series", 100.0, False).across_capacitor_v == 100.0
    assert dc_feed("parallel", None, True) is None


def test_a_capacitor_check_with_dc_scales_only_the_rf_in_its_drive_remedy():
    """1 kV RF peak on 300 V DC against 1 kV × 0.5 = 500 V allowed: 1.3 kV, fails; the RF
    may rise to 500 − 300 = 200 V, a fifth, so the drive power falls to 1/25: 100 W → 4 W
    (a voltage drive to a fifth); two parts in series would not do, ⌈1300/500⌉ = 3."""
    check = capacitor_voltage_check("C1", 1000.0, 1000.0, derating=0.5, drive_power_w=100.0,
                                    dc_v=300.0)
    assert not check.passed and check.actual == 1300.0
    assert_close(check.remedy.drive_power_max_w, 4.0, rel=1e-12, what="drive that passes")
    assert check.remedy.parts_needed == 3
    none = capacitor_voltage_check("C1", 100.0, 1000.0, derating=0.5, drive_power_w=1.0,
                                   dc_v=600.0)
    assert not none.passed and none.remedy.drive_power_max_w is None, \
        "the DC alone is over: no drive passes"
