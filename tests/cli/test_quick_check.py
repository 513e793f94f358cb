"""`check` answers a quick question from the circuit and its parts alone.

Outside source: the textbook series circuit (hand-worked here): L = 50 µH, C = 40 pF,
R = 22 Ω. Thomson's formula f0 = 1/(2π√(LC)) = 1/(2π·√(2e-15)) = 3.5588 MHz;
X0 = √(L/C) = √(1.25e6) = 1118.03 Ω; Q = X0/R = 1118.03/22 = 50.82; bandwidth f0/Q =
3.5588 MHz / 50.82 = 70.03 kHz. With 1 V rms behind 22 Ω at resonance the loop carries
I = 1/22 = 45.45 mA rms and C has I·X0 = 50.82 V rms, 71.87 V peak across it.
"""

import json
import math

from sheetgen.cli import main
from tests.support import assert_close

L_H, C_F, R_OHM = 50e-6, 40e-12, 22.0
F0_HZ = 1 / (2 * math.pi * math.sqrt(L_H * C_F))
X0_OHM = math.sqrt(L_H / C_F)
Q = X0_OHM / R_OHM


def _run(capsys, *args):
    code = main([str(a) for a in args])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    return code, out.out, out.err


def _write(tmp_path, text):
    job = tmp_path / "quick.yaml"
    job.write_text(text, encoding="utf-8")
    return job


COIL_LOSS_JOB = """\
circuit: {topology: series}
inductor: {form: given, inductance: 50 uH, resistance: 22 ohm, tolerance: 0.1 %}
capacitor: {capacitance: 40 pF, stray: 0 pF, tolerance: 0.1 %, dielectric: C0G}
"""


def test_hand_worked_figures():
    assert_close(F0_HZ, 3.5588e6, rel=1e-4, what="Thomson's formula, by hand")
    assert_close(X0_OHM, 1118.03, rel=1e-5, what="√(L/C), by hand")
    assert_close(Q, 50.82, rel=1e-3, what="X0/R, by hand")


def test_textbook_circuit_needs_no_identity_drive_or_capacitor_loss(tmp_path, capsys):
    job = _write(tmp_path, COIL_LOSS_JOB)
    code, out, err = _run(capsys, "check", job, "--json")
    assert code == 0, err
    resonance = json.loads(out)["resonance"]
    assert_close(resonance["f0_hz"], F0_HZ, rel=1e-6, what="f0 (Thomson)")
    assert_close(resonance["reactance_ohm"], X0_OHM, rel=1e-6, what="X0 = √(L/C)")
    assert_close(resonance["q_unloaded"], Q, rel=1e-6, what="Q = X0/R")
    assert_close(resonance["q_loaded"], Q, rel=1e-3, what="no source or load: loaded = unloaded")
    assert_close(resonance["bandwidth_hz"], F0_HZ / Q, rel=1e-3, what="f0/Q")
    # What was assumed is said (on stderr: the JSON stays a results document).
    assert "capacitor.esr: 0 Ω" in err and "taken as none" in err
    assert "source.voltage: 1 V rms open-circuit" in err and "sheet:" in err


def test_brief_prints_the_first_figures_and_the_assumptions(tmp_path, capsys):
    code, out, err = _run(capsys, "check", _write(tmp_path, COIL_LOSS_JOB), "--brief")
    assert code == 0, err
    assert len(out.splitlines()) < 30
    for text in ("3.559 MHz", "1.118 kΩ", "50.82", "70.03 kHz", "3.524 MHz to 3.594 MHz",
                 "22.00 Ω", "Assumed for this check", "no loss given for the capacitor: taken "
                 "as none", "all pass"):
        assert text in out, text
    # No drive was given: the per-volt stresses are not shown as the circuit's.
    assert "Capacitor voltage" not in out and "not judged (no drive given)" in out


def test_losses_left_out_are_none_and_a_given_drive_gives_stresses(tmp_path, capsys):
    job = _write(tmp_path, """\
circuit: {topology: series}
inductor: {form: given, inductance: 50 uH, tolerance: 0.1 %}
capacitor: {capacitance: 40 pF, stray: 0 pF, tolerance: 0.1 %, dielectric: C0G, rated_voltage: 500 V}
source: {resistance: 22 ohm, voltage: 1 V}
""")
    code, out, err = _run(capsys, "check", job, "--brief")
    assert code == 0, err
    assert "inductor.resistance: 0 Ω" in out and "capacitor.esr: 0 Ω" in out
    assert "taken as none (a lossless coil)" in out
    vc_peak = (1 / R_OHM) * X0_OHM * math.sqrt(2)
    assert_close(vc_peak, 71.87, rel=1e-3, what="I·X0·√2, by hand")
    assert "71.87 V peak" in out and "45.45 mA rms" in out
    assert "50.82" in out  # loaded Q = X0/Rs


def test_build_still_requires_identity_drive_and_losses(tmp_path, capsys):
    job = _write(tmp_path, COIL_LOSS_JOB)
    code, out, err = _run(capsys, "build", job, "-o", tmp_path / "quick.pdf")
    assert code == 2
    assert f"{job}:1:1 sheet: is missing" in err and "source: is missing" in err
    assert "capacitor: give exactly one of esr or dissipation_factor" in err
    assert not (tmp_path / "quick.pdf").exists()


def test_brief_and_json_do_not_mix(tmp_path, capsys):
    code, _, err = _run(capsys, "check", _write(tmp_path, COIL_LOSS_JOB), "--brief", "--json")
    assert code == 2 and "choose one" in err
