"""Grading a unit against its sheet: the windows attached to the sheet, never recomputed.

`grade_sheet` takes a sheet read back (`read_sheet`) and, optionally, the features of a
measured sweep, and judges each value of the test record against the window the sheet
printed (results `test_record.values`, inclusive at both edges). A value typed in the form
is read with the quantity parser; a bare number is taken in the unit the row's Expected
column states. As-found values (before trimming) are recorded without a verdict: the
windows are for the trimmed unit, and the sheet states no window for an untrimmed one
that a bench reading could be judged against. The typed f0, half-power points,
bandwidth and loaded Q are checked against each other (`consistency`) to within what the
bench resolves. The technician's own pass/fail ticks are kept beside the computed
verdicts, and where a sweep supplies a figure, the value typed in the form is kept and
graded too (the verdict uses the sweep's). The unit's verdict uses the as-left
(measured.*) values only: "fail" when one is outside its window, else "inconsistent" when
its values disagree with each other, else "incomplete" when a required one is missing,
else "pass". A value that cannot be read is a `Problem` at its field (the caller raises it).
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
from sheetgen.report.formatting import resolved_range_text
from sheetgen.report.procedure import OVERALL_VERDICT, RECORD_TEXT_FIELDS

from .sheet_file import SheetFile
from .signature import SignatureCheck, signature_text
from .sweep import SweepFeatures

PASS, FAIL, NOT_MEASURED, UNREADABLE = "pass", "fail", "not measured", "unreadable"
NO_WINDOW = "no window"  # measured, on a row the sheet gives no window (nothing to judge)
RECORDED = "recorded"  # an as-found value: kept, not judged (the windows are for the trimmed unit)
UNIT_PASS, UNIT_FAIL, UNIT_INCOMPLETE = "pass", "fail", "incomplete"
UNIT_INCONSISTENT = "inconsistent"
# A typed Q is read to 3 figures on most benches: half a unit of its last figure is up to
# 0.5 % of it (common practice).
Q_READING_REL = 0.005
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
    ticked: str = ""  # the technician's own tick in the form: "pass", "fail" or "" (none)
    form_typed: str = ""  # with a sweep: what the form held for this value ("" if blank)
    form_measured: float | None = None
    form_verdict: str = ""  # that typed value judged against the window ("" if no sweep)

    @property
    def tick_disagrees(self) -> bool:
        """The technician ticked a verdict other than the computed one."""
        return bool(self.ticked) and self.ticked != self.verdict


@dataclass(frozen=True)
class Inconsistency:
    """Typed values that disagree with each other by more than the bench resolves:
    `stated` (the value typed for `quantity`) against `implied` (what the others give by
    `relation`), `allowed` the largest difference the bench's resolution explains."""

    quantity: str
    relation: str
    stated: float
    implied: float
    allowed: float
    unit: str
    as_found: bool

    def text(self) -> str:
        def shown(value):
            return format_quantity(value, self.unit, 5) if self.unit else format_number(value, 4)
        prefix = "as found: " if self.as_found else ""
        return (f"{prefix}{self.quantity} typed {shown(self.stated)}, but {self.relation} "
                f"gives {shown(self.implied)} (differs by {shown(abs(self.stated - self.implied))}, "
                f"more than the {shown(self.allowed)} the bench resolves)")


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
    signature: SignatureCheck | None = None  # the sheet's, as checked; None: unsigned
    consistency: tuple[Inconsistency, ...] = ()
    resolution_hz: float | None = None  # a frequency reading's resolution used for them
    ticked_overall: str = ""  # the technician's overall tick: "pass", "fail" or ""
    window_resolution_hz: float | None = None  # the resolution the sheet prints windows to

    @property
    def disagreements(self) -> tuple[str, ...]:
        """The verdict groups whose technician's tick differs from the computed verdict."""
        found = [v.verdict_field for v in self.as_left if v.verdict_field and v.tick_disagrees]
        if self.ticked_overall and self.ticked_overall != self.verdict:
            found.append(OVERALL_VERDICT)
        return tuple(found)

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


