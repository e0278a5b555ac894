"""Facts about the data that scoring and hazard checks need beyond the column profile: the
numbers a design would draw (grouped totals or means), group sizes, overplotting, correlation.
Works on a small frame of the used columns only; the caller's frame is never changed."""

from __future__ import annotations

import warnings

import numpy as np
import pandas as pd

from plotwise.engine.profile import Profile
from plotwise.engine.rules import PANEL_DPI, PANEL_SIZE_IN, SCATTER_MARKER_AREA_PT2, THRESHOLDS


def skewed(f) -> bool:
    """Positive data with a heavy right tail: drawn and analysed on a log scale."""
    return (f is not None and f.level == "quantitative" and f.skew is not None
            and f.minimum is not None and f.minimum > 0 and f.skew > THRESHOLDS["skew_log"]
            and f.maximum / f.minimum >= THRESHOLDS["skew_span"])


def working_frame(df: pd.DataFrame, profile: Profile, columns: list[str]) -> pd.DataFrame:
    """The used columns under their string labels, with dates parsed, durations in seconds and
    infinities as missing. Rows with any missing value are kept (callers drop as they need)."""
    data = {}
    for label in columns:
        f = profile.fields[label]
        s = df[f.name]
        if f.as_text:
            s = s.astype("string")
        elif f.parse_dates:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                s = pd.to_datetime(s, errors="coerce", format="ISO8601")
        elif f.is_timedelta:
            s = s.dt.total_seconds()
        elif f.level == "temporal" and f.is_integer:  # integer years: 2024, not 2024.0
            s = pd.to_numeric(s, errors="coerce").round().astype("Int64")
        elif f.level in ("quantitative", "temporal") and pd.api.types.is_numeric_dtype(s.dtype) \
                and not pd.api.types.is_bool_dtype(s.dtype):
            if s.dtype != np.float64:
                s = pd.to_numeric(s, errors="coerce").astype("float64")
            if f.infinite:
                s = s.replace([np.inf, -np.inf], np.nan)
        data[label] = s.reset_index(drop=True)
    return pd.DataFrame(data, copy=False)


def aggregate(w: pd.DataFrame, by: list[str], y: str | None, stat: str) -> pd.Series:
    """Grouped statistic of ``y`` (or row counts) by the ``by`` columns, missing rows left out."""
    cols = by + ([y] if y else [])
    d = w[cols].dropna()
    g = d.groupby(by, observed=True, sort=True)
    if y is None or stat == "count":
        return g.size()
    if stat == "mean":
        return g[y].mean()
    return g[y].sum()


def share_total(total: float, parts: int) -> dict:
    """Do percentages (or fractions) of one whole add to 100 (or 1), allowing ±0.5 per part for
    rounding (common practice)?"""
    tol = THRESHOLDS["share_rounding_per_part"] * parts
    whole = 100 if total > 5 else 1
    adds_up = abs(total - whole) <= (tol if whole == 100 else tol / 100)
    return {"sum": total, "parts": parts, "whole": whole, "tolerance": tol if whole == 100 else tol / 100,
            "adds_up": adds_up}


def mean_gap(used: pd.DataFrame, x: str, y: str) -> dict | None:
    """Largest difference between group means in units of the pooled within-group standard
    deviation (Cohen's d for the two most distant groups)."""
    g = used.groupby(x, observed=True)[y]
    means, sds, ns = g.mean(), g.std(ddof=1), g.size()
    ok = ns > 1
    if ok.sum() < 2:
        return None
    means, sds, ns = means[ok], sds[ok], ns[ok]
    pooled = float(np.sqrt(((ns - 1) * sds ** 2).sum() / (ns - 1).sum()))
    if not pooled > 0:
        return None
    spread = float(means.max() - means.min())
    return {"d": spread / pooled, "range": spread, "sd": pooled}


