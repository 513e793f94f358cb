"""The bench test's numbers: sweep settings, the fixture that makes the 50 Ω generator and
receiver into the circuit's source and load, the circuit so built, and the test level.

Pure functions over the circuit, its resonance and its stresses; report/procedure.py words
them for the technician. Rules that are the trade's habits rather than derivations are
marked common practice where they are defined.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Literal

from sheetgen.engine.resonance import Circuit, Resonance, analyse
from sheetgen.engine.standard_values import SERIES_TOLERANCE, nearest_standard, series_values
from sheetgen.engine.stress import Drive, Stress, part_stress

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
# A fixture resistance 100 times (or a hundredth of) the impedance it loads changes the
# loaded Q by about 1 % (common practice).
LOADING_RATIO = 100.0
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


PortKind = Literal["direct", "series_resistor", "shunt_resistor"]

# Fixture resistors: IEC 60063 E96 values at ±1 %, metal film, the usual bench stock
# (common practice); run at most at half their rated power (common practice).
FIXTURE_SERIES = "E96"
RESISTOR_POWER_RATINGS_W = (0.25, 0.5, 1.0, 2.0)
FIXTURE_POWER_DERATING = 0.5
# A 50 Ω instrument port within ±5 %: return loss ≥ 32 dB, what an analyser calibrated at
# the fixture's connectors, or a 10 dB attenuator at a port, gives (common practice).
DEFAULT_PORT_TOLERANCE = 0.05
# A port resistance within 1 % of 50 Ω is taken as the port itself, with no resistor.
DIRECT_MATCH = 0.01


@dataclass(frozen=True)
class PortHookup:
    """A 50 Ω instrument port made into the resistance the circuit needs.

    direct: the port itself; series_resistor: R in series with the port (R + 50 Ω);
    shunt_resistor: R across the port (R ∥ 50 Ω). `resistor_ohm` is an E96 value, so
    `presented_ohm` (what the circuit sees, nominal) differs a little from `wanted_ohm`;
    `band` is its relative tolerance from the resistor's ±1 % and the port's tolerance.
    """

    kind: PortKind
    wanted_ohm: float
    resistor_ohm: float | None
    presented_ohm: float
    band: float
    resistor_tolerance: float


def port_hookup(wanted_ohm: float, port_tolerance: float = DEFAULT_PORT_TOLERANCE,
                port_ohm: float = GENERATOR_RESISTANCE_OHM) -> PortHookup:
    """The nearest standard resistor that makes a 50 Ω port present `wanted_ohm`.

    Series: R + Rp, tolerance band (R·t + Rp·p)/(R + Rp); shunt: R·Rp/(R + Rp), band
    (Rp·t + R·p)/(R + Rp) (each term the part's share of the relative change, to first
    order, added as a worst case).
    """
    if not wanted_ohm > 0 or not math.isfinite(wanted_ohm):
        raise ValueError("a port needs a positive, finite resistance")
    t = SERIES_TOLERANCE[FIXTURE_SERIES]
    if abs(wanted_ohm / port_ohm - 1.0) <= DIRECT_MATCH:
        return PortHookup("direct", wanted_ohm, None, port_ohm, port_tolerance, t)
    if wanted_ohm > port_ohm:
        r = nearest_standard(wanted_ohm - port_ohm, FIXTURE_SERIES)
        return PortHookup("series_resistor", wanted_ohm, r, r + port_ohm,
                          (r * t + port_ohm * port_tolerance) / (r + port_ohm), t)
    r = nearest_standard(port_ohm * wanted_ohm / (port_ohm - wanted_ohm), FIXTURE_SERIES)
    return PortHookup("shunt_resistor", wanted_ohm, r, r * port_ohm / (r + port_ohm),
                      (port_ohm * t + r * port_tolerance) / (r + port_ohm), t)


def power_rating_w(dissipation_w: float) -> float:
    """The smallest usual resistor rating that carries `dissipation_w` at the derating
    (beyond the usual sizes, the next 1-2-5 value of what is needed)."""
    needed = dissipation_w / FIXTURE_POWER_DERATING
    fitting = [w for w in RESISTOR_POWER_RATINGS_W if w >= needed]
    return fitting[0] if fitting else nice_at_least(needed)


ReceiverPlace = Literal["load", "sense_resistor", "link", "tap", "pickup"]


@dataclass(frozen=True)
class Receiver:
    """Where the receiver's 50 Ω input joins the circuit, and what the circuit sees there.

    load: the receiver is the load (through its hookup); link / tap: it is the load on the
    coil's link or tap, seen across the tank multiplied by `ratio` = (N/M)²; sense_resistor:
    a series circuit with no load reads its current across a small resistor made from the
    port; pickup: a parallel tank with no load reads its voltage through a large resistor
    into the port. In every case the port is part of the circuit the windows are for.
    """

    place: ReceiverPlace
    hookup: PortHookup
    ratio: float = 1.0

    @property
    def presented_ohm(self) -> float:
        """The resistance the tank (or loop) sees from the receiver's side, nominal."""
        return self.hookup.presented_ohm * self.ratio


