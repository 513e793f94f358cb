"""Series and parallel RLC resonance with lossy parts, source and load.

The circuits (all resistances frequency-independent, evaluated at f0):

* series: a source of resistance Rs, the coil L with its series loss rL, the capacitor C
  with its ESR rC and the load RL, all in one loop. The response is the loop current.
* parallel: two branches across one node, (L + rL) and (C + rC), the load RL across the
  node, driven through Rs (a Norton current source when Rs is absent), or through Rs and a
  series coupling capacitor Cc (a test set-up's loose coupling). The response is the node
  voltage.

Every function here takes numpy arrays as well as floats: the variation analysis re-runs
the same code on perturbed inputs, one element per trial.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Literal

import numpy as np

from sheetgen.engine.roots import safe_newton

Topology = Literal["series", "parallel"]

# Search bracket for the response maximum, in ln(f/f0); the half-power points are looked
# for from there outwards, the bracket's span doubled (in ln f) up to _EXPANSIONS times,
# i.e. as far as f0·10^±12 (a Q of about 1e-12).
_BRACKET_LN = math.log(50.0)
_EXPANSIONS = 3
_FARTHEST_LN = 12.0 * math.log(10.0)


class NoResonanceError(ValueError):
    """The response has no maximum or no half-power point in a decade and more around f0."""


@dataclass(frozen=True)
class Circuit:
    """A tuned circuit in SI units. None: the source is ideal / there is no load."""

    topology: Topology
    inductance_h: float
    inductor_resistance_ohm: float
    capacitance_f: float
    capacitor_esr_ohm: float
    source_resistance_ohm: float | None = None
    load_resistance_ohm: float | None = None
    # parallel only: a capacitor in series with Rs between the source and the tank
    source_capacitance_f: float | None = None


@dataclass(frozen=True)
class Resonance:
    """What the response of a Circuit does around resonance (None where not applicable)."""

    f0_hz: float
    f_peak_hz: float
    f_unity_pf_hz: float | None
    reactance_ohm: float
    q_inductor: float | None
    q_capacitor: float | None
    q_unloaded: float | None
    q_loaded: float | None
    bandwidth_hz: float | None
    f_low_hz: float | None
    f_high_hz: float | None
    impedance_at_peak_ohm: float
    dynamic_resistance_ohm: float | None


@dataclass(frozen=True)
class Sweep:
    """The response over a frequency grid. Impedance is what the source terminals see."""

    f_hz: np.ndarray
    impedance_ohm: np.ndarray
    phase_deg: np.ndarray
    response_db: np.ndarray


def resonant_frequency_hz(inductance_h, capacitance_f):
    """f0 = 1 / (2π √(LC)), Thomson's formula."""
    return 1.0 / (2.0 * np.pi * np.sqrt(inductance_h * capacitance_f))


def reactance_ohm(inductance_h, f_hz):
    """Inductive reactance X_L = 2π f L."""
    return 2.0 * np.pi * f_hz * inductance_h


def capacitance_for_f0(f0_hz, inductance_h):
    """C = 1 / ((2π f0)² L), Thomson's formula solved for C."""
    return 1.0 / ((2.0 * np.pi * f0_hz) ** 2 * inductance_h)


def esr_from_dissipation_factor_ohm(dissipation_factor, capacitance_f, f_hz):
    """ESR = D/(ωC): a capacitor's dissipation factor D = tan δ = ESR·ωC at f."""
    return dissipation_factor / (2.0 * np.pi * f_hz * capacitance_f)


def inductance_for_f0(f0_hz, capacitance_f):
    """L = 1 / ((2π f0)² C), Thomson's formula solved for L."""
    return 1.0 / ((2.0 * np.pi * f0_hz) ** 2 * capacitance_f)


