"""Surprises: what in the data deserves a second look — an item that sits among another label's
items, a value far outside its own group, a level that jumps and stays, values that cannot be,
repeated rows, two units in one column.

Hazards say how a chart could mislead; surprises say what the data may be telling. Each check is
a plain function registered in SURPRISE_CHECKS with its code and a one-line description (the
README's table is compared with the same registry). A check receives a SurpriseContext for one
question the shown designs ask (task and columns) and returns a list of Surprise, naming the rows
(index labels) and numbers, with Marks that the drawing stage puts on the panels. Thresholds and
their sources are in ``rules.SURPRISE_THRESHOLDS``. Engine code: no matplotlib here."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from plotwise.engine.hazards import Finding
from plotwise.engine.headline import fmt
from plotwise.engine.meaning import name_says
from plotwise.engine.memo import memo_get, within_one_call
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.rules import NON_NEGATIVE_NAME_HINTS, SURPRISE_THRESHOLDS
from plotwise.engine.stats import group_sizes, per_group
from plotwise.engine.vocab import SEVERITIES
from plotwise.engine.working import working_frame

T = SURPRISE_THRESHOLDS
NAMED = 5  # rows named in one message, at most
MISFIT_SAMPLE = 20_000  # nearest neighbours are looked up among at most this many items
DUPLICATES_UP_TO = 2_000_000  # whole-row repeats are looked for in frames up to this many rows


@dataclass(frozen=True)
class Mark:
    """Where a surprise sits on a panel: values of the columns on the panel's axes (a column
    left out is not pinned: a mark with only a time value is a vertical line there)."""

    at: tuple[tuple[str, object], ...]  # (column label, value) pairs
    text: str

    def value(self, column: str | None):
        for c, v in self.at:
            if c == column:
                return v
        return None


@dataclass
class Surprise(Finding):
    """Severity info, or warn when the values cannot be right; the message names the rows and
    numbers found."""

    check: str = ""  # what to check
    rows: tuple = ()  # index labels of the rows concerned (the first few)
    columns: tuple[str, ...] = ()
    marks: tuple[Mark, ...] = ()

    def __str__(self) -> str:
        return f"[{self.code}] {self.message} Check: {self.check}"


@dataclass(frozen=True)
class Question:
    """What a shown design asks: its task, columns and statistic."""

    task: str
    x: str | None
    y: str | None
    hue: str | None
    stat: str


@dataclass(frozen=True, eq=False)
class SurpriseContext(Question):
    """One question the shown designs ask, over the caller's rows."""

    profile: Profile
    working: pd.DataFrame  # the used columns, converted; positions as in ``index``
    index: pd.Index  # the caller's row labels
    frame: pd.DataFrame = field(repr=False, default=None)  # the caller's frame (all columns)

    def field(self, label: str | None) -> FieldProfile | None:
        return self.profile.fields.get(label) if label else None

    def level(self, label: str | None) -> str | None:
        f = self.field(label)
        return f.level if f else None

    def rows(self, positions) -> tuple:
        return tuple(self.index[int(p)] for p in positions)

    def value_and_group(self) -> tuple[str | None, str | None]:
        """(numeric column, category column) of a question that splits values by a category."""
        if self.task in ("compare", "proportion") and self.y:
            value, group = self.y, self.x
        elif self.task == "distribution":
            value, group = self.x, self.hue
        else:
            return None, None
        if self.level(value) != "quantitative" or self.level(group) not in ("nominal", "ordinal"):
            return (value if self.level(value) == "quantitative" else None), None
        return value, group


@dataclass(frozen=True)
class SurpriseCheck:
    code: str
    description: str
    func: Callable[[SurpriseContext], list[Surprise]]


SURPRISE_CHECKS: list[SurpriseCheck] = []


def surprise(code: str, description: str):
    def register(func):
        SURPRISE_CHECKS.append(SurpriseCheck(code, description, func))
        return func
    return register


def row_list(rows: tuple, total: int | None = None) -> str:
    """'rows 3, 17 and 40' (and how many more)."""
    names = [repr(r) if isinstance(r, str) else str(r) for r in rows[:NAMED]]
    more = (total or len(rows)) - len(names)
    if len(names) == 1 and more <= 0:
        return f"row {names[0]}"
    text = ", ".join(names[:-1]) + f" and {names[-1]}" if more <= 0 else ", ".join(names)
    return f"rows {text}" + (f" and {more:,} more" if more > 0 else "")


