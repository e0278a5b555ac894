"""plotwise on data that lives in an engine (a benchmark, not a test).

A generated Parquet file of BENCH_ENGINE_ROWS rows (default 100 million; columns as in
benchmarks/run.py) is advised on through DuckDB for every task, and through Dask on a
LocalCluster with two worker processes for the tasks in BENCH_DASK_TASKS (default: compare and
distribution, since every Dask query rescans the file). Each run is a fresh process; reported:
advise() time, show() time (figure rendered to PNG) and the process's peak resident memory (for
Dask also each worker's). Writes build/bench/engines.csv and prints a table.

    python benchmarks/engines.py
    BENCH_ENGINE_ROWS=1e7 python benchmarks/engines.py
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
print(json.dumps({"advise_s": t_advise, "show_s": t_show, "peak_mb": hwm(), "workers_mb": workers,
                  "top": [d.kind for d in a.shown()], "rows": a.profile.rows}))
"""


def main() -> None:
    rows = int(float(os.environ.get("BENCH_ENGINE_ROWS", "1e8")))
    dask_tasks = [t for t in os.environ.get("BENCH_DASK_TASKS", "compare,distribution").split(",") if t]
    OUT.mkdir(parents=True, exist_ok=True)
    path = OUT / f"rows_{rows}.parquet"
    if not path.exists():
        from bigfile import write_parquet

        t = time.perf_counter()
        write_parquet(path, rows)
        print(f"wrote {path.name} ({path.stat().st_size / 2**30:.2f} GiB) in {time.perf_counter() - t:.0f} s")
    results = []
    engines = os.environ.get("BENCH_ENGINES", "duckdb,dask").split(",")
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
        print(f"{engine:7s} {task:13s} rows {r['rows']:>12,}  advise {r['advise_s']:7.1f} s  "
              f"show {r['show_s']:6.1f} s  peak {r['peak_mb']:6.0f} MB{workers}  top {', '.join(r['top'])}",
              flush=True)
    with open(OUT / "engines.csv", "w", newline="") as fh:
        w = csv.DictWriter(fh, fieldnames=["engine", "task", "rows", "advise_s", "show_s", "peak_mb",
                                           "workers_mb", "top"])
        w.writeheader()
        for r in results:
            w.writerow({k: r[k] for k in w.fieldnames})
    print(f"file: {path.stat().st_size / 2**30:.2f} GiB on disk; results in {OUT / 'engines.csv'}")


if __name__ == "__main__":
    main()
