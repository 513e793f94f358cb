"""The PDF build-and-test sheet: page frame, title block, story, attachments and metadata.

reportlab platypus lays out the sections of sections.py in the house style's order. Every
page carries the identity and signature block and "page x of y" (the total is a form
XObject filled in when the document closes, so one pass suffices). The
output is byte-identical for the same inputs: invariant mode, a content-derived /ID, and a
creation date taken from the sheet's own date.

The sheet is an archival record (archival.py: PDF/A-3b, XMP, sRGB output intent): every
font is embedded, the page content starts in DejaVu rather than reportlab's default
Helvetica, and the content hash of the attachments (sheetgen.report.content_hash) is recorded in
the XMP and in the document information as /SheetgenContentSHA256.
"""

from __future__ import annotations

import datetime as _dt
import hashlib
import io
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path

from reportlab.lib import colors
from reportlab.lib.pagesizes import A4, letter
from reportlab.lib.units import mm
from reportlab.lib.utils import simpleSplit
from reportlab.pdfgen.canvas import Canvas
from reportlab.platypus import (
    BaseDocTemplate,
    Flowable,
    Frame,
    NextPageTemplate,
    PageBreak,
    PageTemplate,
    Spacer,
)

from sheetgen import __version__
from sheetgen.design.records import Design
from sheetgen.errors import FieldError, InputError, Problem
from sheetgen.inputs.library import recorded_library_text
from sheetgen.inputs.reader import field_position
from sheetgen.inputs.style import HouseStyle, check_logo_inside, default_style
from sheetgen.report.content_hash import (
    INFO_CONTENT_SHA256,
    INFO_REVISION,
    INFO_SHEET_ID,
    INFO_TOOL_VERSION,
    content_sha256,
)
from sheetgen.report.parts import headline
from sheetgen.report.procedure import procedure
from sheetgen.sheet import archival, fonts
from sheetgen.sheet.sections import SECTIONS, make_kit, para, with_heading

PAGE_SIZES = {"A4": A4, "Letter": letter}
MARGIN = 14 * mm
HEADER_HEIGHT = 24.0
BLOCK_HEIGHT = 80.0
GAP = 8.0
LOGO_HEIGHT = 18.0
LEGIBLE_FLOOR = 5.5  # pt: the smallest text the page frame prints
LEADING = 1.18  # line pitch of the page frame's text, in font sizes
TOO_LONG = f"is too long to print whole in its cell of the title block, even at {LEGIBLE_FLOOR} pt"
PAGE_TOTAL_FORM = "sheetgenPageTotal"
PART_PAGES_FORM = "sheetgenPartPages"  # the cover's page ranges of the two parts
# The running header of each part (the style's `design_record` entry starts part two).
BUILD_PART, RECORD_PART = "Build and test", "Design record"
RECORD_MARKER = "design_record"
ATTACHMENTS = (("job.yaml", "application/x-yaml", "the job file this sheet was made from"),
               ("results.json", "application/json", "the computed results (sheetgen.results/1)"),
               ("library.yaml", "application/x-yaml", "the parts-library entries the design "
                "used, as written in the library at build"))
# How each attachment relates to the sheet (ISO 32000-2, 14.13.2; required by PDF/A-3).
AF_RELATIONSHIP = {"job.yaml": "Source", "results.json": "Data", "library.yaml": "Source"}


# --- identity on every page ---------------------------------------------------------------

def wrap_text(text: str, font: str, size: float, width: float) -> list[str]:
    """`text` wrapped to `width` at `size`; a word wider than `width` is cut where it must
    be, so no line is ever wider."""
    from reportlab.pdfbase.pdfmetrics import stringWidth
    pieces = []
    for word in text.split():
        while stringWidth(word, font, size) > width and len(word) > 1:
            cut = len(word) - 1
            while cut > 1 and stringWidth(word[:cut], font, size) > width:
                cut -= 1
            pieces.append(word[:cut])
            word = word[cut:]
        pieces.append(word)
    return simpleSplit(" ".join(pieces), font, size, width) if pieces else [""]


