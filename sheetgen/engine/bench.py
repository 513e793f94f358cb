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

from sheetgen.engine.resonance import Circuit, NoResonanceError, Resonance, analyse
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


PortKind = Literal["direct", "series_resistor", "shunt_resistor", "transformer",
                   "coupling_capacitor", "probe"]

# Fixture resistors: IEC 60063 E96 values at ±1 %, the usual bench stock (common practice);
# run at most at half their rated power (common practice).
FIXTURE_SERIES = "E96"
RESISTOR_POWER_RATINGS_W = (0.25, 0.5, 1.0, 2.0)
FIXTURE_POWER_DERATING = 0.5
# A 50 Ω instrument port within ±5 %: return loss ≥ 32 dB, what an analyser calibrated at
# the fixture's connectors, or a 10 dB attenuator at a port, gives (common practice).
DEFAULT_PORT_TOLERANCE = 0.05
# A port resistance within 1 % of 50 Ω is taken as the port itself, with no resistor.
DIRECT_MATCH = 0.01
# Below 1 Ω a resistor is a current-sense part (metal strip or foil, four terminals), not a
# bench metal-film or chip resistor (common practice): none is prescribed.
FIXTURE_RESISTOR_MIN_OHM = 1.0
# A fixture resistor is taken as a resistor when its own capacitance and lead inductance
# change its impedance by at most 10 % (about 1 dB on the levels the sheet sets) and,
# folded into the bench circuit at the peak, move the peak by at most 5 % of the bandwidth
# and the bandwidth by at most 2 % — small beside windows that carry the parts' tolerances
# (common practice).
PARASITIC_IMPEDANCE_CHANGE = 0.10
PARASITIC_PEAK_SHIFT_BANDWIDTHS = 0.05
PARASITIC_BANDWIDTH_CHANGE = 0.02
# A current (or voltage) transformer's magnetising reactance at the lowest test frequency:
# at least 10 × the 50 Ω port it carries, so it shunts the port by under 1 % in power
# (common practice).
MAGNETISING_REACTANCE_RATIO = 10.0
# An active (FET) probe: 1 MΩ ∥ 1 pF input, output ÷10 into 50 Ω (common practice, from
# memory); its input resistance within ±10 % (common practice).
PROBE_RESISTANCE_OHM = 1e6
PROBE_CAPACITANCE_F = 1e-12
PROBE_GAIN = 0.1
PROBE_TOLERANCE = 0.10
# Coupling capacitors: class 1 (C0G) ceramic in IEC 60063 E12 values, the usual small-value
# stock (common practice).
COUPLING_SERIES = "E12"
# The receiver reads at least 20 dB above its noise floor at the half-power points, so a
# −3 dB reading is good to about ±0.1 dB (common practice).
NOISE_MARGIN_DB = 20.0
# A bench receiver's noise floor without a preamplifier: −130 dBm per hertz of its
# resolution bandwidth, i.e. −100 dBm in 1 kHz (common practice); test.receiver_noise_floor.
DEFAULT_NOISE_FLOOR_DBM_PER_HZ = -130.0


@dataclass(frozen=True)
class ResistorStyle:
    """A kind of fixture resistor and its parasitics (common practice, from memory)."""

    name: str
    shunt_capacitance_f: float
    lead_inductance_h: float
    power_max_w: float | None  # its rating, when smaller than the usual sizes


# A leaded 0.25 W metal-film resistor with its leads cut short: about 0.2 pF across it and
# 5 to 10 nH in its leads (10 nH taken); a 0603 chip resistor: about 0.05 pF and 1 nH with
# its pads, rated 0.1 W (common practice, from memory).
LEADED = ResistorStyle("metal film, leads cut short", 0.2e-12, 10e-9, None)
CHIP = ResistorStyle("0603 chip, soldered flat to the fixture's pads", 0.05e-12, 1e-9, 0.1)
RESISTOR_STYLES = (LEADED, CHIP)


