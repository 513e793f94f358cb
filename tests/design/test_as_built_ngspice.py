"""Units built exactly as their sheets say, measured by ngspice, against the sheets' windows.

Source: ngspice AC analysis in batch mode (tests/spice.py); the link or tap is an ideal
transformer of the built turns ratio (tests/design/as_built.py: an E/F controlled-source
pair). The engine's own load figure is not used for the coupled load.
"""

from pathlib import Path

import pytest

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.results import results_document
from tests import spice
from tests.design.as_built import as_built_bench, assert_inside_windows, inside
from tests.support import assert_close

pytestmark = pytest.mark.ngspice

ROOT = Path(__file__).resolve().parents[2]
TOROID = (ROOT / "templates" / "toroid.yaml").read_text(encoding="utf-8")
TAPPED = TOROID.replace("  link:\n    resistance: 50 ohm\n", "  tap:\n    resistance: 2 kohm\n")


@pytest.mark.parametrize("text", [TOROID, TAPPED], ids=["link", "tap"])
def test_whole_turn_coupling_load_is_the_built_ratio(tmp_path, text):
    """The rounded link/tap presents R·(N/M)²; the sheet's bandwidth and Q are those of the
    built unit, and its windows hold what ngspice measures."""
    job = tmp_path / "job.yaml"
    job.write_text(text, encoding="utf-8")
    got = results_document(design_from_file(job, ROOT / "shared"))
    measured = spice.measure_bench(as_built_bench(got, parasitics=False))
    where = f"vs {spice.ngspice_version()}"
    res, lim = got["test_record"]["fixture"]["resonance"], got["limits"]
    assert_close(res["bandwidth_hz"], measured.bandwidth_hz, rel=1e-4,
                 what=f"as-built bandwidth {where}")
    assert_close(res["impedance_at_peak_ohm"], measured.impedance_at_peak_ohm, rel=1e-4,
                 what=f"as-built |Z| at the peak {where}")
    inside(measured.bandwidth_hz, lim["bandwidth_min_hz"], lim["bandwidth_max_hz"],
            "bandwidth")
    q = measured.f_peak_hz / measured.bandwidth_hz
    inside(q, lim["q_loaded_min"], lim["q_loaded_max"], "loaded Q")


SELF_C = TOROID.replace("  link:\n", "  self_capacitance: 100 pF\n  link:\n")


@pytest.mark.parametrize("name, text", [("toroid with 100 pF self-capacitance", SELF_C),
                                        ("solenoid starter (Medhurst)",
                                         (ROOT / "templates" / "solenoid.yaml").read_text())])
def test_capacitance_already_across_is_not_fitted_again(tmp_path, name, text):
    """The parts to fit are the total less the coil's self-capacitance and strays:
    built with them, the tank peaks inside the sheet's window (ngspice)."""
    assert "self_capacitance: 100 pF" in SELF_C
    job = tmp_path / "job.yaml"
    job.write_text(text, encoding="utf-8")
    got = results_document(design_from_file(job, ROOT / "shared"))
    measured = spice.measure_bench(as_built_bench(got))
    lim = got["limits"]
    inside(measured.f_peak_hz, lim["f_peak_min_hz"], lim["f_peak_max_hz"],
            f"{name}: peak frequency vs {spice.ngspice_version()}")


def test_power_tank_is_rated_for_its_load_disconnected(tmp_path):
    """A tank whose load comes off sees the whole drive: ngspice measures the unloaded tank's
    peak voltage per volt of EMF; × √2 × EMF (EMF = 2√(P_av·Rs), the available-power
    definition) it is the open-load figure, and the capacitor ratings use it (the worse)."""
    got = results_document(design_from_file(ROOT / "templates" / "power-tank.yaml"))
    parts, stress = got["components"], got["stress"]
    build = spice.parallel_netlist(parts["inductance_h"], parts["inductor_resistance_ohm"],
                                   parts["capacitance_f"], parts["capacitor_esr_ohm"],
                                   parts["source_resistance_ohm"], None)
    measured = spice.measure_bench(build)
    emf = 2.0 * (got["stress"]["drive"]["value"] * parts["source_resistance_ohm"]) ** 0.5
    open_peak = 2 ** 0.5 * emf * measured.response_peak
    assert_close(stress["open_load_capacitor_voltage_peak_v"], open_peak, rel=1e-4,
                 what=f"open-load peak voltage vs {spice.ngspice_version()}")
    assert open_peak > 1.5 * stress["capacitor_voltage_peak_v"]
    voltage_checks = [r for r in got["ratings"] if r["quantity"] == "peak voltage"]
    assert voltage_checks
    for check in voltage_checks:
        assert_close(check["actual"], open_peak, rel=1e-4, what=f"{check['part']} rated stress")


STARTERS = sorted(p.name for p in (ROOT / "templates").glob("*.yaml")
                  if not p.name.startswith("style"))


@pytest.mark.parametrize("name", STARTERS)
def test_every_starter_built_as_its_sheet_says_meets_its_own_windows(name):
    """L as built, the C fitted (parts and trimmer setting) with what is across it, the
    link/tap at its built ratio and the bleeder of the parts list, simulated by ngspice:
    every figure the bench reads falls inside the sheet's own windows."""
    design = design_from_file(ROOT / "templates" / name)
    got = results_document(design)
    if design.bleeder is not None:
        got["bleeder_ohm"] = design.bleeder.resistance_ohm
    measured = spice.measure_bench(as_built_bench(got))
    lim = got["limits"]
    where = f"{name} vs {spice.ngspice_version()}"
    assert_inside_windows(measured, lim, where)
    inside(measured.impedance_at_peak_ohm, lim["impedance_at_peak_min_ohm"],
            lim["impedance_at_peak_max_ohm"], f"{where} |Z| at the peak")
