"""Schematic labels never collide: no two texts overlap, and no text lies on a wire, a
symbol or a dashed boundary, for every starter and for long values and designators.

The drawing is read back as reportlab built it: its tree is walked with each group's
transform, each string measured with reportlab's font metrics at its anchor, each line,
rectangle, circle and path taken as the ink it puts down.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import pytest
from reportlab.graphics.shapes import Circle, Group, Line, Path, Polygon, Rect, String, mmult
from reportlab.pdfbase.pdfmetrics import getAscentDescent, stringWidth

from sheetgen.design.pipeline import design_from_file
from sheetgen.sheet import fonts
from sheetgen.sheet.schematic import Part, Schematic, schematic_drawing, schematic_of
from tests.sheet.test_tools import SHARED, TEMPLATES

STARTERS = ("series", "parallel", "toroid", "solenoid", "power-tank", "demo")


@dataclass(frozen=True)
class Box:
    x0: float
    y0: float
    x1: float
    y1: float
    what: str

    def overlaps(self, other: Box) -> bool:
        return (min(self.x1, other.x1) > max(self.x0, other.x0)
                and min(self.y1, other.y1) > max(self.y0, other.y0))


def _walk(node, matrix=(1, 0, 0, 1, 0, 0)):
    if isinstance(node, Group) or hasattr(node, "contents"):
        inner = mmult(matrix, node.transform) if hasattr(node, "transform") else matrix
        for child in node.contents:
            yield from _walk(child, inner)
    else:
        yield node, matrix


def _around(matrix, points, what: str) -> Box:
    moved = [(matrix[0] * x + matrix[2] * y + matrix[4], matrix[1] * x + matrix[3] * y
              + matrix[5]) for x, y in points]
    return Box(min(p[0] for p in moved), min(p[1] for p in moved), max(p[0] for p in moved),
               max(p[1] for p in moved), what)


def _segment(matrix, x1, y1, x2, y2, width: float, what: str) -> list[Box]:
    """A stroke `width` wide as small boxes along it (a diagonal's bounding box would be too
    big); a straight one's butt ends add nothing along it."""
    half = width / 2
    if x1 == x2 or y1 == y2:
        dx, dy = (half, 0.0) if x1 == x2 else (0.0, half)
        return [_around(matrix, [(min(x1, x2) - dx, min(y1, y2) - dy),
                                 (max(x1, x2) + dx, max(y1, y2) + dy)], what)]
    steps = 24
    points = [(x1 + (x2 - x1) * i / steps, y1 + (y2 - y1) * i / steps) for i in range(steps + 1)]
    return [_around(matrix, [(a[0] - half, a[1] - half), (b[0] + half, b[1] + half)], what)
            for a, b in zip(points, points[1:])]


def texts_and_ink(drawing) -> tuple[list[Box], list[Box]]:
    """Every string's box, and the boxes of everything else the drawing puts down."""
    texts, ink = [], []
    for node, m in _walk(drawing):
        if isinstance(node, String):
            width = stringWidth(node.text, node.fontName, node.fontSize)
            ascent, descent = getAscentDescent(node.fontName, node.fontSize)
            x = node.x - {"start": 0.0, "middle": width / 2, "end": width}[node.textAnchor]
            texts.append(_around(m, [(x, node.y + descent), (x + width, node.y + ascent)],
                                 node.text))
        elif isinstance(node, Line):
            ink += _segment(m, node.x1, node.y1, node.x2, node.y2, node.strokeWidth, "wire")
        elif isinstance(node, Rect):
            x0, y0, x1, y1 = node.x, node.y, node.x + node.width, node.y + node.height
            if node.strokeDashArray:  # a boundary: only its four edges are ink
                for a, b in (((x0, y0), (x1, y0)), ((x1, y0), (x1, y1)), ((x1, y1), (x0, y1)),
                             ((x0, y1), (x0, y0))):
                    ink += _segment(m, *a, *b, node.strokeWidth, "boundary")
            else:
                ink.append(_around(m, [(x0, y0), (x1, y1)], "resistor body"))
        elif isinstance(node, Circle):
            ink.append(_around(m, [(node.cx - node.r, node.cy - node.r),
                                   (node.cx + node.r, node.cy + node.r)], "circle"))
        elif isinstance(node, (Path, Polygon)):
            x0, y0, x1, y1 = node.getBounds()
            ink.append(_around(m, [(x0, y0), (x1, y1)], "symbol"))
    return texts, ink


def collisions(drawing) -> list[tuple[str, str]]:
    texts, ink = texts_and_ink(drawing)
    found = [(a.what, b.what) for i, a in enumerate(texts) for b in texts[i + 1:]
             if a.overlaps(b)]
    found += [(t.what, k.what) for t in texts for k in ink if t.overlaps(k)]
    return sorted(set(found))


