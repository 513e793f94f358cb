"""sheetgen.report.cautions: levels at the thresholds of the standards, and the figures stated.

Sources (see tests/reference/variation.md; all limit figures from memory):
- IEC 61140 (protection against electric shock): extra-low voltage up to 50 V a.c. rms /
  120 V ripple-free d.c.; low voltage up to 1000 V a.c. rms / 1500 V d.c.; with
  IEC 60364-4-41 §414.4.5, no protection against direct contact is needed in normal dry
  conditions up to 25 V a.c. rms / 60 V ripple-free d.c. The a.c. limits are rms; for the
  sinusoidal RF on a part, peak = √2 · rms.
- IEC 61010-1 §6.3: a stored charge above 45 µC (60 V … 15 kV) or energy above 350 mJ is
  hazardous.
- ISO 13732-1: burn thresholds of bare metal, 51 °C for 1 min and 65 °C for 1 s contact.
- RF exposure: a caution from 10 W in the circuit (common practice); a small tank with no
  antenna radiates little, so below that no exposure caution.
- ISO 3864-2 / ANSI Z535.4 signal words DANGER, WARNING, CAUTION, NOTICE.
- Series resonance: the capacitor carries Q times the source voltage, Q = √(L/C)/R
  (Alexander & Sadiku, Fundamentals of Electric Circuits, 5th ed., §14.5).
- RC discharge V0·e^(−t/RC): t = RC ln(V0/V1).
"""

import math

import pytest

from sheetgen.engine.resonance import Circuit, analyse
from sheetgen.engine.stress import Drive, part_stress
from sheetgen.report import cautions

BELOW, ABOVE = 1.0 - 1e-6, 1.0 + 1e-6
SQRT2 = math.sqrt(2.0)


def _capacitor(peak_v, capacitance_f=100e-12, bleeder_ohm=None, rise_k=None):
    return cautions.PartHazard("C1", "capacitor", peak_v, 0.5, capacitance_f, bleeder_ohm, rise_k)


def _coil(peak_v, rise_k=None):
    return cautions.PartHazard("L1", "inductor", peak_v, 0.5, temperature_rise_k=rise_k)


def _by_code(found):
    return {caution.code: caution for caution in found}


# (rms voltage on the parts, expected level of hv-capacitor; None → no hazard)
VOLTAGE_BOUNDARIES = [
    pytest.param(25.0 * BELOW, None, id="IEC61140-dry-25V-just-below"),
    pytest.param(25.0 * ABOVE, "caution", id="IEC61140-dry-25V-just-above"),
    pytest.param(50.0 * BELOW, "caution", id="IEC61140-ELV-50V-just-below"),
    pytest.param(50.0 * ABOVE, "warning", id="IEC61140-ELV-50V-just-above"),
    pytest.param(1000.0 * BELOW, "warning", id="IEC61140-LV-1000V-just-below"),
    pytest.param(1000.0 * ABOVE, "danger", id="IEC61140-LV-1000V-just-above"),
]


@pytest.mark.parametrize("rms_v, level", VOLTAGE_BOUNDARIES)
def test_voltage_levels_at_the_iec_61140_limits(rms_v, level):
    peak_v = rms_v * SQRT2  # the limits are rms; RF on a part is sinusoidal
    found = _by_code(cautions.cautions([_capacitor(peak_v), _coil(peak_v)], 1e6, 0.001))
    if level is None:
        assert "hv-capacitor" not in found and "hv-coil" not in found
        assert found["no-hazardous-voltage"].level == "notice"
    else:
        assert found["hv-capacitor"].level == level and found["hv-coil"].level == level
        assert "no-hazardous-voltage" not in found
    # at 1 mW of drive, covers and interlocks only above the low-voltage limit
    assert ("covers-interlocks" in found) == (level == "danger")


