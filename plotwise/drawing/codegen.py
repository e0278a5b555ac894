"""Code generation: a short pandas + seaborn + matplotlib snippet for each design.

The snippet is the single source of truth for how a design is drawn: plotwise's own drawing
(render.py) executes the same body against the caller's frame, so what a user copies is exactly
what they saw. Every user string (column names, labels) enters the code through ``repr``, so it
comes out as an inert literal whatever it contains."""

from __future__ import annotations

from plotwise.engine.candidates import Design
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.rules import DIVERGING_CMAP, MAIN_COLOUR, OKABE_ITO, SEQUENTIAL_CMAP

LABEL_MAX = 40
STAT_LABEL = {"sum": "total", "mean": "average", "median": "median"}


def short(text: str, limit: int = LABEL_MAX) -> str:
    """A label cut to ``limit`` characters with an ellipsis, on one line, printable only."""
    text = " ".join("".join(ch if ch.isprintable() else " " for ch in str(text)).split())
    return text if len(text) <= limit else text[: limit - 1] + "…"


def column_ref(f: FieldProfile, frame: str) -> str:
    """How the snippet reaches a column of the caller's frame."""
    if isinstance(f.name, str) or (isinstance(f.name, (int, float)) and not isinstance(f.name, bool)
                                   and f.name == f.name):
        return f"{frame}[{f.name!r}]"
    return f"{frame}.iloc[:, {f.position}]"


def column_expr(f: FieldProfile, frame: str) -> str:
    ref = column_ref(f, frame)
    if f.parse_dates:
        return f'pd.to_datetime({ref}, format="ISO8601", errors="coerce")'
    if f.is_timedelta:
        return f"{ref}.dt.total_seconds()"
    if f.as_text:
        return f'{ref}.astype("string")'  # mixed Python objects: compare them as text
    if f.level == "temporal" and f.is_integer:
        return f'{ref}.round().astype("Int64")'  # integer years: label 1950, not 1950.0
    if f.level == "quantitative":
        expr = f'{ref}.astype("float64")'
        if f.infinite:
            expr += ".replace([np.inf, -np.inf], np.nan)"
        return expr
    return ref


def palette_expr(n_hint: int, count: str | None = None, own: list | None = None) -> str:
    """Okabe & Ito (2008) colours (or the caller's ``own``), cut to the number of levels drawn
    (``count``, an expression) so seaborn gets exactly as many as it needs; husl for more levels
    than the palette has."""
    if own:
        cycled = f"({list(own)!r} * {n_hint})"
        return cycled + (f"[:{count}]" if count else f"[:{n_hint}]")
    if n_hint <= len(OKABE_ITO):
        return repr(list(OKABE_ITO)) + (f"[:{count}]" if count else "")
    return f'sns.color_palette("husl", {count or n_hint})'


class Ctx:
    """What a kind's generator needs: the design, the profile and the names of variables."""

    def __init__(self, design: Design, profile: Profile, data: str = "d", ax: str = "ax"):
        self.d = design
        self.p = profile
        self.data = data
        self.ax = ax
        # Engine data drawn from per-group rows: the name of their row-count column.
        self.preagg = (engine_count_name(design) if profile.source is not None
                       and engine_mode(design) == "groups" else None)

    def palette(self, n_hint: int, count: str | None = None) -> str:
        return palette_expr(n_hint, count, self.d.options.get("palette"))

    def cmap(self, default: str = SEQUENTIAL_CMAP) -> str:
        return repr(self.d.options.get("cmap") or default)

    def lit(self, label) -> str:
        return repr(label)

    def f(self, label) -> FieldProfile | None:
        return self.p.fields.get(label)

    def nominal(self, label) -> bool:
        f = self.f(label)
        return f is not None and f.level == "nominal"

    def measure_label(self) -> str:
        d = self.d
        if d.y is None or d.stat == "count":
            base = "number of rows"
        else:
            base = f"{STAT_LABEL.get(d.stat, '')} {short(d.y)}".strip()
        if d.options.get("share"):
            base = "% of all rows" if d.y is None else f"{short(d.y)}, % of the total"
        return base

    def agg_call(self) -> str:
        d = self.d
        if d.y is None or d.stat == "count":
            return ".size()"
        return {"mean": f"[{d.y!r}].mean()", "median": f"[{d.y!r}].median()"}.get(
            d.stat, f"[{d.y!r}].sum()")

    def value_name(self) -> str:
        """Column name of the aggregated value in a long table."""
        d = self.d
        if d.y is not None and d.stat != "count":
            return d.y
        name = "count"
        while name in (d.x, d.hue, d.facet):
            name += "_"
        return name

    def grouped(self, by: list[str]) -> str:
        keys = by[0] if len(by) == 1 else by
        g = f"{self.data}.groupby({keys!r}, observed=True)"
        d = self.d
        if self.preagg is not None:  # rows already one per group: add counts and sums up
            if d.y is None or d.stat == "count":
                return f"{g}[{self.preagg!r}].sum()"
            if d.stat == "mean":
                return f"({g}[{d.y!r}].sum() / {g}[{self.preagg!r}].sum()).rename({d.y!r})"
            if d.stat == "median":
                return f"{g}[{d.y!r}].median()"
            return f"{g}[{d.y!r}].sum()"
        return f"{g}{self.agg_call()}"


