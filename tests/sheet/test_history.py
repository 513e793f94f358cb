"""The sheet's revision history: the job's earlier revisions, then this one (added when the
history does not list it)."""

from pathlib import Path

import pytest

from tests.sheet.test_tools import body_text, build

ROOT = Path(__file__).resolve().parents[2]
pytestmark = pytest.mark.pdf


def test_history_lists_each_revision_with_what_changed(tmp_path):
    text = (ROOT / "templates" / "demo.yaml").read_text(encoding="utf-8")
    built = build(tmp_path, text, "demo")
    body = body_text(built.pdf_path)
    assert "Revision history" in body
    assert "A 2026-10-14 first issue R. Example" in body
    assert "B 2026-12-01 trimmer added; C0G parts R. Example" in body


def test_a_sheet_without_history_shows_its_first_issue(tmp_path):
    text = (ROOT / "templates" / "series.yaml").read_text(encoding="utf-8")
    built = build(tmp_path, text, "series")
    sheet = built.results["sheet"]
    assert f"{sheet['revision']} {sheet['date']} first issue" in body_text(built.pdf_path)
