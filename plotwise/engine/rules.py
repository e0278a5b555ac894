"""Rankings, weights and thresholds as data tables.

Every table names its source beside it. "common practice" marks a rule of thumb with no single
published source; "from memory" marks a value recalled without the source at hand. The engine
(profile, designs, scoring, hazards) reads its numbers from here and nowhere else, so changing a
weight or threshold is a one-line edit with its citation next to it.
"""

from __future__ import annotations

from typing import Any

# --------------------------------------------------------------------------------------------
# Measurement levels and tasks
# --------------------------------------------------------------------------------------------
# The names themselves are the engine's vocabulary (plotwise.engine.vocab).
from plotwise.engine.vocab import LEVELS, TASKS  # noqa: E402,F401

# --------------------------------------------------------------------------------------------
# Perceptual channel rankings
# --------------------------------------------------------------------------------------------
# Mackinlay, J. (1986). Automating the design of graphical presentations of relational
# information. ACM Transactions on Graphics 5(2). Most to least accurate, by level.
# (Table as reproduced "after Mackinlay 1986"; the label "density" for grey level is from memory.)
MACKINLAY_1986 = {
    "quantitative": (
        "position", "length", "angle", "slope", "area", "volume", "density",
        "colour saturation", "colour hue", "texture", "connection", "containment", "shape",
    ),
    "ordinal": (
        "position", "density", "colour saturation", "colour hue", "texture", "connection",
        "containment", "length", "angle", "slope", "area", "volume", "shape",
    ),
    "nominal": (
        "position", "colour hue", "texture", "connection", "containment", "density",
        "colour saturation", "shape", "length", "angle", "slope", "area", "volume",
    ),
}

# Cleveland, W. S. & McGill, R. (1984). Graphical perception. JASA 79(387): position along a
# common scale, then along non-aligned scales, then length, direction and angle, then area,
# volume and curvature, then shading and saturation. The table above already orders these for
# quantities; NON_ALIGNED_FACTOR below applies the second step to stacked segments.

# The encoding channels a Design may use, mapped to the perceptual channel of the rankings above.
# Temporal data is ranked as ordinal data (it is ordered; its intervals are handled by data fit).
# "facet" (one panel per category) separates categories into regions: containment in Mackinlay's
# vocabulary (common practice to read it that way).
CHANNEL_TO_PERCEPTUAL = {
    "x position": "position",
    "y position": "position",
    "length": "length",
    "angle": "angle",
    "area": "area",
    "hue": "colour hue",
    "lightness": "density",
    "connection": "connection",
    "facet": "containment",
}

# How much each role weighs in a design's effectiveness: the measure the question is about counts
# most (common practice).
ROLE_WEIGHTS = {"measure": 0.6, "category": 0.25, "hue": 0.15, "facet": 0.15}

# Weights of the three parts of a design's score (common practice; tuned on the demo data and the
# open datasets in the tests, documented in DEVELOPERS.md).
SCORE_WEIGHTS = {"effectiveness": 0.5, "task_fit": 0.3, "data_fit": 0.2}

# A role the table above does not list weighs this much (common practice).
OTHER_ROLE_WEIGHT = 0.1
# A kind with no task-fit value for a task scores this task fit (common practice).
UNLISTED_TASK_FIT = 0.3
# Stacked segments start from shifting baselines: Cleveland & McGill (1984) rank judgements of
# position along non-aligned scales below aligned ones; such a length channel scores this share
# of an aligned one (the factor itself is common practice).
NON_ALIGNED_FACTOR = 0.85

