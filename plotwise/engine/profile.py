"""Field profiling: each column's measurement level, the evidence for it, and the statistics the
scorer and the hazard checks need. Reads the caller's frame column by column; never copies or
changes it."""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd

from plotwise.engine.meaning import classify_measure, name_says
from plotwise.engine.rules import INTERVAL_NAME_HINTS, SHARE_NAME_HINTS, THRESHOLDS, YEAR_NAME_HINTS
from plotwise.engine.scales import MAX_NUMBER_TEXT_LEVELS, WAVE_NAME_HINTS, text_order
from plotwise.engine.timeaxis import looks_like_dates, time_spacing
from plotwise.errors import PlotwiseError

if TYPE_CHECKING:  # for the type checker only: the engine never imports engine-data code
    from plotwise.sources.base import Source


@dataclass
class FieldProfile:
    """One column as the engine sees it."""

    name: object
    label: str
    level: str  # nominal | ordinal | quantitative | temporal
    dtype: str
    rows: int
    missing: int
    distinct: int
    evidence: list[str] = field(default_factory=list)
    minimum: float | None = None
    maximum: float | None = None
    mean: float | None = None
    std: float | None = None
    skew: float | None = None
    infinite: int = 0
    zeros: int = 0  # rows holding exactly 0 (of the profiled rows)
    holds_bytes: bool = False  # Python bytes values: decoded as UTF-8 before use
    is_integer: bool = False
    is_discrete: bool = False
    zero_meaningful: bool | None = None
    signed: bool = False
    share_like: bool = False
    parse_dates: bool = False
    is_timedelta: bool = False
    order: tuple | None = None  # category order for ordinal data, when known
    top_labels: tuple = ()
    time_regular: bool | None = None
    time_step: str | None = None
    time_gaps: int = 0
    position: int = 0  # column position in the frame
    as_text: bool = False  # values are mixed Python objects, compared as their text
    labels: tuple = ()  # every distinct value seen (in the profile's rows), when there are few
    # What a numeric column means as a measure (plotwise.engine.meaning): additive,
    # non-additive, unknown, identifier, flag or constant; None for other levels.
    measure: str | None = None
    measure_why: str = ""  # the evidence for ``measure``, in words
    time_like: bool = False  # an ordered scale of time points (waves, years as text, months...)
    neutral_middle: bool = False  # an ordered scale with a neutral midpoint (diverging colours)

    @property
    def usable(self) -> int:
        """Rows with a usable value."""
        return self.rows - self.missing - self.infinite

    def summary(self) -> str:
        return f"{self.label}: {self.level} ({'; '.join(self.evidence)})"


@dataclass
class Profile:
    """The whole frame: row count and one FieldProfile per column, in column order.
    ``sample_rows`` is the size of the seeded sample costly statistics came from (None: all)."""

    rows: int
    fields: dict[str, FieldProfile]
    sample_rows: int | None = None
    source: Source | None = None  # a sources.Source when an engine holds the data; None: pandas

    def __getitem__(self, label: str) -> FieldProfile:
        return self.fields[label]

    def of_level(self, *levels: str) -> list[FieldProfile]:
        return [f for f in self.fields.values() if f.level in levels]


def few_integers(f: FieldProfile) -> bool:
    """A numeric column of a few whole numbers (cylinders 4/6/8, a wave 1/2): drawn with whole
    labels, and usable as ordered categories when the caller names it as x or hue."""
    return (f.level == "quantitative" and f.is_integer
            and 2 <= f.distinct <= THRESHOLDS["few_integer_levels"])


