"""read_sweep: Touchstone through scikit-rf, CSV with a named header, every bad file located.

Sources:
- [TS1] Touchstone File Format Specification 1.1 (IBIS Open Forum): option line
  `# <unit> S <MA|DB|RI> R <Z0>`, 2-port records `f S11 S21 S12 S22` on one line,
  2-port noise parameters after the S-parameters, marked by a frequency that drops.
- [TS2] Touchstone File Format Specification 2.0 (IBIS Open Forum): `[Version] 2.0`,
  `[Number of Ports]`, `[Two-Port Data Order] 12_21` (S11 S12 S21 S22), `[Number of
  Frequencies]`, `[Network Data]`, `[End]`; DB format = 20·log10|S| and angle in degrees.
- [SKRF] scikit-rf: a Network written with `write_touchstone` and read back by us.
- [SI] SI prefixes k = 1e3, M = 1e6, G = 1e9 (BIPM SI Brochure); a field quantity in dB is
  20·log10 of the ratio (IEC 60027-3, from memory).
Positions (line, column) in the bad-file cases are counted by hand from the file text.
"""

import math

import numpy as np
import pytest

from sheetgen.bench.sweep_files import MIN_POINTS, read_sweep
from sheetgen.errors import InputError
from tests.support import assert_close


def _problems(path, parameter=None):
    with pytest.raises(InputError) as caught:
        read_sweep(path, parameter)
    return caught.value.problems


def _write(tmp_path, name, text):
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


# --------------------------------------------------------------------------- CSV


ROWS = [(1.00, -9.0, 40.0), (1.05, -4.0, 25.0), (1.10, -0.5, 5.0), (1.15, -2.0, -15.0),
        (1.20, -6.0, -30.0), (1.25, -11.0, -45.0)]


@pytest.mark.parametrize("header, hz_per_unit", [
    ("frequency (MHz)", 1e6), ("frequency [kHz]", 1e3), ("frequency_hz", 1.0),
    ("frequency", 1.0), ("Frequency (GHz)", 1e9), ("freq [Hz]", 1.0),
])
def test_csv_frequency_units(tmp_path, header, hz_per_unit):
    """[SI] the header's unit scales the column."""
    text = f"{header},magnitude (dB)\n" + "".join(f"{f},{db}\n" for f, db, _ in ROWS)
    sweep = read_sweep(_write(tmp_path, "a.csv", text))
    for got, (f, _, _) in zip(sweep.frequency_hz, ROWS):
        assert_close(got, f * hz_per_unit, rel=1e-15, what=f"frequency under {header!r} [SI]")
    assert sweep.phase_deg is None


@pytest.mark.parametrize("header, decibels", [
    ("magnitude (dB)", True), ("mag_db", True), ("db", True), ("Magnitude [dB]", True),
    ("magnitude", False), ("magnitude (linear)", False),
])
def test_csv_magnitude_in_db_or_linear(tmp_path, header, decibels):
    """[SI] a magnitude in dB is 20·log10 of the linear ratio."""
    values = [db if decibels else 10.0 ** (db / 20.0) for _, db, _ in ROWS]
    text = f"frequency (MHz),{header}\n" + "".join(
        f"{f},{v!r}\n" for (f, _, _), v in zip(ROWS, values))
    sweep = read_sweep(_write(tmp_path, "a.csv", text))
    for got, (_, db, _) in zip(sweep.magnitude, ROWS):
        assert_close(got, 10.0 ** (db / 20.0), rel=1e-12, what=f"linear magnitude from {header!r}")
    assert sweep.parameter == header


@pytest.mark.parametrize("header, per_degree", [
    ("phase (deg)", 1.0), ("phase_deg", 1.0), ("phase [°]", 1.0),
    ("phase (rad)", math.pi / 180.0), ("phase_rad", math.pi / 180.0),
])
def test_csv_phase_column(tmp_path, header, per_degree):
    """Phase in degrees or radians (π rad = 180°), semicolon-separated, comments skipped."""
    text = ("# written by hand\n" f"frequency (MHz);mag_db;{header};note\n"
            + "".join(f"{f};{db};{ph * per_degree!r};x\n" for f, db, ph in ROWS))
    sweep = read_sweep(_write(tmp_path, "a.csv", text))
    for got, (_, _, ph) in zip(sweep.phase_deg, ROWS):
        assert_close(got, ph, abs=1e-12, what=f"phase from {header!r}")


