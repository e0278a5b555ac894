"""The public entry point: ``advise(df, task, ...)`` runs the engine (profile → designs →
scoring → hazards) and returns an Advice, which can draw its top designs and display itself."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np
import pandas as pd

from plotwise.engine.candidates import Design, candidates, choose_roles
from plotwise.engine.datastats import choose_bins, design_stats, engine_edges, skewed, working_frame
from plotwise.engine.hazards import SEVERITIES, Hazard, HazardContext, run_checks
from plotwise.engine.profile import FieldProfile, Profile, profile_frame
from plotwise.engine.rules import TASKS, THRESHOLDS
from plotwise.engine.scoring import rank, score_design
from plotwise.errors import PlotwiseError

# Kinds that draw raw values on a position axis and so can take a log axis for skewed data.
LOG_KINDS = ("histogram", "density", "ecdf", "box", "violin", "strip", "scatter", "hexbin")
AGGS = ("sum", "mean", "median", "count")


@dataclass
class Advice:
    """What plotwise recommends for one frame and task."""

    task: str | None
    profile: Profile
    designs: list[Design]
    hazards: list[Hazard]
    notes: list[str] = field(default_factory=list)
    top: int = 3
    request: dict = field(default_factory=dict)  # the arguments advise() was called with
    headline: str | None = None  # one sentence, when a single number says it better than a chart
    _df: object | None = field(default=None, repr=False, compare=False)  # pandas or engine data
    _input: object | None = field(default=None, repr=False, compare=False)  # what advise() got

    @property
    def fields(self) -> dict[str, FieldProfile]:
        return self.profile.fields

    @property
    def best(self) -> Design:
        return self.designs[0]

    def design(self, kind: str, task: str | None = None) -> Design:
        """The best-ranked design of ``kind`` (and ``task``)."""
        for d in self.designs:
            if d.kind == kind and (task is None or d.task == task):
                return d
        kinds = ", ".join(dict.fromkeys(d.kind for d in self.designs))
        raise PlotwiseError(f"no {kind!r} design in this advice; it has: {kinds}.")

    def shown(self, top: int | None = None) -> list[Design]:
        """The designs drawn side by side: the best ``top`` that state nothing false (a design
        that fails the expressiveness test is listed, never drawn as a recommendation, unless
        nothing else exists)."""
        good = [d for d in self.designs if d.expressive]
        return (good or self.designs[:1])[: (top or self.top)]

    def show(self, top: int | None = None):
        """A matplotlib Figure with the top designs side by side (not shown through pyplot)."""
        from plotwise.drawing.render import draw_row

        return draw_row(self.shown(top), self._frame())

    def draw(self, which: int | str | Design = 0, ax=None):
        """Draw one design (index, kind or Design) on ``ax``; a new Figure when ax is None."""
        from matplotlib.figure import Figure

        from plotwise.drawing.render import PANEL_HEIGHT_IN, PANEL_WIDTH_IN, draw, plot_style

        d = self._pick(which)
        if ax is None:
            with plot_style():
                fig = Figure(figsize=(PANEL_WIDTH_IN * 1.3, PANEL_HEIGHT_IN), layout="constrained")
                ax = fig.subplots()
        draw(d, self._frame(), ax)
        return ax

    def code(self, which: int | str | Design = 0, name: str = "df") -> str:
        return self._pick(which).code(name)

    def table(self) -> pd.DataFrame:
        """All candidate designs, ranked: rank, kind, task, score, the one-line reason."""
        return pd.DataFrame({
            "rank": range(1, len(self.designs) + 1),
            "kind": [d.title for d in self.designs],
            "task": [d.task for d in self.designs],
            "score": [round(d.score, 2) for d in self.designs],
            "reason": [d.summary() for d in self.designs],
        })

    def hazard_codes(self) -> list[str]:
        return [h.code for h in self.hazards]

    def _pick(self, which) -> Design:
        if isinstance(which, Design):
            return which
        if isinstance(which, str):
            return self.design(which)
        try:
            return self.designs[which]
        except (IndexError, TypeError):
            raise PlotwiseError(
                f"no design {which!r}; pick 0..{len(self.designs) - 1} or a kind name."
            ) from None

    def _frame(self):
        """What the drawing code reads as ``df``: the caller's frame, or the engine's data."""
        if self._df is None:
            raise PlotwiseError("this advice holds no data to draw.")
        src = self.profile.source
        return src.native if src is not None else self._df

    @property
    def engine(self) -> str:
        """Which engine computed the advice: 'pandas', or the engine holding the data."""
        src = self.profile.source
        return "pandas" if src is None else src.engine_name

    # Display ---------------------------------------------------------------------------------
    def text(self) -> str:
        from plotwise.notebook.display import advice_text

        return advice_text(self)

    def html(self, image: bool = True, profile: bool = False) -> str:
        from plotwise.notebook.display import advice_html

        return advice_html(self, image=image, profile=profile)

    def __str__(self) -> str:
        return self.text()

    def __repr__(self) -> str:
        kinds = ", ".join(d.title for d in self.shown())
        return (f"<Advice task={self.task!r}: {len(self.designs)} designs (top: {kinds}); "
                f"{len(self.hazards)} hazards>")

    def _repr_mimebundle_(self, include=None, exclude=None):
        from plotwise.notebook.display import advice_bundle

        return advice_bundle(self)


def _check_task(task) -> str | None:
    if task is None:
        return None
    if not isinstance(task, str) or task.strip().lower() not in TASKS:
        raise PlotwiseError(f"unknown task {task!r}; use one of: {', '.join(TASKS)} "
                            "(or leave it out to rank across all of them).")
    return task.strip().lower()


def _check_range(value_range):
    if value_range is None:
        return None
    try:
        lo, hi = (float(v) for v in value_range)
    except (TypeError, ValueError):
        raise PlotwiseError("value_range must be two numbers (low, high), e.g. (0, 100).") from None
    if not (np.isfinite(lo) and np.isfinite(hi) and lo < hi):
        raise PlotwiseError(f"value_range {value_range!r} must be two finite numbers, low < high.")
    return lo, hi


def _large_data_options(d: Design, stats: dict) -> None:
    """On large data, point designs draw a seeded sample and histograms are binned first; every
    such panel says what it drew (a note on the panel and the `sampled` hazard)."""
    from plotwise.engine.rules import POINT_KINDS

    n = stats.get("points", 0)
    big, k = THRESHOLDS["draw_sample_above"], THRESHOLDS["draw_sample"]
    if n <= big or d.options.get("matrix"):
        return
    if d.kind in POINT_KINDS or (d.kind == "histogram" and d.hue):
        d.options["sample"] = (big, k)
        d.options["note"] = f"random sample of {k:,} of {n:,} rows"
    elif d.kind == "histogram":
        d.options["prebin"] = True
        d.options["note"] = f"all {n:,} rows, counted into bins first"
    elif d.kind == "hexbin" or (d.kind == "heatmap" and d.task == "correlate"):
        kb = THRESHOLDS["bin_sample"]
        if n > kb:
            d.options["sample"] = (kb, kb)
            d.options["note"] = f"random sample of {kb:,} of {n:,} rows, counted into bins"
        else:
            d.options["note"] = f"all {n:,} rows, counted into bins"
    else:
        d.options["note"] = f"{'counts' if d.stat == 'count' else 'totals' if d.stat in ('sum', 'value') else 'averages'} of all {n:,} rows, computed before drawing"


def _engine_options(d: Design, stats: dict, profile: Profile, working, bins) -> None:
    """Engine data: which rows each design's query brings back, and the panel note saying so."""
    from plotwise.drawing.codegen import engine_mode

    n = stats.get("points", 0)
    name = profile.source.engine_name
    d.options["complete_rows"] = n
    mode = engine_mode(d)
    if mode == "groups":
        what = {"count": "counts", "mean": "averages", "median": "medians"}.get(d.stat, "totals")
        d.options["note"] = f"{name} computed the {what} of all {n:,} rows"
    elif mode == "bins":
        f = profile.fields[d.x]
        d.options["edges"] = engine_edges(working[d.x].dropna().to_numpy(dtype=float), n,
                                          f.minimum, f.maximum, bins[0] if bins else "fd",
                                          skewed(f))
        d.options["note"] = f"{name} counted all {n:,} rows into bins"
    else:
        k = d.options.get("sample", (0, THRESHOLDS["bin_sample"]))[1]
        d.options["engine_sample"] = k
        d.options.pop("sample", None)
        d.options["note"] = (f"random sample of about {k:,} of {n:,} rows, drawn by {name}"
                             if n > k else f"all {n:,} rows, fetched from {name}")


