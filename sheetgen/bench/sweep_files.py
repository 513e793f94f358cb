"""Read a measured sweep (Touchstone .s1p/.s2p or CSV) into frequency, magnitude and phase.

Touchstone (the IBIS open standard for measured network data, versions 1.x and 2.x) is
parsed by scikit-rf; before that, a light scan of the data lines reports a cell that is
not a number or a frequency that does not increase at its own line and column. CSV files
need a header row naming the columns (see `read_sweep`). Every problem is an `InputError`
at FILE:LINE:COLUMN; nothing else escapes.
"""

from __future__ import annotations

import math
import re
import warnings
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from sheetgen.errors import InputError, Problem
from sheetgen.inputs.files import read_bounded
from sheetgen.quantities import FREQUENCY, QuantityError, format_quantity, parse_quantity

# Caps on a sweep file (README "Limits"): the most points the job's own sweep.points allows
# (20 001), more than a bench analyser records in one sweep (common practice), and the bytes
# such a file takes as a 2-port Touchstone file (about 150 bytes a line) with room to spare.
MAX_SWEEP_POINTS = 20_001
MAX_SWEEP_BYTES = 5_000_000
MIN_POINTS = 5  # a parabola through the top needs 3; a handful more to see a response at all
MAX_DB = 300.0  # beyond this 10**(dB/20) leaves the float range; no bench measures it
MAX_LISTED = 20  # bad cells listed one by one before the rest are counted

TOUCHSTONE_PARAMETERS = {1: ("s11",), 2: ("s21", "s11", "s12", "s22")}

# Touchstone's option line names the frequency unit without regard to case (MHZ = MHz).
TOUCHSTONE_UNITS = {"hz": 1.0, "khz": 1e3, "mhz": 1e6, "ghz": 1e9}

FREQUENCY_HEADERS = "frequency, frequency (MHz), frequency [kHz] or frequency_hz"
MAGNITUDE_HEADERS = "magnitude (dB), mag_db, db (decibels) or magnitude (linear)"
PHASE_HEADERS = "phase (deg), phase_deg, phase (rad) or phase_rad"


@dataclass(frozen=True, eq=False)
class MeasuredSweep:
    """One measured response: linear magnitude (and phase in degrees, if given) per frequency.

    `source` says what was read ("Touchstone 1.0, 2-port, S21" / "CSV columns …");
    `parameter` is the S-parameter or CSV column used. Arrays are read-only."""

    path: str
    frequency_hz: np.ndarray
    magnitude: np.ndarray
    phase_deg: np.ndarray | None
    source: str
    parameter: str


def read_sweep(path: str | Path, parameter: str | None = None) -> MeasuredSweep:
    """Read `path`: .s1p → S11; .s2p → S21 (a through-fixture measurement) unless
    `parameter` names another ("s11", "s12", "s22"); .ts (Touchstone 2.0) likewise by its
    [Number of Ports]; .csv → its magnitude column.

    Frequencies must be positive, finite and strictly increasing, with at least
    MIN_POINTS points. Raises InputError for any file that cannot be used."""
    path = Path(path)
    shown = str(path)
    suffix = path.suffix.lower()
    if suffix not in (".s1p", ".s2p", ".ts", ".csv"):
        raise InputError([_problem(shown, 1, 1, "", f"unknown sweep file type {suffix or '(none)'!r}",
                                   "a Touchstone .s1p, .s2p or .ts file, or a .csv file")])
    text = _read_text(path)
    if suffix == ".csv":
        if parameter is not None:
            raise InputError([_problem(shown, 1, 1, "", f"parameter {parameter!r} applies to "
                                       "Touchstone files only; a CSV sweep holds one response")])
        return _read_csv(shown, text)
    ports = {".s1p": 1, ".s2p": 2}.get(suffix) or _declared_ports(shown, text)
    return _read_touchstone(path, text, ports, parameter)


# --------------------------------------------------------------------------- common


def _problem(path, line, column, field, message, expected=""):
    return Problem(path, line, column, field, message, expected)


