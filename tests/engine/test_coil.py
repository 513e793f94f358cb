"""Coil design end to end: properties that can fail, checked against outside sources.

Sources: tests/reference/ring_core.md (Cheng's toroid inductance), awg_astm_b258.md (NEC
Table 8), solenoid.md (Maxwell's ring integral, Wheeler, Medhurst), and ngspice for the
coil's impedance with its self-capacitance (tests/reference/ngspice.md). Cores, materials
and loss figures are invented.
"""

import math

import numpy as np
import pytest
from scipy.constants import mu_0
from scipy.integrate import quad

from sheetgen.engine.coil import (
    CoilLossModel,
    CoreMaterial,
    SolenoidFormer,
    ToroidCore,
    coil_ac_resistance_ohm,
    coil_q_sweep,
    design_solenoid,
    design_toroid,
)
from sheetgen.engine.magnetics import CoreLossTable
from sheetgen.engine.wire import awg_wire, dc_resistance_ohm, wire_from_designation
from tests.engine.test_magnetics import _filament_sum_inductance_h, _maxwell_current_sheet_inductance_h
from tests.support import assert_close

FOOT_M = 0.3048

RING = ToroidCore(outer_diameter_m=20e-3, inner_diameter_m=10e-3, height_m=6e-3)
LOSSY = CoreMaterial(mu_i=125.0, loss_table=CoreLossTable((1e5, 1e6, 1e7), (1e-4, 2e-4, 1e-3)),
                     flux_density_max_t=0.01, steinmetz_k=3.0, steinmetz_alpha=1.3,
                     steinmetz_beta=2.5)
LOW_LOSS = CoreMaterial(mu_i=10.0, loss_table=CoreLossTable((1e4, 1e7), (1e-6, 1e-6)),
                        flux_density_max_t=0.05)


def _cheng_toroid_inductance_h(turns, core, mu_i):
    """L = µ N² h ln(b/a)/(2π) (Cheng, Field and Wave Electromagnetics, 2nd ed.; from memory)."""
    return (mu_0 * mu_i * turns**2 * core.height_m
            * math.log(core.outer_diameter_m / core.inner_diameter_m) / (2 * math.pi))


# --------------------------------------------------------------------------- toroid

@pytest.mark.parametrize("target_h", [1e-6, 4.7e-6, 22e-6, 100e-6])
def test_toroid_inductance_from_geometry_is_the_textbook_value(target_h):
    coil = design_toroid(target_h, 1e6, RING, LOSSY, awg_wire(28), 0.02, None)
    assert coil.al_from_geometry
    assert_close(coil.inductance_built_h, _cheng_toroid_inductance_h(coil.turns, RING, 125.0),
                 rel=1e-12, what="L built")
    # N is the nearest whole number of turns to the exact one.
    exact = math.sqrt(target_h / _cheng_toroid_inductance_h(1, RING, 125.0))
    assert abs(coil.turns - exact) <= 0.5


def test_toroid_with_a_given_al():
    core = ToroidCore(20e-3, 10e-3, 6e-3, al_h_per_turn2=40e-9)
    coil = design_toroid(10e-6, 1e6, core, LOSSY, awg_wire(26), 0.02, None)
    assert not coil.al_from_geometry
    assert coil.turns == 16  # √(10 µH / 40 nH) = 15.8
    assert_close(coil.inductance_built_h, 16**2 * 40e-9, rel=1e-12, what="N² AL")


def test_toroid_wire_length_and_dc_resistance_against_nec_table_8():
    # One layer of AWG 18 at 75 °C: NEC Chapter 9 Table 8 gives 7.77 Ω/kft (from memory;
    # ±0.005 Ω/kft + 0.2 %, see awg_astm_b258.md). The turn length is the section's
    # perimeter plus π·d (Steiner), written out here: 2h + (OD − ID) + π d.
    core = ToroidCore(36e-3, 23e-3, 15e-3, al_h_per_turn2=100e-9)
    wire = awg_wire(18)
    coil = design_toroid(12.1e-6, 100e3, core, LOW_LOSS, wire, 0.05, None, temperature_c=75.0)
    assert coil.turns == 11 and coil.layers_needed == 1
    turn = 2 * 15e-3 + (36e-3 - 23e-3) + math.pi * wire.overall_diameter_m
    assert_close(coil.wire_length_m, 11 * turn + 2 * 0.05, rel=1e-12, what="wire length")
    per_kft = 7.77
    assert_close(coil.dc_resistance_ohm, per_kft * coil.wire_length_m / (1000 * FOOT_M),
                 rel=(0.005 + 0.002 * per_kft) / per_kft, what="R_dc at 75 °C")


