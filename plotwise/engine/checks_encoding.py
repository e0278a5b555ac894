"""Hazard checks on how marks encode the data: baselines, colours, slices, wholes, lines over
categories, overplotting, time spacing, hidden spread, few points, missing rows."""

from __future__ import annotations

from plotwise.engine.conditions import (
    few_points,
    groups_overlap,
    hue_severity,
    lie_factor,
    overplot_severity,
    skewed,
    skewed_with_zeros,
    thin_slice,
    too_many_slices,
)
from plotwise.engine.hazards import Hazard, HazardContext, check
from plotwise.engine.kinds import REGISTRY, kinds_where
from plotwise.engine.rules import THRESHOLDS


@check("truncated-baseline", "bars or filled areas whose value axis does not include zero",
       per_design=True)
def _truncated_baseline(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if ctx.value_range is None or not REGISTRY[d.kind].length_from_zero:
        return []
    lo, hi = ctx.value_range
    if lo <= 0 <= hi:
        return []
    msg = (f"the value axis range {lo:g}..{hi:g} leaves out zero, so the {d.kind} lengths would "
           "not be proportional to the values")
    vals = ctx.stats.values
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
    sev = hue_severity(n)
    if sev is None:
        return []
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
    vals = ctx.stats.values
    n = ctx.profile.fields[d.x].distinct if vals is None else len(vals)
    problems = []
    if too_many_slices(n):
        problems.append(f"{n} slices (angles are hard to compare beyond about "
                        f"{THRESHOLDS['pie_max_parts']})")
    small = ctx.stats.min_share
    if thin_slice(small):
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
    total = ctx.stats.share_total
    if total is not None and not total.adds_up and ctx.hue is None:
        out.append(Hazard("not-a-whole", "severe",
                          f"'{ctx.y}' looks like shares (its name says so) but its {total.parts} "
                          f"parts add to {total.sum:.4g}, not {total.whole} "
                          f"(±{total.tolerance:g} for rounding): they are not parts of one whole.",
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
                   kinds_where(connects=True), (ctx.x,))]


@check("overplotting", "points hiding behind each other at the drawn marker size",
       per_design=True)
def _overplotting(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    hidden = ctx.stats.hidden_share
    sev = overplot_severity(hidden)
    if not REGISTRY[d.kind].overplots or sev is None:
        return []
    n = ctx.stats.points
    return [Hazard("overplotting", sev,
                   f"about {hidden:.0%} of the {n} points fall on top of an earlier point at the "
                   "drawn marker size, so dense regions look no denser "
                   "than sparse ones.",
                   "use a hexbin or 2-D histogram, or smaller, semi-transparent markers "
                   "(alpha ≈ 0.2), or a random sample", (d.kind,),
                   tuple(c for c in (d.x, d.y) if c))]


@check("skewed", "positive data with a heavy right tail (a log axis helps)")
def _skewed(ctx: HazardContext) -> list[Hazard]:
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
        elif skewed_with_zeros(f):
            share = f.zeros / max(f.usable, 1)
            out.append(Hazard("skewed", "warn",
                              f"'{col}' is right-skewed (skewness {f.skew:.1f}) and {share:.0%} "
                              "of its values are 0: most values crowd into the bottom of a "
                              "linear axis, and a log axis would drop the zeros.",
                              "draw log(1 + x) (numpy.log1p), or show the zeros apart from the "
                              "positive values (their share, then the positive values on a log "
                              "axis)", (), (col,)))
    return out


@check("uneven-intervals", "unequally spaced time points drawn as evenly spaced categories",
       per_design=True)
def _uneven_intervals(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    if d.x not in ctx.profile.fields or d.task != "trend":
        return []
    f = ctx.profile.fields[d.x]
    gaps = ctx.stats.time_gaps
    if REGISTRY[d.kind].trend_line and gaps and not d.hue:
        return [Hazard("uneven-intervals", "info",
                       f"'{d.x}' has {gaps} gap(s) longer than its usual step "
                       f"({f.time_step}); lines break there instead of joining across.",
                       "say in the caption what the gap is (no data, not zero)", (d.kind,), (d.x,))]
    if not d.options.time_as_categories or f.time_regular is not False:
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
    gap = ctx.stats.mean_gap
    if d.stat != "mean" or not REGISTRY[d.kind].summarises or not groups_overlap(gap):
        return []
    return [Hazard("hidden-spread", "warn",
                   f"the average '{d.y}' differs across '{d.x}' by at most {gap.range:.3g}, "
                   f"only {gap.d:.2f} of the within-group standard deviation ({gap.sd:.3g}): "
                   "the groups overlap heavily, which a chart of averages hides.",
                   "show the spread: a box or strip plot per group, or error bars",
                   (d.kind,), (d.x, d.y))]


@check("few-points", "a density or violin drawn from too few points", per_design=True)
def _few_points(ctx: HazardContext) -> list[Hazard]:
    d = ctx.design
    n = ctx.stats.min_group_n
    if not REGISTRY[d.kind].smooths or not few_points(n):
        return []
    return [Hazard("few-points", "warn",
                   f"the {d.kind} of '{d.y if d.task == 'compare' else d.x}' rests on {n} points"
                   f" (fewer than {THRESHOLDS['few_points']}): its smooth shape mostly shows the "
                   "kernel, not the data.",
                   "draw the points themselves (a strip plot) or a histogram", (d.kind,),
                   tuple(c for c in (d.x, d.y) if c))]


@check("missing-values", "rows left out because a used column is missing")
def _missing_values(ctx: HazardContext) -> list[Hazard]:
    left = ctx.stats.left_out
    rows = ctx.stats.rows
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


