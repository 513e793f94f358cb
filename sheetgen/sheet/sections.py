"""The sheet's sections: one function per section, from the Design to its flowables.

Each section function takes the Design and the Kit (frame width, paragraph styles) and
returns its heading and flowables, or None when the design has nothing for it; SECTIONS
maps the names a house style lists to these functions, so a new section slots in there.
A list among the flowables is kept together on one page. Rows come from tables.py (and
rows.py), so the sheet words and formats every value as the terminal summary does.
"""

from __future__ import annotations

import re
from collections.abc import Callable
from dataclasses import dataclass
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.enums import TA_LEFT
from reportlab.lib.styles import ParagraphStyle
from reportlab.platypus import (
    CondPageBreak,
    Flowable,
    KeepTogether,
    Paragraph,
    Spacer,
    Table,
    TableStyle,
)

from sheetgen.design.records import Design
from sheetgen.report.advice import rating_advice
from sheetgen.report.cautions import DEFERRAL, design_cautions
from sheetgen.report.formatting import quantity_text
from sheetgen.report.parts import NO_DATA, PART_COLUMNS, PartRow, part_rows
from sheetgen.report.procedure import (
    OVERALL_VERDICT,
    RECORD_TEXT_FIELDS,
    RECORD_TEXT_LABELS,
    VERDICT_CHOICES,
    Procedure,
)
from sheetgen.report.rework import RETURN_TO_ENGINEERING, rework_rows
from sheetgen.report.rows import (
    Row,
    coil_rows,
    component_rows,
    duty_rows,
    limits_rows,
    performance_rows,
    rating_rows,
    stress_rows,
)
from sheetgen.report.winding import cutting_list, winding_steps
from sheetgen.sheet import fonts
from sheetgen.sheet.forms import RadioChoice, TextField
from sheetgen.sheet.plots import coil_q_drawing, impedance_phase_drawing, response_drawing
from sheetgen.sheet.schematic import schematic_drawing, schematic_of
from sheetgen.sheet.setup_drawing import setup_drawing, setup_of
from sheetgen.sheet.winding_drawing import SolenoidView, winding_drawing, winding_view_of

GREY_RULE = colors.Color(0.55, 0.55, 0.55)
GREY_FILL = colors.Color(0.90, 0.90, 0.90)


@dataclass(frozen=True)
class Kit:
    """What a section needs to lay itself out: frame width, paragraph styles, and the
    bench procedure (worded once per sheet, read by the procedure and record sections)."""

    width: float
    procedure: Procedure
    body: ParagraphStyle
    small: ParagraphStyle
    cell: ParagraphStyle
    cell_bold: ParagraphStyle
    heading: ParagraphStyle
    subheading: ParagraphStyle
    step: ParagraphStyle
    title: ParagraphStyle
    caption: ParagraphStyle


@dataclass(frozen=True)
class SectionContent:
    """A section's heading text and its flowables (a list among them: keep together)."""

    title: str
    flowables: list


def make_kit(width: float, plan: Procedure) -> Kit:
    base = dict(fontName=fonts.REGULAR, textColor=colors.black, alignment=TA_LEFT)
    return Kit(
        width=width,
        procedure=plan,
        body=ParagraphStyle("body", fontSize=9, leading=12, spaceAfter=4, **base),
        small=ParagraphStyle("small", fontSize=8, leading=10, **base),
        cell=ParagraphStyle("cell", fontSize=8, leading=9.8, **base),
        cell_bold=ParagraphStyle("cell_bold", fontSize=8, leading=9.8,
                                 **{**base, "fontName": fonts.BOLD}),
        heading=ParagraphStyle("heading", fontSize=11.5, leading=14, spaceBefore=10,
                               spaceAfter=5, keepWithNext=1, **{**base, "fontName": fonts.BOLD}),
        subheading=ParagraphStyle("subheading", fontSize=9.5, leading=12, spaceBefore=6,
                                  spaceAfter=3, keepWithNext=1,
                                  **{**base, "fontName": fonts.BOLD}),
        step=ParagraphStyle("step", fontSize=9, leading=12, spaceAfter=4, leftIndent=18,
                            bulletIndent=0, bulletFontName=fonts.BOLD, bulletFontSize=9,
                            **base),
        title=ParagraphStyle("title", fontSize=15, leading=19, spaceAfter=3,
                             **{**base, "fontName": fonts.BOLD}),
        caption=ParagraphStyle("caption", fontSize=7.5, leading=9.5, spaceBefore=2,
                               spaceAfter=4, textColor=colors.Color(0.2, 0.2, 0.2),
                               **{k: v for k, v in base.items() if k != "textColor"}),
    )


