"""Test limits, rating checks and cautions of whole jobs, through the CLI.

Sources: Thomson's formula f0 = 1/(2π√(LC)) at the corners of the tolerance bands (the
worst case is exact there); IEC 61140 / IEC 60364-4-41 extra-low-voltage limit of 50 V rms
(AC, from memory) for the hazardous-voltage caution; the error contract (exit 1 for a
failed rating, with the part and the figure).
"""

import csv
import io
import json
import math
from pathlib import Path

from sheetgen.cli import main
from sheetgen.quantities import format_quantity

ROOT = Path(__file__).resolve().parents[2]
TEMPLATES = ROOT / "templates"
POWER = (TEMPLATES / "power-tank.yaml").read_text(encoding="utf-8")


def _run(capsys, *args):
    code = main([str(a) for a in args])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    return code, out.out, out.err


def _job(tmp_path, text, name="job.yaml"):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


def test_limits_csv_is_reproducible_and_brackets_the_nominal(capsys):
    first = _run(capsys, "limits", TEMPLATES / "parallel.yaml")
    second = _run(capsys, "limits", TEMPLATES / "parallel.yaml")
    assert first[0] == 0 and first[1] == second[1]
    rows = {row["quantity"]: row for row in csv.DictReader(io.StringIO(first[1]))}
    for quantity in ("f0", "bandwidth (-3 dB)", "loaded Q"):
        row = rows[quantity]
        assert float(row["minimum"]) < float(row["nominal"]) < float(row["maximum"]), row
        assert row["method"] == "monte-carlo" and row["seed"] == "1"


def test_another_seed_moves_the_limits_but_not_the_nominal(tmp_path, capsys):
    text = (TEMPLATES / "series.yaml").read_text(encoding="utf-8")
    seeded = text + "\nvariation: {seed: 7, trials: 2000}\ntest: {frequency_resolution: 1 Hz}\n"
    base = text + "\nvariation: {seed: 1, trials: 2000}\ntest: {frequency_resolution: 1 Hz}\n"
    a = json.loads(_run(capsys, "limits", _job(tmp_path, base, "a.yaml"), "--format", "json")[1])
    b = json.loads(_run(capsys, "limits", _job(tmp_path, seeded, "b.yaml"), "--format", "json")[1])
    assert a["limits"]["seed"] == 1 and b["limits"]["seed"] == 7
    assert a["limits"]["f0_min_hz"] != b["limits"]["f0_min_hz"]


def test_worst_case_window_holds_the_thomson_corners(tmp_path, capsys):
    """With ±5 % on L and C and no temperature drift, the exact f0 extremes are at the
    corners L(1±0.05)·C(1±0.05) (Thomson's formula)."""
    starter = (TEMPLATES / "series.yaml").read_text(encoding="utf-8")
    assert "  resistance: 3.2 ohm    # series loss resistance at f0 (or give q)\n" \
           "  tolerance: 5 %" in starter  # the starter's coil is ±5 % already
    text = (starter.replace("  esr: 0.05 ohm", "  esr: 0.05 ohm\n  tolerance: 5 %")
            + "\nvariation: {method: worst-case, temperature: {minimum: 25 °C, maximum: 25 °C}}"
              "\ntest: {frequency_resolution: 1 Hz, frequency_accuracy: 0 %,"
              " ambient: {minimum: 25 °C, maximum: 25 °C}}\n")
    code, out, _ = _run(capsys, "check", _job(tmp_path, text), "--json")
    got = json.loads(out)
    L, C = got["components"]["inductance_h"], got["components"]["capacitance_f"]
    low = 1 / (2 * math.pi * math.sqrt(L * 1.05 * C * 1.05))
    high = 1 / (2 * math.pi * math.sqrt(L * 0.95 * C * 0.95))
    lim = got["limits"]
    # the window also holds half a sweep step either side: a reading is the nearest point
    pad = lim["sweep_step_hz"] / 2
    assert lim["method"] == "worst-case" and lim["coverage"] is None
    assert lim["f0_min_hz"] <= low - pad < lim["f0_min_hz"] + 1.0
    assert lim["f0_max_hz"] - 1.0 < high + pad <= lim["f0_max_hz"]


def test_overstressed_capacitor_fails_with_part_and_figures(tmp_path, capsys):
    job = _job(tmp_path, POWER.replace("rated_voltage: 3 kV ", "rated_voltage: 500 V "))
    code, out, err = _run(capsys, "check", job, "--json")
    assert code == 1
    got = json.loads(out)
    # rated against the worse case: the same drive with the load disconnected
    peak = got["stress"]["open_load_capacitor_voltage_peak_v"]
    failed = [r for r in got["ratings"] if r["status"] == "fail"]
    assert {r["part"] for r in failed} == {"C1", "C2"}
    assert f"C1: peak voltage {format_quantity(peak, 'V')} is" in err
    assert f"over the allowed {format_quantity(250.0, 'V')}" in err
    assert f"rated at least {format_quantity(peak / 0.5, 'V')}" in err