def _read_text(path: Path) -> str:
    shown = str(path)
    raw = read_bounded(path, MAX_SWEEP_BYTES, "measured sweep (.s1p, .s2p, .ts or .csv)")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        before = raw[: exc.start]
        line = before.count(b"\n") + 1
        column = exc.start - (before.rfind(b"\n") + 1) + 1
        raise InputError([_problem(shown, line, column, "", f"byte 0x{raw[exc.start]:02x} is not "
                                   "UTF-8 text", "a plain-text sweep file (ASCII or UTF-8)")]) from None
    if not text.strip():
        raise InputError([_problem(shown, 1, 1, "", "is empty", "a measured sweep")])
    return text


def _frozen(values) -> np.ndarray:
    array = np.array(values, dtype=float)
    array.flags.writeable = False
    return array


def _check_frequencies(path, frequency_hz, places, field) -> list[Problem]:
    """Positive, finite, strictly increasing; `places[i]` is (line, column) of point i."""
    problems = []
    for i, f_hz in enumerate(frequency_hz):
        line, column = places[i]
        if not math.isfinite(f_hz):
            problems.append(_problem(path, line, column, field, "frequency is not finite"))
        elif f_hz <= 0.0:
            problems.append(_problem(path, line, column, field,
                                     f"frequency {f_hz!r} Hz is not positive"))
        elif i and math.isfinite(frequency_hz[i - 1]) and f_hz <= frequency_hz[i - 1]:
            problems.append(_problem(
                path, line, column, field,
                f"frequency {format_quantity(f_hz, 'Hz', 7)} is not above the previous point's "
                f"{format_quantity(frequency_hz[i - 1], 'Hz', 7)} (line {places[i - 1][0]})",
                "frequencies strictly increasing"))
    return problems


def _too_few(path, line, count) -> Problem:
    return _problem(path, line, 1, "", f"has {count} data point{'s' if count != 1 else ''}",
                    f"at least {MIN_POINTS}")


def _raise(problems: list[Problem]):
    if len(problems) > MAX_LISTED:
        extra = len(problems) - MAX_LISTED
        last = problems[MAX_LISTED]
        problems = problems[:MAX_LISTED] + [_problem(
            last.path, last.line, last.column, "", f"and {extra} more problem"
            f"{'s' if extra != 1 else ''} from here on (not listed)")]
    raise InputError(problems)


# --------------------------------------------------------------------------- Touchstone


def _scan_touchstone(path: str, text: str, ports: int) -> tuple[list[Problem], str]:
    """Cells that are not numbers, records of the wrong length and frequencies that do not
    increase, at their line and column; returns (problems, version). A 1- or 2-port record
    is 1 + 2·ports² numbers on one line (Touchstone 1.1 and 2.0); v1 2-port noise data (a
    frequency that drops, on a 5-number line) and v2 [Noise Data] end the scan."""
    per_record = 1 + 2 * ports * ports
    version = "1.0"
    in_data = True
    problems: list[Problem] = []
    frequencies: list[float] = []
    places: list[tuple[int, int]] = []
    declared = None  # (line, column, text) of [Number of Frequencies]
    scale = TOUCHSTONE_UNITS["ghz"]  # the standard's default when the option line says none
    for number, raw_line in enumerate(text.splitlines(), start=1):
        line = raw_line.split("!", 1)[0]
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            units = [t.lower() for t in stripped[1:].split() if t.lower() in TOUCHSTONE_UNITS]
            scale = TOUCHSTONE_UNITS[units[0]] if units else scale
            problems += _reference_problems(path, number, line)
            continue
        if stripped.startswith("["):
            keyword = stripped[1:].split("]", 1)[0].strip().lower()
            if keyword == "version":
                version = stripped.split("]", 1)[1].strip() or version
                in_data = False
            elif keyword == "number of frequencies":
                after = line.index("]") + 1
                value = line[after:].strip()
                column = (line.index(value, after) if value else after) + 1
                declared = (number, column, value)
            elif keyword == "reference":
                problems += _reference_problems(path, number, line, "reference")
            elif keyword == "network data":
                in_data = True
            elif keyword in ("noise data", "end"):
                break
            elif version != "1.0":
                in_data = False
            continue
        if not in_data:
            continue
        tokens = [(m.start() + 1, m.group(0)) for m in re.finditer(r"\S+", line)]
        first = _number(tokens[0][1])
        if ports == 2 and len(tokens) == 5 and frequencies and first is not None \
                and first * scale <= frequencies[-1] * scale:
            break  # Touchstone 1.x: a 2-port file's noise parameters follow its S-parameters
        bad = [(column, token) for column, token in tokens if _number(token) is None]
        for column, token in bad:
            problems.append(_problem(path, number, column, "", f'"{token}" is not a number'))
        if not bad and len(tokens) != per_record:
            problems.append(_problem(
                path, number, tokens[-1][0], "", f"holds {len(tokens)} numbers",
                f"{per_record} on one line (frequency and {ports * ports} pair"
                f"{'s' if ports > 1 else ''} of values) for a {ports}-port file"))
        if first is not None:
            frequencies.append(first)
            places.append((number, tokens[0][0]))
            if len(frequencies) > MAX_SWEEP_POINTS:
                raise InputError([_too_many(path, number)])
    if declared is not None:
        problems += _count_problems(path, declared, len(frequencies))
    problems += _check_frequencies(path, [f * scale for f in frequencies], places, "")
    return problems, version