_NUMBER_THEN_WORD = re.compile(r"(?<=\d) (?=[^\s\d])")


def para(text: str, style: ParagraphStyle) -> Paragraph:
    """A paragraph of plain text; a number and the unit or word after it never part at a
    line break ("16.10 kHz", "3 turns": joined by a no-break space)."""
    return Paragraph(escape(_NUMBER_THEN_WORD.sub("\u00a0", text)), style)


def _grid_style(header: bool = True) -> list:
    commands = [
        ("GRID", (0, 0), (-1, -1), 0.4, GREY_RULE),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("TOPPADDING", (0, 0), (-1, -1), 1.5),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2.5),
        ("LEFTPADDING", (0, 0), (-1, -1), 4),
        ("RIGHTPADDING", (0, 0), (-1, -1), 4),
    ]
    if header:
        commands.append(("BACKGROUND", (0, 0), (-1, 0), GREY_FILL))
    return commands


def rows_table(rows: list[Row], kit: Kit, heads=("Quantity", "Value", "Remark")) -> Table:
    """Label, value and remark in three columns; the header row repeats on a new page."""
    data = [[para(h, kit.cell_bold) for h in heads]]
    data += [[para(r.label, kit.cell), para(r.value, kit.cell_bold), para(r.remark, kit.cell)]
             for r in rows]
    widths = [kit.width * 0.38, kit.width * 0.29, kit.width * 0.33]
    table = Table(data, colWidths=widths, repeatRows=1)
    table.setStyle(TableStyle(_grid_style()))
    return table


def parts_table(rows: list[PartRow], kit: Kit) -> Table:
    """The parts list, one row a part; long notes wrap, many parts continue on a new page."""
    fractions = (0.07, 0.09, 0.11, 0.11, 0.09, 0.21, 0.05, 0.27)
    data = [[para(h, kit.cell_bold) for h in PART_COLUMNS]]
    for row in rows:
        data.append([para(row.designator, kit.cell_bold), para(row.part, kit.cell),
                     para(row.value, kit.cell_bold), para(row.tolerance, kit.cell),
                     para(row.rating, kit.cell), para(row.material, kit.cell),
                     para(row.quantity, kit.cell), para(row.notes, kit.cell)])
    table = Table(data, colWidths=[kit.width * f for f in fractions], repeatRows=1)
    table.setStyle(TableStyle(_grid_style()))
    return table


# --- sections ----------------------------------------------------------------------------

# Signal words (ISO 3864-2, ANSI Z535.4): the word itself carries the meaning; the panel
# shading only orders them for the eye and stays legible in greyscale.
SIGNAL_PANELS = {"danger": (colors.black, colors.white), "warning": (colors.Color(0.3, 0.3, 0.3),
                 colors.white), "caution": (colors.Color(0.8, 0.8, 0.8), colors.black),
                 "notice": (colors.white, colors.black)}