def _style(c: Ctx, value_axis: str | None) -> list[str]:
    lines = [f'{c.ax}.spines[["top", "right"]].set_visible(False)']
    if value_axis:
        lines.append(f'{c.ax}.grid(axis="{value_axis}", color="#dddddd", linewidth=0.8)')
        lines.append(f"{c.ax}.set_axisbelow(True)")
        if not c.d.log_scale:
            lines.append(f'{c.ax}.locator_params(axis="{value_axis}", nbins=5)')
    return lines


def _legend(c: Ctx) -> str:
    """A small frameless legend titled with the (shortened) hue column."""
    return f"{c.ax}.legend(title={short(c.d.hue, 20)!r}, fontsize=7, title_fontsize=7, frameon=False)"


def _labels(c: Ctx, xlabel: str | None, ylabel: str | None, xnote: str = "") -> list[str]:
    """Axis labels, each cut to one short line; ``xnote`` goes on a second line under x."""
    out = []
    if xlabel is not None:
        out.append(f"{c.ax}.set_xlabel({short(xlabel) + xnote!r})")
    if ylabel is not None:
        out.append(f"{c.ax}.set_ylabel({short(ylabel)!r})")
    return out


def _ordered_series(c: Ctx, cat: str, ascending: bool = False) -> list[str]:
    """v = aggregated values per category; nominal categories sorted by value."""
    lines = [f"v = {c.grouped([cat])}"]
    if c.nominal(cat):
        lines.append(f"v = v.sort_values(ascending={ascending})")
    if c.d.options.get("share"):
        lines.append("v = v / v.sum() * 100")
    lines.append("labels = v.index.astype(str)")
    return lines


# ----------------------------------------------------------------------------------------------
# One generator per kind. Each returns lines that draw on c.ax from the working frame c.data.
# ----------------------------------------------------------------------------------------------
def _bar(c: Ctx) -> list[str]:
    d = c.d
    if d.hue:
        return _grouped_bar(c)
    lines = _ordered_series(c, d.x)
    if d.horizontal:
        lines.append(f'sns.barplot(x=v.values, y=labels, orient="h", color={MAIN_COLOUR!r}, '
                     f'ax={c.ax})')
        lines += _labels(c, c.measure_label(), d.x) + _style(c, "x")
    else:
        lines.append(f'sns.barplot(x=labels, y=v.values, color={MAIN_COLOUR!r}, ax={c.ax})')
        lines += _labels(c, d.x, c.measure_label()) + _style(c, "y")
        f = c.f(d.x)
        dates = f.level == "temporal" and not f.is_integer
        if (len(f.top_labels) and f.distinct > 12) or (dates and f.distinct > 6):
            lines.append(f'{c.ax}.tick_params(axis="x", labelrotation=90)')
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
                 f"hues = sorted(v[{d.hue!r}].unique())",
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


