"""plotwise on data that lives in an engine (a benchmark, not a test).

Generated Parquet files of BENCH_ENGINE_ROWS rows (default 20 and 100 million; columns as in
benchmarks/run.py) are advised on through DuckDB for every task, and through Dask on a
LocalCluster with two worker processes for the tasks in BENCH_DASK_TASKS (default: compare and
distribution, since every Dask query rescans the file). Each run is a fresh process; reported:
advise() time, show() time (figure rendered to PNG) and the process's peak resident memory (for
Dask also each worker's). For DuckDB the same process first times the floor: one query that reads
the used columns once and groups the measure by the category (count, sum, sum of squares, first
and last day per region); advise and show are reported as multiples of it. Writes
build/bench/engines.csv and prints a table.

    python benchmarks/engines.py
    BENCH_ENGINE_ROWS=1e7,2e7 python benchmarks/engines.py
    BENCH_ENGINES=dask python benchmarks/engines.py    # one engine only
"""

from __future__ import annotations

import csv
import json
import os
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
OUT = HERE.parent / "build" / "bench"
sys.path.insert(0, str(HERE))
from frames import TASKS  # noqa: E402  the same tasks and columns as the pandas benchmark

RUN = r"""
import io, json, sys, time
import matplotlib
matplotlib.use("Agg")
import plotwise

def hwm():
    return [int(l.split()[1]) / 1024 for l in open("/proc/self/status") if l.startswith("VmHWM")][0]

engine, path, task, kw = sys.argv[1], sys.argv[2], sys.argv[3], json.loads(sys.argv[4])
workers = None
if engine == "dask":
    import dask.dataframe as dd
    from dask.distributed import Client, LocalCluster
    cluster = LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None,
                           memory_limit="6GiB")
    client = Client(cluster)
    data = dd.read_parquet(path)
else:
    data = path
floor = None
if engine == "duckdb":
    import duckdb
    con = duckdb.connect()
    con.execute("SET enable_progress_bar = false")
    t = time.perf_counter()
    con.sql("SELECT region, count(*), sum(amount), sum(amount * amount), min(day), max(day) "
            f"FROM read_parquet('{path}') GROUP BY region").fetchall()
    floor = time.perf_counter() - t
    con.close()
t = time.perf_counter()
a = plotwise.advise(data, task, **kw)
t_advise = time.perf_counter() - t
t = time.perf_counter()
fig = a.show()
fig.savefig(io.BytesIO(), format="png", dpi=100)
t_show = time.perf_counter() - t
if engine == "dask":
    def worker_hwm():
        return [int(l.split()[1]) / 1024 for l in open("/proc/self/status") if l.startswith("VmHWM")][0]
    workers = sorted(client.run(worker_hwm).values())
    client.close(); cluster.close()
print(json.dumps({"advise_s": t_advise, "show_s": t_show, "floor_s": floor, "peak_mb": hwm(),
                  "workers_mb": workers,
                  "top": [d.kind for d in a.shown()], "rows": a.profile.rows}))
"""


def main() -> None:
    sizes = [int(float(r)) for r in os.environ.get("BENCH_ENGINE_ROWS", "2e7,1e8").split(",")]
    dask_tasks = [t for t in os.environ.get("BENCH_DASK_TASKS", "compare,distribution").split(",") if t]
    engines = os.environ.get("BENCH_ENGINES", "duckdb,dask").split(",")
    OUT.mkdir(parents=True, exist_ok=True)
    results = []
    for rows in sizes:
        results += run_size(rows, engines, dask_tasks)
    fields = ["engine", "task", "rows", "floor_s", "advise_s", "show_s", "peak_mb", "workers_mb",
              "top"]
    with open(OUT / "engines.csv", "w", newline="") as fh:
        w = csv.DictWriter(fh, fieldnames=fields)
        w.writeheader()
        for r in results:
            w.writerow({k: r[k] for k in fields})
    print(f"results in {OUT / 'engines.csv'}")


def run_size(rows: int, engines: list[str], dask_tasks: list[str]) -> list[dict]:
    path = OUT / f"rows_{rows}.parquet"
    if not path.exists():
        from bigfile import write_parquet

        t = time.perf_counter()
        write_parquet(path, rows)
        print(f"wrote {path.name} ({path.stat().st_size / 2**30:.2f} GiB) in {time.perf_counter() - t:.0f} s")
    results = []
    plan = ([("duckdb", t) for t in TASKS] if "duckdb" in engines else []) + \
        ([("dask", t) for t in dask_tasks] if "dask" in engines else [])
    for engine, task in plan:
        run = subprocess.run([sys.executable, "-c", RUN, engine, str(path), task, json.dumps(TASKS[task])],
                             capture_output=True, text=True, timeout=3600)
        if run.returncode != 0:
            print(f"{engine} {task}: FAILED\n{run.stderr[-1500:]}")
            continue
        r = json.loads(run.stdout.strip().splitlines()[-1])
        r.update(engine=engine, task=task)
        results.append(r)
        workers = ("" if not r["workers_mb"]
                   else " workers " + "/".join(f"{w:.0f}" for w in r["workers_mb"]) + " MB")
        floor = ("" if r["floor_s"] is None else
                 f"  floor {r['floor_s']:5.2f} s (advise {r['advise_s'] / r['floor_s']:4.1f}x, "
                 f"show {r['show_s'] / r['floor_s']:4.1f}x)")
        print(f"{engine:7s} {task:13s} rows {r['rows']:>12,}  advise {r['advise_s']:7.2f} s  "
              f"show {r['show_s']:6.2f} s{floor}  peak {r['peak_mb']:6.0f} MB{workers}  "
              f"top {', '.join(r['top'])}", flush=True)
    print(f"file: {path.stat().st_size / 2**30:.2f} GiB on disk")
    return results


if __name__ == "__main__":
    main()