def test_recorded_acceptance_turns_a_failure_into_accepted(tmp_path, capsys):
    text = POWER.replace("rated_voltage: 3 kV ", "rated_voltage: 500 V ") + (
        "\nratings:\n  accept:\n"
        "    - {check: C1 peak voltage, reason: 'pulse-rated part, 1 kV for 1 s; R. Example'}\n"
        "    - {check: C2 peak voltage, reason: 'pulse-rated part, 1 kV for 1 s; R. Example'}\n")
    code, out, err = _run(capsys, "check", _job(tmp_path, text), "--json")
    assert code == 0, err
    statuses = {(r["part"], r["quantity"]): r["status"] for r in json.loads(out)["ratings"]}
    assert statuses[("C1", "peak voltage")] == "accepted"


def test_high_voltage_tank_carries_cautions_with_the_computed_voltage(capsys):
    code, out, _ = _run(capsys, "check", TEMPLATES / "power-tank.yaml", "--json")
    got = json.loads(out)
    peak = got["stress"]["capacitor_voltage_peak_v"]
    assert peak / math.sqrt(2) > 50.0, "the starter must exceed ELV to exercise the caution"
    hv = [c for c in got["cautions"] if c["code"] == "hv-capacitor"]
    assert len(hv) == 1 and hv[0]["level"] in ("warning", "danger")
    assert f"{format_quantity(peak, 'V')} peak" in hv[0]["text"]
    assert "local codes and licensed practice" in got["cautions_deferral"]  # once, not per caution


def test_low_voltage_job_says_no_hazardous_voltage(capsys):
    got = json.loads(_run(capsys, "check", TEMPLATES / "demo.yaml", "--json")[1])
    assert [c["code"] for c in got["cautions"] if c["level"] != "notice"] == []
    assert any(c["code"] == "no-hazardous-voltage" for c in got["cautions"])


def test_trimmer_too_narrow_fails(tmp_path, capsys):
    text = (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8").replace(
        "trimmer: {minimum: 10 pF, maximum: 100 pF}", "trimmer: {minimum: 40 pF, maximum: 70 pF}")
    code, out, err = _run(capsys, "check", _job(tmp_path, text), "--json",
                          "--library", ROOT / "shared")
    assert code == 1 and "capacitor.trimmer" in err
    assert json.loads(out)["limits"]["trimmer_covers"] is False


def test_acceptance_of_a_check_that_does_not_exist_is_bad_input(tmp_path, capsys):
    text = POWER + ("\nratings:\n  accept:\n"
                    "    - {check: C9 peak voltage, reason: 'a typo must not hide a failure'}\n")
    code, _, err = _run(capsys, "check", _job(tmp_path, text))
    assert code == 2
    assert "ratings.accept[0].check: no rating check is called 'C9 peak voltage'" in err
    assert "C1 peak voltage" in err


def test_coil_cautions_at_their_thresholds():
    """SRF below 3·f0 and flux above 80 % of the limit warn (both common practice); at or
    over the limit the flux rating check fails instead, so no second warning."""
    from types import SimpleNamespace

    from sheetgen.report.cautions import coil_cautions
    f0 = 1e6
    codes = lambda coil: [c.code for c in coil_cautions(coil, f0, "L1", 0.010)]  # noqa: E731
    assert codes(SimpleNamespace(srf_hz=2.99e6, flux_density_peak_t=None)) == ["srf-near-f0"]
    assert codes(SimpleNamespace(srf_hz=3.01e6, flux_density_peak_t=None)) == []
    assert codes(SimpleNamespace(srf_hz=None, flux_density_peak_t=0.0081)) == ["flux-near-limit"]
    assert codes(SimpleNamespace(srf_hz=None, flux_density_peak_t=0.0079)) == []
    assert codes(SimpleNamespace(srf_hz=None, flux_density_peak_t=0.0101)) == []


def test_every_expected_value_has_a_window_around_it(capsys):
    """f0, both half-power points, bandwidth, loaded and unloaded Q and |Z| at the peak:
    each window holds its nominal value (a window that missed it would fail good units)."""
    got = json.loads(_run(capsys, "check", TEMPLATES / "power-tank.yaml", "--json")[1])
    res, lim = got["resonance"], got["limits"]
    for nominal, low, high in [("f0_hz", "f0_min_hz", "f0_max_hz"),
                               ("f_low_hz", "f_low_min_hz", "f_low_max_hz"),
                               ("f_high_hz", "f_high_min_hz", "f_high_max_hz"),
                               ("bandwidth_hz", "bandwidth_min_hz", "bandwidth_max_hz"),
                               ("q_loaded", "q_loaded_min", "q_loaded_max"),
                               ("q_unloaded", "q_unloaded_min", "q_unloaded_max"),
                               ("impedance_at_peak_ohm", "impedance_at_peak_min_ohm",
                                "impedance_at_peak_max_ohm")]:
        assert lim[low] < res[nominal] < lim[high], (nominal, lim[low], res[nominal], lim[high])
