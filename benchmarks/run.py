"""plotwise against plain seaborn on large frames (a benchmark, not a test).

For frames of 1e4..1e7 rows with nominal, temporal and quantitative columns, and for each task:
advise() time, show() time (figure drawn and rendered to PNG), peak memory above the frame, the
time of the plain seaborn calls that draw the same three kinds on the full data with default
arguments (skipped when the previous size predicts more than 60 s), and df.describe() as a
reference. Prints a table and writes build/bench/results.csv.

    python benchmarks/run.py            # all sizes
    BENCH_SIZES=10000,100000 python benchmarks/run.py
"""

from __future__ import annotations

import csv
import gc
import io
import os
import platform
import time
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt  # noqa: E402
import pandas as pd  # noqa: E402
import seaborn as sns  # noqa: E402
from frames import REGIONS, TASKS, frame  # noqa: E402, F401  (the benchmark frame)

import plotwise  # noqa: E402

OUT = Path(__file__).resolve().parent.parent / "build" / "bench"
LIMIT_S = 60.0
def render(fig) -> None:
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=100)


def _pie(df, x, y, ax):
    s = df.groupby(x)[y].sum()
    ax.pie(s.values, labels=s.index)


PLAIN = {
    "bar": lambda df, x, y, ax: sns.barplot(data=df, x=x, y=y, ax=ax),
    "dot": lambda df, x, y, ax: sns.pointplot(data=df, x=y, y=x, linestyle="none", ax=ax),
    "line": lambda df, x, y, ax: sns.lineplot(data=df, x=x, y=y, ax=ax),
    "box": lambda df, x, y, ax: sns.boxplot(data=df, x=x, y=y, ax=ax),
    "violin": lambda df, x, y, ax: sns.violinplot(data=df, x=x, y=y, ax=ax),
    "strip": lambda df, x, y, ax: sns.stripplot(data=df, x=x, y=y, ax=ax),
    "histogram": lambda df, x, y, ax: sns.histplot(data=df, x=x, ax=ax),
    "density": lambda df, x, y, ax: sns.kdeplot(data=df, x=x, ax=ax),
    "ecdf": lambda df, x, y, ax: sns.ecdfplot(data=df, x=x, ax=ax),
    "scatter": lambda df, x, y, ax: sns.scatterplot(data=df, x=x, y=y, ax=ax),
    "regression": lambda df, x, y, ax: sns.regplot(data=df, x=x, y=y, ax=ax),
    "hexbin": lambda df, x, y, ax: ax.hexbin(df[x], df[y]),
    "count-bar": lambda df, x, y, ax: sns.countplot(data=df, x=x, ax=ax),
    "pie": _pie,
    "stacked-bar": lambda df, x, y, ax: sns.histplot(data=df, y=x, weights=y, ax=ax),
    "heatmap": lambda df, x, y, ax: sns.heatmap(df.pivot_table(index=x, values=y, aggfunc="sum"),
                                                ax=ax),
}
PLAIN["area"] = PLAIN["line"]
PLAIN["stacked-bar-100"] = PLAIN["grouped-bar"] = PLAIN["stacked-bar"]


def plain(kind: str, df: pd.DataFrame, x: str, y: str | None, ax) -> None:
    """The plain seaborn (or matplotlib, where seaborn has no such chart) call for a kind, on the
    full data with default arguments."""
    if kind not in PLAIN:
        raise ValueError(kind)
    PLAIN[kind](df, x, y, ax)