def cautions_section(design: Design, kit: Kit) -> SectionContent | None:
    cautions = design_cautions(design)
    if not cautions:
        return None
    data, commands = [], _grid_style(header=False)
    for row, caution in enumerate(cautions):
        fill, ink = SIGNAL_PANELS[caution.level]
        word = ParagraphStyle("signal", parent=kit.cell_bold, textColor=ink, fontSize=9,
                              leading=11)
        alert = "" if caution.level == "notice" else "\u26a0 "  # safety alert symbol
        data.append([para(alert + caution.signal_word, word), para(caution.text, kit.cell)])
        commands += [("BACKGROUND", (0, row), (0, row), fill),
                     ("VALIGN", (0, row), (0, row), "MIDDLE")]
    data.append(["", para(DEFERRAL, kit.cell_bold)])  # once for the whole box
    table = Table(data, colWidths=[kit.width * 0.15, kit.width * 0.85])
    table.setStyle(TableStyle(commands + [("LINEBELOW", (0, 0), (-1, -2), 0.8, colors.black)]))
    return SectionContent("Safety", [table])


def checks_section(design: Design, kit: Kit) -> SectionContent | None:
    from sheetgen.report.checks import failed_checks
    failures = failed_checks(design)
    if not failures:
        return None
    data = [[para("Do not build until these are resolved: the design fails "
                f"{len(failures)} check{'s' if len(failures) != 1 else ''}.", kit.cell_bold), ""]]
    data += [[para(f.field or "design", kit.cell_bold), para(f.text, kit.cell)] for f in failures]
    table = Table(data, colWidths=[kit.width * 0.22, kit.width * 0.78])
    table.setStyle(TableStyle(_grid_style(header=False) + [
        ("SPAN", (0, 0), (1, 0)), ("BOX", (0, 0), (-1, -1), 2.0, colors.black)]))
    return SectionContent("Failed checks", [table])


def limits_section(design: Design, kit: Kit) -> SectionContent:
    return SectionContent("Test limits", [rows_table(limits_rows(design), kit)])


def ratings_section(design: Design, kit: Kit) -> SectionContent | None:
    rows = rating_rows(design)
    if not rows:
        return None
    flowables: list = [rows_table(rows, kit, ("Part and stress", "Stress", "Verdict"))]
    for check in design.assessment.ratings:
        for label, text in (("accepted", check.acceptance_reason), ("advice", rating_advice(check))):
            if text:
                flowables.append(para(f"{check.part} {check.quantity}, {label}: {text}",
                                    kit.small))
    return SectionContent("Ratings", flowables)


def schematic_section(design: Design, kit: Kit) -> SectionContent:
    drawing = schematic_drawing(schematic_of(design), kit.width)
    caption = ("Source and load (dashed) are the rest of the system, not parts of the build; "
               "the bench test stands in for them (procedure step 5).")
    return SectionContent("Schematic", [[drawing, para(caption, kit.caption)]])


def _coverage(design: Design) -> str:
    limits = design.assessment.limits
    return (f"{limits.coverage * 100:.2f} %" if limits.coverage is not None
            else "all worst-case corners")


def parts_section(design: Design, kit: Kit) -> SectionContent:
    """The parts to fit (those not fitted, the rest of the system, in one line below), then
    the cutting list of a coil sheetgen designs."""
    rows = part_rows(design)
    fitted = [row for row in rows if row.quantity != NO_DATA]
    flowables: list = [parts_table(fitted, kit)]
    absent = [row for row in rows if row.quantity == NO_DATA]
    if absent:
        flowables.append(para(
            "Not fitted, the rest of the system (the test set-up of the procedure stands in "
            "for them): " + "; ".join(f"{row.designator} {row.value} {row.part.lower()}"
                                      for row in absent) + ".", kit.caption))
    cuts = cutting_list(design)
    if cuts:
        data = [[para(h, kit.cell_bold) for h in ("Cut", "Wire", "Length", "Made of")]]
        data += [[para(c.piece, kit.cell), para(c.wire, kit.cell),
                  para(quantity_text(c.length_m, "m", 3), kit.cell_bold), para(c.made_of, kit.cell)]
                 for c in cuts]
        table = Table(data, colWidths=[kit.width * f for f in (0.16, 0.3, 0.12, 0.42)])
        table.setStyle(TableStyle(_grid_style()))
        flowables.append([para("Cutting list", kit.subheading), table])
    return SectionContent("Parts list", flowables)


