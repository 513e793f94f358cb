"""The schematic of the circuit as built, as vector graphics (reportlab.graphics).

`schematic_of(design)` says what to draw (parts, designators, values); `schematic_drawing`
draws it. Symbols follow IEC 60617 shapes (rectangle resistor, looped inductor, two-plate
capacitor, preset-adjustment bar for a trimmer, circle sources). A trimmer, a link winding
and a tap on the coil are parameters of `Schematic`, drawn only when the design has them.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from sheetgen.design.records import Design
from sheetgen.report.formatting import plural, quantity_text, range_text
from sheetgen.sheet import drawing, fonts

PartKind = Literal["resistor", "inductor", "capacitor", "trimmer"]

LABEL_SIZE = 8.0
DESIGNATOR_SIZE = 8.5
LINE_WIDTH = 1.0
HEIGHT = 128.0
_RESISTOR = (26.0, 9.0)      # body length and width of the IEC rectangle
_LOOPS, _LOOP_R = 4, 4.5     # inductor: half-circle loops and their radius
_CAP_GAP, _CAP_PLATE = 5.0, 18.0
_SOURCE_R = 11.0
_LENGTH = {"resistor": 44.0, "inductor": 54.0, "capacitor": 40.0, "trimmer": 40.0}
LABEL_CLEARANCE = 4.0  # pt between a label and the next label, box edge or wire to its right
_SOURCE_BOX_LEFT = 2.0  # the dashed source box's left edge


@dataclass(frozen=True)
class Part:
    """One drawn part: designator (L1), symbol kind and its value as printed."""

    designator: str
    kind: PartKind
    value: str


@dataclass(frozen=True)
class Schematic:
    """What the schematic shows; the optional parts are drawn only when given.

    `capacitors` are all in parallel (fixed parts, then a trimmer when there is one).
    `link` is a coupling winding on L1's core; with a link the load sits across the link.
    `tap_label` marks a tap on L1. `cored` draws the magnetic-core bars of IEC 60617.
    """

    topology: Literal["series", "parallel"]
    source: Literal["voltage", "current"]
    source_label: str
    inductor: Part
    capacitors: tuple[Part, ...]
    source_resistor: Part | None = None
    load: Part | None = None
    link: Part | None = None
    tap_label: str | None = None
    cored: bool = False
    bleeder: Part | None = None  # a resistor across the capacitors

    @property
    def across_capacitors(self) -> tuple[Part, ...]:
        """The capacitors and, beside them, a bleeder when there is one."""
        return self.capacitors + ((self.bleeder,) if self.bleeder is not None else ())


def schematic_of(design: Design) -> Schematic:
    """The parts as fitted, named by design.designators: L1, C1 (C2 …), the trimmer, R1 = Rs,
    R2 = the load, L2 = a link winding."""
    c = design.circuit
    names = design.designators
    choice = design.capacitor_choice
    if choice.from_standard_parts:
        capacitors = [Part(name, "capacitor", quantity_text(value, "F", 3))
                      for name, value in zip(names.fixed_capacitors, choice.fixed_parts_f)]
    else:
        capacitors = [Part(names.fixed_capacitors[0], "capacitor", quantity_text(choice.fixed_f, "F"))]
    trimmer = design.job.capacitor.trimmer
    if names.trimmer is not None and trimmer is not None:
        capacitors.append(Part(names.trimmer, "trimmer",
                               range_text(trimmer.minimum, trimmer.maximum, 'F', 3)))
    source_resistor = (Part(names.source_resistor, "resistor", quantity_text(c.source_resistance_ohm, "Ω"))
                       if names.source_resistor is not None else None)
    coil = design.coil
    link = load = None
    if names.link is not None and coil is not None:
        turns = plural(coil.link_turns, "turn")
        link = Part(names.link, "inductor", turns)
        load = Part(names.load_resistor, "resistor", quantity_text(coil.link_resistance_ohm, "Ω"))
    elif coil is not None and coil.tap_turns is not None:
        load = Part(names.load_resistor, "resistor", quantity_text(coil.tap_resistance_ohm, "Ω"))
    elif names.load_resistor is not None:
        load = Part(names.load_resistor, "resistor", quantity_text(c.load_resistance_ohm, "Ω"))
    drive = design.drive
    label = {"voltage": quantity_text(drive.value, "V") + " rms", "current": quantity_text(drive.value, "A") + " rms",
             "available_power": quantity_text(drive.value, "W") + " avail."}[drive.kind]
    return Schematic(c.topology, "current" if drive.kind == "current" else "voltage", label,
                     Part(names.coil, "inductor", quantity_text(c.inductance_h, "H")), tuple(capacitors),
                     source_resistor, load, link,
                     tap_label=(f"tap, turn {coil.tap_turns}: to {names.load_resistor}"
                                if coil is not None and coil.tap_turns is not None else None),
                     cored=coil is not None and coil.form == "toroid",
                     bleeder=(Part(names.bleeder, "resistor",
                                   quantity_text(design.bleeder.resistance_ohm, "Ω"))
                              if names.bleeder is not None and design.bleeder is not None
                              else None))


# --- primitives ---------------------------------------------------------------------------

def wire(group, x1, y1, x2, y2, width=LINE_WIDTH):
    drawing.line(group, x1, y1, x2, y2, width)


def label_text(group, x, y, text, size=LABEL_SIZE, anchor="start", bold=False):
    drawing.text(group, x, y, text, size, anchor, bold)


def dot(group, x, y):
    from reportlab.graphics.shapes import Circle
    from reportlab.lib.colors import black
    group.add(Circle(x, y, 1.8, fillColor=black, strokeColor=black, strokeWidth=0))


def _symbol(kind: PartKind, length: float):
    """A two-terminal symbol centred on a lead of `length` along +x (loops towards +y)."""
    from reportlab.graphics.shapes import Group, Path, Rect
    from reportlab.lib.colors import black, white

    g = Group()
    middle = length / 2.0
    if kind == "resistor":
        body, width = _RESISTOR
        wire(g, 0, 0, middle - body / 2, 0)
        wire(g, middle + body / 2, 0, length, 0)
        g.add(Rect(middle - body / 2, -width / 2, body, width, strokeWidth=LINE_WIDTH,
                   fillColor=white, strokeColor=black))
    elif kind == "inductor":
        body = 2 * _LOOP_R * _LOOPS
        start = middle - body / 2
        wire(g, 0, 0, start, 0)
        wire(g, start + body, 0, length, 0)
        path = Path(strokeWidth=LINE_WIDTH, fillColor=None, strokeColor=black)
        path.moveTo(start, 0)
        k = 0.5523 * _LOOP_R  # a quarter circle as one cubic Bézier
        for loop in range(_LOOPS):
            x0 = start + 2 * _LOOP_R * loop
            path.curveTo(x0, k, x0 + _LOOP_R - k, _LOOP_R, x0 + _LOOP_R, _LOOP_R)
            path.curveTo(x0 + _LOOP_R + k, _LOOP_R, x0 + 2 * _LOOP_R, k, x0 + 2 * _LOOP_R, 0)
        g.add(path)
    else:
        wire(g, 0, 0, middle - _CAP_GAP / 2, 0)
        wire(g, middle + _CAP_GAP / 2, 0, length, 0)
        for x in (middle - _CAP_GAP / 2, middle + _CAP_GAP / 2):
            wire(g, x, -_CAP_PLATE / 2, x, _CAP_PLATE / 2, width=1.8)
        if kind == "trimmer":  # preset adjustment: a diagonal ending in a short bar
            wire(g, middle - 9, -12, middle + 9, 12, width=0.8)
            wire(g, middle + 5, 15, middle + 13, 9, width=0.8)
    return g


def horizontal(group, kind: PartKind, x, y, length):
    from reportlab.graphics.shapes import Group
    group.add(Group(_symbol(kind, length), transform=(1, 0, 0, 1, x, y)))


def vertical(group, kind: PartKind, x, y, length, loops_right: bool = False):
    """A symbol from (x, y) up to (x, y + length); an inductor's loops face left or right."""
    from reportlab.graphics.shapes import Group
    matrix = (0, 1, 1, 0, x, y) if loops_right else (0, 1, -1, 0, x, y)
    group.add(Group(_symbol(kind, length), transform=matrix))


