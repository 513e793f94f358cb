"""The labelled, formatted rows that both the terminal summary and the PDF sheet show.

One place decides how each computed value is named and formatted for people, so the
summary, the sheet and the tests that read the sheet agree. Nothing here computes physics.
"""

from __future__ import annotations

from dataclasses import dataclass

from sheetgen.design.records import Design
from sheetgen.quantities import format_number
from sheetgen.report.cautions import dc_feed_text, names_text
from sheetgen.report.formatting import (
    condition_text,
    percent,
    plural,
    printed_part_window,
    quantity_text,
    range_text,
    resolved_range_text,
    resolved_text,
    signed,
    stress_text,
    tolerance_text,
)
from sheetgen.report.winding import coil_check


@dataclass(frozen=True)
class Row:
    """One labelled value: what it is, the formatted value, and an optional remark."""

    label: str
    value: str
    remark: str = ""


def component_rows(design: Design) -> list[Row]:
    """The circuit's parts as analysed (as fitted), with where each value came from."""
    c = design.circuit
    derived = {d.field: d.reason for d in design.derived}
    coil = design.coil
    if coil is not None:
        inductance_remark = (f"{plural(coil.result.turns, 'turn')}, built"
                             + (f" on {coil.core_name}" if coil.core_name else "")
                             + (", with its leads" if coil.leads and coil.leads.counted
                                else ""))
        loss_remark = ("estimated at f0" if coil.q_source == "estimate"
                       else "from the job's Q")
    else:
        inductance_remark = _origin(derived, "inductor.inductance")
        loss_remark = "series, at f0"
    rows = [
        Row("Topology", c.topology),
        Row("Inductance L", quantity_text(c.inductance_h, "H"), inductance_remark),
        Row("Coil loss resistance rL", quantity_text(c.inductor_resistance_ohm, "Ω"), loss_remark),
        Row("Capacitance C", quantity_text(c.capacitance_f, "F"), _capacitance_remark(design)),
    ]
    rows += capacitor_rows(design)
    rows += across_rows(design)
    rows += [
        Row("Capacitor ESR rC", quantity_text(c.capacitor_esr_ohm, "Ω"), "at f0"),
        Row("Source resistance Rs", quantity_text(c.source_resistance_ohm, "Ω")
            if c.source_resistance_ohm is not None else "ideal source"),
        Row("Load resistance RL", quantity_text(c.load_resistance_ohm, "Ω")
            if c.load_resistance_ohm is not None else "none",
            _origin(derived, "load.resistance")),
    ]
    return rows


def _capacitance_remark(design: Design) -> str:
    across = design.capacitor_choice.across
    if across is not None and across.added:
        return ("as the job states it" if across.total_f == 0.0
                else "the job's capacitance, with what is across it")
    return "as fitted, with what is already across it"


def across_rows(design: Design) -> list[Row]:
    """The capacitance across C that is not a part to fit: subtracted before choosing the
    parts (design mode), or added to the capacitance the job states."""
    across = design.capacitor_choice.across
    if across is None:
        return []
    source = {"medhurst_1947": "Medhurst (1947)", "job": "from the job"}.get(across.self_source)
    stray = {"job": "strays {} (capacitor.stray)",
             "default": "strays {} (default for short point-to-point wiring, common practice; "
                        "capacitor.stray)",
             "none": "no strays counted (capacitor.stray)"}[across.stray_source]
    parts = [stray.format(quantity_text(across.stray_f, "F"))]
    if design.circuit.topology == "parallel":
        parts.insert(0, "coil self-capacitance none estimated (give inductor.self_capacitance)"
                     if across.self_source == "none" else
                     f"coil self-capacitance {quantity_text(across.self_capacitance_f, 'F')}"
                     f" ({source})")
    how = ("added to the job's capacitance: " if across.added
           else "subtracted from the capacitance to fit: ")
    return [Row("Capacitance already across C", quantity_text(across.total_f, "F"),
                how + ", ".join(parts))]


