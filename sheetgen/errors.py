"""The two kinds of error a user can cause, and the one way a field path is written.

- `InputError`: a file (job, parts library, style, filled sheet, measured sweep) that cannot
  be used; it lists every `Problem` found, each at FILE:LINE:COLUMN with its field path.
  The CLI prints them and exits 2.
- `FieldError`: a well-formed job that asks for something that cannot be designed; it
  names the job field at fault, and the caller locates it in the file (`InputError`).

Field paths are written `section.key[index].key` everywhere (messages, results, tests).
"""

from __future__ import annotations

import re
from dataclasses import dataclass


def field_path(parts: tuple | list) -> str:
    """('ratings', 'accept', 0, 'check') → 'ratings.accept[0].check'."""
    text = ""
    for part in parts:
        if isinstance(part, int):
            text += f"[{part}]"
        else:
            text += f".{part}" if text else str(part)
    return text


_PART = re.compile(r"([^.\[\]]+)|\[(\d+)\]")


def field_parts(path: str) -> tuple:
    """'ratings.accept[0].check' → ('ratings', 'accept', 0, 'check'); the inverse of field_path."""
    return tuple(int(index) if index else name for name, index in _PART.findall(path or ""))


@dataclass(frozen=True)
class Problem:
    """One thing wrong with an input file, at a 1-based line and column.

    `message` says what is wrong; `expected` (optional) what would be right."""

    path: str
    line: int
    column: int
    field: str
    message: str
    expected: str = ""

    def __str__(self) -> str:
        where = f"{self.path}:{self.line}:{self.column}"
        text = f"{self.message}; expected {self.expected}" if self.expected else self.message
        return f"{where} {self.field}: {text}" if self.field else f"{where} {text}"


class InputError(Exception):
    """An input file that cannot be used; `problems` lists everything found, in file order."""

    def __init__(self, problems: list[Problem]):
        self.problems = sorted(problems, key=lambda p: (p.path, p.line, p.column))
        super().__init__("\n".join(str(p) for p in self.problems))


class FieldError(ValueError):
    """A job that is well-formed but cannot be designed as asked; `field` is the field at fault."""

    def __init__(self, field: str, message: str):
        self.field = field
        self.message = message
        super().__init__(f"{field}: {message}" if field else message)
