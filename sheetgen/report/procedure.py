"""Design → the bench test: fixture, instrument settings, numbered steps and the record.

Pure: reads a Design, returns frozen data (text already worded for the technician), no
I/O, no reportlab. The rules that turn the design into settings are stated where they are
used; those that are the trade's habits rather than derivations are marked common practice.
The names of the record's fields are stable (work-order systems read the filled form) and
listed in FORM_FIELD_NAMES.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from sheetgen.design.records import Design
from sheetgen.quantities import format_number
from sheetgen.report.formatting import quantity_text, range_text, signed, tolerance_text
from sheetgen.report.winding import measuring_frequency_hz

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
MAX_POINTS = 10001
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


@dataclass(frozen=True)
class Detector:
    """Where the response is read and what the probe may load it with."""

    across: str
    probe_resistance_min_ohm: float
    probe_capacitance_max_f: float | None
    sense_resistance_max_ohm: float | None


@dataclass(frozen=True)
class Measurement:
    """One measured value of the record: its form field, its verdict boxes and its label."""

    key: str
    field: str
    verdict: str | None
    label: str
    unit: str


@dataclass(frozen=True)
class RecordRow:
    """A measurement with the value the design expects and its pass window, formatted."""

    measurement: Measurement
    expected: str
    limits: str = "—"


@dataclass(frozen=True)
class Step:
    """One numbered step: what to do, the settings it needs and the fields it fills."""

    number: int
    title: str
    text: str
    settings: tuple[tuple[str, str], ...] = ()
    records: tuple[str, ...] = ()


@dataclass(frozen=True)
class Procedure:
    """The whole bench test of one design."""

    sweep: SweepSettings
    drive: BenchDrive
    detector: Detector
    steps: tuple[Step, ...]
    record: tuple[RecordRow, ...]


MEASUREMENTS: tuple[Measurement, ...] = (
    Measurement("inductance", "measured.inductance_h", "verdict.inductance",
                "Inductance of L1", "H"),
    Measurement("capacitance", "measured.capacitance_f", "verdict.capacitance",
                "Capacitance of the fixed part(s)", "F"),
    Measurement("f0", "measured.f0_hz", "verdict.f0", "Frequency of the response maximum", "Hz"),
    Measurement("f_low", "measured.f_low_hz", "verdict.f_low",
                "Lower half-power (−3 dB) point", "Hz"),
    Measurement("f_high", "measured.f_high_hz", "verdict.f_high",
                "Upper half-power (−3 dB) point", "Hz"),
    Measurement("bandwidth", "measured.bandwidth_hz", "verdict.bandwidth",
                "Bandwidth (−3 dB), upper − lower", "Hz"),
    Measurement("q_loaded", "measured.q_loaded", "verdict.q_loaded",
                "Loaded Q, f0 / bandwidth", ""),
)
OVERALL_VERDICT = "verdict.overall"
RECORD_TEXT_FIELDS = ("record.technician", "record.date", "record.instruments",
                      "record.remarks")
VERDICT_CHOICES = ("pass", "fail")
FORM_FIELD_NAMES: tuple[str, ...] = (
    tuple(m.field for m in MEASUREMENTS)
    + tuple(f"{v}.{choice}" for v in [m.verdict for m in MEASUREMENTS if m.verdict]
            + [OVERALL_VERDICT] for choice in VERDICT_CHOICES)
    + RECORD_TEXT_FIELDS
)


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


def sweep_settings(design: Design) -> SweepSettings:
    """The sweep of the design's own response plot, stepped finely enough for the −3 dB points.

    Start and stop are the design's sweep range (the plot's), so the screen and the sheet
    agree. Step: the largest 1-2-5 value at most BW/100 (at most 10001 points, coarser if
    the span needs it); with no half-power points, span/1000. Receiver bandwidth: the
    largest 1-3 value at most BW/10 (common practice), or the step when there is no BW.
    """
    start, stop = float(design.sweep.f_hz[0]), float(design.sweep.f_hz[-1])
    span = stop - start
    bandwidth = design.resonance.bandwidth_hz
    step = nice_at_most(bandwidth / STEPS_PER_BANDWIDTH if bandwidth else span / 1000.0)
    if span / step + 1 > MAX_POINTS:
        step = nice_at_least(span / (MAX_POINTS - 1))
    points = int(math.ceil(span / step - 1e-9)) + 1
    receiver = nice_at_most(bandwidth / RECEIVER_BANDWIDTHS_PER_BANDWIDTH if bandwidth else step,
                            (1.0, 3.0))
    return SweepSettings(start, stop, 0.5 * (start + stop), span, step, points, receiver)


def dbm_from_emf(emf_rms_v: float, resistance_ohm: float = GENERATOR_RESISTANCE_OHM) -> float:
    """A generator's level setting for an EMF: the power it delivers into a matched load.

    A matched load gets half the EMF, so P = (E/2)²/R and the level is 10·log10(P / 1 mW).
    """
    power_w = (emf_rms_v / 2.0) ** 2 / resistance_ohm
    return 10.0 * math.log10(power_w / 1e-3)


def bench_drive(design: Design) -> BenchDrive:
    """The generator's hookup and level for a bench test at small signal.

    Level: the design's drive scaled down (never up) so that the highest part voltage is at
    most TEST_PART_VOLTAGE_PEAK_V; f0, bandwidth and Q do not depend on the level for a
    linear circuit. Hookup, from a 50 Ω generator (common practice):
    Rs > 50 Ω: a series resistor Rs − 50 Ω; Rs < 50 Ω: a shunt R = 50·Rs/(50 − Rs) across
    the output (Thévenin: source resistance Rs, EMF × R/(R + 50)); no Rs, series circuit
    (ideal voltage source): a shunt giving 1/100 of the loop's resistance; no Rs, parallel
    (ideal current source): a feed resistor of 100 × the tank's impedance (Norton).
    """
    circuit, stress, resonance = design.circuit, design.stress, design.resonance
    highest_v = max(stress.capacitor_voltage_peak_v, stress.inductor_voltage_peak_v)
    scale = min(1.0, TEST_PART_VOLTAGE_PEAK_V / highest_v) if highest_v > 0 else 1.0
    rs = circuit.source_resistance_ohm
    z_peak = resonance.impedance_at_peak_ohm
    series = circuit.topology == "series"
    current = design.drive.value if design.drive.kind == "current" else None
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


def detector(design: Design) -> Detector:
    """Where to read the response, and the probe that does not disturb it.

    Series: the loop current, as the voltage across the load (or across a sense resistor of
    at most 1/100 of the loop's resistance). Parallel: the tank voltage. The probe's
    resistance is at least 100 × what it is across (common practice). Across a tank, its
    capacitance Cp adds to C and, from f0 = 1/(2π√(LC)), moves f0 by about −Cp/(2C); keeping
    that under a tenth of the bandwidth gives Cp ≤ 0.2·C·BW/f0.
    """
    circuit, resonance = design.circuit, design.resonance
    if circuit.topology == "series":
        if circuit.load_resistance_ohm is not None:
            return Detector(f"the load {design.designators.load_resistor}",
                            LOADING_RATIO * circuit.load_resistance_ohm, None, None)
        loop = resonance.impedance_at_peak_ohm + (circuit.source_resistance_ohm or 0.0)
        sense = loop / LOADING_RATIO
        return Detector("a sense resistor in the loop", LOADING_RATIO * sense, None, sense)
    bandwidth = resonance.bandwidth_hz
    probe_c = (2.0 * PROBE_SHIFT_PER_BANDWIDTH * circuit.capacitance_f * bandwidth
               / resonance.f0_hz) if bandwidth else None
    return Detector(f"the tank (across {design.designators.coil})",
                    LOADING_RATIO * resonance.impedance_at_peak_ohm,
                    probe_c, None)


def record_rows(design: Design) -> tuple[RecordRow, ...]:
    """The record's measurements, the values this design expects and the pass windows.

    Windows are the assessment's test limits (the peak-frequency window for f0: the bench
    finds the response maximum), formatted as tables.limits_rows formats them; the parts
    are judged against their tolerances.
    """
    r, c, a = design.resonance, design.circuit, design.assessment
    lim = a.limits
    expected = {
        "inductance": quantity_text(c.inductance_h, "H"),
        "capacitance": quantity_text(design.capacitor_choice.fixed_f, "F"),
        "f0": quantity_text(r.f_peak_hz, "Hz"),
        "f_low": quantity_text(r.f_low_hz, "Hz"),
        "f_high": quantity_text(r.f_high_hz, "Hz"),
        "bandwidth": quantity_text(r.bandwidth_hz, "Hz"),
        "q_loaded": format_number(r.q_loaded, 4),
    }
    limits = {
        "inductance": _tolerance(c.inductance_h, a.inductance_tolerance, "H"),
        "capacitance": _tolerance(design.capacitor_choice.fixed_f, a.capacitor_tolerance, "F"),
        "f0": range_text(lim.f_peak_min_hz, lim.f_peak_max_hz, 'Hz', 6),
        "f_low": range_text(lim.f_low_min_hz, lim.f_low_max_hz, 'Hz', 6),
        "f_high": range_text(lim.f_high_min_hz, lim.f_high_max_hz, 'Hz', 6),
        "bandwidth": range_text(lim.bandwidth_min_hz, lim.bandwidth_max_hz, 'Hz'),
        "q_loaded": f"{format_number(lim.q_loaded_min, 4)} to {format_number(lim.q_loaded_max, 4)}",
    }
    return tuple(RecordRow(m, expected[m.key], limits.get(m.key, "—")) for m in MEASUREMENTS)


def _tolerance(nominal: float, fraction: float | None, unit: str) -> str:
    """A part's window as the meter reads it: nominal ± tolerance, and the tolerance."""
    if not fraction:
        return "—"
    return (f"{range_text(nominal * (1 - fraction), nominal * (1 + fraction), unit)} "
            f"({tolerance_text(fraction)})")


