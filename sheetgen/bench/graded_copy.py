"""The graded copy of a sheet: verdicts set, the overall verdict stamped, every field locked.

Radio groups (ISO 32000-1, 12.7.4.2.4): the group's /V names the chosen state and each kid
widget's /AS is that state where its normal appearance has it, else /Off. Read-only is bit 1
of /Ff (12.7.3.1, Table 221). The stamp is a reportlab overlay in the sheet's embedded
DejaVu font, merged onto the page that carries the overall verdict. Returns bytes; the
caller writes them (atomically) and the original file is left as it was.
"""

from __future__ import annotations

import io

from sheetgen.report.procedure import OVERALL_VERDICT

from .grade import Grading

READ_ONLY = 1  # /Ff bit 1
STAMP_SIZE = 11.0
STAMP_CLEARANCE = 52.0  # pt below the page's lowest field: past the signature row


NOTE_SIZE = 8.0


def stamp_text(grading: Grading) -> str:
    date = grading.unit.get("date") or "no date recorded"
    return f"GRADED {grading.verdict.upper()} by sheetgen grade, {date}"


def stamp_notes(grading: Grading) -> list[str]:
    """Lines under the stamp: the technician's ticks the grade differs from (the copy's
    verdict boxes show the computed verdicts) and values that disagree with each other."""
    notes = []
    ticks = [f"{v.quantity} {v.ticked.upper()}" for v in grading.as_left
             if v.verdict_field and v.tick_disagrees]
    if grading.ticked_overall and grading.ticked_overall != grading.verdict:
        ticks.append(f"overall {grading.ticked_overall.upper()}")
    if ticks:
        notes.append("The technician had ticked " + ", ".join(ticks)
                     + " (kept in the record; the boxes show the graded verdicts)")
    notes += [finding.text() for finding in grading.consistency]
    if grading.signature is not None:
        notes.append(f"The sheet graded was {grading.signature.summary()}; this copy is not "
                     "signed")
    return notes


def _drop_signatures(writer) -> None:
    """Remove the sheet's signature fields, their widgets and the DocMDP permissions: the
    copy's pages and form change, so a signature carried over would only read as broken."""
    from pypdf.generic import ArrayObject, NameObject
    root = writer._root_object
    form = root.get("/AcroForm")
    if form is None:
        return
    form = form.get_object()
    signature_ids = set()
    kept = ArrayObject()
    for reference in form.get("/Fields", []):
        if reference.get_object().get("/FT") == "/Sig":
            signature_ids.add(id(reference.get_object()))
        else:
            kept.append(reference)
    if not signature_ids:
        return
    form[NameObject("/Fields")] = kept
    form.pop(NameObject("/SigFlags"), None)
    root.pop(NameObject("/Perms"), None)
    for page in writer.pages:
        annotations = page.get("/Annots")
        if annotations is None:
            continue
        page[NameObject("/Annots")] = ArrayObject(
            a for a in annotations.get_object() if id(a.get_object()) not in signature_ids)


def _overlay(width: float, height: float, text: str, x: float, y: float,
             notes: list[str] = ()) -> bytes:
    from reportlab.lib.colors import black
    from reportlab.pdfgen import canvas

    from sheetgen.sheet import fonts
    fonts.register_fonts()
    out = io.BytesIO()
    page = canvas.Canvas(out, pagesize=(width, height), pageCompression=1, invariant=1,
                         initialFontName=fonts.BOLD)
    page.setFillColor(black)
    page.setStrokeColor(black)
    page.setFont(fonts.BOLD, STAMP_SIZE)
    text_width = page.stringWidth(text, fonts.BOLD, STAMP_SIZE)
    x = min(max(x, 20.0), width - text_width - 20.0)
    page.setLineWidth(1.2)
    page.rect(x - 5, y - 4, text_width + 10, STAMP_SIZE + 7, stroke=1, fill=0)
    page.drawString(x, y, text)
    from reportlab.lib.utils import simpleSplit
    page.setFont(fonts.REGULAR, NOTE_SIZE)
    lines = [line for note in notes
             for line in simpleSplit(note, fonts.REGULAR, NOTE_SIZE, width - 40.0)]
    for number, line in enumerate(lines, start=1):
        page.drawRightString(width - 20.0, y - 8 - number * (NOTE_SIZE + 2), line)
    page.showPage()
    page.save()
    return out.getvalue()


