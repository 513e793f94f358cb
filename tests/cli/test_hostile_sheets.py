"""Hostile sheets, releases and half results, through the CLI (issue 17, part B).

A sheet is built once; copies are altered with pikepdf (qpdf) as anyone with a PDF library
could, the content hash recomputed the documented way (SHA-256 over the attachments,
report/content_hash.py) so the alteration passes the hash check and reaches the readers.
Reproduced before the fix: results.json as a list, a string, rows of the wrong type or
nested 20,000 deep crashed grade/verify/diff (AttributeError, TypeError, RecursionError); an
attachment of 6 MB cost 35 s and 975 MB; a truncated or password-protected released sheet
was overwritten (exit 0); grade wrote --json and then failed on --append; build wrote
--results and then failed on the PDF; a sweep in kHz under a header in Hz was graded FAIL.
"""

from __future__ import annotations

import hashlib
import json
import subprocess
import sys
import time
from pathlib import Path

import pytest

from sheetgen.cli import main
from sheetgen.report.content_hash import INFO_CONTENT_SHA256, content_sha256
from tests.cli.test_bad_input import GOOD, _run, _write

pikepdf = pytest.importorskip("pikepdf")
pytestmark = pytest.mark.pdf


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    root = tmp_path_factory.mktemp("hostile")
    job = root / "job.yaml"
    job.write_text(GOOD, encoding="utf-8")
    assert main(["build", str(job)]) in (0, 1)
    return root / "job.pdf"


def _forged(pdf: Path, out: Path, *, results: bytes | None = None, job: bytes | None = None,
            compress: bool = False) -> Path:
    """A copy whose attachments are replaced and whose hash (document information and XMP)
    is recomputed to match, as a forger would."""
    with pikepdf.open(pdf) as doc:
        old_job = doc.attachments["job.yaml"].get_file().read_bytes()
        old_results = doc.attachments["results.json"].get_file().read_bytes()
        old_hash = content_sha256(old_job, old_results)
        new_job = old_job if job is None else job
        new_results = old_results if results is None else results
        for name, data in (("job.yaml", new_job), ("results.json", new_results)):
            if compress:
                stream = pikepdf.Stream(doc, __import__("zlib").compress(data, 9))
                stream.Filter = pikepdf.Name.FlateDecode
                stream.Type = pikepdf.Name.EmbeddedFile
                stream.Params = pikepdf.Dictionary(
                    Size=len(data), CheckSum=pikepdf.String(hashlib.md5(data).digest()))
                spec = doc.attachments[name].obj
                spec.EF.F = doc.make_indirect(stream)
            else:
                doc.attachments[name] = pikepdf.AttachedFileSpec(doc, data, filename=name)
        new_hash = content_sha256(new_job, new_results)
        doc.docinfo[pikepdf.Name("/" + INFO_CONTENT_SHA256)] = new_hash
        metadata = doc.Root.Metadata.read_bytes().replace(old_hash.encode(), new_hash.encode())
        doc.Root.Metadata.write(metadata)
        doc.save(out)
    return out


def _results(pdf: Path) -> dict:
    with pikepdf.open(pdf) as doc:
        return json.loads(doc.attachments["results.json"].get_file().read_bytes())


def _deep(levels: int) -> bytes:
    return b"[" * levels + b"]" * levels


def _cases(pdf: Path) -> dict[str, tuple[bytes, str]]:
    """results.json bodies, and the field the message must name."""
    rows = _results(pdf)
    wrong_rows = dict(rows, test_record=dict(rows["test_record"], values=[7, "x"]))
    wrong_row = dict(rows, test_record=dict(rows["test_record"], values=[
        dict(rows["test_record"]["values"][0], min="low")]))
    cautions = dict(rows, cautions=[{"level": 3, "code": "x", "text": "t"}])
    return {
        "a list": (b"[1, 2, 3]", "attachments.results.json"),
        "a string": (b'"results"', "attachments.results.json"),
        "rows not mappings": (json.dumps(wrong_rows).encode(),
                              "attachments.results.json.test_record.values[0]"),
        "a window not a number": (json.dumps(wrong_row).encode(),
                                  "attachments.results.json.test_record.values[0].min"),
        "a caution level not text": (json.dumps(cautions).encode(),
                                     "attachments.results.json.cautions[0].level"),
        "nested 20,000 deep": (b'{"sheet": ' + _deep(20_000) + b"}",
                               "attachments.results.json"),
        "nested 40 deep": (b'{"sheet": {"x": ' + _deep(40) + b"}}", "attachments.results.json"),
    }


