"""Design → the results contract (JSON) that work-order systems and scripts read.

The format is versioned ("sheetgen.results/1"); keys carry their SI unit as a suffix and
null marks a value that does not apply. Adding keys keeps the version; renaming or
removing one needs a new version.
"""

from __future__ import annotations

import json
import math

from sheetgen import __version__
from sheetgen.design.records import Design
from sheetgen.engine.bench import GENERATOR_RESISTANCE_OHM, PROBE_GAIN
from sheetgen.engine.limits import round_outward_significant
from sheetgen.report.advice import rating_advice
from sheetgen.report.cautions import DEFERRAL, design_cautions
from sheetgen.report.checks import failed_checks
from sheetgen.report.procedure import record_rows
from sheetgen.report.winding import coil_check, winding_steps

RESULTS_FORMAT = "sheetgen.results/1"
LIMITS_FORMAT = "sheetgen.limits/1"  # `limits --format json`: its own shape, its own name


def _clean(value):
    """JSON-safe: floats that are not finite become null; nested containers cleaned."""
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, dict):
        return {key: _clean(item) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(item) for item in value]
    return value


def results_document(design: Design) -> dict:
    """The results contract (docs/results.md) as plain data."""
    job, circuit, res, stress = design.job, design.circuit, design.resonance, design.stress
    choice = design.capacitor_choice
    return _clean({
        "format": RESULTS_FORMAT,
        "tool_version": __version__,
        "sheet": {"id": job.sheet.id, "title": job.sheet.title, "revision": job.sheet.revision,
                  "designer": job.sheet.designer, "date": job.sheet.date},
        "topology": circuit.topology,
        "components": {
            "inductance_h": circuit.inductance_h,
            "inductor_resistance_ohm": circuit.inductor_resistance_ohm,
            "capacitance_f": circuit.capacitance_f,
            "capacitor_esr_ohm": circuit.capacitor_esr_ohm,
            "source_resistance_ohm": circuit.source_resistance_ohm,
            "load_resistance_ohm": circuit.load_resistance_ohm,
            "capacitor_build": {
                "series": choice.series,
                "required_f": choice.required_f,
                "nearest_f": choice.nearest_f,
                "from_standard_parts": choice.from_standard_parts,
                "fixed_parts_f": list(choice.fixed_parts_f),
                "fixed_total_f": choice.fixed_f,
                "trimmer_setting_f": choice.trimmer_setting_f,
                "trimmer_in_range": choice.trimmer_in_range,
                "built_f": choice.built_f,
            },
            "capacitance_across": ({
                "coil_self_f": (None if choice.across.self_source == "none"
                                else choice.across.self_capacitance_f),
                "stray_f": choice.across.stray_f,
                "total_f": choice.across.total_f,
            } if choice.across is not None else None),
            "derived": [{"field": d.field, "value": d.value, "unit": d.unit, "reason": d.reason}
                        for d in design.derived],
        },
        "resonance": {
            "f0_hz": res.f0_hz,
            "f_peak_hz": res.f_peak_hz,
            "f_unity_pf_hz": res.f_unity_pf_hz,
            "reactance_ohm": res.reactance_ohm,
            "q_inductor": res.q_inductor,
            "q_capacitor": res.q_capacitor,
            "q_unloaded": res.q_unloaded,
            "q_loaded": res.q_loaded,
            "bandwidth_hz": res.bandwidth_hz,
            "f_low_hz": res.f_low_hz,
            "f_high_hz": res.f_high_hz,
            "impedance_at_peak_ohm": res.impedance_at_peak_ohm,
            "dynamic_resistance_ohm": res.dynamic_resistance_ohm,
        },
        "stress": {
            "at_frequency_hz": stress.f_hz,
            "drive": {"kind": design.drive.kind, "value": design.drive.value},
            "drive_power_w": stress.drive_power_w,
            "capacitor_voltage_rms_v": stress.capacitor_voltage_rms_v,
            "capacitor_voltage_peak_v": stress.capacitor_voltage_peak_v,
            "capacitor_current_rms_a": stress.capacitor_current_rms_a,
            "inductor_voltage_rms_v": stress.inductor_voltage_rms_v,
            "inductor_voltage_peak_v": stress.inductor_voltage_peak_v,
            "inductor_current_rms_a": stress.inductor_current_rms_a,
            "load_voltage_rms_v": stress.load_voltage_rms_v,
            "load_power_w": stress.load_power_w,
            "inductor_loss_w": stress.inductor_loss_w,
            "capacitor_loss_w": stress.capacitor_loss_w,
            **_open_load(design.stress_open_load),
            **_worst_case(design),
        },
        "parts": _parts(design),
        "band": _band(design),
        "inductor": _inductor(design),
        "limits": limits_section(design),
        "variation": _variation(design),
        "ratings": [_rating(check) for check in design.assessment.ratings],
        "checks": [{"code": c.code, "field": c.field, "text": c.text}
                   for c in failed_checks(design)],
        "cautions": [{"level": c.level, "code": c.code, "text": c.text}
                     for c in design_cautions(design)],
        "cautions_deferral": DEFERRAL,
        "test_record": test_record_section(design),
    })


