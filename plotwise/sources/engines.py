"""Data that lives in an engine: Polars (eager or lazy), PyArrow, DuckDB, Dask, Spark, or a
Parquet/CSV file scanned lazily by DuckDB. The statistics the advice needs (row counts, missing
values, min/max, moments, exact category labels, grouped counts and sums, binned counts) are
computed where the data lives; only small results (one row per group, a bounded random sample)
come back to the notebook as pandas.

Every engine query is written once, as Python source text: plotwise evaluates that text itself
and pastes the same text into the generated code, so the snippet a user copies computes exactly
what plotwise computed, in the same engine. Polars, PyArrow, DuckDB and Spark are reached through
narwhals (one dataframe-agnostic API); Dask through its own pandas-like API, because narwhals'
Dask support is leaving its core package. pandas frames never come here: they keep the original
in-memory path unchanged."""

from __future__ import annotations

import os
import warnings
from contextlib import contextmanager
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pandas as pd

from plotwise.errors import PlotwiseError

ENGINE_NAMES = {"polars": "Polars", "pyarrow": "PyArrow", "duckdb": "DuckDB", "dask": "Dask",
                "spark": "Spark"}
FILE_FORMATS = {".parquet": "parquet", ".pq": "parquet", ".csv": "csv", ".tsv": "csv",
                ".gz": "csv"}
ACCEPTED = ("a pandas, Polars (eager or lazy), Dask or Spark DataFrame, a PyArrow Table, a DuckDB "
            "relation, or the path of a Parquet or CSV file")


@dataclass
class Source:
    """Where the data lives and how plotwise reaches it."""

    native: object  # the caller's object (or the DuckDB relation plotwise opened on a file)
    engine: str  # polars | pyarrow | duckdb | dask | spark
    kind: str  # what the caller passed, in words
    columns: list[str]
    path: str | None = None
    file_format: str | None = None
    computed: list[str] = field(default_factory=list)  # what the engine computed, in words

    @property
    def engine_name(self) -> str:
        return ENGINE_NAMES[self.engine]

    def namespace(self) -> dict:
        """What the engine expressions need when evaluated (``df`` is the native data)."""
        ns = {"df": self.native, "np": np, "pd": pd}
        if self.engine != "dask":
            import narwhals as nw

            ns["nw"] = nw
        return ns

    def run(self, expr: str):
        """Evaluate one engine expression built by the functions below."""
        try:
            with quiet():
                return eval(compile(expr, f"<plotwise {self.engine} query>", "eval"), self.namespace())  # noqa: S307
        except PlotwiseError:
            raise
        except Exception as exc:
            raise PlotwiseError(
                f"{self.engine_name} could not compute what plotwise asked of {self.kind}: "
                f"{type(exc).__name__}: {str(exc)[:300]}") from exc

    def note(self, what: str) -> None:
        if what not in self.computed:
            self.computed.append(what)


@contextmanager
def quiet():
    """Hide the version chatter engines print while plotwise queries them (PySpark warns about
    pandas 3 on every conversion); the user's own calls keep their warnings."""
    with warnings.catch_warnings():
        warnings.filterwarnings("ignore", message="PySpark does not yet fully support pandas")
        warnings.filterwarnings("ignore", message="Dask support is moving out of Narwhals")
        warnings.filterwarnings("ignore", message="The copy keyword is deprecated")
        yield


# ----------------------------------------------------------------------------------------------
# Recognising the input
# ----------------------------------------------------------------------------------------------
def is_engine_data(obj) -> bool:
    """Is ``obj`` a frame of one of the engines plotwise reads (checked without importing them)?"""
    module = type(obj).__module__.split(".")[0]
    return module in ("polars", "pyarrow", "duckdb", "pyspark", "dask", "dask_expr") and \
        type(obj).__name__ in ("DataFrame", "LazyFrame", "Table", "DuckDBPyRelation")


