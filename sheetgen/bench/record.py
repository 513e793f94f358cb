"""The unit's record (`sheetgen.record/1`): JSON for a work-order system, a CSV line for a log.

The JSON shape is documented in docs/results.md ("Record contract"). The CSV has one line
per unit and a fixed header (the same for every sheet), so one running log can hold units
of many sheets: identity, the unit's fields, the verdict, then for each value of the test
record its measured SI value and verdict (as-found columns stay empty on units that are
not trimmed), then the columns added since (the technician's ticks, the form's values a
sweep replaced, the consistency findings). `append_record` adds a line without rewriting
the earlier ones; a log whose header is an earlier, shorter version of ours gets lines of
its own columns.
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

from .grade import SWEEP_FEATURES, UNIT_FIELDS, GradedValue, Grading

RECORD_FORMAT = "sheetgen.record/1"


def record_document(grading: Grading) -> dict:
    """The record contract as plain data."""
    return {
        "format": RECORD_FORMAT,
        "tool_version": __version__,
        "sheet": {"id": grading.sheet_id, "revision": grading.revision,
                  "title": grading.title, "content_sha256": grading.content_sha256,
                  "tool_version": grading.tool_version,
                  "signature": _signature(grading)},
        "unit": {name: grading.unit.get(name, "") for name in UNIT_FIELDS},
        "source": grading.source,
        "values": [{"field": v.field, "quantity": v.quantity, "unit": v.unit,
                    "min": _number(v.minimum), "max": _number(v.maximum),
                    "measured": _number(v.measured), "typed": v.typed, "verdict": v.verdict,
                    "required": v.required, "as_found": v.as_found,
                    "ticked": v.ticked or None,
                    "tick_agrees": (not v.tick_disagrees) if v.ticked else None,
                    "form": _form(v)}
                   for v in grading.values],
        "verdict": grading.verdict,
        "ticked_verdict": grading.ticked_overall or None,
        "disagreements": list(grading.disagreements),
        "resolution_hz": _number(grading.resolution_hz),
        "consistency": [{"quantity": f.quantity, "relation": f.relation,
                         "stated": _number(f.stated), "implied": _number(f.implied),
                         "allowed": _number(f.allowed), "as_found": f.as_found,
                         "text": f.text()} for f in grading.consistency],
    }


def _number(value):
    return value if isinstance(value, float) and math.isfinite(value) else (
        float(value) if isinstance(value, int) and not isinstance(value, bool) else None)


def _form(value: GradedValue) -> dict | None:
    """With a sweep: what the form held for the value, and how it fared (None otherwise)."""
    if not value.form_typed:
        return None
    return {"typed": value.form_typed, "measured": _number(value.form_measured),
            "verdict": value.form_verdict}


def _signature(grading: Grading) -> dict | None:
    """The sheet's signature as checked (None: unsigned)."""
    check = grading.signature
    if check is None:
        return None
    return {"signer": check.signer, "trusted": check.trusted, "signed_at": check.signed_at,
            "after_signing": check.after_signing}


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


def _added_columns() -> list[str]:
    """The columns added after the first version, at the end so older logs stay readable."""
    fields = [m.field for m in MEASUREMENTS]
    swept = [f for f in fields if f.removeprefix("measured.") in SWEEP_FEATURES]
    return (["ticked_verdict", "disagreements", "consistency"]
            + [f"{field}.ticked" for field in fields]
            + [column for field in swept for column in (f"{field}.form", f"{field}.form.verdict")])


FIRST_HEADER = (["format", "sheet_id", "revision", "content_sha256", "tool_version"]
                + list(UNIT_FIELDS) + ["verdict"] + _value_columns())
CSV_HEADER = FIRST_HEADER + _added_columns()


def _line(cells: list[str]) -> str:
    out = io.StringIO()
    csv.writer(out, lineterminator="\n").writerow(cells)
    return out.getvalue()


def csv_header(columns: list[str] = CSV_HEADER) -> str:
    return _line(columns)


def csv_line(grading: Grading, columns: list[str] = CSV_HEADER) -> str:
    """The unit as one CSV line (SI values written with repr, empty where not measured)."""
    cells = {"format": RECORD_FORMAT, "sheet_id": grading.sheet_id,
             "revision": grading.revision, "content_sha256": grading.content_sha256,
             "tool_version": __version__, "verdict": grading.verdict,
             "ticked_verdict": grading.ticked_overall,
             "disagreements": " ".join(grading.disagreements),
             "consistency": "; ".join(f.text() for f in grading.consistency)}
    cells.update({name: grading.unit.get(name, "") for name in UNIT_FIELDS})
    for v in grading.values:
        cells[v.field] = "" if v.measured is None else repr(float(v.measured))
        cells[f"{v.field}.verdict"] = v.verdict
        cells[f"{v.field}.ticked"] = v.ticked
        if v.form_typed:
            cells[f"{v.field}.form"] = ("" if v.form_measured is None
                                        else repr(float(v.form_measured)))
            cells[f"{v.field}.form.verdict"] = v.form_verdict
    return _line([cells.get(column, "") for column in columns])


def record_csv(grading: Grading) -> str:
    """Header and the unit's line: a record file of its own."""
    return csv_header() + csv_line(grading)


def append_data(path: Path, grading: Grading) -> bytes:
    """What `append_record` adds to the log at `path`: the unit's line, after the header
    when the file is new or empty (and after a newline when the last line has none). A log
    begun before the added columns gets a line in its own columns; a file whose first line
    is not a record header is an InputError. Nothing is written here."""
    header = csv_header()
    first_header = csv_header(FIRST_HEADER)
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
        return (header + csv_line(grading, CSV_HEADER)).encode("utf-8")
    found = first.decode("utf-8", "replace")
    if found not in (header, first_header):
        raise InputError([Problem(str(path), 1, 1, "", "the log's header is not the "
                                  "record header of sheetgen grade (" + RECORD_FORMAT
                                  + ")", "a log written by `sheetgen grade --append`, "
                                  "or a new file; its header begins "
                                  + header[:60].rstrip() + "…")])
    columns = FIRST_HEADER if found == first_header else CSV_HEADER  # the log's own columns
    return (("\n" if last != b"\n" else "") + csv_line(grading, columns)).encode("utf-8")


def append_record(path: Path, grading: Grading, data: bytes | None = None) -> None:
    """Add the unit's line to the log at `path` with one write in append mode (`data`:
    what append_data made for it, else made here)."""
    data = append_data(path, grading) if data is None else data
    descriptor = os.open(path, os.O_WRONLY | os.O_APPEND | os.O_CREAT, 0o666)
    try:
        os.write(descriptor, data)
    finally:
        os.close(descriptor)
