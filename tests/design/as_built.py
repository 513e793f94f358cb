"""A unit built exactly as its sheet says, on the test set-up the sheet prescribes, as an
ngspice netlist (test helper).

The part values come from the results contract's components (the L built, the C fitted);
a link or tap is modelled as an ideal transformer of the BUILT turns ratio M/N loaded by
the receiver's port network — an E/F controlled-source pair: E makes the secondary
voltage (M/N)·V_tank, F draws (M/N)·I_secondary from the tank (SPICE's textbook ideal
transformer, exact at every frequency and with no magnetising inductance). ngspice then
presents the load to the tank on its own; nothing here takes the engine's load figure.

The capacitance is what is fitted (fixed parts and the trimmer setting) plus what a built
unit has across it anyway: in a parallel tank the coil's self-capacitance (the results'
inductor.self_capacitance_f: Medhurst's for a solenoid, the job's for a ring); the wiring
strays in both topologies.

The test set-up is built from the results' test_record.fixture as a technician would wire
it, part by part, each instrument a 1 V source behind 50 Ω or a 50 Ω input:
- a fixture resistor R with the parasitics the sheet states for it: its leads' L in series
  with R ∥ its shunt C (the usual lumped model), in series with the port or across it;
- a transformer of turns (circuit side a, port side b): the same E/F ideal transformer,
  ratio a/b;
- a coupling capacitor: Cc in series from the port to the tank's hot end;
- an active probe: its input R ∥ C across the tank, its output (the tank voltage times a
  constant gain) read directly.
The response is the voltage at the receiver's own 50 Ω input (what the bench reads).
"""

from __future__ import annotations

from tests import spice

PORT_OHM = 50.0


def as_built_bench(results: dict, parasitics: bool = True) -> spice.BenchCircuit:
    """The netlist of the unit as its sheet says to build it, on its test set-up
    (results["bleeder_ohm"], when set by the caller from the parts list, adds the bleeder
    across the tank). parasitics=False: the fixture resistors ideal, for comparing with
    the engine's figures exactly."""
    parts = results["components"]
    inductor = results["inductor"]
    fixture = results["test_record"]["fixture"]
    across = parts.get("capacitance_across") or {}
    capacitance = parts["capacitor_build"]["built_f"] + (across.get("stray_f") or 0.0)
    series = results["topology"] == "series"
    if not series:
        capacitance += (inductor.get("self_capacitance_f") or 0.0) + (across.get("probe_f")
                                                                      or 0.0)
    lines = ["vdrive src 0 dc 0 ac 1", f"rgen src gport {PORT_OHM!r}"]
    source = fixture["source"]
    lines += _source_network(source, "gport", "feed", parasitics)
    lines.append("vsense feed hot dc 0")
    coil = [f"lcoil hot c1 {parts['inductance_h']!r}",
            f"rcoil c1 c2 {_positive(parts['inductor_resistance_ohm'])!r}"]
    if series:  # one loop: coil, capacitor, then the receiver side to the cold end
        lines += coil + [f"ccap c2 c3 {capacitance!r}",
                         f"rcap c3 end {_positive(parts['capacitor_esr_ohm'])!r}"]
        tank = "end"
    else:
        lines += [f"lcoil hot c1 {parts['inductance_h']!r}",
                  f"rcoil c1 0 {_positive(parts['inductor_resistance_ohm'])!r}",
                  f"ccap hot k1 {capacitance!r}",
                  f"rcap k1 0 {_positive(parts['capacitor_esr_ohm'])!r}"]
        tank = "hot"
    bleeder = results.get("bleeder_ohm")
    if bleeder is not None:  # across the capacitor, i.e. across the tank
        assert not series, "a series bleeder is not modelled here"
        lines.append(f"rbleed hot 0 {float(bleeder)!r}")
    found = fixture["receiver"]
    coupling = _coupling(inductor)
    if coupling is not None:  # the receiver on the link's or tap's secondary
        ratio = coupling
        lines += [f"elink sec 0 {tank} 0 {ratio!r}", "vlinksense sec secx dc 0",
                  f"flink {tank} 0 vlinksense {ratio!r}"]
        lines += _receiver_network(found, "secx", "rport", parasitics)
    else:
        lines += _receiver_network(found, tank, "rport", parasitics)
    response = "v(rport)"
    f_start, f_stop = spice._sweep_limits(parts["inductance_h"], capacitance)
    return spice.BenchCircuit(results["topology"], "\n".join(lines), response,
                              "v(hot)" if not series else "v(feed)", "i(vsense)",
                              f_start, f_stop)


