"""The fail dispositions: the effect of one turn and of the next standard capacitor, checked
with Thomson's formula f0 = 1/(2π√(LC)) and AL's definition L = AL·N² (IEC 60205), and
the E12 ladder of IEC 60063 (…, 330, 390, 470, … pF)."""

import math
import re
from pathlib import Path

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.rework import RETURN_TO_ENGINEERING, rework_rows
from tests.support import assert_close

ROOT = Path(__file__).resolve().parents[2]


def _khz(text: str, pattern: str) -> float:
    match = re.search(pattern, text)
    assert match, (pattern, text)
    return float(match.group(1).replace("\u2212", "-"))


def test_one_turn_and_one_capacitor_step_move_f0_as_thomson_says():
    design = design_from_file(ROOT / "templates" / "toroid.yaml", ROOT / "shared")
    f0 = {r.key: r for r in rework_rows(design)}["f0"].actions
    coil, c = design.coil.result, design.circuit.capacitance_f
    n = coil.turns

    def thomson(l_h, c_f):
        return 1.0 / (2.0 * math.pi * math.sqrt(l_h * c_f))

    l_n = coil.al_h_per_turn2 * n * n
    base = thomson(l_n, c)
    for turns, pattern in ((n + 1, r"add one turn to L1 \(moves f0 by ([−+-][\d.]+) kHz"),
                           (n - 1, r"take one turn off \(moves f0 by ([−+-][\d.]+) kHz")):
        expected_khz = (thomson(coil.al_h_per_turn2 * turns**2, c) - base) / 1e3
        assert_close(_khz(f0, pattern), expected_khz, abs=0.06, what=f"{turns} turns, kHz")
    first = design.capacitor_choice.pair.first
    assert_close(first, 390e-12, rel=1e-9, what="the starter's fixed part (E12)")
    for new_pf, word in ((470, "up"), (330, "down")):
        assert f"change C1 to {new_pf} pF (the next E12 value {word}" in f0
        expected_khz = (thomson(l_n, c - first + new_pf * 1e-12) - base) / 1e3
        got = _khz(f0, rf"next E12 value {word}; moves f0 by ([−+-][\d.]+) kHz")
        assert_close(got, expected_khz, abs=0.06, what=f"C1 → {new_pf} pF, kHz")


def test_every_record_value_has_a_disposition_and_a_stop_rule():
    design = design_from_file(ROOT / "templates" / "series.yaml")
    assert [r.key for r in rework_rows(design)] == ["inductance", "capacitance", "f0",
                                                    "bandwidth"]
    assert "return the unit to engineering" in RETURN_TO_ENGINEERING


def test_the_turn_count_rule_fits_the_coil_form():
    """A ring core's turn is a pass through its hole; a solenoid's is a full turn round the
    former, which has no centre to pass through (before, the solenoid starter printed the
    ring-core rule)."""
    for name, own, other in (("toroid", "each pass through the centre is one",
                              "round the former"),
                             ("solenoid", "each full turn round the former is one",
                              "pass through the centre")):
        design = design_from_file(ROOT / "templates" / f"{name}.yaml", ROOT / "shared")
        inductance = next(r for r in rework_rows(design) if r.key == "inductance")
        assert own in inductance.actions and other not in inductance.actions, name
