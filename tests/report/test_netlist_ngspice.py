"""`sheetgen netlist` on every starter, run through `ngspice -b`: its `.meas` results
(f_peak, f_low, f_high) agree with the results JSON's response features, and its own
maximum with the level the netlist wrote for the −3 dB points."""

from __future__ import annotations

import json
import re
import subprocess
import sys

import pytest

from sheetgen.inputs.package_data import templates_folder
from tests.spice import ngspice_path
from tests.support import assert_close

pytestmark = pytest.mark.ngspice

STARTERS = ["demo", "series", "parallel", "toroid", "solenoid", "power-tank"]


def _run(*args, cwd):
    done = subprocess.run([sys.executable, "-m", "sheetgen", *args], capture_output=True,
                          text=True, cwd=cwd, timeout=120)
    assert done.returncode in (0, 1), done.stderr
    return done.stdout


def _printed_resolution(text: str) -> float:
    """Half a unit in the last printed digit of ngspice's number, relative to the number."""
    mantissa = text.split("e")[0].lstrip("-")
    decimals = len(mantissa.split(".")[1]) if "." in mantissa else 0
    return 0.5 * 10.0 ** -decimals / abs(float(mantissa))


@pytest.mark.parametrize("starter", STARTERS)
def test_starter_netlist_runs_in_ngspice_and_agrees(starter, tmp_path):
    job = templates_folder() / f"{starter}.yaml"
    netlist = tmp_path / "circuit.cir"
    _run("netlist", str(job), "-o", str(netlist), cwd=tmp_path)
    results = json.loads(_run("check", str(job), "--json", cwd=tmp_path))["resonance"]
    done = subprocess.run([ngspice_path(), "-b", str(netlist)], capture_output=True, text=True,
                          cwd=tmp_path, timeout=120, stdin=subprocess.DEVNULL)
    assert done.returncode == 0, done.stdout + done.stderr
    measured = dict(re.findall(r"^(f_peak|f_low|f_high|response_peak)\s*=\s*(\S+)",
                               done.stdout, re.M))
    assert set(measured) == {"f_peak", "f_low", "f_high", "response_peak"}, done.stdout
    sweep = re.search(r"^\.ac lin (\d+) (\S+) (\S+)$", netlist.read_text(), re.M)
    points, start, stop = int(sweep[1]), float(sweep[2]), float(sweep[3])
    step = (stop - start) / (points - 1)
    assert_close(float(measured["f_peak"]), results["f_peak_hz"], abs=step,
                 what="f_peak (to the sweep's step)")
    for key in ("f_low", "f_high"):
        # the 1e-6, or ngspice's printed rounding where that is coarser
        rel = max(1e-6, _printed_resolution(measured[key]))
        assert_close(float(measured[key]), results[f"{key}_hz"], rel=rel, what=key)


def test_a_detuned_netlist_disagrees(tmp_path):
    """The comparison can fail: the demo's netlist with C1 raised by 1 % puts ngspice's peak
    about 0.5 % lower than the results say."""
    job = templates_folder() / "demo.yaml"
    netlist = tmp_path / "circuit.cir"
    _run("netlist", str(job), "-o", str(netlist), cwd=tmp_path)
    text = netlist.read_text()
    line = re.search(r"^C1 (\S+) (\S+) (\S+)$", text, re.M)
    text = text.replace(line[0], f"C1 {line[1]} {line[2]} {float(line[3]) * 1.01!r}")
    netlist.write_text(text)
    results = json.loads(_run("check", str(job), "--json", cwd=tmp_path))["resonance"]
    done = subprocess.run([ngspice_path(), "-b", str(netlist)], capture_output=True, text=True,
                          cwd=tmp_path, timeout=120, stdin=subprocess.DEVNULL)
    f_peak = float(re.search(r"^f_peak\s*=\s*(\S+)", done.stdout, re.M)[1])
    assert abs(f_peak / results["f_peak_hz"] - 1) > 1e-3


def test_netlist_never_overwrites_its_job(tmp_path):
    """`netlist JOB -o JOB` is refused (exit 2, the job named), the job left as it was."""
    job = tmp_path / "j.yaml"
    job.write_text((templates_folder() / "series.yaml").read_text(encoding="utf-8"),
                   encoding="utf-8")
    before = job.read_bytes()
    done = subprocess.run([sys.executable, "-m", "sheetgen", "netlist", str(job), "-o", str(job)],
                          capture_output=True, text=True, cwd=tmp_path, timeout=120)
    assert done.returncode == 2 and "j.yaml" in done.stderr and "Traceback" not in done.stderr
    assert job.read_bytes() == before