def hidden_share(x: np.ndarray, y: np.ndarray, logx=False, logy=False,
                 marker_px: float | None = None) -> float:
    """Share of points drawn on top of an earlier point at the drawn marker size.

    The panel's plotting area (75% of PANEL_SIZE_IN at PANEL_DPI) is cut into square cells one
    marker wide; every point after the first in a cell counts as hidden. A simple occupancy
    estimate (common practice), not a rendering."""
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
    if marker_px is None:
        marker_px_default = np.sqrt(SCATTER_MARKER_AREA_PT2) * PANEL_DPI / 72.0
    else:
        marker_px_default = marker_px
    wpx = PANEL_SIZE_IN[0] * 0.75 * PANEL_DPI
    hpx = PANEL_SIZE_IN[1] * 0.75 * PANEL_DPI
    nx, ny = max(1, int(wpx / marker_px_default)), max(1, int(hpx / marker_px_default))

    def cells(v, k):
        lo, hi = v.min(), v.max()
        if hi == lo:
            return np.zeros(len(v), dtype=np.int64)
        return np.minimum(((v - lo) / (hi - lo) * k).astype(np.int64), k - 1)

    if marker_px is not None:  # x and y already in pixels (a drawn figure): cells one marker wide
        cx = ((x - x.min()) // marker_px).astype(np.int64)
        cy = ((y - y.min()) // marker_px).astype(np.int64)
        occupied = len(np.unique(cx * (int(cy.max()) + 1) + cy))
        return float(1.0 - occupied / n)
    occupied = len(np.unique(cells(x, nx) * (ny + 1) + cells(y, ny)))
    return float(1.0 - occupied / n)


def point_sample(used: pd.DataFrame, k: int | None = None) -> pd.DataFrame:
    """The rows a point-drawing design shows: all of them, or a seeded sample of
    THRESHOLDS['draw_sample'] rows above THRESHOLDS['draw_sample_above']."""
    if len(used) <= THRESHOLDS["draw_sample_above"]:
        return used
    k = k or THRESHOLDS["draw_sample"]
    take = np.sort(np.random.default_rng(0).choice(len(used), size=k, replace=False))
    return used.iloc[take]


def category_codes(values: pd.Series, known: tuple = ()) -> tuple[np.ndarray, pd.Index]:
    """Integer codes of a category column. With the profile's labels known, codes come from a
    lookup in a table of those few labels (a fraction of the memory of hashing every row); any
    value not among them falls back to a full factorisation, so the result is always exact."""
    arrow = getattr(values.dtype, "storage", None) == "pyarrow" or isinstance(values.dtype, pd.ArrowDtype)
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


def grouped(used: pd.DataFrame, x: str, y: str | None, known: tuple = ()) -> dict:
    """One pass over the categories, then sums, counts and sums of squares per group
    (numpy.bincount): totals and means are exact, spreads computed analytically."""
    codes, uniques = category_codes(used[x], known)
    cnt = np.bincount(codes, minlength=len(uniques)).astype(float)
    out = {"labels": uniques, "count": cnt}
    if y is not None:
        yv = used[y].to_numpy(dtype=float)
        out["sum"] = np.bincount(codes, weights=yv, minlength=len(uniques))
        out["sumsq"] = np.bincount(codes, weights=yv * yv, minlength=len(uniques))
    out["codes"] = codes
    return out


def _gap_from_sums(g: dict) -> dict | None:
    """mean_gap() from per-group sums (same result, no second grouping)."""
    n, s, ss = g["count"], g["sum"], g["sumsq"]
    ok = n > 1
    if ok.sum() < 2:
        return None
    n, s, ss = n[ok], s[ok], ss[ok]
    means = s / n
    var = np.maximum((ss - n * means ** 2) / (n - 1), 0)
    pooled = float(np.sqrt(((n - 1) * var).sum() / (n - 1).sum()))
    if not pooled > 0:
        return None
    spread = float(means.max() - means.min())
    return {"d": spread / pooled, "range": spread, "sd": pooled}


def is_binary(f) -> bool:
    """A 0/1 outcome (exact min and max from the profile)."""
    return (f is not None and f.level == "quantitative" and f.minimum is not None
            and f.minimum >= 0 and f.maximum <= 1 and f.is_integer and f.distinct <= 2)


def design_stats(df: pd.DataFrame, profile: Profile, task: str, x, y, hue, stat: str,
                 log_scale: bool = False, w: pd.DataFrame | None = None, exact=None) -> dict:
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
    out: dict = {"points": int(len(used)), "left_out": int(len(w) - len(used)), "rows": int(len(w))}
    ym = y if (y and profile.fields[y].level == "quantitative") else None
    others = tuple(c for c in cols if c not in (x, ym))
    grouping = task in ("compare", "proportion", "trend") and x
    if exact is not None:
        # With a grouping, the complete rows are the sum of the group sizes (one engine query).
        g = exact.grouped(x, ym, others) if grouping else None
        out["points"] = int(g["count"].sum()) if grouping else exact.complete(cols)
        out["rows"] = profile.rows
        out["left_out"] = profile.rows - out["points"]
    pts = point_sample(used)
    out["sampled"] = len(pts) < out["points"]
    if grouping:
        if exact is None:
            g = grouped(used, x, ym, profile.fields[x].labels)
        use = "sum" if task == "proportion" else stat
        if ym is None or use == "count":
            v = g["count"]
        elif use == "mean":
            v = g["sum"] / g["count"]
        elif use == "median":  # not from sums: the engine's (or pandas') own median per group
            med = (exact.medians(x, ym, others) if exact is not None
                   else used.groupby(x, observed=True, sort=True)[ym].median())
            v = med.reindex(g["labels"]).to_numpy()
        else:
            v = g["sum"]
        vals = pd.Series(v, index=g["labels"])
        out["values"] = vals
        if len(vals):
            vmax, vmin = float(vals.max()), float(vals.min())
            mag = max(abs(vmax), abs(vmin))
            out["relative_spread"] = (vmax - vmin) / mag if mag > 0 and vmin > 0 else None
            total = float(vals.sum())
            if vmin >= 0 and total > 0:
                out["min_share"] = vmin / total
            if ym and profile.fields[ym].share_like and not hue:
                out["share_total"] = share_total(total, len(vals))
        if ym and task != "trend":
            out["min_group_n"] = int(g["count"].min()) if len(g["count"]) else 0
            out["mean_gap"] = None if is_binary(profile.fields[ym]) else _gap_from_sums(g)
    if hue:
        out["hue_labels"] = sorted(str(v) for v in pd.unique(used[hue]))
    if task == "trend" and x and pd.api.types.is_datetime64_any_dtype(used[x].dtype):
        t = pd.Series(out["values"].index if exact is not None and "values" in out
                      else used[x].unique()).sort_values()
        steps = t.diff().dropna()
        if len(steps) >= 2:
            out["time_gaps"] = int((steps > 1.5 * steps.median()).sum())
    measure = y if task == "compare" else (x if task == "distribution" else None)
    if measure and profile.fields[measure].level == "quantitative" and not profile.fields[measure].is_discrete:
        from plotwise.engine.shape import bin_rule_shapes, kde_modes

        log = skewed(profile.fields[measure])
        values = used[measure].to_numpy(dtype=float)
        out["modes"] = kde_modes(values, log=log)
        if task == "distribution":
            k = THRESHOLDS["profile_sample"]
            if len(values) > k:  # bin shapes from a seeded sample of the profile's size
                values = values[np.random.default_rng(0).choice(len(values), k, replace=False)]
            out["bin_shapes"] = bin_rule_shapes(values, log=log)
    if ym:
        out["binary_y"] = is_binary(profile.fields[ym])
    if hue and task == "compare" and ym:
        from plotwise.engine.association import rate_reversal

        out["reversal"] = rate_reversal(used, x, ym, hue)
    if task == "distribution":
        if hue:
            sizes = (pd.Series(exact.grouped(hue, None, (x,))["count"]) if exact is not None
                     else used.groupby(hue, observed=True).size())
            out["min_group_n"] = int(sizes.min()) if len(sizes) else 0
        else:
            out["min_group_n"] = int(out["points"])
    if task == "correlate" and x and y and profile.fields[x].level == "quantitative" \
            and profile.fields[y].level == "quantitative":
        xv = pts[x].to_numpy(dtype=float)
        yv = pts[y].to_numpy(dtype=float)
        out["hidden_share"] = hidden_share(xv, yv)
        if len(xv) > 2 and np.std(xv) > 0 and np.std(yv) > 0:
            out["pearson"] = float(np.corrcoef(xv, yv)[0, 1])
        from plotwise.engine.association import correlation_reversal, fit_summary, most_influential

        out["fit"] = fit_summary(xv, yv)
        infl = most_influential(xv, yv)
        out["influence"] = infl
        if infl is not None:
            row = pts.iloc[infl.index]
            out["influence_row"] = (f"at position {pts.index[infl.index]} "
                                    f"({x} = {row[x]:.4g}, {y} = {row[y]:.4g})")
        if hue:
            out["reversal"] = correlation_reversal(used, x, y, hue)
    if task == "compare" and x and ym:
        # Strip plots draw every (sampled) point along the category axis.
        codes = pd.factorize(pts[x], sort=True)[0].astype(float)
        out["hidden_share"] = hidden_share(codes + np.random.default_rng(0).uniform(-.2, .2, len(codes)),
                                           pts[ym].to_numpy(dtype=float))
    return out


def _on_scale(values: np.ndarray, log: bool) -> np.ndarray:
    v = values[np.isfinite(values)]
    return np.log10(v[v > 0]) if log else v


def fd_width(iqr_values: np.ndarray, n: int) -> float | None:
    """Freedman & Diaconis (1981) bin width 2·IQR·n^(-1/3), the IQR taken from ``iqr_values``
    (all values, or a sample of them) and n the number of values binned; None when the IQR is 0."""
    if len(iqr_values) < 2:
        return None
    q25, q75 = np.percentile(iqr_values, [25, 75])
    return 2 * (q75 - q25) * n ** (-1 / 3) if q75 > q25 else None


def sturges_count(n: int) -> int:
    """Sturges (1926): ⌈log2 n⌉ + 1 bins."""
    return int(np.ceil(np.log2(n)) + 1) if n else 1


def choose_bins(values: np.ndarray, log: bool = False) -> tuple[str, str]:
    """A histogram bin rule for ``values`` and the sentence saying why.

    Freedman & Diaconis (1981), h = 2·IQR·n^(-1/3), resists outliers; when the IQR is zero or
    the rule gives an unreadable number of bins, Sturges (1926), k = ⌈log2 n⌉ + 1. Both as
    implemented by numpy.histogram_bin_edges."""
    v = _on_scale(values, log)
    where = " (on the log scale)" if log else ""
    n = len(v)
    # numpy's 'fd' rule: width h = 2·IQR·n^(-1/3), ⌈range / h⌉ equal bins (computed here from
    # the one percentile call rather than asking numpy to sort again).
    h = fd_width(v, n)
    if h is not None:
        k = int(np.ceil(np.ptp(v) / h))
        if 5 <= k <= 150:
            return "fd", (f"bins: Freedman–Diaconis{where}, width 2·IQR·n^(-1/3) = {h:.3g} "
                          f"→ {k} bins, robust to outliers (Freedman & Diaconis 1981)")
    k = sturges_count(n)
    return "sturges", (f"bins: Sturges{where}, ⌈log2 n⌉ + 1 = {k} bins (Sturges 1926), since "
                       "Freedman–Diaconis gives too few or too many bins here")


def engine_edges(sample: np.ndarray, n: int, lo: float, hi: float, rule: str,
                 log: bool) -> tuple:
    """Histogram bins for engine data: (low, width, count, log). The Freedman–Diaconis width
    takes the IQR from the seeded sample and n, min and max exact from the engine; Sturges uses
    the exact n. At most 200 bins (common practice)."""
    if log:
        lo, hi = np.log10(lo), np.log10(hi)
    span = hi - lo
    h = fd_width(_on_scale(sample, log), n) if rule == "fd" else None
    k = int(np.ceil(span / h)) if (h and span > 0) else sturges_count(max(n, 1))
    k = int(min(max(k, 1), 200))
    width = span / k if span > 0 else 1.0
    # 12 significant digits: readable in the generated code, far below any drawn difference
    # (values a rounding puts outside the range are counted in the end bins).
    return float(f"{lo:.12g}"), float(f"{width:.12g}"), k, bool(log)
