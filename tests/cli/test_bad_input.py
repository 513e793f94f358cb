"""Every kind of bad input, through the CLI: one clear located message, exit 2, no output.

The expectations are the project's error contract (README, DESIGN.md): each problem reads
`FILE:LINE:COLUMN field.path: what is wrong; what is expected`, all problems of a file at
once, exit code 2, never a traceback, and no output file written or overwritten.
"""

import re
import subprocess
import sys
from pathlib import Path

import pytest

from sheetgen.cli import main

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"
GOOD = (TEMPLATES / "series.yaml").read_text(encoding="utf-8")
LOCATED = re.compile(r"^(?P<file>.+?):(?P<line>\d+):(?P<column>\d+) (?P<rest>.+)$")


def _write(tmp_path: Path, text: str | bytes, name: str = "job.yaml") -> Path:
    path = tmp_path / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return path


def _edit(old: str, new: str) -> str:
    assert old in GOOD, f"the series template no longer contains {old!r}"
    return GOOD.replace(old, new, 1)


def _run(capsys, *args) -> tuple[int, list[str]]:
    code = main([str(a) for a in args])
    captured = capsys.readouterr()
    assert "Traceback" not in captured.err
    return code, [line for line in captured.err.splitlines() if line]


# (case, job text, [(line, column, field, fragment of the message)])
CASES = [
    ("unknown key with a close match", _edit("  resistance: 3.2 ohm", "  resistnce: 3.2 ohm"),
     [(18, 3, "inductor.resistnce", "did you mean 'resistance'")]),
    ("unknown key, nothing close", _edit("  esr: 0.05 ohm", "  esr: 0.05 ohm\n  colour: blue"),
     [(22, 3, "capacitor.colour", "expected one of: bleeder, bleeder_rated_power, "
                                  "bleeder_rated_voltage, capacitance, description, dielectric")]),
    ("quantity in the wrong unit", _edit("  esr: 0.05 ohm", "  capacitance: 40 pH\n  esr: 0.05 ohm"),
     [(21, 16, "capacitor.capacitance", '"40 pH" is not a capacitance (expected farads, e.g. 40 pF)')]),
    ("zero", _edit("resistance: 50 ohm\n  available", "resistance: 0 ohm\n  available"),
     [(27, 15, "source.resistance", "must be greater than 0")]),
    ("negative", _edit("inductance: 10 uH", "inductance: -10 uH"),
     [(17, 15, "inductor.inductance", "must be greater than 0")]),
    ("not finite", _edit("esr: 0.05 ohm", "esr: .inf"),
     [(21, 8, "capacitor.esr", "not a finite resistance")]),
    ("not a number", _edit("esr: 0.05 ohm", "esr: low"),
     [(21, 8, "capacitor.esr", '"low" is not a resistance')]),
    ("missing required field", _edit("  title: 13.56 MHz series-tuned band-pass, 50 Ω line\n", ""),
     [(4, 3, "sheet.title", "is missing")]),
    ("missing section", re.sub(r"(?m)^inductor:\n(?:[ #].*\n|\n)*", "", GOOD),
     [(3, 1, "inductor", "is missing")]),
    ("wrong choice", _edit("topology: series", "topology: ladder"),
     [(11, 13, "circuit.topology", "'series' or 'parallel'")]),
    ("two losses given", _edit("  resistance: 3.2 ohm", "  resistance: 3.2 ohm\n  q: 200"),
     [(16, 3, "inductor", "exactly one of q or resistance")]),
    ("duplicate key", _edit("  esr: 0.05 ohm", "  esr: 0.05 ohm\n  esr: 0.07 ohm"),
     [(22, 3, "capacitor.esr", "appears twice")]),
    ("python tag", _edit("designer: Your Name", "designer: !!python/object/apply:os.system [ls]"),
     [(7, 13, "sheet.designer", "tag 'tag:yaml.org,2002:python/object/apply:os.system' is not allowed")]),
    ("unknown local tag", _edit("esr: 0.05 ohm", "esr: !secret 0.05 ohm"),
     [(21, 8, "capacitor.esr", "tag '!secret' is not allowed")]),
    ("YAML syntax error", "sheet:\n  id: [unclosed\n", [(3, 1, "", "YAML syntax")]),
    ("empty file", "", [(1, 1, "", "the file is empty")]),
    ("only a comment", "# nothing here\n", [(1, 1, "", "holds no YAML document")]),
    ("top level not a mapping", "- just\n- a list\n", [(1, 1, "", "expected a mapping")]),
    ("design: f0 target with both parts", _edit("  resistance: 3.2 ohm", "  resistance: 3.2 ohm")
     .replace("  esr: 0.05 ohm", "  capacitance: 15 pF\n  esr: 0.05 ohm"),
     [(13, 9, "circuit.targets.f0", "both given")]),
]


