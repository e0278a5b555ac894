"""Audit a chart that is already drawn: read a matplotlib Figure's artists (bars, wedges, lines,
collections, images, limits, scales, legends, projections) and report what could mislead, with
the same Hazard type, codes and severity order as advise(). It reads figures, never changes
them. The checks live in checks.py; recovering the data behind a simple chart in recover.py."""

from __future__ import annotations

from plotwise.drawing.snippet import short
from plotwise.engine.hazards import Hazard
from plotwise.figure_audit import checks as c
from plotwise.figure_audit.recover import recover_frame  # noqa: F401  (part of this module's API)
from plotwise.figure_audit.report import AuditReport, AxesAudit, _axes_of, _name

AXES_CHECKS = (c._check_3d, c._check_bars, c._check_fills, c._check_pie, c._check_colours,
               c._check_colormaps, c._check_lines, c._check_scatter, c._check_labels)


def audit(fig_or_axes) -> AuditReport:
    """Report the hazards in an already drawn Figure (or Axes)."""
    fig, axes = _axes_of(fig_or_axes)
    renderer = fig.canvas.get_renderer() if hasattr(fig.canvas, "get_renderer") else None
    if renderer is None:
        from matplotlib.backends.backend_agg import FigureCanvasAgg

        FigureCanvasAgg(fig)
        renderer = fig.canvas.get_renderer()
    unreadable = _draw_or_why(fig)  # lay out ticks and labels as the reader sees them
    audits = []
    for i, ax in enumerate(axes):
        a = AxesAudit(i, _name(ax, i))
        for check in AXES_CHECKS:
            check(ax, a)
        if unreadable is None:
            c._check_ticks(ax, a, renderer)
        elif i == 0:
            a.hazards.append(Hazard(
                "unreadable-text", "severe",
                f"the figure cannot be drawn: a label holds text that matplotlib reads as a "
                f"maths expression and cannot parse ({short(unreadable, 120)}).",
                "write a dollar sign as \\$ in labels, or draw with "
                "matplotlib.rcParams['text.parse_math'] = False"))
        audits.append(a)
    c._check_dual(axes, audits)
    return AuditReport(fig, audits)


def _draw_or_why(fig) -> str | None:
    """Draw the figure; the parser's complaint when a label's maths cannot be drawn."""
    try:
        fig.canvas.draw()
    except ValueError as exc:  # mathtext's parse errors are ValueErrors
        return str(exc).splitlines()[0] if str(exc) else type(exc).__name__
    return None
