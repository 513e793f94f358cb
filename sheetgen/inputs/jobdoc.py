"""The job file reference in Markdown, written from the models' own field descriptions.

`sheetgen schema --markdown > docs/jobfile.md` regenerates docs/jobfile.md, so the reference
cannot drift from what the loader accepts.
"""

from __future__ import annotations

import types
import typing

from pydantic import BaseModel
from pydantic_core import PydanticUndefined

from sheetgen.inputs.model import Job, PartsLibraryFile

INTRO = """# Job file reference

A job file is YAML (read with a safe loader: plain text, numbers, lists and mappings only).
Quantities take units in engineering notation: `4.7 uH` or `4.7 µH`, `150pF`, `7.1 MHz`,
`2.2 kohm` or `2.2 kΩ`, `0.1 %`, `20 mT`, `12.5 mm`, `10 mil`, `63 nH/turn²`,
`505 µH/100 turns`, `30 dBm`. A plain number is taken in SI units (except AL, which needs
its unit). `sheetgen schema` prints the same rules as JSON Schema for editors.

Start from a starter job: `sheetgen new series|parallel|toroid|solenoid|power-tank`.
"""


def _models_in(annotation) -> list[type[BaseModel]]:
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return [annotation]
    found = []
    for argument in typing.get_args(annotation):
        found += _models_in(argument)
    return found


def _type_text(annotation) -> str:
    origin = typing.get_origin(annotation)
    if origin is typing.Annotated:
        base, *extra = typing.get_args(annotation)
        for e in extra:
            if type(e).__name__ == "WithJsonSchema":
                text = e.json_schema.get("description", "quantity")
                dimension, _, example = text.partition(", e.g. ")
                return f"{dimension.split(' in ')[0]} (e.g. `{example}`)" if example else text
        return _type_text(base)
    if origin is typing.Literal:
        return " \\| ".join(f"`{a}`" for a in typing.get_args(annotation))
    if origin in (typing.Union, types.UnionType):
        parts = [_type_text(a) for a in typing.get_args(annotation) if a is not type(None)]
        return " or ".join(dict.fromkeys(parts))
    if origin in (tuple, list):
        return f"list of {_type_text(typing.get_args(annotation)[0])}"
    if origin is dict:
        return f"mapping of name → {_type_text(typing.get_args(annotation)[1])}"
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return f"mapping ({annotation.__name__})"
    return getattr(annotation, "__name__", str(annotation))


def _section(model: type[BaseModel], title: str, seen: set) -> list[str]:
    lines = [f"## {title}", "", (model.__doc__ or "").strip(), "",
             "| key | type | required | description |", "|---|---|---|---|"]
    nested = []
    for name, field in model.model_fields.items():
        required = field.is_required()
        default = ("" if required or field.default in (None, PydanticUndefined)
                   or isinstance(field.default, BaseModel) else f" (default {field.default!r})")
        children = _models_in(field.annotation)
        description = field.description or (" or ".join(
            (c.__doc__ or "").strip().splitlines()[0] for c in children) if children else "")
        description = description.replace("|", "\\|")
        annotation = (typing.Annotated[(field.annotation, *field.metadata)] if field.metadata
                      else field.annotation)
        lines.append(f"| `{name}` | {_type_text(annotation)} | "
                     f"{'yes' if required else 'no'} | {description}{default} |")
        for child in _models_in(field.annotation):
            if child not in seen:
                seen.add(child)
                nested.append((child, f"{title}.{name}" if len(_models_in(field.annotation)) == 1
                               else f"{title}.{name} ({child.__name__})"))
    lines.append("")
    for child, child_title in nested:
        lines += _section(child, child_title, seen)
    return lines


def job_reference_markdown() -> str:
    """The whole reference: the job file, then a parts library file."""
    seen: set = {Job, PartsLibraryFile}
    lines = [INTRO]
    lines += _section(Job, "job file", seen)
    lines += ["# Parts library files", "",
              "Each `*.yaml` file of the library folder holds `materials:` and/or `cores:`; "
              "a core or material written inline in a job takes the same keys.", ""]
    lines += _section(PartsLibraryFile, "library file", seen)
    return "\n".join(lines).rstrip() + "\n"
