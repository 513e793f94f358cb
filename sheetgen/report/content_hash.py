"""The content hash that ties a sheet to the job and results attached to it.

`sheetgen build` records it in the PDF's metadata; whoever reads a sheet back recomputes it
from the attachments and refuses the sheet when the two differ. The sheet writer
(sheet/layout.py) and the sheet reader (bench/sheet_file.py) both use this module, so the
byte sequence and the places it is recorded are defined here only.
"""

from __future__ import annotations

import hashlib

# Where a sheet records it (and its identity): keys of the PDF document information
# dictionary, and the namespace of the same properties in the XMP packet.
INFO_CONTENT_SHA256 = "SheetgenContentSHA256"
INFO_SHEET_ID = "SheetgenSheetId"
INFO_REVISION = "SheetgenRevision"
INFO_TOOL_VERSION = "SheetgenToolVersion"
XMP_NAMESPACE = "https://sheetgen.invalid/ns/sheet/1.0/"  # .invalid: reserved, RFC 2606


def content_sha256(job_bytes: bytes, results_bytes: bytes,
                   library_bytes: bytes | None = None) -> str:
    """SHA-256 (FIPS 180-4) of the attachments, as 64 lowercase hexadecimal digits.

    The hashed byte sequence is

        len(job) ‖ job ‖ len(results) ‖ results [‖ len(library) ‖ library]

    where `job` is exactly the bytes attached as job.yaml, `results` exactly the bytes
    attached as results.json, `library` exactly the bytes attached as library.yaml (only
    a sheet whose design used parts-library entries has it; without it the sequence ends
    after the results), and each length is an unsigned 64-bit big-endian integer (8 bytes)
    counting the bytes that follow it. The lengths keep the boundaries between the files
    from moving: no other set of files gives the same sequence.
    """
    digest = hashlib.sha256()
    parts = (job_bytes, results_bytes) + (() if library_bytes is None else (library_bytes,))
    for part in parts:
        digest.update(len(part).to_bytes(8, "big"))
        digest.update(part)
    return digest.hexdigest()