def window_problems(path: str, rows: list) -> list[Problem]:
    """Each window of the record that is not a pair of finite numbers with min ≤ max (a
    bound may be null: no edge on that side). Such a window judges nothing: a NaN edge
    passes every value, and an inverted one fails every value."""
    import math
    problems = []
    for index, row in enumerate(rows):
        where = f"attachments.results.json test_record.values[{index}]"
        if not isinstance(row, dict):
            problems.append(Problem(path, 1, 1, where, "is not a window row",
                                    "a mapping with field, quantity, min and max"))
            continue
        edges = {}
        for key in ("min", "max"):
            edge = row.get(key)
            if edge is not None and (isinstance(edge, bool) or not isinstance(edge, (int, float))
                                     or not math.isfinite(edge)):
                problems.append(Problem(path, 1, 1, f"{where}.{key}",
                                        f"the window edge {edge!r} is not a finite number",
                                        "a finite number (SI) or null"))
            else:
                edges[key] = edge
        if edges.get("min") is not None and edges.get("max") is not None \
                and edges["min"] > edges["max"]:
            problems.append(Problem(path, 1, 1, f"{where}.min",
                                    f"the window's min {edges['min']!r} is above its max "
                                    f"{edges['max']!r}", "min ≤ max"))
    return problems


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
    bad_windows = window_problems(sheet.path, record["values"])
    if bad_windows:
        from sheetgen.errors import InputError
        raise InputError(bad_windows)
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
    resolution = reading_resolution_hz(sheet.results)
    findings = (consistency(values, resolution, as_found=False)
                + consistency(values, resolution, as_found=True))
    if any(v.verdict == FAIL for v in as_left):
        verdict = UNIT_FAIL
    elif any(not f.as_found for f in findings):
        verdict = UNIT_INCONSISTENT
    elif any(v.required and v.verdict != PASS for v in as_left):
        verdict = UNIT_INCOMPLETE
    else:
        verdict = UNIT_PASS
    unit = {name: sheet.fields.get(f"record.{name}", "").strip() for name in UNIT_FIELDS}
    title = (sheet.results.get("sheet") or {}).get("title", "")
    return Grading(path=sheet.path, sheet_id=sheet.sheet_id, revision=sheet.revision,
                   title=str(title or ""), content_sha256=sheet.content_sha256_recorded,
                   tool_version=sheet.tool_version, unit=unit, values=tuple(values),
                   verdict=verdict, source=sweep_path or "form", problems=tuple(problems),
                   signature=sheet.signature, consistency=tuple(findings),
                   resolution_hz=resolution,
                   ticked_overall=_tick(sheet.fields.get(OVERALL_VERDICT, "")),
                   window_resolution_hz=_limit(sheet.results, "resolution_hz"))


def _tick(state: str) -> str:
    """A verdict radio group's saved state as a verdict ("" when nothing is ticked)."""
    state = state.strip().lower()
    return state if state in (PASS, FAIL) else ""


def _limit(results: dict, key: str) -> float | None:
    """A positive number from the sheet's limits, or None."""
    limits = results.get("limits") if isinstance(results, dict) else None
    value = limits.get(key) if isinstance(limits, dict) else None
    if isinstance(value, (int, float)) and not isinstance(value, bool) and value > 0:
        return float(value)
    return None


def reading_resolution_hz(results: dict) -> float | None:
    """How finely the bench reads a frequency: the sheet's sweep step (limits.sweep_step_hz),
    else the windows' resolution (limits.resolution_hz); None when the sheet states neither."""
    step = _limit(results, "sweep_step_hz")
    return step if step is not None else _limit(results, "resolution_hz")


