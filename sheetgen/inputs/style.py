"""House style of the sheet: organisation, optional logo, page size and which sections.

A style is a small YAML file (templates/style-default.yaml is the default), read with the
job file's own located reader so a bad style is reported as `FILE:LINE:COL field: message`.
The logo is a PNG or JPEG named relative to the job's folder and must stay inside that
folder tree: absolute paths, `..` and links that lead out are refused; so must a style file
the job names by path (sheet.style). A logo is at most MAX_LOGO_BYTES and MAX_LOGO_PIXELS.
"""

from __future__ import annotations

import typing
from dataclasses import dataclass
from pathlib import Path, PurePosixPath, PureWindowsPath
from typing import Annotated, Literal

from pydantic import Field

from sheetgen.errors import InputError, Problem
from sheetgen.inputs.files import read_bounded
from sheetgen.inputs.library import STYLE_FILE_PREFIX, find_library_folder
from sheetgen.inputs.model import Job, Section
from sheetgen.inputs.package_data import templates_folder
from sheetgen.inputs.reader import compose_located, field_position, read_yaml_text, validate_located

PAGE_SIZES = ("A4", "Letter")
# Every section the sheet can draw, in the default order. The identity (title block on
# every page) is not a section: it is always there.
# `design_record` is not a section but where part two, the design record, starts: on a new
# page, with its own running header (the sections before it are part one, for the bench).
SectionName = Literal["checks", "cautions", "notes", "schematic", "parts", "winding",
                      "procedure", "record", "rework", "design_record", "history", "values",
                      "coil", "performance", "limits", "setup", "stress", "ratings",
                      "response"]
SECTION_NAMES: tuple[str, ...] = typing.get_args(SectionName)
DEFAULT_STYLE_NAME = "style-default"
MAX_STYLE_BYTES = 100_000
MAX_LOGO_BYTES = 5_000_000
# A logo is printed a few centimetres wide: 16 million pixels is 4000 × 4000, over 1000 dpi
# at 10 cm (common practice), and far below the 89 million at which Pillow, which decodes
# it, warns of a decompression bomb.
MAX_LOGO_PIXELS = 16_000_000
_LOGO_SIGNATURES = {b"\x89PNG\r\n\x1a\n": "PNG", b"\xff\xd8\xff": "JPEG"}


@dataclass(frozen=True)
class HouseStyle:
    """A loaded, checked style; `logo_path` is resolved and inside the job's folder tree."""

    organisation: str
    page_size: str = "A4"
    sections: tuple[str, ...] = SECTION_NAMES
    logo_path: Path | None = None
    page_note: str | None = None
    source: str = "<default style>"
    logo_mark: tuple[int, int] = (1, 1)
    text_marks: tuple[tuple[str, int, int], ...] = ()  # (field, line, column) in the file

    def mark(self, field: str) -> tuple[int, int]:
        """Where `field` is written in the style file (1, 1 when not known)."""
        return next(((line, column) for name, line, column in self.text_marks
                     if name == field), (1, 1))


def default_style() -> HouseStyle:
    """The style shipped as templates/style-default.yaml (it has no logo)."""
    file = templates_folder() / f"{DEFAULT_STYLE_NAME}.yaml"
    return style_from_text(file.read_text(encoding="utf-8"), f"{DEFAULT_STYLE_NAME}.yaml", None)


def load_style(path: str | Path, job_dir: str | Path | None = None) -> HouseStyle:
    """Read a style file; its logo is looked up under `job_dir` (default: the style's folder)."""
    path = Path(path)
    shown = str(path)
    text = read_yaml_text(path, "style file", MAX_STYLE_BYTES,
                          " (a house style like templates/style-default.yaml)")
    return style_from_text(text, shown, Path(job_dir) if job_dir is not None else path.parent)


class StyleFile(Section):
    """A house style file: who the sheet is for, its page, and which sections in what order."""

    organisation: Annotated[str, Field(min_length=1, max_length=200)] = Field(
        description="the organisation's name for the title block")
    logo: str | None = Field(None, min_length=1, max_length=1000, description="a PNG or JPEG "
                             "file, relative to the job's folder (optional)")
    page_size: Literal["A4", "Letter"] = Field("A4", description="paper size")
    sections: tuple[SectionName, ...] = Field(SECTION_NAMES, min_length=1, description="the "
                                              "sections to draw, in order, each at most once")
    page_note: str | None = Field(None, max_length=200, description="one line printed on "
                                  "every page (optional)")


