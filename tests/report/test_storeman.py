"""The technician can pick the parts (issue 16, item 8): every line of the parts list
carries the job's description of the part, or its dimensions and material properties."""

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.parts import part_rows
from sheetgen.report.rows import coil_rows, component_rows

INLINE = """\
sheet: {id: T-8, title: inline core, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: parallel, targets: {f0: 3.55 MHz}}
inductor:
  form: toroid
  inductance: 4.2 uH
  wire: AWG 24
  core:
    %s
    outer_diameter: 18 mm
    inner_diameter: 9.5 mm
    height: 6.5 mm
    material:
      %s
      mu_i: 10
      flux_density_max: 15 mT
      loss: [{f: 1 MHz, q: 150}, {f: 10 MHz, q: 120}]
capacitor:
  dissipation_factor: 0.05 %%
  dielectric: C0G
  trimmer: {minimum: 10 pF, maximum: 100 pF}%s
source: {resistance: 20 kohm, voltage: 5 V}
"""
DESCRIBED = ("description: 18 mm ring, red iron powder", "description: iron powder µi 10",
             "\n  description: silver mica, 500 V, radial leads")


def _design(tmp_path, text):
    path = tmp_path / "job.yaml"
    path.write_text(text, encoding="utf-8")
    return design_from_file(path)


def _everything(design) -> str:
    rows = part_rows(design)
    words = [" ".join((r.part, r.value, r.material, r.notes)) for r in rows]
    words += [" ".join((r.label, r.value, r.remark)) for r in component_rows(design)
              + coil_rows(design)]
    return "\n".join(words)


def test_an_inline_core_carries_its_description(tmp_path):
    text = _everything(_design(tmp_path, INLINE % DESCRIBED))
    assert "inline core" not in text and "inline material" not in text, text
    assert "18 mm ring, red iron powder" in text
    assert "iron powder µi 10" in text
    assert "silver mica, 500 V, radial leads" in text


def test_an_undescribed_inline_core_is_named_by_its_dimensions(tmp_path):
    """No description: the storeman gets OD × ID × height and µi instead."""
    text = _everything(_design(tmp_path, INLINE % ("", "", "")))
    assert "inline core" not in text and "inline material" not in text, text
    assert "18 × 9.5 × 6.5 mm" in text, text
    assert "µi 10" in text, text


def test_a_bought_coil_carries_its_description(tmp_path):
    job = """\
sheet: {id: T-9, title: bought coil, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: parallel}
inductor: {form: given, inductance: 220 uH, q: 90, description: "axial moulded RF inductor"}
capacitor: {capacitance: 560 pF, dissipation_factor: 0.1 %, dielectric: C0G}
source: {current: 1 mA}
"""
    (coil,) = [r for r in part_rows(_design(tmp_path, job)) if r.designator.startswith("L")]
    assert "axial moulded RF inductor" in coil.notes + coil.part + coil.material