def open_source(data) -> Source | None:
    """A Source for engine data; None for a pandas DataFrame (the in-memory path)."""
    if isinstance(data, pd.DataFrame):
        return None
    if isinstance(data, (str, os.PathLike)):
        return open_file(data)
    module = type(data).__module__.split(".")[0]
    if module in ("dask", "dask_expr"):
        if not hasattr(data, "columns"):
            raise PlotwiseError(f"plotwise needs a DataFrame, got a Dask {type(data).__name__}; "
                                "turn it into one with .to_frame().")
        return _checked(Source(data, "dask", "Dask DataFrame", [str(c) for c in data.columns]))
    if module in ("polars", "pyarrow", "duckdb", "pyspark"):
        import narwhals as nw

        try:
            frame = nw.from_native(data)
        except TypeError:
            frame = None
        if isinstance(frame, (nw.DataFrame, nw.LazyFrame)):
            impl = str(frame.implementation).lower()
            engine = "spark" if "spark" in impl else impl
            if engine in ENGINE_NAMES:
                kind = {"polars": f"Polars {type(data).__name__}", "pyarrow": "PyArrow Table",
                        "duckdb": "DuckDB relation", "spark": "Spark DataFrame"}[engine]
                return _checked(Source(data, engine, kind, list(frame.columns)))
    raise PlotwiseError(f"plotwise cannot read a {type(data).__module__}.{type(data).__name__}; "
                        f"pass {ACCEPTED}.")


def open_file(path) -> Source:
    """A Parquet or CSV file, scanned lazily by DuckDB (only what each query needs is read)."""
    p = Path(path).expanduser()
    if not p.exists():
        raise PlotwiseError(f"no file at {str(path)!r}; check the path (relative paths start "
                            f"from {os.getcwd()!r}).")
    if p.is_dir():
        raise PlotwiseError(f"{str(path)!r} is a folder; give the path of one Parquet or CSV file.")
    fmt = FILE_FORMATS.get(p.suffix.lower())
    if fmt is None:
        raise PlotwiseError(f"cannot read {p.name!r}: plotwise reads Parquet (.parquet, .pq) and "
                            "CSV (.csv, .tsv, .csv.gz) files.")
    import duckdb

    reader = "read_parquet" if fmt == "parquet" else "read_csv"
    word = "Parquet" if fmt == "parquet" else "CSV"
    try:
        # plotwise's own in-memory connection, quiet (no progress bar in the notebook).
        con = duckdb.connect()
        con.execute("SET enable_progress_bar = false")
        rel = getattr(con, reader)(str(p))
        columns = [str(c) for c in rel.columns]
    except Exception as exc:
        raise PlotwiseError(f"could not read {p.name!r} as {word}: "
                            f"{str(exc).splitlines()[0][:300]}") from exc
    return _checked(Source(rel, "duckdb", f"{word} file {p.name!r}", columns,
                           path=str(p), file_format=fmt))


def _checked(src: Source) -> Source:
    dotted = [c for c in src.columns if "." in c or "`" in c]
    if src.engine == "spark" and dotted:
        raise PlotwiseError(
            f"Spark reads a dot (or backtick) in a column name as a path into a struct, so it "
            f"cannot select {dotted[:5]}; rename them first, e.g. df = df.toDF(*[c.replace('.', "
            "'_').replace('`', '') for c in df.columns]).")
    if not src.columns:
        raise PlotwiseError(f"the {src.kind} has no columns; advise on data with columns in it.")
    dupes = sorted({c for c in src.columns if src.columns.count(c) > 1})
    if dupes:
        raise PlotwiseError(f"the {src.kind} has duplicate column names {dupes[:5]}; rename them.")
    return src


def open_code(src: Source, name: str = "df") -> list[str]:
    """Lines a snippet needs before its queries: imports, and opening the file if there is one."""
    lines = [] if src.engine == "dask" else ["import narwhals as nw"]
    if src.path:
        reader = "read_parquet" if src.file_format == "parquet" else "read_csv"
        lines += ["import duckdb", "",
                  f"{name} = duckdb.{reader}({src.path!r})  # scanned lazily: DuckDB reads only what each query needs"]
    return lines


