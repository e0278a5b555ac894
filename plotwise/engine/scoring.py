"""Scoring: Mackinlay's expressiveness test, then effectiveness from the published channel
rankings, task fit and data fit. Every number that moves a score is written into the design's
reasons, so a reader can follow it."""

from __future__ import annotations

from plotwise.engine.candidates import Design
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.rules import (
    CHANNEL_TO_PERCEPTUAL,
    INEXPRESSIVE_FACTOR,
    MACKINLAY_1986,
    ROLE_WEIGHTS,
    SCORE_WEIGHTS,
    STEVENS_EXPONENTS,
    TASK_FIT,
    THRESHOLDS,
)

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
    role_of = {}
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
        if design.options.get("non_aligned") and channel == "length":
            s *= 0.85
        if col not in best or s > best[col][0]:
            best[col] = (s, channel)
    total = weight = 0.0
    words = []
    for col, (s, channel) in best.items():
        role = role_of.get(col, "category")
        w = ROLE_WEIGHTS.get(role, 0.1)
        total += w * s
        weight += w
        level = _level_of(profile, col)
        rank, n = channel_rank(level, channel)
        perceptual = CHANNEL_TO_PERCEPTUAL[channel]
        words.append(f"'{col}' ({ranking_level(level)}) on {perceptual}: {_nth(rank)} of {n}")
    eff = total / weight if weight else 0.0
    reason = ("encoding " + "; ".join(words) + f" for its kind of data (Mackinlay 1986) "
              f"→ effectiveness {eff:.2f}")
    if design.options.get("non_aligned"):
        reason += ("; stacked segments start from shifting baselines, read less accurately than "
                   "aligned bars (Cleveland & McGill 1984)")
    return eff, [reason]


# ----------------------------------------------------------------------------------------------
# Expressiveness (Mackinlay 1986): a design that states something false is kept last.
# ----------------------------------------------------------------------------------------------
def expressiveness(design: Design, profile: Profile, stats: dict | None = None) -> list[str]:
    """Reasons the design would state something false about the data; empty when expressive."""
    f = profile.fields
    bad = []
    kind = design.kind
    if kind in ("line", "area", "slope") and design.x in f:
        xf = f[design.x]
        if xf.level == "nominal":
            bad.append(f"a line joining the values of '{design.x}' states an order those "
                       "categories do not have")
    measure = design.y if design.y in f else None
    mf: FieldProfile | None = f[measure] if measure else None
    length_kinds = ("bar", "grouped-bar", "stacked-bar", "stacked-bar-100", "area", "pie",
                    "difference-bar")
    if kind in length_kinds and mf is not None and mf.zero_meaningful is False:
        bad.append(f"bar or area length from zero means nothing for '{measure}', whose zero "
                   "is arbitrary (an interval scale)")
    if kind in ("pie", "stacked-bar-100", "stacked-bar") and mf is not None:
        if mf.minimum is not None and mf.minimum < 0:
            bad.append(f"'{measure}' has negative values ({mf.minimum:.4g}): they cannot be "
                       "parts of one whole")
        if design.stat == "mean":
            bad.append(f"averages of '{measure}' are not parts of one whole; stacking or "
                       "slicing them adds numbers that do not add up")
    total = (stats or {}).get("share_total")
    if kind in ("pie", "stacked-bar-100") and total is not None and not total["adds_up"]:
        bad.append(f"the shares in '{measure}' add to {total['sum']:.4g}, not {total['whole']}: "
                   "they are not parts of one whole")
    if kind == "pie" and design.task == "compare" and design.stat not in ("sum", "count", "value"):
        bad.append("a pie says the values are shares of one whole, which a comparison of "
                   f"{design.stat}s is not")
    return bad


