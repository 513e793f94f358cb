"""The test report of a unit graded from a measured sweep: one or two pages, house style.

Identity (sheet id, revision, title, unit serial), the measured curve in dB relative to its
maximum against frequency with the f0 window's edges and the −3 dB level marked, the
verdict table, the record's fields; the sweep file and the record JSON are attached.
Drawn with reportlab in the sheet's embedded DejaVu fonts, with the sheet's plot helpers
(sheetgen/sheet/plots.py) and drawing primitives; attachments added with pypdf.
"""

from __future__ import annotations

import io
import math
from pathlib import Path

import numpy as np

from .grade import Grading, grading_notes, verdict_text, window_text
from .signature import signature_text
from .sweep import HALF_POWER_DB, SweepFeatures
from .sweep_files import MeasuredSweep

RECORD_ATTACHMENT = "record.json"


def _curve_drawing(sweep: MeasuredSweep, features: SweepFeatures, grading: Grading,
                   width: float, height: float = 210.0):
    from reportlab.graphics.shapes import Circle, Drawing, Group, Line
    from reportlab.lib.colors import black, white

    from sheetgen.quantities import format_quantity
    from sheetgen.sheet.plots import MARK_SIZE, Box, frequency_axis, linear_axis, plot_curve, plot_frame, plot_label
    f = np.asarray(sweep.frequency_hz, dtype=float)
    db = 20.0 * np.log10(np.asarray(sweep.magnitude, dtype=float)) - features.response_peak_db
    drawing = Drawing(width, height)
    g = Group()
    box = Box(40.0, 36.0, width - 40.0 - 34.0, height - 36.0 - 30.0)
    x_axis = frequency_axis(float(f[0]), float(f[-1]), 8)
    floor_db = min(max(math.floor(float(np.min(db)) / 10.0) * 10.0, -80.0), -10.0)
    y_axis = linear_axis(floor_db, 0.0, 6, "dB")
    plot_frame(g, box, x_axis, y_axis, y_title_inside=True)
    y_hp = box.y + float(y_axis.fraction(-HALF_POWER_DB)) * box.height
    g.add(Line(box.x, y_hp, box.x + box.width, y_hp, strokeColor=black, strokeWidth=0.6,
               strokeDashArray=[1, 2]))
    plot_label(g, box.x + box.width + 4, y_hp - 2.6, "\u22123 dB", MARK_SIZE, "start")
    plot_curve(g, box, x_axis, y_axis, f, db)

    def x_at(f_hz):
        return box.x + float(x_axis.fraction(f_hz)) * box.width

    f0 = next((v for v in grading.as_left if v.quantity == "f0_hz"), None)
    if f0 is not None:
        for edge, name, anchor in ((f0.minimum, "f0 min", "end"), (f0.maximum, "f0 max", "start")):
            if edge is None or not x_axis.low <= edge <= x_axis.high:
                continue
            x = x_at(edge)
            g.add(Line(x, box.y, x, box.y + box.height, strokeColor=black, strokeWidth=0.7,
                       strokeDashArray=[4, 2]))
            plot_label(g, x + (-3 if anchor == "end" else 3), box.y + box.height + 5,
                    f"{name} {format_quantity(edge, 'Hz', 6)}", MARK_SIZE, anchor, bold=True)
    for f_hz in (features.f_low_hz, features.f_high_hz):
        if x_axis.low <= f_hz <= x_axis.high:
            g.add(Circle(x_at(f_hz), y_hp, 2.4, fillColor=white, strokeColor=black,
                         strokeWidth=0.9))
    if x_axis.low <= features.f_peak_hz <= x_axis.high:
        y_top = box.y + float(y_axis.fraction(0.0)) * box.height
        g.add(Circle(x_at(features.f_peak_hz), y_top, 2.4, fillColor=black, strokeColor=black))
    drawing.add(g)
    return drawing


