"""The aligned plain-text summary that `sheetgen check` prints."""

from __future__ import annotations

from sheetgen.design.records import Design
from sheetgen.inputs.quick import DRIVE_FIELDS, Assumed
from sheetgen.quantities import format_number
from sheetgen.report.cautions import DEFERRAL, design_cautions
from sheetgen.report.checks import failed_checks
from sheetgen.report.formatting import quantity_text
from sheetgen.report.rows import (
    Row,
    coil_rows,
    component_rows,
    limits_rows,
    performance_rows,
    rating_rows,
    stress_rows,
)


def _block(title: str, rows: list[Row]) -> list[str]:
    width = max(len(row.label) for row in rows)
    value_width = max(len(row.value) for row in rows)
    lines = [title, "-" * len(title)]
    for row in rows:
        remark = f"  {row.remark}" if row.remark else ""
        lines.append(f"  {row.label:<{width}}  {row.value:>{value_width}}{remark}".rstrip())
    return lines + [""]


# Checks of a stress against a rating: with no drive given they judge an assumed drive.
DRIVE_CHECKS = ("rating", "rating-not-given")


def drive_assumed(assumed: tuple[Assumed, ...]) -> bool:
    return any(a.field in DRIVE_FIELDS for a in assumed)


def judged_checks(design: Design, assumed: tuple[Assumed, ...] = ()) -> tuple[list, list]:
    """(failed checks, checks not judged): without a drive, the rating checks are not
    judged — their stresses are for the assumed unit drive, not for the circuit's use."""
    failures = failed_checks(design)
    if not drive_assumed(assumed):
        return failures, []
    return ([f for f in failures if f.code not in DRIVE_CHECKS],
            [f for f in failures if f.code in DRIVE_CHECKS])


def assumed_lines(assumed: tuple[Assumed, ...]) -> list[str]:
    """What a quick job left out and what the check took for it."""
    if not assumed:
        return []
    title = "Assumed for this check (not in the job; build needs them given)"
    return [title, "-" * len(title)] + [f"  {a.field}: {a.value} — {a.why}"
                                        for a in assumed] + [""]


def _checks_lines(design: Design, assumed: tuple[Assumed, ...]) -> list[str]:
    failures, unjudged = judged_checks(design, assumed)
    lines = ["Checks", "------"]
    lines += ([f"  FAILED {f.field}: {f.text}" for f in failures] or ["  all pass"])
    lines += [f"  not judged (no drive given) {f.field}: {f.text}" for f in unjudged]
    return lines + [""]


def brief_text(design: Design, assumed: tuple[Assumed, ...] = ()) -> str:
    """The figures an engineer asks first, with what was assumed and the checks."""
    r = design.resonance
    c = design.circuit
    rows = [Row("f0", quantity_text(r.f0_hz, "Hz"), "1/(2π√(LC))"),
            Row("f_peak", quantity_text(r.f_peak_hz, "Hz"),
                "tank voltage maximum" if c.topology == "parallel" else "loop current maximum"),
            Row("X0", quantity_text(r.reactance_ohm, "Ω"), "√(L/C)"),
            Row("Q unloaded", format_number(r.q_unloaded, 4), "X0/(rL + rC)"),
            Row("Q loaded", format_number(r.q_loaded, 4), "f0/bandwidth"),
            Row("Bandwidth (−3 dB)", quantity_text(r.bandwidth_hz, "Hz")),
            Row("−3 dB points", f"{quantity_text(r.f_low_hz, 'Hz')} to "
                f"{quantity_text(r.f_high_hz, 'Hz')}"),
            Row("|Z| at f_peak", quantity_text(r.impedance_at_peak_ohm, "Ω"),
                "source resistance excluded")]
    if r.dynamic_resistance_ohm is not None:
        rows.append(Row("Dynamic resistance", quantity_text(r.dynamic_resistance_ohm, "Ω"),
                        "|Z| at zero phase"))
    if not drive_assumed(assumed):
        s = design.stress
        rows += [Row("Capacitor voltage", quantity_text(s.capacitor_voltage_peak_v, "V")
                     + " peak"),
                 Row("Coil voltage", quantity_text(s.inductor_voltage_peak_v, "V") + " peak"),
                 Row("Coil current", quantity_text(s.inductor_current_rms_a, "A") + " rms"),
                 Row("Capacitor current", quantity_text(s.capacitor_current_rms_a, "A")
                     + " rms"),
                 Row("Power into the circuit", quantity_text(s.drive_power_w, "W"))]
    sheet = design.job.sheet
    lines = [f"{sheet.id} rev {sheet.revision}: {sheet.title} ({c.topology}, "
             f"L {quantity_text(c.inductance_h, 'H')}, C {quantity_text(c.capacitance_f, 'F')})",
             ""]
    lines += assumed_lines(assumed)
    lines += _block("Figures", rows)
    lines += _checks_lines(design, assumed)
    return "\n".join(lines)


def summary_text(design: Design, assumed: tuple[Assumed, ...] = ()) -> str:
    """Identity, components, expected performance and part stresses, aligned for a terminal."""
    sheet = design.job.sheet
    lines = [f"{sheet.id} rev {sheet.revision}: {sheet.title}",
             f"designed by {sheet.designer}, {sheet.date}", ""]
    lines += assumed_lines(assumed)
    lines += _block("Components", component_rows(design))
    if design.coil is not None:
        lines += _block("Coil", coil_rows(design))
    lines += _block("Expected performance", performance_rows(design))
    lines += _block("Stress at the response maximum", stress_rows(design))
    lines += _block("Test limits", limits_rows(design))
    ratings = rating_rows(design)
    if ratings:
        lines += _block("Ratings", ratings)
    lines += ["Cautions", "--------"]
    lines += [f"  {c.signal_word}: {c.text}" for c in design_cautions(design)]
    lines += [f"  {DEFERRAL}", ""]
    lines += _checks_lines(design, assumed)
    return "\n".join(lines)