def values_section(design: Design, kit: Kit) -> SectionContent:
    return SectionContent("Circuit values as analysed",
                          [rows_table(component_rows(design), kit)])


def winding_section(design: Design, kit: Kit) -> SectionContent | None:
    """How to wind the coil sheetgen designed, ending with its inductance check."""
    steps = winding_steps(design)
    if not steps:
        return None
    flowables: list = []
    view = winding_view_of(design)
    if view is not None:
        flowables.append([winding_drawing(view, kit.width), para(_winding_caption(view),
                                                                  kit.caption)])
    flowables += [_numbered(step.number, "", step.text, kit) for step in steps]
    return SectionContent("Winding", flowables)


def coil_section(design: Design, kit: Kit) -> SectionContent | None:
    """The designed coil's data and its estimated Q (how to wind it is part one's)."""
    rows = coil_rows(design)
    if not rows:
        return None
    flowables: list = [rows_table(rows, kit)]
    drawing = coil_q_drawing(design, kit.width)
    if drawing is not None:
        flowables.append([
            drawing, para("The coil's estimated Q against frequency (a logarithmic scale); "
                        "dashed: f0.", kit.caption)])
    return SectionContent("Coil data", flowables)


def _winding_caption(view) -> str:
    if isinstance(view, SolenoidView):
        return ("The coil seen from the side: the grey band is the former, each slanted stroke "
                "the front half of one turn.")
    return ("The core seen from above, drawn to scale: each solid stroke is one turn over the "
            "top face, each dashed stroke its way back under the ring; the arc gives the angle "
            "from the first turn to the last." + (" Outlined strokes: the link winding."
                                                   if view.link_angles_deg else "")
            + " Beside it, a section through one turn: a single layer around the core.")


def performance_section(design: Design, kit: Kit) -> SectionContent:
    return SectionContent("Expected performance", [rows_table(performance_rows(design), kit)])


def stress_section(design: Design, kit: Kit) -> SectionContent:
    items = [rows_table(stress_rows(design), kit)]
    duties = duty_rows(design)
    if duties:
        items += [Spacer(1, 4), para("Every part of the circuit, from one exact solve of its "
                                     "network (voltage across it, current through it, power "
                                     "in its resistance):", kit.body),
                  rows_table(duties, kit, heads=("Part", "At the drive", "Worst case"))]
    return SectionContent("Stress at the response maximum", items)


def response_section(design: Design, kit: Kit) -> SectionContent:
    first = [
        response_drawing(design, kit.width),
        para("Response (series: loop current; parallel: tank voltage) relative to its maximum. "
           "Dashed: f0. Dotted: the half-power (−3 dB) level; circles: the half-power points. "
           f"Grey band: where {_coverage(design)} of builds fall, from the parts' tolerances "
           "(test limits section).", kit.caption)]
    second = [
        para("Impedance and phase", kit.subheading),
        impedance_phase_drawing(design, kit.width),
        para("Impedance the source terminals see (the source's own resistance excluded): "
           "magnitude on a logarithmic scale, and phase.", kit.caption)]
    return SectionContent("Response against frequency", [first, Spacer(1, 4), second])


def _numbered(number: int, title: str, text: str, kit: Kit) -> Paragraph:
    """A numbered step: bold number hanging in the margin, optional bold title."""
    lead = f"<b>{escape(title)}.</b> " if title else ""
    return Paragraph(lead + escape(text), kit.step, bulletText=f"{number}.")


def setup_section(design: Design, kit: Kit) -> SectionContent | None:
    """Why the procedure's settings are what they are: the rows the bench does not need."""
    rows = [(f"Step {step.number}: {label}", value)
            for step in kit.procedure.steps for label, value in step.derivation]
    if not rows:
        return None
    data = [[para(h, kit.cell_bold) for h in ("Step and setting", "Why, and what follows")]]
    data += [[para(label, kit.cell), para(value, kit.cell)] for label, value in rows]
    table = Table(data, colWidths=[kit.width * 0.3, kit.width * 0.7], repeatRows=1)
    table.setStyle(TableStyle(_grid_style()))
    return SectionContent("Test set-up: how the settings were derived", [table])