def fit_text(text: str, font: str, width: float, height: float,
             largest: float) -> tuple[list[str], float] | None:
    """The lines and size at which the whole of `text` fits `width` × `height`, or None.

    Sizes go from `largest` down to LEGIBLE_FLOOR in 0.5 pt steps; a size that keeps every
    word whole is preferred to a larger one that must cut a word."""
    from reportlab.pdfbase.pdfmetrics import stringWidth
    steps = int((largest - LEGIBLE_FLOOR) / 0.5 + 1e-9)
    sizes = sorted({largest - 0.5 * step for step in range(steps + 1)} | {LEGIBLE_FLOOR},
                   reverse=True)
    for whole_words in (True, False):
        for size in sizes:
            if whole_words and any(stringWidth(word, font, size) > width
                                   for word in text.split()):
                continue
            lines = wrap_text(text, font, size, width)
            if len(lines) * size * LEADING <= height + 1e-9:
                return lines, size
    return None


@dataclass(frozen=True)
class _Identity:
    organisation: str
    sheet_id: str
    title: str
    revision: str
    date: str
    designer: str
    checker: str
    approver: str
    note: str
    logo: Path | None


@dataclass(frozen=True)
class TextBox:
    """Where one field of the page frame is printed: the rectangle its lines fill (pt, from
    the page's bottom left), its font and largest size, and whether it is right-aligned."""

    x: float
    y: float
    width: float
    height: float
    font: str
    largest: float
    right: bool = False


# The job or style field each text box of the page frame prints.
FRAME_FIELDS = {"organisation": "organisation", "sheet_line": "sheet.id",
                "title": "sheet.title", "sheet": "sheet.id", "revision": "sheet.revision",
                "date": "sheet.date", "designer": "sheet.designer", "checker": "sheet.checker",
                "approver": "sheet.approver", "note": "page_note"}
_TITLE_COLUMNS = (("title", "TITLE", 0.47), ("sheet", "SHEET", 0.17), ("revision", "REV.", 0.08),
                  ("date", "DATE", 0.15), ("page", "PAGE", 0.13))
_SIGNATURES = (("designer", "DESIGNED"), ("checker", "CHECKED"), ("approver", "APPROVED"))
_ROW_C, _ROW_B = 12.0, 36.0  # heights of the tool-and-note row and the signature row
_ROW_A = BLOCK_HEIGHT - _ROW_C - _ROW_B


def _check_logo_decodes(style: HouseStyle) -> None:
    """A logo whose header reads but whose pixels do not decode (a broken data stream) is
    bad input at the style's `logo`, not an error from deep inside the page drawing."""
    if style.logo_path is None:
        return
    from reportlab.lib.utils import ImageReader
    try:
        ImageReader(str(style.logo_path)).getRGBData()
    except Exception as error:  # noqa: BLE001 - the image decoder raises many kinds
        line, column = style.logo_mark
        text = " ".join(str(error).split()).rsplit("] ", 1)[-1][:120] or type(error).__name__
        raise InputError([Problem(style.source, line, column, "logo", (
            f"{style.logo_path.name} cannot be decoded as an image ({text}); save it again "
            "as PNG or JPEG"))]) from None


def _logo_width(logo: Path | None) -> float:
    """How wide the header draws the logo (LOGO_HEIGHT high, at most 90 pt wide); 0 without
    one."""
    if logo is None:
        return 0.0
    from reportlab.lib.utils import ImageReader
    w_px, h_px = ImageReader(str(logo)).getSize()
    return min(LOGO_HEIGHT * w_px / h_px, 90.0)


def frame_boxes(page_size, logo_width: float = 0.0) -> dict[str, TextBox]:
    """The text box of every field the page frame prints, by its FRAME_FIELDS key (and
    the page number's, "page").

    Each box stops short of its cell's caption, borders and signature line."""
    page_w, page_h = page_size
    left, width, top = MARGIN, page_w - 2 * MARGIN, page_h - MARGIN
    x_org = left + logo_width + 6 if logo_width else left
    boxes = {"organisation": TextBox(x_org, top - 21, left + width * 0.62 - x_org, 21,
                                     fonts.BOLD, 10.5),
             "sheet_line": TextBox(left + width * 0.64, top - 14, width * 0.36, 14,
                                   fonts.REGULAR, 8.0, right=True),
             "note": TextBox(left + width * 0.55 - 3, MARGIN + 1, width * 0.45, _ROW_C - 2,
                             fonts.REGULAR, 6.5, right=True)}
    y_a, x = MARGIN + _ROW_C + _ROW_B, left
    for key, _caption, fraction in _TITLE_COLUMNS:
        boxes[key] = TextBox(x + 3, y_a + 1.5, width * fraction - 6, _ROW_A - 10.5,
                             fonts.BOLD, 9.0)
        x += width * fraction
    third, y_b = width / 3, MARGIN + _ROW_C
    for index, (key, _caption) in enumerate(_SIGNATURES):
        boxes[key] = TextBox(left + third * index + 46, y_b + 12, third - 50, _ROW_B - 13.5,
                             fonts.BOLD, 8.5)
    return boxes


