"""Code generation: a short pandas + seaborn + matplotlib snippet for each design.

The snippet is the single source of truth for how a design is drawn: plotwise's own drawing
(render.py) executes the same body against the caller's frame, so what a user copies is exactly
what they saw. Every user string (column names, labels) enters the code through ``repr``, so it
comes out as an inert literal whatever it contains. The kinds' generators are in
generators_groups and generators_rows."""

from __future__ import annotations

from plotwise.drawing import generators_rows  # noqa: F401  (registers every kind's generator)
from plotwise.drawing.snippet import (
    GENERATORS,
    Ctx,
    column_expr,
    engine_bins,
    engine_count_name,
    engine_keys,
    short,
)
from plotwise.engine.design import CODE_WRITERS, Design
from plotwise.engine.kinds import KINDS, engine_mode
from plotwise.engine.profile import Profile, few_integers

_missing = sorted(set(KINDS) - set(GENERATORS))
if _missing:  # a kind in the registry without a generator would fail only when drawn
    raise ImportError(f"plotwise.drawing has no generator for the chart kind(s) {_missing}")


def engine_queries(design: Design, profile: Profile, frame: str) -> list[tuple[str, str]]:
    """Engine data: the query a design's snippet runs in the engine, as (variable, expression):
    the per-group rows (``agg``), the bin counts (``counts``) or the sampled rows (``d``)."""
    from plotwise.sources.queries import bins_expr, grouped_expr, sample_expr

    src = profile.source
    mode = engine_mode(design)
    n = design.options.complete_rows
    quantitative = [c for c in design.columns if profile.fields[c].level == "quantitative"]
    if mode == "bins":
        lo, width, k, log = engine_bins(design)
        return [("counts", bins_expr(src, design.x, lo, width, k, log, frame))]
    if mode == "groups":
        keys = engine_keys(design)
        measure = None if len(keys) == len(design.columns) else design.y
        stat = "median" if design.stat == "median" else "sum"
        return [("agg", grouped_expr(src, keys, measure, stat, finite=measure in quantitative,
                                     frame=frame))]
    k = (design.options.engine_sample or n)
    return [("d", sample_expr(src, design.columns, k, n, complete=not design.options.matrix,
                              finite=tuple(quantitative), frame=frame))]


def query_line(name: str, expr: str) -> str:
    """``name = expr``, the expression split into one call a line when long."""
    from plotwise.sources.queries import chained

    return f"{name} = " + chained(expr, len(name) + 3)


def engine_lines(design: Design, profile: Profile, frame: str) -> list[str]:
    """Engine data: the query that runs in the engine, then ``d`` (or ``counts``) in pandas."""
    name = profile.source.engine_name
    mode = engine_mode(design)
    n = design.options.complete_rows
    (var, expr), = engine_queries(design, profile, frame)
    query = query_line(var, expr)
    if mode == "bins":
        _, _, k, _ = engine_bins(design)
        return [f"# {name} counts all {n:,} rows into {k} bins; only the counts come back.",
                query, f"counts = counts.reindex(range({k}), fill_value=0).to_numpy()"]
    if mode == "groups":
        keys = engine_keys(design)
        measure = None if len(keys) == len(design.columns) else design.y
        cnt = engine_count_name(design)
        lines = [f"# {name} computes one row per group from all {n:,} rows; only those come back.",
                 query]
        items = [f"{c!r}: {column_expr(profile.fields[c], 'agg')}" for c in keys]
        if measure:
            items.append(f"{measure!r}: agg[{measure!r}].astype(\"float64\")")
        items.append(f"{cnt!r}: agg[{cnt!r}]")
        return lines + [f"d = pd.DataFrame({{{', '.join(items)}}}, copy=False).dropna()"]
    k = (design.options.engine_sample or n)
    what = (f"a random sample of about {k:,} of the {n:,} complete rows" if n > k
            else f"all {n:,} complete rows")
    picked = ", ".join(f"{c!r}: {column_expr(profile.fields[c], 'd')}" for c in design.columns)
    drop = "" if design.options.matrix else ".dropna()"
    return [f"# {name} picks {what}; only those come back.", query,
            f"d = pd.DataFrame({{{picked}}}, copy=False){drop}"]


