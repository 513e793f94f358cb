"""The coil as the technician winds it, drawn to scale as vector graphics (reportlab.graphics).

`winding_view_of(design)` says what to draw, in metres and degrees, from the designed coil;
`winding_drawing(view, width)` draws it. A ring core is seen from above: the core's two
circles, each turn as it lies (solid over the top face, dashed where it returns under the
ring), spaced evenly from the first turn to the last with the spread as an angular
dimension, the start and finish leads either side of the lead gap, a link winding as
outlined strokes (insulated wire) over the start (cold) end, and beside it a section
through one turn showing the single layer. A solenoid is seen from the side: the
former, the front half of each turn at the pitch, the leads, and dimensions for the
winding length, the pitch and the former's diameter. Black on white: the link is told
apart by dash, width and label, never by colour.

The drawing keeps its L1 turn strokes in `drawing.turns` (their hidden returns in
`drawing.hidden_turns`) and the link's in `drawing.link_turns` (reportlab Groups of
Lines), the ring's circles in `drawing.core` or the former in `drawing.former`, so a test
can count and measure what was drawn.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from sheetgen.design.records import Design
from sheetgen.quantities import format_number
from sheetgen.report.formatting import plural, quantity_text
from sheetgen.sheet import drawing, fonts

POINTS_PER_M = 72.0 / 0.0254  # 1 in = 25.4 mm exactly, 72 pt to the inch
LABEL_SIZE = 7.5
FACT_SIZE = 8.0
_RING_MAX_PT = 150.0          # the ring's outer diameter as drawn, at most
_FORMER_MAX_PT = (280.0, 145.0)  # a former's length and diameter as drawn, at most
_LEAD_PT = 24.0               # drawn length of a lead (not to scale: it is cut to length)
_SCALE_STEPS = (1.0, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0, 8.0)
_MIN_STROKE_PT = 0.6
_FACTS_MIN_PT = 170.0         # width kept for the text beside a former


@dataclass(frozen=True)
class DrawingScale:
    """A drafting scale: drawn size / real size, written n : 1 or 1 : n."""

    factor: float

    @property
    def text(self) -> str:
        if self.factor >= 1.0:
            return f"{format_number(self.factor, 2).rstrip('0').rstrip('.')} : 1"
        return f"1 : {format_number(1.0 / self.factor, 2).rstrip('0').rstrip('.')}"


def drafting_scale(real_m: float, drawn_max_pt: float) -> DrawingScale:
    """The largest scale of the usual drafting steps (1, 2, 2.5, 3, 4, 5, 6, 8 × 10ⁿ, and
    their reciprocals) that draws `real_m` no larger than `drawn_max_pt`."""
    best = drawn_max_pt / (real_m * POINTS_PER_M)
    if best >= 1.0:
        decade = 10.0 ** math.floor(math.log10(best))
        factor = max(s * decade for s in _SCALE_STEPS if s * decade <= best * (1 + 1e-9))
        return DrawingScale(factor)
    inverse = 1.0 / best
    decade = 10.0 ** math.floor(math.log10(inverse))
    steps = [s * decade for s in _SCALE_STEPS + (10.0,) if s * decade >= inverse * (1 - 1e-9)]
    return DrawingScale(1.0 / min(steps))


@dataclass(frozen=True)
class ToroidView:
    """A ring core seen from above with its winding. Angles in degrees, counter-clockwise
    from the +x axis; the lead gap is centred at the bottom (270°) and the winding runs
    clockwise from the start lead, over the top, to the finish lead."""

    designator: str
    core_name: str | None
    outer_diameter_m: float
    inner_diameter_m: float
    height_m: float | None
    wire_name: str
    wire_overall_diameter_m: float
    turns: int
    winding_angle_deg: float
    turn_angles_deg: tuple[float, ...]  # the centre of each L1 turn, turn 1 first
    link_designator: str | None
    link_angles_deg: tuple[float, ...]  # the link's turns, over the start end
    lead_length_m: float
    fits: bool  # in one layer within 360° less the lead gap
    tap_turn: int | None = None  # a tap after this turn, counted from the start


@dataclass(frozen=True)
class SolenoidView:
    """A single-layer coil seen from the side, its axis along +x. Positions in metres from
    the left end of the former (the winding is centred on it, and overhangs a former too
    short for it)."""

    designator: str
    former_diameter_m: float
    former_length_m: float
    former_length_given: bool
    winding_start_m: float
    winding_length_m: float
    pitch_m: float
    turns: int
    turn_positions_m: tuple[float, ...]  # where each turn's front half leaves the bottom
    wire_name: str
    wire_overall_diameter_m: float
    lead_length_m: float
    fits: bool  # pitch at least the wire's overall diameter, length within the former's


def toroid_turn_angles_deg(turns: int, winding_angle_deg: float) -> tuple[float, ...]:
    """Turn centres evenly spaced from the first turn to the last over the winding angle
    (centre to centre: the pitch is angle/(N − 1)), clockwise from the start, the lead gap
    of 360° − angle centred at 270°."""
    start = 270.0 - (360.0 - winding_angle_deg) / 2.0
    pitch = winding_angle_deg / (turns - 1) if turns > 1 else 0.0
    return tuple(start - i * pitch for i in range(turns))


def link_angles_deg(turn_angles: tuple[float, ...], link_turns: int) -> tuple[float, ...]:
    """A link's turns between the first tank turns (the start end); spread over the whole
    winding when it has as many turns as the gaps between tank turns."""
    gaps = len(turn_angles) - 1
    if gaps <= 0:
        return tuple(turn_angles[0] for _ in range(link_turns))
    if link_turns <= gaps:
        return tuple((turn_angles[j] + turn_angles[j + 1]) / 2.0 for j in range(link_turns))
    first, last = turn_angles[0], turn_angles[-1]
    step = (last - first) / max(link_turns - 1, 1)
    return tuple(first + j * step for j in range(link_turns))


def winding_view_of(design: Design) -> ToroidView | SolenoidView | None:
    """What the winding drawing shows, from the designed coil (None for a given coil)."""
    coil = design.coil
    if coil is None:
        return None
    r = coil.result
    names = design.designators
    if coil.form == "toroid":
        if coil.core_outer_diameter_m is None or coil.core_inner_diameter_m is None:
            return None
        angles = toroid_turn_angles_deg(r.turns, r.winding_angle_deg)
        link = (link_angles_deg(angles, coil.link_turns)
                if coil.link_turns is not None and names.link is not None else ())
        return ToroidView(names.coil, coil.core_name, coil.core_outer_diameter_m,
                          coil.core_inner_diameter_m, coil.core_height_m, r.wire.name,
                          r.wire.overall_diameter_m, r.turns, r.winding_angle_deg, angles,
                          names.link if link else None, link, coil.lead_length_m, r.fits,
                          coil.tap_turns)
    former_diameter = r.former_diameter_m
    given = design.job.inductor.former_length
    margin = max(0.15 * r.length_m, 2.0 * r.wire.overall_diameter_m, 0.003)
    length = given if given is not None else r.length_m + 2 * margin
    start = (length - r.length_m) / 2.0  # centred; below zero when it overhangs the former
    positions = tuple(start + i * r.pitch_m for i in range(r.turns))
    return SolenoidView(names.coil, former_diameter, length, given is not None, start,
                        r.length_m, r.pitch_m, r.turns, positions, r.wire.name,
                        r.wire.overall_diameter_m, coil.lead_length_m, r.fits)


# --- drawing -------------------------------------------------------------------------------

def winding_drawing(view: ToroidView | SolenoidView, width: float):
    """The view as a reportlab Drawing `width` points wide."""
    fonts.register_fonts()  # the layout measures its labels
    if isinstance(view, ToroidView):
        return _toroid_drawing(view, width)
    return _solenoid_drawing(view, width)


def _text(group, x, y, text, size=LABEL_SIZE, anchor="start", bold=False):
    drawing.text(group, x, y, text, size, anchor, bold)


def _line(group, x1, y1, x2, y2, width=0.8, dash=None, cap=0, color=None):
    drawing.line(group, x1, y1, x2, y2, width, dash, cap, color)


def _arrow_head(group, x, y, dx, dy, size=4.0):
    """A filled arrowhead with its tip at (x, y), pointing along (dx, dy)."""
    from reportlab.graphics.shapes import Polygon
    from reportlab.lib.colors import black
    length = math.hypot(dx, dy)
    ux, uy = dx / length, dy / length
    bx, by = x - ux * size, y - uy * size
    px, py = -uy * size * 0.35, ux * size * 0.35
    group.add(Polygon([round(v, 2) for v in (x, y, bx + px, by + py, bx - px, by - py)],
                      fillColor=black, strokeColor=black, strokeWidth=0.3))


def _dimension(group, x1, y1, x2, y2):
    """A dimension line with an arrowhead at each end."""
    _line(group, x1, y1, x2, y2, width=0.5)
    _arrow_head(group, x1, y1, x1 - x2, y1 - y2)
    _arrow_head(group, x2, y2, x2 - x1, y2 - y1)


def _facts(group, x, y_top, width, lines: list[tuple[str, bool]]) -> None:
    """Lines of text (bold where asked) wrapped to `width`, from y_top down."""
    from reportlab.lib.utils import simpleSplit
    y = y_top
    for text, bold in lines:
        font = fonts.BOLD if bold else fonts.REGULAR
        for part in simpleSplit(text, font, FACT_SIZE, width):
            y -= FACT_SIZE * 1.3
            _text(group, x, y, part, FACT_SIZE, bold=bold)
        y -= 2.0


def _polar(cx, cy, radius, angle_deg):
    a = math.radians(angle_deg)
    return cx + radius * math.cos(a), cy + radius * math.sin(a)


def _arc_points(cx, cy, radius, from_deg, to_deg, steps: int) -> list[float]:
    points = []
    for n in range(steps + 1):
        x, y = _polar(cx, cy, radius, from_deg + (to_deg - from_deg) * n / steps)
        points += [round(x, 2), round(y, 2)]
    return points


def _toroid_drawing(view: ToroidView, width: float):
    """Top view with each turn as it lies (over the top face solid, under the ring dashed),
    the spread as an angular dimension, labels at start, tap and finish; beside it a section
    through one turn showing the single layer."""
    from reportlab.graphics.shapes import Circle, Drawing, Group, PolyLine, Rect
    from reportlab.lib.colors import black, white
    from reportlab.pdfbase.pdfmetrics import stringWidth
    scale = drafting_scale(view.outer_diameter_m, _RING_MAX_PT)
    k = scale.factor * POINTS_PER_M
    r_out, r_in = view.outer_diameter_m / 2 * k, view.inner_diameter_m / 2 * k
    wire_pt = max(view.wire_overall_diameter_m * k, _MIN_STROKE_PT)
    angles = view.turn_angles_deg
    pitch = view.winding_angle_deg / (view.turns - 1) if view.turns > 1 else 0.0
    gap = 360.0 - view.winding_angle_deg
    label_room = 64.0  # the lead labels and the link's label left of the ring
    cx = label_room + r_out + _LEAD_PT * 0.5
    height = 2 * r_out + 2 * _LEAD_PT + 60.0  # provisional: _fit_height trims it
    cy = height - 30.0 - r_out
    drawing = Drawing(width, height)
    body = Group()
    for radius in (r_out, r_in):
        body.add(Circle(round(cx, 2), round(cy, 2), round(radius, 2), strokeColor=black,
                        fillColor=None, strokeWidth=1.0))
    drawing.add(body, name="core")
    over = r_out + wire_pt / 2 + 0.8  # the wire rounds the edges just outside the outline
    under = r_in - wire_pt / 2 - 0.8
    turns, hidden = Group(), Group()
    for index, angle in enumerate(angles):
        x1, y1 = _polar(cx, cy, under, angle)  # over the top face: seen, solid
        x2, y2 = _polar(cx, cy, over, angle)
        _line(turns, x1, y1, x2, y2, width=max(wire_pt * 0.55, _MIN_STROKE_PT), cap=1)
        back = angle - pitch / 2 if index < len(angles) - 1 or pitch else angle - 4.0
        x3, y3 = _polar(cx, cy, under, back)  # under the ring: hidden, dashed
        x4, y4 = _polar(cx, cy, over, back)
        _line(hidden, x3, y3, x4, y4, width=0.45, dash=[2.0, 1.4])
    drawing.add(hidden, name="hidden_turns")
    drawing.add(turns, name="turns")
    marks = Group()
    lead_ends = []
    for angle in (angles[0], angles[-1] - (pitch / 2 if pitch else 4.0)):
        x1, y1 = _polar(cx, cy, over, angle)
        x2, y2 = _polar(cx, cy, r_out + _LEAD_PT, angle)
        _line(marks, x1, y1, x2, y2, width=max(wire_pt * 0.55, 0.9), cap=1)
        lead_ends.append((x2, y2))
    (sx, sy), (fx, fy) = lead_ends
    _text(marks, sx - 3, sy - 8, "start", LABEL_SIZE, "end", bold=True)
    _text(marks, sx - 3, sy - 16, "turn 1", LABEL_SIZE, "end")
    _text(marks, fx + 3, fy - 8, "finish", LABEL_SIZE, "start", bold=True)
    _text(marks, fx + 3, fy - 16, f"turn {view.turns}", LABEL_SIZE, "start")
    spread = Group()  # the angular dimension from turn 1 to turn N, over the top
    if view.turns > 1:
        r_dim = r_out + wire_pt + 9.0
        spread.add(PolyLine(_arc_points(cx, cy, r_dim, angles[0], angles[-1], 96),
                            strokeWidth=0.35, strokeColor=black))
        for end, toward in ((angles[0], angles[0] - 3.0), (angles[-1], angles[-1] + 3.0)):
            x, y = _polar(cx, cy, r_dim, end)
            xa, ya = _polar(cx, cy, r_dim, toward)
            _arrow_head(spread, x, y, x - xa, y - ya)
            xe1, ye1 = _polar(cx, cy, over + 1.5, end)
            xe2, ye2 = _polar(cx, cy, r_dim + 3.0, end)
            _line(spread, xe1, ye1, xe2, ye2, width=0.35)
        _text(spread, cx, cy + r_dim + 4.0,
              f"{format_number(view.winding_angle_deg, 3)}° from turn 1 to turn {view.turns}",
              LABEL_SIZE, "middle")
    gap_text = f"gap {format_number(gap, 3)}°"
    lead_apart = 2 * (r_out + 12) * math.sin(math.radians(gap / 2))
    if lead_apart > stringWidth(gap_text, fonts.REGULAR, LABEL_SIZE) + 8 + wire_pt:
        _text(marks, cx, cy - r_out - 12, gap_text, LABEL_SIZE, "middle")
    _text(marks, cx, cy + 2, view.designator, 9.0, "middle", bold=True)
    _text(marks, cx, cy - 9, plural(view.turns, "turn"), LABEL_SIZE, "middle")
    drawing.add(spread, name="spread")
    drawing.add(marks, name="marks")
    link = Group()
    if view.link_angles_deg:
        for angle in view.link_angles_deg:  # insulated wire: an outlined stroke over the top
            x1, y1 = _polar(cx, cy, under - 4.0, angle)
            x2, y2 = _polar(cx, cy, over + 7.0, angle)
            _line(link, x1, y1, x2, y2, width=3.4, cap=1)
            _line(link, x1, y1, x2, y2, width=1.6, color=white, cap=1)
        x1, y1 = _polar(cx, cy, over + 7.0, view.link_angles_deg[0])
        x2 = cx - r_out - _LEAD_PT
        _line(link, x1, y1, x2, y1, width=0.5)
        _text(link, x2 - 3, y1 + 1, view.link_designator, 9.0, "end", bold=True)
        _text(link, x2 - 3, y1 - 8, "link", LABEL_SIZE, "end")
    drawing.add(link, name="link_turns")
    tap = Group()
    if view.tap_turn is not None:  # a short lead from between turn M and M + 1
        between = angles[view.tap_turn - 1] - pitch / 2
        x1, y1 = _polar(cx, cy, over, between)
        x2, y2 = _polar(cx, cy, r_out + _LEAD_PT * 0.8, between)
        _line(tap, x1, y1, x2, y2, width=max(wire_pt * 0.55, 0.9), cap=1)
        anchor = "start" if x2 >= cx else "end"
        _text(tap, x2 + (3 if anchor == "start" else -3), y2 - 3, f"tap, turn {view.tap_turn}",
              LABEL_SIZE, anchor, bold=True)
    drawing.add(tap, name="tap")
    # a section through one turn, to the same scale: the single layer around the core
    section = Group()
    x_section = cx + r_out + _LEAD_PT + 30.0
    ring_w = r_out - r_in
    ring_h = (view.height_m or view.outer_diameter_m - view.inner_diameter_m) * k
    y_section = cy - ring_h / 2
    section.add(Rect(round(x_section, 2), round(y_section, 2), round(ring_w, 2),
                     round(ring_h, 2), strokeColor=black, fillColor=None, strokeWidth=0.7))
    for offset in range(1, 6):  # hatching: a cut face
        step = (ring_w + ring_h) / 6.0 * offset
        xa, ya = x_section + min(step, ring_w), y_section + max(0.0, step - ring_w)
        xb, yb = x_section + max(0.0, step - ring_h), y_section + min(step, ring_h)
        _line(section, xa, ya, xb, yb, width=0.3)
    pad = wire_pt / 2 + 0.4
    section.add(Rect(round(x_section - pad, 2), round(y_section - pad, 2),
                     round(ring_w + 2 * pad, 2), round(ring_h + 2 * pad, 2),
                     rx=round(pad, 2), ry=round(pad, 2), strokeColor=black, fillColor=None,
                     strokeWidth=round(max(wire_pt * 0.55, _MIN_STROKE_PT), 2)))
    _text(section, x_section + ring_w / 2, y_section - pad - 10.0, "section through",
          LABEL_SIZE, "middle")
    _text(section, x_section + ring_w / 2, y_section - pad - 18.0, "one turn", LABEL_SIZE,
          "middle")
    _text(section, x_section - pad - 3.0, y_section + ring_h / 2 - 2.5, "hole", LABEL_SIZE,
          "end")
    drawing.add(section, name="section")
    facts = Group()
    x_facts = x_section + ring_w + 2 * pad + 24.0
    size = [f"OD {quantity_text(view.outer_diameter_m, 'm', 3)}",
            f"ID {quantity_text(view.inner_diameter_m, 'm', 3)}"]
    if view.height_m:
        size.append(f"height {quantity_text(view.height_m, 'm', 3)}")
    lines = [(f"{view.designator}: {plural(view.turns, 'turn')} of {view.wire_name}, one layer",
              True)]
    if not view.fits:
        lines.append(("DOES NOT FIT in one layer with a lead gap: see the failed checks", True))
    if view.turns > 1:
        lines += [(f"turn 1 to turn {view.turns}: {format_number(view.winding_angle_deg, 3)}°, "
                   f"{format_number(pitch, 3)}° from each turn to the next "
                   f"({view.turns - 1} spaces)", False)]
    lines += [(f"gap of {format_number(gap, 3)}° between the start and finish leads"
               if view.fits else "no gap left between the start and finish leads", False),
              ("solid: the wire over the top face; dashed: its way back under the ring", False)]
    if view.link_angles_deg:
        lines.append((f"{view.link_designator} (outlined strokes): "
                      f"{plural(len(view.link_angles_deg), 'turn')} of insulated wire over the "
                      f"start end of {view.designator}", True))
    if view.tap_turn is not None:
        lines.append((f"tap after turn {view.tap_turn}, counted from the start lead", True))
    core = f"Core {view.core_name}" if view.core_name else "Core"
    lines += [(f"{core}: {', '.join(size)}", False),
              (f"Seen from above, drawn to scale {scale.text} (the leads are not: cut each "
               f"{quantity_text(view.lead_length_m, 'm', 3)} long)", False)]
    _facts(facts, x_facts, height - 10.0, width - x_facts, lines)
    drawing.add(facts, name="facts")
    return _fit_height(drawing)


def _fit_height(drawing, margin_pt: float = 4.0):
    """The drawing's height cut to its content plus a margin, everything moved down to suit."""
    bottom = min(node.getBounds()[1] for node in drawing.contents if node.contents)
    top = max(node.getBounds()[3] for node in drawing.contents if node.contents)
    shift = round(margin_pt - bottom, 2)
    for node in drawing.contents:
        node.transform = (1, 0, 0, 1, 0, shift)
    drawing.height = round(top - bottom + 2 * margin_pt, 2)
    return drawing


