"""A tank tuned across a band by its variable capacitor (circuit.targets.band): the settings
and the capacitance each edge needs against Thomson's formula worked here, the settings
against the closed-form response (engine/resonance.py, held to ngspice), the coverage
check failing and passing, and the job errors. Invented 80 m tank."""

from __future__ import annotations

import json
import math
import subprocess
import sys
from dataclasses import replace

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine import resonance
from tests.support import assert_close

JOB = """\
sheet: {{id: BAND-1, title: 80 m tuned tank, revision: A, designer: R. Example, date: 2026-12-01}}
circuit:
  topology: parallel
  targets:
    band: {{low: 3.5 MHz, high: 3.8 MHz}}
    bandwidth: 150 kHz
inductor: {{form: given, inductance: 4.7 uH, q: 150, tolerance: {l_tol}}}
capacitor:
  dissipation_factor: 0.05 %
  preferred_series: E12
  tolerance: 2 %
  dielectric: C0G
  rated_voltage: 100 V
  stray: 2 pF
  trimmer: {{minimum: {t_min}, maximum: {t_max}}}
source: {{resistance: 10 kohm, voltage: 2 V}}
test: {{frequency_resolution: 1 kHz}}
"""


def _design(tmp_path, l_tol="2 %", t_min="10 pF", t_max="120 pF"):
    path = tmp_path / "band.yaml"
    path.write_text(JOB.format(l_tol=l_tol, t_min=t_min, t_max=t_max), encoding="utf-8")
    return design_from_file(path)


def test_settings_put_the_peak_on_each_band_point(tmp_path):
    """At each point the nominal unit with C3 at its setting peaks there (the closed-form
    response, ≤ 1e-6: the network keeps C3's own ESR as it is set, the closed form one ESR
    for the whole capacitance, a difference far below the printed 3-figure setting), and
    the total capacitance is about 1/((2πf)²L) (Thomson; the losses and the load pull the
    peak of a Q-24 tank by well under 0.1 %)."""
    design = _design(tmp_path)
    band = design.assessment.band
    circuit, choice = design.circuit, design.capacitor_choice
    others = choice.across.total_f
    assert [p.f_hz for p in band.points] == pytest.approx([3.5e6, math.sqrt(3.5e6 * 3.8e6),
                                                           3.8e6], rel=1e-15)
    for point in band.points:
        total = choice.fixed_f + point.setting_f + others
        tuned = resonance.analyse(replace(circuit, capacitance_f=total))
        assert_close(tuned.f_peak_hz, point.f_hz, rel=1e-6, what="peak at the setting")
        thomson = 1 / ((2 * math.pi * point.f_hz) ** 2 * circuit.inductance_h)
        assert_close(total, thomson, rel=1e-3, what="total C by Thomson's formula")


def test_the_padder_centres_the_variable_capacitor_on_the_band(tmp_path):
    """C_fixed ≈ ½(C_low + C_high) − ½(C3min + C3max), each C = 1/((2πf)²L) − strays
    (Thomson at the edges), to the nearest E12 pair."""
    design = _design(tmp_path)
    l = design.circuit.inductance_h
    edge = [1 / ((2 * math.pi * f) ** 2 * l) - 2e-12 for f in (3.5e6, 3.8e6)]
    wanted = 0.5 * sum(edge) - 0.5 * (10e-12 + 120e-12)
    assert_close(design.capacitor_choice.fixed_f, wanted, rel=0.02, what="padder (E12 ±2 %)")


def test_coverage_fails_with_a_wide_spread_and_passes_with_a_wider_capacitor(tmp_path):
    narrow = _design(tmp_path, l_tol="5 %")
    assert not narrow.assessment.band.covers
    low = narrow.assessment.band.low_edge
    thomson = 1 / ((2 * math.pi * 3.5e6) ** 2 * narrow.circuit.inductance_h)
    assert_close(low.nominal_needed_f, thomson - narrow.capacitor_choice.fixed_f - 2e-12,
                 rel=1e-12, what="nominal need at the low edge")
    wide = _design(tmp_path, l_tol="1 %", t_min="5 pF", t_max="160 pF")
    assert wide.assessment.band.covers


def test_band_windows_hold_the_nominal_unit(tmp_path):
    design = _design(tmp_path)
    circuit, choice = design.circuit, design.capacitor_choice
    for point in design.assessment.band.points:
        nominal = resonance.analyse(replace(
            circuit, capacitance_f=choice.fixed_f + point.setting_f + choice.across.total_f))
        lim = point.limits
        assert lim.bandwidth_min_hz <= nominal.bandwidth_hz <= lim.bandwidth_max_hz
        assert lim.f_peak_min_hz <= point.f_hz <= lim.f_peak_max_hz


@pytest.mark.parametrize("edit, field", [
    (lambda text: text.replace("  trimmer: {minimum: 10 pF, maximum: 120 pF}\n", ""),
     "circuit.targets.band"),
    (lambda text: text.replace("    bandwidth: 150 kHz", "    f0: 7 MHz\n    bandwidth: 150 kHz"),
     "circuit.targets"),
])
def test_band_job_errors_name_the_field(tmp_path, edit, field):
    job = tmp_path / "bad.yaml"
    job.write_text(edit(JOB.format(l_tol="2 %", t_min="10 pF", t_max="120 pF")), encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "sheetgen", "check", str(job)],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 2, done.stderr
    assert "bad.yaml:" in done.stderr and field in done.stderr
    assert "Traceback" not in done.stderr


def test_results_carry_the_band(tmp_path):
    job = tmp_path / "band.yaml"
    job.write_text(JOB.format(l_tol="1 %", t_min="5 pF", t_max="160 pF"), encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "sheetgen", "check", str(job), "--json"],
                          capture_output=True, text=True, timeout=120)
    band = json.loads(done.stdout)["band"]
    assert band["covered"] is True and len(band["points"]) == 3
    assert band["points"][0]["setting_f"] > band["points"][2]["setting_f"]  # C ∝ 1/f²
