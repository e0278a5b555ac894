"""Histogram bin rules: Freedman–Diaconis and Sturges, as numpy.histogram_bin_edges implements
them, for the data in memory and for engine data (where the row count and range are exact and
the IQR comes from the seeded sample)."""

from __future__ import annotations

import numpy as np

from plotwise.engine.rules import THRESHOLDS


def _on_scale(values: np.ndarray, log: bool) -> np.ndarray:
    v = values[np.isfinite(values)]
    return np.log10(v[v > 0]) if log else v


def fd_width(iqr_values: np.ndarray, n: int) -> float | None:
    """Freedman & Diaconis (1981) bin width 2·IQR·n^(-1/3), the IQR taken from ``iqr_values``
    (all values, or a sample of them) and n the number of values binned; None when the IQR is 0."""
    if len(iqr_values) < 2:
        return None
    q25, q75 = np.percentile(iqr_values, [25, 75])
    return 2 * (q75 - q25) * n ** (-1 / 3) if q75 > q25 else None


def sturges_count(n: int) -> int:
    """Sturges (1926): ⌈log2 n⌉ + 1 bins."""
    return int(np.ceil(np.log2(n)) + 1) if n else 1


def choose_bins(values: np.ndarray, log: bool = False) -> tuple[str, str]:
    """A histogram bin rule for ``values`` and the sentence saying why.

    Freedman & Diaconis (1981), h = 2·IQR·n^(-1/3), resists outliers; when the IQR is zero or
    the rule gives an unreadable number of bins, Sturges (1926), k = ⌈log2 n⌉ + 1. Both as
    implemented by numpy.histogram_bin_edges."""
    v = _on_scale(values, log)
    where = " (on the log scale)" if log else ""
    n = len(v)
    # numpy's 'fd' rule: width h = 2·IQR·n^(-1/3), ⌈range / h⌉ equal bins (computed here from
    # the one percentile call rather than asking numpy to sort again).
    h = fd_width(v, n)
    if h is not None:
        k = int(np.ceil(np.ptp(v) / h))
        if THRESHOLDS["fd_min_bins"] <= k <= THRESHOLDS["fd_max_bins"]:
            return "fd", (f"bins: Freedman–Diaconis{where}, width 2·IQR·n^(-1/3) = {h:.3g} "
                          f"→ {k} bins, robust to outliers (Freedman & Diaconis 1981)")
    k = sturges_count(n)
    return "sturges", (f"bins: Sturges{where}, ⌈log2 n⌉ + 1 = {k} bins (Sturges 1926), since "
                       "Freedman–Diaconis gives too few or too many bins here")


def engine_edges(sample: np.ndarray, n: int, lo: float, hi: float, rule: str,
                 log: bool) -> tuple:
    """Histogram bins for engine data: (low, width, count, log). The Freedman–Diaconis width
    takes the IQR from the seeded sample and n, min and max exact from the engine; Sturges uses
    the exact n. At most 200 bins (common practice)."""
    if log:
        lo, hi = np.log10(lo), np.log10(hi)
    span = hi - lo
    h = fd_width(_on_scale(sample, log), n) if rule == "fd" else None
    k = int(np.ceil(span / h)) if (h and span > 0) else sturges_count(max(n, 1))
    k = int(min(max(k, 1), THRESHOLDS["engine_max_bins"]))
    width = span / k if span > 0 else 1.0
    # 12 significant digits: readable in the generated code, far below any drawn difference
    # (values a rounding puts outside the range are counted in the end bins).
    return float(f"{lo:.12g}"), float(f"{width:.12g}"), k, bool(log)
