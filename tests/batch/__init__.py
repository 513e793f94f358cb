"""Tests of the batch room (sheetgen/batch)."""
