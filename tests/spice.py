"""ngspice test harness: run AC analyses in batch mode and read back what ngspice measured.

Every number that leaves this module as a measurement was found by ngspice itself
(``meas ac ... MAX``, ``MAX_AT``, ``WHEN``, ``FIND ... AT``); Python only chooses the
sweep windows and passes numbers between runs.  ngspice's interactive ``meas`` keeps
7 significant digits (it prints ``%e`` and re-reads it), so a measured value carries a
rounding error of at most 5e-7 relative.  See tests/reference/ngspice.md.
"""

from __future__ import annotations

import functools
import math
import os
import re
import shutil
import subprocess
import tempfile
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pytest

TIMEOUT_S = 60.0
HALF_POWER_FACTOR = 1.0 / math.sqrt(2.0)  # |H| ratio at the half-power (-3.0103 dB) points

_NAME = re.compile(r"^[a-z][a-z0-9_]*$")


class SpiceError(RuntimeError):
    """ngspice failed, timed out, or did not produce a requested result."""


@dataclass(frozen=True)
class Sweep:
    """One AC sweep: ``ac lin POINTS START STOP`` or ``ac dec POINTS_PER_DECADE START STOP``."""

    kind: str
    points: int
    f_start_hz: float
    f_stop_hz: float

    def __post_init__(self):
        if self.kind not in ("lin", "dec"):
            raise ValueError(f"sweep kind must be 'lin' or 'dec', not {self.kind!r}")
        if self.points < 1 or not 0.0 < self.f_start_hz < self.f_stop_hz:
            raise ValueError(f"bad sweep {self!r}")

    def command(self) -> str:
        return f"ac {self.kind} {self.points} {self.f_start_hz!r} {self.f_stop_hz!r}"


@dataclass(frozen=True)
class AcData:
    """Real vectors written by ngspice's ``wrdata`` over one sweep."""

    frequency_hz: np.ndarray
    vectors: Mapping[str, np.ndarray]


@dataclass(frozen=True)
class ResonanceMeasurement:
    """A resonance as ngspice measured it; ``response_peak`` is in V or A per 1 V (1 A) drive."""

    f_peak_hz: float
    response_peak: float
    f_low_hz: float
    f_high_hz: float
    impedance_at_peak_ohm: float
    f_zero_phase_hz: float | None
    ngspice_version: str

    @property
    def bandwidth_hz(self) -> float:
        return self.f_high_hz - self.f_low_hz


@dataclass(frozen=True)
class BenchCircuit:
    """A netlist body plus the ngspice vectors that measure_resonance needs."""

    topology: str
    body: str
    response: str  # "i(vsense)" (series loop current) or "v(out)" (parallel node voltage)
    port_voltage: str  # voltage across the terminals the source sees, its own Rs excluded
    port_current: str  # current into those terminals
    f_start_hz: float
    f_stop_hz: float


# --------------------------------------------------------------------------- running


def ngspice_path() -> str:
    """The ngspice binary, or skip the calling test when it is not installed."""
    path = shutil.which("ngspice")
    if path is None:
        pytest.skip("ngspice is not installed (Debian/Ubuntu: apt-get install ngspice)")
    return path


@functools.lru_cache(maxsize=1)
def ngspice_version() -> str:
    """The version banner of the installed ngspice, e.g. ``ngspice-39``."""
    done = subprocess.run(
        [ngspice_path(), "-v"], capture_output=True, text=True, timeout=TIMEOUT_S,
        stdin=subprocess.DEVNULL,
    )
    match = re.search(r"ngspice-\S+", done.stdout + done.stderr)
    if match is None:
        raise SpiceError(f"cannot read the ngspice version from:\n{done.stdout}\n{done.stderr}")
    return match.group(0)