def group_lines(design: Design, profile: Profile) -> list[str]:
    """A few whole numbers that name groups (x of a comparison, a hue, a facet) become whole
    numbers again, so they are labelled 4, not 4.0."""
    named = [design.hue, design.facet] + ([design.x] if design.task in ("compare", "proportion")
                                          else [])
    return [f'd[{col!r}] = d[{col!r}].round().astype("Int64")'
            for col in dict.fromkeys(c for c in named if c)
            if col in profile.fields and whole_codes(profile.fields[col])
            and col in design.columns]


def whole_codes(f) -> bool:
    """A few whole numbers, or an ordered scale of integer codes (ratings 1..5)."""
    return few_integers(f) or (f.level == "ordinal" and bool(f.order) and all(
        isinstance(o, int) for o in f.order))


def working_lines(design: Design, profile: Profile, frame: str) -> list[str]:
    """Build ``d``: the used columns under their labels, converted, missing rows dropped."""
    if profile.source is not None:
        lines = engine_lines(design, profile, frame)
        for col in design.options.log_columns:
            if engine_mode(design) == "rows":
                lines.append(f"d = d[d[{col!r}] > 0]")
        return lines + group_lines(design, profile)
    items = ", ".join(f"{label!r}: {column_expr(profile.fields[label], frame)}"
                      for label in design.columns)
    # A correlation matrix uses every pairwise-complete row; other designs drop incomplete rows.
    drop = "" if design.options.matrix else ".dropna()"
    lines = [f"d = pd.DataFrame({{{items}}}, copy=False){drop}"]
    if design.options.log_columns:
        for col in design.options.log_columns:
            lines.append(f"d = d[d[{col!r}] > 0]")
    if design.options.sample:
        big, k = design.options.sample
        lines += [f"if len(d) > {big}:  # draw a seeded random sample of the rows",
                  "    d = d.iloc[np.sort(np.random.default_rng(0).choice(len(d), "
                  f"size={k}, replace=False))]"]
    return lines + group_lines(design, profile)


def legend_lines(design: Design, ax: str = "ax") -> list[str]:
    """A colour legend goes outside the data, to the right of the axes."""
    if not design.hue:
        return []
    return [f"if {ax}.get_legend() is not None:  # the legend outside the data",
            f"    sns.move_legend({ax}, \"upper left\", bbox_to_anchor=(1, 1), frameon=False)"]


NOTE_LINE = 56  # characters of 7-point text that fit above a panel narrowed by a colour bar


def note_lines(design: Design, ax: str = "ax") -> list[str]:
    note = design.options.note
    if not note:
        return []
    if len(note) > NOTE_LINE:  # on two lines: a long note overran a narrow panel's left edge
        import textwrap

        note = "\n".join(textwrap.wrap(note, (len(note) + 1) // 2 + 8))
    return [f"{ax}.annotate({note!r}, xy=(1, 1.01), xycoords=\"axes fraction\", ha=\"right\", "
            "va=\"bottom\", fontsize=7, color=\"#555555\")"]


def body_lines(design: Design, profile: Profile, frame: str = "df") -> list[str]:
    """The drawing body: expects ``ax`` (a matplotlib Axes) and the caller's frame."""
    lines = working_lines(design, profile, frame)
    if design.facet is None:
        return (lines + GENERATORS[design.kind](Ctx(design, profile)) + legend_lines(design)
                + note_lines(design))
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
    "import matplotlib as mpl",
    "import matplotlib.dates as mdates",
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
        from plotwise.sources.base import open_code

        header = HEADER[:-1] + open_code(profile.source, name) + [""]
    lines = header + [
        f"# {short(design.summary(), 90)}",
        "fig, ax = plt.subplots(figsize=(6, 4), layout=\"constrained\")",
    ] + body_lines(design, profile, name) + [
        f"fig.suptitle({title!r})",
        "plt.show()",
    ]
    return "\n".join(lines) + "\n"


CODE_WRITERS[:] = [design_code]
