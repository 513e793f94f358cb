"""The circuit as analysed, written as a plain SPICE netlist an engineer can check.

Nominal values; each coil's loss and each capacitor's ESR as a series resistor at the
working frequency (a fixed SPICE resistor, as the analysis holds it); a coupling of two
coils as a K statement; an ideal turns ratio as a voltage-controlled voltage source on the
primary and a current-controlled current source on the secondary (E and F elements); a
1 V (or 1 A) AC source. An AC sweep across the half-power points and `.meas` statements
named f_peak, f_low and f_high (the frequency of the response maximum and the −3 dB points
of the response the results report), so that `ngspice -b FILE` prints those figures.
SPICE has no expression for "the peak over √2" inside a netlist, so the −3 dB level is
written as a number (sheetgen's |response| at the maximum over √2) and `response_peak`
measures SPICE's own maximum beside it, to compare.
"""

from __future__ import annotations

import math

from sheetgen.design.records import Design
from sheetgen.engine.network import (
    GROUND,
    Capacitor,
    Coil,
    MutualCoupling,
    Network,
    Resistor,
    TurnsRatio,
    solve,
)

SWEEP_POINTS = 20001  # across the −3 dB points: a step of about 1/10,000 of the span
SENSE = "VSENSE"  # a 0 V source in series with the part whose current is the response
SENSED = "isense"  # a node whose voltage is that current (H element, 1 V per ampere)


def _number(value: float) -> str:
    return repr(float(value))


def _element(letter: str, name: str) -> str:
    """A SPICE element name of the right type letter for a part's designator."""
    clean = "".join(ch if ch.isalnum() else "_" for ch in name)
    return clean if clean[:1].upper() == letter else f"{letter}_{clean}"


def _node(name: str) -> str:
    return "0" if name == GROUND else "".join(ch if ch.isalnum() else "_" for ch in name)


def network_lines(network: Network) -> tuple[list[str], str]:
    """The element lines of the network with its unit source, and the SPICE expression of
    its response (a node voltage or the current of a 0 V sense source)."""
    lines = []
    response = network.response
    for part in network.parts:
        a, b = (_node(part.a), _node(part.b)) if not isinstance(part, MutualCoupling) else ("", "")
        if isinstance(part, Coil) and response.kind == "current" and part.name == response.part:
            lines.append(f"{SENSE} {a} {a}_sense 0")
            a = f"{a}_sense"
        if isinstance(part, Resistor):
            lines.append(f"{_element('R', part.name)} {a} {b} {_number(part.resistance_ohm)}")
        elif isinstance(part, Capacitor):
            top = a
            if part.esr_ohm:
                top = _node(f"{part.name}_esr")
                lines.append(f"{_element('R', part.name + '_esr')} {a} {top} "
                             f"{_number(part.esr_ohm)}")
            lines.append(f"{_element('C', part.name)} {top} {b} {_number(part.capacitance_f)}")
        elif isinstance(part, Coil):
            mid = _node(f"{part.name}_loss")
            lines.append(f"{_element('L', part.name)} {a} {mid} {_number(part.inductance_h)}")
            lines.append(f"{_element('R', part.name + '_loss')} {mid} {b} "
                         f"{_number(part.resistance_ohm or 1e-12)}")
            if part.self_capacitance_f:
                lines.append(f"{_element('C', part.name + '_self')} {a} {b} "
                             f"{_number(part.self_capacitance_f)}")
        elif isinstance(part, MutualCoupling):
            lines.append(f"{_element('K', part.name)} {_element('L', part.first)} "
                         f"{_element('L', part.second)} {_number(part.k)}")
        elif isinstance(part, TurnsRatio):
            # V(a,b) = n·V(c,d); the primary current flows a → sense → b; the secondary
            # winding carries −n times it from c to d (an F source from d to c).
            sense = _element("V", part.name + "_primary")
            inner = _node(f"{part.name}_primary")
            lines.append(f"{_element('E', part.name)} {_node(part.a)} {inner} {_node(part.c)} "
                         f"{_node(part.d)} {_number(part.ratio)}")
            lines.append(f"{sense} {inner} {_node(part.b)} 0")
            lines.append(f"{_element('F', part.name)} {_node(part.d)} {_node(part.c)} {sense} "
                         f"{_number(part.ratio)}")
    source = network.source
    node = _node(source.node)
    if source.kind == "voltage":
        if source.resistance_ohm is None:
            lines.insert(0, f"VGEN {node} 0 AC 1")
        else:
            lines.insert(0, "VGEN gen 0 AC 1")
            lines.insert(1, f"{_element('R', source.name or 'SOURCE')} gen {node} "
                         f"{_number(source.resistance_ohm)}")
    else:
        lines.insert(0, f"IGEN 0 {node} AC 1")
        if source.resistance_ohm is not None:
            lines.insert(1, f"{_element('R', source.name or 'SOURCE')} {node} 0 "
                         f"{_number(source.resistance_ohm)}")
    if response.kind == "current":  # .meas reads magnitudes of node voltages: vm(node)
        lines.append(f"HSENSE {SENSED} 0 {SENSE} 1")
        return lines, f"vm({SENSED})"
    part = network.part(response.part)
    if part.b == GROUND:
        return lines, f"vm({_node(part.a)})"
    lines.append(f"EPROBE probe 0 {_node(part.a)} {_node(part.b)} 1")
    return lines, "vm(probe)"


def spice_netlist(design: Design) -> str:
    """The design's circuit (design.model) as a SPICE netlist with its sweep and measures."""
    network = design.model.network
    res = design.resonance
    job = design.job
    lines, response = network_lines(network)
    peak = abs(complex(_response_value(network, res.f_peak_hz)))
    what = ("loop current through " if network.response.kind == "current"
            else "voltage across ") + network.response.part
    unit = "A per volt of EMF" if network.source.kind == "voltage" else "V per ampere"
    if network.response.kind == "current" and network.source.kind == "current":
        unit = "A per ampere"
    header = [
        f"* sheetgen netlist: {job.sheet.id} revision {job.sheet.revision}: {job.sheet.title}",
        f"* the circuit as analysed: nominal values; coil loss and capacitor ESR as series "
        f"resistors at f0 = {res.f0_hz:.9g} Hz",
        f"* response: {what} ({unit}); unit AC source",
    ]
    if res.f_low_hz is not None and res.f_high_hz is not None:
        bandwidth = res.f_high_hz - res.f_low_hz
        start = max(res.f_low_hz - 0.5 * bandwidth, 0.5 * res.f_low_hz)
        stop = res.f_high_hz + 0.5 * bandwidth
    else:
        start, stop = res.f_peak_hz / 3.0, res.f_peak_hz * 3.0
    level = peak / math.sqrt(2.0)
    measures = [
        f".ac lin {SWEEP_POINTS} {_number(start)} {_number(stop)}",
        ".save all",
        f".meas ac response_peak MAX {response}",
        f".meas ac f_peak MAX_AT {response}",
    ]
    if res.f_low_hz is not None and res.f_high_hz is not None:
        measures += [
            f"* -3 dB level: sheetgen's |response| at the maximum, {peak!r}, over sqrt(2)",
            f".meas ac f_low WHEN {response}={_number(level)} RISE=1",
            f".meas ac f_high WHEN {response}={_number(level)} FALL=1",
        ]
    text = "\n".join([*header, *lines, *measures, ".end", ""])
    return text.encode("ascii", "replace").decode("ascii")  # plain ASCII for any simulator


def _response_value(network: Network, f_hz: float):
    return solve(network, f_hz).response()
