"""plotwise's small numerical helpers against the reference library they stand in for (scipy;
plotwise's engine avoids importing scipy.signal and scipy.stats, whose imports cost most of a
second of a first advise()): peaks and prominences (scipy.signal.find_peaks), the Gaussian
kernel density with Silverman's bandwidth (scipy.stats.gaussian_kde), Pearson's r and
Spearman's rho (scipy.stats.pearsonr, spearmanr) and the normal quantile (scipy.stats.norm)."""

import numpy as np
import pytest
from scipy.signal import find_peaks

from plotwise.engine.association import pearson_spearman
from plotwise.engine.shape import prominent_peaks, silverman_density


def signals():
    rng = np.random.default_rng(11)
    grid = np.linspace(-4, 6, 512)
    yield np.exp(-grid**2) + 0.6 * np.exp(-(grid - 3) ** 2)  # two modes
    yield rng.poisson(20, 60).astype(float)  # a noisy histogram
    yield rng.normal(size=1000).cumsum()  # a random walk: many local maxima
    yield np.array([0, 2, 2, 2, 1, 3, 3, 0, 5, 5, 5, 5, 1, 0], dtype=float)  # flat tops
    yield np.array([3, 1, 2, 1, 3], dtype=float)  # peaks at the ends do not count
    yield np.zeros(8)
    yield np.array([1.0])
    yield np.round(rng.random(300) * 4)  # many ties


@pytest.mark.parametrize("x", list(signals()), ids=lambda x: f"n={len(x)}")
@pytest.mark.parametrize("share", [0.0, 0.05, 0.3])
def test_same_peaks_and_prominences_as_scipy(x, share):
    threshold = share * (x.max() if x.size else 0)
    ours, prom = prominent_peaks(x, threshold)
    ref, props = find_peaks(x, prominence=threshold)
    np.testing.assert_array_equal(ours, ref)
    np.testing.assert_allclose(prom, props["prominences"])


@pytest.mark.parametrize("seed", [0, 1, 2])
def test_density_matches_scipy_gaussian_kde(seed):
    from scipy.stats import gaussian_kde

    rng = np.random.default_rng(seed)
    sample = np.concatenate([rng.normal(0, 1, 700), rng.normal(4, 0.5, 300 * (seed + 1))])
    grid = np.linspace(sample.min() - 1, sample.max() + 1, 512)
    ref = gaussian_kde(sample, bw_method="silverman")(grid)
    np.testing.assert_allclose(silverman_density(sample, grid), ref, rtol=1e-9, atol=1e-15)
    assert silverman_density(np.ones(10), grid) is None  # no spread: no density


@pytest.mark.parametrize("seed", [0, 1])
def test_correlations_match_scipy(seed):
    from scipy.stats import pearsonr, spearmanr

    rng = np.random.default_rng(seed)
    x = rng.normal(size=400)
    y = np.round(x**3 + rng.normal(size=400), 1)  # ties in y
    r, rho = pearson_spearman(x, y)
    assert r == pytest.approx(pearsonr(x, y).statistic, abs=1e-12)
    assert rho == pytest.approx(spearmanr(x, y).statistic, abs=1e-12)


@pytest.mark.parametrize("n", [10, 1_000, 10_000_000])
def test_outlier_bar_quantile_matches_scipy_norm(n):
    from statistics import NormalDist

    from scipy.stats import norm

    p = 0.025 / n
    assert -NormalDist().inv_cdf(p) == pytest.approx(norm.isf(p), rel=1e-9)
