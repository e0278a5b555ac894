"""Time axes: whether text holds dates, and whether the spacing between a column's distinct
time points is regular (its step and its gaps), recorded on the column's FieldProfile."""

from __future__ import annotations

import warnings
from typing import TYPE_CHECKING

import numpy as np
import pandas as pd

from plotwise.engine.rules import THRESHOLDS

if TYPE_CHECKING:
    from plotwise.engine.profile import FieldProfile

# Rows looked at when guessing whether strings are dates (a seeded sample, so profiles repeat).
DATE_SNIFF_ROWS = 200


def looks_like_dates(s: pd.Series) -> bool:
    sample = s.dropna()
    if len(sample) == 0:
        return False
    if len(sample) > DATE_SNIFF_ROWS:
        sample = sample.sample(DATE_SNIFF_ROWS, random_state=0)
    if not all(isinstance(v, str) for v in sample):
        return False
    if not all(any(ch.isdigit() for ch in v) and any(sep in v for sep in "-/:") for v in sample):
        return False
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        parsed = pd.to_datetime(sample, errors="coerce", format="ISO8601")
    return bool(parsed.notna().mean() >= 0.95)


def time_spacing(fp: FieldProfile, s: pd.Series) -> None:
    """Is the spacing between distinct time points regular? Records step and gaps."""
    ev = fp.evidence
    values = s.dropna()
    if isinstance(values.dtype, pd.PeriodDtype):
        values = values.dt.to_timestamp()
    if pd.api.types.is_numeric_dtype(values.dtype):  # integer years
        uniq = np.unique(values.to_numpy(dtype=float))
        fp.distinct = len(uniq)
        if len(uniq) < 3:
            fp.time_regular = len(uniq) == 2 or None
            return
        steps = np.diff(uniq)
        unit = "years"
    else:
        try:
            uniq = pd.DatetimeIndex(pd.unique(values)).sort_values()
        except (TypeError, ValueError):
            return
        fp.distinct = len(uniq)
        if len(uniq):
            fp.minimum = None
            fp.maximum = None
        if len(uniq) < 3:
            fp.time_regular = len(uniq) == 2 or None
            return
        try:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                freq = pd.infer_freq(uniq)
            freq = getattr(freq, "freqstr", freq)
        except (TypeError, ValueError):
            freq = None
        if freq:
            fp.time_regular = True
            fp.time_step = freq
            ev.append(f"{len(uniq)} time points, regular step {freq}")
            return
        steps = uniq.to_series().diff().dropna().dt.total_seconds().to_numpy() / 86400.0  # days
        unit = "days"
    step = float(np.median(steps))
    if step <= 0:
        return
    tol = THRESHOLDS["uneven_tolerance"]
    # Calendar months and years vary in length by a few percent; allow for that.
    slack = 0.1 if unit == "days" and step >= 27 else tol
    off = np.abs(steps - step) > slack * step
    fp.time_gaps = int(np.sum(steps > (1 + max(slack, 0.5)) * step))
    fp.time_regular = not bool(off.any())
    fp.time_step = f"{step:g} {unit}"
    if fp.time_regular:
        ev.append(f"{len(uniq)} time points, regular step {fp.time_step}")
    else:
        ev.append(
            f"{len(uniq)} time points, uneven spacing (usual step {fp.time_step}, "
            f"{int(off.sum())} steps differ, {fp.time_gaps} gaps)"
        )
