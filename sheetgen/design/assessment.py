"""Tolerances and temperature → test limits; stresses → rating checks.

Runs after the nominal design: builds the variation spec from the job (each part's
tolerance, temperature behaviour and the operating range), runs the seeded Monte Carlo or
the worst-case corners, sets the test windows, checks the trimmer and the ratings
(report/cautions.py words the cautions from the Design). Pure: the same job and seed give the same Assessment.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from functools import partial

from sheetgen.design.designators import Designators
from sheetgen.engine.bench import sweep_settings
from sheetgen.engine.limits import (
    DEFAULT_TUNING_FRACTION,
    BenchAllowance,
    TestLimits,
    TrimmerCheck,
    part_window,
    settled_monte_carlo,
    test_limits,
    trimmer_check,
)
from sheetgen.engine.ratings import (
    DEFAULT_RESISTOR_POWER_DERATING,
    CurrentDensity,
    RatingCheck,
    UnratedCheck,
    capacitor_current_check,
    capacitor_voltage_check,
    esr_power_check,
    flux_density_check,
    resistor_power,
    resistor_power_check,
    resistor_voltage_check,
    surface_temperature_check,
    unrated_check,
    winding_current_density,
)
from sheetgen.engine.resonance import Circuit, Resonance, Sweep
from sheetgen.engine.standard_values import SERIES_TOLERANCE
from sheetgen.engine.stress import DcFeed, Drive, Stress, WorstCase
from sheetgen.engine.variation import (
    COIL_Q_SPREAD,
    Envelope,
    Spread,
    TemperatureCoefficient,
    VariationResult,
    VariationSpec,
    central_interval,
    dielectric,
    response_envelope,
    sample_parts,
    worst_case,
)
from sheetgen.errors import FieldError
from sheetgen.inputs.model import Job


@dataclass(frozen=True)
class BandPoint:
    """One frequency of a tuning band: the variable capacitor's setting there (nominal
    parts, solved on the network as built) and the windows of units tuned to it."""

    f_hz: float
    setting_f: float | None
    limits: TestLimits


@dataclass(frozen=True)
class BandTuning:
    """A tank tuned across a band by its variable capacitor: whether its range reaches each
    edge over the parts' spread (the trimmer check at both edges), and the band's points."""

    low_hz: float
    high_hz: float
    low_edge: TrimmerCheck  # needs the most capacitance
    high_edge: TrimmerCheck  # needs the least
    points: tuple[BandPoint, ...]  # low edge, middle, high edge

    @property
    def covers(self) -> bool:
        return self.low_edge.covers and self.high_edge.covers


@dataclass(frozen=True)
class Assessment:
    """Limits and rating checks of one design.

    limits are the bench windows (test ambient, widened by what the instruments cannot
    resolve); over_temperature the same figures over the operating range, for the record.
    """

    spec: VariationSpec  # at the bench ambient
    variation: VariationResult  # of the units as tested (trimmed, when there is a trimmer)
    limits: TestLimits
    tuned: bool  # the windows are for a unit trimmed to the target f0 at 25 °C
    trimmer: TrimmerCheck | None
    ratings: tuple[RatingCheck, ...]
    envelope: Envelope
    capacitor_tolerance: float
    capacitor_tolerance_source: str
    inductance_tolerance: float | None
    resolution_hz: float
    over_temperature: TestLimits | None = None
    operating_spec: VariationSpec | None = None
    untrimmed_f0_min_hz: float | None = None  # as assembled, before any trimming
    untrimmed_f0_max_hz: float | None = None
    trim_range_needed_f: float | None = None  # capacitance range that retunes every build
    inductance_window: tuple[float, float] | None = None  # as the LCR meter reads L
    capacitance_window: tuple[float, float] | None = None  # the fixed part(s) as read
    capacitor_temperature_assumed: str | None = None  # dielectric assumed (none named)
    inductance_tc_assumed: float | None = None  # 1/K, a default for the coil's kind
    loss_spread: float | None = None
    loss_spread_source: str | None = None  # "job" or "estimate"
    band: BandTuning | None = None  # tuning across a band (circuit.targets.band)
    current_density: CurrentDensity | None = None  # the winding's, at the worst case: shown

    @property
    def must_trim(self) -> bool:
        """The untrimmed f0 spread is wider than the bandwidth."""
        bw = self.limits.bandwidth_min_hz
        return (self.untrimmed_f0_min_hz is not None and math.isfinite(bw) and
                self.untrimmed_f0_max_hz - self.untrimmed_f0_min_hz > bw)


# Common practice: an air-core copper coil grows with copper's thermal expansion,
# ~17 ppm/K (from memory), and L scales with its linear size.
AIR_COIL_TC_PER_K = 17e-6
# No dielectric named: the parts list allows any, so the widest class is assumed.
ASSUMED_DIELECTRIC = "Y5V"


def variation_spec(job: Job, circuit: Circuit, inductance_tolerance: float | None,
                   inductance_tc: float | None, *,
                   temperature: tuple[float, float] | None = None
                   ) -> tuple[VariationSpec, float, str]:
    """The VariationSpec of a job; also the capacitor tolerance used and where it came from.

    temperature: the ambient range (default: the operating range). A capacitor with no
    dielectric or coefficient is taken as ASSUMED_DIELECTRIC; the coil's loss spreads by
    inductor.q_tolerance, else variation.loss_tolerance, else COIL_Q_SPREAD.
    """
    var = job.variation
    distribution = var.distribution
    cap = job.capacitor
    if cap.tolerance is not None:
        c_tol, c_source = cap.tolerance, "the job"
    else:
        c_tol = SERIES_TOLERANCE[cap.preferred_series]
        c_source = f"IEC 60063 {cap.preferred_series}"
    name = cap.dielectric
    if name is None and cap.temperature_coefficient is None:
        name = ASSUMED_DIELECTRIC
    c_temperature = None
    if name is not None:
        c_temperature = dielectric(name).temperature
        if isinstance(c_temperature, TemperatureCoefficient):
            c_temperature = replace(c_temperature, distribution=distribution)
    elif cap.temperature_coefficient is not None:
        c_temperature = TemperatureCoefficient(cap.temperature_coefficient)
    loss = (Spread(var.loss_tolerance, distribution) if var.loss_tolerance else None)
    coil_spread, _ = coil_loss_spread(job)
    coil_loss = Spread(coil_spread, distribution) if coil_spread else None
    load_tol = job.load.tolerance if job.load is not None else None
    low, high = temperature or (var.temperature.minimum, var.temperature.maximum)
    spec = VariationSpec(
        capacitance=Spread(c_tol, distribution),
        inductance=(Spread(inductance_tolerance, distribution)
                    if inductance_tolerance else None),
        inductor_resistance=coil_loss,
        capacitor_esr=loss if circuit.capacitor_esr_ohm > 0 else None,
        load_resistance=(Spread(load_tol, distribution)
                         if load_tol and circuit.load_resistance_ohm is not None else None),
        capacitor_temperature=c_temperature,
        inductance_temperature=(TemperatureCoefficient(inductance_tc)
                                if inductance_tc else None),
        temperature_min_c=low, temperature_max_c=high,
        trials=var.trials, seed=var.seed, coverage=var.coverage)
    return spec, c_tol, c_source


def coil_loss_spread(job: Job) -> tuple[float, str]:
    """The ± unit-to-unit spread of the coil's loss resistance and where it came from:
    inductor.q_tolerance, else variation.loss_tolerance ("job"), else COIL_Q_SPREAD
    ("default": a stated Q or an estimate is never taken as exact)."""
    if job.inductor.q_tolerance is not None:
        return job.inductor.q_tolerance, "job"
    if job.variation.loss_tolerance is not None:
        return job.variation.loss_tolerance, "job"
    return COIL_Q_SPREAD, "default"


def default_resolution_hz(bandwidth_hz: float | None, f0_hz: float) -> float:
    """A power of ten near bandwidth/50 (our rule: the window edges then sit a few
    percent of the bandwidth apart), or f0/10⁵ without a bandwidth."""
    basis = bandwidth_hz / 50.0 if bandwidth_hz else f0_hz / 1e5
    return 10.0 ** math.floor(math.log10(basis))


def assess(job: Job, circuit: Circuit, resonance: Resonance, stress: Stress,
           sweep: Sweep, names: Designators, *, f0_target_hz: float | None,
           fixed_capacitance_f: float, inductance_tolerance: float | None,
           inductance_tc: float | None, coil=None, flux_limit_t: float | None = None,
           wire_diameter_m: float | None = None, ac_to_dc_resistance: float = 1.0,
           fixed_parts_f: tuple[float, ...] = (),
           other_capacitance_f: float = 0.0,
           worst: WorstCase | None = None, dc: DcFeed | None = None,
           bench=None, band_settings_f: tuple[float | None, ...] = ()) -> Assessment:
    """Limits, trimmer range and rating checks for the nominal design; parts are rated at
    the worst credible case (`worst`, default the nominal stress) plus the DC a part sits
    at (`dc`); a designed coil (`coil`) is given evaluated at that case (its heat and
    flux), and its winding's current density is kept as information.

    The bench windows are for the circuit the test set-up builds (`bench`, an
    engine.bench.BenchSetup: the fixture's standard resistors and the 50 Ω ports, with
    their tolerances); the over-temperature figures are for the design's own circuit."""
    tc_assumed = None
    if inductance_tc is None and job.inductor.form == "solenoid":
        inductance_tc = tc_assumed = AIR_COIL_TC_PER_K
    bench_range = (job.test.ambient.minimum, job.test.ambient.maximum)
    spec, c_tol, c_source = variation_spec(job, circuit, inductance_tolerance, inductance_tc,
                                           temperature=bench_range)
    operating, _, _ = variation_spec(job, circuit, inductance_tolerance, inductance_tc)
    resolution = (job.test.frequency_resolution
                  or default_resolution_hz(resonance.bandwidth_hz, resonance.f0_hz))
    method = (partial(settled_monte_carlo, resolution_hz=resolution)  # stops once settled
              if job.variation.method == "monte-carlo" else worst_case)
    trimmer = job.capacitor.trimmer
    tuned = trimmer is not None and f0_target_hz is not None
    trim = None
    tested, tested_spec = circuit, spec
    if bench is not None:
        tested = bench.circuit
        spread = partial(Spread, distribution=job.variation.distribution)
        tested_spec = replace(spec, source_resistance=spread(bench.source.band),
                              load_resistance=spread(bench.receiver.hookup.band))
    untrimmed = method(tested, tested_spec)
    if tuned:  # the trimmer takes up the tolerances; what is tested is the trimmed unit
        built = sample_parts(circuit, spec, job.variation.method)
        trim = trimmer_check(built, f0_target_hz, fixed_capacitance_f, trimmer.minimum,
                             trimmer.maximum, other_capacitance_f=other_capacitance_f)
        variation = method(tested, replace(tested_spec, tuned_f0_hz=f0_target_hz))
        over = method(circuit, replace(operating, tuned_f0_hz=f0_target_hz))
    else:
        variation = untrimmed
        over = method(circuit, operating)
    bandwidth = resonance.bandwidth_hz
    step = (sweep_settings(float(sweep.f_hz[0]), float(sweep.f_hz[-1]), bandwidth).step_hz
            if bandwidth else 0.0)
    tuning = 0.0
    if tuned:
        tuning = (job.test.tuning_tolerance if job.test.tuning_tolerance is not None
                  else DEFAULT_TUNING_FRACTION * (bandwidth or 0.0))
    allowance = BenchAllowance(step, job.test.frequency_accuracy, job.test.lcr_accuracy,
                               tuning)
    limits = test_limits(variation, resolution_hz=resolution, allowance=allowance)
    band = job.circuit.targets.band if job.circuit.targets else None
    band_tuning = None
    if band is not None and tuned:
        band_tuning = _band_tuning(band, sample_parts(circuit, spec, job.variation.method),
                                   method, tested, tested_spec, fixed_capacitance_f, trimmer,
                                   other_capacitance_f, band_settings_f, resolution, allowance)
    over_limits = test_limits(over, resolution_hz=resolution)
    spread = central_interval(untrimmed.f0_hz, None if job.variation.method == "worst-case"
                              else spec.coverage)
    target = f0_target_hz or resonance.f0_hz
    needed = trimmer_check(untrimmed, target, fixed_capacitance_f, 0.0, 1.0,
                           other_capacitance_f=other_capacitance_f)
    lcr = job.test.lcr_accuracy
    c_window = part_window(fixed_capacitance_f, c_tol, lcr)
    l_window = part_window(circuit.inductance_h, inductance_tolerance, lcr)
    rated = worst.stress if worst is not None else stress
    flux = getattr(coil, "flux_density_peak_t", None) if coil is not None else None
    checks = rating_checks(job, circuit, rated, names, fixed_parts_f or (circuit.capacitance_f,),
                           flux=flux, flux_limit_t=flux_limit_t,
                           coil_rise_k=getattr(coil, "temperature_rise_k", None)
                           if coil is not None else None,
                           dc_across_capacitor_v=dc.across_capacitor_v if dc else 0.0)
    checks += bleeder_checks(job, rated, names, stress.drive_power_w, dc)
    density = (winding_current_density(rated.inductor_current_rms_a, wire_diameter_m,
                                       ac_to_dc_resistance=ac_to_dc_resistance)
               if wire_diameter_m is not None else None)
    loss_spread, loss_source = coil_loss_spread(job)
    loss_spread = loss_spread or None  # 0 %: the job takes the coil's Q as exact
    if loss_source == "default" and coil is not None and job.inductor.q is None:
        loss_source = "estimate"  # the default spread of an estimated Q
    return Assessment(spec, variation, limits, tuned, trim, checks,
                      response_envelope(tested, variation, sweep.f_hz, spec.coverage if
                               job.variation.method == "monte-carlo" else None),
                      c_tol, c_source, inductance_tolerance, resolution,
                      over_temperature=over_limits, operating_spec=operating,
                      untrimmed_f0_min_hz=spread.low, untrimmed_f0_max_hz=spread.high,
                      trim_range_needed_f=needed.needed_max_f - needed.needed_min_f,
                      inductance_window=l_window, capacitance_window=c_window,
                      capacitor_temperature_assumed=(
                          ASSUMED_DIELECTRIC if job.capacitor.dielectric is None
                          and job.capacitor.temperature_coefficient is None else None),
                      inductance_tc_assumed=tc_assumed, loss_spread=loss_spread,
                      loss_spread_source=loss_source if loss_spread else None,
                      current_density=density, band=band_tuning)