def _reference_problems(path: str, number: int, line: str, keyword: str = "") -> list[Problem]:
    """The reference resistance of an option line (`# MHz S MA R 50`) or of a Touchstone
    2.0 [Reference] line: each a positive, finite number of ohms (the standard's default,
    50 Ω, when the option line gives none)."""
    tokens = [(m.start() + 1, m.group(0)) for m in re.finditer(r"[^\s\]]+", line.split("!", 1)[0])]
    if keyword:
        values = [(at, token) for at, token in tokens if not token.startswith("[")
                  and token.lower() != keyword]
    else:
        after = [index for index, (_, token) in enumerate(tokens) if token.lower() == "r"]
        values = [tokens[index + 1] for index in after if index + 1 < len(tokens)]
        if after and after[-1] + 1 >= len(tokens):
            return [_problem(path, number, tokens[-1][0], "reference resistance",
                             "R is given without a value", "R and the port reference in ohms, "
                             "e.g. R 50")]
    problems = []
    for at, token in values:
        value = _number(token)
        if value is None or not math.isfinite(value) or value <= 0.0:
            problems.append(_problem(path, number, at, "reference resistance",
                                     f'"{token}" Ω is not a positive, finite resistance',
                                     "the port reference resistance in ohms, e.g. 50"))
    return problems


def _count_problems(path: str, declared: tuple[int, int, str], found: int) -> list[Problem]:
    """A Touchstone 2.0 [Number of Frequencies] that disagrees with the data records."""
    number, column, text = declared
    if text.isdigit() and int(text) == found:
        return []
    return [_problem(path, number, column, "number of frequencies",
                     f"[Number of Frequencies] says {text or 'nothing'} but the file holds "
                     f"{found} frequencies", "the count of the data records")]


def _too_many(path: str, number: int) -> Problem:
    return _problem(path, number, 1, "", f"holds more than {MAX_SWEEP_POINTS:,} points",
                    f"at most {MAX_SWEEP_POINTS:,} (README, Limits); sweep a narrower span or "
                    "fewer points")


def _declared_ports(path: str, text: str) -> int:
    """A .ts file's [Number of Ports] (Touchstone 2.0); a sweep has 1 or 2."""
    for number, line in enumerate(text.splitlines(), start=1):
        match = re.match(r"\s*\[\s*number\s+of\s+ports\s*\]\s*(\S*)", line, re.I)
        if match:
            if match.group(1) in ("1", "2"):
                return int(match.group(1))
            raise InputError([_problem(path, number, match.start(1) + 1, "", f"{match.group(1)!r} "
                                       "ports", "1 or 2 ports for a measured sweep")])
    raise InputError([_problem(path, 1, 1, "", "has no [Number of Ports] line",
                               "a Touchstone 2.0 file, or name it .s1p or .s2p")])


def _number(token: str) -> float | None:
    try:
        return float(token)
    except ValueError:
        return None


