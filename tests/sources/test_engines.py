"""The same advice whatever engine holds the data: pandas against Polars (eager and lazy),
PyArrow, DuckDB (a relation, and Parquet/CSV files it scans), Dask on a LocalCluster with two
worker processes, and Spark on a local two-core session. Ranked designs and hazard codes must be
identical; profiles and the numbers each grouped or binned design draws must agree within float
tolerance.

The frames are open data shipped inside packages (tests/open_data.py): Grunfeld (1958) from
statsmodels and Fisher's iris from scikit-learn, plus Grunfeld with every seventh investment
blanked (missing values handled alike)."""

from __future__ import annotations

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest
from open_data import grunfeld, iris, kind_cases

import plotwise
from plotwise.engine.kinds import engine_mode

ENGINES = ["polars", "polars-lazy", "pyarrow", "duckdb", "parquet", "csv", "dask", "spark"]


@pytest.fixture(scope="session")
def spark():
    """One local Spark session (two cores) for the whole run; Java must be on the machine."""
    pyspark = pytest.importorskip("pyspark.sql")
    session = (pyspark.SparkSession.builder.master("local[2]").appName("plotwise-tests")
               .config("spark.ui.enabled", "false")
               .config("spark.ui.showConsoleProgress", "false")
               .config("spark.sql.shuffle.partitions", "2")
               .config("spark.sql.session.timeZone", "UTC")
               .getOrCreate())
    session.sparkContext.setLogLevel("ERROR")
    yield session
    session.stop()


@pytest.fixture(scope="session")
def dask_client():
    """A real dask.distributed scheduler with two worker processes, shared by the whole run."""
    distributed = pytest.importorskip("dask.distributed")
    cluster = distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                       dashboard_address=None)
    client = distributed.Client(cluster)
    yield client
    client.close()
    cluster.close()


@pytest.fixture
def to_engine(request, tmp_path):
    """Turn a pandas frame into the named engine's data."""

    def convert(df: pd.DataFrame, engine: str):
        import pyarrow as pa

        if engine == "polars":
            import polars as pl

            return pl.from_pandas(df)
        if engine == "polars-lazy":
            import polars as pl

            return pl.from_pandas(df).lazy()
        if engine == "pyarrow":
            return pa.Table.from_pandas(df, preserve_index=False)
        if engine == "duckdb":
            import duckdb

            return duckdb.from_arrow(pa.Table.from_pandas(df, preserve_index=False))
        if engine == "parquet":
            import pyarrow.parquet as pq

            path = tmp_path / f"data{len(list(tmp_path.iterdir()))}.parquet"
            pq.write_table(pa.Table.from_pandas(df, preserve_index=False), path)
            return str(path)
        if engine == "csv":
            path = tmp_path / f"data{len(list(tmp_path.iterdir()))}.csv"
            df.to_csv(path, index=False)
            return str(path)
        if engine == "dask":
            import dask.dataframe as dd

            request.getfixturevalue("dask_client")
            return dd.from_pandas(df, npartitions=2)
        if engine == "spark":
            return request.getfixturevalue("spark").createDataFrame(df)
        raise AssertionError(engine)

    return convert


def with_gaps() -> pd.DataFrame:
    g = grunfeld()
    g.loc[g.index % 7 == 3, "invest"] = np.nan
    return g


CASES = kind_cases() + [
    (with_gaps(), dict(task="compare", x="firm", y="invest")),
    (with_gaps(), dict(task="trend", x="year", y="invest", agg="mean")),
    (with_gaps(), dict(task="compare", x="firm", y="invest", agg="median")),
    (with_gaps(), dict(task="distribution", x="invest")),
    (iris(), dict(task="correlate", x="petal length (cm)", y="petal width (cm)", hue="species")),
]


