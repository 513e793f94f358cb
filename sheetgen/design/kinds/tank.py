"""The single resonator (series trap or loop, parallel tank) as a network of its parts.

The network holds exactly the circuit the design analyses (engine/resonance.Circuit): the
coil L1 with its series loss; the fitted capacitors (C1, C2, the trimmer at its setting),
the coil's self-capacitance across a parallel tank and the wiring strays as capacitors of
their own, whose sum is the analysed capacitance; the source's resistance; the load, either
directly or through the link's or tap's ideal turns ratio with its own resistor.

The capacitor's loss is shared so that the parallel parts together are exactly the
analysed C with its ESR: each part of capacitance C_i gets ESR_i = ESR·C/C_i (one time
constant ESR·C for all, the same dissipation factor D = ω·ESR·C, as parts of one
dielectric class have), and Σ jωC_i/(1 + jω·ESR_i·C_i) = jωC/(1 + jω·ESR·C) exactly.
"""

from __future__ import annotations

from sheetgen.design.designators import Designators
from sheetgen.design.kinds import CircuitModel
from sheetgen.design.records import CapacitorChoice, Coupling
from sheetgen.engine.network import (
    GROUND,
    Capacitor,
    Coil,
    Network,
    Resistor,
    Response,
    Source,
    TurnsRatio,
)
from sheetgen.engine.resonance import Circuit
from sheetgen.engine.stress import DriveKind

SELF_CAPACITANCE = "CSELF"  # the coil's self-capacitance, across a parallel tank
STRAYS = "CSTRAY"  # the wiring strays
TAP = "TAP1"  # the tap of L1 as an ideal turns ratio (a link is its own winding, L2)
COUPLING = "CC"  # a capacitor in series with the source (a bench fixture's coupling)
MEASURED = ("f_peak", "f_low", "f_high", "bandwidth")


def tank_model(circuit: Circuit, names: Designators, choice: CapacitorChoice,
               coupling: Coupling | None, drive_kind: DriveKind) -> CircuitModel:
    """The model of a series or parallel resonator as built (see the module's notes)."""
    parallel = circuit.topology == "parallel"
    top = "t" if parallel else "a"  # where the capacitors' upper ends sit
    bottom = GROUND if parallel or circuit.load_resistance_ohm is None else "b"
    feed = "t" if parallel else "in"
    coil = Coil(names.coil, feed, GROUND if parallel else "a", circuit.inductance_h,
                circuit.inductor_resistance_ohm)
    capacitors = _capacitors(circuit, names, choice, top, bottom)
    load_parts = _load(circuit, names, coupling, "t" if parallel else "b")
    current = drive_kind == "current" or (parallel and circuit.source_resistance_ohm is None)
    coupling_parts = ()
    if parallel and circuit.source_capacitance_f is not None:  # the source through Cc
        coupling_parts = (Capacitor(COUPLING, "src", feed, circuit.source_capacitance_f),)
        feed = "src"
    source = Source(feed, "current" if current else "voltage", circuit.source_resistance_ohm,
                    names.source_resistor)
    response = Response("voltage", coil.name) if parallel else Response("current", coil.name)
    load = names.load_resistor if load_parts else None
    network = Network((coil, *capacitors, *coupling_parts, *load_parts), source, response, load)
    open_load = (Network((coil, *capacitors, *coupling_parts), source, response, None)
                 if parallel and load_parts else None)
    built = tuple(p.name for p in network.parts
                  if p.name not in (SELF_CAPACITANCE, STRAYS, TAP, COUPLING))
    return CircuitModel(network, open_load, (names.trimmer,) if names.trimmer else (), built,
                        MEASURED)


def _capacitors(circuit: Circuit, names: Designators, choice: CapacitorChoice, a: str,
                b: str) -> tuple[Capacitor, ...]:
    values = list(zip(names.fixed_capacitors, choice.fixed_parts_f, strict=True))
    if names.trimmer is not None:
        values.append((names.trimmer, choice.trimmer_setting_f))
    across = choice.across
    if across is not None and across.self_capacitance_f > 0.0:
        values.append((SELF_CAPACITANCE, across.self_capacitance_f))
    rest = circuit.capacitance_f - sum(v for _, v in values)  # the strays, and any rounding
    if rest > 1e-12 * circuit.capacitance_f:
        values.append((STRAYS, rest))
    elif values:  # no strays: the last part absorbs the rounding, so the sum is exact
        name, value = values[-1]
        values[-1] = (name, value + rest)
    time_constant = circuit.capacitor_esr_ohm * circuit.capacitance_f
    return tuple(Capacitor(name, a, b, value, time_constant / value) for name, value in values)


def _load(circuit: Circuit, names: Designators, coupling: Coupling | None,
          node: str) -> tuple:
    """The load resistor, directly across `node` or on the link's or tap's turns."""
    if circuit.load_resistance_ohm is None:
        return ()
    if coupling is None:
        return (Resistor(names.load_resistor, node, GROUND, circuit.load_resistance_ohm),)
    name = names.link if coupling.kind == "link" and names.link else TAP
    ratio = coupling.tank_turns / coupling.turns
    return (TurnsRatio(name, node, GROUND, "port", GROUND, ratio),
            Resistor(names.load_resistor, "port", GROUND, coupling.resistance_ohm))
