"""Measured-sweep files synthesised by ngspice, read and reduced, against ngspice's own meas.

Source: ngspice (version from `ngspice -v`, named in every failure message) through
tests/spice.py. Each circuit is swept once with `ac lin` over f_peak ± 3 bandwidths at
20 points per bandwidth (vectors written with `wrdata`); the complex response is stored as
Touchstone (scikit-rf's `write_touchstone`) or CSV (dB or linear, with or without phase,
with or without seeded noise), then read back with read_sweep and reduced with
sweep_features. The reference figures are what ngspice's `meas ac` (MAX_AT, WHEN) found
on its own fine sweeps (spice.measure_bench); they must agree within the file's step.

- Series circuit in a 50 Ω through fixture: port 1 a 1 V source behind 50 Ω, the loop
  L, rL, C, rC, then port 2's 50 Ω load; S21 = 2·V2/Vs = 100 Ω · I, S11 = (Zin − 50)/(Zin + 50)
  with Zin = V(port 1)/I (standard definitions for equal 50 Ω references; from memory).
- Parallel tank (L + rL) ∥ (C + rC) ∥ RL driven from 1 V through Rs: the response is
  V(tank)/V(source), which is real exactly where the tank's impedance is.
Circuit values are invented.
"""

import functools
import math

import numpy as np
import pytest

from sheetgen.bench.sweep import sweep_features
from sheetgen.bench.sweep_files import read_sweep
from sheetgen.errors import InputError
from sheetgen.quantities import FREQUENCY, parse_quantity
from tests import spice
from tests.support import assert_close

pytestmark = pytest.mark.ngspice

Z0_OHM = 50.0
POINTS_PER_BANDWIDTH = 20

SERIES = dict(inductance_h=47e-6, inductor_resistance_ohm=4.0, capacitance_f=33e-12,
              capacitor_esr_ohm=0.3, source_resistance_ohm=Z0_OHM, load_resistance_ohm=Z0_OHM)
PARALLEL = dict(inductance_h=2.7e-6, inductor_resistance_ohm=0.5, capacitance_f=220e-12,
                capacitor_esr_ohm=0.05, source_resistance_ohm=10e3, load_resistance_ohm=47e3)


@functools.cache
def _ngspice(topology):
    """(reference measurement, frequency_hz, response, port impedance) for one circuit."""
    values = SERIES if topology == "series" else PARALLEL
    build = spice.series_netlist if topology == "series" else spice.parallel_netlist
    bench = build(**values)
    reference = spice.measure_bench(bench, zero_phase=True)
    bandwidth_hz = reference.bandwidth_hz
    points = 6 * POINTS_PER_BANDWIDTH + 1
    sweep = spice.Sweep("lin", points, reference.f_peak_hz - 3 * bandwidth_hz,
                        reference.f_peak_hz + 3 * bandwidth_hz)
    data = spice.ac_sweep(bench.body, sweep, {
        "rre": f"real({bench.response})", "rim": f"imag({bench.response})",
        "vre": f"real({bench.port_voltage})", "vim": f"imag({bench.port_voltage})",
        "ire": f"real({bench.port_current})", "iim": f"imag({bench.port_current})",
    })
    v = data.vectors
    response = v["rre"] + 1j * v["rim"]
    impedance = (v["vre"] + 1j * v["vim"]) / (v["ire"] + 1j * v["iim"])
    return reference, data.frequency_hz, response, impedance


def _step_hz(frequency_hz):
    return float(np.max(np.diff(frequency_hz)))


def _check(sweep, reference, step_hz, phase=True, peak_scale=None, steps=1.0):
    """Every figure within `steps` steps of ngspice's meas (peak height too, when scaled).

    The brief's bar is one step; noise-free files are held to 0.05 step, the accuracy
    sheetgen/bench/sweep.py states for 10 or more points in band (observed: ~0.001 step)."""
    got = sweep_features(sweep, bandwidth_resolution_hz=step_hz)
    ref = f"ngspice meas ({reference.ngspice_version}), {sweep.source}"
    tol = steps * step_hz
    assert_close(got.f_peak_hz, reference.f_peak_hz, abs=tol, what=f"f_peak vs {ref}")
    assert_close(got.f_low_hz, reference.f_low_hz, abs=tol, what=f"f_low vs {ref}")
    assert_close(got.f_high_hz, reference.f_high_hz, abs=tol, what=f"f_high vs {ref}")
    assert_close(got.bandwidth_hz, reference.bandwidth_hz, abs=2 * tol if steps < 1 else tol,
                 what=f"bandwidth vs {ref}")
    if phase:
        assert_close(got.f_zero_phase_hz, reference.f_zero_phase_hz, abs=tol,
                     what=f"zero phase vs {ref}")
    else:
        assert got.f_zero_phase_hz is None
    if peak_scale is not None:
        assert_close(got.response_peak, peak_scale * reference.response_peak, rel=1e-4,
                     what=f"peak height vs {ref}")
    return got


