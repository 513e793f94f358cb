"""`sheetgen diff A B`: what changed between two revisions of a job.

Outside check: the limits that moved are found here from the two results documents that
`sheetgen check --json` prints (the standard library's json and math.isclose at the same
relative tolerance of 1e-9), a separate path from the diff code; the values shown are
those documents' own numbers.
"""

import json
import math
from pathlib import Path

from sheetgen.cli import main
from sheetgen.quantities import format_quantity

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"
SERIES = (TEMPLATES / "series.yaml").read_text(encoding="utf-8")


def _run(capsys, *args):
    code = main([str(a) for a in args])
    out = capsys.readouterr()
    assert "Traceback" not in out.err
    return code, out.out, out.err


def _revisions(tmp_path):
    a = tmp_path / "rev-a.yaml"
    a.write_text(SERIES, encoding="utf-8")
    b = tmp_path / "rev-b.yaml"
    assert "revision: A" in SERIES and "  esr: 0.05 ohm\n" in SERIES
    b.write_text(SERIES.replace("revision: A", "revision: B")
                 .replace("  esr: 0.05 ohm\n", "  esr: 0.05 ohm\n  tolerance: 1 %\n"),
                 encoding="utf-8")
    return a, b


def _moved_limits(capsys, a, b) -> dict[str, tuple]:
    docs = [json.loads(_run(capsys, "check", job, "--json")[1])["limits"] for job in (a, b)]
    for doc in docs:  # nested figures (over temperature) by their dotted key, as printed
        for key in [k for k, v in doc.items() if isinstance(v, dict)]:
            doc.update({f"{key}.{sub}": v for sub, v in doc.pop(key).items()})
    moved = {}
    for key, value in docs[0].items():
        other = docs[1][key]
        if isinstance(value, float) and isinstance(other, float):
            if not math.isclose(value, other, rel_tol=1e-9):
                moved[key] = (value, other)
        elif value != other:
            moved[key] = (value, other)
    return moved


def test_diff_names_the_changed_inputs_and_the_limits_that_moved(tmp_path, capsys):
    a, b = _revisions(tmp_path)
    moved = _moved_limits(capsys, a, b)
    assert "f0_min_hz" in moved and "f0_max_hz" in moved  # ±5 % → ±1 % narrows the f0 window
    code, out, _ = _run(capsys, "diff", a, b, "--json")
    assert code == 1
    rows = json.loads(out)
    assert [(r["key"], r["a"], r["b"]) for r in rows if r["section"] == "inputs"] == [
        ("sheet.revision", "A", "B"), ("capacitor.tolerance", None, "1 %")]
    limits = {r["key"].removeprefix("limits."): (r["a"], r["b"]) for r in rows
              if r["section"] == "limits"}
    assert limits == moved

    code, table, _ = _run(capsys, "diff", a, b)
    assert code == 1
    lines = table.splitlines()
    assert lines[0].split() == ["section", "field", str(a), str(b)]
    f0_line = next(line for line in lines if " limits.f0_min_hz " in line)
    low_a, low_b = moved["f0_min_hz"]
    shown_a, shown_b = format_quantity(low_a, "Hz", 4), format_quantity(low_b, "Hz", 4)
    assert shown_a != shown_b and f0_line.endswith(shown_b)
    # aligned: every row's A and B values start in the header's A and B columns
    col_a, col_b = lines[0].index(str(a)), lines[0].index(str(b))
    assert f0_line[col_a:].startswith(shown_a) and f0_line[col_b:] == shown_b
    assert all(line[col_a - 1] == " " and line[col_b - 1] == " " for line in lines[1:])


def test_identical_revisions_exit_0(tmp_path, capsys):
    a, _ = _revisions(tmp_path)
    code, out, _ = _run(capsys, "diff", a, a)
    assert code == 0 and out == f"no differences between {a} and {a}\n"
    code, out, _ = _run(capsys, "diff", a, a, "--json")
    assert code == 0 and json.loads(out) == []


def test_bad_input_exits_2(tmp_path, capsys):
    a, _ = _revisions(tmp_path)
    code, out, err = _run(capsys, "diff", a, tmp_path / "missing.yaml")
    assert code == 2 and out == "" and "missing.yaml:1:1 no such file" in err
