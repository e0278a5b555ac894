"""The pipeline: ``advise()`` runs the stages in order — open the data (pandas, or an engine
through plotwise.sources), profile it, choose the columns, make the candidate designs, compute
the data facts, plan each design's drawing, score, check for hazards, write the headline — and
returns an Advice. Each stage lives in its own module of plotwise.engine; this module only
connects them (and hands the engine the drawing side's colour helpers)."""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from plotwise.advice import Advice
from plotwise.drawing import colours as drawing_colours
from plotwise.engine.candidates import candidates
from plotwise.engine.checking import run_checks
from plotwise.engine.design import Design, Roles
from plotwise.engine.hazards import Hazard, HazardContext, by_severity
from plotwise.engine.meaning import measure_reason
from plotwise.engine.memo import memo_get
from plotwise.engine.plan import histogram_bins, mark_single_values, plan_design
from plotwise.engine.profile import Profile, profile_frame
from plotwise.engine.roles import check_roles, choose_roles
from plotwise.engine.scoring import STAT_WORDS, rank, score_design
from plotwise.engine.stats import design_stats
from plotwise.engine.surprises import Question, find_surprises
from plotwise.engine.vocab import AGGS, TASKS
from plotwise.engine.working import working_frame
from plotwise.errors import PlotwiseError


@dataclass
class Request:
    """What the caller asked for, checked."""

    task: str | None
    x: object = None
    y: object = None
    hue: object = None
    agg: str | None = None
    value_range: tuple[float, float] | None = None
    palette: list[str] | None = None
    cmap: object = None
    top: int = 3
    cmap_name: str | None = field(default=None, repr=False)
    cmap_rgb: object = field(default=None, repr=False)

    def as_dict(self) -> dict:
        return {"task": self.task, "x": self.x, "y": self.y, "hue": self.hue, "agg": self.agg,
                "value_range": self.value_range, "palette": self.palette, "cmap": self.cmap}


@dataclass
class TaskResult:
    designs: list[Design]
    hazards: list[Hazard]
    notes: list[str]
    headline: str | None


def check_task(task) -> str | None:
    if task is None:
        return None
    if not isinstance(task, str) or task.strip().lower() not in TASKS:
        raise PlotwiseError(f"unknown task {task!r}; use one of: {', '.join(TASKS)} "
                            "(or leave it out to rank across all of them).")
    return task.strip().lower()


def check_range(value_range):
    if value_range is None:
        return None
    try:
        lo, hi = (float(v) for v in value_range)
    except (TypeError, ValueError):
        raise PlotwiseError("value_range must be two numbers (low, high), e.g. (0, 100).") from None
    if not (np.isfinite(lo) and np.isfinite(hi) and lo < hi):
        raise PlotwiseError(f"value_range {value_range!r} must be two finite numbers, low < high.")
    return lo, hi


def check_request(task, x, y, hue, agg, value_range, palette, cmap, top) -> Request:
    r = Request(check_task(task), x, y, hue, agg, check_range(value_range), None, cmap, top)
    if agg is not None and agg not in AGGS:
        raise PlotwiseError(f"unknown agg {agg!r}; use one of: {', '.join(AGGS)}.")
    if palette is not None:
        if isinstance(palette, str) or len(palette) < 2:
            raise PlotwiseError("palette must be a list of at least two colours, e.g. "
                                "['#0072B2', '#E69F00'].")
        drawing_colours.to_hex_list(palette)
        r.palette = [str(c) for c in palette]
    if cmap is not None:
        r.cmap_name = drawing_colours.resolve_cmap(cmap).name
        r.cmap_rgb = drawing_colours.cmap_rgb(cmap)
    if not isinstance(top, int) or top < 1:
        raise PlotwiseError("top must be a whole number ≥ 1.")
    return r


def _overall_stat(designs: list[Design]) -> str:
    """The statistic the data facts are computed for: the first design's per-group statistic."""
    stat = designs[0].stat if designs[0].stat not in ("distribution", "raw") else "sum"
    for d in designs:
        if d.stat not in ("distribution", "raw", "difference"):
            return d.stat
    return stat