def procedure_section(design: Design, kit: Kit) -> SectionContent:
    plan = kit.procedure
    flowables: list = []
    for step in plan.steps:
        drawn = ()
        if step.key == "connect":
            drawn = (setup_drawing(setup_of(plan, design.designators, design.job.sheet.id),
                                   kit.width - 18),)
        flowables += _step_blocks(step, kit, drawn)
    if plan.full_power:
        flowables.append(para("Optional full-power run — the cautions of this sheet apply",
                              kit.heading))
        for step in plan.full_power:
            flowables += _step_blocks(step, kit)
    return SectionContent("Test procedure", flowables)


def _step_blocks(step, kit: Kit, drawings: tuple = ()) -> list:
    """A numbered step kept together with its settings table, then each drawing kept
    together on its own (so a drawing that does not fit moves on alone)."""
    paragraph = _numbered(step.number, step.title, step.text, kit)
    extras = ([_settings_table(step.settings, kit)] if step.settings else []) + list(drawings)
    if not extras:
        return [paragraph]
    return ([[paragraph, _Indent(extras[0], 18), Spacer(1, 6)]]
            + [[_Indent(extra, 18), Spacer(1, 6)] for extra in extras[1:]])


SHORT_SETTING = 40  # characters: a value this short shares its row with another setting


def _settings_table(settings: tuple[tuple[str, str], ...], kit: Kit) -> Table:
    """A step's settings: what to set, and to what. Short values go two to a row; a long
    value takes a row of its own."""
    short = [row for row in settings if len(row[1]) <= SHORT_SETTING]
    long = [row for row in settings if len(row[1]) > SHORT_SETTING]
    if len(short) < 2:  # nothing to pair: label and value, one setting a row
        widths = (0.34, 0.60) if long else (0.42, 0.30)
        data = [[para(label, kit.cell), para(value, kit.cell_bold)]
                for label, value in settings]
        table = Table(data, colWidths=[kit.width * w for w in widths], hAlign="LEFT")
        table.setStyle(TableStyle(_grid_style(header=False)))
        return table
    half = (len(short) + 1) // 2
    left, right = short[:half], short[half:] + [("", "")] * (2 * half - len(short))
    data = [[para(a, kit.cell), para(b, kit.cell_bold), para(c, kit.cell),
             para(d, kit.cell_bold)] for (a, b), (c, d) in zip(left, right)]
    spans = [("SPAN", (1, len(data) + i), (3, len(data) + i)) for i in range(len(long))]
    data += [[para(label, kit.cell), para(value, kit.cell_bold), "", ""]
             for label, value in long]
    table = Table(data, colWidths=[kit.width * w for w in (0.25, 0.22, 0.25, 0.22)],
                  hAlign="LEFT")
    table.setStyle(TableStyle(_grid_style(header=False) + spans))
    return table


