"""Generators of the kinds drawn from per-group values (bars, dots, pies, lines, slopes,
heatmaps, count bars). Each returns lines that draw on c.ax from the working frame c.data,
quoting every user string with repr."""

from __future__ import annotations

from plotwise.drawing.snippet import Ctx, _labels, _legend, _ordered_series, _style, short
from plotwise.engine.profile import FieldProfile
from plotwise.engine.rules import DIVERGING_CMAP, MAIN_COLOUR, OKABE_ITO


def _bar(c: Ctx) -> list[str]:
    d = c.d
    if d.hue:
        return _grouped_bar(c)
    lines = _ordered_series(c, d.x)
    if d.horizontal:
        lines.append(f'sns.barplot(saturation=1, x=v.values, y=labels, orient="h", color={MAIN_COLOUR!r}, '
                     f'ax={c.ax})')
        lines += _labels(c, c.measure_label(), d.x) + _style(c, "x")
    else:
        lines.append(f'sns.barplot(saturation=1, x=labels, y=v.values, color={MAIN_COLOUR!r}, ax={c.ax})')
        lines += _labels(c, d.x, c.measure_label()) + _style(c, "y")
        f = c.f(d.x)
        dates = f.level == "temporal" and not f.is_integer
        if dates and f.distinct > 6:
            lines.append(f'{c.ax}.tick_params(axis="x", labelrotation=90)')
        else:
            lines += c.upright_ticks(d.x)
    return lines


def _dot(c: Ctx) -> list[str]:
    d = c.d
    if d.task == "trend":
        return _time_dots(c)
    if d.hue:
        vn = c.value_name()
        lines = [f"v = {c.grouped([d.x, d.hue])}.reset_index(name={vn!r})" if d.stat == "count"
                 or d.y is None else f"v = {c.grouped([d.x, d.hue])}.reset_index()",
                 f"v[{d.x!r}] = v[{d.x!r}].astype(str)",
                 f"v[{d.hue!r}] = v[{d.hue!r}].astype(str)",
                 f"order = v.groupby({d.x!r})[{vn!r}].sum().sort_values(ascending=False).index"
                 if c.nominal(d.x) else f"order = v[{d.x!r}].unique()",
                 f"hues = {c.levels(d.hue, 'v')}",
                 f"sns.stripplot(data=v, x={vn!r}, y={d.x!r}, hue={d.hue!r}, order=list(order), "
                 f"hue_order=hues, palette={c.palette(c.f(d.hue).distinct, 'len(hues)')}, jitter=False, "
                 f"size=7, ax={c.ax})"]
    else:
        lines = _ordered_series(c, d.x)
        lines.append(f"sns.stripplot(x=v.values, y=labels, orient=\"h\", jitter=False, size=7, "
                     f"color={MAIN_COLOUR!r}, ax={c.ax})")
    lines += _labels(c, c.measure_label(), d.x, xnote="\n(axis does not start at zero)")
    lines += _style(c, None) + [f'{c.ax}.grid(axis="y", color="#eeeeee", linewidth=0.8)']
    if d.log_scale:
        lines.append(f'{c.ax}.set_xscale("log")')
    else:
        lines.append(f'{c.ax}.locator_params(axis="x", nbins=5)')
    return lines


def _lollipop(c: Ctx) -> list[str]:
    """A thin stem from zero to each category's value, ending in a dot (less ink than a bar)."""
    d = c.d
    lines = _ordered_series(c, d.x) + [
        f"{c.ax}.hlines(y=labels, xmin=0, xmax=v.values, color={MAIN_COLOUR!r}, linewidth=1.5)",
        f"{c.ax}.plot(v.values, labels, \"o\", color={MAIN_COLOUR!r}, markersize=6)",
        f"{c.ax}.set_xlim(left=min(0, float(v.min()) * 1.05))",
        f"{c.ax}.invert_yaxis()",  # the first category on top, as in a bar chart
    ]
    return lines + _labels(c, c.measure_label(), d.x) + _style(c, "x")


def _over_time_finish(c: Ctx, f: FieldProfile | None) -> list[str]:
    """Labels and style of a measure drawn over x; dates on x get slanted tick labels."""
    lines = _labels(c, c.d.x, c.measure_label()) + _style(c, "y")
    return lines + _date_axis(c, f) + c.upright_ticks(c.d.x)


