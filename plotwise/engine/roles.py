"""Choosing columns: which column plays which role (x, y, hue, a period of two time points, a
matrix of numeric columns) for a task, from the caller's names and the profile. Each task has
its own chooser; ``choose_roles`` dispatches and checks the hue."""

from __future__ import annotations

import numpy as np

from plotwise.engine.design import Roles
from plotwise.engine.meaning import NOT_MEASURES
from plotwise.engine.profile import FieldProfile, Profile, few_integers
from plotwise.engine.rules import FIT_LIMITS, THRESHOLDS
from plotwise.errors import PlotwiseError


def check_column(profile: Profile, col, what: str) -> str | None:
    if col is None:
        return None
    if hasattr(col, "shape") and hasattr(col, "dtype") or isinstance(col, (list, dict)):
        # a Series or an array where a column name belongs: say so in one line, not its repr
        name = getattr(col, "name", None)
        hint = f"{what}={name!r}" if isinstance(name, str) else f"{what}='column name'"
        raise PlotwiseError(f"{what} takes a column's name, not the column itself (got a "
                            f"{type(col).__name__}); use {hint}.")
    label = str(col)
    if label not in profile.fields:
        names = list(profile.fields)
        shown = ", ".join(repr(n) for n in names[:20]) + (" ..." if len(names) > 20 else "")
        raise PlotwiseError(f"no column named {label!r} (given as {what}); the frame has: {shown}.")
    return label


def is_category(f: FieldProfile) -> bool:
    return f.level in ("nominal", "ordinal") and 2 <= f.distinct <= THRESHOLDS["max_categories"]


def is_measure(f: FieldProfile) -> bool:
    return f.level == "quantitative" and f.usable > 0 and f.distinct >= 1


def is_time(f: FieldProfile) -> bool:
    return f.level == "temporal" and f.distinct >= 2


def _first(profile: Profile, pred, exclude=()) -> FieldProfile | None:
    for f in profile.fields.values():
        if f.label not in exclude and pred(f):
            return f
    return None


def _best_category(profile: Profile, exclude=()) -> FieldProfile | None:
    """A category with a readable number of levels: 3..30 first, then any 2..max."""
    cats = [f for f in profile.fields.values() if f.label not in exclude and is_category(f)]
    if not cats:
        return None
    readable = [f for f in cats if 3 <= f.distinct <= THRESHOLDS["max_bars"]]
    return (readable or cats)[0]


def _best_measure(profile: Profile, exclude=()) -> FieldProfile | None:
    """The first numeric column that is a measure (never an identifier, a 0/1 flag or a
    constant)."""
    ms = [f for f in profile.fields.values() if f.label not in exclude and is_measure(f)
          and f.measure not in NOT_MEASURES]
    return ms[0] if ms else None


def _two_point_column(profile: Profile, exclude=()) -> FieldProfile | None:
    for f in profile.fields.values():
        if f.label in exclude:
            continue
        if f.distinct == 2 and f.level in ("temporal", "ordinal"):
            return f
    return None


def strongest_pair(df, profile: Profile, labels: list[str]) -> tuple[str, str, float] | None:
    """The pair of numeric columns with the largest |Spearman ρ|, on at most 5,000 rows
    (a seeded sample) and the first 12 columns."""
    from plotwise.engine.working import working_frame

    labels = labels[:12]
    if len(labels) < 2:
        return None
    w = working_frame(df, profile, labels)
    if len(w) > 5000:
        w = w.sample(5000, random_state=0)
    rho = w.rank().corr(method="pearson", min_periods=3).abs()
    best = None
    for i, a in enumerate(labels):
        for b in labels[i + 1:]:
            v = rho.loc[a, b]
            if v == v and (best is None or v > best[2]):
                best = (a, b, float(v))
    return best