def text_width(text: str, size: float = LABEL_SIZE, bold: bool = False) -> float:
    from reportlab.pdfbase.pdfmetrics import stringWidth
    return stringWidth(text, fonts.BOLD if bold else fonts.REGULAR, size)


def label_width(part: Part) -> float:
    """Width of a part's label (designator over value), in points."""
    return max(text_width(part.designator, DESIGNATOR_SIZE, True), text_width(part.value))


def _start_clear_of(x: float, length: float, part: Part, frontier: float) -> float:
    """Where a horizontal part of `length`, at `x` at the earliest, starts so that its label,
    centred above it, begins LABEL_CLEARANCE right of `frontier` (where the drawing so far ends)."""
    return max(x, frontier + LABEL_CLEARANCE + label_width(part) / 2 - length / 2)


def label_above(group, part: Part, x, y):
    label_text(group, x, y + 21, part.designator, DESIGNATOR_SIZE, "middle", True)
    label_text(group, x, y + 11, part.value, LABEL_SIZE, "middle")


def label_right(group, part: Part, x, y):
    label_text(group, x + 14, y + 2, part.designator, DESIGNATOR_SIZE, "start", True)
    label_text(group, x + 14, y - 8, part.value, LABEL_SIZE, "start")


def _source(group, kind, x, y_bottom, y_top, label: str):
    """A source between two rails: a circle with ~ (voltage) or an arrow (current)."""
    from reportlab.graphics.shapes import Circle, Path, Polygon
    from reportlab.lib.colors import black, white
    middle = (y_bottom + y_top) / 2
    wire(group, x, y_bottom, x, middle - _SOURCE_R)
    wire(group, x, middle + _SOURCE_R, x, y_top)
    group.add(Circle(x, middle, _SOURCE_R, strokeWidth=LINE_WIDTH, fillColor=white,
                     strokeColor=black))
    if kind == "voltage":
        wave = Path(strokeWidth=LINE_WIDTH, fillColor=None, strokeColor=black)
        wave.moveTo(x - 6, middle)
        wave.curveTo(x - 4, middle + 6, x - 1, middle + 6, x, middle)
        wave.curveTo(x + 1, middle - 6, x + 4, middle - 6, x + 6, middle)
        group.add(wave)
    else:
        wire(group, x, middle - 6, x, middle + 3)
        group.add(Polygon([x - 3, middle + 2, x + 3, middle + 2, x, middle + 7],
                          fillColor=black, strokeColor=black, strokeWidth=0.5))
    label_text(group, x - _SOURCE_R - 5, middle + 2, "source", LABEL_SIZE, "end", True)
    label_text(group, x - _SOURCE_R - 5, middle - 8, label, LABEL_SIZE, "end")


