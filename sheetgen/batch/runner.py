"""Run one command over many job files: collect the jobs, run each in isolation, report.

Each job runs on its own (in a worker process, or in this process for one worker): a job
that is bad input or fails a check is reported with its messages and the others still
run. Outputs are written whole or not at all (outputs.write_atomically); a worker that
dies leaves no temporary file behind. The exit code is the worst of the jobs' (2 > 1 > 0).
"""

from __future__ import annotations

import json
import os
import sys
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from pathlib import Path

from sheetgen.batch.outputs import OutputFolderError, remove_leftovers, write_atomically, write_sheet
from sheetgen.errors import InputError

EXIT_OK, EXIT_CHECK_FAILED, EXIT_BAD_INPUT = 0, 1, 2
STYLE_PREFIX = "style-"  # house style files kept beside jobs are not jobs
JOB_KEYS = ("sheet", "circuit")  # top-level keys every job file has

OK_WORDS = {"build": "built", "check": "checked", "limits": "wrote"}


@dataclass(frozen=True)
class JobTask:
    """One job to run: the command and the options it takes (picklable, for a worker)."""

    command: str  # "build", "check" or "limits"
    job: Path
    output: Path | None = None  # the file to write (build: the PDF; limits: the CSV/JSON)
    library: Path | None = None
    style: Path | None = None
    json: bool = False  # check: a results document instead of a summary
    format: str = "csv"  # limits


@dataclass(frozen=True)
class JobOutcome:
    """What one job gave: its exit code, status word, messages and standard output."""

    job: Path
    code: int
    status: str  # "built", "checked", "wrote", "failed checks", "bad input", "crashed"
    messages: tuple[str, ...] = ()
    stdout: str = ""
    written: tuple[Path, ...] = field(default=())


def is_job_file(path: Path) -> bool:
    """True when the YAML file's top level has both `sheet:` and `circuit:` keys."""
    if path.name.startswith(STYLE_PREFIX):
        return False
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except (OSError, UnicodeDecodeError):
        return False
    keys = {line.split(":", 1)[0] for line in lines if line[:1].isalpha() and ":" in line}
    return all(key in keys for key in JOB_KEYS)


def collect_jobs(paths: Iterable[Path]) -> list[Path]:
    """The job files named, a folder standing for its *.yaml job files (sorted; house
    styles and parts-library files skipped). A named file is taken as it is."""
    jobs = []
    for path in paths:
        path = Path(path)
        if path.is_dir():
            jobs.extend(p for p in sorted(path.glob("*.yaml")) if p.is_file() and is_job_file(p))
        else:
            jobs.append(path)
    return jobs


def default_workers() -> int:
    """The CPUs this process may use."""
    count = getattr(os, "process_cpu_count", os.cpu_count)()
    return max(1, count or 1)


def output_path(job: Path, out_dir: Path | None, suffix: str) -> Path:
    """JOB.pdf / JOB.csv / JOB.json in out_dir, else beside the job file."""
    folder = out_dir if out_dir is not None else job.parent
    return folder / f"{job.stem}{suffix}"


def _failures(design) -> tuple[str, ...]:
    from sheetgen.report.checks import failed_checks
    return tuple(f"check failed: {f.field}: {f.text}" for f in failed_checks(design))


def run_job(task: JobTask) -> JobOutcome:
    """Run one job; every problem is caught and reported in the outcome (the worker's
    entry point: a top-level function, so it can be started by spawn)."""
    try:
        return _run(task)
    except InputError as error:
        return JobOutcome(task.job, EXIT_BAD_INPUT, "bad input",
                          tuple(str(p) for p in error.problems))
    except OutputFolderError as error:
        return JobOutcome(task.job, EXIT_BAD_INPUT, "bad input", (f"sheetgen: {error}",))
    except OSError as error:
        return JobOutcome(task.job, EXIT_BAD_INPUT, "bad input",
                          (f"sheetgen: {error.filename or ''}: {error.strerror or error}",))
    except Exception as error:  # one job's fault must not stop the others
        return JobOutcome(task.job, EXIT_BAD_INPUT, "crashed",
                          (f"sheetgen: internal error: {type(error).__name__}: {error}",))


def _run(task: JobTask) -> JobOutcome:
    from sheetgen.design.pipeline import design_from_file
    design = design_from_file(task.job, task.library)
    failures = _failures(design)
    code = EXIT_CHECK_FAILED if failures else EXIT_OK
    ok = OK_WORDS[task.command]
    status = "failed checks" if failures else ok
    if task.command == "check":
        if task.json:
            from sheetgen.report.results import results_document
            text = json.dumps(results_document(design), ensure_ascii=False,
                              separators=(",", ":")) + "\n"
        else:
            from sheetgen.report.summary import summary_text
            text = summary_text(design)
        return JobOutcome(task.job, code, status, failures, text)
    if task.command == "limits":
        from sheetgen.report.results import limits_csv, limits_json
        text = limits_csv(design) if task.format == "csv" else limits_json(design)
        write_atomically(task.output, text.encode("utf-8"))
    else:
        from sheetgen.inputs.style import resolve_style
        style = resolve_style(task.job, design.job, task.style, task.library)
        write_sheet(design, task.job, task.output, None, style)
    return JobOutcome(task.job, code, status, failures, written=(task.output,))