def sweep_report(grading: Grading, sweep: MeasuredSweep, features: SweepFeatures,
                 record_text: str, sweep_path: Path) -> bytes:
    """The report's PDF bytes, the sweep file and the record JSON attached."""
    from reportlab.lib.colors import Color, black
    from reportlab.lib.pagesizes import A4
    from reportlab.lib.styles import ParagraphStyle
    from reportlab.lib.units import mm
    from reportlab.platypus import Paragraph, SimpleDocTemplate, Spacer, Table, TableStyle

    from sheetgen.sheet import fonts
    fonts.register_fonts()
    body = ParagraphStyle("body", fontName=fonts.REGULAR, fontSize=9, leading=11.5)
    cell = ParagraphStyle("cell", parent=body, fontSize=8.5, leading=10.5)
    head = ParagraphStyle("head", parent=body, fontName=fonts.BOLD, fontSize=11, leading=14,
                          spaceBefore=8, spaceAfter=4)
    title = ParagraphStyle("title", parent=body, fontName=fonts.BOLD, fontSize=14, leading=18)

    def p(text, style=cell):
        from xml.sax.saxutils import escape
        return Paragraph(escape(str(text)), style)

    grid = TableStyle([("FONTNAME", (0, 0), (-1, -1), fonts.REGULAR),
                       ("GRID", (0, 0), (-1, -1), 0.5, black),
                       ("BACKGROUND", (0, 0), (-1, 0), Color(0.88, 0.88, 0.88)),
                       ("VALIGN", (0, 0), (-1, -1), "MIDDLE")])
    unit = grading.unit
    width = A4[0] - 36 * mm
    story = [p(f"Test report: {grading.title}", title),
             p(f"Sheet {grading.sheet_id} rev {grading.revision} · unit "
               f"{unit.get('serial') or '(no serial recorded)'} · verdict "
               f"{grading.verdict.upper()}", body),
             p(f"Graded by sheetgen grade from the sweep {Path(sweep_path).name} "
               f"({sweep.source}, {sweep.parameter}) against the windows attached to the sheet; "
               f"the sweep and this record (record.json) are attached to this PDF.", body),
             p("Measured response", head),
             _curve_drawing(sweep, features, grading, width),
             p("Verdicts", head)]
    rows = [[p("Quantity"), p("Window"), p("Measured"), p("Verdict")]]
    for v in grading.values:
        rows.append([p(verdict_row_name(v)),
                     p("—" if v.as_found else window_text(v, grading.window_resolution_hz)),
                     p(v.typed or "—"),
                     p(verdict_text(v))])
        if v.form_typed:
            rows.append([p(f"{v.label}, typed in the form"),
                         p(window_text(v, grading.window_resolution_hz)),
                         p(v.form_typed), p(f"{v.form_verdict} (not used: the sweep's is)")])
    rows.append([p("Overall"), p("every value in its window"), p(""),
                 p(grading.verdict)])
    table = Table(rows, colWidths=[0.34 * width, 0.3 * width, 0.22 * width, 0.14 * width],
                  repeatRows=1)
    table.setStyle(grid)
    notes = grading_notes(grading)
    story += [table] + ([Spacer(1, 4)] if notes else []) + [p(note, body) for note in notes] \
        + [p("Record", head)]
    fields = [("Unit serial number", "serial"), ("Work order", "work_order"),
              ("Technician", "technician"), ("Date tested", "date"),
              ("Test ambient temperature (°C)", "ambient_c"), ("Instruments", "instruments"),
              ("Remarks", "remarks")]
    record = Table([[p(label), p(unit.get(key) or "—")] for label, key in fields]
                   + [[p("Content hash of the sheet"), p(grading.content_sha256)],
                      [p("Signature of the sheet"), p(signature_text(grading.signature))]],
                   colWidths=[0.34 * width, 0.66 * width])
    record.setStyle(TableStyle([("GRID", (0, 0), (-1, -1), 0.5, black),
                                ("VALIGN", (0, 0), (-1, -1), "MIDDLE")]))
    story += [record, Spacer(1, 6)]

    def footer(canvas, document):
        canvas.saveState()
        canvas.setFont(fonts.REGULAR, 7.5)
        canvas.drawString(18 * mm, 10 * mm, f"{grading.sheet_id} rev {grading.revision} · "
                          f"test report made by sheetgen {grading.tool_version}")
        canvas.drawRightString(A4[0] - 18 * mm, 10 * mm, f"page {document.page}")
        canvas.restoreState()

    out = io.BytesIO()
    document = SimpleDocTemplate(out, pagesize=A4, leftMargin=18 * mm, rightMargin=18 * mm,
                                 topMargin=16 * mm, bottomMargin=18 * mm,
                                 title=f"Test report {grading.sheet_id} rev {grading.revision}",
                                 author="sheetgen grade", invariant=1, pageCompression=1,
                                 initialFontName=fonts.REGULAR)
    from sheetgen.sheet.layout import reportlab_defaults_in_dejavu
    with reportlab_defaults_in_dejavu():
        document.build(story, onFirstPage=footer, onLaterPages=footer)
    from pypdf import PdfReader, PdfWriter
    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(out.getvalue())))
    writer.add_attachment(Path(sweep_path).name, Path(sweep_path).read_bytes())
    writer.add_attachment(RECORD_ATTACHMENT, record_text.encode("utf-8"))
    final = io.BytesIO()
    writer.write(final)
    return final.getvalue()


def verdict_row_name(value) -> str:
    """The row's quantity as the sheet labels it; a before-trimming reading is marked after
    the label ("Frequency of the peak (as found)"), never as a capital mid-phrase."""
    return f"{value.label} (as found)" if value.as_found else value.label