def advise_task(df, profile: Profile, task: str, req: Request, exact=None) -> TaskResult:
    """One task: roles → candidates → data facts → plan → score → hazards → headline."""
    roles = choose_roles(profile, task, req.x, req.y, req.hue, df, inferred=req.task is None)
    designs = candidates(profile, task, roles, req.agg)
    if not designs:
        raise PlotwiseError(f"no design can show {task} for these columns.")
    if req.agg is None:
        mark_single_values(df, profile, designs, exact)
    stat = _overall_stat(designs)
    working = working_frame(df, profile, [c for c in dict.fromkeys(
        [roles.x, roles.y, roles.hue, roles.period]) if c])
    stats = design_stats(df, profile, task, roles.x, roles.y, roles.hue, stat, w=working,
                         exact=exact)
    if stats.points == 0:
        cols = ", ".join(repr(c) for c in dict.fromkeys([roles.x, roles.y, roles.hue]) if c)
        raise PlotwiseError(f"no row has values in all of {cols}; nothing to draw for {task}.")
    bins = histogram_bins(task, profile, working, roles.x)
    for d in designs:
        extra = plan_design(d, profile, stats, df=df, working=working, bins=bins, exact=exact,
                            palette=req.palette, cmap_name=req.cmap_name)
        score_design(d, profile, stats)
        why = measure_reason(profile.fields[d.y], d.stat, req.agg) if d.y in profile.fields \
            else None
        d.reasons[1:1] = extra + ([why] if why else [])
        if roles.notes:
            d.reasons.append("columns chosen by plotwise: " + "; ".join(roles.notes))
    ctx = HazardContext(df=df, profile=profile, task=task, x=roles.x, y=roles.y, hue=roles.hue,
                        stat=stat, stats=stats, value_range=req.value_range,
                        palette=req.palette, cmap=req.cmap, cmap_rgb=req.cmap_rgb,
                        colours=drawing_colours.drawn_colours, working=working)
    wide = run_checks(ctx, designs)
    return TaskResult(designs, wide, roles.notes, headline_for(ctx, roles))


def headline_for(ctx: HazardContext, roles: Roles) -> str | None:
    """One sentence for when a single number says it better than a chart."""
    from plotwise.engine.headline import change_headline, compare_headline, proportion_headline

    f = ctx.profile.fields
    share_like = bool(ctx.y and f[ctx.y].share_like)
    if roles.period and ctx.y:
        group = ctx.hue if roles.period == ctx.x else ctx.x
        if group and group != roles.period:
            return change_headline(ctx.working, group, roles.period, ctx.y, ctx.stat, share_like)
    vals = ctx.stats.values
    if vals is None or ctx.hue:
        return None
    total = ctx.stats.share_total
    if ctx.task == "proportion" and not (total and not total.adds_up):
        return proportion_headline(vals, ctx.y, share_like)
    if ctx.task == "proportion":  # shares of several answers: the largest, not a part of a whole
        top = vals.idxmax()
        return (f"'{top}' has the largest '{ctx.y}': {float(vals.max()):.1f}% (the shares add "
                f"to {total.sum:.4g}%, so they are not parts of one whole).")
    if ctx.task == "compare":
        word = "" if ctx.stat == "value" else STAT_WORDS.get(ctx.stat, "")
        return compare_headline(vals, ctx.y, word)
    return None


def _same_chart(d: Design) -> tuple:
    return (d.kind, d.x, d.y, d.hue, d.facet, d.stat, d.options.share)


def distinct(designs: list[Design]) -> list[Design]:
    """Across tasks the same chart can come up twice (a slope chart for compare and for trend):
    keep the better-scored one."""
    best: dict[tuple, Design] = {}
    for d in designs:
        key = _same_chart(d)
        if key not in best or d.score > best[key].score:
            best[key] = d
    return [d for d in designs if best[_same_chart(d)] is d]


def favour_richer(designs: list[Design]) -> None:
    """With no task stated, a design that relates more columns answers more of the question:
    scale scores by 0.85 + 0.15 × (columns used / most columns any design uses) (our own rule)."""
    from plotwise.engine.rules import RICHER_BASE

    most = max(len(d.columns) for d in designs)
    for d in designs:
        factor = RICHER_BASE + (1 - RICHER_BASE) * len(d.columns) / most
        if factor < 1:
            d.score = round(d.score * factor, 4)
            d.reasons.append(f"no task given: relates {len(d.columns)} of the {most} columns the "
                             f"richest design relates → score × {factor:.2f} = {d.score:.2f}")