def drawn_numbers(fig) -> list[float]:
    """The numbers a figure encodes: bar extents, wedge angles, line and point positions
    (sorted, so the order in which an engine returned rows does not matter)."""
    from matplotlib.collections import PathCollection, QuadMesh
    from matplotlib.patches import Rectangle, StepPatch, Wedge

    out: list[float] = []
    for ax in fig.axes:
        for p in ax.patches:
            if isinstance(p, Rectangle):
                out += [p.get_width(), p.get_height()]
            elif isinstance(p, Wedge):
                out += [p.theta2 - p.theta1]
            elif isinstance(p, StepPatch):  # a histogram drawn from counts: heights and widths
                data = p.get_data()
                out += list(np.asarray(data.values, dtype=float)) + list(np.diff(data.edges))
        for line in ax.lines:  # values on y, or on x where y holds labels (a horizontal chart)
            ys = np.asarray(line.get_ydata())
            vals = ys if ys.dtype.kind in "biuf" else np.asarray(line.get_xdata())
            out += [float(v) for v in np.asarray(vals, dtype=float) if v == v]
        for c in ax.collections:
            if isinstance(c, PathCollection):
                out += [float(v) for v in np.asarray(c.get_offsets(), dtype=float).ravel()]
            elif isinstance(c, QuadMesh):  # a heatmap: its cells' values
                out += [float(v) for v in np.ma.masked_invalid(
                    np.asarray(c.get_array(), dtype=float)).compressed()]
    return sorted(round(v, 6) for v in out if np.isfinite(v))


def signature(a) -> list[tuple]:
    return [(d.kind, d.task, d.x, d.y, d.hue, d.facet, d.stat, round(d.score, 6)) for d in a.designs]


@pytest.mark.parametrize("engine", ENGINES)
def test_same_advice_on_every_engine(engine, to_engine):
    for df, kwargs in CASES:
        base = plotwise.advise(df, **kwargs)
        other = plotwise.advise(to_engine(df, engine), **kwargs)
        label = f"{engine} {kwargs}"
        assert other.engine != "pandas" and base.engine == "pandas"
        assert signature(other) == signature(base), label
        assert other.hazard_codes() == base.hazard_codes(), label
        assert other.headline == base.headline, label
        for name, f in base.fields.items():
            g = other.fields[name]
            got = (g.level, g.missing, g.distinct, g.rows)
            assert got == (f.level, f.missing, f.distinct, f.rows), (label, name)
            for stat in ("minimum", "maximum", "mean", "std", "skew"):
                a, b = getattr(f, stat), getattr(g, stat)
                assert (a is None) == (b is None), (label, name, stat)
                if a is not None:
                    assert b == pytest.approx(a, rel=1e-9, abs=1e-9), (label, name, stat)
        # Every grouped or binned design among the shown draws the same numbers.
        for d in base.shown():
            e = other.design(d.kind, d.task)
            if engine_mode(e) == "rows":
                continue
            f1, f2 = plt.figure(), plt.figure()
            try:
                base.draw(d, ax=f1.subplots())
                other.draw(e, ax=f2.subplots())
                want, got = drawn_numbers(f1), drawn_numbers(f2)
                assert len(got) == len(want) and len(want) > 0, (label, d.kind)
                np.testing.assert_allclose(got, want, rtol=1e-9, atol=1e-9, err_msg=f"{label} {d.kind}")
            finally:
                plt.close(f1)
                plt.close(f2)


@pytest.mark.parametrize("engine", ["polars", "duckdb", "dask", "spark"])
def test_generated_code_runs_in_the_engine(engine, to_engine):
    """The copied snippet, given the engine's data as ``df``, computes in that engine and draws
    the same numbers plotwise drew."""
    df, kwargs = kind_cases()[0]
    data = to_engine(df, engine)
    a = plotwise.advise(data, **kwargs)
    for d in a.shown():
        code = a.code(d)
        if engine_mode(d) == "groups":
            assert ("group_by" in code) or (".groupby(" in code and engine == "dask")
        ns = {"df": data}
        code = code.replace("plt.show()", "")
        exec(compile(code, "<snippet>", "exec"), ns)  # noqa: S102
        fig = ns["fig"]
        mine = plt.figure()
        try:
            a.draw(d, ax=mine.subplots())
            np.testing.assert_allclose(drawn_numbers(fig), drawn_numbers(mine), rtol=1e-9)
        finally:
            plt.close(fig)
            plt.close(mine)


