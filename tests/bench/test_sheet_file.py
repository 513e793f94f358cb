"""Reading a sheet back (sheetgen.bench.sheet_file.read_sheet).

The sheets are built by `sheetgen build` and altered with pikepdf (qpdf) and pypdf, as a
person with ordinary PDF tools would alter them; the expected job and results are the
files the build read and wrote, and the expected hash is SHA-256 (FIPS 180-4, hashlib)
over the byte sequence sheetgen/content_hash.py documents.
"""

from __future__ import annotations

import hashlib
import json
from pathlib import Path

import pytest

from sheetgen.bench.sheet_file import read_sheet
from sheetgen.cli import main
from sheetgen.errors import InputError

pikepdf = pytest.importorskip("pikepdf")
REPO = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf


@pytest.fixture(scope="module")
def sheet(tmp_path_factory):
    root = tmp_path_factory.mktemp("read")
    job = root / "demo.yaml"
    job.write_bytes((REPO / "templates" / "demo.yaml").read_bytes())
    pdf, results = root / "demo.pdf", root / "demo.json"
    assert main(["build", str(job), "-o", str(pdf), "--results", str(results)]) in (0, 1)
    return pdf, job, results


def _problem(error: pytest.ExceptionInfo):
    assert len(error.value.problems) == 1
    return error.value.problems[0]


def test_a_fresh_sheet_reads_back(sheet):
    pdf, job, results = sheet
    read = read_sheet(pdf)
    assert read.job_text == job.read_text(encoding="utf-8")
    assert read.results == json.loads(results.read_text(encoding="utf-8"))
    with pikepdf.open(pdf) as doc:  # the demo's core comes from the library: recorded too
        library = doc.attachments["library.yaml"].get_file().read_bytes()
    assert read.library_text == library.decode("utf-8")
    sequence = b"".join(len(b).to_bytes(8, "big") + b
                        for b in (job.read_bytes(), results.read_bytes(), library))
    assert read.content_sha256_recorded == hashlib.sha256(sequence).hexdigest()
    assert read.content_sha256_computed == read.content_sha256_recorded
    assert read.sheet_id == read.results["sheet"]["id"]
    assert read.revision == read.results["sheet"]["revision"]
    assert read.tool_version == read.results["tool_version"]
    assert read.fields["measured.f0_hz"] == "" and read.fields["verdict.f0"] == "Off"


def test_values_typed_in_a_viewer_read_back(sheet, tmp_path):
    """pypdf fills the form as a viewer would (and draws the appearance in the /DA font)."""
    from tests.bench.test_grade import fill
    filled = fill(sheet[0], {"measured.f0_hz": "7.093 MHz", "record.technician": "A. Tester µ±°"},
                  tmp_path / "filled.pdf")
    read = read_sheet(filled)
    assert read.fields["measured.f0_hz"] == "7.093 MHz"
    assert read.fields["record.technician"] == "A. Tester µ±°"


def _widened_copy(pdf: Path, out: Path) -> Path:
    with pikepdf.open(pdf) as doc:
        spec = doc.attachments["results.json"]
        data = json.loads(spec.get_file().read_bytes())
        data["limits"]["f0_max_hz"] *= 1.05  # someone widens a window after the build
        doc.attachments["results.json"] = pikepdf.AttachedFileSpec(
            doc, json.dumps(data, indent=2).encode("utf-8"), filename="results.json",
            mime_type="application/json")
        doc.save(out)
    return out


def test_edited_results_are_refused(sheet, tmp_path):
    copy = _widened_copy(sheet[0], tmp_path / "edited.pdf")
    with pytest.raises(InputError) as error:
        read_sheet(copy)
    problem = _problem(error)
    assert problem.path == str(copy) and problem.field == "content_sha256"
    assert "content hash differs" in problem.message and "results" in problem.message
    assert "changed after the build" in problem.message


def test_a_missing_attachment_is_named(sheet, tmp_path):
    copy = tmp_path / "no-job.pdf"
    with pikepdf.open(sheet[0]) as doc:
        del doc.attachments["job.yaml"]
        doc.save(copy)
    with pytest.raises(InputError) as error:
        read_sheet(copy)
    assert _problem(error).field == "attachments.job.yaml"
    assert "job.yaml" in _problem(error).message


def test_a_file_that_is_not_a_pdf_is_refused(tmp_path):
    text = tmp_path / "notes.pdf"
    text.write_text("f0 7.1 MHz\n", encoding="utf-8")
    with pytest.raises(InputError) as error:
        read_sheet(text)
    assert "not a PDF" in _problem(error).message and _problem(error).path == str(text)


def test_a_pdf_that_is_not_a_sheet_is_refused(tmp_path):
    other = tmp_path / "other.pdf"
    with pikepdf.new() as doc:
        doc.add_blank_page()
        doc.docinfo["/Title"] = "a letter"
        doc.save(other)
    with pytest.raises(InputError) as error:
        read_sheet(other)
    assert "not a sheetgen sheet" in _problem(error).message


def test_a_damaged_pdf_is_refused(sheet, tmp_path):
    damaged = tmp_path / "damaged.pdf"
    damaged.write_bytes(sheet[0].read_bytes()[:2000])
    with pytest.raises(InputError) as error:
        read_sheet(damaged)
    assert _problem(error).path == str(damaged)