def _date_axis(c: Ctx, f: FieldProfile | None) -> list[str]:
    """Dates on x: a few ticks a date locator picks, labelled concisely (2013, Apr, Jul...)."""
    if f is None or f.level != "temporal" or f.is_integer:
        return []
    return ["loc = mdates.AutoDateLocator(minticks=3, maxticks=6)",
            f"{c.ax}.xaxis.set_major_locator(loc)",
            f"{c.ax}.xaxis.set_major_formatter(mdates.ConciseDateFormatter(loc))"]


def _time_dots(c: Ctx) -> list[str]:
    """Dots against a real time (or ordered) axis, no connecting line."""
    d = c.d
    vn = c.value_name()
    by = [d.x, d.hue] if d.hue else [d.x]
    reset = f".reset_index(name={vn!r})" if (d.y is None or d.stat == "count") else ".reset_index()"
    lines = [f"v = {c.grouped(by)}{reset}"]
    f = c.f(d.x)
    if f is not None and f.level == "ordinal":
        lines.append(f"v[{d.x!r}] = v[{d.x!r}].astype(str)")
    hue = ""
    if d.hue:
        lines.append(f"v[{d.hue!r}] = v[{d.hue!r}].astype(str)")
        hue = (f", hue={d.hue!r}, hue_order={c.levels(d.hue, 'v')}, "
               f"palette={c.palette(c.f(d.hue).distinct, f'v[{d.hue!r}].nunique()')}")
    size = "s=12" if (f is not None and f.distinct > 60) else "s=30"
    lines.append(f"sns.scatterplot(data=v, x={d.x!r}, y={vn!r}{hue}, {size}, linewidth=0, "
                 f"color={MAIN_COLOUR!r}, ax={c.ax})")
    return lines + _over_time_finish(c, f)


def _grouped_bar(c: Ctx) -> list[str]:
    d = c.d
    vn = c.value_name()
    reset = f".reset_index(name={vn!r})" if (d.y is None or d.stat == "count") else ".reset_index()"
    lines = [f"v = {c.grouped([d.x, d.hue])}{reset}"]
    if d.options.share:
        lines.append(f"v[{vn!r}] = v[{vn!r}] / v.groupby({d.hue!r})[{vn!r}].transform(\"sum\") * 100")
    xtext = (f"pd.Index({c.date_text(f'pd.DatetimeIndex(v[{d.x!r}])')})" if c.dates(d.x)
             else f"v[{d.x!r}].astype(str)")
    lines += [f"v[{d.x!r}] = {xtext}",
              f"v[{d.hue!r}] = v[{d.hue!r}].astype(str)"]
    if c.nominal(d.x):
        lines.append(f"order = list(v.groupby({d.x!r})[{vn!r}].sum().sort_values(ascending=False).index)")
    else:
        lines.append(f"order = list(dict.fromkeys(v[{d.x!r}]))")
    lines.append(f"hues = {c.levels(d.hue, 'v')}")  # the same order in every panel
    pal = c.palette(c.f(d.hue).distinct, "len(hues)")
    if d.horizontal:
        lines.append(f'sns.barplot(saturation=1, data=v, x={vn!r}, y={d.x!r}, hue={d.hue!r}, order=order, '
                     f'hue_order=hues, palette={pal}, orient="h", errorbar=None, ax={c.ax})')
        lines += _labels(c, c.measure_label(), d.x) + _style(c, "x")
    else:
        lines.append(f'sns.barplot(saturation=1, data=v, x={d.x!r}, y={vn!r}, hue={d.hue!r}, order=order, '
                     f'hue_order=hues, palette={pal}, errorbar=None, ax={c.ax})')
        lines += _labels(c, d.x, c.measure_label()) + _style(c, "y")
        if c.dates(d.x) and c.f(d.x).distinct > 6:
            lines.append(f'{c.ax}.tick_params(axis="x", labelrotation=90)')
        else:
            lines += c.upright_ticks(d.x)
    lines.append(_legend(c))
    return lines