def _mark_single_values(df, profile: Profile, designs: list[Design], exact=None) -> None:
    """Where each group holds one row, a design draws the value itself, not a total or mean."""
    unique: dict[tuple, bool] = {}
    for d in designs:
        if d.stat not in ("sum", "mean") or d.y is None:
            continue
        keys = tuple(c for c in (d.x, d.hue, d.facet) if c)
        combos = 1
        for k in keys:
            combos *= max(profile.fields[k].distinct, 1)
        if profile.rows > combos:  # more rows than key combinations: some group has several
            unique[keys] = False
        if keys not in unique and exact is not None:
            unique[keys] = exact.unique_keys(list(keys), d.y)
        if keys not in unique:
            w = working_frame(df, profile, list(keys) + [d.y]).dropna()
            unique[keys] = not w.duplicated(subset=list(keys)).any()
        if unique[keys]:
            d.stat = "value"


def _strongest_pairs(df, profile: Profile, cols: list[str], k: int = 3) -> str:
    w = working_frame(df, profile, cols)
    corr = w.corr()
    pairs = sorted(((abs(corr.iloc[i, j]), cols[i], cols[j], corr.iloc[i, j])
                    for i in range(len(cols)) for j in range(i + 1, len(cols))
                    if corr.iloc[i, j] == corr.iloc[i, j]), reverse=True)[:k]
    named = "; ".join(f"'{a}' & '{b}' r = {r:+.2f}" for _, a, b, r in pairs)
    return (f"all {len(cols) * (len(cols) - 1) // 2} pairs of {len(cols)} numeric columns in one view; "
            f"strongest: {named}")