# Data fit: each rule that finds the design ill-suited to the data multiplies its fit (1.0 =
# suits) by one of these factors, and says why in the reasons (common practice; the sizes of the
# factors order the problems by how badly they mislead: a shape the data do not have worst).
FIT_FACTORS = {
    "too_many_hues_severe": 0.35, "too_many_hues": 0.6,
    "crowded_axis": 0.5,
    "bunched_bars": 0.6, "dots_lose_ratio": 0.9,
    "flat_area": 0.6,
    "overlapping_means": 0.6,
    "modes_hidden_by_box": 0.6, "modes_hidden_by_means": 0.75,
    "influential_line": 0.6, "curved_line": 0.6, "weak_line": 0.7,
    "pie_slices": 0.4, "pie_sliver": 0.7,
    "dense_grid": 0.6, "small_heatmap": 0.7,
    "line_few_points": 0.4, "bars_many_times": 0.45, "bars_uneven_times": 0.6,
    "dots_many_times": 0.7,
    "overplotted_severe": 0.3, "overplotted": 0.75,
    "hexbin_few_points": 0.5, "binned_pairs": 0.8,
    "smooth_few_points": 0.35, "histogram_few_points": 0.6, "box_few_points": 0.5,
    "smoothing_integers": 0.55, "strip_many_points": 0.6, "single_group": 0.85,
}
# Sizes the data-fit rules compare with (common practice).
FIT_LIMITS = {
    "flat_area_spread": 0.5,  # an area filled from zero flattens changes smaller than this share
    "dense_grid_bars": 40,  # grouped bars beyond this many are a dense grid (common practice)
    "small_heatmap_cells": 9,  # fewer cells than this: plain bars read better
    "line_min_points": 3,  # a line needs this many time points to show a trend
    # With no task stated, fewer time points than this are left to compare (common practice).
    "inferred_trend_points": 8,
    "hexbin_min_points": 500,  # fewer points than this: draw each one
    "weak_r": 0.2,  # |Pearson r| below this: a fitted line suggests a relation barely there
    "box_min_points": 5,  # quartiles of fewer points are unstable
    "strip_max_points": 2000,  # a strip plot shows at most about this many points separately
}

# A design that fails Mackinlay's expressiveness criterion is kept, last, with its score scaled by
# this factor so it can never outrank an expressive design (common practice).
INEXPRESSIVE_FACTOR = 0.25

# With no task stated, a design relating fewer columns than the richest keeps at least this share
# of its score (our own rule: 0.85 + 0.15 × columns used / most columns used).
RICHER_BASE = 0.85

# How well each kind answers each task lives in each kind's record (plotwise.engine.kinds).

