"""The cutting list: every wire cut before winding, with its leads and a spare end.

The link's length is checked by hand: a turn hugging the winding lies along the core's
section outline offset by 1.5 wire diameters (second layer), whose length is the section's
perimeter 2h + (OD − ID), less (8 − 4√2)·c for four 45° chamfers of leg c, plus 2π·1.5·d
(Steiner's formula for parallel curves); 50 mm spare is common practice."""

import math
from pathlib import Path

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.winding import cutting_list, winding_steps
from tests.support import assert_close

ROOT = Path(__file__).resolve().parents[2]


def test_toroid_cuts_the_winding_and_the_link_with_leads_and_spare():
    design = design_from_file(ROOT / "templates" / "toroid.yaml", ROOT / "shared")
    winding, link = cutting_list(design)
    coil = design.coil
    lead = coil.lead_length_m
    assert_close(winding.length_m, coil.result.wire_length_m + 0.05, rel=1e-12,
                 what="winding wire plus the spare, m")
    od, id_, h, c = 19.3e-3, 10.7e-3, 7.4e-3, 0.45e-3  # shared/cores.yaml, the starter's core
    d = coil.link_wire.overall_diameter_m
    turn = 2 * h + (od - id_) - (8 - 4 * math.sqrt(2)) * c + 2 * math.pi * 1.5 * d
    assert_close(link.length_m, coil.link_turns * turn + 2 * lead + 0.05, rel=1e-9,
                 what="link wire, m")
    first = winding_steps(design)[0].text
    assert "cutting list" in first and f"{winding.length_m * 1e3:.0f} mm" in first


def test_a_given_coil_has_nothing_to_cut():
    assert cutting_list(design_from_file(ROOT / "templates" / "series.yaml")) == ()
