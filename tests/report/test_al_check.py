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

# An 11.7 × 6.4 × 3.7 mm ring of a µi 160 ± 20 % material, no chamfer (invented test core):
# AL = 4π·1e-7 · 160 · 3.7e-3 m · ln(11.7/6.4) / (2π) = 2e-7 · 160 · 3.7e-3 · 0.6032909
#    = 71.43 nH/turn².
HAND_AL = 2e-7 * 160 * 3.7e-3 * 0.6032909
MATERIAL = ("{mu_i: 160, mu_i_tolerance: 20 %, flux_density_max: 30 mT, loss: "
            "[{f: 1 MHz, loss_factor: 8e-6}, {f: 10 MHz, loss_factor: 20e-6}]}")


def _job(tmp_path, al: str | None) -> Path:
    core = ("{material: " + MATERIAL + ", outer_diameter: 11.7 mm, inner_diameter: 6.4 mm, "
            "height: 3.7 mm" + (f", al: {al}" if al else "") + "}")
    text = (ROOT / "templates" / "toroid.yaml").read_text(encoding="utf-8")
    start = text.index("  core: ")
    end = text.index("\n", start)
    job = tmp_path / "job.yaml"
    job.write_text(text[:start] + "  core: " + core + text[end:], encoding="utf-8")
    return job


def _al_failures(job):
    return [f for f in failed_checks(design_from_file(job)) if f.code == "al-mismatch"]


def test_hand_worked_al_matches_the_ring_formula():
    assert_close(HAND_AL, 4e-7 * math.pi * 160 * 3.7e-3 * math.log(11.7 / 6.4) / (2 * math.pi),
                 rel=1e-6, what="µ0 µi h ln(r2/r1)/2π (IEC 60205)")


def test_an_al_seven_times_the_geometrys_fails_with_the_implied_permeability(tmp_path):
    """The reported case: 523 nH/turn² stated on a ring whose material gives ~71 nH/turn²."""
    failures = _al_failures(_job(tmp_path, "523 nH/turn²"))
    assert len(failures) == 1
    failure = failures[0]
    assert failure.field == "inductor.core.al"
    implied = 160 * 523e-9 / HAND_AL  # ≈ 1172
    assert "µ ≈ 1172" in failure.text, failure.text
    assert_close(implied, 1172, rel=0.01, what="implied µ, by hand")
    assert "71.4 nH/turn²" in failure.text, failure.text
    assert "IEC 60205" in failure.text and "leave al out" in failure.text


@pytest.mark.parametrize("al_nh, agrees", [
    (71.42, True),   # the geometry's own AL
    (87.0, True),    # +22 %: band 69.6..104 nH overlaps 71.42 · 1.2 · 1.05 = 90.0 nH
    (130.0, False),  # band 104..156 nH above 90.0 nH: disagrees
    (40.0, False),   # band 32..48 nH below 71.42 · 0.8 · 0.95 = 54.3 nH: disagrees
])
def test_the_bands_overlap_rule(tmp_path, al_nh, agrees):
    failures = _al_failures(_job(tmp_path, f"{al_nh} nH/turn²"))
    assert (not failures) == agrees, [f.text for f in failures]


def test_no_stated_al_is_never_flagged(tmp_path):
    assert _al_failures(_job(tmp_path, None)) == []
