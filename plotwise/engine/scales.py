"""Ordered scales held as plain text or numbers: agreement and frequency scales, low…high,
before/after, months, weekdays, quarters, years written as text, and small integer waves.
A column whose labels all belong to one scale keeps that scale's order on every axis, stack,
legend and hue; a scale of time points (``time``) can be a trend's x and a before/after period;
a scale with a neutral middle gets a diverging palette.

The scales are common practice (survey and calendar conventions)."""

from __future__ import annotations

import re
from dataclasses import dataclass


@dataclass(frozen=True)
class Scale:
    name: str
    words: tuple[str, ...]  # lower-case, in order
    time: bool = False  # its values are points in time
    neutral_middle: bool = False  # a midpoint that is neither side (diverging)


SCALES: tuple[Scale, ...] = (
    Scale("agreement", ("strongly disagree", "disagree", "somewhat disagree",
                        "neither agree nor disagree", "neutral", "somewhat agree", "agree",
                        "strongly agree"), neutral_middle=True),
    Scale("satisfaction", ("very dissatisfied", "dissatisfied", "neutral", "satisfied",
                           "very satisfied"), neutral_middle=True),
    Scale("likelihood", ("very unlikely", "unlikely", "neutral", "likely", "very likely"),
          neutral_middle=True),
    Scale("frequency", ("never", "rarely", "seldom", "sometimes", "often", "usually",
                        "very often", "always")),
    Scale("quality", ("very poor", "poor", "fair", "average", "good", "very good", "excellent")),
    Scale("amount", ("none", "very low", "low", "medium", "moderate", "high", "very high")),
    Scale("size", ("xs", "extra small", "s", "small", "m", "medium", "l", "large", "xl",
                   "extra large", "xxl")),
    Scale("before-after", ("before", "during", "after"), time=True),
    Scale("pre-post", ("pre", "baseline", "post", "follow-up"), time=True),
    Scale("start-end", ("start", "middle", "end"), time=True),
    Scale("first-last", ("first", "second", "third", "fourth", "fifth", "last"), time=True),
    Scale("months", ("january", "february", "march", "april", "may", "june", "july", "august",
                     "september", "october", "november", "december"), time=True),
    Scale("months-short", ("jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep",
                           "oct", "nov", "dec"), time=True),
    Scale("weekdays", ("monday", "tuesday", "wednesday", "thursday", "friday", "saturday",
                       "sunday"), time=True),
    Scale("weekdays-short", ("mon", "tue", "wed", "thu", "fri", "sat", "sun"), time=True),
    Scale("quarters", ("q1", "q2", "q3", "q4"), time=True),
)

# Integer columns with this few values whose name says they count waves, rounds or visits
# are time points (common practice).
WAVE_NAME_HINTS = ("wave", "round", "visit", "period", "phase", "session", "semester",
                   "cohort")
NUMBER_TEXT = re.compile(r"^\s*[-+]?\d+(\.\d+)?\s*$")
MAX_NUMBER_TEXT_LEVELS = 12  # more number-like labels than this are codes, not a scale


@dataclass(frozen=True)
class Order:
    """A recognised order for a column's labels (in the column's own spelling)."""

    labels: tuple
    scale: str
    time: bool
    neutral_middle: bool


def _norm(label) -> str:
    return " ".join(str(label).strip().lower().replace("_", " ").split())


def text_order(labels: tuple) -> Order | None:
    """The order of text labels that all belong to one scale, or are all numbers (years
    written as text are time points); None when they do not."""
    labels = tuple(v for v in labels if isinstance(v, str))
    if len(labels) < 2:
        return None
    if all(NUMBER_TEXT.match(v) for v in labels) and len(labels) <= MAX_NUMBER_TEXT_LEVELS:
        ranked = tuple(sorted(labels, key=float))
        years = all(v.strip().isdigit() and 1000 <= int(v) <= 2999 for v in labels)
        return Order(ranked, "years as text" if years else "numbers as text", years, False)
    normed = {_norm(v): v for v in labels}
    if len(normed) != len(labels):
        return None
    for s in SCALES:
        if set(normed) <= set(s.words):
            ranked = tuple(normed[w] for w in s.words if w in normed)
            middle = s.neutral_middle and any(
                w in normed for w in ("neutral", "neither agree nor disagree"))
            return Order(ranked, s.name, s.time, middle)
    return None