def receiver(circuit: Circuit, resonance: Resonance, *, coupled: Literal["link", "tap"] | None,
             port_resistor_ohm: float | None,
             port_tolerance: float = DEFAULT_PORT_TOLERANCE) -> Receiver:
    """The receiver's place. A load (or a link's or tap's load resistor,
    `port_resistor_ohm`, presenting circuit.load_resistance_ohm across the tank) is made
    from the receiver's port; with none, a series circuit gets a sense resistance of 1/100
    of its loop resistance and a parallel tank a pickup of 100 × its impedance, each
    changing the loaded Q by about 1 % (common practice) — and included exactly.
    """
    load = circuit.load_resistance_ohm
    if load is not None:
        at_port = port_resistor_ohm if coupled and port_resistor_ohm else load
        return Receiver(coupled or "load", port_hookup(at_port, port_tolerance),
                        load / at_port)
    if circuit.topology == "series":
        loop = resonance.impedance_at_peak_ohm + (circuit.source_resistance_ohm or 0.0)
        return Receiver("sense_resistor", port_hookup(loop / LOADING_RATIO, port_tolerance))
    return Receiver("pickup", port_hookup(LOADING_RATIO * resonance.impedance_at_peak_ohm,
                                          port_tolerance))


def source_hookup(circuit: Circuit, resonance: Resonance,
                  port_tolerance: float = DEFAULT_PORT_TOLERANCE) -> PortHookup:
    """The generator's hookup: the design's Rs; with an ideal source, a series circuit gets
    a source of 1/100 of its loop resistance (Thévenin) and a parallel tank a feed
    resistance of 100 × its impedance (Norton), each within about 1 % of ideal (common
    practice)."""
    rs = circuit.source_resistance_ohm
    if rs is not None:
        return port_hookup(rs, port_tolerance)
    z_peak = resonance.impedance_at_peak_ohm
    wanted = (z_peak / LOADING_RATIO if circuit.topology == "series"
              else LOADING_RATIO * z_peak)
    return port_hookup(wanted, port_tolerance)


def bench_circuit(circuit: Circuit, source: PortHookup, found: Receiver) -> Circuit:
    """The circuit as the bench test builds it: the design's L and C with the fixture's
    source and load resistances, nominal."""
    return replace(circuit, source_resistance_ohm=source.presented_ohm,
                   load_resistance_ohm=found.presented_ohm)


@dataclass(frozen=True)
class BenchDrive:
    """The generator's level for the small-signal test, and what it puts on the parts.

    `generator_emf_rms_v` is the generator's own EMF (before a shunt resistor);
    `part_voltage_peak_v` the highest part voltage on the bench circuit at that level.
    """

    part_voltage_peak_v: float
    generator_emf_rms_v: float
    generator_level_dbm: float
    source_resistor_w: float | None  # dissipation bound of the fixture resistors
    receiver_resistor_w: float | None

    @property
    def source_resistor_rating_w(self) -> float | None:
        return None if self.source_resistor_w is None else power_rating_w(self.source_resistor_w)

    @property
    def receiver_resistor_rating_w(self) -> float | None:
        return (None if self.receiver_resistor_w is None
                else power_rating_w(self.receiver_resistor_w))