def _colour_reason(d: Design, profile: Profile) -> str | None:
    from plotwise.engine.colour import scheme_for

    if "hue" in d.encoding and d.encoding["hue"] in profile.fields and d.kind != "pie":
        f = profile.fields[d.encoding["hue"]]
        if d.options.get("palette"):
            return f"colour: your palette of {len(d.options['palette'])} colours for '{f.label}'"
        return "colour: " + scheme_for("nominal", n_levels=f.distinct)[1]
    if "lightness" in d.encoding:
        col = d.encoding["lightness"]
        f = profile.fields.get(col)
        if d.options.get("cmap"):
            return f"colour: your colormap '{d.options['cmap']}' for '{col}'"
        return "colour: " + scheme_for("quantitative", signed=bool(f and f.signed))[1]
    return None


def _advise_task(df, profile, task, x, y, hue, agg, value_range, palette=None, cmap=None,
                 exact=None):
    roles = choose_roles(profile, task, x, y, hue, df)
    designs = candidates(profile, task, roles, agg)
    if not designs:
        raise PlotwiseError(f"no design can show {task} for these columns.")
    if agg is None:
        _mark_single_values(df, profile, designs, exact)
    stat = designs[0].stat if designs[0].stat not in ("distribution", "raw") else "sum"
    for d in designs:
        if d.stat not in ("distribution", "raw", "difference"):
            stat = d.stat
            break
    working = working_frame(df, profile, [c for c in dict.fromkeys(
        [roles.x, roles.y, roles.hue, roles.period]) if c])
    stats = design_stats(df, profile, task, roles.x, roles.y, roles.hue, stat, w=working,
                         exact=exact)
    if stats["points"] == 0:
        cols = ", ".join(repr(c) for c in dict.fromkeys([roles.x, roles.y, roles.hue]) if c)
        raise PlotwiseError(f"no row has values in all of {cols}; nothing to draw for {task}.")
    extra_reasons: dict[int, list[str]] = {}
    cmap_name = None
    if cmap is not None:
        from plotwise.engine.colour import resolve_cmap

        cmap_name = resolve_cmap(cmap).name
    bins = None
    if task == "distribution" and profile.fields[roles.x].level == "quantitative":
        vals = working[roles.x].dropna().to_numpy(dtype=float)
        bins = choose_bins(vals, log=skewed(profile.fields[roles.x]))
    for d in designs:
        d.profile = profile
        if palette:
            d.options["palette"] = list(palette)
        if cmap is not None:
            d.options["cmap"] = cmap_name
        logs = [c for c in (d.x, d.y) if c and skewed(profile.fields.get(c))]
        if logs and d.kind in LOG_KINDS:
            d.options["log_columns"] = logs
            d.log_scale = bool(logs)
            if logs:
                extra_reasons[id(d)] = [
                    f"log axis for {', '.join(repr(c) for c in logs)}: right-skewed (skewness "
                    f"{profile.fields[logs[0]].skew:.1f}), so equal steps mean equal ratios"]
        _large_data_options(d, stats)
        if exact is not None:
            _engine_options(d, stats, profile, working, bins)
        if d.kind in ("line", "area") and stats.get("time_gaps"):
            d.options["break_gaps"] = True
        if d.kind == "histogram" and bins is not None:
            d.options["bins"] = bins[0]
            extra_reasons.setdefault(id(d), []).append(bins[1])
        if d.options.get("matrix"):
            extra_reasons.setdefault(id(d), []).append(_strongest_pairs(df, profile, d.options["matrix"]))
        colour = _colour_reason(d, profile)
        if colour:
            extra_reasons.setdefault(id(d), []).append(colour)
        score_design(d, profile, stats)
        d.reasons[1:1] = extra_reasons.get(id(d), [])
        if roles.notes:
            d.reasons.append("columns chosen by plotwise: " + "; ".join(roles.notes))
    ctx = HazardContext(df=df, profile=profile, task=task, x=roles.x, y=roles.y, hue=roles.hue,
                        stat=stat, stats=stats, value_range=value_range, palette=palette, cmap=cmap,
                        working=working)
    wide = run_checks(ctx, designs)
    return designs, wide, roles.notes, _headline(ctx, roles, designs)


