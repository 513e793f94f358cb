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
import re
from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine import bench
from sheetgen.engine.bench import HALF_POWER_DB, dbm_from_emf, nice_at_least, nice_at_most
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


# IEC 60063 E96 values near the examples below (from memory): 1.96, 9.76, 10.0, 12.1,
# 12.4, 12.7, 47.5, 84.5 (× a power of ten).
@pytest.mark.parametrize("wanted, kind, resistor, presented", [
    (50.3, "direct", None, 50.0),                       # within 1 % of the port
    (10e3, "series_resistor", 10.0e3, 10.05e3),         # 9.95 kΩ → 10.0 kΩ (9.76 is farther)
    (47e3, "series_resistor", 47.5e3, 47.55e3),         # 46.95 kΩ → 47.5 kΩ
    (60.0, "series_resistor", 10.0, 60.0),
    (10.0, "shunt_resistor", 12.4, 12.4 * 50 / 62.4),   # 12.5 Ω → 12.4 Ω, then ∥ 50 Ω
])
def test_a_port_is_made_from_a_standard_resistor(wanted, kind, resistor, presented):
    hookup = bench.port_hookup(wanted, port_tolerance=0.05)
    assert hookup.kind == kind
    if resistor is None:
        assert hookup.resistor_ohm is None
    else:
        assert_close(hookup.resistor_ohm, resistor, rel=1e-12, what="E96 resistor")
    assert_close(hookup.presented_ohm, presented, rel=1e-12, what="what the circuit sees")
    if kind == "series_resistor":  # first-order band of R(1 ± 1 %) + 50 Ω(1 ± 5 %)
        assert_close(hookup.band, (resistor * 0.01 + 50 * 0.05) / (resistor + 50), rel=1e-12)
    high = (resistor or 0) * 1.01 + 50 * 1.05 if kind != "shunt_resistor" else \
        1 / (1 / (resistor * 1.01) + 1 / 52.5)
    assert high / hookup.presented_ohm - 1 <= hookup.band * (1 + 1e-9), "the band holds the corner"


def _highest_part_voltage_peak(circuit, emf_rms_v: float, f_hz: float) -> float:
    """Ohm's law on the phasors, by hand: series loop or parallel tank behind Rs."""
    w = 2 * math.pi * f_hz
    z_l = complex(circuit.inductor_resistance_ohm, w * circuit.inductance_h)
    z_c = complex(circuit.capacitor_esr_ohm, -1 / (w * circuit.capacitance_f))
    rs, rl = circuit.source_resistance_ohm, circuit.load_resistance_ohm
    if circuit.topology == "series":
        i = emf_rms_v / (rs + (rl or 0) + z_l + z_c)
        return math.sqrt(2) * max(abs(i * z_l), abs(i * z_c))
    y = 1 / z_l + 1 / z_c + (1 / rl if rl else 0)
    v = emf_rms_v / rs / (1 / rs + y)
    return math.sqrt(2) * abs(v)


@pytest.mark.parametrize("name", ["series", "parallel", "demo", "power-tank"])
def test_the_generator_level_puts_one_volt_peak_on_the_highest_part(tmp_path, name):
    """The level is set on the bench circuit (the fixture fitted): at the generator's EMF
    (divided by a shunt's R/(R + 50 Ω), Thévenin), the highest part voltage worked by hand
    is 1 V peak (or the design's own, if lower); dBm = 10·log10((E/2)²/50 Ω / 1 mW)."""
    d, res = _design(tmp_path, name)
    setup = d.bench
    emf = setup.drive.generator_emf_rms_v
    if setup.source.kind == "shunt_resistor":
        emf *= setup.source.resistor_ohm / (setup.source.resistor_ohm + 50)
    got = _highest_part_voltage_peak(setup.circuit, emf, setup.resonance.f_peak_hz)
    design_high = max(res["stress"]["capacitor_voltage_peak_v"],
                      res["stress"]["inductor_voltage_peak_v"])
    assert_close(got, min(1.0, design_high), rel=1e-6, what="highest part voltage, by hand")
    assert_close(setup.drive.generator_level_dbm,
                 10 * math.log10((setup.drive.generator_emf_rms_v / 2) ** 2 / 50 / 1e-3),
                 abs=1e-9)