def _choose_measure(profile: Profile, r: Roles, given: set, per: str,
                    inferred: bool = False) -> None:
    """The measure on y: the caller's (which must be numeric); without one, rows are counted
    per category or time point — unless each has one row (a series) or no task was stated
    (plotwise then looks for a relation to show), when the first measure is shown."""
    f = profile.fields
    if r.y is None:
        # Without a stated measure, rows are counted; only a series (one row per category or
        # time point) has nothing to count, and then its first measure is shown.
        series = profile.rows <= f[r.x].distinct + f[r.x].missing
        m = _best_measure(profile, exclude=given | {r.x}) if (series or inferred) else None
        if m is not None:
            r.y = m.label
            why = f"one row per {per}" if series else "no task stated"
            r.notes.append(f"measure: '{m.label}', the first numeric measure ({why})")
        else:
            r.notes.append(f"no y given: counting rows per {per} (name y=... to show a measure)")
    elif f[r.y].level != "quantitative":
        raise PlotwiseError(f"'{r.y}' is {f[r.y].level}; y must be a numeric measure. "
                            f"Leave y out to count rows per {per}.")


def check_roles(profile: Profile, x, y, hue) -> tuple[str | None, str | None, str | None]:
    """The caller's column names as profile labels; each must exist and differ from the others."""
    x = check_column(profile, x, "x")
    y = check_column(profile, y, "y")
    hue = check_column(profile, hue, "hue")
    named = [(k, c) for k, c in (("x", x), ("y", y), ("hue", hue)) if c is not None]
    for i, (k1, c1) in enumerate(named):
        for k2, c2 in named[i + 1:]:
            if c1 == c2:
                raise PlotwiseError(f"{k1} and {k2} both name the column {c1!r}; give each role "
                                    "a different column (or leave one out to let plotwise choose).")
    return x, y, hue


def _category_x(profile: Profile, r: Roles, task: str, given: set) -> None:
    """x for compare and proportion: the caller's category (or time), else the first readable
    category."""
    f = profile.fields
    if r.x is None:
        c = _best_category(profile, exclude=given)
        if c is None:
            raise PlotwiseError(
                f"{task} needs a category column (text, Categorical or a few integer codes) "
                "with 2 to 60 values; none was found. Name one with x=..., or use "
                "task='distribution' or 'correlate' for numeric columns."
            )
        r.x = c.label
        r.notes.append(f"categories: '{c.label}' ({c.distinct} values), the first column with "
                       "a readable number of categories")
    elif is_time(f[r.x]) and f[r.x].distinct > THRESHOLDS["max_categories"]:
        raise PlotwiseError(
            f"'{r.x}' has {f[r.x].distinct:,} time points; {task} needs at most "
            f"{THRESHOLDS['max_categories']} categories on x. For a measure over time use "
            f"task='trend'; for periods, bin them first, e.g. "
            f"df[{r.x!r}].dt.to_period('M').")
    elif not (is_category(f[r.x]) or is_time(f[r.x]) or few_integers(f[r.x])):
        raise PlotwiseError(
            f"'{r.x}' is {f[r.x].level} with {f[r.x].distinct} distinct values; {task} needs "
            "a category with 2 to 60 values on x. Bin it first (pandas.cut) or pick another column."
        )


def _is_period(f: FieldProfile) -> bool:
    return f.distinct == 2 and f.level in ("temporal", "ordinal")


def _compare_roles(profile: Profile, r: Roles, task: str, given: set, df,
                   inferred: bool = False) -> Roles:
    f = profile.fields
    _category_x(profile, r, task, given)
    _choose_measure(profile, r, given, "category", inferred and task == "compare")
    if r.hue is None and task == "compare":
        # The caller's columns define the question: a split nobody asked for is only mentioned.
        p = _two_point_column(profile, exclude=given | {r.x, r.y})
        if p is not None and f[r.x].level == "nominal":
            r.notes.append(f"'{p.label}' holds two time points: add hue='{p.label}' for "
                           "before/after designs (slope, difference)")
    elif r.hue is not None and _is_period(f[r.hue]):
        r.period = r.hue
    return _checked_hue(profile, r)


