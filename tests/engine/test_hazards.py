"""Each hazard fires on a frame that has it and stays quiet on a near-identical one that does not."""

import numpy as np
import pandas as pd
import pytest

import plotwise
from plotwise.engine.conditions import lie_factor


def codes(advice, kind=None):
    if kind is None:
        return set(advice.hazard_codes())
    d = next(d for d in advice.designs if d.kind == kind and d.facet is None)
    return {h.code for h in d.hazards}


def test_lie_factor_tufte_worked_example():
    # Tufte (1983): data 18 -> 27.5 (+53%), drawn 0.6 -> 5.3 (+783%), Lie Factor 14.8.
    assert lie_factor(18, 27.5, 0.6, 5.3) == pytest.approx(14.8, abs=0.05)
    assert lie_factor(10, 20, 1, 2) == pytest.approx(1.0)


SALES = pd.DataFrame({"shop": ["A", "B", "C", "D"], "sales": [91.0, 94.0, 97.0, 99.0]})


def test_truncated_baseline():
    bad = plotwise.advise(SALES, "compare", value_range=(90, 100))
    ok = plotwise.advise(SALES, "compare", value_range=(0, 100))
    h = [h for h in bad.design("bar").hazards if h.code == "truncated-baseline"]
    assert h and h[0].severity == "severe"
    # bars would grow from 1 to 9 (+800%) while data grow 91 -> 99 (+8.8%): LF = 8 / 0.0879
    assert "Lie Factor of 91.0" in h[0].message
    assert "truncated-baseline" not in codes(ok, "bar")
    # A dot plot may start elsewhere.
    assert "truncated-baseline" not in codes(bad, "dot")


def _groups(n_groups, n=400, seed=1):
    rng = np.random.default_rng(seed)
    return pd.DataFrame({
        "x": rng.normal(size=n), "y": rng.normal(size=n),
        "g": np.array([f"group {i}" for i in range(n_groups)])[rng.integers(0, n_groups, n)],
    })


def test_too_many_colors():
    nine = plotwise.advise(_groups(9), "correlate", x="x", y="y", hue="g")
    assert "too-many-colors" in codes(nine, "scatter")
    severe = plotwise.advise(_groups(12), "correlate", x="x", y="y", hue="g")
    scatter = next(d for d in severe.designs if d.kind == "scatter" and d.hue == "g")
    assert [h.severity for h in scatter.hazards if h.code == "too-many-colors"] == ["severe"]
    # The small-multiples version of the same chart has no such hazard and ranks above it.
    facets = next(d for d in severe.designs if d.kind == "scatter" and d.facet == "g")
    assert not [h for h in facets.hazards if h.code == "too-many-colors"]
    assert severe.designs.index(facets) < severe.designs.index(scatter)
    six = plotwise.advise(_groups(6), "correlate", x="x", y="y", hue="g")
    assert "too-many-colors" not in codes(six, "scatter")


def test_too_many_slices():
    many = pd.DataFrame({"part": list("ABCDEFG"), "v": [30, 20, 15, 12, 10, 8, 5]})
    few = pd.DataFrame({"part": list("ABCD"), "v": [40, 30, 20, 10]})
    sliver = pd.DataFrame({"part": list("ABCD"), "v": [50, 30, 18, 2]})
    assert "too-many-slices" in codes(plotwise.advise(many, "proportion"), "pie")
    assert "too-many-slices" not in codes(plotwise.advise(few, "proportion"), "pie")
    h = plotwise.advise(sliver, "proportion").design("pie").hazards
    assert any(x.code == "too-many-slices" and "2.0%" in x.message for x in h)


def test_not_a_whole():
    # Shares that add to 130 (several answers allowed) are not parts of one whole.
    multi = pd.DataFrame({"reason": list("ABCD"), "share_pct": [50.0, 40.0, 25.0, 15.0]})
    whole = pd.DataFrame({"reason": list("ABCD"), "share_pct": [40.0, 30.0, 20.0, 10.0]})
    rounded = pd.DataFrame({"reason": list("ABCD"), "share_pct": [40.4, 30.3, 20.2, 10.3]})  # 101.2
    assert "not-a-whole" in codes(plotwise.advise(multi, "proportion"))
    assert "not-a-whole" not in codes(plotwise.advise(whole, "proportion"))
    assert "not-a-whole" not in codes(plotwise.advise(rounded, "proportion"))
    signed = pd.DataFrame({"unit": list("ABCD"), "profit": [40.0, -30.0, 20.0, 10.0]})
    a = plotwise.advise(signed, "proportion")
    assert "not-a-whole" in codes(a)
    assert not a.design("pie").expressive