def check_frame(df) -> None:
    """Raise PlotwiseError for frames the engine cannot read."""
    if not isinstance(df, pd.DataFrame):
        raise PlotwiseError(
            f"plotwise cannot read a {type(df).__name__}; pass a pandas, Polars, Dask or Spark "
            "DataFrame, a PyArrow Table, a DuckDB relation, or the path of a Parquet or CSV file."
        )
    if isinstance(df.columns, pd.MultiIndex):
        raise PlotwiseError(
            "the frame has MultiIndex (hierarchical) column names, which plotwise does not "
            "support; flatten them first, e.g. df.columns = ['_'.join(map(str, c)) for c in df.columns]."
        )
    labels = [str(c) for c in df.columns]
    dupes = sorted({lab for lab in labels if labels.count(lab) > 1})
    if dupes:
        raise PlotwiseError(
            f"the frame has duplicate column names {dupes[:5]}; rename them so each is unique, "
            "e.g. df.columns = [f'{c}_{i}' for i, c in enumerate(df.columns)]."
        )
    if df.shape[0] == 0:
        raise PlotwiseError("the frame has no rows; advise on a frame with data in it.")
    if df.shape[1] == 0:
        raise PlotwiseError("the frame has no columns; advise on a frame with data in it.")


def sample_positions(n: int, k: int, seed: int = 0) -> np.ndarray:
    """k row positions out of n, seeded and sorted (the same rows every time)."""
    return np.sort(np.random.default_rng(seed).choice(n, size=k, replace=False))


def profile_frame(df: pd.DataFrame) -> Profile:
    """Profile every column of ``df``. Counts, missing values, min, max and mean are exact;
    on frames above THRESHOLDS['profile_sample'] rows, distinct values, labels, skew and the
    integer checks come from a seeded sample of that many rows (said in the evidence)."""
    check_frame(df)
    n = int(df.shape[0])
    k = THRESHOLDS["profile_sample"]
    take = sample_positions(n, k) if n > k else None
    fields = {}
    for position, name in enumerate(df.columns):
        full = df.iloc[:, position]
        fp = profile_series(full if take is None else full.iloc[take], name)
        if take is not None:
            _exact_over(fp, full, n, k)
        fp.position = position
        fields[str(name)] = fp
    return Profile(rows=n, fields=fields, sample_rows=None if take is None else k)


def _exact_over(fp: FieldProfile, full: pd.Series, n: int, k: int) -> None:
    """Replace the sample's counts by exact ones over the whole column (one cheap pass each)."""
    fp.rows = n
    fp.missing = int(full.isna().sum())
    if fp.level == "quantitative" and fp.minimum is not None and not fp.is_timedelta \
            and pd.api.types.is_numeric_dtype(full.dtype):
        v = full.to_numpy(dtype=float, na_value=np.nan)
        fp.infinite = int(np.isinf(v).sum())
        if fp.infinite:
            v = np.where(np.isinf(v), np.nan, v)
        if fp.missing + fp.infinite < n:
            fp.minimum, fp.maximum = float(np.nanmin(v)), float(np.nanmax(v))
            fp.mean = float(np.nanmean(v))
    if isinstance(full.dtype, pd.CategoricalDtype) or pd.api.types.is_bool_dtype(full.dtype):
        fp.distinct = _safe_nunique(full)
    fp.evidence.insert(1, f"distinct values, labels and shape from a seeded sample of {k:,} of "
                          f"{n:,} rows; counts, min and max exact")


def _safe_nunique(s: pd.Series) -> int:
    try:
        return int(s.nunique(dropna=True))
    except TypeError:  # unhashable values (lists, dicts) in an object column
        return int(s.dropna().astype(str).nunique())


def _all_labels(s: pd.Series) -> tuple:
    """Every distinct non-missing value, when there are few enough to be categories."""
    try:
        u = pd.unique(s.dropna())
    except TypeError:
        return ()
    return tuple(u) if len(u) <= THRESHOLDS["max_categories"] else ()


def _top_labels(s: pd.Series, k: int = 12) -> tuple:
    try:
        counts = s.value_counts(dropna=True)
    except TypeError:
        counts = s.dropna().astype(str).value_counts()
    return tuple(str(v) for v in counts.index[:k])


def has_hint(label: str, hints) -> bool:
    low = label.lower()
    tokens = [t for t in "".join(ch if ch.isalnum() else " " for ch in low).split() if t]
    for hint in hints:
        if not hint.isalnum():
            if hint in low:
                return True
        elif hint in tokens or (len(hint) > 3 and hint in low):
            return True
    return False


