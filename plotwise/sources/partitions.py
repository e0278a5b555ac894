"""Dask: the profile's exact numbers in one pass over the partitions.

Every Dask query rereads the data, so the row count, each column's missing values, the finite
count, min, max and central moments of every numeric column, and the distinct values of every
column with few of them are all computed in one ``dask.compute``: each partition reports its
own, and the reports are combined here. Central moments are combined with the pairwise update
of Chan, Golub & LeVeque (1979, "Updating formulae and a pairwise algorithm for computing sample
variances"), for the third moment as Pébay (2008, Sandia report SAND2008-6212) gives it, so no
centre has to be known before the pass and no power sums about zero lose precision."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

LABEL_PEEK = 5_000  # rows looked at first: a column with more distinct values there is "many"


@dataclass
class Moments:
    """Count, mean and sums of squared and cubed deviations from the mean of finite values."""

    n: int = 0
    mean: float = 0.0
    m2: float = 0.0
    m3: float = 0.0
    lo: float | None = None
    hi: float | None = None

    @classmethod
    def of(cls, v: np.ndarray) -> Moments:
        if not len(v):
            return cls()
        mean = float(v.mean())
        d = v - mean
        d2 = d * d
        return cls(len(v), mean, float(d2.sum()), float((d2 * d).sum()), float(v.min()),
                   float(v.max()))

    def __add__(self, o: Moments) -> Moments:
        if not o.n:
            return self
        if not self.n:
            return o
        n = self.n + o.n
        delta = o.mean - self.mean
        mean = self.mean + delta * o.n / n
        m2 = self.m2 + o.m2 + delta * delta * self.n * o.n / n
        m3 = (self.m3 + o.m3 + delta ** 3 * self.n * o.n * (self.n - o.n) / (n * n)
              + 3 * delta * (self.n * o.m2 - o.n * self.m2) / n)
        return Moments(n, mean, m2, m3, min(self.lo, o.lo), max(self.hi, o.hi))

    def power_sums(self, centre: float) -> dict:
        """The finite count, min, max and sums of (x − centre)^1..3 (column_moments' form)."""
        a = self.mean - centre
        return {"finite": float(self.n), "min": self.lo, "max": self.hi,
                "s1": self.n * a, "s2": self.m2 + self.n * a * a,
                "s3": self.m3 + 3 * a * self.m2 + self.n * a ** 3}


@dataclass
class PartitionFacts:
    """One partition's report (and, added up, the whole frame's)."""

    rows: int = 0
    missing: dict[str, int] = field(default_factory=dict)
    moments: dict[str, Moments] = field(default_factory=dict)
    labels: dict[str, list | None] = field(default_factory=dict)  # None: more than the limit

    def __add__(self, o: PartitionFacts) -> PartitionFacts:
        out = PartitionFacts(self.rows + o.rows)
        for c in dict.fromkeys(list(self.missing) + list(o.missing)):
            out.missing[c] = self.missing.get(c, 0) + o.missing.get(c, 0)
        for c in dict.fromkeys(list(self.moments) + list(o.moments)):
            out.moments[c] = self.moments.get(c, Moments()) + o.moments.get(c, Moments())
        for c in dict.fromkeys(list(self.labels) + list(o.labels)):
            a, b = self.labels.get(c, []), o.labels.get(c, [])
            out.labels[c] = None if a is None or b is None else list(dict.fromkeys(a + b))
        return out


def partition_facts(part: pd.DataFrame, limit: int) -> PartitionFacts:
    """What one partition contributes (runs on the Dask workers)."""
    facts = PartitionFacts(len(part))
    for c in part.columns:
        s = part[c]
        facts.missing[str(c)] = int(s.isna().sum())
        if pd.api.types.is_numeric_dtype(s.dtype):
            v = s.to_numpy(dtype=float, na_value=np.nan)
            facts.moments[str(c)] = Moments.of(v[np.isfinite(v)])
        if not pd.api.types.is_float_dtype(s.dtype):
            facts.labels[str(c)] = _labels(s, limit)
    return facts


def _labels(s: pd.Series, limit: int) -> list | None:
    if s.head(LABEL_PEEK).nunique() > limit:
        return None
    u = s.dropna().unique()
    return None if len(u) > limit else list(u)


def dask_facts(ddf, limit: int) -> PartitionFacts:
    """Every partition's facts, computed in one ``dask.compute`` and added up; a label set that
    grows past ``limit`` becomes None."""
    import dask

    from plotwise.sources.base import quiet

    with quiet():
        parts = dask.compute(*[dask.delayed(partition_facts)(p, limit) for p in ddf.to_delayed()])
    total = PartitionFacts()
    for p in parts:
        total = total + p
    for c, labels in total.labels.items():
        if labels is not None and len(labels) > limit:
            total.labels[c] = None
    return total
