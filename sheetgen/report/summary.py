"""The aligned plain-text summary that `sheetgen check` prints."""

from __future__ import annotations

from sheetgen.design.records import Design
from sheetgen.report.cautions import DEFERRAL, design_cautions
from sheetgen.report.checks import failed_checks
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


def summary_text(design: Design) -> str:
    """Identity, components, expected performance and part stresses, aligned for a terminal."""
    sheet = design.job.sheet
    lines = [f"{sheet.id} rev {sheet.revision}: {sheet.title}",
             f"designed by {sheet.designer}, {sheet.date}", ""]
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
    failures = failed_checks(design)
    lines += ["Checks", "------"]
    lines += ([f"  FAILED {f.field}: {f.text}" for f in failures] or ["  all pass"]) + [""]
    return "\n".join(lines)
