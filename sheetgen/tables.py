"""The labelled, formatted rows that both the terminal summary and the PDF sheet show.

One place decides how each computed value is named and formatted for people, so the
summary, the sheet and the tests that read the sheet agree. Nothing here computes physics.
"""

from __future__ import annotations

from dataclasses import dataclass

from .design import Design
from .quantities import format_number, format_quantity


@dataclass(frozen=True)
class Row:
    """One labelled value: what it is, the formatted value, and an optional remark."""

    label: str
    value: str
    remark: str = ""


def q(value_si, unit, digits=4):
    """Engineering notation for the sheet (4 significant figures unless said)."""
    return format_quantity(value_si, unit, digits)


def component_rows(design: Design) -> list[Row]:
    """The circuit's parts as analysed, with where each value came from."""
    c = design.circuit
    derived = {d.field: d.reason for d in design.derived}
    choice = design.capacitor_choice
    pair = " + ".join(q(v, "F", 3) for v in (choice.pair.first, choice.pair.second) if v)
    rows = [
        Row("Topology", c.topology),
        Row("Inductance L", q(c.inductance_h, "H"), _origin(derived, "inductor.inductance")),
        Row("Coil loss resistance rL", q(c.inductor_resistance_ohm, "Ω"), "series, at f0"),
        Row("Capacitance C", q(c.capacitance_f, "F"), _origin(derived, "capacitor.capacitance")),
        Row("Capacitor ESR rC", q(c.capacitor_esr_ohm, "Ω"), "at f0"),
        Row(f"Nearest {choice.series} capacitor", q(choice.nearest_f, "F", 3),
            f"{(choice.nearest_f / choice.required_f - 1) * 100:+.2f} %"),
        Row(f"Best {choice.series} pair in parallel", pair,
            f"{choice.pair.error_rel * 100:+.2f} %"),
        Row("Source resistance Rs", q(c.source_resistance_ohm, "Ω")
            if c.source_resistance_ohm is not None else "ideal source"),
        Row("Load resistance RL", q(c.load_resistance_ohm, "Ω")
            if c.load_resistance_ohm is not None else "none",
            _origin(derived, "load.resistance")),
    ]
    return rows


def _origin(derived: dict, field: str) -> str:
    return f"computed: {derived[field]}" if field in derived else ""


def performance_rows(design: Design) -> list[Row]:
    """Expected frequencies, Q, bandwidth and impedance (NOT the test limits)."""
    r = design.resonance
    parallel = design.circuit.topology == "parallel"
    rows = [
        Row("Resonant frequency f0", q(r.f0_hz, "Hz"), "1/(2π√(LC))"),
        Row("Frequency of maximum response", q(r.f_peak_hz, "Hz"),
            "tank voltage" if parallel else "loop current"),
    ]
    if parallel:
        rows.append(Row("Unity power factor frequency", q(r.f_unity_pf_hz, "Hz"),
                        "impedance phase zero"))
    rows += [
        Row("Lower half-power (−3 dB) point", q(r.f_low_hz, "Hz")),
        Row("Upper half-power (−3 dB) point", q(r.f_high_hz, "Hz")),
        Row("Bandwidth (−3 dB)", q(r.bandwidth_hz, "Hz")),
        Row("Reactance at f0", q(r.reactance_ohm, "Ω")),
        Row("Coil Q", format_number(r.q_inductor, 4), "X0/rL"),
        Row("Capacitor Q", format_number(r.q_capacitor, 4), "X0/rC"),
        Row("Unloaded Q", format_number(r.q_unloaded, 4), "X0/(rL + rC)"),
        Row("Loaded Q", format_number(r.q_loaded, 4), "f0/bandwidth"),
        Row("Impedance at the response maximum", q(r.impedance_at_peak_ohm, "Ω"),
            "source resistance excluded"),
    ]
    if parallel:
        rows.append(Row("Dynamic resistance of the tank", q(r.dynamic_resistance_ohm, "Ω"),
                        "X0²/(rL + rC)"))
    return rows


def stress_rows(design: Design) -> list[Row]:
    """Voltages, currents and powers at the response maximum for the job's drive."""
    s = design.stress
    drive = design.drive
    drive_text = {"voltage": q(drive.value, "V") + " rms open-circuit",
                  "current": q(drive.value, "A") + " rms",
                  "available_power": q(drive.value, "W") + " available"}[drive.kind]
    return [
        Row("Drive", drive_text, f"at {q(s.f_hz, 'Hz')}"),
        Row("Power into the circuit", q(s.drive_power_w, "W")),
        Row("Capacitor voltage", q(s.capacitor_voltage_rms_v, "V") + " rms",
            q(s.capacitor_voltage_peak_v, "V") + " peak"),
        Row("Capacitor current", q(s.capacitor_current_rms_a, "A") + " rms"),
        Row("Coil voltage", q(s.inductor_voltage_rms_v, "V") + " rms",
            q(s.inductor_voltage_peak_v, "V") + " peak"),
        Row("Coil current", q(s.inductor_current_rms_a, "A") + " rms"),
        Row("Power in the coil's loss", q(s.inductor_loss_w, "W")),
        Row("Power in the capacitor's ESR", q(s.capacitor_loss_w, "W")),
        Row("Power in the load", q(s.load_power_w, "W")),
    ]