def _label(v) -> str:
    return repr(v) if isinstance(v, str) else str(v)


# ------------------------------------------------------------------------------------------------
# The checks
# ------------------------------------------------------------------------------------------------
def misfit_items(points: np.ndarray, labels: np.ndarray, k: int) -> tuple[np.ndarray, np.ndarray]:
    """For each item: how many of its k nearest neighbours (standardised axes, itself left out)
    carry another label, and the most common label among them."""
    from scipy.spatial import cKDTree

    n = len(points)
    sd = points.std(axis=0)
    z = (points - points.mean(axis=0)) / np.where(sd > 0, sd, 1.0)
    _, idx = cKDTree(z).query(z, k=k + 1)
    own = np.arange(n)[:, None]
    # drop the item itself (with duplicate points it need not come first), else the farthest
    keep = idx != own
    first_drop = ~keep.any(axis=1)
    keep[first_drop, -1] = False
    keep[keep.sum(axis=1) > k, -1] = False
    nbrs = idx[keep].reshape(n, k)
    other = (labels[nbrs] != labels[:, None]).sum(axis=1)
    common = np.array([pd.Series(labels[row]).mode().iloc[0] for row in nbrs], dtype=object)
    return other, common


@surprise("label-misfit", "an item whose nearest neighbours nearly all carry another label")
def _label_misfit(ctx: SurpriseContext) -> list[Surprise]:
    if ctx.task != "correlate" or not ctx.hue or ctx.level(ctx.hue) not in ("nominal", "ordinal"):
        return []
    if ctx.level(ctx.x) != "quantitative" or ctx.level(ctx.y) != "quantitative":
        return []
    d = ctx.working[[ctx.x, ctx.y, ctx.hue]].dropna()
    sampled = len(d) > MISFIT_SAMPLE
    if sampled:  # neighbours within a seeded sample: the same items every run
        d = d.iloc[np.sort(np.random.default_rng(0).choice(len(d), MISFIT_SAMPLE, replace=False))]
    k = T["misfit_k"]
    if len(d) < 4 * k or d[ctx.hue].nunique() < 2:
        return []
    pts = d[[ctx.x, ctx.y]].to_numpy(dtype=float)
    labels = d[ctx.hue].astype(str).to_numpy(dtype=object)
    other, common = misfit_items(pts, labels, k)
    flagged = np.flatnonzero(other >= T["misfit_others"])
    if len(flagged) == 0 or len(flagged) > max(3, T["misfit_max_share"] * len(d)):
        return []
    flagged = flagged[np.argsort(-other[flagged], kind="stable")]
    rows = ctx.rows(d.index[flagged])
    first = flagged[0]
    raw = d[ctx.hue].to_numpy(dtype=object)
    marks = tuple(Mark(((ctx.x, pts[i, 0]), (ctx.y, pts[i, 1])), _label(ctx.index[d.index[i]]))
                  for i in flagged[:NAMED])
    return [Surprise(
        "label-misfit", "info",
        f"{row_list(rows)} of {ctx.hue!r} {'sits' if len(rows) == 1 else 'sit'} among items "
        "of another label: row "
        f"{_label(rows[0])} ({_label(raw[first])}) has {other[first]} of its {k} nearest items "
        f"labelled {common[first]!r} (on standardised {ctx.x!r} and {ctx.y!r}"
        + (f"; among a seeded sample of {MISFIT_SAMPLE:,} items)." if sampled else ")."),
        f"the label of {'that row' if len(rows) == 1 else 'those rows'}: a mislabelled item, "
        "or a real member that looks like another group?",
        rows=rows, columns=(ctx.x, ctx.y, ctx.hue), marks=marks)]