def profile_series(s: pd.Series, name) -> FieldProfile:
    label = str(name)
    rows = int(len(s))
    missing = int(s.isna().sum())
    dtype = s.dtype
    fp = FieldProfile(name=name, label=label, level="nominal", dtype=str(dtype), rows=rows,
                      missing=missing, distinct=_safe_nunique(s))
    ev = fp.evidence
    ev.append(f"dtype {dtype}")
    if missing:
        ev.append(f"{missing} of {rows} missing")

    if isinstance(dtype, pd.CategoricalDtype):
        if dtype.ordered:
            fp.level = "ordinal"
            fp.order = tuple(dtype.categories)
            ev.append("ordered Categorical")
            scale = text_order(tuple(str(c) for c in dtype.categories))
            fp.time_like = bool(scale and scale.time)
            fp.neutral_middle = bool(scale and scale.neutral_middle)
        else:
            fp.level = "nominal"
            ev.append("unordered Categorical")
        fp.top_labels = _top_labels(s)
        ev.append(f"{fp.distinct} distinct values")
        return fp

    if pd.api.types.is_bool_dtype(dtype):
        fp.level = "nominal"
        fp.top_labels = _top_labels(s)
        ev.append("true/false values")
        return fp

    if pd.api.types.is_datetime64_any_dtype(dtype) or isinstance(dtype, pd.PeriodDtype):
        fp.level = "temporal"
        ev.append("date/time values")
        time_spacing(fp, s)
        return fp

    if pd.api.types.is_timedelta64_dtype(dtype):
        fp.is_timedelta = True
        values = s.dropna().dt.total_seconds().to_numpy(dtype=float)
        ev.append("durations (drawn in seconds)")
        _quantitative(fp, values)
        return fp

    if pd.api.types.is_complex_dtype(dtype):  # never drop the imaginary part silently
        fp.as_text = True
        _text(fp, s)
        ev.append("complex numbers: compared as text; for a measure, draw np.abs() or .real")
        return fp

    if pd.api.types.is_numeric_dtype(dtype):
        values = _numeric_values(s)
        _quantitative(fp, values)
        return fp

    _text(fp, s)
    return fp


def _text(fp: FieldProfile, s: pd.Series) -> None:
    """Strings and mixed objects: dates held as text, or labels."""
    ev = fp.evidence
    fp.top_labels = _top_labels(s)
    fp.labels = _all_labels(s)
    if pd.api.types.is_object_dtype(s.dtype):
        kinds = {type(v).__name__ for v in s.dropna().head(1000)}
        if "bytes" in kinds:
            fp.as_text = fp.holds_bytes = True
            ev.append("bytes: decoded as UTF-8 (bytes that are not UTF-8 shown as �)")
        elif kinds - {"str"}:
            fp.as_text = True
            ev.append(f"mixed Python values ({', '.join(sorted(kinds))}): compared as text")
    if looks_like_dates(s):
        fp.level = "temporal"
        fp.parse_dates = True
        ev.append("text that parses as dates")
        time_spacing(fp, pd.to_datetime(s, errors="coerce", format="ISO8601"))
        return
    order = text_order(fp.labels)
    if order is not None:
        fp.level = "ordinal"
        fp.order = order.labels
        fp.time_like = order.time
        fp.neutral_middle = order.neutral_middle
        ev.append(f"labels of an ordered scale ({order.scale}): "
                  + " < ".join(map(str, order.labels[:8])))
        return
    fp.level = "nominal"
    ev.append(f"{fp.distinct} distinct labels")
    if fp.distinct > THRESHOLDS["max_categories"]:
        ev.append(
            f"more than {THRESHOLDS['max_categories']} labels: identifier-like, not used as a category"
        )


