"""The main job on open data: sensible top designs for each task, reasons with numbers, and
hazards, checked on datasets shipped inside statsmodels and scikit-learn."""

import matplotlib as mpl
import numpy as np
import pandas as pd
import pytest
from open_data import grunfeld, iris, kind_cases

import plotwise
from plotwise import KINDS, TASKS, PlotwiseError


def top(advice, n=3):
    return [d.kind for d in advice.designs[:n]]


def test_dozen_unordered_categories_compare():
    # Grunfeld (1958) data in statsmodels: investment of 11 firms. A quantity across a dozen
    # unordered categories: bar or dot first, no pie in the top three.
    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest")
    assert a.designs[0].kind in ("bar", "dot")
    assert "pie" not in top(a)
    pie = a.design("pie")
    assert any("slices" in r or "shares of one whole" in r for r in pie.reasons)
    assert {h.code for h in pie.hazards} >= {"too-many-slices"}


def test_long_regular_series_trend_line_first():
    # statsmodels' sunspots: yearly sunspot activity 1700-2008, a long regular series.
    import statsmodels.api as sm

    s = sm.datasets.sunspots.load_pandas().data
    a = plotwise.advise(s, "trend")
    assert a.designs[0].kind == "line"
    assert a.designs[0].x == "YEAR" and a.designs[0].y == "SUNACTIVITY"
    assert a.fields["YEAR"].level == "temporal"


def test_weekly_co2_with_missing_weeks():
    # statsmodels' co2 (weekly, with gaps): line first; missing weeks reported and the line breaks.
    import statsmodels.api as sm

    c = sm.datasets.co2.load_pandas().data.reset_index()
    a = plotwise.advise(c, "trend")
    assert a.designs[0].kind == "line"
    codes = a.hazard_codes()
    assert "missing-values" in codes
    missing = next(h for h in a.hazards if h.code == "missing-values")
    assert f"{int(c['co2'].isna().sum())} of {len(c)} rows" in missing.message
    assert a.designs[0].options.break_gaps is True


def test_two_numeric_columns_scatter_first():
    # scikit-learn's diabetes data: 442 rows, ten numeric columns.
    from sklearn.datasets import load_diabetes

    d = load_diabetes(as_frame=True).frame
    a = plotwise.advise(d, "correlate", x="bmi", y="target")
    assert a.designs[0].kind == "scatter"
    assert a.designs[0].x == "bmi" and a.designs[0].y == "target"


def test_correlate_picks_strongest_pair_and_says_why():
    # Iris (scikit-learn): petal length and petal width are the most strongly related pair
    # (Spearman ρ ≈ 0.94, computed here with scipy as the reference).
    from scipy.stats import spearmanr

    f = iris()
    a = plotwise.advise(f, "correlate")
    d = a.designs[0]
    assert {d.x, d.y} == {"petal length (cm)", "petal width (cm)"}
    rho = spearmanr(f["petal length (cm)"], f["petal width (cm)"]).statistic
    assert f"{abs(rho):.2f}" in " ".join(a.notes)
    assert d.kind == "scatter"


def test_two_time_points_per_group():
    # Grunfeld investment in 1935 and 1954 only: a quantity over two time points per firm
    # ranks slope or difference-bar in the top three, for compare and for trend.
    # The split must be asked for (hue): without it the question is the one stated, and the
    # notes say how to ask for before/after designs (common practice: answer the question asked).
    g = grunfeld()
    two = g[g["year"].isin([1935.0, 1954.0])]
    for task, x, hue in (("compare", "firm", "year"), ("trend", "year", "firm")):
        a = plotwise.advise(two, task, x=x, y="invest", hue=hue)
        assert {"slope", "difference-bar"} & set(top(a)), (task, top(a))
    plain = plotwise.advise(two, "compare", x="firm", y="invest")
    assert not {"slope", "difference-bar"} & set(top(plain))
    assert any("hue='year'" in n for n in plain.notes)


def test_distribution_of_iris_petals():
    a = plotwise.advise(iris(), "distribution", x="petal length (cm)")
    assert a.designs[0].kind == "histogram"
    assert any("Freedman–Diaconis" in r or "Sturges" in r for r in a.designs[0].reasons)


