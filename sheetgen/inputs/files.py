"""Reading an input file with bounds: a regular file only, at most a stated number of bytes.

Every reader of a user's file (job, style, parts library, logo, filled sheet, sweep) comes
through `read_bounded`, so none can be made to hang or run out of memory: a FIFO, a device
or a link to one (`/dev/zero` reports size 0) is refused before it is read, the file's own
size is never trusted (at most `max_bytes + 1` bytes are read), and a directory is named as
one. Every refusal is an InputError naming the file.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

from sheetgen.errors import InputError, Problem


def _refuse(path: Path, message: str) -> InputError:
    return InputError([Problem(str(path), 1, 1, "", message)])


def read_bounded(path: str | os.PathLike, max_bytes: int, kind: str,
                 missing_hint: str = "", expected: str = "") -> bytes:
    """The bytes of the regular file at `path` (links followed), refusing a missing file,
    a folder, anything that is not a regular file, and a file above `max_bytes`. `kind`
    ("job file", "sweep file" …) names the file in the messages; `expected` says what was
    expected (default: a `kind`)."""
    path = Path(path)
    expected = expected or f"a {kind}"
    try:
        mode = os.stat(path).st_mode
    except FileNotFoundError:
        raise _refuse(path, f"no such file; expected {expected}{missing_hint}") from None
    except OSError as error:
        raise _refuse(path, f"cannot be read ({error.strerror or error}); expected "
                      f"{expected}") from None
    if stat.S_ISDIR(mode):
        raise _refuse(path, f"is a directory; expected {expected}")
    if not stat.S_ISREG(mode):
        raise _refuse(path, f"is not a regular file (a device, pipe or socket); expected "
                      f"{expected}")
    try:
        # O_NONBLOCK: should the name be swapped for a pipe after the check, opening it
        # does not wait for a writer; fstat below then refuses it.
        handle = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except OSError as error:
        raise _refuse(path, f"cannot be read ({error.strerror or error})") from None
    try:
        if not stat.S_ISREG(os.fstat(handle).st_mode):
            raise _refuse(path, f"is not a regular file; expected {expected}")
        chunks, total = [], 0
        while total <= max_bytes:
            chunk = os.read(handle, min(1 << 20, max_bytes + 1 - total))
            if not chunk:
                break
            chunks.append(chunk)
            total += len(chunk)
    except OSError as error:
        raise _refuse(path, f"cannot be read ({error.strerror or error})") from None
    finally:
        os.close(handle)
    if total > max_bytes:
        raise _refuse(path, f"is more than {max_bytes:,} bytes; a {kind} is at most "
                      f"{max_bytes:,} bytes")
    return b"".join(chunks)