@pytest.mark.parametrize("power_w, level, enclosed", [
    (9.99, "warning", False), (10.01, "warning", True),  # 10 W: common practice
    (0.001, "danger", True),
])
def test_covers_and_interlocks_for_power_or_above_low_voltage(power_w, level, enclosed):
    rms_v = {"warning": 100.0, "danger": 1200.0}[level]
    found = _by_code(cautions.cautions([_capacitor(rms_v * SQRT2), _coil(rms_v * SQRT2)], 1e6,
                                 power_w))
    assert found["hv-capacitor"].level == level
    assert ("covers-interlocks" in found) == enclosed


def test_hazardous_figures_are_stated_peak_and_rms():
    found = _by_code(cautions.cautions([_capacitor(1420.0), _coil(35.0)], 7.1e6, 0.001))
    text = found["hv-capacitor"].text
    assert "1.42 kV peak (1.00 kV rms) on C1 at 7.10 MHz" in text
    assert found["hv-capacitor"].signal_word == "DANGER"  # 1004 V rms > 1000 V (IEC 61140)
    assert "hv-coil" not in found  # 24.7 V rms on L1 is within the dry 25 V limit


def test_cautions_come_most_severe_first_and_defer_once():
    """The deferral to local codes is the box's (printed once), not each caution's."""
    parts = [_capacitor(5000.0, 1e-6, 1e6, rise_k=60.0), _coil(5000.0, rise_k=60.0)]
    found = cautions.cautions(parts, 13.56e6, 50.0, ambient_max_c=40.0, dc_voltage_v=2000.0)
    assert {c.code for c in found} >= {"hv-capacitor", "hv-coil", "stored-energy", "rf-burn",
                                       "hot-core", "hot-capacitor", "rf-exposure",
                                       "covers-interlocks", "dc-supply"}
    for caution in found:
        assert "local codes" not in caution.text, caution.code
    assert "local codes and licensed practice" in cautions.DEFERRAL
    severities = [cautions.SEVERITY[c.level] for c in found]
    assert severities == sorted(severities, reverse=True)  # most severe first


def test_a_low_level_design_still_carries_a_notice():
    found = cautions.cautions([_capacitor(3.0), _coil(3.0)], 10.7e6, 0.005)
    assert [c.code for c in found] == ["no-hazardous-voltage"]
    assert found[0].signal_word == "NOTICE"
    assert found[0].text.startswith("No hazardous voltage was computed at the given drive")
    assert "3.00 V peak (2.12 V rms) on C1" in found[0].text


@pytest.mark.parametrize("capacitance_f, peak_v, level", [
    pytest.param(100e-12, 60.0 * BELOW, None, id="IEC61140-60V-DC-just-below"),
    pytest.param(100e-12, 60.0 * ABOVE, "caution", id="IEC61140-60V-DC-just-above"),
    pytest.param(0.45e-6 * BELOW, 100.0, "caution", id="IEC61010-45uC-just-below"),
    pytest.param(0.45e-6 * ABOVE, 100.0, "warning", id="IEC61010-45uC-just-above"),
    # at 20 kV, 350 mJ is 35 µC: the energy limit binds before the charge limit
    pytest.param(2 * 0.35 / 20e3**2 * BELOW, 20e3, "caution", id="IEC61010-350mJ-just-below"),
    pytest.param(2 * 0.35 / 20e3**2 * ABOVE, 20e3, "warning", id="IEC61010-350mJ-just-above"),
])
def test_stored_energy_levels(capacitance_f, peak_v, level):
    found = _by_code(cautions.cautions([_capacitor(peak_v, capacitance_f)], 1e6, 0.001))
    if level is None:
        assert "stored-energy" not in found
    else:
        assert found["stored-energy"].level == level


