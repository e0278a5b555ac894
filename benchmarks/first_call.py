"""The first advise() and show() in a fresh interpreter (a benchmark, not a test).

Each run starts a new Python process that builds a 100,000-row frame of the benchmark's columns,
imports plotwise, calls advise() once and then show() rendered to PNG; the time after the frame
exists is what a notebook user waits for at their first call. Median of three runs per task;
also advise() alone (the engine does not import matplotlib, seaborn or scipy.stats for most
questions). Target (issue 16): first advise() + show() ≤ 1.5 s.

    python benchmarks/first_call.py
"""

from __future__ import annotations

import json
import os
import statistics
import subprocess
import sys

TARGET_S = 1.5
RUNS = 3

CODE = r"""
import io, json, sys, time
import numpy as np, pandas as pd
sys.path.insert(0, {here!r})
from frames import TASKS, frame
df = frame(100_000)
t0 = time.perf_counter()
import plotwise
t1 = time.perf_counter()
advice = plotwise.advise(df, {task!r}, **TASKS[{task!r}])
t2 = time.perf_counter()
advice.show().savefig(io.BytesIO(), format="png")
t3 = time.perf_counter()
print(json.dumps({{"import": t1 - t0, "advise": t2 - t1, "show": t3 - t2}}))
"""


def one(task: str) -> dict:
    from pathlib import Path

    here = str(Path(__file__).resolve().parent)
    out = subprocess.run([sys.executable, "-c", CODE.format(here=here, task=task)],
                         capture_output=True, text=True, check=True,
                         env=dict(os.environ, MPLBACKEND="Agg"))
    return json.loads(out.stdout.strip().splitlines()[-1])


def main() -> int:
    sys.path.insert(0, str(__import__("pathlib").Path(__file__).resolve().parent))
    from frames import TASKS

    print(f"first call in a fresh interpreter, 100,000 rows (median of {RUNS} runs; "
          f"target advise + show ≤ {TARGET_S} s)")
    print(f"{'task':>12} {'import':>7} {'advise':>7} {'show':>6} {'total':>6}")
    for task in TASKS:
        runs = [one(task) for _ in range(RUNS)]
        m = {k: statistics.median(r[k] for r in runs) for k in ("import", "advise", "show")}
        total = m["import"] + m["advise"] + m["show"]
        print(f"{task:>12} {m['import']:7.2f} {m['advise']:7.2f} {m['show']:6.2f} {total:6.2f}"
              f" {'ok' if total <= TARGET_S else 'missed'}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