def _frame_texts(identity: _Identity) -> dict[str, str]:
    return {"organisation": identity.organisation,
            "sheet_line": f"{identity.sheet_id} rev {identity.revision}",
            "title": identity.title, "sheet": identity.sheet_id, "revision": identity.revision,
            "date": identity.date, "designer": identity.designer, "checker": identity.checker,
            "approver": identity.approver, "note": identity.note}


def frame_misfits(texts: dict[str, str], page_size, logo_width: float = 0.0) -> list[str]:
    """The FRAME_FIELDS keys whose text cannot be printed whole in its box even at
    LEGIBLE_FLOOR; `texts` maps keys to their text (a missing or empty one always fits)."""
    fonts.register_fonts()
    boxes = frame_boxes(page_size, logo_width)
    return [key for key, text in texts.items() if text and fit_text(
        text, boxes[key].font, boxes[key].width, boxes[key].height, boxes[key].largest) is None]


def check_frame_fits(job, job_path: Path, style: HouseStyle | None = None) -> None:
    """Refuse a job (and its house style) whose title-block text cannot be printed whole."""
    style = style or default_style()
    misfits = frame_misfits(_frame_texts(_identity(job.sheet, style)),
                            PAGE_SIZES[style.page_size], _logo_width(style.logo_path))
    problems = []
    for field in dict.fromkeys(FRAME_FIELDS[key] for key in misfits):
        where = (style.source, *style.mark(field)) if field in ("organisation", "page_note") else (
            str(job_path), *field_position(job_path, field))
        problems.append(Problem(*where, field, TOO_LONG, "a shorter text"))
    if problems:
        raise InputError(problems)


def _identity(sheet, style: HouseStyle) -> _Identity:
    return _Identity(style.organisation, sheet.id, sheet.title, sheet.revision, sheet.date,
                     sheet.designer, sheet.checker or "", sheet.approver or "",
                     style.page_note or "", style.logo_path)


def _cell(canvas: Canvas, x, y, width, height, caption: str):
    canvas.setStrokeColor(colors.black)
    canvas.setLineWidth(0.6)
    canvas.rect(x, y, width, height, stroke=1, fill=0)
    canvas.setFont(fonts.REGULAR, 6.5)
    canvas.setFillColor(colors.Color(0.25, 0.25, 0.25))
    canvas.drawString(x + 3, y + height - 8, caption)
    canvas.setFillColor(colors.black)


def _baseline(box: TextBox, size: float, index: int) -> float:
    """The baseline of line `index` of a box's text: each line takes size × LEADING, its
    descenders at the bottom of that share."""
    from reportlab.pdfbase.pdfmetrics import getDescent
    return box.y + box.height - size * LEADING * (index + 1) - getDescent(box.font, size)


def _draw_box(canvas: Canvas, box: TextBox, text: str) -> None:
    """The whole of `text` in `box` (that it fits is checked before the pages are drawn)."""
    lines, size = fit_text(text, box.font, box.width, box.height, box.largest)
    canvas.setFont(box.font, size)
    for index, line in enumerate(lines):
        if box.right:
            canvas.drawRightString(box.x + box.width, _baseline(box, size, index), line)
        else:
            canvas.drawString(box.x, _baseline(box, size, index), line)


