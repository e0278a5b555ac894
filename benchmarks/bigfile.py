"""A large Parquet file written in chunks, so building it never holds the whole table in memory.
Columns as in benchmarks/run.py: region (12 labels), day (two years of dates), amount
(lognormal), duration (two modes), score (related to amount). Generated data (seeded numpy), used
only to measure speed and memory."""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np
from frames import REGIONS  # noqa: E402  the benchmark frame's labels


def write_parquet(path: Path, n: int, chunk: int = 5_000_000, seed: int = 0) -> Path:
    import pyarrow as pa
    import pyarrow.parquet as pq

    rng = np.random.default_rng(seed)
    start = np.datetime64("2024-01-01")
    writer = None
    try:
        done = 0
        while done < n:
            m = min(chunk, n - done)
            amount = rng.lognormal(3, 0.8, m)
            table = pa.table({
                "region": pa.array(REGIONS[rng.integers(0, len(REGIONS), m)]).dictionary_encode(),
                "day": pa.array(start + rng.integers(0, 730, m).astype("timedelta64[D]")),
                "amount": amount,
                "duration": np.where(rng.random(m) < 0.4, rng.normal(14, 2, m), rng.normal(31, 4, m)),
                "score": 2 * np.log(amount) + rng.normal(0, 1, m),
            })
            if writer is None:
                writer = pq.ParquetWriter(str(path), table.schema, compression="zstd")
            writer.write_table(table, row_group_size=1_000_000)
            done += m
    finally:
        if writer is not None:
            writer.close()
    return path


if __name__ == "__main__":  # python benchmarks/bigfile.py PATH ROWS
    t = time.perf_counter()
    write_parquet(Path(sys.argv[1]), int(float(sys.argv[2])))
    print(f"wrote {sys.argv[1]} in {time.perf_counter() - t:.1f} s")
