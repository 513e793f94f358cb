"""Hostile files and paths, through the CLI: each a clear message naming the file, exit 2,
nothing written or overwritten, never a traceback.

Each case was reproduced against the tool before the fix (issue 17, part B): an output
that is an input replaced it (exit 0); a job, style or library nested 20,000 deep, a job
that is a link to /dev/zero or a FIFO, a logo declaring 30,000 × 30,000 pixels crashed or
hung; `sheet.style` read /etc/passwd; a sweep above any bench's size was read for 20 s.
Small files are written here; the big ones are generated (never committed).
"""

from __future__ import annotations

import os
import struct
import zlib
from pathlib import Path

import pytest

from sheetgen.bench.sweep_files import MAX_SWEEP_BYTES, MAX_SWEEP_POINTS
from sheetgen.inputs.reader import MAX_DEPTH
from sheetgen.inputs.style import MAX_LOGO_PIXELS, image_size
from tests.cli.test_bad_input import GOOD, LOCATED, _run, _write

STYLE = "organisation: Example Works\n"


def _unchanged(path: Path, before: bytes) -> None:
    assert path.read_bytes() == before, f"{path} was overwritten"


# --------------------------------------------------------------------------- 4 outputs


@pytest.mark.parametrize("arguments", [
    ("build", "{job}", "-o", "{job}"),
    ("build", "{job}", "--results", "{job}"),
    ("limits", "{job}", "-o", "{job}"),
    ("build", "{job}", "-o", "{hard}"),
    ("build", "{job}", "-o", "{soft}"),
    ("build", "{job}", "-o", "{out}", "--results", "{out}"),
    ("build", "{job}", "--style", "{style}", "-o", "{style}"),
], ids=["build -o job", "build --results job", "limits -o job", "hard link", "symlink",
        "two outputs one file", "build -o style"])
def test_an_output_that_is_an_input_is_refused(tmp_path, capsys, arguments):
    job = _write(tmp_path, GOOD)
    style = _write(tmp_path, STYLE, "house.yaml")
    os.link(job, tmp_path / "hard.yaml")
    (tmp_path / "soft.yaml").symlink_to(job)
    names = {"job": job, "hard": tmp_path / "hard.yaml", "soft": tmp_path / "soft.yaml",
             "out": tmp_path / "out.pdf", "style": style}
    before = {path: path.read_bytes() for path in (job, style)}
    code, lines = _run(capsys, *[a.format(**names) for a in arguments])
    assert code == 2, lines
    assert len(lines) == 1 and ("would overwrite" in lines[0] or "name the same" in lines[0])
    for path, data in before.items():
        _unchanged(path, data)
    assert not (tmp_path / "out.pdf").exists() and not (tmp_path / "job.pdf").exists()


def test_build_may_not_write_over_a_parts_library_file(tmp_path, capsys):
    toroid = (Path(__file__).resolve().parents[2] / "templates" / "toroid.yaml").read_text(
        encoding="utf-8")
    job = _write(tmp_path, toroid)
    library = Path(__file__).resolve().parents[2] / "shared"
    copy = tmp_path / "parts"
    copy.mkdir()
    for name in ("cores.yaml", "materials.yaml"):
        (copy / name).write_bytes((library / name).read_bytes())
    before = (copy / "cores.yaml").read_bytes()
    code, lines = _run(capsys, "build", job, "--library", copy, "--results", copy / "cores.yaml")
    assert code == 2 and "would overwrite the parts library file" in lines[0]
    _unchanged(copy / "cores.yaml", before)


@pytest.mark.parametrize("option", ["-o", "--json", "--csv", "--append"])
def test_grade_outputs_may_not_be_the_sweep_or_the_sheet(tmp_path, capsys, option):
    """Refused before anything is read: the sheet need not even be a sheet."""
    sheet = _write(tmp_path, b"%PDF-1.7 placeholder", "sheet.pdf")
    sweep = _write(tmp_path, "frequency (Hz),magnitude (dB)\n1,0\n", "m.csv")
    for target in (sweep, sheet):
        code, lines = _run(capsys, "grade", sheet, "--sweep", sweep, option, target)
        assert code == 2 and "would overwrite" in lines[0] and str(target) in lines[0]
    _unchanged(sweep, b"frequency (Hz),magnitude (dB)\n1,0\n")
    _unchanged(sheet, b"%PDF-1.7 placeholder")


def test_grade_outputs_may_not_share_a_file(tmp_path, capsys):
    sheet = _write(tmp_path, b"%PDF-1.7 placeholder", "sheet.pdf")
    code, lines = _run(capsys, "grade", sheet, "--json", tmp_path / "r", "--csv", tmp_path / "r")
    assert code == 2 and "--csv and --json name the same file" in lines[0]
    assert not (tmp_path / "r").exists()


# --------------------------------------------------------------------------- 5 bounds


def _deep_yaml(levels: int) -> str:
    return "[" * levels + "]" * levels + "\n"


