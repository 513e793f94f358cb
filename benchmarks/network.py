"""Cost per Monte Carlo trial of the network engine, against ngspice and the closed forms.

Run from the checkout: `python benchmarks/network.py [trials]`. Not a test: it prints
figures and ratios and asserts nothing.

1. A three-resonator band-pass (top-capacitor coupled shunt resonators, series end
   capacitors to 50 Ω; maximally flat n = 3, g = 1, 2, 1, 3.5–3.8 MHz; invented values):
   the peak and −3 dB points of every trial, the network engine against ngspice running
   the same number of its own trials (its `sgauss` draws, the same ±3σ normal bands), each
   as a cost per trial, with the spread each finds (target: ≥ 1000× cheaper, same spread).
2. The single resonator: the network engine against the closed forms that remain its fast
   path (engine/resonance.py) on the same trials.
"""

from __future__ import annotations

import math
import shutil
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from sheetgen.engine import resonance  # noqa: E402
from sheetgen.engine.network import (  # noqa: E402
    Capacitor,
    Coil,
    Network,
    Resistor,
    Response,
    Source,
)
from sheetgen.engine.network_features import extremum, half_power_points  # noqa: E402
from tests import spice  # noqa: E402
from tests.engine.test_variation_ngspice import ngspice_monte_carlo  # noqa: E402

NGSPICE_TRIALS = 100
GRID = 16  # a coarse grid is enough to bracket the peak of trials within a few per cent
BAND = 0.03  # ±3σ of every L and C
F0, BW, R0, L_COIL, Q_COIL = 3.65e6, 300e3, 50.0, 2e-6, 120.0


def bandpass_values() -> dict[str, float]:
    """Coupled-resonator design (Matthaei, Young & Jones §8.11, from memory, as in
    ../shared/NETWORKS.md): k = FBW/√(g_i g_i+1), Qe = g0 g1/FBW, C_c = k·C0, series end
    capacitor Ce = 1/(ω0 R0 Qs) with Qs = √(R_end/R0 − 1), R_end = Qe·ω0·L."""
    g = (1.0, 2.0, 1.0)
    fbw = BW / F0
    w0 = 2 * math.pi * F0
    c0 = 1 / (w0 * w0 * L_COIL)
    k = fbw / math.sqrt(g[0] * g[1])
    cc = k * c0
    r_end = g[0] / fbw * w0 * L_COIL
    qs = math.sqrt(r_end / R0 - 1)
    ce = 1 / (w0 * R0 * qs)
    cp = ce * qs * qs / (1 + qs * qs)
    return {"ce1": ce, "ce2": ce, "cc12": cc, "cc23": cc, "c1": c0 - cc - cp, "c2": c0 - 2 * cc,
            "c3": c0 - cc - cp, "l1": L_COIL, "l2": L_COIL, "l3": L_COIL,
            "r_coil": w0 * L_COIL / Q_COIL}


def bandpass_network(v: dict) -> Network:
    r = v["r_coil"]
    parts = (
        Capacitor("CE1", "in", "n1", v["ce1"]),
        Coil("L1", "n1", "0", v["l1"], r), Capacitor("C1", "n1", "0", v["c1"]),
        Capacitor("CC12", "n1", "n2", v["cc12"]),
        Coil("L2", "n2", "0", v["l2"], r), Capacitor("C2", "n2", "0", v["c2"]),
        Capacitor("CC23", "n2", "n3", v["cc23"]),
        Coil("L3", "n3", "0", v["l3"], r), Capacitor("C3", "n3", "0", v["c3"]),
        Capacitor("CE2", "n3", "out", v["ce2"]), Resistor("RL", "out", "0", R0))
    return Network(parts, Source("in", "voltage", R0), Response("voltage", "RL"), "RL")


