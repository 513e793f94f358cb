"""The sheet's winding drawing, parts list and designators, checked against the job, the
parts library and published relations (named beside each check), and read back from the
PDF with poppler's pdftotext.

The winding drawing is read as reportlab drew it: `drawing.turns` and `drawing.link_turns`
hold the strokes (Lines), `drawing.core` the ring's circles, `drawing.former` a solenoid's
former.
"""

from __future__ import annotations

import dataclasses
import math
import re

import pytest
import yaml
from reportlab.graphics.shapes import Line
from reportlab.lib.colors import white

from sheetgen.design.designators import Designators
from sheetgen.design.pipeline import design_from_file
from sheetgen.quantities import format_number, format_quantity
from sheetgen.report.parts import NO_DATA, part_rows
from sheetgen.report.rows import (
    capacitor_rows,
    coil_rows,
    component_rows,
    limits_rows,
    rating_rows,
    stress_rows,
)
from sheetgen.report.summary import summary_text
from sheetgen.report.winding import winding_steps
from sheetgen.sheet.schematic import schematic_of
from sheetgen.sheet.winding_drawing import winding_drawing, winding_view_of
from tests.sheet.test_tools import SHARED, TEMPLATES, build, need, page_text
from tests.support import assert_close

pytestmark = pytest.mark.pdf

WIDTH_PT = 515.0  # the A4 frame's width (210 mm less two 14 mm margins, in points)
PT_PER_MM = 72 / 25.4  # 1 in = 25.4 mm exactly (ISO 31-1), 72 pt to the inch (PostScript)
LEAD_GAP_DEG = 30.0  # the gap left between a toroid's leads (common practice)


def _design(name: str):
    return design_from_file(TEMPLATES / f"{name}.yaml", SHARED)


def _job_design(tmp_path, name: str, replacements: dict[str, str]):
    text = (TEMPLATES / f"{name}.yaml").read_text(encoding="utf-8")
    for old, new in replacements.items():
        assert old in text, old
        text = text.replace(old, new)
    path = tmp_path / f"{name}.yaml"
    path.write_text(text, encoding="utf-8")
    return design_from_file(path, SHARED)


def _template(name: str) -> dict:
    return yaml.safe_load((TEMPLATES / f"{name}.yaml").read_text(encoding="utf-8"))


def _library_core(name: str) -> dict:
    return yaml.safe_load((SHARED / "cores.yaml").read_text(encoding="utf-8"))["cores"][name]


def _mm(text: str) -> float:
    number, unit = text.split()
    assert unit == "mm", text
    return float(number)


def _ring(drawing):
    """Centre and the outer and inner radii of the ring as drawn, in points."""
    outer, inner = sorted(drawing.core.contents, key=lambda c: -c.r)
    assert (outer.cx, outer.cy) == (inner.cx, inner.cy), "the two circles are concentric"
    return outer.cx, outer.cy, outer.r, inner.r


def _stroke_angles(lines, cx, cy) -> list[float]:
    """The direction of each stroke from the ring's centre, degrees in [0, 360)."""
    return [math.degrees(math.atan2((a.y1 + a.y2) / 2 - cy, (a.x1 + a.x2) / 2 - cx)) % 360.0
            for a in lines]


# --- the winding drawing -------------------------------------------------------------------

def test_toroid_draws_one_radial_stroke_per_turn_on_a_ring_to_scale():
    design = _design("demo")
    job, core = _template("demo"), _library_core(_template("demo")["inductor"]["core"])
    # N from AL: L = AL·N² (IEC 60205's definition of the inductance factor), whole turns
    al_h = float(core["al"].split()[0]) * 1e-9
    turns = round(math.sqrt(float(job["inductor"]["inductance"].split()[0]) * 1e-6 / al_h))
    assert turns == 16  # √(2.2 µH / 9.1 nH) = 15.55
    drawing = winding_drawing(winding_view_of(design), WIDTH_PT)
    lines = drawing.turns.contents
    assert len(lines) == turns, "one stroke per turn"
    cx, cy, r_out, r_in = _ring(drawing)
    od_mm, id_mm = _mm(core["outer_diameter"]), _mm(core["inner_diameter"])
    assert_close(r_in / r_out, id_mm / od_mm, rel=1e-3, what="ID/OD of the ring as drawn")
    scale = re.search(r"drawn to scale (\d+(?:\.\d+)?) : 1",
                      " ".join(s.text for s in drawing.facts.contents))
    assert scale, "the scale is written beside the drawing"
    assert_close(2 * r_out, od_mm * float(scale.group(1)) * PT_PER_MM, rel=1e-3,
                 what="OD drawn at the stated scale, pt")
    for line in lines:  # radial, across the whole face: from inside the hole to outside
        radii = [math.hypot(line.x1 - cx, line.y1 - cy), math.hypot(line.x2 - cx, line.y2 - cy)]
        assert min(radii) < r_in and max(radii) > r_out
        cross = (line.x1 - cx) * (line.y2 - cy) - (line.y1 - cy) * (line.x2 - cx)
        assert abs(cross) <= 1e-2 * max(radii) ** 2, "the stroke points at the centre"
        assert not line.strokeDashArray, "tank turns are solid"


