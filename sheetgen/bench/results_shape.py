"""The shape of the results a sheet carries, checked before grade, verify or diff read them.

The content hash proves only that the attachments are the ones hashed, and anyone can
recompute it, so the attached results.json is untrusted input: it must be a JSON object
no deeper than MAX_DEPTH, with each section the reader uses of the type the results
contract (docs/results.md) gives it. Anything else is an InputError naming the file and
the field, never an AttributeError deep in a reader.
"""

from __future__ import annotations

from sheetgen.errors import InputError, Problem, field_path

MAX_DEPTH = 32  # the contract nests about five levels
FIELD = "attachments.results.json"
MAPPINGS = ("sheet", "components", "resonance", "stress", "inductor", "limits", "variation",
            "test_record")
LISTS_OF_MAPPINGS = ("ratings", "checks", "cautions")
TEXT_KEYS = {"cautions": ("level", "code", "text")}
ROW_TEXT = ("field", "quantity")  # required in every test_record row
ROW_OPTIONAL_TEXT = ("unit", "display_unit", "as_found_field", "verdict_field", "label")
ROW_NUMBERS = ("min", "max")


def depth(value: object) -> int:
    """How deep lists and mappings nest in `value` (a scalar is 0), without recursion."""
    deepest, stack = 0, [(value, 0)]
    while stack:
        item, level = stack.pop()
        if isinstance(item, (dict, list)):
            level += 1
            deepest = max(deepest, level)
            if level > MAX_DEPTH:
                return level
            stack.extend((child, level) for child in
                         (item.values() if isinstance(item, dict) else item))
    return deepest


def _kind(value: object) -> str:
    return {dict: "a mapping", list: "a list", str: "text", bool: "true/false",
            type(None): "null"}.get(type(value), "a number")


def results_problems(results: object, shown: str) -> list[Problem]:
    """What is wrong with the shape of an attached results document (empty when sound)."""

    def problem(path: tuple, message: str, expected: str) -> Problem:
        return Problem(shown, 1, 1, field_path((FIELD, *path)), message, expected)

    if depth(results) > MAX_DEPTH:
        return [problem((), f"nests more than {MAX_DEPTH} levels deep",
                        "the results document sheetgen build attaches (docs/results.md)")]
    if not isinstance(results, dict):
        return [problem((), f"is {_kind(results)}", "a JSON object (docs/results.md)")]
    found = []
    for name in MAPPINGS:
        if results.get(name) is not None and not isinstance(results[name], dict):
            found.append(problem((name,), f"is {_kind(results[name])}", "a mapping"))
    for name in LISTS_OF_MAPPINGS:
        items = results.get(name)
        if items is None:
            continue
        if not isinstance(items, list):
            found.append(problem((name,), f"is {_kind(items)}", "a list of mappings"))
            continue
        for index, item in enumerate(items):
            if not isinstance(item, dict):
                found.append(problem((name, index), f"is {_kind(item)}", "a mapping"))
                continue
            for key in TEXT_KEYS.get(name, ()):
                if item.get(key) is not None and not isinstance(item[key], str):
                    found.append(problem((name, index, key), f"is {_kind(item[key])}", "text"))
    record = results.get("test_record")
    if isinstance(record, dict) and record.get("values") is not None:
        found += _row_problems(record["values"], problem)
    return found


def _row_problems(rows: object, problem) -> list[Problem]:
    """test_record.values: a list of rows, each with the text and numbers grade reads."""
    where = ("test_record", "values")
    if not isinstance(rows, list):
        return [problem(where, f"is {_kind(rows)}", "a list of rows")]
    found = []
    for index, row in enumerate(rows):
        if not isinstance(row, dict):
            found.append(problem((*where, index), f"is {_kind(row)}", "a mapping"))
            continue
        for key in ROW_TEXT:
            if not isinstance(row.get(key), str) or not row[key]:
                found.append(problem((*where, index, key), f"is {_kind(row.get(key))}", "text"))
        for key in ROW_OPTIONAL_TEXT:
            if row.get(key) is not None and not isinstance(row[key], str):
                found.append(problem((*where, index, key), f"is {_kind(row[key])}", "text"))
        for key in ROW_NUMBERS:
            value = row.get(key)
            if value is not None and (isinstance(value, bool)
                                      or not isinstance(value, (int, float))):
                found.append(problem((*where, index, key), f"is {_kind(value)}",
                                     "a number or null"))
    return found


def check_results(results: object, shown: str) -> None:
    """Raise InputError listing every problem of the results' shape."""
    found = results_problems(results, shown)
    if found:
        raise InputError(found)
