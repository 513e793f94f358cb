"""The test set-up drawing: it names the hookups the bench procedure works out (for every
starter and the cases only an edited job gives), and none of its labels collides with
another label, a wire or a symbol (read back with the schematic's drawing-tree walker).
"""

from __future__ import annotations

from pathlib import Path

import pytest
from reportlab.graphics.shapes import Drawing, Group, String

from sheetgen.design.pipeline import design_from_file
from sheetgen.report.procedure import procedure
from sheetgen.sheet import fonts
from sheetgen.sheet.schematic import Part
from sheetgen.sheet.setup_drawing import (
    DIRECT_LABEL,
    RAIL_LABEL,
    Hookup,
    Instrument,
    SetupView,
    Unit,
    setup_drawing,
    setup_of,
)
from tests.sheet.test_schematic_labels import collisions, texts_and_ink
from tests.sheet.test_tools import SHARED, TEMPLATES, need, overlapping_words, page_text, page_words

WIDTH = 515.0

# Edits to a starter that give the arrangements the starters do not have.
EDITS = {
    "series-shunt": ("series", {"resistance: 50 ohm\n  available_power: 1 W":
                                "resistance: 10 ohm\n  voltage: 0.1 V"}),
    "series-ideal": ("series", {"resistance: 50 ohm\n  available_power: 1 W": "voltage: 0.1 V"}),
    "series-sense": ("series", {"\nload:\n  resistance: 50 ohm\n": "\n"}),
    "parallel-ideal": ("parallel", {"  resistance: 47 kohm    # output resistance of the "
                                    "driving stage\n": ""}),
    "parallel-pickup": ("parallel", {"    bandwidth: 15 kHz    # the load resistance is "
                                     "computed from this\n": ""}),
    "toroid-tap": ("toroid", {"  link:\n    resistance: 50 ohm": "  tap:\n    resistance: 2 kohm"}),
}

# case: (receiver place, source (kind, RT1 value), terminals, receiver (kind, RT2 value)).
# E96 values are those the bench procedure's own tests derive by hand.
EXPECTED = {
    "series": ("load", ("direct", None), ("where R1 stands", "where R2 stands"),
               ("direct", None)),
    "parallel": ("load", ("series_resistor", "47.5 kΩ"), ("where R1 stands", "where R2 stands"),
                 ("series_resistor", "84.5 kΩ")),
    "toroid": ("link", ("series_resistor", "20.0 kΩ"), ("where R1 stands", "L2's ends"),
               ("direct", None)),
    "solenoid": ("load", ("series_resistor", "15.0 kΩ"), ("where R1 stands", "where R2 stands"),
                 ("series_resistor", "12.1 kΩ")),
    "power-tank": ("load", ("series_resistor", "1.96 kΩ"),
                   ("where R1 stands", "where R2 stands"), ("series_resistor", "1.96 kΩ")),
    "demo": ("load", ("series_resistor", "10.0 kΩ"), ("where R1 stands", "where R2 stands"),
             ("series_resistor", "34.0 kΩ")),
    "series-shunt": ("load", ("shunt_resistor", "12.4 Ω"),
                     ("where R1 stands", "where R2 stands"), ("direct", None)),
    "series-ideal": ("load", ("shunt_resistor", "536 mΩ"),
                     ("where the source stands", "where R2 stands"), ("direct", None)),
    "series-sense": ("sense_resistor", ("direct", None), ("where R1 stands", "loop's cold end"),
                     ("shunt_resistor", "536 mΩ")),
    "parallel-ideal": ("load", ("series_resistor", "1.91 MΩ"),
                       ("tank's hot end", "where R2 stands"), ("series_resistor", "30.1 kΩ")),
    "parallel-pickup": ("pickup", ("series_resistor", "47.5 kΩ"),
                        ("where R1 stands", "tank's hot end"), ("series_resistor", "5.23 MΩ")),
    "toroid-tap": ("tap", ("series_resistor", "20.0 kΩ"),
                   ("where R1 stands", "tap of L1 to its cold end"),
                   ("series_resistor", "1.96 kΩ")),
}


def _design(tmp_path: Path, case: str):
    starter, edits = EDITS.get(case, (case, {}))
    text = (TEMPLATES / f"{starter}.yaml").read_text(encoding="utf-8")
    for old, new in edits.items():
        assert old in text, old
        text = text.replace(old, new)
    path = tmp_path / f"{case}.yaml"
    path.write_text(text, encoding="utf-8")
    return design_from_file(path, SHARED)


def _view(tmp_path: Path, case: str) -> tuple[SetupView, object]:
    design = _design(tmp_path, case)
    plan = procedure(design)
    return setup_of(plan, design.designators, design.job.sheet.id), plan.bench


@pytest.fixture(scope="module", autouse=True)
def _fonts():
    fonts.register_fonts()


def _hookup_as(hookup: Hookup, fixture: str) -> tuple[str, str | None]:
    if hookup.resistor is not None:
        assert hookup.resistor.designator == fixture
    return hookup.kind, hookup.resistor.value if hookup.resistor else None