def _all_fields(writer):
    """Every field dictionary of the AcroForm (parents and kids)."""
    from pypdf.generic import NameObject
    root = writer._root_object.get(NameObject("/AcroForm"))
    stack = list(root.get_object().get("/Fields", [])) if root is not None else []
    seen = set()
    while stack:
        item = stack.pop()
        obj = item.get_object()
        if id(obj) in seen:
            continue
        seen.add(id(obj))
        yield obj
        stack.extend(obj.get("/Kids", []))


def _own_text_appearances(writer) -> None:
    """Draw each filled text field's value in an appearance of its own. A form whose text
    widgets share one appearance dictionary shows the last value typed in every field once
    a filler writes into it; the copy gives each widget its own and redraws it (pypdf)."""
    from pypdf.generic import DictionaryObject, NameObject
    for page in writer.pages:
        values = {}
        for annotation in page.get("/Annots", []) or []:
            widget = annotation.get_object()
            if widget.get("/FT") != "/Tx" or "/T" not in widget:
                continue
            value = widget.get("/V")
            widget[NameObject("/AP")] = DictionaryObject()
            values[str(widget["/T"])] = "" if value is None else str(value)
        if values:
            writer.update_page_form_field_values(page, values, auto_regenerate=False)


def graded_copy(pdf_bytes: bytes, grading: Grading) -> bytes:
    """A copy of the sheet in `pdf_bytes` with `grading`'s verdicts, stamp and locked fields."""
    from pypdf import PdfReader, PdfWriter
    from pypdf.generic import NameObject, NumberObject
    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(pdf_bytes)))
    _drop_signatures(writer)
    _own_text_appearances(writer)
    states = grading.verdict_states()
    stamp_page = None
    lowest: dict[int, float] = {}  # each page's lowest widget edge
    for number, page in enumerate(writer.pages):
        for annotation in page.get("/Annots", []) or []:
            widget = annotation.get_object()
            if "/Rect" in widget:
                bottom = min(float(widget["/Rect"][1]), float(widget["/Rect"][3]))
                lowest[number] = min(lowest.get(number, bottom), bottom)
            parent = widget.get("/Parent")
            group = parent.get_object() if parent is not None else widget
            name = str(group.get("/T", ""))
            if name not in states:
                continue
            state = states[name]
            normal = widget.get("/AP", {}).get("/N", {})
            chosen = f"/{state}" if f"/{state}" in normal else "/Off"
            widget[NameObject("/AS")] = NameObject(chosen)
            group[NameObject("/V")] = NameObject(f"/{state}")
            if name == OVERALL_VERDICT:
                stamp_page = number
    for field in _all_fields(writer):
        if "/T" in field or "/FT" in field:
            field[NameObject("/Ff")] = NumberObject(int(field.get("/Ff", 0)) | READ_ONLY)
    if stamp_page is None:  # no overall verdict widget: the last page
        stamp_page = len(writer.pages) - 1
    page = writer.pages[stamp_page]
    width, height = float(page.mediabox.width), float(page.mediabox.height)
    # right-aligned, clear of the record's last row (the signature line below the fields)
    x, y = width, lowest.get(stamp_page, height - 40.0) - STAMP_CLEARANCE
    overlay = PdfReader(io.BytesIO(_overlay(width, height, stamp_text(grading), x, y,
                                            stamp_notes(grading)))).pages[0]
    page.merge_page(overlay)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()