def _clean(exc: Exception) -> str:
    """scikit-rf's complaint, one line, without Python's type names when it has words."""
    text = " ".join(str(exc).split())
    if not text:
        text = type(exc).__name__
    return text if len(text) <= 200 else text[:197] + "…"


def _read_touchstone(path: Path, text: str, ports: int, parameter: str | None) -> MeasuredSweep:
    shown = str(path)
    choices = TOUCHSTONE_PARAMETERS[ports]
    chosen = (parameter or choices[0]).lower()
    if chosen not in choices:
        raise InputError([_problem(shown, 1, 1, "", f"a {ports}-port file has no parameter "
                                   f"{parameter!r}", " or ".join(choices))])
    problems, version = _scan_touchstone(shown, text, ports)
    if problems:
        _raise(problems)
    import skrf  # heavy: only when a Touchstone file is read

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")  # scikit-rf's notes on the file; our checks follow
            with path.open("rb") as handle:
                network = skrf.Network(handle)
            frequency_hz = np.asarray(network.f, dtype=float)
            response = np.asarray(network.s, dtype=complex)
    except Exception as exc:  # scikit-rf raises many kinds; each is a bad file here
        raise InputError([_problem(shown, 1, 1, "", f"not a readable Touchstone file: "
                                   f"{_clean(exc)}", f"Touchstone {ports}-port data")]) from None
    if response.ndim != 3 or response.shape[1:] != (ports, ports) or response.shape[0] != frequency_hz.size:
        raise InputError([_problem(shown, 1, 1, "", f"holds {response.shape[1:]} S-parameters",
                                   f"a {ports}-port file")])
    if frequency_hz.size < MIN_POINTS:
        raise InputError([_too_few(shown, 1, frequency_hz.size)])
    row, column = int(chosen[1]) - 1, int(chosen[2]) - 1
    values = response[:, row, column]
    problems = _check_frequencies(shown, frequency_hz, [(1, 1)] * frequency_hz.size, "")
    if not np.all(np.isfinite(values)):
        problems.append(_problem(shown, 1, 1, chosen, "holds a value that is not finite"))
    elif np.any(values == 0):
        problems.append(_problem(shown, 1, 1, chosen, "holds a zero magnitude (no dB value)"))
    if problems:
        _raise(problems)
    return MeasuredSweep(
        path=shown,
        frequency_hz=_frozen(frequency_hz),
        magnitude=_frozen(np.abs(values)),
        phase_deg=_frozen(np.angle(values, deg=True)),
        source=f"Touchstone {version}, {ports}-port, {chosen.upper()}",
        parameter=chosen,
    )


# --------------------------------------------------------------------------- CSV


_HEADER = re.compile(r"^\s*(?P<name>[^(\[]*?)\s*(?:[(\[]\s*(?P<unit>[^)\]]*?)\s*[)\]])?\s*$")


@dataclass(frozen=True)
class _Column:
    kind: str  # "frequency", "magnitude" or "phase"
    index: int
    header: str
    column: int  # character column of the header cell
    scale: float | None = None  # frequency: Hz per written unit
    decibels: bool = False  # magnitude
    radians: bool = False  # phase


def _cells(line: str, delimiter: str) -> list[tuple[int, str]]:
    """(1-based column of the cell's first visible character, or of the cell when it is
    empty, and its text) of each cell; double quotes group and "" escapes."""
    cells, start, seen, text, quoted, i = [], 0, None, [], False, 0
    while i < len(line):
        char = line[i]
        if seen is None and not char.isspace() and (quoted or char != delimiter):
            seen = i
        if quoted:
            if char == '"' and line[i + 1:i + 2] == '"':
                text.append('"')
                i += 1
            elif char == '"':
                quoted = False
            else:
                text.append(char)
        elif char == '"':
            quoted = True
        elif char == delimiter:
            cells.append(((start if seen is None else seen) + 1, "".join(text).strip()))
            start, seen, text = i + 1, None, []
        else:
            text.append(char)
        i += 1
    cells.append(((start if seen is None else seen) + 1, "".join(text).strip()))
    return cells