def style_from_text(text: str, shown: str, job_dir: Path | None) -> HouseStyle:
    """Parse and check a style's YAML text; every problem is reported at once."""
    located = compose_located(text, shown)
    problems = _repeated_sections(located, shown)
    try:
        style = validate_located(located, shown, StyleFile, "a mapping with organisation, "
                                 "page_size and sections")
    except InputError as error:
        raise InputError(error.problems + problems) from None
    logo_path = None
    if style.logo is not None:
        line, column = located.marks.get(("logo",), (1, 1))
        logo_path = _logo(style.logo, job_dir, lambda message: problems.append(
            Problem(shown, line, column, "logo", message)))
    if not style.organisation.strip():
        line, column = located.marks.get(("organisation",), (1, 1))
        problems.append(Problem(shown, line, column, "organisation",
                                "is blank; expected the organisation's name"))
    if problems:
        raise InputError(problems)
    return HouseStyle(organisation=style.organisation.strip(), page_size=style.page_size,
                      sections=tuple(style.sections), logo_path=logo_path,
                      page_note=style.page_note, source=shown,
                      logo_mark=located.marks.get(("logo",), (1, 1)),
                      text_marks=tuple((field, *located.marks[(field,)])
                                       for field in ("organisation", "page_note")
                                       if (field,) in located.marks))


def _repeated_sections(located, shown: str) -> list[Problem]:
    """A section listed twice (checked on the raw list, so it is reported with the rest)."""
    sections = located.data.get("sections") if isinstance(located.data, dict) else None
    problems, seen = [], set()
    for index, name in enumerate(sections if isinstance(sections, list) else []):
        if isinstance(name, str) and name in seen:
            line, column = located.marks.get(("sections", index), (1, 1))
            problems.append(Problem(shown, line, column, f"sections[{index}]",
                                    f"{name!r} appears twice; list each section once"))
        seen.add(name if isinstance(name, str) else None)
    return problems


def _logo(value: object, job_dir: Path | None, problem) -> Path | None:
    """The logo's resolved path, or None after reporting why it cannot be used."""
    if not isinstance(value, str) or not value.strip():
        problem("expected a path to a PNG or JPEG file, relative to the job's folder")
        return None
    if job_dir is None:
        problem("a logo needs the job's folder to be found in; this style has none")
        return None
    root = Path(job_dir).resolve()
    target = _inside(value, root, "logo", problem)
    if target is None:
        return None
    if not target.exists():
        problem(f'"{value}" does not exist in {root}; expected a PNG or JPEG file there')
        return None
    try:
        data = read_bounded(target, MAX_LOGO_BYTES, "logo", expected="a PNG or JPEG file")
    except InputError as error:
        problem(f'"{value}": {error.problems[0].message}')
        return None
    kind = next((name for signature, name in _LOGO_SIGNATURES.items()
                 if data.startswith(signature)), None)
    if kind is None:
        problem(f'"{value}" is not a PNG or JPEG image')
        return None
    size = image_size(data)
    if size is None:
        problem(f'"{value}" is a damaged {kind} image (its size cannot be read)')
        return None
    width, height = size
    if width < 1 or height < 1 or width * height > MAX_LOGO_PIXELS:
        problem(f'"{value}" is {width:,} × {height:,} pixels; a logo is at most '
                f"{MAX_LOGO_PIXELS:,} pixels (e.g. 4000 × 4000)")
        return None
    return target


