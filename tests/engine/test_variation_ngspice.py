"""Coverage of the Monte Carlo test limits checked against ngspice's own Monte Carlo.

Source: ngspice (Debian package `ngspice`; version read from `ngspice -v` and named in
every failure message), run in batch mode through tests/spice.py. Its control language
draws each part from its own Gaussian generator, `sgauss(0)` (mean 0, σ 1), seeded with
`set rndseed=…`, changes the part with `alter`, runs an AC sweep and measures the
response with `meas ac` (see tests/reference/variation.md). Nothing of sheetgen's
engine runs inside ngspice; only the nominal values and the ±3σ bands are shared.

The check: the windows sheetgen computes at coverage c from 100 000 trials of its own
must hold a share of the ngspice trials consistent with c, by an exact two-sided
binomial test (scipy.stats.binomtest) at the 0.1 % level. A few hundred ngspice trials
tell a right spread from one off by the b/√3-for-b/3 slip or by a factor of 1.5 in σ.

Circuit values are invented.
"""

from __future__ import annotations

import math
import re
import time
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
import pytest
from scipy import stats

from sheetgen.engine import limits
from sheetgen.engine.resonance import Circuit, resonant_frequency_hz
from sheetgen.engine.variation import Spread, VariationSpec, monte_carlo
from tests import spice

pytestmark = pytest.mark.ngspice

NGSPICE_TRIALS = 400
SIGNIFICANCE = 1e-3  # two-sided binomial p-value below which the coverage is rejected


@dataclass(frozen=True)
class NgspiceMonteCarlo:
    """Per-trial results of an ngspice Monte Carlo (7 significant digits, as `meas` keeps)."""

    f_peak_hz: np.ndarray
    f_low_hz: np.ndarray
    f_high_hz: np.ndarray
    seconds: float
    ngspice_version: str

    @property
    def bandwidth_hz(self) -> np.ndarray:
        return self.f_high_hz - self.f_low_hz


def monte_carlo_deck(bench: spice.BenchCircuit, bands: Mapping[str, tuple[float, float]],
                     trials: int, seed: int, sweep: spice.Sweep) -> str:
    """A deck that, `trials` times, sets every element in `bands` (name → nominal, ±3σ
    relative band) to nominal·(1 + band/3·sgauss(0)), runs `sweep` and measures the peak
    of the response (where its derivative crosses zero) and the half-power points."""
    lines = ["* sheetgen variation bench", bench.body.strip(), ".control",
             f"set rndseed={int(seed)}", "let run = 0", f"dowhile run < {int(trials)}"]
    for element, (nominal, band) in bands.items():
        lines += [f"  let v_{element} = {nominal!r} * (1 + {band / 3.0!r} * sgauss(0))",
                  f"  alter {element} = v_{element}"]
    lines += [
        f"  {sweep.command()}",
        f"  let resp = mag({bench.response})",
        "  let dresp = deriv(resp)",
        "  meas ac fpk WHEN dresp=0 CROSS=1",
        "  meas ac pk MAX resp",
        f"  let lev = pk * {spice.HALF_POWER_FACTOR!r}",
        "  meas ac flo WHEN resp=lev RISE=1",
        "  meas ac fhi WHEN resp=lev FALL=1",
        "  print fpk flo fhi >> mc.txt",
        "  destroy all",
        "  let run = run + 1",
        "end", "quit", ".endc", ".end", ""]
    return "\n".join(lines)


def ngspice_monte_carlo(bench: spice.BenchCircuit, bands: Mapping[str, tuple[float, float]],
                        trials: int, seed: int, sweep: spice.Sweep) -> NgspiceMonteCarlo:
    """Run `monte_carlo_deck` and read back ngspice's measurements of every trial."""
    deck = monte_carlo_deck(bench, bands, trials, seed, sweep)
    start = time.perf_counter()
    text = spice._run(deck, ["mc.txt"], timeout_s=30.0 + 0.1 * trials)["mc.txt"]
    seconds = time.perf_counter() - start
    found: dict[str, list[float]] = {"fpk": [], "flo": [], "fhi": []}
    for line in text.splitlines():
        match = re.match(r"^\s*(?:\w+\.)?(fpk|flo|fhi)\s*=\s*(\S+)\s*$", line)
        if match:
            found[match.group(1)].append(float(match.group(2)))
    counts = {name: len(values) for name, values in found.items()}
    if set(counts.values()) != {trials}:
        raise spice.SpiceError(f"expected {trials} trials of each measure, got {counts}\n"
                               f"--- deck ---\n{deck}")
    return NgspiceMonteCarlo(np.array(found["fpk"]), np.array(found["flo"]),
                             np.array(found["fhi"]), seconds, spice.ngspice_version())


