"""The bench procedure: instrument settings worked out by hand from the design's results.

References: the decibel-milliwatt, 0 dBm = 1 mW, which is 223.6 mV rms across 50 Ω (from
memory); the maximum power transfer theorem (a matched load gets half the EMF) and
Thévenin/Norton equivalents (any circuits textbook, e.g. Alexander & Sadiku, Fundamentals
of Electric Circuits, 5th ed., ch. 4); Thomson's formula f0 = 1/(2π√(LC)); the half-power
level 10·log10(1/2) = −3.0103 dB (from memory). Each rule the module states as common
practice is checked as stated, against the design's results.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine import bench
from sheetgen.engine.bench import HALF_POWER_DB, dbm_from_emf, nice_at_least, nice_at_most
from sheetgen.report.formatting import range_text
from sheetgen.report.procedure import form_field_names, procedure
from sheetgen.report.results import results_document
from tests.support import assert_close

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"
SHARED = TEMPLATES.parent / "shared"  # the parts library the starters name


def _design(tmp_path, name: str, edits: dict[str, str] | None = None):
    text = (TEMPLATES / f"{name}.yaml").read_text(encoding="utf-8")
    for old, new in (edits or {}).items():
        assert old in text, old
        text = text.replace(old, new)
    path = tmp_path / f"{name}.yaml"
    path.write_text(text, encoding="utf-8")
    d = design_from_file(path, SHARED)
    return d, results_document(d)


@pytest.mark.parametrize("emf_v, dbm, tol_db", [
    (2 * 0.22361, 0.0, 0.001),    # 0 dBm: 223.6 mV across the matched 50 Ω, EMF twice that
    (2.0, 13.010, 0.001),          # 1 V across 50 Ω = 20 mW = 13.01 dBm
    (2 * 2.2361e-3, -40.0, 0.001),  # 0.1 µW
    (2 * 7.0711, 30.0, 0.001),     # 1 W into 50 Ω is 7.071 V rms
])
def test_generator_level_of_an_emf(emf_v, dbm, tol_db):
    assert_close(dbm_from_emf(emf_v), dbm, abs=tol_db, what="dBm into 50 Ω")


def test_half_power_level():
    assert_close(HALF_POWER_DB, -3.0103, abs=1e-4, what="10·log10(1/2) in dB")


@pytest.mark.parametrize("value, mantissas, at_most, at_least", [
    (1234.0, (1.0, 2.0, 5.0), 1000.0, 2000.0),
    (0.0042, (1.0, 2.0, 5.0), 0.002, 0.005),
    (5.0, (1.0, 2.0, 5.0), 5.0, 5.0),
    (9.99, (1.0, 2.0, 5.0), 5.0, 10.0),
    (15000.0, (1.0, 3.0), 10000.0, 30000.0),
    (3100.0, (1.0, 3.0), 3000.0, 10000.0),
])
def test_nice_steps(value, mantissas, at_most, at_least):
    assert_close(nice_at_most(value, mantissas), at_most, rel=1e-12)
    assert_close(nice_at_least(value, mantissas), at_least, rel=1e-12)


@pytest.mark.parametrize("name", ["series", "parallel", "demo"])
def test_sweep_resolves_the_half_power_points(tmp_path, name):
    d, res = _design(tmp_path, name)
    sweep = bench.sweep_settings(float(d.sweep.f_hz[0]), float(d.sweep.f_hz[-1]), d.resonance.bandwidth_hz)
    bandwidth = res["resonance"]["bandwidth_hz"]
    assert sweep.step_hz <= bandwidth / 100 * (1 + 1e-12), "step at most BW/100"
    assert sweep.step_hz > bandwidth / 100 / 2.5 * (1 - 1e-12), "the largest 1-2-5 step"
    mantissa = sweep.step_hz / 10 ** math.floor(math.log10(sweep.step_hz))
    assert any(math.isclose(mantissa, m) for m in (1, 2, 5))
    assert (sweep.points - 1) * sweep.step_hz >= sweep.span_hz * (1 - 1e-9)
    assert sweep.receiver_bandwidth_hz <= bandwidth / 10 * (1 + 1e-12)
    assert sweep.receiver_bandwidth_hz > bandwidth / 10 / 3.4, "the largest 1-3 value"
    f_peak = res["resonance"]["f_peak_hz"]
    assert sweep.start_hz < res["resonance"]["f_low_hz"] < f_peak < res["resonance"][
        "f_high_hz"] < sweep.stop_hz, "the sweep shows both half-power points"
    assert_close(sweep.centre_hz, (sweep.start_hz + sweep.stop_hz) / 2, rel=1e-12)


def test_direct_hookup_and_level_for_a_50_ohm_source(tmp_path):
    """series.yaml: Rs = 50 Ω, 1 W available. EMF = 2√(P·Rs) (maximum power transfer)."""
    d, res = _design(tmp_path, "series")
    drive = bench.bench_drive(d.circuit, d.resonance, d.stress, d.drive)
    emf_design = 2 * math.sqrt(1.0 * 50.0)
    highest = max(res["stress"]["capacitor_voltage_peak_v"],
                  res["stress"]["inductor_voltage_peak_v"])
    assert drive.hookup == "direct" and drive.fixture_resistance_ohm is None
    assert_close(drive.generator_emf_rms_v, emf_design * 1.0 / highest, rel=1e-9,
                 what="EMF scaled to 1 V peak on the highest part (linear circuit)")
    assert_close(drive.part_voltage_peak_v, 1.0, rel=1e-9)
    assert_close(drive.generator_level_dbm,
                 10 * math.log10((drive.generator_emf_rms_v / 2) ** 2 / 50 / 1e-3), abs=1e-9)


def test_shunt_makes_a_low_source_resistance(tmp_path):
    """Rs = 10 Ω from a 50 Ω generator: 12.5 Ω across its output (50‖12.5 = 10, Thévenin),
    and the EMF behind it is 12.5/(12.5 + 50) of the generator's."""
    d, res = _design(tmp_path, "series", {"resistance: 50 ohm\n  available_power: 1 W":
                                          "resistance: 10 ohm\n  voltage: 0.1 V"})
    drive = bench.bench_drive(d.circuit, d.resonance, d.stress, d.drive)
    assert drive.hookup == "shunt_resistor"
    assert_close(drive.fixture_resistance_ohm, 12.5, rel=1e-12, what="shunt resistor")
    assert_close(1 / (1 / 12.5 + 1 / 50), drive.presented_resistance_ohm, rel=1e-12)
    scale = min(1.0, 1.0 / max(res["stress"]["capacitor_voltage_peak_v"],
                               res["stress"]["inductor_voltage_peak_v"]))
    assert_close(drive.generator_emf_rms_v * 12.5 / 62.5, 0.1 * scale, rel=1e-9,
                 what="Thévenin EMF at the circuit")


