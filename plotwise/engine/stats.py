"""Facts about the data that scoring and hazard checks need beyond the column profile: the
numbers a design would draw (grouped totals or means), group sizes, overplotting, shape,
association. Works on a small frame of the used columns only; the caller's frame is never
changed. ``design_stats`` returns one ``DesignStats`` record; every field is documented there."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np
import pandas as pd

from plotwise.engine.conditions import is_binary, skewed
from plotwise.engine.profile import Profile
from plotwise.engine.rules import (
    PANEL_DPI,
    PANEL_PLOT_FRACTION,
    PANEL_SIZE_IN,
    SCATTER_MARKER_AREA_PT2,
    THRESHOLDS,
)
from plotwise.engine.working import working_frame

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.engine.association import Fit, Influence, Reversal
    from plotwise.engine.shape import BinRuleShape


@dataclass
class ShareTotal:
    """Whether percentages (or fractions) of one whole add to 100 (or 1)."""

    sum: float
    parts: int
    whole: int  # 100 or 1
    tolerance: float
    adds_up: bool


@dataclass
class MeanGap:
    """Largest difference between group means, in pooled within-group standard deviations."""

    d: float  # Cohen's d of the two most distant groups
    range: float  # the difference itself
    sd: float  # the pooled standard deviation


@dataclass
class GroupSums:
    """Per group of one category: row counts and, with a measure, its sums and sums of squares."""

    labels: pd.Index
    count: np.ndarray
    sum: np.ndarray | None = None
    sumsq: np.ndarray | None = None


@dataclass
class DesignStats:
    """What design_stats() found; read by data fit, expressiveness and the hazard checks."""

    points: int  # rows complete in the used columns (exact)
    rows: int  # all rows
    left_out: int  # rows left out for a missing or infinite value
    sampled: bool = False  # checks on single points used a seeded sample
    values: pd.Series | None = None  # the drawn statistic per category (grouping tasks)
    relative_spread: float | None = None  # (max − min) / max of those values, when all positive
    min_share: float | None = None  # the smallest value as a share of their total
    share_total: ShareTotal | None = None  # for a measure that looks like shares
    min_group_n: int | None = None  # rows in the smallest group
    mean_gap: MeanGap | None = None  # how far apart the group means are
    hue_labels: list[str] = field(default_factory=list)  # the hue's labels, sorted as text
    time_gaps: int = 0  # steps longer than 1.5 × the usual step between time points
    modes: int = 1  # modes of the measure (Gaussian KDE)
    bin_shapes: list[BinRuleShape] = field(default_factory=list)  # peaks under several bin rules
    binary_y: bool = False  # the measure is a 0/1 outcome
    reversal: Reversal | None = None  # the pooled comparison against the one within groups
    hidden_share: float | None = None  # share of points hidden behind others when drawn
    pearson: float | None = None  # Pearson's r of x and y (correlate)
    fit: Fit | None = None  # linear and quadratic fit of y on x
    influence: Influence | None = None  # the most influential point of that fit
    influence_row: str | None = None  # where that point is, in words


def share_total(total: float, parts: int) -> ShareTotal:
    """Do percentages (or fractions) of one whole add to 100 (or 1), allowing ±0.5 per part for
    rounding (common practice)?"""
    tol = THRESHOLDS["share_rounding_per_part"] * parts
    whole = 100 if total > THRESHOLDS["percent_total_above"] else 1
    tolerance = tol if whole == 100 else tol / 100
    return ShareTotal(total, parts, whole, tolerance, abs(total - whole) <= tolerance)


def hidden_share(x: np.ndarray, y: np.ndarray, logx=False, logy=False,
                 marker_px: float | None = None) -> float:
    """Share of points drawn on top of an earlier point at the drawn marker size.

    The panel's plotting area (PANEL_PLOT_FRACTION of PANEL_SIZE_IN at PANEL_DPI, the panel
    drawing uses) is cut into square cells one marker wide; every point after the first in a
    cell counts as hidden. A simple occupancy estimate (common practice), not a rendering. With
    ``marker_px``, x and y are already pixels of a drawn figure."""
    ok = np.isfinite(x) & np.isfinite(y)
    if logx:
        ok &= x > 0
    if logy:
        ok &= y > 0
    x, y = x[ok], y[ok]
    n = len(x)
    if n < 2:
        return 0.0
    if logx:
        x = np.log10(x)
    if logy:
        y = np.log10(y)
    if marker_px is not None:
        cx = ((x - x.min()) // marker_px).astype(np.int64)
        cy = ((y - y.min()) // marker_px).astype(np.int64)
        return float(1.0 - len(np.unique(cx * (int(cy.max()) + 1) + cy)) / n)
    marker = np.sqrt(SCATTER_MARKER_AREA_PT2) * PANEL_DPI / 72.0
    nx = max(1, int(PANEL_SIZE_IN[0] * PANEL_PLOT_FRACTION * PANEL_DPI / marker))
    ny = max(1, int(PANEL_SIZE_IN[1] * PANEL_PLOT_FRACTION * PANEL_DPI / marker))

    def cells(v, k):
        lo, hi = v.min(), v.max()
        if hi == lo:
            return np.zeros(len(v), dtype=np.int64)
        return np.minimum(((v - lo) / (hi - lo) * k).astype(np.int64), k - 1)

    return float(1.0 - len(np.unique(cells(x, nx) * (ny + 1) + cells(y, ny))) / n)


def point_sample(used: pd.DataFrame, k: int | None = None) -> pd.DataFrame:
    """The rows a point-drawing design shows: all of them, or a seeded sample of
    THRESHOLDS['draw_sample'] rows above THRESHOLDS['draw_sample_above']."""
    if len(used) <= THRESHOLDS["draw_sample_above"]:
        return used
    k = k or THRESHOLDS["draw_sample"]
    take = np.sort(np.random.default_rng(0).choice(len(used), size=k, replace=False))
    return used.iloc[take]


def time_codes(values: pd.Series) -> tuple[np.ndarray, pd.Index] | None:
    """Integer codes of a timestamp column without missing values, sorted by time, without a
    hash table: the timestamps are whole steps of their common step (days, say) after the first,
    so each one's step number indexes a count table as long as the span. (pandas sizes the hash
    table of a factorisation by the number of rows: 40 MB for a million timestamps.) None when
    the span would be long (irregular times): then a factorisation is cheaper."""
    if not pd.api.types.is_datetime64_dtype(values.dtype) or not len(values):
        return None
    raw = values.to_numpy()
    ticks = raw.view("i8")
    lo = int(ticks.min())
    codes = ticks - lo
    step = int(np.gcd.reduce(codes)) or 1
    span = int(codes.max()) // step + 1
    if span > max(4 * len(codes), 1_000_000):
        return None
    np.floor_divide(codes, step, out=codes)
    present = np.bincount(codes, minlength=span) > 0
    index = np.cumsum(present) - 1
    np.take(index, codes, out=codes)
    times = (lo + step * np.flatnonzero(present)).astype("i8").view(raw.dtype)
    return codes, pd.DatetimeIndex(times, tz=getattr(values.dtype, "tz", None))


def category_codes(values: pd.Series, known: tuple = ()) -> tuple[np.ndarray, pd.Index]:
    """Integer codes of a category column. With the profile's labels known, codes come from a
    lookup in a table of those few labels (a fraction of the memory of hashing every row); any
    value not among them falls back to a full factorisation, so the result is always exact.
    Timestamps get step numbers (time_codes) when their span is short."""
    timed = time_codes(values) if not values.hasnans else None
    if timed is not None:
        return timed
    arrow = (getattr(values.dtype, "storage", None) == "pyarrow"
             or isinstance(values.dtype, pd.ArrowDtype))
    if known and not arrow:  # (Arrow-backed text factorizes in Arrow, cheaper than any lookup)
        try:
            labels = pd.Index(sorted(known))
        except TypeError:
            labels = None
        if labels is not None and labels.is_unique:
            codes = labels.get_indexer(values)
            if not (codes < 0).any():
                return codes, labels
    codes, uniques = pd.factorize(values, sort=True)
    return codes, pd.Index(uniques)


def group_sizes(d: pd.DataFrame, keys: list[str], known: dict | None = None) -> pd.Series:
    """Rows per combination of ``keys`` present in ``d`` (no missing values), in sorted key
    order, as ``d.groupby(keys).size()`` gives them, counted from integer codes (numpy.bincount)
    rather than a hash table of every row. ``known``: the profile's labels per key, if any."""
    codes, levels = [], []
    for c in keys:
        k, u = category_codes(d[c], (known or {}).get(c) or ())
        codes.append(k)
        levels.append(u)
    combined = np.zeros(len(d), dtype=np.int64)
    for k, u in zip(codes, levels):
        combined *= len(u)
        combined += k
    counts = np.bincount(combined, minlength=int(np.prod([len(u) for u in levels])))
    present = np.flatnonzero(counts)
    if len(keys) == 1:
        index = levels[0][present]
    else:
        index = pd.MultiIndex(levels=levels, codes=np.unravel_index(
            present, [len(u) for u in levels]), names=keys)
    return pd.Series(counts[present], index=index)


