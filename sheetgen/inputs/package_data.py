"""Where the shipped starters (templates/) and parts library (shared/) are.

Installed, they are the packages sheetgen.templates and sheetgen.bundled_library (see
pyproject.toml). Run from a source checkout without installing — as the test suite does,
importing sheetgen from the working tree — they are the repository's own top-level folders.
"""

from __future__ import annotations

from importlib import resources
from pathlib import Path

_REPOSITORY = Path(__file__).resolve().parents[2]


def _folder(package: str, checkout_folder: str) -> Path:
    try:
        return Path(str(resources.files(package)))
    except ModuleNotFoundError:
        return _REPOSITORY / checkout_folder


def templates_folder() -> Path:
    """The folder of the starter jobs and house styles."""
    return _folder("sheetgen.templates", "templates")


def bundled_library_folder() -> Path:
    """The parts library that ships with sheetgen."""
    return _folder("sheetgen.bundled_library", "shared")
