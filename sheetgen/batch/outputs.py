"""Writing outputs whole or not at all, and the sheet that one job writes.

Shared by the single-job commands and the batch workers, so a sheet is made one way.
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Sequence
from pathlib import Path

PART_SUFFIX = ".part"  # a temporary file is `.NAME.<random>.part` beside the output


class OutputFolderError(Exception):
    """An output that cannot be written where asked: a folder that does not exist or refuses
    the file, a full disk, or an output that is one of the command's inputs or another of
    its outputs (bad usage, exit 2). The message names the output, never a temporary file."""


def _file_mode(path: Path) -> int:
    """The mode of the file being replaced, else what a new file gets under the umask."""
    if path.exists():
        return path.stat().st_mode & 0o777
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def _identities(path: Path) -> list[tuple]:
    """What makes two names one file: the resolved path (links followed), and where the
    file exists its device and inode (hard links)."""
    found: list[tuple] = []
    try:
        found.append(("path", Path(path).resolve()))
        status = os.stat(path)
        found.append(("inode", status.st_dev, status.st_ino))
    except (OSError, ValueError, RuntimeError):
        pass
    return found


def same_file(a: Path, b: Path) -> bool:
    """True when `a` and `b` name one file (the same resolved path, or the same inode)."""
    return bool(set(_identities(a)) & set(_identities(b)))


def refuse_overlaps(inputs: Sequence[tuple[str, Path]], outputs: Sequence[tuple[str, Path]]) -> None:
    """Refuse an output that is one of the command's inputs or another of its outputs
    (`(what, path)` pairs, e.g. ("--results", Path("j.yaml"))): nothing may be overwritten
    by the command that reads it, nor written twice."""
    seen: dict[tuple, tuple[str, str, Path]] = {}
    for what, source in inputs:
        for identity in _identities(source):
            seen.setdefault(identity, ("input", what, source))
    for label, output in outputs:
        identities = _identities(output)
        for identity in identities:
            if identity in seen:
                kind, what, other = seen[identity]
                if kind == "input":
                    raise OutputFolderError(f"{output}: {label} would overwrite {what} {other}, "
                                            "an input of this command; write it to another file")
                raise OutputFolderError(f"{output}: {label} and {what} name the same file; give "
                                        "each output its own")
        for identity in identities:
            seen[identity] = ("output", label, output)


def _cannot_write(path: Path, error: OSError) -> OutputFolderError:
    return OutputFolderError(f"cannot write {path}: {error.strerror or error}; nothing written")


def _prepare(path: Path, data: bytes) -> Path:
    """`data` in a temporary file beside `path`, flushed to disk; its path."""
    if path.is_dir():
        raise OutputFolderError(f"cannot write {path}: it is a folder; give a file name inside it")
    directory = path.resolve().parent
    if not directory.is_dir():
        raise OutputFolderError(f"cannot write {path}: the folder {directory} does not exist")
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=PART_SUFFIX,
                                             dir=directory)
    except OSError as error:
        raise _cannot_write(path, error) from None
    try:
        os.chmod(temporary, _file_mode(path))  # mkstemp makes 0600; a sheet is for sharing
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
    except BaseException as error:
        Path(temporary).unlink(missing_ok=True)
        if isinstance(error, OSError):
            raise _cannot_write(path, error) from None
        raise
    return Path(temporary)


def write_all(items: Sequence[tuple[Path, bytes]]) -> None:
    """Write every (path, data) whole, or none of them: each goes to a temporary file
    beside its path first, and only when all are on disk are they renamed over their paths."""
    prepared: list[tuple[Path, Path]] = []
    try:
        for path, data in items:
            prepared.append((path, _prepare(path, data)))
        for path, temporary in prepared:
            try:
                os.replace(temporary, path)
            except OSError as error:
                raise _cannot_write(path, error) from None
    finally:
        for _, temporary in prepared:
            temporary.unlink(missing_ok=True)  # those not renamed (on a failure)


def write_atomically(path: Path, data: bytes) -> None:
    """Write to a temporary file beside `path`, then rename over it: whole or not at all."""
    write_all([(path, data)])


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
    from sheetgen.bench.release import SheetStamp, release_decision, release_lock
    from sheetgen.inputs.library import recorded_library_text
    from sheetgen.inputs.reader import read_job_text
    from sheetgen.report.content_hash import content_sha256
    from sheetgen.report.results import results_json
    from sheetgen.sheet import render_sheet
    from sheetgen.sheet.glyphs import check_printable
    from sheetgen.sheet.layout import check_frame_fits
    check_printable(design.job, job_path, style)
    check_frame_fits(design.job, job_path, style)
    job_text = read_job_text(job_path)
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
    items = [(output, pdf)]
    if results_path is not None:
        items.insert(0, (results_path, results_text.encode("utf-8")))
    with release_lock(output):  # asked again under the lock: no other build between
        if release_decision(output, stamp, force) == "same" and sign is None:
            return False
        write_all(items)
    return True