def grouped(used: pd.DataFrame, x: str, y: str | None, known: tuple = ()) -> GroupSums:
    """One pass over the categories, then sums, counts and sums of squares per group
    (numpy.bincount): totals and means are exact, spreads computed analytically."""
    codes, uniques = category_codes(used[x], known)
    g = GroupSums(uniques, np.bincount(codes, minlength=len(uniques)).astype(float))
    if y is not None:
        yv = used[y].to_numpy(dtype=float)
        g.sum = np.bincount(codes, weights=yv, minlength=len(uniques))
        g.sumsq = np.bincount(codes, weights=yv * yv, minlength=len(uniques))
    return g


def per_group(used: pd.DataFrame, x: str, y: str, how: str, known: tuple = ()) -> pd.Series:
    """The sum or mean of ``y`` per value of ``x`` (sorted), from grouped() — as
    ``used.groupby(x)[y].agg(how)`` gives it, without a hash table of every row."""
    g = grouped(used, x, y, known)
    keep = g.count > 0
    v = g.sum if how == "sum" else g.sum / np.where(keep, g.count, 1)
    return pd.Series(v[keep], index=g.labels[keep], name=y)


def gap_from_sums(g: GroupSums) -> MeanGap | None:
    """The largest gap between group means in pooled within-group standard deviations, from the
    per-group sums (no second grouping)."""
    ok = g.count > 1
    if ok.sum() < 2 or g.sum is None or g.sumsq is None:
        return None
    n, s, ss = g.count[ok], g.sum[ok], g.sumsq[ok]
    means = s / n
    var = np.maximum((ss - n * means ** 2) / (n - 1), 0)
    pooled = float(np.sqrt(((n - 1) * var).sum() / (n - 1).sum()))
    if not pooled > 0:
        return None
    spread = float(means.max() - means.min())
    return MeanGap(spread / pooled, spread, pooled)


