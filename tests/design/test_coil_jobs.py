"""Coil jobs through the CLI: library look-up, bad coil input, windings that do not fit.

The expectations are the error contract (exit 2 with FILE:LINE:COLUMN for bad input; exit 1
with a remedy for a design that fails a check) and ASTM B258's gauge range (0000 to 56).
"""

import json
import re
import shutil
from pathlib import Path

import pytest

from sheetgen.cli import main

ROOT = Path(__file__).resolve().parents[2]
TOROID = (ROOT / "templates" / "toroid.yaml").read_text(encoding="utf-8")


def _job(tmp_path: Path, text: str) -> Path:
    path = tmp_path / "job.yaml"
    path.write_text(text, encoding="utf-8")
    return path


def _run(capsys, *args):
    code = main([str(a) for a in args])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    return code, out.out, out.err


def test_unknown_core_names_the_known_ones(tmp_path, capsys):
    job = _job(tmp_path, TOROID.replace("core: ring-19.3x10.7x7.4-irn14", "core: ring-99"))
    code, _, err = _run(capsys, "check", job, "--library", ROOT / "shared")
    assert code == 2
    assert re.match(rf"^{re.escape(str(job))}:19:9 inductor.core: no core named 'ring-99'", err)
    assert "ring-19.3x10.7x7.4-irn14" in err


@pytest.mark.parametrize("size", ["AWG 99", "AWG -2", "banana", "-1 mm"])
def test_wire_that_is_not_a_size(tmp_path, capsys, size):
    job = _job(tmp_path, TOROID.replace("wire: AWG 24", f"wire: {size}"))
    code, _, err = _run(capsys, "check", job, "--library", ROOT / "shared")
    assert code == 2
    assert err.startswith(f"{job}:20:9 inductor.wire: ") and "is not a" in err
    assert "accepted is" in err


def test_winding_that_does_not_fit_fails_with_a_remedy_that_fits(tmp_path, capsys):
    crowded = (TOROID.replace("wire: AWG 24", "wire: AWG 16")
               .replace("inductance: 4.2 uH", "inductance: 9 uH")
               .replace("bandwidth: 60 kHz", "bandwidth: 120 kHz"))
    code, out, err = _run(capsys, "check", _job(tmp_path, crowded), "--json",
                          "--library", ROOT / "shared")
    assert code == 1
    got = json.loads(out)
    assert got["inductor"]["fits"] is False and got["inductor"]["remedy"] == "thinner_wire"
    suggested = re.search(r"use (AWG \d+) wire", err).group(1)
    assert "check failed: inductor.wire:" in err
    code, out, _ = _run(capsys, "check", _job(tmp_path, crowded.replace("AWG 16", suggested)),
                        "--json", "--library", ROOT / "shared")
    assert code == 0 and json.loads(out)["inductor"]["fits"] is True


def test_library_found_by_walking_up_from_the_job(tmp_path, capsys):
    """A team library in a shared/ folder above the job wins over the bundled one."""
    team = tmp_path / "shared"
    team.mkdir()
    shutil.copy(ROOT / "shared" / "materials.yaml", team)
    (team / "cores.yaml").write_text(
        "cores:\n  team-ring:\n    material: iron-powder-mu14\n    outer_diameter: 20 mm\n"
        "    inner_diameter: 11 mm\n    height: 7 mm\n", encoding="utf-8")
    nested = tmp_path / "jobs" / "2026"
    nested.mkdir(parents=True)
    job = _job(nested, TOROID.replace("core: ring-19.3x10.7x7.4-irn14", "core: team-ring"))
    code, out, _ = _run(capsys, "check", job, "--json")
    assert code == 0 and json.loads(out)["inductor"]["core"] == "team-ring"


def test_job_names_its_library_and_bad_library_files_are_located(tmp_path, capsys):
    parts = tmp_path / "parts"
    parts.mkdir()
    (parts / "cores.yaml").write_text(
        "cores:\n  r1:\n    material: {mu_i: 10, flux_density_max: 10 mT,\n"
        "      loss: [{f: 1 MHz, q: 100}]}\n    outer_diameter: 9 mm\n"
        "    inner_diameter: 12 mm\n    height: 4 mm\n", encoding="utf-8")
    job = _job(tmp_path, "library: parts\n" + TOROID.replace("ring-19.3x10.7x7.4-irn14", "r1"))
    code, _, err = _run(capsys, "check", job)
    assert code == 2
    assert err.startswith(f"{parts / 'cores.yaml'}:3:5 cores.r1: inner_diameter must be below")


def test_inline_core_needs_no_library(tmp_path, capsys):
    inline = TOROID.replace(
        "core: ring-19.3x10.7x7.4-irn14",
        "core:\n    material: {mu_i: 14, mu_i_tolerance: 5 %, flux_density_max: 9 mT,\n"
        "               loss: [{f: 1 MHz, q: 135}, {f: 10 MHz, q: 205}]}\n"
        "    outer_diameter: 19.3 mm\n    inner_diameter: 10.7 mm\n    height: 7.4 mm\n"
        "    al: 121 µH/100 turns")
    code, out, _ = _run(capsys, "check", _job(tmp_path, inline), "--json")
    assert code == 0
    got = json.loads(out)["inductor"]
    assert got["al_h_per_turn2"] == pytest.approx(12.1e-9, rel=1e-12)  # 121 µH/100 t = 12.1 nH/t²
    assert got["turns"] ** 2 * 12.1e-9 == pytest.approx(got["inductance_built_h"], rel=1e-12)