def _run(netlist: str, outputs: Sequence[str], timeout_s: float) -> dict[str, str]:
    """Run one netlist with ``ngspice -b`` in a fresh directory; return the named output files."""
    binary = ngspice_path()
    with tempfile.TemporaryDirectory(prefix="sheetgen-spice-") as tmp:
        work = Path(tmp)
        (work / "circuit.cir").write_text(netlist, encoding="ascii")
        env = dict(os.environ, HOME=tmp)  # a user's ~/.spiceinit must not change the run
        try:
            done = subprocess.run(
                [binary, "-b", "circuit.cir"], cwd=work, env=env, capture_output=True,
                text=True, timeout=timeout_s, stdin=subprocess.DEVNULL,
            )
        except subprocess.TimeoutExpired as exc:
            raise SpiceError(
                f"ngspice did not finish within {timeout_s} s\n--- netlist ---\n{netlist}"
            ) from exc
        texts = {}
        for name in outputs:
            path = work / name
            texts[name] = path.read_text(encoding="ascii") if path.exists() else ""
    trouble = re.findall(r"^.*\b(?:error|fatal)\b.*$", done.stdout + done.stderr, re.I | re.M)
    if done.returncode != 0 or trouble:
        raise SpiceError(
            f"ngspice failed (exit {done.returncode})\n--- stderr ---\n{done.stderr}"
            f"\n--- stdout ---\n{done.stdout}\n--- netlist ---\n{netlist}"
        )
    return texts


def _deck(body: str, sweep: Sweep, lets: Mapping[str, str], tail: Sequence[str]) -> str:
    for name in lets:
        if not _NAME.match(name):
            raise ValueError(f"vector name {name!r} must be lower-case letters, digits, _")
    lines = ["* sheetgen test bench", body.strip(), ".control", "set numdgt=15", sweep.command()]
    lines += [f"let {name} = {expr}" for name, expr in lets.items()]
    lines += list(tail)
    lines += ["quit", ".endc", ".end", ""]
    return "\n".join(lines)


def ac_sweep(
    netlist_body: str, sweep: Sweep, lets: Mapping[str, str], timeout_s: float = TIMEOUT_S
) -> AcData:
    """Run one AC sweep and return the real vectors ``lets`` defines (e.g. ``mag(v(out))``)."""
    names = list(lets)
    tail = ["set wr_singlescale", "set wr_vecnames", f"wrdata sweep.txt {' '.join(names)}"]
    text = _run(_deck(netlist_body, sweep, lets, tail), ["sweep.txt"], timeout_s)["sweep.txt"]
    rows = text.strip().splitlines()
    header = rows[0].split() if rows else []
    if header != ["frequency", *names]:
        raise SpiceError(f"unexpected wrdata output for {names}:\n{text[:2000]}")
    table = np.array([[float(x) for x in row.split()] for row in rows[1:]])
    vectors = {name: table[:, k + 1] for k, name in enumerate(names)}
    return AcData(frequency_hz=table[:, 0], vectors=vectors)


def ac_measure(
    netlist_body: str,
    sweep: Sweep,
    lets: Mapping[str, str],
    measures: Mapping[str, str],
    timeout_s: float = TIMEOUT_S,
) -> dict[str, float]:
    """Run one AC sweep and ngspice ``meas ac NAME SPEC`` for each item; return the results."""
    tail = []
    for name, spec in measures.items():
        if not _NAME.match(name):
            raise ValueError(f"measure name {name!r} must be lower-case letters, digits, _")
        tail += [f"meas ac {name} {spec}", f"print {name} >> meas.txt"]
    deck = _deck(netlist_body, sweep, lets, tail)
    text = _run(deck, ["meas.txt"], timeout_s)["meas.txt"]
    found = {}
    for line in text.splitlines():
        match = re.match(r"^\s*(\w+)\s*=\s*(\S+)\s*$", line)
        if match:
            found[match.group(1).lower()] = float(match.group(2))
    missing = [name for name in measures if name not in found]
    if missing:
        raise SpiceError(f"ngspice measured nothing for {missing}\n--- netlist ---\n{deck}")
    return {name: found[name] for name in measures}


# --------------------------------------------------------------------------- resonance


def _last_below(freq, values, level, before_hz):
    """Largest index with freq < before_hz and values < level, or None."""
    idx = np.nonzero((freq < before_hz) & (values < level))[0]
    return int(idx[-1]) if idx.size else None


def _first_below(freq, values, level, after_hz):
    idx = np.nonzero((freq > after_hz) & (values < level))[0]
    return int(idx[0]) if idx.size else None