# ----------------------------------------------------------------------------------------------
# Data fit: does the design suit this data's size and shape?
# ----------------------------------------------------------------------------------------------
def data_fit(design: Design, profile: Profile, stats: dict) -> tuple[float, list[str]]:
    f = profile.fields
    T = THRESHOLDS
    fit = 1.0
    why: list[str] = []

    def penalise(factor: float, text: str) -> None:
        nonlocal fit
        fit *= factor
        why.append(text)

    kind = design.kind
    ncat = f[design.x].distinct if design.x in f else 0
    nhue = f[design.hue].distinct if design.hue in f else 0
    mf = f.get(design.y) if design.y else None
    n_points = stats.get("points", profile.rows)

    if nhue > T["hues_warn"] and "hue" in design.encoding:
        penalise(0.35 if nhue > T["hues_severe"] else 0.6,
                 f"{nhue} colours for '{design.hue}' is more than the ~7 a reader can tell "
                 "apart (Miller 1956)")
    if kind in ("bar", "grouped-bar", "stacked-bar", "dot") and ncat > T["max_bars"] \
            and design.task != "trend":
        penalise(0.5, f"{ncat} bars crowd the axis; filter to the top ones or group the rest")
    if kind in ("bar", "dot", "grouped-bar") and design.task in ("compare", "proportion"):
        spread = stats.get("relative_spread")
        if spread is not None and spread < T["bunched_spread"]:
            if kind == "dot":
                why.append(f"values differ by only {spread:.0%} of their size: a dot plot on a "
                           "tight axis shows the differences (its axis says it does not start "
                           "at zero)")
            else:
                penalise(0.6, f"values differ by only {spread:.0%} of their size: bars from "
                         "zero make those differences hard to see")
        elif kind == "dot" and mf is not None and mf.zero_meaningful:
            penalise(0.9, "bars read ratios from a zero baseline; dots show position only")
    if kind == "area" and design.task == "trend":
        spread = stats.get("relative_spread")
        if spread is not None and spread < 0.5:
            penalise(0.6, f"the values vary by {spread:.0%} of their size: an area filled from "
                     "zero flattens that change")
    gap = stats.get("mean_gap")
    if design.stat == "mean" and kind in ("bar", "dot", "grouped-bar") and gap is not None \
            and gap["d"] < T["hidden_spread_d"]:
        penalise(0.6, f"group averages differ by only {gap['d']:.2f} within-group standard "
                 "deviations: the groups overlap, and averages alone hide it")
    if kind in ("box", "strip", "violin") and design.task == "compare" and gap is not None \
            and gap["d"] < T["hidden_spread_d"]:
        why.append("the groups overlap heavily: showing each group's spread is the honest view")
    modes = stats.get("modes", 1)
    if modes >= 2 and (kind == "box" or (kind in ("bar", "dot", "grouped-bar") and design.stat == "mean")):
        penalise(0.6 if kind == "box" else 0.75,
                 f"the values have {modes} modes, which a {'box' if kind == 'box' else 'chart of averages'} "
                 "hides")
    if modes >= 2 and kind in ("histogram", "density", "strip", "violin", "ecdf"):
        why.append(f"shows the {modes} modes of the values")
    if kind == "regression":
        from plotwise.engine.association import nonlinear_reason

        summary, infl = stats.get("fit"), stats.get("influence")
        if infl is not None and (infl.cooks_d > T["cooks_d"] or infl.leverage >= T["leverage_alone"]):
            penalise(0.6, "one point drives the fitted line (see influential-point)")
        elif summary is not None and nonlinear_reason(summary):
            penalise(0.6, "a straight line misdescribes a curved relation (see nonlinear)")
    if kind == "pie":
        if ncat > T["pie_max_parts"]:
            penalise(0.4, f"{ncat} slices: angles beyond about {T['pie_max_parts']} parts are "
                     "hard to compare")
        small = stats.get("min_share")
        if small is not None and small < T["pie_min_share"]:
            penalise(0.7, f"the smallest part is {small:.1%} of the whole, too thin a slice to see")
    if kind == "grouped-bar" and ncat * max(nhue, 1) > 60:
        penalise(0.6, f"{ncat}×{nhue} bars is a dense grid; consider a heatmap")
    if kind == "heatmap" and design.task != "correlate" and ncat * max(nhue, 1) < 9:
        penalise(0.7, "too few cells for a heatmap to beat plain bars")
    if design.task == "trend" and design.x in f:
        steps = f[design.x].distinct
        if kind in ("line", "area") and steps < 3:
            penalise(0.4, f"only {steps} time points: a line needs at least 3 to show a trend")
        if design.options.get("time_as_categories"):
            if steps > T["max_bars"]:
                penalise(0.45, f"{steps} time points are too many to draw as separate bars")
            if f[design.x].time_regular is False:
                penalise(0.6, f"time points of '{design.x}' are unevenly spaced; equal-width "
                         "bars would hide that")
        if kind == "dot" and steps > T["max_bars"]:
            penalise(0.7, "many time points read better joined by a line")
        if kind in ("line", "area") and steps >= 3 and "hue" not in design.encoding:
            why.append(f"{steps} time points: a line shows the shape of the change")
    if kind in ("scatter", "regression", "strip"):
        hidden = stats.get("hidden_share")
        if hidden is not None and hidden > T["overplot_warn"]:
            penalise(0.3 if hidden > T["overplot_severe"] else 0.75,
                     f"about {hidden:.0%} of the {n_points} points would hide behind others")
    if kind == "hexbin":
        if n_points < 500:
            penalise(0.5, f"{n_points} points: few enough to draw each one")
        elif n_points > T["scatter_max_points"]:
            why.append(f"{n_points} points: binning shows where they pile up")
    if kind == "heatmap" and design.task == "correlate" and design.options.get("binned"):
        penalise(0.8, "binned counts lose the individual points")
    if kind == "regression":
        r = stats.get("pearson")
        if r is not None and abs(r) < 0.2:
            penalise(0.7, f"Pearson r = {r:.2f}: a fitted line would suggest a relation the "
                     "data barely has")
    if design.task == "distribution":
        n = stats.get("min_group_n", n_points)
        var = f.get(design.x)
        if kind in ("density", "violin") and n < T["few_points"]:
            penalise(0.35, f"only {n} points: a smoothed shape would mostly show the kernel")
        if kind == "histogram" and n < T["few_points"]:
            penalise(0.6, f"only {n} points: too few for a histogram's bars")
        if kind == "box" and n < 5:
            penalise(0.5, f"only {n} points: quartiles of so few are unstable")
        if var is not None and var.is_discrete and kind in ("histogram", "density", "violin"):
            penalise(0.55, f"'{design.x}' takes only {var.distinct} integer values: count them "
                     "rather than smooth or bin them")
        if kind == "count-bar" and var is not None and var.level == "quantitative":
            why.append(f"'{design.x}' takes only {var.distinct} integer values: one bar per value")
        if kind == "strip" and n_points > 2000:
            penalise(0.6, f"{n_points} points is more than a strip plot can show separately")
        if kind in ("box", "violin", "strip") and not design.hue:
            penalise(0.85, "a single group: the box, violin or strip shows less than a histogram")
    if kind in ("box", "violin", "strip") and design.task == "compare":
        n = stats.get("min_group_n", n_points)
        if kind == "violin" and n < T["few_points"]:
            penalise(0.35, f"the smallest group has {n} points: too few for a violin")
    if design.facet is not None:
        nf = f[design.facet].distinct
        why.append(f"{nf} panels, one per '{design.facet}', instead of {nf} colours")
    return max(0.0, min(1.0, fit)), why


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


