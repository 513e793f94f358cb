"""Text the sheet cannot print: characters that the embedded fonts have no glyph for.

Such a character would come out as an empty box, so a job (or house style) that holds one
is bad input, reported at the field that holds it with the character named.
"""

from __future__ import annotations

import unicodedata
from pathlib import Path

from sheetgen.errors import InputError, Problem, field_path
from sheetgen.inputs.model import Job
from sheetgen.inputs.reader import field_position
from sheetgen.sheet import fonts

_LAYOUT_CHARACTERS = {"\n", "\r", "\t"}


def missing_glyphs(text: str) -> list[str]:
    """The characters of `text` (in order, once each) that a face of the sheet lacks."""
    from reportlab.pdfbase import pdfmetrics
    fonts.register_fonts()
    maps = [pdfmetrics.getFont(face).face.charToGlyph for face in (fonts.REGULAR, fonts.BOLD)]
    missing: list[str] = []
    for character in text:
        if character in _LAYOUT_CHARACTERS or character in missing:
            continue
        if any(ord(character) not in glyphs for glyphs in maps):
            missing.append(character)
    return missing


def _strings(value, path: tuple):
    if isinstance(value, str):
        yield path, value
    elif isinstance(value, dict):
        for key, item in value.items():
            yield from _strings(item, path + (key,))
    elif isinstance(value, (list, tuple)):
        for index, item in enumerate(value):
            yield from _strings(item, path + (index,))


def _described(character: str) -> str:
    name = unicodedata.name(character, "unnamed character")
    return f"{character!r} (U+{ord(character):04X} {name})"


def check_printable(job: Job, job_path: Path, style=None) -> None:
    """Refuse a job (and its house style) holding text the sheet's fonts cannot draw."""
    problems = []
    for path, text in _strings(job.model_dump(mode="json"), ()):
        missing = missing_glyphs(text)
        if missing:
            field = field_path(path)
            line, column = field_position(job_path, field)
            problems.append(Problem(str(job_path), line, column, field,
                                    f"{', '.join(map(_described, missing))} cannot be printed: "
                                    "the sheet's font (DejaVu Sans) has no glyph for it",
                                    "text in Latin, Greek or Cyrillic script"))
    if style is not None:
        for field in ("organisation", "page_note"):
            missing = missing_glyphs(getattr(style, field) or "")
            if missing:
                problems.append(Problem(style.source, *style.mark(field), field,
                                        f"{', '.join(map(_described, missing))} cannot be "
                                        "printed: the sheet's font has no glyph for it"))
    if problems:
        raise InputError(problems)
