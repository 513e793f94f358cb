"""Fillable AcroForm fields as platypus flowables, placed wherever a table cell puts them.

The field names are the record's stable names from sheetgen.report.procedure (form_field_names);
work-order systems read a filled sheet by those names. Fields print with a border so a
sheet printed blank is filled by hand in the same boxes.

For an archival sheet (PDF/A, ISO 19005) the text fields use the embedded field font of
fonts.py in their appearances, /DA and the form's /DR, and a check box keeps only its
normal appearance (/AP /N, ISO 19005-2 6.3.3).
"""

from __future__ import annotations

from reportlab.lib.colors import Color, black, white
from reportlab.platypus import Flowable

from sheetgen.sheet import fonts

FIELD_FONT = "SGField"  # the field font's resource name in /DR and /DA (fonts.field_font)
FIELD_BORDER = Color(0.25, 0.25, 0.25)
FIELD_FILL = Color(0.97, 0.97, 0.97)


def field_form(canvas):
    """The canvas's AcroForm, made on first use as a `_FieldForm` (embedded field font)."""
    form = getattr(canvas, "AcroForm", None)
    if form is None:
        form = canvas.AcroForm = canvas._doc._catalog.AcroForm = _make_field_form(canvas)
    return form


def _make_field_form(canvas):
    from reportlab.pdfbase.acroform import AcroForm
    from reportlab.pdfbase.pdfdoc import PDFArray, PDFDictionary, PDFString

    class _FieldForm(AcroForm):
        """reportlab's AcroForm with one font, the embedded field font, and no other."""

        def makeFont(self, fontName):
            if fontName != FIELD_FONT:
                raise ValueError(f"form fields use {FIELD_FONT}, not {fontName!r}")
            if FIELD_FONT not in self.fonts:
                self.fonts[FIELD_FONT] = self.getRefStr(_field_font_dictionary(self.canv._doc))
            return self.fonts[FIELD_FONT], FIELD_FONT

        def format(self, doc):
            entries = {"Fields": PDFArray([self.getRef(f) for f in self.fields])}
            if self.fonts:
                entries["DA"] = PDFString(f"/{FIELD_FONT} 0 Tf 0 g")
                entries["DR"] = PDFDictionary({"Font": PDFDictionary(
                    {FIELD_FONT: doc.Reference(_field_font_dictionary(doc))})})
            return PDFDictionary(entries).format(doc)

        def textfield(self, **kwargs):
            # each text field gets appearance streams of its own: shared ones (reportlab
            # reuses identical streams) would show one field's typed value in every field
            self._refMap = {}
            return super().textfield(**kwargs)

        def radio(self, **kwargs):
            super().radio(**kwargs)
            widget_ref = self._radios[kwargs["name"]].kids[-1]
            _normal_appearance_only(self.canv._doc.idToObject[widget_ref.name])

    return _FieldForm(canvas)


def _normal_appearance_only(widget) -> None:
    """Keep a button widget's normal appearance only (/N), as PDF/A requires (no /D, /R)."""
    appearances = widget.dict["AP"].dict
    for key in [key for key in appearances if key != "N"]:
        del appearances[key]


def _field_font_dictionary(doc):
    """The field font's /Font dictionary (simple TrueType, WinAnsiEncoding), one per document."""
    from reportlab.pdfbase.pdfdoc import PDFArray, PDFDictionary, PDFName, PDFStream
    cached = getattr(doc, "_sheetgen_field_font", None)
    if cached is not None:
        return cached
    font = fonts.field_font()
    program = PDFStream(PDFDictionary({"Length1": len(font.program)}), font.program)
    descriptor = PDFDictionary({
        "Type": PDFName("FontDescriptor"), "FontName": PDFName(font.base_font),
        "Flags": 32,  # non-symbolic (ISO 32000-1, 9.8.2)
        "FontBBox": PDFArray(list(font.bbox)), "ItalicAngle": font.italic_angle,
        "Ascent": font.ascent, "Descent": font.descent, "CapHeight": font.cap_height,
        "StemV": font.stem_v, "FontFile2": doc.Reference(program)})
    to_unicode = PDFStream(PDFDictionary({}), _to_unicode_cmap(font.base_font))
    dictionary = PDFDictionary({
        "Type": PDFName("Font"), "Subtype": PDFName("TrueType"),
        "ToUnicode": doc.Reference(to_unicode),
        "BaseFont": PDFName(font.base_font), "FirstChar": fonts.FIELD_FIRST_CHAR,
        "LastChar": 255, "Widths": PDFArray(list(font.widths)),
        "Encoding": PDFName("WinAnsiEncoding"), "FontDescriptor": doc.Reference(descriptor)})
    doc._sheetgen_field_font = dictionary
    return dictionary


