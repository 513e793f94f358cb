"""A quick job for `sheetgen check`: only the circuit and its parts, the rest assumed.

`check` answers a quick question ("f0 of 50 µH and 40 pF with 22 Ω") without a sheet
identity, a drive or a loss for every part; `build` still requires them all. What is
filled in is returned beside the job as `Assumed` entries, so the output can say so.
"""

from __future__ import annotations

import datetime
import os
from dataclasses import dataclass
from pathlib import Path

from sheetgen.inputs.model import Job
from sheetgen.inputs.reader import (
    JOB_FILE_HINT,
    MAX_JOB_BYTES,
    compose_located,
    read_yaml_text,
    validate_located,
)

QUICK_DRIVE_V = 1.0  # a unit drive, so stresses read as "per volt" (open-circuit, rms)
QUICK_DRIVE_A = 1e-3  # a parallel tank's ideal source is a current: "per milliampere"
DRIVE_FIELDS = ("source.voltage", "source.current")
QUICK_SHEET_ID = "QUICK-CHECK"


@dataclass(frozen=True)
class Assumed:
    """A field the quick job left out, and the value the check takes for it."""

    field: str
    value: str
    why: str


def load_quick_job(path: str | os.PathLike) -> tuple[Job, tuple[Assumed, ...]]:
    """Read a job whose sheet identity, drive and part losses may be left out; fill each
    with a stated default (identity: placeholders; drive: 1 V rms open-circuit; a loss
    not given: none) and validate it as a full job."""
    path = Path(path)
    shown = str(path)
    located = compose_located(read_yaml_text(path, "job file", MAX_JOB_BYTES, JOB_FILE_HINT),
                              shown)
    assumed: list[Assumed] = []
    data = located.data
    if isinstance(data, dict):
        _fill(data, assumed)
    return (validate_located(located, shown, Job, "a mapping with circuit, inductor and "
                             "capacitor at the top level (check: sheet and source optional)"),
            tuple(assumed))


def _fill(data: dict, assumed: list[Assumed]) -> None:
    if "sheet" not in data:
        data["sheet"] = {"id": QUICK_SHEET_ID, "title": "quick check", "revision": "-",
                         "designer": "(not given)",
                         "date": datetime.date.today().isoformat()}
        assumed.append(Assumed("sheet", f"id {QUICK_SHEET_ID}, no title or designer",
                               "no sheet identity given (build needs one)"))
    source = data.setdefault("source", {})
    if isinstance(source, dict) and not any(key in source for key in
                                            ("voltage", "current", "available_power")):
        circuit = data.get("circuit")
        parallel = isinstance(circuit, dict) and circuit.get("topology") == "parallel"
        if parallel and "resistance" not in source:  # an ideal source of a tank: a current
            source["current"] = f"{QUICK_DRIVE_A * 1e3:g} mA"
            assumed.append(Assumed("source.current", f"{QUICK_DRIVE_A * 1e3:g} mA rms",
                                   "no drive given: voltages, currents and powers are per "
                                   "milliampere of drive"))
        else:
            source["voltage"] = f"{QUICK_DRIVE_V:g} V"
            assumed.append(Assumed("source.voltage", f"{QUICK_DRIVE_V:g} V rms open-circuit",
                                   "no drive given: voltages, currents and powers are per "
                                   "volt of drive"))
    inductor = data.get("inductor")
    if (isinstance(inductor, dict) and inductor.get("form") == "given"
            and "q" not in inductor and "resistance" not in inductor):
        inductor["resistance"] = "0 ohm"
        assumed.append(Assumed("inductor.resistance", "0 Ω", "no loss given for the coil: "
                               "taken as none (a lossless coil)"))
    capacitor = data.get("capacitor")
    if (isinstance(capacitor, dict) and "esr" not in capacitor
            and "dissipation_factor" not in capacitor):
        capacitor["esr"] = "0 ohm"
        assumed.append(Assumed("capacitor.esr", "0 Ω", "no loss given for the capacitor: "
                               "taken as none (a lossless capacitor)"))