def test_toroid_losses_vanish_towards_dc():
    # Limiting case: skin and proximity effect and core loss all vanish as f → 0.
    coil = design_toroid(22e-6, 10.0, RING, LOSSY, awg_wire(24), 0.03, None)
    assert_close(coil.ac_resistance_ohm, coil.dc_resistance_ohm, rel=1e-9, what="R_ac")
    assert coil.core_loss_resistance_ohm < 1e-4 * coil.dc_resistance_ohm


def test_toroid_flux_density_against_the_transformer_emf_equation():
    # V_rms = 4.44 f N Ae B̂, with Ae from IEC 60205's closed form h ln²(r2/r1)/(1/r1 − 1/r2).
    v, f = 5.0, 2e6
    coil = design_toroid(22e-6, f, RING, LOSSY, awg_wire(24), 0.03, v)
    r1, r2 = 5e-3, 10e-3
    ae = 6e-3 * math.log(2.0) ** 2 / (1 / r1 - 1 / r2)
    # The EMF equation holds for the voltage across the inductance, V·X/|rs + jX| (Q ≈ 24).
    x_l = 2 * math.pi * f * coil.inductance_built_h
    v_l = v * x_l / math.hypot(coil.series_resistance_ohm, x_l)
    assert_close(coil.flux_density_peak_t, v_l / (4.44 * f * coil.turns * ae), rel=1e-3,
                 what="B̂")
    assert coil.flux_density_within_limit == (coil.flux_density_peak_t <= 0.01)
    # The coil current is V/|rs + jX_L|, its copper loss I² R_ac, and the Steinmetz loss.
    current = v / math.hypot(coil.series_resistance_ohm, x_l)
    assert_close(coil.current_rms_a, current, rel=1e-9, what="I")
    assert_close(coil.copper_loss_w, current**2 * coil.ac_resistance_ohm, rel=1e-9, what="P_cu")
    assert coil.core_loss_w > 0 and coil.temperature_rise_k > 0


def test_flux_density_from_the_voltage_across_the_inductance_alone():
    """Faraday's law, B̂ = √2 V_L/(ω N Ae), with V_L the part of the terminal voltage across
    the inductance: V_L = V·X/|rs + jX|. Hand-computed case: a core of relative loss factor
    tan δ/µi = 4e-3 at µi = 125 puts rcore = X·4e-3·125 = X/2 in series (IEC 60401-3
    definition), so with the copper's R_ac the coil's Q is just under 2 and V_L is
    V/√(1 + 1/Q²) ≈ 0.89 V: the whole terminal voltage would overstate B̂ by ~12 %."""
    very_lossy = CoreMaterial(mu_i=125.0, loss_table=CoreLossTable((1e5, 1e6, 1e7),
                                                                   (4e-3, 4e-3, 4e-3)),
                              flux_density_max_t=0.01)
    v, f = 5.0, 2e6
    coil = design_toroid(22e-6, f, RING, very_lossy, awg_wire(24), 0.03, v)
    x = 2 * math.pi * f * coil.inductance_built_h
    assert_close(coil.core_loss_resistance_ohm, x / 2, rel=1e-9, what="rcore = X·tanδ/µi·µi")
    r_s = coil.ac_resistance_ohm + x / 2
    v_l = v * x / math.hypot(r_s, x)
    r1, r2 = 5e-3, 10e-3  # IEC 60205 Ae of the plain ring, as above
    ae = 6e-3 * math.log(2.0) ** 2 / (1 / r1 - 1 / r2)
    expected = math.sqrt(2) * v_l / (2 * math.pi * f * coil.turns * ae)
    assert_close(coil.flux_density_peak_t, expected, rel=1e-3, what="B̂ from V_L")
    assert coil.flux_density_peak_t < 0.9 * math.sqrt(2) * v / (2 * math.pi * f * coil.turns * ae)


