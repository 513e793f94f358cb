"""A design that misses its f0 target says so (issue 16, item 5).

Hand-worked with Thomson's formula f0 = 1/(2π√(LC)) and bandwidth = f0/Q_loaded.
"""

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.checks import failed_checks
from sheetgen.report.rows import performance_rows
from tests.support import assert_close

JOB = """\
sheet: {id: T-18, title: 160 m tank, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: parallel, targets: {f0: 1.8 MHz, loaded_q: 95}}
inductor: {form: given, inductance: 10 uH, q: 200, tolerance: 0 %%}
capacitor: {dissipation_factor: 0.1 %%, dielectric: C0G, preferred_series: E12%s}
source: {current: 1 mA}
"""


def _design(tmp_path, extra=""):
    path = tmp_path / "job.yaml"
    path.write_text(JOB % extra, encoding="utf-8")
    return design_from_file(path)


def test_a_design_that_misses_its_target_fails_with_remedies(tmp_path):
    """C for 1.8 MHz on 10 µH: 1/((2π·1.8e6)²·10e-6) = 781.8 pF, less the 2 pF default
    stray = 779.8 pF to fit; E12 gives 820 pF, so C = 822 pF and f0 =
    1/(2π√(10e-6·822e-12)) = 1.7554 MHz: 44.6 kHz low; the bandwidth f0/95 = 18.48 kHz, so
    −2.41 bandwidths (by hand)."""
    design = _design(tmp_path)
    o = design.target_offset
    assert_close(o.built_hz, 1.7554e6, rel=2e-4, what="built f0")
    assert_close(o.offset_hz, -44.6e3, rel=5e-3, what="offset")
    assert_close(o.bandwidths, -2.41, abs=0.01, what="offset in bandwidths")
    assert o.misses
    (failure,) = [f for f in failed_checks(design) if f.code == "target-offset"]
    assert "2.41 bandwidths below the 1.800 MHz target" in failure.text, failure.text
    assert "390 pF + 390 pF (E12)" in failure.text, failure.text
    assert "E48" in failure.text and "trimmer" in failure.text, failure.text
    rows = {row.label: row for row in performance_rows(design)}
    assert rows["Offset from the f0 target"].value == "−44.57 kHz (−2.41 bandwidths)"


def test_the_pair_remedy_meets_the_target(tmp_path):
    """390 pF + 390 pF + 2 pF stray = 782 pF: f0 = 1/(2π√(10e-6·782e-12)) = 1.79976 MHz,
    0.2 kHz from the target, inside half the 18.9 kHz bandwidth (by hand)."""
    (pair,) = [r for r in _design(tmp_path).target_offset.remedies if r.kind == "pair"]
    assert pair.parts_f == (390e-12, 390e-12)
    assert_close(pair.f0_hz, 1.79976e6, rel=1e-4, what="f0 with the pair")


def test_a_trimmed_design_meets_its_target(tmp_path):
    """With a trimmer the unit is tuned to the target: no offset failure."""
    design = _design(tmp_path, ", trimmer: {minimum: 5 pF, maximum: 120 pF}")
    assert not design.target_offset.misses
    assert not [f for f in failed_checks(design) if f.code == "target-offset"]