def box(group, x, y, width, height, caption: str, top_left: bool = False):
    """A dashed boundary round what the rest of the system (or the test set-up) provides."""
    from reportlab.graphics.shapes import Rect
    from reportlab.lib.colors import Color
    group.add(Rect(x, y, width, height, strokeWidth=0.6, strokeDashArray=[3, 2],
                   fillColor=None, strokeColor=Color(0.35, 0.35, 0.35)))
    if caption and top_left:
        label_text(group, x + 3, y + height - 9, caption, 7.0, "start")
    elif caption:  # bottom right, clear of the leads that cross the box's left half
        label_text(group, x + width - 3, y + 3, caption, 7.0, "end")


# --- layouts ------------------------------------------------------------------------------

def schematic_drawing(schematic: Schematic, width: float, height: float = HEIGHT):
    """The schematic as a reportlab Drawing `width` points wide (scaled down to fit)."""
    from reportlab.graphics.shapes import Drawing, Group
    g = Group()
    y_bottom, y_top = 14.0, height - 36.0
    # the source's labels, left of its circle, clear the source box's left edge
    label = max(text_width("source", bold=True), text_width(schematic.source_label))
    x_source = max(84.0, _SOURCE_BOX_LEFT + LABEL_CLEARANCE + label + 5 + _SOURCE_R)
    _source(g, schematic.source, x_source, y_bottom, y_top, schematic.source_label)
    if schematic.topology == "series":
        _series(g, schematic, x_source, y_bottom, y_top)
    else:
        _parallel(g, schematic, x_source, y_bottom, y_top)
    right = g.getBounds()[2] + 1.0
    scale = min(1.0, width / right)
    g.transform = (scale, 0, 0, scale, 0, 0)
    drawing = Drawing(width, height * scale)
    drawing.add(g)
    return drawing


