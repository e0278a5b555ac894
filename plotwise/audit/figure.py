"""Audit a chart that is already drawn: read a matplotlib Figure's artists (bars, wedges, lines,
collections, images, limits, scales, legends, projections) and report what could mislead, with
the same Hazard type as advise(). Drawing-side code: it reads figures, never changes them."""

from __future__ import annotations

import base64
import io
from dataclasses import dataclass, field

import numpy as np
from matplotlib.axes import Axes
from matplotlib.collections import PathCollection, PolyCollection
from matplotlib.figure import Figure, SubFigure
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle, Wedge

from plotwise.drawing.colours import cmap_rgb
from plotwise.engine.colour import lightness_profile, worst_confusion
from plotwise.engine.conditions import lie_factor
from plotwise.engine.hazards import Hazard
from plotwise.engine.rules import STEVENS_EXPONENTS, THRESHOLDS
from plotwise.engine.vocab import severity_rank
from plotwise.errors import PlotwiseError


@dataclass
class AxesAudit:
    """What the audit found on one Axes."""

    index: int
    name: str
    hazards: list[Hazard] = field(default_factory=list)
    lie_factor: float | None = None
    bars: list[float] = field(default_factory=list)  # bar values in data units, when bars exist
    labels: list[str] = field(default_factory=list)


@dataclass
class AuditReport:
    figure: Figure
    axes: list[AxesAudit]

    @property
    def hazards(self) -> list[Hazard]:
        return [h for a in self.axes for h in a.hazards]

    def hazard_codes(self) -> list[str]:
        return [h.code for h in self.hazards]

    @property
    def worst(self) -> str | None:
        return max((h.severity for h in self.hazards), key=severity_rank, default=None)

    def text(self) -> str:
        if not self.hazards:
            return "plotwise audit: no hazards found."
        lines = ["plotwise audit:"]
        for a in self.axes:
            for h in a.hazards:
                lines.append(f"  [{h.severity}] {h.code}: {h.message}")
                lines.append(f"      fix: {h.fix}")
        return "\n".join(lines)

    def marked_png(self) -> bytes:
        return marked_png(self)

    def _repr_mimebundle_(self, include=None, exclude=None):
        from plotwise.notebook.display import hazards_html

        png = self.marked_png()
        b64 = base64.b64encode(png).decode("ascii")
        html = (f"<div class='pw-audit'><img alt='audited figure' src='data:image/png;base64,{b64}'/>"
                f"<h4>What could mislead</h4>{hazards_html(self.hazards)}</div>")
        return {"text/plain": self.text(), "text/html": html, "image/png": b64}

    def __str__(self) -> str:
        return self.text()


def _axes_of(obj) -> tuple[Figure, list[Axes]]:
    if isinstance(obj, Axes):
        return obj.figure, [obj]
    if isinstance(obj, (Figure, SubFigure)):
        fig = obj.figure if isinstance(obj, SubFigure) else obj
        return fig, [a for a in obj.get_axes() if not _is_colorbar(a)]
    if hasattr(obj, "figure") and isinstance(obj.figure, Figure):  # seaborn grids
        return obj.figure, [a for a in obj.figure.get_axes() if not _is_colorbar(a)]
    raise PlotwiseError(f"audit needs a matplotlib Figure or Axes, got {type(obj).__name__}; "
                        "pass plt.gcf(), the Figure you made, or an Axes.")


def _is_colorbar(ax: Axes) -> bool:
    return ax.get_label() == "<colorbar>" or hasattr(ax, "_colorbar")