@dataclass
class _Job:
    """One design_stats() request: the data, the columns and where exact numbers come from."""

    profile: Profile
    task: str
    x: str | None
    y: str | None
    hue: str | None
    stat: str
    used: pd.DataFrame  # complete rows of the used columns
    pts: pd.DataFrame  # the seeded sample drawn by point designs
    exact: Any  # a sources.EngineStats, or None for pandas data
    ym: str | None  # y when it is a numeric measure
    others: tuple[str, ...]


def design_stats(df: pd.DataFrame, profile: Profile, task: str, x, y, hue, stat: str,
                 w: pd.DataFrame | None = None, exact=None) -> DesignStats:
    """The numbers the scorer's data-fit rules and the hazard checks read. Totals, means, counts
    and missing rows are exact; checks on individual points (overplotting, fits, modes, bin
    shapes) use the same seeded sample the drawing uses on large frames.

    ``exact`` (a sources.EngineStats) is given when an engine holds the data: then ``df`` is a
    seeded sample and the exact counts and grouped sums come from the engine."""
    cols = [c for c in dict.fromkeys([x, y, hue]) if c]
    w = working_frame(df, profile, cols) if w is None else w[cols]
    complete = all(profile.fields[c].missing + profile.fields[c].infinite == 0
                   and not profile.fields[c].parse_dates for c in cols)
    used = w if complete else w.dropna()
    ym = y if (y and profile.fields[y].level == "quantitative") else None
    job = _Job(profile, task, x, y, hue, stat, used, point_sample(used), exact, ym,
               tuple(c for c in cols if c not in (x, ym)))
    out = DesignStats(points=int(len(used)), rows=int(len(w)), left_out=int(len(w) - len(used)))
    g = _grouped_values(job, out) if (task in ("compare", "proportion", "trend") and x) else None
    if exact is not None:  # with a grouping, the complete rows are the sum of the group sizes
        out.points = int(g.count.sum()) if g is not None else exact.complete(cols)
        out.rows = profile.rows
        out.left_out = profile.rows - out.points
    out.sampled = len(job.pts) < out.points
    if hue:
        out.hue_labels = sorted(str(v) for v in pd.unique(used[hue]))
    if ym:
        out.binary_y = is_binary(profile.fields[ym])
    _time_gaps(job, out)
    _shape(job, out)
    _groups_of_hue(job, out)
    _association(job, out)
    return out