def _hookup_text(design: Design, drive: BenchDrive) -> str:
    rs = design.circuit.source_resistance_ohm
    what = (f"the source resistance Rs = {quantity_text(rs, 'Ω')} ({design.designators.source_resistor})"
            if rs is not None else
            "an ideal voltage source" if design.circuit.topology == "series" else
            "an ideal current source")
    fixture = quantity_text(drive.fixture_resistance_ohm, "Ω")
    if drive.hookup == "direct":
        how = "connect the 50 Ω generator directly: its output resistance is Rs"
    elif drive.hookup == "series_resistor":
        how = f"put {fixture} (Rs − 50 Ω) in series with the 50 Ω generator's output"
    elif drive.hookup == "shunt_resistor":
        how = (f"put {fixture} across the 50 Ω generator's output, making a source of "
               f"{quantity_text(drive.presented_resistance_ohm, 'Ω')}")
    else:
        how = (f"feed the tank through {fixture} in series with the generator "
               f"(100 × the tank's impedance), making a current source")
    return f"The design assumes {what}: {how}."


def _detector_text(found: Detector) -> str:
    text = (f"Read the response across {found.across} with a probe of at least "
            f"{quantity_text(found.probe_resistance_min_ohm, 'Ω')}")
    if found.sense_resistance_max_ohm is not None:
        text = (f"Insert a sense resistor of at most {quantity_text(found.sense_resistance_max_ohm, 'Ω')} "
                f"in the loop. " + text)
    if found.probe_capacitance_max_f is not None:
        text += (f" and at most {quantity_text(found.probe_capacitance_max_f, 'F', 3)}: more moves f0 by "
                 "over a tenth of the bandwidth. If no probe is that light, couple loosely "
                 "(a capacitor of that value or a one-turn link) and note it")
    return text + "."