def _name(ax: Axes, i: int) -> str:
    title = ax.get_title() or (ax.figure._suptitle.get_text() if getattr(ax.figure, "_suptitle", None) else "")
    return f"axes {i + 1}" + (f" '{title[:40]}'" if title else "")


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
    small = [f for f in fractions if f < THRESHOLDS["pie_min_share"]]
    problems = []
    if len(wedges) > THRESHOLDS["pie_max_parts"]:
        problems.append(f"{len(wedges)} slices")
    if small:
        problems.append(f"{len(small)} slice(s) under {THRESHOLDS['pie_min_share']:.0%} (smallest "
                        f"{min(fractions):.1%})")
    if problems:
        a.hazards.append(Hazard("too-many-slices", "warn", f"{a.name}: a pie with " + " and ".join(problems) + ".",
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
    if n > THRESHOLDS["hues_warn"] and not is_pie:
        a.hazards.append(Hazard("too-many-colors", "severe" if n > THRESHOLDS["hues_severe"] else "warn",
                                f"{a.name}: {n} colours in the legend; readers tell apart about 7 (Miller 1956).",
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
    labels = [t.get_text() for t in axis.get_ticklabels() if t.get_text()]
    if not labels:
        return False
    def numeric(s):
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
        if hidden > THRESHOLDS["overplot_warn"] and (alpha is None or alpha > 0.3):
            a.hazards.append(Hazard("overplotting", "severe" if hidden > THRESHOLDS["overplot_severe"] else "warn",
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
                                    f"{a.name}: {overlaps} pair(s) of {axis.axis_name} tick labels overlap and "
                                    "cannot be read.",
                                    "rotate the labels, show fewer ticks, or turn the chart horizontal"))


def _check_3d(ax: Axes, a: AxesAudit) -> None:
    if ax.name == "3d":
        a.hazards.append(Hazard("three-d", "warn",
                                f"{a.name}: a 3-D projection; perspective makes lengths and positions "
                                "depend on the viewing angle, and bars hide each other.",
                                "draw the data flat in 2-D (use colour or small multiples for a third variable)"))


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


def audit(fig_or_axes) -> AuditReport:
    """Report the hazards in an already drawn Figure (or Axes)."""
    fig, axes = _axes_of(fig_or_axes)
    renderer = fig.canvas.get_renderer() if hasattr(fig.canvas, "get_renderer") else None
    if renderer is None:
        from matplotlib.backends.backend_agg import FigureCanvasAgg

        FigureCanvasAgg(fig)
        renderer = fig.canvas.get_renderer()
    fig.canvas.draw()  # lay out ticks and labels as the reader sees them
    audits = []
    for i, ax in enumerate(axes):
        a = AxesAudit(i, _name(ax, i))
        for check in (_check_3d, _check_bars, _check_fills, _check_pie, _check_colours,
                      _check_colormaps, _check_lines, _check_scatter, _check_labels):
            check(ax, a)
        _check_ticks(ax, a, renderer)
        audits.append(a)
    _check_dual(axes, audits)
    return AuditReport(fig, audits)


def marked_png(report: AuditReport) -> bytes:
    """The figure as drawn, with a numbered red frame around every axes that has a hazard
    (drawn on a copy of the pixels; the user's figure is not touched)."""
    from plotwise.drawing.render import plot_style

    fig = report.figure
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=fig.dpi)
    buf.seek(0)
    import matplotlib.image as mpimg

    img = mpimg.imread(buf)
    h, w = img.shape[:2]
    with plot_style():
        out = Figure(figsize=(w / 100, h / 100), dpi=100)
        ax = out.add_axes((0, 0, 1, 1))
        ax.imshow(img)
        ax.set_axis_off()
        for a, axes in zip(report.axes, _axes_of(fig)[1]):
            if not a.hazards:
                continue
            bb = axes.get_window_extent()
            x0, y0 = bb.x0 * w / fig.bbox.width, h - bb.y1 * h / fig.bbox.height
            ax.add_patch(Rectangle((x0, y0), bb.width * w / fig.bbox.width, bb.height * h / fig.bbox.height,
                                   fill=False, edgecolor="#B00020", linewidth=2))
            ax.text(x0 + 4, y0 + 4, f"{a.index + 1}: {', '.join(dict.fromkeys(x.code for x in a.hazards))}",
                    color="white", fontsize=8, va="top", bbox={"facecolor": "#B00020", "edgecolor": "none"})
        b = io.BytesIO()
        out.savefig(b, format="png", dpi=100)
    return b.getvalue()


def recover_frame(ax: Axes):
    """The data behind simple charts (bars, one line, one scatter), as a DataFrame and a task,
    so the advised alternative can be drawn from it; None when it cannot be recovered."""
    import pandas as pd

    orient, rects = _bars(ax)
    if orient:
        axis = ax.xaxis if orient == "v" else ax.yaxis
        labels = [t.get_text() for t in axis.get_ticklabels()]
        values = [(r.get_y() + r.get_height()) if orient == "v" else (r.get_x() + r.get_width()) for r in rects]
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
