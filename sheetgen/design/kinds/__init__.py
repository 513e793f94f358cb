"""Circuit kinds: each module builds, from its job section and the design's resolved parts,
one `CircuitModel` — the network the engine solves (engine/network.py), the parts to build,
what the technician adjusts and what the bench measures. Report, sheet and bench read the
model, never a kind's special case. Today: `tank` (the single series or parallel resonator,
with its link or tap, strays and self-capacitance)."""

from __future__ import annotations

import math
from dataclasses import dataclass

from sheetgen.engine.network import Network
from sheetgen.engine.network_features import extremum
from sheetgen.engine.part_duty import PartDuty, part_duties, worse_duties

# The open-load maximum is looked for within a factor of 50 of f0 (as the response's).
SEARCH_RATIO = 50.0


@dataclass(frozen=True)
class CircuitModel:
    """One job's circuit as built.

    network: as analysed, at nominal values; open_load: the same with the load
    disconnected (the worst credible case for the parts), None where that opens the drive's
    only path; adjustable: the parts the technician sets (a trimmer); built: the parts that
    are fitted (strays and the coil's self-capacitance are in the network, not built);
    measured: the response features the bench reads, by name.
    """

    network: Network
    open_load: Network | None
    adjustable: tuple[str, ...]
    built: tuple[str, ...]
    measured: tuple[str, ...]


@dataclass(frozen=True)
class PartDuties:
    """Every part's duty at the nominal drive and at the worst credible case (each figure
    the larger of the nominal and the open-load case, at that case's own response maximum)."""

    nominal: tuple[PartDuty, ...]
    open_load: tuple[PartDuty, ...] | None
    open_load_f_hz: float | None  # the open-load response maximum, where they were taken

    @property
    def worst(self) -> tuple[PartDuty, ...]:
        return worse_duties(self.nominal, self.open_load)


def duties_of(model: CircuitModel, drive_rms: float, f_peak_hz: float,
              f0_hz: float) -> PartDuties:
    """Every part's duty at the response maximum f_peak_hz with the source at drive_rms
    (V EMF or A), and with the load open at that case's own maximum, found on the network
    (the worst mistune too: the drive's EMF behind Rs puts most on the tank there)."""
    nominal = part_duties(model.network, drive_rms, f_peak_hz)
    if model.open_load is None:
        return PartDuties(nominal, None, None)
    peak = extremum(model.open_load, f0_hz / SEARCH_RATIO, f0_hz * SEARCH_RATIO)
    f_open = float(peak.f_hz)
    if math.isnan(f_open):
        return PartDuties(nominal, None, None)
    return PartDuties(nominal, part_duties(model.open_load, drive_rms, f_open), f_open)
