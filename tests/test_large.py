"""Large frames: totals and histogram counts stay exact, point designs draw a seeded sample and
say so, small frames are never sampled."""

import numpy as np
import pandas as pd
import pytest
from matplotlib.figure import Figure

import plotwise
from plotwise.drawing.render import draw
from plotwise.engine.rules import THRESHOLDS


@pytest.fixture(scope="module")
def big():
    rng = np.random.default_rng(42)
    n = 120_000  # above the sampling threshold, small enough for a quick test
    df = pd.DataFrame({
        "group": np.array([f"g{i:02d}" for i in range(12)])[rng.integers(0, 12, n)],
        "value": rng.gamma(2.0, 3.0, n),
        "other": rng.normal(size=n),
    })
    df.loc[rng.choice(n, 500, replace=False), "value"] = np.nan
    return df


def drawn(design, df):
    fig = Figure()
    ax = fig.subplots()
    draw(design, df, ax)
    return fig, ax


def test_bar_totals_exact(big):
    a = plotwise.advise(big, "compare", x="group", y="value", agg="sum")
    bar = a.design("bar")
    assert "totals of all" in bar.options.note
    fig, ax = drawn(bar, big)
    expected = big.groupby("group")["value"].sum().sort_values(ascending=False)
    np.testing.assert_allclose([p.get_width() for p in ax.patches], expected.values, rtol=1e-12)
    assert any(h.code == "sampled" and h.severity == "info" for h in bar.hazards)


def test_histogram_counts_equal_numpy_on_full_column(big):
    a = plotwise.advise(big, "distribution", x="other")
    h = a.design("histogram")
    assert h.options.prebin
    fig, ax = drawn(h, big)
    step = ax.patches[0]
    values, edges, _ = step.get_data()
    full = big["other"].to_numpy()
    counts, ref_edges = np.histogram(full, bins=np.histogram_bin_edges(full, bins=h.options.bins))
    np.testing.assert_array_equal(values, counts)
    np.testing.assert_allclose(edges, ref_edges)
    assert int(values.sum()) == len(big)


def test_point_designs_sampled_and_say_so(big):
    a = plotwise.advise(big, "correlate", x="value", y="other")
    scatter = a.design("scatter")
    fig, ax = drawn(scatter, big)
    assert len(ax.collections[0].get_offsets()) == THRESHOLDS["draw_sample"]
    assert "random sample of 20,000" in scatter.options.note
    assert any(t.get_text().startswith("random sample") for t in ax.texts)
    hz = [h for h in scatter.hazards if h.code == "sampled"]
    assert hz and "119,500 rows" in hz[0].message
    # The code a user copies draws the same sample.
    ns = {"df": big}
    exec(scatter.code(), ns)
    import matplotlib.pyplot as plt

    try:
        np.testing.assert_array_equal(ns["fig"].axes[0].collections[0].get_offsets(),
                                      ax.collections[0].get_offsets())
    finally:
        plt.close(ns["fig"])


def test_small_frames_never_sampled(big):
    small = big.head(1000)
    a = plotwise.advise(small, "correlate", x="value", y="other")
    assert not any(h.code == "sampled" for d in a.designs for h in d.hazards)
    fig, ax = drawn(a.design("scatter"), small)
    assert len(ax.collections[0].get_offsets()) == small[["value", "other"]].dropna().shape[0]


def test_profile_samples_only_costly_statistics():
    rng = np.random.default_rng(1)
    n = THRESHOLDS["profile_sample"] + 50_000
    v = rng.normal(size=n)
    v[:777] = np.nan
    df = pd.DataFrame({"v": v})
    p = plotwise.profile_frame(df)
    assert p.sample_rows == THRESHOLDS["profile_sample"]
    f = p["v"]
    assert f.rows == n and f.missing == 777  # exact
    assert f.minimum == np.nanmin(v) and f.maximum == np.nanmax(v)  # exact
    assert any("seeded sample" in e for e in f.evidence)
    assert plotwise.profile_frame(df.head(1000)).sample_rows is None
