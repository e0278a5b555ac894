"""The Dask pass combines each partition's moments with the pairwise formulas of Chan, Golub &
LeVeque (1979) and Pébay (2008). Checked against numpy's central moments of the whole column
(numpy is the reference) on statsmodels' Grunfeld investment data, split unevenly."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from open_data import grunfeld

from plotwise.sources.partitions import Moments, PartitionFacts, partition_facts


@pytest.mark.parametrize("cuts", [[1], [7, 8, 200], [50, 51, 52, 219], [110]])
def test_pairwise_moments_equal_the_whole_columns(cuts):
    v = grunfeld()["invest"].to_numpy(dtype=float)
    parts = np.split(v, cuts)
    total = Moments()
    for p in parts:
        total = total + Moments.of(p)
    d = v - v.mean()
    assert total.n == len(v)
    assert total.mean == pytest.approx(v.mean(), rel=1e-13)
    assert total.m2 == pytest.approx((d ** 2).sum(), rel=1e-12)
    assert total.m3 == pytest.approx((d ** 3).sum(), rel=1e-10)
    assert (total.lo, total.hi) == (v.min(), v.max())


def test_power_sums_about_a_far_centre_keep_their_precision():
    """A column far from zero (invest + 1e9): sums about a centre near the mean stay exact."""
    v = grunfeld()["invest"].to_numpy(dtype=float) + 1e9
    total = Moments.of(v[:100]) + Moments.of(v[100:])
    sums = total.power_sums(float(np.median(v)))
    n = sums["finite"]
    a = sums["s1"] / n
    m2 = sums["s2"] / n - a * a
    assert m2 == pytest.approx(np.var(v), rel=1e-9)


def test_partition_reports_add_up_to_the_frame():
    """Counts, missing values and labels of two halves add up to pandas' on the whole frame."""
    df = grunfeld()
    df.loc[::7, "invest"] = np.nan
    halves = [partition_facts(df.iloc[:97], 60), partition_facts(df.iloc[97:], 60)]
    total = halves[0] + halves[1]
    assert isinstance(total, PartitionFacts)
    assert total.rows == len(df)
    assert total.missing == {c: int(df[c].isna().sum()) for c in df.columns}
    assert sorted(total.labels["firm"]) == sorted(df["firm"].unique())
    m = total.moments["invest"]
    assert m.n == df["invest"].notna().sum()
    assert m.mean == pytest.approx(df["invest"].mean(), rel=1e-13)
    # a column with more labels than the limit reports none
    assert partition_facts(pd.DataFrame({"k": np.arange(500)}), 60).labels["k"] is None