def capacitor_rows(design: Design) -> list[Row]:
    """What capacitance the design needs and which standard parts make it up."""
    choice = design.capacitor_choice
    if not choice.from_standard_parts:  # the job states the part built: nothing to pick
        return []
    derived = {d.field: d.reason for d in design.derived}
    parts = " + ".join(quantity_text(v, "F", 3) for v in choice.fixed_parts_f)
    rows = [Row("Capacitance required", quantity_text(choice.required_f, "F"),
                _origin(derived, "capacitor.capacitance"))]
    if choice.trimmer_setting_f is None:
        rows.append(Row(f"Fixed {choice.series} part(s) to fit", parts,
                        f"{signed(choice.pair.error_rel * 100, 2)} % of required"))
    else:
        trimmer = design.job.capacitor.trimmer
        rows.append(Row(f"Fixed {choice.series} part(s) to fit", parts, "with the trimmer"))
        rows.append(Row("Trimmer setting", quantity_text(choice.trimmer_setting_f, "F"),
                        f"range {quantity_text(trimmer.minimum, 'F', 3)} to {quantity_text(trimmer.maximum, 'F', 3)}"
                        + ("" if choice.trimmer_in_range else "; OUT OF RANGE")))
    return rows


def coil_rows(design: Design) -> list[Row]:
    """The designed coil: winding, wire, losses, Q, self-resonance and flux."""
    coil = design.coil
    if coil is None:
        return []
    r = coil.result
    rows = [Row("Coil form", coil.form)]
    if coil.form == "toroid":
        rows += [
            Row("Core", coil.core_name, f"material {coil.material_name}"),
            Row("Inductance factor AL", quantity_text(r.al_h_per_turn2 * 1e9, "", 4).strip() + " nH/turn²",
                "from µi and geometry (IEC 60205)" if r.al_from_geometry else "from the core's data"),
            # areas and volumes in mm² and mm³: a prefix would scale the metre, not m²
            Row("Effective magnetic path length le", quantity_text(r.effective.le_m, "m"), "IEC 60205"),
            Row("Effective area Ae", format_number(r.effective.ae_m2 * 1e6, 4) + " mm²",
                "IEC 60205"),
            Row("Effective volume Ve", format_number(r.effective.ve_m3 * 1e9, 4) + " mm³",
                "IEC 60205"),
        ]
    rows += [
        Row("Inductance wanted", quantity_text(coil.target_inductance_h, "H")),
        Row("Turns N", str(r.turns), "each pass through the centre is one turn"
            if coil.form == "toroid" else "whole turns"),
        Row("Inductance built", quantity_text(r.inductance_built_h, "H"), "the winding"),
    ]
    if coil.leads is not None:
        leads = coil.leads
        rows.append(Row("Lead inductance", quantity_text(leads.inductance_h, "H"),
                        f"two {quantity_text(coil.lead_length_m, 'm', 3)} leads, "
                        f"{percent(leads.share)} of the winding (straight wire, Rosa/Grover); "
                        + ("counted in L" if leads.counted else "not counted")
                        + f": above {percent(leads.threshold)} counts"))
    if coil.f0_with_whole_turns_hz is not None:
        rows.append(Row("f0 before re-centring", quantity_text(coil.f0_with_whole_turns_hz, "Hz"),
                        "whole turns, capacitance for the wanted L"))
    rows += [
        Row("Wire", r.wire.name, f"grade {r.wire.grade} enamel, "
            f"{quantity_text(r.wire.overall_diameter_m, 'm', 3)} over enamel"),
        Row("Wire length to cut", quantity_text(r.wire_length_m, "m", 3), "winding and both leads"),
        Row("DC resistance", quantity_text(r.dc_resistance_ohm, "Ω")),
        Row("AC resistance of the wire", quantity_text(r.ac_resistance_ohm, "Ω"), "skin and proximity, at f0"),
    ]
    if coil.form == "toroid":
        rows.append(Row("Core loss resistance", quantity_text(r.core_loss_resistance_ohm, "Ω"), "at f0"))
    rows.append(Row("Coil Q", format_number(coil.q_used, 4),
                    "estimated" if coil.q_source == "estimate" else "from the job"))
    if coil.form == "solenoid":
        rows += [
            Row("Winding length", quantity_text(r.length_m, "m", 3), f"pitch {quantity_text(r.pitch_m, 'm', 3)}"),
            Row("Coil diameter", quantity_text(r.diameter_m, "m", 3), "to the wire centres"),
            Row("Nagaoka coefficient", format_number(r.nagaoka, 4)),
            Row("Round-wire correction", quantity_text(r.round_wire_correction_h, "H"),
                "Rosa: round wires instead of a current sheet"),
            Row("Wheeler's formula gives", quantity_text(r.wheeler_inductance_h, "H"), "cross-check"),
            Row("Self-capacitance", quantity_text(r.self_capacitance_f, "F", 3), "Medhurst (1947)"),
        ]
    srf_remark = {"job": f"with the job's self-capacitance {quantity_text(r.self_capacitance_f, 'F', 3)}",
                  "medhurst_1947": "Medhurst's self-capacitance"}.get(
        r.srf_basis, "no estimate for a ring core; give inductor.self_capacitance")
    rows.append(Row("Self-resonant frequency", quantity_text(r.srf_hz, "Hz") if r.srf_hz else "not estimated",
                    srf_remark))
    if coil.form == "toroid":
        rows += [
            Row("Peak flux density", quantity_text(r.flux_density_peak_t, "T", 3),
                f"{format_number(r.flux_density_peak_t * 1e4, 3)} G as driven"
                + _at_worst(design, "flux_density_peak_t", "T") + "; limit "
                f"{quantity_text(coil.flux_density_max_t, 'T', 3)}"),
            Row("Core loss (used for heat)", _watts(r.core_loss_w), _core_loss_remark(r)),
            Row("Core loss from the loss table", _watts(r.core_loss_table_w),
                "I²·r_core: the loss that sets the Q"
                + ("; the table is extrapolated to f0" if r.core_loss_table_extrapolated else "")),
            Row("Core loss by Steinmetz", _watts(r.core_loss_steinmetz_w),
                "k·f^α·B̂^β·Ve" if r.core_loss_steinmetz_w is not None else "no Steinmetz data"),
            Row("Turns per layer", str(r.turns_per_layer), "on the inner circumference"),
            Row("Winding spread", format_number(r.winding_angle_deg, 3) + "°",
                f"close-wound {format_number(r.close_wound_angle_deg, 3)}°"),
        ]
    case = condition_text(design.worst.condition if design.worst else None)
    rows += [Row("Copper loss", _watts(r.copper_loss_w),
                 "I²·R_ac at the design drive" + _at_worst(design, "copper_loss_w", "W")),
             Row("Temperature rise", (format_number(r.temperature_rise_k, 3) + " K")
                 if r.temperature_rise_k is not None else "—",
                 "natural convection from the " + ("core's" if coil.form == "toroid" else
                                                    "winding's") + " surface (common "
                 "practice)" + _at_worst(design, "temperature_rise_k", "K")
                 + "; the worst case is checked under Ratings")]
    density = design.assessment.current_density
    if density is not None:
        rows.append(Row("Current density", stress_text(density.actual_a_per_m2, "A/m²"),
                        f"information, {case}: over the skin-effect area; "
                        f"{stress_text(density.dc_reference_a_per_m2, 'A/m²')} in DC (common "
                        f"practice for enamelled windings in free air) is "
                        f"{stress_text(density.reference_a_per_m2, 'A/m²')} here for the same "
                        "heat per metre; the winding's temperature decides"))
    rows.append(Row("Winding fits", "yes" if r.fits else "NO"))
    if coil.link_turns is not None:
        rows.append(Row(f"Link winding {design.designators.link or ''}".rstrip(),
                        plural(coil.link_turns, "turn"),
                        f"to {quantity_text(coil.link_resistance_ohm, 'Ω')}: N√(R_link/R_tank) rounded, "
                        "at least 1" + _presented(coil)))
    if coil.tap_turns is not None:
        rows.append(Row("Tap", f"at turn {coil.tap_turns} from the start (cold) end",
                        f"for {quantity_text(coil.tap_resistance_ohm, 'Ω')}: N√(R_tap/R_tank) rounded"
                        + _presented(coil)))
    return rows