def test_line_over_categories():
    df = pd.DataFrame({"stage": ["draft", "review", "final"] * 4, "hours": np.arange(12.0)})
    ordered = df.assign(stage=pd.Categorical(df["stage"], ["draft", "review", "final"], ordered=True))
    bad = plotwise.advise(df, "trend", x="stage", y="hours")
    assert "line-over-categories" in codes(bad)
    assert not bad.design("line").expressive
    good = plotwise.advise(ordered, "trend", x="stage", y="hours")
    assert "line-over-categories" not in codes(good)
    assert good.design("line").expressive
    # A quantity is never a time axis; with no task stated, unordered labels get no trend.
    with pytest.raises(plotwise.PlotwiseError, match="not time"):
        plotwise.advise(df, "trend", x="hours")
    assert "trend" not in {d.task for d in plotwise.advise(df, x="stage", y="hours").designs}


def test_overplotting():
    rng = np.random.default_rng(3)
    dense = pd.DataFrame({"a": rng.normal(size=6000), "b": rng.normal(size=6000)})
    sparse = dense.iloc[:150]
    a = plotwise.advise(dense, "correlate")
    assert "overplotting" in codes(a, "scatter")
    order = a.designs.index
    assert a.designs[0].kind == "hexbin" or order(a.design("hexbin")) < order(a.design("scatter"))
    assert "overplotting" not in codes(plotwise.advise(sparse, "correlate"), "scatter")


def test_skewed():
    rng = np.random.default_rng(4)
    skewed = pd.DataFrame({"income": rng.lognormal(10, 1.2, 800)})
    symmetric = pd.DataFrame({"income": rng.normal(50000, 8000, 800)})
    a = plotwise.advise(skewed, "distribution")
    assert "skewed" in codes(a)
    assert a.designs[0].log_scale
    assert "skewed" not in codes(plotwise.advise(symmetric, "distribution"))


def test_uneven_intervals():
    dates = pd.to_datetime(["2024-01-01", "2024-02-01", "2024-03-01", "2024-06-01", "2024-07-01",
                            "2024-12-01"])
    even = pd.date_range("2024-01-01", periods=6, freq="MS")
    bad = plotwise.advise(pd.DataFrame({"month": dates, "v": [3.0, 4, 5, 4, 6, 7]}), "trend")
    good = plotwise.advise(pd.DataFrame({"month": even, "v": [3.0, 4, 5, 4, 6, 7]}), "trend")
    assert [h.severity for h in bad.design("bar").hazards if h.code == "uneven-intervals"] == ["warn"]
    assert "uneven-intervals" not in codes(good, "bar")


def test_hidden_spread():
    rng = np.random.default_rng(5)
    n = 300
    g = np.repeat(["A", "B", "C"], n)
    overlap = pd.DataFrame({"g": g, "score": rng.normal(50, 10, 3 * n) + np.repeat([0, 2, 3], n)})
    apart = pd.DataFrame({"g": g, "score": rng.normal(50, 10, 3 * n) + np.repeat([0, 20, 40], n)})
    assert "hidden-spread" in codes(plotwise.advise(overlap, "compare", y="score"), "bar")
    assert "hidden-spread" not in codes(plotwise.advise(apart, "compare", y="score"), "bar")


def test_few_points():
    rng = np.random.default_rng(6)
    few = pd.DataFrame({"v": rng.normal(size=12)})
    many = pd.DataFrame({"v": rng.normal(size=200)})
    assert "few-points" in codes(plotwise.advise(few, "distribution"), "density")
    assert "few-points" not in codes(plotwise.advise(many, "distribution"), "density")


def test_missing_values():
    df = pd.DataFrame({"shop": list("ABCDEFGHIJ") * 2, "sales": np.arange(20.0)})
    holes = df.copy()
    holes.loc[[1, 5, 9], "sales"] = np.nan
    a = plotwise.advise(holes, "compare", y="sales")
    h = [h for h in a.hazards if h.code == "missing-values"]
    assert h and "3 of 20 rows" in h[0].message and h[0].severity == "warn"
    assert "missing-values" not in codes(plotwise.advise(df, "compare", y="sales"))


def test_every_registered_code_is_documented():
    readme = open("README.md", encoding="utf-8").read()
    for code in plotwise.hazard_codes():
        assert f"`{code}`" in readme, code


def test_skewed_with_zeros():
    # statsmodels' Fair (1978) affairs data: 'affairs' is 0 for about two thirds of the women
    # and highly skewed (sample skewness about 8.8, checked with pandas); |skewness| > 1 is
    # "highly skewed" (Bulmer 1979, from memory). A log axis would drop the zeros.
    import statsmodels.api as sm

    fair = sm.datasets.fair.load_pandas().data
    assert fair["affairs"].skew() > 1 and (fair["affairs"] == 0).mean() > 0.5
    found = [h for h in plotwise.advise(fair, "distribution", x="affairs").hazards
             if h.code == "skewed"]
    assert found and "are 0" in found[0].message and "log1p" in found[0].fix
    # Near-twin: years married is only moderately skewed (about 0.7) and has no zeros.
    assert fair["yrs_married"].skew() < 1
    calm = plotwise.advise(fair, "distribution", x="yrs_married")
    assert "skewed" not in {h.code for h in calm.hazards}