def _over_time_finish(c: Ctx, f: FieldProfile | None) -> list[str]:
    """Labels and style of a measure drawn over x; dates on x get slanted tick labels."""
    lines = _labels(c, c.d.x, c.measure_label()) + _style(c, "y")
    if f is not None and f.level == "temporal" and not f.is_integer:
        lines.append(f'{c.ax}.tick_params(axis="x", labelrotation=30)')
    return lines


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
        hue = (f", hue={d.hue!r}, hue_order=sorted(v[{d.hue!r}].unique()), "
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
    if d.options.get("share"):
        lines.append(f"v[{vn!r}] = v[{vn!r}] / v.groupby({d.hue!r})[{vn!r}].transform(\"sum\") * 100")
    lines += [f"v[{d.x!r}] = v[{d.x!r}].astype(str)",
              f"v[{d.hue!r}] = v[{d.hue!r}].astype(str)"]
    if c.nominal(d.x):
        lines.append(f"order = list(v.groupby({d.x!r})[{vn!r}].sum().sort_values(ascending=False).index)")
    else:
        lines.append(f"order = list(dict.fromkeys(v[{d.x!r}]))")
    lines.append(f"hues = list(dict.fromkeys(v[{d.hue!r}]))")
    pal = c.palette(c.f(d.hue).distinct, "len(hues)")
    if d.horizontal:
        lines.append(f'sns.barplot(data=v, x={vn!r}, y={d.x!r}, hue={d.hue!r}, order=order, '
                     f'hue_order=hues, palette={pal}, orient="h", errorbar=None, ax={c.ax})')
        lines += _labels(c, c.measure_label(), d.x) + _style(c, "x")
    else:
        lines.append(f'sns.barplot(data=v, x={d.x!r}, y={vn!r}, hue={d.hue!r}, order=order, '
                     f'hue_order=hues, palette={pal}, errorbar=None, ax={c.ax})')
        lines += _labels(c, d.x, c.measure_label()) + _style(c, "y")
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
        lines += [f"v = {c.grouped([parts])}.sort_values(ascending=False)",
                  "t = (v / v.sum() * 100).to_frame().T" if percent else "t = v.to_frame().T",
                  't.index = [""]']
    else:
        lines += [f"t = {c.grouped([bars, parts])}.unstack({parts!r}, fill_value=0)",
                  "t = t[t.sum().sort_values(ascending=False).index]"]
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
                f"hues = sorted(v[{d.hue!r}].unique())",
                f"sns.lineplot(data=v, x={d.x!r}, y={vn!r}, hue={d.hue!r}, hue_order=hues, "
                f"palette={c.palette(c.f(d.hue).distinct, 'len(hues)')}, errorbar=None, ax={c.ax})",
                _legend(c),
                ] + _labels(c, d.x, c.measure_label()) + _style(c, "y")
    lines = [f"v = {c.grouped([d.x])}"]
    if f is not None and f.level == "ordinal" and f.order:
        lines.append("labels = v.index.astype(str)")
        xs = "labels"
    else:
        xs = "v.index"
        if d.options.get("break_gaps"):
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
            "# End labels, nudged apart so they do not overlap (at least 4% of the range).",
            "gap = 0.04 * ((t.max().max() - t.min().min()) or 1)",
            "label_y = []",
            "for name, end in t.iloc[:, 1].sort_values().items():",
            "    label_y.append(max(end, label_y[-1] + gap) if label_y else end)",
            f"    {c.ax}.annotate(str(name)[:18], (1, end), xytext=(1.06, label_y[-1]), "
            "textcoords=\"data\", va=\"center\", fontsize=7)",
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
    if d.options.get("matrix"):
        return _correlation_matrix(c)
    if d.task == "correlate":
        if c.f(d.x) and c.f(d.x).level == "quantitative":
            # Whole numbers with few levels get one cell per value (25 bins would leave stripes).
            discrete = tuple(bool(c.f(v) and c.f(v).is_discrete) for v in (d.x, d.y))
            if not any(discrete):
                bins = "bins=25"
            elif all(discrete):
                bins = "discrete=True"
            else:  # one edge per whole number on the discrete axis, 25 bins on the other
                per = [f"np.arange({c.data}[{v!r}].min() - 0.5, {c.data}[{v!r}].max() + 1.5)"
                       if disc else "25" for v, disc in zip((d.x, d.y), discrete)]
                bins = f"discrete={discrete!r}, bins=({per[0]}, {per[1]})"
            return [f"sns.histplot(data={c.data}, x={d.x!r}, y={d.y!r}, {bins}, cmap={c.cmap()}, "
                    f"cbar=True, cbar_kws={{\"label\": \"rows\"}}, ax={c.ax})",
                    ] + _labels(c, d.x, d.y) + _style(c, None)
        return [f"t = pd.crosstab({c.data}[{d.y!r}], {c.data}[{d.x!r}])",
                f"sns.heatmap(t, cmap={c.cmap()}, annot=t.size <= 80, fmt=\"d\", "
                f"linewidths=0.5, cbar_kws={{\"label\": \"rows\"}}, ax={c.ax})",
                ] + _labels(c, d.x, d.y)
    rows, cols = (d.hue, d.x) if d.task == "trend" else (d.x, d.hue)
    lines = [f"t = {c.grouped([rows, cols])}.unstack({cols!r})"]
    if c.nominal(rows):
        lines.append("t = t.loc[t.sum(axis=1).sort_values(ascending=False).index]")
    if d.options.get("share"):
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
        hue = (f", hue={c.data}[{d.hue!r}].astype(str), hue_order=sorted({c.data}[{d.hue!r}].astype(str).unique()), "
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
        if col in c.d.options.get("log_columns", ()):
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
            f"scatter_kws={{\"s\": 16, \"alpha\": 0.5}}, line_kws={{\"color\": {OKABE_ITO[3]!r}}}, ax={c.ax})",
            ] + _labels(c, d.x, d.y) + _style(c, None)


