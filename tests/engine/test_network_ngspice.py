"""The network solver against ngspice on circuits a single resonator cannot describe:
coupled coils (K statements), an ideal turns ratio (E and F elements) and a trap in a line.
Each netlist is written here by hand, independently of sheetgen's own netlist writer;
ngspice measures with `meas` (peak, half-power points, minimum), 7 significant digits."""

from __future__ import annotations

import math

import pytest

from sheetgen.engine.network import (
    Capacitor,
    Coil,
    MutualCoupling,
    Network,
    Resistor,
    Response,
    Source,
    TurnsRatio,
    solve,
)
from sheetgen.engine.network_features import extremum, half_power_points, load_voltage_quantity
from tests.spice import Sweep, ac_measure, measure_resonance
from tests.support import assert_close

pytestmark = pytest.mark.ngspice

NGSPICE_DIGITS = 1e-6  # ngspice prints 6-7 significant digits (tests/reference/ngspice.md)

L, C, R_COIL, RS = 10e-6, 50e-12, 1.5, 5e3
F0 = 1 / (2 * math.pi * math.sqrt(L * C))


def double_tuned(k: float) -> tuple[Network, str]:
    """Two identical parallel tanks coupled by mutual inductance; 1 V behind 5 kΩ into the
    first, 5 kΩ across the second; response: the second tank's voltage."""
    parts = (Coil("L1", "p", "0", L, R_COIL), Capacitor("C1", "p", "0", C),
             Coil("L2", "s", "0", L, R_COIL), Capacitor("C2", "s", "0", C),
             MutualCoupling("K1", "L1", "L2", k), Resistor("RL", "s", "0", RS))
    network = Network(parts, Source("p", "voltage", RS), Response("voltage", "RL"), "RL")
    body = "\n".join([
        "vdrive src 0 dc 0 ac 1", f"rsource src p {RS!r}", "vsense p pt dc 0",
        f"l1 pt l1r {L!r}", f"rl1 l1r 0 {R_COIL!r}", f"c1 pt 0 {C!r}",
        f"l2 s l2r {L!r}", f"rl2 l2r 0 {R_COIL!r}", f"c2 s 0 {C!r}",
        f"k1 l1 l2 {k!r}", f"rload s 0 {RS!r}",
    ])
    return network, body


@pytest.mark.parametrize("k", [0.004, 0.01])
def test_coupled_tanks_match_ngspice(k):
    """Below critical coupling (one hump) the peak and −3 dB points of the second tank's
    voltage agree with ngspice's `meas` to its printed digits."""
    network, body = double_tuned(k)
    peak = extremum(network, F0 / 3, F0 * 3)
    points = half_power_points(network, peak)
    found = measure_resonance(body, "v(s)", port_voltage="v(pt)", port_current="i(vsense)",
                              f_start_hz=F0 / 3, f_stop_hz=F0 * 3)
    assert_close(float(peak.f_hz), found.f_peak_hz, rel=NGSPICE_DIGITS, what="f_peak")
    assert_close(float(peak.magnitude), found.response_peak, rel=NGSPICE_DIGITS, what="|V|")
    assert_close(float(points.f_low_hz), found.f_low_hz, rel=NGSPICE_DIGITS, what="f_low")
    assert_close(float(points.f_high_hz), found.f_high_hz, rel=NGSPICE_DIGITS, what="f_high")