def _at_worst(design: Design, field: str, unit: str) -> str:
    """'; 12.5 W with the load open': the coil's figure at the worst case, where it differs."""
    worst = design.coil_at_worst
    if (worst is None or design.worst is None or design.worst.condition == "as driven"
            or getattr(worst, field, None) is None):
        return ""
    return (f"; {quantity_text(getattr(worst, field), unit, 3)} "
            f"{condition_text(design.worst.condition)}")


def _presented(coil) -> str:
    """What the whole-turn link or tap presents to the tank, beside what was aimed at."""
    c = coil.coupling
    if c is None:
        return ""
    return (f"; presents {quantity_text(c.presented_ohm, 'Ω')} to the tank "
            f"(aimed at {quantity_text(c.aimed_ohm, 'Ω')})")


def _origin(derived: dict, field: str) -> str:
    return f"computed: {derived[field]}" if field in derived else ""


def _as_built(design: Design, field: str) -> str:
    """The reason a figure is the as-built one (a Derivation), with the job's target."""
    reasons = {d.field: d.reason for d in design.derived}
    return reasons.get(field, "")


def performance_rows(design: Design) -> list[Row]:
    """Expected frequencies, Q, bandwidth and impedance (NOT the test limits)."""
    r = design.resonance
    parallel = design.circuit.topology == "parallel"
    rows = [
        Row("Resonant frequency f0", quantity_text(r.f0_hz, "Hz"), "1/(2π√(LC))"),
    ]
    rows += _offset_rows(design)
    rows += [
        Row("Frequency of maximum response", quantity_text(r.f_peak_hz, "Hz"),
            "tank voltage" if parallel else "loop current"),
    ]
    if parallel:
        rows.append(Row("Unity power factor frequency", quantity_text(r.f_unity_pf_hz, "Hz"),
                        "impedance phase zero"))
    rows += [
        Row("Lower half-power (−3 dB) point", quantity_text(r.f_low_hz, "Hz")),
        Row("Upper half-power (−3 dB) point", quantity_text(r.f_high_hz, "Hz")),
        Row("Bandwidth (−3 dB)", quantity_text(r.bandwidth_hz, "Hz"),
            _as_built(design, "resonance.bandwidth")),
        Row("Reactance at f0", quantity_text(r.reactance_ohm, "Ω")),
        Row("Coil Q", format_number(r.q_inductor, 4), "X0/rL"),
        Row("Capacitor Q", format_number(r.q_capacitor, 4), "X0/rC"),
        Row("Unloaded Q", format_number(r.q_unloaded, 4), "X0/(rL + rC)"),
        Row("Loaded Q", format_number(r.q_loaded, 4), "f0/bandwidth"
            + ("; " + _as_built(design, "resonance.q_loaded")
               if _as_built(design, "resonance.q_loaded") else "")),
        Row("Impedance at the response maximum", quantity_text(r.impedance_at_peak_ohm, "Ω"),
            "source resistance excluded"),
    ]
    if parallel:
        rows.append(Row("Dynamic resistance of the tank", quantity_text(r.dynamic_resistance_ohm, "Ω"),
                        "|Z| at zero phase (exact)"))
    return rows