def test_stored_energy_states_energy_charge_and_bleeder_time():
    # 1 µF at 100 V: ½CV² = 5.00 mJ, CV = 100 µC; 100 kΩ takes RC ln(100/60) = 51.1 ms
    found = _by_code(cautions.cautions([_capacitor(100.0, 1e-6, 100e3)], 1e6, 0.001))
    text = found["stored-energy"].text
    assert "5.00 mJ" in text and "100 µC" in text and "51.1 ms" in text
    without = _by_code(cautions.cautions([_capacitor(100.0, 1e-6)], 1e6, 0.001))
    assert "insulated shorting tool" in without["stored-energy"].text


@pytest.mark.parametrize("rise_k, level", [
    pytest.param(11.0 * BELOW, None, id="ISO13732-51C-just-below"),
    pytest.param(11.0 * ABOVE, "caution", id="ISO13732-51C-just-above"),
    pytest.param(25.0 * BELOW, "caution", id="ISO13732-65C-just-below"),
    pytest.param(25.0 * ABOVE, "warning", id="ISO13732-65C-just-above"),
])
def test_hot_core_levels_in_a_40_degree_ambient(rise_k, level):
    found = _by_code(cautions.cautions([_capacitor(3.0), _coil(3.0, rise_k)], 1e6, 0.001,
                                 ambient_max_c=40.0))
    if level is None:
        assert "hot-core" not in found
    else:
        assert found["hot-core"].level == level
        assert "in a 40.0 °C ambient" in found["hot-core"].text


@pytest.mark.parametrize("power_w, level", [
    pytest.param(0.032, None, id="32mW-in-a-small-tank-no-exposure-caution"),
    pytest.param(10.0 * BELOW, None, id="10W-common-practice-just-below"),
    pytest.param(10.0 * ABOVE, "caution", id="10W-common-practice-just-above"),
])
def test_rf_exposure_levels(power_w, level):
    found = _by_code(cautions.cautions([_capacitor(3.0), _coil(3.0)], 1e6, power_w))
    assert (found["rf-exposure"].level if "rf-exposure" in found else None) == level


@pytest.mark.parametrize("f_hz, burns", [(99e3, False), (101e3, True)])
def test_rf_burn_from_100_khz(f_hz, burns):
    found = _by_code(cautions.cautions([_capacitor(200.0), _coil(200.0)], f_hz, 0.001))
    assert ("rf-burn" in found) == burns


def test_series_circuit_capacitor_carries_q_times_the_source_voltage():
    # L = 10 µH, C = 253.3 pF, R = 10 Ω in the loop: X0 = √(L/C) = 198.7 Ω, Q = 19.87;
    # 10 V rms gives 198.7 V rms = 281 V peak on C1 (Alexander & Sadiku §14.5)
    circuit = Circuit("series", 10e-6, 4.0, 253.3e-12, 0.0, 6.0, None)
    stress = part_stress(circuit, Drive("voltage", 10.0), analyse(circuit).f_peak_hz)
    parts = cautions.parts_from_stress(circuit, stress)
    found = _by_code(cautions.cautions(parts, stress.f_hz, stress.drive_power_w))
    assert "281 V peak (199 V rms) on C1" in found["hv-capacitor"].text
    assert found["hv-capacitor"].level == "warning"  # 199 V rms > 50 V (IEC 61140)


@pytest.mark.parametrize("dc_v, level", [
    pytest.param(60.0 * BELOW, None, id="IEC61140-60V-DC-just-below"),
    pytest.param(60.0 * ABOVE, "caution", id="IEC61140-60V-DC-just-above"),
    pytest.param(120.0 * ABOVE, "warning", id="IEC61140-ELV-120V-DC-just-above"),
    pytest.param(1500.0 * ABOVE, "danger", id="IEC61140-LV-1500V-DC-just-above"),
])
def test_a_dc_supply_on_the_tank_is_cautioned_by_its_level(dc_v, level):
    found = _by_code(cautions.cautions([_capacitor(3.0), _coil(3.0)], 1e6, 0.001, dc_voltage_v=dc_v))
    assert found["dc-supply"].level == (level or "notice")
    assert "live whenever the supply is on" in found["dc-supply"].text