def test_csv_arrays_are_read_only(tmp_path):
    text = "frequency,mag_db\n" + "".join(f"{f},{db}\n" for f, db, _ in ROWS)
    sweep = read_sweep(_write(tmp_path, "a.csv", text))
    with pytest.raises(ValueError):
        sweep.magnitude[0] = 1.0


def test_csv_bad_cells_located(tmp_path):
    """Each bad cell at its own line and column (counted by hand), with the header's name."""
    text = ("frequency (MHz), magnitude (dB), phase (deg)\n"  # line 1
            "1.00, -9.0, 40\n"                                # line 2
            "1.05, -4.0, abc\n"                               # line 3: column 13
            "1.10, , 5\n"                                     # line 4: column 6 (empty)
            "1.15, nan, 0\n"                                  # line 5: column 7
            "1.20\n"                                          # line 6: too short
            "1.25, -11, -45\n")
    problems = _problems(_write(tmp_path, "bad.csv", text))
    found = [(p.line, p.column, p.field) for p in problems]
    assert (3, 13, "phase (deg)") in found
    assert (4, 6, "magnitude (dB)") in found
    assert (5, 7, "magnitude (dB)") in found
    assert any(p.line == 6 and p.field == "magnitude (dB)" for p in problems)
    text_of = {(p.line, p.column): str(p) for p in problems}
    assert '"abc" is not a number' in text_of[(3, 13)]
    assert text_of[(3, 13)].startswith(f"{tmp_path / 'bad.csv'}:3:13 phase (deg):")


def test_csv_non_increasing_frequency_refused(tmp_path):
    text = ("frequency (kHz),magnitude\n" "100,0.1\n" "110,0.5\n" "120,0.9\n"
            "120,0.8\n"   # line 5: equal to the previous
            "115,0.4\n"   # line 6: below it
            "130,0.2\n" "140,0.1\n")
    problems = _problems(_write(tmp_path, "a.csv", text))
    assert [(p.line, p.column) for p in problems] == [(5, 1), (6, 1)]
    assert "not above the previous point" in problems[0].message
    assert problems[0].expected == "frequencies strictly increasing"


@pytest.mark.parametrize("cell, words", [("0", "not positive"), ("-5", "not positive"),
                                         ("inf", "not a finite number")])
def test_csv_frequency_must_be_positive_and_finite(tmp_path, cell, words):
    text = "frequency,magnitude\n" f"{cell},0.1\n" + "".join(f"{k},0.5\n" for k in range(2, 9))
    problems = _problems(_write(tmp_path, "a.csv", text))
    assert [(p.line, p.column) for p in problems] == [(2, 1)]
    assert words in problems[0].message


def test_csv_linear_magnitude_must_be_positive(tmp_path):
    text = "frequency,magnitude\n" + "".join(f"{k},0.5\n" for k in range(1, 7)) + "7,0\n"
    problems = _problems(_write(tmp_path, "a.csv", text))
    assert [(p.line, p.column, p.field) for p in problems] == [(8, 3, "magnitude")]


@pytest.mark.parametrize("header, column, words", [
    ("frequency (MHz),phase (deg)", 1, "no magnitude column"),
    ("f_mhz,magnitude (dB)", 1, "no frequency column"),
    ("frequency (mhz),magnitude (dB)", 1, "megahertz or millihertz"),
    ("frequency (MHz),magnitude (V)", 17, 'magnitude unit "V" is not understood'),
    ("frequency (MHz),magnitude (dB),phase", 32, "phase needs its unit"),
    ("frequency (furlongs),mag_db", 1, "not a frequency unit"),
    ("frequency (MHz),mag_db,db", 24, "a second magnitude column"),
])
def test_csv_header_problems(tmp_path, header, column, words):
    text = header + "\n" + "".join(f"{k},{k},{k}\n" for k in range(1, 8))
    problems = _problems(_write(tmp_path, "a.csv", text))
    assert len(problems) == 1, problems
    assert (problems[0].line, problems[0].column) == (1, column)
    assert words in problems[0].message
    if words.startswith("no "):
        assert "frequency (MHz)" in problems[0].expected or "dB" in problems[0].expected


