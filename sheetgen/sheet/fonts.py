"""The sheet's typefaces: DejaVu Sans, Bold and Mono as shipped inside matplotlib.

DejaVu covers µ, Ω, °, ±, −, √ and π, which the PDF base-14 fonts do not. The files are
found without importing matplotlib (its import costs more than the whole sheet), and
registered with reportlab once per process; reportlab embeds only the glyphs used. The
form fields get their own embedded cut of DejaVu Sans (`field_font`).
"""

from __future__ import annotations

import importlib.util
from dataclasses import dataclass
from functools import cache
from pathlib import Path

REGULAR = "DejaVuSans"
BOLD = "DejaVuSans-Bold"
MONO = "DejaVuSansMono"
FAMILY = "DejaVuSans"

_FILES = {REGULAR: "DejaVuSans.ttf", BOLD: "DejaVuSans-Bold.ttf", MONO: "DejaVuSansMono.ttf"}


class FontError(RuntimeError):
    """The DejaVu font files that matplotlib ships cannot be found."""


def font_folder() -> Path:
    """matplotlib's mpl-data/fonts/ttf folder (the same place matplotlib.get_data_path() names)."""
    spec = importlib.util.find_spec("matplotlib")
    folders = list(spec.submodule_search_locations or []) if spec else []
    for folder in folders:
        candidate = Path(folder) / "mpl-data" / "fonts" / "ttf"
        if (candidate / _FILES[REGULAR]).is_file():
            return candidate
    raise FontError("the DejaVu fonts were not found: install matplotlib, which ships them "
                    "in mpl-data/fonts/ttf")


@cache
def register_fonts() -> None:
    """Register the three faces and the Sans family (regular/bold) with reportlab, once."""
    from reportlab.lib.fonts import addMapping
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    folder = font_folder()
    for name, file_name in _FILES.items():
        pdfmetrics.registerFont(TTFont(name, str(folder / file_name)))
    for bold, italic, face in ((0, 0, REGULAR), (1, 0, BOLD), (0, 1, REGULAR), (1, 1, BOLD)):
        addMapping(FAMILY, bold, italic, face)


# --- the form fields' font -----------------------------------------------------------------
# A viewer that fills a field draws the typed text in the font named by the field's /DA,
# looked up in the form's /DR. reportlab's own subsets of DejaVu number their glyphs as the
# page text needs them, so a viewer cannot type with them; the fields get a simple TrueType
# font of their own instead: DejaVu Sans (the same file as REGULAR), WinAnsiEncoding
# (ISO 32000-1, Annex D), embedded with every glyph that encoding can address.

FIELD_FONT_TAG = "SGFORM"  # the subset tag, six capital letters (ISO 32000-1, 9.6.4)
FIELD_FIRST_CHAR = 32


def winansi_unicode(code: int) -> int | None:
    """The character WinAnsiEncoding gives byte `code` (ISO 32000-1, Annex D), or None.

    Windows code page 1252, except that 0xA0 is the space and 0xAD the hyphen there.
    """
    special = {0xA0: 0x20, 0xAD: 0x2D}
    if code in special:
        return special[code]
    try:
        return ord(bytes([code]).decode("cp1252"))
    except UnicodeDecodeError:
        return None


@dataclass(frozen=True)
class FieldFont:
    """The field font's program (TrueType bytes) and the metrics its PDF dictionaries need."""

    program: bytes
    widths: tuple[int, ...]  # codes FIELD_FIRST_CHAR…255, in 1/1000 em
    bbox: tuple[int, int, int, int]
    ascent: int
    descent: int
    cap_height: int
    italic_angle: float
    stem_v: int

    @property
    def base_font(self) -> str:
        return f"{FIELD_FONT_TAG}+DejaVuSans"


@cache
def field_font() -> FieldFont:
    """DejaVu Sans cut down to the WinAnsi characters (fontTools, which matplotlib requires).

    The subset keeps the (3,1) Unicode cmap, so a reader finds each glyph by its WinAnsi
    glyph name's Unicode value (ISO 32000-1, 9.6.6.4); the result depends only on the font
    file (no timestamp is recalculated).
    """
    import io

    from fontTools import subset
    from fontTools.ttLib import TTFont as FontFile
    from reportlab.pdfbase import pdfmetrics

    register_fonts()
    face = pdfmetrics.getFont(REGULAR).face
    codes = range(FIELD_FIRST_CHAR, 256)
    unicodes = sorted({u for u in map(winansi_unicode, codes) if u is not None})
    options = subset.Options()
    options.name_IDs = ["*"]  # keep the copyright and licence names
    options.name_languages = ["*"]
    options.notdef_outline = True
    options.hinting = False  # the sheet is printed and viewed zoomed; hints only add bytes
    options.layout_features = []
    options.drop_tables += ["GSUB", "GPOS", "GDEF", "MATH", "kern", "FFTM"]
    font = FontFile(str(font_folder() / _FILES[REGULAR]), recalcTimestamp=False)
    subsetter = subset.Subsetter(options)
    subsetter.populate(unicodes=unicodes)
    subsetter.subset(font)
    buffer = io.BytesIO()
    font.save(buffer)
    scale = 1000 / font["head"].unitsPerEm
    cmap, metrics = font.getBestCmap(), font["hmtx"].metrics
    widths = []
    for code in codes:
        glyph = cmap.get(winansi_unicode(code) or -1)
        widths.append(round(metrics[glyph][0] * scale) if glyph else 0)
    return FieldFont(buffer.getvalue(), tuple(widths), tuple(int(v) for v in face.bbox),
                     int(face.ascent), int(face.descent), int(face.capHeight),
                     float(face.italicAngle), int(face.stemV))
