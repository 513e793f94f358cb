"""Design → the results contract (JSON) that work-order systems and scripts read.

The format is versioned ("sheetgen.results/1"); keys carry their SI unit as a suffix and
null marks a value that does not apply. Adding keys keeps the version; renaming or
removing one needs a new version.
"""

from __future__ import annotations

import json
import math

from . import __version__
from .design import Design
from .checks import failed_checks
from .winding import coil_check, winding_steps

RESULTS_FORMAT = "sheetgen.results/1"


def _clean(value):
    """JSON-safe: floats that are not finite become null; nested containers cleaned."""
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, dict):
        return {key: _clean(item) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(item) for item in value]
    return value


def results(design: Design) -> dict:
    """The results contract of DESIGN.md as plain data."""
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
                "fixed_parts_f": ([v for v in (choice.pair.first, choice.pair.second)
                                   if v is not None] if choice.from_standard_parts
                                  else [choice.fixed_f]),
                "fixed_total_f": choice.fixed_f,
                "trimmer_setting_f": choice.trimmer_setting_f,
                "trimmer_in_range": choice.trimmer_in_range,
                "built_f": choice.built_f,
            },
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
        },
        "inductor": _inductor(design),
        "limits": None,
        "checks": [{"code": c.code, "field": c.field, "text": c.text}
                   for c in failed_checks(design)],
        "cautions": [],
    })


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
        "dc_resistance_ohm": r.dc_resistance_ohm,
        "ac_resistance_ohm": r.ac_resistance_ohm,
        "core_loss_resistance_ohm": r.core_loss_resistance_ohm if toroid else 0.0,
        "q_estimated": r.q_estimated,
        "q_used": coil.q_used,
        "q_source": coil.q_source,
        "self_capacitance_f": r.self_capacitance_f,
        "srf_hz": r.srf_hz,
        "flux_density_peak_t": r.flux_density_peak_t if toroid else None,
        "flux_density_max_t": coil.flux_density_max_t,
        "core_loss_w": r.core_loss_w if toroid else None,
        "temperature_rise_k": r.temperature_rise_k if toroid else None,
        "turns_per_layer": r.turns_per_layer if toroid else None,
        "winding_angle_deg": r.winding_angle_deg if toroid else None,
        "winding_length_m": None if toroid else r.length_m,
        "pitch_m": None if toroid else r.pitch_m,
        "nagaoka_coefficient": None if toroid else r.nagaoka,
        "wheeler_inductance_h": None if toroid else r.wheeler_inductance_h,
        "fits": r.fits,
        "remedy": r.remedy if toroid else None,
        "link_turns": coil.link_turns,
        "check": {"inductance_h": check.inductance_h, "tolerance": check.tolerance,
                  "measure_at_hz": check.measure_at_hz},
        "winding_steps": [step.text for step in winding_steps(design)],
    }
    return section


def results_json(design: Design) -> str:
    """The results as stable, sorted-key JSON text, ending in a newline."""
    return json.dumps(results(design), indent=2, sort_keys=False, ensure_ascii=False) + "\n"
