"""Hazards that need real computation, each checked against a published source or a reference
library named beside the check."""

import numpy as np
import pandas as pd
import pytest
from open_data import iris

import plotwise
from plotwise.drawing.colours import cmap_rgb
from plotwise.engine.colour import closest_pair, lightness_profile

# Anscombe, F. J. (1973). Graphs in statistical analysis. The American Statistician 27(1).
ANSCOMBE_X = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5]
ANSCOMBE = {
    "I": (ANSCOMBE_X, [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68]),
    "II": (ANSCOMBE_X, [9.14, 8.14, 8.74, 8.77, 9.26, 8.10, 6.13, 3.10, 9.13, 7.26, 4.74]),
    "III": (ANSCOMBE_X, [7.46, 6.77, 12.74, 7.11, 7.81, 8.84, 6.08, 5.39, 8.15, 6.42, 5.73]),
    "IV": ([8, 8, 8, 8, 8, 8, 8, 19, 8, 8, 8],
           [6.58, 5.76, 7.71, 8.84, 8.47, 7.04, 5.25, 12.50, 5.56, 7.91, 6.89]),
}
ASSOCIATION_CODES = {"nonlinear", "influential-point", "reversal-in-groups"}


@pytest.mark.parametrize("name", list(ANSCOMBE))
def test_anscombe_summary_statistics_identical(name):
    # Anscombe (1973): mean x = 9, var x = 11, mean y ≈ 7.50, var y ≈ 4.12, r ≈ 0.816,
    # fit y ≈ 3.00 + 0.500x (numpy as the reference implementation).
    x, y = map(np.asarray, ANSCOMBE[name])
    assert x.mean() == pytest.approx(9) and x.var(ddof=1) == pytest.approx(11)
    assert y.mean() == pytest.approx(7.50, abs=0.01) and y.var(ddof=1) == pytest.approx(4.12, abs=0.01)
    assert np.corrcoef(x, y)[0, 1] == pytest.approx(0.816, abs=0.001)
    slope, intercept = np.polyfit(x, y, 1)
    assert slope == pytest.approx(0.500, abs=0.001) and intercept == pytest.approx(3.00, abs=0.01)


@pytest.mark.parametrize("name,expected", [("I", set()), ("II", {"nonlinear"}),
                                           ("III", {"influential-point"}),
                                           ("IV", {"influential-point"})])
def test_anscombe_quartet_hazards(name, expected):
    # Anscombe (1973): I is an ordinary linear cloud, II a smooth curve, III linear with one
    # outlier, IV one high-leverage point. The same summary statistics, four different hazards.
    x, y = ANSCOMBE[name]
    a = plotwise.advise(pd.DataFrame({"x": x, "y": y}), "correlate", x="x", y="y")
    assert set(a.hazard_codes()) & ASSOCIATION_CODES == expected
    if expected:
        assert a.designs[0].kind == "scatter"
        reg = a.design("regression")
        assert any("fitted line" in r or "curved" in r for r in reg.reasons)
    if name == "III":
        h = next(h for h in a.hazards if h.code == "influential-point")
        assert "position 2" in h.message and "Cook's distance" in h.message  # the (13, 12.74) point
    if name == "IV":
        h = next(h for h in a.hazards if h.code == "influential-point")
        assert "x = 19" in h.message and "leverage 1.00" in h.message


def berkeley() -> pd.DataFrame:
    """Bickel, Hammel & O'Connell (1975), Science 187(4175): the six largest departments,
    applicants and admitted (counts as in R's UCBAdmissions; percentages in
    ../shared/reference.md), one row per applicant."""
    counts = {"A": ((825, 512), (108, 89)), "B": ((560, 353), (25, 17)), "C": ((325, 120), (593, 202)),
              "D": ((417, 138), (375, 131)), "E": ((191, 53), (393, 94)), "F": ((373, 22), (341, 24))}
    rows = []
    for dept, ((mn, ma), (wn, wa)) in counts.items():
        rows += [(dept, "men", 1)] * ma + [(dept, "men", 0)] * (mn - ma)
        rows += [(dept, "women", 1)] * wa + [(dept, "women", 0)] * (wn - wa)
    return pd.DataFrame(rows, columns=["department", "gender", "admitted"])


