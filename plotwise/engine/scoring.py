"""Scoring: Mackinlay's expressiveness test, then effectiveness from the published channel
rankings, task fit and data fit. Every number that moves a score is written into the design's
reasons, so a reader can follow it."""

from __future__ import annotations

from plotwise.engine.datafit import data_fit
from plotwise.engine.design import Design
from plotwise.engine.kinds import REGISTRY, task_fit
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.rules import (
    CHANNEL_TO_PERCEPTUAL,
    INEXPRESSIVE_FACTOR,
    MACKINLAY_1986,
    NON_ALIGNED_FACTOR,
    OTHER_ROLE_WEIGHT,
    ROLE_WEIGHTS,
    SCORE_WEIGHTS,
    STEVENS_EXPONENTS,
    THRESHOLDS,
    UNLISTED_TASK_FIT,
)
from plotwise.engine.stats import DesignStats

ORDINALS = {1: "1st", 2: "2nd", 3: "3rd"}


def _nth(k: int) -> str:
    return ORDINALS.get(k, f"{k}th")


def ranking_level(level: str) -> str:
    """Which column of Mackinlay's table a measurement level uses (temporal ranks as ordinal)."""
    return "ordinal" if level == "temporal" else level


def channel_rank(level: str, channel: str) -> tuple[int, int]:
    """(rank, table length) of an encoding channel for data of ``level`` (Mackinlay 1986)."""
    table = MACKINLAY_1986[ranking_level(level)]
    perceptual = CHANNEL_TO_PERCEPTUAL[channel]
    return table.index(perceptual) + 1, len(table)


def channel_score(level: str, channel: str) -> float:
    """1.0 for the best channel, falling linearly to 0.0 for the last of the 13."""
    rank, n = channel_rank(level, channel)
    return 1.0 - (rank - 1) / (n - 1)


def _level_of(profile: Profile, column: str) -> str:
    f = profile.fields.get(column)
    return f.level if f is not None else "quantitative"  # derived: count, density, share


def effectiveness(design: Design, profile: Profile) -> tuple[float, list[str]]:
    """Weighted mean of channel scores, each column weighted by its role."""
    role_of: dict[str, str] = {}
    for role, col in design.roles.items():
        role_of.setdefault(col, role)
    best: dict[str, tuple[float, str]] = {}
    for channel, col in design.encoding.items():
        if channel == "connection":
            continue  # a line's connection states order; judged by expressiveness, not ranked
        level = _level_of(profile, col)
        s = channel_score(level, channel)
        # Stacked segments sit on non-aligned baselines: Cleveland & McGill (1984) put such
        # judgements below aligned ones; score them as length on a shifted scale.
        if design.options.non_aligned and channel == "length":
            s *= NON_ALIGNED_FACTOR
        if col not in best or s > best[col][0]:
            best[col] = (s, channel)
    total = weight = 0.0
    words = []
    for col, (s, channel) in best.items():
        role = role_of.get(col, "category")
        w = ROLE_WEIGHTS.get(role, OTHER_ROLE_WEIGHT)
        total += w * s
        weight += w
        level = _level_of(profile, col)
        rank, n = channel_rank(level, channel)
        perceptual = CHANNEL_TO_PERCEPTUAL[channel]
        words.append(f"'{col}' ({ranking_level(level)}) on {perceptual}: {_nth(rank)} of {n}")
    eff = total / weight if weight else 0.0
    reason = ("encoding " + "; ".join(words) + f" for its kind of data (Mackinlay 1986) "
              f"→ effectiveness {eff:.2f}")
    if design.options.non_aligned:
        reason += ("; stacked segments start from shifting baselines, read less accurately than "
                   "aligned bars (Cleveland & McGill 1984)")
    return eff, [reason]


# ----------------------------------------------------------------------------------------------
# Expressiveness (Mackinlay 1986): a design that states something false is kept last.
# ----------------------------------------------------------------------------------------------
def expressiveness(design: Design, profile: Profile, stats: DesignStats | None = None) -> list[str]:
    """Reasons the design would state something false about the data; empty when expressive."""
    f = profile.fields
    k = REGISTRY[design.kind]
    bad = []
    if k.connects and design.x in f and f[design.x].level == "nominal":
        bad.append(f"a line joining the values of '{design.x}' states an order those "
                   "categories do not have")
    measure = design.y if design.y in f else None
    mf: FieldProfile | None = f[measure] if measure else None
    if mf is not None and (k.length_from_zero or k.parts != "none") and mf.zero_meaningful is False:
        bad.append(f"bar or area length from zero means nothing for '{measure}', whose zero "
                   "is arbitrary (an interval scale)")
    if k.parts != "none" and mf is not None:
        if mf.minimum is not None and mf.minimum < 0:
            bad.append(f"'{measure}' has negative values ({mf.minimum:.4g}): they cannot be "
                       "parts of one whole")
        if design.stat == "mean":
            bad.append(f"averages of '{measure}' are not parts of one whole; stacking or "
                       "slicing them adds numbers that do not add up")
    if design.options.time_as_categories and design.x in f and \
            f[design.x].distinct > THRESHOLDS["max_bars"]:
        bad.append(f"{f[design.x].distinct} time points as separate bars or cells: their "
                   "labels cannot be read and even spacing hides the calendar; a line shows them")
    parts = design.encoding.get("hue") if k.parts != "none" else None
    if parts in f and f[parts].distinct > THRESHOLDS["hues_severe"]:
        bad.append(f"{f[parts].distinct} parts of '{parts}' in one {design.kind}: more colours "
                   "than a reader can match to a legend (Miller 1956), so the parts cannot be "
                   "read")
    total = stats.share_total if stats is not None else None
    if k.parts == "whole" and total is not None and not total.adds_up:
        bad.append(f"the shares in '{measure}' add to {total.sum:.4g}, not {total.whole}: "
                   "they are not parts of one whole")
    if design.kind == "pie" and design.task == "compare" and design.stat not in ("sum", "count", "value"):
        bad.append("a pie says the values are shares of one whole, which a comparison of "
                   f"{design.stat}s is not")
    return bad