def unity_power_factor_hz(inductance_h, capacitance_f, inductor_resistance_ohm,
                          capacitor_esr_ohm):
    """Frequency where a lossy two-branch tank is purely resistive (NaN where none).

    Setting Im[1/(rL + jωL) + 1/(rC + 1/(jωC))] = 0 gives
    ω = ω0 √((L/C − rL²)/(L/C − rC²)); with rC = 0 this is the textbook
    f0 √(1 − rL² C/L) (e.g. Hughes, Electrical and Electronic Technology, ch. 15).
    """
    characteristic = inductance_h / capacitance_f
    ratio = ((characteristic - inductor_resistance_ohm**2)
             / (characteristic - capacitor_esr_ohm**2))
    with np.errstate(invalid="ignore"):
        return np.where(ratio > 0, resonant_frequency_hz(inductance_h, capacitance_f)
                        * np.sqrt(np.abs(ratio)), np.nan)


def terminal_impedance(circuit: Circuit, f_hz):
    """Complex impedance the source terminals see (the source's own Rs excluded)."""
    omega = 2.0 * np.pi * np.asarray(f_hz, dtype=float)
    z_coil = circuit.inductor_resistance_ohm + 1j * omega * circuit.inductance_h
    z_cap = circuit.capacitor_esr_ohm + 1.0 / (1j * omega * circuit.capacitance_f)
    if circuit.topology == "series":
        return z_coil + z_cap + _or_zero(circuit.load_resistance_ohm)
    admittance = 1.0 / z_coil + 1.0 / z_cap + _conductance(circuit.load_resistance_ohm)
    return 1.0 / admittance


def dynamic_resistance_ohm(circuit: Circuit, f_unity_pf_hz):
    """Dynamic resistance: |Z| of the two-branch tank alone (no load) at its zero-phase
    frequency, where Z = 1/(1/(rL + jωL) + 1/(rC + 1/(jωC))) is purely resistive. Exact;
    the textbook X0²/(rL + rC) (Hughes, ch. 15) is its high-Q approximation."""
    tank = Circuit("parallel", circuit.inductance_h, circuit.inductor_resistance_ohm,
                   circuit.capacitance_f, circuit.capacitor_esr_ohm)
    with np.errstate(divide="ignore", invalid="ignore"):
        return _finite_or_none(np.abs(terminal_impedance(tank, f_unity_pf_hz)))


def _or_zero(resistance_ohm):
    return 0.0 if resistance_ohm is None else resistance_ohm


def _conductance(resistance_ohm):
    return 0.0 if resistance_ohm is None else 1.0 / resistance_ohm


def _response_denominator(circuit: Circuit, omega):
    """D(ω) with response ∝ 1/D, and its first two derivatives in ω.

    Series: D = Rs + RL + rL + rC + j(ωL − 1/(ωC)), the loop impedance.
    Parallel: D = 1/(rL + jωL) + jωC/(1 + jωC·rC) + 1/RL + 1/Rs, the node admittance; fed
    through Zs = Rs + 1/(jωCc), the node voltage is E/(1 + Zs·Y) (a divider, Y the node
    admittance without the source), so D = 1 + Zs·Y, its derivatives by the product rule.
    """
    L, C = circuit.inductance_h, circuit.capacitance_f
    r_l, r_c = circuit.inductor_resistance_ohm, circuit.capacitor_esr_ohm
    if circuit.topology == "series":
        resistance = (_or_zero(circuit.source_resistance_ohm)
                      + _or_zero(circuit.load_resistance_ohm) + r_l + r_c)
        d = resistance + 1j * (omega * L - 1.0 / (omega * C))
        d1 = 1j * (L + 1.0 / (omega * omega * C))
        d2 = -2j / (omega**3 * C)
        return d, d1, d2
    inv_coil = 1.0 / (r_l + 1j * omega * L)  # one division each; the rest multiplies
    inv_cap = 1.0 / (1.0 + 1j * omega * C * r_c)
    coupled = circuit.source_capacitance_f is not None
    d = (inv_coil + 1j * omega * C * inv_cap + _conductance(circuit.load_resistance_ohm)
         + (0.0 if coupled else _conductance(circuit.source_resistance_ohm)))
    inv_coil2, inv_cap2 = inv_coil * inv_coil, inv_cap * inv_cap
    d1 = -1j * L * inv_coil2 + 1j * C * inv_cap2
    d2 = -2.0 * L * L * inv_coil2 * inv_coil + 2.0 * C * C * r_c * inv_cap2 * inv_cap
    if not coupled:
        return d, d1, d2
    cc = circuit.source_capacitance_f
    zs = _or_zero(circuit.source_resistance_ohm) - 1j / (omega * cc)
    zs1 = 1j / (omega * omega * cc)
    zs2 = -2j / (omega**3 * cc)
    return 1.0 + zs * d, zs1 * d + zs * d1, zs2 * d + 2.0 * zs1 * d1 + zs * d2


