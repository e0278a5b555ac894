"""Hazard checks: what would make a chart of this data mislead, with a concrete fix.

Each check is a plain function registered in HAZARD_CHECKS with its code and a one-line
description (the README's table is generated from the same registry). A check receives the
HazardContext and returns a list of Hazard. Checks marked per_design run once per design and
the hazards are attached to that design; the others run once per advice."""

from __future__ import annotations

from dataclasses import dataclass, field

import pandas as pd

from plotwise.engine.candidates import Design
from plotwise.engine.profile import Profile
from plotwise.engine.rules import THRESHOLDS

SEVERITIES = ("info", "warn", "severe")


@dataclass
class Hazard:
    code: str
    severity: str  # info | warn | severe
    message: str
    fix: str
    kinds: tuple[str, ...] = ()  # design kinds concerned; empty = the data as a whole
    columns: tuple[str, ...] = ()

    def __str__(self) -> str:
        return f"[{self.severity}] {self.code}: {self.message} Fix: {self.fix}"


@dataclass
class HazardContext:
    df: pd.DataFrame
    profile: Profile
    task: str
    x: str | None
    y: str | None
    hue: str | None
    stat: str
    stats: dict
    value_range: tuple[float, float] | None = None
    palette: list[str] | None = None
    cmap: object = None
    design: Design | None = None  # set for per-design checks
    working: pd.DataFrame | None = field(default=None, repr=False)


@dataclass(frozen=True)
class HazardCheck:
    code: str
    description: str
    func: object
    per_design: bool


HAZARD_CHECKS: list[HazardCheck] = []


def check(code: str, description: str, per_design: bool = False):
    def register(func):
        HAZARD_CHECKS.append(HazardCheck(code, description, func, per_design))
        return func
    return register


LENGTH_KINDS = ("bar", "grouped-bar", "stacked-bar", "stacked-bar-100", "area", "difference-bar",
                "histogram", "count-bar")


def lie_factor(first: float, second: float, drawn_first: float, drawn_second: float) -> float:
    """Tufte (1983): size of effect shown in the graphic / size of effect in the data, with
    size of effect = |second − first| / first."""
    data_effect = abs(second - first) / abs(first)
    shown_effect = abs(drawn_second - drawn_first) / abs(drawn_first)
    return shown_effect / data_effect


@check("truncated-baseline", "bars or filled areas whose value axis does not include zero",
       per_design=True)
