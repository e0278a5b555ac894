"""Candidate designs: which chart kinds could answer the task, and which column goes on which
visual channel. No scoring here (see scoring.py) and no drawing (see render.py)."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from plotwise.engine.profile import FieldProfile, Profile, _has_hint
from plotwise.engine.rules import TASKS, THRESHOLDS
from plotwise.errors import PlotwiseError

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.engine.hazards import Hazard

KINDS = (
    "bar", "dot", "grouped-bar", "stacked-bar", "stacked-bar-100", "pie", "line", "area", "slope",
    "difference-bar", "heatmap", "scatter", "hexbin", "regression", "histogram", "density", "ecdf",
    "box", "violin", "strip", "count-bar",
)

# Name fragments of measures whose totals make sense (sum them); others are averaged
# (common practice).
SUM_NAME_HINTS = ("revenue", "sales", "count", "amount", "cost", "total", "quantity", "units",
                  "volume", "passengers", "visits", "orders", "spend", "income", "profit", "trips",
                  "tickets", "n", "num", "number", "admitted", "applicants")


@dataclass
class Design:
    """One candidate chart: a kind, its encoding and statistic, and (after scoring) its score."""

    kind: str
    task: str
    encoding: dict[str, str]  # visual channel -> column label (or a derived quantity)
    roles: dict[str, str]  # measure / category / hue / facet -> column label
    x: str | None = None  # column on the category/time/first axis
    y: str | None = None  # the measure (or second variable for correlate)
    hue: str | None = None
    facet: str | None = None
    stat: str = "raw"  # raw | count | sum | mean | share | distribution | difference
    zero_based: bool = False
    log_scale: bool = False
    horizontal: bool = False
    options: dict = field(default_factory=dict)
    score: float = 0.0
    reasons: list[str] = field(default_factory=list)
    expressive: bool = True
    hazards: list[Hazard] = field(default_factory=list)
    parts: dict[str, float] = field(default_factory=dict)  # effectiveness / task_fit / data_fit
    profile: Profile | None = field(default=None, repr=False, compare=False)

    @property
    def title(self) -> str:
        name = self.kind
        if self.facet is not None:
            name += f" · small multiples by {self.facet}"
        return name

    @property
    def columns(self) -> list[str]:
        cols = list(self.options.get("matrix", ()))
        for c in (self.x, self.y, self.hue, self.facet):
            if c is not None and c not in cols:
                cols.append(c)
        return cols

    def summary(self) -> str:
        return self.reasons[0] if self.reasons else self.kind

    def code(self, name: str = "df") -> str:
        """A short runnable pandas + seaborn + matplotlib snippet that redraws this design from
        the DataFrame variable ``name``. (Code generation lives in plotwise.codegen; it is pure
        text and knows nothing of notebooks.)"""
        from plotwise.drawing.codegen import design_code

        return design_code(self, name)

    def __repr__(self) -> str:
        return f"Design({self.title!r}, task={self.task!r}, score={self.score:.2f})"


@dataclass
class Roles:
    """Columns chosen for a task, and the words explaining any that were inferred."""

    x: str | None = None
    y: str | None = None
    hue: str | None = None
    period: str | None = None  # a column with exactly two time points, for slope designs
    matrix: list[str] = field(default_factory=list)  # numeric columns for a correlation matrix
    notes: list[str] = field(default_factory=list)


# ----------------------------------------------------------------------------------------------
# Choosing columns
# ----------------------------------------------------------------------------------------------
def check_column(profile: Profile, col, what: str) -> str | None:
    if col is None:
        return None
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
    ms = [f for f in profile.fields.values() if f.label not in exclude and is_measure(f)]
    if not ms:
        return None
    # Prefer a column that is not an identifier-like running integer.
    good = [f for f in ms if not (f.is_integer and f.distinct == f.rows and f.rows > 20)]
    return (good or ms)[0]


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
    from plotwise.engine.datastats import working_frame

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


def _choose_measure(profile: Profile, r: Roles, given: set, per: str) -> None:
    """The measure on y: the caller's (which must be numeric) or the first numeric column;
    without one, rows are counted per category or time point."""
    f = profile.fields
    if r.y is None:
        m = _best_measure(profile, exclude=given | {r.x})
        if m is not None:
            r.y = m.label
            r.notes.append(f"measure: '{m.label}', the first numeric column")
        else:
            r.notes.append(f"no numeric column: counting rows per {per}")
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


def choose_roles(profile: Profile, task: str, x, y, hue, df=None) -> Roles:
    x, y, hue = check_roles(profile, x, y, hue)
    r = Roles(x=x, y=y, hue=hue)
    given = {c for c in (x, y, hue) if c}
    f = profile.fields

    if task in ("compare", "proportion"):
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
        elif not (is_category(f[r.x]) or is_time(f[r.x])):
            raise PlotwiseError(
                f"'{r.x}' is {f[r.x].level} with {f[r.x].distinct} distinct values; {task} needs "
                "a category with 2 to 60 values on x. Bin it first (pandas.cut) or pick another column."
            )
        _choose_measure(profile, r, given, "category")
        if r.hue is None and task == "compare":
            p = _two_point_column(profile, exclude=given | {r.x, r.y})
            if p is not None and f[r.x].level == "nominal":
                r.period = p.label
                r.notes.append(f"two time points in '{p.label}': before/after designs considered")
        elif r.hue is not None and f[r.hue].distinct == 2 and f[r.hue].level in ("temporal", "ordinal"):
            r.period = r.hue

    elif task == "trend":
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
        _choose_measure(profile, r, given, "time point")
        if r.hue is None and f[r.x].distinct == 2:
            g = _best_category(profile, exclude=given | {r.x, r.y})
            if g is not None:
                r.hue = g.label
                r.notes.append(f"two time points: groups from '{g.label}' for before/after designs")
        if f[r.x].distinct == 2 and r.hue is not None:
            r.period = r.x

    elif task == "correlate":
        nums = [c for c in profile.fields.values()
                if c.label not in {hue} and is_measure(c) and c.distinct >= 2]
        if r.x is None or r.y is None:
            pool = [c for c in nums if c.label not in given]
            need = (r.x is None) + (r.y is None)
            if len(pool) < need:
                cats = [c for c in profile.fields.values() if is_category(c) and c.label not in given]
                if r.x is None and r.y is None and len(cats) >= 2:
                    r.x, r.y = cats[0].label, cats[1].label
                    r.notes.append(f"no two numeric columns: association of categories "
                                   f"'{r.x}' and '{r.y}' as counts")
                    return r
                raise PlotwiseError(
                    "correlate needs two numeric columns (or two category columns); found "
                    f"{len(nums)} numeric. Name them with x=... and y=...."
                )
            pair = strongest_pair(df, profile, [c.label for c in pool]) if (
                need == 2 and df is not None and len(pool) > 2) else None
            if need == 2 and len(pool) > 2:
                r.matrix = [c.label for c in pool[:12]]
            if pair is not None:
                r.x, r.y = pair[0], pair[1]
                r.notes.append(f"variables: '{r.x}' and '{r.y}', the most strongly associated "
                               f"numeric pair (|Spearman ρ| = {pair[2]:.2f})")
            else:
                picked = [c.label for c in pool[:need]]
                if r.x is None:
                    r.x = picked.pop(0)
                if r.y is None:
                    r.y = picked.pop(0)
                r.notes.append(f"variables: '{r.x}' and '{r.y}', the first numeric columns")
        for c in (r.x, r.y):
            if f[c].level not in ("quantitative", "temporal", "ordinal") and not is_category(f[c]):
                raise PlotwiseError(f"'{c}' is {f[c].level}; correlate needs numeric columns.")

    elif task == "distribution":
        var = r.x or r.y
        if var is None:
            m = _best_measure(profile, exclude=given)
            if m is None:
                c = _best_category(profile, exclude=given)
                if c is None:
                    raise PlotwiseError(
                        "distribution needs a numeric column (or a category to count); none was "
                        "found. Name one with x=...."
                    )
                m = c
            var = m.label
            r.notes.append(f"variable: '{var}', the first {m.level} column")
        if r.x and r.y and r.hue is None and is_category(f[r.y]):
            r.hue = r.y  # distribution of x within the groups of y
        r.x, r.y = var, None
        if f[var].level == "temporal":
            raise PlotwiseError(f"'{var}' holds dates; use task='trend' to see it over time.")
    else:  # pragma: no cover - guarded by the caller
        raise PlotwiseError(f"unknown task {task!r}")

    if r.hue is not None:
        h = f[r.hue]
        if not (is_category(h) or is_time(h)):
            raise PlotwiseError(
                f"hue '{r.hue}' has {h.distinct} distinct {h.level} values; hue needs a category "
                "with 2 to 60 values. Bin it first (pandas.cut) or leave hue out."
            )
    return r


# ----------------------------------------------------------------------------------------------
# Candidate designs per task
# ----------------------------------------------------------------------------------------------
def _measure_stat(profile: Profile, x: str, y: str | None, task: str, agg: str | None) -> str:
    if y is None:
        return "count"
    if agg:
        return agg
    if task == "proportion":
        return "sum"
    m = profile.fields[y]
    if m.minimum is not None and m.minimum >= 0 and m.maximum <= 1 and m.distinct <= 2:
        return "mean"  # a 0/1 outcome: its mean is a rate
    if profile.rows <= profile.fields[x].distinct:
        return "value"  # one row per category: draw the value itself
    if m.zero_meaningful and not m.share_like and _has_hint(y, SUM_NAME_HINTS):
        return "sum"
    return "mean"


def _horizontal(profile: Profile, cat: str) -> bool:
    f = profile.fields[cat]
    long = max((len(str(v)) for v in f.top_labels), default=0) > THRESHOLDS["long_label"]
    return long or f.distinct > 8


def candidates(profile: Profile, task: str, roles: Roles, agg: str | None = None) -> list[Design]:
    """All designs worth scoring for ``task`` with the chosen ``roles``."""
    builder = {
        "compare": _compare, "trend": _trend, "proportion": _proportion,
        "correlate": _correlate, "distribution": _distribution,
    }[task]
    out = builder(profile, roles, agg)
    for d in out:
        d.task = task
    return out


def _small_multiples_of(d: Design, hue: str) -> Design:
    enc = {k: v for k, v in d.encoding.items() if k != "hue"}
    enc["facet"] = hue
    roles = {k: v for k, v in d.roles.items() if k != "hue"}
    roles["facet"] = hue
    return Design(kind=d.kind, task=d.task, encoding=enc, roles=roles, x=d.x, y=d.y, hue=None,
                  facet=hue, stat=d.stat, zero_based=d.zero_based, horizontal=d.horizontal,
                  options=dict(d.options))


def _with_facets(profile: Profile, designs: list[Design], hue: str | None) -> list[Design]:
    """Add a small-multiples version of each hue design when the hue has many levels."""
    if hue is None:
        return designs
    n = profile.fields[hue].distinct
    if n <= THRESHOLDS["hues_warn"] or n > THRESHOLDS["max_facets"]:
        return designs
    extra = [_small_multiples_of(d, hue) for d in designs
             if d.hue == hue and not d.options.get("time_as_categories") and d.kind in ("line", "bar", "scatter", "histogram", "area", "dot",
                                            "density", "regression")]
    return designs + extra


def _compare(profile: Profile, r: Roles, agg) -> list[Design]:
    x, y, hue = r.x, r.y, r.hue
    stat = _measure_stat(profile, x, y, "compare", agg)
    meas = y or "count"
    horiz = _horizontal(profile, x)
    base = {"measure": meas, "category": x}
    out: list[Design] = []
    if r.period and r.period != x:
        group, period = x, r.period
        out.append(Design("slope", "compare", {"x position": period, "y position": meas,
                                               "connection": group},
                          {"measure": meas, "category": period, "hue": group},
                          x=period, y=y, hue=group, stat=stat))
        out.append(Design("difference-bar", "compare", {"y position": group, "length": meas},
                          {"measure": meas, "category": group},
                          x=group, y=y, hue=period, stat=stat, zero_based=True, horizontal=True))
        hb = {**base, "hue": period}
        out.append(Design("grouped-bar", "compare", {"x position": group, "length": meas,
                                                     "hue": period},
                          hb, x=group, y=y, hue=period, stat=stat, zero_based=True,
                          horizontal=horiz))
        out.append(Design("dot", "compare", {"y position": group, "x position": meas,
                                             "hue": period}, hb, x=group, y=y, hue=period,
                          stat=stat, horizontal=True))
        return out
    if hue is None:
        out.append(Design("bar", "compare", {"x position": x, "length": meas}, dict(base), x=x,
                          y=y, stat=stat, zero_based=True, horizontal=horiz))
        out.append(Design("dot", "compare", {"y position": x, "x position": meas}, dict(base),
                          x=x, y=y, stat=stat, horizontal=True))
        out.append(Design("pie", "compare", {"angle": meas, "hue": x}, dict(base), x=x, y=y,
                          stat=stat))
        out.append(Design("line", "compare", {"x position": x, "y position": meas,
                                              "connection": x}, dict(base), x=x, y=y, stat=stat))
        if y is not None and profile.rows > profile.fields[x].distinct:
            for kind in ("box", "violin", "strip"):
                out.append(Design(kind, "compare", {"x position": x, "y position": y},
                                  {"measure": y, "category": x}, x=x, y=y, stat="distribution",
                                  horizontal=horiz))
    else:
        hb = {**base, "hue": hue}
        out.append(Design("grouped-bar", "compare", {"x position": x, "length": meas, "hue": hue},
                          hb, x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=horiz))
        out.append(Design("stacked-bar", "compare", {"x position": x, "length": meas, "hue": hue},
                          hb, x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=horiz,
                          options={"non_aligned": True}))
        out.append(Design("heatmap", "compare", {"x position": hue, "y position": x,
                                                 "lightness": meas}, hb, x=x, y=y, hue=hue,
                          stat=stat))
        out.append(Design("dot", "compare", {"y position": x, "x position": meas, "hue": hue}, hb,
                          x=x, y=y, hue=hue, stat=stat, horizontal=True))
        out.append(Design("bar", "compare", {"x position": x, "length": meas, "hue": hue}, hb,
                          x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=horiz))
        out = [d for d in out if d.kind != "bar"] + _with_facets(
            profile, [d for d in out if d.kind == "bar"], hue)[1:]
    return out


def _trend(profile: Profile, r: Roles, agg) -> list[Design]:
    x, y, hue = r.x, r.y, r.hue
    stat = _measure_stat(profile, x, y, "trend", agg)
    meas = y or "count"
    base = {"measure": meas, "category": x}
    if hue:
        base["hue"] = hue
    enc_hue = {"hue": hue} if hue else {}
    out = [
        Design("line", "trend", {"x position": x, "y position": meas, "connection": x, **enc_hue},
               dict(base), x=x, y=y, hue=hue, stat=stat),
        Design("bar", "trend", {"x position": x, "length": meas, **enc_hue}, dict(base), x=x, y=y,
               hue=hue, stat=stat, zero_based=True, options={"time_as_categories": True}),
        Design("dot", "trend", {"x position": x, "y position": meas, **enc_hue}, dict(base), x=x,
               y=y, hue=hue, stat=stat),
    ]
    if not hue:
        out.append(Design("area", "trend", {"x position": x, "length": meas}, dict(base), x=x,
                          y=y, stat=stat, zero_based=True))
    if hue:
        out.append(Design("heatmap", "trend", {"x position": x, "y position": hue,
                                               "lightness": meas}, dict(base), x=x, y=y,
                          hue=hue, stat=stat, options={"time_as_categories": True}))
    if r.period and hue:
        out.append(Design("slope", "trend", {"x position": x, "y position": meas,
                                             "connection": hue},
                          {"measure": meas, "category": x, "hue": hue}, x=x, y=y, hue=hue,
                          stat=stat))
        out.append(Design("difference-bar", "trend", {"y position": hue, "length": meas},
                          {"measure": meas, "category": hue}, x=hue, y=y, hue=x, stat=stat,
                          zero_based=True, horizontal=True))
    return _with_facets(profile, out, hue)


def _proportion(profile: Profile, r: Roles, agg) -> list[Design]:
    x, y, hue = r.x, r.y, r.hue
    stat = "count" if y is None else "sum"
    meas = y or "count"
    base = {"measure": meas, "category": x}
    horiz = _horizontal(profile, x)
    # Values that are already percentages are drawn as they are, not re-normalised.
    share = not (y is not None and profile.fields[y].share_like)
    if hue is None:
        return [
            Design("bar", "proportion", {"x position": x, "length": meas}, dict(base), x=x, y=y,
                   stat=stat, zero_based=True, horizontal=horiz, options={"share": share}),
            Design("dot", "proportion", {"y position": x, "x position": meas}, dict(base), x=x,
                   y=y, stat=stat, horizontal=True, options={"share": share}),
            Design("pie", "proportion", {"angle": meas, "hue": x}, dict(base), x=x, y=y,
                   stat=stat),
            Design("stacked-bar-100", "proportion", {"length": meas, "hue": x}, dict(base),
                   x=x, y=y, stat=stat, zero_based=True, horizontal=True,
                   options={"non_aligned": True}),
        ]
    hb = {**base, "hue": hue}
    return [
        Design("stacked-bar-100", "proportion", {"x position": hue, "length": meas, "hue": x},
               hb, x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=True,
               options={"non_aligned": True}),
        Design("grouped-bar", "proportion", {"x position": x, "length": meas, "hue": hue}, hb,
               x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=horiz,
               options={"share": True}),
        Design("stacked-bar", "proportion", {"x position": hue, "length": meas, "hue": x}, hb,
               x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=True,
               options={"non_aligned": True}),
        Design("heatmap", "proportion", {"x position": hue, "y position": x, "lightness": meas},
               hb, x=x, y=y, hue=hue, stat=stat, options={"share": True}),
    ]


def _correlate(profile: Profile, r: Roles, agg) -> list[Design]:
    x, y, hue = r.x, r.y, r.hue
    f = profile.fields
    if f[x].level != "quantitative" or f[y].level != "quantitative":
        # Two categories (or a category and a numeric code): a table of counts.
        return [Design("heatmap", "correlate", {"x position": x, "y position": y,
                                                "lightness": "count"},
                       {"measure": "count", "category": x, "hue": y}, x=x, y=y, stat="count")]
    roles = {"measure": y, "category": x}
    enc_hue = {}
    if hue:
        roles["hue"] = hue
        enc_hue = {"hue": hue}
    out = []
    if len(r.matrix) > 2:
        out.append(Design("heatmap", "correlate", {"x position": "columns", "y position": "columns",
                                                   "lightness": "correlation"},
                          {"measure": "correlation", "category": "columns"},
                          stat="correlation", options={"matrix": list(r.matrix)}))
    out += [
        Design("scatter", "correlate", {"x position": x, "y position": y, **enc_hue}, dict(roles),
               x=x, y=y, hue=hue),
        Design("regression", "correlate", {"x position": x, "y position": y, **enc_hue},
               dict(roles), x=x, y=y, hue=hue),
        Design("hexbin", "correlate", {"x position": x, "y position": y, "lightness": "count"},
               dict(roles), x=x, y=y, stat="count"),
        Design("heatmap", "correlate", {"x position": x, "y position": y, "lightness": "count"},
               dict(roles), x=x, y=y, stat="count", options={"binned": True}),
    ]
    return _with_facets(profile, out, hue)


def _distribution(profile: Profile, r: Roles, agg) -> list[Design]:
    v, hue = r.x, r.hue
    f = profile.fields[v]
    roles = {"measure": v}
    enc_hue = {}
    if hue:
        roles["category"] = hue
        enc_hue = {"hue": hue}
    if f.level != "quantitative" or f.is_discrete:
        out = [Design("count-bar", "distribution", {"x position": v, "length": "count",
                                                     **enc_hue}, dict(roles), x=v, hue=hue,
                      stat="count", zero_based=True, horizontal=f.level == "nominal"
                      and _horizontal(profile, v))]
        if f.level != "quantitative":
            return out
    else:
        out = []
    out += [
        Design("histogram", "distribution", {"x position": v, "length": "count", **enc_hue},
               dict(roles), x=v, hue=hue, stat="distribution", zero_based=True),
        Design("density", "distribution", {"x position": v, "y position": "density", **enc_hue},
               dict(roles), x=v, hue=hue, stat="distribution"),
        Design("ecdf", "distribution", {"x position": v, "y position": "cumulative share",
                                        **enc_hue}, dict(roles), x=v, hue=hue,
               stat="distribution"),
    ]
    group_enc = {"y position": v}
    if hue:
        group_enc["x position"] = hue
    for kind in ("box", "violin", "strip"):
        out.append(Design(kind, "distribution", dict(group_enc), dict(roles), x=v, hue=hue,
                          stat="distribution",
                          horizontal=bool(hue) and _horizontal(profile, hue)))
    return _with_facets(profile, out, hue)


def supported_tasks() -> tuple[str, ...]:
    return TASKS
