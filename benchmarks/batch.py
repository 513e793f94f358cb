"""Cold build, and a batch of 40 sheets, as ratios: the three speed targets in one run.

1. a cold `sheetgen build` of the demo against the import floor of build.py (numpy, yaml,
   reportlab.platypus, matplotlib.figure with Agg; target ≤ 1.5 ×), and its peak
   resident set size (getrusage of the child; target < 250 MB);
2. a batch of 40 jobs (the starters copied with different sheet ids) built with
   `sheetgen build DIR --out-dir OUT`: the time per sheet against one cold build of the
   same starters (target ≤ 25 %);
3. the same batch with `-j 2` against `-j 1` (target ≥ 1.8 ×; needs two idle CPUs).

Each figure is the median of --runs runs (the batches: --batch-runs), every command in a
fresh process. Prints, never asserts.

    python benchmarks/batch.py [--runs N] [--batch-runs N] [--jobs 40]
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))

from build import FLOOR, REPO, TARGET_RSS_MB, TARGET_TIME_RATIO, measure  # noqa: E402

STARTERS = ("series", "parallel", "toroid", "solenoid", "power-tank", "demo")
STYLE = REPO / "templates" / "style-default.yaml"
TARGET_AMORTISED = 0.25
TARGET_SPEEDUP = 1.8


def write_jobs(folder: Path, count: int) -> list[Path]:
    """`count` copies of the starters in turn, each with its own sheet id."""
    jobs = []
    for k in range(count):
        name = STARTERS[k % len(STARTERS)]
        text = (REPO / "templates" / f"{name}.yaml").read_text(encoding="utf-8")
        lines = text.splitlines(keepends=True)
        for i, line in enumerate(lines):
            if line.startswith("  id:"):
                lines[i] = f"  id: BATCH-{k:03d}\n"
                break
        job = folder / f"job-{k:03d}-{name}.yaml"
        job.write_text("".join(lines), encoding="utf-8")
        jobs.append(job)
    return jobs


def build_command(*args: str) -> list[str]:
    return [sys.executable, "-m", "sheetgen", "build", *args, "--style", str(STYLE)]


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=5)
    parser.add_argument("--batch-runs", type=int, default=3)
    parser.add_argument("--jobs", type=int, default=40)
    args = parser.parse_args()
    started = time.perf_counter()
    with tempfile.TemporaryDirectory(prefix="sheetgen-batch-") as tmp:
        tmp = Path(tmp)
        (tmp / "jobs").mkdir()
        (tmp / "out").mkdir()
        write_jobs(tmp / "jobs", args.jobs)
        floor_s, floor_mb, _, _ = measure(FLOOR, args.runs)
        demo_s, demo_mb, demo_code, _ = measure(
            build_command(str(REPO / "templates" / "demo.yaml"), "-o", str(tmp / "demo.pdf")),
            args.runs)
        singles = [measure(build_command(str(REPO / "templates" / f"{name}.yaml"), "-o",
                                         str(tmp / f"{name}.pdf")), max(1, args.runs // 2))
                   for name in STARTERS]
        single_s = statistics.mean(m.wall_s for m in singles)
        single_cpu_s = statistics.mean(m.cpu_s for m in singles)
        workers = getattr(os, "process_cpu_count", os.cpu_count)() or 1
        batch = {}
        for j in sorted({1, 2, workers}):
            batch[j] = measure(build_command(str(tmp / "jobs"), "--out-dir", str(tmp / "out"),
                                             "-j", str(j)), args.batch_runs)
        built = len(list((tmp / "out").glob("*.pdf")))
    time_ratio = demo_s / floor_s
    per_sheet = batch[workers][0] / args.jobs
    amortised = per_sheet / single_s
    speedup = batch[1][0] / batch[2][0]
    print(f"import floor            {floor_s:7.3f} s  {floor_mb:7.1f} MB")
    print(f"cold build of the demo  {demo_s:7.3f} s  {demo_mb:7.1f} MB  (exit {demo_code})")
    print(f"cold build, starters    {single_s:7.3f} s  (mean of {', '.join(STARTERS)})")
    for j, (seconds, mb, code, _) in batch.items():
        print(f"batch of {args.jobs}, -j {j:<2}       {seconds:7.3f} s  {mb:7.1f} MB  "
              f"(exit {code}, {seconds / args.jobs:.3f} s per sheet)")
    print(f"sheets written          {built}")
    print(f"ratio 1: cold build / import floor   {time_ratio:6.2f} ×  (target ≤ "
          f"{TARGET_TIME_RATIO} ×: {'met' if time_ratio <= TARGET_TIME_RATIO else 'NOT met'}); "
          f"peak RSS {demo_mb:.0f} MB (target < {TARGET_RSS_MB:.0f} MB: "
          f"{'met' if demo_mb < TARGET_RSS_MB else 'NOT met'})")
    print(f"ratio 2: per sheet in a batch (-j {workers}) / cold build  {amortised:6.1%}  (target ≤ "
          f"{TARGET_AMORTISED:.0%}: {'met' if amortised <= TARGET_AMORTISED else 'NOT met'})")
    amortised_cpu = batch[1].cpu_s / args.jobs / single_cpu_s
    print(f"ratio 2 in CPU time: per sheet in a batch (-j 1) / cold build  {amortised_cpu:6.1%}"
          " (steadier than wall time on a busy machine)")
    print(f"ratio 3: -j 1 time / -j 2 time       {speedup:6.2f} ×  (target ≥ {TARGET_SPEEDUP} ×: "
          f"{'met' if speedup >= TARGET_SPEEDUP else 'NOT met'}; load average "
          f"{os.getloadavg()[0]:.1f} on {os.cpu_count()} CPUs)")
    print(f"benchmark took          {time.perf_counter() - started:7.1f} s")


if __name__ == "__main__":
    main()
