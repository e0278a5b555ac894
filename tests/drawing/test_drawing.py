"""Every kind draws, and each design's .code() redraws the same marks."""

import matplotlib as mpl
import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest
from matplotlib.figure import Figure
from open_data import grunfeld, kind_cases

import plotwise
from plotwise.drawing.render import draw

CASES = kind_cases()


def marks(fig) -> list:
    """What was drawn, artist by artist: type and data size/extent, per axes."""
    out = []
    for ax in fig.axes:
        items = []
        for a in ax.patches:
            items.append(("patch", type(a).__name__, round(float(getattr(a, "get_height", lambda: 0)()), 6),
                          round(float(getattr(a, "get_width", lambda: 0)()), 6)))
        for ln in ax.lines:
            items.append(("line", len(ln.get_xdata())))
        for c in ax.collections:
            items.append(("coll", type(c).__name__, len(c.get_offsets()) if hasattr(c, "get_offsets") else 0))
        items.append(("images", len(ax.images)))
        out.append(items)
    return out


def all_designs():
    for i, (df, kw) in enumerate(CASES):
        advice = plotwise.advise(df, **kw)
        for d in advice.designs:
            yield pytest.param(df, d, id=f"{i}-{d.task}-{d.title}")


@pytest.mark.parametrize("df,design", list(all_designs()))
def test_design_draws_and_code_matches(df, design):
    if not design.expressive and design.kind == "pie":
        pytest.skip("an inexpressive pie is listed, not drawn")
    before = df.copy(deep=True)
    rc = dict(mpl.rcParams)
    fig = Figure(figsize=(6, 4), layout="constrained")
    ax = fig.subplots()
    draw(design, df, ax)
    ours = marks(fig)
    assert any(len(items) > 1 for items in ours), "nothing drawn"
    code = design.code("frame")
    namespace = {"frame": df}
    exec(compile(code, "<snippet>", "exec"), namespace)
    try:
        theirs = marks(namespace["fig"])
    finally:
        plt.close(namespace["fig"])
    assert ours == theirs
    pd.testing.assert_frame_equal(df, before)
    assert dict(mpl.rcParams) == rc


def test_show_three_panels_titled():
    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest")
    fig = a.show()
    titles = [sf._suptitle.get_text() for sf in fig.subfigs]
    assert len(titles) == 3
    for rank, (t, d) in enumerate(zip(titles, a.designs), 1):
        assert t.startswith(f"{rank} · {d.kind}") and f"{d.score:.2f}" in t


def test_bars_sorted_from_zero_and_horizontal_for_long_labels():
    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest", agg="sum")
    bar = a.design("bar")
    assert bar.horizontal
    fig = Figure()
    ax = fig.subplots()
    draw(bar, grunfeld(), ax)
    widths = [p.get_width() for p in ax.patches]
    lefts = [p.get_x() for p in ax.patches]
    assert widths == sorted(widths, reverse=True)
    assert all(x == 0 for x in lefts)
    assert ax.get_xlim()[0] <= 0
    expected = grunfeld().groupby("firm")["invest"].sum().sort_values(ascending=False)
    np.testing.assert_allclose(widths, expected.values)
    assert [t.get_text() for t in ax.get_yticklabels()] == list(expected.index)


def test_histogram_bins_match_numpy():
    # numpy.histogram_bin_edges(bins="fd") is the reference implementation of
    # Freedman & Diaconis (1981); the drawn bars must be numpy's counts.
    from open_data import iris

    f = iris()
    a = plotwise.advise(f, "distribution", x="petal length (cm)")
    h = a.design("histogram")
    rule = h.options.bins
    assert rule in ("fd", "sturges")
    fig = Figure()
    ax = fig.subplots()
    draw(h, f, ax)
    counts, edges = np.histogram(f["petal length (cm)"], bins=np.histogram_bin_edges(f["petal length (cm)"], bins=rule))
    assert [p.get_height() for p in ax.patches] == list(counts)
    assert f"{len(counts)} bins" in " ".join(h.reasons)


def test_sturges_rule_matches_formula():
    # Sturges (1926): k = ceil(log2 n) + 1, as numpy implements it.
    from plotwise.engine.bins import choose_bins

    v = np.zeros(100)
    v[:3] = [1, 2, 3]  # IQR = 0: Freedman–Diaconis cannot be used
    rule, why = choose_bins(v)
    assert rule == "sturges"
    assert f"= {int(np.ceil(np.log2(100)) + 1)} bins" in why


def test_draw_on_callers_axes_and_no_pyplot_figures():
    a = plotwise.advise(grunfeld(), "trend", x="year", y="invest")
    fig, ax = plt.subplots()
    try:
        returned = a.draw(0, ax=ax)
        assert returned is ax and len(ax.lines) >= 1
    finally:
        plt.close(fig)
    n = len(plt.get_fignums())
    a.show()
    a.draw("area")
    assert len(plt.get_fignums()) == n


def test_two_d_histogram_gives_a_whole_number_axis_one_cell_per_value():
    """Fair's affairs data (Fair 1978, shipped with statsmodels): education is a whole number with
    six levels; the 2-D histogram puts one cell column on each level instead of 25 bins that
    leave empty stripes between them."""
    import statsmodels.api as sm
    from matplotlib.collections import QuadMesh

    d = sm.datasets.fair.load_pandas().data
    a = plotwise.advise(d, "correlate", x="educ", y="affairs")
    assert a.fields["educ"].is_discrete
    fig = Figure()
    a.draw(a.design("heatmap"), ax=fig.subplots())
    mesh = [c for c in fig.axes[0].collections if isinstance(c, QuadMesh)][0]
    xs = np.unique(mesh.get_coordinates()[..., 0])
    levels = np.sort(d["educ"].unique())
    np.testing.assert_allclose(xs, np.arange(levels.min() - 0.5, levels.max() + 1.5))