def _offset_rows(design: Design) -> list[Row]:
    """The built f0 against the job's f0 target, in hertz and in bandwidths."""
    o = design.target_offset
    if o is None:
        return []
    exact = abs(o.offset_hz) < 1e-9 * o.target_hz  # re-centred: only rounding is left
    off = quantity_text(0.0 if exact else o.offset_hz, "Hz")
    if not off.startswith(("−", "-", "0")):
        off = "+" + off
    value = off.replace("-", "−")
    if o.bandwidths is not None:
        value += f" ({signed(0.0 if exact else o.bandwidths, 2)} bandwidths)"
    verdict = ("MISSES the target: outside the half-power band or the f0 window"
               if o.misses else "within half a bandwidth and the f0 window")
    return [Row("Offset from the f0 target", value,
                f"target {quantity_text(o.target_hz, 'Hz')}; {verdict}")]


def stress_rows(design: Design) -> list[Row]:
    """Voltages, currents and powers at the response maximum for the job's drive."""
    s = design.stress
    drive = design.drive
    o = design.stress_open_load
    drive_text = {"voltage": quantity_text(drive.value, "V") + " rms open-circuit",
                  "current": quantity_text(drive.value, "A") + " rms",
                  "available_power": quantity_text(drive.value, "W") + " available"}[drive.kind]
    open_rows = [] if o is None else [
        Row("Capacitor voltage, load open", quantity_text(o.capacitor_voltage_peak_v, "V")
            + " peak", f"the same drive, load disconnected, at {quantity_text(o.f_hz, 'Hz')}; "
            "parts are rated against the worse case"),
        Row("Capacitor current, load open", quantity_text(o.capacitor_current_rms_a, "A")
            + " rms"),
        Row("Coil voltage, load open", quantity_text(o.inductor_voltage_peak_v, "V") + " peak"),
        Row("Coil current, load open", quantity_text(o.inductor_current_rms_a, "A") + " rms"),
    ]
    dc = design.dc
    names = design.designators
    dc_rows = [] if dc is None else [
        Row("DC supply on the tank", quantity_text(dc.supply_v, "V"),
            dc_feed_text(dc, names_text(names.capacitors), names.coil,
                         len(names.capacitors) > 1)),
    ]
    return [
        Row("Drive", drive_text, f"at {quantity_text(s.f_hz, 'Hz')}"),
        Row("Power into the circuit", quantity_text(s.drive_power_w, "W")),
        Row("Capacitor voltage", quantity_text(s.capacitor_voltage_rms_v, "V") + " rms",
            quantity_text(s.capacitor_voltage_peak_v, "V") + " peak"),
        Row("Capacitor current", quantity_text(s.capacitor_current_rms_a, "A") + " rms"),
        Row("Coil voltage", quantity_text(s.inductor_voltage_rms_v, "V") + " rms",
            quantity_text(s.inductor_voltage_peak_v, "V") + " peak"),
        Row("Coil current", quantity_text(s.inductor_current_rms_a, "A") + " rms"),
        Row("Power in the coil's loss", quantity_text(s.inductor_loss_w, "W")),
        Row("Power in the capacitor's ESR", quantity_text(s.capacitor_loss_w, "W")),
        Row("Power in the load", quantity_text(s.load_power_w, "W")),
        Row("Load voltage", quantity_text(s.load_voltage_rms_v, "V") + " rms",
            "across the tank; the link steps it down to its load"
            if design.coil is not None and design.coil.link_turns is not None else
            "across the tank; the tap steps it down to its load"
            if design.coil is not None and design.coil.tap_turns is not None else ""),
    ] + open_rows + dc_rows


