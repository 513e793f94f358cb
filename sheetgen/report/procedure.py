"""Design → the bench test: fixture, instrument settings, numbered steps and the record.

Pure: reads a Design, returns frozen data (text already worded for the technician), no
I/O, no reportlab. The rules that turn the design into settings are stated where they are
used; those that are the trade's habits rather than derivations are marked common practice.
The names of the record's fields are stable (work-order systems read the filled form) and
listed by form_field_names().
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sheetgen.design.records import Design
from sheetgen.engine.bench import (
    GENERATOR_LEVEL_MAX_DBM,
    GENERATOR_RESISTANCE_OHM,
    HALF_POWER_DB,
    LCR_TEST_LEVEL_RMS_V,
    NOISE_MARGIN_DB,
    PARASITIC_IMPEDANCE_CHANGE,
    PARASITIC_PEAK_SHIFT_BANDWIDTHS,
    PROBE_GAIN,
    PROBE_RESISTANCE_OHM,
    BenchSetup,
    PortHookup,
    SweepSettings,
    capacitor_measuring_frequency_hz,
    sweep_settings,
)
from sheetgen.quantities import format_number
from sheetgen.report.cautions import design_cautions, kilovolt_distances, names_text
from sheetgen.report.formatting import (
    percent,
    percent_change,
    printed_part_window,
    quantity_text,
    range_text,
    resolved_range_text,
    resolved_text,
    signed,
    tolerance_text,
)
from sheetgen.report.winding import (
    LCR_REACTANCE_MIN_OHM,
    coil_check,
    coil_measuring_text,
    measuring_frequency_hz,
)

NO_WINDOW = "—"  # a record row with no window to judge against (e.g. no tolerance given)


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
    """A measurement with the value the design expects and its pass window, formatted.

    `as_found_field`: for a unit that is trimmed, the field for the value before trimming
    (the as-left value goes in the measurement's own field). `verdict_field`: the row's
    pass/fail choice, None when the row has no window to judge against."""

    measurement: Measurement
    expected: str
    limits: str = NO_WINDOW
    as_found_field: str | None = None
    minimum: float | None = None  # the window in SI units, exactly as printed
    maximum: float | None = None

    @property
    def verdict_field(self) -> str | None:
        return self.measurement.verdict if self.limits != NO_WINDOW else None


@dataclass(frozen=True)
class TestStep:
    """One numbered step of the bench test: what to do, the settings it needs and the
    fields it fills."""

    __test__ = False  # not a pytest test class

    number: int
    title: str
    text: str
    settings: tuple[tuple[str, str], ...] = ()
    records: tuple[str, ...] = ()
    key: str = ""  # which step of the plan it is (e.g. "connect"), for the sheet's layout
    derivation: tuple[tuple[str, str], ...] = ()  # why the settings are so (design record)

    @property
    def all_settings(self) -> tuple[tuple[str, str], ...]:
        """What the bench sets, then why (the design record's rows)."""
        return self.settings + self.derivation


@dataclass(frozen=True)
class Procedure:
    """The whole bench test of one design."""

    sweep: SweepSettings
    bench: BenchSetup
    steps: tuple[TestStep, ...]
    record: tuple[RecordRow, ...]
    full_power: tuple[TestStep, ...] = ()  # the optional run at the design's drive
    fixture: FixtureNames | None = None  # the test set-up's own parts' designators


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
# The unit's identity and the test conditions, then who tested it with what.
RECORD_TEXT_FIELDS = ("record.serial", "record.work_order", "record.technician",
                      "record.date", "record.ambient_c", "record.instruments",
                      "record.remarks")
RECORD_TEXT_LABELS = {
    "record.serial": "Unit serial number", "record.work_order": "Work order",
    "record.technician": "Technician", "record.date": "Date tested",
    "record.ambient_c": "Test ambient temperature (°C)",
    "record.instruments": "Instruments used (type, serial number, calibration due date)",
    "record.remarks": "Remarks"}
VERDICT_CHOICES = ("pass", "fail")  # the values of each verdict's one-choice (radio) group
TUNED_KEYS = ("f0", "f_low", "f_high", "bandwidth", "q_loaded")  # measured before and after


def form_field_names(record: tuple[RecordRow, ...]) -> tuple[str, ...]:
    """Every fillable field of a test record, by its stable name: as-found values (trimmed
    units), measured (as-left) values, one verdict group per row with a window, the overall
    verdict and the record's text fields."""
    return (tuple(row.as_found_field for row in record if row.as_found_field)
            + tuple(row.measurement.field for row in record)
            + tuple(row.verdict_field for row in record if row.verdict_field)
            + (OVERALL_VERDICT,) + RECORD_TEXT_FIELDS)


# Below this loaded Q the response maximum is too flat to read (a Q 10 tank changes by
# about 0.001 dB over ±0.5 % of f0): f0 is taken as the midpoint of the −3 dB points
# instead (common practice).
BROAD_PEAK_Q = 20.0


def broad_peak(design: Design) -> bool:
    """The peak is too broad to read its maximum: loaded Q (on the bench) below
    BROAD_PEAK_Q."""
    r = design.bench.resonance
    return r.q_loaded is not None and r.q_loaded < BROAD_PEAK_Q and r.f_low_hz is not None


def bench_f0_hz(design: Design) -> float:
    """The f0 the bench records: the response maximum, or for a broad peak the midpoint of
    the −3 dB points (BROAD_PEAK_Q)."""
    r = design.bench.resonance
    return 0.5 * (r.f_low_hz + r.f_high_hz) if broad_peak(design) else r.f_peak_hz


def record_rows(design: Design) -> tuple[RecordRow, ...]:
    """The record's measurements, the values this design expects and the pass windows.

    Windows are the assessment's test limits (the peak-frequency window for f0: the bench
    finds the response maximum), formatted as tables.limits_rows formats them; the parts
    are judged against their tolerances.
    """
    r, c, a = design.bench.resonance, design.circuit, design.assessment
    lim = a.limits
    step = lim.resolution_hz
    broad = broad_peak(design)
    expected = {
        "inductance": quantity_text(c.inductance_h, "H"),
        "capacitance": quantity_text(design.capacitor_choice.fixed_f, "F"),
        "f0": resolved_text(bench_f0_hz(design), step, "Hz"),
        "f_low": resolved_text(r.f_low_hz, step, "Hz"),
        "f_high": resolved_text(r.f_high_hz, step, "Hz"),
        "bandwidth": resolved_text(r.bandwidth_hz, step, "Hz"),
        "q_loaded": format_number(r.q_loaded, 4),
    }
    windows = {
        "inductance": (printed_part_window(a.inductance_window)
                       if a.inductance_tolerance else None),
        "capacitance": (printed_part_window(a.capacitance_window)
                        if a.capacitor_tolerance else None),
        "f0": ((lim.f_centre_min_hz, lim.f_centre_max_hz) if broad
               else (lim.f_peak_min_hz, lim.f_peak_max_hz)),
        "f_low": (lim.f_low_min_hz, lim.f_low_max_hz),
        "f_high": (lim.f_high_min_hz, lim.f_high_max_hz),
        "bandwidth": (lim.bandwidth_min_hz, lim.bandwidth_max_hz),
        "q_loaded": (lim.q_loaded_min, lim.q_loaded_max),
    }
    limits = {
        "inductance": _tolerance(windows["inductance"], a.inductance_tolerance, "H"),
        "capacitance": _tolerance(windows["capacitance"], a.capacitor_tolerance, "F"),
        "f0": resolved_range_text(*windows["f0"], step, "Hz") + (
            " (centre of the −3 dB points)" if broad else ""),
        "f_low": resolved_range_text(*windows["f_low"], step, "Hz"),
        "f_high": resolved_range_text(*windows["f_high"], step, "Hz"),
        "bandwidth": resolved_range_text(*windows["bandwidth"], step, "Hz"),
        "q_loaded": f"{format_number(lim.q_loaded_min, 4)} to {format_number(lim.q_loaded_max, 4)}",
    }
    tuned = design.capacitor_choice.trimmer_setting_f is not None
    rows = []
    for m in MEASUREMENTS:
        window = windows.get(m.key)
        low, high = window if window else (None, None)
        rows.append(RecordRow(m, expected[m.key], limits.get(m.key, NO_WINDOW),
                              m.field.replace("measured.", "as_found.")
                              if tuned and m.key in TUNED_KEYS else None, low, high))
    return tuple(rows)


def _tolerance(window: tuple[float, float] | None, fraction: float | None, unit: str) -> str:
    """A part's window as the meter reads it, with the tolerance it comes from."""
    if window is None:
        return NO_WINDOW
    return f"{range_text(*window, unit)} ({tolerance_text(fraction)} and the meter)"


@dataclass(frozen=True)
class FixtureNames:
    """Designators of the test set-up's own parts (None where the hookup has no part).

    IEC 81346-2 class letters, written as the single letters the schematic uses (R a
    resistor, C a capacitor, T a transformer), numbered on after the unit's own parts so
    that no fixture part shares a name with a part of the unit; a probe is an instrument's
    accessory and has none.
    """

    source: str | None
    receiver: str | None


def _number(name: str | None) -> int:
    return int(name[1:]) if name else 0


def fixture_names(design: Design) -> FixtureNames:
    """Name the source's and the receiver's fixture parts (see FixtureNames)."""
    names = design.designators
    following = {"R": max(_number(n) for n in (names.source_resistor, names.load_resistor,
                                               names.bleeder, None)),
                 "C": max((_number(n) for n in names.capacitors), default=0), "T": 0}
    letter = {"series_resistor": "R", "shunt_resistor": "R", "transformer": "T",
              "coupling_capacitor": "C"}
    given = []
    for hookup in (design.bench.source, design.bench.receiver.hookup):
        kind = letter.get(hookup.kind)
        if kind is None:
            given.append(None)
            continue
        following[kind] += 1
        given.append(f"{kind}{following[kind]}")
    return FixtureNames(*given)


def _resistor_text(name: str, hookup: PortHookup, rating_w: float | None) -> str:
    return (f"{name} {quantity_text(hookup.resistor_ohm, 'Ω', 3)} "
            f"{tolerance_text(hookup.resistor_tolerance)} (IEC 60063 E96), "
            f"{hookup.power_rating_w(rating_w):g} W {hookup.style.name}")


def fixture_settings(design: Design) -> tuple[tuple[str, str], ...]:
    """The test set-up as a parts list: how each 50 Ω port becomes the circuit's source or
    load, with the parts to fit and what the circuit then sees."""
    bench, names = design.bench, design.designators
    parts = fixture_names(design)
    rs = design.circuit.source_resistance_ohm
    source, found, drive = bench.source, bench.receiver, bench.drive
    rows: list[tuple[str, str]] = []
    stands_for = (f"Rs {quantity_text(rs, 'Ω')} ({names.source_resistor})" if rs is not None
                  else "an ideal voltage source (1/100 of the loop's resistance)"
                  if design.circuit.topology == "series" else
                  "an ideal current source (100 × the tank's impedance)")
    rows.append(("Generator stands for", stands_for))
    rows.append(("Generator hookup", _port_text(design, source, parts.source,
                                                drive.source_resistor_rating_w,
                                                "generator's output")))
    load_name = names.load_resistor
    probe = found.hookup.kind == "probe"
    where = {"load": f"the load {load_name}",
             "link": f"the load {load_name} on the link {names.link}",
             "tap": f"the load {load_name} on the tap of {names.coil}",
             "sense_resistor": ("a reading of the loop current at its cold end"
                                if found.hookup.kind == "transformer"
                                else "a sense resistance at the loop's cold end"),
             "pickup": (f"a reading of the tank voltage at {names.coil}'s hot end" if probe
                        else f"a pickup from the tank's hot end ({names.coil}), 100 × its "
                        "impedance")
             }[found.place]
    rows.append(("Receiver stands for", where))
    rows.append(("Receiver hookup", _port_text(design, found.hookup, parts.receiver,
                                               drive.receiver_resistor_rating_w,
                                               "receiver's input")))
    sees = f"source {quantity_text(bench.circuit.source_resistance_ohm, 'Ω')}"
    if bench.circuit.source_capacitance_f is not None:
        sees += f" in series with {quantity_text(bench.circuit.source_capacitance_f, 'F', 3)}"
    sees += f", load {quantity_text(bench.circuit.load_resistance_ohm, 'Ω')}"
    sees += " across the tank" if design.circuit.topology == "parallel" else ""
    if probe:
        sees += (f"; tank capacitance {quantity_text(bench.circuit.capacitance_f, 'F')}, the "
                 f"probe's {quantity_text(found.hookup.capacitance_f, 'F', 2)} included")
    rows.append(("The circuit sees", sees))
    resistors = _resistor_behaviour(design)
    if resistors:
        rows.append(("Fixture resistors", resistors))
    rows.append(("Effect on the windows", _effect_text(design)))
    rows.append(("Receiver reading", _reading_text(design)))
    rows.append(("Ports", f"50 Ω {tolerance_text(bench.port_tolerance)} (test.port_tolerance): "
                 "calibrate the analyser at the fixture's connectors, or fit a 10 dB "
                 "attenuator at each port and raise the generator level by 10 dB"))
    return tuple(rows)


def _port_text(design: Design, hookup: PortHookup, name: str | None, rating_w: float | None,
               port: str) -> str:
    presented = quantity_text(hookup.presented_ohm, "Ω")
    if hookup.kind == "direct":
        return f"the {port} in its place, no resistor ({presented})"
    if hookup.is_resistor:
        how = "in series with" if hookup.kind == "series_resistor" else "across"
        return f"{_resistor_text(name, hookup, rating_w)} {how} the {port}: {presented}"
    if hookup.kind == "transformer":
        unit_turns, port_turns = hookup.turns
        wire = ("the circuit's own wire passed once through a ferrite ring"
                if unit_turns == 1 else f"{unit_turns} turns of the circuit's wire on a ferrite ring")
        al = hookup.magnetising_inductance_min_h / port_turns ** 2
        return (f"{name}, a transformer: {wire}, {port_turns} turn"
                f"{'s' if port_turns > 1 else ''} on the ring to the {port} "
                f"({unit_turns}:{port_turns}): {presented} in the circuit "
                f"(50 Ω × ({unit_turns}/{port_turns})²); ring AL at least "
                f"{quantity_text(al, 'H', 3)}/turn², so the {port_turns}-turn winding has "
                f"{quantity_text(hookup.magnetising_inductance_min_h, 'H', 3)} or more "
                "(10 × the port's 50 Ω at the test frequency)")
    if hookup.kind == "coupling_capacitor":
        f = design.bench.resonance.f_peak_hz
        omega = 2 * math.pi * f
        y = 1.0 / (GENERATOR_RESISTANCE_OHM + 1.0 / (1j * omega * hookup.capacitance_f))
        return (f"{name} {quantity_text(hookup.capacitance_f, 'F', 2)} C0G (IEC 60063 E12), "
                f"short leads, from the {port} to the tank's hot end ({design.designators.coil}):"
                f" with the port's 50 Ω it is {quantity_text(1.0 / y.real, 'Ω')} in parallel "
                f"with {quantity_text(y.imag / omega, 'F', 3)} at the peak (a series RC, "
                "worked exactly at every frequency)")
    return (f"an active probe, {quantity_text(PROBE_RESISTANCE_OHM, 'Ω', 2)} ∥ "
            f"{quantity_text(hookup.capacitance_f, 'F', 2)} input (common practice), its "
            f"÷{1 / PROBE_GAIN:g} output into the {port}; tip at the tank's hot end "
            f"({design.designators.coil}), its ground lead short to the cold end")


def _resistor_behaviour(design: Design) -> str:
    """Why the fixture's resistors may be taken as resistors at the test frequency: the
    parasitics assumed for their kind, and what those do to each."""
    bench = design.bench
    names = fixture_names(design)
    by_style: dict = {}
    for hookup, effect, name in ((bench.source, bench.source_effect, names.source),
                                 (bench.receiver.hookup, bench.receiver_effect,
                                  names.receiver)):
        if effect is not None:
            by_style.setdefault(hookup.style, []).append(
                f"{name} changes its impedance by {percent(effect.impedance_change, 2)} and "
                f"moves the peak by {format_number(abs(effect.peak_shift_bandwidths) * 100, 2)}"
                " % of the bandwidth" + ("" if effect.negligible else
                                         " — more than allowed, and no other hookup fits "
                                         "here: the windows do not include it"))
    parts = [f"{style.name}, about {style.shunt_capacitance_f * 1e12:g} pF across and "
             f"{style.lead_inductance_h * 1e9:g} nH in series (common practice): "
             + "; ".join(effects) for style, effects in by_style.items()]
    if not parts:
        return ""
    every = all(e.negligible for e in (bench.source_effect, bench.receiver_effect) if e)
    return ("; ".join(parts) + f" (allowed: {percent(PARASITIC_IMPEDANCE_CHANGE, 2)} and "
            f"{percent(PARASITIC_PEAK_SHIFT_BANDWIDTHS, 1)} of the bandwidth, common "
            "practice)" + (", so each is a resistor at the test frequency" if every else ""))


def _reading_text(design: Design) -> str:
    """What the receiver reads at the −3 dB points against its noise floor."""
    bench = design.bench
    at_half = bench.drive.received_dbm + HALF_POWER_DB
    text = (f"about {signed(bench.drive.received_dbm, 1)} dBm at the peak, "
            f"{signed(at_half, 1)} dBm at the half-power points; noise floor "
            f"{signed(bench.noise_floor_dbm, 1)} dBm in the receiver bandwidth "
            f"(test.receiver_noise_floor, {signed(design.job.test.receiver_noise_floor, 0)} "
            f"dBm/Hz): {format_number(bench.half_power_margin_db, 3)} dB above it")
    if bench.readable:
        return text + f" (at least {NOISE_MARGIN_DB:g} dB needed)"
    return (text + f", less than the {NOISE_MARGIN_DB:g} dB needed: use a receiver with a "
            "lower noise floor, a preamplifier or a narrower receiver bandwidth")


def _effect_text(design: Design) -> str:
    """What the fixture's standard values and ports do to the design's response."""
    built, wanted = design.bench.resonance, design.resonance
    parts = []
    for label, got, aim in (("bandwidth", built.bandwidth_hz, wanted.bandwidth_hz),
                            ("loaded Q", built.q_loaded, wanted.q_loaded)):
        if got is not None and aim:
            parts.append(f"{label} {percent_change(got, aim)}")
    shift = built.f_peak_hz - wanted.f_peak_hz
    parts.append(f"peak frequency {signed(shift / wanted.f_peak_hz * 1e6, 0)} ppm")
    return ("against the design's: " + ", ".join(parts) + "; the expected values and windows "
            "of this sheet are for this set-up, with its tolerances")


def _connect_text(design: Design) -> str:
    bench = design.bench
    found = bench.receiver
    port = found.hookup
    reads = {"load": "the load's current" if design.circuit.topology == "series"
             else "the tank voltage through the load",
             "link": "the tank through its link", "tap": "the tank through its tap",
             "sense_resistor": "the loop current", "pickup": "the tank voltage"}[found.place]
    divider = (GENERATOR_RESISTANCE_OHM / port.presented_ohm
               if port.kind == "series_resistor" else PROBE_GAIN if port.kind == "probe"
               else 1.0)
    level = (f" (the {'probe' if port.kind == 'probe' else 'resistor'} divides it by "
             f"{1 / divider:.4g}, {signed(20 * math.log10(divider), 1)} dB)"
             if divider < 1 else "")
    loads = ("besides them only the probe below touches the circuit, and its loading is in "
             "the windows" if port.kind == "probe"
             else "nothing else is connected to the circuit, so no probe loads it")
    return ("Make the circuit's source from the generator and its load from the receiver, "
            f"as below; {loads}. Fit each hookup where the "
            "schematic shows the part it stands for: a series part on the circuit's side, "
            "each instrument's cable screen to the circuit's ground (cold) side. The receiver "
            f"reads {reads}{level}. Keep the fixture's leads short.")


def _lcr_settings(frequency_hz: float, note: str) -> tuple[tuple[str, str], ...]:
    """An LCR meter's settings: frequency, test level and what that level puts on the part."""
    return (("LCR meter frequency", quantity_text(frequency_hz, "Hz", 3)),
            ("LCR meter test level", f"{quantity_text(LCR_TEST_LEVEL_RMS_V, 'V', 2)} rms "
             "or lower"),
            ("Highest voltage at this level",
             f"{quantity_text(LCR_TEST_LEVEL_RMS_V * math.sqrt(2.0), 'V', 2)} peak: "
             "no caution applies"),
            ("Why this setting", note))


def _sentence(text: str) -> str:
    """`text` with its first letter capital, the rest as written (units keep their case)."""
    return text[:1].upper() + text[1:]


def _expected_text(row: RecordRow) -> str:
    """A step's expected value and pass window, the very figures of the test record."""
    if row.limits == NO_WINDOW:
        return f"expected {row.expected}"
    return f"expected {row.expected}, pass {row.limits}"


def _coil_step(design: Design, coil_name: str, wound: str, measure_at: float,
               expected: str) -> tuple:
    """The coil's measuring step: an LCR meter, or for a coil of too little reactance at
    the meter's frequencies an analyser near the frequency of use (report/winding.py);
    `expected`: the record's expected value and window."""
    expected = _sentence(expected) + "."
    check = coil_check(design)
    if check is None or check.method == "lcr":
        return ("coil", "Measure the coil",
                f"Measure {coil_name}{wound} with an LCR meter, with nothing connected, "
                f"before fitting it. {expected}",
                _lcr_settings(measure_at, _coil_level_note(design, measure_at)),
                ("measured.inductance_h",))
    at = quantity_text(check.measure_at_hz, "Hz", 3)
    return ("coil", "Measure the coil",
            f"Measure {coil_name}{wound} before fitting it: {coil_measuring_text(check)}. "
            f"{expected}",
            (("Analyser frequency", at),
             ("Fixture", "short, compensated open and short at its clips"),
             ("Why this setting", "below f0 and a tenth of the coil's self-resonance; at the "
              "LCR meter's frequencies its reactance is under "
              f"{quantity_text(LCR_REACTANCE_MIN_OHM, 'Ω', 2)}")),
            ("measured.inductance_h",))


def _coil_level_note(design: Design, frequency_hz: float) -> str:
    """Why the coil is measured where it is, and, on a ring core, the flux the meter's level
    drives (Faraday: B̂ = √2·V/(ωNAe)), far inside the material's limit."""
    coil = design.coil
    why = ("the meter's highest test frequency at or below f0"
           + (" and a tenth of the coil's self-resonance"
              if coil is not None and coil.result.srf_hz else ""))
    if coil is None or coil.form != "toroid":
        return why
    from sheetgen.engine.magnetics import peak_flux_density_t
    flux = peak_flux_density_t(LCR_TEST_LEVEL_RMS_V, frequency_hz, coil.result.turns,
                               coil.result.effective.ae_m2)
    limit = coil.flux_density_max_t
    return why + (f"; the level drives {quantity_text(flux, 'T', 2)} peak in the core"
                  + (f", {percent(flux / limit)} of its {quantity_text(limit, 'T', 2)} limit"
                     if limit else ""))


def _small_signal_note(design: Design, hazards) -> str:
    """Whether the sheet's cautions apply to the small-signal test (`hazards`: the
    design's cautions above NOTICE)."""
    level = quantity_text(design.bench.drive.part_voltage_peak_v, "V", 3)
    if not hazards:
        return (f"none apply: this test puts at most {level} peak on any part, and the "
                "design's own drive raises no hazard")
    return (f"not at this level: this test puts at most {level} peak on any part, within "
            "extra-low voltage; they apply at the design's own drive (the full-power run)")


def _hazard_cautions(design: Design):
    """The cautions that warn of harm (every level above NOTICE)."""
    return [c for c in design_cautions(design) if c.level != "notice"]


FULL_POWER_SHARES = (0.25, 0.5, 1.0)  # shares of the design's drive power, in order


def full_power_steps(design: Design, hazards) -> tuple[TestStep, ...]:
    """The optional run at the design's drive, for designs whose cautions warn of harm
    (`hazards`: its cautions above NOTICE): the drive raised in steps (part voltages ∝ √P,
    losses and rises ∝ P in a linear circuit), what to watch at each, and when to stop."""
    if not hazards:
        return ()
    s, names = design.stress, design.designators
    highest = max(s.capacitor_voltage_peak_v, s.inductor_voltage_peak_v)
    coil = design.coil
    rise = getattr(coil.result, "temperature_rise_k", None) if coil is not None else None
    levels = []
    for share in FULL_POWER_SHARES:
        text = (f"{percent(share, 2)} of the drive power ({quantity_text(s.drive_power_w * share, 'W', 3)}"
                f" into the circuit): {quantity_text(highest * math.sqrt(share), 'V', 3)} peak"
                f" on the tank")
        if rise:
            text += f", {names.coil} about {format_number(rise * share, 2)} K above ambient"
        levels.append((f"Step at {percent(share, 2)}", text))
    words = names_text(dict.fromkeys(c.level.upper() for c in hazards))  # most severe first
    severe = any(c.level in ("danger", "warning") for c in hazards)
    guard = ("Only with the unit in its enclosure or behind a guard, an observer present and "
             "the supply's off switch within reach; read voltages only with a probe rated for "
             "them, from outside the guard." if severe else
             "Keep fingers off the parts the cautions name while the drive is on; read voltages "
             "only with a probe rated for them.")
    corona = (" no hiss, glow, smell of ozone or crackle (corona or arcing);"
              if kilovolt_distances(design) is not None else "")
    steps = (
        ("Before you start",
         f"This run puts the design's own voltages on the parts: the cautions of this sheet "
         f"({words}) apply in full. Remove the test set-up and connect the real source and "
         f"load (or a dummy load rated for the power). {guard}", ()),
        ("Raise the drive in steps",
         "Raise the drive to each level below, holding each for 5 minutes (common practice) "
         "and removing the drive before touching anything.", tuple(levels)),
        ("Watch at each step",
         "The response maximum stays in the f0 window of the test record; "
         + (f"{names.coil} stays near the rise shown and {names_text(names.capacitors)} near "
            "ambient" if rise else
            f"{names_text((names.coil, *names.capacitors))} stay near ambient")
         + f" (read by an infrared thermometer, never by touch);{corona} nothing smells hot or "
         "discolours.", ()),
        ("Stop at once",
         "Remove the drive if any of these appears, or the frequency drifts out of its window, "
         "or a part runs hotter than the rise shown by more than 10 K (common practice); "
         "record what was seen in the remarks and return the unit to engineering.", ()),
    )
    return tuple(TestStep(index + 1, title, text, settings)
                 for index, (title, text, settings) in enumerate(steps))


def _trim_step(design: Design, repeat_from: int, repeat_to: int) -> tuple[str, str]:
    """The tuning step's title and text; it sends the technician back to the measuring steps.

    What to tune for is what step `repeat_from` records: the response maximum, or for a
    broad peak the midpoint of the −3 dB points. Without a trimmer, f0 = 1/(2π√(LC)) scales
    the whole capacitance across the coil, strays included, by (f measured / f wanted)²;
    the fixed part is that less the strays."""
    choice = design.capacitor_choice
    aim = resolved_text(bench_f0_hz(design), design.assessment.limits.resolution_hz, "Hz")
    target = (f"the midpoint of the −3 dB points at {aim}" if broad_peak(design)
              else f"the response maximum at {aim}")
    if choice.trimmer_setting_f is not None:
        trimmer = design.job.capacitor.trimmer
        return "Tune", (f"Adjust the trimmer {design.designators.trimmer} for {target} "
                        f"(expected setting {quantity_text(choice.trimmer_setting_f, 'F')} of "
                        f"its {range_text(trimmer.minimum, trimmer.maximum, 'F', 3)}), then "
                        f"repeat steps {repeat_from} and {repeat_to}, recording the values as "
                        "left in the measured column.")
    across = choice.across
    strays = across.total_f if across is not None and not across.added else 0.0
    if strays:
        fixed, stray = (quantity_text(choice.fixed_f, "F"), quantity_text(strays, "F"))
        change = (f"change the fixed part to ({fixed} + {stray}) × (f measured / f wanted)² "
                  f"− {stray} (the {stray} of strays across it is part of what scales)")
    else:
        change = ("change the fixed part to its value × (f measured / f wanted)²")
    return "Trim if needed", (f"If {target.split(' at ')[0]} is off frequency, {change} "
                              f"(from f0 = 1/(2π√(LC))), and repeat from step {repeat_from}.")


# Settings rows that say why a setting is so, rather than what to set: the design record
# prints them, the bench's steps leave them out.
DERIVATION_LABELS = frozenset({"Why this setting", "Highest voltage at this level",
                               "Generator stands for", "Receiver stands for",
                               "The circuit sees", "Fixture resistors",
                               "Effect on the windows", "Highest part voltage at this level"})


def _bench_and_derivation(settings: tuple) -> tuple[tuple, tuple]:
    """A step's settings split into what the bench sets and why (see DERIVATION_LABELS);
    "Cautions for this test" goes to the bench only when a caution applies."""
    def why(label: str, value: str) -> bool:
        return label in DERIVATION_LABELS or (label == "Cautions for this test"
                                              and value.startswith("none apply"))
    return (tuple(row for row in settings if not why(*row)),
            tuple(row for row in settings if why(*row)))


def procedure(design: Design) -> Procedure:
    """The numbered bench test of `design`, with its instrument settings and record."""
    r = design.bench.resonance
    sweep = sweep_settings(float(design.sweep.f_hz[0]), float(design.sweep.f_hz[-1]),
                           r.bandwidth_hz)
    drive = design.bench.drive
    hazards = _hazard_cautions(design)  # worded once, for two steps
    choice = design.capacitor_choice
    level_note = ""
    if drive.generator_level_dbm > GENERATOR_LEVEL_MAX_DBM:
        level_note = (" If the generator cannot reach this level, use its highest level: "
                      "the frequencies and the bandwidth do not depend on the level.")
    coil = design.coil
    measure_at = measuring_frequency_hz(r.f0_hz, coil.result.srf_hz if coil else None)
    wound = " (after winding it as the winding section says)" if coil is not None else ""
    trimmer = choice.trimmer_setting_f is not None
    names = design.designators
    fixed = " + ".join(names.fixed_capacitors)
    first_reading = "as_found" if trimmer else "measured"  # trimmed: measured, tuned, measured
    coil_name = names.coil
    record = record_rows(design)
    expect = {row.measurement.key: _expected_text(row) for row in record}
    # (key, title, text, settings, records); numbered from this list, so a step that
    # refers to another names it by its key.
    plan: list[tuple[str, str, str, tuple, tuple]] = [
        ("parts", "Check the parts",
         "Check every part against the parts list: value, tolerance, dielectric or "
         "material, and rating where the list gives one.", (), ()),
        _coil_step(design, coil_name, wound, measure_at, expect["inductance"]),
        ("capacitance", "Measure the capacitance",
         (f"Measure {fixed} together as they will be fitted"
          if len(names.fixed_capacitors) > 1 else f"Measure {fixed} as it will be fitted")
         + (", without the trimmer" if trimmer else "")
         + f". {_sentence(expect['capacitance'])}.",
         _lcr_settings(capacitor_measuring_frequency_hz(choice.fixed_f),
                       "IEC 60384-1's measuring frequency for this value (from memory)"),
         ("measured.capacitance_f",)),
        ("assemble", "Assemble",
         "Build the circuit as the schematic shows, with short leads; keep the coil "
         "clear of metal and of the other parts.", (), ()),
        ("connect", "Connect the test set-up", _connect_text(design),
         fixture_settings(design), ()),
        ("instrument", "Set the instrument",
         "Set a network analyser, or a generator and a level-reading receiver, to sweep "
         "as below." + level_note,
         (
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
             ("Cautions for this test", _small_signal_note(design, hazards)),
         ), ()),
        ("maximum", "Find the response maximum",
         "Sweep and find the maximum of the response; record its frequency"
         + (" in the as-found column" if trimmer else "") + f". {_sentence(expect['f0'])}."
         if not broad_peak(design) else
         f"Sweep and find the maximum of the response. This peak is broad (loaded Q "
         f"{format_number(r.q_loaded, 3)}, below {BROAD_PEAK_Q:g}): its top is too flat to read, "
         "so record as f0 the midpoint of the two −3 dB points of the next step, "
         f"(f low + f high)/2. {_sentence(expect['f0'])}.",
         (), (f"{first_reading}.f0_hz",)),
        ("half_power", "Find the half-power points",
         f"Find the frequencies either side where the response is {-HALF_POWER_DB:.1f} dB "
         f"below the maximum; record both, their difference (the bandwidth) and f0 divided "
         f"by the bandwidth (the loaded Q). Lower point: {expect['f_low']}; upper point: "
         f"{expect['f_high']}; bandwidth: {expect['bandwidth']}; loaded Q: "
         f"{expect['q_loaded']}.", (),
         tuple(f"{first_reading}.{name}" for name in ("f_low_hz", "f_high_hz", "bandwidth_hz",
                                                 "q_loaded"))),
        ("tune", "", "", (), ()),
        ("verdict", "Record the verdict",
         "Mark pass or fail for each value against the pass window printed in the test "
         "record, and overall: those windows are the limits of this sheet's id and revision, "
         "and they rule. Fill in the instruments used, your name and the date; for a fail, "
         "follow the rework table.", (), ()),
    ]
    number = {key: index + 1 for index, (key, *_rest) in enumerate(plan)}
    tune_title, tune_text = _trim_step(design, number["maximum"], number["half_power"])
    as_left = (("measured.f0_hz", "measured.f_low_hz", "measured.f_high_hz",
                "measured.bandwidth_hz", "measured.q_loaded") if trimmer else ())
    steps = tuple(TestStep(number[key], tune_title if key == "tune" else title,
                           tune_text if key == "tune" else text,
                           _bench_and_derivation(settings)[0],
                           as_left if key == "tune" else records, key,
                           _bench_and_derivation(settings)[1])
                  for key, title, text, settings, records in plan)
    return Procedure(sweep, design.bench, steps, record,
                     full_power_steps(design, hazards), fixture_names(design))