def test_norton_current_drive_beside_a_source_resistance(tmp_path):
    """parallel.yaml: 1 mA beside 47 kΩ is an EMF of 47 V behind 47 kΩ (Norton → Thévenin);
    a series resistor of 47 kΩ − 50 Ω makes the generator's 50 Ω up to it."""
    d, res = _design(tmp_path, "parallel")
    drive = bench.bench_drive(d.circuit, d.resonance, d.stress, d.drive)
    assert drive.hookup == "series_resistor"
    assert_close(drive.fixture_resistance_ohm, 47e3 - 50, rel=1e-12)
    highest = max(res["stress"]["capacitor_voltage_peak_v"],
                  res["stress"]["inductor_voltage_peak_v"])
    assert_close(drive.generator_emf_rms_v, 1e-3 * 47e3 * min(1.0, 1.0 / highest), rel=1e-9)


def test_feed_resistor_for_an_ideal_current_source(tmp_path):
    """No Rs, a current drive: a feed resistor of 100 × |Z| at the maximum, EMF = I·(50 + R)."""
    d, res = _design(tmp_path, "parallel", {"  resistance: 47 kohm    # output resistance of "
                                            "the driving stage\n": ""})
    drive = bench.bench_drive(d.circuit, d.resonance, d.stress, d.drive)
    z_peak = res["resonance"]["impedance_at_peak_ohm"]
    assert drive.hookup == "feed_resistor"
    assert_close(drive.fixture_resistance_ohm, 100 * z_peak, rel=1e-12)
    highest = max(res["stress"]["capacitor_voltage_peak_v"],
                  res["stress"]["inductor_voltage_peak_v"])
    current = 1e-3 * min(1.0, 1.0 / highest)
    assert_close(drive.generator_emf_rms_v, current * (50 + 100 * z_peak), rel=1e-9)


def test_probe_capacitance_limit_moves_f0_a_tenth_of_the_bandwidth(tmp_path):
    """Adding the largest probe capacitance allowed to C lowers f0 (Thomson's formula) by
    about a tenth of the bandwidth (first order in Cp/C)."""
    d, res = _design(tmp_path, "demo")
    probe = bench.detector(d.circuit, d.resonance).probe_capacitance_max_f
    c, l_h = res["components"]["capacitance_f"], res["components"]["inductance_h"]
    f0 = 1 / (2 * math.pi * math.sqrt(l_h * c))
    shifted = 1 / (2 * math.pi * math.sqrt(l_h * (c + probe)))
    assert_close(f0 - shifted, 0.1 * res["resonance"]["bandwidth_hz"], rel=0.01,
                 what="f0 shift by the probe")
    assert_close(bench.detector(d.circuit, d.resonance).probe_resistance_min_ohm,
                 100 * res["resonance"]["impedance_at_peak_ohm"], rel=1e-12)