_DUTY_UNITS = {"resistor": "Ω", "source_resistance": "Ω", "capacitor": "F", "coil": "H"}
_DUTY_NAMES = {"CSELF": "coil's self-capacitance", "CSTRAY": "wiring strays"}


def duty_rows(design: Design) -> list[Row]:
    """Every part of the circuit's network with what it carries, from one exact solve: at the
    job's drive and, where it is worse, with the load open (design/kinds)."""
    duties = design.duties
    if duties is None:
        return []
    worst = {d.name: d for d in duties.worst}
    rows = []
    for d in duties.nominal:
        unit = _DUTY_UNITS.get(d.kind)
        what = (f"{quantity_text(d.value, unit, 4)}" if unit else f"ratio {format_number(d.value, 4)}:1")
        label = f"{d.name}, {what}" + (f" ({_DUTY_NAMES[d.name]})" if d.name in _DUTY_NAMES else "")
        if d.kind == "source_resistance":
            label = f"{d.name}, {what} (the source's own)"
        figures = (f"{quantity_text(d.voltage_peak_v, 'V')} peak, "
                   f"{quantity_text(d.current_rms_a, 'A')} rms, "
                   + ("ideal, lossless" if d.kind == "turns_ratio" else quantity_text(d.power_w, 'W')))
        w = worst[d.name]
        remark = ""
        if w != d and duties.open_load_f_hz is not None:
            remark = (f"load open: {quantity_text(w.voltage_peak_v, 'V')} peak, "
                      f"{quantity_text(w.current_rms_a, 'A')} rms, {quantity_text(w.power_w, 'W')} "
                      f"at {quantity_text(duties.open_load_f_hz, 'Hz')}")
        rows.append(Row(label, figures, remark))
    return rows


def _inward(window: tuple[float, float], unit: str) -> str:
    """How a part's printed window comes from the computed one (the test record's too)."""
    return (f"computed {range_text(*window, unit)}, each edge rounded inward to the "
            "figures printed")


