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
            "capacitor_standard": {
                "series": choice.series,
                "nearest_f": choice.nearest_f,
                "pair_f": [v for v in (choice.pair.first, choice.pair.second) if v is not None],
                "pair_total_f": choice.pair.total,
                "pair_error_rel": choice.pair.error_rel,
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
        "inductor": {"form": "given", "inductance_built_h": circuit.inductance_h,
                     "q_estimated": None, "turns": None, "al_h_per_turn2": None, "wire": None,
                     "wire_length_m": None, "dc_resistance_ohm": None, "ac_resistance_ohm": None,
                     "srf_hz": None, "flux_density_peak_t": None, "winding_angle_deg": None,
                     "fits": None},
        "limits": None,
        "cautions": [],
    })


def results_json(design: Design) -> str:
    """The results as stable, sorted-key JSON text, ending in a newline."""
    return json.dumps(results(design), indent=2, sort_keys=False, ensure_ascii=False) + "\n"
