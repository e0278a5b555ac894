"""Association between two variables: when Pearson's r misdescribes it (a curve), when one or
two points drive the fit (leverage, Cook's distance), and when it reverses within groups
(Simpson's paradox). Engine code: numbers in, numbers out."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from plotwise.engine.rules import THRESHOLDS


@dataclass
class Fit:
    n: int
    pearson: float
    spearman: float
    r2_linear: float
    r2_quadratic: float | None


def pearson_spearman(x: np.ndarray, y: np.ndarray) -> tuple[float, float]:
    """Pearson's r and Spearman's rho (Pearson's r of the ranks, ties given their average
    rank): the statistics of scipy.stats.pearsonr and spearmanr, without importing
    scipy.stats for them."""
    import pandas as pd

    r = float(np.corrcoef(x, y)[0, 1])
    rx = pd.Series(x).rank(method="average").to_numpy()
    ry = pd.Series(y).rank(method="average").to_numpy()
    return float(np.clip(r, -1, 1)), float(np.clip(np.corrcoef(rx, ry)[0, 1], -1, 1))


def fit_summary(x, y) -> Fit | None:
    x, y = np.asarray(x, float), np.asarray(y, float)
    ok = np.isfinite(x) & np.isfinite(y)
    x, y = x[ok], y[ok]
    if len(x) < 4 or np.ptp(x) == 0 or np.ptp(y) == 0:
        return None
    r, rho = pearson_spearman(x, y)
    r2q = None
    if len(np.unique(x)) >= 4:
        coef = np.polyfit(x, y, 2)
        resid = y - np.polyval(coef, x)
        r2q = float(1 - resid.var() / y.var())
    return Fit(len(x), r, rho, r * r, r2q)


def nonlinear_reason(fit: Fit) -> str | None:
    """Why Pearson's r misdescribes the relation, or None."""
    T = THRESHOLDS
    if fit.r2_quadratic is not None and fit.r2_quadratic - fit.r2_linear >= T["curve_r2_gain"]:
        return (f"a quadratic fit explains {fit.r2_quadratic:.0%} of the variance against "
                f"{fit.r2_linear:.0%} for a straight line: the relation curves")
    if abs(fit.spearman) - abs(fit.pearson) >= T["monotone_gap"]:
        return (f"Spearman's ρ = {fit.spearman:.2f} but Pearson's r = {fit.pearson:.2f}: the "
                "relation is monotone but not straight")
    return None


@dataclass
class Influence:
    index: int
    cooks_d: float
    leverage: float


def most_influential(x, y) -> Influence | None:
    """The point with the largest Cook's distance in a least-squares line (Cook 1977), with its
    leverage. A point with leverage ≈ 1 fixes the slope by itself; its distance is infinite."""
    x, y = np.asarray(x, float), np.asarray(y, float)
    ok = np.isfinite(x) & np.isfinite(y)
    idx = np.nonzero(ok)[0]
    x, y = x[ok], y[ok]
    n = len(x)
    if n < 4 or np.ptp(x) == 0:
        return None
    X = np.column_stack([np.ones(n), x])
    xtx_inv = np.linalg.inv(X.T @ X)
    h = np.einsum("ij,jk,ik->i", X, xtx_inv, X)
    beta = xtx_inv @ X.T @ y
    e = y - X @ beta
    p = 2
    s2 = float(e @ e) / (n - p)
    with np.errstate(divide="ignore", invalid="ignore"):
        d = np.where(h < 1 - 1e-9, e ** 2 / (p * s2) * h / (1 - h) ** 2, np.inf) if s2 > 0 else np.zeros(n)
    i = int(np.nanargmax(np.where(np.isnan(d), -1, d)))
    return Influence(int(idx[i]), float(d[i]), float(h[i]))


@dataclass
class Reversal:
    pooled: float
    within: float
    groups_opposite: int
    groups: int
    what: str  # "difference" or "correlation"
    detail: str


def rate_reversal(w: pd.DataFrame, x: str, y: str, group: str) -> Reversal | None:
    """Two categories of x compared on the mean of y, pooled and within each group: does the
    difference flip sign or vanish? Within-group differences are averaged with weights equal
    to the group's row count."""
    d = w[[x, y, group]].dropna()
    levels = sorted(d[x].astype(str).unique())
    if len(levels) != 2:
        return None
    d = d.assign(_x=d[x].astype(str))
    a, b = levels
    means = d.groupby("_x")[y].mean()
    pooled = float(means[a] - means[b])
    diffs, weights = [], []
    for _, part in d.groupby(group, observed=True):
        m = part.groupby("_x")[y].mean()
        if a in m and b in m:
            diffs.append(float(m[a] - m[b]))
            weights.append(len(part))
    if len(diffs) < 2:
        return None
    within = float(np.average(diffs, weights=weights))
    opposite = sum(1 for v in diffs if np.sign(v) == -np.sign(pooled) and v != 0)
    detail = f"'{a}' minus '{b}'"
    return Reversal(pooled, within, opposite, len(diffs), "difference", detail)


def correlation_reversal(w: pd.DataFrame, x: str, y: str, group: str) -> Reversal | None:
    d = w[[x, y, group]].dropna()
    if len(d) < 6 or d[x].nunique() < 3:
        return None
    pooled = float(np.corrcoef(d[x], d[y])[0, 1])
    rs, weights = [], []
    for _, part in d.groupby(group, observed=True):
        if len(part) >= 4 and part[x].std() > 0 and part[y].std() > 0:
            rs.append(float(np.corrcoef(part[x], part[y])[0, 1]))
            weights.append(len(part))
    if len(rs) < 2:
        return None
    within = float(np.average(rs, weights=weights))
    opposite = sum(1 for v in rs if np.sign(v) == -np.sign(pooled))
    return Reversal(pooled, within, opposite, len(rs), "correlation", "Pearson r")


def is_reversal(rev: Reversal) -> bool:
    """The pooled association flips sign within the groups, or vanishes there (common practice:
    a within-group effect under a fifth of the pooled one)."""
    if rev.pooled == 0:
        return False
    flips = np.sign(rev.within) == -np.sign(rev.pooled) and rev.within != 0
    vanishes = abs(rev.within) < 0.2 * abs(rev.pooled)
    strong = abs(rev.pooled) >= (0.1 if rev.what == "correlation" else 0)
    return bool(strong and (flips or vanishes))