def test_csv_too_few_points(tmp_path):
    text = "frequency,magnitude\n" + "".join(f"{k},0.5\n" for k in range(1, MIN_POINTS))
    problems = _problems(_write(tmp_path, "a.csv", text))
    assert problems[0].expected == f"at least {MIN_POINTS}"


def test_csv_with_a_parameter_refused(tmp_path):
    text = "frequency,magnitude\n" + "".join(f"{k},0.5\n" for k in range(1, 9))
    assert "Touchstone files only" in _problems(_write(tmp_path, "a.csv", text), "s21")[0].message


def test_not_utf8_located(tmp_path):
    path = tmp_path / "a.csv"
    path.write_bytes(b"frequency,magnitude\n1,0.5\n2,\xff\n")
    problem = _problems(path)[0]
    assert (problem.line, problem.column) == (3, 3)


@pytest.mark.parametrize("name, words", [("a.txt", "unknown sweep file type"),
                                         ("missing.csv", "no such file"),
                                         ("a.s3p", "unknown sweep file type"),
                                         ("a.ts", "no [Number of Ports] line")])
def test_unusable_paths(tmp_path, name, words):
    if name != "missing.csv":
        _write(tmp_path, name, "frequency,magnitude\n1,1\n")
    assert words in _problems(tmp_path / name)[0].message


def test_empty_and_directory(tmp_path):
    assert "is empty" in _problems(_write(tmp_path, "e.s1p", ""))[0].message
    (tmp_path / "d.csv").mkdir()
    assert "is a directory" in _problems(tmp_path / "d.csv")[0].message


# --------------------------------------------------------------------------- Touchstone


def _network(frequency_hz, s):
    import skrf

    return skrf.Network(frequency=skrf.Frequency.from_f(frequency_hz, unit="hz"), s=s)


def _series_s(frequency_hz):
    """A series element Z between two 50 Ω ports: S11 = S22 = Z/(Z+100), S21 = S12 = 100/(Z+100)
    (standard two-port result for a series impedance; from memory)."""
    w = 2 * np.pi * frequency_hz
    z = 3.0 + 1j * (w * 4.7e-6 - 1.0 / (w * 100e-12))
    s = np.empty((frequency_hz.size, 2, 2), dtype=complex)
    s[:, 0, 0] = s[:, 1, 1] = z / (z + 100.0)
    s[:, 1, 0] = s[:, 0, 1] = 100.0 / (z + 100.0)
    return s


@pytest.mark.parametrize("version", ["1.0", "2.0"])
@pytest.mark.parametrize("form", ["ri", "ma", "db"])
def test_scikit_rf_round_trip_s2p(tmp_path, version, form):
    """[SKRF] written by scikit-rf, read back: S21 by default, S11 when asked."""
    frequency_hz = np.linspace(5e6, 8e6, 61)
    s = _series_s(frequency_hz)
    _network(frequency_hz, s).write_touchstone(str(tmp_path / "dut"), form=form, version=version)
    written = tmp_path / ("dut.s2p" if version == "1.0" else "dut.ts")  # scikit-rf's names
    for parameter, (i, j) in ((None, (1, 0)), ("s11", (0, 0)), ("S22", (1, 1))):
        sweep = read_sweep(written, parameter)
        assert sweep.source.startswith(f"Touchstone {version}")
        assert sweep.parameter == (parameter or "s21").lower()
        np.testing.assert_allclose(sweep.frequency_hz, frequency_hz, rtol=1e-12)
        np.testing.assert_allclose(sweep.magnitude, np.abs(s[:, i, j]), rtol=1e-9)
        np.testing.assert_allclose(sweep.phase_deg, np.angle(s[:, i, j], deg=True), atol=1e-7)


def test_scikit_rf_round_trip_s1p(tmp_path):
    """[SKRF] a one-port file gives S11; asking it for S21 is refused."""
    frequency_hz = np.linspace(1e6, 2e6, 11)
    s = (0.3 + 0.4j * np.linspace(-1, 1, 11)).reshape(-1, 1, 1)
    _network(frequency_hz, s).write_touchstone(str(tmp_path / "dut"))
    sweep = read_sweep(tmp_path / "dut.s1p")
    assert sweep.parameter == "s11" and "1-port" in sweep.source
    np.testing.assert_allclose(sweep.magnitude, np.abs(s[:, 0, 0]), rtol=1e-9)
    assert "no parameter 's21'" in _problems(tmp_path / "dut.s1p", "s21")[0].message


