"""The checks of an audit: each reads one Axes' artists (never changes them) and appends the
Hazards it finds, with the engine's hazard codes, severities and shared conditions."""

from __future__ import annotations

import numpy as np
from matplotlib.axes import Axes
from matplotlib.collections import PathCollection, PolyCollection
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle, Wedge

from plotwise.drawing.colours import cmap_rgb
from plotwise.engine.colour import lightness_profile, worst_confusion
from plotwise.engine.conditions import (
    hue_severity,
    lie_factor,
    overplot_severity,
    thin_slice,
    too_many_slices,
)
from plotwise.engine.hazards import Hazard
from plotwise.engine.rules import STEVENS_EXPONENTS, THRESHOLDS
from plotwise.figure_audit.report import AxesAudit


def _bars(ax: Axes) -> tuple[str | None, list[Rectangle]]:
    """Bar rectangles and their orientation (vertical bars share a bottom edge)."""
    rects = [p for p in ax.patches if isinstance(p, Rectangle) and p.get_visible()
             and p.get_width() != 0 and p.get_height() != 0 and p is not ax.patch]
    if len(rects) < 2:
        return None, []
    ys = {round(r.get_y(), 9) for r in rects}
    xs = {round(r.get_x(), 9) for r in rects}
    widths = {round(r.get_width(), 9) for r in rects}
    heights = {round(r.get_height(), 9) for r in rects}
    if len(widths) == 1 and len(ys) <= max(1, len(rects) // 2):
        return "v", rects
    if len(heights) == 1 and len(xs) <= max(1, len(rects) // 2):
        return "h", rects
    return None, []


def _check_bars(ax: Axes, a: AxesAudit) -> None:
    orient, rects = _bars(ax)
    if not orient:
        return
    lo, hi = ax.get_ylim() if orient == "v" else ax.get_xlim()
    lo, hi = min(lo, hi), max(lo, hi)
    base = [r.get_y() if orient == "v" else r.get_x() for r in rects]
    ends = [b + (r.get_height() if orient == "v" else r.get_width()) for b, r in zip(base, rects)]
    values = [e for e in ends]
    a.bars = values
    axis = "y" if orient == "v" else "x"
    positive = [v for v, b in zip(values, base) if v > 0 and abs(b) < 1e-12]
    if len(positive) >= 2:
        vmin, vmax = min(positive), max(positive)
        shown_lo = max(lo, 0.0)
        if vmin > shown_lo and vmax != vmin:
            a.lie_factor = lie_factor(vmin, vmax, vmin - shown_lo, vmax - shown_lo)
    if lo > 0 and any(abs(b) < 1e-12 for b in base) and positive:
        lf = a.lie_factor
        extra = (f" From the shortest to the longest bar the drawn length grows "
                 f"{(max(positive) - lo) / (min(positive) - lo) - 1:+.0%} while the values grow "
                 f"{max(positive) / min(positive) - 1:+.0%}: a Lie Factor of {lf:.1f} (Tufte 1983 "
                 "asks for 0.95–1.05).") if lf and min(positive) > lo else ""
        a.hazards.append(Hazard(
            "truncated-baseline", "severe",
            f"{a.name}: the bars' value axis ({axis}) starts at {lo:.4g}, not zero, so bar lengths "
            f"are not proportional to the values.{extra}",
            f"start the {axis} axis at zero (ax.set_{axis}lim(0, ...)), or use a dot plot, which may "
            "start elsewhere if it says so", ("bar",)))


def _check_fills(ax: Axes, a: AxesAudit) -> None:
    lo = min(ax.get_ylim())
    for c in ax.collections:
        if isinstance(c, PolyCollection) and not isinstance(c, PathCollection) and c.get_array() is None:
            verts = np.concatenate([p.vertices for p in c.get_paths()]) if c.get_paths() else None
            if verts is not None and len(verts) and verts[:, 1].min() <= 0 < lo:
                a.hazards.append(Hazard(
                    "truncated-baseline", "severe",
                    f"{a.name}: a filled area starts at zero but the y axis starts at {lo:.4g}, so "
                    "the filled heights exaggerate the differences.",
                    "start the y axis at zero, or draw a line without fill", ("area",)))
                return


def _check_pie(ax: Axes, a: AxesAudit) -> None:
    wedges = [p for p in ax.patches if isinstance(p, Wedge)]
    if not wedges:
        return
    fractions = [((w.theta2 - w.theta1) % 360 or 360) / 360 for w in wedges]
    total = sum(fractions)
    small = [f for f in fractions if thin_slice(f)]
    problems = []
    if too_many_slices(len(wedges)):
        problems.append(f"{len(wedges)} slices")
    if small:
        problems.append(f"{len(small)} slice(s) under {THRESHOLDS['pie_min_share']:.0%} (smallest "
                        f"{min(fractions):.1%})")
    if problems:
        a.hazards.append(Hazard("too-many-slices", "warn",
                                f"{a.name}: a pie with " + " and ".join(problems) + ".",
                                "use a bar chart sorted by value, or keep the 4–5 largest parts "
                                "and group the rest", ("pie",)))
    labelled = []
    for t in ax.texts:
        s = t.get_text().strip().rstrip("%")
        if t.get_text().strip().endswith("%"):
            try:
                labelled.append(float(s))
            except ValueError:
                pass
    tol = THRESHOLDS["share_rounding_per_part"] * len(wedges)
    if total < 0.99:
        a.hazards.append(Hazard("not-a-whole", "severe",
                                f"{a.name}: the wedges cover {total:.0%} of the circle: the parts do "
                                "not make up a whole.", "show the values as bars instead", ("pie",)))
    elif len(labelled) == len(wedges) and abs(sum(labelled) - 100) > tol:
        a.hazards.append(Hazard("not-a-whole", "severe",
                                f"{a.name}: the slice labels add to {sum(labelled):.4g}%, not 100% "
                                f"(±{tol:g} for rounding).", "check the numbers, or show them as bars",
                                ("pie",)))


def _series_colours(ax: Axes) -> list[str]:
    from matplotlib.colors import to_hex

    handles, labels = ax.get_legend_handles_labels()
    if not handles and ax.get_legend() is not None:
        handles = ax.get_legend().legend_handles
    out = []
    for h in handles:
        try:
            if isinstance(h, Line2D):
                c = h.get_color()
            elif hasattr(h, "get_facecolor"):
                fc = h.get_facecolor()
                c = fc[0] if np.ndim(fc) == 2 and len(fc) else fc
            else:
                continue
            out.append(to_hex(c))
        except (ValueError, TypeError, IndexError):
            continue
    return list(dict.fromkeys(out))


def _check_colours(ax: Axes, a: AxesAudit) -> None:
    colours = _series_colours(ax)
    n = len(colours)
    is_pie = any(isinstance(p, Wedge) for p in ax.patches)  # slices: see too-many-slices
    sev = hue_severity(n)
    if sev and not is_pie:
        a.hazards.append(Hazard("too-many-colors", sev,
                                f"{a.name}: {n} colours in the legend; readers tell apart "
                                "about 7 (Miller 1956).",
                                "draw small multiples, or highlight a few and grey the rest"))
    if 2 <= n <= 30:
        worst = worst_confusion(colours)
        if worst and worst.delta_e < THRESHOLDS["cvd_delta_e"]:
            sight = "normal sight" if worst.vision == "normal" else f"simulated {worst.vision}"
            a.hazards.append(Hazard("cvd-confusable", "warn",
                                    f"{a.name}: legend colours {worst.pair[0]} and {worst.pair[1]} differ by "
                                    f"ΔE {worst.delta_e:.1f} (CAM02-UCS) for {sight} (Machado et al. 2009).",
                                    "use the Okabe & Ito palette, or label the series directly"))


def _check_colormaps(ax: Axes, a: AxesAudit) -> None:
    mappables = list(ax.images) + [c for c in ax.collections if c.get_array() is not None]
    seen = set()
    for m in mappables:
        cmap = m.get_cmap()
        if cmap.name in seen:
            continue
        seen.add(cmap.name)
        prof = lightness_profile(cmap_rgb(cmap))
        vmin, vmax = m.norm.vmin, m.norm.vmax
        signed = vmin is not None and vmax is not None and vmin < 0 < vmax
        if prof.kind == "non-monotonic" or (prof.kind == "diverging" and not signed):
            why = (f"its lightness rises and falls {prof.turns} time(s)" if prof.kind == "non-monotonic"
                   else "it is diverging but the values have no midpoint at zero")
            a.hazards.append(Hazard("rainbow-colormap", "warn",
                                    f"{a.name}: colormap '{cmap.name}' — {why}, so equal steps in value "
                                    "do not look equal.",
                                    "use 'viridis' or 'cividis' (sequential), or a diverging map centred "
                                    "on a meaningful midpoint"))


def _is_categorical(axis) -> bool:
    from matplotlib.category import UnitData

    return isinstance(getattr(axis, "units", None), UnitData)


def _text_ticks(axis) -> bool:
    if axis.get_scale() != "linear":  # log and other scales are numeric by construction
        return False
    labels = [t.get_text() for t in axis.get_ticklabels() if t.get_text()]
    if not labels:
        return False
    def numeric(s):
        if s.startswith("$") and s.endswith("$") and any(ch.isdigit() for ch in s):
            return True  # a formatter's maths: 10², 2×10³
        try:
            float(s.replace("−", "-").replace(",", ""))
            return True
        except ValueError:
            return False
    return not any(numeric(s) for s in labels)


def _check_lines(ax: Axes, a: AxesAudit) -> None:
    lines = [ln for ln in ax.lines if ln.get_visible() and len(ln.get_xdata()) > 2
             and ln.get_linestyle() not in ("None", "", " ", "none")]
    if not lines:
        return
    if _is_categorical(ax.xaxis) or _text_ticks(ax.xaxis):
        labels = [t.get_text() for t in ax.xaxis.get_ticklabels() if t.get_text()]
        if labels and not _looks_ordered(labels):
            a.hazards.append(Hazard("line-over-categories", "warn",
                                    f"{a.name}: a line joins {len(labels)} categories on the x axis "
                                    f"({', '.join(labels[:4])}{'…' if len(labels) > 4 else ''}) that "
                                    "have no order; its slopes mean nothing.",
                                    "use bars or dots, sorted by value", ("line",)))


def _looks_ordered(labels: list[str]) -> bool:
    """Month or weekday names, or labels that start with numbers, read as ordered."""
    months = ["jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "oct", "nov", "dec"]
    days = ["mon", "tue", "wed", "thu", "fri", "sat", "sun"]
    low = [s.strip().lower()[:3] for s in labels]
    if all(s in months for s in low) or all(s in days for s in low):
        return True
    return all(s[:1].isdigit() for s in labels)


def _check_scatter(ax: Axes, a: AxesAudit) -> None:
    from plotwise.engine.stats import hidden_share

    for c in ax.collections:
        if not isinstance(c, PathCollection):
            continue
        offs = c.get_offsets()
        if len(offs) < 50:
            continue
        px = ax.transData.transform(np.asarray(offs, dtype=float))
        sizes = c.get_sizes()
        area = float(np.median(sizes)) if len(sizes) else 36.0
        hidden = hidden_share(px[:, 0], px[:, 1], marker_px=np.sqrt(area) * ax.figure.dpi / 72.0)
        alpha = c.get_alpha()
        sev = overplot_severity(hidden)
        if sev and (alpha is None or alpha > THRESHOLDS["see_through_alpha"]):
            a.hazards.append(Hazard("overplotting", sev,
                                    f"{a.name}: about {hidden:.0%} of the {len(offs)} markers fall on top of "
                                    "another at their drawn size.",
                                    "use a hexbin or 2-D histogram, or small semi-transparent markers",
                                    ("scatter",)))
        if len(sizes) > 1 and len(np.unique(np.round(sizes, 6))) > 1:
            ratio = float(sizes.max() / max(sizes.min(), 1e-9))
            a.hazards.append(Hazard("area-encoding", "warn",
                                    f"{a.name}: marker area encodes a quantity (largest {ratio:.0f}× the "
                                    f"smallest); readers underestimate areas — a 10× larger area looks about "
                                    f"{10 ** STEVENS_EXPONENTS['area']:.0f}× larger (Stevens' exponent 0.7).",
                                    "put the quantity on a position axis, or label the values", ("scatter",)))


def _check_labels(ax: Axes, a: AxesAudit) -> None:
    if any(isinstance(p, Wedge) for p in ax.patches) or ax.name == "3d":
        return
    has_data = bool(ax.lines or ax.collections or [p for p in ax.patches if isinstance(p, Rectangle)])
    if not has_data:
        return
    missing = []
    for axis, label in ((ax.xaxis, ax.get_xlabel()), (ax.yaxis, ax.get_ylabel())):
        if not axis.get_visible() or label.strip():
            continue
        if _is_categorical(axis) or _text_ticks(axis) or not any(t.get_text() for t in axis.get_ticklabels()):
            continue
        missing.append(axis.axis_name)
    if missing:
        a.hazards.append(Hazard("unlabelled-axis", "warn",
                                f"{a.name}: the value axis {' and '.join(missing)} has no label: the reader "
                                "cannot tell what is measured or in which unit.",
                                "label each value axis with the quantity and its unit"))


def _check_ticks(ax: Axes, a: AxesAudit, renderer) -> None:
    for axis in (ax.xaxis, ax.yaxis):
        boxes = [t.get_window_extent(renderer) for t in axis.get_ticklabels()
                 if t.get_visible() and t.get_text()]
        overlaps = sum(1 for b1, b2 in zip(boxes, boxes[1:]) if b1.overlaps(b2))
        if overlaps:
            a.hazards.append(Hazard("crowded-ticks", "warn",
                                    f"{a.name}: {overlaps} pair(s) of {axis.axis_name} tick "
                                    "labels overlap and "
                                    "cannot be read.",
                                    "rotate the labels, show fewer ticks, or turn the chart horizontal"))


def _check_3d(ax: Axes, a: AxesAudit) -> None:
    if ax.name == "3d":
        a.hazards.append(Hazard("three-d", "warn",
                                f"{a.name}: a 3-D projection; perspective makes lengths and positions "
                                "depend on the viewing angle, and bars hide each other.",
                                "draw the data flat in 2-D (use colour or small multiples "
                                "for a third variable)"))


def _check_dual(axes: list[Axes], audits: list[AxesAudit]) -> None:
    for i, ax in enumerate(axes):
        for j in range(i + 1, len(axes)):
            other = axes[j]
            same_box = np.allclose(ax.get_position().bounds, other.get_position().bounds)
            if same_box and ax.get_shared_x_axes().joined(ax, other):
                audits[i].hazards.append(Hazard(
                    "dual-axis", "warn",
                    f"{audits[i].name} and {audits[j].name}: two value axes share one x axis; the "
                    "crossing points and relative slopes depend only on the arbitrary scales chosen.",
                    "draw two panels one above the other with a shared x axis, or index both series "
                    "to a common start"))