def consistency(values: list[GradedValue], step_hz: float | None,
                as_found: bool) -> list[Inconsistency]:
    """The values of one set (as-left or as-found) checked against each other.

    Each frequency is read to ±one step (`step_hz`), so bandwidth = f_high − f_low holds to
    3 steps (three readings), and loaded Q = f0 / bandwidth (IEEE Std 100: Q of a resonance
    from its half-power bandwidth) holds to a relative 2·step/bandwidth + step/f0 plus the
    reading of Q itself (Q_READING_REL). f0 lies between the half-power points (to a step).
    No check without a stated step."""
    if not step_hz:
        return []
    got = {v.quantity: v.measured for v in values
           if v.as_found == as_found and v.measured is not None and v.verdict != UNREADABLE}
    findings = []
    f0, low, high = got.get("f0_hz"), got.get("f_low_hz"), got.get("f_high_hz")
    bandwidth, q = got.get("bandwidth_hz"), got.get("q_loaded")
    if bandwidth is not None and low is not None and high is not None:
        implied = high - low
        if abs(bandwidth - implied) > 3 * step_hz:
            findings.append(Inconsistency("bandwidth_hz", "f_high − f_low", bandwidth, implied,
                                          3 * step_hz, "Hz", as_found))
    if q is not None and f0 is not None and bandwidth:
        implied = f0 / bandwidth
        allowed = implied * (2 * step_hz / bandwidth + step_hz / f0 + Q_READING_REL)
        if abs(q - implied) > allowed:
            findings.append(Inconsistency("q_loaded", "f0 / bandwidth", q, implied, allowed, "",
                                          as_found))
    if f0 is not None and low is not None and high is not None \
            and not low - step_hz <= f0 <= high + step_hz:
        edge = low if f0 < low else high
        findings.append(Inconsistency("f0_hz", "the half-power points (f0 lies between them)",
                                      f0, edge, step_hz, "Hz", as_found))
    return findings


def _read_form(sheet: SheetFile, field: str, unit: str,
               display_unit: str) -> tuple[str, float | None, Problem | None]:
    """What the form holds at `field`: the text, its SI value, or the Problem reading it."""
    typed = sheet.fields.get(field, "").strip()
    if not typed:
        return typed, None, None
    try:
        return typed, read_typed(typed, unit, display_unit), None
    except QuantityError as error:
        return typed, None, Problem(sheet.path, 1, 1, field, str(error))


def _verdict(measured: float | None, problem: Problem | None, minimum, maximum,
             as_found: bool) -> str:
    if problem is not None:
        return UNREADABLE
    if measured is None:
        return NOT_MEASURED
    if as_found:
        return RECORDED
    if minimum is None and maximum is None:
        return NO_WINDOW
    return judge(measured, minimum, maximum)


def _grade_one(sheet: SheetFile, row: dict, field: str, as_found: bool,
               features: SweepFeatures | None) -> tuple[GradedValue, Problem | None]:
    quantity, unit = row["quantity"], row.get("unit", "")
    minimum, maximum = row.get("min"), row.get("max")
    display_unit = row.get("display_unit", unit)
    form_typed, form_measured, problem = _read_form(sheet, field, unit, display_unit)
    form_verdict = ""
    if features is not None and not as_found and quantity in SWEEP_FEATURES:
        measured = float(getattr(features, SWEEP_FEATURES[quantity]))
        typed = sweep_text(measured, unit)
        if form_typed:
            form_verdict = _verdict(form_measured, problem, minimum, maximum, False)
        problem = None  # a typed value the sweep replaces is kept, not needed
    else:
        typed, measured = form_typed, form_measured
        form_typed, form_measured = "", None
    verdict = _verdict(measured, problem, minimum, maximum, as_found)
    verdict_field = None if as_found else row.get("verdict_field")
    return GradedValue(field=field, quantity=quantity, unit=unit, display_unit=display_unit,
                       label=str(row.get("label", quantity)), minimum=minimum,
                       maximum=maximum, measured=measured, typed=typed, verdict=verdict,
                       required=bool(row.get("required")) and not as_found,
                       as_found=as_found, verdict_field=verdict_field,
                       ticked=_tick(sheet.fields.get(verdict_field, "")) if verdict_field else "",
                       form_typed=form_typed, form_measured=form_measured,
                       form_verdict=form_verdict), problem


