"""The command line as a user meets it: summaries, JSON results, starters, the schema.

Outside checks: the JSON Schema is read by the jsonschema library (Draft 2020-12), which
must accept every starter and reject a job the loader rejects; JSON is parsed by the
standard library.
"""

import json
from pathlib import Path

import jsonschema
import pytest

from sheetgen.cli import main
from sheetgen.inputs.starters import TEMPLATE_NAMES, template_text

ROOT = Path(__file__).resolve().parents[2]


def _run(capsys, *args):
    code = main([str(a) for a in args])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    return code, out.out, out.err


@pytest.mark.parametrize("name", TEMPLATE_NAMES)
def test_new_prints_a_starter_that_checks_clean(tmp_path, capsys, name):
    code, text, _ = _run(capsys, "new", name)
    assert code == 0 and text == template_text(name)
    job = tmp_path / f"{name}.yaml"
    job.write_text(text, encoding="utf-8")
    code, summary, err = _run(capsys, "check", job, "--library", ROOT / "shared")
    assert code == 0, err
    assert "Expected performance" in summary and "Bandwidth (−3 dB)" in summary


def test_json_results_follow_the_contract(capsys):
    code, out, _ = _run(capsys, "check", ROOT / "templates" / "toroid.yaml", "--json")
    assert code == 0
    got = json.loads(out)
    assert got["format"] == "sheetgen.results/1"
    assert set(got) >= {"tool_version", "sheet", "topology", "components", "resonance",
                        "stress", "inductor", "limits", "cautions"}
    assert set(got["resonance"]) >= {"f0_hz", "f_peak_hz", "f_unity_pf_hz", "reactance_ohm",
                                     "q_unloaded", "q_loaded", "bandwidth_hz", "f_low_hz",
                                     "f_high_hz", "impedance_at_peak_ohm"}
    assert set(got["stress"]) >= {"drive_power_w", "capacitor_voltage_peak_v",
                                  "capacitor_current_rms_a", "inductor_voltage_peak_v",
                                  "inductor_current_rms_a"}
    assert got["inductor"]["form"] == "toroid" and isinstance(got["inductor"]["turns"], int)


def test_series_results_mark_what_does_not_apply(capsys):
    code, out, _ = _run(capsys, "check", ROOT / "templates" / "series.yaml", "--json")
    got = json.loads(out)
    assert got["resonance"]["f_unity_pf_hz"] is None and got["inductor"]["turns"] is None


def test_schema_is_valid_and_accepts_every_starter(capsys):
    code, out, _ = _run(capsys, "schema")
    schema = json.loads(out)
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    import yaml

    def as_json(text):  # what an editor's YAML language server hands the schema
        return json.loads(json.dumps(yaml.safe_load(text), default=str))

    for name in TEMPLATE_NAMES + ("demo",):
        errors = list(validator.iter_errors(as_json(template_text(name))))
        assert not errors, (name, errors[0].message)
    bad = as_json(template_text("series"))
    bad["capacitor"]["colour"] = "blue"
    assert list(validator.iter_errors(bad)), "an unknown key must fail the schema too"


def installed_command() -> str | None:
    """The console script of the Python running the tests (beside sys.executable, as a
    virtual environment puts it), else the first on PATH."""
    import shutil
    import sys
    beside = Path(sys.executable).parent / "sheetgen"
    return str(beside) if beside.is_file() else shutil.which("sheetgen")


@pytest.mark.pdf
def test_installed_command_runs_the_demo_from_any_folder(tmp_path):
    """The installed console script (not this checkout) finds its package data: the demo,
    the starters and the bundled parts library. Outside check: pypdf reads the PDF."""
    import subprocess

    from pypdf import PdfReader
    command = installed_command()
    assert command, "sheetgen is not installed; the README's test command installs it"
    done = subprocess.run([command, "demo", "-o", "demo.pdf"], cwd=tmp_path, capture_output=True,
                          text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    assert len(PdfReader(tmp_path / "demo.pdf").pages) >= 2
    starter = subprocess.run([command, "new", "toroid"], cwd=tmp_path, capture_output=True,
                             text=True, timeout=60)
    (tmp_path / "coil.yaml").write_text(starter.stdout, encoding="utf-8")
    done = subprocess.run([command, "check", "coil.yaml", "--json"], cwd=tmp_path,
                          capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    assert json.loads(done.stdout)["inductor"]["core"] == "ring-19.3x10.7x7.4-irn14"


def test_outputs_are_written_whole_with_ordinary_permissions(tmp_path, capsys):
    """The temporary file is renamed into place (nothing .part is left) and the sheet gets
    the mode a new file gets under the umask, not the temporary file's private 0600."""
    import os
    out = tmp_path / "sheet.pdf"
    mask = os.umask(0o022)
    try:
        assert main(["build", str(ROOT / "templates" / "series.yaml"), "-o", str(out)]) == 0
    finally:
        os.umask(mask)
    assert out.read_bytes().startswith(b"%PDF-")
    assert out.stat().st_mode & 0o777 == 0o644
    assert [p.name for p in tmp_path.iterdir()] == ["sheet.pdf"]


def test_a_title_too_long_for_the_title_block_is_bad_input(tmp_path, capsys):
    """The title block prints every field whole or refuses it: exit 2 at the field's line
    and column, and no sheet written."""
    text = template_text("series")
    title = "Very long title with many words " * 12
    job = tmp_path / "long.yaml"
    job.write_text("\n".join(f'  title: "{title}"' if line.startswith("  title:") else line
                             for line in text.splitlines()) + "\n", encoding="utf-8")
    out = tmp_path / "long.pdf"
    assert main(["build", str(job), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    line = next(n for n, t in enumerate(job.read_text().splitlines(), 1) if t.startswith("  title:"))
    assert f"long.yaml:{line}:10 sheet.title: is too long to print whole" in err
    assert not out.exists()


def test_a_page_note_too_long_for_its_row_is_bad_input_at_its_line(tmp_path, capsys):
    """The style's page note is printed whole in the title block's last row or refused at
    the line and column where the style file writes it."""
    job = tmp_path / "job.yaml"
    job.write_text(template_text("series"), encoding="utf-8")
    style = tmp_path / "style-long.yaml"
    style.write_text("organisation: Example Radio Works\n"
                     f"page_note: {'Check the revision against the work order. ' * 4}\n",
                     encoding="utf-8")
    out = tmp_path / "job.pdf"
    assert main(["build", str(job), "-o", str(out), "--style", str(style)]) == 2
    err = capsys.readouterr().err
    assert "style-long.yaml:2:12 page_note: is too long to print whole" in err
    assert not out.exists()
