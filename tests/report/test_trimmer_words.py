"""No negative capacitance is ever printed: where the fixed part alone already exceeds the
capacitance for f0 in some builds, the sheet says so and says to choose a smaller part.

Check by hand (Thomson's formula, C = 1/((2π f0)² L)): the toroid starter needs about
478 pF at 3.55 MHz with 4.2 µH; a 408 pF fixed pair at ±20 % reaches 490 pF, above it, so
some builds need a negative trimmer capacitance, which no trimmer has.
"""

import re

from sheetgen.cli import main
from tests.cli.test_bad_input import TEMPLATES

NEGATIVE_CAPACITANCE = re.compile(r"(?<![\deE])[-\u2212]\s*\d[\d.,]*(?:e[-+]?\d+)?\s*[afpnuµm]?F\b")


def test_fixed_part_beyond_f0_is_worded_not_negative(tmp_path, capsys):
    text = (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8")
    assert "  tolerance: 2 %" in text
    job = tmp_path / "job.yaml"
    job.write_text(text.replace("  tolerance: 2 %", "  tolerance: 20 %"), encoding="utf-8")
    assert main(["check", str(job)]) == 1
    captured = capsys.readouterr()
    printed = captured.out + captured.err
    assert not NEGATIVE_CAPACITANCE.findall(printed), NEGATIVE_CAPACITANCE.findall(printed)
    failure = next(line for line in captured.err.splitlines()
                   if line.startswith("check failed: capacitor.trimmer: "))
    assert "the fixed capacitors alone already exceed the capacitance for f0" in failure
    assert "choose a smaller fixed part" in failure
    row = next(line for line in captured.out.splitlines() if "Trimmer capacitance needed" in line)
    assert "fixed part alone exceeds" in row, row