def test_advice_names_the_engine(to_engine):
    a = plotwise.advise(to_engine(grunfeld(), "duckdb"), "compare", x="firm", y="invest")
    assert a.engine == "DuckDB"
    assert any(n.startswith("DuckDB computed, over all 220 rows") for n in a.notes)
    assert "DuckDB computed counts" in " ".join(a.fields["invest"].evidence)
    assert "DuckDB computes one row per group" in a.code(0)


@pytest.mark.filterwarnings("ignore:Sending large graph")  # the test ships its frame to Dask
@pytest.mark.parametrize("engine", ["duckdb", "dask"])
def test_large_engine_data_is_sampled_and_counted_in_the_engine(engine, to_engine):
    """Above the profile sample size, the sample drives the levels and points, while counts,
    totals and bins stay exact (checked against pandas on the same 300,000 rows, generated by
    numpy's seeded generator)."""
    rng = np.random.default_rng(7)
    n = 300_000
    df = pd.DataFrame({"group": rng.choice(list("abcdefgh"), n, p=[.3, .2, .15, .1, .1, .08, .05, .02]),
                       "amount": rng.lognormal(3, 1, n)})
    df.loc[rng.choice(n, 1000, replace=False), "amount"] = np.nan
    base = plotwise.advise(df, "compare", x="group", y="amount")
    other = plotwise.advise(to_engine(df, engine), "compare", x="group", y="amount")
    assert other.profile.sample_rows == 200_000
    assert other.fields["amount"].missing == 1000
    assert other.fields["group"].distinct == 8
    assert other.fields["amount"].mean == pytest.approx(df["amount"].mean(), rel=1e-12)
    assert other.fields["amount"].skew == pytest.approx(df["amount"].skew(), rel=1e-9)
    bar = other.design("bar")
    assert f"{other.engine} computed the totals of all 299,000 rows" == bar.options.note
    f1, f2 = plt.figure(), plt.figure()
    try:
        base.draw(base.design("bar"), ax=f1.subplots())
        other.draw(bar, ax=f2.subplots())
        np.testing.assert_allclose(drawn_numbers(f2), drawn_numbers(f1), rtol=1e-9)
    finally:
        plt.close(f1)
        plt.close(f2)
    box = other.design("box")
    assert box.options.engine_sample == 20_000
    assert "sampled" in [h.code for h in box.hazards]


def test_engine_histogram_counts_every_row(to_engine):
    """Bin counts from the engine add up to the complete rows and match numpy.histogram on the
    same edges (numpy is the reference)."""
    rng = np.random.default_rng(3)
    df = pd.DataFrame({"x": rng.normal(10, 2, 5000)})
    a = plotwise.advise(to_engine(df, "polars-lazy"), "distribution", x="x")
    h = a.design("histogram")
    lo, width, k, log = h.options.edges
    fig = plt.figure()
    try:
        a.draw(h, ax=fig.subplots())
        step = [p for p in fig.axes[0].patches][0]
        counts = step.get_data().values
    finally:
        plt.close(fig)
    edges = np.linspace(lo, lo + width * k, k + 1)
    # The edges are rounded to 12 digits, so the extreme values may fall a hair outside them;
    # plotwise counts those in the end bins.
    want, _ = np.histogram(np.clip(df["x"], edges[0], edges[-1]), bins=edges)
    assert counts.sum() == 5000
    np.testing.assert_array_equal(counts, want)


@pytest.mark.parametrize("bad, message", [
    ("no/such/file.parquet", "no file at"),
    ("README.md", "plotwise reads Parquet"),
    (object(), "cannot read a builtins.object"),
])
def test_unreadable_inputs_are_clear_errors(bad, message):
    with pytest.raises(plotwise.PlotwiseError, match=message):
        plotwise.advise(bad, "compare")


