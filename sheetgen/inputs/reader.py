"""Read a YAML job file into a validated Job, or report every problem with its place.

YAML is read with PyYAML's safe composer only; every node keeps its line and column, so
each message reads `FILE:LINE:COLUMN field.path: what is wrong; what is expected`.
"""

from __future__ import annotations

import difflib
import os
import re
import types
import typing
from dataclasses import dataclass
from pathlib import Path

import yaml
from pydantic import BaseModel, ValidationError

from sheetgen.errors import InputError, Problem, field_parts, field_path
from sheetgen.inputs.files import read_bounded
from sheetgen.inputs.model import BY_NAME, INLINE, Job
from sheetgen.quantities import shown_input

UNION_TAGS = {BY_NAME, INLINE}

MAX_JOB_BYTES = 1_000_000
MAX_NODES = 100_000
# No input file nests deeper than a handful of levels (a job's deepest field is about six);
# 64 leaves room and keeps every reader far from Python's recursion limit.
MAX_DEPTH = 64
_PLAIN_TAGS = {
    "tag:yaml.org,2002:" + name
    for name in ("str", "int", "float", "bool", "null", "map", "seq", "timestamp")
}


@dataclass(frozen=True)
class Located:
    """Plain data from YAML with the mark of every mapping key and value, by field path."""

    data: object
    marks: dict[tuple, tuple[int, int]]
    key_marks: dict[tuple, tuple[int, int]]


JOB_FILE_HINT = " (see `sheetgen new parallel`)"


def read_job_text(path: Path) -> str:
    """A job file's text (see read_yaml_text)."""
    return read_yaml_text(path, "job file", MAX_JOB_BYTES, JOB_FILE_HINT)


def read_yaml_text(path: Path, kind: str, max_bytes: int, missing_hint: str = "") -> str:
    """The file's text, refusing what is not a readable, sane-sized UTF-8 file; `kind`
    ("job file", "style file" …) names it in the messages."""
    shown = str(path)
    raw = read_bounded(path, max_bytes, kind, missing_hint, f"a YAML {kind}")
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as error:
        line = raw.count(b"\n", 0, error.start) + 1
        column = error.start - (raw.rfind(b"\n", 0, error.start) + 1) + 1
        raise InputError([Problem(shown, line, column, "", f"byte 0x{raw[error.start]:02x} is "
                                    f"not UTF-8; save the {kind} as UTF-8 text")]) from None
    return text.removeprefix("\ufeff")


def compose_located(text: str, shown: str) -> Located:
    """YAML text → plain data, with marks; only the plain YAML types, no duplicate keys."""
    if not text.strip():
        raise InputError([Problem(shown, 1, 1, "", "the file is empty; expected a mapping with "
                                    "sheet, circuit, inductor, capacitor and source")])
    try:
        loader = yaml.SafeLoader(text)
    except yaml.reader.ReaderError as error:  # a character YAML does not allow (e.g. NUL)
        line = text.count("\n", 0, error.position) + 1
        column = error.position - (text.rfind("\n", 0, error.position) + 1) + 1
        raise InputError([Problem(shown, line, column, "",
                                  f"the control character U+{error.character:04X} is not "
                                  "allowed in a YAML file; remove it")]) from None
    try:
        node = loader.get_single_node()
    except RecursionError:  # PyYAML composes recursively: thousands of levels exhaust it
        raise InputError([Problem(shown, 1, 1, "", f"nested more than {MAX_DEPTH} levels deep; "
                                  "an input file is a few levels of mappings and lists")]) from None
    except yaml.MarkedYAMLError as error:
        mark = error.problem_mark or error.context_mark
        what = error.problem or "not valid YAML"
        line, column = (mark.line + 1, mark.column + 1) if mark else (1, 1)
        raise InputError([Problem(shown, line, column, "",
                                    f"YAML syntax: {what}; expected valid YAML")]) from None
    except yaml.YAMLError as error:
        raise InputError([Problem(shown, 1, 1, "", f"YAML syntax: {error}")]) from None
    finally:
        loader.dispose()
    if node is None:
        raise InputError([Problem(shown, 1, 1, "", "the file holds no YAML document; expected "
                                    "a mapping with sheet, circuit, inductor, capacitor and source")])
    problems: list[Problem] = []
    marks: dict[tuple, tuple[int, int]] = {}
    key_marks: dict[tuple, tuple[int, int]] = {}
    count = [0]
    constructor = yaml.constructor.SafeConstructor()

    def at(n) -> tuple[int, int]:
        return n.start_mark.line + 1, n.start_mark.column + 1

    def build(n, path: tuple):
        count[0] += 1
        if count[0] > MAX_NODES:
            raise InputError([Problem(shown, *at(n), field_path(path),
                                        f"more than {MAX_NODES:,} YAML nodes (aliases expanded); "
                                        "a job file is far smaller")])
        if len(path) > MAX_DEPTH:
            raise InputError([Problem(shown, *at(n), field_path(path[:MAX_DEPTH]),
                                      f"nested more than {MAX_DEPTH} levels deep; an input "
                                      "file is a few levels of mappings and lists")])
        marks[path] = at(n)
        if n.tag not in _PLAIN_TAGS:
            problems.append(Problem(shown, *at(n), field_path(path),
                                    f"the tag {n.tag!r} is not allowed; expected plain YAML "
                                    "values (text, numbers, lists, mappings)"))
            return None
        if isinstance(n, yaml.MappingNode):
            result = {}
            for key_node, value_node in n.value:
                if (not isinstance(key_node, yaml.ScalarNode)
                        or key_node.tag != "tag:yaml.org,2002:str"):
                    problems.append(Problem(shown, *at(key_node), field_path(path),
                                            "a key must be plain text"))
                    continue
                key = key_node.value
                if key in result:
                    problems.append(Problem(shown, *at(key_node), field_path(path + (key,)),
                                            "appears twice; give each key once"))
                    continue
                key_marks[path + (key,)] = at(key_node)
                result[key] = build(value_node, path + (key,))
            return result
        if isinstance(n, yaml.SequenceNode):
            return [build(item, path + (index,)) for index, item in enumerate(n.value)]
        if n.tag == "tag:yaml.org,2002:timestamp":
            return n.value  # a date is kept as the text written; the model checks it
        return constructor.construct_object(n)

    data = build(node, ())
    if problems:
        raise InputError(problems)
    return Located(data, marks, key_marks)