def group_centres(values: np.ndarray, codes: np.ndarray, smallest: int = 1
                  ) -> tuple[np.ndarray, np.ndarray]:
    """(median, MAD) of each group of ``values``, for Iglewicz & Hoaglin's modified z-score
    0.6745·(x − median)/MAD (far_from_centre); ``codes`` numbers the groups 0, 1, … A group
    of fewer than ``smallest`` values gets NaN. Past T['outlier_centre_sample'] values they come
    from a seeded sample (drawn with replacement) plus every row of the groups of at most
    T['outlier_small_group'] rows."""
    groups = int(codes.max()) + 1 if len(codes) else 0
    sizes = np.bincount(codes, minlength=groups)
    take = T["outlier_centre_sample"]
    if len(values) > take:
        small = sizes <= T["outlier_small_group"]
        drawn = np.random.default_rng(0).integers(0, len(values), take)
        rows = np.concatenate([drawn[~small[codes[drawn]]], np.flatnonzero(small[codes])])
        sv, sc = values[rows], codes[rows]
    else:
        sv, sc = values, codes
    med = pd.Series(sv).groupby(sc).median().reindex(range(groups)).to_numpy()
    mad = pd.Series(np.abs(sv - med[sc])).groupby(sc).median().reindex(range(groups)).to_numpy(
        copy=True)
    mad[(sizes < smallest) | ~np.isfinite(mad) | (mad == 0)] = np.nan
    return med, mad


def far_from_centre(values: np.ndarray, codes: np.ndarray, med: np.ndarray, mad: np.ndarray,
                    bar: float, block: int = 100_000) -> tuple[np.ndarray, np.ndarray]:
    """(positions, modified z) of the values whose modified z-score within their own group
    passes ``bar`` — computed in blocks of rows, so the memory beyond the inputs stays small."""
    where, zs = [], []
    for start in range(0, len(values), block):
        c = codes[start:start + block]
        with np.errstate(divide="ignore", invalid="ignore"):
            z = T["modified_z_constant"] * (values[start:start + block] - med[c]) / mad[c]
            far = np.flatnonzero(np.abs(z) > bar)
        where.append(far + start)
        zs.append(z[far])
    return np.concatenate(where or [np.arange(0)]), np.concatenate(zs or [np.zeros(0)])


@surprise("group-outlier", "a value far outside its own group (modified z-score above 3.5, "
          "and above what chance gives among that many values)")
def _group_outlier(ctx: SurpriseContext) -> list[Surprise]:
    value, group = ctx.value_and_group()
    if not value or not group:
        return []
    return memo_get(("group-outlier", value, group), lambda: _far_in_group(ctx, value, group),
                    about=ctx.frame)


def _far_in_group(ctx: SurpriseContext, value: str, group: str) -> list[Surprise]:
    d = ctx.working[[group, value]].dropna()
    f = ctx.field(value)
    # The modified z-score assumes a roughly symmetric spread. A heavy right tail of positive
    # values is judged on their logarithm; with zeros as well (rain, sales) a far value is the
    # tail itself, not a surprise (the `skewed` hazard speaks of it).
    skewed = f is not None and (f.skew or 0) > T["outlier_skew"]
    if skewed and not (d[value] > 0).all():
        return []
    found: list[tuple[float, int, object, float, float]] = []  # |z|, position, group, value, median
    # Among many values some pass 3.5 by chance alone: the bar is also the largest |z| that n
    # normal values reach by chance once in 20 (a Bonferroni bound, common practice).
    from statistics import NormalDist

    bar = max(T["modified_z"], -NormalDist().inv_cdf(0.025 / max(len(d), 1)))
    v = d[value].to_numpy(dtype=float)
    codes, labels = pd.factorize(d[group])
    scored = np.log10(v) if skewed else v
    med, mad = group_centres(scored, codes, smallest=T["outlier_min_group"])
    far, z = far_from_centre(scored, codes, med, mad, bar)
    told: dict[int, float] = {}  # each named group's median over all its rows, as the message says
    for i, zi in zip(far, z):
        c = int(codes[i])
        if c not in told:
            told[c] = float(np.median(v[codes == c]))
        found.append((abs(float(zi)), int(d.index[i]), labels[c], float(v[i]), told[c]))
    if not found or len(found) > max(2, T["outlier_max_share"] * len(d)):
        return []
    found.sort(key=lambda t: -t[0])
    rows = ctx.rows([f[1] for f in found])
    z0, _, g0, v0, m0 = found[0]
    marks = tuple(Mark(((group, g), (value, v)), _label(ctx.index[p])) for _, p, g, v, _ in
                  found[:NAMED])
    return [Surprise(
        "group-outlier", "info",
        f"{row_list(rows)}: {value!r} far outside {'its' if len(rows) == 1 else 'their'} own "
        f"{group!r} group; row {_label(rows[0])} holds {fmt(v0)} where the median of "
        f"{_label(g0)} is {fmt(m0)} (modified z = {z0:.1f}; beyond {bar:.1f} is far out among "
        f"{len(d):,} values).",
        "the value (a typing or unit error?) and the group label of "
        f"{'that row' if len(rows) == 1 else 'those rows'}.",
        rows=rows, columns=(group, value), marks=marks)]