def limits_rows(design: Design) -> list[Row]:
    """The test windows, each beside its nominal value, and how they were set."""
    a = design.assessment
    lim, r = a.limits, design.resonance
    rows = [Row("Units tested", "trimmed to the f0 target at 25 °C")] if a.tuned else []
    b, step = design.bench.resonance, lim.resolution_hz  # the windows are the bench's

    def window(low: float, high: float, nominal: float) -> tuple[str, str]:
        return (resolved_range_text(low, high, step, "Hz"),
                f"nominal {resolved_text(nominal, step, 'Hz')}")
    rows += [
        Row("f0 window", *window(lim.f0_min_hz, lim.f0_max_hz, b.f0_hz)),
        Row("Peak frequency window", *window(lim.f_peak_min_hz, lim.f_peak_max_hz, b.f_peak_hz)),
        Row("Bandwidth window", *window(lim.bandwidth_min_hz, lim.bandwidth_max_hz,
                                        b.bandwidth_hz)),
        Row("Loaded Q window", f"{format_number(lim.q_loaded_min, 4)} to "
            f"{format_number(lim.q_loaded_max, 4)}", f"nominal {format_number(b.q_loaded, 4)}"),
        Row("Lower half-power point window", *window(lim.f_low_min_hz, lim.f_low_max_hz,
                                                     b.f_low_hz)),
        Row("Upper half-power point window", *window(lim.f_high_min_hz, lim.f_high_max_hz,
                                                     b.f_high_hz)),
        Row("Unloaded Q window", f"{format_number(lim.q_unloaded_min, 4)} to "
            f"{format_number(lim.q_unloaded_max, 4)}",
            f"nominal {format_number(r.q_unloaded, 4)}; X0/(rL + rC)"),
        Row("Impedance window", f"{quantity_text(lim.impedance_min_ohm, 'Ω', 3)} to "
            f"{quantity_text(lim.impedance_max_ohm, 'Ω', 3)}", f"nominal {quantity_text(r.impedance_at_peak_ohm, 'Ω')}"
            " at the response maximum, source resistance excluded"),
    ]
    if a.trimmer is not None:
        t = a.trimmer
        needed = (range_text(t.needed_min_f, t.needed_max_f, "F") if t.needed_min_f >= 0 else
                  f"up to {quantity_text(t.needed_max_f, 'F')}" if t.needed_max_f > 0 else
                  "none can tune it")
        note = ("covered" if t.covers else
                f"NOT COVERED: the trimmer tunes {t.fraction_tunable * 100:.1f} % of builds")
        if t.needed_min_f < 0:  # never a negative capacitance: say what it means
            note += (f"; the fixed part alone exceeds f0's capacitance by up to "
                     f"{quantity_text(-t.needed_min_f, 'F')} in some builds")
        rows.append(Row("Trimmer capacitance needed", needed, note))
    rows += band_rows(design)
    method = (f"Monte Carlo, {lim.trials:,} trials, seed {lim.seed}, "
              f"{lim.coverage * 100:.2f} % coverage" if lim.method == "monte-carlo"
              else f"worst case over {lim.trials} corners")
    spec = a.spec
    operating = a.operating_spec or spec
    rows += _bench_rows(design)
    rows += [
        Row("Method", method, f"bands read as {design.job.variation.distribution}"),
        Row("Bench ambient", f"{spec.temperature_min_c:g} to {spec.temperature_max_c:g} °C",
            "the windows above are for a test in this range (test.ambient)"),
        Row("Temperature range", f"{operating.temperature_min_c:g} to "
            f"{operating.temperature_max_c:g} °C", "operating range: see over temperature"),
        Row("Capacitor tolerance", tolerance_text(a.capacitor_tolerance),
            f"from {a.capacitor_tolerance_source}"),
        _inductance_tolerance_row(design),
        _loss_spread_row(design),
        Row("Windows rounded outward to", quantity_text(a.resolution_hz, "Hz", 3)),
    ]
    return rows


def band_rows(design: Design) -> list[Row]:
    """Tuning across the band: what the variable capacitor must reach at each edge, and at
    the edges and the middle its setting and the windows of a unit tuned there."""
    band = design.assessment.band
    if band is None:
        return []
    trimmer = design.designators.trimmer
    rows = [Row("Tuning band", range_text(band.low_hz, band.high_hz, "Hz", 6),
                f"tuned with {trimmer} ({quantity_text(band.low_edge.trimmer_min_f, 'F', 3)} to "
                f"{quantity_text(band.low_edge.trimmer_max_f, 'F', 3)})")]
    for label, edge in (("low", band.low_edge), ("high", band.high_edge)):
        state = ("reached" if edge.covers else
                 f"NOT REACHED by every build: {edge.fraction_tunable * 100:.1f} % reach it")
        rows.append(Row(f"{trimmer} needed at the {label} edge",
                        range_text(edge.needed_min_f, edge.needed_max_f, "F"),
                        f"{quantity_text(edge.target_f0_hz, 'Hz', 6)}; {state}"))
    for point in band.points:
        lim = point.limits
        setting = ("beyond its range" if point.setting_f is None
                   else f"set {trimmer} to about {quantity_text(point.setting_f, 'F', 3)}")
        rows.append(Row(f"At {quantity_text(point.f_hz, 'Hz', 6)}",
                        f"peak {range_text(lim.f_peak_min_hz, lim.f_peak_max_hz, 'Hz', 6)}; "
                        f"bandwidth {quantity_text(lim.bandwidth_min_hz, 'Hz')} to "
                        f"{quantity_text(lim.bandwidth_max_hz, 'Hz')}", setting))
    return rows