def _positive(value: float) -> float:
    return value if value > 0 else 1e-9


def _coupling(inductor: dict) -> float | None:
    """The link's or tap's built ratio M/N, or None."""
    turns = inductor.get("turns")
    for key in ("link_turns", "tap_turns"):
        if inductor.get(key) is not None:
            return inductor[key] / turns
    return None


def _resistor(name: str, a: str, b: str, port: dict, parasitics: bool) -> list[str]:
    """R with the parasitics the sheet states: leads' L in series with R ∥ C."""
    r = port["resistor_ohm"]
    if not parasitics:
        return [f"r{name} {a} {b} {r!r}"]
    c, inductance = port["resistor_shunt_capacitance_f"], port["resistor_lead_inductance_h"]
    return [f"l{name} {a} {name}m {inductance!r}", f"r{name} {name}m {b} {r!r}",
            f"c{name} {name}m {b} {c!r}"]


def _source_network(port: dict, at: str, feed: str, parasitics: bool) -> list[str]:
    """From the generator's port node `at` to the circuit's source terminal `feed`."""
    kind = port["hookup"]
    if kind == "direct":
        return [f"vdirect {at} {feed} dc 0"]
    if kind == "series_resistor":
        return _resistor("fxs", at, feed, port, parasitics)
    if kind == "shunt_resistor":
        return _resistor("fxs", at, "0", port, parasitics) + [f"vshunt {at} {feed} dc 0"]
    if kind == "coupling_capacitor":
        return [f"ccoup {at} {feed} {port['capacitance_f']!r}"]
    if kind == "transformer":  # circuit side a turns in the loop, port side b turns
        a, b = port["turns"]
        ratio = a / b
        return [f"etxs {feed}e 0 {at} 0 {ratio!r}", f"vtxs {feed}e {feed} dc 0",
                f"ftxs {at} 0 vtxs {ratio!r}"]
    raise ValueError(f"no source hookup {kind!r}")


def _receiver_network(port: dict, at: str, node: str, parasitics: bool) -> list[str]:
    """From the circuit's receiver terminal `at` to ground, with the receiver's 50 Ω input
    at `node` (the response is v(node))."""
    kind = port["hookup"]
    load = f"rinput {node} 0 {PORT_OHM!r}"
    if kind == "direct":
        return [f"vdirectr {at} {node} dc 0", load]
    if kind == "series_resistor":
        return _resistor("fxr", at, node, port, parasitics) + [load]
    if kind == "shunt_resistor":
        return _resistor("fxr", at, "0", port, parasitics) + [f"vshuntr {at} {node} dc 0", load]
    if kind == "probe":  # input R ∥ C across the tank; its output follows the tank voltage
        return [f"rprobe {at} 0 {port['presented_ohm']!r}",
                f"cprobe {at} 0 {port['capacitance_f']!r}",
                f"eprobe {node} 0 {at} 0 0.1", load]
    if kind == "transformer":  # circuit side a turns carries the loop current to ground
        a, b = port["turns"]
        ratio = a / b
        return [f"vtxr {at} {at}e dc 0", f"etxr {at}e 0 {node} 0 {ratio!r}",
                f"ftxr 0 {node} vtxr {ratio!r}", load]
    raise ValueError(f"no receiver hookup {kind!r}")


def inside(value: float, low: float, high: float, what: str) -> None:
    assert low <= value <= high, f"{what}: measured {value!r} outside the window {low!r}…{high!r}"


def assert_inside_windows(measured: spice.ResonanceMeasurement, lim: dict, where: str) -> None:
    """Every frequency feature ngspice measured, and the loaded Q, inside the sheet's
    windows (results' limits)."""
    centre = 0.5 * (measured.f_low_hz + measured.f_high_hz)
    inside(measured.f_peak_hz, lim["f_peak_min_hz"], lim["f_peak_max_hz"], f"{where} f_peak")
    inside(centre, lim["f_centre_min_hz"], lim["f_centre_max_hz"], f"{where} centre")
    inside(measured.f_low_hz, lim["f_low_min_hz"], lim["f_low_max_hz"], f"{where} f_low")
    inside(measured.f_high_hz, lim["f_high_min_hz"], lim["f_high_max_hz"], f"{where} f_high")
    inside(measured.bandwidth_hz, lim["bandwidth_min_hz"], lim["bandwidth_max_hz"],
           f"{where} bandwidth")
    inside(measured.f_peak_hz / measured.bandwidth_hz, lim["q_loaded_min"],
           lim["q_loaded_max"], f"{where} loaded Q")
