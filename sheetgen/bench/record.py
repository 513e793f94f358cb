"""The unit's record (`sheetgen.record/1`): JSON for a work-order system, a CSV line for a log.

The JSON shape is documented in docs/results.md ("Record contract"). The CSV has one line
per unit and a fixed header (the same for every sheet), so one running log can hold units
of many sheets: identity, the unit's fields, the verdict, then for each value of the test
record its measured SI value and verdict (as-found columns stay empty on units that are
not trimmed). `append_record` adds a line without rewriting the earlier ones.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
from pathlib import Path

from sheetgen import __version__
from sheetgen.errors import InputError, Problem
from sheetgen.report.procedure import MEASUREMENTS, TUNED_KEYS

from .grade import UNIT_FIELDS, Grading

RECORD_FORMAT = "sheetgen.record/1"


def record_document(grading: Grading) -> dict:
    """The record contract as plain data."""
    def number(value):
        return value if isinstance(value, float) and math.isfinite(value) else (
            float(value) if isinstance(value, int) else None)

    return {
        "format": RECORD_FORMAT,
        "tool_version": __version__,
        "sheet": {"id": grading.sheet_id, "revision": grading.revision,
                  "title": grading.title, "content_sha256": grading.content_sha256,
                  "tool_version": grading.tool_version},
        "unit": {name: grading.unit.get(name, "") for name in UNIT_FIELDS},
        "source": grading.source,
        "values": [{"field": v.field, "quantity": v.quantity, "unit": v.unit,
                    "min": number(v.minimum), "max": number(v.maximum),
                    "measured": number(v.measured), "typed": v.typed, "verdict": v.verdict,
                    "required": v.required, "as_found": v.as_found}
                   for v in grading.values],
        "verdict": grading.verdict,
    }


def record_json(grading: Grading) -> str:
    return json.dumps(record_document(grading), indent=2, ensure_ascii=False) + "\n"


def _value_columns() -> list[str]:
    quantities = [m.field.removeprefix("measured.") for m in MEASUREMENTS]
    tuned = {m.field.removeprefix("measured.") for m in MEASUREMENTS if m.key in TUNED_KEYS}
    columns = []
    for quantity in quantities:
        if quantity in tuned:
            columns += [f"as_found.{quantity}", f"as_found.{quantity}.verdict"]
        columns += [f"measured.{quantity}", f"measured.{quantity}.verdict"]
    return columns


CSV_HEADER = (["format", "sheet_id", "revision", "content_sha256", "tool_version"]
              + list(UNIT_FIELDS) + ["verdict"] + _value_columns())


def _line(cells: list[str]) -> str:
    out = io.StringIO()
    csv.writer(out, lineterminator="\n").writerow(cells)
    return out.getvalue()


def csv_header() -> str:
    return _line(CSV_HEADER)


def csv_line(grading: Grading) -> str:
    """The unit as one CSV line (SI values written with repr, empty where not measured)."""
    cells = {"format": RECORD_FORMAT, "sheet_id": grading.sheet_id,
             "revision": grading.revision, "content_sha256": grading.content_sha256,
             "tool_version": __version__, "verdict": grading.verdict}
    cells.update({name: grading.unit.get(name, "") for name in UNIT_FIELDS})
    for v in grading.values:
        cells[v.field] = "" if v.measured is None else repr(float(v.measured))
        cells[f"{v.field}.verdict"] = v.verdict
    return _line([cells.get(column, "") for column in CSV_HEADER])


def record_csv(grading: Grading) -> str:
    """Header and the unit's line: a record file of its own."""
    return csv_header() + csv_line(grading)


def append_data(path: Path, grading: Grading) -> bytes:
    """What `append_record` adds to the log at `path`: the unit's line, after the header
    when the file is new or empty (and after a newline when the last line has none). A
    file whose first line is not our header is an InputError; nothing is written here."""
    line = csv_line(grading)
    header = csv_header()
    try:
        with open(path, "rb") as existing:
            first = existing.readline(len(header.encode("utf-8")) + 1)
            existing.seek(0, os.SEEK_END)
            size = existing.tell()
            last = b"\n"
            if size:
                existing.seek(size - 1)
                last = existing.read(1)
    except FileNotFoundError:
        size = 0
    except OSError as error:
        raise InputError([Problem(str(path), 1, 1, "", f"the log cannot be read "
                                  f"({error.strerror or error})")]) from None
    if size == 0:
        return (header + line).encode("utf-8")
    if first.decode("utf-8", "replace") != header:
        raise InputError([Problem(str(path), 1, 1, "", "the log's header is not the "
                                  "record header of sheetgen grade (" + RECORD_FORMAT
                                  + ")", "a log written by `sheetgen grade --append`, "
                                  "or a new file; its header begins "
                                  + header[:60].rstrip() + "…")])
    return (("\n" if last != b"\n" else "") + line).encode("utf-8")


def append_record(path: Path, grading: Grading, data: bytes | None = None) -> None:
    """Add the unit's line to the log at `path` with one write in append mode (`data`:
    what append_data made for it, else made here)."""
    data = append_data(path, grading) if data is None else data
    descriptor = os.open(path, os.O_WRONLY | os.O_APPEND | os.O_CREAT, 0o666)
    try:
        os.write(descriptor, data)
    finally:
        os.close(descriptor)
