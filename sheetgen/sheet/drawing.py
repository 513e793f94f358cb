"""The drawing primitives every figure of the sheet uses: a label and a line.

Coordinates are rounded to 0.01 pt so that the same design always writes the same bytes.
"""

from __future__ import annotations

from reportlab.graphics.shapes import Line, String
from reportlab.lib.colors import black

from sheetgen.sheet import fonts


def text(group, x, y, content: str, size: float, anchor: str = "start",
         bold: bool = False) -> None:
    """A label at (x, y) in the sheet's embedded font."""
    group.add(String(round(x, 2), round(y, 2), content, fontSize=size, textAnchor=anchor,
                     fontName=fonts.BOLD if bold else fonts.REGULAR))


def line(group, x1, y1, x2, y2, width: float = 0.8, dash=None, cap: int = 0,
         color=None) -> None:
    """A straight stroke from (x1, y1) to (x2, y2)."""
    group.add(Line(round(x1, 2), round(y1, 2), round(x2, 2), round(y2, 2), strokeWidth=width,
                   strokeDashArray=dash, strokeLineCap=cap, strokeColor=color or black))
