"""The team's parts library: named core materials and ring cores, read from YAML files.

Where it is found, first match wins: the folder given on the command line (--library);
the job's own `library:` field (relative to the job file); the nearest folder named
`shared/` above the job file that holds library files; the library shipped with sheetgen.
Every *.yaml file of the folder is read except house styles (style-NAME.yaml); names must
be unique across the files.

A built sheet records the entries its design used (`recorded_library_text`: the data as
written, attached as library.yaml), so the record re-designs anywhere from them; an entry
of a local library that reuses a shipped entry's name with other data is noted
(`LibraryEntry.shadows`) so the build can say which one it used.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from sheetgen.errors import InputError, Problem
from sheetgen.inputs.model import CoreSpec, MaterialSpec, PartsLibraryFile
from sheetgen.inputs.package_data import bundled_library_folder
from sheetgen.inputs.reader import load_validated_located

STYLE_FILE_PREFIX = "style-"  # house styles may share the team's library folder
LIBRARY_MARKERS = ("cores.yaml", "materials.yaml")
RECORDED_LIBRARY_HEADER = (
    "# The parts-library entries the design of this sheet used, as written in the library\n"
    "# at build (sheetgen build). `sheetgen verify` designs the attached job from these.\n")


@dataclass(frozen=True)
class LibraryEntry:
    """One entry of a library as its file wrote it: `kind` "cores" or "materials", the
    plain data, the file it came from, and the shipped library's file when that holds an
    entry of the same name with other data (None otherwise)."""

    kind: str
    name: str
    data: object
    origin: str
    shadows: str | None = None


@dataclass(frozen=True)
class PartsLibrary:
    """Materials and cores by name, and where each came from (for messages); `entries` the
    data as written, by "kind.name"."""

    folder: str
    materials: dict[str, MaterialSpec]
    cores: dict[str, CoreSpec]
    origin: dict[str, str]
    entries: dict[str, LibraryEntry] = field(default_factory=dict)

    def entry(self, kind: str, name: str) -> LibraryEntry | None:
        return self.entries.get(f"{kind}.{name}")


def find_library_folder(job_path: Path, named: str | None, cli_folder: Path | None) -> Path:
    """The folder to read, by the order in the module docstring."""
    if cli_folder is not None:
        return cli_folder
    if named is not None:
        return (job_path.resolve().parent / named)
    for folder in job_path.resolve().parents:
        candidate = folder / "shared"
        if any((candidate / marker).is_file() for marker in LIBRARY_MARKERS):
            return candidate
    return bundled_library_folder()


def library_files(folder: Path) -> list[Path]:
    """The parts files of a library folder: every *.yaml but the house styles kept beside
    them (style-NAME.yaml, see inputs/style.py)."""
    return [path for path in sorted(folder.glob("*.yaml"))
            if not path.name.startswith(STYLE_FILE_PREFIX)]


def load_library(folder: Path) -> PartsLibrary:
    """Read and validate every YAML file of `folder`; InputError lists all problems."""
    if not folder.is_dir():
        raise InputError([Problem(str(folder), 1, 1, "", "the parts library folder does not "
                                    "exist; expected a folder of YAML files")])
    materials: dict[str, MaterialSpec] = {}
    cores: dict[str, CoreSpec] = {}
    origin: dict[str, str] = {}
    entries: dict[str, LibraryEntry] = {}
    problems: list[Problem] = []
    for path in library_files(folder):
        try:
            part, located = load_validated_located(
                path, PartsLibraryFile, "a mapping with materials and/or cores",
                kind="parts library file")
        except InputError as error:
            problems += error.problems
            continue
        for kind, found, store in (("materials", part.materials, materials),
                                   ("cores", part.cores, cores)):
            for name, spec in found.items():
                key = f"{kind}.{name}"
                if key in origin:
                    line, column = located.key_marks.get((kind, name), (1, 1))
                    problems.append(Problem(str(path), line, column, key,
                                            f"is also defined in {origin[key]}; names must be "
                                            "unique in a library"))
                    continue
                store[name] = spec
                origin[key] = str(path)
                entries[key] = LibraryEntry(kind, name, located.data[kind][name], str(path))
    if problems:
        raise InputError(problems)
    return PartsLibrary(str(folder), materials, cores, origin, _with_shadows(folder, entries))


def _with_shadows(folder: Path, entries: dict[str, LibraryEntry]) -> dict[str, LibraryEntry]:
    """`entries` with `shadows` set where the shipped library has the name with other data."""
    shipped_folder = bundled_library_folder()
    if not entries or Path(folder).resolve() == Path(shipped_folder).resolve():
        return entries
    shipped = load_library(shipped_folder).entries
    out = {}
    for key, entry in entries.items():
        other = shipped.get(key)
        if other is not None and other.data != entry.data:
            entry = LibraryEntry(entry.kind, entry.name, entry.data, entry.origin, other.origin)
        out[key] = entry
    return out


def recorded_library_text(entries: tuple[LibraryEntry, ...]) -> str | None:
    """The entries used, as a library file of their own (None when none was used)."""
    if not entries:
        return None
    import yaml
    return RECORDED_LIBRARY_HEADER + yaml.safe_dump(library_document(entries), sort_keys=False,
                                                    allow_unicode=True, width=100)


def library_document(entries: tuple[LibraryEntry, ...]) -> dict[str, dict]:
    """The entries as a library file's data: {kind: {name: data}}."""
    document: dict[str, dict] = {}
    for entry in entries:
        document.setdefault(entry.kind, {})[entry.name] = entry.data
    return document
