"""The benchmark frame and questions, shared by every benchmark (imports only numpy and pandas,
so a benchmark can build the frame before timing plotwise's own imports).

Frames have a 12-label text column, a date column (730 days) and three numeric columns.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

REGIONS = np.array([f"region {c}" for c in "ABCDEFGHIJKL"])
TASKS = {
    "compare": dict(x="region", y="amount"),
    "trend": dict(x="day", y="amount"),
    "proportion": dict(x="region", y="amount"),
    "correlate": dict(x="amount", y="score"),
    "distribution": dict(x="duration"),
}


def frame(n: int, seed: int = 0) -> pd.DataFrame:
    rng = np.random.default_rng(seed)
    amount = rng.lognormal(3, 0.8, n)
    return pd.DataFrame({
        "region": REGIONS[rng.integers(0, len(REGIONS), n)],
        "day": pd.Timestamp("2024-01-01") + pd.to_timedelta(rng.integers(0, 730, n), unit="D"),
        "amount": amount,
        "duration": np.where(rng.random(n) < 0.4, rng.normal(14, 2, n), rng.normal(31, 4, n)),
        "score": 2 * np.log(amount) + rng.normal(0, 1, n),
    })
