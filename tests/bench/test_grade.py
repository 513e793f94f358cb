"""Grading a filled test record (sheetgen.bench.grade) against the sheet it was filled in.

Sheets are built from the starters by `sheetgen build` and filled with pypdf as a viewer
would (update_page_form_field_values, auto_regenerate=False). Sources outside the code:
- the pass windows as printed on the sheet, read back with poppler's pdftotext (a
  window "13.2200 MHz to 13.9000 MHz" gives the edges typed and the last printed digit);
- the SI prefixes (BIPM, The International System of Units, 9th ed., Table 7: k = 10³,
  M = 10⁶, p = 10⁻¹²) for what each spelling of a value means;
- decimal arithmetic on the printed digits (Python's decimal module) for one unit of the
  last printed digit beyond an edge.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from dataclasses import replace
from decimal import Decimal
from pathlib import Path

import pytest

from sheetgen.bench.grade import grade_sheet
from sheetgen.bench.sheet_file import read_sheet
from sheetgen.cli import main
from tests.support import assert_close

REPO = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf

# the record's rows as printed (label → field), in order
ROWS = (("Inductance of L1", "measured.inductance_h"),
        ("Capacitance of the fixed part(s)", "measured.capacitance_f"),
        ("Frequency of the response maximum", "measured.f0_hz"),
        ("Lower half-power (−3 dB) point", "measured.f_low_hz"),
        ("Upper half-power (−3 dB) point", "measured.f_high_hz"),
        ("Bandwidth (−3 dB), upper −", "measured.bandwidth_hz"),
        ("Loaded Q, f0 / bandwidth", "measured.q_loaded"))
WINDOW_FIELDS = tuple(field for _, field in ROWS[1:])  # the rows with a window on every sheet
_WINDOW = re.compile(r"(\d+(?:\.\d+)?)(?: ([kMGpnuµm]?(?:Hz|F|H)))? to "
                     r"(\d+(?:\.\d+)?)(?: ([kMGpnuµm]?(?:Hz|F|H)))?")


def build_sheet(folder: Path, starter: str) -> Path:
    """The starter's sheet, built by `sheetgen build` from this worktree's templates/."""
    job = folder / f"{starter}.yaml"
    job.write_bytes((REPO / "templates" / f"{starter}.yaml").read_bytes())
    pdf = folder / f"{starter}.pdf"
    assert main(["build", str(job), "-o", str(pdf)]) in (0, 1)
    return pdf


def fill(pdf: Path, values: dict[str, str], out: Path) -> Path:
    """Type `values` into the form as a viewer would (pypdf, no appearance regeneration)."""
    from pypdf import PdfReader, PdfWriter
    writer = PdfWriter(clone_from=PdfReader(pdf))
    for page in writer.pages:
        names = {str(a.get_object().get("/T", "")) for a in page.get("/Annots", []) or []}
        here = {k: v for k, v in values.items() if k in names}
        if here:
            writer.update_page_form_field_values(page, here, auto_regenerate=False)
    with out.open("wb") as handle:
        writer.write(handle)
    return out


def page_text(pdf: Path, layout: bool = False) -> str:
    if shutil.which("pdftotext") is None:
        pytest.skip("poppler's pdftotext is not installed")
    command = ["pdftotext"] + (["-layout"] if layout else []) + [str(pdf), "-"]
    return subprocess.run(command, capture_output=True, text=True, check=True).stdout


def fonts_not_embedded(pdf: Path) -> list[str]:
    """The fonts poppler's pdffonts lists with "emb" = no."""
    if shutil.which("pdffonts") is None:
        pytest.skip("poppler's pdffonts is not installed")
    listing = subprocess.run(["pdffonts", str(pdf)], capture_output=True, text=True,
                             check=True).stdout.splitlines()[2:]
    return [line.split()[0] for line in listing if line.split()[-5] != "yes"]


def printed_windows(pdf: Path) -> dict[str, tuple[str, str, str]]:
    """Each window of the test record as poppler reads it: field → (low, high, unit)."""
    text = " ".join(page_text(pdf).split())
    start = text.index("Test record Measurement")
    ends = [text.index(label, start) for label, _ in ROWS] + [text.index("Overall", start)]
    windows = {}
    for (_, field), begin, end in zip(ROWS, ends, ends[1:]):
        found = _WINDOW.findall(text[begin:end])
        if found:
            ((low, unit_low, high, unit_high),) = found
            windows[field] = (low, high, unit_high or unit_low or "")
    assert set(WINDOW_FIELDS) <= set(windows), windows
    return windows


