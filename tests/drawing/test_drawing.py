"""Every kind draws the numbers pandas computes for it (independently of plotwise's generated
code), and each design's .code() redraws the same marks."""

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


AGG = {"sum": "sum", "mean": "mean", "median": "median", "value": "sum"}


def pandas_numbers(d, df):
    """The numbers a design must draw, computed here with pandas alone (sorted), or None for
    kinds whose marks are shapes rather than one mark per number (box, violin, density...)."""
    if d.facet is not None or d.options.matrix:
        return None
    w = df[d.columns].dropna()

    def per(keys):
        g = w.groupby(keys, observed=True)
        return g.size() if d.y is None or d.stat == "count" else g[d.y].agg(AGG[d.stat])

    k = d.kind
    if k in ("bar", "dot", "lollipop", "line", "area", "count-bar", "pie") and not d.hue:
        v = per([d.x])
        if d.options.share or k == "pie":
            v = v / v.sum() * 100
        return sorted(v.to_numpy(dtype=float))
    if k == "stacked-bar-100":
        bars, parts = (d.hue, d.x) if d.task == "proportion" else (d.x, d.hue)
        if bars is None:
            v = per([parts])
            return sorted((v / v.sum() * 100).to_numpy(dtype=float))
        t = per([bars, parts]).unstack(parts, fill_value=0)
        return sorted(t.div(t.sum(axis=1), axis=0).mul(100).to_numpy(dtype=float).ravel())
    if k in ("grouped-bar", "stacked-bar", "line", "dot", "bar") or (
            k == "heatmap" and d.task != "correlate"):
        v = per([d.x, d.hue])
        if d.options.share:
            v = v / v.groupby(level=1).transform("sum") * 100
        if k == "stacked-bar":  # the empty segments of missing combinations are drawn as 0
            v = v.unstack(fill_value=0).stack()
        return sorted(v.to_numpy(dtype=float))
    if k == "slope":
        return sorted(per([d.hue, d.x]).unstack(d.x).dropna().to_numpy(dtype=float).ravel())
    if k == "difference-bar":
        t = per([d.x, d.hue]).unstack(d.hue).dropna()
        return sorted((t.iloc[:, 1] - t.iloc[:, 0]).to_numpy(dtype=float))
    if k == "histogram" and not d.hue:
        v = w[d.x].to_numpy(dtype=float)
        return sorted(np.histogram(v, bins=np.histogram_bin_edges(v, bins=d.options.bins))[0]
                      .astype(float))
    if k in ("scatter", "regression"):
        return [float(len(w))]
    return None


def drawn_numbers(d, ax):
    """The same numbers read back from the drawn artists."""
    from matplotlib.collections import PathCollection, QuadMesh
    from matplotlib.patches import Rectangle, Wedge

    k = d.kind
    if k == "pie":
        wedges = [p for p in ax.patches if isinstance(p, Wedge)]
        return sorted((w.theta2 - w.theta1) / 360 * 100 for w in wedges)
    if k in ("line", "area", "slope"):
        ys = np.concatenate([np.asarray(ln.get_ydata(), dtype=float) for ln in ax.lines
                             if len(ln.get_ydata()) > 1])
        return sorted(ys[np.isfinite(ys)])
    if k == "lollipop":  # the dots' positions, and each stem must end at its dot
        from matplotlib.collections import LineCollection

        dots = np.asarray(ax.lines[0].get_xdata(), dtype=float)
        stems = next(c for c in ax.collections if isinstance(c, LineCollection))
        ends = [float(seg[1][0]) for seg in stems.get_segments()]
        starts = [float(seg[0][0]) for seg in stems.get_segments()]
        assert ends == list(dots) and set(starts) == {0.0}
        return sorted(dots)
    if k == "dot":
        offs = np.concatenate([c.get_offsets() for c in ax.collections
                               if isinstance(c, PathCollection)])
        col = 0 if d.horizontal else 1
        return sorted(np.asarray(offs, dtype=float)[:, col])
    if k == "heatmap":
        mesh = next(c for c in ax.collections if isinstance(c, QuadMesh))
        a = np.ma.masked_invalid(np.asarray(mesh.get_array(), dtype=float))
        return sorted(a.compressed())
    if k in ("scatter", "regression"):
        return [float(sum(len(c.get_offsets()) for c in ax.collections
                          if isinstance(c, PathCollection)))]
    rects = [p for p in ax.patches if isinstance(p, Rectangle) and p is not ax.patch]
    across = d.horizontal or k in ("difference-bar", "stacked-bar-100") or (
        k == "stacked-bar")
    # (seaborn adds empty rectangles as legend handles; empty segments are empty bars too)
    vals = [(r.get_width() if across else r.get_height()) for r in rects
            if r.get_width() != 0 and r.get_height() != 0]
    return sorted(float(v) for v in vals)


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
    expected = pandas_numbers(design, df)
    if expected is not None and design.kind not in ("pie", "line", "area", "slope", "dot", "lollipop",
                                                    "heatmap", "scatter", "regression"):
        expected = [v for v in expected if v != 0]
    if expected is not None:
        np.testing.assert_allclose(drawn_numbers(design, ax), expected, rtol=1e-6, atol=1e-9)
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
    v = f["petal length (cm)"]
    counts, edges = np.histogram(v, bins=np.histogram_bin_edges(v, bins=rule))
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