def test_a_shunt_makes_a_low_source_resistance(tmp_path):
    """Rs = 10 Ω from a 50 Ω generator: 12.4 Ω (the E96 value nearest 12.5 Ω) across its
    output, which the circuit sees as 12.4 ∥ 50 = 9.94 Ω."""
    d, _ = _design(tmp_path, "series", {"resistance: 50 ohm\n  available_power: 1 W":
                                        "resistance: 10 ohm\n  voltage: 0.1 V"})
    assert d.bench.source.kind == "shunt_resistor"
    assert_close(d.bench.circuit.source_resistance_ohm, 12.4 * 50 / 62.4, rel=1e-12)


def test_an_ideal_current_source_is_fed_through_a_small_coupling_capacitor(tmp_path):
    """No Rs, a current drive: a feed resistor of 100 × |Z| − 50 Ω (about 1.9 MΩ) with the
    ~0.2 pF across a leaded resistor (common practice) is a capacitor at 455 kHz
    (ωRC ≈ 1.1), so the generator feeds the tank through a small coupling capacitor:
    50 Ω + 1/(jωCc) is the parallel R = 50·(1 + Qc²), Qc = 1/(ωCc·50) (series-to-parallel
    conversion), so Cc = 1/(ω·50·√(R/50 − 1)), the nearest E12 value; the circuit sees
    the port's 50 Ω in series with it."""
    d, res = _design(tmp_path, "parallel", {"  resistance: 47 kohm    # output resistance of "
                                            "the driving stage\n": ""})
    z_peak = res["resonance"]["impedance_at_peak_ohm"]
    source = d.bench.source
    assert source.kind == "coupling_capacitor"
    omega = 2 * math.pi * res["resonance"]["f_peak_hz"]
    assert omega * 0.2e-12 * (100 * z_peak - 50) > 1.0, "no resistor at this frequency"
    cc = 1 / (omega * 50 * math.sqrt(100 * z_peak / 50 - 1))
    e12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)  # IEC 60063
    nearest = min((m * 10.0 ** k for m in e12 for k in range(-13, -9)),
                  key=lambda c: abs(math.log(c / cc)))
    assert_close(source.capacitance_f, nearest, rel=1e-9)
    assert_close(d.bench.circuit.source_capacitance_f, nearest, rel=1e-12)
    assert d.bench.circuit.source_resistance_ohm == 50.0
    settings = dict(next(s for s in procedure(d).steps if s.key == "connect").all_settings)
    assert settings["Generator hookup"].startswith("C3 33 pF C0G"), settings["Generator hookup"]


def test_a_link_coupled_tank_is_measured_through_its_link(tmp_path):
    """toroid.yaml: a 50 Ω load on the link is the receiver's own input; the tank sees it as
    50 Ω × (N/M)² (ideal transformer), with no probe and no resistor."""
    d, res = _design(tmp_path, "toroid")
    found = d.bench.receiver
    assert found.place == "link" and found.hookup.kind == "direct"
    n, m = res["inductor"]["turns"], res["inductor"]["link_turns"]
    assert_close(d.bench.circuit.load_resistance_ohm, 50.0 * (n / m) ** 2, rel=1e-12)
    connect = next(s for s in procedure(d).steps if s.title == "Connect the test set-up")
    assert "through its link" in connect.text and "no probe" in connect.text


def test_a_parallel_load_is_a_resistor_into_the_receiver(tmp_path):
    """demo.yaml: the load R2 is made of the E96 value nearest RL − 50 Ω in series with the
    receiver's 50 Ω input; the receiver reads the tank voltage divided by (R + 50)/50."""
    d, res = _design(tmp_path, "demo")
    wanted = res["components"]["load_resistance_ohm"]
    port = d.bench.receiver.hookup
    assert port.kind == "series_resistor"
    assert abs(math.log(port.resistor_ohm / (wanted - 50))) <= math.log(10) / 96 / 2 + 1e-9
    fixture = res["test_record"]["fixture"]
    assert_close(fixture["circuit"]["load_resistance_ohm"], port.resistor_ohm + 50, rel=1e-12)
    settings = dict(next(s for s in procedure(d).steps
                         if s.title == "Connect the test set-up").all_settings)
    from sheetgen.quantities import format_quantity
    assert (f"R4 {format_quantity(port.resistor_ohm, 'Ω', 3)} ± 1.00 % (IEC 60063 E96)"
            in settings["Receiver hookup"]), "numbered on after the unit's R1 and R2"


