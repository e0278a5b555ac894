"""Distribution shape: how many modes a sample has, and whether a histogram's peaks depend on
its bin width. Engine code: numbers in, numbers out."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from plotwise.engine.rules import THRESHOLDS

# At most this many values feed the density estimate (a seeded sample above it).
MODE_SAMPLE = 5000


def _finite(values) -> np.ndarray:
    v = np.asarray(values, dtype=float)
    return v[np.isfinite(v)]


def kde_modes(values, log: bool = False) -> int:
    """Number of modes of a Gaussian kernel density estimate with Silverman's (1986)
    rule-of-thumb bandwidth, counting local maxima whose prominence is at least
    THRESHOLDS['mode_prominence'] of the highest density (our own documented threshold)."""
    from scipy.signal import find_peaks
    from scipy.stats import gaussian_kde

    v = np.asarray(values, dtype=float)
    if len(v) > MODE_SAMPLE:  # sample first: the transforms below then touch few values
        v = v[np.random.default_rng(0).choice(len(v), MODE_SAMPLE, replace=False)]
    v = _finite(v)
    if log:
        v = np.log10(v[v > 0])
    if len(v) < THRESHOLDS["few_points"] or np.ptp(v) == 0:
        return 1
    if len(np.unique(v)) < 5:
        return 1
    v = v / np.max(np.abs(v))  # modes do not depend on scale; this keeps ±1e308 from overflowing
    try:
        kde = gaussian_kde(v, bw_method="silverman")
    except (np.linalg.LinAlgError, ValueError):  # a singular or non-finite covariance: one mode
        return 1
    grid = np.linspace(v.min(), v.max(), 512)
    dens = kde(grid)
    padded = np.concatenate([[0.0], dens, [0.0]])
    peaks, _ = find_peaks(padded, prominence=THRESHOLDS["mode_prominence"] * dens.max())
    return max(1, len(peaks))


@dataclass
class BinRuleShape:
    rule: str
    bins: int
    width: float
    peaks: int


def histogram_peaks(counts: np.ndarray) -> int:
    """Peaks of a histogram: local maxima standing out from their surroundings by at least
    THRESHOLDS['bin_peak_prominence'] of the tallest bar and by more than twice the counting
    noise of the peak itself (3·√count, Poisson; our own documented rule), so that random
    wiggles in narrow bins do not count as peaks."""
    from scipy.signal import find_peaks

    counts = np.asarray(counts, dtype=float)
    if counts.max() <= 0:
        return 0
    padded = np.concatenate([[0.0], counts, [0.0]])
    peaks, props = find_peaks(padded, prominence=THRESHOLDS["bin_peak_prominence"] * counts.max())
    real = props["prominences"] > 3 * np.sqrt(padded[peaks])
    return int(real.sum())


def bin_rule_shapes(values, log: bool = False) -> list[BinRuleShape]:
    """Histogram peak counts under Sturges (1926), Scott (1979) and Freedman–Diaconis (1981)
    bins (numpy.histogram_bin_edges), and at half and twice the Freedman–Diaconis width."""
    v = _finite(values)
    if log:
        v = np.log10(v[v > 0])
    if len(v) < THRESHOLDS["few_points"] or np.ptp(v) == 0:
        return []
    out = []
    fd = np.histogram_bin_edges(v, bins="fd")
    fd_width = fd[1] - fd[0]
    for name, bins in (("Sturges", "sturges"), ("Scott", "scott"), ("Freedman–Diaconis", "fd")):
        edges = np.histogram_bin_edges(v, bins=bins)
        if len(edges) - 1 > 400:
            continue
        counts, _ = np.histogram(v, bins=edges)
        out.append(BinRuleShape(name, len(counts), float(edges[1] - edges[0]), histogram_peaks(counts)))
    for name, factor in (("half the Freedman–Diaconis width", 0.5),
                         ("twice the Freedman–Diaconis width", 2.0)):
        width = fd_width * factor
        if width <= 0:
            continue
        k = int(np.ceil(np.ptp(v) / width))
        if not 1 <= k <= 400:
            continue
        counts, edges = np.histogram(v, bins=k)
        out.append(BinRuleShape(name, k, float(edges[1] - edges[0]), histogram_peaks(counts)))
    return out