def score_design(design: Design, profile: Profile, stats: dict) -> Design:
    """Fill in design.score, design.parts, design.expressive and design.reasons."""
    eff, eff_words = effectiveness(design, profile)
    task_fit = TASK_FIT.get(design.task, {}).get(design.kind, 0.3)
    fit, fit_words = data_fit(design, profile, stats)
    W = SCORE_WEIGHTS
    score = W["effectiveness"] * eff + W["task_fit"] * task_fit + W["data_fit"] * fit
    bad = expressiveness(design, profile, stats)
    design.expressive = not bad
    if bad:
        score *= INEXPRESSIVE_FACTOR
    design.score = round(max(0.0, min(1.0, score)), 4)
    design.parts = {"effectiveness": round(eff, 3), "task_fit": task_fit, "data_fit": round(fit, 3)}
    headline = _headline(design, profile)
    reasons = [headline]
    reasons += [f"not expressive, kept last: {b} (Mackinlay 1986)" for b in bad]
    reasons += eff_words
    reasons.append(f"task fit for {design.task}: {task_fit:.2f} (common practice)")
    reasons += [f"data fit: {w}" for w in fit_words]
    note = stevens_note(design)
    if note:
        reasons.append(note)
    reasons.append(f"score = {W['effectiveness']}×{eff:.2f} + {W['task_fit']}×{task_fit:.2f} + "
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
    if k in ("bar", "dot"):
        s = f"{measure} per '{x}'"
        if design.options.get("share"):
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
    if k == "heatmap" and design.options.get("matrix"):
        return f"correlation matrix of {len(design.options['matrix'])} numeric columns"
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
