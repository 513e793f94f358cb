"""What a design is made of: frozen records that the report and the sheet read.

Computed by design/compute.py; nothing here computes or formats.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sheetgen.design.assessment import Assessment
from sheetgen.design.designators import Designators
from sheetgen.design.kinds import CircuitModel, PartDuties
from sheetgen.design.plausibility import Finding
from sheetgen.engine.bench import BenchSetup
from sheetgen.engine.coil import SolenoidCoil, ToroidCoil
from sheetgen.engine.magnetics import AlAgreement
from sheetgen.engine.resonance import Circuit, Resonance, Sweep
from sheetgen.engine.standard_values import StandardPair
from sheetgen.engine.stress import DcFeed, Drive, Stress, WorstCase
from sheetgen.engine.wire import Wire
from sheetgen.inputs.library import LibraryEntry
from sheetgen.inputs.model import Job


@dataclass(frozen=True)
class CapacitanceAcross:
    """Capacitance across the tuning capacitor that is not a part to fit: the coil's own
    (Medhurst's for a solenoid, the job's for a ring; none for a series circuit, where it
    is across the coil, not the capacitor) and the wiring strays."""

    self_capacitance_f: float
    stray_f: float
    self_source: str  # "medhurst_1947", "job" or "none"
    stray_source: str = "job"  # "job", "default" (design mode) or "none"
    added: bool = False  # added to a capacitance the job states, not subtracted from a fit

    @property
    def total_f(self) -> float:
        return self.self_capacitance_f + self.stray_f


@dataclass(frozen=True)
class CapacitorChoice:
    """Standard parts for the capacitance the design needs (IEC 60063), and what is fitted.

    With a trimmer, the fixed part is picked for the required capacitance less the
    trimmer's mid-range, and the trimmer is set to make up the rest.
    """

    required_f: float
    series: str
    nearest_f: float
    pair: StandardPair
    fixed_f: float
    trimmer_setting_f: float | None
    trimmer_in_range: bool | None
    built_f: float
    from_standard_parts: bool
    across: CapacitanceAcross | None = None  # subtracted before the parts were picked

    @property
    def fixed_parts_f(self) -> tuple[float, ...]:
        """The fixed capacitors to fit: the standard part(s), or the job's own value."""
        if not self.from_standard_parts:
            return (self.fixed_f,)
        return tuple(v for v in (self.pair.first, self.pair.second) if v is not None)


@dataclass(frozen=True)
class BleederDuty:
    """The bleeder across the capacitor sees the tank's RF voltage at the worst case and
    any DC across the capacitor: P = V̂²/(2R) + V_dc²/R, peak V̂ + V_dc. The minimum
    ratings to buy are P/derating and that peak (what the sheet states when the job gives
    no rating)."""

    resistance_ohm: float
    voltage_peak_v: float
    power_w: float
    power_rating_min_w: float
    voltage_rating_min_v: float


@dataclass(frozen=True)
class Derivation:
    """A value sheetgen computed rather than read from the job, and from what."""

    field: str
    value: float
    unit: str
    reason: str


@dataclass(frozen=True)
class CoilCurve:
    """The designed coil's estimated Q against frequency."""

    f_hz: np.ndarray
    q: np.ndarray


@dataclass(frozen=True)
class Coupling:
    """A link winding or tap of whole turns, and the resistance it presents to the tank.

    An ideal transformer: R at M of N turns looks like R·(N/M)² across the tank.
    turns_exact is N√(R/R_aimed) before rounding; aimed_ohm the tank load it was for.
    """

    kind: str  # "link" or "tap"
    turns: int
    turns_exact: float
    tank_turns: int
    resistance_ohm: float
    aimed_ohm: float
    presented_ohm: float
    reactance_ohm: float  # X0 of the tank, which the presented resistance must exceed

    @property
    def too_many_turns(self) -> bool:
        """A link of more turns than the tank winding steps the load up: not a coupling."""
        return self.turns > self.tank_turns

    @property
    def swamps_tank(self) -> bool:
        """The presented resistance is below X0: the load alone holds the Q under 1."""
        return self.presented_ohm < self.reactance_ohm

    @property
    def resistance_min_ohm(self) -> float:
        """The least resistance on the coupling that presents X0 at these turns."""
        return self.reactance_ohm * (self.turns / self.tank_turns) ** 2