def test_a_parallel_tank_coil_discharges_its_capacitor_unless_dc_blocked():
    """In a parallel tank the coil is across the capacitor: it cannot keep a DC charge when
    the circuit is broken, unless a blocking capacitor is in series with the coil."""
    circuit = Circuit("parallel", 10e-6, 4.0, 253.3e-12, 0.0, 5e3, None)
    stress = part_stress(circuit, Drive("voltage", 100.0), analyse(circuit).f_peak_hz)
    plain = _by_code(cautions.cautions(cautions.parts_from_stress(circuit, stress), 1e6, 0.001))
    blocked = _by_code(cautions.cautions(cautions.parts_from_stress(circuit, stress, dc_blocked=True), 1e6,
                                   0.001))
    assert stress.capacitor_voltage_peak_v > 60.0  # above the DC limit that calls for it
    assert "stored-energy" not in plain and "stored-energy" in blocked


def test_several_capacitors_are_named_together_with_their_connections():
    circuit = Circuit("series", 10e-6, 4.0, 253.3e-12, 0.0, 6.0, None)
    stress = part_stress(circuit, Drive("voltage", 10.0), analyse(circuit).f_peak_hz)
    parts = cautions.parts_from_stress(circuit, stress, capacitors=("C1", "C2", "C3"))
    text = _by_code(cautions.cautions(parts, stress.f_hz, 0.001))["hv-capacitor"].text
    assert "on C1, C2 and C3 at" in text and "or their connections" in text


def test_a_kilovolt_tank_states_creepage_clearance_and_corona(tmp_path):
    """The power-tank starter at 300 W: 2.09 kV peak = 1.48 kV rms on the capacitors with
    the load open (the worst case the sheet computes, which the distances are for), which
    IEC 60664-1 Table F.5 (from memory) rounds up to its 1600 V row: 16 mm creepage at
    pollution degree 2, material group III; clearance 2 mm per kV peak (common practice)."""
    from pathlib import Path

    from sheetgen.design.pipeline import design_from_file
    root = Path(__file__).resolve().parents[2]
    text = (root / "templates" / "power-tank.yaml").read_text(encoding="utf-8")
    job = tmp_path / "tank.yaml"
    job.write_text(text.replace("available_power: 100 W", "available_power: 300 W"),
                   encoding="utf-8")
    design = design_from_file(job)
    peak = design.stress_open_load.capacitor_voltage_peak_v
    assert peak > design.stress.capacitor_voltage_peak_v
    assert 1131.0 < peak / SQRT2 <= 1600.0, "between Table F.5's 1250 V and 1600 V rows"
    found = _by_code(cautions.design_cautions(design))
    text = found["insulation-distances"].text
    assert "at least 16 mm along insulating surfaces" in text
    assert f"at least {peak * 2e-3:.1f} mm through air" in text
    assert "corona" in text
    low = _by_code(cautions.design_cautions(design_from_file(root / "templates" / "demo.yaml")))
    assert "insulation-distances" not in low, "below 1 kV peak nothing is said"


def test_a_loss_table_used_beyond_its_rows_is_flagged():
    """A core whose loss rows stop below f0 is extrapolated: said, not hidden."""
    from types import SimpleNamespace
    coil = SimpleNamespace(srf_hz=None, flux_density_peak_t=None,
                           core_loss_table_extrapolated=True)
    found = _by_code(cautions.coil_cautions(coil, 30e6, "L1", None))
    assert found["core-data-extrapolated"].level == "notice"
    assert "extrapolated" in found["core-data-extrapolated"].text
    inside = SimpleNamespace(srf_hz=None, flux_density_peak_t=None,
                             core_loss_table_extrapolated=False)
    assert "core-data-extrapolated" not in _by_code(cautions.coil_cautions(inside, 3e6, "L1"))
