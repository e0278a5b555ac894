"""Panel latency: how long the notebook panel takes to answer a change of one control, measured
through the panel object (no browser), on the benchmark frame of benchmarks/run.py (a benchmark,
not a test).

For each size: the panel is built once, then for each task a change of task (with its columns),
a change of y (or x), going back to a choice already seen, picking another design, and moving
the bins slider. "top" is the time until the new top figure is in the panel (what the reader
waits for); "all" until the detail panel and code are updated too.

Targets (issue 16): a change ≤ 0.5 s at 1M rows and ≤ 1.5 s at 10M rows; going back ≤ 0.2 s;
another design or the bins slider ≤ 0.3 s.

    python benchmarks/panel.py                     # 1,000,000 and 10,000,000 rows
    PANEL_SIZES=100000 python benchmarks/panel.py
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

import plotwise  # noqa: E402
from plotwise.notebook.panel import AdvicePanel  # noqa: E402

# The other y (or x) each task is asked about after its first question.
OTHER = {"compare": ("y", "score"), "trend": ("y", "score"), "proportion": ("y", "duration"),
         "correlate": ("y", "duration"), "distribution": ("x", "amount")}
TARGETS = {1_000_000: 0.5, 10_000_000: 1.5}


class Clock:
    """Times a panel change: until the top image changes, and until the callback returns."""

    def __init__(self, panel: AdvicePanel):
        self.top = None
        panel.top_image.observe(self._seen, names="value")

    def _seen(self, _change) -> None:
        if self.top is None:
            self.top = time.perf_counter()

    def run(self, action, *args) -> tuple[float, float]:
        self.top = None
        t0 = time.perf_counter()
        action(*args)
        t1 = time.perf_counter()
        return (self.top or t1) - t0, t1 - t0


def set_request(panel: AdvicePanel, task: str, cols: dict) -> None:
    """Put the panel at ``task`` with these columns (one re-advice: controls set quietly first)."""
    panel._busy = True
    try:
        for k in ("x", "y", "hue"):
            getattr(panel, k).value = cols.get(k, "\x00auto")
    finally:
        panel._busy = False
    panel.task.value = task


def main() -> int:
    sizes = [int(s) for s in os.environ.get("PANEL_SIZES", "1000000,10000000").split(",")]
    warm = frame(2000)
    AdvicePanel(plotwise.advise(warm, "compare", **TASKS["compare"]))  # imports, fonts
    worst_ok = True
    for n in sizes:
        df = frame(n)
        t0 = time.perf_counter()
        panel = AdvicePanel(plotwise.advise(df, "correlate", x="duration", y="score"))
        print(f"\npanel at {n:,} rows: built in {time.perf_counter() - t0:.2f} s "
              f"(target for a change: {TARGETS.get(n, '-')} s)")
        clock = Clock(panel)
        print(f"{'task':>12} {'change task':>14} {'change ' + 'col':>14} {'back':>6} "
              f"{'design':>7} {'bins':>6}")
        for task, kw in TASKS.items():
            first = clock.run(set_request, panel, task, kw)
            control, value = OTHER[task]
            widget = getattr(panel, control)
            other = clock.run(setattr, widget, "value", value)
            back = clock.run(setattr, widget, "value", kw[control])
            design = clock.run(setattr, panel.designs, "value", 1)
            hist = next((i for i, d in enumerate(panel.advice.designs) if d.kind == "histogram"),
                        None)
            bins = (None, None)
            if hist is not None:
                panel.designs.value = hist
                bins = clock.run(setattr, panel.bins, "value", panel.bins.value + 7)
            target = TARGETS.get(n)
            if target is not None and max(first[0], other[0]) > target:
                worst_ok = False
            print(f"{task:>12} {first[0]:5.2f}/{first[1]:5.2f} s {other[0]:5.2f}/{other[1]:5.2f} s "
                  f"{back[1]:5.2f} {design[1]:6.2f} "
                  f"{'' if bins[1] is None else f'{bins[1]:6.2f}'}")
        print("(change: top figure shown / whole panel updated)")
    print("targets met" if worst_ok else "some changes missed their target")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