def test_record_section(design: Design) -> dict:
    """What the bench measures and the windows each value of the test record is graded
    against (`sheetgen grade` reads these, attached to the sheet, and recomputes nothing)."""
    values = []
    for row in record_rows(design):
        m = row.measurement
        shown = row.expected.split(" ")
        values.append({
            "field": m.field, "quantity": m.field.removeprefix("measured."), "unit": m.unit,
            "display_unit": shown[1] if len(shown) == 2 else m.unit, "label": m.label,
            "min": row.minimum, "max": row.maximum, "verdict_field": row.verdict_field,
            "as_found_field": row.as_found_field, "required": row.verdict_field is not None})
    bench = design.bench
    return {"measurement": {"response": "transmission magnitude, S21 (through the test set-up)",
                            "detector": bench.receiver.place,
                            "source_hookup": bench.source.kind},
            "fixture": _fixture(bench), "values": values}


def _fixture(bench) -> dict:
    """The test set-up as the sheet lists it: each 50 Ω port's hookup with its standard
    resistor, what the circuit sees, the bench circuit's response and the test level."""
    def port(hookup, rating_w):
        style = hookup.style if hookup.is_resistor else None
        return {"hookup": hookup.kind, "resistor_ohm": hookup.resistor_ohm,
                "resistor_tolerance": hookup.resistor_tolerance if hookup.resistor_ohm else None,
                "resistor_shunt_capacitance_f": style.shunt_capacitance_f if style else None,
                "resistor_lead_inductance_h": style.lead_inductance_h if style else None,
                "capacitance_f": hookup.capacitance_f,  # coupling capacitor or probe input
                "turns": list(hookup.turns) if hookup.turns else None,  # (circuit, port)
                "power_rating_w": hookup.power_rating_w(rating_w) if style else rating_w,
                "wanted_ohm": hookup.wanted_ohm,
                "presented_ohm": hookup.presented_ohm, "band": hookup.band}
    source_w = bench.drive.source_resistor_rating_w
    receiver_w = bench.drive.receiver_resistor_rating_w
    r = bench.resonance
    return {
        "port_resistance_ohm": GENERATOR_RESISTANCE_OHM, "port_tolerance": bench.port_tolerance,
        "source": port(bench.source, source_w),
        "receiver": {"place": bench.receiver.place, "ratio": bench.receiver.ratio,
                     **port(bench.receiver.hookup, receiver_w)},
        "circuit": {"source_resistance_ohm": bench.circuit.source_resistance_ohm,
                    "source_capacitance_f": bench.circuit.source_capacitance_f,
                    "load_resistance_ohm": bench.circuit.load_resistance_ohm,
                    "capacitance_f": bench.circuit.capacitance_f},
        "probe_gain": PROBE_GAIN if bench.receiver.hookup.kind == "probe" else None,
        "received_dbm": bench.drive.received_dbm,
        "noise_floor_dbm": bench.noise_floor_dbm,
        "half_power_margin_db": bench.half_power_margin_db,
        "resonance": {"f_peak_hz": r.f_peak_hz, "f_low_hz": r.f_low_hz,
                      "f_high_hz": r.f_high_hz, "bandwidth_hz": r.bandwidth_hz,
                      "q_loaded": r.q_loaded, "impedance_at_peak_ohm": r.impedance_at_peak_ohm},
        "generator_emf_rms_v": bench.drive.generator_emf_rms_v,
        "generator_level_dbm": bench.drive.generator_level_dbm,
        "part_voltage_peak_v": bench.drive.part_voltage_peak_v,
    }


