"""The bench test set-up as a block diagram (reportlab.graphics), for procedure step 5.

`setup_of(procedure, designators)` says what to draw: the generator, the source hookup,
the unit under test with the terminals the hookups join, the receiver hookup and the
receiver. `setup_drawing` draws it left to right in the schematic's house style: fixture
resistors as IEC 60617 rectangles (a series one in the signal path, a shunt one from the
path to the cold rail), a coupling capacitor as the IEC 60617 capacitor in the path, a
transformer or an active probe as a box of text in the path, instruments as boxes with a
coaxial port, the unit as a dashed box.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from sheetgen.design.designators import Designators
from sheetgen.report.formatting import quantity_text, signed
from sheetgen.report.procedure import FixtureNames, Procedure
from sheetgen.sheet import drawing
from sheetgen.sheet.schematic import (
    LABEL_CLEARANCE,
    LABEL_SIZE,
    LINE_WIDTH,
    Part,
    box,
    dot,
    horizontal,
    label_above,
    label_right,
    label_text,
    label_width,
    text_width,
    vertical,
    wire,
)

HookupKind = Literal["direct", "series_resistor", "shunt_resistor", "transformer",
                     "coupling_capacitor", "probe"]

RAIL_LABEL = "cold side / cable screens"
DIRECT_LABEL = "direct"
_PORT_R = 5.0           # the coaxial port's outer circle
_PAD = 6.0              # text inside a box, from its edges
_LINE_PITCH = 10.0      # between the lines of text in an instrument box
_RESISTOR_LENGTH = 44.0
_Y_RAIL, _Y_SIGNAL = 22.0, 84.0
_HEIGHT = 124.0


@dataclass(frozen=True)
class Instrument:
    """A bench instrument: its name, its port and (for the generator) its level."""

    name: str
    lines: tuple[str, ...]


@dataclass(frozen=True)
class Hookup:
    """How a port joins the unit: directly, through a fixture part (a resistor of E96
    value or a coupling capacitor, with its designator), or through a block of text (a
    transformer, an active probe)."""

    kind: HookupKind
    part: Part | None = None
    lines: tuple[str, ...] = ()


@dataclass(frozen=True)
class Unit:
    """The unit under test and where on it the source and receiver hookups join."""

    caption: str
    source_terminal: str
    receiver_terminal: str


@dataclass(frozen=True)
class SetupView:
    """What the set-up drawing shows, left to right."""

    generator: Instrument
    source: Hookup
    unit: Unit
    receiver_hookup: Hookup
    receiver: Instrument


def setup_of(procedure: Procedure, designators: Designators,
             sheet_id: str | None = None) -> SetupView:
    """The set-up of `procedure.bench`, its terminals named by the unit's designators and
    its parts by procedure.fixture (the names the procedure's words use)."""
    bench = procedure.bench
    parts: FixtureNames = procedure.fixture
    source_terminal = (f"where {designators.source_resistor} stands"
                       if designators.source_resistor is not None
                       else "where the source stands" if bench.circuit.topology == "series"
                       else "tank's hot end")
    receiver_terminal = {"load": f"where {designators.load_resistor} stands",
                         "link": f"{designators.link}'s ends",
                         "tap": f"tap of {designators.coil} to its cold end",
                         "sense_resistor": "loop's cold end",
                         "pickup": "tank's hot end"}[bench.receiver.place]
    if bench.source.kind == "coupling_capacitor":
        source_terminal = "tank's hot end"
    level = signed(bench.drive.generator_level_dbm, 1) + " dBm"
    return SetupView(
        Instrument("generator", ("50 Ω output", f"level {level}")),
        _hookup(bench.source, parts.source),
        Unit("unit under test" + (f", sheet {sheet_id}" if sheet_id else ""),
             source_terminal, receiver_terminal),
        _hookup(bench.receiver.hookup, parts.receiver),
        Instrument("receiver", ("50 Ω input",)))


def _hookup(port, name: str | None) -> Hookup:
    """A bench PortHookup as drawn: its kind, and its part named `name`."""
    if port.kind == "direct":
        return Hookup("direct")
    if port.kind == "coupling_capacitor":
        return Hookup(port.kind, Part(name, "capacitor", quantity_text(port.capacitance_f, "F", 2)))
    if port.kind == "transformer":
        unit_turns, port_turns = port.turns
        return Hookup(port.kind, lines=(f"{name} {unit_turns}:{port_turns}",
                                        "ferrite ring",
                                        "circuit : port"))
    if port.kind == "probe":
        return Hookup(port.kind, lines=("active probe",
                                        f"{quantity_text(port.presented_ohm, 'Ω', 2)} ∥ "
                                        f"{quantity_text(port.capacitance_f, 'F', 2)}"))
    return Hookup(port.kind, Part(name, "resistor", quantity_text(port.resistor_ohm, "Ω", 3)))


# --- drawing ------------------------------------------------------------------------------

def setup_drawing(view: SetupView, width: float):
    """The set-up as a reportlab Drawing `width` points wide (scaled down to fit)."""
    from reportlab.graphics.shapes import Drawing, Group
    g = Group()
    x_port = _instrument(g, view.generator, 2.0, port_right=True)
    x = _hookup_drawn(g, view.source, x_port)
    x, unit_middle = _unit(g, view.unit, x)
    x = _hookup_drawn(g, view.receiver_hookup, x)
    x_receiver_port = x + _PORT_R + 14.0
    wire(g, x, _Y_SIGNAL, x_receiver_port, _Y_SIGNAL)
    _instrument(g, view.receiver, x_receiver_port + _PORT_R, port_right=False)
    wire(g, x_port, _Y_RAIL, x_receiver_port, _Y_RAIL)
    label_text(g, unit_middle, _Y_RAIL - 11, RAIL_LABEL, 7.0, "middle")
    right = g.getBounds()[2] + 1.0
    scale = min(1.0, width / right)
    g.transform = (scale, 0, 0, scale, 0, 0)
    figure = Drawing(width, _HEIGHT * scale)
    figure.add(g)
    return figure


def _instrument(g, instrument: Instrument, left: float, port_right: bool) -> float:
    """A solid box of text from `left`, its coaxial port at signal height on its right (the
    generator) or its left (the receiver), the port's screen down to the rail. Returns the
    port's x."""
    from reportlab.graphics.shapes import Circle
    from reportlab.lib.colors import black
    width = _text_box(g, (instrument.name, *instrument.lines), left)
    x_port = left + width + _PORT_R if port_right else left - _PORT_R
    g.add(Circle(x_port, _Y_SIGNAL, _PORT_R, strokeWidth=0.8, fillColor=None,
                 strokeColor=black))
    dot(g, x_port, _Y_SIGNAL)
    wire(g, x_port, _Y_SIGNAL - _PORT_R, x_port, _Y_RAIL)
    return x_port


def _text_box(g, lines: tuple[str, ...], left: float) -> float:
    """A solid box from `left`, centred on the signal path, holding `lines` (the first in
    bold); returns its width."""
    width = 2 * _PAD + max(text_width(lines[0], bold=True), *(text_width(t) for t in lines))
    height = 2 * _PAD + _LINE_PITCH * len(lines)
    bottom = _Y_SIGNAL - height / 2
    for x1, y1, x2, y2 in ((left, bottom, left + width, bottom),
                           (left + width, bottom, left + width, bottom + height),
                           (left + width, bottom + height, left, bottom + height),
                           (left, bottom + height, left, bottom)):
        drawing.line(g, x1, y1, x2, y2, LINE_WIDTH, cap=2)  # square corners
    for index, content in enumerate(lines):
        label_text(g, left + width / 2, bottom + height - _PAD - 7.5 - _LINE_PITCH * index,
                   content, LABEL_SIZE, "middle", bold=index == 0)
    return width


def _hookup_drawn(g, hookup: Hookup, x: float) -> float:
    """A hookup on the signal path from `x`; returns where the path goes on."""
    gap = 16.0
    if hookup.kind == "direct":
        length = text_width(DIRECT_LABEL) + 2 * gap
        wire(g, x, _Y_SIGNAL, x + length, _Y_SIGNAL)
        label_text(g, x + length / 2, _Y_SIGNAL + 5, DIRECT_LABEL, LABEL_SIZE, "middle")
        return x + length
    if hookup.lines:
        return _block(g, hookup.lines, x, gap)
    part = hookup.part
    label = label_width(part)
    if hookup.kind in ("series_resistor", "coupling_capacitor"):
        start = x + gap + max(0.0, label / 2 - _RESISTOR_LENGTH / 2)
        wire(g, x, _Y_SIGNAL, start, _Y_SIGNAL)
        horizontal(g, part.kind, start, _Y_SIGNAL, _RESISTOR_LENGTH)
        label_above(g, part, start + _RESISTOR_LENGTH / 2, _Y_SIGNAL)
        end = start + _RESISTOR_LENGTH + max(0.0, label / 2 - _RESISTOR_LENGTH / 2) + gap
        wire(g, start + _RESISTOR_LENGTH, _Y_SIGNAL, end, _Y_SIGNAL)
        return end
    x_shunt = x + 2 * gap
    vertical(g, "resistor", x_shunt, _Y_RAIL, _Y_SIGNAL - _Y_RAIL)
    label_right(g, part, x_shunt, (_Y_SIGNAL + _Y_RAIL) / 2)
    dot(g, x_shunt, _Y_SIGNAL)
    dot(g, x_shunt, _Y_RAIL)
    end = x_shunt + 14 + label + LABEL_CLEARANCE + gap
    wire(g, x, _Y_SIGNAL, end, _Y_SIGNAL)
    return end


def _block(g, lines: tuple[str, ...], x: float, gap: float) -> float:
    """A box of text in the signal path from `x` (a transformer, a probe), its cold side
    down to the rail; returns where the path goes on."""
    left = x + gap
    width = _text_box(g, lines, left)
    height = 2 * _PAD + _LINE_PITCH * len(lines)
    bottom = _Y_SIGNAL - height / 2
    wire(g, x, _Y_SIGNAL, left, _Y_SIGNAL)
    wire(g, left + width, _Y_SIGNAL, left + width + gap, _Y_SIGNAL)
    wire(g, left + width / 2, bottom, left + width / 2, _Y_RAIL)
    dot(g, left + width / 2, _Y_RAIL)
    return left + width + gap


def _unit(g, unit: Unit, x: float) -> tuple[float, float]:
    """The dashed unit box from `x`, its terminals on the signal path and its cold side
    down to the rail; returns its right edge and its middle."""
    caption_width = text_width(unit.caption, 7.0)
    width = max(caption_width + 2 * _PAD, text_width(unit.source_terminal)
                + text_width(unit.receiver_terminal) + 2 * _PAD + 3 * LABEL_CLEARANCE)
    bottom, top = _Y_RAIL + 12, _Y_SIGNAL + 30
    box(g, x, bottom, width, top - bottom, unit.caption, top_left=True)
    right, middle = x + width, x + width / 2
    for xx in (x, right):
        dot(g, xx, _Y_SIGNAL)
    label_text(g, x + _PAD, _Y_SIGNAL - 3, unit.source_terminal)
    label_text(g, right - _PAD, _Y_SIGNAL - 3, unit.receiver_terminal, LABEL_SIZE, "end")
    dot(g, middle, bottom)
    wire(g, middle, bottom, middle, _Y_RAIL)
    dot(g, middle, _Y_RAIL)
    return right, middle
