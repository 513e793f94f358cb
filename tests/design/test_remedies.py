"""Every remedy that names a drive is re-checked by the engine: set the drive to it and the
check passes; 2 % beyond it, it fails.

Source of the expectation: linearity of the circuit (every voltage and current is
proportional to the source's EMF or current, every power to its square — any circuit
textbook); the re-check runs the whole design again, not the remedy's formula.
"""

import re
from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file

ROOT = Path(__file__).resolve().parents[2]
POWER_TANK = (ROOT / "templates" / "power-tank.yaml").read_text(encoding="utf-8")
DEMO = (ROOT / "templates" / "demo.yaml").read_text(encoding="utf-8")
PARALLEL = (ROOT / "templates" / "parallel.yaml").read_text(encoding="utf-8")

DRIVE_LINE = re.compile(r"^(  (?:available_power|voltage|current):)\s*[^\n#]*", re.M)

CASES = {
    "power tank, low voltage rating (available power)":
        POWER_TANK.replace("rated_voltage: 3 kV ", "rated_voltage: 400 V "),
    "power tank, low current rating (available power)":
        POWER_TANK.replace("rated_current: 10 A", "rated_current: 1 A"),
    "power tank, thin wire (available power)":
        POWER_TANK.replace("wire: AWG 4", "wire: AWG 22"),
    "demo, low voltage rating (voltage drive)":
        DEMO.replace("rated_voltage: 100 V", "rated_voltage: 0.5 V"),
    "parallel, low current rating (current drive)":
        PARALLEL.replace("capacitor:\n", "capacitor:\n  rated_current: 1 mA\n", 1),
}


def _design(tmp_path, text, name="job.yaml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return design_from_file(path, ROOT / "shared")


def _with_drive(text: str, value: float) -> str:
    return DRIVE_LINE.sub(lambda m: f"{m.group(1)} {value!r} ", text, count=1)


def _check(design, part, quantity):
    return next(c for c in design.assessment.ratings
                if c.part == part and c.quantity == quantity)


@pytest.mark.parametrize("case", sorted(CASES))
def test_remedy_drive_passes_and_two_percent_more_fails(tmp_path, case):
    text = CASES[case]
    failing = [c for c in _design(tmp_path, text).assessment.ratings if c.status == "fail"]
    assert failing, f"{case}: the case must fail a rating to test its remedy"
    for check in failing:
        remedy = check.remedy
        assert remedy.drive_max is not None, f"{case}: {check.part} {check.quantity}"
        at = _check(_design(tmp_path, _with_drive(text, remedy.drive_max * (1 - 1e-9))),
                    check.part, check.quantity)
        assert at.passed, (f"{case}: {check.part} {check.quantity} at the remedy's drive "
                           f"{remedy.drive_max!r}: {at.actual!r} > {at.allowed!r}")
        beyond = _check(_design(tmp_path, _with_drive(text, remedy.drive_max * 1.02)),
                        check.part, check.quantity)
        assert not beyond.passed, f"{case}: 2 % beyond the remedy still passes"
