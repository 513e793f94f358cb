"""`sheetgen grade` end to end: exit codes, messages, the unit's record, the graded copy.

Outside sources: the windows as printed, read with poppler's pdftotext (tests/bench/
test_grade.py); the record read back with Python's json and csv modules (RFC 8259,
RFC 4180); the graded copy read back with pypdf (its form fields and /Ff read-only bit,
ISO 32000-1 Table 221) and poppler (the stamp's text); an attachment edited with pikepdf
(qpdf) as a person with ordinary PDF tools would.
"""

from __future__ import annotations

import csv
import hashlib
import json
from decimal import Decimal

import pytest

from sheetgen.cli import main
from tests.bench.test_grade import (
    IDENTITY,
    build_sheet,
    fill,
    fonts_not_embedded,
    page_text,
    printed_windows,
)

pytestmark = pytest.mark.pdf


@pytest.fixture(scope="module")
def sheets(tmp_path_factory):
    """The series starter's sheet, blank, filled in its windows' middles, and out of one."""
    root = tmp_path_factory.mktemp("gradecli")
    blank = build_sheet(root, "series")
    windows = printed_windows(blank)
    middle = {field: f"{(Decimal(low) + Decimal(high)) / 2} {unit}".strip()
              for field, (low, high, unit) in windows.items()}
    good = fill(blank, {**middle, **IDENTITY}, root / "good.pdf")
    low, _, unit = windows["measured.f0_hz"]
    bad = fill(blank, {**middle, **IDENTITY, "measured.f0_hz": f"{Decimal(low) - 1} {unit}"},
               root / "bad.pdf")
    return {"blank": blank, "good": good, "bad": bad, "windows": windows}


def test_pass_prints_the_table_and_exits_0(sheets, capsys):
    assert main(["grade", str(sheets["good"])]) == 0
    out = capsys.readouterr().out
    assert "Overall: PASS" in out
    f0_low, f0_high, unit = sheets["windows"]["measured.f0_hz"]
    row = next(line for line in out.splitlines() if line.startswith("f0_hz "))
    assert f"{f0_low} {unit} to {f0_high} {unit}" in row and row.rstrip().endswith("pass")
    for value in ("SN-0042", "WO-881", "A. Tester", "2026-12-02",
                  IDENTITY["record.instruments"]):
        assert value in out


def test_fail_exits_1_and_names_the_value(sheets, capsys):
    assert main(["grade", str(sheets["bad"])]) == 1
    captured = capsys.readouterr()
    assert "Overall: FAIL" in captured.out
    assert "measured.f0_hz: fail" in captured.err


def test_blank_sheet_is_incomplete_exit_1(sheets, tmp_path, capsys):
    record = tmp_path / "r.json"
    assert main(["grade", str(sheets["blank"]), "--json", str(record)]) == 1
    data = json.loads(record.read_text(encoding="utf-8"))
    assert data["verdict"] == "incomplete"
    assert {v["verdict"] for v in data["values"]} == {"not measured"}
    assert "measured.q_loaded: not measured" in capsys.readouterr().err


def test_frequency_typed_as_inductance_is_bad_input(sheets, tmp_path, capsys):
    filled = fill(sheets["blank"], {"measured.f0_hz": "7.1 mH"}, tmp_path / "typo.pdf")
    record = tmp_path / "r.json"
    assert main(["grade", str(filled), "--json", str(record)]) == 2
    err = capsys.readouterr().err
    assert f'{filled}:1:1 measured.f0_hz: "7.1 mH" is not a frequency' in err
    assert "Traceback" not in err and not record.exists()


def test_results_widened_after_the_build_is_refused(sheets, tmp_path, capsys):
    """Someone widens the f0 window in the attached results with pikepdf: exit 2."""
    pikepdf = pytest.importorskip("pikepdf")
    edited = tmp_path / "widened.pdf"
    with pikepdf.open(sheets["good"]) as doc:
        data = json.loads(doc.attachments["results.json"].get_file().read_bytes())
        row = next(v for v in data["test_record"]["values"] if v["field"] == "measured.f0_hz")
        row["max"] *= 1.05
        doc.attachments["results.json"] = pikepdf.AttachedFileSpec(
            doc, json.dumps(data, indent=2).encode("utf-8"), filename="results.json",
            mime_type="application/json")
        doc.save(edited)
    assert main(["grade", str(edited)]) == 2
    err = capsys.readouterr().err
    assert "content hash differs" in err and "content_sha256" in err


def test_not_a_sheet_is_bad_input(tmp_path, capsys):
    text = tmp_path / "notes.pdf"
    text.write_text("not a pdf", encoding="utf-8")
    assert main(["grade", str(text)]) == 2
    assert "is not a PDF file" in capsys.readouterr().err


