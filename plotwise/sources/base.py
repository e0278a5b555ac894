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
KEPT_ANSWERS = 16  # engine answers a Source keeps (see Source.keep)
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
    # Each query's answer, by its text: a design drawn again, or three designs that ask the
    # engine the same question, read the data once. (Kept as long as this Source: one advice,
    # or one panel's frame memo.)
    answers: dict[str, object] = field(default_factory=dict, repr=False)

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
        """Evaluate one engine expression built by the functions below (once per text)."""
        if expr not in self.answers:
            self.keep(expr, self._evaluate(expr))
        answer = self.answers[expr]
        # a shallow copy: under copy-on-write the caller's changes never reach the kept answer
        return answer.copy(deep=False) if isinstance(answer, (pd.DataFrame, pd.Series)) \
            else answer

    def keep(self, expr: str, answer) -> None:
        """Keep an answer; past KEPT_ANSWERS the oldest goes (a long panel session on engine
        data asks many questions, each bringing back at most a sample)."""
        self.answers[expr] = answer
        while len(self.answers) > KEPT_ANSWERS:
            del self.answers[next(iter(self.answers))]

    def prefetch(self, exprs: list[str]) -> None:
        """Answer several queries at once where the engine can: Dask computes them all in one
        ``dask.compute`` (each query text ends in ``.compute()``); other engines answer each in
        turn when it is run."""
        todo = [e for e in dict.fromkeys(exprs) if e not in self.answers]
        if self.engine != "dask" or len(todo) < 2 or \
                not all(e.endswith(".compute()") for e in todo):
            return
        import dask

        try:
            lazy = [self._evaluate(e[:-len(".compute()")]) for e in todo]
            with quiet():
                answers = dask.compute(*lazy)
        except Exception:  # noqa: BLE001  each query, run alone, reports its own error
            return
        for e, answer in zip(todo, answers):
            self.keep(e, answer)

    def _evaluate(self, expr: str):
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

        # PyArrow tables and Spark frames may repeat a name (Polars and DuckDB cannot);
        # narwhals would refuse them with an error of its own.
        names = list(data.column_names if module == "pyarrow" else
                     data.columns if module == "pyspark" else [])
        dupes = sorted({str(c) for c in names if names.count(c) > 1})
        if dupes:
            raise PlotwiseError(f"the data has duplicate column names {dupes[:5]}; rename them.")
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
    nul = [c for c in src.columns if "\x00" in c]
    if nul:
        raise PlotwiseError(f"column name(s) {nul[:5]} hold a NUL character, which the "
                            f"{src.engine_name} engine cannot pass on; rename them first, e.g. "
                            "with names of letters, digits and spaces.")
    if src.engine in ("polars", "duckdb", "dask", "spark", "pyarrow"):
        odd = [c for c in src.columns if c == "*" or (c.startswith("^") and c.endswith("$"))]
        if odd:
            raise PlotwiseError(
                f"column name(s) {odd[:5]} read as a wildcard or a regular expression in "
                f"{src.engine_name}'s column selection (every column, or every matching one); "
                "rename them first, e.g. 'all' or 'v_pattern'.")
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
                  f"{name} = duckdb.{reader}({src.path!r})"
                  "  # scanned lazily: DuckDB reads only what each query needs"]
    return lines