def test_berkeley_admissions_reversal():
    df = berkeley()
    # Bickel et al. (1975): pooled over these six departments men 44.5%, women 30.4%.
    rates = df.groupby("gender")["admitted"].mean()
    assert rates["men"] == pytest.approx(0.445, abs=0.001)
    assert rates["women"] == pytest.approx(0.304, abs=0.001)
    with_dept = plotwise.advise(df, "compare", x="gender", y="admitted", hue="department")
    h = [h for h in with_dept.hazards if h.code == "reversal-in-groups"]
    assert h and "+14.2 percentage points" in h[0].message and "4 of 6" in h[0].message
    without = plotwise.advise(df, "compare", x="gender", y="admitted")
    assert "reversal-in-groups" not in without.hazard_codes()


def test_correlation_reversal_within_groups():
    rng = np.random.default_rng(7)
    parts = []
    for k in range(4):  # each group: y falls with x, but the groups sit higher as x grows
        x = rng.uniform(0, 1, 50) + 2 * k
        parts.append(pd.DataFrame({"x": x, "y": -x + 4 * k + rng.normal(0, 0.2, 50), "g": f"g{k}"}))
    df = pd.concat(parts, ignore_index=True)
    assert "reversal-in-groups" in plotwise.advise(df, "correlate", x="x", y="y", hue="g").hazard_codes()
    same = df.assign(y=df["x"] + rng.normal(0, 0.2, len(df)))
    same_advice = plotwise.advise(same, "correlate", x="x", y="y", hue="g")
    assert "reversal-in-groups" not in same_advice.hazard_codes()


@pytest.mark.parametrize("cmap,kind", [("viridis", "sequential"), ("cividis", "sequential"),
                                       ("jet", "non-monotonic"), ("turbo", "non-monotonic"),
                                       ("vlag", "diverging")])
def test_colormap_lightness(cmap, kind):
    # Smith & van der Walt (2015): viridis (and cividis) have monotonic lightness; jet and turbo
    # rise and fall. Lightness J' computed in CAM02-UCS by colorspacious.
    assert lightness_profile(cmap_rgb(cmap)).kind == kind


def test_rainbow_colormap_hazard():
    df = iris()
    bad = plotwise.advise(df, "correlate", cmap="jet")
    assert "rainbow-colormap" in bad.hazard_codes()
    assert "rainbow-colormap" not in plotwise.advise(df, "correlate", cmap="viridis").hazard_codes()
    assert "'jet'" in bad.design("hexbin").code()
    with pytest.raises(plotwise.PlotwiseError, match="colormap"):
        plotwise.advise(df, "correlate", cmap="no-such-map")


def test_cvd_confusable():
    # Machado et al. (2009) simulation via colorspacious: matplotlib's tab10 orange and green
    # collapse for protan vision; the Okabe & Ito (2008) palette stays apart.
    assert closest_pair(["#ff7f0e", "#2ca02c"], "protanomaly").delta_e < 8
    df = iris()
    bad = plotwise.advise(df, "correlate", x="petal length (cm)", y="petal width (cm)", hue="species",
                          palette=["#ff7f0e", "#2ca02c", "#1f77b4"])
    scatter = bad.design("scatter")
    h = [h for h in scatter.hazards if h.code == "cvd-confusable"]
    assert h and "protan" in h[0].message and "setosa" in h[0].message
    assert "'#ff7f0e'" in scatter.code()
    good = plotwise.advise(df, "correlate", x="petal length (cm)", y="petal width (cm)", hue="species")
    assert "cvd-confusable" not in {h.code for h in good.design("scatter").hazards}
    assert any("Okabe & Ito 2008" in r for r in good.design("scatter").reasons)


def test_bin_sensitive():
    # Bin rules as numpy.histogram_bin_edges implements them (Sturges 1926, Scott 1979,
    # Freedman & Diaconis 1981); two close modes appear or merge with the width.
    rng = np.random.default_rng(3)
    close = pd.DataFrame({"v": np.concatenate([rng.normal(0, 1, 300), rng.normal(3.0, 1, 300)])})
    rng = np.random.default_rng(3)
    apart = pd.DataFrame({"v": np.concatenate([rng.normal(0, 1, 300), rng.normal(8.0, 1, 300)])})
    h = [h for h in plotwise.advise(close, "distribution").hazards if h.code == "bin-sensitive"]
    assert h and h[0].severity == "warn"
    assert "Sturges (11 bins): 1 peak" in h[0].message and "Scott (12 bins): 2 peaks" in h[0].message
    assert "bin-sensitive" not in plotwise.advise(apart, "distribution").hazard_codes()