def stevens_note(design: Design) -> str | None:
    """Perceived-magnitude note for area or lightness encodings (Stevens 1957)."""
    a = None
    if "area" in design.encoding:
        a, what = STEVENS_EXPONENTS["area"], "area"
    elif "lightness" in design.encoding:
        a, what = STEVENS_EXPONENTS["brightness"], "lightness"
    if a is None:
        return None
    return (f"values read from {what} are underestimated: a 10× larger value looks about "
            f"{10 ** a:.0f}× larger (Stevens' exponent {a})")


def score_design(design: Design, profile: Profile, stats: DesignStats) -> Design:
    """Fill in design.score, design.parts, design.expressive and design.reasons."""
    eff, eff_words = effectiveness(design, profile)
    listed = task_fit(design.task, design.kind)
    tfit = UNLISTED_TASK_FIT if listed is None else listed
    fit, fit_words = data_fit(design, profile, stats)
    W = SCORE_WEIGHTS
    score = W["effectiveness"] * eff + W["task_fit"] * tfit + W["data_fit"] * fit
    bad = expressiveness(design, profile, stats)
    design.expressive = not bad
    if bad:
        score *= INEXPRESSIVE_FACTOR
    design.score = round(max(0.0, min(1.0, score)), 4)
    design.parts = {"effectiveness": round(eff, 3), "task_fit": tfit, "data_fit": round(fit, 3)}
    headline = _headline(design, profile)
    reasons = [headline]
    reasons += [f"not expressive, kept last: {b} (Mackinlay 1986)" for b in bad]
    reasons += eff_words
    reasons.append(f"task fit for {design.task}: {tfit:.2f} (common practice)")
    reasons += [f"data fit: {w}" for w in fit_words]
    note = stevens_note(design)
    if note:
        reasons.append(note)
    reasons.append(f"score = {W['effectiveness']}×{eff:.2f} + {W['task_fit']}×{tfit:.2f} + "
                   f"{W['data_fit']}×{fit:.2f}" + (f" × {INEXPRESSIVE_FACTOR}" if bad else "")
                   + f" = {design.score:.2f}")
    design.reasons = reasons
    return design


STAT_WORDS = {
    "sum": "total", "mean": "average", "median": "median", "count": "count of rows", "share": "share",
    "raw": "values", "value": "values", "distribution": "distribution",
}


def _headline(design: Design, profile: Profile) -> str:
    k = design.kind
    what = STAT_WORDS.get(design.stat, design.stat)
    y = design.y
    measure = f"{what} of '{y}'" if y and design.stat in ("sum", "mean", "median", "value") else (
        f"'{y}'" if y else "row counts")
    x = design.x
    if k in ("bar", "dot", "lollipop"):
        s = f"{measure} per '{x}'"
        if design.options.share:
            s = f"each '{x}' as a share of the total {('of ' + repr(y)) if y else 'rows'}"
        s += ", sorted by value" if profile.fields[x].level == "nominal" else ""
        return f"{k} chart of {s}" + (" by " + repr(design.hue) if design.hue else "")
    if k in ("grouped-bar", "stacked-bar"):
        return f"{k} of {measure} per '{x}', split by '{design.hue}'"
    if k == "stacked-bar-100":
        return (f"100% bar of '{x}' shares" + (f" within each '{design.hue}'" if design.hue else ""))
    if k == "pie":
        return f"pie of {measure} across the {profile.fields[x].distinct} values of '{x}'"
    if k in ("line", "area"):
        return f"{k} of {measure} over '{x}'" + (f" for each '{design.hue}'" if design.hue else "")
    if k == "slope":
        return f"slope chart: {measure} at the two values of '{x}', one line per '{design.hue}'"
    if k == "difference-bar":
        return f"change in {measure} between the two values of '{design.hue}', per '{x}'"
    if k == "heatmap" and design.options.matrix:
        return f"correlation matrix of {len(design.options.matrix)} numeric columns"
    if k == "heatmap":
        if design.task == "correlate":
            return f"heatmap of counts over '{x}' × '{y}'"
        return f"heatmap of {measure} over '{x}' × '{design.hue}'"
    if k in ("scatter", "regression", "hexbin"):
        extra = {"regression": " with a least-squares line", "hexbin": " binned into hexagons"}
        return f"{k}: '{y}' against '{x}'{extra.get(k, '')}"
    if k in ("box", "violin", "strip") and design.task == "compare":
        return f"{k} plot of '{y}' per '{x}', showing each group's spread"
    if k == "count-bar":
        return f"count of rows for each value of '{x}'"
    return f"{k} of '{x}'" + (f" per '{design.hue}'" if design.hue else "")


def rank(designs: list[Design]) -> list[Design]:
    """Best first: expressive designs before inexpressive ones, then by score, then by kind
    order (stable and reproducible)."""
    return sorted(designs, key=lambda d: (not d.expressive, -d.score))
