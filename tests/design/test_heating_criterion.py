"""One criterion for coil heating: the winding's temperature at the worst credible case;
the current density is information beside its reference, at the same case.

Sources: the natural-convection rule ΔT [K] = (P [mW] / A [cm²])^0.833 over the winding's
enveloping cylinder π(D + d)ℓ (common practice), worked in the test; P = I²·R_ac (Joule);
ASTM B258 AWG 14, 1.628 mm (from memory); 4 A/mm² for enamelled windings in free air
(common practice).
"""

import math
from pathlib import Path

from sheetgen.design.pipeline import design_from_file
from tests.support import assert_close

# Reproduction: a 40 m trap in AWG 14 whose current density is far above 4 A/mm² while its
# winding runs well below the enamel's 155 °C; the old check failed it.
TRAP = """
sheet: {id: T-40, title: 40 m trap, revision: A, designer: X, date: 2026-12-01}
circuit:
  topology: parallel
  targets: {f0: 7.05 MHz, loaded_q: 10}
inductor:
  form: solenoid
  inductance: 4.7 uH
  former_diameter: 40 mm
  wire: AWG 14
  pitch: 3 mm
  former_length: 80 mm
  lead_length: 20 mm
capacitor:
  dissipation_factor: 0.05 %
  preferred_series: E12
  dielectric: C0G
  rated_voltage: 3 kV
  rated_power: 5 W
  trimmer: {minimum: 5 pF, maximum: 60 pF, rated_voltage: 3 kV}
source:
  resistance: 3 kohm
  available_power: 60 W
"""


def _trap(tmp_path):
    path = tmp_path / "trap.yaml"
    path.write_text(TRAP, encoding="utf-8")
    return design_from_file(path)


def test_an_ordinary_coil_is_not_failed_by_its_current_density(tmp_path):
    d = _trap(tmp_path)
    checks = {f"{c.part} {c.quantity}": c for c in d.assessment.ratings}
    assert "L1 current density" not in checks
    density = d.assessment.current_density
    assert density.actual_a_per_m2 > density.reference_a_per_m2, "the finding reproduced"
    area_mm2 = math.pi / 4 * 1.628**2  # AWG 14 (from memory): 2.08 mm²
    assert density.actual_a_per_m2 * 1e-6 > 3.758 / area_mm2, "crowded area is smaller"
    assert checks["L1 surface temperature"].passed


def test_temperature_and_current_density_use_the_same_worst_case(tmp_path):
    """Both at the load-open coil current; the rise worked from the convection rule."""
    d = _trap(tmp_path)
    open_current = d.stress_open_load.inductor_current_rms_a
    assert open_current > d.stress.inductor_current_rms_a, "load open is the worst case"
    coil = d.coil_at_worst
    assert coil.copper_loss_w > d.coil.result.copper_loss_w, "the sheet's rows keep the drive's"
    assert_close(d.assessment.current_density.current_rms_a, open_current, rel=1e-9,
                 what="current density at the load-open current")
    # coil_at_voltage takes the terminal voltage: I = V/|r + jX| is the same current
    power_w = open_current**2 * coil.ac_resistance_ohm
    assert_close(coil.copper_loss_w, power_w, rel=1e-3, what="I²·R_ac with the load open")
    surface_cm2 = math.pi * (coil.diameter_m + coil.wire.overall_diameter_m) * coil.length_m * 1e4
    rise_k = (power_w * 1e3 / surface_cm2) ** 0.833
    check = next(c for c in d.assessment.ratings if c.quantity == "surface temperature")
    assert_close(check.actual, d.job.variation.temperature.maximum + rise_k, rel=1e-3,
                 what="winding temperature at the worst case")


def test_the_coil_finish_stands_the_worst_case(tmp_path):
    """Coil wax softens from about 50 °C (from memory; common practice). In a 15 °C
    ambient the trap's winding runs about 30 K up as driven (wax would do) but about
    48 K up with the load open: the finish is chosen for the worst case."""
    from sheetgen.report.winding import coil_finish_text
    path = tmp_path / "trap.yaml"
    path.write_text(TRAP + "variation:\n  temperature: {minimum: 0 °C, maximum: 15 °C}\n",
                    encoding="utf-8")
    d = design_from_file(path)
    assert 15.0 + d.coil.result.temperature_rise_k < 50.0 < 15.0 + d.coil_at_worst.temperature_rise_k
    text = coil_finish_text(d)
    assert "do not use wax" in text and "with the load open" in text


def test_the_finish_says_where_the_heat_comes_from():
    """The demo's coil warms by millikelvins; its 50 °C is the job's hottest ambient
    (templates/demo.yaml). The finish text must not say the coil "makes" 50 °C: it names
    the ambient and the coil's own rise, which add up to the surface figure."""
    from sheetgen.report.winding import coil_finish_text
    d = design_from_file(Path(__file__).resolve().parents[2] / "templates" / "demo.yaml",
                         Path(__file__).resolve().parents[2] / "shared")
    text = coil_finish_text(d)
    assert "makes" not in text
    assert "a 50.0 °C ambient" in text and "mK of its own heat" in text, text
