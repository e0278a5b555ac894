"""Surprises are marked on the shown panels where the panel's axes can place them."""

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd

import plotwise
from plotwise.drawing.marks import MARK_GID


def marked(fig):
    out = []
    for ax in fig.findobj(lambda a: hasattr(a, "get_gid") and a.get_gid() == MARK_GID):
        out.append(ax)
    return out


def test_misfit_items_are_ringed_on_the_scatter_at_their_values():
    from open_data import iris

    df = iris()
    a = plotwise.advise(df, "correlate", x="petal length (cm)", y="petal width (cm)",
                        hue="species")
    rows = next(s for s in a.surprises if s.code == "label-misfit").rows
    fig = a.show()
    scatter_ax = fig.subfigs[0].axes[0]
    rings = [c for c in scatter_ax.collections if c.get_gid() == MARK_GID]
    where = {tuple(np.round(c.get_offsets()[0], 6)) for c in rings}
    want = {tuple(np.round(df.loc[r, ["petal length (cm)", "petal width (cm)"]].to_numpy(float), 6))
            for r in rows}
    assert where == want
    labels = " ".join(t.get_text() for t in scatter_ax.texts if t.get_gid() == MARK_GID)
    assert all(str(r) in labels for r in rows)
    plt.close(fig)


def test_level_shift_is_a_dashed_line_at_its_year_on_every_time_panel():
    import statsmodels.api as sm

    nile = sm.datasets.nile.load_pandas().data
    fig = plotwise.advise(nile, "trend", x="year", y="volume").show()
    for sub in fig.subfigs:
        lines = [ln for ln in sub.axes[0].lines if ln.get_gid() == MARK_GID]
        assert len(lines) == 1 and lines[0].get_xdata()[0] == 1899
    plt.close(fig)


def test_no_surprise_no_mark_and_the_snippet_draws_no_mark(rng):
    df = pd.DataFrame({"shop": np.repeat(["Alder", "Birch"], 30), "basket": rng.normal(50, 5, 60)})
    a = plotwise.advise(df, "compare", x="shop", y="basket")
    assert a.surprises == []
    fig = a.show()
    assert marked(fig) == []
    plt.close(fig)
    df.loc[3, "basket"] = 400.0
    a = plotwise.advise(df, "compare", x="shop", y="basket")
    assert "group-outlier" in a.surprise_codes()
    assert "plotwise-surprise" not in a.code(0)  # the copied code draws the chart only
    fig = a.show()
    assert marked(fig)
    plt.close(fig)
