"""One call from a job file's path to its Design: load, find the parts library, design.

Problems found after loading (a design that cannot be made as asked) are reported like
load problems, at the job field they concern, so callers handle one error type.
"""

from __future__ import annotations

from pathlib import Path

from sheetgen.design.compute import compute_design
from sheetgen.design.records import Design
from sheetgen.errors import FieldError, InputError, Problem
from sheetgen.inputs.library import find_library_folder, load_library
from sheetgen.inputs.model import Job
from sheetgen.inputs.quick import Assumed, load_quick_job
from sheetgen.inputs.reader import field_position, load_job


def needs_library(job: Job) -> bool:
    """True when the job names a core or material that must come from the parts library."""
    inductor = job.inductor
    if inductor.form != "toroid":
        return False
    return isinstance(inductor.core, str) or isinstance(inductor.core.material, str)


def design_from_file(job_path: Path, library_folder: Path | None = None) -> Design:
    """The Design of the job file at job_path; InputError lists what is wrong with it."""
    job_path = Path(job_path)
    return _design(job_path, load_job(job_path), library_folder)


def quick_design_from_file(job_path: Path, library_folder: Path | None = None
                           ) -> tuple[Design, tuple[Assumed, ...]]:
    """The Design of a quick job (sheet identity, drive and part losses optional, for
    `check`), with what was assumed for each left out (inputs/quick.py)."""
    job_path = Path(job_path)
    job, assumed = load_quick_job(job_path)
    return _design(job_path, job, library_folder), assumed


def _design(job_path: Path, job: Job, library_folder: Path | None) -> Design:
    library = None
    if needs_library(job):
        library = load_library(find_library_folder(job_path, job.library, library_folder))
    try:
        return compute_design(job, library)
    except FieldError as error:
        line, column = field_position(job_path, error.field)
        raise InputError([Problem(str(job_path), line, column, error.field,
                                  error.message)]) from None
