"""How often plotwise reads engine data: counted by DuckDB itself. The tests open their own
DuckDB connection with its query log on (DuckDB's `QueryLog`), hand plotwise a relation on a
Parquet file of that connection, and count the statements that read the file.

The frame is generated (seeded numpy): it only has to be larger than the profile sample, so that
the sampled path is the one counted."""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import pytest

import plotwise
from plotwise.engine.rules import THRESHOLDS

duckdb = pytest.importorskip("duckdb")

ROWS = THRESHOLDS["profile_sample"] + 50_000
QUESTIONS = [("compare", "region", "amount"), ("trend", "day", "amount"),
             ("proportion", "region", "amount"), ("correlate", "amount", "score"),
             ("distribution", "amount", None)]


@pytest.fixture(scope="module")
def logged(tmp_path_factory):
    """A DuckDB connection logging every query, and a relation on a Parquet file of ROWS rows."""
    rng = np.random.default_rng(11)
    amount = rng.lognormal(3, 0.8, ROWS)
    df = pd.DataFrame({
        "region": rng.choice([f"region {c}" for c in "ABCDEFGH"], ROWS),
        "day": np.datetime64("2024-01-01") + rng.integers(0, 365, ROWS).astype("timedelta64[D]"),
        "amount": amount,
        "score": 2 * np.log(amount) + rng.normal(0, 1, ROWS),
        "units": rng.integers(1, 6, ROWS),
    })
    path = tmp_path_factory.mktemp("passes") / "sales.parquet"
    df.to_parquet(path)
    con = duckdb.connect()
    con.execute("SET enable_progress_bar = false")
    con.execute("CALL enable_logging('QueryLog')")
    return con, con.read_parquet(str(path))


def reads(con, since: int) -> tuple[int, list[str]]:
    """(statements logged so far, the statements after ``since`` that read the data). A view
    that ``relation.query`` makes and drops reads nothing; ``SELECT count()`` of a Parquet file
    is answered from the file's footer (DuckDB reads no rows for it)."""
    log = [m for (m,) in con.execute(
        "SELECT message FROM duckdb_logs WHERE type = 'QueryLog' ORDER BY timestamp").fetchall()]
    data = [m for m in log[since:]
            if "parquet_scan" in m and not re.match(r"\s*(CREATE|DROP)\b", m)
            and not re.match(r'\s*SELECT count\(\) AS "len" FROM parquet_scan\([^)]*\) AS "\w+" '
                             r"GROUP BY ALL\s*$", m)]
    return len(log), data


@pytest.mark.parametrize("task,x,y", QUESTIONS)
def test_advice_reads_engine_data_at_most_three_times(logged, task, x, y):
    """One pass for the seeded sample, one for every column's counts, moments and labels, and
    at most one for the designs' group statistics — whatever the task."""
    con, rel = logged
    start, _ = reads(con, 0)
    a = plotwise.advise(rel, task, x=x, y=y)
    done, data = reads(con, start)
    assert a.profile.sample_rows == THRESHOLDS["profile_sample"]
    assert len(data) <= 3, "\n\n".join(data)
    # the profile's labels came from the engine: all eight regions, exact
    assert sorted(a.fields["region"].labels) == [f"region {c}" for c in "ABCDEFGH"]
    fig = a.show()
    try:
        _, drawn = reads(con, done)
    finally:
        import matplotlib.pyplot as plt

        plt.close(fig)
    # the three designs shown ask each distinct query once
    assert len(drawn) == len(set(drawn)), "\n\n".join(drawn)


def test_designs_that_ask_the_same_question_read_the_data_once(logged):
    """Bar, dot and lollipop of one comparison draw the same group totals: one engine query
    for the three, and drawing them again asks none."""
    import matplotlib.pyplot as plt

    con, rel = logged
    a = plotwise.advise(rel, "compare", x="region", y="amount")
    designs = [a.design(k) for k in ("bar", "dot", "lollipop")]
    counts = []
    for _ in range(2):
        start, _ = reads(con, 0)
        fig = plt.figure()
        try:
            for d, ax in zip(designs, fig.subplots(1, 3)):
                a.draw(d, ax=ax)
        finally:
            plt.close(fig)
        counts.append(len(reads(con, start)[1]))
    assert counts == [1, 0]


