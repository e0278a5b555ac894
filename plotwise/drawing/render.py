"""Drawing: runs each design's generated code (plotwise.codegen) on a matplotlib Figure made
inside style context managers, so the user's global matplotlib/seaborn settings never change and
no pyplot figure is left open."""

from __future__ import annotations

import threading
import warnings
from contextlib import contextmanager

import matplotlib as mpl
import matplotlib.dates as mdates
import numpy as np
import pandas as pd
import seaborn as sns
from matplotlib.axes import Axes
from matplotlib.category import StrCategoryFormatter
from matplotlib.figure import Figure
from matplotlib.text import Text
from matplotlib.ticker import FixedFormatter

from plotwise.drawing.codegen import body_lines, engine_queries, query_line, short
from plotwise.drawing.marks import mark_surprises
from plotwise.engine.conditions import drawn_labels
from plotwise.engine.design import Design
from plotwise.engine.profile import Profile
from plotwise.engine.rules import LABEL_HEIGHT_IN, PANEL_DPI, PANEL_SIZE_IN
from plotwise.engine.surprises import Surprise
from plotwise.errors import PlotwiseError

PANEL_WIDTH_IN, PANEL_HEIGHT_IN = PANEL_SIZE_IN  # one panel geometry: drawing and overplotting
PANEL_MARGIN_IN = 1.6  # titles, axis label and ticks around stacked labels


# matplotlib's rcParams are process-wide: two threads each inside a style block would restore
# each other's settings. Style blocks (and drawing a plotwise figure) take turns.
STYLE_LOCK = threading.RLock()


class LiteralFigure(Figure):
    """A plotwise Figure. It renders in plotwise's style whatever the global style is at that
    moment (tick labels made while rendering take their size from it), and its text is drawn
    literally: a '$' in a column name or label is a dollar sign, never the start of maths."""

    def draw(self, renderer):
        with plot_style():
            # every Axes, also those of subfigures (Figure.axes lists only its own)
            literal_text(self.findobj(Axes), self)
            return super().draw(renderer)


def literal_text(axes, root) -> None:
    """Draw the user's strings literally: every Text under ``root`` (labels, titles, legends,
    annotations) and the tick labels of category axes, whose labels are data values. Numeric
    axes keep matplotlib's maths (a log axis labels its ticks 10², written as mathtext)."""
    numeric = []
    for ax in axes:
        for axis in (ax.xaxis, ax.yaxis):
            if isinstance(axis.get_major_formatter(), (StrCategoryFormatter, FixedFormatter)):
                # make the ticks now (a category axis has a fixed number), so none is made
                # while drawing with the default maths parsing
                for tick in axis.get_major_ticks(len(axis.get_majorticklocs())):
                    tick.label1.set_parse_math(False)
                    tick.label2.set_parse_math(False)
            else:
                numeric.append(axis)
    for text in root.findobj(Text):
        text.set_parse_math(False)
    for axis in numeric:
        # the ticks for the current locations, made now (minor ticks of a log axis too), keep
        # the maths their formatter writes
        for tick in axis.get_major_ticks() + axis.get_minor_ticks():
            tick.label1.set_parse_math(True)
            tick.label2.set_parse_math(True)
        axis.offsetText.set_parse_math(True)


@contextmanager
def plot_style():
    """plotwise's look, applied only inside the block (one thread at a time)."""
    with STYLE_LOCK, mpl.rc_context(), sns.axes_style("ticks"), \
            sns.plotting_context("notebook", font_scale=0.75):
        mpl.rcParams["figure.dpi"] = PANEL_DPI
        mpl.rcParams["savefig.dpi"] = PANEL_DPI
        with warnings.catch_warnings(), np.errstate(all="ignore"):
            # seaborn 0.13.2 with matplotlib 3.11 / pandas 3: deprecation chatter, not user news.
            warnings.filterwarnings("ignore", category=FutureWarning)
            warnings.filterwarnings("ignore", category=DeprecationWarning)
            warnings.filterwarnings("ignore", category=PendingDeprecationWarning)
            warnings.filterwarnings("ignore", message=".*vert.*")
            yield


def draw(design: Design, df, ax: Axes, profile: Profile | None = None) -> Axes:
    """Draw one design on the caller's Axes (small multiples subdivide its area)."""
    profile = profile or design.profile
    if profile is None:
        raise PlotwiseError("this design was not made by plotwise.advise(); call advise() first.")
    lines = body_lines(design, profile, "df")
    namespace = {"pd": pd, "np": np, "sns": sns, "mpl": mpl, "mdates": mdates, "ax": ax,
                 "df": df}
    try:
        if profile.source is not None:  # engine data: the queries need the engine's namespace
            namespace.update({k: v for k, v in profile.source.namespace().items() if k != "df"})
            # The snippet's query, evaluated by the Source: the same text, asked of the engine
            # once however many of the shown designs ask it.
            for var, expr in engine_queries(design, profile, "df"):
                line = query_line(var, expr)
                if line in lines and df is profile.source.native:
                    namespace[var] = profile.source.run(expr)
                    lines.remove(line)
        fig = ax.figure  # (small multiples replace ``ax`` by a grid of their own)
        with plot_style():
            exec(compile("\n".join(lines), f"<plotwise {design.kind}>", "exec"), namespace)  # noqa: S102
            literal_text(fig.axes, fig)  # also on the caller's own figure
    except PlotwiseError as exc:
        if exc.__cause__ is None:  # plotwise's own refusal, already worded for the reader
            raise
        raise cannot_draw(design, str(exc)) from exc.__cause__
    except Exception as exc:  # the drawing libraries' errors become one readable message
        raise cannot_draw(design, f"{type(exc).__name__}: {short(str(exc), 200)}") from exc
    return ax


