"""The working frame: the used columns under their string labels, converted the one way plotwise
converts them (dates parsed, durations in seconds, integer years as whole numbers, numbers as
floats, infinities as missing). The conversion is written once, as expression text:
``working_frame`` evaluates it and the generated code prints the very same text."""

from __future__ import annotations

import warnings
from functools import lru_cache, partial

import numpy as np
import pandas as pd

from plotwise.engine.memo import memo_get
from plotwise.engine.profile import FieldProfile, Profile

_NUMPY_NUMBERS = {"int8", "int16", "int32", "int64", "uint8", "uint16", "uint32", "uint64",
                  "float16", "float32"}


def conversion(f: FieldProfile) -> str:
    """The expression that converts column ``f``, with ``{}`` where the column goes."""
    if f.holds_bytes:  # bytes: decoded, never failing on bytes that are not UTF-8
        return ('{}.map(lambda v: v.decode("utf-8", "replace") if isinstance(v, bytes) else v)'
                '.astype("string")')
    if f.as_text:
        return '{}.astype("string")'  # mixed Python objects: compared as their text
    if f.dtype.startswith("period"):  # pandas Periods: their start time, drawable on a date axis
        return "{}.dt.to_timestamp()"
    if f.parse_dates:
        return 'pd.to_datetime({}, format="ISO8601", errors="coerce")'
    if f.is_timedelta:
        return "{}.dt.total_seconds()"
    if f.level == "temporal" and f.is_integer:
        return '{}.round().astype("Int64")'  # integer years: label 1950, not 1950.0
    if f.level == "ordinal" and f.order and all(isinstance(o, str) for o in f.order) \
            and not f.dtype.startswith("category"):
        # an ordered scale held as text: an ordered Categorical, so groups and stacks keep it
        order = repr(list(f.order)).replace("{", "{{").replace("}", "}}")
        return "{}.astype(pd.CategoricalDtype(" + order + ", ordered=True))"
    if f.level != "quantitative":
        return "{}"
    if f.dtype == "float64":
        expr = "{}"
    elif f.dtype in _NUMPY_NUMBERS:
        expr = '{}.astype("float64")'
    else:  # nullable, Arrow-backed or engine types
        expr = 'pd.to_numeric({}, errors="coerce").astype("float64")'
    if f.infinite:
        expr += ".replace([np.inf, -np.inf], np.nan)"
    return expr


def column_expr(f: FieldProfile, ref: str) -> str:
    """The converted column as code, for the column reached by ``ref``."""
    return conversion(f).format(ref)


@lru_cache(maxsize=64)
def _compiled(template: str):
    return compile(template.format("s"), "<plotwise conversion>", "eval")


def convert(s: pd.Series, f: FieldProfile) -> pd.Series:
    """Column ``s`` converted as ``conversion(f)`` says."""
    template = conversion(f)
    if template == "{}":
        return s
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return eval(_compiled(template), {"pd": pd, "np": np, "s": s})  # noqa: S307


def working_frame(df: pd.DataFrame, profile: Profile, columns: list[str]) -> pd.DataFrame:
    """The used columns under their string labels, converted. Rows with any missing value are
    kept (callers drop as they need)."""
    def converted(f: FieldProfile) -> pd.Series:
        return convert(df[f.name], f).reset_index(drop=True)

    data = {}
    for label in columns:
        f = profile.fields[label]
        data[label] = memo_get(("converted", label), partial(converted, f), about=df)
    return pd.DataFrame(data, copy=False)


def aggregate(w: pd.DataFrame, by: list[str], y: str | None, stat: str) -> pd.Series:
    """Grouped statistic of ``y`` (or row counts) by the ``by`` columns, missing rows left out."""
    cols = by + ([y] if y else [])
    d = w[cols].dropna()
    g = d.groupby(by, observed=True, sort=True)
    if y is None or stat == "count":
        return g.size()
    if stat == "mean":
        return g[y].mean()
    return g[y].sum()
