"""sheetgen.engine.ratings: checks at their boundaries, remedies, acceptance, stored energy.

Sources (see tests/reference/variation.md):
- Derating defaults: 50 % of rated voltage for ceramic capacitors, 80 % of the RF current
  rating, 4 A/mm² in enamelled copper in free air (all common practice).
- Linearity: in a linear circuit every voltage and current scales with √P of the drive,
  every power with P (Joule's law, P = V²/R).
- Equal capacitors in series share an AC voltage equally; in parallel, a current.
- ASTM B258: AWG 18 is 0.0403 in = 1.0236 mm (from memory).
- W = ½CV² and Q = CV, checked against scipy.integrate.quad of ∫ C v dv; the RC discharge
  V0·e^(−t/RC) against scipy.integrate.solve_ivp of dV/dt = −V/(RC).
"""

import math

import pytest
from scipy import integrate

from sheetgen.engine import ratings
from sheetgen.report.advice import rating_advice
from tests.support import assert_close

BELOW, ABOVE = 1.0 - 1e-9, 1.0 + 1e-9

# (check, rating, derating: None → the default, the allowed value that default gives)
BOUNDARIES = [
    pytest.param(ratings.capacitor_voltage_check, 500.0, None, 250.0,
                 id="peak-voltage-50%-common-practice"),
    pytest.param(ratings.capacitor_voltage_check, 500.0, 0.8, 400.0, id="peak-voltage-80%"),
    pytest.param(ratings.capacitor_current_check, 2.0, None, 1.6,
                 id="rf-current-80%-common-practice"),
    pytest.param(ratings.esr_power_check, 0.5, None, 0.5, id="esr-power-no-derating"),
    pytest.param(ratings.flux_density_check, 0.2, 0.75, 0.15, id="flux-density-75%"),
]


def _check(check, actual, rating, derating, **options):
    if derating is not None:
        options["derating"] = derating
    return check("C1", actual, rating, **options)


@pytest.mark.parametrize("check, rating, derating, allowed", BOUNDARIES)
def test_boundary_just_below_passes_and_just_above_fails(check, rating, derating, allowed):
    below = _check(check, allowed * BELOW, rating, derating)
    above = _check(check, allowed * ABOVE, rating, derating)
    assert below.passed and below.status == "pass" and rating_advice(below) is None
    assert not above.passed and above.status == "fail" and rating_advice(above).startswith("C1: ")
    assert_close(above.allowed, allowed, rel=1e-12, what="allowed = rating × derating")
    assert_close(above.margin, -1e-9, rel=1e-3, what="margin just over")


def test_default_deratings_are_the_common_practice_figures():
    assert ratings.DEFAULT_VOLTAGE_DERATING == 0.5  # common practice
    assert ratings.DEFAULT_CURRENT_DERATING == 0.8  # common practice
    assert ratings.DEFAULT_CURRENT_DENSITY_LIMIT_A_PER_M2 == 4.0e6  # 4 A/mm², common practice


def test_voltage_failure_says_by_how_much_and_what_to_fit():
    check = ratings.capacitor_voltage_check("C1", 1420.0, 2000.0, drive_power_w=5.0)
    # allowed 1 kV; 42 % over; a part of ≥ 1420/0.5 = 2840 V; two equal parts in series
    # share it equally; V ∝ √P, so P ≤ 5 W·(1000/1420)² = 2.48 W
    assert_close(check.margin, 1.0 - 1420.0 / 1000.0, rel=1e-12, what="margin")
    assert_close(check.remedy.required_rating, 2840.0, rel=1e-12, what="rating needed")
    assert check.remedy.parts_needed == 2 and check.remedy.arrangement == "series"
    assert_close(check.remedy.drive_power_max_w, 5.0 * (1000.0 / 1420.0) ** 2, rel=1e-12,
                 what="drive that passes")
    assert rating_advice(check) == (
        "C1: peak voltage 1.42 kV is 42.0 % over the allowed 1.00 kV (50.0 % of its 2.00 kV "
        "rating). Fit a capacitor rated at least 2.84 kV, or 2 of the present rating in "
        "series, each of 2× the capacitance, or lower the drive to at most 2.48 W into the circuit.")


def test_current_failure_suggests_parts_in_parallel():
    check = ratings.capacitor_current_check("C2", 5.0, 2.5, drive_power_w=10.0)
    # allowed 2.0 A: ⌈5/2⌉ = 3 equal parts in parallel; I ∝ √P, P ≤ 10·(2/5)² = 1.6 W
    assert check.remedy.parts_needed == 3 and check.remedy.arrangement == "parallel"
    assert_close(check.remedy.required_rating, 6.25, rel=1e-12, what="current rating needed")
    assert_close(check.remedy.drive_power_max_w, 1.6, rel=1e-12, what="drive that passes")
    assert "3 in parallel" in rating_advice(check) and "6.25 A rms" in rating_advice(check)
    assert "1.60 W" in rating_advice(check)


def test_esr_power_failure_gives_the_esr_and_drive_that_pass():
    check = ratings.esr_power_check("C1", 1.2, 1.0, esr_ohm=0.05, drive_power_w=5.0)
    # P = I²·ESR at the same current: ESR ≤ 0.05·1/1.2; power ∝ drive: P ≤ 5·1/1.2
    assert_close(check.remedy.esr_max_ohm, 0.05 / 1.2, rel=1e-12, what="ESR that passes")
    assert_close(check.remedy.drive_power_max_w, 5.0 / 1.2, rel=1e-12, what="drive")
    assert "41.7 mΩ" in rating_advice(check) and "4.17 W" in rating_advice(check)