def _draw_page_frame(canvas: Canvas, identity: _Identity, page_size,
                     attached: str = "job.yaml, results.json", part: str = "") -> None:
    """Header (organisation, logo, the part the page belongs to) and the title block with
    signature lines."""
    page_w, page_h = page_size
    left, width = MARGIN, page_w - 2 * MARGIN
    canvas.saveState()
    top = page_h - MARGIN
    logo_width = _logo_width(identity.logo)
    if identity.logo is not None:
        canvas.drawImage(str(identity.logo), left, top - LOGO_HEIGHT, logo_width, LOGO_HEIGHT,
                         preserveAspectRatio=True, anchor="sw", mask="auto")
    boxes = frame_boxes(page_size, logo_width)
    for key, text in _frame_texts(identity).items():
        if text:
            _draw_box(canvas, boxes[key], text)
    canvas.setFont(fonts.BOLD if part == RECORD_PART else fonts.REGULAR, 7)
    canvas.drawRightString(left + width, top - 19.5, "build-and-test sheet"
                           + (f" \u00b7 {part}" if part else ""))
    canvas.setStrokeColor(colors.black)
    canvas.setLineWidth(0.8)
    canvas.line(left, top - HEADER_HEIGHT + 2, left + width, top - HEADER_HEIGHT + 2)

    # title block: row A identity, row B signatures, row C tool and note
    y_c = MARGIN
    y_b = y_c + _ROW_C
    y_a = y_b + _ROW_B
    x = left
    for key, caption, fraction in _TITLE_COLUMNS:
        _cell(canvas, x, y_a, width * fraction, _ROW_A, caption)
        if key == "page":
            page_box = boxes["page"]
            text = f"{canvas.getPageNumber()} of "
            baseline = _baseline(page_box, 9.0, 0)
            canvas.setFont(fonts.BOLD, 9)
            canvas.drawString(page_box.x, baseline, text)
            canvas.saveState()
            canvas.translate(page_box.x + canvas.stringWidth(text, fonts.BOLD, 9), baseline)
            canvas.doForm(PAGE_TOTAL_FORM)
            canvas.restoreState()
        x += width * fraction
    third = width / 3
    for index, (_key, caption) in enumerate(_SIGNATURES):
        x = left + third * index
        _cell(canvas, x, y_b, third, _ROW_B, caption)
        canvas.setFont(fonts.REGULAR, 6.5)
        canvas.drawString(x + 3, y_b + 5, "signature")
        canvas.drawString(x + third * 0.64, y_b + 5, "date")
        canvas.setLineWidth(0.5)
        canvas.line(x + 34, y_b + 4, x + third * 0.62, y_b + 4)
        canvas.line(x + third * 0.64 + 16, y_b + 4, x + third - 4, y_b + 4)
    canvas.setLineWidth(0.6)
    canvas.rect(left, y_c, width, _ROW_C, stroke=1, fill=0)
    canvas.setFont(fonts.REGULAR, 6.5)
    canvas.drawString(left + 3, y_c + 3.5, f"made by sheetgen {__version__} from the job file "
                      f"attached to this PDF ({attached})")
    canvas.restoreState()


@dataclass(frozen=True)
class _Archive:
    """What the archival metadata records besides the document information's own strings."""

    moment: _dt.datetime
    sheet_id: str
    revision: str
    content_sha256: str


def _canvas_class(attachments: list[tuple[str, bytes, str, str]], document_id: bytes,
                  archive: _Archive):
    """A Canvas that defines the page-total form, sets the /ID, embeds the files and writes
    the archival metadata on save."""
    pdf_date = archival.pdf_date(archive.moment)

    class SheetCanvas(Canvas):
        def __init__(self, *args, **kwargs):
            super().__init__(*args, **kwargs)
            self.setDateFormatter(lambda *_: pdf_date)

        def save(self):
            total = self.getPageNumber() - 1
            self.beginForm(PAGE_TOTAL_FORM)
            self.setFont(fonts.BOLD, 9)
            self.drawString(0, 0, str(total))
            self.endForm()
            record_page = getattr(self, "design_record_page", None)
            if record_page is not None:
                self.beginForm(PART_PAGES_FORM)
                self.setFont(fonts.BOLD, 8.5)
                self.drawString(0, 0, part_pages_text(record_page, total))
                self.endForm()
            specs = _embed_files(self._doc, attachments, pdf_date)
            info = self._doc.info
            own = {INFO_SHEET_ID: archive.sheet_id, INFO_REVISION: archive.revision,
                   INFO_TOOL_VERSION: __version__, INFO_CONTENT_SHA256: archive.content_sha256}
            self._doc.info = _info_with(info, own)
            archival.add_archival_objects(self._doc, archival.Record(
                title=info.title, author=info.author, subject=info.subject,
                keywords=info.keywords, creator_tool=info.creator, producer=info.producer,
                date=archive.moment, sheet_id=archive.sheet_id, revision=archive.revision,
                tool_version=__version__, content_sha256=archive.content_sha256), specs)
            from reportlab.pdfbase.pdfdoc import DummyDoc, PDFText
            hexed = PDFText(document_id, enc="raw").format(DummyDoc())
            self._doc._ID = b"\n[" + hexed + hexed + b"]\n"
            super().save()

    return SheetCanvas