def resistor_impedance(resistance_ohm: float, style: ResistorStyle, f_hz: float) -> complex:
    """A resistor with its parasitics: jωLs + R ∥ 1/(jωCp) (the usual lumped model)."""
    omega = 2.0 * math.pi * f_hz
    return (1j * omega * style.lead_inductance_h
            + resistance_ohm / (1.0 + 1j * omega * resistance_ohm * style.shunt_capacitance_f))


@dataclass(frozen=True)
class PortHookup:
    """A 50 Ω instrument port made into the resistance the circuit needs.

    direct: the port itself; series_resistor: R in series with the port (R + 50 Ω);
    shunt_resistor: R across the port (R ∥ 50 Ω); transformer: the port through an ideal
    transformer of `turns` = (unit side, port side), presenting 50 Ω·(unit/port)² (a current
    transformer when the unit side is the one turn of the circuit's own wire);
    coupling_capacitor: the port through `capacitance_f` in series (presented_ohm is its
    parallel resistance at the peak, the engine works the exact series RC);
    probe: an active probe of PROBE_RESISTANCE_OHM ∥ `capacitance_f` across the tank.
    `presented_ohm` (what the circuit sees, nominal) differs a little from `wanted_ohm`;
    `band` is its relative tolerance.
    """

    kind: PortKind
    wanted_ohm: float
    resistor_ohm: float | None
    presented_ohm: float
    band: float
    resistor_tolerance: float
    style: ResistorStyle | None = None
    turns: tuple[int, int] | None = None
    capacitance_f: float | None = None
    magnetising_inductance_min_h: float | None = None  # transformer, port side

    @property
    def is_resistor(self) -> bool:
        return self.kind in ("series_resistor", "shunt_resistor")

    def power_rating_w(self, needed_rating_w: float | None) -> float | None:
        """The resistor's rating: its style's own (a chip's) or the usual size needed."""
        if self.style is not None and self.style.power_max_w is not None:
            return self.style.power_max_w
        return needed_rating_w


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
                          (r * t + port_ohm * port_tolerance) / (r + port_ohm), t, LEADED)
    r = nearest_standard(port_ohm * wanted_ohm / (port_ohm - wanted_ohm), FIXTURE_SERIES)
    return PortHookup("shunt_resistor", wanted_ohm, r, r * port_ohm / (r + port_ohm),
                      (port_ohm * t + r * port_tolerance) / (r + port_ohm), t, LEADED)


def transformer_hookup(wanted_ohm: float, f_hz: float,
                       port_tolerance: float = DEFAULT_PORT_TOLERANCE,
                       port_ohm: float = GENERATOR_RESISTANCE_OHM) -> PortHookup:
    """The port through an ideal transformer of whole turns, one turn on the lower-impedance
    side: it presents port_ohm·(n_unit/n_port)² (the ideal transformer's impedance ratio),
    N the whole number nearest in ratio to √(wanted/port_ohm). The port side needs a
    magnetising inductance of at least MAGNETISING_REACTANCE_RATIO·port_ohm/ω."""
    ratio = math.sqrt(wanted_ohm / port_ohm)
    step = ratio if ratio >= 1.0 else 1.0 / ratio
    n = max(2, min((math.floor(step), math.ceil(step)),
                   key=lambda k: abs(math.log(max(k, 1) / step))))
    turns = (n, 1) if ratio >= 1.0 else (1, n)
    presented = port_ohm * (turns[0] / turns[1]) ** 2
    l_min = MAGNETISING_REACTANCE_RATIO * port_ohm / (2.0 * math.pi * f_hz)
    return PortHookup("transformer", wanted_ohm, None, presented, port_tolerance, 0.0,
                      turns=turns, magnetising_inductance_min_h=l_min)


