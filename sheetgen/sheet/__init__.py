"""The printable PDF build-and-test sheet (reportlab); draws what the Design gives."""

from sheetgen.sheet.layout import render_sheet

__all__ = ["render_sheet"]