def _embed_files(doc, attachments, pdf_date: str) -> list:
    """Embedded files (PDF 1.7, 7.11.4) in the catalog's /Names /EmbeddedFiles tree.

    Each file specification says how the file relates to the sheet (/AFRelationship) and
    is returned, for the catalog's /AF array (associated files, PDF/A-3)."""
    from reportlab.pdfbase.pdfdoc import PDFArray, PDFDictionary, PDFName, PDFStream, PDFString
    names, specs = [], []
    for name, data, mime, description in sorted(attachments):
        stream = PDFStream(PDFDictionary({
            "Type": PDFName("EmbeddedFile"),
            "Subtype": PDFName(mime.replace("/", "#2F")),
            "Params": PDFDictionary({"Size": len(data), "ModDate": PDFString(pdf_date),
                                     "CheckSum": PDFString(hashlib.md5(data).digest(),
                                                           enc="raw")}),
        }), data)
        spec = PDFDictionary({"Type": PDFName("Filespec"), "F": PDFString(name),
                              "UF": PDFString(name), "Desc": PDFString(description),
                              "AFRelationship": PDFName(AF_RELATIONSHIP[name]),
                              "EF": PDFDictionary({"F": doc.Reference(stream)})})
        specs.append(doc.Reference(spec))
        names += [PDFString(name), specs[-1]]
    doc.Catalog.Names = PDFDictionary({"EmbeddedFiles": PDFDictionary({"Names": PDFArray(names)})})
    return specs


def _info_with(info, own: dict[str, str]):
    """A copy of reportlab's document information that also writes our keys `own`."""
    from reportlab.pdfbase.pdfdoc import PDFDate, PDFDictionary, PDFInfo, PDFName, PDFString

    class SheetInfo(PDFInfo):
        def format(self, document):
            date = PDFDate(ts=document._timeStamp, dateFormatter=self._dateFormatter)
            entries = {"Title": PDFString(self.title), "Author": PDFString(self.author),
                       "CreationDate": date, "ModDate": date,
                       "Producer": PDFString(self.producer), "Creator": PDFString(self.creator),
                       "Subject": PDFString(self.subject), "Keywords": PDFString(self.keywords),
                       "Trapped": PDFName(self.trapped)}
            entries.update((key, PDFString(value)) for key, value in own.items())
            return PDFDictionary(entries).format(document)

    copy = SheetInfo()
    copy.__dict__.update(info.__dict__)
    return copy


def _sheet_moment(text: str) -> _dt.datetime:
    """The sheet's date (midnight UTC) when it is an ISO date, else a fixed date."""
    try:
        day = _dt.date.fromisoformat(text.strip())
    except ValueError:
        day = _dt.date(2000, 1, 1)
    return _dt.datetime(day.year, day.month, day.day)


def part_pages_text(record_page: int, total: int) -> str:
    """The cover's line saying which pages each part takes (part one prints alone)."""
    build = "page 1" if record_page == 2 else f"pages 1\u2013{record_page - 1}"
    record = (f"page {record_page}" if record_page == total
              else f"pages {record_page}\u2013{total}")
    return (f"{BUILD_PART}: {build} (print these for the bench); "
            f"{RECORD_PART.lower()}: {record}")


class _PartPages(Flowable):
    """The cover's line of page ranges (a form filled in when the document closes)."""

    def wrap(self, available_width, available_height):
        return available_width, 12.0

    def draw(self):
        self.canv.doForm(PART_PAGES_FORM)


class _RecordStarts(Flowable):
    """Notes on the canvas the page on which the design record starts; draws nothing."""

    def wrap(self, available_width, available_height):
        return 0.0, 0.0

    def draw(self):
        self.canv.design_record_page = self.canv.getPageNumber()


@contextmanager
def reportlab_defaults_in_dejavu():
    """reportlab's table cells and drawings select its default font (Helvetica, never
    embedded) before they draw, even when all their text is in DejaVu; while the sheet is
    made, that default is DejaVu Sans, so no page names a font that is not embedded."""
    from reportlab.graphics import shapes
    from reportlab.platypus import tables
    saved = tables.CellStyle.fontname, shapes.STATE_DEFAULTS["fontName"]
    tables.CellStyle.fontname = shapes.STATE_DEFAULTS["fontName"] = fonts.REGULAR
    try:
        yield
    finally:
        tables.CellStyle.fontname, shapes.STATE_DEFAULTS["fontName"] = saved


