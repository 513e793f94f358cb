"""Features of a network's exact response, refined to machine precision on the solver.

Each feature is bracketed on a coarse grid (or by widening a bracket geometrically), then
refined by safeguarded Newton iteration in u = ln f (roots.safe_newton) with the exact
ω-derivatives the MNA solve gives, every Monte Carlo trial at once:

* the maximum (or minimum, for a notch) of |H|: where d|H|²/dω = 2·Re(H*·H') = 0;
* the half-power (−3 dB) points: where |H|² = |H_peak|²/2, outwards from the maximum;
* the value at named frequencies (attenuation), the extremes over a band (ripple, worst
  return loss), each an exact solve.

H is a `Quantity` of the solution: the network's response (default), its S11 or its S21.
Pure: arrays in SI, no words.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Literal

import numpy as np

from sheetgen.engine.network import Network, Solution, solve, value_shape
from sheetgen.engine.roots import safe_newton_active

# A quantity: (value, d/dω, d²/dω²) of a complex function of the solution (derivatives None
# when the solution was computed without them).
Quantity = Callable[[Solution], tuple[np.ndarray, np.ndarray | None, np.ndarray | None]]

GRID_POINTS = 64  # the coarse grid that brackets an extremum (per trial)
_FARTHEST_LN = 12.0 * math.log(10.0)  # half-power points looked for up to 12 decades away
_EXPANSIONS = 60  # bracket doublings when widening towards a half-power point


def response_quantity(solution: Solution):
    """The network's own response: a part's voltage or current."""
    return tuple(solution.response(k) if _has(solution, k) else None for k in range(3))


def load_voltage_quantity(solution: Solution):
    """The voltage across the load resistor (∝ S21 for a resistive source and load)."""
    load = solution.network.part(solution.network.load)
    return tuple(solution.part_voltage(load.name, k) if _has(solution, k) else None
                 for k in range(3))


def s21_quantity(solution: Solution):
    """Transmission into the load, S21 = 2·V_load·√(Rs/RL) per volt of EMF (power waves,
    Solution.s21), and its ω-derivatives (the same constant times V_load's)."""
    network = solution.network
    scale = 2.0 * np.sqrt(network.source.resistance_ohm
                          / network.part(network.load).resistance_ohm)
    return tuple(None if v is None else scale * v for v in load_voltage_quantity(solution))


def s11_quantity(solution: Solution):
    """Reflection at the source port, Γ = (Z − R0)/(Z + R0), and its ω-derivatives.

    With the Norton drive J = 1/R0 into the port node, the port current is J − V/R0, so
    Γ = (V − (J − V/R0)·R0)/(V + (J − V/R0)·R0) = 2V/(J·R0) − 1 = 2V − 1 per volt of EMF:
    Γ' = 2V', Γ'' = 2V'' (exact; the port's reference is the source resistance R0).
    """
    source = solution.network.source
    if source.kind != "voltage" or source.resistance_ohm is None:
        raise ValueError("S11 needs a voltage source with a resistance")
    node = source.node
    values = [solution.node_voltage(node, k) if _has(solution, k) else None for k in range(3)]
    return (2.0 * values[0] - 1.0, None if values[1] is None else 2.0 * values[1],
            None if values[2] is None else 2.0 * values[2])


def _has(solution: Solution, order: int) -> bool:
    return (solution.x, solution.dx, solution.d2x)[order] is not None


def evaluate(network: Network, f_hz, quantity: Quantity = response_quantity,
             per_trial: bool = False) -> np.ndarray:
    """The complex quantity at f_hz (a grid shared by the trials, or one per trial)."""
    return quantity(solve(network, f_hz, per_trial=per_trial))[0]


def _slopes(h, h1, h2, f, order: int):
    """|H|² and its u-derivatives (u = ln f) from H and its ω-derivatives."""
    omega = 2.0 * np.pi * f
    power = np.abs(h) ** 2
    s = np.real(np.conj(h) * h1)  # ½ d|H|²/dω
    slope = 2.0 * omega * s
    if order < 2:
        return power, slope, None
    ds_du = omega * (np.abs(h1) ** 2 + np.real(np.conj(h) * h2))
    curvature = 2.0 * omega * s + 2.0 * omega * ds_du
    return power, slope, curvature


def _functional(network: Network, quantity: Quantity):
    """(c, d) with the quantity = c·x + d per unit drive, x the MNA unknowns; None where
    the quantity is not such a fixed combination (e.g. a capacitor's current)."""
    ix = network.index
    c = np.zeros(ix.size)

    def across(part) -> np.ndarray:
        for node, sign in ((part.a, 1.0), (part.b, -1.0)):
            if node in ix.nodes:
                c[ix.nodes[node]] += sign
        return c

    if quantity is response_quantity:
        wanted = network.response
        part = network.part(wanted.part)
        if wanted.kind == "voltage":
            return across(part), 0.0
        if part.name in ix.branches:
            c[ix.branches[part.name]] = 1.0
            return c, 0.0
        return None
    if quantity is load_voltage_quantity:
        return across(network.part(network.load)), 0.0
    if quantity is s21_quantity:
        load = network.part(network.load)
        scale = 2.0 * np.sqrt(network.source.resistance_ohm / load.resistance_ohm)
        if np.ndim(scale):
            return None  # a per-trial constant: not one fixed functional
        return scale * across(load), 0.0
    if quantity is s11_quantity and network.source.node in ix.nodes:
        c[ix.nodes[network.source.node]] = 2.0
        return c, -1.0
    return None


class _Evaluator:
    """The quantity of every trial at per-trial frequencies, for a root finder that asks
    for some trials at a time: through the pole–residue form where it holds
    (engine/network_poles.py: a sum over poles), else by solving those trials' networks."""

    def __init__(self, network: Network, quantity: Quantity, shape: tuple[int, ...],
                 check_hz: float):
        from sheetgen.engine.network_poles import pole_residue
        self.network, self.quantity, self.shape = network, quantity, shape
        self.trials = _Trials(network, shape)
        functional = _functional(network, quantity)
        form = None if functional is None else pole_residue(network, *functional, check_hz)
        if form is not None:
            m = form.poles.shape[-1]
            form = type(form)(np.broadcast_to(form.poles, shape + (m,)),
                              np.broadcast_to(form.residues, shape + (m,)),
                              np.broadcast_to(form.direct, shape))
        self.form = form

    def slopes(self, index, u, order: int):
        f = np.exp(u)
        if self.form is not None:
            return _slopes(*self.form.take(index).at(f, order), f, order)
        return _slopes(*self.quantity(solve(self.trials.take(index), f, derivatives=order,
                                            per_trial=True)), f, order)

    def grid(self, f_hz: np.ndarray) -> np.ndarray:
        """|H| over a grid per trial (f_hz of shape trials + (points,))."""
        if self.form is not None:
            return np.abs(self.form.at(f_hz)[0])
        return np.abs(self.quantity(solve(_expanded(self.network), f_hz, per_trial=True))[0])


@dataclass(frozen=True)
class Extremum:
    """The frequency of an extremum of |H| per trial, and |H| there (NaN where none)."""

    f_hz: np.ndarray
    magnitude: np.ndarray
    curvature: np.ndarray  # d²|H|²/du² there (u = ln f)
    evaluator: _Evaluator | None = field(default=None, repr=False, compare=False)


def extremum(network: Network, low_hz, high_hz, *, kind: Literal["max", "min"] = "max",
             quantity: Quantity = response_quantity, points: int = GRID_POINTS) -> Extremum:
    """The largest (or smallest) |H| between low_hz and high_hz (scalars or one per trial).

    A log-spaced grid of `points` brackets it between the neighbours of the best sample;
    there d|H|²/du changes sign, and safeguarded Newton on it (exact second derivative)
    refines it. Where the best sample is at an end of the range, the extremum is that end
    (no turning point inside): NaN is returned for it.
    """
    value_shape = _trial_shape(network, low_hz, high_hz)
    low_u = np.broadcast_to(np.log(np.asarray(low_hz, dtype=float)), value_shape)
    high_u = np.broadcast_to(np.log(np.asarray(high_hz, dtype=float)), value_shape)
    steps = np.linspace(0.0, 1.0, points)
    grid_u = low_u[..., None] + (high_u - low_u)[..., None] * steps
    check_hz = float(np.exp(np.median(0.5 * (low_u + high_u))))
    evaluator = _Evaluator(network, quantity, value_shape, check_hz)
    grid = evaluator.grid(np.exp(grid_u))  # every trial's own grid, the grid axis last
    best = np.argmax(grid, axis=-1) if kind == "max" else np.argmin(grid, axis=-1)
    inside = (best > 0) & (best < points - 1)
    lo = np.take_along_axis(grid_u, np.clip(best - 1, 0, points - 1)[..., None], -1)[..., 0]
    hi = np.take_along_axis(grid_u, np.clip(best + 1, 0, points - 1)[..., None], -1)[..., 0]
    guess = np.take_along_axis(grid_u, best[..., None], -1)[..., 0]

    def slope(index, u):
        _, first, second = evaluator.slopes(index, u, 2)
        return first, second

    u = safe_newton_active(slope, lo, hi, guess)
    power, _, curvature = evaluator.slopes(np.arange(u.size), u.ravel(), 2)
    power, curvature = power.reshape(u.shape), curvature.reshape(u.shape)
    nan = np.nan
    return Extremum(np.where(inside, np.exp(u), nan), np.where(inside, np.sqrt(power), nan),
                    np.where(inside, curvature, nan), evaluator)


def _trial_shape(network: Network, *arrays) -> tuple[int, ...]:
    return np.broadcast_shapes(value_shape(network), *(np.shape(a) for a in arrays))


def _expanded(network: Network) -> Network:
    """The same network with every array value given a trailing axis of length 1, so that it
    broadcasts against a per-trial grid of frequencies."""
    from dataclasses import fields, replace

    def grow(value):
        return value[..., None] if isinstance(value, np.ndarray) and value.ndim else value

    parts = []
    for part in network.parts:
        changes = {f.name: grow(getattr(part, f.name)) for f in fields(part)
                   if isinstance(getattr(part, f.name), np.ndarray)}
        parts.append(replace(part, **changes) if changes else part)
    source = network.source
    if isinstance(source.resistance_ohm, np.ndarray):
        source = replace(source, resistance_ohm=grow(source.resistance_ohm))
    return Network(tuple(parts), source, network.response, network.load)


class _Trials:
    """The network's trials, flattened, so that a root finder can solve only some of them:
    `take(index)` is the network with every array value cut to those trials."""

    def __init__(self, network: Network, shape: tuple[int, ...]):
        from dataclasses import fields, replace

        def flat(value):
            if isinstance(value, np.ndarray) and value.ndim:
                return np.broadcast_to(value, shape).ravel()
            return value

        self._network = network
        self._parts = []
        for part in network.parts:
            arrays = {f.name: flat(getattr(part, f.name)) for f in fields(part)
                      if isinstance(getattr(part, f.name), np.ndarray)}
            self._parts.append((part, arrays))
        self._source = network.source
        self._source_array = flat(network.source.resistance_ohm)
        self._replace = replace

    def take(self, index: np.ndarray) -> Network:
        parts = tuple(self._replace(part, **{k: v[index] for k, v in arrays.items()})
                      if arrays else part for part, arrays in self._parts)
        source = self._source
        if isinstance(self._source_array, np.ndarray):
            source = self._replace(source, resistance_ohm=self._source_array[index])
        return Network(parts, source, self._network.response, self._network.load)


@dataclass(frozen=True)
class HalfPower:
    """The half-power (−3 dB) points either side of a maximum, NaN where none."""

    f_low_hz: np.ndarray
    f_high_hz: np.ndarray

    @property
    def bandwidth_hz(self) -> np.ndarray:
        return self.f_high_hz - self.f_low_hz


def half_power_points(network: Network, peak: Extremum,
                      quantity: Quantity = response_quantity) -> HalfPower:
    """Where |H|² = |H_peak|²/2, the first crossing below and above the maximum.

    From the curvature at the peak, |H|² ≈ P + ½κ(u − u_p)², so each point starts at
    u_p ± √(P/|κ|); the bracket is widened geometrically (to 12 decades at most) until
    |H|² is below the target at its outer end, then refined by safeguarded Newton.
    """
    u_peak = np.log(peak.f_hz)
    target = 0.5 * peak.magnitude ** 2
    with np.errstate(divide="ignore", invalid="ignore"):
        offset = np.sqrt(peak.magnitude ** 2 / np.abs(peak.curvature))
    offset = np.clip(np.nan_to_num(offset, nan=0.1, posinf=0.1), 1e-12, _FARTHEST_LN)

    evaluator = peak.evaluator
    if (evaluator is None or evaluator.network is not network or evaluator.quantity is not quantity
            or evaluator.shape != np.shape(u_peak)):
        finite = np.isfinite(u_peak)
        check_hz = float(np.exp(np.median(u_peak[finite]))) if np.any(finite) else 1.0
        evaluator = _Evaluator(network, quantity, np.shape(u_peak), check_hz)
    flat_target = np.ravel(target)

    def excess(index, u):
        power, slope, _ = evaluator.slopes(index, u, 1)
        return flat_target[index] - power, -slope

    def side(sign: float) -> np.ndarray:
        edge = np.ravel(u_peak + sign * offset).copy()
        every = np.arange(edge.size)
        short = np.isfinite(np.ravel(u_peak))
        for _ in range(_EXPANSIONS):
            index = every[short]
            if index.size == 0:
                break
            below = excess(index, edge[index])[0] > 0
            short[index[below]] = False
            wider = np.ravel(u_peak)[index] + np.clip(
                2.0 * (edge[index] - np.ravel(u_peak)[index]), -_FARTHEST_LN, _FARTHEST_LN)
            edge[index] = np.where(below, edge[index], wider)
        edge = edge.reshape(np.shape(u_peak))
        found = excess(every, np.ravel(np.nan_to_num(edge)))[0].reshape(np.shape(u_peak)) > 0
        low, high = (edge, u_peak) if sign < 0 else (u_peak, edge)
        guess = u_peak + sign * np.minimum(offset, 0.999 * np.abs(edge - u_peak))
        u = safe_newton_active(excess, np.nan_to_num(low), np.nan_to_num(high),
                               np.nan_to_num(guess))
        return np.where(found & np.isfinite(u_peak), np.exp(u), np.nan)

    return HalfPower(side(-1.0), side(+1.0))


@dataclass(frozen=True)
class BandExtremes:
    """The largest and smallest |H| over a band, each refined where it is a turning point."""

    low_hz: np.ndarray
    high_hz: np.ndarray
    maximum: np.ndarray
    minimum: np.ndarray


def band_extremes(network: Network, low_hz, high_hz, quantity: Quantity = response_quantity,
                  points: int = 4 * GRID_POINTS) -> BandExtremes:
    """max and min of |H| over [low_hz, high_hz], ends included: the grid's best samples,
    refined to the turning point where one lies inside (passband ripple, worst |S11|)."""
    top = extremum(network, low_hz, high_hz, kind="max", quantity=quantity, points=points)
    bottom = extremum(network, low_hz, high_hz, kind="min", quantity=quantity, points=points)
    ends = np.abs(np.stack([evaluate(network, low_hz, quantity, per_trial=True),
                            evaluate(network, high_hz, quantity, per_trial=True)]))
    maximum = np.fmax(top.magnitude, ends.max(axis=0))
    minimum = np.fmin(bottom.magnitude, ends.min(axis=0))
    return BandExtremes(np.asarray(low_hz), np.asarray(high_hz), maximum, minimum)


def loss_db(network: Network, f_hz, per_trial: bool = False) -> np.ndarray:
    """Insertion loss (attenuation) at f_hz, −20·log10|S21|: at f0, at named frequencies
    (an image, an IF, a harmonic) or over a grid."""
    return -decibels(evaluate(network, f_hz, s21_quantity, per_trial=per_trial))


def decibels(magnitude) -> np.ndarray:
    """20·log10|H|."""
    with np.errstate(divide="ignore"):
        return 20.0 * np.log10(np.abs(magnitude))