@dataclass(frozen=True)
class LevelShift:
    at: int  # position of the first point at the new level
    evidence: float  # BIC advantage over the better of a constant and a line (discounted)
    phi: float  # lag-1 autocorrelation of the residuals about the two levels


def level_shift(y: np.ndarray) -> LevelShift | None:
    """The strongest single change in mean of ``y`` (least squares), or None when it does not
    beat a constant and a straight line (see SURPRISE_THRESHOLDS['shift_bic'])."""
    y = np.asarray(y, dtype=float)
    n = len(y)
    if n < T["shift_min_points"] or np.ptp(y) == 0:
        return None
    y = (y - y.mean()) / y.std()  # scale-free: ±1e300 stays finite
    q1, q3 = np.percentile(y, [25, 75])
    # a lone extreme value (a sensor code, a typo) must not decide where the level changes
    y = np.clip(y, q1 - 3 * (q3 - q1), q3 + 3 * (q3 - q1)) if q3 > q1 else y
    cs, cs2 = np.cumsum(y), np.cumsum(y * y)
    m = max(3, int(0.05 * n))
    k = np.arange(m, n - m + 1)
    if len(k) == 0:
        return None
    left, left2 = cs[k - 1], cs2[k - 1]
    right, right2 = cs[-1] - left, cs2[-1] - left2
    sse = left2 - left**2 / k + right2 - right**2 / (n - k)
    best = int(np.argmin(sse))
    at, sse_step = int(k[best]), max(float(sse[best]), 1e-12)
    sse_const = float(cs2[-1] - cs[-1] ** 2 / n)
    t = np.arange(n, dtype=float)
    slope, icpt = np.polyfit(t, y, 1)
    sse_line = float(((y - (slope * t + icpt)) ** 2).sum())
    resid = np.concatenate([y[:at] - y[:at].mean(), y[at:] - y[at:].mean()])
    phi = float(np.corrcoef(resid[:-1], resid[1:])[0, 1]) if resid.std() > 0 else 0.0
    phi = min(max(phi if np.isfinite(phi) else 0.0, 0.0), 0.99)
    neff = n * (1 - phi) / (1 + phi)
    # BIC differences on the effective sample: the step has 3 parameters, the line 2, the constant 1
    gain_const = neff * np.log(max(sse_const, 1e-12) / sse_step) - 2 * np.log(neff)
    gain_line = neff * np.log(max(sse_line, 1e-12) / sse_step) - 1 * np.log(neff)
    evidence = float(min(gain_const, gain_line))
    if evidence <= T["shift_bic"]:
        return None
    return LevelShift(at, evidence, phi)


def _when(v) -> str:
    if isinstance(v, pd.Timestamp):
        return str(v.date()) if v == v.normalize() else str(v)
    if isinstance(v, float) and v.is_integer():
        return str(int(v))
    return str(v)