def bench_drive(bench: Circuit, f_peak_hz: float, design_stress: Stress,
                source: PortHookup, found: Receiver) -> BenchDrive:
    """The generator level that puts at most TEST_PART_VOLTAGE_PEAK_V on any part of the
    bench circuit (never more than the design's own drive does); linear circuit, so f0,
    bandwidth and Q do not depend on the level.

    The EMF behind the presented source resistance follows from the bench circuit's part
    voltages per volt of EMF (part_stress); a shunt resistor R divides the generator's EMF
    by R/(R + 50 Ω) (Thévenin). Fixture dissipation bounds: a series resistor R at most
    (E/Rs)²·R, a shunt at most E²/R; at the receiver, its share of the load's power.
    """
    design_high = max(design_stress.capacitor_voltage_peak_v,
                      design_stress.inductor_voltage_peak_v)
    target = min(TEST_PART_VOLTAGE_PEAK_V, design_high) if design_high > 0 else \
        TEST_PART_VOLTAGE_PEAK_V
    unit = part_stress(bench, Drive("voltage", 1.0), f_peak_hz)
    per_volt = max(unit.capacitor_voltage_peak_v, unit.inductor_voltage_peak_v)
    emf = target / per_volt
    r_port = GENERATOR_RESISTANCE_OHM
    generator_emf = (emf * (source.resistor_ohm + r_port) / source.resistor_ohm
                     if source.kind == "shunt_resistor" else emf)
    source_w = None
    if source.kind == "series_resistor":
        source_w = (emf / source.presented_ohm) ** 2 * source.resistor_ohm
    elif source.kind == "shunt_resistor":
        source_w = emf ** 2 / source.resistor_ohm
    load_w = unit.load_power_w * emf ** 2  # P ∝ E²
    receiver_w = None
    port = found.hookup
    if port.kind == "series_resistor":
        receiver_w = load_w * port.resistor_ohm / port.presented_ohm
    elif port.kind == "shunt_resistor":
        receiver_w = load_w * port.presented_ohm / port.resistor_ohm
    return BenchDrive(part_voltage_peak_v=target,
                      generator_emf_rms_v=generator_emf,
                      generator_level_dbm=dbm_from_emf(generator_emf),
                      source_resistor_w=source_w, receiver_resistor_w=receiver_w)


@dataclass(frozen=True)
class BenchSetup:
    """The whole small-signal test set-up: the fixture, the circuit it builds and its
    response (what the bench windows are for), and the generator's level."""

    source: PortHookup
    receiver: Receiver
    circuit: Circuit
    resonance: Resonance
    drive: BenchDrive
    port_tolerance: float


def bench_setup(circuit: Circuit, resonance: Resonance, stress: Stress, *,
                coupled: Literal["link", "tap"] | None = None,
                port_resistor_ohm: float | None = None,
                port_tolerance: float = DEFAULT_PORT_TOLERANCE) -> BenchSetup:
    """The fixture for `circuit` (source_hookup, receiver), the bench circuit it builds,
    analysed exactly (resonance.analyse), and the test level (bench_drive)."""
    source = source_hookup(circuit, resonance, port_tolerance)
    found = receiver(circuit, resonance, coupled=coupled, port_resistor_ohm=port_resistor_ohm,
                     port_tolerance=port_tolerance)
    built = bench_circuit(circuit, source, found)
    response = analyse(built)
    drive = bench_drive(built, response.f_peak_hz, stress, source, found)
    return BenchSetup(source, found, built, response, drive, port_tolerance)


# LCR meters: their usual test signal (common practice); a class 1 ceramic capacitor is
# measured at 1 MHz up to 1 nF and at 1 kHz above (IEC 60384-1, from memory).
LCR_TEST_LEVEL_RMS_V = 1.0
CAPACITOR_MEASURING_LIMIT_F = 1e-9


def capacitor_measuring_frequency_hz(capacitance_f: float) -> float:
    """The LCR meter's frequency for a capacitor of `capacitance_f` (rule above)."""
    return 1e6 if capacitance_f <= CAPACITOR_MEASURING_LIMIT_F else 1e3


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
    decade = math.floor(math.log10(value))
    ladder = sorted(float(f"{m * 10.0 ** (decade + shift):.6g}") for shift in (-1, 0, 1)
                    for m in series_values(series))
    below = max(v for v in ladder if v < value * (1 - 1e-9))
    above = min(v for v in ladder if v > value * (1 + 1e-9))
    return below, above