def test_hidden_modes_iris():
    # Fisher's iris (scikit-learn): petal length is two-peaked (setosa apart from the other two
    # species); sepal width is one-peaked. Density by scipy.stats.gaussian_kde.
    df = iris()
    a = plotwise.advise(df, "distribution", x="petal length (cm)")
    box = a.design("box")
    assert "hidden-modes" in {h.code for h in box.hazards}
    for kind in ("histogram", "density", "strip", "ecdf"):
        assert a.designs.index(a.design(kind)) < a.designs.index(box), kind
    b = plotwise.advise(df, "distribution", x="sepal width (cm)")
    assert "hidden-modes" not in {h.code for h in b.design("box").hazards}


def test_discrete_gets_count_bar():
    df = pd.DataFrame({"defects": [0, 1, 1, 2, 2, 2, 3, 3, 4, 0, 1, 2] * 10})
    a = plotwise.advise(df, "distribution")
    assert a.designs[0].kind == "count-bar"
    assert a.designs.index(a.design("density")) > a.designs.index(a.design("histogram"))


def test_headlines_exact():
    shares = pd.DataFrame({"kind": ["a", "b", "c"], "share_pct": [50.0, 30.0, 20.0]})
    assert plotwise.advise(shares, "proportion").headline == \
        "'a' is the largest part: 50.0% of the whole ('share_pct' as given)."
    amounts = pd.DataFrame({"shop": ["a", "b", "c"], "sales": [300.0, 100.0, 600.0]})
    assert plotwise.advise(amounts, "proportion").headline == \
        "'c' is the largest part: 600 of 1,000 'sales' in all, 60.0% of the whole."
    assert plotwise.advise(amounts, "compare").headline == \
        "'c' has the highest 'sales' (600), 6.0× that of 'b', the lowest (100)."
    two = pd.DataFrame({"team": ["a", "a", "b", "b"], "year": [2023, 2024, 2023, 2024],
                        "sales": [100.0, 150.0, 200.0, 190.0]})
    assert plotwise.advise(two, "compare", x="team", y="sales", hue="year").headline == \
        "'a' changed most: 'sales' went from 100 to 150 between 2023 and 2024 (+50, +50.0%)."
    pts = two.rename(columns={"sales": "share_pct"}).assign(share_pct=[30.0, 33.2, 50.0, 49.0])
    assert plotwise.advise(pts, "compare", x="team", y="share_pct", hue="year").headline == (
        "'a' changed most: 'share_pct' went from 30.0% to 33.2% between 2023 and 2024 "
        "(+3.2 percentage points).")


def test_perceived_magnitude_in_reasons():
    # Stevens (1957): brightness exponent 0.33, so a 10× larger value looks about 10^0.33 ≈ 2×.
    a = plotwise.advise(iris(), "correlate", x="petal length (cm)", y="petal width (cm)")
    assert any("about 2× larger" in r and "0.33" in r for r in a.design("hexbin").reasons)


def test_colour_scheme_follows_data():
    df = pd.DataFrame({"unit": list("ABCDEF") * 4, "q": np.repeat(["q1", "q2", "q3", "q4"], 6),
                       "profit": np.linspace(-50, 70, 24)})
    heat = plotwise.advise(df, "compare", x="unit", y="profit", hue="q").design("heatmap")
    assert any("diverging" in r and "centred on zero" in r for r in heat.reasons)
    assert "center=0" in heat.code()


def test_headline_for_equal_groups_says_so():
    # It read "'a' has the highest total … 1.0× that of 'a', the lowest".
    same = pd.DataFrame({"shop": ["a", "b", "c"], "sales": [5.0, 5.0, 5.0]})
    assert plotwise.advise(same, "compare", x="shop", y="sales").headline == \
        "All 3 groups have the same 'sales' (5)."


def test_infinite_values_leave_fits_and_modes_alone():
    # ±inf once reached the KDE (ValueError) and the regression checks (SVD did not converge).
    rng = np.random.default_rng(2)
    x = rng.normal(size=200)
    df = pd.DataFrame({"x": x, "y": 2 * x + rng.normal(size=200)})
    df.loc[[3, 50], "y"] = [np.inf, -np.inf]
    a = plotwise.advise(df, "correlate", x="x", y="y")
    assert a.fields["y"].infinite == 2
    plotwise.advise(df, "distribution", x="y").show()