def record_section(design: Design, kit: Kit) -> SectionContent:
    """The test record: one row per measured value (as found and as left for a trimmed
    unit), one pass/fail choice per row with a window, the overall verdict, and the unit's
    identity and test conditions."""
    rows = kit.procedure.record
    tuned = any(row.as_found_field for row in rows)
    heads = (["Measurement", "Expected", "Pass window"]
             + (["As found", "As left (with unit)"] if tuned else ["Measured (with unit)"])
             + ["Verdict", ""])
    data = [[para(h, kit.cell_bold) for h in heads]]
    for row in rows:
        m = row.measurement
        verdict = ([RadioChoice(row.verdict_field, c, f"{m.label}: {c}")
                    for c in VERDICT_CHOICES] if row.verdict_field else ["", ""])
        found = ([TextField(row.as_found_field, f"{m.label}, as found")
                  if row.as_found_field else ""] if tuned else [])
        data.append([para(m.label, kit.cell), para(row.expected, kit.cell_bold),
                     para(row.limits, kit.cell), *found, TextField(m.field, m.label), *verdict])
    data.append([para("Overall", kit.cell_bold), para("every value in its window", kit.cell),
                 "", *([""] if tuned else []), "",
                 *[RadioChoice(OVERALL_VERDICT, c, f"overall: {c}") for c in VERDICT_CHOICES]])
    fractions = ((0.19, 0.11, 0.23, 0.11, 0.19, 0.085, 0.085) if tuned else
                 (0.24, 0.12, 0.26, 0.22, 0.08, 0.08))
    table = Table(data, colWidths=[kit.width * f for f in fractions], repeatRows=1)
    verdict_column = len(heads) - 2
    table.setStyle(TableStyle(_grid_style() + [
        ("VALIGN", (0, 1), (-1, -1), "MIDDLE"),
        ("SPAN", (verdict_column, 0), (verdict_column + 1, 0))]))
    wide = ("record.instruments", "record.remarks")  # a whole row each, several lines
    short = [[para(RECORD_TEXT_LABELS[name], kit.cell_bold),
              TextField(name, RECORD_TEXT_LABELS[name], height=15, max_length=2000)]
             for name in RECORD_TEXT_FIELDS if name not in wide]
    short.append([para("Technician's signature", kit.cell_bold), ""])
    people = [a + b for a, b in zip(short[0::2], short[1::2])]
    spans = [("SPAN", (1, len(people) + i), (3, len(people) + i)) for i in range(len(wide))]
    people += [[para(RECORD_TEXT_LABELS[name], kit.cell_bold),
                TextField(name, RECORD_TEXT_LABELS[name], height=28, multiline=True,
                          max_length=2000), "", ""] for name in wide]
    sign = Table(people, colWidths=[kit.width * f for f in (0.22, 0.28, 0.22, 0.28)],
                 rowHeights=[None] * (len(people) - len(wide) - 1) + [24]
                 + [None] * len(wide))
    sign.setStyle(TableStyle(_grid_style(header=False) + spans
                             + [("VALIGN", (0, 0), (-1, -1), "MIDDLE")]))
    return SectionContent("Test record", [table, [Spacer(1, 8), sign]])


def rework_section(design: Design, kit: Kit) -> SectionContent:
    rows = rework_rows(design)
    data = [[para(h, kit.cell_bold) for h in ("Value that fails", "Likely causes", "Rework")]]
    data += [[para(r.label, kit.cell), para(r.causes, kit.cell), para(r.actions, kit.cell)]
             for r in rows]
    data.append([para(RETURN_TO_ENGINEERING, kit.cell_bold), "", ""])  # the stop rule, last
    table = Table(data, colWidths=[kit.width * f for f in (0.2, 0.33, 0.47)], repeatRows=1)
    table.setStyle(TableStyle(_grid_style() + [("SPAN", (0, len(data) - 1),
                                                (-1, len(data) - 1))]))
    return SectionContent("If a value fails", [table])


def history_section(design: Design, kit: Kit) -> SectionContent:
    """The revisions of the sheet, oldest first, ending with this one."""
    sheet = design.job.sheet
    data = [[para(h, kit.cell_bold) for h in ("Revision", "Date", "What changed", "By")]]
    data += [[para(e.revision, kit.cell), para(e.date, kit.cell), para(e.change, kit.cell),
              para(e.by, kit.cell)] for e in sheet.history]
    if not any(e.revision == sheet.revision for e in sheet.history):
        data.append([para(sheet.revision, kit.cell_bold), para(sheet.date, kit.cell),
                     para("this revision" if sheet.history else "first issue", kit.cell),
                     para(sheet.designer, kit.cell)])
    table = Table(data, colWidths=[kit.width * f for f in (0.12, 0.16, 0.52, 0.2)],
                  repeatRows=1)
    table.setStyle(TableStyle(_grid_style()))
    return SectionContent("Revision history", [table])