def test_json_and_csv_records(sheets, tmp_path):
    record, table = tmp_path / "r.json", tmp_path / "r.csv"
    assert main(["grade", str(sheets["good"]), "--json", str(record), "--csv", str(table)]) == 0
    data = json.loads(record.read_text(encoding="utf-8"))
    blank_pdf = sheets["blank"].read_bytes()
    assert data["format"] == "sheetgen.record/1"
    assert set(data) >= {"format", "tool_version", "sheet", "unit", "values", "verdict"}
    assert set(data["sheet"]) >= {"id", "revision", "content_sha256"}
    assert data["sheet"]["content_sha256"].encode("ascii") in blank_pdf  # as recorded at build
    assert data["unit"]["serial"] == "SN-0042" and data["unit"]["ambient_c"] == "22"
    f0 = next(v for v in data["values"] if v["field"] == "measured.f0_hz")
    low, high, _ = sheets["windows"]["measured.f0_hz"]
    assert f0["measured"] == pytest.approx(float((Decimal(low) + Decimal(high)) / 2) * 1e6,
                                           rel=1e-12)
    assert set(f0) >= {"field", "quantity", "unit", "min", "max", "measured", "typed", "verdict"}
    assert f0["min"] <= f0["measured"] <= f0["max"] and f0["unit"] == "Hz"
    rows = list(csv.DictReader(table.read_text(encoding="utf-8").splitlines()))
    assert len(rows) == 1
    assert rows[0]["serial"] == "SN-0042" and rows[0]["verdict"] == "pass"
    assert float(rows[0]["measured.f0_hz"]) == f0["measured"]


def test_append_twice_gives_header_and_two_lines(sheets, tmp_path):
    log = tmp_path / "log.csv"
    assert main(["grade", str(sheets["good"]), "--append", str(log)]) == 0
    first = log.read_bytes()
    assert main(["grade", str(sheets["bad"]), "--append", str(log)]) == 1
    data = log.read_bytes()
    assert data.startswith(first)  # earlier lines untouched
    rows = list(csv.reader(data.decode("utf-8").splitlines()))
    assert len(rows) == 3 and rows[0][0] == "format"
    verdict = rows[0].index("verdict")
    assert [rows[1][verdict], rows[2][verdict]] == ["pass", "fail"]


def test_append_to_a_foreign_log_is_refused(sheets, tmp_path, capsys):
    log = tmp_path / "other.csv"
    log.write_text("date,serial,result\n2026-11-30,SN-1,ok\n", encoding="utf-8")
    before = log.read_bytes()
    assert main(["grade", str(sheets["good"]), "--append", str(log)]) == 2
    assert log.read_bytes() == before
    assert "header" in capsys.readouterr().err


def test_graded_copy(sheets, tmp_path, capsys):
    from pypdf import PdfReader
    source = sheets["bad"]
    before = hashlib.sha256(source.read_bytes()).hexdigest()
    copy = tmp_path / "graded.pdf"
    assert main(["grade", str(source), "-o", str(copy)]) == 1
    assert hashlib.sha256(source.read_bytes()).hexdigest() == before  # original untouched
    fields = PdfReader(copy).get_fields()
    assert fields["verdict.f0"]["/V"] == "/fail"
    assert fields["verdict.overall"]["/V"] == "/fail"
    for name in ("verdict.capacitance", "verdict.f_low", "verdict.f_high", "verdict.bandwidth",
                 "verdict.q_loaded"):
        assert fields[name]["/V"] == "/pass", name
    assert all(int(field.get("/Ff", 0)) & 1 for field in fields.values())
    reader = PdfReader(copy)
    states = {}
    for page in reader.pages:
        for annotation in page.get("/Annots", []) or []:
            widget = annotation.get_object()
            parent = widget.get("/Parent")
            if parent is not None and str(parent.get_object().get("/T")) == "verdict.f0":
                states[tuple(k for k in widget["/AP"]["/N"] if k != "/Off")] = widget["/AS"]
    assert states == {("/pass",): "/Off", ("/fail",): "/fail"}
    text = " ".join(page_text(copy).split())
    assert "GRADED FAIL by sheetgen grade, 2026-12-02" in text
    # every value typed is drawn in its own field (poppler reads field appearances)
    for value in ("SN-0042", "WO-881", "A. Tester", IDENTITY["record.instruments"]):
        assert text.count(value) == 1, value
    assert fonts_not_embedded(copy) == []  # the stamp in the sheet's embedded DejaVu
    # the copy is still the same sheet: its attachments match the recorded hash
    assert main(["grade", str(copy)]) == 1


def test_output_may_not_replace_the_sheet(sheets, capsys):
    assert main(["grade", str(sheets["good"]), "-o", str(sheets["good"])]) == 2
    assert "would overwrite the sheet" in capsys.readouterr().err


def test_usage_errors(sheets, tmp_path, capsys):
    assert main(["grade", str(sheets["good"]), "--parameter", "s21"]) == 2
    assert "--parameter needs --sweep" in capsys.readouterr().err
    assert main(["grade", str(sheets["good"]), "--sweep", str(tmp_path / "none.s2p")]) == 2
    err = capsys.readouterr().err
    assert "none.s2p" in err and "Traceback" not in err