def coupling_capacitor_hookup(wanted_ohm: float, f_hz: float,
                              port_tolerance: float = DEFAULT_PORT_TOLERANCE,
                              port_ohm: float = GENERATOR_RESISTANCE_OHM) -> PortHookup:
    """The port through a small series capacitor Cc: at ω the series Rp + 1/(jωCc) is the
    parallel R = Rp(1 + Qc²) with Qc = 1/(ωCc·Rp) (series-to-parallel conversion), so
    Cc = 1/(ω·Rp·√(wanted/Rp − 1)), the nearest COUPLING_SERIES value."""
    omega = 2.0 * math.pi * f_hz
    qc = math.sqrt(max(wanted_ohm / port_ohm - 1.0, 1e-12))
    cc = nearest_standard(1.0 / (omega * port_ohm * qc), COUPLING_SERIES)
    qc_built = 1.0 / (omega * cc * port_ohm)
    return PortHookup("coupling_capacitor", wanted_ohm, None, port_ohm * (1.0 + qc_built ** 2),
                      port_tolerance, 0.0, capacitance_f=cc)


def probe_hookup() -> PortHookup:
    """An active probe across the tank: its input resistance is the tank's load, its input
    capacitance is added to the tank's."""
    return PortHookup("probe", PROBE_RESISTANCE_OHM, None, PROBE_RESISTANCE_OHM,
                      PROBE_TOLERANCE, 0.0, capacitance_f=PROBE_CAPACITANCE_F)


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
    a series circuit with no load reads its current through a small resistance made from
    the port; pickup: a parallel tank with no load reads its voltage through a large
    resistance or a probe. In every case the port is part of the circuit the windows are for.
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
    source and load, nominal. A coupling capacitor stays a series RC from the 50 Ω port
    (exact at every frequency); a probe's input capacitance is added to the tank's."""
    coupled = source.kind == "coupling_capacitor"
    added = found.hookup.capacitance_f if found.hookup.kind == "probe" else 0.0
    return replace(circuit,
                   source_resistance_ohm=(GENERATOR_RESISTANCE_OHM if coupled
                                          else source.presented_ohm),
                   source_capacitance_f=source.capacitance_f if coupled else None,
                   load_resistance_ohm=found.presented_ohm,
                   capacitance_f=circuit.capacitance_f + added)


@dataclass(frozen=True)
class ParasiticEffect:
    """What a fixture resistor's own capacitance and lead inductance do: |Z/R − 1| of the
    resistor itself, the bench response's peak shift in bandwidths and its bandwidth's
    relative change."""

    impedance_change: float
    peak_shift_bandwidths: float
    bandwidth_change: float

    @property
    def negligible(self) -> bool:
        return (self.impedance_change <= PARASITIC_IMPEDANCE_CHANGE
                and abs(self.peak_shift_bandwidths) <= PARASITIC_PEAK_SHIFT_BANDWIDTHS
                and abs(self.bandwidth_change) <= PARASITIC_BANDWIDTH_CHANGE)


def parasitic_effect(built: Circuit, response: Resonance, hookup: PortHookup, side: str,
                     ratio: float = 1.0) -> ParasiticEffect | None:
    """The effect of `hookup`'s resistor parasitics (None for a hookup with no resistor or
    a response with no bandwidth): its port's complex impedance at the peak (the resistor
    by resistor_impedance, with the 50 Ω port in series or across; × `ratio` through a link
    or tap) folded into the circuit exactly at that frequency — series: its resistance and
    its reactance as a change of L; parallel: the parallel equivalent, its susceptance as a
    change of C — and analysed again."""
    if not hookup.is_resistor or response.bandwidth_hz is None:
        return None
    f = response.f_peak_hz
    omega = 2.0 * math.pi * f
    z_r = resistor_impedance(hookup.resistor_ohm, hookup.style, f)
    port = GENERATOR_RESISTANCE_OHM
    z = (z_r + port if hookup.kind == "series_resistor" else z_r * port / (z_r + port)) * ratio
    if built.topology == "series":
        resistance, changed = z.real, replace(built, inductance_h=built.inductance_h
                                              + z.imag / omega)
    else:
        y = 1.0 / z
        resistance, changed = 1.0 / y.real, replace(built, capacitance_f=built.capacitance_f
                                                    + y.imag / omega)
    changed = replace(changed, **{f"{side}_resistance_ohm": resistance})
    change = abs(z_r / hookup.resistor_ohm - 1.0)
    if not (changed.inductance_h > 0 and changed.capacitance_f > 0 and resistance > 0):
        return ParasiticEffect(change, math.inf, math.inf)  # swamps the part it joins
    try:
        moved = analyse(changed)
    except NoResonanceError:
        return ParasiticEffect(change, math.inf, math.inf)
    if moved.bandwidth_hz is None:
        return ParasiticEffect(change, math.inf, math.inf)
    return ParasiticEffect(change, (moved.f_peak_hz - f) / response.bandwidth_hz,
                           moved.bandwidth_hz / response.bandwidth_hz - 1.0)


@dataclass(frozen=True)
class BenchDrive:
    """The generator's level for the small-signal test, and what it puts on the parts.

    `generator_emf_rms_v` is the generator's own EMF (before a shunt resistor or a
    transformer); `part_voltage_peak_v` the highest part voltage on the bench circuit at
    that level; `received_dbm` what the receiver reads at the peak at that level (or at
    GENERATOR_LEVEL_MAX_DBM when the level is beyond it).
    """

    part_voltage_peak_v: float
    generator_emf_rms_v: float
    generator_level_dbm: float
    source_resistor_w: float | None  # dissipation bound of the fixture resistors
    receiver_resistor_w: float | None
    received_dbm: float = math.nan

    @property
    def source_resistor_rating_w(self) -> float | None:
        return None if self.source_resistor_w is None else power_rating_w(self.source_resistor_w)

    @property
    def receiver_resistor_rating_w(self) -> float | None:
        return (None if self.receiver_resistor_w is None
                else power_rating_w(self.receiver_resistor_w))


def _stress_per_volt(bench: Circuit, f_hz: float) -> Stress:
    """part_stress per volt of EMF; a coupling capacitor's series RC is replaced, at f_hz
    only, by its exact parallel equivalent Yp = 1/(Rs + 1/(jωCc)) (Rp = 1/Re Yp across, Im
    Yp/ω added to C) fed by the same Norton current E·|Yp|."""
    if bench.source_capacitance_f is None:
        return part_stress(bench, Drive("voltage", 1.0), f_hz)
    omega = 2.0 * math.pi * f_hz
    y = 1.0 / (bench.source_resistance_ohm + 1.0 / (1j * omega * bench.source_capacitance_f))
    rp = 1.0 / y.real
    equivalent = replace(bench, source_resistance_ohm=rp, source_capacitance_f=None,
                         capacitance_f=bench.capacitance_f + y.imag / omega)
    return part_stress(equivalent, Drive("voltage", rp * abs(y)), f_hz)


def bench_drive(bench: Circuit, f_peak_hz: float, design_stress: Stress,
                source: PortHookup, found: Receiver) -> BenchDrive:
    """The generator level that puts at most TEST_PART_VOLTAGE_PEAK_V on any part of the
    bench circuit (never more than the design's own drive does); linear circuit, so f0,
    bandwidth and Q do not depend on the level.

    The EMF behind the presented source resistance follows from the bench circuit's part
    voltages per volt of EMF (part_stress); a shunt resistor R divides the generator's EMF
    by R/(R + 50 Ω) (Thévenin), a transformer multiplies it by n_unit/n_port. Fixture
    dissipation bounds: a series resistor R at most (E/Rs)²·R, a shunt at most E²/R; at the
    receiver, its share of the load's power. The receiver's power: its share of the load's
    (a resistor's divider; all of it through a transformer or directly); through a probe,
    (gain·V)²/50 Ω with V the tank voltage.
    """
    design_high = max(design_stress.capacitor_voltage_peak_v,
                      design_stress.inductor_voltage_peak_v)
    target = min(TEST_PART_VOLTAGE_PEAK_V, design_high) if design_high > 0 else \
        TEST_PART_VOLTAGE_PEAK_V
    unit = _stress_per_volt(bench, f_peak_hz)
    per_volt = max(unit.capacitor_voltage_peak_v, unit.inductor_voltage_peak_v)
    emf = target / per_volt
    r_port = GENERATOR_RESISTANCE_OHM
    generator_emf = emf
    if source.kind == "shunt_resistor":
        generator_emf = emf * (source.resistor_ohm + r_port) / source.resistor_ohm
    elif source.kind == "transformer":
        generator_emf = emf * source.turns[1] / source.turns[0]
    source_w = None
    if source.kind == "series_resistor":
        source_w = (emf / source.presented_ohm) ** 2 * source.resistor_ohm
    elif source.kind == "shunt_resistor":
        source_w = emf ** 2 / source.resistor_ohm
    load_w = unit.load_power_w * emf ** 2  # P ∝ E²
    receiver_w = None
    port = found.hookup
    received_w = load_w
    if port.kind == "series_resistor":
        receiver_w = load_w * port.resistor_ohm / port.presented_ohm
        received_w = load_w - receiver_w
    elif port.kind == "shunt_resistor":
        receiver_w = load_w * port.presented_ohm / port.resistor_ohm
        received_w = load_w - receiver_w
    elif port.kind == "probe":
        received_w = PROBE_GAIN ** 2 * load_w * port.presented_ohm / r_port
    level = dbm_from_emf(generator_emf)
    received = (10.0 * math.log10(received_w / 1e-3) - max(0.0, level - GENERATOR_LEVEL_MAX_DBM)
                if received_w > 0 else -math.inf)
    return BenchDrive(part_voltage_peak_v=target,
                      generator_emf_rms_v=generator_emf,
                      generator_level_dbm=level,
                      source_resistor_w=source_w, receiver_resistor_w=receiver_w,
                      received_dbm=received)


def receiver_bandwidth_hz(bandwidth_hz: float | None, step_hz: float) -> float:
    """The receiver's resolution bandwidth sweep_settings sets: the largest 1-3 value at most
    BW/10 (common practice), or the step when there is no bandwidth."""
    return nice_at_most(bandwidth_hz / RECEIVER_BANDWIDTHS_PER_BANDWIDTH if bandwidth_hz
                        else step_hz, (1.0, 3.0))


@dataclass(frozen=True)
class BenchSetup:
    """The whole small-signal test set-up: the fixture, the circuit it builds and its
    response (what the bench windows are for), the generator's level, and how far above the
    receiver's noise floor the half-power points read."""

    source: PortHookup
    receiver: Receiver
    circuit: Circuit
    resonance: Resonance
    drive: BenchDrive
    port_tolerance: float
    noise_floor_dbm: float = math.nan  # in the receiver's bandwidth
    source_effect: ParasiticEffect | None = None  # of the fixture resistors' parasitics
    receiver_effect: ParasiticEffect | None = None

    @property
    def half_power_margin_db(self) -> float:
        """The −3 dB points' reading above the noise floor, dB."""
        return self.drive.received_dbm + HALF_POWER_DB - self.noise_floor_dbm

    @property
    def readable(self) -> bool:
        return self.half_power_margin_db >= NOISE_MARGIN_DB


def _chip_or_leaded(built: Circuit, response: Resonance, hookup: PortHookup, side: str,
                    ratio: float = 1.0) -> tuple[PortHookup, ParasiticEffect | None]:
    """The resistor style whose parasitics are negligible on `built` (leaded first, then a
    chip), with its effect; the hookup unchanged (and the chip's effect) when none is."""
    if not hookup.is_resistor:
        return hookup, None
    effect = None
    for style in RESISTOR_STYLES:
        candidate = replace(hookup, style=style)
        effect = parasitic_effect(built, response, candidate, side, ratio)
        if effect is None or effect.negligible:
            return candidate, effect
    return replace(hookup, style=CHIP), effect


def _unusable(hookup: PortHookup, effect: ParasiticEffect | None) -> bool:
    return hookup.is_resistor and (hookup.resistor_ohm < FIXTURE_RESISTOR_MIN_OHM
                                   or (effect is not None and not effect.negligible))


def _alternative(circuit: Circuit, hookup: PortHookup, side: str, place: str,
                 f_hz: float, port_tolerance: float) -> PortHookup | None:
    """What a technician fits where no resistor will do: a series loop takes a transformer
    (a current transformer for a small resistance); a parallel tank is fed through a small
    coupling capacitor and read by an active probe (no load) or a transformer (a small
    load). None where none fits."""
    wanted = hookup.wanted_ohm
    if circuit.topology == "series" or wanted < GENERATOR_RESISTANCE_OHM:
        return transformer_hookup(wanted, f_hz, port_tolerance)
    if side == "source":
        return coupling_capacitor_hookup(wanted, f_hz, port_tolerance)
    if place == "pickup":
        return probe_hookup()
    return None


def bench_setup(circuit: Circuit, resonance: Resonance, stress: Stress, *,
                coupled: Literal["link", "tap"] | None = None,
                port_resistor_ohm: float | None = None,
                port_tolerance: float = DEFAULT_PORT_TOLERANCE,
                noise_floor_dbm_per_hz: float = DEFAULT_NOISE_FLOOR_DBM_PER_HZ) -> BenchSetup:
    """The fixture for `circuit` (source_hookup, receiver), the bench circuit it builds,
    analysed exactly (resonance.analyse), and the test level (bench_drive).

    Each fixture resistor must behave as one at the test frequency (parasitic_effect, a
    leaded part or else a chip, and no sub-ohm part) and the receiver must read the −3 dB
    points NOISE_MARGIN_DB above its floor; where not, the hookup is replaced by
    _alternative's, and the bench circuit is built and analysed again with it.
    """
    f = resonance.f_peak_hz
    source = source_hookup(circuit, resonance, port_tolerance)
    found = receiver(circuit, resonance, coupled=coupled, port_resistor_ohm=port_resistor_ohm,
                     port_tolerance=port_tolerance)
    built = bench_circuit(circuit, source, found)
    response = analyse(built)
    source, source_effect = _chip_or_leaded(built, response, source, "source")
    hookup, receiver_effect = _chip_or_leaded(built, response, found.hookup, "load",
                                              found.ratio)
    found = replace(found, hookup=hookup)
    if _unusable(source, source_effect):
        source = _alternative(circuit, source, "source", found.place, f, port_tolerance) \
            or source
    if _unusable(found.hookup, receiver_effect):
        other = _alternative(circuit, found.hookup, "load", found.place, f, port_tolerance)
        found = replace(found, hookup=other) if other else found
    setup = _analysed(circuit, stress, source, found, port_tolerance, noise_floor_dbm_per_hz)
    if not setup.readable and found.hookup.is_resistor and found.place in (
            "pickup", "sense_resistor"):
        other = _alternative(circuit, found.hookup, "load", found.place, f, port_tolerance)
        if other is not None:
            setup = _analysed(circuit, stress, source, replace(found, hookup=other),
                              port_tolerance, noise_floor_dbm_per_hz)
    return replace(setup,
                   source_effect=source_effect if setup.source.is_resistor else None,
                   receiver_effect=(receiver_effect if setup.receiver.hookup.is_resistor
                                    else None))


def _analysed(circuit: Circuit, stress: Stress, source: PortHookup, found: Receiver,
              port_tolerance: float, noise_floor_dbm_per_hz: float) -> BenchSetup:
    built = bench_circuit(circuit, source, found)
    response = analyse(built)
    drive = bench_drive(built, response.f_peak_hz, stress, source, found)
    span = 8.0 * (response.bandwidth_hz or response.f0_hz / 2.0)
    rbw = receiver_bandwidth_hz(response.bandwidth_hz, span / 1000.0)
    return BenchSetup(source, found, built, response, drive, port_tolerance,
                      noise_floor_dbm_per_hz + 10.0 * math.log10(rbw))


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