def test_toroid_without_steinmetz_data_takes_its_core_loss_from_the_loss_table():
    """One core-loss figure: with no Steinmetz data it is the loss table's I²·r_core (the
    same resistance that sets the Q), and the rise follows from it and the copper loss."""
    coil = design_toroid(22e-6, 1e6, RING, LOW_LOSS, awg_wire(24), 0.03, 5.0)
    assert coil.core_loss_steinmetz_w is None
    assert_close(coil.core_loss_w, coil.current_rms_a**2 * coil.core_loss_resistance_ohm,
                 rel=1e-12, what="core loss from the loss table, W")
    assert coil.temperature_rise_k is not None and coil.temperature_rise_k > 0
    assert coil.srf_hz is None and coil.srf_basis == "not_estimated"


def test_the_heat_takes_the_larger_of_the_two_core_loss_estimates():
    coil = design_toroid(22e-6, 137e3, RING, LOSSY, awg_wire(24), 0.03, 20.0)
    assert coil.core_loss_steinmetz_w is not None and coil.core_loss_table_w is not None
    assert coil.core_loss_w == max(coil.core_loss_table_w, coil.core_loss_steinmetz_w)


def test_winding_that_fits_has_no_remedy():
    coil = design_toroid(20e-6, 1e6, RING, LOSSY, awg_wire(24), 0.03, None)
    assert coil.fits and coil.layers_needed == 1 and coil.remedy is None
    assert_close(coil.winding_angle_deg, 330.0, rel=1e-12, what="spread (30° lead gap)")


def test_thinner_wire_remedy_fits_and_is_the_thickest_that_does():
    # 44 turns of AWG 20 on a 10 mm hole is more than one layer.
    coil = design_toroid(200e-6, 1e6, RING, LOSSY, awg_wire(20), 0.03, None)
    assert not coil.fits and coil.remedy == "thinner_wire"
    remedy = coil.remedy_wire
    assert remedy.diameter_m < awg_wire(20).diameter_m
    redone = design_toroid(200e-6, 1e6, RING, LOSSY, remedy, 0.03, None)
    assert redone.fits and redone.remedy is None and redone.turns == coil.turns
    thicker = design_toroid(200e-6, 1e6, RING, LOSSY, awg_wire(remedy.awg - 1), 0.03, None)
    assert not thicker.fits


def test_larger_core_remedy_fits():
    coil = design_toroid(200e-6, 1e6, RING, LOSSY, awg_wire(20), 0.03, None)
    hole = coil.remedy_inner_diameter_m
    assert hole > RING.inner_diameter_m
    bigger = ToroidCore(hole + 10e-3, hole, 6e-3, al_h_per_turn2=coil.al_h_per_turn2)
    redone = design_toroid(200e-6, 1e6, bigger, LOSSY, awg_wire(20), 0.03, None)
    assert redone.turns == coil.turns and redone.fits


def test_two_layer_remedy_when_it_keeps_the_higher_q():
    # At 10 kHz on a low-loss core, 32 turns of AWG 20 need two layers; proximity effect
    # is still small there, so two layers keep a higher Q than the thinner wire.
    al = 8.317e-9
    coil = design_toroid(32**2 * al, 10e3, RING, LOW_LOSS, awg_wire(20), 0.03, None)
    assert not coil.fits and coil.layers_needed == 2
    assert coil.remedy == "two_layers"
    thinner = design_toroid(32**2 * al, 10e3, RING, LOW_LOSS, coil.remedy_wire, 0.03, None)
    assert thinner.fits and thinner.q_estimated < coil.q_estimated


def test_larger_core_is_the_remedy_when_nothing_else_fits():
    tiny = ToroidCore(6e-3, 1.5e-3, 2e-3)
    coil = design_toroid(10e-3, 100e3, tiny, LOSSY, awg_wire(30), 0.01, None)  # 380 turns
    assert not coil.fits and coil.layers_needed is None and coil.remedy_wire is None
    assert coil.remedy == "larger_core"
    hole = coil.remedy_inner_diameter_m
    bigger = ToroidCore(hole + 5e-3, hole, 2e-3, al_h_per_turn2=coil.al_h_per_turn2)
    assert design_toroid(10e-3, 100e3, bigger, LOSSY, awg_wire(30), 0.01, None).fits


def test_wire_too_thick_for_the_hole_is_refused():
    with pytest.raises(ValueError, match="too thick"):
        design_toroid(1e-6, 1e6, ToroidCore(6e-3, 1.5e-3, 2e-3), LOSSY, awg_wire(20), 0.01, None)


# --------------------------------------------------------------------------- solenoid