def _trend_roles(profile: Profile, r: Roles, task: str, given: set, df,
                 inferred: bool = False) -> Roles:
    f = profile.fields
    if r.x is None:
        t = _first(profile, is_time, exclude=given) or _first(
            profile, lambda c: c.level == "ordinal" and c.distinct >= 2, exclude=given)
        if t is None:
            raise PlotwiseError(
                "trend needs a time column (dates, or integer years) or an ordered column; "
                "none was found. Name one with x=..., make the column an ordered Categorical, "
                "or use task='compare' for unordered categories."
            )
        r.x = t.label
        r.notes.append(f"time: '{t.label}' ({f[t.label].distinct} time points)")
    _check_time_axis(f[r.x], inferred)
    if inferred and f[r.x].distinct < FIT_LIMITS["inferred_trend_points"]:
        raise PlotwiseError(f"'{r.x}' has only {f[r.x].distinct} time points; with no task "
                            "stated, so few are compared, not drawn as a trend.")
    _choose_measure(profile, r, given, "time point", inferred)
    if r.hue is None and f[r.x].distinct == 2:
        g = _best_category(profile, exclude=given | {r.x, r.y})
        if g is not None:
            r.notes.append(f"two time points: add hue='{g.label}' for before/after designs")
    if f[r.x].distinct == 2 and r.hue is not None:
        r.period = r.x
    return _checked_hue(profile, r)


def _check_time_axis(f: FieldProfile, inferred: bool) -> None:
    """A trend needs time on x: dates or years, or an ordered scale of time points (waves,
    months, before/after). When the task is stated, the caller's category is accepted (an
    unordered one then gets the line-over-categories hazard); a quantity never is."""
    if f.level == "temporal" or f.time_like or (
            f.level in ("ordinal", "nominal") and not inferred):
        return
    raise PlotwiseError(
        f"'{f.label}' is {f.level}, not time; a trend needs dates, years or an ordered column of "
        "time points on x. For two quantities use task='correlate'; for categories 'compare'.")


def _pick_pair(profile: Profile, r: Roles, pool: list[FieldProfile], need: int, df) -> None:
    """The two numeric variables when the caller left one or both out: the most strongly
    associated pair (|Spearman ρ|), else the first columns; several give a matrix too."""
    pair = strongest_pair(df, profile, [c.label for c in pool]) if (
        need == 2 and df is not None and len(pool) > 2) else None
    if need == 2 and len(pool) > 2:
        r.matrix = [c.label for c in pool[:12]]
    if pair is not None:
        r.x, r.y = pair[0], pair[1]
        r.notes.append(f"variables: '{r.x}' and '{r.y}', the most strongly associated "
                       f"numeric pair (|Spearman ρ| = {pair[2]:.2f})")
        return
    picked = [c.label for c in pool[:need]]
    if r.x is None:
        r.x = picked.pop(0)
    if r.y is None:
        r.y = picked.pop(0)
    r.notes.append(f"variables: '{r.x}' and '{r.y}', the first numeric columns")


def _correlate_roles(profile: Profile, r: Roles, task: str, given: set, df,
                     inferred: bool = False) -> Roles:
    f = profile.fields
    nums = [c for c in f.values() if c.label != r.hue and is_measure(c) and c.distinct >= 2]
    if r.x is None or r.y is None:
        pool = [c for c in nums if c.label not in given]
        need = (r.x is None) + (r.y is None)
        if len(pool) < need:
            cats = [c for c in f.values() if is_category(c) and c.label not in given]
            if r.x is None and r.y is None and len(cats) >= 2:
                r.x, r.y = cats[0].label, cats[1].label
                r.notes.append(f"no two numeric columns: association of categories "
                               f"'{r.x}' and '{r.y}' as counts")
                return r
            raise PlotwiseError(
                "correlate needs two numeric columns (or two category columns); found "
                f"{len(nums)} numeric. Name them with x=... and y=...."
            )
        _pick_pair(profile, r, pool, need, df)
    for c in (r.x, r.y):
        if f[c].level not in ("quantitative", "temporal", "ordinal") and not is_category(f[c]):
            raise PlotwiseError(f"'{c}' is {f[c].level}; correlate needs numeric columns.")
    return _checked_hue(profile, r)