# --------------------------------------------------------------------------------------------
# Thresholds used by data fit and hazards
# --------------------------------------------------------------------------------------------
THRESHOLDS: dict[str, Any] = {
    # Miller (1956) "7 ± 2"; common practice: up to 7 hues comfortably, never more than about 10.
    "hues_warn": 7,
    "hues_severe": 10,
    # Pie: more than 5 parts, or a part under about 3% (common practice).
    "pie_max_parts": 5,
    "pie_min_share": 0.03,
    # Percent shares of one whole add to 100, allowing ±0.5 per part for rounding (common practice).
    "share_rounding_per_part": 0.5,
    # A density or violin on fewer points than this is mostly the kernel's shape (common practice).
    "few_points": 20,
    # |Sample skewness| above 1 is "highly skewed" (Bulmer, M. G. 1979, Principles of
    # Statistics, Dover; threshold from memory); on positive data it suggests a log axis.
    "skew_log": 1.0,
    # ...and only when the values span at least this ratio (largest / smallest), so a log axis
    # has orders of magnitude to spread out (common practice).
    "skew_span": 10.0,
    # Markers more transparent than this show their overlaps; no overplotting warning (common
    # practice).
    "see_through_alpha": 0.3,
    # Share of points hidden under others at the drawn marker size: warn / severe (common practice).
    "overplot_warn": 0.25,
    "overplot_severe": 0.6,
    # Standardised difference between group means below which their distributions overlap
    # heavily (Cohen's d < 0.5, a "medium" effect; Cohen 1988, from memory).
    "hidden_spread_d": 0.5,
    # A total above this is read as percentages (of 100), else as fractions (of 1) (common
    # practice).
    "percent_total_above": 5,
    # A step between time points longer than this many usual steps is a gap (common practice).
    "time_gap_steps": 1.5,
    # Strip plots scatter points this far (in category widths) either side of the axis; the
    # overplotting estimate uses the same jitter (our own layout).
    "strip_jitter": 0.25,
    # Share of rows left out for missing values above which the note becomes a warning
    # (common practice).
    "missing_warn": 0.05,
    # Time steps whose spacing varies by more than this fraction of the usual step are uneven
    # (common practice).
    "uneven_tolerance": 0.05,
    # Integer columns with at most this many distinct values are discrete (common practice).
    "discrete_levels": 15,
    # Integer codes 1..k with k at most this are read as ordinal codes (common practice).
    "ordinal_code_levels": 7,
    # A numeric column of at most this many whole numbers can be a category when named as x or
    # hue (cylinders 4/6/8); common practice.
    "few_integer_levels": 12,
    # Strings with at most this many distinct values are categories (common practice).
    "max_categories": 60,
    # Category labels longer than this turn bars horizontal (common practice).
    "long_label": 6,
    # Categories beyond this make a bar chart crowded (common practice).
    "max_bars": 30,
    # One axis of bars or dots shows at most this many categories: the largest, then one for
    # "all other" (common practice: beyond about two dozen labels nobody reads them all).
    "max_shown_categories": 25,
    # Scatter of more points than this switches the advice to hexbin (common practice).
    "scatter_max_points": 5000,
    # Large frames (our own documented sizes): profiling statistics that cost more than a pass
    # (distinct values, skew, integer checks, labels) come from a seeded sample of this many
    # rows when the frame is larger...
    "profile_sample": 200_000,
    # Engine data: the profile sample brings every column back, so wide tables get fewer rows:
    # at most this many cells (about 160 MB of numbers), never fewer rows than "draw_sample"
    # (our own memory budget).
    "engine_sample_cells": 20_000_000,
    # ...and designs that draw every point (scatter, strip, box, violin, density, ECDF) draw a
    # seeded random sample of "draw_sample" rows when the data has more than "draw_sample_above".
    "draw_sample": 20_000,
    "draw_sample_above": 50_000,
    # Histograms of more rows than this are binned with numpy first and drawn as steps.
    "prebin_above": 50_000,
    # Hexbins and 2-D histograms of more rows than this count a seeded sample of that many rows.
    "bin_sample": 100_000,
    # Freedman–Diaconis is used when it gives this many bins or between; else Sturges (common
    # practice: fewer hides the shape, more is noise at the panel's width).
    "fd_min_bins": 5,
    "fd_max_bins": 150,
    # Engine histograms: at most this many bins come back (common practice).
    "engine_max_bins": 200,
    # Small multiples: at most this many panels (common practice).
    "max_facets": 12,
    # ...each panel holding this many rows on average: a panel of one or two marks shows nothing
    # a colour could not (common practice).
    "facet_min_rows": 3,
    # Two palette colours closer than this CAM02-UCS ΔE, for normal or simulated colour-vision
    # deficient sight, are hard to tell apart as series (common practice; Okabe & Ito's palette
    # stays above 11 under all three simulations at full severity, tab10 falls to 1.6).
    "cvd_delta_e": 8.0,
    # A diverging colormap's two halves match in lightness: mean |J'(t) - J'(1-t)| below this
    # (our own rule; seaborn's vlag 0.4, matplotlib's RdBu 2.6, turbo far above).
    "diverging_asymmetry": 5.0,
    # A colormap's lightness is smoothed over this many of its 256 samples before its turns are
    # counted; a diverging map turns within this distance of its middle (our own rules).
    "lightness_smoothing": 9,
    "diverging_centre": 0.1,
    # A density peak counts as a mode when its prominence is at least this share of the highest
    # density (Gaussian KDE, Silverman 1986 bandwidth; our own documented threshold).
    "mode_prominence": 0.1,
    # A histogram bar counts as a peak when it stands this share of the tallest bar above its
    # surroundings (our own documented threshold).
    "bin_peak_prominence": 0.15,
    # A quadratic fit that explains this much more variance than a line: the relation curves
    # (common practice).
    "curve_r2_gain": 0.05,
    # |Spearman ρ| this much above |Pearson r|: monotone but not straight (common practice).
    "monotone_gap": 0.1,
    # Cook's distance above 1 marks an influential point (Cook & Weisberg 1982, from memory).
    "cooks_d": 1.0,
    # A point with leverage at least this fixes the fitted slope by itself (common practice).
    "leverage_alone": 0.9,
    # Values whose spread is under this fraction of their magnitude are bunched far from zero:
    # bars from zero would hide the differences, a dot plot shows them (common practice).
    "bunched_spread": 0.1,
}