def _source_box(g, y_bottom, y_top, right):
    box(g, _SOURCE_BOX_LEFT, y_bottom - 8, right - _SOURCE_BOX_LEFT, y_top - y_bottom + 40,
         "source", top_left=True)


def _source_resistor(g, s: Schematic, x, y_bottom, y_top, lead: float) -> tuple[float, float]:
    """R1 along the top wire from `x` (at least `lead` on), then the source box's right edge
    clear of R1's label; returns where the wire goes on and where the drawing ends."""
    length = _LENGTH["resistor"]
    start = _start_clear_of(x + lead, length, s.source_resistor, x)
    wire(g, x, y_top, start, y_top)
    horizontal(g, "resistor", start, y_top, length)
    label_above(g, s.source_resistor, start + length / 2, y_top)
    right = max(start + length + 6, start + length / 2 + label_width(s.source_resistor) / 2
                + LABEL_CLEARANCE)
    _source_box(g, y_bottom, y_top, right)
    return start + length, right


def _norton_resistor(g, s: Schematic, x, y_bottom, y_top) -> tuple[float, float]:
    """R1 across a current source (Norton: its output resistance is in parallel with it),
    down between the rails right of the source; the source box closes right of R1's label.
    Returns where the top wire goes on and where the drawing ends."""
    x_r = x + 34.0
    vertical(g, "resistor", x_r, y_bottom, y_top - y_bottom)
    label_right(g, s.source_resistor, x_r, (y_top + y_bottom) / 2)
    wire(g, x, y_top, x_r, y_top)
    wire(g, x, y_bottom, x_r, y_bottom)
    dot(g, x_r, y_top)
    dot(g, x_r, y_bottom)
    right = x_r + 14 + label_width(s.source_resistor) + LABEL_CLEARANCE
    _source_box(g, y_bottom, y_top, right)
    return x_r, right


def _source_part(g, s: Schematic, x, y_bottom, y_top, lead: float) -> tuple[float, float]:
    """The source's resistance: across a current source, in series with a voltage source."""
    if s.source == "current":
        return _norton_resistor(g, s, x, y_bottom, y_top)
    return _source_resistor(g, s, x, y_bottom, y_top, lead)