def merged_hazards(wide: list[tuple[str, Hazard]], shown: list[Design]) -> list[Hazard]:
    """The hazards of the shown designs and their tasks, one entry per finding, worst first."""
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
    return by_severity(list(merged.values()))


def open_data(df):
    """(profile, frame to work on, exact engine statistics or None, source or None)."""
    from plotwise.sources import EngineStats, open_source, profile_source

    src = open_source(df)
    if src is None:
        return profile_frame(df), df, None, None
    profile, sample = profile_source(src)  # an engine holds the data: work on a seeded sample
    return profile, sample, EngineStats(src, profile), src


def advise(df=None, task: str | None = None, x=None, y=None, hue=None, *, data=None,
           agg: str | None = None, value_range=None, palette=None, cmap=None,
           top: int = 3) -> Advice:
    """Rank chart designs for ``task`` on ``df`` and flag what could mislead.

    task: one of compare, trend, proportion, correlate, distribution; None ranks across the
    tasks the columns support. x, y, hue: column names (inferred when left out). agg: how
    compare/trend aggregate rows per category (sum, mean, median, count). value_range: a
    (low, high) value axis you intend to use; plotwise checks it (e.g. for a truncated baseline).
    palette: your colours for groups (names or hex codes); cmap: your colormap (name or
    matplotlib Colormap) for lightness encodings. Both are drawn and checked (colour-vision
    deficiency, lightness).
    """
    if data is not None:  # advise(data=df, ...), as in seaborn and pandas' plotting
        if df is not None:
            raise PlotwiseError("give the data once: advise(df, ...) or advise(data=df, ...).")
        df = data
    if df is None:
        raise PlotwiseError("advise() needs the data: advise(df, task, x=..., y=...).")
    # Huge or infinite values overflow in intermediate sums; the engine handles the non-finite
    # results itself, so numpy's RuntimeWarnings would only be noise in the user's notebook.
    with np.errstate(all="ignore"):
        return _advise(df, task, x, y, hue, agg, value_range, palette, cmap, top)


def _advise(df, task, x, y, hue, agg, value_range, palette, cmap, top) -> Advice:
    req = check_request(task, x, y, hue, agg, value_range, palette, cmap, top)
    profile, frame, exact, src = memo_get(("opened",), lambda: open_data(df), about=df)
    check_roles(profile, x, y, hue)
    designs: list[Design] = []
    wide: list[tuple[str, Hazard]] = []
    notes: list[str] = []
    errors = []
    headlines: dict[str, str | None] = {}
    for t in [req.task] if req.task else list(TASKS):
        try:
            res = advise_task(frame, profile, t, req, exact)
        except PlotwiseError as exc:
            if req.task:
                raise
            errors.append(f"{t}: {exc}")
            continue
        designs += res.designs
        headlines[t] = res.headline
        wide += [(t, h) for h in res.hazards]
        notes += [f"{t}: {n}" if not req.task else n for n in res.notes]
    if not designs:
        raise PlotwiseError("no task fits these columns:\n  " + "\n  ".join(errors))
    if req.task is None:
        designs = distinct(designs)
        favour_richer(designs)
    ranked = rank(designs)
    shown = ([d for d in ranked if d.expressive] or ranked[:1])[:top]
    # Surprises name rows: on engine data only when every row came back (rows then count from
    # 0 in the engine's order, which is the file's order for DuckDB scans).
    whole = src is None or profile.sample_rows is None
    surprises = find_surprises(frame, profile, [
        Question(d.task, d.x, d.y, d.hue or d.facet, d.stat) for d in shown]) if whole else []
    if src is not None:
        notes.append(f"{src.engine_name} computed, over all {profile.rows:,} rows of the "
                     f"{src.kind}: " + "; ".join(src.computed) + ". Checks on single points "
                     "(overplotting, fits, modes) used a seeded sample." + (
                         " Rows named in surprises count from 0 in the engine's row order."
                         if whole else " Surprises (outliers, misfit labels, repeats) are "
                         "looked for only when all rows fit in memory: bring the columns in "
                         "question into pandas for them."))
    return Advice(task=req.task, profile=profile, designs=ranked,
                  hazards=merged_hazards(wide, shown), notes=notes, top=top,
                  request=req.as_dict(), headline=headlines.get(req.task or shown[0].task),
                  surprises=surprises,
                  _df=frame, _input=df, _advise=advise)
