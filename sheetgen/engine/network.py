"""A small linear network of lumped parts between named nodes, solved exactly by modified
nodal analysis (MNA), vectorised over frequencies and Monte Carlo trials.

The unknowns are the node voltages (ground is node "0") and one branch current per coil,
per turns-ratio coupling and for an ideal voltage source (Ho, Ruehli & Brennan, "The
modified nodal approach to network analysis", IEEE Trans. Circuits and Systems 22(6):504,
1975). With G the conductances, C the capacitances, A_L the node–coil incidence, R_L the
coils' series loss and L_M the inductance matrix (M_ij = k_ij·√(L_i L_j) off the diagonal):

    [ G + jωC    A_L              ] [V]   [J]
    [ A_Lᵀ      −(R_L + jω·L_M)   ] [I] = [0]

Every part is stamped so that the matrix is exactly A(ω) = A0 + jω·A1 (a capacitor's ESR
gets an internal node), which makes the derivatives in ω exact and cheap:
x' = −A⁻¹(jA1)x, x'' = −2A⁻¹(jA1)x'. Part values may be numpy arrays (one element per
trial); they broadcast against each other and against the frequencies.

The source drives one node against ground: a voltage of 1 V (EMF) behind its resistance
(entered as its Norton equivalent, J = 1/Rs), an ideal 1 V source, or a current of 1 A
with its resistance across it. Everything returned is per unit of that drive.
Pure: floats and arrays in SI, no words.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

import numpy as np

GROUND = "0"
# Memory bound of one batched solve: trials × frequencies × n² × 16 bytes, split into chunks
# of at most this many bytes (the inverse and the matrix each take one such block).
CHUNK_BYTES = 32 * 2**20


@dataclass(frozen=True)
class Resistor:
    name: str
    a: str
    b: str
    resistance_ohm: float | np.ndarray


@dataclass(frozen=True)
class Capacitor:
    """A capacitor with its equivalent series resistance (ESR)."""

    name: str
    a: str
    b: str
    capacitance_f: float | np.ndarray
    esr_ohm: float | np.ndarray = 0.0


@dataclass(frozen=True)
class Coil:
    """A coil: inductance in series with its loss resistance at the working frequency, and
    its self-capacitance across both."""

    name: str
    a: str
    b: str
    inductance_h: float | np.ndarray
    resistance_ohm: float | np.ndarray = 0.0
    self_capacitance_f: float | np.ndarray = 0.0


@dataclass(frozen=True)
class MutualCoupling:
    """Two coils coupled by k: mutual inductance M = k·√(L1·L2), dots at each coil's `a`."""

    name: str
    first: str
    second: str
    k: float | np.ndarray


@dataclass(frozen=True)
class TurnsRatio:
    """An ideal transformer: V(a, b) = ratio · V(c, d), and the powers in and out equal
    (a winding of N turns at a, b coupled to one of M turns at c, d: ratio = N/M)."""

    name: str
    a: str
    b: str
    c: str
    d: str
    ratio: float | np.ndarray


Part = Resistor | Capacitor | Coil | MutualCoupling | TurnsRatio
SourceKind = Literal["voltage", "current"]
ResponseKind = Literal["voltage", "current"]


@dataclass(frozen=True)
class Source:
    """The drive between `node` and ground: a 1 V EMF behind `resistance_ohm` (None: an
    ideal voltage source), or a 1 A current with `resistance_ohm` across it (None: ideal).
    `name` is the designator of that resistance where the circuit shows it as a part."""

    node: str
    kind: SourceKind = "voltage"
    resistance_ohm: float | np.ndarray | None = None
    name: str | None = None


@dataclass(frozen=True)
class Response:
    """What the response is: the voltage across a part, or the current through it."""

    kind: ResponseKind
    part: str


@dataclass(frozen=True, eq=False)
class Network:
    """Parts between named nodes, the source, the response and the load (a Resistor's name,
    None where the circuit has no load)."""

    parts: tuple[Part, ...]
    source: Source
    response: Response
    load: str | None = None
    index: _Index = field(init=False, repr=False, compare=False)

    def __post_init__(self):
        object.__setattr__(self, "index", _Index.of(self))

    def part(self, name: str) -> Part:
        return self.index.parts[name]

    def with_values(self, **values) -> Network:
        """A copy with some parts' main values replaced: name=value (resistance, capacitance,
        inductance, k or ratio), e.g. for Monte Carlo trials or a trimmer's setting."""
        parts = tuple(_with_main_value(p, values[p.name]) if p.name in values else p
                      for p in self.parts)
        return Network(parts, self.source, self.response, self.load)


_MAIN_VALUE = {Resistor: "resistance_ohm", Capacitor: "capacitance_f", Coil: "inductance_h",
               MutualCoupling: "k", TurnsRatio: "ratio"}


