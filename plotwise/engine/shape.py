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


def local_maxima(x: np.ndarray) -> np.ndarray:
    """Indices of the local maxima of ``x`` (a flat top counts once, at its middle; the ends
    never count): the definition of scipy.signal.find_peaks."""
    out = []
    i, last = 1, len(x) - 1
    while i < last:
        if x[i - 1] < x[i]:
            ahead = i + 1
            while ahead < last and x[ahead] == x[i]:
                ahead += 1
            if x[ahead] < x[i]:
                out.append((i + ahead - 1) // 2)
                i = ahead
        i += 1
    return np.asarray(out, dtype=int)


def prominent_peaks(x, min_prominence: float) -> tuple[np.ndarray, np.ndarray]:
    """(indices, prominences) of the local maxima of ``x`` whose topographic prominence is at
    least ``min_prominence``: the height of a peak above the higher of the lowest points
    between it and the nearest higher value on each side (or the end). The same answer as
    scipy.signal.find_peaks(x, prominence=min_prominence), without importing scipy.signal
    (whose import alone costs most of a second)."""
    x = np.asarray(x, dtype=float)
    peaks = local_maxima(x)
    prom = np.empty(len(peaks))
    for k, p in enumerate(peaks):
        higher_left = np.flatnonzero(x[:p] > x[p])
        higher_right = np.flatnonzero(x[p + 1:] > x[p])
        lo = higher_left[-1] + 1 if len(higher_left) else 0
        hi = p + 1 + higher_right[0] if len(higher_right) else len(x)
        prom[k] = x[p] - max(x[lo:p + 1].min(), x[p:hi].min())
    keep = prom >= min_prominence
    return peaks[keep], prom[keep]


def silverman_density(sample, grid) -> np.ndarray | None:
    """A Gaussian kernel density estimate of the 1-D ``sample`` at ``grid``, with Silverman's
    (1986) rule-of-thumb bandwidth: the numbers of scipy.stats.gaussian_kde(sample,
    bw_method="silverman") (kernel sd = sample sd × (3n/4)^(-1/5)), without importing
    scipy.stats (its import alone costs most of a second). None when the sample has no spread
    or is not finite."""
    v = np.asarray(sample, dtype=float)
    n = len(v)
    if n < 2 or not np.isfinite(v).all():
        return None
    sd = float(np.std(v, ddof=1)) * (n * 3 / 4) ** (-1 / 5)
    if not np.isfinite(sd) or sd <= 0:
        return None
    g = np.asarray(grid, dtype=float)
    out = np.zeros(len(g))
    for start in range(0, len(g), 64):  # in blocks: at most 64 × n values in memory
        z = (g[start:start + 64, None] - v[None, :]) / sd
        out[start:start + 64] = np.exp(-0.5 * z * z).sum(axis=1)
    return out / (n * sd * np.sqrt(2 * np.pi))


def kde_modes(values, log: bool = False) -> int:
    """Number of modes of a Gaussian kernel density estimate with Silverman's (1986)
    rule-of-thumb bandwidth, counting local maxima whose prominence is at least
    THRESHOLDS['mode_prominence'] of the highest density (our own documented threshold)."""
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
    grid = np.linspace(v.min(), v.max(), 512)
    dens = silverman_density(v, grid)
    if dens is None:  # no spread or not finite: one mode
        return 1
    padded = np.concatenate([[0.0], dens, [0.0]])
    peaks, _ = prominent_peaks(padded, THRESHOLDS["mode_prominence"] * dens.max())
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
    counts = np.asarray(counts, dtype=float)
    if counts.max() <= 0:
        return 0
    padded = np.concatenate([[0.0], counts, [0.0]])
    peaks, prominences = prominent_peaks(padded, THRESHOLDS["bin_peak_prominence"] * counts.max())
    real = prominences > 3 * np.sqrt(padded[peaks])
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