def _outer_edge(excess, u_peak, edge):
    """The bracket end beyond a half-power point: `edge` (ln f/f0, on one side of the peak)
    with its span doubled, at most _EXPANSIONS times and to ±_FARTHEST_LN, for the
    elements where |D|² has not yet passed the half-power target there."""
    edge = np.asarray(edge, dtype=float)
    for _ in range(_EXPANSIONS):
        short = ~(excess(edge)[0] > 0)
        if not np.any(short):
            break
        wider = np.clip(2.0 * edge, -_FARTHEST_LN, _FARTHEST_LN)
        edge = np.where(short, wider, edge)
    return edge


@dataclass(frozen=True)
class ResponseFeatures:
    """Peak and half-power frequencies of the response, arrays, NaN where absent."""

    f0_hz: np.ndarray
    f_peak_hz: np.ndarray
    f_low_hz: np.ndarray
    f_high_hz: np.ndarray


def response_features(circuit: Circuit) -> ResponseFeatures:
    """Maximum of |response| and its half-power points, from the exact complex response.

    The maximum of 1/|D| is where d|D|²/dω = 2 Re(D* · dD/dω) changes sign; the half-power
    points are where |D|² = 2 |D(ω_peak)|². The peak is bracketed within ln(f/f0) = ±ln 50,
    each half-power point by widening that bracket geometrically until |D|² exceeds the
    target there (to f0·10^±12 at most); both are found by safeguarded Newton iteration,
    element by element when the values are arrays.
    """
    f0 = np.asarray(resonant_frequency_hz(circuit.inductance_h, circuit.capacitance_f),
                    dtype=float)
    omega0 = 2.0 * np.pi * f0

    def slope(u):
        """d|D|²/dω / 2 = Re(D* D'), and its derivative in u = ln(f/f0)."""
        omega = omega0 * np.exp(u)
        d, d1, d2 = _response_denominator(circuit, omega)
        return np.real(np.conj(d) * d1), omega * (np.abs(d1) ** 2 + np.real(np.conj(d) * d2))

    edge = np.full_like(f0, _BRACKET_LN)
    has_peak = (slope(-edge)[0] < 0) & (slope(edge)[0] > 0)
    u_peak = safe_newton(slope, -edge, edge, np.zeros_like(f0))
    omega_peak = omega0 * np.exp(u_peak)
    d_peak, _, _ = _response_denominator(circuit, omega_peak)
    target = 2.0 * np.abs(d_peak) ** 2
    # Near the peak |D|² ≈ |D_p|² (1 + 4Q²(u − u_p)²): the curvature gives Q, and the
    # half-power points start from u_p ± 1/(2Q).
    curvature = 2.0 * omega_peak * slope(u_peak)[1]
    with np.errstate(divide="ignore", invalid="ignore"):
        offset = np.sqrt(np.abs(target) / np.where(curvature > 0, curvature, np.inf))
    offset = np.clip(np.nan_to_num(offset, nan=0.1), 1e-9, _FARTHEST_LN)

    def excess(u):
        """|D|² − 2|D_p|² and its derivative in u, 2ω·Re(D* D')."""
        omega = omega0 * np.exp(u)
        d, d1, _ = _response_denominator(circuit, omega)
        return np.abs(d) ** 2 - target, 2.0 * omega * np.real(np.conj(d) * d1)

    low_edge = _outer_edge(excess, u_peak, -edge)
    high_edge = _outer_edge(excess, u_peak, edge)
    has_low = excess(low_edge)[0] > 0
    has_high = excess(high_edge)[0] > 0
    u_low = safe_newton(excess, low_edge, u_peak,
                         np.maximum(u_peak - offset, u_peak + 0.999 * (low_edge - u_peak)))
    u_high = safe_newton(excess, u_peak, high_edge,
                          np.minimum(u_peak + offset, u_peak + 0.999 * (high_edge - u_peak)))
    nan = np.nan
    return ResponseFeatures(
        f0_hz=f0,
        f_peak_hz=np.where(has_peak, f0 * np.exp(u_peak), nan),
        f_low_hz=np.where(has_peak & has_low, f0 * np.exp(u_low), nan),
        f_high_hz=np.where(has_peak & has_high, f0 * np.exp(u_high), nan),
    )


