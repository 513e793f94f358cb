"""Many jobs in one command, through the CLI: every job isolated, outputs whole, the
worst exit code, JSON Lines from `check --json`.

Outside checks: JSON Lines (jsonlines.org: one JSON text per line, UTF-8) is read line
by line with the standard library's json; each line must equal the document the
single-job `check --json` prints for that job (a separate path through the CLI); the
PDFs are read back with pypdf.
"""

import json
import subprocess
import sys
from pathlib import Path

import pytest

from sheetgen.cli import main

ROOT = Path(__file__).resolve().parents[2]
TEMPLATES = ROOT / "templates"
GOOD = ("series", "parallel", "solenoid")


def _run(capsys, *args):
    code = main([str(a) for a in args])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    return code, out.out, out.err


def _jobs(folder: Path) -> dict[str, Path]:
    """Three good starters, one bad job (exit 2) and one that fails a rating (exit 1)."""
    folder.mkdir(exist_ok=True)
    jobs = {}
    for name in GOOD:
        jobs[name] = folder / f"{name}.yaml"
        jobs[name].write_text((TEMPLATES / f"{name}.yaml").read_text(encoding="utf-8"),
                              encoding="utf-8")
    jobs["bad"] = folder / "bad.yaml"
    jobs["bad"].write_text((TEMPLATES / "series.yaml").read_text(encoding="utf-8")
                           .replace("esr: 0.05 ohm", "esr: low"), encoding="utf-8")
    jobs["failing"] = folder / "failing.yaml"  # 500 V parts under ~1 kV peak: rating fails
    jobs["failing"].write_text((TEMPLATES / "power-tank.yaml").read_text(encoding="utf-8")
                               .replace("  rated_voltage: 3 kV", "  rated_voltage: 500 V", 1),
                               encoding="utf-8")
    (folder / "style-house.yaml").write_text(
        (TEMPLATES / "style-default.yaml").read_text(encoding="utf-8"), encoding="utf-8")
    return jobs


@pytest.mark.parametrize("workers", ["1", "2"])
def test_limits_batch_writes_every_good_job_and_reports_the_rest(tmp_path, capsys, workers):
    jobs = _jobs(tmp_path / "jobs")
    out = tmp_path / "out"
    out.mkdir()
    code, stdout, err = _run(capsys, "limits", tmp_path / "jobs", "--out-dir", out, "-j", workers)
    assert code == 2, err  # bad input beats a failed check
    assert stdout == ""
    lines = err.splitlines()
    assert lines[-1] == "wrote 3, failed checks 1, bad input 1"
    assert f"bad input: {jobs['bad']}" in lines
    assert any(line.startswith(f"  {jobs['bad']}:21:8 capacitor.esr:") for line in lines)
    assert f"failed checks: {jobs['failing']} (wrote {out / 'failing.csv'})" in lines
    assert any(line.startswith("  check failed: capacitor") for line in lines), lines
    for name in GOOD:
        assert f"wrote {out / (name + '.csv')}" in lines
    # every file whole: the good and the failing job's limits, nothing for the bad one
    assert sorted(p.name for p in out.iterdir()) == ["failing.csv", "parallel.csv",
                                                     "series.csv", "solenoid.csv"]
    for name in GOOD:
        code, single, _ = _run(capsys, "limits", jobs[name])
        assert (out / f"{name}.csv").read_text(encoding="utf-8") == single


def test_exit_code_is_1_when_the_worst_job_fails_a_check(tmp_path, capsys):
    jobs = _jobs(tmp_path / "jobs")
    code, _, err = _run(capsys, "limits", jobs["series"], jobs["failing"], "--out-dir", tmp_path,
                        "-j", "1")
    assert code == 1 and err.splitlines()[-1] == "wrote 1, failed checks 1, bad input 0"
    code, _, err = _run(capsys, "limits", jobs["series"], jobs["parallel"], "--out-dir", tmp_path,
                        "-j", "1")
    assert code == 0 and err.splitlines()[-1] == "wrote 2, failed checks 0, bad input 0"


