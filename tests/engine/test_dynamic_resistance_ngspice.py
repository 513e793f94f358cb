"""Dynamic resistance of a lossy tank against ngspice (AC analysis in batch mode, tests/spice.py):
ngspice finds the zero-phase frequency of v(out)/i(in) on its own and reads |Z| there."""

import math

import pytest

from sheetgen.engine import resonance
from tests import spice
from tests.support import assert_close


@pytest.mark.ngspice
def test_dynamic_resistance_at_q_2_with_both_losses_against_ngspice():
    L, C = 1e-6, 25.33e-9  # invented; Q = 2 with the loss split evenly
    x0 = 2 * math.pi * L / (2 * math.pi * math.sqrt(L * C))
    r_l = r_c = x0 / 4
    bench = spice.parallel_netlist(L, r_l, C, r_c)
    measured = spice.measure_bench(bench)
    half = 1e-4 * measured.f_zero_phase_hz
    z_zero = spice.ac_measure(
        bench.body, spice.Sweep("lin", 2001, measured.f_zero_phase_hz - half,
                                measured.f_zero_phase_hz + half),
        {"zmag": f"mag({bench.port_voltage}/{bench.port_current})"},
        {"zzero": f"FIND zmag AT={measured.f_zero_phase_hz!r}"})["zzero"]
    got = resonance.analyse(resonance.Circuit("parallel", L, r_l, C, r_c))
    where = spice.ngspice_version()
    assert_close(got.f_unity_pf_hz, measured.f_zero_phase_hz, rel=1e-5,
                 what=f"f zero phase, {where}")
    assert_close(got.dynamic_resistance_ohm, z_zero, rel=1e-5, what=f"|Z| at zero phase, {where}")
    assert abs(x0 * x0 / (r_l + r_c) / z_zero - 1) > 0.05, "premise: X0²/(rL + rC) is > 5 % off"