@dataclass(frozen=True)
class Leads:
    """A coil's two leads: their inductance (in series with the winding) and whether it is
    counted in the coil's inductance (design/coil.py lead_inductance)."""

    inductance_h: float
    share: float  # of the winding's inductance
    threshold: float  # the share above which it is counted
    counted: bool


@dataclass(frozen=True)
class CoilDesign:
    """The coil sheetgen designed: the engine's result and what the design made of it."""

    form: str
    result: ToroidCoil | SolenoidCoil
    core_name: str | None
    material_name: str | None
    target_inductance_h: float
    f0_with_whole_turns_hz: float | None  # before the capacitor re-centres it
    link_turns: int | None
    link_resistance_ohm: float | None
    tap_turns: int | None  # counted from the start (cold) end
    tap_resistance_ohm: float | None
    flux_density_max_t: float | None
    inductance_tolerance: float | None  # ± fraction of the built inductance
    inductance_tc: float | None  # 1/K
    lead_length_m: float
    core_outer_diameter_m: float | None  # toroid only
    core_inner_diameter_m: float | None
    core_height_m: float | None
    q_used: float
    q_source: str  # "estimate" or "job"
    q_curve: CoilCurve
    coupling: Coupling | None = None
    link_wire: Wire | None = None  # the link winding's wire (the job's, else the tank's)
    link_wire_length_m: float | None = None  # its turns over the tank winding plus two leads
    al_agreement: AlAgreement | None = None  # a stated AL against µi and the geometry
    stock: str | None = None  # what to pick from stores: core size and µi, or the former
    leads: Leads | None = None  # the two leads' inductance


@dataclass(frozen=True)
class TargetRemedy:
    """One change that brings the built f0 to within half a bandwidth of the target:
    kind "pair" (two standard parts of the job's series), "series" (one part of a finer
    series), "turns" (a turn more or less) or "trimmer" (the capacitance a trimmer adds
    or takes away at mid-range)."""

    kind: str
    f0_hz: float  # the nominal f0 with the change
    parts_f: tuple[float, ...] = ()  # "pair", "series": the fixed parts to fit
    series: str | None = None  # "pair", "series": the IEC 60063 series
    turns: int | None = None  # "turns": the new number of turns
    capacitance_f: float | None = None  # "trimmer": the capacitance to make up (+ or −)


@dataclass(frozen=True)
class TargetOffset:
    """The built f0 against the job's f0 target. It misses when the target lies outside
    the built unit's half-power band (|offset| > bandwidth/2) or outside the f0 window."""

    target_hz: float
    built_hz: float
    bandwidth_hz: float | None  # None: no half-power band (a very low Q)
    window_hz: tuple[float, float]
    remedies: tuple[TargetRemedy, ...] = ()

    @property
    def offset_hz(self) -> float:
        return self.built_hz - self.target_hz

    @property
    def bandwidths(self) -> float | None:
        """The offset in bandwidths (signed)."""
        return self.offset_hz / self.bandwidth_hz if self.bandwidth_hz else None

    @property
    def misses(self) -> bool:
        low, high = self.window_hz
        outside_band = (self.bandwidth_hz is not None
                        and abs(self.offset_hz) > 0.5 * self.bandwidth_hz)
        return outside_band or not low <= self.target_hz <= high


@dataclass(frozen=True)
class Design:
    """Everything computed for one job; the results, the sheet and the CLI read only this."""

    job: Job
    circuit: Circuit
    drive: Drive
    resonance: Resonance
    stress: Stress
    sweep: Sweep
    capacitor_choice: CapacitorChoice
    derived: tuple[Derivation, ...]
    coil: CoilDesign | None
    designators: Designators
    assessment: Assessment
    plausibility: tuple[Finding, ...] = ()  # values beyond what can be built (plausibility.py)
    stress_open_load: Stress | None = None  # the same drive with the load disconnected
    bleeder: BleederDuty | None = None
    bench: BenchSetup | None = None  # the small-signal test set-up and the circuit it builds
    model: CircuitModel | None = None  # the circuit as a network of its parts (design/kinds)
    duties: PartDuties | None = None  # every part's V, I and P from the network's solve
    worst: WorstCase | None = None  # the worst credible case: what parts are rated at
    dc: DcFeed | None = None  # where the job's DC supply sits in the tank
    coil_at_worst: ToroidCoil | SolenoidCoil | None = None  # the designed coil at `worst`
    # the parts-library entries (core, material) the design used, as their files wrote them
    library_entries: tuple[LibraryEntry, ...] = ()
    target_offset: TargetOffset | None = None  # built f0 against the job's f0 target