def _headline(ctx: HazardContext, roles, designs: list[Design]) -> str | None:
    from plotwise.engine.headline import change_headline, compare_headline, proportion_headline
    from plotwise.engine.scoring import STAT_WORDS

    f = ctx.profile.fields
    share_like = bool(ctx.y and f[ctx.y].share_like)
    if roles.period and ctx.y:
        group = ctx.hue if roles.period == ctx.x else ctx.x
        if group and group != roles.period:
            return change_headline(ctx.working, group, roles.period, ctx.y, ctx.stat, share_like)
    vals = ctx.stats.get("values")
    if vals is None or ctx.hue:
        return None
    total = ctx.stats.get("share_total")
    if ctx.task == "proportion" and not (total and not total["adds_up"]):
        return proportion_headline(vals, ctx.y, share_like)
    if ctx.task == "proportion":  # shares of several answers: the largest, not a part of a whole
        top = vals.idxmax()
        return (f"'{top}' has the largest '{ctx.y}': {float(vals.max()):.1f}% (the shares add "
                f"to {total['sum']:.4g}%, so they are not parts of one whole).")
    if ctx.task == "compare":
        word = "" if ctx.stat == "value" else STAT_WORDS.get(ctx.stat, "")
        return compare_headline(vals, ctx.y, word)
    return None


def _distinct(designs: list[Design]) -> list[Design]:
    """Across tasks the same chart can come up twice (a slope chart for compare and for trend):
    keep the better-scored one."""
    best: dict[tuple, Design] = {}
    for d in designs:
        key = (d.kind, d.x, d.y, d.hue, d.facet, d.stat, bool(d.options.get("share")))
        if key not in best or d.score > best[key].score:
            best[key] = d
    return [d for d in designs if best[(d.kind, d.x, d.y, d.hue, d.facet, d.stat,
                                        bool(d.options.get("share")))] is d]


def _favour_richer(designs: list[Design]) -> None:
    """With no task stated, a design that relates more columns answers more of the question:
    scale scores by 0.85 + 0.15 × (columns used / most columns any design uses) (our own rule)."""
    most = max(len(d.columns) for d in designs)
    for d in designs:
        factor = 0.85 + 0.15 * len(d.columns) / most
        if factor < 1:
            d.score = round(d.score * factor, 4)
            d.reasons.append(f"no task given: relates {len(d.columns)} of the {most} columns the "
                             f"richest design relates → score × {factor:.2f} = {d.score:.2f}")