def load_job(path: str | os.PathLike) -> Job:
    """Read and validate a job file. Raises InputError listing every problem found."""
    return load_validated(path, Job, "a mapping with sheet, circuit, inductor, capacitor and "
                          "source at the top level", "job file", JOB_FILE_HINT)


def load_validated(path: str | os.PathLike, model: type[BaseModel], expected: str,
                   kind: str, missing_hint: str = ""):
    """Read a YAML `kind` of file and validate it as `model`, every problem located in it."""
    return load_validated_located(path, model, expected, kind, missing_hint)[0]


def load_validated_located(path: str | os.PathLike, model: type[BaseModel], expected: str,
                           kind: str, missing_hint: str = "") -> tuple[BaseModel, Located]:
    """load_validated, also returning the located data (marks of every node) it read."""
    path = Path(path)
    shown = str(path)
    located = compose_located(read_yaml_text(path, kind, MAX_JOB_BYTES, missing_hint), shown)
    return validate_located(located, shown, model, expected), located


def validate_located(located: Located, shown: str, model: type[BaseModel], expected: str):
    """Validate located data as `model`; every problem is reported at its line and column."""
    if not isinstance(located.data, dict):
        raise InputError([Problem(shown, 1, 1, "", f"expected {expected}")])
    try:
        return model.model_validate(located.data)
    except ValidationError as error:
        raise InputError([_problem(shown, located, e, model) for e in error.errors()]) from None


def _problem(shown: str, located: Located, error: dict, root: type[BaseModel]) -> Problem:
    """One pydantic error → a Problem at the right node, with a message a person can act on."""
    path = _data_path(located.data, error["loc"])
    named = (error.get("ctx") or {}).get("field")
    if isinstance(named, str) and not error["loc"]:  # a whole-file check naming its field
        path = field_parts(named)
    kind = error["type"]
    field = field_path(path)
    if kind == "extra_forbidden":
        line, column = located.key_marks.get(path, located.marks.get(path, (1, 1)))
        allowed = _allowed_keys(root, path[:-1], located.data)
        close = ([key for key in allowed if key.startswith(str(path[-1]))]
                 or difflib.get_close_matches(str(path[-1]), allowed, n=1, cutoff=0.6))
        hint = f"did you mean {close[0]!r}? " if close else ""
        return Problem(shown, line, column, field,
                       f"unknown key; {hint}expected one of: {', '.join(sorted(allowed))}")
    if kind == "missing":
        parent = path[:-1]
        line, column = located.marks.get(parent, (1, 1))
        model = _model_at(root, parent, located.data)
        described = model.model_fields[path[-1]].description if model else None
        expected = f"expected {described}" if described else "this field is required"
        return Problem(shown, line, column, field, f"is missing; {expected}")
    if kind in ("union_tag_invalid", "union_tag_not_found"):
        tags = error.get("ctx", {}).get("expected_tags") or _forms(root, path)
        path = path + ("form",)
        field = field_path(path)
        line, column = located.marks.get(path, located.marks.get(path[:-1], (1, 1)))
        given = error.get("ctx", {}).get("tag")
        what = f"{_shown(given)} is not a form" if given is not None else "is missing"
        return Problem(shown, line, column, field, f"{what}; expected one of {tags}")
    line, column = located.marks.get(path, located.marks.get(path[:-1], (1, 1)))
    message = error["msg"]
    if kind == "literal_error":
        allowed = re.findall(r"'([^']*)'", error.get("ctx", {}).get("expected", ""))
        close = difflib.get_close_matches(str(error.get("input")), allowed, n=1, cutoff=0.6)
        hint = f"did you mean {close[0]!r}? " if close else ""
        message = f"{_shown(error.get('input'))} is not allowed; {hint}{message[:1].lower()}{message[1:]}"
    elif kind in ("model_type", "dict_type"):
        message = f"expected a mapping of keys, got {_shown(error.get('input'))}"
    elif kind in ("string_type", "int_type", "int_parsing", "int_from_float", "float_type"):
        message = f"{_shown(error.get('input'))}: {message.lower()}"
    return Problem(shown, line, column, field, message)


