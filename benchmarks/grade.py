"""`sheetgen grade` against `sheetgen check` on the same job, in the same process, as ratios.

Grades (1) the starter's sheet with its test record filled in, and (2) the same sheet
with a 10,001-point measured sweep (CSV, the tank's response computed from the circuit's
impedance with numpy). Each command is run through sheetgen.cli.main with its output
discarded, a few times after one warm-up run (imports paid once, as in a batch), and the
median time.perf_counter figure is compared with `sheetgen check`. Target: grading a filled
sheet costs less than a third of a check. Prints, never asserts.

    python benchmarks/grade.py [--runs N] [--starter parallel]
"""

from __future__ import annotations

import argparse
import contextlib
import io
import json
import statistics
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(REPO))
TARGET_RATIO = 1.0 / 3.0
SWEEP_POINTS = 10_001


def _quiet(argv: list[str]) -> int:
    from sheetgen.cli import main
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        return main(argv)


def _time(argv: list[str], runs: int) -> tuple[float, int]:
    code = _quiet(argv)  # warm-up: imports and caches
    times = []
    for _ in range(runs):
        started = time.perf_counter()
        code = _quiet(argv)
        times.append(time.perf_counter() - started)
    return statistics.median(times), code


def _tank_sweep(results: dict, path: Path) -> None:
    """|V(tank)/V(source)| in dB over f_peak ± 4 bandwidths, SWEEP_POINTS points."""
    c, r = results["components"], results["resonance"]
    f = np.linspace(r["f_peak_hz"] - 4 * r["bandwidth_hz"], r["f_peak_hz"] + 4 * r["bandwidth_hz"],
                    SWEEP_POINTS)
    w = 2j * np.pi * f
    coil = c["inductor_resistance_ohm"] + w * c["inductance_h"]
    cap = c["capacitor_esr_ohm"] + 1.0 / (w * c["capacitance_f"])
    z = 1.0 / (1.0 / coil + 1.0 / cap + 1.0 / (c["load_resistance_ohm"] or np.inf))
    h = z / (z + (c["source_resistance_ohm"] or 0.0))
    lines = ["frequency (Hz),magnitude (dB)"]
    lines += [f"{fi!r},{v!r}" for fi, v in zip(f.tolist(), (20 * np.log10(np.abs(h))).tolist())]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=5)
    parser.add_argument("--starter", default="parallel")
    args = parser.parse_args()
    with tempfile.TemporaryDirectory(prefix="sheetgen-grade-bench-") as tmp:
        root = Path(tmp)
        job = root / "job.yaml"
        job.write_bytes((REPO / "templates" / f"{args.starter}.yaml").read_bytes())
        pdf, results_path = root / "sheet.pdf", root / "results.json"
        _quiet(["build", str(job), "-o", str(pdf), "--results", str(results_path)])
        results = json.loads(results_path.read_text(encoding="utf-8"))
        values = {}
        for row in results["test_record"]["values"]:
            if row["min"] is not None:
                middle = 0.5 * (row["min"] + row["max"])
                values[row["field"]] = repr(middle) + (f" {row['unit']}" if row["unit"] else "")
        values.update({"record.serial": "SN-1", "record.technician": "bench",
                       "record.date": "2026-12-02"})
        filled = root / "filled.pdf"
        from tests.bench.test_grade import fill  # the suite's viewer-like filling
        fill(pdf, values, filled)
        sweep = root / "sweep.csv"
        _tank_sweep(results, sweep)
        check_s, check_code = _time(["check", str(job)], args.runs)
        form_s, form_code = _time(["grade", str(filled)], args.runs)
        sweep_s, sweep_code = _time(["grade", str(filled), "--sweep", str(sweep)], args.runs)
    print(f"starter {args.starter}, median of {args.runs} runs after a warm-up, one process")
    print(f"  sheetgen check                       {check_s * 1e3:8.1f} ms  (exit {check_code})")
    print(f"  sheetgen grade (filled form)         {form_s * 1e3:8.1f} ms  (exit {form_code})  "
          f"ratio {form_s / check_s:.2f} × check (target < {TARGET_RATIO:.2f})")
    print(f"  sheetgen grade --sweep ({SWEEP_POINTS} pts)  {sweep_s * 1e3:8.1f} ms  "
          f"(exit {sweep_code})  ratio {sweep_s / check_s:.2f} × check")
    print("  target met" if form_s / check_s < TARGET_RATIO else "  target NOT met")


if __name__ == "__main__":
    main()