def _classify(path, line, column, index, header) -> tuple[_Column | None, Problem | None]:
    match = _HEADER.match(header)
    name = re.sub(r"[\s_]+", "_", (match.group("name") if match else header).strip().lower())
    unit = (match.group("unit") if match else None) or ""
    unit = unit.strip()
    if name in ("frequency", "freq", "frequency_hz", "freq_hz"):
        if name.endswith("_hz"):
            if unit:
                return None, _problem(path, line, column, header, "gives the unit twice",
                                      FREQUENCY_HEADERS)
            unit = "Hz"
        unit = unit or "Hz"
        if unit == "mhz":
            return None, _problem(path, line, column, header, '"mhz" could be megahertz or '
                                  "millihertz", "MHz (megahertz)")
        try:
            scale = parse_quantity(f"1 {unit}", FREQUENCY)
        except QuantityError:
            return None, _problem(path, line, column, header, f'unit "{unit}" is not a '
                                  "frequency unit", "Hz, kHz, MHz or GHz")
        return _Column("frequency", index, header, column, scale=scale), None
    if name in ("mag_db", "magnitude_db", "db"):
        if unit:
            return None, _problem(path, line, column, header, "gives the unit twice",
                                  MAGNITUDE_HEADERS)
        return _Column("magnitude", index, header, column, decibels=True), None
    if name in ("magnitude", "mag"):
        if unit.lower() == "db":
            return _Column("magnitude", index, header, column, decibels=True), None
        if unit.lower() in ("", "linear", "lin"):
            return _Column("magnitude", index, header, column), None
        return None, _problem(path, line, column, header, f'magnitude unit "{unit}" is not '
                              "understood", MAGNITUDE_HEADERS)
    if name in ("phase", "phase_deg", "phase_rad"):
        unit = unit.lower() or {"phase_deg": "deg", "phase_rad": "rad"}.get(name, "")
        if name != "phase" and match and match.group("unit"):
            return None, _problem(path, line, column, header, "gives the unit twice", PHASE_HEADERS)
        if unit in ("deg", "degree", "degrees", "\u00b0"):
            return _Column("phase", index, header, column), None
        if unit in ("rad", "radian", "radians"):
            return _Column("phase", index, header, column, radians=True), None
        return None, _problem(path, line, column, header, "phase needs its unit" if not unit
                              else f'phase unit "{unit}" is not understood', PHASE_HEADERS)
    return None, None  # another column (a second trace, a time stamp): not ours


