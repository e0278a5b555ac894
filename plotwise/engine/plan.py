"""The drawing plan of each candidate for this data: log axes for skewed columns, the histogram's
bin rule, samples and pre-binning on large data, what engine data brings back, the caller's
colours, and the panel note that says what was drawn. Fills ``Design.options``; draws nothing."""

from __future__ import annotations

from plotwise.engine.bins import choose_bins, engine_edges
from plotwise.engine.colour import scheme_for
from plotwise.engine.conditions import skewed
from plotwise.engine.design import Design
from plotwise.engine.kinds import REGISTRY, engine_mode, is_binned_pairs, large_mode
from plotwise.engine.profile import Profile
from plotwise.engine.rules import THRESHOLDS
from plotwise.engine.stats import DesignStats
from plotwise.engine.working import working_frame

AGGREGATE_WORDS = {"count": "counts", "sum": "totals", "value": "totals"}


def large_data_options(d: Design, stats: DesignStats) -> None:
    """On large data, point designs draw a seeded sample and histograms are binned first; every
    such panel says what it drew (a note on the panel and the `sampled` hazard)."""
    n = stats.points
    big, k = THRESHOLDS["draw_sample_above"], THRESHOLDS["draw_sample"]
    if n <= big or d.options.matrix:
        return
    mode = large_mode(d)
    if mode == "sample":
        d.options.sample = (big, k)
        d.options.note = f"random sample of {k:,} of {n:,} rows"
    elif mode == "prebin":
        d.options.prebin = True
        d.options.note = f"all {n:,} rows, counted into bins first"
    elif mode == "bin-sample":
        kb = THRESHOLDS["bin_sample"]
        if n > kb:
            d.options.sample = (kb, kb)
            d.options.note = f"random sample of {kb:,} of {n:,} rows, counted into bins"
        else:
            d.options.note = f"all {n:,} rows, counted into bins"
    else:
        what = AGGREGATE_WORDS.get(d.stat, "averages")
        d.options.note = f"{what} of all {n:,} rows, computed before drawing"


def engine_options(d: Design, stats: DesignStats, profile: Profile, working, bins) -> None:
    """Engine data: which rows each design's query brings back, and the panel note saying so."""
    n = stats.points
    name = profile.source.engine_name
    d.options.complete_rows = n
    mode = engine_mode(d)
    if mode == "groups":
        if d.stat == "value":  # one row per group: the values themselves, not totals
            d.options.note = f"all {n:,} values, one per group, fetched from {name}"
        else:
            what = {"count": "counts", "mean": "averages", "median": "medians"}.get(d.stat, "totals")
            d.options.note = f"{name} computed the {what} of all {n:,} rows"
    elif mode == "bins":
        f = profile.fields[d.x]
        d.options.edges = engine_edges(working[d.x].dropna().to_numpy(dtype=float), n,
                                       f.minimum, f.maximum, bins[0] if bins else "fd",
                                       skewed(f))
        d.options.note = f"{name} counted all {n:,} rows into bins"
    else:
        k = d.options.sample[1] if d.options.sample else THRESHOLDS["bin_sample"]
        d.options.engine_sample = k
        d.options.sample = None
        d.options.note = (f"random sample of about {k:,} of {n:,} rows, drawn by {name}"
                          if n > k else f"all {n:,} rows, fetched from {name}")


def mark_single_values(df, profile: Profile, designs: list[Design], exact=None) -> None:
    """Where each group holds one row, a design draws the value itself, not a total or mean."""
    unique: dict[tuple, bool] = {}
    for d in designs:
        if d.stat not in ("sum", "mean") or d.y is None:
            continue
        keys = tuple(c for c in (d.x, d.hue, d.facet) if c)
        combos = 1
        for k in keys:
            combos *= max(profile.fields[k].distinct, 1)
        if profile.rows > combos:  # more rows than key combinations: some group has several
            unique[keys] = False
        if keys not in unique and exact is not None:
            unique[keys] = exact.unique_keys(list(keys), d.y)
        if keys not in unique:
            w = working_frame(df, profile, list(keys) + [d.y]).dropna()
            unique[keys] = not w.duplicated(subset=list(keys)).any()
        if unique[keys]:
            d.stat = "value"