_PART_UNITS = {"resistor": "Ω", "source_resistance": "Ω", "capacitor": "F", "coil": "H",
               "turns_ratio": ""}


def _parts(design: Design) -> list[dict]:
    """Every part of the circuit's network (design/kinds), with its duty at the nominal drive
    and at the worst credible case (the larger of nominal and load open)."""
    if design.duties is None:
        return []
    duties = design.duties
    worst = {d.name: d for d in duties.worst}
    opened = {d.name for d in duties.open_load or ()}
    built = set(design.model.built)
    rows = []
    for d in duties.nominal:
        w = worst[d.name]
        rows.append({
            "designator": d.name, "kind": d.kind, "value": d.value, "unit": _PART_UNITS[d.kind],
            "fitted": d.name in built,
            "voltage_peak_v": d.voltage_peak_v, "current_rms_a": d.current_rms_a,
            "power_w": d.power_w,
            "worst_case": {
                "condition": "load_open" if d.name in opened and w != d else "nominal",
                "voltage_peak_v": w.voltage_peak_v, "current_rms_a": w.current_rms_a,
                "power_w": w.power_w,
                "at_frequency_hz": (duties.open_load_f_hz if d.name in opened and w != d
                                    else design.stress.f_hz),
            },
        })
    return rows


def _band(design: Design) -> dict | None:
    """Tuning across a band (null without one): the capacitance needed at each edge over
    the spread, and each band point's setting and windows."""
    band = design.assessment.band
    if band is None:
        return None

    def edge(check) -> dict:
        return {"f_hz": check.target_f0_hz, "needed_min_f": check.needed_min_f,
                "needed_max_f": check.needed_max_f, "fraction_tunable": check.fraction_tunable,
                "reached": check.covers}

    return {
        "low_hz": band.low_hz, "high_hz": band.high_hz, "covered": band.covers,
        "variable_capacitor": {"designator": design.designators.trimmer,
                               "minimum_f": band.low_edge.trimmer_min_f,
                               "maximum_f": band.low_edge.trimmer_max_f},
        "low_edge": edge(band.low_edge), "high_edge": edge(band.high_edge),
        "points": [{"f_hz": p.f_hz, "setting_f": p.setting_f,
                    "f_peak_min_hz": p.limits.f_peak_min_hz, "f_peak_max_hz": p.limits.f_peak_max_hz,
                    "bandwidth_min_hz": p.limits.bandwidth_min_hz,
                    "bandwidth_max_hz": p.limits.bandwidth_max_hz,
                    "q_loaded_min": p.limits.q_loaded_min, "q_loaded_max": p.limits.q_loaded_max}
                   for p in band.points],
    }


def _worst_case(design: Design) -> dict:
    """The case the parts are rated and the cautions worded at, and the DC supply's place
    (volts across the tuning capacitor, against the chassis, across a blocking capacitor;
    null without a supply)."""
    worst, dc = design.worst, design.dc
    return {
        "worst_case_condition": worst.condition if worst is not None else None,
        "worst_case_capacitor_voltage_peak_v": (worst.stress.capacitor_voltage_peak_v
                                                if worst is not None else None),
        "worst_case_inductor_current_rms_a": (worst.stress.inductor_current_rms_a
                                              if worst is not None else None),
        "dc_across_capacitor_v": dc.across_capacitor_v if dc else None,
        "dc_to_chassis_v": dc.to_chassis_v if dc else None,
        "dc_across_blocking_capacitor_v": dc.across_blocking_v if dc else None,
    }


