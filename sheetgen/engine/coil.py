"""Designing the tuned circuit's coil: one call per coil form, one frozen result each.

design_toroid winds a ring core, design_solenoid a single-layer air-core former. Both keep
a CoilLossModel in their result, from which their R_ac, core loss resistance and Q at f
come, and which coil_q_sweep evaluates over a frequency grid: one code path for both.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Literal

import numpy as np

from sheetgen.engine.magnetics import (
    LEAD_GAP_DEG,
    CoreLossTable,
    ToroidEffectiveParameters,
    al_from_permeability,
    core_loss_resistance_ohm,
    medhurst_self_capacitance_f,
    peak_flux_density_t,
    solenoid_turns_for_inductance,
    steinmetz_core_loss_w,
    temperature_rise_k,
    toroid_effective_parameters,
    toroid_inner_diameter_for_turns_m,
    toroid_layers_needed,
    toroid_surface_area_m2,
    toroid_turn_length_m,
    toroid_turns_per_layer,
    toroid_winding_angle_deg,
    turns_for_inductance,
    wheeler_inductance_h,
)
from sheetgen.engine.resonance import reactance_ohm, resonant_frequency_hz
from sheetgen.engine.wire import (
    AWG_MAX,
    AWG_MIN,
    COPPER_REFERENCE_TEMPERATURE_C,
    Wire,
    ac_resistance_ratio,
    awg_wire,
    copper_resistivity_ohm_m,
    current_density_a_per_m2,
    dc_resistance_ohm,
    proximity_resistance_ratio,
    single_layer_field_per_ampere_per_m,
)

WindingRemedy = Literal["thinner_wire", "larger_core", "two_layers"]
LARGER_CORE_STEP_M = 0.1e-3  # a suggested inner diameter is rounded up to this step


# --------------------------------------------------------------------------- input specs


@dataclass(frozen=True)
class ToroidCore:
    """A ring core of rectangular section; AL (H/turn²) when known, else from µi and geometry."""

    outer_diameter_m: float
    inner_diameter_m: float
    height_m: float
    chamfer_m: float = 0.0
    al_h_per_turn2: float | None = None


@dataclass(frozen=True)
class CoreMaterial:
    """A core material by its physical properties (no maker's data).

    flux_density_max_t is the peak flux density the material is used up to at RF; the
    Steinmetz parameters (P_v = k f^α B̂^β, W/m³ with f in Hz, B̂ in T) are optional.
    """

    mu_i: float
    loss_table: CoreLossTable
    flux_density_max_t: float
    steinmetz_k: float | None = None
    steinmetz_alpha: float | None = None
    steinmetz_beta: float | None = None

    def __post_init__(self):
        given = [p is not None for p in (self.steinmetz_k, self.steinmetz_alpha,
                                         self.steinmetz_beta)]
        if any(given) and not all(given):
            raise ValueError("give all three Steinmetz parameters (k, alpha, beta) or none")
        if not (self.mu_i > 0.0 and self.flux_density_max_t > 0.0):
            raise ValueError("µi and the maximum flux density must be positive")

    @property
    def has_steinmetz(self) -> bool:
        return self.steinmetz_k is not None


@dataclass(frozen=True)
class SolenoidFormer:
    """A cylindrical coil former: outside diameter and, if limited, the usable winding length."""

    diameter_m: float
    winding_length_max_m: float | None = None


# --------------------------------------------------------------------------- loss model


@dataclass(frozen=True)
class CoilLossModel:
    """What a coil's series loss resistance and Q depend on, frequency aside.

    Skin effect acts on all the wire, proximity effect on the winding only, in the rms
    transverse field proximity_field_per_ampere_per_m × I from the other turns.
    """

    inductance_h: float
    wire_diameter_m: float
    resistivity_ohm_m: float
    winding_wire_length_m: float
    lead_wire_length_m: float
    proximity_field_per_ampere_per_m: float
    core_loss_table: CoreLossTable | None = None
    mu_i: float | None = None
    self_capacitance_f: float | None = None


def coil_ac_resistance_ohm(model: CoilLossModel, f_hz):
    """Wire loss resistance at f: R_dc · (R_ac/R_dc)_skin + R_dc,winding · (ΔR/R_dc)_proximity."""
    d, rho = model.wire_diameter_m, model.resistivity_ohm_m
    r_winding = dc_resistance_ohm(model.winding_wire_length_m, d, rho)
    r_total = dc_resistance_ohm(model.winding_wire_length_m + model.lead_wire_length_m, d, rho)
    return (r_total * ac_resistance_ratio(d, f_hz, rho) + r_winding * proximity_resistance_ratio(
        d, f_hz, rho, model.proximity_field_per_ampere_per_m))


def coil_core_resistance_ohm(model: CoilLossModel, f_hz):
    """Series loss resistance of the core at f (zero for an air core)."""
    if model.core_loss_table is None:
        zero = np.zeros(np.shape(f_hz))
        return float(zero) if zero.ndim == 0 else zero
    return core_loss_resistance_ohm(model.inductance_h, f_hz, model.core_loss_table, model.mu_i)


def coil_q_sweep(coil, f_hz_array):
    """Q of the coil over frequency, self-capacitance included; vectorised over f.

    The coil is L in series with R(f) = R_ac + R_core, shunted by its self-capacitance C.
    Its impedance Z = (R + jωL)/(1 − ω²LC + jωRC) gives Q = Im Z / Re Z
    = (ωL/R)(1 − ω²LC − R²C/L): ωL/R rises with f, then the factor pulls Q down to zero at
    the self-resonance. At and above it the coil is capacitive and Q is given as 0.
    Accepts a ToroidCoil, a SolenoidCoil or a CoilLossModel.
    """
    model = coil.loss_model if hasattr(coil, "loss_model") else coil
    f = np.asarray(f_hz_array, dtype=float)
    resistance = coil_ac_resistance_ohm(model, f) + coil_core_resistance_ohm(model, f)
    l_h, c_f = model.inductance_h, model.self_capacitance_f or 0.0
    omega = 2.0 * math.pi * f
    q = reactance_ohm(l_h, f) / resistance * (1.0 - omega**2 * l_h * c_f
                                                - resistance**2 * c_f / l_h)
    q = np.maximum(q, 0.0)
    return float(q) if np.ndim(q) == 0 else q


# --------------------------------------------------------------------------- toroid


@dataclass(frozen=True)
class ToroidCoil:
    """A winding on a ring core, evaluated at the design frequency (SI units; None: n/a).

    Losses and Q of a winding that does not fit are those of the layers it would need (of
    one layer when the hole fills first): a figure to compare remedies by, not to build.
    """

    turns: int
    al_h_per_turn2: float
    al_from_geometry: bool
    inductance_built_h: float
    wire: Wire
    wire_length_m: float  # winding plus both leads
    dc_resistance_ohm: float
    ac_resistance_ohm: float  # wire only: skin and proximity effect
    core_loss_resistance_ohm: float
    series_resistance_ohm: float  # ac + core: the coil's loss resistance at f
    q_estimated: float
    self_capacitance_f: float | None
    srf_hz: float | None
    srf_basis: str  # "not_estimated": no self-capacitance estimate is made for a toroid
    core_loss_table_extrapolated: bool
    current_rms_a: float | None  # V / (ωL) for the given coil voltage
    current_density_a_per_m2: float | None
    flux_density_peak_t: float | None
    flux_density_within_limit: bool | None
    copper_loss_w: float | None
    core_loss_w: float | None  # the larger of the two estimates below: the one heat uses
    core_loss_table_w: float | None  # I²·r_core from the material's loss table (sets the Q)
    core_loss_steinmetz_w: float | None  # Steinmetz's P = k f^α B̂^β Ve; None without data
    temperature_rise_k: float | None  # from copper + core loss over the core's surface
    turns_per_layer: int
    layers_needed: int | None  # None: the hole fills before the turns are on
    winding_angle_deg: float
    close_wound_angle_deg: float
    fits: bool  # one layer, close-wound within 360° less the lead gap
    remedy: WindingRemedy | None
    remedy_wire: Wire | None  # thickest AWG of the same grade that fits in one layer
    remedy_inner_diameter_m: float | None  # smallest core hole that takes the winding
    effective: ToroidEffectiveParameters
    loss_model: CoilLossModel


def _toroid_field_per_ampere(turns: int, layers: int, core: ToroidCore) -> float:
    """Field from the other turns at a winding wire per ampere, rms over the turn's path.

    Inside the winding H = NI/(2πρ), outside none. With M layers, layer m sits in the mean
    field (2m − 1)/(2M) of H (the 1-D layer picture of Dowell 1966 / Ferreira 1994), so
    ⟨H²⟩ = ⟨(NI/(2πρ))²⟩ (4M² − 1)/(12 M²); ⟨1/ρ²⟩ is taken along the section's outline
    (inner and outer faces of height h, two flat faces from r1 to r2).
    """
    r1, r2, h = core.inner_diameter_m / 2.0, core.outer_diameter_m / 2.0, core.height_m
    mean_inv_rho2 = (h / r1**2 + h / r2**2 + 2.0 * (1.0 / r1 - 1.0 / r2)) / (2.0 * h
                                                                           + 2.0 * (r2 - r1))
    layer_factor = (4.0 * layers**2 - 1.0) / (12.0 * layers**2)
    return turns / (2.0 * math.pi) * math.sqrt(mean_inv_rho2 * layer_factor)


def _toroid_winding_length_m(turns: int, core: ToroidCore, wire: Wire,
                             layers: int | None) -> float:
    """Σ over the layers of (turns in the layer × that layer's turn length)."""
    def turn_length(layer):
        return toroid_turn_length_m(core.outer_diameter_m, core.inner_diameter_m,
                                    core.height_m, wire.overall_diameter_m, core.chamfer_m,
                                    layer)
    if layers is None:
        return turns * turn_length(1)
    remaining, total = turns, 0.0
    for layer in range(1, layers + 1):
        here = min(remaining, toroid_turns_per_layer(
            core.inner_diameter_m, wire.overall_diameter_m, layer, LEAD_GAP_DEG))
        total += here * turn_length(layer)
        remaining -= here
    return total


def design_toroid(target_inductance_h: float, f_hz: float, core: ToroidCore,
                  material: CoreMaterial, wire: Wire, lead_length_m: float,
                  voltage_rms_v: float | None,
                  temperature_c: float = COPPER_REFERENCE_TEMPERATURE_C) -> ToroidCoil:
    """Turns, wire, losses, Q, flux density and fit of a winding on a ring core at f.

    lead_length_m is the length of each of the two leads; voltage_rms_v is the rms voltage
    across the coil's terminals (None when not known: current, flux density and losses are
    then None); the flux density is from the part across the inductance alone.
    If the winding does not fit in one layer, the remedy is the better-Q of a thinner wire
    that fits and two layers (when two suffice); a larger core hole when neither is possible.
    """
    coil = _toroid_build(target_inductance_h, f_hz, core, material, wire, lead_length_m,
                         temperature_c)
    if voltage_rms_v is not None:
        coil = toroid_at_voltage(coil, core, material, voltage_rms_v, f_hz)
    if coil.fits:
        return coil
    thinner = _thickest_fitting_awg(coil.turns, core.inner_diameter_m, wire)
    options: list[tuple[float, WindingRemedy]] = []
    if thinner is not None:
        options.append((_toroid_build(target_inductance_h, f_hz, core, material, thinner,
                                      lead_length_m, temperature_c).q_estimated,
                        "thinner_wire"))
    if coil.layers_needed == 2:
        options.append((coil.q_estimated, "two_layers"))
    remedy: WindingRemedy = max(options)[1] if options else "larger_core"
    hole = toroid_inner_diameter_for_turns_m(coil.turns, wire.overall_diameter_m)
    hole = math.ceil(hole / LARGER_CORE_STEP_M + 1e-9) * LARGER_CORE_STEP_M
    return replace(coil, remedy=remedy, remedy_wire=thinner, remedy_inner_diameter_m=hole)


def toroid_at_voltage(coil: ToroidCoil, core: ToroidCore, material: CoreMaterial,
                      voltage_rms_v: float, f_hz: float) -> ToroidCoil:
    """The wound coil with an rms voltage across its terminals: current, current density,
    peak flux density, copper and core loss and the temperature rise (the winding itself is
    the same, so it is designed once and evaluated here for the stress)."""
    effective, turns, l_built = coil.effective, coil.turns, coil.inductance_built_h
    r_ac, r_core, wire = coil.ac_resistance_ohm, coil.core_loss_resistance_ohm, coil.wire
    # voltage_rms_v is across the coil's terminals, |rs + jX|·I; the flux links only the
    # inductive part, V_L = X·I (Faraday's law), the loss resistance rs carries the rest.
    x_l = reactance_ohm(l_built, f_hz)
    current = voltage_rms_v / math.hypot(r_ac + r_core, x_l)
    density = current_density_a_per_m2(current, wire.diameter_m)
    flux = peak_flux_density_t(current * x_l, f_hz, turns, effective.ae_m2)
    flux_ok = flux <= material.flux_density_max_t
    copper_w = current**2 * r_ac
    # One core-loss figure per sheet: the loss table (which sets the Q) and Steinmetz's
    # law can disagree; the heat takes the larger, and both are kept to be shown.
    table_w = current**2 * r_core
    steinmetz_w = (steinmetz_core_loss_w(f_hz, flux, material.steinmetz_k,
                                         material.steinmetz_alpha, material.steinmetz_beta,
                                         effective.ve_m3) if material.has_steinmetz else None)
    core_w = max(table_w, steinmetz_w) if steinmetz_w is not None else table_w
    rise = temperature_rise_k(copper_w + core_w, toroid_surface_area_m2(
        core.outer_diameter_m, core.inner_diameter_m, core.height_m))
    return replace(coil, current_rms_a=current, current_density_a_per_m2=density,
                   flux_density_peak_t=flux, flux_density_within_limit=flux_ok,
                   copper_loss_w=copper_w, core_loss_w=core_w, core_loss_table_w=table_w,
                   core_loss_steinmetz_w=steinmetz_w, temperature_rise_k=rise)


def solenoid_surface_area_m2(coil: SolenoidCoil) -> float:
    """The cylinder that envelopes the winding, π (D + d) ℓ: the surface a spaced
    single-layer coil sheds its heat from by convection and radiation (common practice)."""
    return math.pi * (coil.diameter_m + coil.wire.overall_diameter_m) * coil.length_m


def solenoid_at_voltage(coil: SolenoidCoil, voltage_rms_v: float, f_hz: float) -> SolenoidCoil:
    """The air-core coil with an rms voltage across its terminals: its current
    V/|r + jX|, the copper loss I²·R_ac and the temperature rise over its surface (the
    empirical convection law of magnetics.temperature_rise_k, common practice)."""
    x_l = reactance_ohm(coil.inductance_built_h, f_hz)
    current = voltage_rms_v / math.hypot(coil.series_resistance_ohm, x_l)
    copper_w = current**2 * coil.ac_resistance_ohm
    rise = temperature_rise_k(copper_w, solenoid_surface_area_m2(coil))
    return replace(coil, current_rms_a=current, copper_loss_w=copper_w,
                   temperature_rise_k=rise)


def _thickest_fitting_awg(turns: int, inner_diameter_m: float, wire: Wire) -> Wire | None:
    """The thickest AWG wire of the same grade, thinner than wire, that fits in one layer."""
    for gauge in range(AWG_MIN, AWG_MAX + 1):
        candidate = awg_wire(gauge, wire.grade)
        if candidate.diameter_m >= wire.diameter_m * (1.0 - 1e-9):
            continue
        if 2.0 * candidate.overall_diameter_m >= inner_diameter_m:
            continue
        if toroid_winding_angle_deg(turns, inner_diameter_m,
                                    candidate.overall_diameter_m).fits_single_layer:
            return candidate
    return None


def _toroid_build(target_inductance_h, f_hz, core, material, wire, lead_length_m,
                  temperature_c) -> ToroidCoil:
    effective = toroid_effective_parameters(core.outer_diameter_m, core.inner_diameter_m,
                                            core.height_m, core.chamfer_m)
    from_geometry = core.al_h_per_turn2 is None
    al = (al_from_permeability(material.mu_i, effective.le_m, effective.ae_m2)
          if from_geometry else core.al_h_per_turn2)
    turns_result = turns_for_inductance(target_inductance_h, al)
    turns, l_built = turns_result.turns, turns_result.inductance_built_h
    d_over = wire.overall_diameter_m
    if 2.0 * d_over >= core.inner_diameter_m:
        raise ValueError(f"wire {wire.name} is too thick to wind through the core's hole "
                         f"(its overall diameter must be under half the inner diameter)")
    angle = toroid_winding_angle_deg(turns, core.inner_diameter_m, d_over)
    layers = toroid_layers_needed(turns, core.inner_diameter_m, d_over)
    rho = copper_resistivity_ohm_m(temperature_c)
    winding_length = _toroid_winding_length_m(turns, core, wire, layers)
    model = CoilLossModel(
        inductance_h=l_built, wire_diameter_m=wire.diameter_m, resistivity_ohm_m=rho,
        winding_wire_length_m=winding_length, lead_wire_length_m=2.0 * lead_length_m,
        proximity_field_per_ampere_per_m=_toroid_field_per_ampere(turns, layers or 1, core),
        core_loss_table=material.loss_table, mu_i=material.mu_i, self_capacitance_f=None)
    r_dc = dc_resistance_ohm(winding_length + 2.0 * lead_length_m, wire.diameter_m, rho)
    r_ac = float(coil_ac_resistance_ohm(model, f_hz))
    r_core = float(coil_core_resistance_ohm(model, f_hz))

    return ToroidCoil(
        turns=turns, al_h_per_turn2=al, al_from_geometry=from_geometry,
        inductance_built_h=l_built, wire=wire,
        wire_length_m=winding_length + 2.0 * lead_length_m, dc_resistance_ohm=r_dc,
        ac_resistance_ohm=r_ac, core_loss_resistance_ohm=r_core,
        series_resistance_ohm=r_ac + r_core, q_estimated=coil_q_sweep(model, f_hz),
        self_capacitance_f=None, srf_hz=None, srf_basis="not_estimated",
        core_loss_table_extrapolated=not material.loss_table.covers(f_hz),
        current_rms_a=None, current_density_a_per_m2=None, flux_density_peak_t=None,
        flux_density_within_limit=None, copper_loss_w=None, core_loss_w=None,
        core_loss_table_w=None, core_loss_steinmetz_w=None, temperature_rise_k=None,
        turns_per_layer=toroid_turns_per_layer(core.inner_diameter_m, d_over),
        layers_needed=layers, winding_angle_deg=angle.spread_deg,
        close_wound_angle_deg=angle.close_wound_deg, fits=angle.fits_single_layer,
        remedy=None, remedy_wire=None, remedy_inner_diameter_m=None, effective=effective,
        loss_model=model)


# --------------------------------------------------------------------------- solenoid


@dataclass(frozen=True)
class SolenoidCoil:
    """A single-layer air-core winding, evaluated at the design frequency (SI units)."""

    turns: int  # whole turns
    inductance_built_h: float
    diameter_m: float  # to the wire centres: former diameter + wire overall diameter
    length_m: float  # winding length, turns × pitch
    pitch_m: float
    nagaoka: float
    round_wire_correction_h: float  # Rosa's ΔL: inductance_built_h = current sheet − this
    wheeler_inductance_h: float  # Wheeler's 1928 formula, a cross-check
    wire: Wire
    wire_length_m: float  # helix plus both leads
    dc_resistance_ohm: float
    ac_resistance_ohm: float
    series_resistance_ohm: float  # equal to ac_resistance_ohm: no core
    q_estimated: float
    self_capacitance_f: float
    srf_hz: float
    srf_basis: str  # "medhurst_1947"
    fits: bool  # pitch ≥ wire overall diameter and length within the former's
    loss_model: CoilLossModel
    current_rms_a: float | None = None  # at the coil's voltage (solenoid_at_voltage)
    copper_loss_w: float | None = None
    temperature_rise_k: float | None = None  # over the winding's enveloping cylinder

    @property
    def former_diameter_m(self) -> float:
        """The former under the winding: the wire-centre diameter less one wire overall."""
        return self.diameter_m - self.wire.overall_diameter_m


def design_solenoid(target_inductance_h: float, f_hz: float,
                    former_diameter_m: float | SolenoidFormer, wire: Wire, *,
                    pitch_m: float | None = None, length_m: float | None = None,
                    lead_length_m: float = 0.0,
                    temperature_c: float = COPPER_REFERENCE_TEMPERATURE_C) -> SolenoidCoil:
    """Whole turns, inductance, losses, Q and self-resonance of a single-layer solenoid at f.

    Give exactly one of pitch_m (l = N·p) and length_m (p = l/N). The current-sheet
    diameter is to the wire centres, former diameter + wire overall diameter. Proximity
    effect takes the single-layer current-sheet field (wire.single_layer_proximity_ratio)
    scaled by K_L: in a coil of finite length the mean field inside is K_L·K, not K
    (its flux is µ0 K_L K π r²), our own stated correction for short coils.
    """
    former = (former_diameter_m if isinstance(former_diameter_m, SolenoidFormer)
              else SolenoidFormer(diameter_m=former_diameter_m))
    diameter = former.diameter_m + wire.overall_diameter_m
    wound = solenoid_turns_for_inductance(target_inductance_h, diameter, pitch_m=pitch_m,
                                          length_m=length_m, wire_diameter_m=wire.diameter_m)
    n, length, pitch = wound.turns, wound.length_m, wound.pitch_m
    rho = copper_resistivity_ohm_m(temperature_c)
    helix = n * math.hypot(math.pi * diameter, pitch)
    c_self = medhurst_self_capacitance_f(diameter, length)
    model = CoilLossModel(
        inductance_h=wound.inductance_built_h, wire_diameter_m=wire.diameter_m,
        resistivity_ohm_m=rho, winding_wire_length_m=helix,
        lead_wire_length_m=2.0 * lead_length_m,
        proximity_field_per_ampere_per_m=wound.nagaoka * single_layer_field_per_ampere_per_m(
            pitch),
        self_capacitance_f=c_self)
    r_ac = float(coil_ac_resistance_ohm(model, f_hz))
    fits = pitch >= wire.overall_diameter_m * (1.0 - 1e-9) and (
        former.winding_length_max_m is None or length <= former.winding_length_max_m)
    return SolenoidCoil(
        turns=n, inductance_built_h=wound.inductance_built_h, diameter_m=diameter,
        length_m=length, pitch_m=pitch, nagaoka=wound.nagaoka,
        round_wire_correction_h=wound.round_wire_correction_h,
        wheeler_inductance_h=wheeler_inductance_h(n, diameter, length), wire=wire,
        wire_length_m=helix + 2.0 * lead_length_m,
        dc_resistance_ohm=dc_resistance_ohm(helix + 2.0 * lead_length_m, wire.diameter_m, rho),
        ac_resistance_ohm=r_ac, series_resistance_ohm=r_ac,
        q_estimated=coil_q_sweep(model, f_hz), self_capacitance_f=c_self,
        srf_hz=float(resonant_frequency_hz(wound.inductance_built_h, c_self)),
        srf_basis="medhurst_1947", fits=fits, loss_model=model)