def _hexbin(c: Ctx) -> list[str]:
    d = c.d
    scales = "".join(f', {a}scale="log"' for a, col in (("x", d.x), ("y", d.y))
                     if col in d.options.get("log_columns", ()))
    return [f"hb = {c.ax}.hexbin({c.data}[{d.x!r}], {c.data}[{d.y!r}], gridsize=30, mincnt=1, "
            f"cmap={c.cmap()}{scales})",
            f'{c.ax}.figure.colorbar(hb, ax={c.ax}, label="rows")',
            ] + _labels(c, d.x, d.y) + _style(c, None)


def _hue_args(c: Ctx) -> str:
    d = c.d
    if not d.hue:
        return f", color={MAIN_COLOUR!r}"
    return (f", hue={d.hue!r}, hue_order=sorted({c.data}[{d.hue!r}].unique(), key=str), "
            f"palette={c.palette(c.f(d.hue).distinct, f'{c.data}[{d.hue!r}].nunique()')}")


def _log_arg(c: Ctx) -> str:
    return ", log_scale=True" if c.d.x in c.d.options.get("log_columns", ()) else ""


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
    rule = d.options.get("bins", "fd")
    if d.options.get("prebin") and not d.hue:
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
             "strip": ", size=2.5, alpha=0.5, jitter=0.25"}[kind]
    func = {"box": "boxplot", "violin": "violinplot", "strip": "stripplot"}[kind]
    data = c.data
    lines = []
    if kind == "strip":
        lines.append(f"pts = {data}.sample(2000, random_state=0) if len({data}) > 2000 else {data}")
        data = "pts"
    logs = var in d.options.get("log_columns", ())
    if group is None:
        lines.append(f"sns.{func}(x={data}[{var!r}], color={MAIN_COLOUR!r}{extra}, ax={c.ax})")
        lines += _labels(c, var, "") + _style(c, "x")
        if logs:
            lines.append(f'{c.ax}.set_xscale("log")')
        return lines
    lines.append(f"g = {data}[{group!r}].astype(str)")
    if c.nominal(group):
        lines.append(f"order = list({c.data}.groupby({group!r}, observed=True)[{var!r}].median()"
                     ".sort_values(ascending=False).index.astype(str))")
    else:
        lines.append("order = sorted(g.unique())")
    colour = f"color={MAIN_COLOUR!r}"
    if d.horizontal:
        lines.append(f"sns.{func}(x={data}[{var!r}], y=g, order=order, orient=\"h\", {colour}{extra}, ax={c.ax})")
        lines += _labels(c, var, group) + _style(c, "x")
        if logs:
            lines.append(f'{c.ax}.set_xscale("log")')
    else:
        lines.append(f"sns.{func}(x=g, y={data}[{var!r}], order=order, {colour}{extra}, ax={c.ax})")
        lines += _labels(c, group, var) + _style(c, "y")
        if logs:
            lines.append(f'{c.ax}.set_yscale("log")')
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
                f"sns.barplot(data=v, x={d.x!r}, y=\"rows\", hue={d.hue!r}, order=[str(o) for o in order], "
                f"hue_order=sorted(v[{d.hue!r}].unique()), palette={c.palette(c.f(d.hue).distinct, f'v[{d.hue!r}].nunique()')}, "
                f"errorbar=None, ax={c.ax})",
                ] + _labels(c, d.x, "number of rows") + _style(c, "y")
    if f.level == "nominal":
        lines = [f"v = {c.grouped([d.x])}.sort_values(ascending=False, kind=\"stable\")"]
    else:
        lines = [f"v = {c.grouped([d.x])}"]
    lines.append("labels = [f\"{k:g}\" if isinstance(k, float) else str(k) for k in v.index]")
    if d.horizontal:
        lines.append(f"sns.barplot(x=v.values, y=labels, orient=\"h\", color={MAIN_COLOUR!r}, ax={c.ax})")
        return lines + _labels(c, "number of rows", d.x) + _style(c, "x")
    lines.append(f"sns.barplot(x=labels, y=v.values, color={MAIN_COLOUR!r}, ax={c.ax})")
    return lines + _labels(c, d.x, "number of rows") + _style(c, "y")