def _to_unicode_cmap(name: str) -> bytes:
    """A ToUnicode CMap (ISO 32000-1, 9.10.3) for the WinAnsi codes the field font has."""
    pairs = [(code, fonts.winansi_unicode(code)) for code in range(fonts.FIELD_FIRST_CHAR, 256)]
    pairs = [(code, u) for code, u in pairs if u is not None]
    blocks = []
    for start in range(0, len(pairs), 100):  # at most 100 entries per beginbfchar
        chunk = pairs[start:start + 100]
        blocks.append(f"{len(chunk)} beginbfchar\n" + "".join(
            f"<{code:02X}> <{u:04X}>\n" for code, u in chunk) + "endbfchar\n")
    return ("/CIDInit /ProcSet findresource begin\n12 dict begin\nbegincmap\n"
            "/CIDSystemInfo << /Registry (Adobe) /Ordering (UCS) /Supplement 0 >> def\n"
            f"/CMapName /{name.replace('+', '-')}-UCS def\n/CMapType 2 def\n"
            "1 begincodespacerange\n<00> <FF>\nendcodespacerange\n" + "".join(blocks)
            + "endcmap\nCMapName currentdict /CMap defineresource pop\nend\nend\n"
            ).encode("ascii")


class TextField(Flowable):
    """A one-line (or multi-line) text field as wide as its cell."""

    def __init__(self, name: str, tooltip: str, height: float = 15.0, multiline: bool = False,
                 max_length: int = 200):
        super().__init__()
        self.name, self.tooltip, self.multiline = name, tooltip, multiline
        self.field_height, self.max_length = height, max_length

    def wrap(self, available_width, available_height):
        self.width, self.height = available_width, self.field_height
        return self.width, self.height

    def draw(self):
        field_form(self.canv).textfield(
            name=self.name, tooltip=self.tooltip, x=0, y=0, width=self.width,
            height=self.height, relative=True, fontName=FIELD_FONT, fontSize=9 if not
            self.multiline else 8, borderWidth=0.6, borderColor=FIELD_BORDER,
            fillColor=FIELD_FILL, textColor=black, maxlen=self.max_length,
            fieldFlags="multiline" if self.multiline else "", forceBorder=True)


class RadioChoice(Flowable):
    """One choice of a one-choice group (pass or fail: choosing one clears the other),
    followed by its word; the group is the field `name`, the choice its `value`."""

    SIZE = 11.0

    def __init__(self, name: str, value: str, tooltip: str):
        super().__init__()
        self.name, self.value, self.tooltip = name, value, tooltip

    def wrap(self, available_width, available_height):
        self.width, self.height = min(available_width, 48.0), self.SIZE
        return self.width, self.height

    def draw(self):
        self.canv.acroForm.radio(
            name=self.name, tooltip=self.tooltip, value=self.value, selected=False, x=0, y=0,
            size=self.SIZE, relative=True, buttonStyle="check", shape="square",
            borderWidth=0.8, borderColor=black, fillColor=white, textColor=black,
            forceBorder=True)
        self.canv.setFont(fonts.REGULAR, 8.5)
        self.canv.drawString(self.SIZE + 3, 2.2, self.value)