def _open_load(open_stress) -> dict:
    """The same drive with the load disconnected (parallel tanks; null otherwise): the
    parts are rated against the worse of this and the nominal stress."""
    keys = ("capacitor_voltage_peak_v", "capacitor_current_rms_a", "inductor_voltage_peak_v",
            "inductor_current_rms_a")
    section = {f"open_load_{key}": (getattr(open_stress, key) if open_stress else None)
               for key in keys}
    section["open_load_at_frequency_hz"] = open_stress.f_hz if open_stress else None
    return section


def _inductor(design: Design) -> dict:
    """The inductor section: the designed coil's figures, or the given coil's."""
    coil = design.coil
    if coil is None:
        return {"form": "given", "turns": None, "al_h_per_turn2": None,
                "inductance_built_h": design.circuit.inductance_h, "wire": None,
                "wire_length_m": None, "dc_resistance_ohm": None, "ac_resistance_ohm": None,
                "q_estimated": None, "srf_hz": None, "flux_density_peak_t": None,
                "winding_angle_deg": None, "fits": None}
    r = coil.result
    toroid = coil.form == "toroid"
    check = coil_check(design)
    section = {
        "form": coil.form,
        "turns": r.turns,
        "al_h_per_turn2": r.al_h_per_turn2 if toroid else None,
        "al_from_geometry": r.al_from_geometry if toroid else None,
        "inductance_wanted_h": coil.target_inductance_h,
        "inductance_built_h": r.inductance_built_h,
        "inductance_tolerance": coil.inductance_tolerance,
        "f0_with_whole_turns_hz": coil.f0_with_whole_turns_hz,
        "core": coil.core_name,
        "material": coil.material_name,
        "wire": {"name": r.wire.name, "diameter_m": r.wire.diameter_m,
                 "overall_diameter_m": r.wire.overall_diameter_m, "grade": r.wire.grade,
                 "awg": r.wire.awg},
        "wire_length_m": r.wire_length_m,
        "lead_length_m": coil.lead_length_m,
        "lead_inductance_h": coil.leads.inductance_h if coil.leads else None,
        "lead_inductance_counted": coil.leads.counted if coil.leads else None,
        "dc_resistance_ohm": r.dc_resistance_ohm,
        "ac_resistance_ohm": r.ac_resistance_ohm,
        "core_loss_resistance_ohm": r.core_loss_resistance_ohm if toroid else 0.0,
        "q_estimated": r.q_estimated,
        "q_used": coil.q_used,
        "q_source": coil.q_source,
        "effective_parameters": ({"le_m": r.effective.le_m, "ae_m2": r.effective.ae_m2,
                                  "ve_m3": r.effective.ve_m3} if toroid else None),
        "self_capacitance_f": r.self_capacitance_f,
        "srf_hz": r.srf_hz,
        "flux_density_peak_t": r.flux_density_peak_t if toroid else None,
        "flux_density_max_t": coil.flux_density_max_t,
        "core_loss_w": r.core_loss_w if toroid else None,
        "core_loss_table_w": r.core_loss_table_w if toroid else None,
        "core_loss_steinmetz_w": r.core_loss_steinmetz_w if toroid else None,
        "core_loss_table_extrapolated": r.core_loss_table_extrapolated if toroid else None,
        "copper_loss_w": r.copper_loss_w,
        "temperature_rise_k": r.temperature_rise_k,
        "turns_per_layer": r.turns_per_layer if toroid else None,
        "winding_angle_deg": r.winding_angle_deg if toroid else None,
        "winding_length_m": None if toroid else r.length_m,
        "pitch_m": None if toroid else r.pitch_m,
        "nagaoka_coefficient": None if toroid else r.nagaoka,
        "wheeler_inductance_h": None if toroid else r.wheeler_inductance_h,
        "round_wire_correction_h": None if toroid else r.round_wire_correction_h,
        "fits": r.fits,
        "remedy": r.remedy if toroid else None,
        "link_turns": coil.link_turns,
        "link_resistance_ohm": coil.link_resistance_ohm,
        "coupling": ({"kind": coil.coupling.kind, "turns": coil.coupling.turns,
                      "resistance_ohm": coil.coupling.resistance_ohm,
                      "aimed_ohm": coil.coupling.aimed_ohm,
                      "presented_ohm": coil.coupling.presented_ohm}
                     if coil.coupling is not None else None),
        "tap_turns": coil.tap_turns,
        "tap_resistance_ohm": coil.tap_resistance_ohm,
        "check": {"inductance_h": check.inductance_h, "tolerance": check.tolerance,
                  "measure_at_hz": check.measure_at_hz},
        "winding_steps": [step.text for step in winding_steps(design)],
    }
    return section