def unloaded_q(circuit: Circuit):
    """Q of the tank's own losses, X0/(rL + rC) (reactance over resistance)."""
    x0 = reactance_ohm(circuit.inductance_h,
                       resonant_frequency_hz(circuit.inductance_h, circuit.capacitance_f))
    return _ratio(x0, circuit.inductor_resistance_ohm + circuit.capacitor_esr_ohm)


def _ratio(numerator, denominator):
    with np.errstate(divide="ignore"):
        return np.where(denominator > 0, numerator / np.where(denominator > 0, denominator, 1.0),
                        np.inf)


def analyse(circuit: Circuit) -> Resonance:
    """Resonance of one circuit: frequencies, Q, bandwidth and impedance at the peak.

    q_loaded is f0/bandwidth of the actual response (for a series circuit this equals
    X0 divided by every resistance in the loop). Raises NoResonanceError when the
    response has no maximum near f0.
    """
    features = response_features(circuit)
    f0 = float(features.f0_hz)
    f_peak = float(features.f_peak_hz)
    if math.isnan(f_peak):
        raise NoResonanceError(
            "the response has no maximum within a factor of 50 of f0: the losses swamp "
            "the resonance (raise Q or the load resistance)")
    f_low, f_high = _float_or_none(features.f_low_hz), _float_or_none(features.f_high_hz)
    f_unity = (_float_or_none(unity_power_factor_hz(
        circuit.inductance_h, circuit.capacitance_f, circuit.inductor_resistance_ohm,
        circuit.capacitor_esr_ohm)) if circuit.topology == "parallel" else None)
    bandwidth = None if f_low is None or f_high is None else f_high - f_low
    x0 = float(reactance_ohm(circuit.inductance_h, f0))
    r_l, r_c = circuit.inductor_resistance_ohm, circuit.capacitor_esr_ohm
    return Resonance(
        f0_hz=f0,
        f_peak_hz=f_peak,
        f_unity_pf_hz=f_unity,
        reactance_ohm=x0,
        q_inductor=_finite_or_none(_ratio(x0, r_l)),
        q_capacitor=_finite_or_none(_ratio(x0, r_c)),
        q_unloaded=_finite_or_none(unloaded_q(circuit)),
        q_loaded=None if bandwidth is None else f0 / bandwidth,
        bandwidth_hz=bandwidth,
        f_low_hz=f_low,
        f_high_hz=f_high,
        impedance_at_peak_ohm=float(np.abs(terminal_impedance(circuit, f_peak))),
        dynamic_resistance_ohm=(None if f_unity is None or r_l + r_c <= 0
                                else dynamic_resistance_ohm(circuit, f_unity)),
    )


def _float_or_none(value) -> float | None:
    number = float(value)
    return None if math.isnan(number) else number


def _finite_or_none(value) -> float | None:
    number = float(value)
    return number if math.isfinite(number) else None


def relative_response_db(circuit: Circuit, reference: Circuit, f_hz):
    """Response of `circuit` over f_hz in dB relative to the maximum of `reference`'s
    (the same drive): 20 log10(|D_ref(ω_peak)| / |D(ω)|). Broadcasts like numpy."""
    f_peak = np.asarray(response_features(reference).f_peak_hz, dtype=float)
    d_peak = _response_denominator(reference, 2.0 * np.pi * f_peak)[0]
    d = _response_denominator(circuit, 2.0 * np.pi * np.asarray(f_hz, dtype=float))[0]
    return 20.0 * np.log10(np.abs(d_peak) / np.abs(d))