def _stacked(c: Ctx, percent: bool) -> list[str]:
    d = c.d
    # Bars along `bars`, segments by `parts`.
    if d.task == "proportion":
        bars, parts = d.hue, d.x
    else:
        bars, parts = d.x, d.hue
    lines = []
    if bars is None:  # one bar of the whole
        lines += [f"v = {c.grouped([parts])}" + ("" if c.ordered(parts)
                                                 else ".sort_values(ascending=False)"),
                  "t = (v / v.sum() * 100).to_frame().T" if percent else "t = v.to_frame().T",
                  't.index = [""]']
    else:
        lines += [f"t = {c.grouped([bars, parts])}.unstack({parts!r}, fill_value=0)"]
        if not c.ordered(parts):  # an ordered scale keeps its order; labels go largest first
            lines.append("t = t[t.sum().sort_values(ascending=False).index]")
        if c.nominal(bars):
            lines.append("t = t.loc[t.sum(axis=1).sort_values(ascending=False).index]")
        if percent:
            lines.append("t = t.div(t.sum(axis=1), axis=0) * 100")
        lines.append("t.index = t.index.astype(str)")
    pal = c.palette(c.f(parts).distinct)
    lines += [f"colors = {pal}",
              "left = np.zeros(len(t))",
              "for i, (name, col) in enumerate(t.items()):",
              f"    {c.ax}.barh(t.index, col.values, left=left, color=colors[i % len(colors)], "
              "label=str(name), edgecolor=\"white\", linewidth=0.5)",
              "    left = left + col.values",
              f"{c.ax}.invert_yaxis()",
              f'{c.ax}.legend(title={short(parts, 20)!r}, fontsize=7, title_fontsize=7, frameon=False, '
              'loc="upper left", bbox_to_anchor=(1, 1))']
    what = c.measure_label()
    if percent:
        what = f"{short(d.y)}, % of the total" if d.y else "% of all rows"
    lines += _labels(c, what, bars if bars else "") + _style(c, "x")
    if percent:
        lines.append(f"{c.ax}.set_xlim(0, 100)")
    return lines


def _pie(c: Ctx) -> list[str]:
    d = c.d
    return [f"v = {c.grouped([d.x])}.sort_values(ascending=False)",
            f"colors = {c.palette(c.f(d.x).distinct)}",
            f"{c.ax}.pie(v.values, labels=[str(k) for k in v.index], "
            "colors=[colors[i % len(colors)] for i in range(len(v))], startangle=90, "
            "counterclock=False, autopct=\"%.0f%%\", pctdistance=0.75, "
            "wedgeprops={\"edgecolor\": \"white\", \"linewidth\": 1}, textprops={\"fontsize\": 8})",
            f'{c.ax}.set_aspect("equal")']


def _line(c: Ctx, area: bool = False) -> list[str]:
    d = c.d
    f = c.f(d.x)
    if d.hue:
        vn = c.value_name()
        reset = f".reset_index(name={vn!r})" if (d.y is None or d.stat == "count") else ".reset_index()"
        return [f"v = {c.grouped([d.x, d.hue])}{reset}",
                f"v[{d.hue!r}] = v[{d.hue!r}].astype(str)",
                f"hues = {c.levels(d.hue, 'v')}",
                f"sns.lineplot(data=v, x={d.x!r}, y={vn!r}, hue={d.hue!r}, hue_order=hues, "
                f"palette={c.palette(c.f(d.hue).distinct, 'len(hues)')}, errorbar=None, ax={c.ax})",
                _legend(c),
                ] + _labels(c, d.x, c.measure_label()) + _style(c, "y") + _date_axis(c, f)
    lines = [f"v = {c.grouped([d.x])}"]
    if f is not None and f.level == "ordinal" and f.order:
        lines.append("labels = v.index.astype(str)")
        xs = "labels"
    else:
        xs = "v.index"
        if d.options.break_gaps:
            # Break the line at gaps in time instead of drawing across them.
            lines += ["t = v.index.to_series()",
                      "step = t.diff().median()",
                      "after_gap = t[t.diff().shift(-1) > 1.5 * step]",
                      "v = pd.concat([v, pd.Series(np.nan, index=after_gap + step)]).sort_index()"]
    marker = ', marker="o", markersize=3' if (f is None or f.distinct <= 40) else ""
    lines.append(f"{c.ax}.plot({xs}, v.values, color={MAIN_COLOUR!r}{marker})")
    if area:
        lines.append(f"{c.ax}.fill_between({xs}, v.values, color={MAIN_COLOUR!r}, alpha=0.3)")
        lines.append(f"{c.ax}.set_ylim(bottom=0)")
    return lines + _over_time_finish(c, f)