def _with_main_value(part: Part, value) -> Part:
    from dataclasses import replace
    return replace(part, **{_MAIN_VALUE[type(part)]: value})


@dataclass(frozen=True)
class _Index:
    """Where each unknown sits: node voltages first, then the branch currents."""

    nodes: dict[str, int]
    branches: dict[str, int]  # coil, turns-ratio and ideal-source currents
    internal: dict[str, int]  # a capacitor's node between its ESR and its capacitance
    parts: dict[str, Part]
    size: int

    @staticmethod
    def of(network: Network) -> _Index:
        names = [p.name for p in network.parts]
        if len(set(names)) != len(names):
            raise ValueError("every part needs its own name")
        nodes: dict[str, int] = {}

        def add(node: str):
            if node != GROUND and node not in nodes:
                nodes[node] = len(nodes)

        for part in network.parts:
            for node in _terminals(part):
                add(node)
        add(network.source.node)
        internal = {}
        for part in network.parts:
            if isinstance(part, Capacitor) and np.any(np.asarray(part.esr_ohm) != 0.0):
                internal[part.name] = len(nodes) + len(internal)
        size = len(nodes) + len(internal)
        branches = {}
        for part in network.parts:
            if isinstance(part, Coil | TurnsRatio):
                branches[part.name] = size
                size += 1
        if network.source.kind == "voltage" and network.source.resistance_ohm is None:
            branches["__source__"] = size
            size += 1
        parts = dict(zip(names, network.parts, strict=True))
        for part in network.parts:
            if isinstance(part, MutualCoupling):
                for coil in (part.first, part.second):
                    if not isinstance(parts.get(coil), Coil):
                        raise ValueError(f"{part.name} couples {coil}, which is not a coil")
        if network.response.part not in parts:
            raise ValueError(f"the response names {network.response.part}, not a part")
        if network.load is not None and not isinstance(parts.get(network.load), Resistor):
            raise ValueError(f"the load {network.load} is not a resistor of the network")
        return _Index(nodes, branches, internal, parts, size)


def _terminals(part: Part) -> tuple[str, ...]:
    if isinstance(part, TurnsRatio):
        return part.a, part.b, part.c, part.d
    if isinstance(part, MutualCoupling):
        return ()
    return part.a, part.b


def value_shape(network: Network) -> tuple[int, ...]:
    """The broadcast shape of every part value (the trials' shape; () for one circuit)."""
    shapes = [np.shape(v) for part in network.parts for v in _values(part)]
    if network.source.resistance_ohm is not None:
        shapes.append(np.shape(network.source.resistance_ohm))
    return np.broadcast_shapes(*shapes) if shapes else ()


def _values(part: Part):
    if isinstance(part, Resistor):
        return (part.resistance_ohm,)
    if isinstance(part, Capacitor):
        return part.capacitance_f, part.esr_ohm
    if isinstance(part, Coil):
        return part.inductance_h, part.resistance_ohm, part.self_capacitance_f
    if isinstance(part, MutualCoupling):
        return (part.k,)
    return (part.ratio,)


@dataclass(frozen=True)
class Stamps:
    """A(ω) = a0 + jω·a1 and the drive vector b, each of shape trials + (n, n) or (n,)."""

    a0: np.ndarray
    a1: np.ndarray
    b: np.ndarray


