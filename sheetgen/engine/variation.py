"""How a tuned circuit's response moves with part tolerances and temperature.

Two analyses over the same perturbation of a nominal `Circuit`:

* `monte_carlo`: every spread drawn at random (numpy's default generator, one independent
  stream per quantity spawned from the seed), an operating temperature drawn uniformly
  within the range, and the exact response (`resonance.response_features`) evaluated on
  all trials at once.
* `worst_case`: every corner of the tolerance bands and both ends of the temperature
  range, 2^k circuits for k varying quantities.

A part value in a trial is nominal · (1 + tolerance deviation) · (1 + temperature change),
the temperature change taken from the reference temperature, 25 °C. The inductance's
tolerance is that of AL (or of the core's permeability): L = AL·N² with N exact, so
δL/L = δAL/AL.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import Literal

import numpy as np

from sheetgen.engine.resonance import (
    Circuit,
    capacitance_for_f0,
    relative_response_db,
    response_features,
    terminal_impedance,
)

Distribution = Literal["uniform", "normal"]
Method = Literal["monte-carlo", "worst-case"]

REFERENCE_TEMPERATURE_C = 25.0
DEFAULT_TRIALS = 100_000
DEFAULT_COVERAGE = 0.9973  # the ±3σ central interval of a normal distribution
DEFAULT_SEED = 1
# Common practice: a coil's Q, estimated from loss tables or stated by a maker for the
# type (a typical or minimum figure), spreads about ±20 % from unit to unit.
COIL_Q_SPREAD = 0.20
# Common practice: bought RF inductors are sold at ±5 % or ±10 %; with none stated the
# wider is assumed.
BOUGHT_COIL_TOLERANCE = 0.10

# Independent random streams, spawned from the seed in this order. A new quantity is
# added at the end, so existing jobs keep their draws.
_STREAMS = ("temperature", "capacitance", "inductance", "inductor_resistance",
            "capacitor_esr", "load_resistance", "capacitor_temperature",
            "inductance_temperature", "source_resistance")


def _check_distribution(distribution: str) -> None:
    if distribution not in ("uniform", "normal"):
        raise ValueError(f"distribution must be 'uniform' or 'normal', not {distribution!r}")


def band_sigma(band: float, distribution: Distribution) -> float:
    """Standard deviation of a ±band: b/√3 for a uniform band, b/3 when the band is ±3σ."""
    _check_distribution(distribution)
    return band / math.sqrt(3.0) if distribution == "uniform" else band / 3.0


@dataclass(frozen=True)
class Spread:
    """A relative tolerance ±`relative` (0.05 for ±5 %).

    "uniform": any value within the band equally likely; "normal": the band is ±3σ of a
    normal distribution (0.27 % of parts fall outside it).
    """

    relative: float
    distribution: Distribution = "uniform"

    def __post_init__(self):
        _check_distribution(self.distribution)
        # A normal band wider than ±50 % (σ > 1/6) could draw a value ≤ 0 in 1e9 trials.
        if self.distribution == "uniform":
            valid = 0.0 <= self.relative < 1.0
        else:
            valid = 0.0 <= self.relative <= 0.5
        if not valid:
            widest = "below 1" if self.distribution == "uniform" else "at most 0.5"
            raise ValueError(f"a {self.distribution} spread must be ≥ 0 and {widest} "
                             f"(relative), not {self.relative!r}")

    @property
    def sigma(self) -> float:
        """Standard deviation of the relative deviation."""
        return band_sigma(self.relative, self.distribution)


@dataclass(frozen=True)
class TemperatureCoefficient:
    """A linear temperature coefficient: ΔX/X = α (T − 25 °C), α = per_kelvin ± band.

    per_kelvin and band_per_kelvin are in 1/K (−30 ppm/K is −30e-6); the band is part to
    part, drawn like a `Spread` ("uniform" or "normal" with the band = ±3σ).
    """

    per_kelvin: float = 0.0
    band_per_kelvin: float = 0.0
    distribution: Distribution = "uniform"

    def __post_init__(self):
        _check_distribution(self.distribution)
        if not (math.isfinite(self.per_kelvin) and math.isfinite(self.band_per_kelvin)
                and self.band_per_kelvin >= 0.0):
            raise ValueError("a temperature coefficient needs finite values and a band ≥ 0")


@dataclass(frozen=True)
class TemperatureBand:
    """A class 2 dielectric: ΔC/C from 25 °C stays within [change_low, change_high] over
    its rated range [rated_min_c, rated_max_c]; the standards bound that change, not the
    shape of the curve.

    Model (ours, stated here): at a temperature T the change lies within the band scaled
    by s(T) = (T − 25)/(rated_max − 25) above 25 °C and (25 − T)/(25 − rated_min) below,
    so the whole band is reached at the ends of the rated range and none at 25 °C. A part
    sits at a fixed position within that scaled band (Monte Carlo: uniform; worst case:
    either edge). Operating beyond the rated range is refused: nothing bounds it there.
    Bias-voltage and ageing losses of class 2 parts are not modelled.
    """

    change_low: float
    change_high: float
    rated_min_c: float
    rated_max_c: float

    def __post_init__(self):
        if not (-1.0 < self.change_low <= 0.0 <= self.change_high):
            raise ValueError("a band of change must satisfy -1 < change_low ≤ 0 ≤ change_high")
        if not self.rated_min_c < REFERENCE_TEMPERATURE_C < self.rated_max_c:
            raise ValueError("a rated range must include the reference temperature, 25 °C")

    def scale(self, temperature_c):
        """s(T), the fraction of the band reached at T (0 at 25 °C, 1 at the range ends)."""
        t = np.asarray(temperature_c, dtype=float)
        above = (t - REFERENCE_TEMPERATURE_C) / (self.rated_max_c - REFERENCE_TEMPERATURE_C)
        below = (REFERENCE_TEMPERATURE_C - t) / (REFERENCE_TEMPERATURE_C - self.rated_min_c)
        return np.where(t >= REFERENCE_TEMPERATURE_C, above, below)


@dataclass(frozen=True)
class Dielectric:
    """A ceramic dielectric type: its temperature behaviour, rated range and source."""

    name: str
    dielectric_class: int
    temperature: TemperatureCoefficient | TemperatureBand
    rated_min_c: float
    rated_max_c: float
    source: str


# EIA-198 letter codes (IEC 60384-8 for class 1, IEC 60384-9 for class 2 give the same
# limits under their own codes). Figures from memory; see tests/reference/variation.md.
DIELECTRICS: Mapping[str, Dielectric] = MappingProxyType({
    "C0G": Dielectric(
        "C0G/NP0", 1, TemperatureCoefficient(0.0, 30e-6, "uniform"), -55.0, 125.0,
        "EIA-198 C0G (IEC 60384-8 class 1): 0 ± 30 ppm/K, −55 … 125 °C (from memory)"),
    "X7R": Dielectric(
        "X7R", 2, TemperatureBand(-0.15, 0.15, -55.0, 125.0), -55.0, 125.0,
        "EIA-198 X7R (IEC 60384-9 class 2): ±15 % over −55 … 125 °C (from memory)"),
    "X5R": Dielectric(
        "X5R", 2, TemperatureBand(-0.15, 0.15, -55.0, 85.0), -55.0, 85.0,
        "EIA-198 X5R (IEC 60384-9 class 2): ±15 % over −55 … 85 °C (from memory)"),
    "Y5V": Dielectric(
        "Y5V", 2, TemperatureBand(-0.82, 0.22, -30.0, 85.0), -30.0, 85.0,
        "EIA-198 Y5V (IEC 60384-9 class 2): +22 %/−82 % over −30 … 85 °C (from memory)"),
})
_DIELECTRIC_ALIASES = {"NP0": "C0G", "C0G/NP0": "C0G", "NPO": "C0G", "COG": "C0G"}


def dielectric(name: str) -> Dielectric:
    """The dielectric called `name` ("C0G", "NP0", "X7R", "X5R", "Y5V"; any case)."""
    key = name.strip().upper()
    key = _DIELECTRIC_ALIASES.get(key, key)
    if key not in DIELECTRICS:
        raise ValueError(f"unknown dielectric {name!r}; known: C0G (NP0), "
                         f"{', '.join(k for k in DIELECTRICS if k != 'C0G')}")
    return DIELECTRICS[key]


@dataclass(frozen=True)
class VariationSpec:
    """What varies, how, over which temperatures, and how many trials (None: exact)."""

    capacitance: Spread | None = None
    inductance: Spread | None = None
    inductor_resistance: Spread | None = None
    capacitor_esr: Spread | None = None
    load_resistance: Spread | None = None
    source_resistance: Spread | None = None  # e.g. a bench fixture and its 50 Ω port
    capacitor_temperature: TemperatureCoefficient | TemperatureBand | None = None
    inductance_temperature: TemperatureCoefficient | None = None
    temperature_min_c: float = REFERENCE_TEMPERATURE_C
    temperature_max_c: float = REFERENCE_TEMPERATURE_C
    trials: int = DEFAULT_TRIALS
    seed: int = DEFAULT_SEED
    coverage: float = DEFAULT_COVERAGE
    tuned_f0_hz: float | None = None  # each build trimmed to this f0 at 25 °C (see _parts)

    def __post_init__(self):
        if not self.temperature_min_c <= self.temperature_max_c:
            raise ValueError("temperature_min_c must not be above temperature_max_c")
        if not (isinstance(self.trials, int) and self.trials >= 2):
            raise ValueError("a Monte Carlo needs at least 2 trials")
        if not 0.0 < self.coverage < 1.0:
            raise ValueError("coverage must lie strictly between 0 and 1")
        band = self.capacitor_temperature
        if isinstance(band, TemperatureBand) and not (
                band.rated_min_c <= self.temperature_min_c
                and self.temperature_max_c <= band.rated_max_c):
            raise ValueError(
                f"the operating range {self.temperature_min_c:g} … "
                f"{self.temperature_max_c:g} °C goes beyond the capacitor dielectric's rated "
                f"range {band.rated_min_c:g} … "
                f"{band.rated_max_c:g} °C, where its change is not bounded")

    @property
    def temperature_span_k(self) -> float:
        return self.temperature_max_c - self.temperature_min_c


@dataclass(frozen=True)
class Interval:
    """A closed interval [low, high]."""

    low: float
    high: float


def central_interval(values, coverage: float | None) -> Interval:
    """The central interval holding `coverage` of the finite values: the (1 − c)/2 and
    (1 + c)/2 quantiles (numpy's default linear interpolation); min … max for None.
    NaN bounds when no value is finite."""
    finite = np.asarray(values, dtype=float)
    finite = finite[np.isfinite(finite)]
    if finite.size == 0:
        return Interval(math.nan, math.nan)
    if coverage is None:
        return Interval(float(finite.min()), float(finite.max()))
    low, high = np.quantile(finite, [(1.0 - coverage) / 2.0, (1.0 + coverage) / 2.0])
    return Interval(float(low), float(high))


@dataclass(frozen=True)
class Percentiles:
    """One quantity over the trials: the central interval at the coverage (min … max for
    a worst case), median, mean, standard deviation and extremes of the finite trials."""

    low: float
    median: float
    high: float
    mean: float
    std: float
    minimum: float
    maximum: float
    finite_trials: int
    nan_trials: int


def percentiles(values, coverage: float | None) -> Percentiles:
    """Summary of `values` (NaN trials counted, not used)."""
    values = np.asarray(values, dtype=float)
    finite = values[np.isfinite(values)]
    interval = central_interval(finite, coverage)
    if finite.size == 0:
        nan = math.nan
        return Percentiles(nan, nan, nan, nan, nan, nan, nan, 0, int(values.size))
    return Percentiles(
        low=interval.low, median=float(np.median(finite)), high=interval.high,
        mean=float(finite.mean()), std=float(finite.std(ddof=1)) if finite.size > 1 else 0.0,
        minimum=float(finite.min()), maximum=float(finite.max()),
        finite_trials=int(finite.size), nan_trials=int(values.size - finite.size))


@dataclass(frozen=True)
class VariationSummary:
    """Percentile summaries of the response figures."""

    f0_hz: Percentiles
    f_peak_hz: Percentiles
    bandwidth_hz: Percentiles
    q_loaded: Percentiles
    impedance_at_peak_ohm: Percentiles


@dataclass(frozen=True)
class TrialParts:
    """The part values of every trial (read-only arrays; load None when there is none).

    capacitance_factor is C_trial / C_nominal: the capacitor's tolerance and temperature
    change together.
    """

    temperature_c: np.ndarray
    inductance_h: np.ndarray
    capacitance_f: np.ndarray
    capacitance_factor: np.ndarray
    inductor_resistance_ohm: np.ndarray
    capacitor_esr_ohm: np.ndarray
    load_resistance_ohm: np.ndarray | None
    source_resistance_ohm: np.ndarray | None = None


@dataclass(frozen=True)
class VariationResult:
    """The response of every trial (read-only arrays, NaN where a figure is absent) and
    their summaries. seed and coverage are None for a worst case; its trials are corners."""

    method: Method
    trials: int
    seed: int | None
    coverage: float | None
    nan_trials: int
    nominal: Circuit
    parts: TrialParts
    f0_hz: np.ndarray
    f_peak_hz: np.ndarray
    f_low_hz: np.ndarray
    f_high_hz: np.ndarray
    bandwidth_hz: np.ndarray
    q_loaded: np.ndarray
    impedance_at_peak_ohm: np.ndarray
    summary: VariationSummary


@dataclass(frozen=True)
class _Draws:
    """Unit deviations of one set of trials, before they are applied to the parts."""

    temperature_c: np.ndarray
    capacitance: np.ndarray
    inductance: np.ndarray
    inductor_resistance: np.ndarray
    capacitor_esr: np.ndarray
    load_resistance: np.ndarray
    capacitor_temperature: np.ndarray  # α in 1/K, or the position 0…1 within a band
    inductance_temperature: np.ndarray  # α in 1/K
    source_resistance: np.ndarray


def _random_band(rng: np.random.Generator, band: float, distribution: Distribution,
                 trials: int) -> np.ndarray:
    if band == 0.0:
        return np.zeros(trials)
    if distribution == "uniform":
        return rng.uniform(-band, band, trials)
    return band_sigma(band, "normal") * rng.standard_normal(trials)


def _random_spread(rng, spread: Spread | None, trials: int) -> np.ndarray:
    if spread is None:
        return np.zeros(trials)
    return _random_band(rng, spread.relative, spread.distribution, trials)


def _random_coefficient(rng, model, trials: int) -> np.ndarray:
    if model is None:
        return np.zeros(trials)
    if isinstance(model, TemperatureBand):
        return rng.uniform(0.0, 1.0, trials)
    return model.per_kelvin + _random_band(rng, model.band_per_kelvin, model.distribution,
                                           trials)


def _monte_carlo_draws(spec: VariationSpec) -> _Draws:
    n = spec.trials
    streams = dict(zip(_STREAMS, np.random.default_rng(spec.seed).spawn(len(_STREAMS))))
    if spec.temperature_span_k > 0.0:
        temperature = streams["temperature"].uniform(spec.temperature_min_c,
                                                     spec.temperature_max_c, n)
    else:
        temperature = np.full(n, float(spec.temperature_min_c))
    return _Draws(
        temperature_c=temperature,
        capacitance=_random_spread(streams["capacitance"], spec.capacitance, n),
        inductance=_random_spread(streams["inductance"], spec.inductance, n),
        inductor_resistance=_random_spread(streams["inductor_resistance"],
                                           spec.inductor_resistance, n),
        capacitor_esr=_random_spread(streams["capacitor_esr"], spec.capacitor_esr, n),
        load_resistance=_random_spread(streams["load_resistance"], spec.load_resistance, n),
        capacitor_temperature=_random_coefficient(streams["capacitor_temperature"],
                                                  spec.capacitor_temperature, n),
        inductance_temperature=_random_coefficient(streams["inductance_temperature"],
                                                   spec.inductance_temperature, n),
        source_resistance=_random_spread(streams["source_resistance"], spec.source_resistance,
                                         n),
    )


def _edges(spread: Spread | None) -> tuple[float, ...]:
    return (0.0,) if spread is None or spread.relative == 0.0 else (-spread.relative,
                                                                      spread.relative)


def _coefficient_edges(model) -> tuple[float, ...]:
    if model is None:
        return (0.0,)
    if isinstance(model, TemperatureBand):
        return (0.0, 1.0)
    band = model.band_per_kelvin
    return (model.per_kelvin,) if band == 0.0 else (model.per_kelvin - band,
                                                    model.per_kelvin + band)


def _corner_draws(spec: VariationSpec) -> _Draws:
    temperatures = ((float(spec.temperature_min_c),) if spec.temperature_span_k == 0.0
                    else (float(spec.temperature_min_c), float(spec.temperature_max_c)))
    axes = (temperatures, _edges(spec.capacitance), _edges(spec.inductance),
            _edges(spec.inductor_resistance), _edges(spec.capacitor_esr),
            _edges(spec.load_resistance), _coefficient_edges(spec.capacitor_temperature),
            _coefficient_edges(spec.inductance_temperature), _edges(spec.source_resistance))
    corners = np.array(list(itertools.product(*axes)), dtype=float)
    return _Draws(*(corners[:, k].copy() for k in range(len(axes))))


def _linear_change(alpha_per_k: np.ndarray, temperature_c: np.ndarray) -> np.ndarray:
    """ΔX/X = α (T − T_ref)."""
    return alpha_per_k * (temperature_c - REFERENCE_TEMPERATURE_C)


def _capacitor_temperature_change(model, draw: np.ndarray, temperature_c: np.ndarray):
    if model is None:
        return np.zeros_like(temperature_c)
    if isinstance(model, TemperatureBand):
        position = model.change_low + (model.change_high - model.change_low) * draw
        return model.scale(temperature_c) * position
    return _linear_change(draw, temperature_c)


def _frozen(array: np.ndarray) -> np.ndarray:
    array = np.ascontiguousarray(array, dtype=float)
    array.setflags(write=False)
    return array


def _parts(circuit: Circuit, spec: VariationSpec, draws: _Draws) -> TrialParts:
    """Each trial's parts. With spec.tuned_f0_hz the capacitance is the one a technician
    trims to: C = 1/(ω_t² L_25) at 25 °C (Thomson's formula, L_25 the trial's coil before
    temperature), so the capacitor's tolerance drops out and its temperature change stays."""
    t = draws.temperature_c
    temperature_change = 1.0 + _capacitor_temperature_change(
        spec.capacitor_temperature, draws.capacitor_temperature, t)
    if spec.tuned_f0_hz is None:
        c_factor = (1.0 + draws.capacitance) * temperature_change
    else:
        tuned = capacitance_for_f0(spec.tuned_f0_hz,
                                   circuit.inductance_h * (1.0 + draws.inductance))
        c_factor = tuned / circuit.capacitance_f * temperature_change
    l_factor = (1.0 + draws.inductance) * (1.0 + _linear_change(
        draws.inductance_temperature, t))
    load, source = circuit.load_resistance_ohm, circuit.source_resistance_ohm
    return TrialParts(
        temperature_c=_frozen(t),
        inductance_h=_frozen(circuit.inductance_h * l_factor),
        capacitance_f=_frozen(circuit.capacitance_f * c_factor),
        capacitance_factor=_frozen(c_factor),
        inductor_resistance_ohm=_frozen(circuit.inductor_resistance_ohm
                                        * (1.0 + draws.inductor_resistance)),
        capacitor_esr_ohm=_frozen(circuit.capacitor_esr_ohm * (1.0 + draws.capacitor_esr)),
        load_resistance_ohm=None if load is None else _frozen(load
                                                              * (1.0 + draws.load_resistance)),
        source_resistance_ohm=None if source is None or spec.source_resistance is None
        else _frozen(source * (1.0 + draws.source_resistance)),
    )


def _trial_circuit(nominal: Circuit, parts: TrialParts, index=slice(None)) -> Circuit:
    load, source = parts.load_resistance_ohm, parts.source_resistance_ohm
    return Circuit(nominal.topology, parts.inductance_h[index],
                   parts.inductor_resistance_ohm[index], parts.capacitance_f[index],
                   parts.capacitor_esr_ohm[index],
                   nominal.source_resistance_ohm if source is None else source[index],
                   None if load is None else load[index], nominal.source_capacitance_f)


def _evaluate(method: Method, circuit: Circuit, spec: VariationSpec, draws: _Draws,
              seed: int | None, coverage: float | None) -> VariationResult:
    parts = _parts(circuit, spec, draws)
    features = response_features(_trial_circuit(circuit, parts))
    bandwidth = features.f_high_hz - features.f_low_hz
    with np.errstate(divide="ignore", invalid="ignore"):
        q_loaded = features.f0_hz / bandwidth
    impedance = np.full(parts.inductance_h.shape, np.nan)
    has_peak = np.isfinite(features.f_peak_hz)
    impedance[has_peak] = np.abs(terminal_impedance(
        _trial_circuit(circuit, parts, has_peak), features.f_peak_hz[has_peak]))
    arrays = {
        "f0_hz": _frozen(features.f0_hz), "f_peak_hz": _frozen(features.f_peak_hz),
        "f_low_hz": _frozen(features.f_low_hz), "f_high_hz": _frozen(features.f_high_hz),
        "bandwidth_hz": _frozen(bandwidth), "q_loaded": _frozen(q_loaded),
        "impedance_at_peak_ohm": _frozen(impedance),
    }
    absent = ~(np.isfinite(arrays["f_peak_hz"]) & np.isfinite(arrays["bandwidth_hz"]))
    summary = VariationSummary(**{name: percentiles(arrays[name], coverage)
                                  for name in ("f0_hz", "f_peak_hz", "bandwidth_hz",
                                               "q_loaded", "impedance_at_peak_ohm")})
    return VariationResult(method=method, trials=int(parts.inductance_h.size), seed=seed,
                           coverage=coverage, nan_trials=int(absent.sum()), nominal=circuit,
                           parts=parts, summary=summary, **arrays)


def monte_carlo(circuit: Circuit, spec: VariationSpec) -> VariationResult:
    """Monte Carlo of the exact response over spec.trials random trials, all at once.

    Each trial draws every spread and an operating temperature, uniform within the range
    (no distribution of operating temperatures is known, so none is favoured).

    The same circuit, spec and seed always give bit-for-bit the same result.
    """
    return _evaluate("monte-carlo", circuit, spec, _monte_carlo_draws(spec), spec.seed,
                     spec.coverage)


def worst_case(circuit: Circuit, spec: VariationSpec) -> VariationResult:
    """Every corner of the bands and both ends of the temperature range (2^k trials).

    f0 moves monotonically with each part, so its extremes are exact corners; the other
    figures are taken at the same corners (the usual extreme-value method).
    """
    return _evaluate("worst-case", circuit, spec, _corner_draws(spec), None, None)


@dataclass(frozen=True)
class SampledParts:
    """The part values of every trial without their responses (what a trimmer check needs);
    the same draws as monte_carlo / worst_case give for the same spec."""

    method: Method
    coverage: float | None
    nominal: Circuit
    parts: TrialParts


def sample_parts(circuit: Circuit, spec: VariationSpec, method: Method) -> SampledParts:
    """Draw the trials' parts as `method` would, skipping the response evaluation."""
    if method == "monte-carlo":
        return SampledParts(method, spec.coverage, circuit,
                            _parts(circuit, spec, _monte_carlo_draws(spec)))
    return SampledParts(method, None, circuit, _parts(circuit, spec, _corner_draws(spec)))


def _columns(parts: TrialParts) -> TrialParts:
    """The same trials as column vectors, to broadcast against a row of frequencies."""
    import dataclasses
    return TrialParts(**{f.name: None if getattr(parts, f.name) is None
                         else getattr(parts, f.name)[:, None]
                         for f in dataclasses.fields(TrialParts)})


ENVELOPE_TRIALS = 2000  # trials drawn for the plotted Monte Carlo envelope of the response
ENVELOPE_POINTS = 201  # frequencies of the envelope (a band on a plot needs no more)


@dataclass(frozen=True)
class Envelope:
    """The response (dB, relative to the nominal maximum) that the coverage of builds stays
    within, at each frequency of the sweep."""

    f_hz: np.ndarray
    low_db: np.ndarray
    high_db: np.ndarray


def response_envelope(circuit: Circuit, variation: VariationResult, sweep_f_hz: np.ndarray,
                      coverage: float | None) -> Envelope:
    """The response band of the first ENVELOPE_TRIALS builds (all corners for a worst case)
    over the sweep, relative to the nominal maximum."""
    parts = variation.parts
    count = min(ENVELOPE_TRIALS, len(parts.inductance_h))
    take = slice(0, count)
    trial = _trial_circuit(circuit, _columns(parts), take)
    f_hz = sweep_f_hz[::max(1, (len(sweep_f_hz) - 1) // (ENVELOPE_POINTS - 1))]
    relative = relative_response_db(trial, circuit, f_hz[None, :])
    if coverage is None:
        low, high = relative.min(axis=0), relative.max(axis=0)
    else:
        tail = 100.0 * (1.0 - coverage) / 2.0
        low, high = np.percentile(relative, [tail, 100.0 - tail], axis=0)
    return Envelope(f_hz, low, high)


MONTE_CARLO_BLOCK = 10_000  # trials per block of a Monte Carlo that stops once settled


def monte_carlo_blocks(circuit: Circuit, spec: VariationSpec, block: int = MONTE_CARLO_BLOCK):
    """The Monte Carlo of the first `block`, 2·`block`, … trials, the last of spec.trials.

    Each is the result monte_carlo gives for that many trials (numpy's generators deliver
    a stream's first n values the same however many are drawn): only each new block is
    evaluated, and the trials so far are joined.
    """
    import dataclasses
    if block < 2:
        raise ValueError("a block needs at least 2 trials")
    draws = _monte_carlo_draws(spec)
    names = ("f0_hz", "f_peak_hz", "f_low_hz", "f_high_hz", "bandwidth_hz", "q_loaded",
             "impedance_at_peak_ohm")
    done: list[VariationResult] = []
    for start in range(0, spec.trials, block):
        stop = min(start + block, spec.trials)
        if spec.trials - stop < 2:  # never leave a last block too small to summarise
            stop = spec.trials
        piece = _Draws(*(getattr(draws, f.name)[start:stop] for f in dataclasses.fields(_Draws)))
        done.append(_evaluate("monte-carlo", circuit, spec, piece, spec.seed, spec.coverage))
        if len(done) == 1:
            yield done[0]
        else:
            joined = {name: _frozen(np.concatenate([getattr(r, name) for r in done]))
                      for name in names}
            parts = TrialParts(**{
                f.name: (None if getattr(done[0].parts, f.name) is None else _frozen(
                    np.concatenate([getattr(r.parts, f.name) for r in done])))
                for f in dataclasses.fields(TrialParts)})
            summary = VariationSummary(**{
                f.name: percentiles(joined[f.name], spec.coverage)
                for f in dataclasses.fields(VariationSummary)})
            yield VariationResult(method="monte-carlo", trials=stop, seed=spec.seed,
                                  coverage=spec.coverage,
                                  nan_trials=sum(r.nan_trials for r in done), nominal=circuit,
                                  parts=parts, summary=summary, **joined)
        if stop == spec.trials:
            return