def image_size(data: bytes) -> tuple[int, int] | None:
    """(width, height) in pixels from a PNG's IHDR chunk (ISO/IEC 15948 §11.2.2) or a
    JPEG's start-of-frame marker (ITU-T T.81 B.2.2); None when neither can be found."""
    if data.startswith(b"\x89PNG\r\n\x1a\n"):
        if len(data) < 24 or data[12:16] != b"IHDR":
            return None
        return int.from_bytes(data[16:20], "big"), int.from_bytes(data[20:24], "big")
    at = 2  # after SOI
    while at + 4 <= len(data):
        if data[at] != 0xFF:
            return None
        marker = data[at + 1]
        if marker == 0xFF:  # fill byte
            at += 1
            continue
        if marker in (0x01, *range(0xD0, 0xD8)):  # markers without a length
            at += 2
            continue
        length = int.from_bytes(data[at + 2:at + 4], "big")
        if marker in (*range(0xC0, 0xC4), *range(0xC5, 0xC8), *range(0xC9, 0xCC),
                      *range(0xCD, 0xD0)):  # SOFn: precision, height, width
            if at + 9 > len(data):
                return None
            return int.from_bytes(data[at + 7:at + 9], "big"), int.from_bytes(data[at + 5:at + 7], "big")
        at += 2 + length
    return None


def _inside(value: str, root: Path, what: str, problem) -> Path | None:
    """`value`, a path relative to `root`, resolved; None after reporting (through
    `problem`) an absolute path, a `..` or a link that leads out of `root`'s tree."""
    if (PurePosixPath(value).is_absolute() or PureWindowsPath(value).is_absolute()
            or PureWindowsPath(value).drive or value.startswith(("/", "\\", "~"))):
        problem(f'"{value}" is an absolute path; give the {what} relative to the job\'s folder')
        return None
    if ".." in PurePosixPath(value.replace("\\", "/")).parts:
        problem(f'"{value}" leads out of the job\'s folder with ".."; keep the {what} in the '
                "job's folder or below it")
        return None
    root = Path(root).resolve()
    target = (root / value).resolve()
    if not target.is_relative_to(root):
        problem(f'"{value}" resolves to {target}, outside the job\'s folder {root} (through a '
                f"link); keep the {what} inside the job's folder tree")
        return None
    return target


def _confined_style(job_path: Path, wanted: str) -> Path:
    """The style file a job names by path: inside the job's folder tree, like the logo (a
    style from elsewhere is named by --style, or kept in the library as style-NAME.yaml)."""
    problems: list[Problem] = []

    def problem(message: str) -> None:
        line, column = field_position(job_path, "sheet.style")
        problems.append(Problem(str(job_path), line, column, "sheet.style", message))

    target = _inside(wanted, job_path.resolve().parent, "style file", problem)
    if target is None:
        raise InputError(problems)
    return target


def check_logo_inside(style: HouseStyle, job_dir: Path | None) -> None:
    """Refuse to draw a logo that is not inside `job_dir` (the job being rendered)."""
    if style.logo_path is None or job_dir is None:
        return
    root = Path(job_dir).resolve()
    if not style.logo_path.resolve().is_relative_to(root):
        line, column = style.logo_mark
        raise InputError([Problem(style.source, line, column, "logo",
                                    f"{style.logo_path} is outside the job's folder {root}; "
                                    "keep the logo inside the job's folder tree")])


def resolve_style(job_path: Path, job: Job, cli_style: Path | None,
                  library_folder: Path | None) -> HouseStyle | None:
    """The house style: --style, else the job's sheet.style (a path, or a name looked up as
    style-NAME.yaml in the parts library folder and then in the shipped templates)."""
    job_dir = job_path.resolve().parent
    if cli_style is not None:
        return load_style(cli_style, job_dir)
    wanted = job.sheet.style
    if wanted is None:
        return None
    if wanted.endswith((".yaml", ".yml")) or "/" in wanted or "\\" in wanted:
        return load_style(_confined_style(job_path, wanted), job_dir)
    folders = [find_library_folder(job_path, job.library, library_folder),
               templates_folder()]
    for folder in folders:
        candidate = folder / f"{STYLE_FILE_PREFIX}{wanted}.yaml"
        if candidate.is_file():
            return load_style(candidate, job_dir)
    line, column = field_position(job_path, "sheet.style")
    looked = " and ".join(str(f) for f in folders)
    raise InputError([Problem(str(job_path), line, column, "sheet.style",
                                f"no house style named {wanted!r} (style-{wanted}.yaml) in "
                                f"{looked}; expected a style name or a path to a style file")])
