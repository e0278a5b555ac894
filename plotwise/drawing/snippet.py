"""The building blocks of a generated snippet: short labels, column references, palettes and the
``Ctx`` a kind's generator writes with, plus the table of generators (one per chart kind,
filled by generators_groups and generators_rows)."""

from __future__ import annotations

from collections.abc import Callable

from plotwise.engine.colour import ordered_palette
from plotwise.engine.conditions import kept_categories
from plotwise.engine.design import Design
from plotwise.engine.kinds import engine_mode
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.rules import OKABE_ITO, SEQUENTIAL_CMAP
from plotwise.engine.working import conversion

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
    """The converted column as code: the engine's own conversion (plotwise.engine.working)."""
    return conversion(f).format(column_ref(f, frame))


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


TICK_ROW_CHARS = 50  # characters of category names that fit side by side under one panel
TICK_NAMES_SEEN = 60


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
        """Colours for the column on the hue channel: the caller's, an ordered palette for an
        ordered scale, else Okabe & Ito."""
        named = ordered_palette(self.f(self.d.encoding.get("hue") or ""))
        if named and not self.d.options.palette:
            return f"sns.color_palette({named!r}, {count or n_hint})"
        return palette_expr(n_hint, count, self.d.options.palette)

    def levels(self, label, frame: str, key: str = "", text: bool = False) -> str:
        """Code for the levels of ``label`` present in ``frame``, in the column's own order
        (as text) when it has one (an ordered scale), else sorted (as text with ``text``)."""
        f = self.f(label)
        if f is not None and f.level == "ordinal" and f.order:
            order = [str(o) for o in f.order]
            return f"[k for k in {order!r} if k in set({frame}[{label!r}].astype(str))]"
        col = f"{frame}[{label!r}]" + (".astype(str)" if text else "")
        return f"sorted({col}.unique(){key})"

    def upright_ticks(self, label) -> list[str]:
        """Turn the x tick labels upright when the categories' names would not fit side by
        side in a panel (about 50 characters, our own measure)."""
        f = self.f(label)
        if f is None or f.level == "quantitative" or (f.level == "temporal" and not f.is_integer):
            return []
        names = [str(v) for v in (f.order or f.labels or f.top_labels)]
        width: float = sum(len(n) + 2 for n in names[:TICK_NAMES_SEEN])
        if f.distinct > len(names):  # only the most common names are known: scale up
            width = width * f.distinct / max(len(names), 1)
        if width <= TICK_ROW_CHARS:
            return []
        return [f'{self.ax}.tick_params(axis="x", labelrotation=90)']

    def dates(self, label) -> bool:
        """Calendar dates (not integer years) on this column."""
        f = self.f(label)
        return f is not None and f.level == "temporal" and not f.is_integer

    def date_text(self, values: str) -> str:
        """Code for dates as short text: the year alone when every date is a 1 January, the
        month when every date is a first of the month, else the day."""
        return (f"{values}.strftime(\"%Y\" if ({values}.month == 1).all() and ({values}.day == 1)"
                f".all() else \"%Y-%m\" if ({values}.day == 1).all() else \"%Y-%m-%d\")")

    def ordered(self, label) -> bool:
        """The column has an order of its own (segments and legends keep it)."""
        f = self.f(label)
        return f is not None and f.level == "ordinal" and bool(f.order)

    def cmap(self, default: str = SEQUENTIAL_CMAP) -> str:
        return repr(self.d.options.cmap or default)

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
        if d.options.share:
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
    """A small frameless legend titled with the (shortened) hue column, outside the data (to
    the right of the axes), so it never covers a mark."""
    return (f"{c.ax}.legend(title={short(c.d.hue, 20)!r}, fontsize=7, title_fontsize=7, "
            "frameon=False, loc=\"upper left\", bbox_to_anchor=(1, 1))")


def _labels(c: Ctx, xlabel: str | None, ylabel: str | None, xnote: str = "") -> list[str]:
    """Axis labels, each cut to one short line; ``xnote`` goes on a second line under x."""
    out = []
    kept = kept_categories(c.d, c.p)
    if kept:  # say which categories the axis shows
        f = c.f(c.d.x)
        rest = "the rest as one" if c.d.stat in ("count", "sum") else "the rest not shown"
        note = f"\n(largest {kept} of {f.distinct}; {rest})"
        xnote = note if xlabel == c.d.x else xnote
        ynote = note if ylabel == c.d.x else ""
    else:
        ynote = ""
    if xlabel is not None:
        out.append(f"{c.ax}.set_xlabel({short(xlabel) + xnote!r})")
    if ylabel is not None:
        out.append(f"{c.ax}.set_ylabel({short(ylabel) + ynote!r})")
    return out


def _ordered_series(c: Ctx, cat: str, ascending: bool = False) -> list[str]:
    """v = aggregated values per category; nominal categories sorted by value."""
    lines = [f"v = {c.grouped([cat])}"]
    if c.nominal(cat):
        lines.append(f"v = v.sort_values(ascending={ascending})")
    kept = kept_categories(c.d, c.p)
    if kept:
        lines += _capped(c, kept)
    if c.d.options.share:
        lines.append("v = v / v.sum() * 100")
    if c.dates(cat):
        lines.append(f"labels = {c.date_text('v.index')}")
    else:
        lines.append("labels = [f\"{k:g}\" if isinstance(k, float) else str(k) for k in v.index]")
    return lines


def _capped(c: Ctx, kept: int) -> list[str]:
    """Keep the ``kept`` largest categories of ``v``; counts and sums of the rest become one
    "all other" bar, averages of the rest are left out (and the axis label says so)."""
    if c.d.stat in ("count", "sum"):
        return [f"v = pd.concat([v.iloc[:{kept}], pd.Series({{f\"all other ({{len(v) - {kept}}})\": "
                f"v.iloc[{kept}:].sum()}})])  # the largest {kept}, then the rest as one"]
    return [f"v = v.iloc[:{kept}]  # the largest {kept}; the others are not drawn"]


# ----------------------------------------------------------------------------------------------
# One generator per kind. Each returns lines that draw on c.ax from the working frame c.data.
# ----------------------------------------------------------------------------------------------


def engine_bins(design: Design) -> tuple:
    """(low, width, count, log) of an engine histogram's bins; a whole number in
    ``options.bins`` (the panel's slider) splits the same range into that many bins."""
    lo, width, k, log = design.options.edges
    want = design.options.bins
    if isinstance(want, int) and want > 0 and want != k:
        width, k = width * k / want, want
    return lo, width, k, log


def engine_count_name(design: Design) -> str:
    from plotwise.sources.queries import count_name

    return count_name(engine_keys(design), design.y)


def engine_keys(design: Design) -> list[str]:
    measure = None if (design.y is None or design.stat == "count") else design.y
    return [c for c in design.columns if c != measure]

Generator = Callable[[Ctx], list[str]]
GENERATORS: dict[str, Generator] = {}


def register(table: dict[str, Generator]) -> None:
    """Add kinds' generators; each returns lines that draw on c.ax from the working frame c.data."""
    GENERATORS.update(table)
