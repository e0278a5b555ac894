"""Profiling engine data: the exact counts, moments and label sets computed by the engine, and
the levels and evidence from a seeded sample."""

from __future__ import annotations

import numpy as np
import pandas as pd

from plotwise.errors import PlotwiseError
from plotwise.sources.base import Source, quiet
from plotwise.sources.queries import sample_expr


# ----------------------------------------------------------------------------------------------
# What the engine computes for the advice
# ----------------------------------------------------------------------------------------------
def column_types(src: Source) -> dict[str, str]:
    """Each column's type as the engine names it."""
    if src.engine == "dask":
        return {str(c): str(t) for c, t in src.native.dtypes.items()}
    import narwhals as nw

    with quiet():
        schema = nw.from_native(src.native).lazy().collect_schema()
    return {str(c): str(t) for c, t in schema.items()}


def row_count(src: Source) -> int:
    if src.engine == "dask":
        return len(src.native)
    return int(src.run('nw.from_native(df).lazy().select(nw.len()).collect("pandas").to_native().iloc[0, 0]'))


def column_moments(src: Source, numeric: dict[str, float], others: list[str],
                   floats: set[str], labels: tuple = ()) -> dict[str, dict]:
    """Exact per-column counts in one pass: missing values for every column; for the numeric
    ones also the finite count, min, max and the sums of (x − c)^1..3 about ``c`` (a centre
    taken from the sample, which keeps the power sums numerically stable). Dask also collects
    the distinct values of the ``labels`` columns in the same pass (every Dask query rereads
    the data), and DuckDB in grouping sets of the same query; other engines answer
    distinct_values() separately."""
    if src.engine == "dask":
        return _dask_moments(src, numeric, others, labels)
    if src.engine == "duckdb":
        return _duckdb_moments(src, numeric, others, floats, labels)
    return _narwhals_moments(src, numeric, others, floats)


def _quoted(name: str) -> str:
    return '"' + name.replace('"', '""') + '"'


def _duckdb_moments(src: Source, numeric: dict[str, float], others: list[str], floats: set[str],
                    labels: tuple) -> dict[str, dict]:
    """column_moments() for DuckDB: one aggregate query (the expressions narwhals writes for
    the other engines) whose grouping sets also return the distinct values of the ``labels``
    columns, so the profile reads the data once however many columns have few labels."""
    names: list[tuple[str, str]] = []
    exprs: list[str] = []

    def add(sql: str, c: str, what: str) -> None:
        names.append((c, what))
        exprs.append(f"{sql} AS e{len(exprs)}")

    for c in list(numeric) + others:
        q = _quoted(c)
        add(f"count(*) - count({q})" + (f" + count_if(isnan({q}))" if c in floats else ""),
            c, "missing")
    for c, centre in numeric.items():
        q = _quoted(c)
        v = f"(CASE WHEN isfinite({q}) THEN CAST({q} AS DOUBLE) END)"
        d = f"({v} - {float(centre)!r}::DOUBLE)"
        add(f"count({v})", c, "finite")
        add(f"min({v})", c, "min")
        add(f"max({v})", c, "max")
        add(f"sum({d})", c, "s1")
        add(f"sum({d} * {d})", c, "s2")
        add(f"sum({d} * {d} * {d})", c, "s3")
    keys = [_quoted(c) for c in labels]
    select = [f"GROUPING({k}) AS g{i}" for i, k in enumerate(keys)] + keys + exprs
    sets = "GROUPING SETS ((), " + ", ".join(f"({k})" for k in keys) + ")" if keys else ""
    with quiet():
        frame = src.native.aggregate(", ".join(select), sets).df()
    grouped = [frame[f"g{i}"].to_numpy() for i in range(len(keys))]
    whole = np.ones(len(frame), dtype=bool)
    for g in grouped:
        whole &= g == 1
    row = frame.loc[whole].iloc[0]
    out: dict[str, dict] = {}
    for i, (c, what) in enumerate(names):
        v = row[f"e{i}"]
        out.setdefault(c, {})[what] = None if pd.isna(v) else float(v)
    for i, c in enumerate(labels):
        out.setdefault(c, {})["labels"] = list(
            _plain(frame.iloc[:, len(keys) + i][grouped[i] == 0].dropna()))
    return out


def _plain(s: pd.Series) -> pd.Series:
    """A column of nullable integers or booleans (how DuckDB hands back a column that held
    NULLs) as plain numpy values, as a column without missing values comes back."""
    numpy_dtype = getattr(s.dtype, "numpy_dtype", None)
    if isinstance(s.dtype, pd.api.extensions.ExtensionDtype) and numpy_dtype is not None \
            and numpy_dtype.kind in "iub":
        return s.astype(numpy_dtype)
    return s