def advise(df, task: str | None = None, x=None, y=None, hue=None, *, agg: str | None = None,
           value_range=None, palette=None, cmap=None, top: int = 3) -> Advice:
    """Rank chart designs for ``task`` on ``df`` and flag what could mislead.

    task: one of compare, trend, proportion, correlate, distribution; None ranks across the
    tasks the columns support. x, y, hue: column names (inferred when left out). agg: how
    compare/trend aggregate rows per category (sum, mean, median, count). value_range: a
    (low, high) value axis you intend to use; plotwise checks it (e.g. for a truncated baseline).
    palette: your colours for groups (names or hex codes); cmap: your colormap (name or
    matplotlib Colormap) for lightness encodings. Both are drawn and checked (colour-vision
    deficiency, lightness).
    """
    data = df
    task = _check_task(task)
    if agg is not None and agg not in AGGS:
        raise PlotwiseError(f"unknown agg {agg!r}; use one of: {', '.join(AGGS)}.")
    value_range = _check_range(value_range)
    if palette is not None:
        from plotwise.engine.colour import to_rgb_array

        if isinstance(palette, str) or len(palette) < 2:
            raise PlotwiseError("palette must be a list of at least two colours, e.g. "
                                "['#0072B2', '#E69F00'].")
        to_rgb_array(palette)
        palette = [str(c) for c in palette]
    if cmap is not None:
        from plotwise.engine.colour import resolve_cmap

        resolve_cmap(cmap)
    if not isinstance(top, int) or top < 1:
        raise PlotwiseError("top must be a whole number ≥ 1.")
    from plotwise.sources.engines import EngineStats, open_source, profile_source

    src = open_source(df)
    exact = None
    if src is None:
        profile = profile_frame(df)
    else:  # an engine holds the data: profile there, work on a seeded sample here
        profile, df = profile_source(src)
        exact = EngineStats(src, profile)
    from plotwise.engine.candidates import check_roles

    check_roles(profile, x, y, hue)
    tasks = [task] if task else list(TASKS)
    designs: list[Design] = []
    wide: list[tuple[str, Hazard]] = []
    notes: list[str] = []
    errors = []
    headlines: dict[str, str | None] = {}
    for t in tasks:
        try:
            ds, hz, nt, hl = _advise_task(df, profile, t, x, y, hue, agg, value_range, palette,
                                          cmap, exact)
        except PlotwiseError as exc:
            if task:
                raise
            errors.append(f"{t}: {exc}")
            continue
        designs += ds
        headlines[t] = hl
        wide += [(t, h) for h in hz]
        notes += [f"{t}: {n}" if not task else n for n in nt]
    if not designs:
        raise PlotwiseError("no task fits these columns:\n  " + "\n  ".join(errors))
    if task is None:
        designs = _distinct(designs)
        _favour_richer(designs)
    ranked = rank(designs)
    shown = ([d for d in ranked if d.expressive] or ranked[:1])[:top]
    shown_tasks = {d.task for d in shown}
    merged: dict[tuple[str, str], Hazard] = {}
    found = [h for t, h in wide if t in shown_tasks] + [h for d in shown for h in d.hazards]
    for h in found:
        key = (h.code, h.message)
        if key in merged:  # the same finding for several shown designs: one entry, all kinds
            old = merged[key]
            merged[key] = replace(old, kinds=tuple(dict.fromkeys(old.kinds + h.kinds)))
        else:
            merged[key] = h
    hazards = list(merged.values())
    hazards.sort(key=lambda h: -SEVERITIES.index(h.severity))
    request = {"task": task, "x": x, "y": y, "hue": hue, "agg": agg, "value_range": value_range,
               "palette": palette, "cmap": cmap}
    headline = headlines.get(task if task else shown[0].task)
    if src is not None:
        notes.append(f"{src.engine_name} computed, over all {profile.rows:,} rows of the "
                     f"{src.kind}: " + "; ".join(src.computed) + ". Checks on single points "
                     "(overplotting, fits, modes) used a seeded sample.")
    return Advice(task=task, profile=profile, designs=ranked, hazards=hazards, notes=notes,
                  top=top, request=request, headline=headline, _df=df, _input=data)
