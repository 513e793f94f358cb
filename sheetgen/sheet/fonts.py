"""The sheet's typefaces: DejaVu Sans, Bold and Mono as shipped inside matplotlib.

DejaVu covers µ, Ω, °, ±, −, √ and π, which the PDF base-14 fonts do not. The files are
found without importing matplotlib (its import costs more than the whole sheet), and
registered with reportlab once per process; reportlab embeds only the glyphs used.
"""

from __future__ import annotations

import importlib.util
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