def _starter(name: str) -> Schematic:
    return schematic_of(design_from_file(TEMPLATES / f"{name}.yaml", SHARED))


@pytest.fixture(scope="module", autouse=True)
def _fonts():
    fonts.register_fonts()


@pytest.mark.parametrize("name", STARTERS)
def test_no_label_collides_on_a_starter(name):
    assert collisions(schematic_drawing(_starter(name), 515.0)) == []


def _synthetic() -> dict[str, Schematic]:
    """Every arrangement the schematic draws, with long values and designators."""
    long_value, long_range, long_sum = "1.234 MΩ", "10.00 pF to 130.0 pF", "180 pF + 15.0 pF"
    fixed = (Part("C101", "capacitor", long_sum), Part("C102", "capacitor", "1.234 nF"),
             Part("C103", "trimmer", long_range))
    cases = {}
    for topology in ("series", "parallel"):
        for capacitors in (fixed[:1], fixed):
            for source_resistor in (None, Part("R101", "resistor", "33.95 kΩ")):
                base = Schematic(topology, "voltage", "10.00 W avail.",
                                 Part("L101", "inductor", "123.4 µH"), capacitors,
                                 source_resistor, Part("R102", "resistor", "2.200 kΩ"))
                key = f"{topology}-{len(capacitors)}C-{'R1' if source_resistor else 'noR1'}"
                cases[f"{key}-plain"] = base
                cases[f"{key}-bleeder"] = dataclasses.replace(
                    base, bleeder=Part("R103", "resistor", long_value))
                cases[f"{key}-tap"] = dataclasses.replace(
                    base, tap_label="tap, turn 112: to R102")
                if topology == "parallel":
                    cases[f"{key}-link"] = dataclasses.replace(
                        base, link=Part("L102", "inductor", "12 turns"), cored=True)
                    cases[f"{key}-source-long"] = dataclasses.replace(
                        base, source="current", source_label="100.0 mA rms",
                        inductor=Part("L101", "inductor", long_range))
                cases[f"{key}-long-everything"] = dataclasses.replace(
                    base, source_label=long_range,
                    inductor=Part("L1001", "inductor", long_range),
                    source_resistor=source_resistor and Part("R1001", "resistor", long_sum),
                    load=Part("R1002", "resistor", long_sum))
    return cases


SYNTHETIC = _synthetic()


@pytest.mark.parametrize("key", sorted(SYNTHETIC))
def test_no_label_collides_with_long_values_and_designators(key):
    assert collisions(schematic_drawing(SYNTHETIC[key], 515.0)) == []


def test_every_part_is_labelled_whole():
    """The check above would pass if a label were dropped: each one is there, whole."""
    schematic = SYNTHETIC["parallel-3C-R1-long-everything"]
    drawn = {box.what for box in texts_and_ink(schematic_drawing(schematic, 515.0))[0]}
    parts = (schematic.inductor, *schematic.capacitors, schematic.source_resistor,
             schematic.load)
    for part in parts:
        assert {part.designator, part.value} <= drawn
    assert schematic.source_label in drawn


def test_the_reader_sees_a_collision():
    """Two labels written on top of each other are found (the reader is not blind)."""
    from reportlab.graphics.shapes import Drawing
    drawing = Drawing(100, 40)
    drawing.add(String(10, 10, "2.200 kΩ", fontName=fonts.REGULAR, fontSize=8))
    drawing.add(String(30, 12, "load", fontName=fonts.REGULAR, fontSize=7))
    drawing.add(Line(0, 14, 100, 14))
    assert collisions(drawing) == [("2.200 kΩ", "load"), ("2.200 kΩ", "wire"),
                                   ("load", "wire")]


def _resistor_bodies(drawing) -> list[Box]:
    _, ink = texts_and_ink(drawing)
    return [box for box in ink if box.what == "resistor body"]


def _label(drawing, text: str) -> Box:
    texts, _ = texts_and_ink(drawing)
    return next(box for box in texts if box.what == text)


@pytest.mark.parametrize("name, across", [("parallel", True), ("demo", False)])
def test_a_current_source_has_its_resistance_drawn_across_it(name, across):
    """Norton's theorem: a current source's output resistance is in parallel with it (a
    resistor in series with an ideal current source would do nothing). The parallel
    starter (1 mA with 47 kΩ) draws R1 upright between the rails, beside the source; a
    voltage source (demo: 2 V behind 10 kΩ) keeps R1 in series along the top wire."""
    drawing = schematic_drawing(_starter(name), 515.0)
    r1 = _label(drawing, "R1")
    body = min(_resistor_bodies(drawing), key=lambda b: abs((b.x0 + b.x1) / 2 - r1.x0)
               + abs((b.y0 + b.y1) / 2 - r1.y0))
    upright = (body.y1 - body.y0) > (body.x1 - body.x0)
    assert upright == across, f"{name}: R1 {'across' if across else 'in series with'} the source"
