"""A rating the job does not give is not a pass (IEC 61140: extra-low voltage is up to
50 V a.c. rms, 70.7 V peak for a sinusoid; from memory): within it a warning, above it a
failed check that says which rating to give."""

import json

from sheetgen.cli import main
from tests.cli.test_bad_input import GOOD

UNRATED = (GOOD.replace("  rated_voltage: 500 V   # each part; its 165 V peak is above "
                        "extra-low voltage\n", "").replace("  rated_power: 250 mW\n", ""))


def _check(tmp_path, capsys, text):
    job = tmp_path / "job.yaml"
    job.write_text(text, encoding="utf-8")
    code = main(["check", str(job), "--json"])
    results = json.loads(capsys.readouterr().out)
    main(["check", str(job)])
    summary = capsys.readouterr()
    return code, results, summary.out, summary.err


def test_unrated_capacitor_above_extra_low_voltage_fails(tmp_path, capsys):
    assert "rated_voltage" not in UNRATED and "rated_power" not in UNRATED
    code, results, out, err = _check(tmp_path, capsys, UNRATED)
    assert code == 1
    statuses = {(r["part"], r["quantity"]): r["status"] for r in results["ratings"]}
    assert statuses[("C1", "peak voltage")] == "fail"
    assert statuses[("C1", "power in ESR")] == "fail"
    assert any(c["code"] == "rating-not-given" and c["field"] == "capacitor.rated_voltage"
               for c in results["checks"])
    assert "rating not given" in out
    assert "check failed: capacitor.rated_voltage: C1: no voltage rating is given" in err
    # the peak over the 50 % derating (the default, common practice)
    from sheetgen.quantities import format_quantity
    peak = results["stress"]["capacitor_voltage_peak_v"]
    assert 160.0 < peak < 170.0, "about 165 V peak on the series starter's C1"
    assert f"at least {format_quantity(peak / 0.5, 'V', 3)} at the 50 % derating" in err


def test_unrated_capacitor_within_extra_low_voltage_is_a_warning(tmp_path, capsys):
    """At 10 mW available the peak is 165 V × √(10 mW / 1 W) = 16.5 V (stress scales with
    √P in a linear circuit), within 70.7 V: a warning, not a failure."""
    code, results, out, _ = _check(tmp_path, capsys,
                                   UNRATED.replace("available_power: 1 W", "available_power: 10 mW"))
    assert code == 0
    statuses = {(r["part"], r["quantity"]): r["status"] for r in results["ratings"]}
    assert statuses[("C1", "peak voltage")] == "not rated"
    assert "NOT RATED" in out


def test_unrated_trimmer_is_listed(tmp_path, capsys):
    """The toroid starter's trimmer C3 has no rating; 2 V peak is within 70.7 V."""
    from tests.cli.test_bad_input import TEMPLATES
    text = (TEMPLATES / "toroid.yaml").read_text(encoding="utf-8")
    assert "trimmer: {minimum: 10 pF, maximum: 100 pF}" in text
    code, results, out, _ = _check(tmp_path, capsys, text)
    statuses = {(r["part"], r["quantity"]): r["status"] for r in results["ratings"]}
    assert statuses[("C3", "peak voltage")] == "not rated", statuses
    assert "C3 peak voltage" in out


def test_a_capacitor_heated_by_its_esr_is_checked_against_its_dielectric(tmp_path, capsys):
    """With a thermal resistance given, a fixed part runs ΔT = P·Rθ above the highest
    operating ambient (P its share of the ESR loss): the rise is proportional to Rθ, and
    C0G is rated to 125 °C (EIA-198, from memory), so a large Rθ fails and a small one
    passes."""
    from pathlib import Path
    root = Path(__file__).resolve().parents[2]
    text = (root / "templates" / "power-tank.yaml").read_text(encoding="utf-8")
    assert "  dielectric: C0G" in text and "maximum: 55 °C" in text.replace("degC", "°C")

    def c1_surface(r_theta: float) -> dict:
        job = tmp_path / f"tank-{r_theta:g}.yaml"
        job.write_text(text.replace("  dielectric: C0G", f"  dielectric: C0G\n"
                                    f"  thermal_resistance: {r_theta:g}"), encoding="utf-8")
        main(["check", str(job), "--json"])
        got = json.loads(capsys.readouterr().out)
        return next(r for r in got["ratings"] if r["part"] == "C1"
                    and r["quantity"] == "surface temperature")

    hot, cool = c1_surface(400.0), c1_surface(4.0)
    ambient = 55.0
    assert abs((hot["actual"] - ambient) / (cool["actual"] - ambient) - 100.0) < 1e-9
    assert hot["allowed"] == cool["allowed"] == 125.0
    assert hot["status"] == "fail" and cool["status"] == "pass"