def _series_s(topology="series"):
    reference, frequency_hz, current, impedance = _ngspice(topology)
    s = np.empty((frequency_hz.size, 2, 2), dtype=complex)
    s[:, 1, 0] = s[:, 0, 1] = 2.0 * Z0_OHM * current  # 2·V2/Vs with V2 = 50 Ω · I, Vs = 1 V
    s[:, 0, 0] = s[:, 1, 1] = (impedance - Z0_OHM) / (impedance + Z0_OHM)
    return reference, frequency_hz, s


def _write_touchstone(tmp_path, frequency_hz, s, name):
    import skrf

    network = skrf.Network(frequency=skrf.Frequency.from_f(frequency_hz, unit="hz"), s=s)
    network.write_touchstone(str(tmp_path / name))


def test_series_through_fixture_s2p(tmp_path):
    """.s2p from scikit-rf: S21's peak, half-power points and zero phase vs ngspice."""
    reference, frequency_hz, s = _series_s()
    _write_touchstone(tmp_path, frequency_hz, s, "series")
    sweep = read_sweep(tmp_path / "series.s2p")
    _check(sweep, reference, _step_hz(frequency_hz), peak_scale=2.0 * Z0_OHM, steps=0.05)


def test_series_reflection_s1p_read_and_refused_as_band_pass(tmp_path):
    """.s1p (S11 with port 2 matched): read back as written; its dip at resonance is not a
    band-pass maximum, and sweep_features says so rather than reporting one."""
    reference, frequency_hz, s = _series_s()
    _write_touchstone(tmp_path, frequency_hz, s[:, :1, :1], "series")
    sweep = read_sweep(tmp_path / "series.s1p")
    np.testing.assert_allclose(sweep.magnitude, np.abs(s[:, 0, 0]), rtol=1e-9)
    assert_close(sweep.frequency_hz[int(np.argmin(sweep.magnitude))], reference.f_peak_hz,
                 abs=_step_hz(frequency_hz), what="S11 dip at the loop's resonance (ngspice)")
    with pytest.raises(InputError) as caught:
        sweep_features(sweep)
    assert "the peak is not inside" in caught.value.problems[0].message
    _write_touchstone(tmp_path, frequency_hz, s, "series")
    s11 = read_sweep(tmp_path / "series.s2p", "s11")  # the same S11 from the 2-port file
    np.testing.assert_allclose(s11.magnitude, sweep.magnitude, rtol=1e-12)


def _csv(tmp_path, name, frequency_hz, response, decibels, phase, noise_db=0.0, seed=0):
    rng = np.random.default_rng(seed)
    magnitude = np.abs(response) * 10.0 ** (rng.normal(0.0, noise_db, response.size) / 20.0)
    angle = np.angle(response, deg=True) + (rng.normal(0.0, 0.1, response.size) if noise_db else 0)
    header = ["frequency (MHz)", "magnitude (dB)" if decibels else "magnitude"]
    header += ["phase (deg)"] if phase else []
    rows = [",".join(header)]
    for k, f_hz in enumerate(frequency_hz):
        value = 20 * math.log10(magnitude[k]) if decibels else magnitude[k]
        cells = [repr(float(f_hz) / 1e6), repr(float(value))]
        cells += [repr(float(angle[k]))] if phase else []
        rows.append(",".join(cells))
    path = tmp_path / name
    path.write_text("\n".join(rows) + "\n", encoding="utf-8")
    return path


CSV_CASES = [
    pytest.param(True, True, 0.0, id="dB-phase"),
    pytest.param(False, False, 0.0, id="linear-no-phase"),
    pytest.param(True, False, 0.0, id="dB-no-phase"),
    pytest.param(False, True, 0.0, id="linear-phase"),
    pytest.param(True, True, 0.02, id="dB-phase-noise-0.02dB"),
    pytest.param(False, False, 0.05, id="linear-noise-0.05dB"),
]


@pytest.mark.parametrize("topology", ["series", "parallel"])
@pytest.mark.parametrize("decibels, phase, noise_db", CSV_CASES)
def test_csv_sweeps(tmp_path, topology, decibels, phase, noise_db):
    """CSV of the series loop current or the tank voltage: every figure within a step."""
    reference, frequency_hz, response, _ = _ngspice(topology)
    path = _csv(tmp_path, f"{topology}.csv", frequency_hz, response, decibels, phase, noise_db)
    sweep = read_sweep(path)
    _check(sweep, reference, _step_hz(frequency_hz), phase=phase,
           peak_scale=None if noise_db else 1.0, steps=1.0 if noise_db else 0.05)


def test_too_coarse_ngspice_sweep_refused(tmp_path):
    """Every fourth point of the tank's sweep (5 per bandwidth): refused, with the step
    needed no coarser than a tenth of ngspice's bandwidth."""
    reference, frequency_hz, response, _ = _ngspice("parallel")
    path = _csv(tmp_path, "coarse.csv", frequency_hz[::4], response[::4], True, False)
    with pytest.raises(InputError) as caught:
        sweep_features(read_sweep(path))
    (problem,) = caught.value.problems
    assert "too coarse" in problem.message
    step_text = problem.expected.split("in steps of ")[1].split(" or finer")[0]
    assert parse_quantity(step_text.replace(" ", ""), FREQUENCY) <= reference.bandwidth_hz / 10