def _read_csv(path: str, text: str) -> MeasuredSweep:
    lines = text.splitlines()
    header_line = next((n for n, line in enumerate(lines, start=1)
                        if line.strip() and not line.lstrip().startswith("#")), None)
    if header_line is None:
        raise InputError([_problem(path, 1, 1, "", "has no header row",
                                   f"a header naming {FREQUENCY_HEADERS} and {MAGNITUDE_HEADERS}")])
    header = lines[header_line - 1]
    delimiter = next((d for d in (",", ";", "\t") if d in header), None)
    if delimiter is None:
        raise InputError([_problem(path, header_line, 1, "header", f'"{header.strip()}" has one '
                                   "column", "comma-, semicolon- or tab-separated columns: "
                                   "frequency and magnitude (and phase)")])
    columns: dict[str, _Column] = {}
    problems = []
    for index, (column, cell) in enumerate(_cells(header, delimiter)):
        found, problem = _classify(path, header_line, column, index, cell)
        if problem:
            problems.append(problem)
        elif found and found.kind in columns:
            problems.append(_problem(path, header_line, column, cell, f"a second {found.kind} "
                                     f"column (the first is \"{columns[found.kind].header}\")"))
        elif found:
            columns[found.kind] = found
    for kind, expected in (("frequency", FREQUENCY_HEADERS), ("magnitude", MAGNITUDE_HEADERS)):
        if kind not in columns and not any(p.line == header_line for p in problems):
            problems.append(_problem(path, header_line, 1, "header", f"no {kind} column in "
                                     f'"{header.strip()}"', f"a column named {expected}"))
    if problems:
        _raise(problems)
    wanted = [columns[kind] for kind in ("frequency", "magnitude", "phase") if kind in columns]
    values: dict[str, list[float]] = {column.kind: [] for column in wanted}
    places = []
    for number in range(header_line + 1, len(lines) + 1):
        line = lines[number - 1]
        if not line.strip() or line.lstrip().startswith("#"):
            continue
        cells = _cells(line, delimiter)
        row_ok = True
        row = {}
        for column in wanted:
            if column.index >= len(cells):
                problems.append(_problem(path, number, len(line) + 1, column.header,
                                         f"row has {len(cells)} cells; no {column.kind} value",
                                         f"a value under \"{column.header}\""))
                row_ok = False
                continue
            at, cell = cells[column.index]
            value = _number(cell)
            if value is None or not math.isfinite(value):
                shown = f'"{cell}"' if cell else "an empty cell"
                problems.append(_problem(path, number, at, column.header,
                                         f"{shown} is not a {'finite ' if value is not None else ''}"
                                         "number", f"a {column.kind} value"))
                row_ok = False
            elif column.kind == "magnitude" and column.decibels and abs(value) > MAX_DB:
                problems.append(_problem(path, number, at, column.header, f"{cell} dB is outside "
                                         f"±{MAX_DB:g} dB", "a measured magnitude in dB"))
                row_ok = False
            elif column.kind == "magnitude" and not column.decibels and value <= 0.0:
                problems.append(_problem(path, number, at, column.header, f"magnitude {cell} is "
                                         "not positive", "a linear magnitude above 0"))
                row_ok = False
            else:
                row[column.kind] = value
        if row_ok:
            for kind, value in row.items():
                values[kind].append(value)
            places.append((number, cells[columns["frequency"].index][0]))
            if len(places) > MAX_SWEEP_POINTS:
                raise InputError([_too_many(path, number)])
    frequency_hz = [value * columns["frequency"].scale for value in values["frequency"]]
    problems += _check_frequencies(path, frequency_hz, places, columns["frequency"].header)
    if not problems and len(frequency_hz) < MIN_POINTS:
        problems.append(_too_few(path, header_line, len(frequency_hz)))
    if problems:
        _raise(problems)
    magnitude_column = columns["magnitude"]
    magnitude = np.array(values["magnitude"])
    if magnitude_column.decibels:
        magnitude = 10.0 ** (magnitude / 20.0)
    phase = None
    if "phase" in columns:
        phase = np.array(values["phase"])
        if columns["phase"].radians:
            phase = np.degrees(phase)
    described = ", ".join(f'"{column.header}"' for column in wanted)
    return MeasuredSweep(
        path=path,
        frequency_hz=_frozen(frequency_hz),
        magnitude=_frozen(magnitude),
        phase_deg=None if phase is None else _frozen(phase),
        source=f"CSV columns {described}",
        parameter=magnitude_column.header,
    )


# --------------------------------------------------------------------------- reach

REACH_QUANTITIES = ("f0_hz", "f_low_hz", "f_high_hz")  # the windows a sweep is graded on


def require_reach(sweep: MeasuredSweep, results: dict) -> None:
    """A sweep must span every frequency window of the sheet's test record it is graded
    against (f0 and the half-power points); one that does not (a unit's kHz written
    under a header in Hz, a span set for another sheet) is bad input, not a failed unit."""
    rows = ((results.get("test_record") or {}).get("values") or []) if isinstance(results, dict) \
        else []
    edges = [edge for row in rows if isinstance(row, dict)
             and row.get("quantity") in REACH_QUANTITIES
             for edge in (row.get("min"), row.get("max"))
             if isinstance(edge, (int, float)) and not isinstance(edge, bool) and math.isfinite(edge)]
    if not edges:
        return
    low, high = min(edges), max(edges)
    first, last = float(sweep.frequency_hz[0]), float(sweep.frequency_hz[-1])
    if first > low or last < high:
        raise InputError([_problem(
            sweep.path, 1, 1, "", f"spans {format_quantity(first, 'Hz', 6)} to "
            f"{format_quantity(last, 'Hz', 6)}, which does not reach the sheet's windows "
            f"({format_quantity(low, 'Hz', 6)} to {format_quantity(high, 'Hz', 6)}); check "
            "the frequency unit of the file and the span swept",
            "a sweep across every frequency window of the sheet")])
