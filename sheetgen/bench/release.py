"""A released sheet is not replaced by a different one of the same id and revision.

`sheetgen build` asks before it writes: the PDF at the output path, if it is a sheetgen
sheet, names its id, revision and content hash in its document information. The same id
and revision with other content means the design moved without a new revision: refused
(bad input) unless the user forces it. The same content is a no-op.

A file at the output that cannot be read as a PDF (truncated, damaged, saved with a
password) may be a released sheet, so it is protected the same way: refused unless forced.
The check and the write are atomic against each other: `release_lock` holds an exclusive
lock on the output's folder from the last check until the rename, so of two builds to the
same output the second sees the first's sheet (and refuses it, or finds it the same).
"""

from __future__ import annotations

import os
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

from sheetgen.errors import InputError, Problem
from sheetgen.report.content_hash import INFO_CONTENT_SHA256, INFO_REVISION, INFO_SHEET_ID


@dataclass(frozen=True)
class SheetStamp:
    """What a built sheet says it is."""

    sheet_id: str
    revision: str
    content_sha256: str


class Unreadable:
    """A file at the output that cannot be read as a PDF; `why` says what went wrong."""

    def __init__(self, why: str):
        self.why = why


def existing_stamp(path: Path) -> SheetStamp | Unreadable | None:
    """The stamp of the sheetgen sheet at `path`; None when there is none (no file, or a
    PDF that sheetgen did not make); Unreadable when the file cannot be read as a PDF."""
    if not path.exists():
        return None
    if not path.is_file():
        return Unreadable("it is not a regular file")
    import logging
    logging.getLogger("pypdf").setLevel(logging.CRITICAL)  # its notes on a damaged file
    try:
        from pypdf import PdfReader
        reader = PdfReader(str(path), strict=True)
        if reader.is_encrypted:
            return Unreadable("it is saved with a password")
        info = reader.metadata or {}
        len(reader.pages)  # a truncated file fails here, if not before
    except Exception as error:  # noqa: BLE001 - any failure: the file cannot be read
        return Unreadable(" ".join(str(error).split())[:120] or type(error).__name__)
    values = [info.get(f"/{key}") for key in (INFO_SHEET_ID, INFO_REVISION, INFO_CONTENT_SHA256)]
    if not all(isinstance(value, str) and value for value in values):
        return None
    return SheetStamp(*values)


@contextmanager
def release_lock(output: Path):
    """An exclusive lock on the output's folder (flock, released when the process ends in
    any way) while the release is checked again and the sheet written."""
    import fcntl
    folder = output.resolve().parent
    try:
        handle = os.open(folder, os.O_RDONLY)
    except OSError:  # no such folder: the write itself reports it
        yield
        return
    try:
        fcntl.flock(handle, fcntl.LOCK_EX)
        yield
    finally:
        os.close(handle)  # closing releases the lock


def release_decision(output: Path, new: SheetStamp, force: bool) -> Literal["write", "same"]:
    """'write' when the output may be written (always when forced), 'same' when it already
    holds this content; InputError when it holds the same id and revision with different
    content."""
    old = existing_stamp(output)
    if isinstance(old, Unreadable) and not force:
        raise InputError([Problem(str(output), 1, 1, "", (
            f"{output.name} exists but cannot be read as a sheet ({old.why}); it may be a "
            "released sheet, so it is not replaced: move it away or pass --force"))])
    if force or not isinstance(old, SheetStamp) or (
            (old.sheet_id, old.revision) != (new.sheet_id, new.revision)):
        return "write"
    if old.content_sha256 == new.content_sha256:
        return "same"
    raise InputError([Problem(str(output), 1, 1, "", (
        f"{output.name} holds {old.sheet_id} rev {old.revision} with different content; "
        "raise the revision (sheet.revision) or pass --force to replace it"))])