@surprise("level-shift", "a trend whose level changes abruptly and stays changed")
def _level_shift(ctx: SurpriseContext) -> list[Surprise]:
    if ctx.task != "trend" or not ctx.y or ctx.level(ctx.y) != "quantitative":
        return []
    if ctx.level(ctx.x) not in ("temporal", "ordinal", "quantitative"):
        return []
    how = ctx.stat if ctx.stat in ("sum", "mean", "median") else "mean"
    d = ctx.working[[c for c in (ctx.x, ctx.y, ctx.hue) if c]].dropna()
    parts = [(None, d)] if not ctx.hue else list(d.groupby(ctx.hue, observed=True, sort=True))[:8]
    best = None
    for g, part in parts:
        series = (part.groupby(ctx.x, observed=True, sort=True)[ctx.y].median() if how == "median"
                  else per_group(part, ctx.x, ctx.y, how, ctx.field(ctx.x).labels))
        found = level_shift(series.to_numpy(dtype=float))
        if found and (best is None or found.evidence > best[1].evidence):
            best = (g, found, series)
    if best is None:
        return []
    g, found, series = best
    at = series.index[found.at]
    # medians: a lone extreme value (a sensor code) does not move the levels reported
    before = float(series.iloc[:found.at].median())
    after = float(series.iloc[found.at:].median())
    whose = f" for {ctx.hue} = {_label(g)}" if ctx.hue else ""
    direction = "drops" if after < before else "rises"
    return [Surprise(
        "level-shift", "info",
        f"the level of {ctx.y!r}{whose} {direction} from a median of about {fmt(before)} to "
        f"about {fmt(after)} at {_when(at)} ({len(series) - found.at} of {len(series)} time points "
        "after it) and stays there; a single step fits far better than a constant or a "
        f"straight line (BIC lower by {found.evidence:.0f}).",
        f"what changed at {_when(at)}: a new instrument or method, a changed definition, a real "
        "event? Compare the two periods separately.",
        columns=(ctx.x, ctx.y), marks=(Mark(((ctx.x, at),), f"level shift {_when(at)}"),))]


@surprise("impossible-value", "values that cannot be right: negative counts, shares above 100%, "
          "missing-value codes, placeholder or future dates")
def _impossible(ctx: SurpriseContext) -> list[Surprise]:
    out: list[Surprise] = []
    for col in dict.fromkeys(c for c in (ctx.x, ctx.y) if c):
        f = ctx.field(col)
        if f is None or col not in ctx.working:
            continue
        s = ctx.working[col]
        if f.level == "quantitative":
            out += _impossible_numbers(ctx, col, f, s.to_numpy(dtype=float, na_value=np.nan))
        elif f.level == "temporal" and pd.api.types.is_datetime64_any_dtype(s):
            out += _impossible_dates(ctx, col, s)
    return out


def _found(ctx, col, positions, values, what, check) -> Surprise:
    rows = ctx.rows(positions)
    shown = ", ".join(fmt(v) for v in values[:NAMED])
    verb = "holds" if len(positions) == 1 else "hold"
    return Surprise("impossible-value", "warn",
                    f"{row_list(rows, len(positions))} of {col!r} {verb} {what} ({shown}).", check,
                    rows=rows[:NAMED], columns=(col,))


def _impossible_numbers(ctx, col, f, v) -> list[Surprise]:
    out = []
    finite = np.isfinite(v)
    codes = np.zeros(len(v), dtype=bool)
    coded = np.isin(v, T["sentinels"])
    rest = v[finite & ~coded]
    if coded.any() and len(rest) >= 5:
        q1, q3 = np.percentile(rest, [25, 75])
        fence = 3 * max(q3 - q1, 1e-12)
        codes = coded & ((v < q1 - fence) | (v > q3 + fence))
        pos = np.flatnonzero(codes)
        if len(pos):
            out.append(_found(ctx, col, pos, v[pos], "a code often used for 'missing', far "
                              "from the other values",
                              "the data's codebook; replace the code with a missing value "
                              f"(df[{col!r}].replace({fmt(v[pos[0]])}, np.nan))."))
    hint = name_says(col, NON_NEGATIVE_NAME_HINTS)
    neg = np.flatnonzero(finite & (v < 0) & ~codes)
    if hint and len(neg) and len(neg) <= 0.2 * finite.sum():
        out.append(_found(ctx, col, neg, v[neg], f"negative values, but the name says '{hint}'",
                          "whether these are refunds or corrections kept on purpose, or sign "
                          "errors; filter or fix them before totals are drawn."))
    if f.share_like and finite.any() and np.nanmedian(v[finite]) <= 100:
        over = np.flatnonzero(finite & (v > 100))
        if len(over):
            out.append(_found(ctx, col, over, v[over], "shares above 100%",
                              "how the share was computed; a share of one whole cannot pass 100%."))
    return out