# ----------------------------------------------------------------------------------------------
# Engine expressions (source text). ``df`` names the native data; each returns pandas.
# ----------------------------------------------------------------------------------------------
def chained(expr: str, indent: int) -> str:
    """A long method chain split at its top-level calls, one per line, inside parentheses (how
    people write engine queries by hand); short expressions stay on one line."""
    if len(expr) + indent <= 100:
        return expr
    parts, depth, quote, start = [], 0, None, 0
    for i, ch in enumerate(expr):
        if quote:
            if ch == quote and expr[i - 1] != "\\":
                quote = None
        elif ch in "'\"":
            quote = ch
        elif ch in "([{":
            depth += 1
        elif ch in ")]}":
            depth -= 1
        elif ch == "." and depth == 0 and i and expr[i - 1] in ")]":
            parts.append(expr[start:i])
            start = i
    parts.append(expr[start:])
    if len(parts) == 1:
        return expr
    pad = "\n" + " " * (indent + 1)
    return "(" + pad.join(parts) + ")"


def _keyword(name: str, value: str) -> str:
    """A keyword argument ``name=value``, or ``**{'name': value}`` when name is no identifier."""
    import keyword

    if name.isidentifier() and not keyword.iskeyword(name):
        return f"{name}={value}"
    return f"**{{{name!r}: {value}}}"


def _minus(value: float) -> str:
    """``- value`` written the way a person would (``+ 0.5`` rather than ``- -0.5``)."""
    return f"- {value!r}" if value >= 0 else f"+ {-value!r}"


def _fresh(name: str, taken) -> str:
    while name in taken:
        name += "_"
    return name


def complete_rows(src: Source, cols: list[str], finite: tuple = (), frame: str = "df") -> str:
    """The columns ``cols``, rows with a missing value (or a non-finite number in ``finite``)
    left out, still inside the engine."""
    if src.engine == "dask":
        expr = f"{frame}[{cols!r}].dropna()"
        for c in finite:
            expr += f".pipe(lambda t: t[np.isfinite(t[{c!r}])])"
        return expr
    expr = f"nw.from_native({frame}).lazy().select({cols!r}).drop_nulls()"
    for c in finite:
        expr += f".filter(nw.col({c!r}).is_finite())"
    return expr


def _to_pandas(src: Source, expr: str) -> str:
    return f"{expr}.compute()" if src.engine == "dask" else f'{expr}.collect("pandas").to_native()'


def count_name(keys, y=None) -> str:
    return _fresh("rows", set(keys) | {y})


def grouped_expr(src: Source, keys: list[str], y: str | None, stat: str = "sum",
                 squares: bool = False, finite: bool = True, frame: str = "df",
                 complete_in: tuple = ()) -> str:
    """One row per group of ``keys``: the row count (column ``count_name``), and for ``y`` its
    sum (or median), and with ``squares`` the sum of squares (column ``y + '_squares'``). Rows
    missing a value in keys, y or ``complete_in`` are left out."""
    n = count_name(keys, y)
    cols = list(dict.fromkeys(keys + ([y] if y else []) + list(complete_in)))
    fin = (y,) if (y and finite) else ()
    sq = _fresh(f"{y}_squares", set(cols)) if (y and squares) else None
    base = complete_rows(src, cols, fin, frame)
    if src.engine == "dask":
        parts = [_keyword(n, f"({(y or keys[0])!r}, 'count')")]
        if y:
            parts.append(_keyword(y, f"({y!r}, {('median' if stat == 'median' else 'sum')!r})"))
        if sq:
            base += f".assign({_keyword(sq, f'lambda t: t[{y!r}] ** 2')})"
            parts.append(_keyword(sq, f"({sq!r}, 'sum')"))
        return (f"{base}.groupby({keys!r}, observed=True).agg({', '.join(parts)})"
                ".compute().reset_index()")
    if src.engine == "pyarrow" and stat == "median" and y:
        # PyArrow's grouped median is approximate (a t-digest); the table is in memory, so the
        # used columns go to pandas for an exact median.
        return (f"{_to_pandas(src, base)}.groupby({keys!r}, observed=True)"
                f".agg({_keyword(n, repr((y, 'count')))}, {_keyword(y, repr((y, 'median')))})"
                ".reset_index()")
    aggs = [f"nw.len().alias({n!r})"]
    if y:
        aggs.append(f"nw.col({y!r}).{'median' if stat == 'median' else 'sum'}()")
    if sq:
        base += f".with_columns((nw.col({y!r}) ** 2).alias({sq!r}))"
        aggs.append(f"nw.col({sq!r}).sum()")
    return _to_pandas(src, f"{base}.group_by({keys!r}).agg({', '.join(aggs)})")


