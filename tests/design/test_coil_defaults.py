"""Windows no tighter than the parts (issue 16, item 7): a bought coil's tolerance and its
stated Q spread by stated common-practice defaults unless the job gives them.

Hand-worked: f0 = 1/(2π√(LC)) (Thomson), Q = X/R, and under a current drive an unloaded
tank's bandwidth is f0/Q, so it moves in proportion to the coil's loss resistance.
"""

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.rows import limits_rows
from tests.support import assert_close

JOB = """\
sheet: {id: T-7, title: bought coil, revision: A, designer: T, date: 2026-12-01}
circuit: {topology: parallel}
inductor: {form: given, inductance: 220 uH, q: 90%s}
capacitor: {capacitance: 560 pF, dissipation_factor: 0 %%, dielectric: C0G, tolerance: 0 %%}
source: {current: 1 mA}
variation: {method: worst-case}
"""


def _design(tmp_path, extra=""):
    path = tmp_path / "job.yaml"
    path.write_text(JOB % extra, encoding="utf-8")
    return design_from_file(path)


def test_a_stated_q_spreads_by_the_common_practice_default(tmp_path):
    """f0 = 1/(2π√(220e-6 · 560e-12)) = 453.4 kHz; bandwidth f0/Q = 453.4 kHz/90 = 5.038 kHz.
    A maker's Q spreads ±20 % (common practice), so the worst-case bandwidth window spans
    at least 5.038 kHz · (1 ± 0.19): 4.08 kHz to 6.00 kHz."""
    design = _design(tmp_path)
    assert_close(design.resonance.f0_hz, 453.4e3, rel=5e-4, what="f0")
    assert_close(design.resonance.bandwidth_hz, 5.038e3, rel=5e-3, what="bandwidth")
    lim = design.assessment.limits
    assert lim.bandwidth_min_hz <= 5.038e3 * 0.81, lim
    assert lim.bandwidth_max_hz >= 5.038e3 * 1.19, lim
    rows = {row.label: row for row in limits_rows(design)}
    assert "common practice" in rows["Coil Q spread"].remark


def test_the_job_overrides_the_q_spread(tmp_path):
    """inductor.q_tolerance: 0 % takes the stated Q as exact (and tolerance: 0 % the L,
    since the loss resistance X0/Q is fixed in ohms and bandwidth ≈ R/(2πL)): the bandwidth
    window is then only what the bench adds around the test set-up's own bandwidth (its
    probe and feed and their tolerances, a few percent), and less than a third as wide as
    with the default ±20 % spread."""
    exact = _design(tmp_path, ", q_tolerance: 0 %, tolerance: 0 %")
    lim, bench_bw = exact.assessment.limits, exact.bench.resonance.bandwidth_hz
    assert lim.bandwidth_min_hz > bench_bw * 0.95, lim
    assert lim.bandwidth_max_hz < bench_bw * 1.05, lim
    spread = _design(tmp_path).assessment.limits
    assert (lim.bandwidth_max_hz - lim.bandwidth_min_hz
            < (spread.bandwidth_max_hz - spread.bandwidth_min_hz) / 3)


def test_a_bought_coil_with_no_tolerance_is_not_exact(tmp_path):
    """No inductor.tolerance: ±10 % assumed (common practice for bought RF inductors), so
    the LCR window is 220 µH · 0.90 · 0.99 = 196.0 µH to 220 µH · 1.10 · 1.01 = 244.4 µH
    (the meter's default ±1 % on top, by hand)."""
    design = _design(tmp_path)
    low, high = design.assessment.inductance_window
    assert_close(low, 196.02e-6, rel=1e-4, what="L window low")
    assert_close(high, 244.42e-6, rel=1e-4, what="L window high")
    rows = {row.label: row for row in limits_rows(design)}
    assert "bought coil" in rows["Inductance tolerance"].remark
    given = _design(tmp_path, ", tolerance: 2 %").assessment.inductance_window
    assert_close(given[0], 220e-6 * 0.98 * 0.99, rel=1e-6, what="stated tolerance")


@pytest.mark.parametrize("spread", ["60 %"])
def test_a_normal_band_q_spread_is_bounded(tmp_path, spread):
    """A normal band wider than ±50 % could draw a negative loss: bad input."""
    from sheetgen.errors import InputError
    path = tmp_path / "job.yaml"
    path.write_text((JOB % f", q_tolerance: {spread}").replace(
        "variation: {method: worst-case}", "variation: {distribution: normal}"),
        encoding="utf-8")
    with pytest.raises(InputError) as error:
        design_from_file(path)
    assert "q_tolerance" in str(error.value)