def _truncated_baseline(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if ctx.value_range is None or d.kind not in LENGTH_KINDS:
        return []
    lo, hi = ctx.value_range
    if lo <= 0 <= hi:
        return []
    msg = (f"the value axis range {lo:g}..{hi:g} leaves out zero, so the {d.kind} lengths would "
           "not be proportional to the values")
    vals = ctx.stats.get("values")
    if vals is not None and len(vals) >= 2 and lo > 0:
        a, b = float(vals.min()), float(vals.max())
        if a > lo and a > 0 and b != a:
            lf = lie_factor(a, b, a - lo, b - lo)
            msg += (f": from the smallest ({a:.4g}) to the largest ({b:.4g}) the bars would grow "
                    f"{(b - lo) / (a - lo) - 1:+.0%} while the data grow {b / a - 1:+.0%} — "
                    f"a Lie Factor of {lf:.1f} (Tufte 1983 asks for 0.95–1.05)")
    return [Hazard("truncated-baseline", "severe", msg + ".",
                   "let the value axis start at zero (plotwise draws lengths from zero), or use "
                   "a dot plot, whose axis may start elsewhere if it says so",
                   (d.kind,), tuple(c for c in (d.y,) if c))]


@check("too-many-colors", "more than 7 colours (warn) or 10 (severe) to tell apart",
       per_design=True)
def _too_many_colors(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    col = d.encoding.get("hue")
    if col is None or d.kind == "pie" or col not in ctx.profile.fields:
        return []
    n = ctx.profile.fields[col].distinct
    if n <= THRESHOLDS["hues_warn"]:
        return []
    sev = "severe" if n > THRESHOLDS["hues_severe"] else "warn"
    return [Hazard("too-many-colors", sev,
                   f"'{col}' has {n} values, each needing its own colour in the {d.kind}; readers "
                   "reliably tell apart about 7 (Miller 1956).",
                   f"draw small multiples (one panel per '{col}'), or highlight the 2–3 that "
                   "matter and grey the rest", (d.kind,), (col,))]


@check("too-many-slices", "a pie with more than 5 parts or a part under about 3%",
       per_design=True)
def _too_many_slices(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if d.kind != "pie":
        return []
    vals = ctx.stats.get("values")
    n = ctx.profile.fields[d.x].distinct if vals is None else len(vals)
    problems = []
    if n > THRESHOLDS["pie_max_parts"]:
        problems.append(f"{n} slices (angles are hard to compare beyond about "
                        f"{THRESHOLDS['pie_max_parts']})")
    small = ctx.stats.get("min_share")
    if small is not None and small < THRESHOLDS["pie_min_share"]:
        label = str(vals.idxmin()) if vals is not None else "one part"
        problems.append(f"'{label}' is only {small:.1%} of the whole, a sliver")
    if not problems:
        return []
    return [Hazard("too-many-slices", "warn", f"pie of '{d.x}': " + " and ".join(problems) + ".",
                   "use a bar chart sorted by value; or keep the 4–5 largest parts and group "
                   "the rest as 'other'", ("pie",), (d.x,))]


@check("not-a-whole", "parts that are negative, or shares that do not add to 100%")
def _not_a_whole(ctx: HazardContext) -> list[Hazard]:
    if ctx.task != "proportion" or ctx.y is None:
        return []
    f = ctx.profile.fields[ctx.y]
    out = []
    if f.minimum is not None and f.minimum < 0:
        out.append(Hazard("not-a-whole", "severe",
                          f"'{ctx.y}' has negative values (down to {f.minimum:.4g}); negative "
                          "amounts cannot be parts of one whole.",
                          "show the values on a bar chart from zero (a diverging bar for signed "
                          "values), not as shares", ("pie", "stacked-bar-100", "stacked-bar"),
                          (ctx.y,)))
    total = ctx.stats.get("share_total")
    if total is not None and not total["adds_up"] and ctx.hue is None:
        out.append(Hazard("not-a-whole", "severe",
                          f"'{ctx.y}' looks like shares (its name says so) but its {total['parts']} "
                          f"parts add to {total['sum']:.4g}, not {total['whole']} "
                          f"(±{total['tolerance']:g} for rounding): they are not parts of one whole.",
                          "if respondents could pick several answers, show each share as its "
                          "own bar against 100%; otherwise check the numbers",
                          ("pie", "stacked-bar-100"), (ctx.y,)))
    return out


@check("line-over-categories", "a line joining categories that have no order")
def _line_over_categories(ctx: HazardContext) -> list[Hazard]:
    if ctx.task != "trend" or ctx.x is None:
        return []
    f = ctx.profile.fields[ctx.x]
    if f.level != "nominal":
        return []
    return [Hazard("line-over-categories", "severe",
                   f"a trend over '{ctx.x}' joins its {f.distinct} categories with a line, but "
                   "they have no order: the slopes between them mean nothing.",
                   "compare the categories with a bar or dot chart (task 'compare'), or give "
                   f"'{ctx.x}' a real order with pandas.Categorical(..., ordered=True)",
                   ("line", "area", "slope"), (ctx.x,))]


@check("overplotting", "points hiding behind each other at the drawn marker size",
       per_design=True)
def _overplotting(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if d.kind not in ("scatter", "regression", "strip"):
        return []
    hidden = ctx.stats.get("hidden_share")
    if hidden is None or hidden <= THRESHOLDS["overplot_warn"]:
        return []
    n = ctx.stats.get("points", 0)
    sev = "severe" if hidden > THRESHOLDS["overplot_severe"] else "warn"
    return [Hazard("overplotting", sev,
                   f"about {hidden:.0%} of the {n} points fall on top of an earlier point at the drawn marker size, so dense regions look no denser "
                   "than sparse ones.",
                   "use a hexbin or 2-D histogram, or smaller, semi-transparent markers "
                   "(alpha ≈ 0.2), or a random sample", (d.kind,),
                   tuple(c for c in (d.x, d.y) if c))]


@check("skewed", "positive data with a heavy right tail (a log axis helps)")
def _skewed(ctx: HazardContext) -> list[Hazard]:
    from plotwise.engine.datastats import skewed

    out = []
    for col in dict.fromkeys(c for c in (ctx.x, ctx.y) if c):
        f = ctx.profile.fields[col]
        if skewed(f):
            ratio = f.maximum / f.minimum
            out.append(Hazard("skewed", "warn",
                              f"'{col}' is right-skewed (skewness {f.skew:.1f}, largest value "
                              f"{ratio:.0f}× the smallest): most values crowd into the bottom "
                              "of a linear axis.",
                              "use a log axis for histograms, scatter and dot plots (bars keep "
                              "a linear axis from zero), or compare medians",
                              (), (col,)))
    return out


@check("uneven-intervals", "unequally spaced time points drawn as evenly spaced categories",
       per_design=True)
def _uneven_intervals(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if d.x not in ctx.profile.fields or d.task != "trend":
        return []
    f = ctx.profile.fields[d.x]
    gaps = ctx.stats.get("time_gaps", 0)
    if d.kind in ("line", "area") and gaps and not d.hue:
        return [Hazard("uneven-intervals", "info",
                       f"'{d.x}' has {gaps} gap(s) longer than its usual step "
                       f"({f.time_step}); lines break there instead of joining across.",
                       "say in the caption what the gap is (no data, not zero)", (d.kind,), (d.x,))]
    if not d.options.get("time_as_categories") or f.time_regular is not False:
        return []
    return [Hazard("uneven-intervals", "warn",
                   f"the time points of '{d.x}' are unevenly spaced (usual step {f.time_step}, "
                   f"{f.time_gaps} gaps), but the {d.kind} draws them as equally spaced "
                   "categories, hiding the gaps.",
                   "draw on a real time axis (a line or dots against dates) so gaps show",
                   (d.kind,), (d.x,))]


@check("hidden-spread", "group means compared without their spread while the groups overlap",
       per_design=True)
def _hidden_spread(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    gap = ctx.stats.get("mean_gap")
    if d.stat != "mean" or d.kind not in ("bar", "dot", "grouped-bar") or gap is None:
        return []
    if gap["d"] >= THRESHOLDS["hidden_spread_d"]:
        return []
    return [Hazard("hidden-spread", "warn",
                   f"the average '{d.y}' differs across '{d.x}' by at most {gap['range']:.3g}, "
                   f"only {gap['d']:.2f} of the within-group standard deviation ({gap['sd']:.3g}): "
                   "the groups overlap heavily, which a chart of averages hides.",
                   "show the spread: a box or strip plot per group, or error bars",
                   (d.kind,), (d.x, d.y))]


@check("few-points", "a density or violin drawn from too few points", per_design=True)
def _few_points(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if d.kind not in ("density", "violin"):
        return []
    n = ctx.stats.get("min_group_n")
    if n is None or n >= THRESHOLDS["few_points"]:
        return []
    return [Hazard("few-points", "warn",
                   f"the {d.kind} of '{d.y if d.task == 'compare' else d.x}' rests on {n} points"
                   f" (fewer than {THRESHOLDS['few_points']}): its smooth shape mostly shows the "
                   "kernel, not the data.",
                   "draw the points themselves (a strip plot) or a histogram", (d.kind,),
                   tuple(c for c in (d.x, d.y) if c))]


@check("missing-values", "rows left out because a used column is missing")
def _missing_values(ctx: HazardContext) -> list[Hazard]:
    left = ctx.stats.get("left_out", 0)
    rows = ctx.stats.get("rows", 0)
    if not left or not rows:
        return []
    share = left / rows
    cols = [c for c in dict.fromkeys([ctx.x, ctx.y, ctx.hue]) if c]
    per = [f"'{c}': {ctx.profile.fields[c].missing + ctx.profile.fields[c].infinite}"
           for c in cols if ctx.profile.fields[c].missing + ctx.profile.fields[c].infinite]
    sev = "warn" if share > THRESHOLDS["missing_warn"] else "info"
    return [Hazard("missing-values", sev,
                   f"{left} of {rows} rows ({share:.1%}) were left out because they are missing "
                   f"or infinite in a used column ({', '.join(per)}).",
                   "check whether the missing rows differ from the rest; fill or flag them "
                   "explicitly if they matter", (), tuple(cols))]


def drawn_colours(d: Design, n: int) -> list[str]:
    """The colours a design draws for n groups (as codegen picks them)."""
    from plotwise.engine.rules import OKABE_ITO

    pal = d.options.get("palette")
    if pal:
        return [pal[i % len(pal)] for i in range(n)]
    if n <= len(OKABE_ITO):
        return list(OKABE_ITO[:n])
    import seaborn as sns

    return [f"#{int(r * 255):02x}{int(g * 255):02x}{int(b * 255):02x}"
            for r, g, b in sns.color_palette("husl", n)]


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
    colours = drawn_colours(d, n)
    worst = worst_confusion(colours)
    if worst is None or worst.delta_e >= THRESHOLDS["cvd_delta_e"]:
        return []
    labels = ctx.stats.get("hue_labels") or []
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
    from plotwise.engine.colour import lightness_profile, resolve_cmap

    if ctx.cmap is None:
        return []
    cm = resolve_cmap(ctx.cmap)
    prof = lightness_profile(cm)
    signed = any(ctx.profile.fields[c].signed for c in (ctx.x, ctx.y) if c in ctx.profile.fields)
    if prof.kind == "sequential" or (prof.kind == "diverging" and signed):
        return []
    if prof.kind == "diverging":
        msg = (f"'{cm.name}' is a diverging colormap (lightness peaks in the middle), but the data "
               "have no meaningful midpoint: readers will see a centre that is not there.")
        fix = "use a sequential colormap such as 'viridis' or 'cividis'"
    else:
        msg = (f"the lightness of '{cm.name}' rises and falls {prof.turns} time(s) along the map "
               f"(CAM02-UCS J′ from {prof.start:.0f} to {prof.end:.0f}): equal steps in value do "
               "not look equal, and bands appear that are not in the data.")
        fix = ("use a perceptually uniform colormap: 'viridis' or 'cividis' (sequential), or "
               "'vlag' centred on zero for signed data")
    return [Hazard("rainbow-colormap", "warn", msg, fix, ("heatmap", "hexbin"), ())]


@check("bin-sensitive", "a histogram whose number of peaks changes with the bin width")
def _bin_sensitive(ctx: HazardContext) -> list[Hazard]:
    shapes = ctx.stats.get("bin_shapes")
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


HIDING_KINDS = ("box", "bar", "dot", "grouped-bar")


@check("hidden-modes", "a box plot or a bar of averages hiding a distribution with two or more "
       "modes", per_design=True)
def _hidden_modes(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    modes = ctx.stats.get("modes", 1)
    if modes < 2 or d.kind not in HIDING_KINDS:
        return []
    if d.kind != "box" and d.stat != "mean":
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

    fit = ctx.stats.get("fit")
    if fit is None:
        return []
    infl = ctx.stats.get("influence")
    if infl is not None and _is_influential(infl):
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


def _is_influential(infl) -> bool:
    return infl.cooks_d > THRESHOLDS["cooks_d"] or infl.leverage >= THRESHOLDS["leverage_alone"]


@check("influential-point", "one point drives the fitted line (Cook's distance, leverage)")
def _influential(ctx: HazardContext) -> list[Hazard]:
    infl = ctx.stats.get("influence")
    if infl is None or not _is_influential(infl):
        return []
    row = ctx.stats.get("influence_row", infl.index)
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

    rev = ctx.stats.get("reversal")
    if rev is None or not is_reversal(rev):
        return []
    if rev.what == "difference":
        unit = " percentage points" if ctx.stats.get("binary_y") else ""
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
    note = d.options.get("note")
    if not note or ctx.stats.get("points", 0) <= THRESHOLDS["draw_sample_above"]:
        return []  # small data: the note only says where the numbers came from
    k = d.options["sample"][1] if d.options.get("sample") else d.options.get("engine_sample")
    if k and k < ctx.stats.get("points", 0):
        msg = (f"the {d.kind} shows a seeded random sample of {k:,} of the "
               f"{ctx.stats.get('points', 0):,} rows (drawing every row would be slow and hide "
               "points behind each other); its shape is representative, single points are not.")
        fix = "filter to the rows you care about to see every point, or use the binned designs"
    else:
        msg = f"the {d.kind} is drawn from {note}: exact for every row."
        fix = "nothing to fix; said so you know what the panel shows"
    return [Hazard("sampled", "info", msg, fix, (d.kind,), tuple(c for c in d.columns))]


def run_checks(ctx: HazardContext, designs: list[Design]) -> list[Hazard]:
    """Attach per-design hazards to every design; return the advice-wide hazards."""
    for d in designs:
        d.hazards = []
        for hc in HAZARD_CHECKS:
            if hc.per_design:
                ctx.design = d
                d.hazards.extend(hc.func(ctx))
    ctx.design = None
    found: list[Hazard] = []
    for hc in HAZARD_CHECKS:
        if not hc.per_design:
            found.extend(hc.func(ctx))
    return found


def hazard_codes() -> list[str]:
    return list(dict.fromkeys(hc.code for hc in HAZARD_CHECKS))
