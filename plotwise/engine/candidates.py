"""Candidate designs: which chart kinds could answer the task, and which column goes on which
visual channel. No scoring here (see scoring.py) and no drawing (see plotwise.drawing)."""

from __future__ import annotations

from dataclasses import replace

from plotwise.engine.design import Design, DesignOptions, Roles
from plotwise.engine.kinds import kind as kind_record
from plotwise.engine.meaning import is_non_additive
from plotwise.engine.profile import Profile
from plotwise.engine.rules import THRESHOLDS


def _measure_stat(profile: Profile, x: str, y: str | None, task: str, agg: str | None) -> str:
    if y is None:
        return "count"
    if agg:
        return agg
    m = profile.fields[y]
    if m.measure == "flag":
        return "mean"  # a 0/1 outcome: its mean is a rate
    if profile.rows <= profile.fields[x].distinct:
        return "value"  # one row per category: draw the value itself
    if task == "proportion":  # parts of a whole add up, unless the data say they cannot
        return "mean" if is_non_additive(m) else "sum"
    return "sum" if m.measure == "additive" else "mean"


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
                  options=replace(d.options))


def _with_facets(profile: Profile, designs: list[Design], hue: str | None) -> list[Design]:
    """Add a small-multiples version of each hue design when the hue has many levels."""
    if hue is None:
        return designs
    n = profile.fields[hue].distinct
    if n <= THRESHOLDS["hues_warn"] or n > THRESHOLDS["max_facets"]:
        return designs
    if profile.rows < THRESHOLDS["facet_min_rows"] * n:  # panels of a mark or two each
        return designs
    extra = [_small_multiples_of(d, hue) for d in designs
             if d.hue == hue and not d.options.time_as_categories and kind_record(d.kind).facets]
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
        out.append(Design("lollipop", "compare", {"x position": x, "length": meas}, dict(base),
                          x=x, y=y, stat=stat, zero_based=True, horizontal=True))
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
                          options=DesignOptions(non_aligned=True)))
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
               hue=hue, stat=stat, zero_based=True, options=DesignOptions(time_as_categories=True)),
        Design("dot", "trend", {"x position": x, "y position": meas, **enc_hue}, dict(base), x=x,
               y=y, hue=hue, stat=stat),
    ]
    if not hue:
        out.append(Design("area", "trend", {"x position": x, "length": meas}, dict(base), x=x,
                          y=y, stat=stat, zero_based=True))
    if hue:
        out.append(Design("heatmap", "trend", {"x position": x, "y position": hue,
                                               "lightness": meas}, dict(base), x=x, y=y,
                          hue=hue, stat=stat, options=DesignOptions(time_as_categories=True)))
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
    stat = _measure_stat(profile, x, y, "proportion", agg)
    if stat not in ("count", "sum", "value") or (
            stat == "value" and is_non_additive(profile.fields[y])):
        # Rates, percentages and averages do not add up to a whole: no shares, only the
        # per-category values (the reasons say why).
        return [d for d in _compare(profile, r, agg) if kind_record(d.kind).parts == "none"
                and kind_record(d.kind).summarises]
    meas = y or "count"
    base = {"measure": meas, "category": x}
    horiz = _horizontal(profile, x)
    # Values that are already percentages are drawn as they are, not re-normalised.
    share = not (y is not None and profile.fields[y].share_like)
    if hue is None:
        return [
            Design("bar", "proportion", {"x position": x, "length": meas}, dict(base), x=x, y=y,
                   stat=stat, zero_based=True, horizontal=horiz, options=DesignOptions(share=share)),
            Design("dot", "proportion", {"y position": x, "x position": meas}, dict(base), x=x,
                   y=y, stat=stat, horizontal=True, options=DesignOptions(share=share)),
            Design("pie", "proportion", {"angle": meas, "hue": x}, dict(base), x=x, y=y,
                   stat=stat),
            Design("stacked-bar-100", "proportion", {"length": meas, "hue": x}, dict(base),
                   x=x, y=y, stat=stat, zero_based=True, horizontal=True,
                   options=DesignOptions(non_aligned=True)),
        ]
    hb = {**base, "hue": hue}
    return [
        Design("stacked-bar-100", "proportion", {"x position": hue, "length": meas, "hue": x},
               hb, x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=True,
               options=DesignOptions(non_aligned=True)),
        Design("grouped-bar", "proportion", {"x position": x, "length": meas, "hue": hue}, hb,
               x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=horiz,
               options=DesignOptions(share=True)),
        Design("stacked-bar", "proportion", {"x position": hue, "length": meas, "hue": x}, hb,
               x=x, y=y, hue=hue, stat=stat, zero_based=True, horizontal=True,
               options=DesignOptions(non_aligned=True)),
        Design("heatmap", "proportion", {"x position": hue, "y position": x, "lightness": meas},
               hb, x=x, y=y, hue=hue, stat=stat, options=DesignOptions(share=True)),
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
                          stat="correlation", options=DesignOptions(matrix=list(r.matrix))))
    out += [
        Design("scatter", "correlate", {"x position": x, "y position": y, **enc_hue}, dict(roles),
               x=x, y=y, hue=hue),
        Design("regression", "correlate", {"x position": x, "y position": y, **enc_hue},
               dict(roles), x=x, y=y, hue=hue),
        Design("hexbin", "correlate", {"x position": x, "y position": y, "lightness": "count"},
               dict(roles), x=x, y=y, stat="count"),
        Design("heatmap", "correlate", {"x position": x, "y position": y, "lightness": "count"},
               dict(roles), x=x, y=y, stat="count", options=DesignOptions(binned=True)),
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