def sweep(circuit: Circuit, f_hz: np.ndarray) -> Sweep:
    """|Z|, phase and the response in dB relative to its maximum over f_hz."""
    f_hz = np.asarray(f_hz, dtype=float)
    impedance = terminal_impedance(circuit, f_hz)
    return Sweep(f_hz=f_hz, impedance_ohm=np.abs(impedance),
                 phase_deg=np.degrees(np.angle(impedance)),
                 response_db=relative_response_db(circuit, circuit, f_hz))


def default_sweep_range_hz(resonance: Resonance) -> tuple[float, float]:
    """A span that shows the skirts: ±4 bandwidths around f_peak, within f0/3 … 3·f0."""
    half_span = 4.0 * (resonance.bandwidth_hz or resonance.f0_hz / 2.0)
    low = max(resonance.f_peak_hz - half_span, resonance.f0_hz / 3.0)
    high = min(resonance.f_peak_hz + half_span, resonance.f0_hz * 3.0)
    if not low < resonance.f_peak_hz < high:  # a peak far from f0: span both, a decade out
        low = min(resonance.f0_hz, resonance.f_peak_hz) / 3.0
        high = max(resonance.f0_hz, resonance.f_peak_hz) * 3.0
    return low, high


_LOAD_GRID_POINTS = 64  # RL grid per round when solving for a loaded-Q target
_LOAD_GRID_ROUNDS = 8  # 27.6 (ln of 12 decades) / 63^8 < 1e-13


class LoadedQUnreachable(ValueError):
    """No load resistance gives the wanted loaded Q; `low`/`high` are the Q the load can span."""

    def __init__(self, wanted_q: float, low: float, high: float):
        self.wanted_q, self.low, self.high = wanted_q, low, high
        super().__init__(f"a loaded Q of {wanted_q:.4g} cannot be reached with a load "
                         f"resistance: the losses and source allow {low:.3g} to {high:.3g}")


def loaded_q(circuit: Circuit, loads_ohm: np.ndarray) -> np.ndarray:
    """f0/bandwidth of the circuit with each of the load resistances (0 where no −3 dB
    points), all in one vectorised evaluation of the exact response."""
    features = response_features(replace(circuit, load_resistance_ohm=loads_ohm))
    with np.errstate(invalid="ignore", divide="ignore"):
        q = features.f0_hz / (features.f_high_hz - features.f_low_hz)
    return np.nan_to_num(q, nan=0.0)


def load_for_loaded_q(circuit: Circuit, wanted_q: float) -> float:
    """The load resistance that gives loaded Q = f0/bandwidth = wanted_q.

    Solved on the exact response: the loaded Q moves monotonically with RL (down as a
    series load grows, up as a parallel load grows), so a grid of RL over twelve decades
    around X0 brackets the answer and each finer grid inside the bracket narrows it 63-fold.
    Raises LoadedQUnreachable when no load in that span reaches it.
    """
    x0 = float(reactance_ohm(circuit.inductance_h,
                             resonant_frequency_hz(circuit.inductance_h, circuit.capacitance_f)))
    low_u, high_u = math.log(x0 * 1e-6), math.log(x0 * 1e6)
    ends = loaded_q(circuit, np.exp(np.array([low_u, high_u])))
    if not min(ends) < wanted_q < max(ends):
        raise LoadedQUnreachable(wanted_q, float(min(ends)), float(max(ends)))
    rising = ends[1] > ends[0]
    for _ in range(_LOAD_GRID_ROUNDS):
        grid = np.linspace(low_u, high_u, _LOAD_GRID_POINTS)
        below = (loaded_q(circuit, np.exp(grid)) < wanted_q) == rising
        index = int(np.count_nonzero(below))  # grid[:index] lie on the low side
        index = min(max(index, 1), _LOAD_GRID_POINTS - 1)
        low_u, high_u = grid[index - 1], grid[index]
    return math.exp(0.5 * (low_u + high_u))
