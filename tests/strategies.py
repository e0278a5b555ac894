"""Column generators shared by the property tests (pandas and engine data)."""

import numpy as np
import pandas as pd

NAN = float("nan")


def column(kind: str, n: int, rng: np.random.Generator):
    if kind == "int":
        return rng.integers(-5, 50, n)
    if kind == "float":
        v = rng.normal(0, 10, n)
        if n:
            v[rng.random(n) < 0.2] = NAN
            v[rng.random(n) < 0.05] = np.inf
            v[rng.random(n) < 0.05] = -np.inf
        return v
    if kind == "posfloat":
        return rng.lognormal(2, 1.5, n)
    if kind == "Int64":
        return pd.array([None if rng.random() < 0.2 else int(x) for x in rng.integers(0, 9, n)], dtype="Int64")
    if kind == "Float64":
        return pd.array([None if rng.random() < 0.2 else float(x) for x in rng.normal(size=n)], dtype="Float64")
    if kind == "boolean":
        return pd.array([None if rng.random() < 0.2 else bool(x) for x in rng.integers(0, 2, n)], dtype="boolean")
    if kind == "string":
        return pd.array([f"s{int(x)}" for x in rng.integers(0, 6, n)], dtype="string")
    if kind == "object_mixed":
        pool = [1, "a", None, 2.5, "b", ("t",), True]
        return pd.Series([pool[int(i)] for i in rng.integers(0, len(pool), n)], dtype=object)
    if kind == "cat":
        return pd.Categorical(rng.choice(["x", "y", "z"], n), categories=["x", "y", "z", "unused"])
    if kind == "ordcat":
        return pd.Categorical(rng.choice(["lo", "mid", "hi"], n), categories=["lo", "mid", "hi", "top"], ordered=True)
    if kind == "date":
        d = pd.Series(pd.date_range("2024-01-01", periods=n, freq="D"))
        if n:
            d[rng.random(n) < 0.2] = pd.NaT
        return d
    if kind == "datetz":
        return pd.Series(pd.date_range("2024-01-01", periods=n, freq="h", tz="Europe/Paris"))
    if kind == "timedelta":
        return pd.to_timedelta(rng.integers(0, 500, n), unit="s")
    if kind == "bool":
        return rng.integers(0, 2, n).astype(bool)
    if kind == "constant":
        return np.full(n, 3.0)
    if kind == "allmissing":
        return np.full(n, NAN)
    if kind == "highcard":
        return [f"id-{i}-{int(x)}" for i, x in enumerate(rng.integers(0, 10**6, n))]
    if kind == "datetext":
        return pd.date_range("2023-05-01", periods=n, freq="W").strftime("%Y-%m-%d")
    raise AssertionError(kind)