def _trim_step(design: Design) -> Step:
    choice = design.capacitor_choice
    if choice.trimmer_setting_f is not None:
        trimmer = design.job.capacitor.trimmer
        return Step(9, "Tune", f"Adjust the trimmer {design.designators.trimmer} for the "
                    f"response maximum at "
                    f"{quantity_text(design.resonance.f_peak_hz, 'Hz')} (expected setting "
                    f"{quantity_text(choice.trimmer_setting_f, 'F')} of its "
                    f"{range_text(trimmer.minimum, trimmer.maximum, 'F', 3)}), then repeat steps 7 and 8.")
    return Step(9, "Trim if needed",
                "If the maximum is off frequency, change the capacitance to C × (f measured / "
                "f wanted)² (from f0 = 1/(2π√(LC))) and repeat from step 7.")


def procedure(design: Design) -> Procedure:
    """The numbered bench test of `design`, with its instrument settings and record."""
    sweep = sweep_settings(design)
    drive = bench_drive(design)
    found = detector(design)
    r = design.resonance
    choice = design.capacitor_choice
    level_note = ""
    if drive.generator_level_dbm > GENERATOR_LEVEL_MAX_DBM:
        level_note = (" If the generator cannot reach this level, use its highest level: "
                      "the frequencies and the bandwidth do not depend on the level.")
    coil = design.coil
    measure_at = measuring_frequency_hz(r.f0_hz, coil.result.srf_hz if coil else None)
    wound = " (after winding it as the coil section says)" if coil is not None else ""
    trimmer = choice.trimmer_setting_f is not None
    names = design.designators
    fixed = " + ".join(names.fixed_capacitors)
    coil_name = names.coil
    steps = [
        Step(1, "Check the parts",
             "Check every part against the parts list: value, tolerance, dielectric or "
             "material, and rating where the list gives one."),
        Step(2, "Measure the coil",
             f"Measure {coil_name}{wound} with an LCR meter at {quantity_text(measure_at, 'Hz', 3)}, with nothing "
             f"connected, before fitting it. Expected {quantity_text(design.circuit.inductance_h, 'H')}.",
             records=("measured.inductance_h",)),
        Step(3, "Measure the capacitance",
             f"Measure {fixed} together as they will be fitted"
             + (", without the trimmer" if trimmer else "")
             + f". Expected {quantity_text(choice.fixed_f, 'F')}.", records=("measured.capacitance_f",)),
        Step(4, "Assemble",
             "Build the circuit as the schematic shows, with short leads; keep the coil "
             "clear of metal and of the other parts."),
        Step(5, "Connect the test set-up",
             f"{_hookup_text(design, drive)} {_detector_text(found)}"),
        Step(6, "Set the instrument",
             "Set a network analyser, or a generator and a level-reading receiver, to sweep "
             "as below." + level_note,
             settings=(
                 ("Start", quantity_text(sweep.start_hz, "Hz")),
                 ("Stop", quantity_text(sweep.stop_hz, "Hz")),
                 ("Centre", quantity_text(sweep.centre_hz, "Hz")),
                 ("Span", quantity_text(sweep.span_hz, "Hz")),
                 ("Step", f"{quantity_text(sweep.step_hz, 'Hz')} ({sweep.points} points)"),
                 ("Receiver (resolution/IF) bandwidth", quantity_text(sweep.receiver_bandwidth_hz, "Hz")),
                 ("Generator EMF", quantity_text(drive.generator_emf_rms_v, "V") + " rms"),
                 ("Generator level (into 50 Ω)", signed(drive.generator_level_dbm, 1) + " dBm"),
                 ("Highest part voltage at this level", quantity_text(drive.part_voltage_peak_v, "V")
                  + " peak"),
             )),
        Step(7, "Find the response maximum",
             "Sweep and find the maximum of the response; record its frequency. Expected "
             f"{quantity_text(r.f_peak_hz, 'Hz')}; the test record gives the pass window.",
             records=("measured.f0_hz",)),
        Step(8, "Find the half-power points",
             f"Find the frequencies either side where the response is {-HALF_POWER_DB:.1f} dB "
             f"below the maximum; record both, their difference (the bandwidth) and f0 divided "
             f"by the bandwidth (the loaded Q). Expected {quantity_text(r.f_low_hz, 'Hz')} and "
             f"{quantity_text(r.f_high_hz, 'Hz')}.",
             records=("measured.f_low_hz", "measured.f_high_hz", "measured.bandwidth_hz",
                      "measured.q_loaded")),
        _trim_step(design),
        Step(10, "Record the verdict",
             "Mark pass or fail against the work order's limits for each value, and overall; "
             "fill in the instruments used, your name and the date."),
    ]
    return Procedure(sweep, drive, found, tuple(steps), record_rows(design))