def test_current_density_in_awg_18_beside_the_common_practice_reference():
    """J = I/A for DC (no crowding); the reference is 4 A/mm² (common practice)."""
    diameter = 0.0403 * 0.0254  # ASTM B258 AWG 18, 1.0236 mm (from memory)
    area_mm2 = math.pi / 4.0 * (diameter * 1e3) ** 2  # 0.8229 mm²
    j = ratings.winding_current_density(4.0, diameter)
    assert_close(j.actual_a_per_m2, 4.0 / area_mm2 * 1e6, rel=1e-12, what="J in A/m²")
    assert_close(j.reference_a_per_m2, 4.0e6, rel=1e-12, what="DC reference")
    assert "current density" not in {q for q in ratings.CheckQuantity.__args__}, \
        "heating is judged by the winding's temperature, not by a current density"


def test_flux_density_failure_asks_for_more_core_area():
    check = ratings.flux_density_check("L1", 0.25, 0.2, drive_power_w=5.0)
    # B̂ = √2 V/(ω N Ae): 1.25× the area at the same V and N; B ∝ V ∝ √P
    assert_close(check.remedy.core_area_factor, 1.25, rel=1e-12, what="area factor")
    assert_close(check.remedy.drive_power_max_w, 5.0 * 0.8**2, rel=1e-12, what="drive")
    assert "1.25× the cross-section Ae" in rating_advice(check)


def test_acceptance_keeps_a_failed_check_visible():
    reason = "pulsed duty, 10 % on; maker's pulse rating 3 kV"
    check = ratings.capacitor_voltage_check("C1", 1420.0, 2000.0, acceptance=reason)
    assert not check.passed and check.accepted and check.status == "accepted"
    assert check.acceptance_reason == reason and rating_advice(check) is not None
    plain = ratings.capacitor_voltage_check("C3", 1420.0, 2000.0)
    assert (check.status, plain.status) == ("accepted", "fail")
    with pytest.raises(ValueError, match="written reason"):
        ratings.capacitor_voltage_check("C1", 1420.0, 2000.0, acceptance="   ")


@pytest.mark.parametrize("derating", [0.0, -0.5, 1.5])
def test_derating_outside_zero_to_one_is_refused(derating):
    with pytest.raises(ValueError, match="derating"):
        ratings.capacitor_voltage_check("C1", 10.0, 100.0, derating=derating)


@pytest.mark.parametrize("capacitance_f, voltage_v", [(1e-6, 400.0), (220e-12, 3000.0)])
def test_stored_energy_and_charge_against_numerical_integration(capacitance_f, voltage_v):
    # W = ∫ C v dv from 0 to V (scipy.integrate.quad)
    energy, _ = integrate.quad(lambda v: capacitance_f * v, 0.0, voltage_v)
    assert_close(ratings.stored_energy_j(capacitance_f, voltage_v), energy, rel=1e-12,
                 what="½CV²")
    assert_close(ratings.stored_charge_c(capacitance_f, voltage_v), capacitance_f * voltage_v,
                 rel=1e-15, what="Q = CV")


def test_discharge_time_against_an_ode_solution():
    c, r, v0, v1 = 2.2e-6, 470e3, 1000.0, 60.0

    def reaches_v1(t, v):
        return v[0] - v1
    reaches_v1.terminal = True

    solution = integrate.solve_ivp(lambda t, v: -v / (r * c), (0.0, 20.0), [v0],
                                   events=reaches_v1, rtol=1e-10, atol=1e-9)
    assert_close(ratings.discharge_time_s(c, r, v0, v1), float(solution.t_events[0][0]),
                 rel=1e-6, what="time to fall to 60 V")
    assert ratings.discharge_time_s(c, r, 50.0, 60.0) == 0.0  # already below


def test_current_density_at_rf_uses_the_crowded_area_and_the_same_heat_per_metre():
    """A round wire at 10 MHz: R_ac/R_dc from the exact Bessel solution (checked against
    Terman's table in tests/engine/test_wire.py). The current flows in A·R_dc/R_ac, and the
    reference is the current whose heat per metre I²·R_ac equals the DC figure's J²·ρ·A
    (4 A/mm², common practice), over that crowded area."""
    from sheetgen.engine.wire import (
        COPPER_RESISTIVITY_20C_OHM_M as rho,
    )
    from sheetgen.engine.wire import (
        ac_resistance_ratio,
    )
    d = 0.511e-3  # AWG 24
    area = math.pi * d * d / 4.0
    ratio = float(ac_resistance_ratio(d, 10e6, rho))
    assert ratio > 3.0, "skin effect is strong at 10 MHz in AWG 24"
    limit = ratings.DEFAULT_CURRENT_DENSITY_LIMIT_A_PER_M2
    # heat per metre of the reference RF current equals the DC figure's: I²·R_ac = J²·ρ·A
    i_reference = math.sqrt(limit**2 * rho * area / (ratio * rho / area))
    j = ratings.winding_current_density(i_reference, d, ac_to_dc_resistance=ratio)
    assert_close(j.actual_a_per_m2, i_reference / (area / ratio), rel=1e-12,
                 what="current over the crowded area A·R_dc/R_ac, A/m²")
    assert_close(j.actual_a_per_m2, j.reference_a_per_m2, rel=1e-12,
                 what="at the reference current J meets its reference")