def _slope(c: Ctx) -> list[str]:
    d = c.d
    period, group = (d.x, d.hue)
    return [f"t = {c.grouped([group, period])}.unstack({period!r}).dropna()",
            f"colors = {c.palette(c.f(group).distinct)}",
            "for i, (name, row) in enumerate(t.iterrows()):",
            f"    {c.ax}.plot([0, 1], row.values, marker=\"o\", color=colors[i % len(colors)])",
            "# End labels in each line's colour, nudged apart so they do not overlap (at least",
            "# 4% of the range) and joined to their points by a thin leader line.",
            "gap = 0.04 * ((t.max().max() - t.min().min()) or 1)",
            "colour_of = {name: colors[i % len(colors)] for i, name in enumerate(t.index)}",
            "label_y = []",
            "for name, end in t.iloc[:, 1].sort_values().items():",
            "    label_y.append(max(end, label_y[-1] + gap) if label_y else end)",
            f"    {c.ax}.annotate(str(name)[:18], (1, end), xytext=(1.08, label_y[-1]), "
            "textcoords=\"data\", va=\"center\", fontsize=7, color=colour_of[name], "
            "arrowprops={\"arrowstyle\": \"-\", \"color\": \"#aaaaaa\", \"lw\": 0.5, "
            "\"shrinkA\": 0, \"shrinkB\": 3})",
            f"{c.ax}.set_xticks([0, 1], [str(p) for p in t.columns])",
            f"{c.ax}.set_xlim(-0.15, 1.45)",
            ] + _labels(c, d.x, c.measure_label()) + _style(c, "y")


def _difference_bar(c: Ctx) -> list[str]:
    d = c.d
    group, period = d.x, d.hue
    return [f"t = {c.grouped([group, period])}.unstack({period!r}).dropna()",
            "diff = (t.iloc[:, 1] - t.iloc[:, 0]).sort_values()",
            f"colors = np.where(diff.values >= 0, {OKABE_ITO[0]!r}, {OKABE_ITO[3]!r})",
            f"{c.ax}.barh(diff.index.astype(str), diff.values, color=colors)",
            f'{c.ax}.axvline(0, color="black", linewidth=0.8)',
            f"{c.ax}.set_xlabel(f'change in {c.measure_label()}, {{t.columns[0]}} → {{t.columns[1]}}'[:60])",
            f"{c.ax}.set_ylabel({short(group)!r})",
            ] + _style(c, "x")


def _correlation_matrix(c: Ctx) -> list[str]:
    """Pearson correlations of every pair (pairwise complete rows), diverging colormap centred on
    zero, strongest colour at ±1."""
    return [f"corr = {c.data}.corr()",
            f"sns.heatmap(corr, cmap={c.cmap(DIVERGING_CMAP)}, center=0, vmin=-1, vmax=1, "
            "annot=len(corr) <= 8, fmt=\".2f\", annot_kws={\"fontsize\": 7}, square=True, "
            f"linewidths=0.5, cbar_kws={{\"label\": \"Pearson r\"}}, ax={c.ax})",
            f"{c.ax}.tick_params(labelsize=7)"]


def _heatmap(c: Ctx) -> list[str]:
    d = c.d
    if d.options.matrix:
        return _correlation_matrix(c)
    if d.task == "correlate":
        if c.f(d.x) and c.f(d.x).level == "quantitative":
            # Whole numbers with few levels get one cell per value (25 bins would leave stripes).
            discrete = tuple(bool(c.f(v) and c.f(v).is_discrete) for v in (d.x, d.y))
            if not any(discrete):
                logs = tuple(v in d.options.log_columns for v in (d.x, d.y))
                bins = "bins=25" + (f", log_scale={logs!r}" if any(logs) else "")
            elif all(discrete):
                bins = "discrete=True"
            else:  # one edge per whole number on the discrete axis, 25 bins on the other
                per = [f"np.arange({c.data}[{v!r}].min() - 0.5, {c.data}[{v!r}].max() + 1.5)"
                       if disc else "25" for v, disc in zip((d.x, d.y), discrete)]
                bins = f"discrete={discrete!r}, bins=({per[0]}, {per[1]})"
            # a Colormap object, not its name: seaborn refuses some names (e.g. 'jet') there
            return [f"sns.histplot(data={c.data}, x={d.x!r}, y={d.y!r}, {bins}, "
                    f"cmap=mpl.colormaps[{c.cmap()}], "
                    f"cbar=True, cbar_kws={{\"label\": \"rows\"}}, ax={c.ax})",
                    ] + _labels(c, d.x, d.y) + _style(c, None)
        # A category against a many-valued number: the number in ten equal bins (one row or
        # column per distinct value would draw a cell per row of the data), high values on top.
        many = [bool(c.f(v) and c.f(v).level == "quantitative" and c.f(v).distinct > 12)
                for v in (d.y, d.x)]
        lines = [f"{b} = pd.cut({c.data}[{v!r}], 10)" for b, v, m in zip("rc", (d.y, d.x), many)
                 if m]
        rows, cols = (b if m else f"{c.data}[{v!r}]" for b, v, m in zip("rc", (d.y, d.x), many))
        lines.append(f"t = pd.crosstab({rows}, {cols})")
        if many[0]:  # empty bins stay, as rows of zeros; high values on top
            lines.append("t = t.reindex(r.cat.categories[::-1], fill_value=0)")
        if many[1]:
            lines.append("t = t.reindex(columns=c.cat.categories, fill_value=0)")
        return lines + [
                f"sns.heatmap(t, cmap={c.cmap()}, annot=t.size <= 80, fmt=\"d\", "
                f"linewidths=0.5, cbar_kws={{\"label\": \"rows\"}}, ax={c.ax})",
                ] + _labels(c, d.x, d.y)
    rows, cols = (d.hue, d.x) if d.task == "trend" else (d.x, d.hue)
    lines = [f"t = {c.grouped([rows, cols])}.unstack({cols!r})"]
    if c.nominal(rows):
        lines.append("t = t.loc[t.sum(axis=1).sort_values(ascending=False).index]")
    if d.options.share:
        lines.append("t = t / t.sum() * 100")
    f = c.f(d.y) if d.y else None
    signed = f is not None and f.signed
    cmap = f"cmap={c.cmap(DIVERGING_CMAP)}, center=0" if signed else f"cmap={c.cmap()}"
    lines += ["t.index = t.index.astype(str)",
              "t.columns = t.columns.astype(str)",
              f"sns.heatmap(t, {cmap}, annot=t.size <= 60, fmt=\".3g\" if t.abs().max().max() < 1000 "
              f"else \",.0f\", annot_kws={{\"fontsize\": 7}}, "
              f"linewidths=0.5, cbar_kws={{\"label\": {short(c.measure_label(), 30)!r}}}, ax={c.ax})"]
    lines += _labels(c, cols, rows)
    return lines