def bandpass_bench(v: dict) -> spice.BenchCircuit:
    r = v["r_coil"]
    body = "\n".join([
        "vdrive src 0 dc 0 ac 1", f"rsource src in {R0!r}", "vsense in in2 dc 0",
        f"ce1 in2 n1 {v['ce1']!r}",
        f"l1 n1 m1 {v['l1']!r}", f"rl1 m1 0 {r!r}", f"c1 n1 0 {v['c1']!r}",
        f"cc12 n1 n2 {v['cc12']!r}",
        f"l2 n2 m2 {v['l2']!r}", f"rl2 m2 0 {r!r}", f"c2 n2 0 {v['c2']!r}",
        f"cc23 n2 n3 {v['cc23']!r}",
        f"l3 n3 m3 {v['l3']!r}", f"rl3 m3 0 {r!r}", f"c3 n3 0 {v['c3']!r}",
        f"ce2 n3 out {v['ce2']!r}", f"rload out 0 {R0!r}",
    ])
    return spice.BenchCircuit("parallel", body, "v(out)", "v(in2)", "i(vsense)",
                              F0 / 2, F0 * 2)


def _spread(values: np.ndarray) -> str:
    finite = values[np.isfinite(values)]
    return f"σ/mean {finite.std(ddof=1) / finite.mean():.3%}"


def bandpass(trials: int) -> None:
    nominal = bandpass_values()
    rng = np.random.default_rng(5)
    perturbed = {name: (value * (1 + BAND / 3 * rng.standard_normal(trials))
                        if name[0] in "cl" else value) for name, value in nominal.items()}
    network = bandpass_network(perturbed)
    start = time.perf_counter()
    peak = extremum(network, F0 * 0.8, F0 * 1.25, points=GRID)
    points = half_power_points(network, peak)
    ours_s = (time.perf_counter() - start) / trials
    centre = np.sqrt(points.f_low_hz * points.f_high_hz)
    print(f"three-resonator band-pass, {len(nominal) - 1} parts varied ±{BAND:.0%} (3σ)")
    print(f"  network engine {trials:>7} trials {ours_s * 1e6:10.1f} µs/trial   "
          f"centre {_spread(centre)}   bandwidth {_spread(points.bandwidth_hz)}")
    if shutil.which("ngspice") is None:
        print("  ngspice         not installed (apt-get install ngspice)")
        return
    bands = {name: (value, BAND) for name, value in nominal.items() if name[0] in "cl"}
    run = ngspice_monte_carlo(bandpass_bench(nominal), bands, NGSPICE_TRIALS, 1005,
                              spice.Sweep("lin", 4001, F0 * 0.8, F0 * 1.25))
    spice_s = run.seconds / NGSPICE_TRIALS
    spice_centre = np.sqrt(run.f_low_hz * run.f_high_hz)
    print(f"  {run.ngspice_version:<14} {NGSPICE_TRIALS:>7} trials {spice_s * 1e6:10.1f} µs/trial   "
          f"centre {_spread(spice_centre)}   bandwidth {_spread(run.bandwidth_hz)}   "
          f"ratio {spice_s / ours_s:8.1f}× (target ≥ 1000×)")


def single(trials: int) -> None:
    rng = np.random.default_rng(6)
    l = 50e-6 * (1 + 0.05 / 3 * rng.standard_normal(trials))
    c = 40e-12 * (1 + 0.05 / 3 * rng.standard_normal(trials))
    circuit = resonance.Circuit("parallel", l, 2.0, c, 0.1, 47e3, 20e3)
    start = time.perf_counter()
    closed = resonance.response_features(circuit)
    closed_s = (time.perf_counter() - start) / trials
    parts = (Coil("L1", "t", "0", l, 2.0), Capacitor("C1", "t", "0", c, 0.1),
             Resistor("RL", "t", "0", 20e3))
    network = Network(parts, Source("t", "voltage", 47e3), Response("voltage", "L1"), "RL")
    f0 = 1 / (2 * math.pi * math.sqrt(50e-6 * 40e-12))
    start = time.perf_counter()
    peak = extremum(network, f0 / 50, f0 * 50)
    points = half_power_points(network, peak)
    network_s = (time.perf_counter() - start) / trials
    worst = np.nanmax(np.abs(points.f_high_hz / closed.f_high_hz - 1))
    print(f"single resonator, {trials} trials")
    print(f"  closed forms (the fast path)  {closed_s * 1e6:8.2f} µs/trial")
    print(f"  network engine                {network_s * 1e6:8.2f} µs/trial   "
          f"ratio {network_s / closed_s:6.1f}× slower; largest difference {worst:.1e}")


def main(trials: int = 20_000) -> None:
    bandpass(trials)
    single(trials)


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 20_000)
