"""Property-based tests: whatever frame a user points plotwise at, the result is an Advice or a
PlotwiseError with a readable message; the frame, rcParams and open figures are untouched."""

import copy
import os

import matplotlib as mpl
import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from matplotlib.figure import Figure

import plotwise
from plotwise import PlotwiseError
from plotwise.drawing.render import draw

# 2,000 generated frames per CI run (override with PLOTWISE_EXAMPLES).
EXAMPLES = int(os.environ.get("PLOTWISE_EXAMPLES", "2000"))
COUNT = {"frames": 0, "advice": 0, "errors": 0}
MESSAGES: list[str] = []

NAN = float("nan")


def column(kind: str, n: int, rng: np.random.Generator):
    if kind == "int":
        return rng.integers(-5, 50, n)
    if kind == "float":
        v = rng.normal(0, 10, n)
        if n:
            v[rng.random(n) < 0.2] = NAN
            v[rng.random(n) < 0.05] = np.inf
            v[rng.random(n) < 0.05] = -np.inf
        return v
    if kind == "posfloat":
        return rng.lognormal(2, 1.5, n)
    if kind == "Int64":
        return pd.array([None if rng.random() < 0.2 else int(x) for x in rng.integers(0, 9, n)], dtype="Int64")
    if kind == "Float64":
        return pd.array([None if rng.random() < 0.2 else float(x) for x in rng.normal(size=n)], dtype="Float64")
    if kind == "boolean":
        return pd.array([None if rng.random() < 0.2 else bool(x) for x in rng.integers(0, 2, n)], dtype="boolean")
    if kind == "string":
        return pd.array([f"s{int(x)}" for x in rng.integers(0, 6, n)], dtype="string")
    if kind == "object_mixed":
        pool = [1, "a", None, 2.5, "b", ("t",), True]
        return pd.Series([pool[int(i)] for i in rng.integers(0, len(pool), n)], dtype=object)
    if kind == "cat":
        return pd.Categorical(rng.choice(["x", "y", "z"], n), categories=["x", "y", "z", "unused"])
    if kind == "ordcat":
        return pd.Categorical(rng.choice(["lo", "mid", "hi"], n), categories=["lo", "mid", "hi", "top"], ordered=True)
    if kind == "date":
        d = pd.Series(pd.date_range("2024-01-01", periods=n, freq="D"))
        if n:
            d[rng.random(n) < 0.2] = pd.NaT
        return d
    if kind == "datetz":
        return pd.Series(pd.date_range("2024-01-01", periods=n, freq="h", tz="Europe/Paris"))
    if kind == "timedelta":
        return pd.to_timedelta(rng.integers(0, 500, n), unit="s")
    if kind == "bool":
        return rng.integers(0, 2, n).astype(bool)
    if kind == "constant":
        return np.full(n, 3.0)
    if kind == "allmissing":
        return np.full(n, NAN)
    if kind == "highcard":
        return [f"id-{i}-{int(x)}" for i, x in enumerate(rng.integers(0, 10**6, n))]
    if kind == "datetext":
        return pd.date_range("2023-05-01", periods=n, freq="W").strftime("%Y-%m-%d")
    raise AssertionError(kind)


KINDS = ["int", "float", "posfloat", "Int64", "Float64", "boolean", "string", "object_mixed", "cat",
         "ordcat", "date", "datetz", "timedelta", "bool", "constant", "allmissing", "highcard", "datetext"]
NAMES = ["a", "b", "value", 0, 1, "<b>x</b>", "with space", "é", "x\ny", "a"]


@st.composite
def frames(draw_):
    n = draw_(st.sampled_from([0, 1, 2, 3, 8, 40]))
    ncols = draw_(st.integers(1, 4))
    kinds = draw_(st.lists(st.sampled_from(KINDS), min_size=ncols, max_size=ncols))
    unique = draw_(st.integers(0, 9)) > 0  # duplicate names now and then
    names = draw_(st.lists(st.sampled_from(NAMES), min_size=ncols, max_size=ncols, unique=unique))
    seed = draw_(st.integers(0, 2**16))
    rng = np.random.default_rng(seed)
    data = [column(k, n, rng) for k in kinds]
    df = pd.DataFrame({i: v for i, v in enumerate(data)})
    if draw_(st.booleans()) and ncols >= 2 and draw_(st.integers(0, 9)) == 0:
        df.columns = pd.MultiIndex.from_tuples([("g", str(i)) for i in range(ncols)])
    else:
        df.columns = names
    return df


def roles(draw_, df):
    cols = list(df.columns) + [None, None]
    pick = lambda: draw_(st.sampled_from(cols))  # noqa: E731
    return {"x": pick(), "y": pick(), "hue": pick()}


@settings(max_examples=EXAMPLES, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
@given(df=frames(), task=st.sampled_from([None, "compare", "trend", "proportion", "correlate", "distribution"]),
       data=st.data())
def test_any_frame_gives_advice_or_clear_error(df, task, data):
    COUNT["frames"] += 1
    kw = data.draw(st.sampled_from([{}, "roles"]))
    if kw == "roles" and not isinstance(df.columns, pd.MultiIndex):
        kw = roles(data.draw, df)
    else:
        kw = {}
    before = copy.deepcopy(df)
    rc = dict(mpl.rcParams)
    try:
        advice = plotwise.advise(df, task, **kw)
    except PlotwiseError as exc:
        COUNT["errors"] += 1
        msg = str(exc)
        MESSAGES.append(msg.split(";")[0][:70])
        assert 10 < len(msg) < 2000 and "Traceback" not in msg
    else:
        COUNT["advice"] += 1
        assert advice.designs and all(0 <= d.score <= 1 for d in advice.designs)
        fig = Figure()
        try:
            draw(advice.shown(1)[0], df, fig.subplots())
        except PlotwiseError as exc:
            assert "could not draw" in str(exc)
    pd.testing.assert_frame_equal(df, before)
    assert dict(mpl.rcParams) == rc
    assert plt.get_fignums() == []


def test_generated_enough_frames():
    # Runs after the property test (file order).
    if COUNT["frames"] == 0:
        pytest.skip("property test not run in this session")
    assert COUNT["frames"] >= min(EXAMPLES, 2000) * 0.9
    if os.environ.get("PLOTWISE_SHOW_ERRORS"):
        from collections import Counter

        for msg, n in Counter(MESSAGES).most_common(25):
            print(f"{n:5d}  {msg}")


# Regression tests for bugs the generated frames found.
def test_regression_same_column_in_two_roles():
    df = pd.DataFrame({"a": [41, 3, 5]})
    with pytest.raises(PlotwiseError, match="x and y both name the column 'a'"):
        plotwise.advise(df, None, x="a", y="a")


def test_regression_mixed_object_column():
    pool = [1, "a", None, 2.5, "b", ("t",), True]
    df = pd.DataFrame({"a": pd.Series([pool[i % 7] for i in range(40)], dtype=object)})
    before = copy.deepcopy(df)
    advice = plotwise.advise(df, "distribution")
    assert advice.fields["a"].as_text
    fig = Figure()
    draw(advice.designs[0], df, fig.subplots())
    pd.testing.assert_frame_equal(df, before)
