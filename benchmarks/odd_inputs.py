"""Bounded time on odd input: advise() + show() on 10,000-row frames built from every column
family the generated-frame sweep covers (bytes, Decimal, ±1e308, a huge range with a tiny IQR,
periods, intervals, complex numbers, Arrow-backed types, maths-like text, ordered scales, years
as text...), under every task. Prints the slowest cases; `make bench` runs it. The target is
"a few seconds" at most per case (a benchmark, not a timed unit test)."""

from __future__ import annotations

import sys
import time
import warnings
from pathlib import Path

import numpy as np
import pandas as pd

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "tests"))

from strategies import COLUMNS  # noqa: E402

import plotwise  # noqa: E402
from plotwise import PlotwiseError  # noqa: E402

ROWS = 10_000
TARGET_S = 3.0
TASKS = (None, "compare", "trend", "proportion", "correlate", "distribution")


def frame(kind: str, rng: np.random.Generator) -> pd.DataFrame:
    return pd.DataFrame({
        "group": np.array(list("ABCDEF"))[rng.integers(0, 6, ROWS)],
        "when": pd.Timestamp("2024-01-01") + pd.to_timedelta(rng.integers(0, 200, ROWS), unit="D"),
        "amount": rng.gamma(2, 10, ROWS),
        kind: COLUMNS[kind](ROWS, rng),
    })


def main() -> int:
    warnings.simplefilter("ignore")
    rng = np.random.default_rng(0)
    rows = []
    for kind in COLUMNS:
        df = frame(kind, rng)
        for task in TASKS:
            for kw in ({}, {"x": kind} if task in ("distribution", "compare") else {}):
                start = time.perf_counter()
                outcome = "advised"
                try:
                    plotwise.advise(df, task, **kw).show()
                except PlotwiseError:
                    outcome = "refused"
                rows.append((time.perf_counter() - start, kind, task, kw, outcome))
    rows.sort(key=lambda r: -r[0])
    print(f"odd inputs, {ROWS:,} rows: {len(rows)} cases; slowest:")
    for seconds, kind, task, kw, outcome in rows[:10]:
        print(f"  {seconds:6.2f} s  {kind:12s} task={task} {kw} ({outcome})")
    worst = rows[0][0]
    print(f"worst {worst:.2f} s (target ≤ {TARGET_S:g} s): {'met' if worst <= TARGET_S else 'MISSED'}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