def band_points_hz(band) -> tuple[float, float, float]:
    """The band's edges and its geometric centre, where the sheet gives settings and windows."""
    return band.low, band.centre, band.high


def _band_tuning(band, built, method, tested, tested_spec, fixed_capacitance_f, trimmer,
                 other_capacitance_f, settings_f, resolution, allowance) -> BandTuning:
    """The trimmer check at both edges of the band (the capacitance each build needs there,
    Thomson's formula per trial), and the windows of units tuned to each band point (the
    Monte Carlo with every trial re-tuned there, as the technician sets it)."""
    def edge(f_hz):
        return trimmer_check(built, f_hz, fixed_capacitance_f, trimmer.minimum, trimmer.maximum,
                             other_capacitance_f=other_capacitance_f)
    points = []
    for k, f_hz in enumerate(band_points_hz(band)):
        tuned = method(tested, replace(tested_spec, tuned_f0_hz=f_hz))
        setting = settings_f[k] if k < len(settings_f) else None
        points.append(BandPoint(f_hz, setting, test_limits(tuned, resolution_hz=resolution,
                                                           allowance=allowance)))
    return BandTuning(band.low, band.high, edge(band.low), edge(band.high), tuple(points))


def bleeder_duty(job: Job, rated: Stress, dc: DcFeed | None = None):
    """What a bleeder across the capacitor dissipates and holds off (None without one):
    the RF at the worst case, V̂²/(2R), and any DC across the capacitor, V_dc²/R."""
    from sheetgen.design.records import BleederDuty
    r = job.capacitor.bleeder
    if r is None:
        return None
    v_dc = dc.across_capacitor_v if dc else 0.0
    v = rated.capacitor_voltage_peak_v + v_dc
    p = resistor_power(rated.capacitor_voltage_peak_v, r) + v_dc * v_dc / r
    return BleederDuty(r, v, p, p / DEFAULT_RESISTOR_POWER_DERATING, v)