def test_broken_parquet_file_is_a_clear_error(tmp_path):
    p = tmp_path / "broken.parquet"
    p.write_bytes(b"not a parquet file at all")
    with pytest.raises(plotwise.PlotwiseError, match="could not read 'broken.parquet' as Parquet"):
        plotwise.advise(str(p), "compare")


def test_unknown_column_in_engine_data(to_engine):
    with pytest.raises(plotwise.PlotwiseError, match="nope"):
        plotwise.advise(to_engine(grunfeld(), "polars"), "compare", x="nope", y="invest")


def test_engine_data_is_not_changed(to_engine):
    import polars as pl

    df = pl.from_pandas(grunfeld())
    before = df.clone()
    plotwise.advise(df, "compare", x="firm", y="invest").show()
    assert df.equals(before)


def test_cli_writes_a_self_contained_page(tmp_path, capsys):
    import re
    import subprocess
    import sys

    from plotwise.cli import main

    data = tmp_path / "grunfeld.parquet"
    grunfeld().to_parquet(data)
    out = tmp_path / "pages" / "advice.html"
    argv = ["advise", str(data), "--task", "compare", "--x", "firm", "--y", "invest", "--out", str(out)]
    assert main(argv) == 0
    assert "wrote" in capsys.readouterr().out
    page = out.read_text(encoding="utf-8")
    assert page.startswith("<!DOCTYPE html>") and page.rstrip().endswith("</html>")
    assert len(re.findall(r"src='data:image/png;base64,", page)) == 1
    assert "<script" not in page and not re.search(r"(src|href)=['\"]https?:", page)
    for part in ("Hazards", "All candidate designs", "DuckDB computed", "skewed",
                 "duckdb.read_parquet", "heuristic"):
        assert part in page, part
    # Errors: exit 2 and one readable line.
    assert main(["advise", str(data), "--x", "nope", "--out", str(out)]) == 2
    assert "no column named 'nope'" in capsys.readouterr().err
    assert main(["advise", str(tmp_path / "absent.parquet"), "--out", str(out)]) == 2
    assert "no file at" in capsys.readouterr().err
    bad = tmp_path / "notes.txt"
    bad.write_text("hello")
    assert main(["advise", str(bad), "--out", str(out)]) == 2
    assert "plotwise reads Parquet" in capsys.readouterr().err
    # The installed entry point (python -m plotwise) does the same.
    csv = tmp_path / "grunfeld.csv"
    grunfeld().to_csv(csv, index=False)
    run = subprocess.run([sys.executable, "-m", "plotwise", "advise", str(csv), "--task", "trend",
                          "--out", str(tmp_path / "trend.html")], capture_output=True, text=True,
                         timeout=300)
    assert run.returncode == 0, run.stderr
    assert (tmp_path / "trend.html").stat().st_size > 10_000


BIG_ROWS = 30_000_000
MEMORY_BOUND_MB = 800  # generous: measured ~470 MB on the 2-core CI machine


@pytest.fixture(scope="session")
def big_parquet(tmp_path_factory):
    """A generated Parquet file of 30 million rows, written in chunks once per run."""
    import sys
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parents[2] / "benchmarks"))
    from bigfile import write_parquet

    return write_parquet(tmp_path_factory.mktemp("big") / "big.parquet", BIG_ROWS)


