"""Forged and re-saved sheets, made as an attacker with a PDF library would make them.

A sheet is built by `sheetgen build`, then altered with pikepdf (qpdf): its attached results
edited, the content hash recomputed over the byte sequence sheetgen/report/content_hash.py
documents (SHA-256, FIPS 180-4, via hashlib — written out here, not sheetgen's function),
and both recorded copies (document information, XMP) updated to match.
"""

from __future__ import annotations

import hashlib
import json
import math
from pathlib import Path

import pytest

from sheetgen.bench.sheet_file import read_sheet
from sheetgen.cli import main
from sheetgen.errors import InputError

pikepdf = pytest.importorskip("pikepdf")
REPO = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf
INFO_HASH = "/SheetgenContentSHA256"


def documented_hash(*files: bytes) -> str:
    """len(job) ‖ job ‖ len(results) ‖ results [‖ len(library) ‖ library], lengths as
    8-byte big-endian (the docs)."""
    return hashlib.sha256(b"".join(len(b).to_bytes(8, "big") + b for b in files)).hexdigest()


def build_demo(root: Path, name: str = "demo.pdf") -> tuple[Path, Path]:
    """The demo starter's job in `root` (beside the repository's library) and its sheet."""
    job = root / "demo.yaml"
    job.write_bytes((REPO / "templates" / "demo.yaml").read_bytes())
    (root / "shared").symlink_to(REPO / "shared")
    pdf = root / name
    assert main(["build", str(job), "-o", str(pdf)]) in (0, 1)
    return job, pdf


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    return build_demo(tmp_path_factory.mktemp("forge"))[1]


def forge(pdf: Path, out: Path, edit) -> Path:
    """`edit(results)` applied to the attached results; hash recomputed; metadata updated."""
    with pikepdf.open(pdf) as doc:
        job = doc.attachments["job.yaml"].get_file().read_bytes()
        results = json.loads(doc.attachments["results.json"].get_file().read_bytes())
        edit(results)
        data = json.dumps(results, indent=2).encode("utf-8")
        library = ([doc.attachments["library.yaml"].get_file().read_bytes()]
                   if "library.yaml" in doc.attachments else [])
        old, new = str(doc.docinfo[INFO_HASH]), documented_hash(job, data, *library)
        doc.attachments["results.json"] = pikepdf.AttachedFileSpec(
            doc, data, filename="results.json", mime_type="application/json")
        doc.docinfo[INFO_HASH] = new
        xmp = doc.Root.Metadata.read_bytes()
        assert old.encode() in xmp
        doc.Root.Metadata.write(xmp.replace(old.encode(), new.encode()))
        doc.save(out)
    return out


def _window(results: dict, field: str) -> dict:
    return next(row for row in results["test_record"]["values"] if row["field"] == field)


def widen(low: float, high: float):
    def edit(results):
        for row in results["test_record"]["values"]:
            if row["min"] is not None:
                row["min"], row["max"] = low, high
        for key in results["limits"]:
            if key.endswith(("_min_hz", "_max_hz")):
                results["limits"][key] = low if "_min_" in key else high
    return edit


def test_a_forgery_with_a_recomputed_hash_reads_as_intact(built, tmp_path):
    """The premise: the hash alone does not stop a forger who recomputes it."""
    forged = forge(built, tmp_path / "forged.pdf", widen(0.0, 1e12))
    sheet = read_sheet(forged)
    assert _window(sheet.results, "measured.f0_hz")["max"] == 1e12


def test_verify_and_diff_see_widened_windows(built, tmp_path, capsys):
    forged = forge(built, tmp_path / "forged.pdf", widen(0.0, 1e12))
    capsys.readouterr()
    assert main(["verify", str(forged)]) == 1
    out = capsys.readouterr().out
    assert "does NOT reproduce" in out
    assert "test_record.measured.f0_hz.max" in out and "test_record.measured.f0_hz.min" in out
    assert main(["diff", str(built), str(forged)]) == 1
    out = capsys.readouterr().out
    assert "test_record.measured.f0_hz.max" in out and "no differences" not in out


def test_nan_windows_are_refused_by_grade_and_do_not_verify(built, tmp_path, capsys):
    forged = forge(built, tmp_path / "nan.pdf", widen(math.nan, math.nan))
    capsys.readouterr()
    assert main(["grade", str(forged)]) == 2
    err = capsys.readouterr().err
    assert "test_record.values[2].min" in err and "is not a finite number" in err
    assert "Traceback" not in err
    assert main(["verify", str(forged)]) == 1


def test_an_inverted_window_is_refused_by_grade(built, tmp_path, capsys):
    def invert(results):
        row = _window(results, "measured.f0_hz")
        row["min"], row["max"] = row["max"], row["min"]
    forged = forge(built, tmp_path / "inverted.pdf", invert)
    capsys.readouterr()
    assert main(["grade", str(forged)]) == 2
    assert "is above its max" in capsys.readouterr().err


def test_an_edited_xmp_hash_is_refused(built, tmp_path):
    edited = tmp_path / "xmp.pdf"
    with pikepdf.open(built) as doc:
        recorded = str(doc.docinfo[INFO_HASH])
        xmp = doc.Root.Metadata.read_bytes()
        doc.Root.Metadata.write(xmp.replace(recorded.encode(), b"0" * 64))
        doc.save(edited)
    with pytest.raises(InputError) as error:
        read_sheet(edited)
    (problem,) = error.value.problems
    assert problem.field == "metadata.ContentSHA256" and "differs" in problem.message


def test_a_sheet_whose_document_information_was_dropped_reads_from_its_xmp(built, tmp_path,
                                                                          capsys):
    resaved = tmp_path / "resaved.pdf"
    with pikepdf.open(built) as doc:
        recorded = str(doc.docinfo[INFO_HASH])
        del doc.trailer["/Info"]
        doc.save(resaved)
    with pikepdf.open(resaved) as doc:
        assert INFO_HASH not in doc.docinfo  # the re-save really dropped it
    sheet = read_sheet(resaved)
    assert sheet.content_sha256_recorded == recorded
    assert sheet.sheet_id == sheet.results["sheet"]["id"]
    capsys.readouterr()
    assert main(["verify", str(resaved)]) == 0, capsys.readouterr()


def test_a_long_differing_text_is_wrapped_in_the_diff_table():
    from sheetgen.report.diff import DiffRow, diff_table
    long_a = "WARNING: " + "the tank voltage is high; " * 13
    long_b = long_a.replace("high", "very high")
    table = diff_table([DiffRow("cautions", "tank-voltage", long_a, long_b)], "a.pdf", "b.pdf")
    assert max(len(line) for line in table.splitlines()) <= 160
    assert table.split().count("very") == 13  # nothing of B was cut off
