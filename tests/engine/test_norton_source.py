"""A current-driven parallel tank: the source's resistance is across the source (Norton),
so it loads the tank in the stresses exactly as it does in the response.

Sources: Ohm's law on phasors, worked by hand below; ngspice checks the same circuits in
tests/engine/test_stress.py (a current source with its resistor across it).
"""

import math
from pathlib import Path

from sheetgen.design.pipeline import design_from_file
from sheetgen.engine.resonance import Circuit
from sheetgen.engine.stress import Drive, part_stress
from tests.support import assert_close

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"


def test_norton_resistance_loads_the_tank_by_hand():
    """ω = 10⁶ rad/s; L = 100 µH with rL = 1 Ω: Z_L = 1 + j100 Ω; C = 10 nF, lossless:
    Z_C = −j100 Ω; I_N = 1 mA with Rs = 10 kΩ across it.
    Y_L = (1 − j100)/10001 = 9.99900e-5 − j9.99900e-3 S; Y_C = +j0.01 S;
    Y_L + Y_C = 9.99900e-5 + j9.99900e-7 S; with 1/Rs = 1e-4 S: 1.99990e-4 + j9.99900e-7 S,
    |Y| = 1.999925e-4 S → V = 1 mA/|Y| = 5.00019 V; I_L = V/|Z_L| = V/100.005 = 49.9994 mA;
    I_C = V/100 = 50.0019 mA. Without Rs across, V would be 1 mA/|Y_L + Y_C| ≈ 9.9995 V."""
    c = Circuit("parallel", 100e-6, 1.0, 10e-9, 0.0, 10e3, None)
    s = part_stress(c, Drive("current", 1e-3), 1e6 / (2 * math.pi))
    assert_close(s.capacitor_voltage_rms_v, 5.00019, rel=2e-6, what="tank voltage, Rs across")
    assert_close(s.inductor_current_rms_a, 49.9994e-3, rel=2e-6, what="coil current")
    assert_close(s.capacitor_current_rms_a, 50.0019e-3, rel=2e-6, what="capacitor current")
    # power into the circuit (Rs is the source's own): V²·Re(Y_L + Y_C) = 2.49994 mW
    assert_close(s.drive_power_w, 5.00019**2 * 9.99900e-5, rel=1e-5, what="power in")


def test_parallel_starter_stresses_see_the_source_resistance():
    """Reproduction: the parallel starter (1 mA from 47 kΩ) put 32.1 V rms on the tank,
    the figure without Rs across; with it, V = I·|Z_tank ∥ RL ∥ Rs| at the peak, i.e. the
    tank voltage equals the drive times the parallel of the impedance the sheet reports
    (source excluded) and Rs — worked here by hand from those two resistive figures
    (the response maximum is at zero phase to within 1e-4 for this Q)."""
    d = design_from_file(TEMPLATES / "parallel.yaml")
    z_terminals = d.resonance.impedance_at_peak_ohm
    rs = d.circuit.source_resistance_ohm
    expected = 1e-3 * (z_terminals * rs / (z_terminals + rs))  # ≈ 19.1 V
    assert_close(d.stress.capacitor_voltage_rms_v, expected, rel=1e-3, what="tank voltage")
    assert d.stress.capacitor_voltage_rms_v < 20.0, "the 32.1 V figure ignores Rs"
