"""A released sheet is not replaced by a different one of the same id and revision.

`sheetgen build` asks before it writes: the PDF at the output path, if it is a sheetgen
sheet, names its id, revision and content hash in its document information. The same id
and revision with other content means the design moved without a new revision: refused
(bad input) unless the user forces it. The same content is a no-op.
"""

from __future__ import annotations

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


def existing_stamp(path: Path) -> SheetStamp | None:
    """The stamp of the sheetgen sheet at `path`; None when there is none (no file, not a
    PDF, or a PDF that sheetgen did not make)."""
    if not path.is_file():
        return None
    try:
        from pypdf import PdfReader
        info = PdfReader(str(path)).metadata or {}
    except Exception:  # any unreadable file is simply not a sheet of ours
        return None
    values = [info.get(f"/{key}") for key in (INFO_SHEET_ID, INFO_REVISION, INFO_CONTENT_SHA256)]
    if not all(isinstance(value, str) and value for value in values):
        return None
    return SheetStamp(*values)


def release_decision(output: Path, new: SheetStamp, force: bool) -> Literal["write", "same"]:
    """'write' when the output may be written (always when forced), 'same' when it already
    holds this content; InputError when it holds the same id and revision with different
    content."""
    old = existing_stamp(output)
    if force or old is None or (old.sheet_id, old.revision) != (new.sheet_id, new.revision):
        return "write"
    if old.content_sha256 == new.content_sha256:
        return "same"
    raise InputError([Problem(str(output), 1, 1, "", (
        f"{output.name} holds {old.sheet_id} rev {old.revision} with different content; "
        "raise the revision (sheet.revision) or pass --force to replace it"))])