def cannot_draw(design: Design, why: str) -> PlotwiseError:
    return PlotwiseError(
        f"could not draw the {design.title} design of {', '.join(map(repr, design.columns))}: "
        f"{why}. Try another design from advice.designs, or check the columns' values.")


def panel_height(designs: list[Design]) -> float:
    """The panel height: the standard one, or taller when a design stacks many category labels
    on its axis (each needs LABEL_HEIGHT_IN)."""
    rows = max((drawn_labels(d, d.profile) for d in designs if d.profile is not None), default=0)
    return max(PANEL_HEIGHT_IN, LABEL_HEIGHT_IN * rows + PANEL_MARGIN_IN)


def panel_title(rank: int, design: Design) -> str:
    return f"{rank} · {short(design.title, 48)} · score {design.score:.2f}"


def ask_together(designs: list[Design], df) -> None:
    """On engine data, the queries of every design about to be drawn go to the engine together
    (Dask: one ``dask.compute`` for them all); each design then finds its answer kept."""
    for design in designs:
        src = design.profile.source if design.profile is not None else None
        if src is not None and df is src.native:
            # (should the engine refuse, each design asks again and reports its own error)
            src.prefetch([expr for d in designs if d.profile is design.profile
                          for _, expr in engine_queries(d, d.profile, "df")])
            return


def draw_row(designs: list[Design], df: pd.DataFrame, ranks: list[int] | None = None,
             notes: list[str] | None = None, surprises: list[Surprise] | None = None,
             prefix: str = "") -> Figure:
    """A Figure with the given designs side by side, each titled with rank, kind and score;
    ``surprises`` are marked where a panel's axes can place them."""
    if not designs:
        raise PlotwiseError("there are no designs to draw.")
    ranks = ranks or list(range(1, len(designs) + 1))
    ask_together(designs, df)
    with plot_style():
        fig = LiteralFigure(figsize=(PANEL_WIDTH_IN * len(designs), panel_height(designs)),
                     layout="constrained")
        subs = fig.subfigures(1, len(designs), wspace=0.02, squeeze=False)[0]
        for i, (sub, design) in enumerate(zip(subs, designs)):
            ax = sub.subplots()
            draw(design, df, ax)
            if surprises:
                mark_surprises(ax, design, surprises)
            sub.suptitle(prefix + panel_title(ranks[i], design), fontsize=10,
                         fontweight="bold")
            if notes and i < len(notes) and notes[i]:
                sub.supxlabel(notes[i], fontsize=7, color="#555555")
    return fig


SHEET_COLUMNS = 4
SHEET_PANEL_IN = (3.6, 3.0)  # a thumbnail panel of the sheet: small, still readable


def draw_sheet(designs: list[Design], df, ranks: list[int], more: int = 0) -> Figure:
    """Every given design as a small panel in one Figure, ranked; ``more`` designs left out are
    counted below the panels."""
    if not designs:
        raise PlotwiseError("there are no designs to draw.")
    cols = min(SHEET_COLUMNS, len(designs))
    rows = -(-len(designs) // cols)
    w, h = SHEET_PANEL_IN
    with plot_style():
        fig = LiteralFigure(figsize=(w * cols, h * rows + (0.3 if more else 0)),
                            layout="constrained")
        subs = fig.subfigures(rows, cols, squeeze=False, wspace=0.02, hspace=0.02)
        for i, sub in enumerate(subs.flat):
            if i >= len(designs):
                continue
            d = designs[i]
            ax = sub.subplots()
            try:
                draw(d, df, ax)
            except PlotwiseError as exc:  # one design that cannot be drawn does not sink the sheet
                ax.clear()
                ax.set_axis_off()
                ax.text(0.5, 0.5, short(str(exc), 80), ha="center", va="center", wrap=True,
                        fontsize=7, transform=ax.transAxes, parse_math=False)
            sub.suptitle(f"{ranks[i]} · {short(d.title, 34)} · {d.score:.2f}", fontsize=9,
                         fontweight="bold")
        if more:
            fig.supxlabel(f"and {more} more expressive design{'s' if more > 1 else ''} "
                          "(advice.table() lists them all)", fontsize=8, color="#555555")
    return fig
