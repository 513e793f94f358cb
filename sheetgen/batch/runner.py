"""Run one command over many job files: collect the jobs, run each in isolation, report.

Each job runs on its own (in a worker process, or in this process for one worker): a job
that is bad input or fails a check is reported with its messages and the others still
run. Outputs are written whole or not at all (outputs.write_atomically); a worker that
dies leaves no temporary file behind. The exit code is the worst of the jobs' (2 > 1 > 0).
"""

from __future__ import annotations

import json
import os
import signal
import sys
import threading
from collections.abc import Iterable, Sequence
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path

from sheetgen.batch.outputs import OutputFolderError, remove_leftovers, write_atomically, write_sheet
from sheetgen.errors import InputError
from sheetgen.inputs.files import read_bounded
from sheetgen.inputs.reader import MAX_JOB_BYTES

EXIT_OK, EXIT_CHECK_FAILED, EXIT_BAD_INPUT = 0, 1, 2
EXIT_INTERRUPTED = 130  # 128 + SIGINT, as a shell reports a command stopped by Ctrl-C
# The time one job of a batch may take (README "Limits"): a starter builds in about two
# seconds and the heaviest job (2,000,000 Monte Carlo trials) in well under a minute here,
# so five minutes stops only a job that hangs. `--timeout` sets another.
JOB_TIMEOUT_S = 300.0
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
    timeout: float = 300.0  # seconds the job may take (JOB_TIMEOUT_S)


@dataclass(frozen=True)
class JobOutcome:
    """What one job gave: its exit code, status word, messages and standard output."""

    job: Path
    code: int
    status: str  # "built", "checked", "wrote", "failed checks", "bad input", "crashed"
    messages: tuple[str, ...] = ()
    stdout: str = ""
    written: tuple[Path, ...] = field(default=())


LIBRARY_KEYS = {"materials", "cores"}  # the top-level keys of a parts library file


def not_a_job(path: Path) -> str | None:
    """Why a *.yaml file found in a folder is not a job (a house style, a parts library
    file), or None: it is a job, and runs as one; a file that cannot be read or has a
    misspelt section is then reported as bad input like any job, never skipped silently."""
    if path.name.startswith(STYLE_PREFIX):
        return "a house style (style-NAME.yaml)"
    try:
        text = read_bounded(path, MAX_JOB_BYTES, "job file").decode("utf-8")
    except (InputError, UnicodeDecodeError):
        return None
    keys = {line.split(":", 1)[0] for line in text.splitlines()
            if line[:1].isalpha() and ":" in line}
    if keys and keys <= LIBRARY_KEYS:
        return "a parts library file (materials: and cores: only)"
    return None


def is_job_file(path: Path) -> bool:
    """True when the YAML file is to run as a job (see not_a_job)."""
    return not_a_job(path) is None


def collect(paths: Iterable[Path]) -> tuple[list[Path], list[tuple[Path, str]]]:
    """The jobs to run and the files skipped, with why. A named file is taken as it is; a
    folder stands for its *.yaml files (sorted), every one a job but house styles and
    parts library files, which are listed as skipped."""
    jobs, skipped = [], []
    for path in paths:
        path = Path(path)
        if path.is_dir():
            for found in sorted(path.glob("*.yaml")):
                if found.is_dir():
                    continue
                reason = not_a_job(found)
                if reason is None:
                    jobs.append(found)
                else:
                    skipped.append((found, reason))
        else:
            jobs.append(path)
    return jobs, skipped


def collect_jobs(paths: Iterable[Path]) -> list[Path]:
    """The job files `collect` finds."""
    return collect(paths)[0]


def default_workers() -> int:
    """The CPUs this process may use (its affinity mask where the platform has one)."""
    count = getattr(os, "process_cpu_count", None)
    if count is not None:
        return max(1, count() or 1)
    if hasattr(os, "sched_getaffinity"):
        return max(1, len(os.sched_getaffinity(0)))
    return max(1, os.cpu_count() or 1)


