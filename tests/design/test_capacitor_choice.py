"""The capacitor choice through the command line, for a job that gives a capacitance that is
itself a standard value (IEC 60063 E12: 56 pF is in the list)."""

import json

from sheetgen.cli import main

JOB = """\
sheet:
  id: TS-0056
  title: Tank with a standard capacitor
  revision: A
  designer: Test
  date: 2026-12-01
circuit:
  topology: parallel
inductor:
  form: given
  inductance: 10 uH
  q: 100
  tolerance: 0.1 %     # a selected coil (omit: a bought coil's ±10 % is assumed)
capacitor:
  capacitance: {c}
  tolerance: 0.1 %     # a selected part: no trimmer is needed to stay in the band
  dielectric: C0G
  dissipation_factor: 0.1 %
  preferred_series: E12
source:
  current: 1 mA
"""


def test_a_standard_value_given_as_the_capacitance_checks(tmp_path, capsys):
    """56 pF is in E12 (IEC 60063): the check runs, and the nearest and the chosen parts are
    that very value, one part."""
    job = tmp_path / "tank.yaml"
    job.write_text(JOB.format(c="56 pF"), encoding="utf-8")
    code = main(["check", str(job), "--json"])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    assert code == 0, out.err
    got = json.loads(out.out)
    build = got["components"]["capacitor_build"]
    assert abs(build["fixed_total_f"] / 56e-12 - 1) < 1e-12, build  # the part given, fitted
