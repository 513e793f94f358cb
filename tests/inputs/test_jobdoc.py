"""The job file reference covers every key the loader accepts (docs/jobfile.md), and the
README's quickstart is the command CI runs (.ci/run)."""

from pathlib import Path

import pytest
from pydantic import BaseModel

from sheetgen.inputs.jobdoc import _models_in
from sheetgen.inputs.model import Job, PartsLibraryFile

ROOT = Path(__file__).resolve().parents[2]
REFERENCE = (ROOT / "docs" / "jobfile.md").read_text(encoding="utf-8")


def _all_models(model: type[BaseModel], seen: set) -> set:
    seen.add(model)
    for field in model.model_fields.values():
        for child in _models_in(field.annotation):
            if child not in seen:
                _all_models(child, seen)
    return seen


@pytest.mark.parametrize("model", sorted(_all_models(Job, set()) | _all_models(PartsLibraryFile, set()),
                                         key=lambda m: m.__name__), ids=lambda m: m.__name__)
def test_every_field_is_in_the_reference(model):
    for name, field in model.model_fields.items():
        assert f"| `{name}` |" in REFERENCE, f"{model.__name__}.{name} is missing from docs/jobfile.md"
        if field.description:
            assert field.description.replace("|", "\\|") in REFERENCE, (
                f"{model.__name__}.{name}: docs/jobfile.md is stale; run "
                "`sheetgen schema --markdown > docs/jobfile.md`")


def test_ci_runs_the_readme_test_command():
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    ci_lines = (ROOT / ".ci" / "run").read_text(encoding="utf-8").splitlines()
    command = ci_lines[-1].strip()
    assert command in readme.splitlines(), "README quickstart and .ci/run differ"