@dataclass
class Tally:
    """Counts of the outcomes by kind, and the worst exit code."""

    command: str
    counts: dict[str, int] = field(default_factory=dict)
    code: int = EXIT_OK

    def add(self, outcome: JobOutcome) -> None:
        self.counts[outcome.status] = self.counts.get(outcome.status, 0) + 1
        self.code = max(self.code, outcome.code)

    def line(self) -> str:
        """'built 3, failed checks 1, bad input 1' (crashed only when some did)."""
        words = [OK_WORDS[self.command], "failed checks", "bad input"]
        words += [w for w in self.counts if w not in words]
        return ", ".join(f"{w} {self.counts.get(w, 0)}" for w in words)


def outcome_lines(outcome: JobOutcome) -> list[str]:
    """The job's line ('built a.pdf', 'failed checks: b.yaml', 'bad input: c.yaml') and
    its messages beneath it, indented."""
    if outcome.code == EXIT_OK:
        head = (f"{outcome.status} {outcome.written[0]}" if outcome.written
                else f"{outcome.status} {outcome.job}")
    else:
        head = f"{outcome.status}: {outcome.job}"
        if outcome.written:
            head += f" (wrote {outcome.written[0]})"
    return [head] + [f"  {message}" for message in outcome.messages]


def _in_process(tasks: Sequence[JobTask]):
    for index, task in enumerate(tasks):
        yield index, run_job(task)


# Imported once by the fork server, so every worker starts with them loaded (the imports
# cost more than a job); where there is no fork server, workers are spawned and import them.
PRELOAD = ("sheetgen.batch.runner", "sheetgen.design.pipeline", "sheetgen.report.results",
           "sheetgen.report.summary", "sheetgen.inputs.style", "sheetgen.design.coil",
           "scipy.special")  # the coil jobs' modules (scipy.special: the Kelvin functions)
PRELOAD_SHEET = ("sheetgen.sheet", "sheetgen.sheet.warm", "sheetgen.sheet.glyphs",
                 "sheetgen.bench.release")  # warm: the fonts, made once for every worker


def _worker_context(multiprocessing, command: str):
    """A fork server with the job modules preloaded where the platform has one, else spawn.
    Either way a worker runs run_job, a top-level function (spawn-safe)."""
    if "forkserver" not in multiprocessing.get_all_start_methods():
        return multiprocessing.get_context("spawn")
    context = multiprocessing.get_context("forkserver")
    context.set_forkserver_preload(list(PRELOAD + (PRELOAD_SHEET if command == "build" else ())))
    return context


def _in_workers(tasks: Sequence[JobTask], workers: int):
    """(index, outcome) as jobs finish. A job whose worker died is run again alone in a
    fresh worker; if that one dies too the job is reported as crashed."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor, as_completed
    from concurrent.futures.process import BrokenProcessPool
    context = _worker_context(multiprocessing, tasks[0].command)
    broken = []
    with ProcessPoolExecutor(max_workers=workers, mp_context=context) as pool:
        futures = {pool.submit(run_job, task): index for index, task in enumerate(tasks)}
        for future in as_completed(futures):
            index = futures[future]
            try:
                yield index, future.result()
            except BrokenProcessPool:
                broken.append(index)
    for index in sorted(broken):
        task = tasks[index]
        if task.output is not None:  # what the dead worker may have left half-written
            remove_leftovers(task.output)
        try:
            with ProcessPoolExecutor(max_workers=1, mp_context=context) as alone:
                outcome = alone.submit(run_job, task).result()
        except BrokenProcessPool:
            if task.output is not None:
                remove_leftovers(task.output)
            outcome = JobOutcome(task.job, EXIT_BAD_INPUT, "crashed",
                                 ("sheetgen: the worker process running this job stopped; "
                                  "nothing written for it",))
        yield index, outcome


def run_batch(tasks: Sequence[JobTask], workers: int, *, stdout=None, stderr=None,
              progress: bool | None = None) -> int:
    """Run every task (`workers` processes; 1 runs here), print each job's output and
    lines in job order and a summary line; return the worst exit code."""
    stdout = stdout or sys.stdout
    stderr = stderr or sys.stderr
    if progress is None:
        progress = stderr.isatty()
    tally = Tally(tasks[0].command if tasks else "build")
    bar = None
    if progress:
        from tqdm import tqdm
        bar = tqdm(total=len(tasks), file=stderr, unit="job", leave=False)

    def say(line: str) -> None:
        if bar is not None:
            bar.write(line, file=stderr)
        else:
            print(line, file=stderr)

    workers = max(1, min(workers, len(tasks)))
    runs = _in_process(tasks) if workers == 1 else _in_workers(tasks, workers)
    waiting: dict[int, JobOutcome] = {}
    next_index = 0
    try:
        for index, outcome in runs:
            if bar is not None:
                bar.update(1)
            waiting[index] = outcome
            while next_index in waiting:  # job order, whatever order they finish in
                done = waiting.pop(next_index)
                next_index += 1
                tally.add(done)
                if done.stdout:
                    stdout.write(done.stdout)
                    stdout.flush()
                if bar is None or done.code != EXIT_OK:
                    for line in outcome_lines(done):
                        say(line)
    finally:
        if bar is not None:
            bar.close()
    print(tally.line(), file=stderr)
    return tally.code