def stamps(network: Network) -> Stamps:
    """The MNA matrices of the network (stamping rules of Ho, Ruehli & Brennan, 1975)."""
    ix = network.index
    shape = value_shape(network)
    n = ix.size
    a0 = np.zeros(shape + (n, n))
    a1 = np.zeros(shape + (n, n))
    b = np.zeros(shape + (n,))

    def node(name: str) -> int | None:
        return None if name == GROUND else ix.nodes[name]

    def admittance(matrix, i, j, value):
        for p, q, sign in ((i, i, 1.0), (j, j, 1.0), (i, j, -1.0), (j, i, -1.0)):
            if p is not None and q is not None:
                matrix[..., p, q] += sign * value

    def branch(row, i, j):
        """A branch current at `row` flowing from node i through the part to node j."""
        for k, sign in ((i, 1.0), (j, -1.0)):
            if k is not None:
                a0[..., k, row] += sign
                a0[..., row, k] += sign

    for part in network.parts:
        if isinstance(part, Resistor):
            admittance(a0, node(part.a), node(part.b), 1.0 / np.asarray(part.resistance_ohm))
        elif isinstance(part, Capacitor):
            if part.name in ix.internal:
                mid = ix.internal[part.name]
                admittance(a0, node(part.a), mid, 1.0 / np.asarray(part.esr_ohm))
                admittance(a1, mid, node(part.b), part.capacitance_f)
            else:
                admittance(a1, node(part.a), node(part.b), part.capacitance_f)
        elif isinstance(part, Coil):
            row = ix.branches[part.name]
            branch(row, node(part.a), node(part.b))
            a0[..., row, row] -= part.resistance_ohm
            a1[..., row, row] -= part.inductance_h
            admittance(a1, node(part.a), node(part.b), part.self_capacitance_f)
        elif isinstance(part, TurnsRatio):
            row = ix.branches[part.name]
            ratio = np.asarray(part.ratio, dtype=float)
            # primary current I from a to b; the secondary carries −ratio·I from c to d;
            # constraint V(a) − V(b) − ratio·(V(c) − V(d)) = 0.
            for k, sign in ((node(part.a), 1.0), (node(part.b), -1.0)):
                if k is not None:
                    a0[..., k, row] += sign
                    a0[..., row, k] += sign
            for k, sign in ((node(part.c), -1.0), (node(part.d), 1.0)):
                if k is not None:
                    a0[..., k, row] += sign * ratio
                    a0[..., row, k] += sign * ratio
    for part in network.parts:
        if isinstance(part, MutualCoupling):
            first, second = ix.parts[part.first], ix.parts[part.second]
            mutual = part.k * np.sqrt(np.asarray(first.inductance_h) * second.inductance_h)
            i, j = ix.branches[part.first], ix.branches[part.second]
            a1[..., i, j] -= mutual
            a1[..., j, i] -= mutual
    source = network.source
    k = node(source.node)
    rs = source.resistance_ohm
    if source.kind == "voltage" and rs is None:
        row = ix.branches["__source__"]
        a0[..., k, row] -= 1.0  # the source's current enters the node
        a0[..., row, k] += 1.0
        b[..., row] = 1.0
    else:
        if rs is not None:
            admittance(a0, k, None, 1.0 / np.asarray(rs))
        b[..., k] = 1.0 / np.asarray(rs) if source.kind == "voltage" else 1.0
    return Stamps(a0, a1, b)


@dataclass(frozen=True)
class Solution:
    """The network solved at f_hz: every unknown per unit drive, and its first two
    derivatives in ω where they were asked for. Arrays of shape `shape` + (n,)."""

    network: Network
    f_hz: np.ndarray
    x: np.ndarray
    dx: np.ndarray | None = None
    d2x: np.ndarray | None = None

    def node_voltage(self, node: str, order: int = 0) -> np.ndarray:
        vector = self._vector(order)
        if node == GROUND:
            return np.zeros(vector.shape[:-1], dtype=complex)
        return vector[..., self.network.index.nodes[node]]

    def part_voltage(self, name: str, order: int = 0) -> np.ndarray:
        """Voltage from the part's terminal a to b (the primary's, for a turns ratio)."""
        part = self.network.part(name)
        return self.node_voltage(part.a, order) - self.node_voltage(part.b, order)

    def part_current(self, name: str) -> np.ndarray:
        """Current through the part from a to b (a coil: through its winding, without the
        self-capacitance's share; a turns ratio: its primary)."""
        part = self.network.part(name)
        omega = 2.0 * np.pi * self.f_hz
        v = self.part_voltage(name)
        if isinstance(part, Resistor):
            return v / part.resistance_ohm
        if isinstance(part, Capacitor):
            return v / (part.esr_ohm + 1.0 / (1j * omega * part.capacitance_f))
        return self.x[..., self.network.index.branches[name]]

    def response(self, order: int = 0) -> np.ndarray:
        """The network's response (its part's voltage or current) and its ω-derivatives."""
        wanted = self.network.response
        if wanted.kind == "voltage":
            return self.part_voltage(wanted.part, order)
        part = self.network.part(wanted.part)
        if isinstance(part, Coil | TurnsRatio):
            return self._vector(order)[..., self.network.index.branches[part.name]]
        if order:
            raise ValueError("derivatives of a current are given for coil currents only")
        return self.part_current(part.name)

    def source_voltage(self) -> np.ndarray:
        """The voltage at the source's node (its own resistance excluded)."""
        return self.node_voltage(self.network.source.node)

    def source_current(self) -> np.ndarray:
        """The current the source terminals deliver into the network (after its resistance)."""
        source = self.network.source
        v = self.source_voltage()
        if source.kind == "voltage" and source.resistance_ohm is None:
            return self.x[..., self.network.index.branches["__source__"]]
        drive = 1.0 / source.resistance_ohm if source.kind == "voltage" else 1.0
        shunt = 0.0 if source.resistance_ohm is None else v / source.resistance_ohm
        return drive - shunt

    def source_resistor_current(self) -> np.ndarray:
        """The current in the source's own resistance: (E − V)/Rs in series with a voltage
        source (Thévenin), V/Rs across a current source (Norton)."""
        source = self.network.source
        v = self.source_voltage()
        if source.kind == "voltage":
            return (1.0 - v) / source.resistance_ohm
        return v / source.resistance_ohm

    def input_impedance(self) -> np.ndarray:
        """What the source terminals see, the source's own resistance excluded."""
        return self.source_voltage() / self.source_current()

    def s11(self, reference_ohm=None) -> np.ndarray:
        """Reflection at the source port: (Z_in − R0)/(Z_in + R0), R0 the source resistance."""
        r0 = self.network.source.resistance_ohm if reference_ohm is None else reference_ohm
        z = self.input_impedance()
        return (z - r0) / (z + r0)

    def s21(self) -> np.ndarray:
        """Transmission into the load for a voltage source of resistance Rs and a load RL:
        S21 = 2·V_load/E·√(Rs/RL) (the power-wave definition; equal ports: 2·V_load/E)."""
        source = self.network.source
        if self.network.load is None or source.kind != "voltage" or source.resistance_ohm is None:
            raise ValueError("S21 needs a voltage source with a resistance and a load")
        load = self.network.part(self.network.load)
        return (2.0 * self.part_voltage(load.name)
                * np.sqrt(source.resistance_ohm / load.resistance_ohm))

    def _vector(self, order: int) -> np.ndarray:
        vector = (self.x, self.dx, self.d2x)[order]
        if vector is None:
            raise ValueError(f"derivative of order {order} was not computed")
        return vector