def test_overcoupled_tanks_have_two_humps_as_ngspice_finds():
    """Beyond critical coupling the response splits in two peaks near f0/√(1 ± k) (coupled
    resonators, e.g. Terman, Radio Engineers' Handbook, from memory); the solver's values at
    ngspice's own two maxima agree with ngspice's magnitudes."""
    k = 0.3  # k·Q ≈ 3 with the tanks' loaded Q of about 11: well beyond critical
    network, body = double_tuned(k)
    for low, high in ((F0 / 1.5, F0), (F0, F0 * 1.5)):
        found = ac_measure(body, Sweep("lin", 20001, low, high), {"resp": "mag(v(s))"},
                           {"peak": "MAX resp", "fpeak": "MAX_AT resp"})
        ours = extremum(network, low, high)
        assert_close(float(ours.f_hz), found["fpeak"], rel=(high - low) / 20000 / low,
                     what="hump frequency (to ngspice's sweep step)")
        value = abs(complex(solve(network, found["fpeak"]).response()))
        assert_close(value, found["peak"], rel=NGSPICE_DIGITS, what="|V| at the hump")
    assert_close(float(extremum(network, F0 / 1.5, F0).f_hz), F0 / math.sqrt(1 + k), rel=0.02,
                 what="lower hump near f0/√(1+k)")
    assert_close(float(extremum(network, F0, F0 * 1.5).f_hz), F0 / math.sqrt(1 - k), rel=0.02,
                 what="upper hump near f0/√(1−k)")


def test_turns_ratio_matches_ngspice_e_and_f_elements():
    """A tank with its load on a 1:8 tap (ideal turns ratio) against ngspice's E/F pair."""
    n, rl = 8.0, 50.0
    parts = (Coil("L1", "t", "0", L, R_COIL), Capacitor("C1", "t", "0", C),
             TurnsRatio("T1", "t", "0", "o", "0", n), Resistor("RL", "o", "0", rl))
    network = Network(parts, Source("t", "voltage", RS), Response("voltage", "L1"), "RL")
    body = "\n".join([
        "vdrive src 0 dc 0 ac 1", f"rsource src t {RS!r}", "vsense t tt dc 0",
        f"l1 tt l1r {L!r}", f"rl1 l1r 0 {R_COIL!r}", f"c1 tt 0 {C!r}",
        f"e1 tt ep o 0 {n!r}", "vprim ep 0 dc 0", f"f1 0 o vprim {n!r}", f"rload o 0 {rl!r}",
    ])
    peak = extremum(network, F0 / 3, F0 * 3)
    points = half_power_points(network, peak)
    found = measure_resonance(body, "v(tt)", port_voltage="v(tt)", port_current="i(vsense)",
                              f_start_hz=F0 / 3, f_stop_hz=F0 * 3)
    assert_close(float(peak.f_hz), found.f_peak_hz, rel=NGSPICE_DIGITS, what="f_peak")
    assert_close(float(points.f_low_hz), found.f_low_hz, rel=NGSPICE_DIGITS, what="f_low")
    assert_close(float(points.f_high_hz), found.f_high_hz, rel=NGSPICE_DIGITS, what="f_high")


def test_trap_in_a_line_notch_matches_ngspice():
    """A lossy parallel tank in series with a 50 Ω line: frequency and depth of the notch
    of the load voltage against ngspice's MIN / MIN_AT."""
    parts = (Coil("L1", "in", "m", L, R_COIL), Capacitor("C1", "in", "out", C, 0.2),
             Resistor("RW", "m", "out", 1e-9), Resistor("RL", "out", "0", 50.0))
    network = Network(parts, Source("in", "voltage", 50.0), Response("voltage", "RL"), "RL")
    body = "\n".join([
        "vdrive src 0 dc 0 ac 1", "rsource src in 50", f"l1 in l1r {L!r}",
        f"rl1 l1r m {R_COIL!r}", "rw m out 1e-9", f"c1 in c1r {C!r}", "rc1 c1r out 0.2",
        "rload out 0 50",
    ])
    low, high = F0 * 0.98, F0 * 1.02
    notch = extremum(network, low, high, kind="min", quantity=load_voltage_quantity)
    found = ac_measure(body, Sweep("lin", 40001, low, high), {"resp": "mag(v(out))"},
                       {"lowest": "MIN resp", "flow": "MIN_AT resp"})
    assert_close(float(notch.f_hz), found["flow"], rel=(high - low) / 40000 / low,
                 what="notch frequency (to ngspice's step)")
    assert_close(float(notch.magnitude), found["lowest"], rel=1e-5, what="notch depth")
