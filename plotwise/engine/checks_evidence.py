"""Hazard checks on colour and on what the data hold: colour-vision safety, colormaps, bin
sensitivity, hidden modes, curved or point-driven fits, reversal within groups, sampled panels."""

from __future__ import annotations

from plotwise.engine.conditions import is_influential
from plotwise.engine.hazards import Hazard, HazardContext, check
from plotwise.engine.kinds import REGISTRY
from plotwise.engine.rules import THRESHOLDS


@check("cvd-confusable", "two series' colours hard to tell apart, for normal or simulated "
       "colour-vision-deficient sight", per_design=True)
def _cvd_confusable(ctx: HazardContext) -> list[Hazard]:
    from plotwise.engine.colour import CVD_TYPES, worst_confusion

    d = ctx.design
    col = d.encoding.get("hue")
    if col is None or col not in ctx.profile.fields or d.kind in ("slope",):
        return []
    n = ctx.profile.fields[col].distinct
    if n < 2 or n > 30:
        return []
    colours = ctx.colours(d, n) if ctx.colours is not None else []
    worst = worst_confusion(colours)
    if worst is None or worst.delta_e >= THRESHOLDS["cvd_delta_e"]:
        return []
    labels = ctx.stats.hue_labels or []
    names = [labels[i] if i < len(labels) else f"group {i + 1}" for i in worst.index]
    sight = "normal sight" if worst.vision == "normal" else f"simulated {CVD_TYPES[worst.vision]} sight"
    return [Hazard("cvd-confusable", "warn",
                   f"in the {d.kind}, '{names[0]}' ({worst.pair[0]}) and '{names[1]}' "
                   f"({worst.pair[1]}) differ by only ΔE {worst.delta_e:.1f} (CAM02-UCS) for "
                   f"{sight} (Machado et al. 2009); below {THRESHOLDS['cvd_delta_e']:g} they are "
                   "hard to tell apart. About 8% of men have a red-green deficiency (Birch 2012).",
                   "use the Okabe & Ito palette (plotwise's default), fewer groups, or label the "
                   "series directly instead of a legend", (d.kind,), (col,))]


@check("rainbow-colormap", "a colormap whose lightness does not rise steadily (or a diverging "
       "one on data with no midpoint)")
def _rainbow_colormap(ctx: HazardContext) -> list[Hazard]:
    from plotwise.engine.colour import lightness_profile

    if ctx.cmap is None or ctx.cmap_rgb is None:
        return []
    name = ctx.cmap if isinstance(ctx.cmap, str) else getattr(ctx.cmap, "name", "your colormap")
    prof = lightness_profile(ctx.cmap_rgb)
    signed = any(ctx.profile.fields[c].signed for c in (ctx.x, ctx.y) if c in ctx.profile.fields)
    if prof.kind == "sequential" or (prof.kind == "diverging" and signed):
        return []
    if prof.kind == "diverging":
        msg = (f"'{name}' is a diverging colormap (lightness peaks in the middle), but the data "
               "have no meaningful midpoint: readers will see a centre that is not there.")
        fix = "use a sequential colormap such as 'viridis' or 'cividis'"
    else:
        msg = (f"the lightness of '{name}' rises and falls {prof.turns} time(s) along the map "
               f"(CAM02-UCS J′ from {prof.start:.0f} to {prof.end:.0f}): equal steps in value do "
               "not look equal, and bands appear that are not in the data.")
        fix = ("use a perceptually uniform colormap: 'viridis' or 'cividis' (sequential), or "
               "'vlag' centred on zero for signed data")
    return [Hazard("rainbow-colormap", "warn", msg, fix, ("heatmap", "hexbin"), ())]


@check("bin-sensitive", "a histogram whose number of peaks changes with the bin width")
def _bin_sensitive(ctx: HazardContext) -> list[Hazard]:
    shapes = ctx.stats.bin_shapes
    if not shapes or len({b.peaks for b in shapes}) < 2:
        return []
    standard = {b.peaks for b in shapes[:3]}
    sev = "warn" if len(standard) > 1 else "info"
    parts = "; ".join(f"{b.rule} ({b.bins} bins): {b.peaks} peak{'s' if b.peaks != 1 else ''}"
                      for b in shapes)
    return [Hazard("bin-sensitive", sev,
                   f"the histogram of '{ctx.x}' changes shape with the bin width — {parts}.",
                   "look at two or three widths (or a density and an ECDF) before trusting one "
                   "picture; say which bin rule the chart uses", ("histogram",), (ctx.x,))]


@check("hidden-modes", "a box plot or a bar of averages hiding a distribution with two or more "
       "modes", per_design=True)