def measure_resonance(
    netlist_body: str,
    response: str,
    *,
    port_voltage: str,
    port_current: str,
    f_start_hz: float,
    f_stop_hz: float,
    zero_phase: bool = False,
    coarse_points_per_decade: int = 400,
    fine_points: int = 4001,
    timeout_s: float = TIMEOUT_S,
) -> ResonanceMeasurement:
    """Measure a resonance with ngspice: peak of |response|, half-power points, |Z| at the peak.

    ``response`` is an ngspice vector such as ``v(out)`` or ``i(vsense)`` (a 0 V source);
    the impedance is ``port_voltage / port_current``.  With ``zero_phase`` also the
    frequency where that impedance's phase crosses zero.  Passes: a coarse ``dec`` sweep
    over [f_start_hz, f_stop_hz] to locate; two ``lin`` zooms for ``MAX``/``MAX_AT``;
    a ``lin`` sweep across each half-power crossing (``WHEN``, ngspice interpolates
    linearly) and, if asked, across the phase crossing; ``FIND ... AT`` for |Z|.
    """
    lets = {
        "resp": f"mag({response})",
        "zmag": f"mag({port_voltage}/{port_current})",
        "zph": f"ph({port_voltage}/{port_current})",
    }
    coarse = ac_sweep(
        netlist_body, Sweep("dec", coarse_points_per_decade, f_start_hz, f_stop_hz),
        lets, timeout_s,
    )
    freq, resp = coarse.frequency_hz, coarse.vectors["resp"]
    top = int(np.argmax(resp))
    if top == 0 or top == freq.size - 1:
        raise SpiceError(
            f"|{response}| has no maximum inside {f_start_hz!r}..{f_stop_hz!r} Hz "
            f"(largest at the sweep's end, {freq[top]!r} Hz); widen the sweep"
        )

    # Zoom twice on the maximum: the true peak of a one-humped response lies between the
    # neighbours of the largest sample.
    lo_hz, hi_hz = float(freq[top - 1]), float(freq[top + 1])
    for _ in range(2):
        peak = ac_measure(
            netlist_body, Sweep("lin", fine_points, lo_hz, hi_hz), lets,
            {"peak": "MAX resp", "fpeak": "MAX_AT resp"}, timeout_s,
        )
        step_hz = (hi_hz - lo_hz) / (fine_points - 1)
        lo_hz = max(lo_hz, peak["fpeak"] - 2.0 * step_hz)
        hi_hz = min(hi_hz, peak["fpeak"] + 2.0 * step_hz)
    f_peak_hz, response_peak = peak["fpeak"], peak["peak"]
    level = response_peak * HALF_POWER_FACTOR

    low = _last_below(freq, resp, level, f_peak_hz)
    high = _first_below(freq, resp, level, f_peak_hz)
    if low is None or high is None:
        raise SpiceError(
            f"|{response}| does not fall to the half-power level {level!r} on both sides of "
            f"{f_peak_hz!r} Hz within {f_start_hz!r}..{f_stop_hz!r} Hz; widen the sweep"
        )
    low_end_hz = min(float(freq[low + 1]), f_peak_hz)
    high_start_hz = max(float(freq[high - 1]), f_peak_hz)
    f_low_hz = ac_measure(
        netlist_body, Sweep("lin", fine_points, float(freq[low]), low_end_hz), lets,
        {"flow": f"WHEN resp={level!r} RISE=1"}, timeout_s,
    )["flow"]
    f_high_hz = ac_measure(
        netlist_body, Sweep("lin", fine_points, high_start_hz, float(freq[high])), lets,
        {"fhigh": f"WHEN resp={level!r} FALL=1"}, timeout_s,
    )["fhigh"]

    # |Z| at the peak: FIND interpolates between the samples of a sweep around f_peak.
    half_hz = 1e-3 * f_peak_hz
    impedance_ohm = ac_measure(
        netlist_body, Sweep("lin", 2001, f_peak_hz - half_hz, f_peak_hz + half_hz), lets,
        {"zpeak": f"FIND zmag AT={f_peak_hz!r}"}, timeout_s,
    )["zpeak"]

    f_zero_phase_hz = None
    if zero_phase:
        phase = coarse.vectors["zph"]
        flips = np.nonzero(np.sign(phase[:-1]) != np.sign(phase[1:]))[0]
        if flips.size == 0:
            raise SpiceError(f"the phase of {port_voltage}/{port_current} never crosses zero")
        k = int(flips[np.argmin(np.abs(freq[flips] - f_peak_hz))])
        f_zero_phase_hz = ac_measure(
            netlist_body, Sweep("lin", fine_points, float(freq[k]), float(freq[k + 1])), lets,
            {"fzero": "WHEN zph=0 CROSS=1"}, timeout_s,
        )["fzero"]

    return ResonanceMeasurement(
        f_peak_hz=f_peak_hz,
        response_peak=response_peak,
        f_low_hz=f_low_hz,
        f_high_hz=f_high_hz,
        impedance_at_peak_ohm=impedance_ohm,
        f_zero_phase_hz=f_zero_phase_hz,
        ngspice_version=ngspice_version(),
    )