def test_check_json_on_many_jobs_prints_json_lines(tmp_path, capsys):
    jobs = _jobs(tmp_path / "jobs")
    code, stdout, err = _run(capsys, "check", tmp_path / "jobs", "--json", "-j", "2")
    assert code == 2
    lines = stdout.splitlines()
    assert stdout.endswith("\n") and len(lines) == 4  # the bad job prints none
    documents = [json.loads(line) for line in lines]
    assert all("\n" not in line and line.startswith('{"format":"sheetgen.results/1"')
               for line in lines)
    # job order (folder sorted): failing, parallel, series, solenoid
    order = ["failing", "parallel", "series", "solenoid"]
    assert [d["sheet"]["id"] for d in documents] == [
        json.loads(_run(capsys, "check", jobs[name], "--json")[1])["sheet"]["id"] for name in order]
    for name, document in zip(order, documents):
        assert document == json.loads(_run(capsys, "check", jobs[name], "--json")[1])
    assert err.splitlines()[-1] == "checked 3, failed checks 1, bad input 1"


def test_batch_usage_errors(tmp_path, capsys):
    jobs = _jobs(tmp_path / "jobs")
    code, _, err = _run(capsys, "build", jobs["series"], jobs["parallel"], "-o", tmp_path / "x.pdf")
    assert code == 2 and "--output names one file; for several jobs use --out-dir" in err
    (tmp_path / "a-file").write_text("")
    code, _, err = _run(capsys, "limits", jobs["series"], "--out-dir", tmp_path / "a-file")
    assert code == 2 and "exists and is not a folder" in err
    other = tmp_path / "other"
    other.mkdir()
    (other / "series.yaml").write_text(jobs["series"].read_text())
    code, _, err = _run(capsys, "limits", jobs["series"], other / "series.yaml", "--out-dir",
                        tmp_path)
    assert code == 2 and "would both write" in err
    assert not (tmp_path / "series.csv").exists()


def test_out_dir_that_does_not_exist_is_made_with_its_parents(tmp_path, capsys):
    """As `mkdir -p` (POSIX): a missing output folder and its parents are created."""
    jobs = _jobs(tmp_path / "jobs")
    out = tmp_path / "new" / "nested" / "limits"
    code, _, err = _run(capsys, "limits", jobs["series"], jobs["parallel"], "--out-dir", out)
    assert code == 0, err
    assert sorted(p.name for p in out.iterdir()) == ["parallel.csv", "series.csv"]
    # A usage error found before any job runs leaves no folder behind.
    other = tmp_path / "other"
    other.mkdir()
    (other / "series.yaml").write_text(jobs["series"].read_text())
    never = tmp_path / "never"
    code, _, err = _run(capsys, "limits", jobs["series"], other / "series.yaml", "--out-dir",
                        never)
    assert code == 2 and "would both write" in err and not never.exists()


def test_one_job_runs_exactly_as_before(tmp_path, capsys):
    job = _jobs(tmp_path / "jobs")["series"]
    code, stdout, err = _run(capsys, "check", job, "--json", "-j", "2")
    assert code == 0 and err == ""
    assert stdout.startswith('{\n  "format": "sheetgen.results/1"')  # indented, not a line


@pytest.mark.pdf
def test_build_batch_in_workers_writes_whole_sheets(tmp_path):
    """Through a real process (spawned workers need an importable entry point)."""
    from pypdf import PdfReader
    jobs = _jobs(tmp_path / "jobs")
    out = tmp_path / "out"
    out.mkdir()
    done = subprocess.run([sys.executable, "-m", "sheetgen", "build", str(tmp_path / "jobs"),
                           "--out-dir", str(out), "-j", "2", "--style",
                           str(TEMPLATES / "style-default.yaml")],
                          capture_output=True, text=True, cwd=ROOT, timeout=600)
    assert done.returncode == 2, done.stderr
    assert "Traceback" not in done.stderr
    lines = done.stderr.splitlines()
    assert lines[-1] == "built 3, failed checks 1, bad input 1"
    assert f"bad input: {jobs['bad']}" in lines
    assert sorted(p.name for p in out.iterdir()) == ["failing.pdf", "parallel.pdf", "series.pdf",
                                                     "solenoid.pdf"]
    for pdf in out.iterdir():
        assert len(PdfReader(pdf).pages) >= 2
    # The same job gives the same bytes in a worker that inherited the fork server's fonts
    # (sheet/warm.py) as in a cold single build of its own.
    single = tmp_path / "single.pdf"
    done = subprocess.run([sys.executable, "-m", "sheetgen", "build", str(jobs["series"]),
                           "-o", str(single), "--style", str(TEMPLATES / "style-default.yaml")],
                          capture_output=True, text=True, cwd=ROOT, timeout=600)
    assert done.returncode == 0, done.stderr
    assert single.read_bytes() == (out / "series.pdf").read_bytes()