# --------------------------------------------------------------------------------------------
# Surprises: what in the data deserves a second look (plotwise.engine.surprises)
# --------------------------------------------------------------------------------------------
SURPRISE_THRESHOLDS: dict[str, Any] = {
    # label-misfit: an item's k nearest neighbours on standardised axes (k about 5–7 is common
    # practice); flagged when at least this many of them carry another label.
    "misfit_k": 6,
    "misfit_others": 5,
    # ...and only while the flagged items are few: beyond this share of the items the groups
    # simply overlap, which the chart shows by itself (common practice).
    "misfit_max_share": 0.05,
    # group-outlier: modified z-score 0.6745·(x − median)/MAD above 3.5 (Iglewicz, B. &
    # Hoaglin, D. C. 1993, How to Detect and Handle Outliers, ASQC); groups of at least 5 values.
    "modified_z": 3.5,
    "modified_z_constant": 0.6745,
    "outlier_min_group": 5,
    "outlier_max_share": 0.05,  # more than this share far out: heavy tails, not a surprise
    # Above this many values a group's median and MAD come from a seeded sample of about this
    # many, drawn with replacement (every row of a group with at most "outlier_small_group"
    # rows is kept instead): a median of
    # 16,000 values is within about 0.01 SD of the group's, far below the 3.5 bar (common
    # practice); every row is still scored against them.
    "outlier_centre_sample": 200_000,
    "outlier_small_group": 2_000,
    # ...and on the log of positive values whose sample skewness passes this (common practice).
    "outlier_skew": 1.0,
    # level-shift: one change in mean found by least squares (the first step of binary
    # segmentation), kept when its BIC beats both a constant and a straight line by more than 10
    # ("very strong" evidence: Kass, R. E. & Raftery, A. E. 1995, JASA 90:773–795), with the
    # sample size discounted for lag-1 autocorrelation n·(1−φ)/(1+φ) so that a random walk's
    # wander is not read as a step (common practice); at least 12 time points, each side at
    # least 5% of them and 3.
    "shift_bic": 10.0,
    "shift_min_points": 12,
    # impossible-value: codes that stand for "missing" in many files (common practice), flagged
    # only when they lie far outside the other values; dates that stand for "unknown".
    "sentinels": (-99999, -9999, -999, -99, 999, 9999, 99999),
    "sentinel_dates": ("1900-01-01", "1970-01-01", "1899-12-30"),
    # duplicate-rows: whole-row repeats are reported only when chance explains few of them: the
    # pairs of rows expected to agree in every column by chance (columns taken as independent)
    # at most this share of the repeats found; one row per key is "expected" when at least this
    # share of keys have exactly one (common practice).
    "duplicate_chance": 0.1,
    "one_per_key": 0.9,
    # unit-mix: two density peaks of log10(values) this close to a whole number (1–3) of decades
    # apart, each holding at least this share of the values (common practice).
    "unit_decades_tolerance": 0.1,
    "unit_min_share": 0.05,
    "unit_min_values": 50,
}
# Names of measures that cannot be negative (common practice).
NON_NEGATIVE_NAME_HINTS = ("count", "quantity", "units", "passengers", "visits", "orders",
                           "trips", "tickets", "num", "number", "population", "deaths", "cases",
                           "births", "age", "weight", "height", "length", "width", "price",
                           "precipitation", "rainfall", "sold", "arrests", "crimes", "duration")

# Marker drawn by scatter designs: seaborn's default marker area, in points² (from memory: 36 in
# seaborn 0.13 via rcParams lines.markersize 6 → 6² = 36).
SCATTER_MARKER_AREA_PT2 = 36.0
# The panel the advice draws into, in inches (our own layout), used by drawing and by the
# overplotting estimate alike; about this share of it is the plotting area (the rest holds
# titles, labels and ticks).
PANEL_SIZE_IN = (4.6, 4.2)
# A category label needs about this much height (7-pt text with spacing) when labels are stacked
# on an axis; a panel grows to fit them (our own layout).
LABEL_HEIGHT_IN = 0.17
PANEL_DPI = 100
PANEL_PLOT_FRACTION = 0.75

