"""The package's rooms import only the rooms below them (DEVELOPERS.md, "Layout").

Read with `ast` from the source files, so a forbidden import fails here with its
file:line even when no test happens to execute that line.
"""

from __future__ import annotations

import ast
import sys
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parents[1] / "sheetgen"

# Rooms from the bottom up; a room may import the top-level helpers and lower rooms.
ORDER = ("engine", "inputs", "design", "report", "sheet", "bench", "batch")
TOP_LEVEL = {"cli", "__main__", "errors", "quantities", "__init__"}
HELPERS = {"errors", "quantities"}
THIRD_PARTY = {  # beyond the standard library; None = anything
    "engine": {"numpy", "scipy"},
    "inputs": {"numpy", "yaml", "pydantic", "pydantic_core", "quantiphy"},
    "design": {"numpy"},
    "report": {"numpy"},
    "sheet": {"numpy", "reportlab", "matplotlib", "PIL", "fontTools"},
    "bench": {"numpy", "skrf", "pypdf", "pikepdf", "reportlab", "matplotlib", "pyhanko",
              "pyhanko_certvalidator"},
    "batch": {"tqdm"},
}
FORBIDDEN_ROOMS = {"sheet": {"engine"}}  # the sheet draws what the design gives


def _imports(path: Path, package_root: Path):
    """(line, absolute module) of every import in a module of the package."""
    tree = ast.parse(path.read_text(encoding="utf-8"), str(path))
    package = ["sheetgen", *path.relative_to(package_root).with_suffix("").parts[:-1]]
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for alias in node.names:
                yield node.lineno, alias.name
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package[: len(package) - node.level + 1]
                module = ".".join(base + ([node.module] if node.module else []))
            else:
                module = node.module or ""
            if module in ("sheetgen", "sheetgen.sheet", "sheetgen.engine") and not node.level:
                for alias in node.names:  # from sheetgen import quantities
                    yield node.lineno, f"{module}.{alias.name}"
            else:
                yield node.lineno, module


def _room(module: str) -> str | None:
    parts = module.split(".")
    if parts[0] != "sheetgen":
        return None
    if len(parts) == 1 or parts[1].startswith("__"):  # sheetgen, sheetgen.__version__
        return "__init__"
    return parts[1]


def layer_violations(package: Path = PACKAGE) -> list[str]:
    """Every import that breaks the layout, as 'file:line imports X (why)'."""
    found = []
    for path in sorted(package.rglob("*.py")):
        relative = path.relative_to(package)
        if len(relative.parts) == 1:
            if relative.stem not in TOP_LEVEL:
                found.append(f"{path}:1 is a top-level module; the top level holds only "
                             f"{', '.join(sorted(TOP_LEVEL - {'__init__'}))}")
            room = relative.stem
        else:
            room = relative.parts[0]
        for line, module in _imports(path, package):
            where = f"{path.relative_to(package.parent)}:{line}"
            target = _room(module)
            if target is None:
                top = module.split(".")[0]
                if top in sys.stdlib_module_names or top == "__future__":
                    continue
                allowed = THIRD_PARTY.get(room)
                if allowed is not None and top not in allowed:
                    found.append(f"{where} imports {module} ({room}/ may use "
                                 f"{', '.join(sorted(allowed)) or 'only the standard library'})")
                continue
            if room not in ORDER or target == room:
                continue
            if room == "engine":
                found.append(f"{where} imports {module} (the engine imports only itself, "
                             "numpy, scipy and the standard library)")
            elif target in HELPERS or target == "__init__":
                continue
            elif target in FORBIDDEN_ROOMS.get(room, ()):
                found.append(f"{where} imports {module} ({room}/ never imports {target}/)")
            elif target not in ORDER or ORDER.index(target) > ORDER.index(room):
                found.append(f"{where} imports {module} ({room}/ may import only rooms "
                             f"below it: {', '.join(ORDER[:ORDER.index(room)]) or 'none'})")
    return found


def test_every_room_imports_only_rooms_below_it():
    violations = layer_violations()
    assert not violations, "layering broken:\n" + "\n".join(violations)


@pytest.mark.parametrize("room, line, why", [
    ("engine", "from sheetgen.quantities import format_quantity", "the engine imports only"),
    ("engine", "import yaml", "engine/ may use"),
    ("design", "from sheetgen.report.rows import Row", "may import only rooms below"),
    ("report", "import reportlab", "report/ may use"),
    ("sheet", "from sheetgen.engine import resonance", "never imports engine"),
])
def test_a_forbidden_import_is_reported_with_its_file_and_line(tmp_path, room, line, why):
    """The check itself can fail: a planted import in a copy of the package is found."""
    package = tmp_path / "sheetgen"
    (package / room).mkdir(parents=True)
    (package / "__init__.py").write_text("")
    (package / room / "__init__.py").write_text("")
    (package / room / "planted.py").write_text(f'"""x"""\n\n{line}\n')
    violations = layer_violations(package)
    assert len(violations) == 1 and why in violations[0], violations
    assert f"sheetgen/{room}/planted.py:3" in violations[0]


def test_a_new_top_level_module_is_reported(tmp_path):
    package = tmp_path / "sheetgen"
    package.mkdir()
    (package / "helpers.py").write_text("")
    assert any("helpers.py:1 is a top-level module" in v for v in layer_violations(package))