def _distribution_roles(profile: Profile, r: Roles, task: str, given: set, df,
                        inferred: bool = False) -> Roles:
    f = profile.fields
    var = r.x or r.y
    if var is None:
        m = _best_measure(profile, exclude=given) or _best_category(profile, exclude=given)
        if m is None:
            raise PlotwiseError(
                "distribution needs a numeric column (or a category to count); none was "
                "found. Name one with x=...."
            )
        var = m.label
        r.notes.append(f"variable: '{var}', the first {m.level} column")
    if r.x and r.y and r.hue is None and is_category(f[r.y]):
        r.hue = r.y  # distribution of x within the groups of y
    r.x, r.y = var, None
    if f[var].level == "temporal":
        raise PlotwiseError(f"'{var}' holds dates; use task='trend' to see it over time.")
    if f[var].level in ("nominal", "ordinal") and f[var].distinct > THRESHOLDS["max_categories"]:
        raise PlotwiseError(
            f"'{var}' has {f[var].distinct:,} distinct labels (identifier-like); a count per "
            f"label needs at most {THRESHOLDS['max_categories']}. Look at the most common ones "
            f"with df[{var!r}].value_counts().head(20), or group them first.")
    return _checked_hue(profile, r)


CHOOSERS = {"compare": _compare_roles, "proportion": _compare_roles, "trend": _trend_roles,
            "correlate": _correlate_roles, "distribution": _distribution_roles}


def choose_roles(profile: Profile, task: str, x, y, hue, df=None, inferred: bool = False) -> Roles:
    """The columns for ``task``: the caller's (checked) and, where left out, plotwise's choice
    with a note saying why. ``inferred``: no task was stated (plotwise ranks across tasks)."""
    x, y, hue = check_roles(profile, x, y, hue)
    given = {c for c in (x, y, hue) if c}
    r = CHOOSERS[task](profile, Roles(x=x, y=y, hue=hue), task, given, df, inferred)
    for col in dict.fromkeys(c for c in (r.x, r.y) if c):
        _check_range(profile.fields[col])
    return r


def _check_range(f: FieldProfile) -> None:
    """Values so far apart that float arithmetic overflows on their difference (±1e308) cannot
    be binned, averaged or drawn on one axis; they are nearly always sentinels or errors."""
    if f.level != "quantitative" or f.minimum is None or f.maximum is None:
        return
    with np.errstate(over="ignore"):
        span = np.float64(f.maximum) - np.float64(f.minimum)
    if not np.isfinite(span) or not np.isfinite(np.float64(f.maximum) + np.float64(f.minimum)):
        raise PlotwiseError(
            f"'{f.label}' runs from {f.minimum:.4g} to {f.maximum:.4g}, too wide a range for "
            "floating-point arithmetic (such values are usually placeholders or errors); leave "
            f"them out first, e.g. df[df[{f.label!r}].abs() < 1e300].")


def _checked_hue(profile: Profile, r: Roles) -> Roles:
    if r.hue is not None:
        h = profile.fields[r.hue]
        if not (is_category(h) or is_time(h) or few_integers(h)):
            raise PlotwiseError(
                f"hue '{r.hue}' has {h.distinct} distinct {h.level} values; hue needs a category "
                "with 2 to 60 values. Bin it first (pandas.cut) or leave hue out."
            )
    return r