def test_the_lcr_level_drives_a_small_flux_in_a_ring_core(tmp_path):
    """1 V rms at the measuring frequency: B̂ = √2·V/(ωNAe) (Faraday), by hand from the
    results' turns and the core's Ae."""
    d, res = _design(tmp_path, "demo")
    coil = next(s for s in procedure(d).steps if s.title == "Measure the coil")
    settings = dict(coil.all_settings)
    f = 1e6
    assert settings["LCR meter frequency"] == "1.00 MHz"
    ae = d.coil.result.effective.ae_m2
    flux = math.sqrt(2) * 1.0 / (2 * math.pi * f * res["inductor"]["turns"] * ae)
    shown = re.search(r"drives ([\d.]+) µT peak in the core", settings["Why this setting"])
    assert shown, settings["Why this setting"]
    assert_close(float(shown.group(1)) * 1e-6, flux, rel=0.01, what="B̂, printed to 2 figures")


def test_hazardous_designs_get_an_optional_full_power_run(tmp_path):
    """Part voltages scale with √P in a linear circuit: the 25 % step shows half the 100 %
    voltage; a design with no hazard gets no run."""
    d, res = _design(tmp_path, "power-tank")
    plan = procedure(d)
    assert plan.full_power, "the power tank's cautions apply at its drive"
    levels = dict(next(s for s in plan.full_power if s.settings).settings)
    highest = max(res["stress"]["capacitor_voltage_peak_v"], res["stress"]["inductor_voltage_peak_v"])
    from sheetgen.quantities import format_quantity
    assert format_quantity(highest, "V", 3) in levels["Step at 100 %"]
    assert format_quantity(highest / 2, "V", 3) in levels["Step at 25 %"]
    assert "the cautions of this sheet (WARNING and CAUTION) apply in full" in plan.full_power[0].text
    assert "behind a guard" in plan.full_power[0].text, "WARNING: guarded, observed"
    toroid, _ = _design(tmp_path, "toroid")
    assert procedure(toroid).full_power == ()


def test_a_caution_only_design_gets_a_lighter_full_power_run(tmp_path):
    """ANSI Z535.4 / ISO 3864-2: CAUTION is a hazard of minor injury, WARNING of serious
    injury; parallel.yaml driven at 2 mA has only CAUTIONs (about 54 V peak on the tank,
    70 V peak with the load open), so its run asks for care, not a guard and an observer,
    and a coil with no computed rise is watched for ambient."""
    d, res = _design(tmp_path, "parallel", {"current: 1 mA": "current: 2 mA"})
    assert "caution" in {c["level"] for c in res["cautions"]}
    assert {c["level"] for c in res["cautions"]} <= {"caution", "notice"}
    run = procedure(d).full_power
    assert run and "behind a guard" not in run[0].text and "Keep fingers off" in run[0].text
    watch = next(s for s in run if s.title == "Watch at each step")
    assert "rise shown" not in watch.text and "L1, C1 and C2 stay near ambient" in watch.text


def test_steps_are_numbered_and_name_the_settings(tmp_path):
    d, res = _design(tmp_path, "demo")
    plan = procedure(d)
    assert [s.number for s in plan.steps] == list(range(1, len(plan.steps) + 1))
    settings = dict(next(s for s in plan.steps if s.title == "Set the instrument").settings)
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
    # Printed to the bench's resolution, no finer: the windows are rounded outward to
    # 1 kHz (limits.resolution_hz), so 7.088 MHz shows its kHz digit and nothing after it
    # (hand-worked: log10 7.088e6 → 6, log10 1e3 → 3: 6 − 3 + 1 = 4 figures).
    assert lim["resolution_hz"] == 1e3
    assert windows["f0"] == (f"{format_quantity(lim['f_peak_min_hz'], 'Hz', 4)} to "
                             f"{format_quantity(lim['f_peak_max_hz'], 'Hz', 4)}")
    low, high = (float(text.split()[0]) * 1e6 for text in windows["f0"].split(" to "))
    assert (low, high) == (lim["f_peak_min_hz"], lim["f_peak_max_hz"]), "nothing lost"


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
    tuning = steps.get("Tune") or steps["Trim if needed"]
    if broad:
        assert d.resonance.q_loaded < 20
        assert "midpoint of the two −3 dB points" in steps["Find the response maximum"]
        assert rows["f0"].limits.startswith(_at_resolution(
            lim.f_centre_min_hz, lim.f_centre_max_hz, lim.resolution_hz))
        # the tuning step aims at what step 7 records, not at a maximum too flat to read
        assert "midpoint of the −3 dB points" in tuning and "maximum" not in tuning
    else:
        assert "midpoint" not in steps["Find the response maximum"]
        assert rows["f0"].limits == _at_resolution(lim.f_peak_min_hz, lim.f_peak_max_hz,
                                                   lim.resolution_hz)
        assert "response maximum" in tuning