def _series(g, s: Schematic, x_source, y_bottom, y_top):
    """R1, L1 and C1 (‖ C2 …) along the top wire; the load R2 down the right side."""
    x, gap = x_source, 22.0
    frontier = x  # everything drawn so far lies left of this
    if s.source_resistor is not None:
        x, frontier = _source_part(g, s, x, y_bottom, y_top, gap)
    length = _LENGTH["inductor"]
    start = _start_clear_of(x + gap, length, s.inductor, frontier)
    wire(g, x, y_top, start, y_top)
    horizontal(g, "inductor", start, y_top, length)
    label_above(g, s.inductor, start + length / 2, y_top)
    frontier = _tap(g, s, start + length / 2, y_top, along_top=True)
    frontier = max(frontier, start + length / 2 + label_width(s.inductor) / 2)
    x = start + length
    bank = _start_clear_of(x + gap + 10, 40.0, s.across_capacitors[0], frontier) - 10
    wire(g, x, y_top, bank, y_top)
    x, labels_end = _capacitor_bank(g, s.across_capacitors, bank, y_top)
    x_right = max(x + gap, labels_end + 34.0)
    wire(g, x, y_top, x_right, y_top)
    if s.load is not None:
        vertical(g, "resistor", x_right, y_bottom, y_top - y_bottom)
        label_right(g, s.load, x_right, (y_top + y_bottom) / 2)
        box(g, x_right - 18, y_bottom + 8, 40 + label_width(s.load), y_top - y_bottom - 16,
             "load")
    else:
        wire(g, x_right, y_bottom, x_right, y_top)
    wire(g, x_source, y_bottom, x_right, y_bottom)


def _capacitor_bank(g, capacitors, x, y) -> tuple[float, float]:
    """Capacitors in parallel on a horizontal wire, stacked downwards.

    Returns where the wire leaves the bank and how far right the labels reach.
    """
    pitch, inner = 30.0, 40.0
    ys = [y - pitch * i for i in range(len(capacitors))]
    for index, (part, yy) in enumerate(zip(capacitors, ys)):
        horizontal(g, part.kind, x + 10, yy, inner)
        if index == 0:
            label_above(g, part, x + 10 + inner / 2, yy)
        else:
            label_text(g, x + 10 + inner + 6, yy + 2, part.designator, DESIGNATOR_SIZE, "start", True)
            label_text(g, x + 10 + inner + 6, yy - 8, part.value, LABEL_SIZE, "start")
    wire(g, x, y, x + 10, y)
    wire(g, x + 10 + inner, y, x + 20 + inner, y)
    if len(capacitors) > 1:
        for xx in (x + 10, x + 10 + inner):
            wire(g, xx, ys[0], xx, ys[-1])
            dot(g, xx, y)
    end = x + 20 + inner
    labels = max((label_width(p) for p in capacitors[1:]), default=0.0)
    return end, max(end, x + 10 + inner + 6 + labels)


def _parallel(g, s: Schematic, x_source, y_bottom, y_top):
    """R1 along the top to the tank (across the source when it is a current source); C1,
    C2 …, L1 and the load R2 as branches across it."""
    x = frontier = x_source  # everything drawn so far lies left of `frontier`
    if s.source_resistor is not None:
        x, frontier = _source_part(g, s, x, y_bottom, y_top, 18.0)
    linked = s.link is not None
    tapped = s.tap_label is not None and s.load is not None and not linked
    coupled = linked or tapped  # L1 goes last, its label on its left, the load beside it
    branches = ([s.inductor, *s.across_capacitors] if not coupled
                else [*s.across_capacitors, s.inductor])
    if s.load is not None and not coupled:
        branches.append(s.load)
    x_branch = max(x + 36.0, frontier + 30.0)
    xs = []
    span = y_top - y_bottom
    for part in branches:
        beside = coupled and part is s.inductor  # its label to its left, above the top wire
        if beside:
            x_branch = max(x_branch, frontier + LABEL_CLEARANCE + 8 + label_width(part))
        xs.append(x_branch)
        reach = x_branch + 14 + label_width(part)
        if beside:
            vertical(g, "inductor", x_branch, y_bottom, span, loops_right=True)
            label_text(g, x_branch - 8, y_top + 12, part.designator, DESIGNATOR_SIZE, "end", True)
            label_text(g, x_branch - 8, y_top + 3, part.value, LABEL_SIZE, "end")
        else:
            vertical(g, part.kind, x_branch, y_bottom, span)
            label_right(g, part, x_branch, (y_top + y_bottom) / 2)
        if part is s.inductor and not tapped:
            reach = max(reach, _tap(g, s, x_branch, y_bottom + span * 0.25, along_top=False))
        if part is s.load:
            box(g, x_branch - 18, y_bottom + 8, 40 + label_width(part), span - 16, "load")
        # the next branch clears this one's label and tap (drawn to its right)
        if not beside:
            x_branch = max(x_branch + 60.0, reach + 22)
    wire(g, x, y_top, xs[-1], y_top)
    wire(g, x_source, y_bottom, xs[-1], y_bottom)
    for xx in xs[:-1]:
        dot(g, xx, y_top)
        dot(g, xx, y_bottom)
    if linked:
        _link(g, s, xs[-1], y_bottom, y_top)
    if tapped:
        _tapped_load(g, s, xs[-1], y_bottom, y_top)


