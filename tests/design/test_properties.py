"""Any valid job, however extreme its values, is answered: exit 0, 1 or 2 through the CLI,
never a traceback, and no negative capacitance in what is printed.

Jobs are the series and parallel starters with L, C, coil Q, Rs, RL and the targets drawn
log-uniformly over many decades, inside and far outside the plausible ranges
(sheetgen/design/plausibility.py). Hypothesis (property-based testing) draws them.
"""

import re
import tempfile
from pathlib import Path

import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from sheetgen.cli import main
from tests.cli.test_bad_input import TEMPLATES

NEGATIVE_CAPACITANCE = re.compile(r"(?<![\deE])[-\u2212]\s*\d[\d.,]*(?:e[-+]?\d+)?\s*[yzafpnuµm]?F\b")


def _decades(low: int, high: int):
    return st.floats(min_value=low, max_value=high).map(lambda exponent: 10.0 ** exponent)


@st.composite
def jobs(draw):
    topology = draw(st.sampled_from(["series", "parallel"]))
    job = yaml.safe_load((TEMPLATES / f"{topology}.yaml").read_text(encoding="utf-8"))
    job["sheet"]["date"] = "2026-12-01"
    job["variation"] = {"trials": 2000}
    job.pop("sweep", None)
    inductor = {"form": "given"}
    capacitor = {k: v for k, v in job["capacitor"].items() if not k.startswith("rated_")}
    mode = draw(st.sampled_from(["L and f0", "C and f0", "L and C"]))
    targets = {}
    if mode != "L and C":
        targets["f0"] = draw(_decades(-3, 13))
    if mode != "C and f0":
        inductor["inductance"] = draw(_decades(-16, 4))
    if mode != "L and f0":
        capacitor["capacitance"] = draw(_decades(-25, 2))
    inductor["q"] = draw(_decades(-3, 5))
    job["source"]["resistance"] = draw(_decades(-3, 30))
    selectivity = draw(st.sampled_from(["load", "bandwidth", "loaded_q"]))
    if selectivity == "load" or "f0" not in targets:
        job["load"] = {"resistance": draw(_decades(-3, 30))}
    elif selectivity == "bandwidth":
        job.pop("load", None)
        targets["bandwidth"] = draw(_decades(-3, 12))
    else:
        job.pop("load", None)
        targets["loaded_q"] = draw(_decades(-11, 5))
    job["circuit"] = {"topology": topology, **({"targets": targets} if targets else {})}
    job["inductor"] = inductor
    job["capacitor"] = capacitor
    return yaml.safe_dump(job, allow_unicode=True, sort_keys=False)


@settings(max_examples=60, deadline=None,
          suppress_health_check=[HealthCheck.function_scoped_fixture, HealthCheck.too_slow])
@given(text=jobs())
def test_any_job_is_answered_without_a_traceback(capsys, text):
    with tempfile.TemporaryDirectory() as folder:
        job = Path(folder) / "job.yaml"
        job.write_text(text, encoding="utf-8")
        capsys.readouterr()
        code = main(["check", str(job)])
        captured = capsys.readouterr()
    assert code in (0, 1, 2), (code, text)
    assert "Traceback" not in captured.err, text
    printed = captured.out + captured.err
    assert not NEGATIVE_CAPACITANCE.findall(printed), (NEGATIVE_CAPACITANCE.findall(printed),
                                                       text)
    if code == 0:
        assert "all pass" in captured.out, text
