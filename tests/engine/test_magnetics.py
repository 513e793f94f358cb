"""Magnetics: ring cores, solenoids, core loss, against outside sources.

Sources and their tables: tests/reference/ring_core.md and tests/reference/solenoid.md.
All core sizes are invented.
"""

import math

import numpy as np
import pytest
import scipy.special as sp
from scipy.constants import mu_0
from scipy.integrate import quad
from scipy.spatial import ConvexHull

from sheetgen.engine.magnetics import (
    LEAD_GAP_DEG,
    CoreLossTable,
    al_from_permeability,
    core_loss_factor,
    core_loss_resistance_ohm,
    link_turns,
    medhurst_self_capacitance_f,
    nagaoka_coefficient,
    peak_flux_density_t,
    rosa_correction_h,
    rosa_mutual_constant,
    solenoid_inductance_h,
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
from sheetgen.engine.resonance import resonant_frequency_hz
from tests.support import assert_close

# Invented ring cores: (OD, ID, height) in m.
RINGS = [
    pytest.param(20e-3, 10e-3, 6e-3, id="20x10x6"),
    pytest.param(12.5e-3, 7.5e-3, 5e-3, id="12.5x7.5x5"),
    pytest.param(36e-3, 23e-3, 15e-3, id="36x23x15"),
    pytest.param(6e-3, 1.5e-3, 2e-3, id="6x1.5x2-thick"),
]


# --------------------------------------------------------------------------- ring cores

@pytest.mark.parametrize("od, id_, h", RINGS)
def test_ring_le_ae_against_iec_60205_closed_form(od, id_, h):
    # IEC 60205 ring core (from memory): le = 2π ln(r2/r1)/(1/r1 − 1/r2),
    # Ae = h ln²(r2/r1)/(1/r1 − 1/r2), Ve = le·Ae.
    r1, r2 = id_ / 2, od / 2
    ln, span = math.log(r2 / r1), 1 / r1 - 1 / r2
    p = toroid_effective_parameters(od, id_, h)
    assert_close(p.le_m, 2 * math.pi * ln / span, rel=1e-12, what="le")
    assert_close(p.ae_m2, h * ln**2 / span, rel=1e-12, what="Ae")
    assert_close(p.ve_m3, 2 * math.pi * ln / span * h * ln**2 / span, rel=1e-12, what="Ve")
    assert_close(p.amin_m2, h * (r2 - r1), rel=1e-12, what="Amin")


def _integrated_c1_c2(od, id_, h, c):
    """C1 from the permeance, C2 from the ∫H³ dV equivalence, by numerical integration."""
    r1, r2 = id_ / 2, od / 2

    def height(rho):  # section height at radius ρ with 45° chamfers of leg c at both rims
        return h - 2 * max(0.0, c - (rho - r1)) - 2 * max(0.0, c - (r2 - rho))

    breaks = [r1 + c, r2 - c] if c > 0 else None
    permeance, _ = quad(lambda rho: height(rho) / (2 * math.pi * rho), r1, r2, points=breaks,
                        epsabs=0, epsrel=1e-13)
    cubic, _ = quad(lambda rho: height(rho) / rho**2, r1, r2, points=breaks, epsabs=0,
                    epsrel=1e-13)
    c1 = 1.0 / permeance
    return c1, c1**3 * cubic / (4 * math.pi**2)


@pytest.mark.parametrize("od, id_, h", RINGS)
@pytest.mark.parametrize("chamfer_fraction", [0.0, 0.1, 0.3])
def test_ring_c1_c2_against_numerical_integration(od, id_, h, chamfer_fraction):
    c = chamfer_fraction * min(h, (od - id_) / 2) / 2
    c1, c2 = _integrated_c1_c2(od, id_, h, c)
    p = toroid_effective_parameters(od, id_, h, c)
    assert_close(p.c1_per_m, c1, rel=1e-10, what="C1 = Σ l/A")
    assert_close(p.c2_per_m3, c2, rel=1e-10, what="C2 = Σ l/A²")
    # The chamfers take 4 × c²/2 off the rectangle.
    assert_close(p.amin_m2, h * (od - id_) / 2 - 2 * c**2, rel=1e-12, what="Amin")


def test_chamfer_reduces_ae_and_raises_c1():
    plain = toroid_effective_parameters(20e-3, 10e-3, 6e-3)
    chamfered = toroid_effective_parameters(20e-3, 10e-3, 6e-3, 0.5e-3)
    assert chamfered.ae_m2 < plain.ae_m2 and chamfered.c1_per_m > plain.c1_per_m


@pytest.mark.parametrize("bad", [(10e-3, 20e-3, 5e-3, 0.0), (20e-3, 10e-3, 0.0, 0.0),
                                 (20e-3, 10e-3, 4e-3, 2e-3), (20e-3, 10e-3, 8e-3, 2.6e-3)])
def test_impossible_rings_are_refused(bad):
    with pytest.raises(ValueError):
        toroid_effective_parameters(*bad)


@pytest.mark.parametrize("od, id_, h", RINGS)
@pytest.mark.parametrize("mu_i", [10.0, 125.0, 2300.0])
def test_al_gives_the_textbook_toroid_inductance(od, id_, h, mu_i):
    # Cheng, Field and Wave Electromagnetics, 2nd ed. (toroid of rectangular section,
    # from memory): L = µ N² h ln(b/a)/(2π); with AL = µ0 µi Ae/le, L = N² AL.
    p = toroid_effective_parameters(od, id_, h)
    al = al_from_permeability(mu_i, p.le_m, p.ae_m2)
    n = 17
    assert_close(n**2 * al, mu_0 * mu_i * n**2 * h * math.log(od / id_) / (2 * math.pi),
                 rel=1e-12, what="L")


@pytest.mark.parametrize("target_h, al, turns", [
    # Round to the nearest whole turn: √(L/AL) = 20, 20.49, 20.52, 0.3, 1.6.
    (10e-6, 25e-9, 20), (10.5e-6, 25e-9, 20), (10.53e-6, 25e-9, 21), (2.25e-9, 25e-9, 1),
    (64e-9, 25e-9, 2),
])
def test_turns_for_inductance_rounds_to_the_nearest_turn(target_h, al, turns):
    result = turns_for_inductance(target_h, al)
    assert result.turns == turns
    assert_close(result.inductance_built_h, turns**2 * al, rel=1e-12, what="N² AL")


def _hull_perimeter(points):
    hull = ConvexHull(points)
    ring = points[hull.vertices]
    return float(np.sum(np.hypot(*(np.roll(ring, -1, axis=0) - ring).T)))


@pytest.mark.parametrize("od, id_, h", RINGS)
@pytest.mark.parametrize("chamfer, layer", [(0.0, 1), (0.4e-3, 1), (0.0, 2)])
def test_turn_length_against_convex_hull_of_the_offset_section(od, id_, h, chamfer, layer):
    # Independent geometry: the wire centre line is the outline of the section dilated by
    # (2k−1)d/2; its length is the perimeter of the convex hull of the section's corners
    # each surrounded by a finely sampled circle of that radius (scipy.spatial.ConvexHull).
    d = 0.45e-3
    w = (od - id_) / 2
    c = chamfer
    corners = [(0, c), (c, 0), (w - c, 0), (w, c), (w, h - c), (w - c, h), (c, h), (0, h - c)]
    radius = (2 * layer - 1) * d / 2
    phi = np.linspace(0, 2 * np.pi, 20000, endpoint=False)
    circle = radius * np.column_stack([np.cos(phi), np.sin(phi)])
    points = np.vstack([np.array(p) + circle for p in corners])
    expected = _hull_perimeter(points)
    got = toroid_turn_length_m(od, id_, h, d, chamfer, layer)
    assert_close(got, expected, rel=1e-6, what="turn length")


@pytest.mark.parametrize("wire_d", [0.3e-3, 1.0e-3, 2.5e-3])
def test_six_turns_fill_a_hole_of_three_wire_diameters(wire_d):
    # Six equal circles fit exactly around a seventh (the plane's kissing number).
    assert toroid_turns_per_layer(3 * wire_d, wire_d) == 6
    assert toroid_turns_per_layer(3 * wire_d * 0.999, wire_d) == 5
    angle = toroid_winding_angle_deg(6, 3 * wire_d, wire_d)
    assert_close(angle.close_wound_deg, 360.0, rel=1e-12, what="close-wound angle")
    assert not angle.fits_single_layer  # no room for the lead gap
    assert toroid_winding_angle_deg(5, 3 * wire_d, wire_d).fits_single_layer


@pytest.mark.parametrize("id_, d", [(10e-3, 0.5e-3), (23e-3, 0.25e-3), (5e-3, 0.8e-3)])
def test_turns_per_layer_agrees_with_inner_circumference_count(id_, d):
    # The brief's rule π(ID − d)/d counts arcs; touching wires need a chord d, so the exact
    # count is the same or, with few turns, one less.
    arc_count = math.floor(math.pi * (id_ - d) / d)
    assert arc_count - 1 <= toroid_turns_per_layer(id_, d) <= arc_count


def test_layers_and_lead_gap():
    id_, d = 10e-3, 0.5e-3
    first = toroid_turns_per_layer(id_, d, 1, LEAD_GAP_DEG)
    second = toroid_turns_per_layer(id_, d, 2, LEAD_GAP_DEG)
    assert second < first < toroid_turns_per_layer(id_, d)
    assert toroid_layers_needed(first, id_, d) == 1
    assert toroid_layers_needed(first + 1, id_, d) == 2
    assert toroid_layers_needed(first + second + 1, id_, d) == 3
    assert toroid_layers_needed(10_000, id_, d) is None  # the hole fills first


@pytest.mark.parametrize("turns, d", [(12, 0.5e-3), (40, 0.3e-3), (150, 0.2e-3), (2, 1e-3)])
def test_smallest_hole_for_a_single_layer_fits_just(turns, d):
    hole = toroid_inner_diameter_for_turns_m(turns, d)
    assert toroid_winding_angle_deg(turns, hole * 1.0001, d).fits_single_layer
    assert not toroid_winding_angle_deg(turns, hole * 0.999, d).fits_single_layer


def test_spread_winding_leaves_the_lead_gap():
    # 30° between the leads (common practice): a winding that fits is spread over 330°.
    angle = toroid_winding_angle_deg(20, 20e-3, 0.5e-3)
    assert angle.fits_single_layer
    assert_close(angle.spread_deg, 330.0, rel=1e-12, what="spread")
    assert_close(angle.pitch_deg, 16.5, rel=1e-12, what="pitch")


def test_ring_surface_area():
    # Two annuli plus two cylinders, for a 20 × 10 × 6 mm ring: 2·(π/4)(400 − 100) mm²
    # + π·(20 + 10)·6 mm² = 471.24 + 565.49 = 1036.73 mm² (hand calculation).
    assert_close(toroid_surface_area_m2(20e-3, 10e-3, 6e-3), 1036.726e-6, rel=1e-6, what="A")


# --------------------------------------------------------------------------- solenoids

@pytest.mark.parametrize("d_over_l, k_table", [
    # Nagaoka 1909 / Grover, Inductance Calculations (1946), table of K (from memory).
    (0.1, 0.9588), (0.2, 0.9201), (0.5, 0.8181), (1.0, 0.6884), (2.0, 0.5255),
    (5.0, 0.3198), (10.0, 0.2033),
])
def test_nagaoka_against_published_table(d_over_l, k_table):
    tolerance = max(1e-4 * k_table, 5e-5)  # 1e-4 rel, or half a unit of the 4th decimal
    assert_close(nagaoka_coefficient(d_over_l * 0.05, 0.05), k_table, abs=tolerance,
                 what=f"K at D/l = {d_over_l}")


@pytest.mark.parametrize("d_over_l", [0.003, 0.01, 0.02])
def test_nagaoka_long_coil_series(d_over_l):
    # Lorenz's series for a long current sheet: K = 1 − 4D/(3πl) + D²/(8l²) − … (Rosa &
    # Grover 1912, from memory); the next term is of order (D/l)⁴.
    expected = 1 - 4 * d_over_l / (3 * math.pi) + d_over_l**2 / 8
    assert_close(nagaoka_coefficient(d_over_l, 1.0), expected, abs=d_over_l**4, what="K")


@pytest.mark.parametrize("l_over_d", [1e-3, 1e-4])
def test_nagaoka_very_short_coil(l_over_d):
    # A wide thin strip loop: L = µ0 r (ln(8r/l) − 1/2) (Rosa & Grover 1912, from memory).
    r, l = 0.5, l_over_d
    expected = l / (math.pi * r) * (math.log(8 * r / l) - 0.5)
    assert_close(nagaoka_coefficient(1.0, l), expected, rel=10 * l_over_d, what="K")


def _maxwell_current_sheet_inductance_h(turns, diameter_m, length_m):
    """The current sheet as coaxial rings: L = (N/l)² ∫ 2(l − s) M(s) ds, Maxwell's M."""
    r = diameter_m / 2

    def mutual(s):
        m1 = s * s / (4 * r * r + s * s)  # 1 − k²; ellipkm1 keeps K accurate as s → 0
        k = math.sqrt(1.0 - m1)
        return mu_0 * r * ((2 / k - k) * sp.ellipkm1(m1) - 2 / k * sp.ellipe(1.0 - m1))

    # s = l·t² takes the logarithmic singularity of M at s = 0 out of the integrand.
    def integrand(t):
        s = length_m * t * t
        return 2 * (length_m - s) * mutual(s) * 2 * length_m * t if t > 0 else 0.0

    integral, _ = quad(integrand, 0.0, 1.0, epsabs=0, epsrel=1e-11, limit=400)
    return (turns / length_m) ** 2 * integral


@pytest.mark.parametrize("d_over_l", [0.05, 0.3, 1.0, 3.0, 8.0])
def test_solenoid_inductance_against_maxwell_ring_integral(d_over_l):
    d = 0.03
    l = d / d_over_l
    assert_close(solenoid_inductance_h(12, d, l), _maxwell_current_sheet_inductance_h(12, d, l),
                 rel=1e-7, what=f"L at D/l = {d_over_l}")


@pytest.mark.parametrize("l_over_d", [0.4, 0.5, 0.8, 1.0, 2.0, 5.0, 20.0, 100.0])
def test_wheeler_within_one_percent_of_nagaoka_for_l_over_0_4_d(l_over_d):
    # Wheeler 1928: within about 1 % for l > 0.8 r.
    d = 0.02
    nagaoka = solenoid_inductance_h(25, d, l_over_d * d)
    assert_close(wheeler_inductance_h(25, d, l_over_d * d), nagaoka, rel=0.01, what="Wheeler")


def test_wheeler_leaves_its_range_for_short_coils():
    # Below l = 0.4 D Wheeler's formula is outside its stated accuracy (here 4 % low).
    d = 0.02
    ratio = wheeler_inductance_h(25, d, 0.2 * d) / solenoid_inductance_h(25, d, 0.2 * d)
    assert ratio < 0.98


@pytest.mark.parametrize("diameter_m, pitch_m, turns", [
    (0.02, 1.5e-3, 14), (0.008, 0.6e-3, 33), (0.05, 4e-3, 6), (0.01, 1e-3, 1)])
def test_solenoid_turns_at_a_pitch_reproduce_an_independent_inductance(diameter_m, pitch_m,
                                                                       turns):
    # Target: the Maxwell-integral inductance of `turns` at this pitch; the solver must find
    # that whole number of turns and the winding length N·p.
    target = _maxwell_current_sheet_inductance_h(turns, diameter_m, turns * pitch_m)
    wound = solenoid_turns_for_inductance(target, diameter_m, pitch_m=pitch_m)
    assert wound.turns == turns
    assert_close(wound.length_m, turns * pitch_m, rel=1e-12, what="length")
    assert_close(wound.inductance_built_h, target, rel=1e-7, what="L built")


def test_solenoid_turns_at_a_fixed_length():
    d, l, turns = 0.015, 0.02, 23
    target = _maxwell_current_sheet_inductance_h(turns, d, l) * 1.01  # 1 % above 23 turns
    wound = solenoid_turns_for_inductance(target, d, length_m=l)
    assert wound.turns == turns  # 24 turns would be 8.9 % above 23's, so 23 is nearest
    assert_close(wound.pitch_m, l / turns, rel=1e-12, what="pitch")
    with pytest.raises(ValueError, match="exactly one"):
        solenoid_turns_for_inductance(target, d, length_m=l, pitch_m=1e-3)


@pytest.mark.parametrize("l_over_d, h_pf_per_cm", [(1.0, 0.46), (2.0, 0.50)])
def test_medhurst_self_capacitance_against_his_table(l_over_d, h_pf_per_cm):
    # Medhurst 1947, measured H = C/D in pF/cm (from memory, two figures: 2 %).
    d_m = 0.04
    expected_f = h_pf_per_cm * (d_m * 100) * 1e-12
    assert_close(medhurst_self_capacitance_f(d_m, l_over_d * d_m), expected_f, rel=0.02,
                 what=f"C at l/D = {l_over_d}")


def test_medhurst_capacitance_scales_with_diameter():
    # C = H(l/D)·D: coils of the same shape have self-capacitance proportional to size.
    small = medhurst_self_capacitance_f(0.01, 0.03)
    assert_close(medhurst_self_capacitance_f(0.05, 0.15), 5 * small, rel=1e-12, what="C")


def test_self_resonant_frequency():
    # Thomson: 10 µH with 10 pF resonates at 1/(2π·10⁻⁵) Hz = 15.915494 MHz.
    assert_close(resonant_frequency_hz(10e-6, 10e-12), 15.915494e6, rel=1e-7, what="SRF")


# --------------------------------------------------------------------------- core loss

def test_core_loss_resistance_from_loss_factor_and_from_material_q():
    # tanδ = R_s/(ωL) (IEC 60401-3); tanδ/µi = 1e-5 at µi = 100 gives tanδ = 1e-3, so a
    # 10 µH coil at 1 MHz has R = 2π·10⁶·10⁻⁵·10⁻³ = 62.83 mΩ (hand calculation).
    table = CoreLossTable((1e5, 1e6, 1e7), (5e-6, 1e-5, 4e-5))
    assert_close(core_loss_resistance_ohm(10e-6, 1e6, table, 100.0), 0.0628319, rel=1e-5,
                 what="R_core")
    # A gapped core with µe = 50 halves it (IEC 60401-3: tanδ_e = (tanδ/µi)·µe).
    assert_close(core_loss_resistance_ohm(10e-6, 1e6, table, 100.0, mu_e=50.0), 0.0314159,
                 rel=1e-5, what="R_core gapped")
    q_table = CoreLossTable((1e6,), (250.0,), kind="material_q")
    assert_close(core_loss_resistance_ohm(10e-6, 1e6, q_table, 100.0), 62.8319 / 250.0,
                 rel=1e-5, what="R_core from Q")


def test_loss_factor_interpolates_as_a_power_law_and_extends_the_end_segments():
    # Rows on tanδ/µi = 1e-5 (f/1 MHz)^0.5 below 1 MHz and ∝ f^1.0 above: interpolation
    # in log f and log value reproduces each power law between the rows and beyond the ends.
    table = CoreLossTable((1e5, 1e6, 1e7), (1e-5 * 0.1**0.5, 1e-5, 1e-4))
    f = np.array([2e4, 3e5, 1e6, 4e6, 3e7])
    expected = np.array([1e-5 * (2e4 / 1e6) ** 0.5, 1e-5 * 0.3**0.5, 1e-5, 4e-5, 3e-4])
    got = core_loss_factor(f, table, 100.0)
    for g, e, fk in zip(got, expected, f):
        assert_close(g, e, rel=1e-12, what=f"tanδ/µi at {fk:g} Hz")
    assert table.covers(1e6) and not table.covers(3e7)


@pytest.mark.parametrize("rows", [((1e6, 1e5), (1e-5, 1e-5)), ((1e6,), (0.0,)),
                                  ((1e6, 2e6), (1e-5,)), ((), ())])
def test_bad_loss_tables_are_refused(rows):
    with pytest.raises(ValueError):
        CoreLossTable(*rows)


def test_peak_flux_density_against_the_transformer_emf_equation():
    # V_rms = 4.44 f N Ae B̂ (textbook EMF equation; 4.44 ≈ 2π/√2 to 1e-3).
    v, f, n, ae = 12.0, 2e6, 9, 25e-6
    assert_close(peak_flux_density_t(v, f, n, ae), v / (4.44 * f * n * ae), rel=1e-3, what="B̂")


def test_steinmetz_and_temperature_rise():
    # P = k f^α B̂^β Ve: k = 2.0, 1 MHz^1.4 = 10^8.4, (0.01 T)^2.5 = 10^-5, Ve = 1 cm³
    # → 2 · 10^8.4 · 10^-5 · 10^-6 W = 0.5024 W (hand calculation).
    assert_close(steinmetz_core_loss_w(1e6, 0.01, 2.0, 1.4, 2.5, 1e-6), 2 * 10**-2.6,
                 rel=1e-12, what="P")
    # ΔT = (P[mW]/A[cm²])^0.833 (common practice): 500 mW over 10 cm² → 50^0.833 = 26.02 K.
    assert_close(temperature_rise_k(0.5, 10e-4), 26.02, rel=1e-3, what="ΔT")


@pytest.mark.parametrize("tank_turns, r_tank, r_link, expected", [
    # Ideal transformer: resistance scales as the turns ratio squared.
    (20, 5000.0, 50.0, 2), (12, 20e3, 50.0, 1), (30, 1800.0, 50.0, 5), (3, 1e5, 50.0, 1),
    (40, 2000.0, 300.0, 15),
])
def test_link_turns(tank_turns, r_tank, r_link, expected):
    assert link_turns(tank_turns, r_tank, r_link) == expected


def test_mu_0_is_codata_2022():
    """The engine's µ0 against scipy.constants (CODATA 2022)."""
    import scipy.constants

    from sheetgen.engine.constants import MU_0_H_PER_M
    # CODATA 2018 and 2022 differ by 7e-10 relative; either scipy passes at 1e-9.
    assert_close(MU_0_H_PER_M, scipy.constants.mu_0, rel=1e-9, what="µ0")


# --------------------------------------------------------------------------- Rosa's correction

@pytest.mark.parametrize("turns, b_published", [
    # Rosa (Bull. Bureau of Standards 2, 1906) / Grover (Inductance Calculations, 1946),
    # table of the mutual-inductance constant B against the number of turns (from memory).
    (1, 0.0), (2, 0.1137), (3, 0.1663), (4, 0.1973), (5, 0.2180), (6, 0.2329), (7, 0.2443),
    (8, 0.2532), (9, 0.2604), (10, 0.2664), (15, 0.2857),
])
def test_rosa_mutual_constant_against_the_published_table(turns, b_published):
    assert_close(rosa_mutual_constant(turns), b_published, abs=1.5e-4, what=f"B({turns})")


@pytest.mark.parametrize("d_over_p, a_published", [
    # Grover's table of the self-inductance constant A against d/p (from memory).
    (1.0, 0.5568), (0.9, 0.4515), (0.8, 0.3337), (0.7, 0.2002), (0.6, 0.0460), (0.5, -0.1363),
])
def test_rosa_self_constant_against_the_published_table(d_over_p, a_published):
    """One turn (B = 0): ΔL = µ0 a A."""
    a = 5e-3
    got = rosa_correction_h(1, 2 * a, 1e-3, d_over_p * 1e-3) / (mu_0 * a)
    assert_close(got, a_published, abs=1.5e-4, what=f"A(d/p = {d_over_p})")


def _filament_sum_inductance_h(turns, diameter_m, pitch_m, wire_diameter_m):
    """N coaxial round-wire rings: Σ self + Σ mutual. Self of a thin ring of round wire with
    uniform current µ0 a (ln(8a/ρ) − 7/4) (Kirchhoff; Rosa & Grover), mutual of coaxial
    circles by Maxwell's elliptic-integral formula M = µ0 a ((2/k − k) K − (2/k) E),
    k² = 4a²/(4a² + s²) (scipy.special, parameter m = k²)."""
    a, rho = diameter_m / 2, wire_diameter_m / 2
    total = turns * mu_0 * a * (math.log(8 * a / rho) - 1.75)
    for j in range(1, turns):
        s = j * pitch_m
        m = 4 * a * a / (4 * a * a + s * s)
        k = math.sqrt(m)
        mutual = mu_0 * a * ((2 / k - k) * sp.ellipk(m) - (2 / k) * sp.ellipe(m))
        total += 2 * (turns - j) * mutual
    return total


@pytest.mark.parametrize("turns, diameter_m, pitch_m, wire_diameter_m", [
    (16, 17.117e-3, 2.0e-3, 1.024e-3),  # near templates/solenoid.yaml: AWG 18 on 16 mm
    (10, 10e-3, 1.0e-3, 0.8e-3),
    (40, 25e-3, 0.6e-3, 0.5e-3),
])
def test_round_wire_inductance_against_a_sum_over_filaments(turns, diameter_m, pitch_m,
                                                            wire_diameter_m):
    """Current sheet less Rosa's correction against the rings summed one by one: agreement
    to 0.2 % (the rings are not a helix, Rosa's logarithms assume p ≪ a); the correction
    itself is larger than that, so the check can fail."""
    sheet = solenoid_inductance_h(turns, diameter_m, turns * pitch_m)
    correction = rosa_correction_h(turns, diameter_m, pitch_m, wire_diameter_m)
    reference = _filament_sum_inductance_h(turns, diameter_m, pitch_m, wire_diameter_m)
    assert abs(sheet / reference - 1) > 0.005, "premise: the current sheet alone is off"
    assert_close(sheet - correction, reference, rel=2e-3, what="round-wire L")


def test_solenoid_turns_apply_the_round_wire_correction():
    """With the wire known, the built L is the current sheet less Rosa's ΔL."""
    got = solenoid_turns_for_inductance(1.85e-6, 17.117e-3, pitch_m=2e-3,
                                        wire_diameter_m=1.024e-3)
    sheet = solenoid_inductance_h(got.turns, 17.117e-3, got.length_m)
    assert_close(got.round_wire_correction_h,
                 mu_0 * 17.117e-3 / 2 * got.turns
                 * (1.25 - math.log(2 * 2e-3 / 1.024e-3) + rosa_mutual_constant(got.turns)),
                 rel=1e-12, what="ΔL = µ0 a N (A + B)")
    assert_close(got.inductance_built_h, sheet - got.round_wire_correction_h, rel=1e-12,
                 what="L = L_sheet − ΔL")