@pytest.mark.parametrize("target_h, former_m, gauge, pitch_m", [
    (2e-6, 20e-3, 18, 2e-3), (0.5e-6, 10e-3, 20, 1.5e-3), (10e-6, 25e-3, 24, 0.6e-3),
])
def test_solenoid_inductance_against_maxwell_ring_integral(target_h, former_m, gauge, pitch_m):
    wire = awg_wire(gauge)
    coil = design_solenoid(target_h, 7e6, former_m, wire, pitch_m=pitch_m, lead_length_m=0.02)
    diameter = former_m + wire.overall_diameter_m
    assert_close(coil.diameter_m, diameter, rel=1e-12, what="D to wire centres")
    # The current sheet (Maxwell's ring integral) less the round-wire correction; the
    # round-wire L itself against the rings summed one by one (Maxwell's mutual inductance
    # of coaxial circles, Kirchhoff's self-inductance of a ring), to 0.3 % (Rosa's logarithms
    # assume a pitch small beside the radius; here p/a reaches 0.28).
    sheet = _maxwell_current_sheet_inductance_h(coil.turns, diameter, coil.length_m)
    assert_close(coil.inductance_built_h + coil.round_wire_correction_h, sheet, rel=1e-7,
                 what="L built + Rosa's ΔL = current sheet")
    rings = _filament_sum_inductance_h(coil.turns, diameter, pitch_m, wire.diameter_m)
    assert_close(coil.inductance_built_h, rings, rel=3e-3, what="L built vs rings")
    # Wheeler (1928), a current-sheet formula, agrees within his 1 % for l > 0.4 D.
    if coil.length_m > 0.4 * diameter:
        assert_close(coil.wheeler_inductance_h, sheet, rel=0.01, what="Wheeler")
    # Whole turns, nearest to the target: one turn more or less is farther from it (rings).
    for other in (coil.turns - 1, coil.turns + 1):
        if other >= 1:
            l_other = _filament_sum_inductance_h(other, diameter, pitch_m, wire.diameter_m)
            assert abs(l_other - target_h) >= abs(rings - target_h) * 0.99


def test_solenoid_wire_length_is_the_helix_arc_length():
    # Arc length of the helix (r cos t, r sin t, p t/2π) by numerical integration.
    wire = awg_wire(20)
    coil = design_solenoid(1e-6, 10e6, 12e-3, wire, pitch_m=1.2e-3, lead_length_m=0.015)
    r, p = coil.diameter_m / 2, coil.pitch_m
    one_turn, _ = quad(lambda t: math.hypot(r, p / (2 * math.pi)), 0, 2 * math.pi)
    assert_close(coil.wire_length_m, coil.turns * one_turn + 0.03, rel=1e-12, what="wire")


def test_solenoid_self_capacitance_and_srf_against_medhurst_table():
    # Length = 2·D: Medhurst's measured H = 0.50 pF/cm (from memory, 2 %), so the SRF is
    # within 1 % of 1/(2π √(L · 0.50 pF/cm · D)).
    wire = awg_wire(22)
    d_centre = 20e-3 + wire.overall_diameter_m
    coil = design_solenoid(3e-6, 5e6, 20e-3, wire, length_m=2 * d_centre)
    c_table = 0.50e-12 * d_centre * 100
    assert_close(coil.self_capacitance_f, c_table, rel=0.02, what="C self")
    srf = 1 / (2 * math.pi * math.sqrt(coil.inductance_built_h * c_table))
    assert_close(coil.srf_hz, srf, rel=0.01, what="SRF")
    assert coil.srf_basis == "medhurst_1947"


def test_solenoid_fit():
    wire = awg_wire(18)  # overall ≈ 1.12 mm
    assert design_solenoid(1e-6, 7e6, 15e-3, wire, pitch_m=1.2e-3).fits
    assert not design_solenoid(1e-6, 7e6, 15e-3, wire, pitch_m=1.0e-3).fits
    former = SolenoidFormer(diameter_m=15e-3, winding_length_max_m=5e-3)
    assert not design_solenoid(1e-6, 7e6, former, wire, pitch_m=1.2e-3).fits


def test_solenoid_dc_resistance_against_nec_table_8():
    wire = awg_wire(18)
    coil = design_solenoid(2e-6, 7e6, 20e-3, wire, pitch_m=2e-3, lead_length_m=0.02,
                           temperature_c=75.0)
    per_kft = 7.77  # NEC Chapter 9 Table 8, AWG 18 solid at 75 °C (from memory)
    assert_close(coil.dc_resistance_ohm, per_kft * coil.wire_length_m / (1000 * FOOT_M),
                 rel=(0.005 + 0.002 * per_kft) / per_kft, what="R_dc")