def bleeder_checks(job: Job, rated: Stress, names: Designators,
                   drive_power_w: float, dc: DcFeed | None = None) -> tuple[RatingCheck, ...]:
    """The bleeder's power and working-voltage ratings, when the job gives them."""
    cap = job.capacitor
    if cap.bleeder is None or names.bleeder is None:
        return ()
    accepted = {a.check.strip().lower(): a.reason for a in job.ratings.accept}
    duty = bleeder_duty(job, rated, dc)
    drive = job_drive(job)
    checks = []
    if cap.bleeder_rated_power is not None:
        checks.append(resistor_power_check(
            names.bleeder, duty.power_w, cap.bleeder_rated_power, drive_power_w=drive_power_w,
            drive=drive, acceptance=accepted.get(f"{names.bleeder} power".lower())))
    if cap.bleeder_rated_voltage is not None:
        checks.append(resistor_voltage_check(
            names.bleeder, duty.voltage_peak_v, cap.bleeder_rated_voltage,
            drive_power_w=drive_power_w, drive=drive,
            acceptance=accepted.get(f"{names.bleeder} working voltage".lower())))
    return tuple(checks)


def capacitor_max_temperature_c(cap) -> float:
    """The highest rated temperature of the job's dielectric (the widest class, Y5V, when
    none is named: the same assumption the limits make)."""
    return dielectric(cap.dielectric or ASSUMED_DIELECTRIC).rated_max_c