@pytest.fixture
def dask_computes(monkeypatch):
    """Count every dask.compute (a collection's .compute() and len() go through it too)."""
    base = pytest.importorskip("dask.base")
    import dask

    calls = []
    real = base.compute

    def counting(*args, **kwargs):
        calls.append(len(args))
        return real(*args, **kwargs)

    monkeypatch.setattr(base, "compute", counting)
    monkeypatch.setattr(dask, "compute", counting)
    return calls


@pytest.mark.filterwarnings("ignore:Sending large graph")
@pytest.mark.parametrize("task,x,y", QUESTIONS)
def test_dask_profile_takes_two_computes_and_the_shown_designs_one(logged, dask_computes,
                                                                   task, x, y):
    """Every Dask query rereads the data: the profile's counts, moments and labels share one
    compute, the seeded sample takes a second, the designs' group statistics a third, and the
    three designs shown are computed together."""
    import dask.dataframe as dd
    import matplotlib.pyplot as plt

    con, rel = logged
    df = rel.df()
    ddf = dd.from_pandas(df, npartitions=3)
    a = plotwise.advise(ddf, task, x=x, y=y)
    assert len(dask_computes) <= 3
    # exact, although every partition reported its own: pandas on the whole frame agrees
    col = y or x
    assert a.fields[col].mean == pytest.approx(df[col].mean(), rel=1e-12)
    assert a.fields[col].std == pytest.approx(df[col].std(), rel=1e-10)
    assert a.fields[col].skew == pytest.approx(df[col].skew(), rel=1e-8)
    assert a.fields["units"].distinct == 5
    assert sorted(a.fields["region"].labels) == [f"region {c}" for c in "ABCDEFGH"]
    dask_computes.clear()
    fig = a.show()
    plt.close(fig)
    assert len(dask_computes) == 1


def test_kept_answers_are_bounded(logged):
    """A long panel session asks many questions; the Source keeps only the latest answers, and
    asking a kept one again reads nothing."""
    from plotwise.sources.base import KEPT_ANSWERS, open_source

    con, rel = logged
    src = open_source(rel)
    exprs = [f'nw.from_native(df).lazy().select(nw.len()).collect("pandas").to_native().iloc[0, 0] + {i}'
             for i in range(KEPT_ANSWERS + 5)]
    for e in exprs:
        src.run(e)
    assert list(src.answers) == exprs[-KEPT_ANSWERS:]
    start, _ = reads(con, 0)
    total, _ = reads(con, start)
    assert src.run(exprs[-1]) == ROWS + KEPT_ANSWERS + 4
    assert reads(con, 0)[0] == total + 1  # only this check's own log query


def test_panel_notes_stay_inside_the_figure(logged):
    """A sampled hexbin's note beside its colour bar is long ("random sample of about 100,000
    of 20,000,000 rows, drawn by DuckDB"): each panel's note lies inside its panel."""
    import matplotlib.pyplot as plt
    from matplotlib.text import Text

    _, rel = logged
    a = plotwise.advise(rel, "correlate", x="amount", y="score")
    for d in a.shown():  # the note as a 20-million-row file has it
        d.options.note = d.options.note.replace(f"{ROWS:,}", "20,000,000")
    fig = a.show()
    try:
        from matplotlib.backends.backend_agg import FigureCanvasAgg

        canvas = FigureCanvasAgg(fig)
        canvas.draw()
        renderer = canvas.get_renderer()
        notes = [t for t in fig.findobj(Text) if "drawn by DuckDB" in t.get_text()]
        assert notes
        for t in notes:  # inside its own panel (a subfigure), not over the next one
            e, box = t.get_window_extent(renderer), t.get_figure(root=False).bbox
            assert e.x0 >= box.x0 - 1 and e.x1 <= box.x1 + 1, t.get_text()
    finally:
        plt.close(fig)
