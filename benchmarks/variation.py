"""Cost per trial of the vectorised Monte Carlo against a per-trial loop and ngspice.

Run from the checkout: `python benchmarks/variation.py [trials]`. Not a test: it prints
figures and ratios and asserts nothing. The three runs use the same circuits and the
same ±3σ normal bands (tests/test_variation_ngspice.py); the loop and ngspice run on a
subset and are scaled to a cost per trial.
"""

from __future__ import annotations

import dataclasses
import shutil
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from sheetgen.engine.resonance import Circuit, response_features, terminal_impedance  # noqa: E402
from sheetgen.engine.variation import monte_carlo  # noqa: E402
from tests.engine.test_variation_ngspice import CASES, ngspice_monte_carlo  # noqa: E402

LOOP_TRIALS = 2_000
NGSPICE_TRIALS = 300


def _spread(f_hz: np.ndarray) -> str:
    finite = f_hz[np.isfinite(f_hz)]
    return f"σ/mean {finite.std(ddof=1) / finite.mean():.4%}"


def _loop(result, count: int) -> tuple[float, np.ndarray, np.ndarray]:
    """The same engine, one scalar circuit per trial."""
    parts, nominal = result.parts, result.nominal
    peaks, bandwidths = np.empty(count), np.empty(count)
    start = time.perf_counter()
    for k in range(count):
        load = parts.load_resistance_ohm
        circuit = Circuit(nominal.topology, float(parts.inductance_h[k]),
                          float(parts.inductor_resistance_ohm[k]), float(parts.capacitance_f[k]),
                          float(parts.capacitor_esr_ohm[k]), nominal.source_resistance_ohm,
                          None if load is None else float(load[k]))
        features = response_features(circuit)
        abs(terminal_impedance(circuit, float(features.f_peak_hz)))
        peaks[k] = float(features.f_peak_hz)
        bandwidths[k] = float(features.f_high_hz - features.f_low_hz)
    return (time.perf_counter() - start) / count, peaks, bandwidths


def main(trials: int = 100_000) -> None:
    have_ngspice = shutil.which("ngspice") is not None
    for name, case in CASES.items():
        spec = case.spec()
        spec = dataclasses.replace(spec, trials=trials)
        start = time.perf_counter()
        result = monte_carlo(case.circuit, spec)
        vector_s = (time.perf_counter() - start) / trials
        loop_s, loop_peaks, loop_bw = _loop(result, min(LOOP_TRIALS, trials))
        print(f"\n{name}")
        print(f"  vectorised  {trials:>7} trials  {vector_s * 1e6:9.2f} µs/trial   "
              f"f_peak {_spread(result.f_peak_hz)}   bandwidth {_spread(result.bandwidth_hz)}")
        print(f"  loop        {len(loop_peaks):>7} trials  {loop_s * 1e6:9.2f} µs/trial   "
              f"f_peak {_spread(loop_peaks)}   bandwidth {_spread(loop_bw)}   "
              f"ratio {loop_s / vector_s:8.1f}×")
        if not have_ngspice:
            print("  ngspice     not installed (apt-get install ngspice)")
            continue
        bands = {element: (case.nominal(element), band) for element, band in case.bands.items()}
        run = ngspice_monte_carlo(case.bench(), bands, NGSPICE_TRIALS, 1000 + case.seed,
                                  case.sweep())
        spice_s = run.seconds / NGSPICE_TRIALS
        print(f"  {run.ngspice_version:<11} {NGSPICE_TRIALS:>7} trials  {spice_s * 1e6:9.2f} "
              f"µs/trial   f_peak {_spread(run.f_peak_hz)}   bandwidth "
              f"{_spread(run.bandwidth_hz)}   ratio {spice_s / vector_s:8.1f}× "
              f"(target ≥ 1000×)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 100_000)
