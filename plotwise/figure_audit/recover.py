"""The data behind a simple drawn chart (bars, one line, one scatter), read back from its
artists so the advised alternative can be drawn from it."""

from __future__ import annotations

import numpy as np
from matplotlib.axes import Axes
from matplotlib.collections import PathCollection

from plotwise.figure_audit.checks import _bars, _is_categorical


def recover_frame(ax: Axes):
    """The data behind simple charts (bars, one line, one scatter), as a DataFrame and a task,
    so the advised alternative can be drawn from it; None when it cannot be recovered."""
    import pandas as pd

    orient, rects = _bars(ax)
    if orient:
        axis = ax.xaxis if orient == "v" else ax.yaxis
        labels = [t.get_text() for t in axis.get_ticklabels()]
        values = [(r.get_y() + r.get_height()) if orient == "v" else (r.get_x() + r.get_width())
                  for r in rects]
        if len(labels) == len(values) and all(labels):
            name = (ax.get_ylabel() if orient == "v" else ax.get_xlabel()) or "value"
            cat = (ax.get_xlabel() if orient == "v" else ax.get_ylabel()) or "category"
            if name == cat:
                cat = cat + " (category)"
            return pd.DataFrame({cat: labels, name: values}), "compare"
    pcs = [c for c in ax.collections if isinstance(c, PathCollection) and len(c.get_offsets()) > 2]
    if len(pcs) == 1 and not ax.lines:
        offs = np.asarray(pcs[0].get_offsets(), dtype=float)
        xl, yl = ax.get_xlabel() or "x", ax.get_ylabel() or "y"
        if xl == yl:
            yl = yl + " (y)"
        return pd.DataFrame({xl: offs[:, 0], yl: offs[:, 1]}), "correlate"
    lines = [ln for ln in ax.lines if len(ln.get_xdata()) > 2]
    if len(lines) == 1 and not _is_categorical(ax.xaxis):
        x = np.asarray(lines[0].get_xdata(), dtype=float)
        y = np.asarray(lines[0].get_ydata(), dtype=float)
        return pd.DataFrame({"step": x, ax.get_ylabel() or "value": y}), "correlate"
    return None