def output_path(job: Path, out_dir: Path | None, suffix: str) -> Path:
    """JOB.pdf / JOB.csv / JOB.json in out_dir, else beside the job file."""
    folder = out_dir if out_dir is not None else job.parent
    return folder / f"{job.stem}{suffix}"


def _failures(design) -> tuple[str, ...]:
    from sheetgen.report.checks import failed_checks
    return tuple(f"check failed: {f.field}: {f.text}" for f in failed_checks(design))


class JobTimeout(Exception):
    """A job ran past its time (JobTask.timeout)."""


@contextmanager
def _time_limit(seconds: float):
    """Raise JobTimeout in this thread after `seconds` (a real-time interval timer, where
    the platform has one and this is the main thread; else no limit)."""
    if not seconds or not hasattr(signal, "setitimer") \
            or threading.current_thread() is not threading.main_thread():
        yield
        return

    def expire(signum, frame):
        raise JobTimeout()
    previous = signal.signal(signal.SIGALRM, expire)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


def run_job(task: JobTask) -> JobOutcome:
    """Run one job within its time; every problem is caught and reported in the outcome
    (the worker's entry point: a top-level function, so it can be started by spawn)."""
    try:
        with _time_limit(task.timeout):
            return _run(task)
    except JobTimeout:
        if task.output is not None:
            remove_leftovers(task.output)
        return JobOutcome(task.job, EXIT_BAD_INPUT, "timed out", (
            f"sheetgen: the job ran past {task.timeout:g} s (--timeout) and was stopped; "
            "nothing written for it",))
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
    fresh worker; if that one dies too the job is reported as crashed. Stopped (Ctrl-C, or
    the caller closing this generator), the queued jobs are cancelled and the workers
    terminated at once; what they were writing is removed."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor, as_completed
    from concurrent.futures.process import BrokenProcessPool
    context = _worker_context(multiprocessing, tasks[0].command)
    broken = []
    pool = ProcessPoolExecutor(max_workers=workers, mp_context=context,
                               initializer=_leave_ctrl_c_to_the_parent)
    try:
        futures = {pool.submit(run_job, task): index for index, task in enumerate(tasks)}
        for future in as_completed(futures):
            index = futures[future]
            try:
                yield index, future.result()
            except BrokenProcessPool:
                broken.append(index)
    except BaseException:
        _stop(pool, tasks)
        raise
    pool.shutdown(wait=True)
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


def _leave_ctrl_c_to_the_parent() -> None:
    """In a worker: ignore SIGINT. Ctrl-C reaches the whole process group; the parent
    alone answers it, by terminating the workers (_stop), so none prints a traceback."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def _stop(pool, tasks: Sequence[JobTask]) -> None:
    """Cancel what has not started, terminate the workers, remove half-written outputs."""
    processes = list((getattr(pool, "_processes", None) or {}).values())  # no public handle
    pool.shutdown(wait=False, cancel_futures=True)
    for process in processes:
        if process.is_alive():
            process.terminate()
    for process in processes:
        process.join(timeout=5)
    pool.shutdown(wait=True)  # its manager thread sees the workers gone and ends
    for task in tasks:
        if task.output is not None:
            remove_leftovers(task.output)


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

    workers = max(1, min(workers, len(tasks), default_workers()))
    runs = _in_process(tasks) if workers == 1 else _in_workers(tasks, workers)
    waiting: dict[int, JobOutcome] = {}
    next_index = 0
    interrupted = False
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
    except KeyboardInterrupt:
        interrupted = True
        if hasattr(runs, "close"):
            runs.close()  # stops the workers (see _in_workers)
    finally:
        if bar is not None:
            bar.close()
    if interrupted:
        for index in sorted(waiting):  # finished out of order before the stop: report them
            tally.add(waiting[index])
            for line in outcome_lines(waiting[index]):
                say(line)
        finished = sum(tally.counts.values())
        print(f"{tally.line()}; interrupted: {len(tasks) - finished} of {len(tasks)} jobs not "
              "run, nothing written for them", file=stderr)
        return EXIT_INTERRUPTED
    print(tally.line(), file=stderr)
    return tally.code
