"""The engine's vocabulary: measurement levels, tasks, statistics and severities as ``Literal``
aliases (what a type checker reads) with the same names as tuples (what the code checks at run
time). Chart kinds live in the kind registry (plotwise.engine.kinds), which refuses unknown names
the same way."""

from __future__ import annotations

from typing import Literal, get_args

from plotwise.errors import PlotwiseError

Level = Literal["nominal", "ordinal", "quantitative", "temporal"]
Task = Literal["compare", "trend", "proportion", "correlate", "distribution"]
# raw: every row; value: one row per group, drawn as it is; distribution: the rows' spread;
# correlation: a matrix of coefficients; the rest are per-group statistics.
Stat = Literal["raw", "value", "count", "sum", "mean", "median", "distribution", "correlation"]
Severity = Literal["info", "warn", "severe"]  # in rising order
Agg = Literal["sum", "mean", "median", "count"]  # what the caller may ask for with agg=

LEVELS: tuple[str, ...] = get_args(Level)
TASKS: tuple[str, ...] = get_args(Task)
STATS: tuple[str, ...] = get_args(Stat)
SEVERITIES: tuple[str, ...] = get_args(Severity)
AGGS: tuple[str, ...] = get_args(Agg)


def checked(value: str, allowed: tuple[str, ...], what: str) -> str:
    """``value`` when it is one of ``allowed``; otherwise a PlotwiseError naming the choices."""
    if value not in allowed:
        raise PlotwiseError(f"unknown {what} {value!r}; use one of: {', '.join(allowed)}.")
    return value


def severity_rank(severity: str) -> int:
    """0 for info, 1 for warn, 2 for severe: the one severity order of advice and audit."""
    return SEVERITIES.index(severity)