def _tapped_load(g, s: Schematic, x_coil, y_bottom, y_top):
    """The load from a tap on L1 (drawn half-way up; the cold end is at the bottom) to the
    bottom rail, in its dashed load box."""
    span = y_top - y_bottom
    y_tap = y_bottom + span / 2.0
    tap = s.tap_label.split(":")[0]
    x_load = x_coil + max(74.0, 6 + text_width(tap) + LABEL_CLEARANCE + 16)  # the box is 16 left of R2
    dot(g, x_coil, y_tap)
    wire(g, x_coil, y_tap, x_load, y_tap)
    label_text(g, x_coil + 6, y_tap + 3, tap, LABEL_SIZE)
    vertical(g, "resistor", x_load, y_bottom, y_tap - y_bottom)
    label_right(g, s.load, x_load, y_bottom + (y_tap - y_bottom) / 2)
    wire(g, x_coil, y_bottom, x_load, y_bottom)
    box(g, x_load - 16, y_bottom + 2, 36 + label_width(s.load), span - 4, "load",
         top_left=True)  # R2 and its label fill the box's lower half


def _link(g, s: Schematic, x_coil, y_bottom, y_top):
    """The link winding L2 beside L1 (core bars between when cored), the load across it."""
    x_link = x_coil + 2 * _LOOP_R + 16
    inner_bottom, inner_top = y_bottom + 14, y_top - 14
    vertical(g, "inductor", x_link, inner_bottom, inner_top - inner_bottom)
    if s.cored:
        for dx in (-2.0, 2.0):
            middle = (x_coil + x_link) / 2 + dx
            wire(g, middle, inner_bottom + 6, middle, inner_top - 6, width=0.9)
    label_text(g, x_link + 8, y_top + 12, s.link.designator, DESIGNATOR_SIZE, "start", True)
    label_text(g, x_link + 8, y_top + 3, s.link.value, LABEL_SIZE, "start")
    x_load = x_link + 50
    wire(g, x_link, inner_top, x_load, inner_top)
    wire(g, x_link, inner_bottom, x_load, inner_bottom)
    if s.load is not None:
        vertical(g, "resistor", x_load, inner_bottom, inner_top - inner_bottom)
        label_right(g, s.load, x_load, (inner_top + inner_bottom) / 2)
        box(g, x_load - 18, inner_bottom + 3, 40 + label_width(s.load),
             inner_top - inner_bottom - 6, "load")


def _tap(g, s: Schematic, x, y, along_top: bool) -> float:
    """A tap lead from the middle of L1, labelled, when the schematic has one; returns how
    far right it reaches (x without a tap)."""
    if s.tap_label is None:
        return x
    if along_top:
        dot(g, x, y)
        wire(g, x, y, x, y - 20)
        label_text(g, x + 4, y - 18, s.tap_label, LABEL_SIZE)
        return x + 4 + text_width(s.tap_label)
    else:
        dot(g, x, y)
        wire(g, x, y, x + 24, y)
        label_text(g, x + 26, y - 3, s.tap_label, LABEL_SIZE)
        return x + 26 + text_width(s.tap_label)
