"""Grading a unit against its sheet: the windows attached to the sheet, never recomputed.

`grade_sheet` takes a sheet read back (`read_sheet`) and, optionally, the features of a
measured sweep, and judges each value of the test record against the window the sheet
printed (results `test_record.values`, inclusive at both edges). A value typed in the form
is read with the quantity parser; a bare number is taken in the unit the row's Expected
column states. The unit's verdict uses the as-left (measured.*) values only: "fail" when
one is outside its window, else "incomplete" when a required one is missing, else "pass".
A value that cannot be read is a `Problem` at its field (the caller raises it).
"""

from __future__ import annotations

from dataclasses import dataclass

from sheetgen.errors import Problem
from sheetgen.quantities import (
    CAPACITANCE,
    DIMENSIONLESS,
    FREQUENCY,
    INDUCTANCE,
    RESISTANCE,
    Dimension,
    QuantityError,
    format_number,
    format_quantity,
    parse_quantity,
    shortened,
)
from sheetgen.report.procedure import OVERALL_VERDICT, RECORD_TEXT_FIELDS

from .sheet_file import SheetFile
from .sweep import SweepFeatures

PASS, FAIL, NOT_MEASURED, UNREADABLE = "pass", "fail", "not measured", "unreadable"
NO_WINDOW = "no window"  # measured, on a row the sheet gives no window (nothing to judge)
UNIT_PASS, UNIT_FAIL, UNIT_INCOMPLETE = "pass", "fail", "incomplete"
DIMENSIONS = {"Hz": FREQUENCY, "H": INDUCTANCE, "F": CAPACITANCE, "": DIMENSIONLESS,
              "Ω": RESISTANCE, "ohm": RESISTANCE}
# A value typed exactly at a printed edge reads back within a few ulps of it (e.g.
# 13.9 × 1e6); one unit of the last printed digit is at least 1e-6 of the value.
EDGE_TOLERANCE = 1e-9
# The features of a sweep that stand in for the as-left values (f0 is the response
# maximum: the sheet's f0 row is "Frequency of the response maximum").
SWEEP_FEATURES = {"f0_hz": "f_peak_hz", "f_low_hz": "f_low_hz", "f_high_hz": "f_high_hz",
                  "bandwidth_hz": "bandwidth_hz", "q_loaded": "q_loaded"}
UNIT_FIELDS = tuple(name.removeprefix("record.") for name in RECORD_TEXT_FIELDS)


@dataclass(frozen=True)
class GradedValue:
    """One value of the record and how it fared. `measured` is SI (None when not measured
    or unreadable); `typed` is what the form held, or "sweep: …" for a sweep's figure."""

    field: str
    quantity: str
    unit: str
    display_unit: str
    label: str
    minimum: float | None
    maximum: float | None
    measured: float | None
    typed: str
    verdict: str
    required: bool
    as_found: bool
    verdict_field: str | None


@dataclass(frozen=True)
class Grading:
    """A unit graded against its sheet."""

    path: str
    sheet_id: str
    revision: str
    title: str
    content_sha256: str
    tool_version: str
    unit: dict[str, str]  # serial, work_order, technician, date, ambient_c, instruments, remarks
    values: tuple[GradedValue, ...]
    verdict: str
    source: str  # "form" or the sweep file's path
    problems: tuple[Problem, ...] = ()

    @property
    def as_left(self) -> tuple[GradedValue, ...]:
        return tuple(v for v in self.values if not v.as_found)

    def verdict_states(self) -> dict[str, str]:
        """Each as-left verdict group's state ("pass", "fail" or "Off") and the overall."""
        states = {v.verdict_field: v.verdict if v.verdict in (PASS, FAIL) else "Off"
                  for v in self.as_left if v.verdict_field}
        states[OVERALL_VERDICT] = self.verdict if self.verdict in (PASS, FAIL) else "Off"
        return states


def judge(value_si: float, minimum: float | None, maximum: float | None) -> str:
    """PASS when minimum ≤ value ≤ maximum (inclusive, to EDGE_TOLERANCE of the edge)."""
    if minimum is not None and value_si < minimum - EDGE_TOLERANCE * abs(minimum):
        return FAIL
    if maximum is not None and value_si > maximum + EDGE_TOLERANCE * abs(maximum):
        return FAIL
    return PASS


def read_typed(text: str, unit: str, display_unit: str) -> float:
    """What was typed, in SI; a bare number is in `display_unit`. Raises QuantityError."""
    dimension: Dimension = DIMENSIONS.get(unit, DIMENSIONLESS)
    try:
        float(text.strip())
        bare = True
    except ValueError:
        bare = False
    if bare and display_unit:
        return parse_quantity(f"{text.strip()} {display_unit}", dimension)
    return parse_quantity(text, dimension)


def sweep_text(value_si: float, unit: str) -> str:
    """A sweep's figure as the record quotes it: 'sweep: 7.10030 MHz'."""
    shown = format_quantity(value_si, unit, 6) if unit else format_number(value_si, 5)
    return f"sweep: {shown}"


def bandwidth_resolution_hz(results: dict) -> float | None:
    """Half the width of the sheet's bandwidth window: the step a sweep must resolve
    (None when the record has no bandwidth window)."""
    for row in (results.get("test_record") or {}).get("values", []):
        if row.get("quantity") == "bandwidth_hz" and row.get("min") is not None \
                and row.get("max") is not None and row["max"] > row["min"]:
            return 0.5 * (row["max"] - row["min"])
    return None


