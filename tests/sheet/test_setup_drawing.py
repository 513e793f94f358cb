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

# case: (receiver place, source (kind, designator, value or first line), terminals,
# receiver (kind, designator, value or first line)). E96 values are those the bench
# procedure's own tests derive by hand. Fixture parts are numbered on after the unit's own
# (R1 source, R2 load, R3 bleeder): demo has R1 and R2, so R3 and R4; power-tank also has a
# bleeder R3, so R4 and R5.
# series-ideal / series-sense: the loop (3.2 + 0.05 + 50 Ω) needs 1/100 of it, 0.5325 Ω,
# below any metal-film part: a current transformer of N = √(50/0.5325) = 9.7 → 10 turns,
# presenting 50/10² = 0.5 Ω. parallel-ideal: 100 × the tank's impedance (1.9 MΩ) at 455 kHz
# is no resistor with 0.2 pF across it (ωRC ≈ 1.1): a coupling capacitor
# 1/(ω·50·√(R/50 − 1)) ≈ 35 pF → the nearest E12 value, 33 pF. parallel-pickup: 100 × |Z|
# (5.2 MΩ) is no resistor either: the active probe.
EXPECTED = {
    "series": ("load", ("direct", None, None), ("where R1 stands", "where R2 stands"),
               ("direct", None, None)),
    "parallel": ("load", ("series_resistor", "R3", "47.5 kΩ"),
                 ("where R1 stands", "where R2 stands"), ("series_resistor", "R4", "84.5 kΩ")),
    "toroid": ("link", ("series_resistor", "R3", "20.0 kΩ"), ("where R1 stands", "L2's ends"),
               ("direct", None, None)),
    "solenoid": ("load", ("series_resistor", "R3", "15.0 kΩ"),
                 ("where R1 stands", "where R2 stands"), ("series_resistor", "R4", "12.1 kΩ")),
    "power-tank": ("load", ("series_resistor", "R4", "1.96 kΩ"),
                   ("where R1 stands", "where R2 stands"), ("series_resistor", "R5", "1.96 kΩ")),
    "demo": ("load", ("series_resistor", "R3", "10.0 kΩ"), ("where R1 stands", "where R2 stands"),
             ("series_resistor", "R4", "34.0 kΩ")),
    "series-shunt": ("load", ("shunt_resistor", "R3", "12.4 Ω"),
                     ("where R1 stands", "where R2 stands"), ("direct", None, None)),
    "series-ideal": ("load", ("transformer", "T1", "T1 1:10"),
                     ("where the source stands", "where R2 stands"), ("direct", None, None)),
    "series-sense": ("sense_resistor", ("direct", None, None),
                     ("where R1 stands", "loop's cold end"), ("transformer", "T1", "T1 1:10")),
    "parallel-ideal": ("load", ("coupling_capacitor", "C3", "33 pF"),
                       ("tank's hot end", "where R2 stands"), ("series_resistor", "R3", "30.1 kΩ")),
    "parallel-pickup": ("pickup", ("series_resistor", "R2", "47.5 kΩ"),
                        ("where R1 stands", "tank's hot end"), ("probe", None, "active probe")),
    "toroid-tap": ("tap", ("series_resistor", "R3", "20.0 kΩ"),
                   ("where R1 stands", "tap of L1 to its cold end"),
                   ("series_resistor", "R4", "1.96 kΩ")),
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


def _hookup_as(hookup: Hookup) -> tuple[str, str | None, str | None]:
    if hookup.part is not None:
        return hookup.kind, hookup.part.designator, hookup.part.value
    if hookup.lines:
        first = hookup.lines[0]
        return hookup.kind, first.split()[0] if first[1:2].isdigit() else None, first
    return hookup.kind, None, None


@pytest.mark.parametrize("case", sorted(EXPECTED))
def test_the_view_names_the_benchs_hookups(tmp_path, case):
    place, source, terminals, found = EXPECTED[case]
    view, bench = _view(tmp_path, case)
    assert bench.receiver.place == place, "the job edit gives the case it is named for"
    assert (view.source.kind, view.receiver_hookup.kind) == (bench.source.kind,
                                                            bench.receiver.hookup.kind)
    assert _hookup_as(view.source) == source
    assert (view.unit.source_terminal, view.unit.receiver_terminal) == terminals
    assert _hookup_as(view.receiver_hookup) == found


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
    if kind in ("transformer", "probe"):
        lines = ("T1001 1:1000", "ferrite ring of a long description", "circuit : port")
        return SetupView(Instrument("generator", ("50 Ω output", "level −123.4 dBm")),
                         Hookup(kind, lines=lines),
                         Unit("unit under test, sheet LONG-SHEET-ID-0001-REV-ZZ",
                              "where R1001 stands, hot side", "tap of L1001 to its cold end"),
                         Hookup(kind, lines=("active probe", "1.0 MΩ ∥ 1.0 pF")),
                         Instrument("receiver", ("50 Ω input",)))
    part_kind = "capacitor" if kind == "coupling_capacitor" else "resistor"
    resistor = None if kind == "direct" else Part("R101", part_kind, "1.234 MΩ ± 0.1 %")
    return SetupView(Instrument("generator", ("50 Ω output", "level −123.4 dBm")),
                     Hookup(kind, resistor and Part("R100", part_kind, resistor.value)),
                     Unit("unit under test, sheet LONG-SHEET-ID-0001-REV-ZZ",
                          "where R1001 stands, hot side", "tap of L1001 to its cold end"),
                     Hookup(kind, resistor),
                     Instrument("receiver", ("50 Ω input",)))


@pytest.mark.parametrize("kind", ["direct", "series_resistor", "shunt_resistor",
                                  "coupling_capacitor", "transformer", "probe"])
def test_no_label_collides_with_long_labels(kind):
    view = _long_view(kind)
    drawing = setup_drawing(view, WIDTH)
    assert collisions(drawing) == []
    assert drawing.width == WIDTH


def test_every_label_is_drawn_whole():
    """The collision check would pass if a label were dropped: each one is there."""
    for kind in ("series_resistor", "shunt_resistor", "coupling_capacitor", "transformer"):
        view = _long_view(kind)
        wanted = {view.generator.name, *view.generator.lines, view.receiver.name,
                  *view.receiver.lines, view.unit.caption, view.unit.source_terminal,
                  view.unit.receiver_terminal, RAIL_LABEL}
        for hookup in (view.source, view.receiver_hookup):
            wanted |= ({hookup.part.designator, hookup.part.value} if hookup.part
                       else set(hookup.lines))
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
    for label in ("R3", "10.0 kΩ", "R4", "34.0 kΩ", "where R1 stands", "where R2 stands",
                  "50 Ω output", "50 Ω input", RAIL_LABEL):
        assert label in text
    assert overlapping_words(page_words(path)[0].words) == []