@pytest.mark.parametrize("case, text, expected", CASES, ids=[c[0] for c in CASES])
def test_bad_job_is_reported_with_place_and_exit_2(tmp_path, capsys, case, text, expected):
    job = _write(tmp_path, text)
    code, lines = _run(capsys, "check", job)
    assert code == 2, lines
    assert len(lines) == len(expected), lines
    for line, (row, column, field, fragment) in zip(lines, expected):
        match = LOCATED.match(line)
        assert match, f"not FILE:LINE:COLUMN: {line}"
        assert match["file"] == str(job)
        assert (int(match["line"]), int(match["column"])) == (row, column), line
        assert match["rest"].startswith(f"{field}: " if field else ""), line
        assert fragment in line, line


def test_all_problems_of_a_file_at_once(tmp_path, capsys):
    text = (_edit("inductance: 10 uH", "inductance: 10 uF")
            .replace("esr: 0.05 ohm", "esr: -1 ohm").replace("topology: series", "topology: x"))
    code, lines = _run(capsys, "check", _write(tmp_path, text))
    assert code == 2
    fields = [LOCATED.match(line)["rest"].split(":")[0] for line in lines]
    assert fields == ["circuit.topology", "inductor.inductance", "capacitor.esr"], lines


def test_not_utf8(tmp_path, capsys):
    job = _write(tmp_path, GOOD.encode("utf-8").replace(b"Your Name", b"Jos\xe9"))
    code, lines = _run(capsys, "check", job)
    assert code == 2
    assert lines == [f"{job}:7:16 byte 0xe9 is not UTF-8; save the job file as UTF-8 text"]


def test_directory_and_missing_path(tmp_path, capsys):
    code, lines = _run(capsys, "check", tmp_path)
    assert code == 2 and lines == [f"{tmp_path}:1:1 is a directory; expected a YAML job file"]
    missing = tmp_path / "nope.yaml"
    code, lines = _run(capsys, "check", missing)
    assert code == 2 and lines[0].startswith(f"{missing}:1:1 no such file")


def test_file_over_the_size_limit(tmp_path, capsys):
    job = _write(tmp_path, GOOD + "# " + "x" * 1_000_001 + "\n")
    code, lines = _run(capsys, "check", job)
    assert code == 2 and "a job file is at most 1,000,000 bytes" in lines[0]


def test_alias_bomb_is_refused(tmp_path, capsys):
    levels = ["a0: &a0 [x, x, x, x, x, x, x, x, x, x]"]
    levels += [f"a{i}: &a{i} [" + ", ".join([f"*a{i - 1}"] * 10) + "]" for i in range(1, 7)]
    code, lines = _run(capsys, "check", _write(tmp_path, "\n".join(levels) + "\n"))
    assert code == 2 and "YAML nodes" in lines[0]


def test_usage_errors_exit_2(capsys):
    assert _run(capsys, "frobnicate")[0] == 2
    assert _run(capsys, "new", "ladder")[0] == 2
    assert _run(capsys)[0] == 2


def test_bad_job_leaves_existing_output_untouched(tmp_path, capsys):
    job = _write(tmp_path, _edit("inductance: 10 uH", "inductance: 10 uF"))
    output = tmp_path / "sheet.pdf"
    output.write_bytes(b"the previous sheet")
    code, _ = _run(capsys, "build", job, "-o", output)
    assert code == 2
    assert output.read_bytes() == b"the previous sheet"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["job.yaml", "sheet.pdf"]


def test_real_process_prints_no_traceback(tmp_path):
    job = _write(tmp_path, _edit("esr: 0.05 ohm", "esr: 40 pH"))
    done = subprocess.run([sys.executable, "-m", "sheetgen", "check", str(job)],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 2
    assert "Traceback" not in done.stderr
    assert done.stderr.strip() == (f'{job}:21:8 capacitor.esr: "40 pH" is not a resistance '
                                   "(expected ohms, e.g. 2.2 kΩ)")
    assert done.stdout == ""


def test_build_needs_the_sections_a_quick_check_may_leave_out(tmp_path, capsys):
    """check takes a job without a source (a quick question); build reports it missing."""
    job = _write(tmp_path, GOOD.split("\nsource:")[0] + "\n")
    code, lines = _run(capsys, "build", job, "-o", tmp_path / "job.pdf")
    assert code == 2 and lines == [f"{job}:3:1 source: is missing; this field is required"]
    assert not (tmp_path / "job.pdf").exists()