def grade_sheet(sheet: SheetFile, features: SweepFeatures | None = None,
                sweep_path: str | None = None) -> Grading:
    """Grade the form of `sheet` (and the sweep's `features`, which replace the typed
    as-left f0, f_low, f_high, bandwidth and loaded Q) against the attached windows."""
    record = sheet.results.get("test_record") if isinstance(sheet.results, dict) else None
    if not isinstance(record, dict) or not isinstance(record.get("values"), list):
        from sheetgen.errors import InputError
        raise InputError([Problem(sheet.path, 1, 1, "attachments.results.json",
                                  "the attached results have no test record windows "
                                  "(test_record.values)",
                                  "a sheet built by a sheetgen that records them")])
    values, problems = [], []
    for row in record["values"]:
        entries = [(row["field"], False)]
        if row.get("as_found_field"):
            entries.insert(0, (row["as_found_field"], True))
        for field, as_found in entries:
            graded, problem = _grade_one(sheet, row, field, as_found, features)
            values.append(graded)
            if problem is not None:
                problems.append(problem)
    as_left = [v for v in values if not v.as_found]
    if any(v.verdict == FAIL for v in as_left):
        verdict = UNIT_FAIL
    elif any(v.required and v.verdict != PASS for v in as_left):
        verdict = UNIT_INCOMPLETE
    else:
        verdict = UNIT_PASS
    unit = {name: sheet.fields.get(f"record.{name}", "").strip() for name in UNIT_FIELDS}
    title = (sheet.results.get("sheet") or {}).get("title", "")
    return Grading(path=sheet.path, sheet_id=sheet.sheet_id, revision=sheet.revision,
                   title=str(title or ""), content_sha256=sheet.content_sha256_recorded,
                   tool_version=sheet.tool_version, unit=unit, values=tuple(values),
                   verdict=verdict, source=sweep_path or "form", problems=tuple(problems))


def _grade_one(sheet: SheetFile, row: dict, field: str, as_found: bool,
               features: SweepFeatures | None) -> tuple[GradedValue, Problem | None]:
    quantity, unit = row["quantity"], row.get("unit", "")
    minimum, maximum = row.get("min"), row.get("max")
    display_unit = row.get("display_unit", unit)
    problem = None
    if features is not None and not as_found and quantity in SWEEP_FEATURES:
        measured = float(getattr(features, SWEEP_FEATURES[quantity]))
        typed = sweep_text(measured, unit)
    else:
        typed = sheet.fields.get(field, "").strip()
        measured = None
        if typed:
            try:
                measured = read_typed(typed, unit, display_unit)
            except QuantityError as error:
                problem = Problem(sheet.path, 1, 1, field, str(error))
    if problem is not None:
        verdict = UNREADABLE
    elif measured is None:
        verdict = NOT_MEASURED
    elif minimum is None and maximum is None:
        verdict = NO_WINDOW
    else:
        verdict = judge(measured, minimum, maximum)
    return GradedValue(field=field, quantity=quantity, unit=unit, display_unit=display_unit,
                       label=str(row.get("label", quantity)), minimum=minimum,
                       maximum=maximum, measured=measured, typed=typed, verdict=verdict,
                       required=bool(row.get("required")) and not as_found,
                       as_found=as_found, verdict_field=None if as_found
                       else row.get("verdict_field")), problem


def window_text(value: GradedValue) -> str:
    """The window as the sheet prints it (6 figures for frequencies, 4 otherwise)."""
    if value.minimum is None and value.maximum is None:
        return "—"
    digits = 6 if value.unit == "Hz" and value.quantity != "bandwidth_hz" else 4
    if value.unit:
        return (f"{format_quantity(value.minimum, value.unit, digits)} to "
                f"{format_quantity(value.maximum, value.unit, digits)}")
    return f"{format_number(value.minimum, 4)} to {format_number(value.maximum, 4)}"


def grading_table(grading: Grading) -> str:
    """The aligned table the terminal shows, then the overall verdict and the unit."""
    rows = [("Quantity", "Window", "Measured", "Verdict")]
    for v in grading.values:
        name = ("as found " if v.as_found else "") + v.quantity
        rows.append((name, window_text(v), shortened(v.typed) or "—", v.verdict))
    widths = [max(len(r[k]) for r in rows) for k in range(4)]
    lines = [f"{grading.sheet_id} rev {grading.revision}  {grading.title}".rstrip(),
             f"graded from {'the form' if grading.source == 'form' else grading.source}", ""]
    for number, r in enumerate(rows):
        lines.append("  ".join(cell.ljust(widths[k]) for k, cell in enumerate(r)).rstrip())
        if number == 0:
            lines.append("  ".join("-" * w for w in widths))
    lines.append("")
    lines.append(f"Overall: {grading.verdict.upper()}")
    for label, key in (("Serial", "serial"), ("Work order", "work_order"),
                       ("Technician", "technician"), ("Date", "date"),
                       ("Ambient (°C)", "ambient_c"), ("Instruments", "instruments")):
        lines.append(f"{label + ':':<14}{grading.unit.get(key) or '—'}")
    return "\n".join(lines) + "\n"
