"""Collecting jobs from folders, the outcome lines, the summary and the exit code.

The rules checked are the batch contract (README "Many jobs at once"): a folder stands
for its job files (top-level `sheet:` and `circuit:`), house styles and parts-library
files skipped; the exit code is the worst of the jobs' (2 > 1 > 0).
"""

from pathlib import Path

from sheetgen.batch.outputs import remove_leftovers, write_atomically
from sheetgen.batch.runner import JobOutcome, JobTask, Tally, collect_jobs, is_job_file, run_batch

ROOT = Path(__file__).resolve().parents[2]
TEMPLATES = ROOT / "templates"


def test_a_folder_stands_for_its_job_files_only(tmp_path):
    for name in ("series", "parallel"):
        (tmp_path / f"{name}.yaml").write_text((TEMPLATES / f"{name}.yaml").read_text())
    (tmp_path / "style-house.yaml").write_text((TEMPLATES / "style-default.yaml").read_text())
    (tmp_path / "cores.yaml").write_text((ROOT / "shared" / "cores.yaml").read_text())
    (tmp_path / "notes.txt").write_text("sheet: x\ncircuit: y\n")
    (tmp_path / "style-looks-like-a-job.yaml").write_text("sheet: x\ncircuit: y\n")
    assert [p.name for p in collect_jobs([tmp_path])] == ["parallel.yaml", "series.yaml"]
    assert is_job_file(tmp_path / "series.yaml")
    assert not is_job_file(tmp_path / "cores.yaml")


def test_a_named_file_is_taken_as_given_and_order_is_kept(tmp_path):
    odd = tmp_path / "z.yaml"
    odd.write_text("not a job\n")
    folder = tmp_path / "more"
    folder.mkdir()
    (folder / "a.yaml").write_text((TEMPLATES / "series.yaml").read_text())
    assert collect_jobs([odd, folder]) == [odd, folder / "a.yaml"]


def test_the_worst_exit_code_wins_and_the_summary_counts_every_kind():
    tally = Tally("build")
    for code, status in ((0, "built"), (1, "failed checks"), (0, "built"), (2, "bad input")):
        tally.add(JobOutcome(Path("x.yaml"), code, status))
    assert tally.code == 2
    assert tally.line() == "built 2, failed checks 1, bad input 1"
    quiet = Tally("check")
    quiet.add(JobOutcome(Path("x.yaml"), 0, "checked"))
    assert (quiet.code, quiet.line()) == (0, "checked 1, failed checks 0, bad input 0")


def test_in_process_run_reports_every_job_in_order(tmp_path, capsys):
    good = tmp_path / "good.yaml"
    good.write_text((TEMPLATES / "series.yaml").read_text())
    bad = tmp_path / "bad.yaml"
    bad.write_text((TEMPLATES / "series.yaml").read_text().replace("esr: 0.05 ohm", "esr: low"))
    tasks = [JobTask("limits", job, tmp_path / f"{job.stem}.csv") for job in (bad, good)]
    code = run_batch(tasks, 1, progress=False)
    err = capsys.readouterr().err.splitlines()
    assert code == 2
    assert err[0] == f"bad input: {bad}"
    assert err[1].startswith(f"  {bad}:21:8 capacitor.esr:")
    assert err[2] == f"wrote {tmp_path / 'good.csv'}"
    assert err[-1] == "wrote 1, failed checks 0, bad input 1"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bad.yaml", "good.csv", "good.yaml"]


def test_leftovers_of_a_killed_writer_are_removed_and_the_output_kept(tmp_path):
    out = tmp_path / "job.pdf"
    write_atomically(out, b"%PDF-whole")
    (tmp_path / ".job.pdf.abc123.part").write_bytes(b"%PDF-ha")  # as mkstemp names it
    remove_leftovers(out)
    assert [p.name for p in tmp_path.iterdir()] == ["job.pdf"]
    assert out.read_bytes() == b"%PDF-whole"


def test_on_a_terminal_a_progress_bar_replaces_the_job_lines(tmp_path):
    import io
    good = tmp_path / "good.yaml"
    good.write_text((TEMPLATES / "series.yaml").read_text())
    bad = tmp_path / "bad.yaml"
    bad.write_text("sheet: {}\ncircuit: {}\n")
    stderr = io.StringIO()
    tasks = [JobTask("limits", job, tmp_path / f"{job.stem}.csv") for job in (good, bad)]
    code = run_batch(tasks, 1, progress=True, stderr=stderr)
    text = stderr.getvalue()
    assert code == 2
    assert f"wrote {tmp_path / 'good.csv'}" not in text  # good jobs: only the bar moves
    assert f"bad input: {bad}" in text and "job/s" in text  # tqdm's rate unit
    assert text.rstrip().endswith("wrote 1, failed checks 0, bad input 1")