def test_steps_are_numbered_and_name_the_settings(tmp_path):
    d, res = _design(tmp_path, "demo")
    plan = procedure(d)
    assert [s.number for s in plan.steps] == list(range(1, len(plan.steps) + 1))
    settings = dict(next(s for s in plan.steps if s.settings).settings)
    from sheetgen.quantities import format_quantity
    sweep = bench.sweep_settings(float(d.sweep.f_hz[0]), float(d.sweep.f_hz[-1]), d.resonance.bandwidth_hz)
    assert settings["Start"] == format_quantity(sweep.start_hz, "Hz", 4)
    assert settings["Stop"] == format_quantity(sweep.stop_hz, "Hz", 4)
    recorded = {field for step in plan.steps for field in step.records}
    value_fields = {name for name in form_field_names(plan.record)
                    if name.startswith(("measured.", "as_found."))}
    assert recorded == value_fields, "every value field is filled by a step, and no other"
    windows = {row.measurement.key: row.limits for row in plan.record}
    lim = res["limits"]
    assert windows["f0"] == (f"{format_quantity(lim['f_peak_min_hz'], 'Hz', 6)} to "
                             f"{format_quantity(lim['f_peak_max_hz'], 'Hz', 6)}")


def test_a_trimmed_unit_is_recorded_as_found_and_as_left(tmp_path):
    """Measure, tune, measure again: the record keeps both readings of every value the
    trimmer moves; the steps say which column each reading goes in."""
    d, _ = _design(tmp_path, "demo")
    assert d.capacitor_choice.trimmer_setting_f is not None, "the demo has a trimmer"
    plan = procedure(d)
    names = form_field_names(plan.record)
    for quantity in ("f0_hz", "f_low_hz", "f_high_hz", "bandwidth_hz", "q_loaded"):
        assert f"as_found.{quantity}" in names and f"measured.{quantity}" in names
    tune = next(step for step in plan.steps if step.title == "Tune")
    assert "recording the values as left" in tune.text
    assert set(tune.records) == {f"measured.{q}" for q in ("f0_hz", "f_low_hz", "f_high_hz",
                                                           "bandwidth_hz", "q_loaded")}
    assert len(set(names)) == len(names)


def test_an_untrimmed_unit_has_no_as_found_column(tmp_path):
    d, _ = _design(tmp_path, "series")
    names = form_field_names(procedure(d).record)
    assert not [n for n in names if n.startswith("as_found.")]
    assert "record.serial" in names and "record.work_order" in names


def test_part_windows_are_absolute_values_a_meter_reads():
    """L and C windows are nominal × (1 ± tolerance) × (1 ± the LCR meter's accuracy, 1 %
    by default, common practice), shown as values as well as percent, each edge rounded
    inward to the 4 figures printed: the window graded is the one printed."""
    import math
    d = design_from_file(TEMPLATES / "demo.yaml", SHARED)
    rows = {row.measurement.key: row for row in procedure(d).record}
    L, tol = d.circuit.inductance_h, d.assessment.inductance_tolerance
    meter = d.job.test.lcr_accuracy
    assert meter == 0.01
    row = rows["inductance"]
    low_uh = L * (1 - tol) * (1 - meter) * 1e6  # 2.1… µH
    high_uh = L * (1 + tol) * (1 + meter) * 1e6  # 2.4… µH
    assert_close(row.minimum * 1e6, math.ceil(low_uh * 1000 - 1e-9) / 1000, abs=1e-12,
                 what="lower edge rounded up to 4 figures, µH")
    assert_close(row.maximum * 1e6, math.floor(high_uh * 1000 + 1e-9) / 1000, abs=1e-12,
                 what="upper edge rounded down to 4 figures, µH")
    assert row.limits.startswith(f"{row.minimum * 1e6:.3f} µH to {row.maximum * 1e6:.3f} µH")


@pytest.mark.parametrize("name, broad", [("series", True), ("power-tank", True),
                                         ("toroid", False)])
def test_broad_peaks_are_read_at_the_centre_of_the_half_power_points(name, broad):
    """Below a loaded Q of 20 (common practice) the top of the response is too flat to read
    (a Q 8 series circuit changes by ~0.001 dB within ±0.1 % of f0, from |H| =
    1/√(1 + Q²(f/f0 − f0/f)²)); f0 is then the midpoint of the −3 dB points, and the record
    windows that midpoint."""
    d = design_from_file(TEMPLATES / f"{name}.yaml", SHARED)
    steps = {s.title: s.text for s in procedure(d).steps}
    rows = {row.measurement.key: row for row in procedure(d).record}
    lim = d.assessment.limits
    if broad:
        assert d.resonance.q_loaded < 20
        assert "midpoint of the two −3 dB points" in steps["Find the response maximum"]
        assert rows["f0"].limits.startswith(
            range_text(lim.f_centre_min_hz, lim.f_centre_max_hz, "Hz", 6))
    else:
        assert "midpoint" not in steps["Find the response maximum"]
        assert rows["f0"].limits == range_text(lim.f_peak_min_hz, lim.f_peak_max_hz, "Hz", 6)
