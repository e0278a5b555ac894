"""Conditions that more than one stage asks about, each written once: scoring's data fit and
the hazard checks read the same rule (and the same threshold from rules.THRESHOLDS)."""

from __future__ import annotations

from typing import TYPE_CHECKING

from plotwise.engine.rules import THRESHOLDS

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.engine.association import Influence
    from plotwise.engine.profile import FieldProfile
    from plotwise.engine.stats import MeanGap


def skewed(f: FieldProfile | None) -> bool:
    """Positive data with a heavy right tail spanning orders of magnitude: drawn and analysed on
    a log scale."""
    return (f is not None and f.level == "quantitative" and f.skew is not None
            and f.minimum is not None and f.maximum is not None and f.minimum > 0
            and f.skew > THRESHOLDS["skew_log"]
            and f.maximum / f.minimum >= THRESHOLDS["skew_span"])


def skewed_with_zeros(f: FieldProfile | None) -> bool:
    """Non-negative data, highly skewed (Bulmer 1979), with zeros among the values: a log axis
    would drop the zeros (zero-inflated counts and amounts)."""
    return (f is not None and f.level == "quantitative" and f.skew is not None
            and f.minimum == 0 and f.zeros > 0 and f.skew > THRESHOLDS["skew_log"])


def is_binary(f: FieldProfile | None) -> bool:
    """A 0/1 outcome (exact min and max from the profile)."""
    return (f is not None and f.level == "quantitative" and f.minimum is not None
            and f.maximum is not None and f.minimum >= 0 and f.maximum <= 1 and f.is_integer
            and f.distinct <= 2)


def is_influential(infl: Influence | None) -> bool:
    """One point drives the fitted line: Cook's distance above the threshold, or leverage so
    high that the line must pass through it."""
    return infl is not None and (infl.cooks_d > THRESHOLDS["cooks_d"]
                                 or infl.leverage >= THRESHOLDS["leverage_alone"])


def groups_overlap(gap: MeanGap | None) -> bool:
    """Group means closer than THRESHOLDS['hidden_spread_d'] pooled standard deviations."""
    return gap is not None and gap.d < THRESHOLDS["hidden_spread_d"]


def overplot_severity(hidden: float | None) -> str | None:
    """'warn' or 'severe' when that share of points hides behind others; None when few do."""
    if hidden is None or hidden <= THRESHOLDS["overplot_warn"]:
        return None
    return "severe" if hidden > THRESHOLDS["overplot_severe"] else "warn"


def hue_severity(n: int) -> str | None:
    """'warn' beyond about 7 colours, 'severe' beyond 10 (Miller 1956; common practice)."""
    if n <= THRESHOLDS["hues_warn"]:
        return None
    return "severe" if n > THRESHOLDS["hues_severe"] else "warn"


def too_many_slices(n: int) -> bool:
    return n > THRESHOLDS["pie_max_parts"]


def thin_slice(share: float | None) -> bool:
    return share is not None and share < THRESHOLDS["pie_min_share"]


def few_points(n: int | None) -> bool:
    """Too few points for a smoothed shape (a density or violin)."""
    return n is not None and n < THRESHOLDS["few_points"]


def lie_factor(first: float, second: float, drawn_first: float, drawn_second: float) -> float:
    """Tufte (1983): size of effect shown in the graphic / size of effect in the data, with
    size of effect = |second − first| / first."""
    data_effect = abs(second - first) / abs(first)
    shown_effect = abs(drawn_second - drawn_first) / abs(drawn_first)
    return shown_effect / data_effect


def kept_categories(design, profile) -> int | None:
    """How many categories a one-axis bar, dot or lollipop chart keeps when there are more than
    THRESHOLDS['max_shown_categories'] (the largest ones; the rest become one "all other" bar
    for counts and sums, or are left out and said so for averages); None when all are drawn."""
    from plotwise.engine.kinds import REGISTRY

    f = profile.fields.get(design.x) if design.x else None
    k = REGISTRY[design.kind]
    if (f is None or f.level != "nominal" or design.hue or design.facet or design.task == "trend"
            or not (k.summarises and k.axis_per_category) or k.parts != "none"):
        return None
    cap = THRESHOLDS["max_shown_categories"]
    return cap - 1 if f.distinct > cap else None


def drawn_labels(design, profile) -> int:
    """How many category labels a horizontal design stacks on its axis (0 for others)."""
    f = profile.fields.get(design.x) if design.x else None
    if not design.horizontal or f is None:
        return 0
    kept = kept_categories(design, profile)
    return kept + 1 if kept else f.distinct
