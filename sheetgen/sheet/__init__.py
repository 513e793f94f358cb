"""The printable PDF build-and-test sheet (reportlab); draws what the Design gives."""

from .layout import render_sheet

__all__ = ["render_sheet"]