def solve(network: Network, f_hz, *, derivatives: int = 0, per_trial: bool = False) -> Solution:
    """Solve the network at f_hz, per unit drive.

    With per_trial=False, f_hz is a grid shared by every trial: the result has the shape
    trials + f_hz.shape. With per_trial=True, f_hz has (or broadcasts to) the trials' shape,
    one frequency each (what a root finder iterating every trial at once needs).
    `derivatives` (0 to 2): also the ω-derivatives of every unknown. The batch is solved in
    chunks of at most CHUNK_BYTES per matrix block.
    """
    st = stamps(network)
    f = np.asarray(f_hz, dtype=float)
    value_shape = st.a0.shape[:-2]
    if per_trial:
        shape = np.broadcast_shapes(value_shape, f.shape)
        a0 = np.broadcast_to(st.a0, shape + st.a0.shape[-2:])
        a1 = np.broadcast_to(st.a1, shape + st.a1.shape[-2:])
        b = np.broadcast_to(st.b, shape + st.b.shape[-1:])
        omega = np.broadcast_to(2.0 * np.pi * f, shape)
    else:
        shape = value_shape + f.shape
        extra = (np.newaxis,) * f.ndim
        a0 = np.broadcast_to(st.a0[(..., *extra, slice(None), slice(None))],
                             shape + st.a0.shape[-2:])
        a1 = np.broadcast_to(st.a1[(..., *extra, slice(None), slice(None))],
                             shape + st.a1.shape[-2:])
        b = np.broadcast_to(st.b[(..., *extra, slice(None))], shape + st.b.shape[-1:])
        omega = np.broadcast_to(2.0 * np.pi * f, shape)
    f_full = omega / (2.0 * np.pi)
    n = st.b.shape[-1]
    count = math.prod(shape)
    flat = (count, n)
    a0f, a1f = a0.reshape(count, n, n), a1.reshape(count, n, n)
    bf, wf = b.reshape(flat), omega.reshape(count)
    x = np.empty(flat, dtype=complex)
    dx = np.empty(flat, dtype=complex) if derivatives >= 1 else None
    d2x = np.empty(flat, dtype=complex) if derivatives >= 2 else None
    step = max(1, CHUNK_BYTES // (16 * n * n))
    for start in range(0, count, step):
        part = slice(start, start + step)
        jA1 = 1j * a1f[part]
        matrix = a0f[part] + wf[part, None, None] * jA1
        if derivatives == 0:
            x[part] = np.linalg.solve(matrix, bf[part][..., None])[..., 0]
            continue
        inverse = np.linalg.inv(matrix)
        x[part] = _times(inverse, bf[part])
        dx[part] = -_times(inverse, _times(jA1, x[part]))
        if derivatives >= 2:
            d2x[part] = -2.0 * _times(inverse, _times(jA1, dx[part]))
    full = shape + (n,)
    return Solution(network, f_full, x.reshape(full), None if dx is None else dx.reshape(full),
                    None if d2x is None else d2x.reshape(full))


def _times(matrices: np.ndarray, vectors: np.ndarray) -> np.ndarray:
    """A batch of matrix–vector products."""
    return (matrices @ vectors[..., None])[..., 0]