def _at_resolution(low: float, high: float, resolution: float) -> str:
    """A window printed so its last figure is the resolution's (hand rule: figures =
    ⌊log10 value⌋ − ⌊log10 resolution⌋ + 1)."""
    import math

    from sheetgen.quantities import format_quantity

    def text(value: float) -> str:
        digits = math.floor(math.log10(value)) - math.floor(math.log10(resolution)) + 1
        return format_quantity(value, "Hz", digits)
    return f"{text(low)} to {text(high)}"


@pytest.mark.parametrize("name", ["series", "parallel", "toroid", "solenoid", "power-tank",
                                  "demo"])
def test_the_record_and_the_limits_table_print_the_same_figures(name):
    """One value, one wording: the test record's expected values and pass windows are the
    very strings the design record's limits table prints (before, the table printed the
    computed part windows, 4.094 µH to 4.617 µH, and the record those rounded inward,
    4.095 µH to 4.616 µH; and the nominal f0 to six figures beside a record of four)."""
    from sheetgen.report.rows import limits_rows
    d = design_from_file(TEMPLATES / f"{name}.yaml", SHARED)
    table = {row.label: row for row in limits_rows(d)}
    record = {row.measurement.key: row for row in procedure(d).record}
    broad = d.bench.resonance.q_loaded < 20
    f0_row = table["Centre frequency window" if broad else "Peak frequency window"]
    assert record["f0"].limits.startswith(f0_row.value)
    assert f"nominal {record['f0'].expected}" in f0_row.remark
    for key, label in (("f_low", "Lower half-power point window"),
                       ("f_high", "Upper half-power point window"),
                       ("bandwidth", "Bandwidth window")):
        assert record[key].limits == table[label].value, key
        assert table[label].remark == f"nominal {record[key].expected}", key
    assert record["q_loaded"].limits == table["Loaded Q window"].value
    assert table["Loaded Q window"].remark == f"nominal {record['q_loaded'].expected}"
    for key, label in (("inductance", "Inductance window"),
                       ("capacitance", "Capacitance window")):
        if label in table:
            assert record[key].limits.startswith(table[label].value + " ("), key


def test_one_capacitor_is_not_measured_together():
    """"Together" is for several fixed parts (the toroid starter's C1 + C2); the series
    starter fits C1 alone. The LCR step states its frequency rule itself: a bought coil's
    sheet has no coil section to point at."""
    texts = {}
    for name in ("series", "toroid"):
        d = design_from_file(TEMPLATES / f"{name}.yaml", SHARED)
        steps = {s.key: s for s in procedure(d).steps}
        texts[name] = steps["capacitance"].text
        why = dict(steps["coil"].all_settings).get("Why this setting", "")
        assert "coil section" not in why and "at or below f0" in why, why
    assert "Measure C1 as it will be fitted" in texts["series"]
    assert "together" not in texts["series"]
    assert "Measure C1 + C2 together" in texts["toroid"]


def test_trimming_scales_the_whole_capacitance_with_its_strays():
    """f0 = 1/(2π√(LC)) scales the whole capacitance across the coil, strays included:
    on the series starter (C1 12 pF, 2 pF of strays) a reading 1 % high needs
    (12 + 2) × 1.01² − 2 = 12.28 pF, not 12 × 1.01² = 12.24 pF (hand-worked)."""
    d = design_from_file(TEMPLATES / "series.yaml", SHARED)
    trim = next(s for s in procedure(d).steps if s.key == "tune")
    assert trim.title == "Trim if needed"
    assert "(12.00 pF + 2.000 pF) × (f measured / f wanted)² − 2.000 pF" in trim.text