def nudged(number: str, steps: int) -> str:
    """`number` moved by `steps` units of its last printed digit, printed with as many."""
    value = Decimal(number)
    return str(value + steps * Decimal(1).scaleb(value.as_tuple().exponent))


def typed(number: str, unit: str) -> str:
    return f"{number} {unit}".strip()


IDENTITY = {"record.serial": "SN-0042", "record.work_order": "WO-881",
            "record.technician": "A. Tester", "record.date": "2026-12-02",
            "record.ambient_c": "22", "record.instruments": "network analyser s/n 17, "
            "calibration due 2027-06-30"}


@pytest.fixture(scope="module")
def sheets(tmp_path_factory):
    folder, built = tmp_path_factory.mktemp("grade"), {}

    def sheet(starter):
        if starter not in built:
            built[starter] = build_sheet(folder, starter)
        return built[starter]
    return sheet


@pytest.fixture(scope="module")
def series(sheets):
    return sheets("series")


def _verdicts(grading) -> dict[str, str]:
    return {v.field: v.verdict for v in grading.values}


@pytest.mark.parametrize("starter", ["series", "parallel", "demo"])
@pytest.mark.parametrize("edge, steps, verdict", [
    pytest.param(0, 0, "pass", id="at-minimum"), pytest.param(0, -1, "fail", id="below-minimum"),
    pytest.param(1, 0, "pass", id="at-maximum"), pytest.param(1, +1, "fail", id="above-maximum"),
])
def test_every_window_edge(sheets, tmp_path, starter, edge, steps, verdict):
    """Exactly at a printed edge passes; one unit of the last printed digit outside fails,
    for every row with a window (the windows as poppler reads them off the sheet)."""
    series = sheets(starter)
    windows = printed_windows(series)
    values = {field: typed(nudged(window[edge], steps), window[2])
              for field, window in windows.items()}
    grading = grade_sheet(read_sheet(fill(series, {**values, **IDENTITY}, tmp_path / "f.pdf")))
    got = _verdicts(grading)
    assert {field: got[field] for field in windows} == {field: verdict for field in windows}, values
    # every value at one edge is not a unit the bench could measure (bandwidth_min is not
    # f_high_min − f_low_min): such a passing record is "inconsistent", never a plain pass
    expected = "inconsistent" if verdict == "pass" and grading.consistency else verdict
    assert grading.verdict == expected
    assert grading.unit["serial"] == "SN-0042"
    assert grading.unit["instruments"] == IDENTITY["record.instruments"]


@pytest.mark.parametrize("spelling, factor", [
    pytest.param("13.55 MHz", 1e6, id="MHz"), pytest.param("13550 kHz", 1e3, id="kHz"),
    pytest.param("13.55MHz", 1e6, id="no-space"), pytest.param("13550000 Hz", 1.0, id="Hz"),
])
def test_unit_spellings(series, spelling, factor):
    """Each spelling is read with its SI prefix (BIPM SI Brochure, Table 7)."""
    sheet = read_sheet(series)
    number = float(re.match(r"[\d.]+", spelling).group(0))
    grading = grade_sheet(replace(sheet, fields={**sheet.fields, "measured.f0_hz": spelling}))
    f0 = next(v for v in grading.values if v.field == "measured.f0_hz")
    assert_close(f0.measured, number * factor, rel=1e-12, what=spelling)
    assert f0.verdict == "pass" and f0.typed == spelling