def test_toroid_winding_arithmetic_closes_in_the_drawing_and_the_steps():
    """A winding that fits runs from turn 1 to turn N over 360° less the lead gap (30°,
    common practice): N − 1 equal spaces of (360° − gap)/(N − 1), and those spaces plus the
    gap, summed from the drawn strokes, make the full 360°. The steps and the facts beside
    the drawing state the same numbers."""
    design = _design("demo")
    drawing = winding_drawing(winding_view_of(design), WIDTH_PT)
    cx, cy, _, _ = _ring(drawing)
    angles = _stroke_angles(drawing.turns.contents, cx, cy)
    n = len(angles)
    steps = [(a - b) % 360.0 for a, b in zip(angles, angles[1:], strict=False)]  # clockwise
    gap = (angles[-1] - angles[0]) % 360.0  # from the last turn on round to the first
    assert_close(sum(steps) + gap, 360.0, abs=0.05, what="drawn spaces plus the gap")
    assert_close(gap, LEAD_GAP_DEG, abs=0.05, what="gap between the finish and start turns")
    pitch = (360.0 - LEAD_GAP_DEG) / (n - 1)
    for step in steps:
        assert_close(step, pitch, abs=0.05, what="angle between neighbouring turns, degrees")
    assert_close((angles[0] + angles[-1]) / 2 % 360.0, 270.0, abs=0.1,
                 what="the lead gap sits at the bottom")
    facts = " ".join(s.text for s in drawing.facts.contents)
    words = " ".join(step.text for step in winding_steps(design))
    for text in (facts, words):
        assert f"{format_number(pitch, 3)}° from each turn to the next ({n - 1} spaces)" in text
        assert f"gap of {format_number(LEAD_GAP_DEG, 3)}°" in text
    hidden = drawing.hidden_turns.contents
    assert len(hidden) == n and all(line.strokeDashArray for line in hidden), \
        "each turn's way back under the ring is drawn once, dashed"


def test_link_is_drawn_as_outlined_strokes_over_the_start_end():
    """The link's turns: N_link = N·√(R_link/R_tank), rounded (an ideal transformer refers a
    resistance by the square of the turns ratio, textbook)."""
    design = _design("toroid")
    n = design.coil.result.turns
    r_tank = design.circuit.load_resistance_ohm
    r_link = float(_template("toroid")["inductor"]["link"]["resistance"].split()[0])
    expected = max(1, round(n * math.sqrt(r_link / r_tank)))
    drawing = winding_drawing(winding_view_of(design), WIDTH_PT)
    strokes = [line for line in drawing.link_turns.contents if isinstance(line, Line)]
    cores = [line for line in strokes if line.strokeColor == white]  # the outline's inside
    assert len(cores) == expected == design.coil.link_turns
    tank = drawing.turns.contents
    cx, cy, r_out, _ = _ring(drawing)
    tank_angles = _stroke_angles(tank, cx, cy)
    for angle in _stroke_angles(cores, cx, cy):  # between turn 1 and turn (link turns + 1)
        assert (tank_angles[0] - angle) % 360.0 <= (tank_angles[0] - tank_angles[expected]) % 360.0
    longest = max(math.hypot(line.x2 - cx, line.y2 - cy) for line in cores)
    assert longest > max(math.hypot(line.x2 - cx, line.y2 - cy) for line in tank), \
        "the link's strokes reach beyond the tank's, so they read apart without colour"
    labels = [s.text for s in drawing.link_turns.contents if hasattr(s, "text")]
    assert design.designators.link in labels


