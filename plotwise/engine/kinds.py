"""The chart-kind registry: one typed record per chart kind, and every "which kinds do X"
question answered from it.

A record says which tasks the kind serves (and how well), which encoding channels it may use,
how its marks encode values (lengths from zero, parts of a whole, a connecting line), what it
draws (per-group aggregates, every row, or binned counts), how it is drawn on large data and on
engine data, and whether it can take a log axis or small multiples. Code generators are
registered for each kind by plotwise.drawing (the engine knows nothing of drawing); a test checks
that every kind here has one.

Task fit values (how well a kind answers a task, 0..1) are common practice: ordered by the
rankings of Cleveland & McGill (1984) and Mackinlay (1986) for the channel the task reads, then
tuned on the open datasets in the tests."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Literal

from plotwise.engine.vocab import TASKS
from plotwise.errors import PlotwiseError

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.engine.design import Design

Draws = Literal["groups", "rows", "bins"]
Large = Literal["aggregate", "sample", "prebin", "bin-sample"]
EngineMode = Literal["groups", "bins", "rows"]
Parts = Literal["none", "stacked", "whole"]


@dataclass(frozen=True)
class ChartKind:
    """Everything the engine knows about one chart kind."""

    name: str
    task_fit: dict[str, float]  # task -> how well the kind answers it, 0..1 (common practice)
    channels: tuple[str, ...]  # encoding channels it may use (keys of rules.CHANNEL_TO_PERCEPTUAL)
    draws: Draws  # one mark per group aggregate, one per row, or binned counts
    large: Large  # large data: aggregate first, draw a sample, count into bins, or sample then bin
    engine: EngineMode  # engine data: one row per group, counts per bin, or a bounded sample
    length_from_zero: bool = False  # bar or filled-area lengths start at zero (a baseline)
    parts: Parts = "none"  # marks are parts of one whole ("whole") or stacked parts ("stacked")
    connects: bool = False  # a line joins the x values, stating an order
    trend_line: bool = False  # a line (or filled area) through many time points
    log_axis: bool = False  # draws raw values on a position axis, so can take a log axis
    facets: bool = False  # offered as small multiples when a hue has too many levels
    overplots: bool = False  # one mark per row: marks can hide each other
    smooths: bool = False  # a kernel density estimate of the values
    bins_values: bool = False  # treats values as continuous (binned or smoothed)
    shows_spread: bool = False  # each group's spread (quartiles or every point)
    shows_shape: bool = False  # the distribution's shape, modes included
    summarises: bool = False  # one summary number per group (averages hide spread and modes)
    hides_modes: bool = False  # summarises a distribution by quartiles, hiding its modes
    axis_per_category: bool = False  # one mark per category along an axis (crowds beyond a limit)


def _k(name: str, fit: dict[str, float], channels: str, draws: Draws, large: Large,
       engine: EngineMode, **traits) -> ChartKind:
    return ChartKind(name, fit, tuple(c.strip() for c in channels.split(",")), draws, large,
                     engine, **traits)


# One record per kind. Channels: x/y position, length, angle, area, hue, lightness, connection
# (facet is added for kinds that take small multiples).
REGISTRY: dict[str, ChartKind] = {k.name: k for k in (
    _k("bar", {"compare": 1.0, "trend": 0.7, "proportion": 0.95}, "x position, length, hue",
       "groups", "aggregate", "groups", length_from_zero=True, facets=True, summarises=True,
       axis_per_category=True),
    _k("dot", {"compare": 0.92, "trend": 0.6, "proportion": 0.8},
       "x position, y position, hue", "groups", "aggregate", "groups", facets=True,
       summarises=True, axis_per_category=True),
    _k("lollipop", {"compare": 0.85, "proportion": 0.75}, "x position, length", "groups",
       "aggregate", "groups", length_from_zero=True, summarises=True, axis_per_category=True),
    _k("grouped-bar", {"compare": 0.95, "proportion": 0.75}, "x position, length, hue",
       "groups", "aggregate", "groups", length_from_zero=True, summarises=True,
       axis_per_category=True),
    _k("stacked-bar", {"compare": 0.6, "trend": 0.55, "proportion": 0.7},
       "x position, length, hue", "groups", "aggregate", "groups", length_from_zero=True,
       parts="stacked", axis_per_category=True),
    _k("stacked-bar-100", {"proportion": 0.9}, "x position, length, hue", "groups", "aggregate",
       "groups", length_from_zero=True, parts="whole"),
    _k("pie", {"compare": 0.3, "proportion": 0.75}, "angle, hue", "groups", "aggregate",
       "groups", parts="whole"),
    _k("line", {"compare": 0.5, "trend": 1.0}, "x position, y position, connection, hue",
       "groups", "aggregate", "groups", connects=True, trend_line=True, facets=True),
    _k("area", {"trend": 0.75}, "x position, length", "groups", "aggregate", "groups",
       length_from_zero=True, connects=True, trend_line=True, facets=True),
    _k("slope", {"compare": 0.95, "trend": 0.95}, "x position, y position, connection",
       "groups", "aggregate", "groups", connects=True),
    _k("difference-bar", {"compare": 0.95, "trend": 0.9}, "y position, length", "groups",
       "aggregate", "groups", length_from_zero=True),
    _k("heatmap", {"compare": 0.7, "trend": 0.65, "proportion": 0.6, "correlate": 0.8},
       "x position, y position, lightness", "groups", "aggregate", "groups"),
    _k("scatter", {"correlate": 1.0}, "x position, y position, hue", "rows", "sample", "rows",
       log_axis=True, facets=True, overplots=True),
    _k("regression", {"correlate": 0.95}, "x position, y position, hue", "rows", "sample",
       "rows", facets=True, overplots=True),
    _k("hexbin", {"correlate": 0.85}, "x position, y position, lightness", "bins", "bin-sample",
       "rows", log_axis=True),
    _k("histogram", {"distribution": 1.0}, "x position, length, hue", "bins", "prebin", "bins",
       length_from_zero=True, log_axis=True, facets=True, bins_values=True, shows_shape=True),
    _k("density", {"distribution": 0.85}, "x position, y position, hue", "rows", "sample",
       "rows", log_axis=True, facets=True, smooths=True, bins_values=True, shows_shape=True),
    _k("ecdf", {"distribution": 0.8}, "x position, y position, hue", "rows", "sample", "rows",
       log_axis=True, shows_shape=True),
    _k("box", {"compare": 0.8, "distribution": 0.75}, "x position, y position", "rows",
       "sample", "rows", log_axis=True, shows_spread=True, hides_modes=True),
    _k("violin", {"compare": 0.7, "distribution": 0.78}, "x position, y position", "rows",
       "sample", "rows", log_axis=True, smooths=True, bins_values=True, shows_spread=True,
       shows_shape=True),
    _k("strip", {"compare": 0.75, "distribution": 0.72}, "x position, y position", "rows",
       "sample", "rows", log_axis=True, overplots=True, shows_spread=True, shows_shape=True),
    _k("count-bar", {"distribution": 1.0}, "x position, length, hue", "groups", "aggregate",
       "groups", length_from_zero=True),
)}

KINDS: tuple[str, ...] = tuple(REGISTRY)


def kind(name: str) -> ChartKind:
    """The record of ``name``; a PlotwiseError naming the known kinds for any other name."""
    try:
        return REGISTRY[name]
    except (KeyError, TypeError):
        raise PlotwiseError(f"unknown chart kind {name!r}; plotwise knows: "
                            f"{', '.join(KINDS)}.") from None


def kinds_where(**traits) -> tuple[str, ...]:
    """Names of the kinds whose records have all of ``traits``, e.g. kinds_where(overplots=True)."""
    return tuple(k.name for k in REGISTRY.values()
                 if all(getattr(k, t) == v for t, v in traits.items()))


def task_fit(task: str, name: str) -> float | None:
    """How well kind ``name`` answers ``task`` (None: it does not serve that task)."""
    return REGISTRY[name].task_fit.get(task)


def kinds_for(task: str) -> tuple[str, ...]:
    return tuple(k.name for k in REGISTRY.values() if task in k.task_fit)


def is_binned_pairs(design: Design) -> bool:
    """A heatmap of two variables' joint counts (or a correlation matrix): drawn from rows."""
    return design.kind == "heatmap" and (design.task == "correlate"
                                         or bool(design.options.matrix))


def engine_mode(design: Design) -> EngineMode:
    """How engine data reaches a design: 'groups' (one row per group, computed by the engine),
    'bins' (row counts per histogram bin, computed by the engine) or 'rows' (a bounded sample).
    A histogram split by hue and a heatmap of joint counts take rows."""
    mode = REGISTRY[design.kind].engine
    if mode == "groups" and is_binned_pairs(design):
        return "rows"
    if mode == "bins" and design.hue:
        return "rows"
    return mode


def large_mode(design: Design) -> Large:
    """How a design is drawn on large data (see the record's ``large``), for this variant."""
    mode = REGISTRY[design.kind].large
    if mode == "prebin" and design.hue:
        return "sample"
    if mode == "aggregate" and design.kind == "heatmap" and design.task == "correlate":
        return "bin-sample"
    return mode


assert all(set(k.task_fit) <= set(TASKS) for k in REGISTRY.values())
