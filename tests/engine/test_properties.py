"""Property-based tests: whatever frame a user points plotwise at, the result is an Advice or a
PlotwiseError with a readable message; the frame, rcParams and open figures are untouched."""

import copy
import os
import warnings
from contextlib import contextmanager

import matplotlib as mpl
import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest
from hypothesis import HealthCheck, given, seed, settings
from hypothesis import strategies as st
from matplotlib.figure import Figure

import plotwise
from plotwise import PlotwiseError
from plotwise.drawing.render import draw

# 3,000 generated frames per CI run (override with PLOTWISE_EXAMPLES); every advised frame
# (every FULL_EVERY-th, when set above 1 for a quick local run) also goes the whole way:
# show(), the notebook display (HTML and PNG) and every shown design's code() run in a fresh
# namespace.
EXAMPLES = int(os.environ.get("PLOTWISE_EXAMPLES", "3000"))
FULL_EVERY = int(os.environ.get("PLOTWISE_FULL_EVERY", "1"))
COUNT = {"frames": 0, "advice": 0, "errors": 0, "full": 0}
MESSAGES: list[str] = []

from strategies import column  # noqa: E402

KINDS = ["int", "float", "posfloat", "Int64", "Float64", "boolean", "string", "object_mixed", "cat",
         "ordcat", "date", "datetz", "timedelta", "bool", "constant", "allmissing", "highcard",
         "datetext", "bytes", "decimal", "huge", "tinyiqr", "period", "interval", "complex",
         "arrow_str", "arrow_int", "mathtext", "likert", "yeartext"]
NAMES = ["a", "b", "value", 0, 1, "<b>x</b>", "with space", "é", "x\ny", "a", "$x^$",
         "price ($) vs cost ($)", "*", "^v.*$"]


@st.composite
def frames(draw_):
    n = draw_(st.sampled_from([0, 1, 2, 3, 8, 40]))
    ncols = draw_(st.integers(1, 4))
    kinds = draw_(st.lists(st.sampled_from(KINDS), min_size=ncols, max_size=ncols))
    unique = draw_(st.integers(0, 9)) > 0  # duplicate names now and then
    names = draw_(st.lists(st.sampled_from(NAMES), min_size=ncols, max_size=ncols, unique=unique))
    frame_seed = draw_(st.integers(0, 2**16))
    rng = np.random.default_rng(frame_seed)
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


SHARDS = 2  # the frames are split in shards that pytest-xdist runs on separate cores


@pytest.mark.parametrize("shard", range(SHARDS))
def test_any_frame_gives_advice_or_clear_error(shard):
    before = COUNT["frames"]
    run = settings(max_examples=EXAMPLES // SHARDS, deadline=None, database=None,
                   suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])(
        given(df=frames(), task=st.sampled_from(
            [None, "compare", "trend", "proportion", "correlate", "distribution"]),
            data=st.data())(one_frame))
    seed(20261203 + shard)(run)()  # fixed seeds: the same frames every run
    assert COUNT["frames"] - before >= EXAMPLES // SHARDS * 0.9
    if os.environ.get("PLOTWISE_SHOW_ERRORS"):
        from collections import Counter

        for msg, n in Counter(MESSAGES).most_common(25):
            print(f"{n:5d}  {msg}")


def one_frame(df, task, data):
    COUNT["frames"] += 1
    kw = data.draw(st.sampled_from([{}, "roles"]))
    if kw == "roles" and not isinstance(df.columns, pd.MultiIndex):
        kw = roles(data.draw, df)
    else:
        kw = {}
    before = copy.deepcopy(df)
    rc = dict(mpl.rcParams)
    try:
        with no_numeric_noise():
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
            with no_numeric_noise():
                draw(advice.shown(1)[0], df, fig.subplots())
        except PlotwiseError as exc:
            assert "could not draw" in str(exc)
        if COUNT["advice"] % FULL_EVERY == 0:
            with no_numeric_noise():
                whole_way(advice, df)
    pd.testing.assert_frame_equal(df, before)
    assert dict(mpl.rcParams) == rc
    assert plt.get_fignums() == []


@contextmanager
def no_numeric_noise():
    """numpy's overflow/invalid RuntimeWarnings from inside plotwise are noise to a user: fail."""
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)
        # a layout that collapsed draws panels of no size: a broken figure, not a warning
        warnings.filterwarnings("error", message="constrained_layout not applied")
        yield


def whole_way(advice, df):
    """show(), the notebook display and every shown design's code in a fresh namespace."""
    COUNT["full"] += 1
    try:
        advice.show()
        bundle, _ = advice._repr_mimebundle_()
        assert bundle["text/html"] and bundle["image/png"]
    except PlotwiseError as exc:
        assert "could not draw" in str(exc)
        return
    warnings.simplefilter("default", RuntimeWarning)  # snippets are the user's code from here
    for d in advice.shown():
        namespace = {"frame": df}
        try:
            exec(compile(d.code("frame"), "<snippet>", "exec"), namespace)  # noqa: S102
        finally:
            plt.close("all")


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


# Regression tests for the families an independent sweep found (each once ended in something
# other than a PlotwiseError).
def test_regression_bytes_are_decoded_not_fatal():
    df = pd.DataFrame({"g": [b"x", b"y", b"\xff"] * 20, "v": np.arange(60.0)})
    a = plotwise.advise(df, "compare", x="g", y="v")
    assert "bytes" in " ".join(a.fields["g"].evidence)
    fig = a.show()
    labels = {t.get_text() for ax in fig.axes for t in ax.get_yticklabels() + ax.get_xticklabels()}
    assert {"x", "y", "\ufffd"} <= labels  # undecodable bytes become the replacement character


def test_regression_decimal_with_nan():
    import decimal

    pool = [decimal.Decimal("1.5"), decimal.Decimal("NaN"), decimal.Decimal("2")]
    df = pd.DataFrame({"g": list("abc") * 20, "v": pd.Series(pool * 20, dtype=object)})
    for task in (None, "compare", "distribution"):
        try:
            plotwise.advise(df, task).show()
        except PlotwiseError:
            pass


def test_regression_range_beyond_float_arithmetic_is_refused_clearly():
    v = np.r_[np.random.default_rng(0).normal(size=58), 1e308, -1e308]
    df = pd.DataFrame({"g": list("abc") * 20, "v": v})
    with pytest.raises(PlotwiseError, match="too wide a range"):
        plotwise.advise(df, "distribution", x="v")
    tiny_iqr = pd.DataFrame({"v": np.r_[np.ones(59), 1e300]})  # bins from the range: bounded
    plotwise.advise(tiny_iqr, "distribution").show()


def test_regression_complex_keeps_its_imaginary_part():
    from plotwise.engine.profile import profile_frame

    df = pd.DataFrame({"v": np.arange(10.0) + 1j})
    fp = profile_frame(df)["v"]
    assert fp.level != "quantitative" and "complex" in " ".join(fp.evidence)


def test_regression_thousands_of_dates_or_labels_are_refused_fast():
    # compare over 3,000 dates drew 3,000 bars and 3,000 strip calls (about a minute); a
    # distribution of 3,000 identifier-like labels drew 3,000 bars. Both are refused at once.
    n = 3000
    df = pd.DataFrame({"d": pd.date_range("2020-01-01", periods=n, freq="D"),
                       "h": [f"id{i}" for i in range(n)], "v": np.arange(n, dtype=float)})
    with pytest.raises(PlotwiseError, match="task='trend'"):
        plotwise.advise(df, "compare", x="d", y="v")
    with pytest.raises(PlotwiseError, match="value_counts"):
        plotwise.advise(df, "distribution", x="h")
