"""The starter job files of templates/ and the bundled demo, read from package data."""

from __future__ import annotations

from pathlib import Path

from sheetgen.inputs.package_data import templates_folder

TEMPLATE_NAMES = ("series", "parallel", "toroid", "solenoid", "power-tank")
DEMO_NAME = "demo"


def _template_file(name: str):
    return templates_folder() / f"{name}.yaml"


def template_text(name: str) -> str:
    """The text of the starter job `name` (one of TEMPLATE_NAMES)."""
    if name not in TEMPLATE_NAMES and name != DEMO_NAME:
        raise KeyError(name)
    return _template_file(name).read_text(encoding="utf-8")


def demo_job_path() -> Path:
    """A filesystem path to the bundled demo job (package data is a real file when installed)."""
    return _template_file(DEMO_NAME)
