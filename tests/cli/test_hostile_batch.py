"""Hostile batches (issue 17, part B, point 7), each reproduced before the fix: Ctrl-C with
`-j 2` ran every queued job to the end; `-j 1000` started one process per job; a job file
with a misspelt section, a quoted key or a non-UTF-8 byte was skipped silently ("built 1,
bad input 0", exit 0); a FIFO named *.yaml stalled the batch forever; nothing bounded a
job's time.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

import sheetgen.batch.runner as runner
from sheetgen.cli import main
from tests.cli.test_bad_input import GOOD, _write

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"


def _run(capsys, *args) -> tuple[int, list[str]]:
    code = main([str(a) for a in args])
    captured = capsys.readouterr()
    assert "Traceback" not in captured.err
    return code, captured.err.splitlines()


def test_every_yaml_file_in_a_folder_is_a_job_or_said_not_to_be(tmp_path, capsys):
    folder = tmp_path / "jobs"
    folder.mkdir()
    good = _write(folder, GOOD, "good.yaml")
    typo = _write(folder, GOOD.replace("sheet:\n", "shet:\n", 1), "typo.yaml")
    quoted = _write(folder, GOOD.replace("sheet:\n", '"sheet":\n', 1), "quoted.yaml")
    latin = _write(folder, GOOD.encode("utf-8").replace(b"Your Name", b"J\xf6rg"), "latin.yaml")
    os.mkfifo(folder / "fifo.yaml")
    style = _write(folder, (TEMPLATES / "style-default.yaml").read_text(), "style-house.yaml")
    cores = _write(folder, "cores: {}\nmaterials: {}\n", "cores.yaml")
    code, lines = _run(capsys, "check", folder)
    assert code == 2
    assert f"skipped {style}: a house style (style-NAME.yaml)" in lines
    assert f"skipped {cores}: a parts library file (materials: and cores: only)" in lines
    for bad in (typo, latin, folder / "fifo.yaml"):
        assert f"bad input: {bad}" in lines, lines
    assert any(line.startswith(f"  {typo}:") and "shet" in line for line in lines)
    assert any(line.startswith(f"  {latin}:") and "not UTF-8" in line for line in lines)
    assert any(line.startswith(f"  {folder / 'fifo.yaml'}:1:1 is not a regular file")
               for line in lines)
    assert f"checked {good}" in lines
    assert f"checked {quoted}" in lines  # a quoted key is still the key: a job like any other
    assert lines[-1] == "checked 2, failed checks 0, bad input 3"


def test_workers_are_capped_at_the_cpus_available(tmp_path, capsys, monkeypatch):
    """`-j 1000` with three jobs on a machine allowed 2 CPUs: 2 workers, and it says so."""
    started = []

    def in_workers(tasks, workers):
        started.append(workers)
        return runner._in_process(tasks)
    monkeypatch.setattr(runner, "default_workers", lambda: 2)
    monkeypatch.setattr(runner, "_in_workers", in_workers)
    jobs = [_write(tmp_path, GOOD, f"j{n}.yaml") for n in range(3)]
    code, lines = _run(capsys, "check", *jobs, "-j", "1000")
    assert code == 0 and started == [2]
    assert lines[0] == "sheetgen: -j 1000: running 2 workers, the CPUs this process may use"


def test_the_cpus_available_follow_the_affinity_mask():
    """os.sched_getaffinity (Linux) is what the process may use, not the machine's count."""
    if not hasattr(os, "sched_getaffinity"):
        pytest.skip("no affinity mask on this platform")
    assert runner.default_workers() == len(os.sched_getaffinity(0))


def test_a_job_past_its_time_is_stopped_and_the_others_run(tmp_path, capsys, monkeypatch):
    """A job that hangs (here: one that sleeps a minute before its design) is stopped at
    --timeout; the next job runs. In this process (-j 1), as in a worker."""
    original = runner._run

    def hanging(task):
        if task.job.name == "slow.yaml":
            time.sleep(60)
        return original(task)
    monkeypatch.setattr(runner, "_run", hanging)
    slow = _write(tmp_path, GOOD, "slow.yaml")
    quick = _write(tmp_path, GOOD, "quick.yaml")
    started = time.monotonic()
    code, lines = _run(capsys, "check", slow, quick, "-j", "1", "--timeout", "2")
    assert time.monotonic() - started < 30
    assert code == 2
    assert f"timed out: {slow}" in lines
    assert any("ran past 2 s (--timeout) and was stopped" in line for line in lines)
    assert f"checked {quick}" in lines


def test_ctrl_c_stops_a_batch_promptly(tmp_path):
    """SIGINT to the process group (as a terminal sends it) while two workers build 30
    sheets: the batch stops within seconds, reports, exits 130 and leaves no temporary file."""
    folder = tmp_path / "jobs"
    folder.mkdir()
    for n in range(30):
        _write(folder, GOOD.replace("id: TS-1356", f"id: TS-{n:04d}"), f"job{n:02d}.yaml")
    out = tmp_path / "out"
    out.mkdir()
    process = subprocess.Popen([sys.executable, "-m", "sheetgen", "build", str(folder),
                                "--out-dir", str(out), "-j", "2"], stderr=subprocess.PIPE,
                               text=True, start_new_session=True)
    deadline = time.monotonic() + 120
    while not any(out.glob("*.pdf")) and time.monotonic() < deadline:
        time.sleep(0.2)
    os.killpg(process.pid, signal.SIGINT)
    stopped = time.monotonic()
    _, err = process.communicate(timeout=60)
    assert time.monotonic() - stopped < 15, err
    assert process.returncode == 130, err
    summary = err.splitlines()[-1]
    assert "interrupted:" in summary and "jobs not run, nothing written for them" in summary, err
    assert "Traceback" not in err
    assert len(list(out.glob("*.pdf"))) < 20
    assert not list(out.glob(".*.part"))