# --------------------------------------------------------------------------------------------
# Colour
# --------------------------------------------------------------------------------------------
# Okabe, M. & Ito, K. (2008). Color Universal Design. Reordered so the first hues are the most
# distinct on white; black is kept last.
OKABE_ITO = ("#0072B2", "#E69F00", "#009E73", "#D55E00", "#CC79A7", "#56B4E9", "#F0E442", "#000000")
# Perceptually uniform colormaps (Smith & van der Walt 2015 for viridis; matplotlib's own docs for
# cividis and the diverging "vlag" of seaborn, whose ends are equally light - from memory).
SEQUENTIAL_CMAP = "viridis"
DIVERGING_CMAP = "vlag"
# Colours for the levels of an ordered scale: a sequential palette whose lightness rises with the
# order, or a diverging one when the scale has a neutral middle (Brewer 1994; seaborn's names).
ORDERED_PALETTE = "crest"
DIVERGING_PALETTE = "coolwarm"
# A single-series colour and the grey for context.
MAIN_COLOUR = OKABE_ITO[0]
CONTEXT_GREY = "#9A9A9A"

# Stevens, S. S. (1957/1975): perceived = k · stimulus^a.
STEVENS_EXPONENTS = {"length": 1.0, "area": 0.7, "volume": 0.6, "brightness": 0.33}

# Name fragments that mark an interval-scale quantity whose zero is arbitrary (common practice).
INTERVAL_NAME_HINTS = ("temp", "celsius", "fahrenheit", "latitude", "longitude", "lat", "lon",
                       "elevation", "zscore", "z_score")
# Name fragments of measures whose totals make sense (sum them); others are averaged
# (common practice). "volume" is not one: a flow or trading volume per period is compared by
# its average when periods differ in length.
SUM_NAME_HINTS = ("revenue", "sales", "count", "amount", "cost", "total", "quantity", "units",
                  "passengers", "visits", "orders", "spend", "income", "profit", "trips",
                  "tickets", "n", "num", "number", "admitted", "applicants")
# Name fragments of measures that describe each item, so that their totals mostly count the
# items (rates, ratios, averages, scores, sizes and other per-item quantities): averaged, never
# summed into shares of a whole (common practice).
NON_ADDITIVE_NAME_HINTS = ("rate", "ratio", "avg", "average", "mean", "median", "per", "score",
                           "index", "age", "expectancy", "life", "mpg", "gallon", "speed",
                           "density", "price", "length", "width", "depth", "height", "weight",
                           "mass", "bmi", "sleep", "grade", "rating", "pct", "percent", "share",
                           "fraction", "proportion", "horsepower", "acceleration", "displacement",
                           "wind", "pressure", "humidity", "temp", "latitude", "longitude",
                           "elevation", "altitude", "lat", "lon", "mm", "cm", "kg")
# Name fragments of measures whose totals make sense beyond the SUM_NAME_HINTS above
# (common practice).
ADDITIVE_NAME_HINTS = SUM_NAME_HINTS + (
    "population", "pop", "deaths", "cases", "births", "precipitation", "rainfall", "emissions",
    "invest", "investment", "capital", "sold", "crimes", "arrests", "employment", "employed",
    "net_generation", "generation", "kwh", "mwh", "gwh", "budget", "expenditure", "hours_worked")
# Name fragments of row identifiers and codes: never a measure (common practice).
IDENTIFIER_NAME_HINTS = ("id", "key", "code", "zip", "zipcode", "fips", "uuid", "index_",
                         "serial", "row", "record")
# Name fragments that mark a column of percentages or shares (common practice).
SHARE_NAME_HINTS = ("pct", "percent", "share", "%", "proportion", "fraction")
# Name fragments that mark a year stored as an integer (common practice).
YEAR_NAME_HINTS = ("year", "yr")