def test_file_larger_than_the_memory_bound_is_advised_through_duckdb(big_parquet):
    """Advice and drawing on a 30-million-row file in a fresh process: peak resident memory
    stays under MEMORY_BOUND_MB although the data alone, loaded as Arrow columns, would take
    more than that (as pandas, with text as Python strings, several times more)."""
    import json
    import subprocess
    import sys

    import pyarrow.parquet as pq

    meta = pq.ParquetFile(big_parquet).metadata
    assert meta.num_rows == BIG_ROWS
    # Arrow in memory: three float64 columns, date32 days, int32 dictionary codes = 32 B a row.
    loaded_mb = BIG_ROWS * (3 * 8 + 4 + 4) / 2 ** 20
    assert loaded_mb > MEMORY_BOUND_MB
    script = (
        "import io, json, sys\n"
        "import plotwise\n"
        "a = plotwise.advise(sys.argv[1], 'compare', x='region', y='amount')\n"
        "fig = a.show(); fig.savefig(io.BytesIO(), format='png')\n"
        "bar = a.design('bar')\n"
        # VmHWM: this address space's peak (ru_maxrss can carry the parent's peak over exec).
        "hwm = [ln for ln in open('/proc/self/status') if ln.startswith('VmHWM')][0]\n"
        "print(json.dumps({'peak_mb': int(hwm.split()[1]) / 1024,\n"
        "  'rows': a.profile.rows, 'engine': a.engine, 'note': bar.options.note,\n"
        "  'missing': a.fields['amount'].missing, 'labels': len(a.fields['region'].labels)}))\n")
    run = subprocess.run([sys.executable, "-c", script, str(big_parquet)], capture_output=True,
                         text=True, timeout=600, env={**__import__("os").environ, "MPLBACKEND": "Agg"})
    assert run.returncode == 0, run.stderr[-2000:]
    out = json.loads(run.stdout.strip().splitlines()[-1])
    print(f"\n30M-row Parquet through DuckDB: peak resident memory {out['peak_mb']:.0f} MB "
          f"(bound {MEMORY_BOUND_MB} MB; Arrow columns alone {loaded_mb:.0f} MB)")
    assert out["engine"] == "DuckDB" and out["rows"] == BIG_ROWS
    assert out["labels"] == 12 and out["missing"] == 0
    assert out["note"] == f"DuckDB computed the totals of all {BIG_ROWS:,} rows"
    assert out["peak_mb"] < MEMORY_BOUND_MB


def test_engine_histogram_follows_a_chosen_bin_count(to_engine):
    """The panel's bins slider sets a whole number of bins; the engine counts into that many
    equal bins over the same range."""
    from dataclasses import replace

    df = iris()
    a = plotwise.advise(to_engine(df, "duckdb"), "distribution", x="sepal width (cm)")
    h = a.design("histogram")
    lo, width, k, _ = h.options.edges
    h7 = replace(h, options=replace(h.options, bins=7))
    fig = plt.figure()
    try:
        a.draw(h7, ax=fig.subplots())
        data = fig.axes[0].patches[0].get_data()
    finally:
        plt.close(fig)
    v = np.clip(df["sepal width (cm)"], lo, lo + width * k)  # rounded edges: see above
    want, edges = np.histogram(v, bins=7, range=(lo, lo + width * k))
    np.testing.assert_allclose(data.edges, edges)
    np.testing.assert_array_equal(data.values, want)


def test_spark_awkward_column_names(spark):
    """Spaces and quotes in Spark column names work; a dot (a struct path to Spark) is refused
    with a way out."""
    rng = np.random.default_rng(0)
    pdf = pd.DataFrame({"x y": rng.choice(list("abc"), 200), "it's": rng.normal(size=200)})
    a = plotwise.advise(spark.createDataFrame(pdf), "compare", x="x y", y="it's")
    b = plotwise.advise(pdf, "compare", x="x y", y="it's")
    assert signature(a) == signature(b) and a.hazard_codes() == b.hazard_codes()
    with pytest.raises(plotwise.PlotwiseError, match="rename them first"):
        plotwise.advise(spark.createDataFrame(pd.DataFrame({"a.b": [1.0, 2.0]})), "distribution")