@pytest.mark.parametrize("levels", [MAX_DEPTH + 5, 20_000])
def test_a_job_nested_deep_is_refused(tmp_path, capsys, levels):
    job = _write(tmp_path, "sheet:\n  notes: " + _deep_yaml(levels))
    code, lines = _run(capsys, "check", job)
    assert code == 2 and lines[0].startswith(f"{job}:")
    assert f"nested more than {MAX_DEPTH} levels deep" in lines[0]


def test_a_style_nested_deep_is_refused(tmp_path, capsys):
    job = _write(tmp_path, GOOD)
    style = _write(tmp_path, "organisation: " + _deep_yaml(20_000), "house.yaml")
    code, lines = _run(capsys, "build", job, "--style", style)
    assert code == 2 and lines[0].startswith(f"{style}:") and "nested more than" in lines[0]
    assert not (tmp_path / "job.pdf").exists()


def test_a_library_file_nested_deep_is_refused(tmp_path, capsys):
    toroid = (Path(__file__).resolve().parents[2] / "templates" / "toroid.yaml").read_text(
        encoding="utf-8")
    job = _write(tmp_path, toroid)
    library = tmp_path / "parts"
    library.mkdir()
    deep = _write(library, "cores: " + _deep_yaml(20_000), "cores.yaml")
    code, lines = _run(capsys, "check", job, "--library", library)
    assert code == 2 and any(line.startswith(f"{deep}:") and "nested more than" in line
                             for line in lines), lines


def test_a_job_that_links_to_dev_zero_is_refused(tmp_path, capsys):
    """/dev/zero reports size 0 (it passed the size cap) and reads forever."""
    job = tmp_path / "job.yaml"
    job.symlink_to("/dev/zero")
    code, lines = _run(capsys, "check", job)
    assert code == 2 and lines == [f"{job}:1:1 is not a regular file (a device, pipe or "
                                   "socket); expected a YAML job file"]


def test_a_fifo_as_a_job_is_refused_without_waiting(tmp_path, capsys):
    job = tmp_path / "job.yaml"
    os.mkfifo(job)  # nobody writes to it: reading it would wait forever
    code, lines = _run(capsys, "check", job)
    assert code == 2 and "is not a regular file" in lines[0]


def _png(width: int, height: int, pixels: bytes | None = None) -> bytes:
    """A PNG whose IHDR (ISO/IEC 15948 §11.2.2) declares width × height, 8-bit grey; its one
    IDAT holds a single row (or `pixels`), so the file is small whatever it declares."""
    def chunk(kind: bytes, body: bytes) -> bytes:
        return (struct.pack(">I", len(body)) + kind + body
                + struct.pack(">I", zlib.crc32(kind + body) & 0xFFFFFFFF))
    header = struct.pack(">IIBBBBB", width, height, 8, 0, 0, 0, 0)
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", header)
            + chunk(b"IDAT", pixels or zlib.compress(b"\x00" * (width + 1)))
            + chunk(b"IEND", b""))


def test_the_png_and_jpeg_sizes_are_read_from_their_headers():
    assert image_size(_png(30_000, 20_000)) == (30_000, 20_000)
    # JPEG: SOI, then SOF0 with length 17, precision 8, height 0x01E0 (480), width
    # 0x0280 (640) (ITU-T T.81 B.2.2)
    jpeg = b"\xff\xd8" + b"\xff\xe0\x00\x04ab" + b"\xff\xc0\x00\x11\x08\x01\xe0\x02\x80" + b"\0" * 12
    assert image_size(jpeg) == (640, 480)


def test_a_decompression_bomb_logo_is_refused(tmp_path, capsys):
    (tmp_path / "logo.png").write_bytes(_png(30_000, 30_000))
    job = _write(tmp_path, GOOD)
    style = _write(tmp_path, STYLE + "logo: logo.png\n", "house.yaml")
    code, lines = _run(capsys, "build", job, "--style", style)
    assert code == 2, lines
    match = LOCATED.match(lines[0])
    assert match and match["file"] == str(style) and match["rest"].startswith("logo: ")
    assert f"30,000 × 30,000 pixels; a logo is at most {MAX_LOGO_PIXELS:,}" in lines[0]
    assert not (tmp_path / "job.pdf").exists()


def test_a_logo_whose_pixels_do_not_decode_is_named(tmp_path, capsys):
    """Reproduced: "sheetgen: : handle_pageBegin … broken data stream", naming no file."""
    (tmp_path / "logo.png").write_bytes(_png(40, 20, pixels=b"not a zlib stream"))
    job = _write(tmp_path, GOOD)
    style = _write(tmp_path, STYLE + "logo: logo.png\n", "house.yaml")
    code, lines = _run(capsys, "build", job, "--style", style)
    assert code == 2 and lines == [f"{style}:2:7 logo: logo.png cannot be decoded as an image "
                                   "(broken data stream when reading image file); save it "
                                   "again as PNG or JPEG"]
    assert not (tmp_path / "job.pdf").exists()


