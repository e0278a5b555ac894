"""Data fit: does a design suit this data's size and shape? Each rule below looks at one
problem; when it finds it, it multiplies the design's fit by a factor from rules.FIT_FACTORS and
states the numbers in a reason (or only adds a reason, when the design suits the data well).
Rules run in the order written; which kinds a rule applies to comes from the kind registry."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

from plotwise.engine.conditions import (
    few_points,
    groups_overlap,
    hue_severity,
    is_influential,
    kept_categories,
    overplot_severity,
    thin_slice,
    too_many_slices,
)
from plotwise.engine.design import Design
from plotwise.engine.kinds import REGISTRY, ChartKind
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.rules import FIT_FACTORS, FIT_LIMITS, THRESHOLDS
from plotwise.engine.stats import DesignStats


@dataclass
class FitCase:
    """One design under the rules, with what they read, and the fit found so far."""

    d: Design
    k: ChartKind
    profile: Profile
    stats: DesignStats
    ncat: int
    nhue: int
    mf: FieldProfile | None  # the measure's profile
    n_points: int
    fit: float = 1.0
    why: list[str] = field(default_factory=list)

    def penalise(self, factor: str, text: str) -> None:
        self.fit *= FIT_FACTORS[factor]
        self.why.append(text)

    def note(self, text: str) -> None:
        self.why.append(text)

    @property
    def group_n(self) -> int:
        n = self.stats.min_group_n
        return self.n_points if n is None else n


RULES: list[Callable[[FitCase], None]] = []


def rule(func: Callable[[FitCase], None]) -> Callable[[FitCase], None]:
    RULES.append(func)
    return func


@rule
def _hues(c: FitCase) -> None:
    sev = hue_severity(c.nhue)
    if sev and "hue" in c.d.encoding:
        c.penalise("too_many_hues_severe" if sev == "severe" else "too_many_hues",
                   f"{c.nhue} colours for '{c.d.hue}' is more than the ~7 a reader can tell "
                   "apart (Miller 1956)")


@rule
def _crowded_axis(c: FitCase) -> None:
    kept = kept_categories(c.d, c.profile)
    if kept:
        c.note(f"{c.ncat} categories: the largest {kept} are drawn, "
               + ("the rest combined into one" if c.d.stat in ("count", "sum")
                  else "the rest left out (averages do not combine)"))
    elif c.k.axis_per_category and c.ncat > THRESHOLDS["max_bars"] and c.d.task != "trend":
        c.penalise("crowded_axis",
                   f"{c.ncat} bars crowd the axis; filter to the top ones or group the rest")


@rule
def _bunched(c: FitCase) -> None:
    if not (c.k.summarises and c.d.task in ("compare", "proportion")):
        return
    spread = c.stats.relative_spread
    if spread is not None and spread < THRESHOLDS["bunched_spread"]:
        if c.d.kind == "dot":
            c.note(f"values differ by only {spread:.0%} of their size: a dot plot on a tight "
                   "axis shows the differences (its axis says it does not start at zero)")
        else:
            c.penalise("bunched_bars", f"values differ by only {spread:.0%} of their size: "
                       "bars from zero make those differences hard to see")
    elif c.d.kind == "dot" and c.mf is not None and c.mf.zero_meaningful:
        c.penalise("dots_lose_ratio", "bars read ratios from a zero baseline; dots show "
                   "position only")


@rule
def _flat_area(c: FitCase) -> None:
    spread = c.stats.relative_spread
    if (c.k.trend_line and c.k.length_from_zero and c.d.task == "trend" and spread is not None
            and spread < FIT_LIMITS["flat_area_spread"]):
        c.penalise("flat_area", f"the values vary by {spread:.0%} of their size: an area "
                   "filled from zero flattens that change")


@rule
def _overlapping_means(c: FitCase) -> None:
    gap = c.stats.mean_gap
    if not groups_overlap(gap):
        return
    if c.d.stat == "mean" and c.k.summarises:
        c.penalise("overlapping_means", f"group averages differ by only {gap.d:.2f} "
                   "within-group standard deviations: the groups overlap, and averages alone "
                   "hide it")
    if c.k.shows_spread and c.d.task == "compare":
        c.note("the groups overlap heavily: showing each group's spread is the honest view")


@rule
def _modes(c: FitCase) -> None:
    modes = c.stats.modes
    if modes < 2:
        return
    if c.k.hides_modes:
        c.penalise("modes_hidden_by_box", f"the values have {modes} modes, which a box hides")
    elif c.k.summarises and c.d.stat == "mean":
        c.penalise("modes_hidden_by_means",
                   f"the values have {modes} modes, which a chart of averages hides")
    if c.k.shows_shape:
        c.note(f"shows the {modes} modes of the values")


@rule
def _fitted_line(c: FitCase) -> None:
    if c.d.kind != "regression":
        return
    from plotwise.engine.association import nonlinear_reason

    if is_influential(c.stats.influence):
        c.penalise("influential_line", "one point drives the fitted line (see influential-point)")
    elif c.stats.fit is not None and nonlinear_reason(c.stats.fit):
        c.penalise("curved_line", "a straight line misdescribes a curved relation (see nonlinear)")


@rule
def _pie(c: FitCase) -> None:
    if c.d.kind != "pie":
        return
    if too_many_slices(c.ncat):
        c.penalise("pie_slices", f"{c.ncat} slices: angles beyond about "
                   f"{THRESHOLDS['pie_max_parts']} parts are hard to compare")
    small = c.stats.min_share
    if thin_slice(small):
        c.penalise("pie_sliver", f"the smallest part is {small:.1%} of the whole, too thin a "
                   "slice to see")


@rule
def _grids(c: FitCase) -> None:
    cells = c.ncat * max(c.nhue, 1)
    if c.d.kind == "grouped-bar" and cells > FIT_LIMITS["dense_grid_bars"]:
        c.penalise("dense_grid", f"{c.ncat}×{c.nhue} bars is a dense grid; a dot chart (one "
                   "line per category) or a heatmap reads better")
    if c.d.kind == "heatmap" and c.d.task != "correlate" and cells < FIT_LIMITS["small_heatmap_cells"]:
        c.penalise("small_heatmap", "too few cells for a heatmap to beat plain bars")


@rule
def _time_points(c: FitCase) -> None:
    d, f = c.d, c.profile.fields
    if d.task != "trend" or d.x not in f:
        return
    steps = f[d.x].distinct
    if c.k.trend_line and steps < FIT_LIMITS["line_min_points"]:
        c.penalise("line_few_points", f"only {steps} time points: a line needs at least "
                   f"{FIT_LIMITS['line_min_points']} to show a trend")
    if d.options.time_as_categories:
        if steps > THRESHOLDS["max_bars"]:
            c.penalise("bars_many_times", f"{steps} time points are too many to draw as "
                       "separate bars")
        if f[d.x].time_regular is False:
            c.penalise("bars_uneven_times", f"time points of '{d.x}' are unevenly spaced; "
                       "equal-width bars would hide that")
    if d.kind == "dot" and steps > THRESHOLDS["max_bars"]:
        c.penalise("dots_many_times", "many time points read better joined by a line")
    if c.k.trend_line and steps >= FIT_LIMITS["line_min_points"] and "hue" not in d.encoding:
        c.note(f"{steps} time points: a line shows the shape of the change")


@rule
def _overplotting(c: FitCase) -> None:
    sev = overplot_severity(c.stats.hidden_share)
    if c.k.overplots and sev:
        c.penalise("overplotted_severe" if sev == "severe" else "overplotted",
                   f"about {c.stats.hidden_share:.0%} of the {c.n_points} points would hide "
                   "behind others")


@rule
def _binned_pairs(c: FitCase) -> None:
    d = c.d
    if d.kind == "hexbin":
        if c.n_points < FIT_LIMITS["hexbin_min_points"]:
            c.penalise("hexbin_few_points", f"{c.n_points} points: few enough to draw each one")
        elif c.n_points > THRESHOLDS["scatter_max_points"]:
            c.note(f"{c.n_points} points: binning shows where they pile up")
    if d.kind == "heatmap" and d.task == "correlate" and d.options.binned:
        c.penalise("binned_pairs", "binned counts lose the individual points")
    r = c.stats.pearson
    if d.kind == "regression" and r is not None and abs(r) < FIT_LIMITS["weak_r"]:
        c.penalise("weak_line", f"Pearson r = {r:.2f}: a fitted line would suggest a relation "
                   "the data barely has")


@rule
def _distribution(c: FitCase) -> None:
    d, k = c.d, c.k
    if d.task != "distribution":
        return
    n, var = c.group_n, c.profile.fields.get(d.x)
    if k.smooths and few_points(n):
        c.penalise("smooth_few_points", f"only {n} points: a smoothed shape would mostly show "
                   "the kernel")
    if d.kind == "histogram" and few_points(n):
        c.penalise("histogram_few_points", f"only {n} points: too few for a histogram's bars")
    if d.kind == "box" and n < FIT_LIMITS["box_min_points"]:
        c.penalise("box_few_points", f"only {n} points: quartiles of so few are unstable")
    if var is not None and var.is_discrete and k.bins_values:
        c.penalise("smoothing_integers", f"'{d.x}' takes only {var.distinct} integer values: "
                   "count them rather than smooth or bin them")
    if d.kind == "count-bar" and var is not None and var.level == "quantitative":
        c.note(f"'{d.x}' takes only {var.distinct} integer values: one bar per value")
    if d.kind == "strip" and c.n_points > FIT_LIMITS["strip_max_points"]:
        c.penalise("strip_many_points", f"{c.n_points} points is more than a strip plot can "
                   "show separately")
    if k.shows_spread and not d.hue:
        c.penalise("single_group", "a single group: the box, violin or strip shows less than "
                   "a histogram")


@rule
def _groups_of_compare(c: FitCase) -> None:
    n = c.group_n
    if c.d.kind == "violin" and c.d.task == "compare" and few_points(n):
        c.penalise("smooth_few_points", f"the smallest group has {n} points: too few for a violin")


@rule
def _facets(c: FitCase) -> None:
    if c.d.facet is not None:
        nf = c.profile.fields[c.d.facet].distinct
        c.note(f"{nf} panels, one per '{c.d.facet}', instead of {nf} colours")


def data_fit(design: Design, profile: Profile, stats: DesignStats) -> tuple[float, list[str]]:
    """The design's fit to the data (0..1) and the reasons, rule by rule."""
    f = profile.fields
    case = FitCase(design, REGISTRY[design.kind], profile, stats,
                   ncat=f[design.x].distinct if design.x in f else 0,
                   nhue=f[design.hue].distinct if design.hue in f else 0,
                   mf=f.get(design.y) if design.y else None, n_points=stats.points)
    for check in RULES:
        check(case)
    return max(0.0, min(1.0, case.fit)), case.why