def sample_expr(src: Source, cols: list[str], k: int, n: int, complete: bool = True,
                finite: tuple = (), frame: str = "df") -> str:
    """At most about ``k`` random rows of ``cols`` (all rows when ``n`` ≤ k), seeded."""
    if complete:
        base = complete_rows(src, cols, finite, frame)
    elif src.engine == "dask":
        base = f"{frame}[{cols!r}]"
    else:
        base = f"nw.from_native({frame}).lazy().select({cols!r})"
    if n <= k:
        return _to_pandas(src, base)
    frac = min(1.0, k / n)
    if src.engine == "dask":  # Bernoulli sample in every partition: about k rows
        return f"{base}.sample(frac={frac:.6g}, random_state=0).compute()"
    if src.engine == "spark":  # Bernoulli sample on the executors: about k rows
        return f"{base}.to_native().sample(fraction={frac:.6g}, seed=0).toPandas()"
    if src.engine == "duckdb":  # reservoir sample inside DuckDB: exactly k rows
        return (f'{base}.to_native().query("t", "SELECT * FROM t USING SAMPLE reservoir({k} ROWS) '
                'REPEATABLE (0)").df()')
    return f"{base}.collect().sample(n={k}, seed=0).to_pandas()"  # in memory already


def bins_expr(src: Source, col: str, lo: float, width: float, k: int, log: bool = False,
              frame: str = "df") -> str:
    """Row counts in ``k`` equal bins of ``width`` from ``lo`` (of log10 values with ``log``),
    counted in the engine; the last bin includes its right edge, as in numpy.histogram."""
    base = complete_rows(src, [col], (col,), frame)
    if src.engine == "dask":
        v = f"np.log10(t[{col!r}])" if log else f"t[{col!r}]"
        cut = f".pipe(lambda t: t[t[{col!r}] > 0])" if log else ""
        return (f"{base}{cut}.assign(bin=lambda t: np.floor(({v} {_minus(lo)}) / {width!r})"
                f".clip(0, {k - 1}).astype('int64')).groupby('bin').size().compute()")
    v = f"nw.col({col!r}).log(10)" if log else f"nw.col({col!r})"
    cut = f".filter(nw.col({col!r}) > 0)" if log else ""
    return (f"{base}{cut}.select((({v} {_minus(lo)}) / {width!r}).floor().clip(0, {k - 1})"
            f".cast(nw.Int64).alias('bin')).group_by('bin').agg(nw.len())"
            '.collect("pandas").to_native().set_index("bin")["len"]')


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
    the data); other engines answer distinct_values() separately."""
    out: dict[str, dict] = {}
    if src.engine == "dask":
        import dask

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
                out.setdefault(c, {})[what] = [u for u in v if u == u]
            else:
                out.setdefault(c, {})[what] = float(v) if v is not None else None
        return out
    import narwhals as nw

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
    (Dask gets its labels in column_moments' single pass instead.)"""
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
    limit = THRESHOLDS["max_categories"]
    few = tuple(c for c, fp in fields.items()
                if n > len(sample) and fp.distinct <= limit and fp.level != "quantitative")
    moments = column_moments(src, numeric, [c for c in src.columns if c not in numeric], floats,
                             few)
    for c, fp in fields.items():
        m = moments.get(c, {})
        fp.rows = n
        fp.missing = int(m.get("missing") or 0)
        if c in numeric and m.get("finite"):
            fp.infinite = int(n - fp.missing - m["finite"])
            fp.minimum, fp.maximum = m["min"], m["max"]
            stats = moments_to_stats(m, numeric[c])
            fp.mean, fp.std = stats["mean"], stats["std"]
            if stats["skew"] is not None and fp.skew is not None:
                fp.skew = stats["skew"]
        if c in few:
            labels = m.get("labels") if src.engine == "dask" else distinct_values(src, c, limit)
            if labels is not None and len(labels) > limit:
                labels = None
            if labels is not None:
                fp.distinct = len(labels)
                if fp.labels:
                    fp.labels = tuple(labels)
                src.note(f"the exact labels of '{c}'")
        where = (f"from a seeded sample of {len(sample):,} of {n:,} rows" if n > len(sample)
                 else f"from all {n:,} rows")
        fp.evidence.insert(1, f"{src.engine_name} computed counts, missing values, min and max; "
                              f"levels and labels {where}")
    return Profile(rows=n, fields=fields, sample_rows=None if n <= k else len(sample),
                   source=src), sample