def _dask_moments(src: Source, numeric: dict[str, float], others: list[str],
                  labels: tuple) -> dict[str, dict]:
    """column_moments() for Dask: one dask.compute for every column's numbers and labels."""
    import dask

    out: dict[str, dict] = {}
    df = src.native
    lazy = {}
    for c in list(numeric) + others:
        lazy[(c, "missing")] = df[c].isna().sum()
    for c, centre in numeric.items():
        s = df[c].astype("float64")
        v = s.where(np.isfinite(s))
        d = v - centre
        lazy.update({(c, "finite"): v.count(), (c, "min"): v.min(), (c, "max"): v.max(),
                     (c, "s1"): d.sum(), (c, "s2"): (d ** 2).sum(), (c, "s3"): (d ** 3).sum()})
    for c in labels:
        lazy[(c, "labels")] = df[c].dropna().unique()
    keys = list(lazy)
    with quiet():
        values = dask.compute(*[lazy[k] for k in keys])
    for (c, what), v in zip(keys, values):
        if what == "labels":
            out.setdefault(c, {})[what] = list(v)
        else:
            out.setdefault(c, {})[what] = float(v) if v is not None else None
    return out


def _narwhals_moments(src: Source, numeric: dict[str, float], others: list[str],
                      floats: set[str]) -> dict[str, dict]:
    """column_moments() through narwhals: one select of every column's numbers."""
    import narwhals as nw

    out: dict[str, dict] = {}
    exprs = []
    names = []

    def add(expr, c, what):
        names.append((c, what))
        exprs.append(expr.alias(f"e{len(exprs)}"))

    for c in list(numeric) + others:
        miss = nw.col(c).null_count()
        if c in floats:
            miss = miss + nw.col(c).is_nan().cast(nw.Int64).sum()
        add(miss, c, "missing")
    for c, centre in numeric.items():
        v = nw.when(nw.col(c).is_finite()).then(nw.col(c).cast(nw.Float64))
        d = v - centre
        add(v.count(), c, "finite")
        add(v.min(), c, "min")
        add(v.max(), c, "max")
        add(d.sum(), c, "s1")
        add((d * d).sum(), c, "s2")
        add((d * d * d).sum(), c, "s3")
    with quiet():
        frame = nw.from_native(src.native).lazy().select(*exprs).collect("pandas").to_native()
    row = frame.iloc[0]
    for i, (c, what) in enumerate(names):
        v = row.iloc[i]
        out.setdefault(c, {})[what] = None if pd.isna(v) else float(v)
    return out


def moments_to_stats(m: dict, centre: float) -> dict:
    """Mean, standard deviation (n − 1) and the adjusted Fisher–Pearson skewness (as pandas'
    Series.skew computes it) from the power sums about ``centre``."""
    n = m.get("finite") or 0
    if n == 0:
        return {}
    s1, s2, s3 = m["s1"] or 0.0, m["s2"] or 0.0, m["s3"] or 0.0
    a = s1 / n
    mean = centre + a
    m2 = max(s2 / n - a * a, 0.0)
    m3 = s3 / n - 3 * a * s2 / n + 2 * a ** 3
    std = float(np.sqrt(m2 * n / (n - 1))) if n > 1 else 0.0
    skew = None
    if n > 2 and m2 > 0:
        skew = float(m3 / m2 ** 1.5 * np.sqrt(n * (n - 1)) / (n - 2))
    return {"mean": float(mean), "std": std, "skew": skew}


def distinct_values(src: Source, col: str, limit: int) -> list | None:
    """Every distinct non-missing value of ``col`` when there are at most ``limit``; else None.
    (Dask and DuckDB get their labels in column_moments' single pass instead.)"""
    # A hash aggregate (streams in every engine) rather than unique(), which some engines run as
    # a window over all rows.
    expr = (f"nw.from_native(df).lazy().select({[col]!r}).drop_nulls().group_by({[col]!r})"
            f".agg(nw.len()).head({limit + 1}).collect(\"pandas\").to_native()")
    vals = [v for v in src.run(expr).iloc[:, 0] if v == v]  # NaN in a float column is no label
    return None if len(vals) > limit else vals


