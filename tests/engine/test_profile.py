"""Field profiling: measurement levels with evidence, and the statistics the engine needs."""

import numpy as np
import pandas as pd
import pytest
from open_data import iris

from plotwise import PlotwiseError, profile_frame


def levels(df):
    return {k: f.level for k, f in profile_frame(df).fields.items()}


def test_levels_by_dtype_and_content():
    n = 60
    df = pd.DataFrame({
        "region": ["north", "south", "east"] * 20,
        "size": pd.Categorical(["S", "M", "L"] * 20, categories=["S", "M", "L"], ordered=True),
        "kind": pd.Categorical(["a", "b"] * 30),
        "rating": [1, 2, 3, 4, 5] * 12,
        "amount": np.linspace(0, 100, n),
        "balance": np.linspace(-50, 50, n),
        "when": pd.date_range("2024-01-01", periods=n, freq="D"),
        "when_text": pd.date_range("2024-01-01", periods=n, freq="D").strftime("%Y-%m-%d"),
        "year": np.repeat(np.arange(2000, 2012), 5),
        "flag": [True, False] * 30,
        "wait": pd.to_timedelta(np.arange(n), unit="min"),
        "temp_c": np.linspace(5, 30, n),
    })
    got = levels(df)
    assert got == {
        "region": "nominal", "size": "ordinal", "kind": "nominal", "rating": "ordinal",
        "amount": "quantitative", "balance": "quantitative", "when": "temporal",
        "when_text": "temporal", "year": "temporal", "flag": "nominal", "wait": "quantitative",
        "temp_c": "quantitative",
    }
    p = profile_frame(df)
    assert p["amount"].zero_meaningful is True and not p["amount"].signed
    assert p["balance"].signed is True
    assert p["temp_c"].zero_meaningful is False  # interval scale: zero is arbitrary
    assert p["size"].order == ("S", "M", "L")
    assert any("ordered Categorical" in e for e in p["size"].evidence)
    assert any("rating or rank" in e for e in p["rating"].evidence)
    assert p["when"].time_regular is True


def test_time_gaps_and_uneven_spacing():
    days = pd.date_range("2024-01-01", periods=40, freq="D")
    regular = pd.DataFrame({"t": days, "v": np.arange(40)})
    gap = regular.drop(index=range(10, 20))
    assert profile_frame(regular)["t"].time_regular is True
    f = profile_frame(gap)["t"]
    assert f.time_regular is False and f.time_gaps == 1


def test_missing_and_infinite_counted():
    df = pd.DataFrame({"x": [1.0, np.nan, np.inf, 4.0, 5.0]})
    f = profile_frame(df)["x"]
    assert f.missing == 1 and f.infinite == 1 and f.usable == 3
    assert f.maximum == 5.0


def test_discrete_integers():
    df = pd.DataFrame({"children": [0, 1, 2, 3, 1, 2, 0, 4, 2, 1] * 10})
    f = profile_frame(df)["children"]
    assert f.level == "quantitative" and f.is_discrete


def test_iris_profile():
    # Fisher's iris data shipped with scikit-learn: four positive measurements and a species
    # label with 3 values, 50 rows each (the dataset's documented layout).
    p = profile_frame(iris())
    assert p.rows == 150
    for name in ("sepal length (cm)", "sepal width (cm)", "petal length (cm)", "petal width (cm)"):
        assert p[name].level == "quantitative" and p[name].zero_meaningful is True
    assert p["species"].level == "nominal" and p["species"].distinct == 3
    assert p["petal length (cm)"].minimum == pytest.approx(1.0)
    assert p["petal length (cm)"].maximum == pytest.approx(6.9)


def test_profile_does_not_change_frame():
    df = iris()
    before = df.copy(deep=True)
    profile_frame(df)
    pd.testing.assert_frame_equal(df, before)


@pytest.mark.parametrize("bad,words", [
    (pd.DataFrame(), "no rows"),
    (pd.DataFrame({"a": []}), "no rows"),
    ([1, 2, 3], "cannot read a list"),
    (pd.DataFrame([[1, 2]], columns=pd.MultiIndex.from_tuples([("a", "b"), ("a", "c")])), "flatten"),
    (pd.DataFrame([[1, 2]], columns=["a", "a"]), "duplicate column names"),
])
def test_bad_frames(bad, words):
    with pytest.raises(PlotwiseError, match=words):
        profile_frame(bad)


def test_reasons_say_why_totals_or_averages():
    # The default statistic is explained: totals for a measure that adds up, averages for one
    # that does not (with the evidence), and the caller's agg= named as such.
    import sys
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "judgement"))
    import judgement_data as data

    import plotwise

    mpg = plotwise.advise(data.cars(), "compare", x="Origin", y="Miles_per_Gallon")
    assert any(r.startswith("averages of 'Miles_per_Gallon', not totals") for r in mpg.designs[0].reasons)
    energy = plotwise.advise(data.electricity(), "compare", x="source", y="net_generation")
    assert any(r.startswith("totals of 'net_generation': it adds up") for r in energy.designs[0].reasons)
    asked = plotwise.advise(data.cars(), "compare", x="Origin", y="Miles_per_Gallon", agg="sum")
    assert any("as asked (agg='sum')" in r for r in asked.designs[0].reasons)