def _grouped_values(job: _Job, out: DesignStats) -> GroupSums:
    """The statistic each category would draw, its spread, shares and group sizes."""
    p, x, ym = job.profile, job.x, job.ym
    g = (job.exact.grouped(x, ym, job.others) if job.exact is not None
         else grouped(job.used, x, ym, p.fields[x].labels))
    use = "sum" if job.task == "proportion" else job.stat
    if ym is None or use == "count":
        v = g.count
    elif use == "mean":
        v = g.sum / g.count
    elif use == "median":  # not from sums: the engine's (or pandas') own median per group
        med = (job.exact.medians(x, ym, job.others) if job.exact is not None
               else job.used.groupby(x, observed=True, sort=True)[ym].median())
        v = med.reindex(g.labels).to_numpy()
    else:
        v = g.sum
    vals = pd.Series(v, index=g.labels)
    out.values = vals
    if len(vals):
        vmax, vmin = float(vals.max()), float(vals.min())
        mag = max(abs(vmax), abs(vmin))
        out.relative_spread = (vmax - vmin) / mag if mag > 0 and vmin > 0 else None
        total = float(vals.sum())
        if vmin >= 0 and total > 0:
            out.min_share = vmin / total
        if ym and p.fields[ym].share_like and not job.hue:
            out.share_total = share_total(total, len(vals))
    if ym and job.task != "trend":
        out.min_group_n = int(g.count.min()) if len(g.count) else 0
        out.mean_gap = None if is_binary(p.fields[ym]) else gap_from_sums(g)
    return g


def _time_gaps(job: _Job, out: DesignStats) -> None:
    x = job.x
    if job.task != "trend" or not x or not pd.api.types.is_datetime64_any_dtype(job.used[x].dtype):
        return
    t = pd.Series(out.values.index if out.values is not None
                  else job.used[x].unique()).sort_values()
    steps = t.diff().dropna()
    if len(steps) >= 2:
        out.time_gaps = int((steps > THRESHOLDS["time_gap_steps"] * steps.median()).sum())


def _shape(job: _Job, out: DesignStats) -> None:
    """Modes of the measure, and for distributions the peaks under several bin rules."""
    from plotwise.engine.shape import bin_rule_shapes, kde_modes

    measure = job.y if job.task == "compare" else (job.x if job.task == "distribution" else None)
    f = job.profile.fields.get(measure) if measure else None
    if f is None or f.level != "quantitative" or f.is_discrete:
        return
    log = skewed(f)
    values = job.used[measure].to_numpy(dtype=float)
    out.modes = kde_modes(values, log=log)
    if job.task == "distribution":
        k = THRESHOLDS["profile_sample"]
        if len(values) > k:  # bin shapes from a seeded sample of the profile's size
            values = values[np.random.default_rng(0).choice(len(values), k, replace=False)]
        out.bin_shapes = bin_rule_shapes(values, log=log)


def _groups_of_hue(job: _Job, out: DesignStats) -> None:
    """Distributions: rows in the smallest hue group (or all rows without a hue)."""
    if job.task != "distribution":
        return
    if not job.hue:
        out.min_group_n = int(out.points)
        return
    sizes = (pd.Series(job.exact.grouped(job.hue, None, (job.x,)).count)
             if job.exact is not None else job.used.groupby(job.hue, observed=True).size())
    out.min_group_n = int(sizes.min()) if len(sizes) else 0


def _association(job: _Job, out: DesignStats) -> None:
    """Reversal within groups, overplotting, fit and influence, from the drawn sample."""
    from plotwise.engine.association import rate_reversal

    p, x, y, ym, pts = job.profile, job.x, job.y, job.ym, job.pts
    if job.hue and job.task == "compare" and ym:
        out.reversal = rate_reversal(job.used, x, ym, job.hue)
    if (job.task == "correlate" and x and y and p.fields[x].level == "quantitative"
            and p.fields[y].level == "quantitative"):
        _correlation(job, out)
    if job.task == "compare" and x and ym:
        # Strip plots draw every (sampled) point along the category axis, jittered.
        codes = pd.factorize(pts[x], sort=True)[0].astype(float)
        jitter = THRESHOLDS["strip_jitter"]
        out.hidden_share = hidden_share(
            codes + np.random.default_rng(0).uniform(-jitter, jitter, len(codes)),
            pts[ym].to_numpy(dtype=float))


def _correlation(job: _Job, out: DesignStats) -> None:
    from plotwise.engine.association import correlation_reversal, fit_summary, most_influential

    x, y, pts = job.x, job.y, job.pts
    xv = pts[x].to_numpy(dtype=float)
    yv = pts[y].to_numpy(dtype=float)
    out.hidden_share = hidden_share(xv, yv)
    if len(xv) > 2 and np.std(xv) > 0 and np.std(yv) > 0:
        out.pearson = float(np.corrcoef(xv, yv)[0, 1])
    out.fit = fit_summary(xv, yv)
    infl = most_influential(xv, yv)
    out.influence = infl
    if infl is not None:
        row = pts.iloc[infl.index]
        out.influence_row = (f"at position {pts.index[infl.index]} "
                             f"({x} = {row[x]:.4g}, {y} = {row[y]:.4g})")
    if job.hue:
        out.reversal = correlation_reversal(job.used, x, y, job.hue)