def _solenoid_drawing(view: SolenoidView, width: float):
    from reportlab.graphics.shapes import Drawing, Group, Rect
    from reportlab.lib.colors import Color, black
    from reportlab.pdfbase.pdfmetrics import stringWidth
    overhang_m = max(0.0, -view.winding_start_m)
    by_length = drafting_scale(view.former_length_m + 2 * overhang_m,
                               min(_FORMER_MAX_PT[0], width - _FACTS_MIN_PT - 110.0))
    by_diameter = drafting_scale(view.former_diameter_m, _FORMER_MAX_PT[1])
    scale = min(by_length, by_diameter, key=lambda s: s.factor)
    k = scale.factor * POINTS_PER_M
    length_pt, diameter_pt = view.former_length_m * k, view.former_diameter_m * k
    wire_pt = max(view.wire_overall_diameter_m * k, _MIN_STROKE_PT)
    x_left = 70.0 + overhang_m * k  # room for the diameter's dimension and label
    y_bottom = _LEAD_PT + 26.0
    y_top = y_bottom + diameter_pt
    height = y_top + 40.0  # provisional: _fit_height trims it
    drawing = Drawing(width, height)
    body = Group()
    body.add(Rect(round(x_left, 2), round(y_bottom, 2), round(length_pt, 2),
                  round(diameter_pt, 2), fillColor=Color(0.86, 0.86, 0.86), strokeColor=black,
                  strokeWidth=0.9))
    drawing.add(body, name="former")
    turns = Group()
    half_pitch = view.pitch_m * k / 2.0
    for position in view.turn_positions_m:  # the front half of each turn, bottom to top
        x = x_left + position * k
        _line(turns, x, y_bottom - wire_pt / 2, x + half_pitch, y_top + wire_pt / 2,
              width=wire_pt)
    drawing.add(turns, name="turns")
    marks = Group()
    x_start = x_left + view.winding_start_m * k
    x_end = x_start + view.winding_length_m * k
    right = max(x_left + length_pt, x_end + 30.0)  # the finish label reaches past x_end
    for x, word, anchor, number in ((x_start, "start", "end", 1),
                                    (x_end, "finish", "start", view.turns)):
        _line(marks, x, y_bottom - wire_pt / 2, x, y_bottom - _LEAD_PT,
              width=max(wire_pt * 0.6, 0.9), cap=1)
        dx = -3 if anchor == "end" else 3
        _text(marks, x + dx, y_bottom - _LEAD_PT - 4, word, LABEL_SIZE, anchor, bold=True)
        _text(marks, x + dx, y_bottom - _LEAD_PT - 12, f"turn {number}", LABEL_SIZE, anchor)
    # winding length, above the former
    y_dim = y_top + wire_pt / 2 + 12.0
    for x in (x_start, x_end):
        _line(marks, x, y_top + wire_pt / 2 + 2, x, y_dim + 3, width=0.4)
    _dimension(marks, x_start, y_dim, x_end, y_dim)
    _text(marks, (x_start + x_end) / 2, y_dim + 4,
          f"winding {quantity_text(view.winding_length_m, 'm', 3)}", LABEL_SIZE, "middle")
    # pitch, below the former, between two turns in the middle of the winding; the
    # dimension line runs on to its label right of the winding, clear of the leads' labels
    if view.turns >= 2:
        middle = max(1, view.turns // 2)
        xa = x_left + view.turn_positions_m[middle - 1] * k
        xb = x_left + view.turn_positions_m[middle] * k
        y_pitch = y_bottom - wire_pt / 2 - 8.0
        for x in (xa, xb):
            _line(marks, x, y_bottom - wire_pt / 2 - 1, x, y_pitch - 3, width=0.4)
        _line(marks, xa - 10, y_pitch, x_end + 6, y_pitch, width=0.5)
        _arrow_head(marks, xa, y_pitch, 1.0, 0.0)
        _arrow_head(marks, xb, y_pitch, -1.0, 0.0)
        pitch_text = f"pitch {quantity_text(view.pitch_m, 'm', 3)}"
        _text(marks, x_end + 8, y_pitch - 2.6, pitch_text, LABEL_SIZE, "start")
        right = max(right, x_end + 8 + stringWidth(pitch_text, fonts.REGULAR, LABEL_SIZE))
    # the former's diameter, left of it
    x_dim = x_left - 10.0
    for y in (y_bottom, y_top):
        _line(marks, x_left - 2, y, x_dim - 3, y, width=0.4)
    _dimension(marks, x_dim, y_bottom, x_dim, y_top)
    _text(marks, x_dim - 4, (y_bottom + y_top) / 2 + 1, f"Ø {quantity_text(view.former_diameter_m, 'm', 3)}",
          LABEL_SIZE, "end")
    _text(marks, x_dim - 4, (y_bottom + y_top) / 2 - 8, "former", LABEL_SIZE, "end")
    drawing.add(marks, name="marks")
    drawing.add(Group(), name="link_turns")
    facts = Group()
    x_facts = right + 20.0
    former = (f"a former Ø {quantity_text(view.former_diameter_m, 'm', 3)}, "
              f"{quantity_text(view.former_length_m, 'm', 3)} long" if view.former_length_given else
              f"a former Ø {quantity_text(view.former_diameter_m, 'm', 3)}")
    lines = [(f"{view.designator}: {plural(view.turns, 'turn')} of {view.wire_name}", True)]
    if not view.fits:
        lines.append(("DOES NOT FIT as asked: see the failed checks", True))
    lines += [(f"at a pitch of {quantity_text(view.pitch_m, 'm', 3)} over "
              f"{quantity_text(view.winding_length_m, 'm', 3)}, one layer", False),
             (f"on {former}", False),
             (f"Seen from the side (the front half of each turn), drawn to scale {scale.text} "
              f"(the leads are not: cut each {quantity_text(view.lead_length_m, 'm', 3)} long)", False)]
    _facts(facts, x_facts, height - 10.0, width - x_facts, lines)
    drawing.add(facts, name="facts")
    return _fit_height(drawing)