CASE_NAMES = ["a list", "a string", "rows not mappings", "a window not a number",
              "a caution level not text", "nested 20,000 deep", "nested 40 deep"]


@pytest.mark.parametrize("case", CASE_NAMES)
@pytest.mark.parametrize("command", ["grade", "verify", "diff"])
def test_hostile_results_are_bad_input_in_every_reader(built, tmp_path, capsys, case, command):
    body, field = _cases(built)[case]
    forged = _forged(built, tmp_path / "forged.pdf", results=body)
    arguments = {"grade": ["grade", forged], "verify": ["verify", forged],
                 "diff": ["diff", built, forged]}[command]
    code, lines = _run(capsys, *arguments)
    assert code == 2, lines
    assert lines[0].startswith(f"{forged}:1:1 {field}: "), lines


@pytest.mark.parametrize("which", ["job.yaml", "results.json"])
def test_an_attachment_over_the_job_cap_is_refused_at_once(built, tmp_path, capsys, which):
    """6 MB of YAML compressed into a 150 kB sheet cost 35 s and 975 MB; now refused
    before it is inflated past the cap (1,000,000 bytes, the job file's)."""
    big = b"# " + b"x" * 6_000_000 + b"\n"
    forged = _forged(built, tmp_path / "big.pdf", compress=True,
                     **({"job": big} if which == "job.yaml" else {"results": big}))
    assert forged.stat().st_size < 400_000
    started = time.monotonic()
    code, lines = _run(capsys, "verify", forged)
    assert code == 2 and f"attachments.{which}: the attached {which} is larger than " \
        "1,000,000 bytes" in lines[0], lines
    assert time.monotonic() - started < 10


def test_an_encrypted_sheet_is_named(built, tmp_path, capsys):
    locked = tmp_path / "locked.pdf"
    with pikepdf.open(built) as doc:
        doc.save(locked, encryption=pikepdf.Encryption(owner="secret", user="", aes=True, R=6))
    for arguments in (["grade", locked], ["verify", locked]):
        code, lines = _run(capsys, *arguments)
        assert code == 2 and lines == [
            f"{locked}:1:1 is encrypted (saved with a password); sheetgen reads a sheet as it "
            "was built; expected the sheet saved without a password"]