def _inductance_tolerance_row(design: Design) -> Row:
    """The coil's tolerance and where it came from: the job, or a stated default."""
    a = design.assessment
    inductor = design.job.inductor
    if not a.inductance_tolerance:
        return Row("Inductance tolerance", "exact", "the job gives 0 %" if
                   inductor.tolerance is not None else "none given (inductor.tolerance)")
    if inductor.tolerance is not None:
        origin = "from the job"
    elif inductor.form == "given":
        origin = "assumed for a bought coil (common practice); inductor.tolerance"
    elif inductor.form == "solenoid":
        origin = "assumed for a hand-wound coil (common practice); inductor.tolerance"
    else:
        origin = "the core's AL (or µi) tolerance; inductor.tolerance"
    return Row("Inductance tolerance", tolerance_text(a.inductance_tolerance), origin)


def _loss_spread_row(design: Design) -> Row:
    """How the coil's and capacitor's losses were varied: the job's spread, or the stated
    common-practice default for a coil Q (estimated, or stated by a maker)."""
    a = design.assessment
    esr = design.job.variation.loss_tolerance
    esr_text = (f"; capacitor ESR {tolerance_text(esr)}" if esr else "; capacitor ESR exact")
    if a.loss_spread_source == "job":
        return Row("Coil Q spread", tolerance_text(a.loss_spread),
                   "coil loss resistance, from the job" + esr_text)
    if a.loss_spread_source in ("default", "estimate"):
        what = "an estimate" if a.loss_spread_source == "estimate" else "a stated figure"
        return Row("Coil Q spread", tolerance_text(a.loss_spread),
                   f"coil loss resistance: the coil Q is {what}, assumed to spread so "
                   "(common practice); inductor.q_tolerance" + esr_text)
    return Row("Coil Q spread", "exact", "the job gives 0 %" + esr_text)