def _impossible_dates(ctx, col, s: pd.Series) -> list[Surprise]:
    out = []
    tz = getattr(s.dt, "tz", None)
    naive = s.dt.tz_convert(None) if tz is not None else s
    placeholder = naive.isin(pd.to_datetime(list(T["sentinel_dates"])))
    if placeholder.any() and (~placeholder & naive.notna()).sum() >= 5:
        rest = naive[~placeholder].dropna()
        # "well before": further from the other dates than they span, and by over a year (a
        # car's model year 1970 beside 1971..1982 is a date, not a placeholder)
        gap = max(rest.max() - rest.min(), pd.Timedelta(days=366))
        pos = np.flatnonzero(placeholder.to_numpy() & (naive < rest.min() - gap).to_numpy())
        if len(pos):
            vals = [str(naive.iloc[p].date()) for p in pos[:NAMED]]
            rows = ctx.rows(pos)
            out.append(Surprise(
                "impossible-value", "warn",
                f"{row_list(rows, len(pos))} of {col!r} hold a placeholder date "
                f"({', '.join(vals)}), well before every other date.",
                "whether these dates are unknown; set them to missing (NaT) before drawing.",
                rows=rows[:NAMED], columns=(col,)))
    now = pd.Timestamp.now(tz="UTC").tz_convert(None)
    future = np.flatnonzero((naive > now).to_numpy())
    if len(future) and len(future) <= 0.5 * naive.notna().sum():
        rows = ctx.rows(future)
        vals = [str(naive.iloc[p].date()) for p in future[:NAMED]]
        out.append(Surprise(
            "impossible-value", "warn",
            f"{row_list(rows, len(future))} of {col!r} lie in the future ({', '.join(vals)}).",
            "whether these are planned dates or typing errors (a wrong year?).",
            rows=rows[:NAMED], columns=(col,)))
    return out


def chance_repeats(frame: pd.DataFrame) -> float:
    """How many pairs of rows would agree in every column by chance, were the columns
    independent: the pairs of rows times, per column, the share of pairs of rows holding equal
    values (the repeats themselves count in, which errs towards silence)."""
    n = len(frame)
    pairs = n * (n - 1) / 2
    expected = pairs
    for c in frame.columns:
        counts = frame[c].value_counts(dropna=False).to_numpy(dtype=float)
        expected *= float((counts * (counts - 1)).sum()) / (n * (n - 1))
        if expected == 0:
            break
    return expected


@surprise("duplicate-rows", "rows repeated exactly, or several rows where one per key is "
          "expected (one per time point and group)")
def _duplicate_rows(ctx: SurpriseContext) -> list[Surprise]:
    return _repeated_rows(ctx) + _repeated_keys(ctx)


def _repeated_rows(ctx: SurpriseContext) -> list[Surprise]:
    frame = ctx.frame
    if frame is None or not 3 <= len(frame) <= DUPLICATES_UP_TO or frame.columns.has_duplicates:
        return []
    found = memo_get(("repeated-rows",), lambda: _exact_repeats(frame), about=frame)
    if found is None:
        return []
    pos, twin_pos = found
    if chance_repeats(frame) > T["duplicate_chance"] * len(pos):
        return []
    rows = ctx.rows(pos)
    twin = ctx.index[twin_pos]
    which = (f"row {_label(rows[0])} repeats row {_label(twin)}" if twin != rows[0] else
             f"the label {_label(twin)} is on both copies")
    return [Surprise(
        "duplicate-rows", "info",
        f"{row_list(rows, len(pos))} {'repeats' if len(pos) == 1 else 'repeat'} an earlier row "
        f"in every column ({which}).",
        "whether each row is a separate item; drop repeats with df.drop_duplicates() if they "
        "were loaded twice.", rows=rows[:NAMED])]