def test_pypdf_notes_on_a_damaged_sheet_are_not_printed(built, tmp_path, capsys):
    damaged = tmp_path / "damaged.pdf"
    data = built.read_bytes()
    damaged.write_bytes(data[:len(data) // 2])
    code, lines = _run(capsys, "grade", damaged)
    assert code == 2 and len(lines) == 1 and lines[0].startswith(f"{damaged}:1:1 ")


# --------------------------------------------------------------------------- 8 releases


def _other_content(tmp_path: Path) -> Path:
    """The same id and revision as the built sheet, another design."""
    return _write(tmp_path, GOOD.replace("inductance: 10 uH", "inductance: 12 uH"), "other.yaml")


@pytest.mark.parametrize("damage", ["truncated by 100 bytes", "owner password"])
def test_a_released_sheet_that_cannot_be_read_is_protected(built, tmp_path, capsys, damage):
    released = tmp_path / "released.pdf"
    if damage == "owner password":
        with pikepdf.open(built) as doc:
            doc.save(released, encryption=pikepdf.Encryption(owner="o", user="", R=6))
    else:
        released.write_bytes(built.read_bytes()[:-100])
    before = released.read_bytes()
    other = _other_content(tmp_path)
    code, lines = _run(capsys, "build", other, "-o", released)
    assert code == 2 and "cannot be read as a sheet" in lines[0] and "--force" in lines[0]
    assert released.read_bytes() == before
    code, lines = _run(capsys, "build", other, "-o", released, "--force")
    assert code in (0, 1) and released.read_bytes() != before


def test_the_release_check_and_the_write_are_one_step(built, tmp_path):
    """While another build holds the release lock of the folder, a build waits; when the
    other build has written its sheet, the waiting one sees it (same id and revision,
    different content) and refuses, instead of both saying "wrote" and the last winning."""
    from sheetgen.bench.release import release_lock
    output = tmp_path / "sheet.pdf"
    other = _other_content(tmp_path)
    with release_lock(output):
        waiting = subprocess.Popen([sys.executable, "-m", "sheetgen", "build", str(other), "-o",
                                    str(output)], stdout=subprocess.PIPE,
                                   stderr=subprocess.PIPE, text=True)
        time.sleep(8)  # long enough for it to render and reach the lock
        assert waiting.poll() is None and not output.exists()
        output.write_bytes(built.read_bytes())  # the first build's sheet, written under the lock
    out, err = waiting.communicate(timeout=60)
    assert waiting.returncode == 2, (out, err)
    assert "with different content" in err and "wrote" not in out
    assert output.read_bytes() == built.read_bytes()


# --------------------------------------------------------------------------- 9 half results


def test_grade_writes_nothing_when_the_log_is_not_a_record_log(built, tmp_path, capsys):
    log = _write(tmp_path, "not,a,record,log\n", "log.csv")
    code, lines = _run(capsys, "grade", built, "--json", tmp_path / "r.json", "--csv",
                       tmp_path / "r.csv", "-o", tmp_path / "graded.pdf", "--append", log)
    assert code == 2 and lines[-1].startswith(f"{log}:1:1 the log's header is not")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["log.csv"]
    assert log.read_text() == "not,a,record,log\n"


def test_build_writes_no_results_when_the_pdf_cannot_be_written(tmp_path, capsys):
    job = _write(tmp_path, GOOD)
    code, lines = _run(capsys, "build", job, "--results", tmp_path / "r.json", "-o",
                       tmp_path / "missing" / "job.pdf")
    assert code == 2 and "the folder" in lines[0] and "does not exist" in lines[0]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["job.yaml"]


def test_a_folder_that_refuses_the_file_names_the_output(tmp_path, capsys, monkeypatch):
    """A read-only folder or a full disk fails in the temporary file; the message names the
    output the user asked for, not `.job.pdf.x.part`. (Root may write anywhere, so the
    refusal is made by the operating system call the writer uses.)"""
    import errno
    import tempfile

    def refuse(*args, **kwargs):
        raise OSError(errno.ENOSPC, "No space left on device", str(tmp_path / ".job.pdf.x.part"))
    monkeypatch.setattr(tempfile, "mkstemp", refuse)
    job = _write(tmp_path, GOOD)
    code, lines = _run(capsys, "limits", job, "--allow-failing", "-o", tmp_path / "job.csv")
    assert code == 2 and lines == [f"sheetgen: cannot write {tmp_path / 'job.csv'}: No space "
                                   "left on device; nothing written"]


def test_a_megabyte_typed_in_a_field_is_not_echoed_whole(built, tmp_path, capsys):
    from tests.bench.test_grade import fill
    filled = fill(built, {"measured.f0_hz": "9" * 1_000_000 + " furlongs"}, tmp_path / "f.pdf")
    code = main(["grade", str(filled)])
    captured = capsys.readouterr()
    assert code == 2 and "Traceback" not in captured.err
    assert len(captured.out) + len(captured.err) < 10_000
    assert "(1,000,009 characters)" in captured.err


# --------------------------------------------------------------------------- 10 reach


def test_a_sweep_in_khz_under_a_header_in_hz_is_bad_input(built, tmp_path, capsys):
    """The series starter is tuned to 13.56 MHz: its numbers in kHz written under a header
    that says Hz put the whole sweep near 13.5 kHz. Not a failed unit: bad input, and no
    record written."""
    rows = "".join(f"{13_000 + 10 * n},{-30 + (n if n < 50 else 100 - n) * 0.5}\n"
                   for n in range(101))
    sweep = _write(tmp_path, "frequency (Hz),magnitude (dB)\n" + rows, "unit.csv")
    code, lines = _run(capsys, "grade", built, "--sweep", sweep, "--json", tmp_path / "r.json")
    assert code == 2, lines
    assert lines[-1].startswith(f"{sweep}:1:1 spans 13.0000 kHz to 14.0000 kHz, which does "
                                "not reach the sheet's windows")
    assert not (tmp_path / "r.json").exists()
