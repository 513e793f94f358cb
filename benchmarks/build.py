"""Cold `sheetgen build` against the bare import floor: wall time and peak memory, as ratios.

The floor is a fresh interpreter importing what a program that draws a sheet needs anyway:
numpy, yaml, reportlab.platypus and matplotlib.figure with the Agg backend (a bare
`import matplotlib` loads no figure code, so it is no floor). Each command runs in a fresh
process, several times; the median wall time, the median CPU time (user + system, which a
busy shared machine disturbs less than wall time) and the peak resident set size
(getrusage of the child, read by a small wrapper process so each figure is that command's
own) are printed. Targets: within 1.5 × the floor's time and under 250 MB. Prints, never
asserts.

    python benchmarks/build.py [--runs N] [JOB.yaml]
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path
from typing import NamedTuple

REPO = Path(__file__).resolve().parents[1]
FLOOR = [sys.executable, "-c", "import matplotlib; matplotlib.use('Agg'); "
         "import numpy, yaml, reportlab.platypus, matplotlib.figure"]
TARGET_TIME_RATIO = 1.5
TARGET_RSS_MB = 250.0
_WRAPPER = ("import json, resource, subprocess, sys, time; t = time.perf_counter(); "
            "code = subprocess.run(sys.argv[1:], stdout=subprocess.DEVNULL).returncode; "
            "wall = time.perf_counter() - t; u = resource.getrusage(resource.RUSAGE_CHILDREN); "
            "print(json.dumps({'code': code, 'wall_s': wall, 'cpu_s': u.ru_utime + u.ru_stime, "
            "'rss_kb': u.ru_maxrss}))")


class Measured(NamedTuple):
    """Median wall and CPU time (s), largest peak RSS (MB), the last exit code."""

    wall_s: float
    rss_mb: float
    code: int
    cpu_s: float


def measure(command: list[str], runs: int) -> Measured:
    """Median wall time (s), largest peak RSS (MB), the last exit code and the median CPU
    time (s) over `runs` runs."""
    walls, cpus, rss = [], [], []
    code = 0
    for _ in range(runs):
        done = subprocess.run([sys.executable, "-c", _WRAPPER, *command], capture_output=True,
                              text=True, cwd=REPO, check=True)
        figures = json.loads(done.stdout)
        walls.append(figures["wall_s"])
        cpus.append(figures["cpu_s"])
        rss.append(figures["rss_kb"] / 1024.0)
        code = figures["code"]
    return Measured(statistics.median(walls), max(rss), code, statistics.median(cpus))


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("job", nargs="?", type=Path, default=REPO / "templates" / "demo.yaml")
    parser.add_argument("--runs", type=int, default=5)
    parser.add_argument("--style", type=Path, default=REPO / "templates" / "style-default.yaml",
                        help="house style of the checkout (not the installed package's)")
    args = parser.parse_args()
    with tempfile.TemporaryDirectory(prefix="sheetgen-bench-") as tmp:
        out = Path(tmp) / "sheet.pdf"
        build = [sys.executable, "-m", "sheetgen", "build", str(args.job.resolve()), "-o",
                 str(out), "--style", str(args.style.resolve())]
        started = time.perf_counter()
        floor = measure(FLOOR, args.runs)
        built = measure(build, args.runs)
        floor_s, floor_mb, build_s, build_mb, code = (floor.wall_s, floor.rss_mb, built.wall_s,
                                                      built.rss_mb, built.code)
        size = out.stat().st_size if out.exists() else 0
        total = time.perf_counter() - started
    ratio = build_s / floor_s
    print(f"job                 {args.job}")
    print(f"runs                {args.runs} each (median wall time, peak RSS)")
    print(f"import floor        {floor_s:7.3f} s  {floor_mb:7.1f} MB")
    print(f"sheetgen build      {build_s:7.3f} s  {build_mb:7.1f} MB  (exit {code}, "
          f"{size:,} bytes of PDF)")
    print(f"time ratio          {ratio:7.2f} ×  (target ≤ {TARGET_TIME_RATIO} ×: "
          f"{'met' if ratio <= TARGET_TIME_RATIO else 'NOT met'})")
    cpu_ratio = built.cpu_s / floor.cpu_s
    print(f"CPU time ratio      {cpu_ratio:7.2f} ×  ({built.cpu_s:.3f} s against "
          f"{floor.cpu_s:.3f} s; load average {os.getloadavg()[0]:.1f} on {os.cpu_count()} CPUs)")
    print(f"memory ratio        {build_mb / floor_mb:7.2f} ×  ({build_mb:.0f} MB; target < "
          f"{TARGET_RSS_MB:.0f} MB: {'met' if build_mb < TARGET_RSS_MB else 'NOT met'})")
    print(f"benchmark took      {total:7.1f} s")


if __name__ == "__main__":
    main()