def measure(n: int, task: str, skip: list[str]) -> dict:
    """One size and task, in its own process: timings, then peak traced memory in a second run."""
    import tracemalloc

    df = frame(n)
    kw = TASKS[task]
    frame_mb = df.memory_usage(deep=True).sum() / 2**20
    t = time.perf_counter()
    df.describe()
    describe_s = time.perf_counter() - t
    t = time.perf_counter()
    advice = plotwise.advise(df, task, **kw)
    advise_s = time.perf_counter() - t
    t = time.perf_counter()
    render(advice.show())
    show_s = time.perf_counter() - t
    kinds = [d.kind for d in advice.shown()]
    plain_times = {}
    for kind in kinds:
        if kind in skip:
            continue
        fig, ax = plt.subplots()
        t = time.perf_counter()
        try:
            plain(kind, df, kw.get("x"), kw.get("y"), ax)
            render(fig)
        finally:
            plt.close(fig)
        plain_times[kind] = time.perf_counter() - t
    gc.collect()
    tracemalloc.start()
    tracemalloc.reset_peak()
    base = tracemalloc.get_traced_memory()[0]
    render(plotwise.advise(df, task, **kw).show())
    peak_mb = (tracemalloc.get_traced_memory()[1] - base) / 2**20
    tracemalloc.stop()
    return {"kinds": kinds, "advise_s": advise_s, "show_s": show_s, "describe_s": describe_s,
            "plain": plain_times, "frame_mb": frame_mb, "peak_mb": peak_mb,
            "sampled": any(h.code == "sampled" and "sample" in h.message for h in advice.hazards)}


def main() -> None:
    import json
    import subprocess
    import sys

    if len(sys.argv) > 1 and sys.argv[1] == "--one":
        tasks = sys.argv[4].split(",") if sys.argv[4] else []
        print(json.dumps(measure(int(sys.argv[2]), sys.argv[3], tasks)))
        return
    sizes = [int(float(s)) for s in os.environ.get("BENCH_SIZES", "1e4,1e5,1e6,1e7").split(",")]
    OUT.mkdir(parents=True, exist_ok=True)
    rows = []
    predicted: dict[tuple[str, str], float] = {}
    for n in sizes:
        for task in TASKS:
            skip = [k for (t, k), p in predicted.items() if t == task and p > LIMIT_S]
            if os.environ.get("BENCH_SKIP_PLAIN"):  # quick re-checks of plotwise's own times
                skip = ["bar", "dot", "line", "area", "box", "violin", "strip", "histogram", "density",
                        "ecdf", "scatter", "regression", "hexbin", "count-bar", "pie", "heatmap",
                        "stacked-bar-100", "stacked-bar", "grouped-bar", "slope", "difference-bar"]
            out = subprocess.run([sys.executable, __file__, "--one", str(n), task, ",".join(skip)],
                                 capture_output=True, text=True, check=True)
            r = json.loads(out.stdout.strip().splitlines()[-1])
            for kind, took in r["plain"].items():
                predicted[(task, kind)] = took * 10  # linear in rows: the next size is 10× larger
            skipped = [k for k in r["kinds"] if k not in r["plain"]]
            plain_s = sum(r["plain"].values())
            row = {
                "rows": n, "task": task, "top three": " / ".join(r["kinds"]),
                "advise_s": round(r["advise_s"], 3), "show_s": round(r["show_s"], 3),
                "plain_seaborn_s": round(plain_s, 2) if not skipped else "",
                "show_vs_plain": round(r["show_s"] / plain_s, 3) if plain_s and not skipped else "",
                "skipped_plain": ", ".join(f"{k} (> {LIMIT_S:.0f} s predicted)" for k in skipped),
                "describe_s": round(r["describe_s"], 3),
                "advise_vs_describe": round(r["advise_s"] / r["describe_s"], 2),
                "frame_mb": round(r["frame_mb"], 1), "peak_extra_mb": round(r["peak_mb"], 1),
                "extra_vs_frame": round(r["peak_mb"] / r["frame_mb"], 2),
                "sampled": "yes" if r["sampled"] else "",
            }
            rows.append(row)
            print(" | ".join(f"{k}={v}" for k, v in row.items()), flush=True)
    with open(OUT / "results.csv", "w", newline="") as f:
        w = csv.DictWriter(f, fieldnames=list(rows[0]))
        w.writeheader()
        w.writerows(rows)
    ram = os.sysconf('SC_PAGE_SIZE') * os.sysconf('SC_PHYS_PAGES') / 2**30
    print(f"\nmachine: {os.cpu_count()} cores, {ram:.0f} GiB RAM, "
          f"Python {platform.python_version()}, pandas {pd.__version__}, seaborn {sns.__version__}; "
          f"{time.strftime('%Y-%m-%d')}")
    print(f"wrote {OUT / 'results.csv'}")


if __name__ == "__main__":
    main()