def test_solenoid_draws_each_turn_at_the_pitch():
    design = _design("solenoid")
    job = _template("solenoid")["inductor"]
    pitch_mm, former_mm = _mm(job["pitch"]), _mm(job["former_diameter"])
    drawing = winding_drawing(winding_view_of(design), WIDTH_PT)
    lines = drawing.turns.contents
    assert len(lines) == design.coil.result.turns
    (former,) = drawing.former.contents
    scale_pt_per_mm = former.height / former_mm  # the former's diameter sets the scale
    facts = " ".join(s.text for s in drawing.facts.contents)
    stated = re.search(r"drawn to scale (\d+(?:\.\d+)?) : 1", facts)
    assert stated
    assert_close(scale_pt_per_mm, float(stated.group(1)) * PT_PER_MM, rel=1e-3,
                 what="the former drawn at the stated scale")
    starts = sorted(line.x1 for line in lines)
    for a, b in zip(starts, starts[1:]):
        assert_close(b - a, pitch_mm * scale_pt_per_mm, abs=0.02, what="pitch as drawn, pt")
    for line in lines:  # from the bottom of the former to its top, half a pitch along
        assert line.y1 < former.y and line.y2 > former.y + former.height
        assert_close(line.x2 - line.x1, pitch_mm * scale_pt_per_mm / 2, abs=0.02,
                     what="a turn's front half advances half a pitch")
    words = [s.text for s in drawing.marks.contents if hasattr(s, "text")]
    for label in ("start", "finish", f"pitch {format_quantity(pitch_mm * 1e-3, 'm', 3)}",
                  f"Ø {format_quantity(former_mm * 1e-3, 'm', 3)}"):
        assert label in words, label


def test_the_stroke_count_check_can_fail():
    """A view with one turn fewer draws one stroke fewer (the count is of what is drawn)."""
    view = winding_view_of(_design("demo"))
    fewer = dataclasses.replace(view, turns=view.turns - 1,
                                turn_angles_deg=view.turn_angles_deg[:-1])
    assert len(winding_drawing(fewer, WIDTH_PT).turns.contents) == view.turns - 1


