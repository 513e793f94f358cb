"""Magnetics of the tuned circuit's inductor: ring cores, single-layer solenoids, core loss.

Plain SI floats throughout: AL in H per turn², lengths in m, flux density in T. The
frequency-dependent functions also take numpy arrays of frequency.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from sheetgen.engine.constants import MU_0_H_PER_M as mu_0
from sheetgen.engine.resonance import reactance_ohm

LEAD_GAP_DEG = 30.0  # angle left free between a toroid's two leads (common practice)
INCH_M = 0.0254


# --------------------------------------------------------------------------- ring cores


@dataclass(frozen=True)
class ToroidEffectiveParameters:
    """IEC 60205 effective parameters of a ring core: C1 = Σ l/A, C2 = Σ l/A², le, Ae, Ve."""

    c1_per_m: float
    c2_per_m3: float
    le_m: float
    ae_m2: float
    ve_m3: float
    amin_m2: float  # the smallest cross-section (the rectangle less its chamfers)


def toroid_effective_parameters(outer_diameter_m: float, inner_diameter_m: float,
                                height_m: float, chamfer_m: float = 0.0
                                ) -> ToroidEffectiveParameters:
    """C1, C2, le = C1²/C2, Ae = C1/C2, Ve = C1³/C2² of a ring of rectangular section.

    Without chamfer these are IEC 60205's ring-core forms C1 = 2π/(h ln(r2/r1)) and
    C2 = 2π(1/r1 − 1/r2)/(h² ln³(r2/r1)). They follow from the field H = NI/(2πρ): C1 from
    the permeance, 1/C1 = ∫ h(ρ) dρ/(2πρ), and C2 from the hysteresis (∫H³ dV) equivalence,
    C2 = C1³ ∫ h(ρ) dρ/ρ² / (4π²). A chamfer (four 45° edge bevels of leg c) makes the
    section's height h(ρ) fall linearly by 2c towards each rim; the same two integrals are
    then taken in closed form over that section. This is our own stated correction, not the
    standard's printed one (which we could not confirm).
    """
    r1, r2, h, c = inner_diameter_m / 2.0, outer_diameter_m / 2.0, height_m, chamfer_m
    if not 0.0 < r1 < r2:
        raise ValueError("a ring core needs 0 < inner diameter < outer diameter")
    if not h > 0.0:
        raise ValueError("a ring core's height must be positive")
    if not 0.0 <= c < min(h / 2.0, (r2 - r1) / 2.0):
        raise ValueError("a chamfer must be ≥ 0 and less than half the section's height and width")
    ln = math.log(r2 / r1)
    # ∫ h(ρ)/ρ dρ and ∫ h(ρ)/ρ² dρ over the chamfered section.
    i1 = h * ln
    i2 = h * (1.0 / r1 - 1.0 / r2)
    if c > 0.0:
        i1 -= 2.0 * ((c + r1) * math.log((r1 + c) / r1) - c)
        i1 -= 2.0 * ((c - r2) * math.log(r2 / (r2 - c)) + c)
        i2 -= 2.0 * (c / r1 - math.log((r1 + c) / r1))
        i2 -= 2.0 * (math.log(r2 / (r2 - c)) - c / r2)
    c1 = 2.0 * math.pi / i1
    c2 = c1**3 * i2 / (4.0 * math.pi**2)
    return ToroidEffectiveParameters(
        c1_per_m=c1, c2_per_m3=c2, le_m=c1**2 / c2, ae_m2=c1 / c2, ve_m3=c1**3 / c2**2,
        amin_m2=h * (r2 - r1) - 2.0 * c**2)


def al_from_permeability(mu_i: float, le_m: float, ae_m2: float) -> float:
    """AL = µ0 µi Ae / le (H per turn²), the inductance factor of an ungapped core (IEC 60205)."""
    return mu_0 * mu_i * ae_m2 / le_m


# Common practice: ring cores are made to a few per cent in each dimension, and an AL is
# measured on the finished (coated, edge-rounded) core, so µ0·µi·Ae/le from the nominal
# size is good to about this much beyond µi's own tolerance.
AL_GEOMETRY_ALLOWANCE = 0.05


@dataclass(frozen=True)
class AlAgreement:
    """A stated AL against µ0·µi·Ae/le (IEC 60205) of the same ring and material.

    mu_implied is the permeability the stated AL stands for on this geometry; `agrees` is
    False when the stated AL's tolerance band and the computed AL's band (µi's tolerance
    and AL_GEOMETRY_ALLOWANCE) do not overlap.
    """

    al_stated_h_per_turn2: float
    al_tolerance: float
    al_geometry_h_per_turn2: float
    mu_i: float
    mu_tolerance: float
    mu_implied: float
    agrees: bool


def al_agreement(al_stated_h_per_turn2: float, al_tolerance: float, mu_i: float,
                 mu_tolerance: float, le_m: float, ae_m2: float) -> AlAgreement:
    """Do a stated AL and AL = µ0 µi Ae/le (IEC 60205) overlap within their tolerances?"""
    geometric = al_from_permeability(mu_i, le_m, ae_m2)
    stated_low = al_stated_h_per_turn2 * (1.0 - al_tolerance)
    stated_high = al_stated_h_per_turn2 * (1.0 + al_tolerance)
    geometric_low = geometric * (1.0 - mu_tolerance) * (1.0 - AL_GEOMETRY_ALLOWANCE)
    geometric_high = geometric * (1.0 + mu_tolerance) * (1.0 + AL_GEOMETRY_ALLOWANCE)
    agrees = stated_low <= geometric_high and geometric_low <= stated_high
    return AlAgreement(al_stated_h_per_turn2, al_tolerance, geometric, mu_i, mu_tolerance,
                       mu_i * al_stated_h_per_turn2 / geometric, agrees)


@dataclass(frozen=True)
class TurnsForInductance:
    """Whole turns for a target inductance and the inductance they give."""

    turns: int
    inductance_built_h: float


def turns_for_inductance(inductance_h: float, al_h_per_turn2: float) -> TurnsForInductance:
    """N = √(L/AL) rounded to the nearest whole turn (at least 1); L_built = N² AL.

    On a ring core each pass of the wire through the centre hole is one turn.
    """
    if not (inductance_h > 0.0 and al_h_per_turn2 > 0.0):
        raise ValueError("inductance and AL must be positive")
    turns = max(1, round(math.sqrt(inductance_h / al_h_per_turn2)))
    return TurnsForInductance(turns=turns, inductance_built_h=turns**2 * al_h_per_turn2)


def toroid_turn_length_m(outer_diameter_m: float, inner_diameter_m: float, height_m: float,
                         wire_overall_diameter_m: float, chamfer_m: float = 0.0,
                         layer: int = 1) -> float:
    """Length of one turn's wire centre line around the core's section.

    The wire hugs the section, so its centre line is the section's outline offset by
    (2·layer − 1)·d/2; the length of an outline offset by t around a convex shape is its
    perimeter plus 2πt (Steiner's formula for parallel curves). The section's perimeter is
    2h + (OD − ID), less (8 − 4√2)·c for four 45° chamfers of leg c.
    """
    perimeter = (2.0 * height_m + (outer_diameter_m - inner_diameter_m)
                 - (8.0 - 4.0 * math.sqrt(2.0)) * chamfer_m)
    return perimeter + math.pi * (2 * layer - 1) * wire_overall_diameter_m


def _turn_angle_rad(inner_diameter_m: float, wire_overall_diameter_m: float, layer: int):
    """Angle 2·asin(d/D′) between touching wire centres on the circle D′ = ID − (2k−1)d.

    None when the wire no longer fits on that circle (d ≥ D′).
    """
    circle = inner_diameter_m - (2 * layer - 1) * wire_overall_diameter_m
    if not wire_overall_diameter_m < circle:
        return None
    return 2.0 * math.asin(wire_overall_diameter_m / circle)


def toroid_turns_per_layer(inner_diameter_m: float, wire_overall_diameter_m: float,
                           layer: int = 1, lead_gap_deg: float = 0.0) -> int:
    """Turns that fit side by side on the inside of the hole in layer k (1 = on the core).

    The wire centres of layer k lie on the circle of diameter D′ = ID − (2k−1)d, touching
    neighbours a chord d apart, so each turn takes 2·asin(d/D′) of the circle: exact for
    touching round wires, and for many turns the same as π(ID − d)/d on the inner
    circumference (it never exceeds that count). A lead gap leaves that angle unused.
    """
    angle = _turn_angle_rad(inner_diameter_m, wire_overall_diameter_m, layer)
    if angle is None:
        return 0
    usable = 2.0 * math.pi * (1.0 - lead_gap_deg / 360.0)
    return max(0, math.floor(usable / angle + 1e-9))


def toroid_layers_needed(turns: int, inner_diameter_m: float, wire_overall_diameter_m: float,
                         lead_gap_deg: float = LEAD_GAP_DEG) -> int | None:
    """How many layers the turns take on the inside of the hole; None if the hole fills up."""
    remaining, layer = turns, 0
    while remaining > 0:
        layer += 1
        capacity = toroid_turns_per_layer(inner_diameter_m, wire_overall_diameter_m, layer,
                                          lead_gap_deg)
        if capacity <= 0:
            return None
        remaining -= capacity
    return layer


def toroid_inner_diameter_for_turns_m(turns: int, wire_overall_diameter_m: float,
                                      lead_gap_deg: float = LEAD_GAP_DEG) -> float:
    """The smallest hole that takes the turns in one layer, close-wound, leaving the lead gap.

    From N · 2·asin(d/D′) = 2π(1 − gap/360°): D′ = d / sin(π(1 − gap/360°)/N), ID = D′ + d.
    """
    half_angle = math.pi * (1.0 - lead_gap_deg / 360.0) / turns
    if half_angle >= math.pi / 2.0:
        return 2.0 * wire_overall_diameter_m
    return wire_overall_diameter_m / math.sin(half_angle) + wire_overall_diameter_m


@dataclass(frozen=True)
class WindingAngle:
    """The angle a toroid winding takes, close-wound and spread (degrees of the core)."""

    close_wound_deg: float  # N touching turns on the first layer's circle (may pass 360)
    spread_deg: float  # recommended: spread evenly over 360° less the lead gap, if it fits
    pitch_deg: float  # angle per turn when spread over spread_deg
    fits_single_layer: bool  # close-wound angle within 360° less the lead gap


def toroid_winding_angle_deg(turns: int, inner_diameter_m: float,
                             wire_overall_diameter_m: float,
                             lead_gap_deg: float = LEAD_GAP_DEG) -> WindingAngle:
    """Close-wound angle N · 2·asin(d/(ID − d)); spread over 360° − gap (≈30°, common practice).

    When the close-wound winding does not fit within 360° − gap it cannot be spread; its
    spread angle is then the close-wound angle, at most 360°.
    """
    angle = _turn_angle_rad(inner_diameter_m, wire_overall_diameter_m, 1)
    if angle is None:
        raise ValueError("the wire is too thick to pass through the core's hole")
    close = math.degrees(turns * angle)
    room = 360.0 - lead_gap_deg
    fits = close <= room + 1e-9
    spread = room if fits else min(close, 360.0)
    return WindingAngle(close_wound_deg=close, spread_deg=spread, pitch_deg=spread / turns,
                        fits_single_layer=fits)


def toroid_surface_area_m2(outer_diameter_m: float, inner_diameter_m: float,
                           height_m: float) -> float:
    """Outer surface of a ring: two annular faces plus the outer and inner cylinders."""
    faces = 2.0 * math.pi / 4.0 * (outer_diameter_m**2 - inner_diameter_m**2)
    return faces + math.pi * (outer_diameter_m + inner_diameter_m) * height_m


# --------------------------------------------------------------------------- solenoids


def nagaoka_coefficient(diameter_m, length_m):
    """Nagaoka's coefficient K_L of a current sheet (Nagaoka 1909) from elliptic integrals.

    K_L = 4/(3π k′) · [(k′²/k²)(K(k) − E(k)) + E(k) − k], k² = D²/(D² + l²), k′² = 1 − k².
    scipy's ellipk/ellipe take the parameter m = k².
    """
    d = np.asarray(diameter_m, dtype=float)
    l = np.asarray(length_m, dtype=float)
    if np.any(d <= 0.0) or np.any(l <= 0.0):
        raise ValueError("solenoid diameter and length must be positive")
    m = d**2 / (d**2 + l**2)
    k, kp = np.sqrt(m), np.sqrt(1.0 - m)
    import scipy.special as sp  # imported on first use: a job without a coil never needs it
    big_k, big_e = sp.ellipk(m), sp.ellipe(m)
    value = 4.0 / (3.0 * math.pi * kp) * ((kp**2 / k**2) * (big_k - big_e) + big_e - k)
    return float(value) if np.ndim(value) == 0 else value


def solenoid_inductance_h(turns, diameter_m, length_m):
    """L = µ0 π r² N² K_L / l, the current-sheet inductance of a single-layer solenoid.

    D is the diameter to the wire centres and l the winding length (N turns × pitch). This
    is the current sheet; a winding of round wire is less by rosa_correction_h.
    """
    r = np.asarray(diameter_m, dtype=float) / 2.0
    value = mu_0 * math.pi * r**2 * np.asarray(turns, dtype=float) ** 2 * nagaoka_coefficient(
        diameter_m, length_m) / np.asarray(length_m, dtype=float)
    return float(value) if np.ndim(value) == 0 else value


def rosa_mutual_constant(turns: int) -> float:
    """Rosa's B(N): the mutual-inductance part of the round-wire correction (Rosa 1906).

    B = −(2/N) Σ_{k=1}^{N−1} (N − k) ln(g_k / (k p)), where g_k is the geometric mean
    distance of two strips of width p whose centres are k p apart,
    ln(g_k/p) = ½[(k+1)² ln(k+1) + (k−1)² ln(k−1) − 2k² ln k] − 3/2: the difference between
    the mutual inductances of thin turns and of the current sheet's bands.
    """
    n = int(turns)
    if n < 1:
        raise ValueError("a winding has at least one turn")
    k = np.arange(1, n, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        lower = np.where(k > 1, (k - 1) ** 2 * np.log(np.where(k > 1, k - 1, 1.0)), 0.0)
    ln_ratio = (0.5 * ((k + 1) ** 2 * np.log(k + 1) + lower - 2 * k * k * np.log(k))
                - 1.5 - np.log(k))
    return float(-2.0 / n * np.sum((n - k) * ln_ratio))


def rosa_correction_h(turns: int, diameter_m: float, pitch_m: float,
                      wire_diameter_m: float) -> float:
    """Rosa's round-wire correction ΔL = µ0 a N (A + B), L = L_sheet − ΔL (Rosa, Bull.
    Bureau of Standards 2, 1906; Grover, Inductance Calculations, 1946).

    a is the radius to the wire centres, A = 5/4 − ln(2p/d) the self-inductance part (round
    wire of copper diameter d with uniform current, against a band of width p; negative
    for a spaced winding) and B = rosa_mutual_constant(N).
    """
    if not (pitch_m > 0.0 and wire_diameter_m > 0.0 and diameter_m > 0.0):
        raise ValueError("diameter, pitch and wire diameter must be positive")
    a_self = 1.25 - math.log(2.0 * pitch_m / wire_diameter_m)
    return mu_0 * 0.5 * diameter_m * int(turns) * (a_self + rosa_mutual_constant(turns))


def wheeler_inductance_h(turns, diameter_m, length_m):
    """Wheeler (Proc. IRE 16, 1928): L[µH] = r² N² / (9r + 10l), r and l in inches.

    Wheeler states it is within about 1 % for l > 0.8 r (l > 0.4 D).
    """
    r_in = diameter_m / 2.0 / INCH_M
    l_in = length_m / INCH_M
    return r_in**2 * turns**2 / (9.0 * r_in + 10.0 * l_in) * 1e-6


@dataclass(frozen=True)
class SolenoidTurns:
    """Whole turns for a target inductance on a former, with the winding they make."""

    turns: int
    length_m: float
    pitch_m: float
    nagaoka: float
    inductance_built_h: float  # with the round-wire correction when the wire is known
    round_wire_correction_h: float = 0.0  # Rosa's ΔL, subtracted from the current sheet


# Single-layer tuned-circuit coils carry tens to a few hundred turns (common practice);
# 10,000 leaves room for any of them and keeps the search for whole turns (each candidate
# costs O(N), Rosa's sum) to a fraction of a second.
MAX_SOLENOID_TURNS = 10_000


def solenoid_turns_for_inductance(inductance_h: float, diameter_m: float, *,
                                  pitch_m: float | None = None,
                                  length_m: float | None = None,
                                  wire_diameter_m: float | None = None) -> SolenoidTurns:
    """Whole turns (nearest, at least 1) for L at a given pitch (l = N·p) or a given length.

    At a fixed length K_L is fixed, so N = √(L l/(µ0 π r² K_L)); at a fixed pitch L grows
    monotonically with N and is solved for with Brent's method. With the copper diameter
    of the wire, L is the current sheet less Rosa's correction (rosa_correction_h), and
    the whole number of turns nearest in ln L to the target is taken around that solution.
    """
    if (pitch_m is None) == (length_m is None):
        raise ValueError("give exactly one of pitch_m and length_m")
    if not (inductance_h > 0.0 and diameter_m > 0.0):
        raise ValueError("inductance and diameter must be positive")
    if length_m is not None:
        if not length_m > 0.0:
            raise ValueError("winding length must be positive")
        per_turn2 = solenoid_inductance_h(1.0, diameter_m, length_m)
        exact = math.sqrt(inductance_h / per_turn2)
    else:
        if not pitch_m > 0.0:
            raise ValueError("winding pitch must be positive")

        def excess(n):
            return solenoid_inductance_h(n, diameter_m, n * pitch_m) / inductance_h - 1.0

        high = 1.0
        while excess(high) < 0.0:
            high *= 2.0
        from scipy.optimize import brentq  # imported on first use
        exact = brentq(excess, 1e-6, high, xtol=1e-9, rtol=1e-12)
    if exact > MAX_SOLENOID_TURNS:
        raise ValueError(f"a single-layer winding would need {exact:,.0f} turns; at most "
                         f"{MAX_SOLENOID_TURNS:,} are wound in one layer: ask for less "
                         "inductance, or wind on a wider former or a core")

    def wound(turns: int) -> SolenoidTurns:
        length = length_m if length_m is not None else turns * pitch_m
        pitch = length / turns
        sheet = solenoid_inductance_h(turns, diameter_m, length)
        correction = (0.0 if wire_diameter_m is None
                      else rosa_correction_h(turns, diameter_m, pitch, wire_diameter_m))
        return SolenoidTurns(turns=turns, length_m=length, pitch_m=pitch,
                             nagaoka=nagaoka_coefficient(diameter_m, length),
                             inductance_built_h=sheet - correction,
                             round_wire_correction_h=correction)

    nearest = max(1, round(exact))
    if wire_diameter_m is None:
        return wound(nearest)
    # Rosa's correction is a few per cent of L, so the answer lies within a few turns.
    spread = max(3, math.ceil(0.1 * exact))
    options = [wound(n) for n in range(max(1, nearest - spread), nearest + spread + 1)]
    options = [o for o in options if o.inductance_built_h > 0.0]
    return min(options, key=lambda o: abs(math.log(o.inductance_built_h / inductance_h)))


def medhurst_self_capacitance_f(diameter_m: float, length_m: float) -> float:
    """Medhurst (Wireless Engineer 24, 1947): C = H·D, H [pF/cm] = 0.1126 l/D + 0.08 + 0.27/√(l/D).

    An empirical fit to measured single-layer solenoids, for l/D from about 1 upwards; below
    l/D ≈ 1 his measured H rises above the fit.
    """
    ratio = length_m / diameter_m
    h_pf_per_cm = 0.1126 * ratio + 0.08 + 0.27 / math.sqrt(ratio)
    return h_pf_per_cm * (diameter_m * 100.0) * 1e-12


# --------------------------------------------------------------------------- core loss

LossKind = Literal["loss_factor", "material_q"]


@dataclass(frozen=True)
class CoreLossTable:
    """A material's small-signal loss against frequency, as given by its maker's curves.

    kind "loss_factor": values are the relative loss factor tanδ/µi (IEC 60401-3);
    kind "material_q": values are the Q of a coil on the ungapped core (core loss only).
    """

    frequency_hz: tuple[float, ...]
    value: tuple[float, ...]
    kind: LossKind = "loss_factor"

    def __post_init__(self):
        if self.kind not in ("loss_factor", "material_q"):
            raise ValueError(
                f"loss table kind must be loss_factor or material_q, not {self.kind!r}")
        if len(self.frequency_hz) != len(self.value) or not self.frequency_hz:
            raise ValueError("a loss table needs one value per frequency, at least one row")
        if any(f <= 0.0 for f in self.frequency_hz) or any(v <= 0.0 for v in self.value):
            raise ValueError("loss table frequencies and values must be positive")
        if any(b <= a for a, b in zip(self.frequency_hz, self.frequency_hz[1:])):
            raise ValueError("loss table frequencies must increase")

    def covers(self, f_hz: float) -> bool:
        """True when f lies within the table (no extrapolation)."""
        return self.frequency_hz[0] <= f_hz <= self.frequency_hz[-1]


def core_loss_factor(f_hz, table: CoreLossTable, mu_i: float):
    """tanδ/µi at f, interpolated as a power law between rows (linear in log f, log value).

    Beyond the table the end row pair's power law is continued (a one-row table is taken
    as constant); check CoreLossTable.covers to know when that happened. A material-Q table
    converts as tanδ/µi = 1/(Q µi).
    """
    f = np.asarray(f_hz, dtype=float)
    log_f = np.log(np.asarray(table.frequency_hz))
    values = np.asarray(table.value, dtype=float)
    log_v = np.log(values if table.kind == "loss_factor" else 1.0 / (values * mu_i))
    if len(log_f) == 1:
        result = np.full(f.shape, math.exp(log_v[0]))
    else:
        x = np.log(np.where(f > 0.0, f, table.frequency_hz[0]))
        inside = np.interp(x, log_f, log_v)
        low_slope = (log_v[1] - log_v[0]) / (log_f[1] - log_f[0])
        high_slope = (log_v[-1] - log_v[-2]) / (log_f[-1] - log_f[-2])
        below = log_v[0] + low_slope * (x - log_f[0])
        above = log_v[-1] + high_slope * (x - log_f[-1])
        result = np.exp(np.where(x < log_f[0], below, np.where(x > log_f[-1], above, inside)))
    return float(result) if np.ndim(result) == 0 else result


def core_loss_resistance_ohm(inductance_h, f_hz, table: CoreLossTable, mu_i: float,
                             mu_e: float | None = None):
    """Series loss resistance of the core: R = ω L tanδ_e, tanδ_e = (tanδ/µi) · µe.

    µe is the magnetic circuit's effective permeability, µi for an ungapped ring (IEC 60401-3
    defines the relative loss factor so that it scales with µe for a gapped core).
    """
    mu_e = mu_i if mu_e is None else mu_e
    return reactance_ohm(inductance_h, np.asarray(f_hz, dtype=float)) * core_loss_factor(
        f_hz, table, mu_i) * mu_e


def peak_flux_density_t(voltage_rms_v, f_hz, turns, ae_m2):
    """B̂ = √2 V_rms / (ω N Ae), from Faraday's law for a sinusoidal voltage."""
    return math.sqrt(2.0) * voltage_rms_v / (2.0 * math.pi * f_hz * turns * ae_m2)


def steinmetz_core_loss_w(f_hz, flux_density_peak_t, k, alpha, beta, ve_m3):
    """P = k f^α B̂^β · Ve (Steinmetz's power law; k in W/m³ with f in Hz and B̂ in T)."""
    return k * f_hz**alpha * flux_density_peak_t**beta * ve_m3


def temperature_rise_k(power_w, surface_area_m2):
    """ΔT [K] = (P [mW] / A [cm²])^0.833, natural convection (common practice, empirical)."""
    return (power_w * 1e3 / (surface_area_m2 * 1e4)) ** 0.833


def link_turns(tank_turns: int, tank_resistance_ohm: float, link_resistance_ohm: float) -> int:
    """M = N √(R_link/R_tank), rounded, at least 1 (ideal transformer: R scales as turns²)."""
    if not (tank_resistance_ohm > 0.0 and link_resistance_ohm > 0.0):
        raise ValueError("tank and link resistances must be positive")
    return max(1, round(tank_turns * math.sqrt(link_resistance_ohm / tank_resistance_ohm)))