def test_touchstone_v2_by_hand(tmp_path):
    """[TS2] keyword syntax, 12_21 order (S11 S12 S21 S22), DB format, kHz option line."""
    rows = [(100 + 10 * k, -20.0 + k, 30.0 - 5 * k) for k in range(7)]
    text = ("! written by hand for the test\n"
            "[Version] 2.0\n"
            "# kHz S DB R 50\n"
            "[Number of Ports] 2\n"
            "[Two-Port Data Order] 12_21\n"
            f"[Number of Frequencies] {len(rows)}\n"
            "[Reference] 50 50\n"
            "[Network Data]\n"
            + "".join(f"{f} -30 0 -40 10 {db} {ang} -35 0\n" for f, db, ang in rows)
            + "[End]\n")
    sweep = read_sweep(_write(tmp_path, "v2.s2p", text))
    assert sweep.source.startswith("Touchstone 2.0")
    for k, (f, db, ang) in enumerate(rows):
        assert_close(sweep.frequency_hz[k], f * 1e3, rel=1e-15, what="f [TS2] kHz")
        assert_close(sweep.magnitude[k], 10.0 ** (db / 20.0), rel=1e-12, what="|S21| [TS2] DB")
        assert_close(sweep.phase_deg[k], ang, abs=1e-9, what="angle S21 [TS2]")
    s12 = read_sweep(tmp_path / "v2.s2p", "s12")
    (tmp_path / "v2.ts").write_text(text, encoding="utf-8")
    assert_close(read_sweep(tmp_path / "v2.ts").magnitude[0], 10.0 ** (-20 / 20.0), rel=1e-12,
                 what="|S21| [TS2] from a .ts file")
    assert_close(s12.magnitude[0], 10.0 ** (-40 / 20.0), rel=1e-12, what="|S12| [TS2] 12_21")


def test_touchstone_v1_noise_block_is_not_data(tmp_path):
    """[TS1] 2-port noise parameters (5 numbers) after a frequency drop are not S-parameters."""
    text = ("# MHz S MA R 50\n" + "".join(f"{k} 0.1 0 0.{k} 20 0.1 0 0.1 0\n" for k in range(1, 7))
            + "1 1.5 0.5 30 0.2\n2 1.6 0.5 40 0.2\n")
    sweep = read_sweep(_write(tmp_path, "n.s2p", text))
    np.testing.assert_allclose(sweep.frequency_hz, np.arange(1, 7) * 1e6, rtol=1e-15)
    np.testing.assert_allclose(sweep.magnitude, np.arange(1, 7) / 10, rtol=1e-12)


def test_touchstone_bad_cells_located(tmp_path):
    text = ("! comment\n# MHz S MA R 50\n"
            "1 0.5 0 0.5 0 0.5 0 0.5 0\n"
            "2 0.5 0 0.5 0 x 0 0.5 0\n"     # line 4, column 15
            "3 0.5 0 0.5 0 0.5 0 0.5\n"     # line 5: 8 numbers, the last at column 21
            "2.5 0.5 0 0.5 0 0.5 0 0.5 0\n"  # line 6: frequency drops
            "4 0.5 0 0.5 0 0.5 0 0.5 0\n5 0.5 0 0.5 0 0.5 0 0.5 0\n")
    problems = _problems(_write(tmp_path, "b.s2p", text))
    assert [(p.line, p.column) for p in problems] == [(4, 15), (5, 21), (6, 1)]
    assert '"x" is not a number' in problems[0].message
    assert problems[1].expected.startswith("9 on one line")
    assert "2.500000 MHz is not above the previous point's 3.000000 MHz" in problems[2].message


def test_touchstone_what_scikit_rf_said(tmp_path):
    """A file scikit-rf refuses: line 1, its words, no traceback."""
    text = "# XHz S MA R 50\n" + "".join(f"{k} 0.5 0 0.5 0 0.5 0 0.5 0\n" for k in range(1, 7))
    problems = _problems(_write(tmp_path, "o.s2p", text))
    assert (problems[0].line, problems[0].column) == (1, 1)
    assert problems[0].message.startswith("not a readable Touchstone file: ")
    assert "xhz" in problems[0].message.lower()
    assert "Traceback" not in str(problems[0])