def row_hashes(frame: pd.DataFrame, block: int = 100_000) -> np.ndarray:
    """One 64-bit hash per row from pandas' hash of each value (hash_pandas_object), combined
    column by column in blocks of rows, so that the memory beyond the result stays small."""
    out = np.zeros(len(frame), dtype=np.uint64)
    for start in range(0, len(frame), block):
        part = frame.iloc[start:start + block]
        acc = out[start:start + block]
        for col in range(part.shape[1]):
            h = pd.util.hash_pandas_object(part.iloc[:, col], index=False).to_numpy()
            acc *= np.uint64(1_000_003)
            acc ^= h
    return out


def _exact_repeats(frame: pd.DataFrame) -> tuple[np.ndarray, int] | None:
    """(positions of the rows that repeat an earlier row in every column, position of the row
    the first of them repeats), or None. Rows are hashed first (pandas' row hash, one pass);
    only rows whose hash occurs twice are compared exactly, so a hash collision never counts."""
    try:
        hashes = row_hashes(frame)
        # hashes that occur twice, found on a sorted copy (a hash table would cost more memory)
        ordered = np.sort(hashes)
        twice = np.unique(ordered[1:][ordered[1:] == ordered[:-1]])
        del ordered
        maybe = np.flatnonzero(np.isin(hashes, twice)) if len(twice) else np.arange(0)
    except (TypeError, ValueError):  # values pandas cannot hash (lists beside numbers...)
        maybe = np.arange(len(frame))
    if len(maybe) == 0:
        return None
    try:
        few = frame.iloc[maybe]
        dup = few.duplicated(keep="first").to_numpy()
    except TypeError:  # unhashable values (lists, dicts): no row comparison
        return None
    if not dup.any():
        return None
    first = int(np.flatnonzero(dup)[0])
    twin = int(np.flatnonzero(few.iloc[: first + 1].duplicated(keep="last").to_numpy())[0])
    return maybe[dup], int(maybe[twin])


def _repeated_keys(ctx: SurpriseContext) -> list[Surprise]:
    if ctx.task != "trend" or not ctx.y or ctx.level(ctx.x) != "temporal":
        return []
    keys = [c for c in (ctx.x, ctx.hue) if c]
    d = ctx.working[keys].dropna()
    sizes = group_sizes(d, keys, {c: ctx.field(c).labels for c in keys})
    if len(sizes) < 10 or (sizes == 1).mean() < T["one_per_key"] or (sizes > 1).sum() == 0:
        return []
    many = sizes[sizes > 1]
    key0 = many.index[0]
    mask = np.ones(len(d), dtype=bool)
    for c, v in zip(keys, key0 if isinstance(key0, tuple) else (key0,)):
        mask &= (d[c] == v).to_numpy()
    rows = ctx.rows(d.index[mask])
    what = "time point" + (" and group" if ctx.hue else "")
    k0 = ", ".join(_when(v) for v in (key0 if isinstance(key0, tuple) else (key0,)))
    drawn = {"sum": "added up", "mean": "averaged", "median": "reduced to their median"}.get(
        ctx.stat, "drawn together")
    return [Surprise(
        "duplicate-rows", "info",
        f"{len(many):,} {what}s have several rows while {(sizes == 1).mean():.0%} have exactly "
        f"one: {row_list(rows)} share {k0}; the chart shows them {drawn}.",
        "whether the extra rows are repeats or corrections (keep the latest), or a key column "
        "is missing from the question.", rows=rows[:NAMED], columns=tuple(keys))]


@surprise("unit-mix", "a positive measure with two clusters a power of ten apart (two units)")
def _unit_mix(ctx: SurpriseContext) -> list[Surprise]:
    col = ctx.y if ctx.task in ("compare", "trend", "proportion") else ctx.x
    if ctx.task == "correlate" or ctx.level(col) != "quantitative" or col not in ctx.working:
        return []
    key = ("unit-mix", col, ctx.x if ctx.task == "trend" else None, ctx.value_and_group()[1])
    return memo_get(key, lambda: _two_units(ctx, col), about=ctx.frame)