def _numeric_values(s: pd.Series) -> np.ndarray:
    """Finite and infinite float values of a numeric column (nullable types included), no NaN."""
    v = s.dropna()
    try:
        arr = v.to_numpy(dtype=float, na_value=np.nan)
    except (TypeError, ValueError):
        arr = pd.to_numeric(v, errors="coerce").to_numpy(dtype=float, na_value=np.nan)
    return arr[~np.isnan(arr)]


def _quantitative(fp: FieldProfile, values: np.ndarray) -> None:
    ev = fp.evidence
    finite = values[np.isfinite(values)]
    fp.infinite = int(len(values) - len(finite))
    if fp.infinite:
        ev.append(f"{fp.infinite} infinite values left out")
    fp.level = "quantitative"
    if len(finite) == 0:
        ev.append("no finite values")
        return
    fp.minimum = float(finite.min())
    fp.maximum = float(finite.max())
    fp.mean = float(finite.mean())
    fp.std = float(finite.std(ddof=1)) if len(finite) > 1 else 0.0
    if len(finite) > 2 and fp.std > 0:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            fp.skew = float(pd.Series(finite).skew())
    fp.is_integer = bool(np.all(np.mod(finite, 1) == 0))
    fp.zeros = int(np.count_nonzero(finite == 0))
    levels = THRESHOLDS["discrete_levels"]
    fp.is_discrete = fp.is_integer and fp.distinct <= levels
    label = fp.label
    # Integer years stored as numbers.
    if fp.is_integer and has_hint(label, YEAR_NAME_HINTS) and 1000 <= fp.minimum and fp.maximum <= 2999:
        fp.level = "temporal"
        ev.append(f"integer years {int(fp.minimum)}..{int(fp.maximum)} (name says year)")
        time_spacing(fp, pd.Series(np.unique(finite)))
        return
    uniq = np.unique(finite)
    # A few integer waves, rounds or visits: time points in their numeric order.
    if (fp.is_integer and 2 <= len(uniq) <= MAX_NUMBER_TEXT_LEVELS
            and name_says(label, WAVE_NAME_HINTS)):
        fp.level = "ordinal"
        fp.time_like = True
        fp.order = tuple(int(u) for u in uniq)
        ev.append(f"{len(uniq)} integer time points (name says {name_says(label, WAVE_NAME_HINTS)!r})")
        return
    # Small integer codes 1..k: a rating or rank, read as ordinal. (Codes from 0 are more often
    # counts - children, defects - and stay quantitative.)
    k = THRESHOLDS["ordinal_code_levels"]
    if (fp.is_integer and 3 <= len(uniq) <= k and uniq[0] == 1
            and np.array_equal(uniq, np.arange(uniq[0], uniq[0] + len(uniq)))
            and fp.rows >= 3 * len(uniq)):
        fp.level = "ordinal"
        fp.order = tuple(int(u) for u in uniq)
        ev.append(f"integer codes {int(uniq[0])}..{int(uniq[-1])} with many ties (a rating or rank)")
        return
    fp.measure, fp.measure_why = classify_measure(fp, finite)
    ev.append(f"{fp.distinct} distinct numbers from {fp.minimum:.4g} to {fp.maximum:.4g}")
    ev.append(f"{fp.measure} measure ({fp.measure_why})")
    if fp.is_discrete:
        ev.append(f"integers with only {fp.distinct} levels (discrete)")
    if has_hint(label, INTERVAL_NAME_HINTS):
        fp.zero_meaningful = False
        fp.signed = fp.minimum < 0 < fp.maximum
        ev.append("name suggests an interval scale: zero is arbitrary")
    elif fp.minimum >= 0:
        fp.zero_meaningful = True
        ev.append("all values ≥ 0: an amount or count, zero is meaningful")
    else:
        fp.zero_meaningful = True
        fp.signed = fp.maximum > 0
        ev.append("signed values: zero is the natural midpoint")
    fp.share_like = fp.minimum >= 0 and has_hint(label, SHARE_NAME_HINTS)
    if fp.skew is not None and abs(fp.skew) >= 1:
        ev.append(f"skewness {fp.skew:.2f}")
