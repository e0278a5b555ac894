"""Column generators shared by the property tests (pandas and engine data)."""

import numpy as np
import pandas as pd

NAN = float("nan")


def _nullable(values, dtype, rng):
    return pd.array([None if rng.random() < 0.2 else v for v in values], dtype=dtype)


def _float(n, rng):
    v = rng.normal(0, 10, n)
    if n:
        v[rng.random(n) < 0.2] = NAN
        v[rng.random(n) < 0.05] = np.inf
        v[rng.random(n) < 0.05] = -np.inf
    return v


def _date(n, rng):
    d = pd.Series(pd.date_range("2024-01-01", periods=n, freq="D"))
    if n:
        d[rng.random(n) < 0.2] = pd.NaT
    return d


def _mixed(n, rng):
    pool = [1, "a", None, 2.5, "b", ("t",), True]
    return pd.Series([pool[int(i)] for i in rng.integers(0, len(pool), n)], dtype=object)


COLUMNS = {
    "int": lambda n, rng: rng.integers(-5, 50, n),
    "float": _float,
    "posfloat": lambda n, rng: rng.lognormal(2, 1.5, n),
    "Int64": lambda n, rng: _nullable([int(x) for x in rng.integers(0, 9, n)], "Int64", rng),
    "Float64": lambda n, rng: _nullable([float(x) for x in rng.normal(size=n)], "Float64", rng),
    "boolean": lambda n, rng: _nullable([bool(x) for x in rng.integers(0, 2, n)], "boolean", rng),
    "string": lambda n, rng: pd.array([f"s{int(x)}" for x in rng.integers(0, 6, n)],
                                      dtype="string"),
    "object_mixed": _mixed,
    "cat": lambda n, rng: pd.Categorical(rng.choice(["x", "y", "z"], n),
                                         categories=["x", "y", "z", "unused"]),
    "ordcat": lambda n, rng: pd.Categorical(rng.choice(["lo", "mid", "hi"], n),
                                            categories=["lo", "mid", "hi", "top"], ordered=True),
    "date": _date,
    "datetz": lambda n, rng: pd.Series(pd.date_range("2024-01-01", periods=n, freq="h",
                                                     tz="Europe/Paris")),
    "timedelta": lambda n, rng: pd.to_timedelta(rng.integers(0, 500, n), unit="s"),
    "bool": lambda n, rng: rng.integers(0, 2, n).astype(bool),
    "constant": lambda n, rng: np.full(n, 3.0),
    "allmissing": lambda n, rng: np.full(n, NAN),
    "highcard": lambda n, rng: [f"id-{i}-{int(x)}" for i, x in enumerate(rng.integers(0, 10**6, n))],
    "datetext": lambda n, rng: pd.date_range("2023-05-01", periods=n, freq="W").strftime("%Y-%m-%d"),
}


def _decimal(n, rng):
    import decimal

    pool = [decimal.Decimal("1.5"), decimal.Decimal("NaN"), decimal.Decimal("-2"), None,
            decimal.Decimal("1e3")]
    return pd.Series([pool[int(i)] for i in rng.integers(0, len(pool), n)], dtype=object)


def _huge(n, rng):
    v = rng.normal(0, 1, n)
    if n >= 2:
        v[0], v[-1] = 1e308, -1e308
    return v


def _tiny_iqr(n, rng):
    v = np.ones(n)
    if n:
        v[-1] = 1e300
    return v


def _likert(n, rng):
    scale = ["strongly disagree", "disagree", "neutral", "agree", "strongly agree"]
    return pd.Series([scale[int(i)] for i in rng.integers(0, 5, n)], dtype=object)


# Families that once raised something other than a PlotwiseError: bytes, Decimal (with NaN),
# ±1e308, a huge range with a tiny IQR, Period, Interval, complex, Arrow-backed types, text
# that matplotlib would read as maths, ordered scales held as text, years as text.
COLUMNS.update({
    "bytes": lambda n, rng: pd.Series([[b"a", b"b\xff", None, "c"][int(i)]
                                       for i in rng.integers(0, 4, n)], dtype=object),
    "decimal": _decimal,
    "huge": _huge,
    "tinyiqr": _tiny_iqr,
    "period": lambda n, rng: pd.Series(pd.period_range("2020-01", periods=n, freq="M")),
    "interval": lambda n, rng: pd.Series(pd.cut(rng.normal(size=n), 3)) if n else pd.Series([]),
    "complex": lambda n, rng: rng.normal(size=n) + 1j,
    "arrow_str": lambda n, rng: pd.array([f"k{int(x)}" for x in rng.integers(0, 4, n)],
                                         dtype="string[pyarrow]"),
    "arrow_int": lambda n, rng: pd.array([int(x) for x in rng.integers(0, 99, n)],
                                         dtype="int64[pyarrow]"),
    "mathtext": lambda n, rng: pd.Series([["$5–$10", "$x^$", "a_b", "50%"][int(i)]
                                          for i in rng.integers(0, 4, n)], dtype=object),
    "likert": _likert,
    "yeartext": lambda n, rng: pd.Series([["2023", "2024"][int(i)]
                                          for i in rng.integers(0, 2, n)], dtype=object),
})


def column(kind: str, n: int, rng: np.random.Generator):
    return COLUMNS[kind](n, rng)