def window_text(value: GradedValue, resolution_hz: float | None = None) -> str:
    """The window as the sheet prints it: frequencies to the windows' resolution (a sheet
    that does not state it: 6 figures), other values to 4 figures."""
    if value.minimum is None and value.maximum is None:
        return "—"
    if value.unit == "Hz" and resolution_hz and None not in (value.minimum, value.maximum):
        return resolved_range_text(value.minimum, value.maximum, resolution_hz, "Hz")
    digits = 6 if value.unit == "Hz" and value.quantity != "bandwidth_hz" else 4
    if value.unit:
        return (f"{format_quantity(value.minimum, value.unit, digits)} to "
                f"{format_quantity(value.maximum, value.unit, digits)}")
    return f"{format_number(value.minimum, 4)} to {format_number(value.maximum, 4)}"


def value_name(value: GradedValue) -> str:
    return ("as found " if value.as_found else "") + value.quantity


def verdict_text(value: GradedValue) -> str:
    """The verdict as the table shows it (an as-found value says why it has none)."""
    return "recorded, not judged" if value.verdict == RECORDED else value.verdict


def grading_notes(grading: Grading) -> list[str]:
    """The lines under the table: typed values a sweep replaced, values that disagree with
    each other, and ticks of the technician that differ from the computed verdicts."""
    notes = []
    for v in grading.values:
        if v.form_typed:
            notes.append(f"{v.quantity}: the form says {v.form_typed} ({v.form_verdict}), the "
                         f"sweep {v.typed.removeprefix('sweep: ')} ({v.verdict}); the verdict "
                         "uses the sweep's")
    if grading.consistency:
        notes.append("inconsistent (frequencies read to ±"
                     f"{format_quantity(grading.resolution_hz, 'Hz', 4)}, the sheet's sweep "
                     "step):")
        notes += [f"  {finding.text()}" for finding in grading.consistency]
    for v in grading.as_left:
        if v.verdict_field and v.tick_disagrees:
            notes.append(f"{v.quantity}: the technician ticked {v.ticked.upper()}, graded "
                         f"{v.verdict.upper()} (both kept in the record)")
    if grading.ticked_overall and grading.ticked_overall != grading.verdict:
        notes.append(f"overall: the technician ticked {grading.ticked_overall.upper()}, "
                     f"graded {grading.verdict.upper()} (both kept in the record)")
    if any(v.as_found for v in grading.values):
        notes.append("as-found values (before trimming) are recorded without a verdict: the "
                     "windows are for the trimmed unit")
    return notes


def grading_table(grading: Grading) -> str:
    """The aligned table the terminal shows, the notes, then the overall verdict and the
    unit."""
    rows = [("Quantity", "Window", "Measured", "Verdict", "Ticked")]
    for v in grading.values:
        ticked = v.ticked + (" (differs)" if v.tick_disagrees else "") if v.ticked else ""
        rows.append((value_name(v), "—" if v.as_found
                     else window_text(v, grading.window_resolution_hz),
                     shortened(v.typed) or "—", verdict_text(v), ticked))
    widths = [max(len(r[k]) for r in rows) for k in range(5)]
    lines = [f"{grading.sheet_id} rev {grading.revision}  {grading.title}".rstrip(),
             f"graded from {'the form' if grading.source == 'form' else grading.source}",
             f"sheet {signature_text(grading.signature)}", ""]
    for number, r in enumerate(rows):
        lines.append("  ".join(cell.ljust(widths[k]) for k, cell in enumerate(r)).rstrip())
        if number == 0:
            lines.append("  ".join("-" * w for w in widths))
    notes = grading_notes(grading)
    if notes:
        lines += [""] + notes
    lines.append("")
    lines.append(f"Overall: {grading.verdict.upper()}"
                 + (f" (technician ticked {grading.ticked_overall.upper()})"
                    if grading.ticked_overall and grading.ticked_overall != grading.verdict
                    else ""))
    for label, key in (("Serial", "serial"), ("Work order", "work_order"),
                       ("Technician", "technician"), ("Date", "date"),
                       ("Ambient (°C)", "ambient_c"), ("Instruments", "instruments")):
        lines.append(f"{label + ':':<14}{grading.unit.get(key) or '—'}")
    return "\n".join(lines) + "\n"