# ----------------------------------------------------------------------------------------------
# Profile and exact group statistics of engine data
# ----------------------------------------------------------------------------------------------
def profile_source(src: Source):
    """Profile engine data: levels, evidence and labels from a seeded sample of at most
    THRESHOLDS['profile_sample'] rows (all rows when there are fewer), then the counts, missing
    values, min, max, mean, spread and skewness exact from the engine, and the exact label set of
    every column with few labels. Returns (Profile, the sample as a pandas frame)."""
    from plotwise.engine.profile import Profile, check_frame, profile_series
    from plotwise.engine.rules import THRESHOLDS

    limit = THRESHOLDS["max_categories"]
    facts = None
    if src.engine == "dask":  # one pass for the count, every column's numbers and labels
        from plotwise.sources.partitions import dask_facts

        facts = dask_facts(src.native, limit)
        n = facts.rows
    else:
        n = row_count(src)
    if n == 0:
        raise PlotwiseError(f"the {src.kind} has no rows; advise on data with rows in it.")
    k = min(THRESHOLDS["profile_sample"],
            max(THRESHOLDS["draw_sample"], THRESHOLDS["engine_sample_cells"] // len(src.columns)))
    sample = src.run(sample_expr(src, src.columns, k, n, complete=False))
    sample = sample.reset_index(drop=True)
    check_frame(sample)
    src.note(f"row count ({n:,}), missing values, min, max, mean, spread and skewness of every "
             "column, exact")
    fields = {}
    types = column_types(src)
    for position, name in enumerate(src.columns):
        fp = profile_series(sample[name], name)
        fp.position = position
        if types.get(name):  # the engine's own type name, not the sample's pandas dtype
            fp.dtype = types[name]
            fp.evidence[0] = f"{types[name]} column in {src.engine_name}"
        fields[name] = fp
    numeric = {c: (fp.mean if fp.mean is not None else 0.0) for c, fp in fields.items()
               if fp.minimum is not None and not fp.is_timedelta}
    floats = {c for c in src.columns if pd.api.types.is_float_dtype(sample[c].dtype)}
    few = tuple(c for c, fp in fields.items()
                if n > len(sample) and fp.distinct <= limit and fp.level != "quantitative")
    others = [c for c in src.columns if c not in numeric]
    if facts is None:
        moments = column_moments(src, numeric, others, floats, few)
    else:
        moments = _from_facts(facts, numeric, few)
        # a column the pass could not cover (numbers held as text, labels of a float column)
        rest = {c: m for c, m in numeric.items() if c not in facts.moments}
        more = tuple(c for c in few if c not in facts.labels)
        if rest or more:
            for c, m in column_moments(src, rest, [], floats, more).items():
                moments.setdefault(c, {}).update({k: v for k, v in m.items() if k != "missing"})
    for c, fp in fields.items():
        _exact_field(src, fp, moments.get(c, {}), n, numeric.get(c), c in few, len(sample))
    return Profile(rows=n, fields=fields, sample_rows=None if n <= k else len(sample),
                   source=src), sample


def _from_facts(facts, numeric: dict[str, float], few: tuple) -> dict[str, dict]:
    """column_moments()' answer from the Dask pass's combined facts."""
    out: dict[str, dict] = {c: {"missing": float(m)} for c, m in facts.missing.items()}
    for c, centre in numeric.items():
        if c in facts.moments:
            out[c].update(facts.moments[c].power_sums(centre))
    for c in few:
        if c in facts.labels:
            out[c]["labels"] = facts.labels[c]
    return out


def _exact_field(src: Source, fp, m: dict, n: int, centre: float | None, few: bool,
                 sampled: int) -> None:
    """Replace a sample-profiled field's counts by the engine's exact ones."""
    from plotwise.engine.rules import THRESHOLDS

    limit = THRESHOLDS["max_categories"]
    c = fp.label
    fp.rows = n
    fp.missing = int(m.get("missing") or 0)
    if centre is not None and m.get("finite"):
        fp.infinite = int(n - fp.missing - m["finite"])
        fp.minimum, fp.maximum = m["min"], m["max"]
        stats = moments_to_stats(m, centre)
        fp.mean, fp.std = stats["mean"], stats["std"]
        if stats["skew"] is not None and fp.skew is not None:
            fp.skew = stats["skew"]
    if few:
        labels = (m.get("labels") if src.engine in ("dask", "duckdb")
                  else distinct_values(src, c, limit))
        if labels is not None:  # NaN in a float column is no label
            labels = [u for u in labels if u == u]
        if labels is not None and len(labels) > limit:
            labels = None
        if labels is not None:
            fp.distinct = len(labels)
            if fp.labels:
                fp.labels = tuple(labels)
            src.note(f"the exact labels of '{c}'")
    where = (f"from a seeded sample of {sampled:,} of {n:,} rows" if n > sampled
             else f"from all {n:,} rows")
    fp.evidence.insert(1, f"{src.engine_name} computed counts, missing values, min and max; "
                          f"levels and labels {where}")