@pytest.mark.parametrize("cmap", ["jet", "rainbow", "flare", "Greys"])
def test_any_colormap_name_draws_every_lightness_design(cmap):
    # seaborn's own palette lookup refuses some matplotlib names ('jet'); every name matplotlib
    # knows must still draw (the rainbow-colormap hazard then says why not to use it).
    from open_data import iris

    a = plotwise.advise(iris(), "correlate", cmap=cmap)
    drawn = 0
    for d in a.designs:
        if "lightness" in d.encoding and d.expressive:
            fig = Figure()
            draw(d, iris(), fig.subplots())
            assert any(len(ax.collections) or ax.images for ax in fig.axes)
            drawn += 1
    assert drawn >= 2


def test_category_against_many_valued_number_is_counted_in_ten_bins():
    # statsmodels' Grunfeld investment data: 'firm' (10 firms) against 'invest', a number with
    # about 200 distinct values. One heatmap row per distinct value would draw a cell per row
    # of the data; the number goes in ten equal bins (checked with numpy's histogram, whose
    # equal-width edges pd.cut shares apart from its 0.1% widening of the outer edges).
    from matplotlib.collections import QuadMesh

    d = grunfeld()
    a = plotwise.advise(d, "correlate", x="firm", y="invest")
    design = a.design("heatmap")
    fig = Figure()
    a.draw(design, ax=fig.subplots())
    mesh = next(c for c in fig.axes[0].collections if isinstance(c, QuadMesh))
    counts = np.asarray(mesh.get_array(), dtype=float).reshape(10, -1)  # rows: bins, high on top
    assert counts.shape == (10, d["firm"].nunique())
    per_bin = np.histogram(d["invest"].dropna(), bins=10)[0]
    np.testing.assert_array_equal(counts.sum(axis=1)[::-1], per_bin)


def test_heatmap_of_a_skewed_number_bins_on_its_logarithm():
    """Engel's food expenditure against income (statsmodels; income is right-skewed): the
    heatmap's 25 columns are equal steps of log10(income), so its cells count what
    numpy.histogram2d counts on log10(income) (numpy is the reference) — with linear bins most
    households fell into the first two columns."""
    import statsmodels.api as sm
    from matplotlib.collections import QuadMesh

    df = sm.datasets.engel.load_pandas().data
    a = plotwise.advise(df, "correlate", x="income", y="foodexp")
    h = a.design("heatmap")
    assert h.options.log_columns == ["income"]
    fig = plt.figure()
    try:
        a.draw(h, ax=fig.subplots())
        ax = fig.axes[0]
        mesh = [c for c in ax.collections if isinstance(c, QuadMesh)][0]
        cells = np.ma.masked_invalid(np.asarray(mesh.get_array(), dtype=float)).filled(0)
        counts, x_edges, _ = np.histogram2d(np.log10(df["income"]), df["foodexp"], bins=25)
        assert ax.get_xscale() == "log"
        np.testing.assert_allclose(np.log10(mesh.get_coordinates()[0, :, 0]), x_edges)
        np.testing.assert_array_equal(cells.reshape(25, 25), counts.T)
    finally:
        plt.close(fig)
