"""Repeated advise + draw: memory stays flat and no figure is left open."""

import gc

import numpy as np
import pandas as pd
import pytest

import plotwise
from plotwise.notebook.display import figure_png


def rss_mb() -> float:
    with open("/proc/self/statm") as f:
        pages = int(f.read().split()[1])
    import os

    return pages * os.sysconf("SC_PAGE_SIZE") / 2**20


def frame(n=5000, seed=0):
    rng = np.random.default_rng(seed)
    return pd.DataFrame({
        "group": np.array(list("ABCDEFGH"))[rng.integers(0, 8, n)],
        "when": pd.Timestamp("2024-01-01") + pd.to_timedelta(rng.integers(0, 365, n), unit="D"),
        "amount": rng.gamma(2, 10, n),
        "other": rng.normal(size=n),
    })


def cycle(df, i):
    task = ("compare", "trend", "correlate", "distribution", "proportion")[i % 5]
    a = plotwise.advise(df, task)
    figure_png(a.show())


def soak(cycles):
    df = frame()
    # Warm caches (fonts, text layout, seaborn, numpy, the allocator's arenas) before measuring:
    # resident memory rises for about 20 cycles and then stays flat (measured), a plateau, not
    # a leak; a leak keeps growing over the measured cycles.
    for i in range(30):
        cycle(df, i)
    gc.collect()
    start = rss_mb()
    for i in range(cycles):
        cycle(df, i)
    gc.collect()
    return rss_mb() - start


def soak_in_fresh_process(cycles: int) -> float:
    """Resident memory growth over ``cycles`` in an interpreter that runs nothing else: the
    process running the whole suite also holds Dask and Spark clients, an IPython shell and the
    allocator's leftovers from the 30-million-row test, whose own growth is not plotwise's."""
    import subprocess
    import sys
    from pathlib import Path

    code = (f"import test_soak, matplotlib.pyplot as plt\n"
            f"g = test_soak.soak({cycles})\n"
            "assert plt.get_fignums() == []\n"
            "print(g)\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         cwd=Path(__file__).parent, env={**__import__("os").environ,
                                                          "MPLBACKEND": "Agg"}, check=True)
    return float(out.stdout.strip().splitlines()[-1])


def test_quick_soak_50_cycles():
    growth = soak_in_fresh_process(50)
    assert growth < 50, f"resident memory grew by {growth:.1f} MB"


@pytest.mark.soak
def test_soak_500_cycles():
    growth = soak_in_fresh_process(500)
    print(f"\n500 cycles: resident memory grew by {growth:.1f} MB")
    assert growth < 50