def limits_section(design: Design) -> dict:
    """The test limits for a work order: windows rounded outward, the trimmer range."""
    a = design.assessment
    lim, trim = a.limits, a.trimmer
    return {
        "method": lim.method,
        "coverage": lim.coverage,
        "trials": lim.trials,
        "seed": lim.seed,
        "distribution": design.job.variation.distribution,
        "temperature_min_c": (a.operating_spec or a.spec).temperature_min_c,
        "temperature_max_c": (a.operating_spec or a.spec).temperature_max_c,
        "f0_for_tuned_unit": a.tuned,
        "resolution_hz": lim.resolution_hz,
        "sweep_step_hz": lim.allowance.step_hz if lim.allowance else None,
        "frequency_accuracy": lim.allowance.frequency_accuracy if lim.allowance else None,
        "lcr_accuracy": lim.allowance.lcr_accuracy if lim.allowance else None,
        "tuning_tolerance_hz": (lim.allowance.tuning_hz if lim.allowance and a.tuned
                                else None),
        "bench_temperature_min_c": a.spec.temperature_min_c,
        "bench_temperature_max_c": a.spec.temperature_max_c,
        "f_centre_min_hz": lim.f_centre_min_hz, "f_centre_max_hz": lim.f_centre_max_hz,
        "inductance_min_h": a.inductance_window[0] if a.inductance_window else None,
        "inductance_max_h": a.inductance_window[1] if a.inductance_window else None,
        "capacitance_min_f": a.capacitance_window[0] if a.capacitance_window else None,
        "capacitance_max_f": a.capacitance_window[1] if a.capacitance_window else None,
        "untrimmed_f0_min_hz": a.untrimmed_f0_min_hz,
        "untrimmed_f0_max_hz": a.untrimmed_f0_max_hz,
        "must_trim": a.must_trim,
        "trim_range_needed_f": a.trim_range_needed_f,
        "capacitor_dielectric_assumed": a.capacitor_temperature_assumed,
        "inductance_tc_assumed_per_k": a.inductance_tc_assumed,
        "loss_spread": a.loss_spread,
        "loss_spread_source": a.loss_spread_source,
        "over_temperature": _over_temperature(a),
        "f0_min_hz": lim.f0_min_hz, "f0_max_hz": lim.f0_max_hz,
        "f_peak_min_hz": lim.f_peak_min_hz, "f_peak_max_hz": lim.f_peak_max_hz,
        "bandwidth_min_hz": lim.bandwidth_min_hz, "bandwidth_max_hz": lim.bandwidth_max_hz,
        "q_loaded_min": lim.q_loaded_min, "q_loaded_max": lim.q_loaded_max,
        "f_low_min_hz": lim.f_low_min_hz, "f_low_max_hz": lim.f_low_max_hz,
        "f_high_min_hz": lim.f_high_min_hz, "f_high_max_hz": lim.f_high_max_hz,
        "q_unloaded_min": lim.q_unloaded_min, "q_unloaded_max": lim.q_unloaded_max,
        "impedance_at_peak_min_ohm": lim.impedance_min_ohm,
        "impedance_at_peak_max_ohm": lim.impedance_max_ohm,
        "trim_capacitance_min_f": trim.needed_min_f if trim else None,
        "trim_capacitance_max_f": trim.needed_max_f if trim else None,
        "trimmer_covers": trim.covers if trim else None,
        "trimmer_fraction_tunable": trim.fraction_tunable if trim else None,
        "nan_trials": lim.nan_trials,
    }