def _bench_rows(design: Design) -> list[Row]:
    """What the windows allow for besides the parts, what was assumed, the part windows,
    whether the unit must be trimmed, and the figures over the operating range."""
    a = design.assessment
    lim = a.limits
    b, step = design.bench.resonance, lim.resolution_hz
    rows = []
    if lim.allowance is not None:
        al = lim.allowance
        text = (f"sweep step {quantity_text(al.step_hz, 'Hz', 3)}, frequency "
                f"± {format_number(al.frequency_accuracy * 1e6, 3)} ppm, LCR and |Z| "
                f"{tolerance_text(al.lcr_accuracy)}")
        if a.tuned:
            text += f", tuned to within ± {quantity_text(al.tuning_hz, 'Hz', 3)}"
        rows.append(Row("Windows include", text, "what the bench cannot tell apart "
                        "(test.frequency_accuracy, test.lcr_accuracy, test.tuning_tolerance)"))
    bench = design.bench
    if bench is not None:
        rows.append(Row("Test set-up", f"source {quantity_text(bench.circuit.source_resistance_ohm, 'Ω')}"
                        f" {tolerance_text(bench.source.band)}, load "
                        f"{quantity_text(bench.circuit.load_resistance_ohm, 'Ω')} "
                        f"{tolerance_text(bench.receiver.hookup.band)}",
                        "the windows are for the circuit the test set-up builds: its E96 "
                        "resistors (± 1 %) and 50 Ω ports (test.port_tolerance); procedure "
                        "step 5"))
    rows.append(Row("Centre frequency window",
                    resolved_range_text(lim.f_centre_min_hz, lim.f_centre_max_hz, step, "Hz"),
                    "midpoint of the −3 dB points"
                    + (f", nominal {resolved_text(0.5 * (b.f_low_hz + b.f_high_hz), step, 'Hz')}"
                       if None not in (b.f_low_hz, b.f_high_hz) else "")
                    + "; for broad peaks"))
    if a.inductance_window is not None:
        check = coil_check(design)
        meter = ("the analyser" if check is not None and check.method == "analyser"
                 else "the LCR meter")
        rows.append(Row("Inductance window",
                        range_text(*printed_part_window(a.inductance_window), "H"),
                        f"as {meter} reads {design.designators.coil}; "
                        + _inward(a.inductance_window, "H")))
    if a.capacitance_window is not None:
        rows.append(Row("Capacitance window",
                        range_text(*printed_part_window(a.capacitance_window), "F"),
                        "as the LCR meter reads the fixed part(s); "
                        + _inward(a.capacitance_window, "F")))
    if a.untrimmed_f0_min_hz is not None:
        state = ("TRIMMING REQUIRED: wider than the bandwidth" if a.must_trim
                 else "within the bandwidth")
        rows.append(Row("Untrimmed f0 spread",
                        range_text(a.untrimmed_f0_min_hz, a.untrimmed_f0_max_hz, "Hz", 6),
                        f"as assembled; {state}; retuning every build takes "
                        f"{quantity_text(a.trim_range_needed_f, 'F')}"))
    if a.capacitor_temperature_assumed:
        rows.append(Row("Capacitor dielectric", f"{a.capacitor_temperature_assumed} assumed",
                        "none named: the widest class; name capacitor.dielectric"))
    if a.inductance_tc_assumed is not None:
        rows.append(Row("Coil temperature coefficient",
                        f"{signed(a.inductance_tc_assumed * 1e6, 0)} ppm/K assumed",
                        "copper's thermal expansion (air coil); give "
                        "inductor.temperature_coefficient"))
    o = a.over_temperature
    if o is not None:
        rows += [
            Row("Over temperature: f0", range_text(o.f0_min_hz, o.f0_max_hz, "Hz", 6),
                "operating range, not a bench window"),
            Row("Over temperature: peak frequency",
                range_text(o.f_peak_min_hz, o.f_peak_max_hz, "Hz", 6)),
            Row("Over temperature: bandwidth",
                range_text(o.bandwidth_min_hz, o.bandwidth_max_hz, "Hz")),
            Row("Over temperature: loaded Q", f"{format_number(o.q_loaded_min, 4)} to "
                f"{format_number(o.q_loaded_max, 4)}"),
        ]
    return rows


def rating_rows(design: Design) -> list[Row]:
    """Each rating check: the stress against the derated rating, and its status."""
    rows = []
    for check in design.assessment.ratings:
        if check.rating is None:  # a rating the job does not give
            rows.append(Row(f"{check.part} {check.quantity}",
                            f"{stress_text(check.actual, check.unit)}, rating not given",
                            {"not rated": "NOT RATED: give the rating (warning)",
                             "fail": "FAIL: rating not given, above extra-low voltage",
                             "accepted": "ACCEPTED without a rating"}[check.status]))
            continue
        status = {"pass": "pass", "fail": "FAIL", "accepted": "ACCEPTED"}[check.status]
        rows.append(Row(f"{check.part} {check.quantity}", f"{stress_text(check.actual, check.unit)} of "
                        f"{stress_text(check.allowed, check.unit)} allowed", f"{status}, margin "
                        f"{signed(check.margin * 100, 0)} %" + _rated_case(design, check)))
    return rows


def _rated_case(design: Design, check) -> str:
    """The case a rating is checked at: the worst credible one, and any DC in the figure."""
    worst = design.worst
    case = ("" if worst is None or worst.condition == "as driven"
            else f"; {condition_text(worst.condition)}")
    dc = design.dc
    capacitors = (*design.designators.capacitors, design.designators.bleeder)
    if (dc is not None and dc.across_capacitor_v and check.part in capacitors
            and check.quantity in ("peak voltage", "working voltage")):
        case += f"; RF peak plus {quantity_text(dc.across_capacitor_v, 'V')} DC"
    return case


def _watts(value: float | None) -> str:
    return quantity_text(value, "W", 3) if value is not None else "—"


def _core_loss_remark(r) -> str:
    """Which of the two core-loss estimates the heat uses (the larger)."""
    if r.core_loss_steinmetz_w is None:
        return "from the loss table"
    larger = "Steinmetz" if r.core_loss_steinmetz_w >= r.core_loss_table_w else "the loss table"
    return f"the larger estimate: {larger}"
