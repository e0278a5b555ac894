"""The audit's records: what was found on each Axes (``AxesAudit``) and in the whole figure
(``AuditReport``), and the figure's picture with the flagged axes framed."""

from __future__ import annotations

import base64
import io
from dataclasses import dataclass, field

from matplotlib.axes import Axes
from matplotlib.figure import Figure, SubFigure
from matplotlib.patches import Rectangle

from plotwise.engine.hazards import Hazard, by_severity
from plotwise.engine.vocab import severity_rank
from plotwise.errors import PlotwiseError

# Codes only the audit of drawn figures reports (its other codes are the engine's registered
# hazard codes, with their meaning and severity order).
AUDIT_ONLY_CODES = {
    "three-d": "3-D axes",
    "dual-axis": "two value axes on one x",
    "area-encoding": "marker size encodes a quantity",
    "unlabelled-axis": "a value axis with no label",
    "crowded-ticks": "overlapping tick labels",
    "unreadable-text": "a label matplotlib cannot draw (broken maths markup)",
}


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
        """Every hazard found, most severe first (the advice's severity order)."""
        return by_severity([h for a in self.axes for h in a.hazards])

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
    sup = getattr(ax.figure, "_suptitle", None)
    title = ax.get_title() or (sup.get_text() if sup else "")
    return f"axes {i + 1}" + (f" '{title[:40]}'" if title else "")


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
