"""Drawing never trips on what users put in names and labels, and never leaves the user's
matplotlib style changed — not even with two threads drawing at once."""

import threading

import matplotlib as mpl
import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest

import plotwise

MATHS_LIKE = ["$5–$10", "$10–$20", "$x^$", "50% of $"]


def money_frame():
    return pd.DataFrame({"band": MATHS_LIKE * 10,
                         "price ($) vs cost ($)": np.arange(40.0),
                         "n $": np.arange(40.0) ** 2})


@pytest.mark.parametrize("task", ["compare", "proportion", "distribution", "correlate", None])
def test_dollar_signs_are_text_not_maths(task):
    # matplotlib reads text between two '$' as mathtext (and raises on "$x^$"); plotwise draws
    # every user string literally: the labels come out exactly as given.
    df = money_frame()
    kw = dict(x="band", y="price ($) vs cost ($)") if task in ("compare", "proportion") else {}
    a = plotwise.advise(df, task, **kw)
    fig = a.show()
    bundle, _ = a._repr_mimebundle_()
    assert bundle["image/png"]
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    FigureCanvasAgg(fig).draw()
    texts = {t.get_text() for ax in fig.axes for t in ax.get_yticklabels() + ax.get_xticklabels()}
    texts |= {ax.get_xlabel() for ax in fig.axes} | {ax.get_ylabel() for ax in fig.axes}
    if task in ("compare", "proportion"):
        assert set(MATHS_LIKE) <= texts
    for d in a.shown():
        a.draw(d).figure.savefig(__import__("io").BytesIO(), format="png")


def test_two_threads_leave_the_style_as_it_was():
    from open_data import grunfeld, iris

    before = dict(mpl.rcParams)
    errors = []

    def work(df, kw):
        try:
            for _ in range(6):
                plotwise.advise(df, **kw).show().savefig(__import__("io").BytesIO(), format="png")
        except Exception as exc:  # noqa: BLE001 - collected and asserted below
            errors.append(exc)

    threads = [threading.Thread(target=work, args=(grunfeld(), dict(task="compare", x="firm",
                                                                     y="invest"))),
               threading.Thread(target=work, args=(iris(), dict(task="correlate")))]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert not errors
    assert dict(mpl.rcParams) == before


def test_log_axes_keep_their_maths_and_the_global_style_does_not_leak_in():
    # A log axis labels its ticks with mathtext (10², 10³); only user strings are literal.
    # A figure rendered later, under another global style, still renders in plotwise's.
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from open_data import grunfeld

    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest")
    box = a.design("box")
    assert box.log_scale
    fig = a.show()
    with mpl.rc_context({"xtick.labelsize": 20, "ytick.labelsize": 20}):
        FigureCanvasAgg(fig).draw()
    ax = fig.axes[[d.kind for d in a.shown()].index("box")]
    numeric = [t for t in ax.get_xticklabels() if "$" in t.get_text()]
    assert numeric and all(t.get_parse_math() for t in numeric)
    categories = ax.get_yticklabels()
    assert categories and not any(t.get_parse_math() for t in categories)
    assert {t.get_fontsize() for t in categories} != {20.0}


def test_period_time_axis_snippets_run():
    # Regression: a pandas Period column reached matplotlib's float() in the line and area
    # snippets (TypeError); periods are now drawn at their start time.
    df = pd.DataFrame({"month": pd.period_range("2020-01", periods=36, freq="M"),
                       "sales": np.arange(36, dtype=float) % 7 + 10})
    advice = plotwise.advise(df, "trend", x="month", y="sales")
    assert advice.best.kind == "line"
    for d in advice.shown():
        namespace = {"df": df}
        exec(compile(d.code("df"), "<snippet>", "exec"), namespace)  # noqa: S102
        ax = namespace["ax"]
        assert ax.get_lines() or ax.patches or ax.collections
        plt.close("all")
    pd.testing.assert_series_equal(df["month"], pd.Series(pd.period_range(
        "2020-01", periods=36, freq="M"), name="month"))
