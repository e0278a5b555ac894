"""Generators of the kinds drawn from rows or bins (histograms, densities, ECDFs, boxes, violins,
strips, count bars) and the kind table that registers every generator."""

from __future__ import annotations

from plotwise.drawing.generators_groups import (
    _bar,
    _difference_bar,
    _dot,
    _grouped_bar,
    _heatmap,
    _hexbin,
    _line,
    _lollipop,
    _pie,
    _regression,
    _scatter,
    _slope,
    _stacked,
)
from plotwise.drawing.snippet import Ctx, _labels, _style, engine_bins, register
from plotwise.engine.kinds import engine_mode
from plotwise.engine.rules import MAIN_COLOUR, THRESHOLDS


def _hue_args(c: Ctx) -> str:
    d = c.d
    if not d.hue:
        return f", color={MAIN_COLOUR!r}"
    return (f", hue={d.hue!r}, hue_order={c.levels(d.hue, c.data, ', key=str')}, "
            f"palette={c.palette(c.f(d.hue).distinct, f'{c.data}[{d.hue!r}].nunique()')}")


def _log_arg(c: Ctx) -> str:
    return ", log_scale=True" if c.d.x in c.d.options.log_columns else ""


def _prebinned_histogram(c: Ctx, rule) -> list[str]:
    """Large data: numpy counts every value into the bins first, then only the bins are drawn."""
    d = c.d
    col = f"{c.data}[{d.x!r}]"
    if _log_arg(c):
        if isinstance(rule, int):
            edges = f"np.logspace(np.log10({col}.min()), np.log10({col}.max()), {rule + 1})"
        else:
            edges = f"10 ** np.histogram_bin_edges(np.log10({col}), bins={rule!r})"
    else:
        edges = f"np.histogram_bin_edges({col}, bins={rule!r})"
    lines = [f"counts, edges = np.histogram({col}, bins={edges})",
             f"{c.ax}.stairs(counts, edges, fill=True, color={MAIN_COLOUR!r}, alpha=0.75)",
             f"{c.ax}.set_ylim(bottom=0)"]
    if _log_arg(c):
        lines.append(f'{c.ax}.set_xscale("log")')
    return lines + _labels(c, d.x, "number of rows") + _style(c, "y")


def _engine_histogram(c: Ctx) -> list[str]:
    """Engine data: the engine counts every row into the bins plotwise chose; only the counts
    come back. ``counts`` is set by the engine lines (see engine_lines)."""
    d = c.d
    lo, width, k, log = engine_bins(d)
    edges = f"np.linspace({lo!r}, {lo + width * k!r}, {k + 1})"
    lines = [f"edges = 10 ** {edges}" if log else f"edges = {edges}",
             f"{c.ax}.stairs(counts, edges, fill=True, color={MAIN_COLOUR!r}, alpha=0.75)",
             f"{c.ax}.set_ylim(bottom=0)"]
    if log:
        lines.append(f'{c.ax}.set_xscale("log")')
    return lines + _labels(c, d.x, "number of rows") + _style(c, "y")


def _histogram(c: Ctx) -> list[str]:
    d = c.d
    if c.p.source is not None and engine_mode(d) == "bins":
        return _engine_histogram(c)
    rule = d.options.bins or "fd"
    if d.options.prebin and not d.hue:
        return _prebinned_histogram(c, rule)
    if _log_arg(c):
        bins = f"bins=len(np.histogram_bin_edges(np.log10({c.data}[{d.x!r}]), bins={rule!r})) - 1"
    else:
        bins = f"bins=np.histogram_bin_edges({c.data}[{d.x!r}], bins={rule!r})"
    extra = ', element="step", fill=False' if d.hue else ""
    return [f"sns.histplot(data={c.data}, x={d.x!r}, {bins}{_hue_args(c)}{_log_arg(c)}{extra}, ax={c.ax})",
            ] + _labels(c, d.x, "number of rows") + _style(c, "y")


def _density(c: Ctx) -> list[str]:
    d = c.d
    return [f"sns.kdeplot(data={c.data}, x={d.x!r}{_hue_args(c)}{_log_arg(c)}, fill=True, alpha=0.3, "
            f"cut=0, common_norm=False, warn_singular=False, ax={c.ax})",
            ] + _labels(c, d.x, "density") + _style(c, "y")


def _ecdf(c: Ctx) -> list[str]:
    d = c.d
    return [f"sns.ecdfplot(data={c.data}, x={d.x!r}{_hue_args(c)}{_log_arg(c)}, ax={c.ax})",
            ] + _labels(c, d.x, "share of rows at or below") + _style(c, "y")


