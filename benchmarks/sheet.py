"""The sheet of alternatives and the surprise checks at 100,000 rows (a benchmark, not a test).

For each task on the benchmark frame of benchmarks/run.py: advise() (which now also looks for
surprises), then advice.sheet() drawn and rendered to PNG. Target: the sheet within 2 s.

    python benchmarks/sheet.py            # 100,000 rows
    SHEET_ROWS=1000000 python benchmarks/sheet.py
"""

from __future__ import annotations

import os
import sys
import time
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

sys.path.insert(0, str(Path(__file__).resolve().parent))

from frames import TASKS, frame  # noqa: E402
from run import render  # noqa: E402

import plotwise  # noqa: E402

TARGET_S = 2.0


def main() -> int:
    n = int(os.environ.get("SHEET_ROWS", "100000"))
    df = frame(n)
    plotwise.advise(df.head(1000), "compare", **TASKS["compare"]).sheet()  # warm-up: imports
    print(f"sheet of alternatives at {n:,} rows (target: sheet ≤ {TARGET_S} s)")
    worst = 0.0
    for task, kw in TASKS.items():
        t0 = time.perf_counter()
        advice = plotwise.advise(df, task, **kw)
        t1 = time.perf_counter()
        fig = advice.sheet()
        render(fig)
        t2 = time.perf_counter()
        panels = sum(1 for sf in fig.subfigs if sf.axes)
        worst = max(worst, t2 - t1)
        print(f"{task:>12}: advise {t1 - t0:5.2f} s (surprises: "
              f"{', '.join(dict.fromkeys(advice.surprise_codes())) or 'none'}); sheet of "
              f"{panels} panels {t2 - t1:5.2f} s {'ok' if t2 - t1 <= TARGET_S else 'MISSED'}")
    print(f"slowest sheet: {worst:.2f} s")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