def _hidden_modes(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    modes = ctx.stats.modes
    k = REGISTRY[d.kind]
    if modes < 2 or not (k.hides_modes or (k.summarises and d.stat == "mean")):
        return []
    col = d.y if d.task == "compare" else d.x
    what = "a box plot" if d.kind == "box" else "averages"
    return [Hazard("hidden-modes", "warn",
                   f"'{col}' has {modes} modes (peaks of a Gaussian density estimate with "
                   f"Silverman's bandwidth), which {what} cannot show: a box's median and quartiles "
                   "or a mean can fall in the valley between the peaks.",
                   "show the shape: a histogram, density, strip plot or ECDF (per group)",
                   (d.kind,), (col,))]


@check("nonlinear", "a correlation coefficient that misdescribes a curved relation")
def _nonlinear(ctx: HazardContext) -> list[Hazard]:
    from plotwise.engine.association import nonlinear_reason

    fit = ctx.stats.fit
    if fit is None:
        return []
    infl = ctx.stats.influence
    if is_influential(infl):
        return []  # one point explains the gap between the coefficients (see influential-point)
    why = nonlinear_reason(fit)
    if why is None:
        return []
    return [Hazard("nonlinear", "warn",
                   f"'{ctx.y}' against '{ctx.x}': {why}; Pearson's r = {fit.pearson:.2f} alone "
                   "would misdescribe it.",
                   "draw the scatter (with a smooth curve rather than a straight line), report "
                   "Spearman's ρ, or transform a variable", ("regression", "scatter"),
                   (ctx.x, ctx.y))]


@check("influential-point", "one point drives the fitted line (Cook's distance, leverage)")
def _influential(ctx: HazardContext) -> list[Hazard]:
    infl = ctx.stats.influence
    if not is_influential(infl):
        return []
    row = ctx.stats.influence_row or infl.index
    if infl.leverage >= THRESHOLDS["leverage_alone"]:
        why = (f"the row {row} has leverage {infl.leverage:.2f}: its '{ctx.x}' value sits so far from "
               "the others that the fitted line must pass through it")
    else:
        why = (f"the row {row} has Cook's distance {infl.cooks_d:.2f} (above "
               f"{THRESHOLDS['cooks_d']:g}): removing it would move the fitted line a lot")
    return [Hazard("influential-point", "warn",
                   f"'{ctx.y}' against '{ctx.x}': {why}.",
                   "show the points, mark that one, and report the fit with and without it",
                   ("regression", "scatter"), (ctx.x, ctx.y))]


@check("reversal-in-groups", "an association or difference that flips or vanishes within groups "
       "(Simpson's paradox)")
def _reversal(ctx: HazardContext) -> list[Hazard]:
    from plotwise.engine.association import is_reversal

    rev = ctx.stats.reversal
    if rev is None or not is_reversal(rev):
        return []
    if rev.what == "difference":
        unit = " percentage points" if ctx.stats.binary_y else ""
        scale = 100 if unit else 1
        msg = (f"pooled over '{ctx.hue}', {rev.detail} in '{ctx.y}' is {rev.pooled * scale:+.3g}{unit}, "
               f"but within the groups it averages {rev.within * scale:+.3g}{unit} "
               f"({rev.groups_opposite} of {rev.groups} groups go the other way)")
    else:
        msg = (f"pooled, '{ctx.y}' and '{ctx.x}' correlate with r = {rev.pooled:+.2f}, but within "
               f"the groups of '{ctx.hue}' the average r is {rev.within:+.2f} "
               f"({rev.groups_opposite} of {rev.groups} groups go the other way)")
    return [Hazard("reversal-in-groups", "severe", msg + ": the groups differ in size or level "
                   "and the pooled comparison mixes them (Simpson's paradox).",
                   f"compare within each '{ctx.hue}' (small multiples, or colour by it) and say "
                   "which comparison answers the question", (), (ctx.x, ctx.y, ctx.hue))]


@check("sampled", "a panel drawn from a sample or from pre-computed aggregates of a large frame",
       per_design=True)
def _sampled(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    note = d.options.note
    if not note or ctx.stats.points <= THRESHOLDS["draw_sample_above"]:
        return []  # small data: the note only says where the numbers came from
    k = d.options.sample[1] if d.options.sample else d.options.engine_sample
    if k and k < ctx.stats.points:
        msg = (f"the {d.kind} shows a seeded random sample of {k:,} of the "
               f"{ctx.stats.points:,} rows (drawing every row would be slow and hide "
               "points behind each other); its shape is representative, single points are not.")
        fix = "filter to the rows you care about to see every point, or use the binned designs"
    else:
        msg = f"the {d.kind} is drawn from {note}: exact for every row."
        fix = "nothing to fix; said so you know what the panel shows"
    return [Hazard("sampled", "info", msg, fix, (d.kind,), tuple(c for c in d.columns))]