@pytest.mark.parametrize("kind", ["toroid", "solenoid"])
def test_new_offers_the_coil_starters(capsys, kind):
    code, out, _ = _run(capsys, "new", kind)
    assert code == 0 and f"form: {kind}" in out


TAPPED = TOROID.replace("  link:\n    resistance: 50 ohm\n", "  tap:\n    resistance: 2 kohm\n")


def test_tap_matches_its_resistance_to_the_tank(tmp_path, capsys):
    """Ideal autotransformer: R at M of N turns looks like R·(N/M)² across the tank, so the
    tap sits at M = N√(R_tap/R_tank) rounded to a whole turn (any textbook transformer
    relation); the steps and the drawing's facts say where."""
    assert "tap:" in TAPPED
    code, out, _ = _run(capsys, "check", _job(tmp_path, TAPPED), "--json",
                        "--library", ROOT / "shared")
    assert code == 0
    got = json.loads(out)
    n, m = got["inductor"]["turns"], got["inductor"]["tap_turns"]
    r_tank = got["components"]["load_resistance_ohm"]
    exact = n * (2000.0 / r_tank) ** 0.5
    assert m == round(exact) and abs(m - exact) <= 0.5
    assert any(f"after turn {m}" in step for step in got["inductor"]["winding_steps"])


def test_tap_above_the_tank_resistance_and_tap_with_link_are_refused(tmp_path, capsys):
    high = TAPPED.replace("resistance: 2 kohm", "resistance: 100 kohm")
    code, _, err = _run(capsys, "check", _job(tmp_path, high), "--library", ROOT / "shared")
    assert code == 2 and "inductor.tap: a tap for 1e+05 Ω would sit at or beyond the end" in err
    both = TAPPED.replace("  tap:\n", "  link:\n    resistance: 50 ohm\n  tap:\n")
    code, _, err = _run(capsys, "check", _job(tmp_path, both), "--library", ROOT / "shared")
    assert code == 2 and "give a link or a tap, not both" in err


@pytest.mark.pdf
def test_tap_is_drawn_on_the_schematic_and_the_winding(tmp_path, capsys):
    from pypdf import PdfReader
    job, out = _job(tmp_path, TAPPED), tmp_path / "tap.pdf"
    assert main(["build", str(job), "-o", str(out), "--library", str(ROOT / "shared")]) == 0
    capsys.readouterr()
    text = "\n".join(page.extract_text() for page in PdfReader(out).pages)
    m = json.loads(_run(capsys, "check", job, "--json", "--library", ROOT / "shared")[1])[
        "inductor"]["tap_turns"]
    assert text.count(f"tap, turn {m}") >= 2, "the tap is labelled on the schematic and the winding"


def test_given_self_capacitance_sets_the_toroid_srf(tmp_path, capsys):
    """SRF = 1/(2π√(L·C_self)) (Thomson's formula) with the job's self-capacitance, and the
    coil's Q at f0 falls (the self-capacitance's (1 − ω²LC) factor, engine.coil_q_sweep)."""
    import math
    plain = json.loads(_run(capsys, "check", _job(tmp_path, TOROID), "--json",
                            "--library", ROOT / "shared")[1])["inductor"]
    text = TOROID.replace("  lead_length: 30 mm", "  lead_length: 30 mm\n  self_capacitance: 3 pF")
    got = json.loads(_run(capsys, "check", _job(tmp_path, text), "--json",
                          "--library", ROOT / "shared")[1])["inductor"]
    srf = 1 / (2 * math.pi * math.sqrt(got["inductance_built_h"] * 3e-12))
    assert plain["srf_hz"] is None and abs(got["srf_hz"] / srf - 1) < 1e-12
    assert got["q_estimated"] < plain["q_estimated"]


@pytest.mark.parametrize("resistance, code_word", [("50 kohm", "more than the 19-turn"),
                                                   ("0.1 ohm", "below its reactance")])
def test_link_that_cannot_present_the_tank_load_fails_with_a_remedy(tmp_path, capsys,
                                                                     resistance, code_word):
    """Ideal transformer (any textbook): R at M of N turns presents R·(N/M)². A link of more
    turns than the tank (50 kΩ onto a ~23 kΩ tank load needs 19·√(50/23) ≈ 28 turns) steps
    the load up; one that presents less than X0 (0.1 Ω · 19² = 36 Ω < X0 ≈ 97 Ω) leaves a
    loaded Q under 1. Either is a failed check (exit 1), not "fits, all pass"."""
    text = TOROID.replace("    resistance: 50 ohm\n", f"    resistance: {resistance}\n")
    code, out, _ = _run(capsys, "check", _job(tmp_path, text), "--library", ROOT / "shared")
    assert code == 1
    assert code_word in out