# --------------------------------------------------------------------------- Q sweep

def _ngspice_q(l_h, r_ohm, c_f, f_hz):
    """Q = Im Z / Re Z of (R + L) shunted by C, from an ngspice AC analysis at f."""
    from tests.spice import Sweep, ac_sweep
    body = "\n".join([
        "vdrive src 0 dc 0 ac 1", "vsense src out dc 0",
        f"lcoil out mid {l_h!r}", f"rcoil mid 0 {r_ohm!r}", f"cself out 0 {c_f!r}"])
    data = ac_sweep(body, Sweep("lin", 2, f_hz, f_hz * (1 + 1e-9)),
                    {"zre": "real(v(out)/i(vsense))", "zim": "imag(v(out)/i(vsense))"})
    return data.vectors["zim"][0] / data.vectors["zre"][0]


@pytest.mark.ngspice
def test_q_with_self_capacitance_against_ngspice():
    coil = design_solenoid(2e-6, 7e6, 20e-3, awg_wire(18), pitch_m=2e-3, lead_length_m=0.02)
    model = coil.loss_model
    for fraction in (0.02, 0.1, 0.3, 0.6, 0.9):
        f = fraction * coil.srf_hz
        r = float(coil_ac_resistance_ohm(model, f))
        expected = _ngspice_q(model.inductance_h, r, model.self_capacitance_f, f)
        assert_close(coil_q_sweep(coil, f), expected, rel=1e-5, what=f"Q at {fraction} SRF")


def test_q_sweep_rises_peaks_and_falls_to_zero_at_the_srf():
    coil = design_solenoid(2e-6, 7e6, 20e-3, awg_wire(18), pitch_m=2e-3, lead_length_m=0.02)
    f = np.geomspace(1e4, 2 * coil.srf_hz, 400)
    q = coil_q_sweep(coil, f)
    assert q.shape == f.shape
    peak = int(np.argmax(q))
    assert 0 < peak < len(f) - 1 and f[peak] < coil.srf_hz
    assert np.all(np.diff(q[: peak + 1]) > 0)
    falling = q[peak:][f[peak:] < coil.srf_hz]
    assert np.all(np.diff(falling) < 0)
    assert np.all(q[f >= coil.srf_hz] == 0.0)  # capacitive from the SRF on
    assert coil_q_sweep(coil, 0.0) == 0.0


def test_q_sweep_of_a_toroid_includes_core_loss():
    # At 1 MHz the material's table row is tanδ/µi = 2e-4, so with µi = 125 the core adds
    # R = ωL tanδ = ωL · 0.025 (IEC 60401-3 definitions) in series with the wire's R_ac.
    coil = design_toroid(20e-6, 1e6, RING, LOSSY, awg_wire(24), 0.03, None)
    omega_l = 2 * math.pi * 1e6 * coil.inductance_built_h
    assert_close(coil.core_loss_resistance_ohm, omega_l * 0.025, rel=1e-12, what="R_core")
    q = coil_q_sweep(coil, np.array([1e6]))
    assert_close(q[0], omega_l / (coil.ac_resistance_ohm + omega_l * 0.025), rel=1e-12,
                 what="Q at f")
    assert_close(coil.q_estimated, q[0], rel=1e-12, what="q_estimated")


def test_loss_model_alone_can_be_swept():
    model = CoilLossModel(inductance_h=1e-6, wire_diameter_m=0.5e-3, resistivity_ohm_m=1.7241e-8,
                          winding_wire_length_m=0.5, lead_wire_length_m=0.0,
                          proximity_field_per_ampere_per_m=0.0)
    # At 1 Hz the wire is its DC resistance (skin effect 1 + (r/δ)⁴/48 − 1 ≈ 4e-12), so
    # Q = ωL/R_dc.
    r_dc = dc_resistance_ohm(0.5, 0.5e-3, 1.7241e-8)
    assert_close(coil_q_sweep(model, 1.0), 2 * math.pi * 1e-6 / r_dc, rel=1e-9, what="Q")


def test_designation_feeds_the_design():
    wire = wire_from_designation("0.5 mm", grade=1)
    coil = design_solenoid(1e-6, 10e6, 10e-3, wire, length_m=15e-3)
    assert coil.wire.name == "0.50 mm" and coil.wire.grade == 1 and coil.fits
