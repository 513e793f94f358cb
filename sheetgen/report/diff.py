"""What changed between two revisions of a design: inputs, the parts-library entries used,
derived values, limits, the test record (its windows), ratings, cautions and every other
key of the results, from two job documents and two results documents (sheetgen.results/1).

Pure: plain data in, rows out. Numbers are equal within a relative tolerance of 1e-9; a
value is shown in engineering notation with the unit its key's suffix names.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass

from sheetgen.errors import field_path
from sheetgen.report.formatting import quantity_text

REL_TOL = 1e-9
UNIT_SUFFIXES = (("_hz", "Hz"), ("_f", "F"), ("_h", "H"), ("_ohm", "Ω"), ("_v", "V"),
                 ("_a", "A"), ("_w", "W"), ("_t", "T"), ("_m", "m"))
DERIVED = ("components", "resonance", "stress", "inductor")
# Results keys a section below reads; every other key but the computing tool's version goes
# to the "other" section, so no part of the results is left uncompared.
SECTIONED = {*DERIVED, "variation", "limits", "test_record", "ratings", "checks", "cautions",
             "tool_version"}
MISSING = "—"
WRAP = 60  # characters of a text per line of the table (a word, path or key is not cut)


@dataclass(frozen=True)
class DiffRow:
    """One changed value: its section, field path, and the value in A and in B (None where
    absent or not applicable)."""

    section: str
    key: str
    a: object
    b: object


def _flatten(value, prefix: tuple = ()) -> dict[str, object]:
    """{'a.b[0].c': leaf} of nested mappings and lists."""
    if isinstance(value, dict):
        if not value and prefix:
            return {field_path(prefix): value}
        out = {}
        for key, item in value.items():
            out.update(_flatten(item, (*prefix, str(key))))
        return out
    if isinstance(value, (list, tuple)):
        if not value and prefix:
            return {field_path(prefix): None}
        out = {}
        for index, item in enumerate(value):
            out.update(_flatten(item, (*prefix, index)))
        return out
    return {field_path(prefix): value}


def same(a, b) -> bool:
    """Equal values; numbers (not booleans) equal within a relative tolerance of 1e-9."""
    numbers = (int, float)
    if (isinstance(a, numbers) and isinstance(b, numbers)
            and not isinstance(a, bool) and not isinstance(b, bool)):
        return math.isclose(a, b, rel_tol=REL_TOL, abs_tol=0.0)
    return a == b


def _by_name(items: list[dict], name) -> dict[str, dict]:
    """Items keyed by name(item), a repeated name numbered name[1], name[2] …"""
    out: dict[str, dict] = {}
    for item in items or ():
        key = name(item)
        if key in out:
            count = 1
            while f"{key}[{count}]" in out:
                count += 1
            key = f"{key}[{count}]"
        out[key] = item
    return out


def _sections(job: object, results: dict, library: object = None) -> dict[str, dict[str, object]]:
    """Each section's flat {key: value} for one revision (`library`: the parts-library
    entries its design used, {kind: {name: data}}, or None when not known)."""
    derived = {}
    for name in DERIVED:
        derived.update(_flatten(results.get(name), (name,)))
    # the tolerances the variation used; its statistics are summed up by the limits
    derived.update({f"variation.{key}": value for key, value in
                    (results.get("variation") or {}).items() if not isinstance(value, dict)})
    ratings = {}
    for key, rating in _by_name(results.get("ratings", []),
                                lambda r: f"{r.get('part')}.{r.get('quantity')}").items():
        ratings.update({f"{key}.{field}": value for field, value in rating.items()
                        if field != "advice"})
    for key, check in _by_name(results.get("checks", []),
                               lambda c: f"{c.get('code')}.{c.get('field')}").items():
        ratings[f"check.{key}"] = check.get("text")
    cautions = {key: f"{c.get('level', '').upper()}: {c.get('text')}"
                for key, c in _by_name(results.get("cautions", []),
                                       lambda c: str(c.get("code"))).items()}
    variation = results.get("variation") or {}
    other = _flatten({key: value for key, value in results.items() if key not in SECTIONED})
    # the variation's statistics, which the limits sum up, are compared too
    other.update(_flatten({key: value for key, value in variation.items()
                           if isinstance(value, dict)}, ("variation",)))
    return {
        "inputs": _flatten(job),
        "library": _flatten(library, ("library",)) if library else {},
        "derived": derived,
        "limits": _flatten(results.get("limits"), ("limits",)),
        "test_record": _test_record(results.get("test_record")),
        "ratings": ratings,
        "cautions": cautions,
        "other": other,
    }


def _test_record(record) -> dict[str, object]:
    """The test record flat, each window row keyed by its form field
    ('test_record.measured.f0_hz.min'), so a row reads the same wherever it is printed."""
    if not isinstance(record, dict):
        return _flatten(record, ("test_record",))
    rows = record.get("values")
    out = _flatten({k: v for k, v in record.items() if k != "values"}, ("test_record",))
    if not isinstance(rows, list) or not all(isinstance(row, dict) for row in rows):
        out.update(_flatten(rows, ("test_record", "values")))
        return out
    for key, row in _by_name(rows, lambda r: str(r.get("field"))).items():
        out.update(_flatten(row, ("test_record", key)))
    return out


def diff_rows(job_a: object, results_a: dict, job_b: object, results_b: dict,
              library_a: object = None, library_b: object = None) -> list[DiffRow]:
    """Every value that differs between revision A and revision B, section by section, in
    the order of A's keys (keys only in B after them). The library sections compare the
    parts-library entries each design used, when both are given."""
    if library_a is None or library_b is None:
        library_a = library_b = None
    a_sections = _sections(job_a, results_a, library_a)
    b_sections = _sections(job_b, results_b, library_b)
    rows = []
    for section, a_values in a_sections.items():
        b_values = b_sections[section]
        for key in [*a_values, *(k for k in b_values if k not in a_values)]:
            a, b = a_values.get(key), b_values.get(key)
            if not same(a, b):
                rows.append(DiffRow(section, key, a, b))
    return rows


def unit_of(key: str) -> str | None:
    """The unit the suffix of a key names ('limits.f0_min_hz' → 'Hz'), else of the key
    holding it ('variation.f0_hz.low' → 'Hz'), else None."""
    for part in reversed(key.split(".")):
        name = part.split("[", 1)[0]
        for suffix, unit in UNIT_SUFFIXES:
            if name.endswith(suffix):
                return unit
    return None


def _shown(value, unit: str | None, digits: int) -> str:
    if value is None:
        return MISSING
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return str(value)
    if not math.isfinite(value):
        return str(value)
    if unit is not None:
        return quantity_text(float(value), unit, digits)
    if isinstance(value, int):
        return str(value)
    return f"{value:.{digits}g}"


def shown_pair(row: DiffRow) -> tuple[str, str]:
    """A and B as written for people: engineering notation, with as many figures as it
    takes (4 to 12) for two different numbers to read differently."""
    unit = unit_of(row.key)
    digits = 4
    a, b = _shown(row.a, unit, digits), _shown(row.b, unit, digits)
    while a == b and digits < 12:
        digits += 1
        a, b = _shown(row.a, unit, digits), _shown(row.b, unit, digits)
    return a, b


def diff_table(rows: list[DiffRow], name_a: object = "A", name_b: object = "B") -> str:
    """The changes as an aligned table (section, field, A, B), or a line saying there are
    none. A cell longer than WRAP characters (a caution's text) is wrapped onto more lines."""
    if not rows:
        return f"no differences between {name_a} and {name_b}\n"
    import textwrap
    cells = [("section", "field", str(name_a), str(name_b))]
    cells += [(row.section, row.key, *shown_pair(row)) for row in rows]
    wrapped = [[textwrap.wrap(text, WRAP, break_long_words=False,
                                             break_on_hyphens=False) or [""] for text in line]
               for line in cells]
    widths = [max(len(part) for line in wrapped for part in line[k]) for k in range(3)]
    lines = []
    for line in wrapped:
        for depth in range(max(len(parts) for parts in line)):
            texts = [parts[depth] if depth < len(parts) else "" for parts in line]
            lines.append("  ".join(text.ljust(width) for text, width in zip(texts[:3], widths))
                         + "  " + texts[3])
    return "\n".join(line.rstrip() for line in lines) + "\n"


def diff_json(rows: list[DiffRow]) -> str:
    """The changes as a JSON list of {section, key, a, b} (SI values, null where absent)."""
    return json.dumps([{"section": r.section, "key": r.key, "a": r.a, "b": r.b} for r in rows],
                      indent=2, ensure_ascii=False, default=str) + "\n"
