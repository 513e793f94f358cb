"""Values no lumped tuned circuit is built with are failed checks (exit 1) with a remedy.

Bounds and their basis (sheetgen/design/plausibility.py): lumped LC tanks from 1 kHz to
1 GHz (common practice); 1 nH (about 1 nH per mm of lead, from memory) to 1 H; 0.1 pF
(strays of 0.1 … 1 pF, common practice) to 100 µF; loaded Q of at least ½ (critical damping
of a second-order circuit, textbook); peak voltage at most 3 MV/m (breakdown of air at sea
level, from memory) × 10 mm = 30 kV.
"""

import json

import pytest

from sheetgen.cli import main
from sheetgen.design.pipeline import design_from_file
from sheetgen.inputs.starters import TEMPLATE_NAMES
from tests.cli.test_bad_input import GOOD, TEMPLATES, _edit

NO_LOAD = GOOD.split("\nload:")[0] + "\n"
NO_TARGET = _edit("  targets:\n    f0: 13.56 MHz\n", "")

# Values inside the physical ranges (inputs/model.py PHYSICAL_RANGES) but outside what a
# tuned circuit plausibly holds; beyond the physical ranges a value is bad input
# (tests/inputs/test_physical_ranges.py).
CASES = [  # (case, job text, field at fault, fragment of the sentence)
    ("10 H coil", _edit("inductance: 10 uH", "inductance: 10 H"),
     "inductor.inductance", "is above 1.00 H"),
    ("10 H from a bare number", _edit("inductance: 10 uH", "inductance: 10"),
     "inductor.inductance", "a bare number is in henries"),
    ("1.4e-17 F computed", _edit("inductance: 10 uH", "inductance: 10 H"),
     "inductor.inductance", "the capacitance computed for f0 with this inductance"),
    ("1 F given", NO_TARGET.replace("  esr: 0.05 ohm", "  capacitance: 1 F\n  esr: 0.05 ohm"),
     "capacitor.capacitance", "is above 100 µF"),
    ("Q 0.00003 of a 1 F tank", NO_TARGET.replace("  esr: 0.05 ohm",
                                                 "  capacitance: 1 F\n  esr: 0.05 ohm"),
     "load.resistance", "overdamped"),
    ("5e9 Hz", _edit("f0: 13.56 MHz", "f0: 5e9 Hz"), "circuit.targets.f0", "above 1.00 GHz"),
    ("0.005 THz", _edit("f0: 13.56 MHz", "f0: 0.005 THz"), "circuit.targets.f0", "above 1.00 GHz"),
    ("1 Hz", _edit("f0: 13.56 MHz", "f0: 1 Hz"), "circuit.targets.f0", "below 1.00 kHz"),
    ("kilofarads for 1 Hz", _edit("f0: 13.56 MHz", "f0: 1 Hz"), "inductor.inductance",
     "2.53 kF, is above 100 µF"),
    ("100 pH", _edit("inductance: 10 uH", "inductance: 100 pH"), "inductor.inductance",
     "below 1.00 nH"),
    ("100 MHz bandwidth", NO_LOAD.replace("f0: 13.56 MHz", "f0: 13.56 MHz\n    bandwidth: 100 MHz"),
     "circuit.targets.bandwidth", "ask for a bandwidth of at most"),
    ("loaded Q 1e-11", NO_LOAD.replace("f0: 13.56 MHz", "f0: 13.56 MHz\n    loaded_q: 1e-11"),
     "circuit.targets.loaded_q", "at least 0.500"),
    ("1e11 ohm source", _edit("resistance: 50 ohm\n  available", "resistance: 1e11 ohm\n  available"),
     "load.resistance", "the resistances in the loop swamp the reactance"),
    ("megavolts", _edit("available_power: 1 W", "available_power: 5 MW"),
     "source.available_power", "above 30.0 kV"),
]


@pytest.mark.parametrize("case, text, field, fragment", CASES, ids=[c[0] for c in CASES])
def test_implausible_design_fails_its_checks(tmp_path, capsys, case, text, field, fragment):
    job = tmp_path / "job.yaml"
    job.write_text(text, encoding="utf-8")
    assert main(["check", str(job)]) == 1
    captured = capsys.readouterr()
    assert "all pass" not in captured.out
    lines = [line for line in captured.err.splitlines() if line.startswith("check failed: ")]
    assert any(line.startswith(f"check failed: {field}: ") and fragment in line
               for line in lines), lines
    assert main(["check", str(job), "--json"]) == 1
    checks = json.loads(capsys.readouterr().out)["checks"]
    assert any(c["code"] == "implausible" and c["field"] == field for c in checks), checks


@pytest.mark.parametrize("name", TEMPLATE_NAMES + ("demo",))
def test_the_starters_are_plausible(name):
    """The shipped starters describe buildable circuits: none crosses a bound."""
    assert design_from_file(TEMPLATES / f"{name}.yaml").plausibility == ()


def test_coil_above_its_self_resonance_is_refused_at_the_inductor(tmp_path, capsys):
    """Above its self-resonance a coil is capacitive and its Q is zero (Medhurst's
    self-capacitance, engine/coil.py); a 1.8 µH single-layer coil self-resonates well below
    500 MHz, so the loss X0/Q cannot be formed: refused, naming the coil, no traceback."""
    text = (TEMPLATES / "solenoid.yaml").read_text(encoding="utf-8")
    assert "    f0: 14.2 MHz" in text and "  trimmer:" in text
    text = "".join(line for line in text.splitlines(keepends=True)
                   if not line.startswith("  trimmer:"))
    job = tmp_path / "job.yaml"
    job.write_text(text.replace("    f0: 14.2 MHz", "    f0: 500 MHz"), encoding="utf-8")
    code = main(["check", str(job)])
    err = capsys.readouterr().err
    assert code == 2 and "Traceback" not in err
    # refused where the analysis first meets it: the coil's Q at f0, or the loaded Q it
    # can no longer reach once its self-capacitance is counted in the tuning
    assert (" inductor: " in err and "self-resonance" in err) or \
        (" circuit.targets: " in err and "cannot be reached" in err), err