def notes_section(design: Design, kit: Kit) -> SectionContent | None:
    notes = design.job.sheet.notes
    if not notes or not notes.strip():
        return None
    flowables = [Paragraph(escape(block.strip()).replace("\n", "<br/>"), kit.body)
                 for block in notes.split("\n\n") if block.strip()]
    return SectionContent("Notes", flowables)


SECTIONS: dict[str, Callable[[Design, Kit], SectionContent | None]] = {
    "checks": checks_section,
    "cautions": cautions_section,
    "schematic": schematic_section,
    "parts": parts_section,
    "values": values_section,
    "coil": coil_section,
    "winding": winding_section,
    "setup": setup_section,
    "performance": performance_section,
    "limits": limits_section,
    "stress": stress_section,
    "ratings": ratings_section,
    "response": response_section,
    "procedure": procedure_section,
    "record": record_section,
    "rework": rework_section,
    "history": history_section,
    "notes": notes_section,
}


def with_heading(heading: Paragraph, items: list) -> list:
    """Flowables of a section: a list item is kept together on one page, and the heading is
    kept with the first item. Leading page-break conditions go before the heading.

    (reportlab's KeepTogether does not nest well, so groups stay lists until here.)
    """
    lead = []
    while items and isinstance(items[0], CondPageBreak):
        lead.append(items[0])
        items = items[1:]
    if not items:
        return lead + [heading]
    if isinstance(items[0], Table):  # a table may split: keep a few rows with the heading
        heading.keepWithNext = 0  # (keepWithNext would move the heading and whole table on)
        table = _splittable(items[0])
        out = lead + [CondPageBreak(_heading_and_first_rows_pt(heading, table)), heading, table]
    else:
        first = items[0] if isinstance(items[0], list) else [items[0]]
        out = lead + [KeepTogether([heading, *first])]
    out += [KeepTogether(item) if isinstance(item, list) else item for item in items[1:]]
    return out


TABLE_ROWS_KEPT = 2  # rows a split leaves at least on each page (besides a repeated header)


def _splittable(table: Table) -> Table:
    """A table that may split across pages but never leaves fewer than TABLE_ROWS_KEPT body
    rows on either page (its header row repeats on the next)."""
    rows = len(table._cellvalues)
    header = table.repeatRows or 0
    if rows - header > 2 * TABLE_ROWS_KEPT:
        table.setStyle(TableStyle([
            ("NOSPLIT", (0, 0), (-1, header + TABLE_ROWS_KEPT - 1)),
            ("NOSPLIT", (0, rows - TABLE_ROWS_KEPT), (-1, rows - 1))]))
    else:
        table.setStyle(TableStyle([("NOSPLIT", (0, 0), (-1, rows - 1))]))
    return table


def _heading_and_first_rows_pt(heading: Paragraph, table: Table) -> float:
    """The height a heading needs below it on its page: itself and the table's first rows."""
    width = table._colWidths and sum(w for w in table._colWidths if w) or 500.0
    _, heading_pt = heading.wrap(width, 1e6)
    table.wrap(width, 1e6)
    rows, header = len(table._cellvalues), table.repeatRows or 0
    kept = header + TABLE_ROWS_KEPT if rows - header > 2 * TABLE_ROWS_KEPT else rows
    return (heading_pt + heading.style.spaceBefore + heading.style.spaceAfter
            + sum(table._rowHeights[:kept]) + 6.0)


class _Indent(Flowable):
    """A flowable shifted right by `indent` points."""

    def __init__(self, inner: Flowable, indent: float):
        super().__init__()
        self.inner, self.indent = inner, indent

    def wrap(self, available_width, available_height):
        width, height = self.inner.wrap(available_width - self.indent, available_height)
        self.width, self.height = width + self.indent, height
        return self.width, self.height

    def draw(self):
        self.inner.drawOn(self.canv, self.indent, 0)
