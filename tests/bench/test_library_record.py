"""The parts-library entries a design used travel with its sheet (library.yaml).

Reproduction: a job folder whose own shared/cores.yaml reuses the shipped core's name with
a 22 mm instead of an 18 mm outer diameter. Before, the build used it without a word, and
the sheet verified in that folder but "moved" once archived elsewhere. The attachment is
read back with pikepdf and parsed with PyYAML; the content hash is recomputed with hashlib
over the byte sequence report/content_hash.py documents (three files, 8-byte big-endian
lengths).
"""

from __future__ import annotations

import hashlib
import shutil
from pathlib import Path

import pytest
import yaml

from sheetgen.cli import main

pikepdf = pytest.importorskip("pikepdf")
REPO = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf
CORE = "ring-19.3x10.7x7.4-irn14"  # the core templates/toroid.yaml names


@pytest.fixture(scope="module")
def shadowed(tmp_path_factory):
    """The toroid starter built in a folder whose local library redefines its core."""
    root = tmp_path_factory.mktemp("library")
    job_folder = root / "project"
    (job_folder / "shared").mkdir(parents=True)
    job = job_folder / "toroid.yaml"
    job.write_bytes((REPO / "templates" / "toroid.yaml").read_bytes())
    assert f"core: {CORE}" in job.read_text(encoding="utf-8")
    cores = (REPO / "shared" / "cores.yaml").read_text(encoding="utf-8")
    block = cores[cores.index(f"  {CORE}:"):]
    assert "outer_diameter: 19.3 mm" in block.split("\n\n")[0]
    local = cores.replace(block, block.replace("outer_diameter: 19.3 mm",
                                               "outer_diameter: 23.0 mm", 1))
    (job_folder / "shared" / "cores.yaml").write_text(local, encoding="utf-8")
    shutil.copy(REPO / "shared" / "materials.yaml", job_folder / "shared" / "materials.yaml")
    return root, job


def test_the_build_says_a_local_entry_shadows_a_shipped_one(shadowed, capsys):
    root, job = shadowed
    capsys.readouterr()
    assert main(["build", str(job), "-o", str(job.with_suffix(".pdf"))]) in (0, 1)
    err = capsys.readouterr().err
    local = job.parent / "shared" / "cores.yaml"
    assert f"NOTICE: cores.{CORE} taken from {local}" in err
    assert str(REPO / "shared" / "cores.yaml") in err


def test_the_sheet_records_the_entries_used_and_verifies_anywhere(shadowed, capsys):
    root, job = shadowed
    sheet = job.with_suffix(".pdf")
    assert main(["build", str(job), "-o", str(sheet)]) in (0, 1)
    with pikepdf.open(sheet) as doc:
        attached = {name: doc.attachments[name].get_file().read_bytes()
                    for name in ("job.yaml", "results.json", "library.yaml")}
        recorded = str(doc.docinfo["/SheetgenContentSHA256"])
    library = yaml.safe_load(attached["library.yaml"])
    assert list(library["cores"]) == [CORE]
    assert library["cores"][CORE]["outer_diameter"] == "23.0 mm"  # the local entry
    assert list(library["materials"]) == [library["cores"][CORE]["material"]]
    sequence = b"".join(len(b).to_bytes(8, "big") + b for b in attached.values())
    assert recorded == hashlib.sha256(sequence).hexdigest()
    archive = root / "archive"  # no shared/ folder here or above: the shipped library
    archive.mkdir()
    moved = archive / "toroid.pdf"
    shutil.copy(sheet, moved)
    capsys.readouterr()
    assert main(["verify", str(moved)]) == 0, capsys.readouterr()
    assert "designed from the library entries recorded in the sheet" in capsys.readouterr().out
    # the shipped entry differs: naming the shipped library explicitly shows the move
    assert main(["verify", str(moved), "--library", str(REPO / "shared")]) == 1
    assert "inductor." in capsys.readouterr().out


def test_an_edited_library_attachment_is_refused(shadowed, tmp_path, capsys):
    root, job = shadowed
    sheet = job.with_suffix(".pdf")
    assert main(["build", str(job), "-o", str(sheet)]) in (0, 1)
    edited = tmp_path / "edited.pdf"
    with pikepdf.open(sheet) as doc:
        text = doc.attachments["library.yaml"].get_file().read_bytes()
        doc.attachments["library.yaml"] = pikepdf.AttachedFileSpec(
            doc, text.replace(b"23.0 mm", b"19.3 mm"), filename="library.yaml",
            mime_type="application/x-yaml")
        doc.save(edited)
    capsys.readouterr()
    assert main(["verify", str(edited)]) == 2
    assert "content hash differs" in capsys.readouterr().err


def test_a_job_without_library_parts_attaches_no_library(tmp_path):
    job = tmp_path / "series.yaml"
    job.write_bytes((REPO / "templates" / "series.yaml").read_bytes())
    assert main(["build", str(job), "-o", str(tmp_path / "series.pdf")]) in (0, 1)
    with pikepdf.open(tmp_path / "series.pdf") as doc:
        assert sorted(doc.attachments) == ["job.yaml", "results.json"]


def test_diff_names_the_library_entry_that_differs(shadowed, tmp_path, capsys):
    """The same job built against the shipped core (18 mm) and the local one (22 mm)."""
    root, job = shadowed
    local = job.with_suffix(".pdf")
    assert main(["build", str(job), "-o", str(local)]) in (0, 1)
    shipped = tmp_path / "shipped.pdf"
    assert main(["build", str(job), "-o", str(shipped), "--library", str(REPO / "shared")]) \
        in (0, 1)
    capsys.readouterr()
    assert main(["diff", str(shipped), str(local), "--json"]) == 1
    import json
    rows = json.loads(capsys.readouterr().out)
    library = [(r["key"], r["a"], r["b"]) for r in rows if r["section"] == "library"]
    assert library == [(f"library.cores.{CORE}.outer_diameter", "19.3 mm", "23.0 mm")]
    assert not [r for r in rows if r["section"] == "inputs"]  # the same job file
