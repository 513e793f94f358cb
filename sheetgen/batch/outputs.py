"""Writing outputs whole or not at all, and the sheet that one job writes.

Shared by the single-job commands and the batch workers, so a sheet is made one way.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

PART_SUFFIX = ".part"  # a temporary file is `.NAME.<random>.part` beside the output


class OutputFolderError(Exception):
    """The folder an output should go to does not exist (bad usage, exit 2)."""


def _file_mode(path: Path) -> int:
    """The mode of the file being replaced, else what a new file gets under the umask."""
    if path.exists():
        return path.stat().st_mode & 0o777
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def write_atomically(path: Path, data: bytes) -> None:
    """Write to a temporary file beside `path`, then rename over it: whole or not at all."""
    if path.is_dir():
        raise OutputFolderError(f"cannot write {path}: it is a folder; give a file name inside it")
    directory = path.resolve().parent
    if not directory.is_dir():
        raise OutputFolderError(f"cannot write {path}: the folder {directory} does not exist")
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=PART_SUFFIX, dir=directory)
    try:
        os.chmod(temporary, _file_mode(path))  # mkstemp makes 0600; a sheet is for sharing
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
        os.replace(temporary, path)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise


def remove_leftovers(path: Path) -> None:
    """Remove temporary files a killed writer of `path` left behind (never `path` itself)."""
    directory = path.resolve().parent
    if directory.is_dir():
        for stale in directory.glob(f".{path.name}.*{PART_SUFFIX}"):
            stale.unlink(missing_ok=True)


def write_sheet(design, job_path: Path, output: Path, results_path: Path | None,
                style=None, force: bool = False, sign=None) -> bool:
    """Render the design's sheet (job and results attached) and write it, and the results
    JSON when asked; nothing is written if rendering fails. Text the sheet's font cannot
    draw is bad input, and a released sheet of the same id and revision with other content
    is not replaced unless `force` (bench/release.py). `sign` (bytes → bytes, e.g.
    bench/signature.sign_pdf with a key) signs the finished PDF before it is written. False
    when the output already holds this very sheet (nothing written; never when signing)."""
    from sheetgen.bench.release import SheetStamp, release_decision
    from sheetgen.inputs.library import recorded_library_text
    from sheetgen.report.content_hash import content_sha256
    from sheetgen.report.results import results_json
    from sheetgen.sheet import render_sheet
    from sheetgen.sheet.glyphs import check_printable
    from sheetgen.sheet.layout import check_frame_fits
    check_printable(design.job, job_path, style)
    check_frame_fits(design.job, job_path, style)
    job_text = job_path.read_text(encoding="utf-8")
    results_text = results_json(design)
    sheet = design.job.sheet
    library_text = recorded_library_text(design.library_entries)
    stamp = SheetStamp(sheet.id, sheet.revision, content_sha256(
        job_text.encode("utf-8"), results_text.encode("utf-8"),
        None if library_text is None else library_text.encode("utf-8")))
    if release_decision(output, stamp, force) == "same" and sign is None:
        return False
    pdf = render_sheet(design, job_text=job_text, results_text=results_text,
                       job_dir=job_path.resolve().parent, style=style)
    if sign is not None:
        pdf = sign(pdf)
    if results_path is not None:
        write_atomically(results_path, results_text.encode("utf-8"))
    write_atomically(output, pdf)
    return True