def render_sheet(design: Design, job_text: str, results_text: str, job_dir: Path | None = None,
                 *, style: HouseStyle | None = None) -> bytes:
    """The build-and-test sheet of `design` as PDF bytes (same inputs ⇒ same bytes).

    `job_text` and `results_text` are embedded as job.yaml and results.json; `job_dir` is
    the job's folder, inside which a style's logo must lie.
    """
    fonts.register_fonts()
    with reportlab_defaults_in_dejavu():
        return _render(design, job_text, results_text, job_dir, style)


def _render(design: Design, job_text: str, results_text: str, job_dir: Path | None,
            style: HouseStyle | None) -> bytes:
    style = style or default_style()
    check_logo_inside(style, job_dir)
    _check_logo_decodes(style)
    page_size = PAGE_SIZES[style.page_size]
    sheet = design.job.sheet
    identity = _identity(sheet, style)
    misfits = frame_misfits(_frame_texts(identity), page_size, _logo_width(style.logo_path))
    if misfits:
        raise FieldError(FRAME_FIELDS[misfits[0]], TOO_LONG)
    page_w, page_h = page_size
    frame_bottom = MARGIN + BLOCK_HEIGHT + GAP
    frame_top = page_h - MARGIN - HEADER_HEIGHT - 2
    def body_frame() -> Frame:
        return Frame(MARGIN, frame_bottom, page_w - 2 * MARGIN, frame_top - frame_bottom,
                     leftPadding=0, rightPadding=0, topPadding=0, bottomPadding=0, id="body")
    frame = body_frame()
    kit = make_kit(frame.width, procedure(design))
    two_parts = RECORD_MARKER in style.sections
    story: list = [para(sheet.title, kit.title), para(headline(design), kit.small)]
    story += [Spacer(1, 2), _PartPages()] if two_parts else []
    story.append(Spacer(1, 4))
    number = 0
    for name in style.sections:
        if name == RECORD_MARKER:
            story += [NextPageTemplate("record"), PageBreak(), _RecordStarts(),
                      para(RECORD_PART, kit.title),
                      para("For the engineer who checks and signs the design: the values as "
                           "analysed, how the test windows were derived, stresses, ratings "
                           "and plots. Nothing in it is needed at the bench.", kit.small),
                      Spacer(1, 4)]
            continue
        content = SECTIONS[name](design, kit)
        if content is None:
            continue
        number += 1
        heading = para(f"{number}  {content.title}", kit.heading)
        story += with_heading(heading, content.flowables)
    job_bytes, results_bytes = job_text.encode("utf-8"), results_text.encode("utf-8")
    library_text = recorded_library_text(design.library_entries)
    library_bytes = None if library_text is None else library_text.encode("utf-8")
    attachments = [(name, data, mime, description) for (name, mime, description), data
                   in zip(ATTACHMENTS, (job_bytes, results_bytes, library_bytes))
                   if data is not None]
    attached = ", ".join(name for name, *_ in attachments)
    archive = _Archive(_sheet_moment(sheet.date), sheet.id, sheet.revision,
                       content_sha256(job_bytes, results_bytes, library_bytes))
    digest = hashlib.sha256()
    for part in (__version__, repr(style), job_text, results_text, library_text or ""):
        digest.update(part.encode("utf-8") + b"\0")
    buffer = io.BytesIO()
    doc = BaseDocTemplate(
        buffer, pagesize=page_size, invariant=1, pageCompression=1,
        title=f"{sheet.id} rev {sheet.revision}: {sheet.title}", author=sheet.designer,
        subject=f"Build-and-test sheet: {headline(design)}",
        keywords=", ".join(["tuned circuit", design.circuit.topology, "build-and-test sheet",
                            sheet.id, f"rev {sheet.revision}"]),
        creator=f"sheetgen {__version__}", lang="en", initialFontName=fonts.REGULAR,
        leftMargin=MARGIN, rightMargin=MARGIN, topMargin=MARGIN, bottomMargin=MARGIN)
    doc.addPageTemplates([PageTemplate(
        template, [body_frame()], pagesize=page_size,
        onPage=lambda canvas, _doc, part=part: _draw_page_frame(canvas, identity, page_size,
                                                              attached, part))
        for template, part in (("sheet", BUILD_PART if two_parts else ""),
                               ("record", RECORD_PART))])
    doc.build(story, canvasmaker=_canvas_class(attachments, digest.digest()[:16], archive))
    return buffer.getvalue()
