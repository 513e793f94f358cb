"""Round copper winding wire: sizes, enamel build, resistivity, skin and proximity effect.

Every function takes plain SI floats; the frequency-dependent ones also take numpy arrays
of frequency and return an array of the same shape (a float for a scalar input).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

import numpy as np

from sheetgen.engine.constants import MU_0_H_PER_M as mu_0

# IEC 60028: annealed copper standard, 1/58 Ω·mm²/m at 20 °C, α20 = 0.00393 /K.
COPPER_RESISTIVITY_20C_OHM_M = 1.0 / 58.0e6
COPPER_TEMPERATURE_COEFFICIENT_PER_K = 0.00393

AWG_MIN = -3  # 0000 ("4/0"); 000 = -2, 00 = -1, 0 = 0
AWG_MAX = 56
METRIC_DIAMETER_MIN_M = 0.010e-3
METRIC_DIAMETER_MAX_M = 12.0e-3
ENAMEL_GRADES = (1, 2, 3)

# Maximum overall diameter of enamelled round copper wire, IEC 60317-0-1 (grades 1, 2
# and 3), a few nominal sizes (from memory; see tests/reference/enamel_build.md). Columns:
# nominal copper diameter, grade 1, grade 2 and grade 3 maximum overall diameter, in mm.
_ENAMEL_TABLE_MM = (
    (0.100, 0.117, 0.125, 0.132),
    (0.200, 0.226, 0.239, 0.252),
    (0.500, 0.544, 0.566, 0.587),
    (1.000, 1.062, 1.093, 1.124),
    (2.000, 2.074, 2.112, 2.150),
)

# Above this x = √2·r/δ the Kelvin-function products approach overflow (ber ~ e^(x/√2));
# the asymptotic series is used instead (its next term is about 4e-12 relative there).
_KELVIN_X_MAX = 200.0
_SERIES_X_MAX = 1.0e-3  # below this, the first term of the power series is exact to 1e-16
_PROXIMITY_X_MAX = 1.0e4  # above this, the asymptote of the transverse-field loss is used


@dataclass(frozen=True)
class Wire:
    """An enamelled round copper wire: copper diameter and diameter over the enamel."""

    name: str
    diameter_m: float
    overall_diameter_m: float
    grade: int
    awg: int | None = None


COPPER_REFERENCE_TEMPERATURE_C = 20.0  # IEC 60028's reference; windings are taken at it


def copper_resistivity_ohm_m(temperature_c: float = COPPER_REFERENCE_TEMPERATURE_C) -> float:
    """ρ(T) = ρ20 (1 + α20 (T − 20 °C)), annealed copper per IEC 60028.

    The linear law is the standard's; it is good to a fraction of a percent between about
    −50 °C and +150 °C (common practice).
    """
    ratio = 1.0 + COPPER_TEMPERATURE_COEFFICIENT_PER_K * (temperature_c - COPPER_REFERENCE_TEMPERATURE_C)
    if ratio <= 0.0:
        raise ValueError(f"copper temperature {temperature_c} °C is below the linear law's range")
    return COPPER_RESISTIVITY_20C_OHM_M * ratio


def awg_diameter_m(gauge: int) -> float:
    """AWG copper diameter by ASTM B258: d = 0.127 mm · 92^((36 − n)/39).

    Gauge 0 is "0", −1 is "00", −2 is "000", −3 is "0000" (4/0); accepted −3 … 56.
    """
    if isinstance(gauge, bool) or not isinstance(gauge, (int, np.integer)):
        raise ValueError(f"AWG gauge must be a whole number, not {gauge!r}")
    if not AWG_MIN <= gauge <= AWG_MAX:
        raise ValueError(
            f"AWG {gauge} is outside the accepted gauges 0000 (written -3 or 4/0) to {AWG_MAX}")
    return 0.127e-3 * 92.0 ** ((36 - int(gauge)) / 39.0)


def awg_name(gauge: int) -> str:
    """"AWG 24"; the aught sizes as "AWG 1/0" … "AWG 4/0"."""
    return f"AWG {1 - gauge}/0" if gauge <= 0 else f"AWG {gauge}"


def enamelled_overall_diameter_m(diameter_m: float, grade: int = 2) -> float:
    """Maximum overall diameter over the enamel for grade 1, 2 or 3 (IEC 60317-0-1, from
    memory).

    The increase (overall − copper) is interpolated in log–log between the table rows above
    and extended beyond its ends along the end rows' power law. Using the maximum makes a
    fit check conservative.
    """
    if grade not in ENAMEL_GRADES:
        raise ValueError(f"enamel grade must be 1, 2 or 3, not {grade!r}")
    if not diameter_m > 0.0:
        raise ValueError(f"wire diameter must be positive, not {diameter_m!r} m")
    column = grade  # grade n → column n
    log_d = [math.log(row[0]) for row in _ENAMEL_TABLE_MM]
    log_inc = [math.log(row[column] - row[0]) for row in _ENAMEL_TABLE_MM]
    x = math.log(diameter_m * 1e3)
    if x <= log_d[0]:
        k = 0
    elif x >= log_d[-1]:
        k = len(log_d) - 2
    else:
        k = max(i for i in range(len(log_d) - 1) if log_d[i] <= x)
    slope = (log_inc[k + 1] - log_inc[k]) / (log_d[k + 1] - log_d[k])
    increase_mm = math.exp(log_inc[k] + slope * (x - log_d[k]))
    return diameter_m + increase_mm * 1e-3


def make_wire(diameter_m: float, grade: int = 2, name: str | None = None,
              awg: int | None = None) -> Wire:
    """A Wire of the given copper diameter with the enamel build of its grade."""
    if name is None:
        name = awg_name(awg) if awg is not None else _metric_name(diameter_m)
    return Wire(name=name, diameter_m=diameter_m,
                overall_diameter_m=enamelled_overall_diameter_m(diameter_m, grade),
                grade=grade, awg=awg)


def awg_wire(gauge: int, grade: int = 2) -> Wire:
    """The enamelled wire of an AWG gauge."""
    return make_wire(awg_diameter_m(gauge), grade, awg=gauge)


def _metric_name(diameter_m: float) -> str:
    d_mm = diameter_m * 1e3
    return f"{d_mm:.2f} mm" if abs(round(d_mm, 2) - d_mm) < 1e-9 else f"{d_mm:.3f} mm"


_ACCEPTED = ('an AWG gauge ("AWG 24", "24 AWG", "awg24"; 0000 or 4/0 to 56) '
             'or a copper diameter in millimetres ("0.5 mm", "0.50mm")')
_AWG_TOKEN = r"(?P<g>-?\d+(?:/0)?)"
_AWG_FORMS = (re.compile(rf"^awg\s*#?\s*{_AWG_TOKEN}$"), re.compile(rf"^#?\s*{_AWG_TOKEN}\s*awg$"))
_METRIC = re.compile(r"^(?P<d>[-+]?(?:\d+(?:\.\d*)?|\.\d+))\s*mm$")


def _gauge_from_token(token: str) -> int:
    if token.endswith("/0"):
        aughts = int(token[:-2])
        if not 1 <= aughts <= 4:
            raise ValueError(f'AWG "{token}" is not a gauge: the aught sizes run 1/0 to 4/0; '
                             f'accepted is {_ACCEPTED}')
        return 1 - aughts
    if len(token) > 1 and set(token) == {"0"}:  # "00", "000", "0000"
        return 1 - len(token)
    if token.startswith("-"):  # the aught sizes are written 00…0000 or 2/0…4/0, never negative
        raise ValueError(f'AWG "{token}" is not a gauge: write the aught sizes as 00, 000, '
                         f'0000 or 2/0 to 4/0; accepted is {_ACCEPTED}')
    return int(token)


def wire_from_designation(text: str, grade: int = 2) -> Wire:
    """Parse "AWG 24", "24 AWG", "awg24", "AWG 4/0", "0.5 mm", "0.50mm" into a Wire."""
    cleaned = " ".join(str(text).strip().lower().split())
    for form in _AWG_FORMS:
        match = form.match(cleaned)
        if match:
            gauge = _gauge_from_token(match.group("g"))
            if not AWG_MIN <= gauge <= AWG_MAX:
                raise ValueError(f'wire size "{text}" is not a size: AWG gauges run 0000 '
                                 f'(4/0) to {AWG_MAX}; accepted is {_ACCEPTED}')
            return awg_wire(gauge, grade)
    match = _METRIC.match(cleaned)
    if match:
        diameter_m = float(match.group("d")) * 1e-3
        if not diameter_m > 0.0:
            raise ValueError(f'wire size "{text}" is not a size: a copper diameter must be '
                             f'positive; accepted is {_ACCEPTED}')
        if not METRIC_DIAMETER_MIN_M <= diameter_m <= METRIC_DIAMETER_MAX_M:
            raise ValueError(
                f'wire size "{text}" is not a size: a copper diameter must lie between '
                f'{METRIC_DIAMETER_MIN_M * 1e3:g} mm and {METRIC_DIAMETER_MAX_M * 1e3:g} mm; '
                f'accepted is {_ACCEPTED}')
        return make_wire(diameter_m, grade)
    raise ValueError(f'wire size "{text}" is not a size: accepted is {_ACCEPTED}')


def dc_resistance_ohm(length_m, diameter_m, resistivity_ohm_m):
    """R = ρ l / A with A = π d²/4."""
    return resistivity_ohm_m * length_m / (math.pi * diameter_m**2 / 4.0)


def straight_wire_inductance_h(length_m, diameter_m, high_frequency: bool = True):
    """Self-inductance of a straight round wire of length l and radius r (l ≫ r), Rosa
    (1908) and Grover, "Inductance Calculations" (1946):

        L = (µ0·l / 2π)·(ln(2l/r) − 1)      at high frequency (current on the surface)
        L = (µ0·l / 2π)·(ln(2l/r) − 3/4)    at DC (uniform current: + µ0·l/8π inside)
    """
    length = np.asarray(length_m, dtype=float)
    r = 0.5 * np.asarray(diameter_m, dtype=float)
    constant = 1.0 if high_frequency else 0.75
    result = mu_0 * length / (2.0 * math.pi) * (np.log(2.0 * length / r) - constant)
    return _like_input(result)


def current_density_a_per_m2(current_rms_a, diameter_m):
    """J = I / (π d²/4), the DC (uniform) current density."""
    return current_rms_a / (math.pi * diameter_m**2 / 4.0)


def skin_depth_m(resistivity_ohm_m, f_hz, mu_r=1.0):
    """δ = √(ρ / (π f µ0 µr)); infinite at f = 0."""
    f = np.asarray(f_hz, dtype=float)
    denominator = math.pi * f * mu_0 * mu_r
    safe = np.where(denominator > 0.0, denominator, 1.0)
    depth = np.where(denominator > 0.0, np.sqrt(resistivity_ohm_m / safe), np.inf)
    return _like_input(depth)


def _kelvin_x(diameter_m, f_hz, resistivity_ohm_m):
    """x = √2 · r / δ = r √(2π f µ0 / ρ) (written without δ, so f = 0 gives x = 0)."""
    f = np.asarray(f_hz, dtype=float)
    if np.any(f < 0.0):
        raise ValueError("frequency must not be negative")
    return (diameter_m / 2.0) * np.sqrt(2.0 * math.pi * f * mu_0 / resistivity_ohm_m)


def skin_ratio_from_x(x):
    """R_ac/R_dc of an isolated round wire against x = √2 r/δ (exact Bessel solution).

    R_ac/R_dc = (x/2) · (ber x · bei′x − bei x · ber′x) / (ber′²x + bei′²x), the form given
    in Ramo, Whinnery & Van Duzer, Fields and Waves in Communication Electronics (internal
    impedance of a round wire) and in Terman, Radio Engineers' Handbook (1943).
    Below x = 1e-3: the series 1 + x⁴/192. Above x = 200: the asymptote
    x/(2√2) + 1/4 + 3/(16√2 x) − 63/(256√2 x³), from the Hankel expansions of J0/J1
    (the Kelvin-function products would overflow near x = 500).
    """
    x, shape = _flat(x)
    ratio = np.empty_like(x)
    small = x < _SERIES_X_MAX
    large = x > _KELVIN_X_MAX
    mid = ~(small | large)
    ratio[small] = 1.0 + x[small] ** 4 / 192.0
    xm = x[mid]
    import scipy.special as sp  # imported on first use: a job without a coil never needs it
    ber, bei, berp, beip = sp.ber(xm), sp.bei(xm), sp.berp(xm), sp.beip(xm)
    ratio[mid] = (xm / 2.0) * (ber * beip - bei * berp) / (berp**2 + beip**2)
    xl = x[large]
    s2 = math.sqrt(2.0)
    ratio[large] = xl / (2 * s2) + 0.25 + 3.0 / (16 * s2 * xl) - 63.0 / (256 * s2 * xl**3)
    return _like_input(ratio.reshape(shape))


def ac_resistance_ratio(diameter_m, f_hz, resistivity_ohm_m):
    """R_ac/R_dc of an isolated straight round wire (skin effect only); see skin_ratio_from_x."""
    return skin_ratio_from_x(_kelvin_x(diameter_m, f_hz, resistivity_ohm_m))


def transverse_field_loss_function(x):
    """G(x) = Re{ j z* J1(z)/J0(z) }, z = x·e^(−jπ/4): loss of a round wire in a uniform field.

    A conducting cylinder of radius a in a uniform transverse field of peak H0 dissipates
    P′ = (2π H0²/σ) · G(x) per unit length (the cylinder in a transverse field, solved with
    A_z ∝ J1(kρ) sin φ inside, as in Lammeraner & Štafl, Eddy Currents, 1966; Ferreira,
    IEEE Trans. Power Electron. 9(1), 1994, uses the same solution for round conductors).
    Limits: G → x⁴/16 at low frequency (P′ = π σ ω² B0² a⁴/8) and
    G → x/√2 − 1/2 − 1/(8√2 x) at high frequency (surface field 2 H0 sin φ).
    """
    x, shape = _flat(x)
    g = np.empty_like(x)
    small = x < _SERIES_X_MAX
    large = x > _PROXIMITY_X_MAX
    mid = ~(small | large)
    g[small] = x[small] ** 4 / 16.0
    z = x[mid] * np.exp(-0.25j * math.pi)
    # jve scales J0 and J1 by the same exp(-|Im z|), so the ratio cannot overflow.
    import scipy.special as sp  # imported on first use
    g[mid] = np.real(1j * np.conj(z) * sp.jve(1, z) / sp.jve(0, z))
    xl = x[large]
    s2 = math.sqrt(2.0)
    g[large] = xl / s2 - 0.5 - 1.0 / (8 * s2 * xl)
    return _like_input(g.reshape(shape))


def proximity_resistance_ratio(diameter_m, f_hz, resistivity_ohm_m, field_per_ampere_per_m):
    """ΔR/R_dc of a round wire in a uniform transverse field H = c·I from the other turns.

    From the transverse-field loss (transverse_field_loss_function) over the DC loss of the
    wire's own current: ΔR/R_dc = π² d² c² G(x). Assumes the field is uniform across the
    wire (the neighbours are not much closer than about one diameter, centre to surface)
    and ignores the wire's own eddy currents' effect on the neighbours.
    """
    x = _kelvin_x(diameter_m, f_hz, resistivity_ohm_m)
    g = transverse_field_loss_function(x)
    return math.pi**2 * diameter_m**2 * field_per_ampere_per_m**2 * g


def single_layer_field_per_ampere_per_m(pitch_m):
    """c = H/I = 1/(2p): the mean field K/2 of a current sheet K = I/p at its own turns.

    The layer has field K on the winding side and none outside (a long solenoid, or the
    faces of a toroid); a wire in it sees the mean of the two.
    """
    return 1.0 / (2.0 * pitch_m)


def single_layer_proximity_ratio(diameter_m, pitch_m, f_hz, resistivity_ohm_m):
    """ΔR/R_dc from proximity effect in one layer of turns at a pitch (current-sheet model).

    Each wire sits in the mean field K/2 of the layer's current sheet K = I/p, taken uniform
    over the wire (single_layer_field_per_ampere_per_m, proximity_resistance_ratio). The
    1-D layer model is Dowell's (Proc. IEE 113(8), 1966) for m = 1 layer, split into skin
    and proximity parts as in Ferreira (1994); here the proximity part uses the exact
    round-wire loss instead of Dowell's equivalent foil (which gives 4/3 of it at low
    frequency). Valid for a long, single-layer winding with pitch p ≳ 1.5 d; it underrates
    the loss of close-wound turns (p → d, where the neighbours' non-uniform field crowds the
    current) and overrates it in short coils (l < D), whose field at the ends is weaker.
    """
    return proximity_resistance_ratio(diameter_m, f_hz, resistivity_ohm_m,
                                      single_layer_field_per_ampere_per_m(pitch_m))


def _flat(values):
    """A 1-d float copy of values and the shape to restore."""
    array = np.asarray(values, dtype=float)
    return array.reshape(-1), array.shape


def _like_input(values: np.ndarray):
    """A float for a 0-d result, the array otherwise."""
    return float(values) if np.ndim(values) == 0 else values