def _scatter(c: Ctx) -> list[str]:
    d = c.d
    hue = ""
    if d.hue:
        hue = (f", hue={c.data}[{d.hue!r}].astype(str), "
               f"hue_order={c.levels(d.hue, c.data, text=True)}, "
               f"palette={c.palette(c.f(d.hue).distinct, f'{c.data}[{d.hue!r}].nunique()')}")
    lines = [f"alpha = 1.0 if len({c.data}) <= 300 else max(0.15, (300 / len({c.data})) ** 0.5)",
             f"sns.scatterplot(x={c.data}[{d.x!r}], y={c.data}[{d.y!r}]{hue}, s=36, alpha=alpha, "
             f"color={MAIN_COLOUR!r}, linewidth=0, ax={c.ax})"]
    if d.hue:
        lines.append(_legend(c))
    lines += _logs(c) + _labels(c, d.x, d.y) + _style(c, None)
    return lines


def _logs(c: Ctx) -> list[str]:
    out = []
    for axis, col in (("x", c.d.x), ("y", c.d.y)):
        if col in c.d.options.log_columns:
            out.append(f'{c.ax}.set_{axis}scale("log")')
    return out


def _regression(c: Ctx) -> list[str]:
    d = c.d
    ci = f"ci=None if len({c.data}) > 2000 else 95"
    if d.hue:
        return [f"colors = {c.palette(c.f(d.hue).distinct)}",
                f"for i, (name, part) in enumerate({c.data}.groupby({d.hue!r}, observed=True)):",
                f"    sns.regplot(data=part, x={d.x!r}, y={d.y!r}, {ci}, color=colors[i % len(colors)], "
                f"scatter_kws={{\"s\": 16, \"alpha\": 0.5}}, label=str(name), ax={c.ax})",
                _legend(c),
                ] + _labels(c, d.x, d.y) + _style(c, None)
    return [f"sns.regplot(data={c.data}, x={d.x!r}, y={d.y!r}, {ci}, color={MAIN_COLOUR!r}, "
            f"scatter_kws={{\"s\": 16, \"alpha\": 0.5}}, "
            f"line_kws={{\"color\": {OKABE_ITO[3]!r}}}, ax={c.ax})",
            ] + _labels(c, d.x, d.y) + _style(c, None)


def _hexbin(c: Ctx) -> list[str]:
    d = c.d
    scales = "".join(f', {a}scale="log"' for a, col in (("x", d.x), ("y", d.y))
                     if col in d.options.log_columns)
    return [f"hb = {c.ax}.hexbin({c.data}[{d.x!r}], {c.data}[{d.y!r}], gridsize=30, mincnt=1, "
            f"cmap={c.cmap()}{scales})",
            f'{c.ax}.figure.colorbar(hb, ax={c.ax}, label="rows")',
            ] + _labels(c, d.x, d.y) + _style(c, None)