def measure_bench(bench: BenchCircuit, zero_phase: bool | None = None) -> ResonanceMeasurement:
    """measure_resonance on a built circuit; zero phase is measured for parallel ones by default."""
    return measure_resonance(
        bench.body, bench.response,
        port_voltage=bench.port_voltage, port_current=bench.port_current,
        f_start_hz=bench.f_start_hz, f_stop_hz=bench.f_stop_hz,
        zero_phase=(bench.topology == "parallel") if zero_phase is None else zero_phase,
    )


# --------------------------------------------------------------------------- netlists


def _value(x: float) -> str:
    if not (math.isfinite(x) and x > 0.0):
        raise ValueError(f"component value must be a positive finite float, not {x!r}")
    return repr(float(x))


def _path(start: str, end: str, prefix: str, elements: Sequence[tuple[str, float | None]]):
    """Netlist lines for elements in series from start to end; None or 0 Ω resistors left out."""
    kept = [(name, value) for name, value in elements if not (name[0] == "r" and not value)]
    nodes = [start] + [f"{prefix}{k}" for k in range(1, len(kept))] + [end]
    return [
        f"{name} {nodes[k]} {nodes[k + 1]} {_value(value)}"
        for k, (name, value) in enumerate(kept)
    ]


def _sweep_limits(inductance_h: float, capacitance_f: float) -> tuple[float, float]:
    f0_hz = 1.0 / (2.0 * math.pi * math.sqrt(inductance_h * capacitance_f))
    return f0_hz / 30.0, f0_hz * 30.0


def series_netlist(
    inductance_h: float,
    inductor_resistance_ohm: float,
    capacitance_f: float,
    capacitor_esr_ohm: float,
    source_resistance_ohm: float | None = None,
    load_resistance_ohm: float | None = None,
) -> BenchCircuit:
    """1 V AC source, Rs, then one loop of L, rL, C, rC and the load RL; response = loop current."""
    lines = ["vdrive src 0 dc 0 ac 1"]
    port = "src"
    if source_resistance_ohm:
        lines.append(f"rsource src port {_value(source_resistance_ohm)}")
        port = "port"
    lines.append(f"vsense {port} loop0 dc 0")
    lines += _path("loop0", "0", "loop", [
        ("lcoil", inductance_h), ("rcoil", inductor_resistance_ohm),
        ("ccap", capacitance_f), ("rcap", capacitor_esr_ohm),
        ("rload", load_resistance_ohm),
    ])
    f_start_hz, f_stop_hz = _sweep_limits(inductance_h, capacitance_f)
    return BenchCircuit(
        topology="series",
        body="\n".join(lines),
        response="i(vsense)",
        port_voltage=f"v({port})",
        port_current="i(vsense)",
        f_start_hz=f_start_hz,
        f_stop_hz=f_stop_hz,
    )


def parallel_netlist(
    inductance_h: float,
    inductor_resistance_ohm: float,
    capacitance_f: float,
    capacitor_esr_ohm: float,
    source_resistance_ohm: float | None = None,
    load_resistance_ohm: float | None = None,
) -> BenchCircuit:
    """Tank (L + rL) ∥ (C + rC) ∥ RL on node out; 1 V through Rs, or 1 A when Rs is None."""
    if source_resistance_ohm is None:
        lines = ["idrive 0 feed dc 0 ac 1"]  # pushes 1 A into node feed
    else:
        lines = [
            "vdrive src 0 dc 0 ac 1",
            f"rsource src feed {_value(source_resistance_ohm)}",
        ]
    lines.append("vsense feed out dc 0")
    lines += _path("out", "0", "coil", [
        ("lcoil", inductance_h), ("rcoil", inductor_resistance_ohm),
    ])
    lines += _path("out", "0", "cap", [("ccap", capacitance_f), ("rcap", capacitor_esr_ohm)])
    if load_resistance_ohm is not None:
        lines.append(f"rload out 0 {_value(load_resistance_ohm)}")
    f_start_hz, f_stop_hz = _sweep_limits(inductance_h, capacitance_f)
    return BenchCircuit(
        topology="parallel",
        body="\n".join(lines),
        response="v(out)",
        port_voltage="v(out)",
        port_current="i(vsense)",
        f_start_hz=f_start_hz,
        f_stop_hz=f_stop_hz,
    )
