"""Open datasets shipped inside installed packages (no download)."""

import pandas as pd


def grunfeld() -> pd.DataFrame:
    """Grunfeld (1958) investment data for 11 US firms, 1935-1954, shipped with statsmodels."""
    import statsmodels.api as sm

    return sm.datasets.grunfeld.load_pandas().data


def iris() -> pd.DataFrame:
    """Fisher's iris measurements, shipped with scikit-learn, with species names as text."""
    from sklearn.datasets import load_iris

    b = load_iris(as_frame=True)
    f = b.frame.drop(columns="target")
    f["species"] = b.target_names[b.target]
    return f


def kind_cases() -> list[tuple[pd.DataFrame, dict]]:
    """Frames and arguments that between them produce every chart kind (open data only)."""
    g = grunfeld()
    two = g[g["year"].isin([1935.0, 1954.0])]
    f = iris()
    return [
        (g, dict(task="compare", x="firm", y="invest")),
        (g[g.year >= 1950], dict(task="compare", x="firm", y="invest", hue="year")),
        (g, dict(task="trend", x="year", y="invest", hue="firm")),
        (g, dict(task="trend", x="year", y="invest")),
        (two, dict(task="compare", x="firm", y="invest", hue="year")),
        (g, dict(task="proportion", x="firm", y="invest")),
        (g[g.year >= 1952], dict(task="proportion", x="firm", y="invest", hue="year")),
        (f, dict(task="correlate")),
        (f, dict(task="distribution", x="sepal width (cm)")),
        (f, dict(task="distribution", x="sepal width (cm)", hue="species")),
        (pd.DataFrame({"n": [0, 1, 1, 2, 2, 2, 3, 3, 4] * 5}), dict(task="distribution")),
    ]