def _over_temperature(a) -> dict | None:
    """The same figures over the operating range (not bench windows: no instrument
    allowance), for the record and for whoever qualifies the unit over temperature."""
    o = a.over_temperature
    if o is None:
        return None
    return {"temperature_min_c": a.operating_spec.temperature_min_c,
            "temperature_max_c": a.operating_spec.temperature_max_c,
            "f0_min_hz": o.f0_min_hz, "f0_max_hz": o.f0_max_hz,
            "f_peak_min_hz": o.f_peak_min_hz, "f_peak_max_hz": o.f_peak_max_hz,
            "bandwidth_min_hz": o.bandwidth_min_hz, "bandwidth_max_hz": o.bandwidth_max_hz,
            "q_loaded_min": o.q_loaded_min, "q_loaded_max": o.q_loaded_max}


def _variation(design: Design) -> dict:
    """Percentiles of each figure over the trials, and the spreads that produced them."""
    a = design.assessment
    summary = a.variation.summary

    def stats(p):
        return {"low": p.low, "median": p.median, "high": p.high, "mean": p.mean,
                "std": p.std, "minimum": p.minimum, "maximum": p.maximum}

    return {
        "capacitance_tolerance": a.capacitor_tolerance,
        "capacitance_tolerance_source": a.capacitor_tolerance_source,
        "inductance_tolerance": a.inductance_tolerance,
        "f0_hz": stats(summary.f0_hz), "f_peak_hz": stats(summary.f_peak_hz),
        "bandwidth_hz": stats(summary.bandwidth_hz), "q_loaded": stats(summary.q_loaded),
        "impedance_at_peak_ohm": stats(summary.impedance_at_peak_ohm),
    }


def _rating(check) -> dict:
    return {"part": check.part, "quantity": check.quantity, "unit": check.unit,
            "actual": check.actual, "rating": check.rating, "derating": check.derating,
            "allowed": check.allowed, "margin": check.margin, "status": check.status,
            "acceptance_reason": check.acceptance_reason, "advice": rating_advice(check)}


LIMIT_ROWS = (  # CSV rows: machine key, label, unit, keys of the minimum and maximum
    ("f0_hz", "f0", "Hz", "f0_min_hz", "f0_max_hz"),
    ("f_peak_hz", "frequency of maximum response", "Hz", "f_peak_min_hz", "f_peak_max_hz"),
    ("f_centre_hz", "centre of the half-power points", "Hz", "f_centre_min_hz",
     "f_centre_max_hz"),
    ("bandwidth_hz", "bandwidth (-3 dB)", "Hz", "bandwidth_min_hz", "bandwidth_max_hz"),
    ("q_loaded", "loaded Q", "", "q_loaded_min", "q_loaded_max"),
    ("f_low_hz", "lower half-power point", "Hz", "f_low_min_hz", "f_low_max_hz"),
    ("f_high_hz", "upper half-power point", "Hz", "f_high_min_hz", "f_high_max_hz"),
    ("q_unloaded", "unloaded Q", "", "q_unloaded_min", "q_unloaded_max"),
    ("impedance_at_peak_ohm", "impedance at the response maximum", "ohm",
     "impedance_at_peak_min_ohm", "impedance_at_peak_max_ohm"),
    ("inductance_h", "inductance (LCR meter)", "H", "inductance_min_h", "inductance_max_h"),
    ("capacitance_f", "fixed capacitance (LCR meter)", "F", "capacitance_min_f",
     "capacitance_max_f"),
    ("trim_capacitance_f", "trimmer capacitance needed", "F", "trim_capacitance_min_f",
     "trim_capacitance_max_f"),
)
PART_DIGITS = 4  # L and C windows, rounded outward to what an LCR meter shows (ours)
FIGURES = 6  # significant figures of a nominal whose window has no resolution step (ours)