def _shown(value: object) -> str:
    if isinstance(value, dict):
        return "a mapping"
    if isinstance(value, list):
        return "a list"
    return shown_input(value)


def _data_path(data: object, loc: tuple) -> tuple:
    """pydantic's loc without the union tags it inserts (kept only what exists in the data)."""
    path: list = []
    node = data
    for index, part in enumerate(loc):
        if isinstance(node, dict) and part in node:
            node = node[part]
            path.append(part)
        elif isinstance(node, list) and isinstance(part, int) and part < len(node):
            node = node[part]
            path.append(part)
        elif (isinstance(node, dict) and node.get("form") == part) or part in UNION_TAGS:
            continue  # a union's tag (the inductor's form, name-or-inline): not in the data
        elif index == len(loc) - 1 and isinstance(node, dict):
            path.append(part)  # a missing or unknown key
    return tuple(path)


def _allowed_keys(model: type[BaseModel], path: tuple, data: object) -> list[str]:
    """The field names allowed at `path` under `model` (unions chosen by the data's `form`)."""
    found = _model_at(model, path, data)
    return list(found.model_fields) if found else []


def _model_at(model: type[BaseModel], path: tuple, data: object):
    """The model class that validates the mapping at `path`, or None."""
    current: object = model
    node = data
    skip = False  # the next part is a list index or a mapping's own key (a library name)
    for part in path:
        if isinstance(node, dict):
            node = node.get(part)
        elif isinstance(node, list) and isinstance(part, int) and part < len(node):
            node = node[part]
        else:
            node = None
        if skip:
            skip = False
            continue
        field = (current.model_fields.get(part)
                 if isinstance(current, type) and issubclass(current, BaseModel) else None)
        if field is None:
            return None
        skip = typing.get_origin(field.annotation) in (tuple, list, dict)
        current = _pick_model(field.annotation, node)
        if current is None:
            return None
    return current if isinstance(current, type) else None


def _forms(root: type[BaseModel], path: tuple) -> str:
    """The allowed values of `form` for the union field at `path`, quoted and listed."""
    parent = _model_at(root, path[:-1], None)
    field = parent.model_fields.get(path[-1]) if parent else None
    if field is None:
        return "the documented forms"
    forms = []
    for member in typing.get_args(typing.get_args(field.annotation)[0]
                                  if typing.get_origin(field.annotation) is typing.Annotated
                                  else field.annotation):
        form = getattr(member, "model_fields", {}).get("form")
        if form is not None:
            forms += [repr(value) for value in typing.get_args(form.annotation)]
    return ", ".join(forms)


def _pick_model(annotation, node):
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    origin = typing.get_origin(annotation)
    if origin is typing.Annotated:
        return _pick_model(typing.get_args(annotation)[0], node)
    if origin in (tuple, list):
        return _pick_model(typing.get_args(annotation)[0], None)
    if origin is dict:
        return _pick_model(typing.get_args(annotation)[1], None)
    if origin in (typing.Union, types.UnionType):
        models = [m for m in (_pick_model(a, node) for a in typing.get_args(annotation)) if m]
        for candidate in models:
            form = candidate.model_fields.get("form")
            wanted = node.get("form") if isinstance(node, dict) else None
            if form is not None and wanted in typing.get_args(form.annotation):
                return candidate
        return models[0] if models else None
    return None


def field_position(path: str | os.PathLike, field: str) -> tuple[int, int]:
    """Line and column of a dotted field in a job file already known to load (1, 1 if absent)."""
    located = compose_located(read_job_text(Path(path)), str(path))
    parts = field_parts(field)
    while parts and parts not in located.marks:
        parts = parts[:-1]
    return located.marks.get(parts, (1, 1))
