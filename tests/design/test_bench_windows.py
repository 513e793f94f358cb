"""Bench windows: never narrower than the bench can tell apart, set for the test ambient,
with assumptions stated where the job is silent.

Sources: a frequency read off a stepped sweep is the nearest point, within ±step/2 (and a
difference of two readings within ±step) — arithmetic of sampling; Thomson's formula
f0 = 1/(2π√(LC)) for how a capacitance change moves f0; the instruments' default accuracies
are common practice (engine/limits.py); copper's expansion ~17 ppm/K (from memory).
"""

from pathlib import Path

import pytest

from sheetgen.cli import main
from sheetgen.design.pipeline import design_from_file
from sheetgen.report.results import results_document

ROOT = Path(__file__).resolve().parents[2]
TEMPLATES = ROOT / "templates"
STARTERS = sorted(p.name for p in TEMPLATES.glob("*.yaml") if not p.name.startswith("style"))
FREQUENCY_WINDOWS = ("f0", "f_peak", "f_low", "f_high", "f_centre")


def _results(tmp_path, text, name="job.yaml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return results_document(design_from_file(path, ROOT / "shared"))


@pytest.mark.parametrize("name", STARTERS)
def test_no_window_is_narrower_than_the_bench_resolves(name):
    got = results_document(design_from_file(TEMPLATES / name))
    lim, res = got["limits"], got["resonance"]
    step = lim["sweep_step_hz"]
    assert step > 0
    for key in FREQUENCY_WINDOWS:
        low, high = lim[f"{key}_min_hz"], lim[f"{key}_max_hz"]
        assert high - low >= step, f"{name} {key}: {low}…{high} narrower than one step {step}"
    assert lim["bandwidth_max_hz"] - lim["bandwidth_min_hz"] >= 2 * step
    accuracy = lim["lcr_accuracy"]
    z = res["impedance_at_peak_ohm"]
    assert lim["impedance_at_peak_min_ohm"] <= z * (1 - accuracy)
    assert lim["impedance_at_peak_max_ohm"] >= z * (1 + accuracy)
    if lim["f0_for_tuned_unit"]:  # trimmed only to within the tuning tolerance
        tuning = lim["tuning_tolerance_hz"]
        assert tuning > 0
        assert lim["f_peak_max_hz"] - lim["f_peak_min_hz"] >= 2 * tuning


PARALLEL = (TEMPLATES / "parallel.yaml").read_text(encoding="utf-8")
NO_TRIMMER = "".join(line for line in PARALLEL.splitlines(keepends=True)
                     if not line.startswith(("  trimmer:", "  tolerance: 5 %         # C0G")))
TUNED_N750 = (NO_TRIMMER.replace("  dielectric: C0G        # name it: with none, the widest class "
                               "(Y5V) is assumed\n",
                               "  temperature_coefficient: -750 ppm/K\n"
                               "  tolerance: 2 %\n"
                               "  trimmer: {minimum: 10 pF, maximum: 60 pF}\n")
              + "\nvariation:\n  temperature: {minimum: -10 °C, maximum: 60 °C}\n")


def test_bench_windows_come_from_the_test_ambient_not_the_operating_range(tmp_path):
    """A 455 kHz tank with an N750 capacitor over −10…60 °C drifts ≈ 750 ppm/K × 35 K / 2
    ≈ 1.3 % ≈ 6 kHz (Thomson: f ∝ C^-½); the bench (20…30 °C) windows must still tell a
    unit 5 kHz off tune: the half-power windows do not overlap, and the operating-range
    figures are given apart, wider."""
    assert "trimmer" in TUNED_N750 and "-750 ppm/K" in TUNED_N750
    lim = _results(tmp_path, TUNED_N750)["limits"]
    assert (lim["bench_temperature_min_c"], lim["bench_temperature_max_c"]) == (20.0, 30.0)
    assert lim["f_low_max_hz"] < lim["f_high_min_hz"], "half-power windows overlap"
    assert lim["f_peak_max_hz"] - lim["f_peak_min_hz"] < 5e3
    over = lim["over_temperature"]
    assert (over["temperature_min_c"], over["temperature_max_c"]) == (-10.0, 60.0)
    assert over["f_peak_max_hz"] - over["f_peak_min_hz"] > 5e3


def test_a_missing_temperature_coefficient_is_not_zero(tmp_path):
    """No dielectric named: the widest class (Y5V) is assumed and said; an air coil with no
    coefficient gets copper's expansion, +17 ppm/K (from memory)."""
    solenoid = (TEMPLATES / "solenoid.yaml").read_text(encoding="utf-8")
    named = _results(tmp_path, solenoid, "named.yaml")["limits"]
    silent = _results(tmp_path, solenoid.replace("  dielectric: C0G", "  # no dielectric"),
                      "silent.yaml")["limits"]
    assert named["capacitor_dielectric_assumed"] is None
    assert silent["capacitor_dielectric_assumed"] == "Y5V"
    assert (silent["f_peak_max_hz"] - silent["f_peak_min_hz"]
            > 2 * (named["f_peak_max_hz"] - named["f_peak_min_hz"]))
    assert named["inductance_tc_assumed_per_k"] == pytest.approx(17e-6)


def test_estimated_coil_q_spreads_the_loss_by_default(tmp_path):
    """A loss-table Q is good to about ±20 % (common practice), and so is a measured one
    from unit to unit; only inductor.q_tolerance: 0 % takes the Q as exact."""
    toroid = (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8")
    estimated = _results(tmp_path, toroid, "e.yaml")["limits"]
    assert estimated["loss_spread"] == pytest.approx(0.2)
    assert estimated["loss_spread_source"] == "estimate"
    stated = _results(tmp_path, toroid.replace("  lead_length: 30 mm\n",
                                               "  lead_length: 30 mm\n  q: 136\n"),
                      "s.yaml")["limits"]
    assert stated["loss_spread"] == pytest.approx(0.2)
    assert stated["loss_spread_source"] == "default"
    measured = _results(tmp_path, toroid.replace(
        "  lead_length: 30 mm\n", "  lead_length: 30 mm\n  q: 136\n  q_tolerance: 0 %\n"),
        "m.yaml")["limits"]
    assert measured["loss_spread"] is None
    assert (estimated["q_loaded_max"] - estimated["q_loaded_min"]
            > 3 * (measured["q_loaded_max"] - measured["q_loaded_min"]))


def test_untrimmed_spread_wider_than_the_bandwidth_needs_a_trimmer(tmp_path):
    """E12 (±10 %, IEC 60063) parts and the starter's ±5 % coil spread a 455 kHz tank's f0
    by about ±7.5 % (Thomson: f ∝ (LC)^-½), far more than its 15 kHz bandwidth: without a
    trimmer the design fails with the trimmer range it needs — C·(±10 % ± 5 %), most of 30 %
    of C — and with a trimmer of that range (and some room) it passes."""
    no_trimmer = NO_TRIMMER
    assert no_trimmer != PARALLEL
    path = tmp_path / "job.yaml"
    path.write_text(no_trimmer, encoding="utf-8")
    code = main(["check", str(path), "--json"])
    assert code == 1
    got = results_document(design_from_file(path))
    (failure,) = [c for c in got["checks"] if c["code"] == "untrimmed-spread"]
    needed = got["limits"]["trim_range_needed_f"]
    nominal = got["components"]["capacitance_f"]
    assert 0.22 * nominal < needed < 0.32 * nominal  # ±(10 % + 5 %) of C, most of it
    assert "add a trimmer of at least" in failure["text"]
    high = 10e-12 + 1.2 * needed
    fixed = no_trimmer.replace("  dielectric: C0G", "  trimmer: {minimum: 10 pF, maximum: "
                               f"{high * 1e12:.0f} pF, rated_voltage: 250 V}}\n  dielectric: C0G")
    path.write_text(fixed, encoding="utf-8")
    assert main(["check", str(path)]) == 0