def _boxlike(c: Ctx, kind: str) -> list[str]:
    d = c.d
    # In compare the group is d.x and the measure d.y; in distribution the variable is d.x.
    if d.task == "compare":
        group, var = d.x, d.y
    else:
        group, var = d.hue, d.x
    extra = {"box": ", fliersize=2", "violin": ", cut=0, inner=\"quart\"",
             "strip": f", size=2.5, alpha=0.5, jitter={THRESHOLDS['strip_jitter']}"}[kind]
    func = {"box": "boxplot", "violin": "violinplot", "strip": "stripplot"}[kind]
    data = c.data
    lines = []
    if kind == "strip":
        lines.append(f"pts = {data}.sample(2000, random_state=0) if len({data}) > 2000 else {data}")
        data = "pts"
    # A log axis is seaborn's log_scale: a violin's density is then estimated on the log of the
    # values (setting the axis afterwards squeezes a density made on raw values into a line).
    if var in d.options.log_columns:
        extra += ", log_scale=True"
    if group is None:
        lines.append(f"sns.{func}(x={data}[{var!r}], color={MAIN_COLOUR!r}{extra}, ax={c.ax})")
        lines += _labels(c, var, "") + _style(c, "x")
        return lines
    lines.append(f"g = {data}[{group!r}].astype(str)")
    if c.nominal(group):
        lines.append(f"order = list({c.data}.groupby({group!r}, observed=True)[{var!r}].median()"
                     ".sort_values(ascending=False).index.astype(str))")
    else:
        lines.append(f"order = {c.levels(group, 'g.to_frame()')}" if c.ordered(group)
                     else "order = sorted(g.unique())")
    colour = f"color={MAIN_COLOUR!r}"
    if d.horizontal:
        lines.append(f"sns.{func}(x={data}[{var!r}], y=g, order=order, orient=\"h\", "
                     f"{colour}{extra}, ax={c.ax})")
        lines += _labels(c, var, group) + _style(c, "x")
    else:
        lines.append(f"sns.{func}(x=g, y={data}[{var!r}], order=order, {colour}{extra}, ax={c.ax})")
        lines += _labels(c, group, var) + _style(c, "y")
    return lines


def _count_bar(c: Ctx) -> list[str]:
    d = c.d
    f = c.f(d.x)
    if d.hue:
        return [f"v = {c.grouped([d.x, d.hue])}.reset_index(name=\"rows\")",
                f"v[{d.hue!r}] = v[{d.hue!r}].astype(str)",
                f"order = sorted({c.data}[{d.x!r}].unique())" if f.level != "nominal"
                else f"order = list({c.grouped([d.x])}.sort_values(ascending=False, kind=\"stable\").index)",
                f"v[{d.x!r}] = v[{d.x!r}].astype(str)",
                f"sns.barplot(saturation=1, data=v, x={d.x!r}, y=\"rows\", hue={d.hue!r}, "
                "order=[str(o) for o in order], "
                f"hue_order={c.levels(d.hue, 'v')}, "
                f"palette={c.palette(c.f(d.hue).distinct, f'v[{d.hue!r}].nunique()')}, "
                f"errorbar=None, ax={c.ax})",
                ] + _labels(c, d.x, "number of rows") + _style(c, "y")
    if f.level == "nominal":
        lines = [f"v = {c.grouped([d.x])}.sort_values(ascending=False, kind=\"stable\")"]
    else:
        lines = [f"v = {c.grouped([d.x])}"]
    lines.append("labels = [f\"{k:g}\" if isinstance(k, float) else str(k) for k in v.index]")
    if d.horizontal:
        lines.append(f"sns.barplot(saturation=1, x=v.values, y=labels, orient=\"h\", "
                     f"color={MAIN_COLOUR!r}, ax={c.ax})")
        return lines + _labels(c, "number of rows", d.x) + _style(c, "x")
    lines.append(f"sns.barplot(saturation=1, x=labels, y=v.values, color={MAIN_COLOUR!r}, ax={c.ax})")
    return lines + _labels(c, d.x, "number of rows") + _style(c, "y")



register({
    "bar": _bar, "dot": _dot, "lollipop": _lollipop, "grouped-bar": _grouped_bar,
    "stacked-bar": lambda c: _stacked(c, percent=False),
    "stacked-bar-100": lambda c: _stacked(c, percent=True),
    "pie": _pie, "line": _line, "area": lambda c: _line(c, area=True), "slope": _slope,
    "difference-bar": _difference_bar, "heatmap": _heatmap, "scatter": _scatter,
    "hexbin": _hexbin, "regression": _regression, "histogram": _histogram, "density": _density,
    "ecdf": _ecdf, "box": lambda c: _boxlike(c, "box"), "violin": lambda c: _boxlike(c, "violin"),
    "strip": lambda c: _boxlike(c, "strip"), "count-bar": _count_bar,
})