GENERATORS = {
    "bar": _bar, "dot": _dot, "grouped-bar": _grouped_bar,
    "stacked-bar": lambda c: _stacked(c, percent=False),
    "stacked-bar-100": lambda c: _stacked(c, percent=True),
    "pie": _pie, "line": _line, "area": lambda c: _line(c, area=True), "slope": _slope,
    "difference-bar": _difference_bar, "heatmap": _heatmap, "scatter": _scatter,
    "hexbin": _hexbin, "regression": _regression, "histogram": _histogram, "density": _density,
    "ecdf": _ecdf, "box": lambda c: _boxlike(c, "box"), "violin": lambda c: _boxlike(c, "violin"),
    "strip": lambda c: _boxlike(c, "strip"), "count-bar": _count_bar,
}


GROUP_KINDS = ("bar", "dot", "grouped-bar", "stacked-bar", "stacked-bar-100", "pie", "line",
               "area", "slope", "difference-bar", "count-bar", "heatmap")


def engine_mode(design: Design) -> str:
    """How engine data reaches a design: 'groups' (one row per group, computed by the engine),
    'bins' (row counts per histogram bin, computed by the engine) or 'rows' (a bounded sample)."""
    if design.kind in GROUP_KINDS and not design.options.get("matrix") and not (
            design.kind == "heatmap" and design.task == "correlate"):
        return "groups"
    if design.kind == "histogram" and not design.hue:
        return "bins"
    return "rows"


def engine_bins(design: Design) -> tuple:
    """(low, width, count, log) of an engine histogram's bins; a whole number in
    ``options['bins']`` (the panel's slider) splits the same range into that many bins."""
    lo, width, k, log = design.options["edges"]
    want = design.options.get("bins")
    if isinstance(want, int) and want > 0 and want != k:
        width, k = width * k / want, want
    return lo, width, k, log


def engine_count_name(design: Design) -> str:
    from plotwise.sources.engines import count_name

    return count_name(engine_keys(design), design.y)


def engine_keys(design: Design) -> list[str]:
    measure = None if (design.y is None or design.stat == "count") else design.y
    return [c for c in design.columns if c != measure]


def engine_lines(design: Design, profile: Profile, frame: str) -> list[str]:
    """Engine data: the query that runs in the engine, then ``d`` (or ``counts``) in pandas."""
    from plotwise.sources.engines import bins_expr, chained, grouped_expr, sample_expr

    src = profile.source
    name = src.engine_name
    mode = engine_mode(design)
    n = design.options.get("complete_rows", 0)
    quantitative = [c for c in design.columns if profile.fields[c].level == "quantitative"]
    if mode == "bins":
        lo, width, k, log = engine_bins(design)
        return [f"# {name} counts all {n:,} rows into {k} bins; only the counts come back.",
                f"counts = {chained(bins_expr(src, design.x, lo, width, k, log, frame), 9)}",
                f"counts = counts.reindex(range({k}), fill_value=0).to_numpy()"]
    if mode == "groups":
        keys = engine_keys(design)
        measure = None if len(keys) == len(design.columns) else design.y
        stat = "median" if design.stat == "median" else "sum"
        cnt = engine_count_name(design)
        lines = [f"# {name} computes one row per group from all {n:,} rows; only those come back.",
                 f"agg = {chained(grouped_expr(src, keys, measure, stat, finite=measure in quantitative, frame=frame), 6)}"]
        items = [f"{c!r}: {column_expr(profile.fields[c], 'agg')}" for c in keys]
        if measure:
            items.append(f"{measure!r}: agg[{measure!r}].astype(\"float64\")")
        items.append(f"{cnt!r}: agg[{cnt!r}]")
        return lines + [f"d = pd.DataFrame({{{', '.join(items)}}}, copy=False).dropna()"]
    k = design.options.get("engine_sample", n)
    cols = design.columns
    fin = tuple(quantitative)
    what = (f"a random sample of about {k:,} of the {n:,} complete rows" if n > k
            else f"all {n:,} complete rows")
    items = ", ".join(f"{c!r}: {column_expr(profile.fields[c], 'd')}" for c in cols)
    drop = "" if design.options.get("matrix") else ".dropna()"
    return [f"# {name} picks {what}; only those come back.",
            f"d = {chained(sample_expr(src, cols, k, n, complete=not design.options.get('matrix'), finite=fin, frame=frame), 4)}",
            f"d = pd.DataFrame({{{items}}}, copy=False){drop}"]