@dataclass(frozen=True)
class Case:
    """A circuit, its ±3σ normal bands by ngspice element name, and a sweep around f0."""

    circuit: Circuit
    bands: Mapping[str, float]
    span: float  # the sweep covers f0·(1 ± span)
    seed: int

    def bench(self) -> spice.BenchCircuit:
        c = self.circuit
        build = spice.series_netlist if c.topology == "series" else spice.parallel_netlist
        return build(c.inductance_h, c.inductor_resistance_ohm, c.capacitance_f,
                     c.capacitor_esr_ohm, c.source_resistance_ohm, c.load_resistance_ohm)

    def nominal(self, element: str) -> float:
        c = self.circuit
        return {"lcoil": c.inductance_h, "ccap": c.capacitance_f,
                "rcoil": c.inductor_resistance_ohm, "rcap": c.capacitor_esr_ohm,
                "rload": c.load_resistance_ohm}[element]

    def spec(self) -> VariationSpec:
        field = {"lcoil": "inductance", "ccap": "capacitance", "rcoil": "inductor_resistance",
                 "rcap": "capacitor_esr", "rload": "load_resistance"}
        return VariationSpec(trials=100_000, seed=self.seed, **{
            field[name]: Spread(band, "normal") for name, band in self.bands.items()})

    def sweep(self) -> spice.Sweep:
        f0 = float(resonant_frequency_hz(self.circuit.inductance_h, self.circuit.capacitance_f))
        return spice.Sweep("lin", 4001, f0 * (1 - self.span), f0 * (1 + self.span))


CASES = {
    "series-3.2MHz-Q20": Case(Circuit("series", 10e-6, 3.0, 253.3e-12, 0.0, 5.0, None),
                              {"lcoil": 0.05, "ccap": 0.05, "rcoil": 0.10}, 0.15, 21),
    "parallel-6.5MHz-Q30": Case(Circuit("parallel", 2.7e-6, 0.5, 220e-12, 0.05, 10e3, 47e3),
                                {"lcoil": 0.03, "ccap": 0.05, "rcoil": 0.2, "rload": 0.05},
                                0.15, 22),
}

_runs: dict[str, NgspiceMonteCarlo] = {}


def _ngspice(name: str) -> NgspiceMonteCarlo:
    if name not in _runs:
        case = CASES[name]
        bands = {element: (case.nominal(element), band) for element, band in case.bands.items()}
        _runs[name] = ngspice_monte_carlo(case.bench(), bands, NGSPICE_TRIALS, 1000 + case.seed,
                                          case.sweep())
    return _runs[name]


def _assert_consistent(inside: int, trials: int, coverage: float, what: str, version: str):
    p_value = stats.binomtest(inside, trials, coverage).pvalue
    assert p_value >= SIGNIFICANCE, (
        f"{what}: {inside} of {trials} {version} Monte Carlo trials fall inside the window "
        f"for coverage {coverage} (expected {coverage * trials:.0f}; binomial p = {p_value:.2g})")


@pytest.mark.parametrize("coverage", [0.90, 0.9973])
@pytest.mark.parametrize("name", list(CASES))
def test_limits_cover_ngspice_monte_carlo_at_the_stated_coverage(name, coverage):
    spice.ngspice_path()  # skips, saying why, when ngspice is not installed
    case = CASES[name]
    window = limits.test_limits(monte_carlo(case.circuit, case.spec()), coverage,
                                resolution_hz=1.0)
    run = _ngspice(name)
    peak_inside = int(np.count_nonzero((run.f_peak_hz >= window.f_peak_min_hz)
                                       & (run.f_peak_hz <= window.f_peak_max_hz)))
    bw_inside = int(np.count_nonzero((run.bandwidth_hz >= window.bandwidth_min_hz)
                                     & (run.bandwidth_hz <= window.bandwidth_max_hz)))
    _assert_consistent(peak_inside, NGSPICE_TRIALS, coverage, f"{name} f_peak window",
                       run.ngspice_version)
    _assert_consistent(bw_inside, NGSPICE_TRIALS, coverage, f"{name} bandwidth window",
                       run.ngspice_version)


def test_ngspice_gaussian_draws_are_seeded():
    # the reference itself: the same rndseed gives the same trials, another seed others
    spice.ngspice_path()
    case = CASES["series-3.2MHz-Q20"]
    bands = {"lcoil": (case.nominal("lcoil"), 0.05)}
    sweep = case.sweep()
    first = ngspice_monte_carlo(case.bench(), bands, 5, 7, sweep)
    again = ngspice_monte_carlo(case.bench(), bands, 5, 7, sweep)
    other = ngspice_monte_carlo(case.bench(), bands, 5, 8, sweep)
    assert np.array_equal(first.f_peak_hz, again.f_peak_hz)
    assert not np.array_equal(first.f_peak_hz, other.f_peak_hz)
    assert math.isfinite(float(first.bandwidth_hz.sum()))