def test_winding_drawing_on_the_sheet(tmp_path):
    need("pdftotext")
    built = build(tmp_path, (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8"), "toroid")
    text = page_text(built.pdf_path)
    turns = built.results["inductor"]["turns"]
    for words in ("start turn 1", f"finish turn {turns}", f"L1: {turns} turns of AWG 24",
                  "L2 (outlined strokes): 1 turn", "seen from above"):
        assert words.lower() in text.lower(), words


def test_given_coil_has_no_winding_drawing():
    assert winding_view_of(_design("series")) is None


# --- designators ---------------------------------------------------------------------------

@pytest.mark.parametrize("name", ["series", "parallel", "demo", "toroid", "solenoid",
                                  "power-tank"])
def test_schematic_parts_list_and_ratings_use_the_same_designators(name):
    design = _design(name)
    schematic = schematic_of(design)
    drawn = {schematic.inductor.designator, *(p.designator for p in schematic.capacitors)}
    drawn |= {p.designator for p in (schematic.source_resistor, schematic.load, schematic.link,
                                     schematic.bleeder)
              if p is not None}
    listed = [row.designator for row in part_rows(design)]
    assert len(listed) == len(set(listed)), "each part listed once"
    assert drawn == set(listed)
    rated = {check.part for check in design.assessment.ratings}
    assert rated <= set(listed), rated - set(listed)
    names = design.designators
    expected = {names.coil, *names.capacitors, names.source_resistor, names.load_resistor,
                names.link, names.bleeder} - {None}
    assert set(listed) == expected


BLEEDER_JOB = (TEMPLATES / "power-tank.yaml").read_text(encoding="utf-8")


def _bleeder_design(tmp_path, extra=""):
    text = BLEEDER_JOB.replace("  bleeder: 1 Mohm\n", "  bleeder: 1 Mohm\n" + extra)
    assert "bleeder: 1 Mohm" in text
    path = tmp_path / "job.yaml"
    path.write_text(text, encoding="utf-8")
    return design_from_file(path)


def test_bleeder_is_a_part_drawn_listed_and_rated(tmp_path):
    """The bleeder across the tank sees its RF voltage: P = V̂²/(2R) (Joule's law for a
    sinusoid of peak V̂), at the worse (load-open) peak; half its rating (common practice)."""
    design = _bleeder_design(tmp_path)
    name = design.designators.bleeder
    assert name is not None and name.startswith("R")
    assert schematic_of(design).bleeder.designator == name
    (row,) = [r for r in part_rows(design) if r.designator == name]
    peak = max(design.stress.capacitor_voltage_peak_v,
               design.stress_open_load.capacitor_voltage_peak_v)
    power = peak**2 / (2 * 1e6)
    assert f"dissipates {format_quantity(power, 'W', 3)}" in row.notes
    assert row.rating == (f"buy at least {format_quantity(2 * power, 'W', 3)} and "
                          f"{format_quantity(peak, 'V', 3)} peak working voltage")
    assert not [c for c in design.assessment.ratings if c.part == name], "no rating given"
    low = _bleeder_design(tmp_path, "  bleeder_rated_power: 0.5 W\n"
                                    "  bleeder_rated_voltage: 500 V\n")
    checks = {c.quantity: c for c in low.assessment.ratings if c.part == name}
    assert checks["power"].status == "fail" and checks["working voltage"].status == "fail"
    assert_close(checks["power"].remedy.required_rating, 2 * power, rel=1e-9,
                 what="power rating to buy")
    good = _bleeder_design(tmp_path, "  bleeder_rated_power: 2 W\n"
                                     "  bleeder_rated_voltage: 1.5 kV\n")
    assert all(c.passed for c in good.assessment.ratings if c.part == name)


def test_designators_come_from_the_design_alone():
    """Renumbered designators change the schematic, the parts list and their cross-references
    (nothing numbers parts by itself)."""
    design = _design("toroid")
    renamed = Designators(coil="L7", fixed_capacitors=("C11", "C12"), trimmer="C13",
                          source_resistor="R5", load_resistor="R6", link="L8")
    other = dataclasses.replace(design, designators=renamed)
    schematic = schematic_of(other)
    assert schematic.inductor.designator == "L7" and schematic.link.designator == "L8"
    assert [p.designator for p in schematic.capacitors] == ["C11", "C12", "C13"]
    rows = {row.designator: row for row in part_rows(other)}
    assert sorted(rows) == sorted(["L7", "C11", "C12", "C13", "L8", "R5", "R6"])
    assert "L7" in rows["L8"].notes and "R6" in rows["L8"].notes
    assert "C12" in rows["C11"].notes
    view = winding_view_of(other)
    assert view.designator == "L7" and view.link_designator == "L8"


def test_designators_agree_on_the_printed_sheet(tmp_path):
    need("pdftotext")
    built = build(tmp_path, (TEMPLATES / "power-tank.yaml").read_text(encoding="utf-8"),
                  "power-tank")
    text = page_text(built.pdf_path)
    for check in built.results["ratings"]:
        assert re.search(rf"\b{check['part']} {re.escape(check['quantity'])}\b", text)
    for part in ("L1", "C1", "C2", "C3", "R1", "R2"):  # on the schematic and in the list
        assert len(re.findall(rf"\b{part}\b", text)) >= 2, part


# --- the parts list ------------------------------------------------------------------------

def test_parts_list_shows_the_dielectric_and_ratings_the_job_gives():
    """templates/power-tank.yaml: C0G, 3 kV peak, 10 A rms and 5 W per fixed part, a 3 kV trimmer,
    5 % tolerance. C0G is a class 1 dielectric (EIA-198, IEC 60384-8; from memory)."""
    design = _design("power-tank")
    rows = {row.designator: row for row in part_rows(design)}
    for fixed in ("C1", "C2"):
        assert rows[fixed].material == "C0G (class 1)"
        assert rows[fixed].rating == (f"{format_quantity(3e3, 'V', 3)} peak; "
                                      f"{format_quantity(10.0, 'A', 3)} rms; "
                                      f"{format_quantity(5.0, 'W', 3)} in its ESR")
        assert rows[fixed].tolerance == "± 2.00 % (job)"
    assert rows["C3"].rating == format_quantity(3e3, "V", 3) + " peak"
    assert rows["C3"].material == NO_DATA, "the job gives no trimmer dielectric"
    assert "air core" in rows["L1"].material and "AWG 4" in rows["L1"].material


def test_parts_list_tolerance_follows_the_series_when_the_job_gives_none():
    """No tolerance in templates/solenoid.yaml: the limits use the E24 series' ±5 %
    (IEC 60063 pairs E24 with 5 %; from memory), and the list says so."""
    design = _design("solenoid")
    rows = {row.designator: row for row in part_rows(design)}
    assert rows["C1"].tolerance == "± 5.00 % (IEC 60063 E24)"
    assert rows["C1"].material == "C0G (class 1)" and rows["C1"].rating == NO_DATA


def test_parts_list_of_a_ring_coil_names_material_wire_and_flux_limit():
    design = _design("demo")
    core = _library_core(_template("demo")["inductor"]["core"])
    materials = yaml.safe_load((SHARED / "materials.yaml").read_text(encoding="utf-8"))
    flux_mt = float(materials["materials"][core["material"]]["flux_density_max"].split()[0])
    (coil,) = [row for row in part_rows(design) if row.designator == "L1"]
    assert core["material"] in coil.material and "AWG 26" in coil.material
    assert coil.rating == f"core flux {format_quantity(flux_mt * 1e-3, 'T', 3)} peak"
    # no AL tolerance on the core: the material's µi tolerance (AL ∝ µi, IEC 60205)
    mu_tolerance = float(materials["materials"][core["material"]]["mu_i_tolerance"].split()[0])
    assert "al_tolerance" not in core
    assert coil.tolerance == f"± {mu_tolerance:.2f} %"


def test_parts_list_on_the_sheet(tmp_path):
    need("pdftotext")
    built = build(tmp_path, (TEMPLATES / "power-tank.yaml").read_text(encoding="utf-8"),
                  "power-tank")
    text = page_text(built.pdf_path)
    for words in ("C0G (class 1)", "3.00 kV peak; 10.0 A rms", "3.00 kV peak",
                  "± 2.00 % (job)"):
        assert words in text, words


# --- rows shared with the terminal summary -------------------------------------------------

def test_core_effective_parameters_in_the_summary(tmp_path):
    """A ring of rectangular section without chamfer: le = 2π ln(r2/r1)/(1/r1 − 1/r2),
    Ae = h ln²(r2/r1)/(1/r1 − 1/r2), Ve = le·Ae (IEC 60205 closed forms; from memory, see
    tests/reference/ring_core.md)."""
    design = _job_design(tmp_path, "demo", {
        "core: ring-14.6x8.1x5.7-irn14": "core: {material: iron-powder-mu14, outer_diameter: "
                                         "14.6 mm, inner_diameter: 8.1 mm, height: 5.7 mm, "
                                         "al: 9.1 nH/turn²}"})
    r1, r2, h = 4.05e-3, 7.3e-3, 5.7e-3
    le = 2 * math.pi * math.log(r2 / r1) / (1 / r1 - 1 / r2)
    ae = h * math.log(r2 / r1) ** 2 / (1 / r1 - 1 / r2)
    text = summary_text(design)
    shown = re.search(r"Effective magnetic path length le\s+([\d.]+) mm", text)
    assert_close(float(shown.group(1)) * 1e-3, le, rel=5e-4, what="le, 4 figures")
    shown = re.search(r"Effective area Ae\s+([\d.]+) mm²", text)
    assert_close(float(shown.group(1)) * 1e-6, ae, rel=5e-4, what="Ae, 4 figures")
    shown = re.search(r"Effective volume Ve\s+([\d.]+) mm³", text)
    assert_close(float(shown.group(1)) * 1e-9, le * ae, rel=5e-4, what="Ve, 4 figures")
    assert [r.label for r in coil_rows(design)].count("Effective area Ae") == 1


def test_load_voltage_in_the_summary():
    """templates/series.yaml: 1 W available from 50 Ω is an EMF of 2√(P·Rs) (available power
    V²/4Rs); at the series peak the reactances cancel, so the loop current is
    V/(Rs + rL + rC + RL) and the load sees I·RL (textbook series resonance)."""
    design = _design("series")
    emf = 2 * math.sqrt(1.0 * 50.0)
    current = emf / (50.0 + 3.2 + 0.05 + 50.0)
    shown = re.search(r"Load voltage\s+([\d.]+) V rms", summary_text(design))
    assert_close(float(shown.group(1)), current * 50.0, rel=5e-4, what="load voltage, V rms")
    assert [r.label for r in stress_rows(design)].count("Load voltage") == 1


def test_negative_percentages_use_the_minus_sign(tmp_path):
    """125 pF given: the part the job states is built, so no nearest E12 value is offered
    against it (issue 16). A 100 V rating on C1 is exceeded by the 165 V peak of
    templates/series.yaml, so its margin is negative."""
    design = _job_design(tmp_path, "series", {
        "  targets:\n    f0: 13.56 MHz\n": "",
        "preferred_series: E24": "preferred_series: E12",
        "capacitor:\n": "capacitor:\n  capacitance: 125 pF\n",
        "rated_voltage: 500 V": "rated_voltage: 100 V"})
    assert capacitor_rows(design) == []
    (rating,) = [r for r in rating_rows(design) if r.label == "C1 peak voltage"]
    assert re.fullmatch(r"FAIL, margin \u2212\d+ %", rating.remark), rating.remark
    every = (component_rows(design) + stress_rows(design) + limits_rows(design)
             + rating_rows(design))
    assert not [r for r in every if re.search(r"-\d", r.value + r.remark)]