def test_wide_engine_table_gets_a_smaller_profile_sample(to_engine):
    """Above THRESHOLDS['engine_sample_cells'] the profile sample shrinks so that all columns of
    a wide table fit the budget; counts stay exact."""
    from plotwise.engine.rules import THRESHOLDS

    rng = np.random.default_rng(5)
    n, width = 60_000, 400
    df = pd.DataFrame(rng.normal(size=(n, width)), columns=[f"c{i}" for i in range(width)])
    a = plotwise.advise(to_engine(df, "duckdb"), "distribution", x="c0")
    expected = max(THRESHOLDS["draw_sample"], THRESHOLDS["engine_sample_cells"] // width)
    assert a.profile.sample_rows == expected < n
    assert a.profile.rows == n and a.fields["c7"].mean == pytest.approx(df["c7"].mean(), abs=1e-12)


@pytest.mark.parametrize("name", ["a\x00b", "*", "^v.*$"])
def test_names_an_engine_would_misread_are_refused(name):
    # A NUL panics inside Polars' conversion; '*' and '^…$' are a wildcard and a regular
    # expression in Polars' column selection (several columns instead of one).
    import polars as pl

    df = pd.DataFrame({"g": list("abc") * 5, name: np.arange(15.0)})
    for data in (pl.from_pandas(df), duckdb_relation(df)):
        with pytest.raises(plotwise.PlotwiseError, match="rename them first"):
            plotwise.advise(data, "compare", x="g", y=name)
    plotwise.advise(df, "compare", x="g", y=name)  # pandas reads them as plain names


def duckdb_relation(df):
    import duckdb

    return duckdb.from_df(df)


def test_duplicate_column_names_in_an_arrow_table_are_refused():
    # A PyArrow Table may hold two columns of one name; narwhals then raised its own
    # DuplicateError (a traceback) where plotwise's check should have spoken.
    import pyarrow as pa

    t = pa.Table.from_arrays([pa.array(["x", "y", "z"] * 20), pa.array(range(60))],
                             names=["a", "a"])
    with pytest.raises(plotwise.PlotwiseError, match=r"duplicate column names \['a'\]"):
        plotwise.advise(t, "compare")


def test_dotted_column_names_group_in_duckdb(to_engine):
    """Names with dots, as R writes them (Sepal.Length), on Fisher's iris from scikit-learn:
    narwhals' DuckDB group_by reads 'Iris.Species' as table.column, so plotwise groups under a
    plain name and renames back; the bars equal pandas' own, and the printed code runs."""
    df = iris().rename(columns=lambda c: c.replace(" (cm)", "").title().replace(" ", "."))
    df = df.rename(columns={"Species": "Iris.Species"})
    base = plotwise.advise(df, "compare", x="Iris.Species", y="Sepal.Length")
    rel = to_engine(df, "duckdb")
    other = plotwise.advise(rel, "compare", x="Iris.Species", y="Sepal.Length")
    assert signature(other) == signature(base)
    figs = [plt.figure() for _ in range(2)]
    try:
        base.draw(base.design("bar"), ax=figs[0].subplots())
        other.draw(other.design("bar"), ax=figs[1].subplots())
        ns = {"df": rel, "plt": plt}
        exec(other.code("bar").replace("plt.show()", ""), ns)  # noqa: S102
        figs.append(ns["fig"])
        np.testing.assert_allclose(drawn_numbers(figs[1]), drawn_numbers(figs[0]), rtol=1e-9)
        np.testing.assert_allclose(drawn_numbers(figs[2]), drawn_numbers(figs[0]), rtol=1e-9)
    finally:
        for f in figs:
            plt.close(f)


def test_one_row_per_group_is_noted_as_values(to_engine):
    """vega_datasets' stocks (one price per symbol and month, shipped with the package): the
    line draws each price as it is, and the engine's panel note says values, not totals."""
    from vega_datasets import data as vega

    df = vega.stocks()
    a = plotwise.advise(to_engine(df, "duckdb"), "trend", x="date", y="price", hue="symbol")
    line = a.design("line")
    assert line.stat == "value"
    assert line.options.note == f"all {len(df):,} values, one per group, fetched from DuckDB"