def _two_units(ctx: SurpriseContext, col: str) -> list[Surprise]:
    from plotwise.engine.shape import prominent_peaks, silverman_density

    v = ctx.working[col].to_numpy(dtype=float, na_value=np.nan)
    pos_ok = np.isfinite(v) & (v > 0)
    if pos_ok.sum() < T["unit_min_values"] or pos_ok.sum() < 0.95 * np.isfinite(v).sum():
        return []
    lv = np.log10(v[pos_ok])
    sample = lv if len(lv) <= 5000 else np.random.default_rng(0).choice(lv, 5000, replace=False)
    if np.ptp(lv) < 0.8 or len(np.unique(sample)) < 10:
        return []
    grid = np.linspace(lv.min(), lv.max(), 512)
    dens = silverman_density(sample, grid)
    if dens is None:
        return []
    peaks, _ = prominent_peaks(np.concatenate([[0.0], dens, [0.0]]), 0.1 * dens.max())
    if len(peaks) != 2:
        return []
    a, b = grid[peaks - 1]
    apart = b - a
    decades = round(apart)
    if decades < 1 or decades > 3 or abs(apart - decades) > T["unit_decades_tolerance"]:
        return []
    cut = grid[peaks[0] - 1 + int(np.argmin(dens[peaks[0] - 1: peaks[1]]))]
    low = np.flatnonzero(pos_ok)[lv < cut]
    share = len(low) / len(lv)
    if min(share, 1 - share) < T["unit_min_share"]:
        return []
    minority = low if share <= 0.5 else np.flatnonzero(pos_ok)[lv >= cut]
    if _clusters_explained(ctx, minority, pos_ok):
        return []
    rows = ctx.rows(minority)
    factor = 10**decades
    return [Surprise(
        "unit-mix", "info",
        f"{col!r} has two clusters about {factor:,}× apart (around {fmt(10**a)} and "
        f"{fmt(10**b)}); the smaller one holds {len(minority):,} values "
        f"({row_list(rows, len(minority))}). Values kept in two units (g and kg, cents and "
        "euros) look like this.",
        f"the units of those rows; divide or multiply by {factor:,} where they differ.",
        rows=rows[:NAMED], columns=(col,))]


def _clusters_explained(ctx: SurpriseContext, minority: np.ndarray, used: np.ndarray) -> bool:
    """Two magnitudes that the question itself explains: a series that grew tenfold over time
    (the clusters follow each other instead of mixing), or several whole groups of one size and
    several of another (big and small kinds of items, not two units)."""
    inside = np.zeros(len(used), dtype=bool)
    inside[minority] = True
    if ctx.task == "trend" and ctx.x in ctx.working:
        t = pd.Series(ctx.working[ctx.x].to_numpy()[used])
        small, big = t[inside[used]], t[~inside[used]]
        if small.empty or big.empty:
            return False
        within = big.between(small.min(), small.max()).mean()
        around = small.between(big.min(), big.max()).mean()
        return bool(min(within, around) < 0.25)
    group = ctx.value_and_group()[1]
    if group and group in ctx.working:
        g = pd.Series(ctx.working[group].to_numpy()[used]).astype(str)
        share_in = pd.Series(inside[used]).groupby(g.to_numpy()).mean()
        whole = share_in[share_in >= 0.9]
        return len(whole) >= 2 and (share_in <= 0.1).sum() >= 2
    return False


# ------------------------------------------------------------------------------------------------
# Running the checks
# ------------------------------------------------------------------------------------------------
def find_surprises(df: pd.DataFrame, profile: Profile, questions: list[Question]) -> list[Surprise]:
    """The surprises in ``df`` (a pandas frame) for the questions the shown designs ask, worst
    first, one entry per finding."""
    with within_one_call(df):
        out = _ask(df, profile, questions)
    seen: dict[tuple[str, str], Surprise] = {}
    for s in out:
        seen.setdefault((s.code, s.message), s)
    return sorted(seen.values(), key=lambda s: -SEVERITIES.index(s.severity))


def _ask(df: pd.DataFrame, profile: Profile, questions: list[Question]) -> list[Surprise]:
    out: list[Surprise] = []
    for q in dict.fromkeys(questions):
        cols = [c for c in dict.fromkeys([q.x, q.y, q.hue]) if c and c in profile.fields]
        ctx = SurpriseContext(profile=profile, task=q.task, x=q.x, y=q.y, hue=q.hue, stat=q.stat,
                              working=working_frame(df, profile, cols), index=df.index, frame=df)
        for c in SURPRISE_CHECKS:
            out += c.func(ctx)
    return out
