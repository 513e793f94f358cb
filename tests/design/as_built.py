"""A unit built exactly as its sheet says, as an ngspice netlist (test helper).

The part values come from the results contract's components (the L built, the C fitted);
a link or tap is modelled as an ideal transformer of the BUILT turns ratio M/N loaded by
the job's coupling resistance — an E/F controlled-source pair: E makes the secondary
voltage (M/N)·V_tank, F draws (M/N)·I_secondary from the tank (SPICE's textbook ideal
transformer, exact at every frequency and with no magnetising inductance). ngspice then
presents R·(N/M)² to the tank on its own; nothing here takes the engine's load figure.

The capacitance is what is fitted (fixed parts and the trimmer setting) plus what a built
unit has across it anyway: in a parallel tank the coil's self-capacitance (the results'
inductor.self_capacitance_f: Medhurst's for a solenoid, the job's for a ring); the wiring
strays in both topologies.

The source and the load are the test set-up as the sheet lists it (results'
test_record.fixture): each 50 Ω port with its standard resistor in series (R + 50 Ω) or
across it (R ∥ 50 Ω), worked here by hand from the resistor values.
"""

from __future__ import annotations

from tests import spice


def as_built_bench(results: dict) -> spice.BenchCircuit:
    """The netlist of the unit as its sheet says to build it (results["bleeder_ohm"], when
    set by the caller from the parts list, adds the bleeder across the tank)."""
    parts = results["components"]
    inductor = results["inductor"]
    turns = inductor.get("turns")
    coupling = None
    if inductor.get("link_turns") is not None:
        coupling = inductor["link_turns"], inductor["link_resistance_ohm"]
    elif inductor.get("tap_turns") is not None:
        coupling = inductor["tap_turns"], inductor["tap_resistance_ohm"]
    fixture = results["test_record"]["fixture"]
    source = _port_resistance(fixture["source"], fixture["port_resistance_ohm"])
    at_receiver = _port_resistance(fixture["receiver"], fixture["port_resistance_ohm"])
    if coupling is not None:
        coupling = coupling[0], at_receiver
    load = None if coupling is not None else at_receiver
    across = parts.get("capacitance_across") or {}
    capacitance = parts["capacitor_build"]["built_f"] + (across.get("stray_f") or 0.0)
    if results["topology"] == "parallel":
        capacitance += (inductor.get("self_capacitance_f") or 0.0) + (across.get("probe_f")
                                                                      or 0.0)
    build = spice.series_netlist if results["topology"] == "series" else spice.parallel_netlist
    bench = build(parts["inductance_h"], parts["inductor_resistance_ohm"],
                  capacitance, parts["capacitor_esr_ohm"],
                  source, load)
    lines = []
    bleeder = results.get("bleeder_ohm")
    if bleeder is not None:  # across the capacitor, i.e. across the tank
        assert results["topology"] == "parallel", "a series bleeder is not modelled here"
        lines.append(f"rbleed out 0 {float(bleeder)!r}")
    if coupling is not None:
        m, r = coupling
        ratio = m / turns
        lines += [f"elink sec 0 out 0 {ratio!r}", "vlinksense sec secx dc 0",
                  f"rlink secx 0 {float(r)!r}", f"flink out 0 vlinksense {ratio!r}"]
    if not lines:
        return bench
    return spice.BenchCircuit(bench.topology, bench.body + "\n" + "\n".join(lines),
                              bench.response, bench.port_voltage, bench.port_current,
                              bench.f_start_hz, bench.f_stop_hz)


def _port_resistance(port: dict, port_ohm: float) -> float:
    """What a 50 Ω port with its fixture resistor presents: R + Rp, R ∥ Rp, or Rp."""
    r = port["resistor_ohm"]
    if port["hookup"] == "series_resistor":
        return r + port_ohm
    if port["hookup"] == "shunt_resistor":
        return r * port_ohm / (r + port_ohm)
    return port_ohm