def _nominals(design: Design) -> dict:
    r = design.resonance
    centre = (0.5 * (r.f_low_hz + r.f_high_hz)
              if r.f_low_hz is not None and r.f_high_hz is not None else None)
    return {"f0_hz": r.f0_hz, "f_peak_hz": r.f_peak_hz, "f_centre_hz": centre,
            "bandwidth_hz": r.bandwidth_hz, "q_loaded": r.q_loaded, "f_low_hz": r.f_low_hz,
            "f_high_hz": r.f_high_hz, "q_unloaded": r.q_unloaded,
            "impedance_at_peak_ohm": r.impedance_at_peak_ohm,
            "inductance_h": design.circuit.inductance_h,
            "capacitance_f": design.capacitor_choice.fixed_f,
            "trim_capacitance_f": design.capacitor_choice.trimmer_setting_f}


def _rounded(value, unit: str, lim: dict):
    """A nominal rounded to the resolution its window is rounded to: the frequency step for
    frequencies, the Q step for Q, else FIGURES significant figures."""
    if value is None or not math.isfinite(value):
        return None
    step = {"Hz": lim["resolution_hz"], "": 0.1}.get(unit)
    if step:
        return float(f"{round(value / step) * step:.12g}")
    return float(f"{value:.{FIGURES}g}")


def limits_csv(design: Design) -> str:
    """The limits as CSV for a work-order system: one row per tested quantity, SI units,
    a stable machine key beside the label, and whether the design passed its checks."""
    import csv
    import io
    lim = limits_section(design)
    nominal = _nominals(design)
    passed = "yes" if not failed_checks(design) else "no"
    out = io.StringIO()
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(["sheet_id", "revision", "key", "quantity", "unit", "nominal", "minimum",
                     "maximum", "method", "coverage", "seed", "design_passed"])
    sheet = design.job.sheet
    for key, quantity, unit, low, high in LIMIT_ROWS:
        if lim[low] is None or (isinstance(lim[low], float) and not math.isfinite(lim[low])):
            continue
        minimum, maximum = lim[low], lim[high]
        if unit in ("H", "F"):  # part windows: outward to PART_DIGITS figures
            minimum, maximum = round_outward_significant(minimum, maximum, PART_DIGITS)
        writer.writerow([sheet.id, sheet.revision, key, quantity, unit,
                         _csv_number(_rounded(nominal.get(key), unit, lim)),
                         _csv_number(minimum), _csv_number(maximum), lim["method"],
                         _csv_number(lim["coverage"]),
                         "" if lim["seed"] is None else lim["seed"], passed])
    return out.getvalue()


CSV_FIGURES = 12  # beyond any window's resolution, short of a double's noise (~16 figures)


def _csv_number(value) -> str:
    """The shortest text that reads back as the value rounded to CSV_FIGURES significant
    figures (Python's repr is the shortest round-trip form), so no float noise such as
    4.0210000000000004e-10 reaches a work-order system."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return ""
    return repr(float(f"{float(value):.{CSV_FIGURES}g}"))


def limits_json(design: Design) -> str:
    """The limits section alone, with the sheet's identity, as JSON."""
    sheet = design.job.sheet
    return json.dumps(_clean({"format": LIMITS_FORMAT, "tool_version": __version__,
                              "sheet": {"id": sheet.id, "revision": sheet.revision},
                              "design_passed": not failed_checks(design),
                              "limits": limits_section(design)}),
                      indent=2, ensure_ascii=False) + "\n"


def results_json(design: Design) -> str:
    """The results as stable, sorted-key JSON text, ending in a newline."""
    return json.dumps(results_document(design), indent=2, ensure_ascii=False) + "\n"
