"""`sheetgen verify`: an archived sheet is intact (content hash) and still reproduces.

The archived sheets in tests/data/records were built by this version of sheetgen; when a
change moves their results on purpose, rebuild them (DEVELOPERS.md says how) and say so."""

import json
from pathlib import Path

import pytest

from sheetgen.cli import main
from sheetgen.engine import wire

ROOT = Path(__file__).resolve().parents[2]
RECORDS = sorted((ROOT / "tests" / "data" / "records").glob("*.pdf"))
pikepdf = pytest.importorskip("pikepdf")


def test_the_archived_records_reproduce(capsys):
    assert RECORDS, "tests/data/records holds the archived sheets"
    assert main(["verify", *map(str, RECORDS)]) == 0, capsys.readouterr()
    out = capsys.readouterr().out
    assert out.count("reproduces (built by sheetgen") == len(RECORDS)


def test_a_sheet_whose_attached_results_were_edited_is_refused(tmp_path, capsys):
    edited = tmp_path / "edited.pdf"
    with pikepdf.open(RECORDS[0]) as doc:
        data = json.loads(doc.attachments["results.json"].get_file().read_bytes())
        data["limits"]["f0_max_hz"] *= 1.05  # a window widened after the build
        doc.attachments["results.json"] = pikepdf.AttachedFileSpec(
            doc, json.dumps(data).encode("utf-8"), filename="results.json",
            mime_type="application/json")
        doc.save(edited)
    assert main(["verify", str(edited)]) == 2
    assert "content hash differs" in capsys.readouterr().err


@pytest.mark.pdf
def test_a_sheet_built_with_another_engine_constant_lists_what_moved(tmp_path, capsys,
                                                                    monkeypatch):
    """A sheet built while the copper resistivity of IEC 60028 (1/58 Ω·mm²/m) was 10 % high
    no longer reproduces: the coil's loss, Q and bandwidth moved, and verify names them."""
    job = tmp_path / "demo.yaml"
    job.write_text((ROOT / "templates" / "demo.yaml").read_text(encoding="utf-8"),
                   encoding="utf-8")
    (tmp_path / "shared").symlink_to(ROOT / "shared")
    sheet = tmp_path / "demo.pdf"
    with monkeypatch.context() as patch:
        patch.setattr(wire, "COPPER_RESISTIVITY_20C_OHM_M", wire.COPPER_RESISTIVITY_20C_OHM_M * 1.1)
        assert main(["build", str(job), "-o", str(sheet)]) == 0
    capsys.readouterr()
    assert main(["verify", str(sheet)]) == 1
    out = capsys.readouterr().out
    assert "does NOT reproduce" in out
    for moved in ("components.inductor_resistance_ohm", "resonance.q_unloaded",
                  "inductor.dc_resistance_ohm"):
        assert moved in out, moved