def strongest_pairs(df, profile: Profile, cols: list[str], k: int = 3) -> str:
    """A reason for a correlation matrix: how many pairs, and the k strongest."""
    w = working_frame(df, profile, cols)
    corr = w.corr()
    pairs = sorted(((abs(corr.iloc[i, j]), cols[i], cols[j], corr.iloc[i, j])
                    for i in range(len(cols)) for j in range(i + 1, len(cols))
                    if corr.iloc[i, j] == corr.iloc[i, j]), reverse=True)[:k]
    named = "; ".join(f"'{a}' & '{b}' r = {r:+.2f}" for _, a, b, r in pairs)
    return (f"all {len(cols) * (len(cols) - 1) // 2} pairs of {len(cols)} numeric columns in one "
            f"view; strongest: {named}")


def colour_reason(d: Design, profile: Profile) -> str | None:
    """Which colours the design uses and why, in one sentence."""
    if "hue" in d.encoding and d.encoding["hue"] in profile.fields and d.kind != "pie":
        f = profile.fields[d.encoding["hue"]]
        if d.options.palette:
            return f"colour: your palette of {len(d.options.palette)} colours for '{f.label}'"
        return "colour: " + scheme_for("nominal", n_levels=f.distinct)[1]
    if "lightness" in d.encoding:
        col = d.encoding["lightness"]
        fl = profile.fields.get(col)
        if d.options.cmap:
            return f"colour: your colormap '{d.options.cmap}' for '{col}'"
        return "colour: " + scheme_for("quantitative", signed=bool(fl and fl.signed))[1]
    return None


def histogram_bins(task: str, profile: Profile, working, x: str | None) -> tuple[str, str] | None:
    """The bin rule (and its reason) for a distribution of a numeric column."""
    if task != "distribution" or x is None or profile.fields[x].level != "quantitative":
        return None
    vals = working[x].dropna().to_numpy(dtype=float)
    return choose_bins(vals, log=skewed(profile.fields[x]))


def may_log(d: Design, profile: Profile) -> bool:
    """Can the design put a skewed number on a log axis? Kinds with a log axis can; so can a
    heatmap of two continuous numbers (its cells are then equal ratios wide, as the hexbin's
    beside it, instead of most rows falling into the first column)."""
    if REGISTRY[d.kind].log_axis:
        return True
    fields = [profile.fields.get(c) if c else None for c in (d.x, d.y)]
    return is_binned_pairs(d) and not d.options.matrix and all(
        f is not None and f.level == "quantitative" and not f.is_discrete for f in fields)


def plan_design(d: Design, profile: Profile, stats: DesignStats, *, df, working, bins,
                exact, palette, cmap_name) -> list[str]:
    """Fill ``d.options`` for this data; return the reasons the plan adds to the design's."""
    d.profile = profile
    extra: list[str] = []
    if palette:
        d.options.palette = list(palette)
    if cmap_name is not None:
        d.options.cmap = cmap_name
    logs = [c for c in (d.x, d.y) if c and skewed(profile.fields.get(c))]
    if logs and may_log(d, profile):
        d.options.log_columns = logs
        d.log_scale = True
        extra.append(f"log axis for {', '.join(repr(c) for c in logs)}: right-skewed (skewness "
                     f"{profile.fields[logs[0]].skew:.1f}), so equal steps mean equal ratios")
    large_data_options(d, stats)
    if exact is not None:
        engine_options(d, stats, profile, working, bins)
    if REGISTRY[d.kind].trend_line and stats.time_gaps:
        d.options.break_gaps = True
    if d.kind == "histogram" and bins is not None:
        d.options.bins = bins[0]
        extra.append(bins[1])
    if d.options.matrix:
        extra.append(strongest_pairs(df, profile, d.options.matrix))
    colour = colour_reason(d, profile)
    if colour:
        extra.append(colour)
    return extra
