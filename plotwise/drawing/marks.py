"""Surprises drawn on the panels: a ring and the row label at a point, or a dashed line at a
time. An overlay of the shown figure only: the design's code (what the reader copies) draws the
chart itself, the marks point at what the advice text names."""

from __future__ import annotations

import numpy as np
from matplotlib.axes import Axes
from matplotlib.axis import Axis

from plotwise.engine.design import Design
from plotwise.engine.headline import label
from plotwise.engine.surprises import Surprise

MARK_COLOUR = "#D55E00"  # Okabe–Ito vermillion: apart from the blue of single-series marks
MARK_GID = "plotwise-surprise"  # every mark artist carries it (tests and audits tell them apart)


def axis_columns(d: Design) -> tuple[str | None, str | None]:
    """The columns on the panel's (x axis, y axis) where a mark can be placed exactly."""
    if d.facet:
        return None, None
    if d.kind in ("scatter", "regression"):
        return d.x, d.y
    if d.task == "trend" and d.kind in ("line", "dot", "area", "bar"):
        return d.x, None  # the measure is aggregated: only a time can be pinned
    if d.kind in ("box", "violin", "strip"):
        cat, val = (d.hue, d.x) if d.task == "distribution" else (d.x, d.y)
        return (val, cat) if d.horizontal else (cat, val)
    return None, None


def _position(axis: Axis, value, categorical: bool) -> float | None:
    if value is None:
        return None
    if categorical:
        texts = [t.get_text() for t in axis.get_majorticklabels()]
        for want in (str(value), label(value)):
            if want in texts:
                return float(axis.get_majorticklocs()[texts.index(want)])
        return None
    try:
        pos = float(np.asarray(axis.convert_units(value), dtype=float))
    except (TypeError, ValueError):
        return None
    return pos if np.isfinite(pos) else None


def mark_surprises(ax: Axes, design: Design, surprises: list[Surprise]) -> int:
    """Put the surprises' marks that fit this design's axes on ``ax``; the number placed."""
    if not surprises or design.profile is None:
        return 0
    xcol, ycol = axis_columns(design)
    if xcol is None and ycol is None:
        return 0
    fields = design.profile.fields
    cat = {c: c in fields and fields[c].level in ("nominal", "ordinal") for c in (xcol, ycol) if c}
    points: dict[tuple[float, float | None], list[str]] = {}  # marks at one place: one label
    for s in surprises:
        for m in s.marks:
            if {c for c, _ in m.at} != {c for c in (xcol, ycol) if c} and not (
                    len(m.at) == 1 and m.at[0][0] == xcol):
                continue
            px = _position(ax.xaxis, m.value(xcol), cat.get(xcol, False)) if xcol else None
            py = _position(ax.yaxis, m.value(ycol), cat.get(ycol, False)) if ycol else None
            if px is None or (py is None and len(m.at) != 1):
                continue
            texts = points.setdefault((px, py), [])
            if m.text not in texts:
                texts.append(m.text)
    for (px, py), texts in points.items():
        text = ", ".join(texts)
        if py is None:  # a time: a dashed line across the panel
            ax.axvline(px, color=MARK_COLOUR, linestyle="--", linewidth=1, zorder=4, gid=MARK_GID)
            ax.annotate(text, (px, 1), xycoords=("data", "axes fraction"), xytext=(3, -10),
                        textcoords="offset points", fontsize=7, color=MARK_COLOUR,
                        parse_math=False, gid=MARK_GID)
        else:
            ax.scatter([px], [py], s=140, facecolors="none", edgecolors=MARK_COLOUR,
                       linewidths=1.4, zorder=5, gid=MARK_GID)
            ax.annotate(text, (px, py), xytext=(6, 5), textcoords="offset points", fontsize=7,
                        color=MARK_COLOUR, parse_math=False, gid=MARK_GID)
    return len(points)
