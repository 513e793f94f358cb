"""A released sheet is protected: the same id and revision with other content is refused
(exit 2) unless --force; the same content is a no-op that says so."""

from pathlib import Path

import pytest

from sheetgen.cli import main

ROOT = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf


def _job(tmp_path: Path, esr: str = "0.05 ohm", revision: str | None = None) -> Path:
    text = (ROOT / "templates" / "series.yaml").read_text(encoding="utf-8")
    assert "  esr: 0.05 ohm" in text
    text = text.replace("  esr: 0.05 ohm", f"  esr: {esr}")
    if revision:
        text = text.replace("  revision: A", f"  revision: {revision}")
    job = tmp_path / "job.yaml"
    job.write_text(text, encoding="utf-8")
    return job


def test_a_released_sheet_is_kept_unless_forced(tmp_path, capsys):
    out = tmp_path / "job.pdf"
    assert main(["build", str(_job(tmp_path)), "-o", str(out)]) == 0
    released = out.read_bytes()
    capsys.readouterr()
    assert main(["build", str(_job(tmp_path)), "-o", str(out)]) == 0
    assert "with this content; nothing written" in capsys.readouterr().out
    assert main(["build", str(_job(tmp_path, esr="0.06 ohm")), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert "job.pdf holds TS-1356 rev A with different content" in err and "--force" in err
    assert out.read_bytes() == released, "the released sheet is untouched"
    assert main(["build", str(_job(tmp_path, esr="0.06 ohm")), "-o", str(out), "--force"]) == 0
    assert out.read_bytes() != released
    capsys.readouterr()
    assert main(["build", str(_job(tmp_path, esr="0.06 ohm")), "-o", str(out), "--force"]) == 0
    assert "nothing written" not in capsys.readouterr().out, "--force always writes"


def test_a_new_revision_replaces_the_old_file(tmp_path, capsys):
    out = tmp_path / "job.pdf"
    assert main(["build", str(_job(tmp_path)), "-o", str(out)]) == 0
    assert main(["build", str(_job(tmp_path, esr="0.06 ohm", revision="B")), "-o",
                 str(out)]) == 0
    assert "wrote" in capsys.readouterr().out