def test_bare_number_is_in_the_expected_columns_unit(series):
    """A bare number takes the unit the row's Expected column prints (MHz for f0, pF for
    the capacitor on this sheet, read with poppler), so "13.55" is 13.55 MHz and "13550"
    (13.55 GHz) fails."""
    text = page_text(series, layout=True)
    f0_row = re.search(r"Frequency of the response\s+(\d+\.\d+) (\S+)", text)
    cap_row = re.search(r"Capacitance of the fixed\s+(\d+\.\d+) (\S+)", text)
    assert f0_row.group(2) == "MHz" and cap_row.group(2) == "pF"
    sheet = read_sheet(series)
    fields = {**sheet.fields, "measured.f0_hz": f0_row.group(1),
              "measured.capacitance_f": cap_row.group(1)}
    got = {v.field: v for v in grade_sheet(replace(sheet, fields=fields)).values}
    assert_close(got["measured.f0_hz"].measured, float(f0_row.group(1)) * 1e6, rel=1e-12)
    assert_close(got["measured.capacitance_f"].measured, float(cap_row.group(1)) * 1e-12,
                 rel=1e-12)
    assert got["measured.f0_hz"].verdict == "pass"
    fields["measured.f0_hz"] = "13550"
    assert _verdicts(grade_sheet(replace(sheet, fields=fields)))["measured.f0_hz"] == "fail"


def test_loaded_q_is_a_plain_number(series):
    windows = printed_windows(series)
    low, high, unit = windows["measured.q_loaded"]
    assert unit == ""
    sheet = read_sheet(series)
    middle = str((Decimal(low) + Decimal(high)) / 2)
    grading = grade_sheet(replace(sheet, fields={**sheet.fields, "measured.q_loaded": middle}))
    assert _verdicts(grading)["measured.q_loaded"] == "pass"


def test_missing_required_value_is_incomplete(series, tmp_path):
    """All but the loaded Q typed at their window's middle: the unit is incomplete."""
    windows = printed_windows(series)
    values = {field: typed(str((Decimal(low) + Decimal(high)) / 2), unit)
              for field, (low, high, unit) in windows.items() if field != "measured.q_loaded"}
    grading = grade_sheet(read_sheet(fill(series, values, tmp_path / "f.pdf")))
    got = _verdicts(grading)
    assert got["measured.q_loaded"] == "not measured"
    assert all(got[field] == "pass" for field in values)
    assert grading.verdict == "incomplete"
    # the starter's coil is ±5 %, so L has a window (issue 16: no window is left as "—")
    assert got["measured.inductance_h"] == "pass"


def test_unreadable_value_is_a_problem_at_its_field(series):
    sheet = read_sheet(series)
    grading = grade_sheet(replace(sheet, fields={**sheet.fields, "measured.f0_hz": "7.1 mH"}))
    assert _verdicts(grading)["measured.f0_hz"] == "unreadable"
    (problem,) = grading.problems
    assert problem.field == "measured.f0_hz"
    assert str(problem).startswith(f'{series}:1:1 measured.f0_hz: "7.1 mH" is not a frequency')


def test_as_found_values_are_recorded_without_a_verdict(sheets, tmp_path):
    """The demo's unit is trimmed: its record has as-found columns. An as-found f0 below the
    trimmed window (before trimming, as expected) is recorded without a verdict — the
    windows are for the trimmed unit — so a passing unit lists no "fail" row; blank
    as-found values leave it complete."""
    demo = sheets("demo")
    windows = printed_windows(demo)
    middle = {field: typed(str((Decimal(low) + Decimal(high)) / 2), unit)
              for field, (low, high, unit) in windows.items()}
    low, _, unit = windows["measured.f0_hz"]
    sheet = read_sheet(fill(demo, {**middle, "as_found.f0_hz": typed(nudged(low, -1), unit)},
                            tmp_path / "f.pdf"))
    assert "as_found.f0_hz" in sheet.fields  # the demo's record is a trimmed unit's
    grading = grade_sheet(sheet)
    found = {v.field: v for v in grading.values if v.as_found}
    assert found["as_found.f0_hz"].verdict == "recorded" and not found["as_found.f0_hz"].required
    assert found["as_found.bandwidth_hz"].verdict == "not measured"
    assert not any(v.verdict == "fail" for v in grading.values)
    assert grading.verdict == "pass"  # the middles agree: bandwidth ≈ f_high − f_low
    import csv

    from sheetgen.bench.grade import grading_table
    from sheetgen.bench.record import record_csv
    (row,) = csv.DictReader(record_csv(grading).splitlines())
    assert row["as_found.f0_hz.verdict"] == "recorded"
    assert float(row["as_found.f0_hz"]) == float(Decimal(nudged(low, -1))) * {
        "kHz": 1e3, "MHz": 1e6}[unit]
    table = grading_table(grading)
    assert "recorded, not judged" in table and "as-found values (before trimming)" in table