def test_a_logo_that_is_a_fifo_is_refused(tmp_path, capsys):
    os.mkfifo(tmp_path / "logo.png")  # inside the folder; reading it would wait forever
    job = _write(tmp_path, GOOD)
    style = _write(tmp_path, STYLE + "logo: logo.png\n", "house.yaml")
    code, lines = _run(capsys, "build", job, "--style", style)
    assert code == 2 and "logo: " in lines[0] and "not a regular file" in lines[0]


@pytest.mark.parametrize("style", ["../../../../etc/passwd", "/etc/passwd", "../house.yaml"])
def test_a_style_the_job_names_must_be_inside_its_folder(tmp_path, capsys, style):
    folder = tmp_path / "jobs"
    folder.mkdir()
    _write(tmp_path, STYLE, "house.yaml")
    job = _write(folder, GOOD.replace("  date: 2026-12-01\n", f"  date: 2026-12-01\n  style: "
                                      f"{style}\n"))
    code, lines = _run(capsys, "build", job)
    assert code == 2, lines
    match = LOCATED.match(lines[0])
    assert match and match["file"] == str(job) and match["rest"].startswith("sheet.style: ")
    assert "absolute path" in lines[0] or '".."' in lines[0]
    assert not (folder / "job.pdf").exists()


def test_a_style_linked_out_of_the_job_folder_is_refused(tmp_path, capsys):
    folder = tmp_path / "jobs"
    folder.mkdir()
    (folder / "house.yaml").symlink_to("/etc/passwd")
    job = _write(folder, GOOD.replace("  date: 2026-12-01\n", "  date: 2026-12-01\n"
                                      "  style: house.yaml\n"))
    code, lines = _run(capsys, "build", job)
    assert code == 2 and "sheet.style: " in lines[0] and "outside the job's folder" in lines[0]


# --------------------------------------------------------------------------- 6 sweep caps


def test_a_sweep_over_the_byte_cap_is_refused_unread(tmp_path):
    from sheetgen.bench.sweep_files import read_sweep
    from sheetgen.errors import InputError
    path = tmp_path / "big.csv"
    with path.open("w") as handle:
        handle.write("frequency (Hz),magnitude (dB)\n")
        handle.write("# padding\n" * (MAX_SWEEP_BYTES // 10 + 1))
    with pytest.raises(InputError) as error:
        read_sweep(path)
    assert f"a measured sweep (.s1p, .s2p, .ts or .csv) is at most {MAX_SWEEP_BYTES:,}" in \
        str(error.value)


def test_a_sweep_over_the_point_cap_is_refused(tmp_path):
    from sheetgen.bench.sweep_files import read_sweep
    from sheetgen.errors import InputError
    path = tmp_path / "many.csv"
    rows = "".join(f"{1000 + n},-3\n" for n in range(MAX_SWEEP_POINTS + 1))
    path.write_text("frequency (Hz),magnitude (dB)\n" + rows)
    with pytest.raises(InputError) as error:
        read_sweep(path)
    problem = error.value.problems[0]
    assert problem.line == MAX_SWEEP_POINTS + 2  # the header is line 1
    assert f"more than {MAX_SWEEP_POINTS:,} points" in problem.message


# --------------------------------------------------------------------------- 10 Touchstone


def _touchstone(option: str, extra: str = "", points: int = 6) -> str:
    rows = "".join(f"{450 + n} {-20 + n} 0\n" for n in range(points))
    return f"! a one-port sweep\n{option}\n{extra}{rows}"


@pytest.mark.parametrize("option, column, word", [
    ("# kHz S DB R 0", 14, '"0" Ω is not a positive'),
    ("# kHz S DB R -50", 14, '"-50" Ω is not a positive'),
    ("# kHz S DB R", 12, "R is given without a value"),
])
def test_a_touchstone_reference_resistance_must_be_positive(tmp_path, option, column, word):
    from sheetgen.bench.sweep_files import read_sweep
    from sheetgen.errors import InputError
    path = tmp_path / "unit.s1p"
    path.write_text(_touchstone(option))
    with pytest.raises(InputError) as error:
        read_sweep(path)
    problem = error.value.problems[0]
    assert (problem.line, problem.column, problem.field) == (2, column, "reference resistance")
    assert word in problem.message


def test_a_wrong_number_of_frequencies_is_refused(tmp_path):
    """Touchstone 2.0: [Number of Frequencies] must count the data records."""
    from sheetgen.bench.sweep_files import read_sweep
    from sheetgen.errors import InputError
    path = tmp_path / "unit.ts"
    path.write_text("[Version] 2.0\n# kHz S DB R 50\n[Number of Ports] 1\n"
                    "[Number of Frequencies] 9\n[Network Data]\n"
                    + "".join(f"{450 + n} {-20 + n} 0\n" for n in range(6)) + "[End]\n")
    with pytest.raises(InputError) as error:
        read_sweep(path)
    problem = error.value.problems[0]
    assert (problem.line, problem.column) == (4, 25)
    assert "says 9 but the file holds 6 frequencies" in problem.message