class EngineStats:
    """The exact numbers design_stats() asks of engine data (complete rows, grouped counts, sums
    and sums of squares), each computed once by the engine and kept."""

    def __init__(self, src: Source, profile):
        self.src = src
        self.profile = profile
        self._cache: dict = {}

    def _finite(self, cols) -> tuple:
        return tuple(c for c in cols if self.profile.fields[c].level == "quantitative"
                     and self.profile.fields[c].minimum is not None)

    def complete(self, cols: list[str]) -> int:
        key = ("complete", tuple(cols))
        if key not in self._cache:
            base = complete_rows(self.src, cols, self._finite(cols))
            expr = (f"len({base})" if self.src.engine == "dask" else
                    f'int({base}.select(nw.len()).collect("pandas").to_native().iloc[0, 0])')
            self._cache[key] = self.src.run(expr)
        return self._cache[key]

    def table(self, keys: list[str], y: str | None, others: tuple = ()) -> pd.DataFrame:
        """Per group of ``keys`` (after plotwise's column conversions): count, sum, sumsq;
        rows are those complete in keys, y and ``others``."""
        cache_key = ("table", tuple(keys), y, tuple(others))
        if cache_key in self._cache:
            return self._cache[cache_key]
        from plotwise.engine.working import working_frame

        cols = list(dict.fromkeys(keys + list(others)))
        fin = y is not None and bool(self._finite([y]))
        raw = self.src.run(grouped_expr(self.src, cols, y, squares=y is not None, finite=fin))
        n = count_name(cols, y)
        w = working_frame(raw, self.profile, keys)
        w["count"] = raw[n].to_numpy(dtype=float)
        if y is not None:
            sq = _fresh(f"{y}_squares", set(cols + [y]))
            w["sum"] = raw[y].to_numpy(dtype=float)
            w["sumsq"] = raw[sq].to_numpy(dtype=float)
        t = w.dropna(subset=keys).groupby(keys, observed=True, sort=True).sum()
        self.src.note("totals, means and group sizes from all rows")
        self._cache[cache_key] = t
        return t

    def grouped(self, x: str, y: str | None, others: tuple = ()):
        """Like plotwise.engine.stats.grouped(), from the engine: a GroupSums."""
        from plotwise.engine.stats import GroupSums

        t = self.table([x], y, others)
        g = GroupSums(t.index, t["count"].to_numpy())
        if y is not None:
            g.sum = t["sum"].to_numpy()
            g.sumsq = t["sumsq"].to_numpy()
        return g

    def medians(self, x: str, y: str, others: tuple = ()) -> pd.Series:
        """The median of ``y`` per group of ``x``, computed by the engine (rows complete in x, y
        and ``others``)."""
        from plotwise.engine.working import working_frame

        raw = self.src.run(grouped_expr(self.src, [x], y, stat="median",
                                        finite=bool(self._finite([y])), complete_in=others))
        w = working_frame(raw, self.profile, [x])
        w["median"] = raw[y].to_numpy(dtype=float)
        # One row per group unless x has several raw values for one label (text parsed as the
        # same date, say): then the median of their medians, a close stand-in.
        return w.dropna(subset=[x]).groupby(x, observed=True, sort=True)["median"].median()

    def unique_keys(self, keys: list[str], y: str) -> bool:
        """Does every group of ``keys`` hold exactly one complete row?"""
        t = self.table(keys, None, (y,))
        return bool(len(t) and t["count"].max() == 1)