@pytest.mark.parametrize("case", sorted(EXPECTED))
def test_the_view_names_the_benchs_hookups(tmp_path, case):
    place, source, terminals, found = EXPECTED[case]
    view, bench = _view(tmp_path, case)
    assert bench.receiver.place == place, "the job edit gives the case it is named for"
    assert (view.source.kind, view.receiver_hookup.kind) == (bench.source.kind,
                                                            bench.receiver.hookup.kind)
    assert _hookup_as(view.source, "RT1") == source
    assert (view.unit.source_terminal, view.unit.receiver_terminal) == terminals
    assert _hookup_as(view.receiver_hookup, "RT2") == found


def test_the_instruments_are_50_ohm_ports_at_the_benchs_level(tmp_path):
    """demo.yaml: the generator level printed is the bench drive's, to 0.1 dB."""
    view, bench = _view(tmp_path, "demo")
    assert "50 Ω output" in view.generator.lines
    level = next(t for t in view.generator.lines if t.endswith(" dBm"))
    assert abs(float(level.split()[-2].replace("−", "-")) - bench.drive.generator_level_dbm) <= 0.05
    assert (view.receiver.name, view.receiver.lines) == ("receiver", ("50 Ω input",))
    assert "DEMO-0071" in view.unit.caption


def _drawn_texts(view: SetupView) -> set[str]:
    return {box.what for box in texts_and_ink(setup_drawing(view, WIDTH))[0]}


@pytest.mark.parametrize("case", sorted(EXPECTED))
def test_no_label_collides(tmp_path, case):
    view, _ = _view(tmp_path, case)
    assert collisions(setup_drawing(view, WIDTH)) == []


def _long_view(kind: str) -> SetupView:
    """Both hookups of `kind`, with long values, designators and terminals."""
    resistor = None if kind == "direct" else Part("RT101", "resistor", "1.234 MΩ ± 0.1 %")
    return SetupView(Instrument("generator", ("50 Ω output", "level −123.4 dBm")),
                     Hookup(kind, resistor and Part("RT100", "resistor", resistor.value)),
                     Unit("unit under test, sheet LONG-SHEET-ID-0001-REV-ZZ",
                          "where R1001 stands, hot side", "tap of L1001 to its cold end"),
                     Hookup(kind, resistor),
                     Instrument("receiver", ("50 Ω input",)))


@pytest.mark.parametrize("kind", ["direct", "series_resistor", "shunt_resistor"])
def test_no_label_collides_with_long_labels(kind):
    view = _long_view(kind)
    drawing = setup_drawing(view, WIDTH)
    assert collisions(drawing) == []
    assert drawing.width == WIDTH


def test_every_label_is_drawn_whole():
    """The collision check would pass if a label were dropped: each one is there."""
    for kind in ("series_resistor", "shunt_resistor"):
        view = _long_view(kind)
        wanted = {view.generator.name, *view.generator.lines, view.receiver.name,
                  *view.receiver.lines, view.unit.caption, view.unit.source_terminal,
                  view.unit.receiver_terminal, RAIL_LABEL}
        for hookup in (view.source, view.receiver_hookup):
            wanted |= {hookup.resistor.designator, hookup.resistor.value}
        assert wanted <= _drawn_texts(view)
    assert DIRECT_LABEL in _drawn_texts(_long_view("direct"))


def test_a_planted_label_on_the_drawing_is_found(tmp_path):
    """The check can fail: a label written over the unit's terminal label and the signal
    path is reported against both."""
    view, _ = _view(tmp_path, "demo")
    drawing = setup_drawing(view, WIDTH)
    terminal = next(box for box in texts_and_ink(drawing)[0] if box.what == "where R1 stands")
    planted = Drawing(drawing.width, drawing.height)
    planted.add(Group(*drawing.contents))
    planted.add(String(terminal.x0 - 20, terminal.y0 + 1, "planted label",
                       fontName=fonts.REGULAR, fontSize=8))
    found = collisions(planted)
    assert ("planted label", "where R1 stands") in found or \
        ("where R1 stands", "planted label") in found
    assert ("planted label", "wire") in found


@pytest.mark.pdf
def test_the_rendered_drawing_reads_back_without_overlaps(tmp_path):
    """demo.yaml drawn into a PDF: poppler finds every hookup's text, no two words overlap."""
    from reportlab.graphics import renderPDF
    need("pdftotext")
    view, _ = _view(tmp_path, "demo")
    path = tmp_path / "setup.pdf"
    renderPDF.drawToFile(setup_drawing(view, WIDTH), str(path))
    text = page_text(path)
    for label in ("RT1", "10.0 kΩ", "RT2", "34.0 kΩ", "where R1 stands", "where R2 stands",
                  "50 Ω output", "50 Ω input", RAIL_LABEL):
        assert label in text
    assert overlapping_words(page_words(path)[0].words) == []