def test_many_series_get_small_multiples():
    # 11 firms over 20 years: too many colours for one chart; small multiples come first.
    a = plotwise.advise(grunfeld(), "trend", x="year", y="invest", hue="firm")
    assert a.designs[0].facet == "firm"
    line = next(d for d in a.designs if d.kind == "line" and d.hue == "firm")
    assert any(h.code == "too-many-colors" and h.severity == "severe" for h in line.hazards)


def test_reasons_carry_numbers_and_sources():
    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest")
    for d in a.designs:
        text = " ".join(d.reasons)
        assert "Mackinlay 1986" in text
        assert f"{d.score:.2f}" in text
        assert 0.0 <= d.score <= 1.0
    scores = [d.score for d in a.designs if d.expressive]
    assert scores == sorted(scores, reverse=True)


def test_inexpressive_designs_kept_last():
    # A line joining unordered firms states an order that is not there (Mackinlay 1986).
    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest")
    line = a.design("line")
    assert not line.expressive
    assert a.designs.index(line) > max(a.designs.index(d) for d in a.designs if d.expressive)
    assert any("order" in r for r in line.reasons)


def test_no_task_ranks_across_tasks():
    a = plotwise.advise(iris())
    tasks = {d.task for d in a.designs}
    assert {"compare", "correlate", "distribution"} <= tasks
    assert a.task is None
    assert all(d.task in TASKS for d in a.designs)


def test_interval_measure_gets_no_bars():
    # Temperatures in Celsius have an arbitrary zero: bar length means nothing (Mackinlay's
    # expressiveness); the dot plot wins.
    df = pd.DataFrame({"city": list("ABCDEFGH"), "temp_c": [12.5, 14.0, 9.5, 11.0, 13.2, 10.1, 8.7, 15.3]})
    a = plotwise.advise(df, "compare")
    assert a.designs[0].kind == "dot"
    assert not a.design("bar").expressive


def test_all_kinds_reachable():
    seen = set()
    for df, kw in kind_cases():
        seen |= {d.kind for d in plotwise.advise(df, **kw).designs}
    assert seen == set(KINDS)


def test_frame_and_style_untouched():
    g = grunfeld()
    before = g.copy(deep=True)
    rc = dict(mpl.rcParams)
    a = plotwise.advise(g, "trend", x="year", y="invest", hue="firm")
    fig = a.show()
    assert len(fig.subfigs) == 3
    pd.testing.assert_frame_equal(g, before)
    assert dict(mpl.rcParams) == rc


@pytest.mark.parametrize("kwargs,words", [
    (dict(task="explain"), "unknown task"),
    (dict(task="compare", x="nope"), "no column named 'nope'"),
    (dict(task="trend", x="year", y="firm"), "y must be a numeric measure"),
    (dict(task="trend", x="firm", y="firm"), "both name the column"),
    (dict(task="compare", agg="total"), "unknown agg"),
    (dict(task="compare", value_range=(5,)), "value_range"),
])
def test_bad_arguments(kwargs, words):
    with pytest.raises(PlotwiseError, match=words):
        plotwise.advise(grunfeld(), **kwargs)


def test_nothing_the_task_can_use():
    only_numbers = pd.DataFrame({"a": np.arange(10.0), "b": np.arange(10.0) ** 2})
    with pytest.raises(PlotwiseError, match="category column"):
        plotwise.advise(only_numbers, "compare")
    with pytest.raises(PlotwiseError, match="time column"):
        plotwise.advise(only_numbers, "trend")
    only_text = pd.DataFrame({"id": [f"row{i}" for i in range(100)]})
    with pytest.raises(PlotwiseError, match="no task fits"):
        plotwise.advise(only_text)
    assert issubclass(PlotwiseError, ValueError)


def test_median_headline_reports_medians_not_totals():
    """With agg='median' the one-sentence headline gives each group's median (checked against
    pandas on Grunfeld 1958); it used to report totals without saying so."""
    g = grunfeld()
    a = plotwise.advise(g, "compare", x="firm", y="invest", agg="median")
    med = g.groupby("firm")["invest"].median()
    assert a.headline.startswith(f"'{med.idxmax()}' has the highest median 'invest' ({med.max():.4g})")
    assert f"'{med.idxmin()}', the lowest ({med.min():.3g})" in a.headline
    assert a.designs[0].summary().startswith("bar chart of median of 'invest'")
