"""The bench test's numbers: sweep settings, the generator's hookup and level, and the
probe that does not disturb the circuit.

Pure functions over the circuit, its resonance and its stresses; report/procedure.py words
them for the technician. Rules that are the trade's habits rather than derivations are
marked common practice where they are defined.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from sheetgen.engine.resonance import Circuit, Resonance
from sheetgen.engine.stress import Drive, Stress

# Bench generators, analysers and their cables are 50 Ω systems (common practice).
GENERATOR_RESISTANCE_OHM = 50.0
# Highest part voltage for the bench test: small-signal, far inside any part's rating and
# any hazard, and within an analyser input's range (common practice).
TEST_PART_VOLTAGE_PEAK_V = 1.0
# Frequency step at most BW/100, so each half-power point is read to 1 % of the bandwidth.
STEPS_PER_BANDWIDTH = 100
# Receiver (resolution / IF) bandwidth at most a tenth of the circuit's bandwidth, so the
# receiver does not smooth the skirts (common practice).
RECEIVER_BANDWIDTHS_PER_BANDWIDTH = 10
# A probe or fixture resistor at least 100 times the impedance it loads changes the loaded
# Q by about 1 % (common practice).
LOADING_RATIO = 100.0
# A probe may move f0 by at most a tenth of the bandwidth.
PROBE_SHIFT_PER_BANDWIDTH = 0.1
# Input capacitance of the probe put across a tank: an active (FET) probe, about 1 pF
# (common practice; a passive 10:1 probe's 10-15 pF detunes most tanks by far more).
PROBE_CAPACITANCE_F = 1e-12
MAX_POINTS = 10001  # the most points a bench analyser sweeps in one go (common practice)
# Above this level many bench generators run out of output (common practice).
GENERATOR_LEVEL_MAX_DBM = 10.0
HALF_POWER_DB = 10.0 * math.log10(0.5)  # −3.0103 dB


@dataclass(frozen=True)
class SweepSettings:
    """Frequency sweep for a network analyser or a generator and level-reading receiver."""

    start_hz: float
    stop_hz: float
    centre_hz: float
    span_hz: float
    step_hz: float
    points: int
    receiver_bandwidth_hz: float


Hookup = Literal["direct", "series_resistor", "shunt_resistor", "feed_resistor"]


@dataclass(frozen=True)
class BenchDrive:
    """How the 50 Ω generator stands in for the design's source, and at what level.

    `hookup`: direct (Rs is 50 Ω); series_resistor (Rs − 50 Ω in series); shunt_resistor
    (a resistor across the generator's output makes a lower source resistance, Thévenin);
    feed_resistor (a large series resistor makes a current source, Norton).
    """

    scale: float
    part_voltage_peak_v: float
    hookup: Hookup
    fixture_resistance_ohm: float | None
    presented_resistance_ohm: float | None
    generator_emf_rms_v: float
    generator_level_dbm: float


DetectorPlace = Literal["load", "sense_resistor", "tank"]


@dataclass(frozen=True)
class Detector:
    """Where the response is read and what the probe may load it with."""

    place: DetectorPlace
    probe_resistance_min_ohm: float
    probe_capacitance_max_f: float | None
    sense_resistance_max_ohm: float | None


def nice_at_most(value: float, mantissas: tuple[float, ...] = (1.0, 2.0, 5.0)) -> float:
    """The largest m·10^k not above `value`, m from `mantissas` (1-2-5 or 1-3 steps)."""
    return max(c for c in _ladder(value, mantissas) if c <= value * (1 + 1e-12))


def nice_at_least(value: float, mantissas: tuple[float, ...] = (1.0, 2.0, 5.0)) -> float:
    """The smallest m·10^k not below `value`."""
    return min(c for c in _ladder(value, mantissas) if c >= value * (1 - 1e-12))


def _ladder(value: float, mantissas: tuple[float, ...]) -> list[float]:
    if not value > 0 or not math.isfinite(value):
        raise ValueError("a step needs a positive, finite bound")
    decade = math.floor(math.log10(value))
    return [float(f"{m * 10.0 ** k:.6g}") for k in (decade - 1, decade, decade + 1)
            for m in mantissas]


def sweep_settings(start_hz: float, stop_hz: float, bandwidth_hz: float | None) -> SweepSettings:
    """A sweep from start to stop stepped finely enough for the −3 dB points.

    Step: the largest 1-2-5 value at most BW/100 (at most 10001 points, coarser if the span
    needs it); with no half-power points, span/1000. Receiver bandwidth: the largest 1-3
    value at most BW/10 (common practice), or the step when there is no BW.
    """
    span = stop_hz - start_hz
    step = nice_at_most(bandwidth_hz / STEPS_PER_BANDWIDTH if bandwidth_hz else span / 1000.0)
    if span / step + 1 > MAX_POINTS:
        step = nice_at_least(span / (MAX_POINTS - 1))
    points = int(math.ceil(span / step - 1e-9)) + 1
    receiver = nice_at_most(bandwidth_hz / RECEIVER_BANDWIDTHS_PER_BANDWIDTH if bandwidth_hz
                            else step, (1.0, 3.0))
    return SweepSettings(start_hz, stop_hz, 0.5 * (start_hz + stop_hz), span, step, points,
                         receiver)


def dbm_from_emf(emf_rms_v: float, resistance_ohm: float = GENERATOR_RESISTANCE_OHM) -> float:
    """A generator's level setting for an EMF: the power it delivers into a matched load.

    A matched load gets half the EMF, so P = (E/2)²/R and the level is 10·log10(P / 1 mW).
    """
    power_w = (emf_rms_v / 2.0) ** 2 / resistance_ohm
    return 10.0 * math.log10(power_w / 1e-3)


def bench_drive(circuit: Circuit, resonance: Resonance, stress: Stress,
                drive: Drive) -> BenchDrive:
    """The generator's hookup and level for a bench test at small signal.

    Level: the design's drive scaled down (never up) so that the highest part voltage is at
    most TEST_PART_VOLTAGE_PEAK_V; f0, bandwidth and Q do not depend on the level for a
    linear circuit. Hookup, from a 50 Ω generator (common practice):
    Rs > 50 Ω: a series resistor Rs − 50 Ω; Rs < 50 Ω: a shunt R = 50·Rs/(50 − Rs) across
    the output (Thévenin: source resistance Rs, EMF × R/(R + 50)); no Rs, series circuit
    (ideal voltage source): a shunt giving 1/100 of the loop's resistance; no Rs, parallel
    (ideal current source): a feed resistor of 100 × the tank's impedance (Norton).
    """
    highest_v = max(stress.capacitor_voltage_peak_v, stress.inductor_voltage_peak_v)
    scale = min(1.0, TEST_PART_VOLTAGE_PEAK_V / highest_v) if highest_v > 0 else 1.0
    rs = circuit.source_resistance_ohm
    z_peak = resonance.impedance_at_peak_ohm
    series = circuit.topology == "series"
    current = drive.value if drive.kind == "current" else None
    if stress.source_voltage_rms_v is not None:
        emf = stress.source_voltage_rms_v
    elif series:
        emf = current * ((rs or 0.0) + z_peak)  # loop at the maximum is nearly resistive
    elif rs is not None:
        emf = current * rs  # Norton current beside Rs is a Thévenin EMF I·Rs behind Rs
    else:
        emf = None
    r_gen = GENERATOR_RESISTANCE_OHM
    if emf is None:  # parallel tank fed by an ideal current source
        feed = LOADING_RATIO * z_peak
        generator_emf = scale * current * (r_gen + feed)
        hookup, fixture, presented = "feed_resistor", feed, r_gen + feed
    else:
        wanted = rs if rs is not None else z_peak / LOADING_RATIO
        test_emf = scale * emf
        if math.isclose(wanted, r_gen, rel_tol=0.01):
            hookup, fixture, generator_emf = "direct", None, test_emf
        elif wanted > r_gen:
            hookup, fixture, generator_emf = "series_resistor", wanted - r_gen, test_emf
        else:
            shunt = r_gen * wanted / (r_gen - wanted)
            hookup, fixture = "shunt_resistor", shunt
            generator_emf = test_emf * (shunt + r_gen) / shunt
        presented = wanted
    return BenchDrive(scale=scale, part_voltage_peak_v=scale * highest_v, hookup=hookup,
                      fixture_resistance_ohm=fixture, presented_resistance_ohm=presented,
                      generator_emf_rms_v=generator_emf,
                      generator_level_dbm=dbm_from_emf(generator_emf))


def detector(circuit: Circuit, resonance: Resonance) -> Detector:
    """Where to read the response, and the probe that does not disturb it.

    Series: the loop current, as the voltage across the load (or across a sense resistor of
    at most 1/100 of the loop's resistance). Parallel: the tank voltage. The probe's
    resistance is at least 100 × what it is across (common practice). Across a tank, its
    capacitance Cp adds to C and, from f0 = 1/(2π√(LC)), moves f0 by about −Cp/(2C); keeping
    that under a tenth of the bandwidth gives Cp ≤ 0.2·C·BW/f0.
    """
    if circuit.topology == "series":
        if circuit.load_resistance_ohm is not None:
            return Detector("load", LOADING_RATIO * circuit.load_resistance_ohm, None, None)
        loop = resonance.impedance_at_peak_ohm + (circuit.source_resistance_ohm or 0.0)
        sense = loop / LOADING_RATIO
        return Detector("sense_resistor", LOADING_RATIO * sense, None, sense)
    bandwidth = resonance.bandwidth_hz
    probe_c = (2.0 * PROBE_SHIFT_PER_BANDWIDTH * circuit.capacitance_f * bandwidth
               / resonance.f0_hz) if bandwidth else None
    return Detector("tank", LOADING_RATIO * resonance.impedance_at_peak_ohm, probe_c, None)


# --- rework ---------------------------------------------------------------------------------

def f0_with_turns_hz(f0_hz: float, turns: int, new_turns: int) -> float:
    """f0 after rewinding to new_turns: L ∝ N² (AL·N² on a ring; about so on a solenoid of
    the same length), and f0 = 1/(2π√(LC)) ∝ 1/N."""
    return f0_hz * turns / new_turns


def f0_with_capacitance_hz(f0_hz: float, capacitance_f: float, new_capacitance_f: float) -> float:
    """f0 after changing the tank capacitance: f0 ∝ 1/√C (Thomson's formula)."""
    return f0_hz * math.sqrt(capacitance_f / new_capacitance_f)


def adjacent_standard_values(value: float, series: str) -> tuple[float, float]:
    """The standard values of `series` (IEC 60063) just below and just above `value`."""
    from sheetgen.engine.standard_values import series_values
    decade = math.floor(math.log10(value))
    ladder = sorted(float(f"{m * 10.0 ** (decade + shift):.6g}") for shift in (-1, 0, 1)
                    for m in series_values(series))
    below = max(v for v in ladder if v < value * (1 - 1e-9))
    above = min(v for v in ladder if v > value * (1 + 1e-9))
    return below, above
