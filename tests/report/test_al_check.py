"""A stated AL that the core's material and size cannot give is a failed check.

Outside source: IEC 60205's ring-core effective parameters, C1 = 2π/(h ln(r2/r1)), so for
a ring of rectangular section without chamfer Ae/le = 1/C1 and
AL = µ0 µi Ae/le = µ0 µi h ln(r2/r1) / (2π); worked by hand below.
"""

import math
from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.checks import failed_checks
from tests.support import assert_close

ROOT = Path(__file__).resolve().parents[2]

# A 10 × 6 × 4 mm ring of a µi 125 ± 20 % material, no chamfer (invented test core):
# AL = 4π·1e-7 · 125 · 4e-3 m · ln(5/3) / (2π) = 2e-7 · 125 · 4e-3 · 0.510826 = 51.08 nH/turn².
HAND_AL = 2e-7 * 125 * 4e-3 * 0.5108256
MATERIAL = ("{mu_i: 125, mu_i_tolerance: 20 %, flux_density_max: 30 mT, loss: "
            "[{f: 1 MHz, loss_factor: 8e-6}, {f: 10 MHz, loss_factor: 20e-6}]}")


def _job(tmp_path, al: str | None) -> Path:
    core = ("{material: " + MATERIAL + ", outer_diameter: 10 mm, inner_diameter: 6 mm, "
            "height: 4 mm" + (f", al: {al}" if al else "") + "}")
    text = (ROOT / "templates" / "toroid.yaml").read_text(encoding="utf-8")
    start = text.index("  core: ")
    end = text.index("\n", start)
    job = tmp_path / "job.yaml"
    job.write_text(text[:start] + "  core: " + core + text[end:], encoding="utf-8")
    return job


def _al_failures(job):
    return [f for f in failed_checks(design_from_file(job)) if f.code == "al-mismatch"]


def test_hand_worked_al_matches_the_ring_formula():
    assert_close(HAND_AL, 4e-7 * math.pi * 125 * 4e-3 * math.log(5 / 3) / (2 * math.pi),
                 rel=1e-6, what="µ0 µi h ln(r2/r1)/2π (IEC 60205)")


def test_an_al_seven_times_the_geometrys_fails_with_the_implied_permeability(tmp_path):
    failures = _al_failures(_job(tmp_path, "523 nH/turn²"))
    assert len(failures) == 1
    failure = failures[0]
    assert failure.field == "inductor.core.al"
    implied = 125 * 523e-9 / HAND_AL  # ≈ 1280
    assert "µ ≈ 1.28 k" in failure.text or "µ ≈ 1280" in failure.text, failure.text
    assert_close(implied, 1280, rel=0.01, what="implied µ, by hand")
    assert "51.1 nH/turn²" in failure.text, failure.text
    assert "IEC 60205" in failure.text and "leave al out" in failure.text


@pytest.mark.parametrize("al_nh, agrees", [
    (51.08, True),   # the geometry's own AL
    (62.0, True),    # +21 %: within the overlap of the two ±20 % bands
    (95.0, False),   # band 76..114 nH above 51.08 · 1.2 · 1.05 = 64.4 nH: disagrees
    (30.0, False),   # band 24..36 nH below 51.08 · 0.8 · 0.95 = 38.8 nH: disagrees
])
def test_the_bands_overlap_rule(tmp_path, al_nh, agrees):
    failures = _al_failures(_job(tmp_path, f"{al_nh} nH/turn²"))
    assert (not failures) == agrees, [f.text for f in failures]


def test_no_stated_al_is_never_flagged(tmp_path):
    assert _al_failures(_job(tmp_path, None)) == []