def job_drive(job: Job) -> Drive:
    """The job's drive as the engine takes it: an open-circuit voltage, a current or an
    available power."""
    source = job.source
    if source.voltage is not None:
        return Drive("voltage", source.voltage)
    if source.current is not None:
        return Drive("current", source.current)
    return Drive("available_power", source.available_power)


def rating_checks(job: Job, circuit: Circuit, stress: Stress, names: Designators,
                  fixed_parts_f: tuple[float, ...], *, flux: float | None,
                  flux_limit_t: float | None, coil_rise_k: float | None = None,
                  dc_across_capacitor_v: float = 0.0
                  ) -> tuple[RatingCheck | UnratedCheck, ...]:
    """Every rating the job gives, against the computed stress (parallel parts share the
    capacitor current in proportion to their capacitance); the capacitors' and the
    trimmer's peak voltage is the RF peak plus the DC across them. A capacitor's voltage
    and ESR power and the trimmer's voltage without a rating are UnratedChecks, never a
    pass. The coil's heating is judged by its temperature (coil_rise_k)."""
    ratings = job.ratings
    accepted = {a.check.strip().lower(): a.reason for a in ratings.accept}
    power = stress.drive_power_w
    drive = job_drive(job)  # remedies name the job's own drive quantity
    cap = job.capacitor
    checks = []

    def acceptance(part, quantity):
        return accepted.get(f"{part} {quantity}".lower())

    total_c = circuit.capacitance_f
    for part, c_part in zip(names.fixed_capacitors, fixed_parts_f):
        share = c_part / total_c
        peak = stress.capacitor_voltage_peak_v + dc_across_capacitor_v
        if cap.rated_voltage is not None:
            checks.append(capacitor_voltage_check(
                part, stress.capacitor_voltage_peak_v, cap.rated_voltage,
                derating=ratings.voltage_derating, drive_power_w=power, drive=drive,
                acceptance=acceptance(part, "peak voltage"), dc_v=dc_across_capacitor_v))
        else:  # a missing rating is not a pass
            checks.append(unrated_check(part, "peak voltage", "V", peak, peak,
                                        acceptance(part, "peak voltage")))
        if cap.rated_current is not None:
            checks.append(capacitor_current_check(
                part, stress.capacitor_current_rms_a * share, cap.rated_current,
                derating=ratings.current_derating, drive_power_w=power, drive=drive,
                acceptance=acceptance(part, "RF current")))
        if cap.thermal_resistance is not None:  # its own ESR heats it: ΔT = P·Rθ
            checks.append(surface_temperature_check(
                part, job.variation.temperature.maximum,
                stress.capacitor_loss_w * share * cap.thermal_resistance,
                limit_c=capacitor_max_temperature_c(cap), drive_power_w=power,
                acceptance=acceptance(part, "surface temperature")))
        if cap.rated_power is not None:
            checks.append(esr_power_check(
                part, stress.capacitor_loss_w * share, cap.rated_power,
                esr_ohm=circuit.capacitor_esr_ohm, drive_power_w=power, drive=drive,
                acceptance=acceptance(part, "power in ESR")))
        elif stress.capacitor_loss_w > 0:
            checks.append(unrated_check(part, "power in ESR", "W",
                                        stress.capacitor_loss_w * share, peak,
                                        acceptance(part, "power in ESR")))
    trimmer_peak = stress.capacitor_voltage_peak_v + dc_across_capacitor_v
    if names.trimmer and cap.trimmer is not None and cap.trimmer.rated_voltage is not None:
        checks.append(capacitor_voltage_check(
            names.trimmer, stress.capacitor_voltage_peak_v, cap.trimmer.rated_voltage,
            derating=ratings.voltage_derating, drive_power_w=power, drive=drive,
            acceptance=acceptance(names.trimmer, "peak voltage"),
            dc_v=dc_across_capacitor_v))
    elif names.trimmer and cap.trimmer is not None:
        checks.append(unrated_check(names.trimmer, "peak voltage", "V", trimmer_peak,
                                    trimmer_peak, acceptance(names.trimmer, "peak voltage")))
    if coil_rise_k is not None:
        checks.append(surface_temperature_check(
            names.coil, job.variation.temperature.maximum, coil_rise_k, drive_power_w=power,
            acceptance=acceptance(names.coil, "surface temperature")))
    if flux is not None and flux_limit_t is not None:
        checks.append(flux_density_check(
            names.coil, flux, flux_limit_t, drive_power_w=power, drive=drive,
            acceptance=acceptance(names.coil, "flux density")))
    known = {f"{c.part} {c.quantity}".lower() for c in checks}
    for index, accepted_check in enumerate(ratings.accept):
        if accepted_check.check.strip().lower() not in known:
            names = ", ".join(f"{c.part} {c.quantity}" for c in checks) or "none"
            raise FieldError(f"ratings.accept[{index}].check",
                                    f"no rating check is called {accepted_check.check!r}; the "
                                    f"checks of this design are: {names}")
    return tuple(checks)