def working_lines(design: Design, profile: Profile, frame: str) -> list[str]:
    """Build ``d``: the used columns under their labels, converted, missing rows dropped."""
    if profile.source is not None:
        lines = engine_lines(design, profile, frame)
        for col in design.options.get("log_columns", ()):
            if engine_mode(design) == "rows":
                lines.append(f"d = d[d[{col!r}] > 0]")
        return lines
    items = ", ".join(f"{label!r}: {column_expr(profile.fields[label], frame)}"
                      for label in design.columns)
    # A correlation matrix uses every pairwise-complete row; other designs drop incomplete rows.
    drop = "" if design.options.get("matrix") else ".dropna()"
    lines = [f"d = pd.DataFrame({{{items}}}, copy=False){drop}"]
    if design.options.get("log_columns"):
        for col in design.options["log_columns"]:
            lines.append(f"d = d[d[{col!r}] > 0]")
    if design.options.get("sample"):
        big, k = design.options["sample"]
        lines += [f"if len(d) > {big}:  # draw a seeded random sample of the rows",
                  f"    d = d.iloc[np.sort(np.random.default_rng(0).choice(len(d), size={k}, replace=False))]"]
    return lines


def note_lines(design: Design, ax: str = "ax") -> list[str]:
    note = design.options.get("note")
    if not note:
        return []
    return [f"{ax}.annotate({note!r}, xy=(1, 1.01), xycoords=\"axes fraction\", ha=\"right\", "
            "va=\"bottom\", fontsize=7, color=\"#555555\")"]


def body_lines(design: Design, profile: Profile, frame: str = "df") -> list[str]:
    """The drawing body: expects ``ax`` (a matplotlib Axes) and the caller's frame."""
    lines = working_lines(design, profile, frame)
    if design.facet is None:
        return lines + GENERATORS[design.kind](Ctx(design, profile)) + note_lines(design)
    f = design.facet
    lines += [f"groups = [k for k, part in d.groupby({f!r}, observed=True)]",
              "ncols = min(4, len(groups))",
              "nrows = -(-len(groups) // ncols)",
              "fig = ax.figure",
              "grid = ax.get_subplotspec().subgridspec(nrows, ncols, hspace=0.7, wspace=0.35)",
              "ax.remove()",
              "first = fig.add_subplot(grid[0, 0])",
              "axes = [first] + [fig.add_subplot(grid[i // ncols, i % ncols], sharex=first, "
              "sharey=first) for i in range(1, len(groups))]",
              f"for a, (name, part) in zip(axes, d.groupby({f!r}, observed=True)):"]
    inner = GENERATORS[design.kind](Ctx(design, profile, data="part", ax="a"))
    inner += ['a.set_title(str(name)[:20], fontsize=7)', 'a.set_xlabel("")', 'a.set_ylabel("")',
              'a.tick_params(labelsize=6)']
    lines += ["    " + ln for ln in inner]
    return lines


HEADER = [
    "import matplotlib.pyplot as plt",
    "import numpy as np",
    "import pandas as pd",
    "import seaborn as sns",
    "",
]


def design_code(design: Design, name: str = "df", profile: Profile | None = None) -> str:
    """The whole runnable snippet for ``design`` reading the frame variable ``name``."""
    if not name.isidentifier():
        raise ValueError(f"{name!r} is not a valid Python variable name")
    profile = profile or design.profile
    if profile is None:
        raise ValueError("this design was not made by plotwise.advise(); no profile to read")
    title = short(design.title, 60)
    header = HEADER
    if profile.source is not None:
        from plotwise.sources.engines import open_code

        header = HEADER[:-1] + open_code(profile.source, name) + [""]
    lines = header + [
        f"# {short(design.summary(), 90)}",
        "fig, ax = plt.subplots(figsize=(6, 4), layout=\"constrained\")",
    ] + body_lines(design, profile, name) + [
        f"fig.suptitle({title!r})",
        "plt.show()",
    ]
    return "\n".join(lines) + "\n"
