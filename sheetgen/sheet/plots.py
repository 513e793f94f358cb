"""Response, impedance and phase against frequency, drawn as reportlab vector graphics.

Drawn directly with reportlab.graphics rather than through matplotlib: the output is
vector, byte-for-byte deterministic, uses the sheet's own embedded font, and the sheet
does not pay matplotlib's import time. Every curve is black; curves and marks are told
apart by dash pattern and by text, never by colour.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from sheetgen.design.records import Design
from sheetgen.quantities import format_quantity
from sheetgen.report.formatting import quantity_text
from sheetgen.sheet import drawing

TICK_SIZE = 7.5
TITLE_SIZE = 8.0
MARK_SIZE = 7.5
_PREFIXES = ((1e15, "P"), (1e12, "T"), (1e9, "G"), (1e6, "M"), (1e3, "k"), (1.0, ""),
             (1e-3, "m"), (1e-6, "µ"), (1e-9, "n"), (1e-12, "p"), (1e-15, "f"))


@dataclass(frozen=True)
class Axis:
    """One axis: its range, tick positions and tick labels, and its title."""

    low: float
    high: float
    ticks: tuple[float, ...]
    labels: tuple[str, ...]
    title: str
    log: bool = False

    def fraction(self, value):
        """Where `value` falls along the axis, 0 at low and 1 at high."""
        if self.log:
            return (np.log10(value) - math.log10(self.low)) / (
                math.log10(self.high) - math.log10(self.low))
        return (np.asarray(value, dtype=float) - self.low) / (self.high - self.low)


def nice_step(span: float, count: int) -> float:
    """A 1-2-2.5-5 × 10^k step giving about `count` intervals over `span`."""
    raw = span / max(count, 1)
    decade = 10.0 ** math.floor(math.log10(raw))
    for mantissa in (1.0, 2.0, 2.5, 5.0, 10.0):
        if mantissa * decade >= raw * (1 - 1e-9):
            return mantissa * decade
    return 10.0 * decade  # pragma: no cover


def _decimals(step: float) -> int:
    """Decimals that show a tick step exactly (0.25 → 2, 0.5 → 1, 20 → 0)."""
    for decimals in range(0, 10):
        if abs(round(step, decimals) - step) <= step * 1e-6:
            return decimals
    return 9


def linear_ticks(low: float, high: float, count: int,
                 step: float | None = None) -> tuple[float, ...]:
    """Multiples of a nice step (or of `step`) inside [low, high]."""
    step = step or nice_step(high - low, count)
    first = math.ceil(low / step - 1e-9)
    last = math.floor(high / step + 1e-9)
    return tuple(float(f"{i * step:.12g}") for i in range(first, last + 1))


def frequency_axis(low_hz: float, high_hz: float, count: int) -> Axis:
    """Frequency in the prefix that keeps the labels short (kHz, MHz …), for any range: an
    empty or reversed one is widened around its centre."""
    if not high_hz > low_hz:
        centre = max(abs(low_hz), abs(high_hz)) or 1.0
        low_hz, high_hz = centre * (1 - 1e-3), centre * (1 + 1e-3)
    scale, prefix = next(((s, p) for s, p in _PREFIXES if high_hz >= s), _PREFIXES[-1])
    ticks = linear_ticks(low_hz / scale, high_hz / scale, count)
    decimals = _decimals(nice_step((high_hz - low_hz) / scale, count))
    labels = tuple(f"{t:.{decimals}f}" for t in ticks)
    return Axis(low_hz, high_hz, tuple(t * scale for t in ticks), labels,
                f"Frequency ({prefix}Hz)")


def linear_axis(low: float, high: float, count: int, title: str, unit: str = "",
                step: float | None = None) -> Axis:
    """A linear axis over [low, high] with nice ticks, labels with U+2212 minus signs."""
    ticks = linear_ticks(low, high, count, step)
    decimals = _decimals(step or nice_step(high - low, count))
    labels = tuple(f"{t:.{decimals}f}".replace("-", "\u2212") + unit for t in ticks)
    return Axis(low, high, ticks, labels, title)


def log_axis(low: float, high: float, title: str, unit: str) -> Axis:
    """A logarithmic axis on whole decades, with 2 and 5 ticks when it spans few decades."""
    low_decade = math.floor(math.log10(low))
    high_decade = math.ceil(math.log10(high))
    if high_decade - low_decade < 1:
        high_decade = low_decade + 1
    mantissas = (1.0, 2.0, 5.0) if high_decade - low_decade <= 3 else (1.0,)
    ticks = tuple(m * 10.0 ** d for d in range(low_decade, high_decade + 1) for m in mantissas
                  if m * 10.0 ** d <= 10.0 ** high_decade * (1 + 1e-9))
    labels = tuple(format_quantity(t, unit, 1) for t in ticks)
    return Axis(10.0 ** low_decade, 10.0 ** high_decade, ticks, labels, title, log=True)


@dataclass(frozen=True)
class Box:
    """The plotting area inside a drawing, in points."""

    x: float
    y: float
    width: float
    height: float


def plot_label(group, x, y, text, size=TICK_SIZE, anchor="middle", bold=False):
    drawing.text(group, x, y, text, size, anchor, bold)


def plot_frame(group, box: Box, x_axis: Axis, y_axis: Axis, y_side: str = "left",
           y_title_inside: bool = False):
    """Plot border, grid, ticks, tick labels and axis titles."""
    from reportlab.graphics.shapes import Line, Rect
    from reportlab.lib.colors import Color, black
    grid = Color(0.78, 0.78, 0.78)
    for tick in x_axis.ticks:
        x = box.x + float(x_axis.fraction(tick)) * box.width
        group.add(Line(x, box.y, x, box.y + box.height, strokeColor=grid, strokeWidth=0.4))
    for tick in y_axis.ticks:
        y = box.y + float(y_axis.fraction(tick)) * box.height
        group.add(Line(box.x, y, box.x + box.width, y, strokeColor=grid, strokeWidth=0.4))
    group.add(Rect(box.x, box.y, box.width, box.height, fillColor=None, strokeColor=black,
                   strokeWidth=0.8))
    for tick, label in zip(x_axis.ticks, x_axis.labels):
        x = box.x + float(x_axis.fraction(tick)) * box.width
        group.add(Line(x, box.y, x, box.y - 3, strokeColor=black, strokeWidth=0.6))
        plot_label(group, x, box.y - 12, label)
    plot_label(group, box.x + box.width / 2, box.y - 24, x_axis.title, TITLE_SIZE)
    for tick, label in zip(y_axis.ticks, y_axis.labels):
        y = box.y + float(y_axis.fraction(tick)) * box.height
        if y_side == "left":
            group.add(Line(box.x - 3, y, box.x, y, strokeColor=black, strokeWidth=0.6))
            plot_label(group, box.x - 5, y - 2.6, label, anchor="end")
        else:
            group.add(Line(box.x + box.width, y, box.x + box.width + 3, y, strokeColor=black,
                           strokeWidth=0.6))
            plot_label(group, box.x + box.width + 5, y - 2.6, label, anchor="start")
    if y_title_inside:  # a short unit label above the tick labels, clear of the plot area
        plot_label(group, box.x - 5, box.y + box.height + 8, y_axis.title, TITLE_SIZE, "end")
    else:
        plot_label(group, box.x, box.y + box.height + 5, y_axis.title, TITLE_SIZE, "start")


def plot_curve(group, box: Box, x_axis: Axis, y_axis: Axis, x, y, dash=None, width=1.1):
    """A polyline of (x, y), clipped to the axis ranges by clamping."""
    from reportlab.graphics.shapes import PolyLine
    from reportlab.lib.colors import black
    fx = np.clip(x_axis.fraction(np.asarray(x, dtype=float)), 0.0, 1.0)
    fy = np.clip(y_axis.fraction(np.asarray(y, dtype=float)), 0.0, 1.0)
    points = np.empty(2 * len(fx))
    points[0::2] = np.round(box.x + fx * box.width, 2)
    points[1::2] = np.round(box.y + fy * box.height, 2)
    group.add(PolyLine(points.tolist(), strokeColor=black, strokeWidth=width,
                       strokeDashArray=dash, strokeLineJoin=1))


def _band(group, box: Box, x_axis: Axis, y_axis: Axis, x, low, high):
    """A light grey band between two curves (the spread of builds), drawn under the curve."""
    from reportlab.graphics.shapes import Polygon
    from reportlab.lib.colors import Color
    x = np.asarray(x, dtype=float)
    keep = np.isfinite(low) & np.isfinite(high)
    if keep.sum() < 2:
        return
    fx = np.clip(x_axis.fraction(x[keep]), 0.0, 1.0)
    f_low = np.clip(y_axis.fraction(np.asarray(low, dtype=float)[keep]), 0.0, 1.0)
    f_high = np.clip(y_axis.fraction(np.asarray(high, dtype=float)[keep]), 0.0, 1.0)
    xs = np.concatenate([fx, fx[::-1]]) * box.width + box.x
    ys = np.concatenate([f_high, f_low[::-1]]) * box.height + box.y
    points = np.empty(2 * len(xs))
    points[0::2], points[1::2] = np.round(xs, 2), np.round(ys, 2)
    group.add(Polygon(points.tolist(), fillColor=Color(0.82, 0.82, 0.82), strokeColor=None,
                      strokeWidth=0))


def response_drawing(design: Design, width: float, height: float = 175.0):
    """The response in dB relative to its maximum, with f0 and the −3 dB points marked."""
    from reportlab.graphics.shapes import Circle, Drawing, Group, Line
    from reportlab.lib.colors import black, white
    sweep, r = design.sweep, design.resonance
    drawing = Drawing(width, height)
    g = Group()
    box = Box(40.0, 36.0, width - 40.0 - 34.0, height - 36.0 - 16.0)
    f = sweep.f_hz
    x_axis = frequency_axis(float(f[0]), float(f[-1]), 8)
    floor_db = max(math.floor(float(np.min(sweep.response_db)) / 10.0) * 10.0, -80.0)
    floor_db = min(floor_db, -10.0)
    y_axis = linear_axis(floor_db, 0.0, 6, "dB")
    envelope = design.assessment.envelope
    _band(g, box, x_axis, y_axis, envelope.f_hz, envelope.low_db, envelope.high_db)
    plot_frame(g, box, x_axis, y_axis, y_title_inside=True)
    half_power = 10.0 * math.log10(0.5)
    y_hp = box.y + float(y_axis.fraction(half_power)) * box.height
    g.add(Line(box.x, y_hp, box.x + box.width, y_hp, strokeColor=black, strokeWidth=0.6,
               strokeDashArray=[1, 2]))
    plot_label(g, box.x + box.width + 4, y_hp - 2.6, "\u22123 dB", MARK_SIZE, "start")
    plot_curve(g, box, x_axis, y_axis, f, sweep.response_db)

    def x_at(f_hz):
        return box.x + float(x_axis.fraction(f_hz)) * box.width

    if x_axis.low <= r.f0_hz <= x_axis.high:
        x0 = x_at(r.f0_hz)
        g.add(Line(x0, box.y, x0, box.y + box.height, strokeColor=black, strokeWidth=0.7,
                   strokeDashArray=[4, 2]))
        anchor = "middle"
        if x0 > box.x + box.width - 45:
            anchor = "end"
        elif x0 < box.x + 45:
            anchor = "start"
        plot_label(g, x0, box.y + box.height + 5, f"f0 {quantity_text(r.f0_hz, 'Hz')}", MARK_SIZE, anchor,
                bold=True)
    for f_hz, side in ((r.f_low_hz, "end"), (r.f_high_hz, "start")):
        if f_hz is None or not x_axis.low <= f_hz <= x_axis.high:
            continue
        x = x_at(f_hz)
        g.add(Circle(x, y_hp, 2.4, fillColor=white, strokeColor=black, strokeWidth=0.9))
        # outside the half-power points the curve is below the −3 dB line: label above it
        offset = -4 if side == "end" else 4
        plot_label(g, x + offset, y_hp + 4, quantity_text(f_hz, "Hz"), MARK_SIZE, side)
    drawing.add(g)
    return drawing


def impedance_phase_drawing(design: Design, width: float, height: float = 155.0):
    """|Z| (log scale) and its phase against frequency, side by side."""
    from reportlab.graphics.shapes import Drawing, Group
    sweep = design.sweep
    drawing = Drawing(width, height)
    g = Group()
    half = width / 2.0
    f = sweep.f_hz
    z = np.maximum(sweep.impedance_ohm, 1e-12)
    left = Box(46.0, 36.0, half - 46.0 - 14.0, height - 36.0 - 16.0)
    x_axis = frequency_axis(float(f[0]), float(f[-1]), 5)
    z_axis = log_axis(float(np.min(z)), float(np.max(z)), "|Z| at the source terminals", "Ω")
    plot_frame(g, left, x_axis, z_axis)
    plot_curve(g, left, x_axis, z_axis, f, z)
    right = Box(half + 40.0, 36.0, half - 40.0 - 8.0, height - 36.0 - 16.0)
    phase_axis = linear_axis(-90.0, 90.0, 4, "Phase of Z", "°", step=45.0)
    plot_frame(g, right, x_axis, phase_axis)
    plot_curve(g, right, x_axis, phase_axis, f, sweep.phase_deg)
    drawing.add(g)
    return drawing


def log_frequency_axis(low_hz: float, high_hz: float) -> Axis:
    """Frequency on a logarithmic scale, decade ticks (with 2 and 5 when few), labelled in Hz."""
    axis = log_axis(low_hz, high_hz, "Frequency", "Hz")
    keep = [(t, label) for t, label in zip(axis.ticks, axis.labels) if low_hz <= t <= high_hz]
    return Axis(low_hz, high_hz, tuple(t for t, _ in keep), tuple(lb for _, lb in keep),
                "Frequency", log=True)


def coil_q_drawing(design: Design, width: float, height: float = 150.0):
    """The designed coil's estimated Q against frequency, f0 marked; None for a given coil."""
    from reportlab.graphics.shapes import Drawing, Group, Line
    from reportlab.lib.colors import black
    coil = design.coil
    if coil is None:
        return None
    f, values = np.asarray(coil.q_curve.f_hz, dtype=float), np.asarray(coil.q_curve.q, dtype=float)
    drawing = Drawing(width, height)
    g = Group()
    box = Box(40.0, 36.0, width - 40.0 - 16.0, height - 36.0 - 20.0)
    x_axis = log_frequency_axis(float(f[0]), float(f[-1]))
    top = float(np.nanmax(values))
    y_axis = linear_axis(0.0, nice_step(top, 5) * math.ceil(top / nice_step(top, 5)), 5, "Q")
    plot_frame(g, box, x_axis, y_axis, y_title_inside=True)
    plot_curve(g, box, x_axis, y_axis, f, values)
    f0 = design.resonance.f0_hz
    if f[0] <= f0 <= f[-1]:
        x0 = box.x + float(x_axis.fraction(f0)) * box.width
        g.add(Line(x0, box.y, x0, box.y + box.height, strokeColor=black, strokeWidth=0.7,
                   strokeDashArray=[4, 2]))
        plot_label(g, x0, box.y + box.height + 5, f"f0 {quantity_text(f0, 'Hz')}", MARK_SIZE, "middle",
                bold=True)
    drawing.add(g)
    return drawing
