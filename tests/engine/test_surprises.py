"""Surprises: each built case is found, with its rows and numbers, and its near-twin stays silent;
label-misfit and level-shift are checked on published data against outside references."""

import numpy as np
import pandas as pd
import pytest

import plotwise
from plotwise.engine.rules import SURPRISE_THRESHOLDS
from plotwise.engine.surprises import SURPRISE_CHECKS, level_shift, misfit_items


def codes(advice) -> list[str]:
    return advice.surprise_codes()


def only(advice, code):
    found = [s for s in advice.surprises if s.code == code]
    assert len(found) == 1, [str(s) for s in advice.surprises]
    return found[0]


# label-misfit ----------------------------------------------------------------------------------
def two_clusters(swap: bool, rng):
    a = rng.normal([0, 0], 0.5, size=(60, 2))
    b = rng.normal([4, 4], 0.5, size=(60, 2))
    df = pd.DataFrame(np.vstack([a, b]), columns=["width", "depth"],
                      index=[f"item{i}" for i in range(120)])
    df["batch"] = ["north"] * 60 + ["south"] * 60
    if swap:
        df.loc["item7", "batch"] = "south"  # an item of the north cluster labelled south
    return df


def test_label_misfit_names_the_mislabelled_item_and_its_twin_is_silent(rng):
    df = two_clusters(True, rng)
    s = only(plotwise.advise(df, "correlate", x="width", y="depth", hue="batch"), "label-misfit")
    assert s.rows == ("item7",)
    assert "6 of its 6 nearest items labelled 'north'" in s.message
    assert s.marks and s.marks[0].value("width") == pytest.approx(df.loc["item7", "width"])
    twin = plotwise.advise(two_clusters(False, rng), "correlate", x="width", y="depth",
                           hue="batch")
    assert "label-misfit" not in codes(twin)


def knn_reference(points, labels, k):
    """scikit-learn's KNeighborsClassifier with each item left out of its own neighbours
    (predict_proba with X=None): the share of neighbours carrying the item's own label."""
    from sklearn.neighbors import KNeighborsClassifier

    z = (points - points.mean(axis=0)) / points.std(axis=0)
    clf = KNeighborsClassifier(n_neighbors=k).fit(z, labels)
    proba = clf.predict_proba(None)
    own = proba[np.arange(len(labels)), np.searchsorted(clf.classes_, labels)]
    dist, _ = clf.kneighbors(None, n_neighbors=k + 1)
    tied = np.isclose(dist[:, k - 1], dist[:, k])  # the k-th neighbour is a tie: order decides
    return np.rint((1 - own) * k).astype(int), tied


@pytest.mark.parametrize("dataset, x, y", [
    ("iris", "petal length (cm)", "petal width (cm)"),  # Fisher (1936), via scikit-learn
    ("wine", "alcohol", "flavanoids"),  # UCI wine recognition data, via scikit-learn
])
def test_label_misfit_agrees_with_scikit_learn_neighbours(dataset, x, y):
    # Reference: scikit-learn's KNeighborsClassifier (an outside implementation of k nearest
    # neighbours): the items plotwise flags are exactly those whose neighbours disagree.
    from sklearn import datasets

    bunch = getattr(datasets, f"load_{dataset}")(as_frame=True)
    df = bunch.frame.drop(columns="target")
    df["label"] = np.asarray(bunch.target_names)[bunch.target]
    k = SURPRISE_THRESHOLDS["misfit_k"]
    pts = df[[x, y]].to_numpy(float)
    labels = df["label"].to_numpy(object)
    ours, _ = misfit_items(pts, labels, k)
    ref, tied = knn_reference(pts, labels, k)
    assert (ours[~tied] == ref[~tied]).all()
    expected = set(df.index[(ref >= SURPRISE_THRESHOLDS["misfit_others"]) & ~tied])
    advice = plotwise.advise(df, "correlate", x=x, y=y, hue="label")
    flagged = set(only(advice, "label-misfit").rows) if "label-misfit" in codes(advice) else set()
    assert expected and expected <= flagged | set(df.index[tied])
    assert flagged - expected <= set(df.index[tied])


# group-outlier ---------------------------------------------------------------------------------
def modified_z_reference(v):
    # Iglewicz & Hoaglin (1993): M = 0.6745 (x - median) / MAD, MAD from scipy.
    from scipy.stats import median_abs_deviation

    return 0.6745 * (v - np.median(v)) / median_abs_deviation(v)


def test_modified_z_matches_scipy_mad(rng):
    from plotwise.engine.surprises import far_from_centre, group_centres

    v = rng.normal(10, 2, 200)
    codes = np.zeros(200, dtype=int)
    med, mad = group_centres(v, codes)
    far, z = far_from_centre(v, codes, med, mad, bar=-1.0)  # every value passes a bar below 0
    np.testing.assert_array_equal(far, np.arange(200))
    np.testing.assert_allclose(z, modified_z_reference(v))


def shops(outlier: bool, rng):
    df = pd.DataFrame({"shop": np.repeat(["Alder", "Birch", "Cedar"], 40),
                       "basket": rng.normal(50, 5, 120).round(2)})
    if outlier:
        df.loc[45, "basket"] = 500.0  # a value typed with an extra zero
    return df


def test_group_outlier_names_row_and_group_and_twin_is_silent(rng):
    s = only(plotwise.advise(shops(True, rng), "compare", x="shop", y="basket"), "group-outlier")
    assert s.rows == (45,) and "'Birch'" in s.message and "500" in s.message
    assert "group-outlier" not in codes(plotwise.advise(shops(False, rng), "compare", x="shop",
                                                        y="basket"))


def test_group_centres_from_a_sample_flag_what_the_exact_medians_flag(rng):
    # Past 200,000 values each group's median and MAD come from a sample (small groups whole);
    # the rows it flags must be those that the exact per-group modified z (scipy's MAD, the
    # reference above) puts beyond the bar.
    from statistics import NormalDist

    from plotwise.engine.surprises import far_from_centre, group_centres

    n = 400_000
    codes = rng.integers(0, 3, n)
    codes[:150] = 3  # a small group: kept whole in the sample
    v = rng.normal(100, 10, n) + 20 * codes
    planted = [7, 90, 12_345, 399_999]
    v[planted] = [300.0, -100.0, 260.0, 400.0]
    centre, mad = group_centres(v, codes)
    bar = -NormalDist().inv_cdf(0.025 / n)
    exact = np.empty(n)
    for g in range(4):
        m = codes == g
        exact[m] = modified_z_reference(v[m])
        assert centre[g] == pytest.approx(np.median(v[m]), abs=0.2)  # within 0.02 SD
    far, z = far_from_centre(v, codes, centre, mad, bar, block=30_000)
    np.testing.assert_array_equal(far, np.flatnonzero(np.abs(exact) > bar))
    np.testing.assert_allclose(z, exact[far], rtol=0.02)
    assert set(planted) <= set(far)


# level-shift -----------------------------------------------------------------------------------
def test_level_shift_on_the_nile_finds_the_1898_break():
    # Cobb, G. W. (1978), Biometrika 65:243–251: the Nile's annual flow at Aswan drops after
    # 1898 (statsmodels ships the series). Levels checked against pandas medians of the two periods.
    import statsmodels.api as sm

    nile = sm.datasets.nile.load_pandas().data
    s = only(plotwise.advise(nile, "trend", x="year", y="volume"), "level-shift")
    assert "at 1899" in s.message and s.marks[0].value("year") == 1899
    before = nile.volume[nile.year <= 1898].median()
    after = nile.volume[nile.year >= 1899].median()
    assert f"{before:,.0f}" in s.message and f"{after:,.0f}" in s.message


@pytest.mark.parametrize("series", ["co2", "sunspots"])
def test_level_shift_stays_silent_on_trends_and_cycles(series):
    # statsmodels' CO2 (Mauna Loa, a rising trend with seasons) and sunspots (an 11-year cycle):
    # smooth change, no step.
    import statsmodels.api as sm

    if series == "co2":
        y = sm.datasets.co2.load_pandas().data.co2.interpolate().to_numpy()
    else:
        y = sm.datasets.sunspots.load_pandas().data.SUNACTIVITY.to_numpy()
    assert level_shift(y) is None


def sensor(step: bool, rng):
    days = pd.date_range("2025-01-01", periods=120, freq="D")
    temp = 20 + rng.normal(0, 0.5, 120) + np.linspace(0, 0.5, 120)
    if step:
        temp[80:] += 2.0  # a replaced sensor reads two degrees higher
    return pd.DataFrame({"day": days, "reading": temp})


def test_level_shift_dates_a_replaced_sensor_and_twin_is_silent(rng):
    s = only(plotwise.advise(sensor(True, rng), "trend", x="day", y="reading"), "level-shift")
    assert "at 2025-03-22" in s.message and "rises" in s.message
    assert "level-shift" not in codes(plotwise.advise(sensor(False, rng), "trend", x="day",
                                                      y="reading"))


def test_a_random_walk_is_not_a_level_shift():
    rng = np.random.default_rng(7)
    found = sum(level_shift(np.cumsum(rng.normal(size=200))) is not None for _ in range(20))
    assert found <= 2


# impossible-value ------------------------------------------------------------------------------
def test_negative_counts_sentinels_shares_and_future_dates(rng):
    df = pd.DataFrame({"depot": np.repeat(list("ABCD"), 10),
                       "parcel_count": rng.integers(5, 40, 40).astype(float),
                       "on_time_pct": rng.uniform(80, 99, 40)})
    df.loc[3, "parcel_count"] = -12
    df.loc[8, "parcel_count"] = -999
    a = plotwise.advise(df, "compare", x="depot", y="parcel_count")
    found = {s.rows: s.message for s in a.surprises if s.code == "impossible-value"}
    assert "negative values" in found[(3,)] and "missing" in found[(8,)]
    assert all(s.severity == "warn" for s in a.surprises if s.code == "impossible-value")
    df.loc[5, "on_time_pct"] = 130.0
    a = plotwise.advise(df, "compare", x="depot", y="on_time_pct")
    assert any("above 100%" in s.message and "row 5" in s.message for s in a.surprises)
    clean = df.assign(parcel_count=df.parcel_count.abs().clip(upper=90),
                      on_time_pct=df.on_time_pct.clip(upper=99))
    for y in ("parcel_count", "on_time_pct"):
        assert "impossible-value" not in codes(plotwise.advise(clean, "compare", x="depot", y=y))


def test_placeholder_and_future_dates(rng):
    days = pd.Series(pd.date_range("2024-01-01", periods=60, freq="D"))
    df = pd.DataFrame({"shipped": days, "weight": rng.uniform(1, 5, 60)})
    df.loc[4, "shipped"] = pd.Timestamp("1900-01-01")
    df.loc[50, "shipped"] = pd.Timestamp.now().normalize() + pd.Timedelta(days=400)
    a = plotwise.advise(df, "trend", x="shipped", y="weight")
    msgs = " ".join(s.message for s in a.surprises if s.code == "impossible-value")
    assert "placeholder date (1900-01-01)" in msgs and "row 4" in msgs
    assert "in the future" in msgs and "row 50" in msgs
    clean = pd.DataFrame({"shipped": days, "weight": df.weight})
    assert "impossible-value" not in codes(plotwise.advise(clean, "trend", x="shipped",
                                                           y="weight"))


# duplicate-rows --------------------------------------------------------------------------------
def test_duplicate_rows_in_iris_and_a_frame_of_few_combinations_is_silent():
    # Fisher's iris as shipped by scikit-learn holds one exact repeat: row 142 equals row 101
    # (from memory; checked here with pandas' own duplicated()).
    from open_data import iris

    df = iris()
    assert list(df.index[df.duplicated()]) == [142]
    s = only(plotwise.advise(df, "correlate", x="sepal length (cm)", y="sepal width (cm)"),
             "duplicate-rows")
    assert s.rows == (142,) and "repeats row 101" in s.message
    # species × a 3-level grade: repeats are expected, not a surprise
    few = pd.DataFrame({"kind": list("abc") * 20, "grade": ["lo", "mid", "hi"] * 20})
    assert "duplicate-rows" not in codes(plotwise.advise(few, "compare", x="kind"))
    # 120 baskets rounded to cents in 3 shops: a repeated row is what chance gives (about two
    # pairs expected), not a surprise
    rng = np.random.default_rng(4)
    baskets = pd.DataFrame({"shop": np.repeat(["Alder", "Birch", "Cedar"], 40),
                            "basket": rng.normal(50, 5, 120).round(2)})
    assert baskets.duplicated().sum() == 1
    assert "duplicate-rows" not in codes(plotwise.advise(baskets, "compare", x="shop",
                                                         y="basket"))


def test_two_rows_for_one_day_when_every_other_day_has_one(rng):
    df = pd.DataFrame({"day": pd.date_range("2025-05-01", periods=40, freq="D"),
                       "tickets": rng.integers(10, 50, 40).astype(float)})
    twin_free = df.copy()
    df = pd.concat([df, df.iloc[[12]].assign(tickets=99.0)], ignore_index=True)
    s = only(plotwise.advise(df, "trend", x="day", y="tickets"), "duplicate-rows")
    assert "2025-05-13" in s.message and set(s.rows) == {12, 40} and "added up" in s.message
    assert "duplicate-rows" not in codes(plotwise.advise(twin_free, "trend", x="day",
                                                         y="tickets"))


# unit-mix --------------------------------------------------------------------------------------
def parcels(mixed: bool, rng):
    kg = rng.lognormal(np.log(3), 0.25, 300)
    if mixed:
        kg[:60] *= 1000  # 60 parcels weighed in grams
    return pd.DataFrame({"depot": rng.choice(list("ABC"), 300), "parcel_mass": kg})


def test_unit_mix_finds_grams_among_kilograms_and_twin_is_silent(rng):
    s = only(plotwise.advise(parcels(True, rng), "distribution", x="parcel_mass"), "unit-mix")
    assert "1,000×" in s.message and "60 values" in s.message and s.rows[0] == 0
    assert "unit-mix" not in codes(plotwise.advise(parcels(False, rng), "distribution",
                                                   x="parcel_mass"))
    two_sizes = parcels(False, rng).assign(parcel_mass=lambda d: np.where(
        d.index < 150, d.parcel_mass, d.parcel_mass * 3))  # two sizes 3× apart: no unit mix
    assert "unit-mix" not in codes(plotwise.advise(two_sizes, "distribution", x="parcel_mass"))


def test_every_surprise_code_has_a_test_here():
    import inspect
    import sys

    source = inspect.getsource(sys.modules[__name__])
    for c in {c.code for c in SURPRISE_CHECKS}:
        assert f'"{c}"' in source, c


def test_engine_data_small_enough_gets_surprises_and_large_says_why_not(tmp_path, monkeypatch):
    import duckdb

    from plotwise.engine.rules import THRESHOLDS

    df = shops(True, np.random.default_rng(1))
    path = tmp_path / "baskets.parquet"
    df.to_parquet(path)
    a = plotwise.advise(str(path), "compare", x="shop", y="basket")
    in_memory = plotwise.advise(df, "compare", x="shop", y="basket")
    assert 45 in only(a, "group-outlier").rows  # row numbers in the file's order
    assert a.surprises == in_memory.surprises
    monkeypatch.setitem(THRESHOLDS, "profile_sample", 50)  # a "large" table: only a sample
    monkeypatch.setitem(THRESHOLDS, "draw_sample", 50)
    a = plotwise.advise(duckdb.connect().from_df(df), "compare", x="shop", y="basket")
    assert a.surprises == [] and any("surprises" in n.lower() for n in a.notes)


# Open data where a practitioner sees nothing to look at twice (each once raised a false alarm).
QUIET = [
    # vega_datasets' monthly AAPL prices: a tenfold rise over the years, not two units
    ("stocks", lambda d: d[d.symbol == "AAPL"], dict(task="trend", x="date", y="price"),
     "unit-mix"),
    # vega_datasets' US electricity by source: sources differ in size by nature
    ("electricity", None, dict(task="compare", x="source", y="net_generation"), "unit-mix"),
    # vega_datasets' Seattle weather: rain is zero on most days, a heavy tail is no outlier
    ("seattle", None, dict(task="compare", x="weather", y="precipitation", agg="sum"),
     "group-outlier"),
    # vega_datasets' cars: model year 1970 stored as 1970-01-01 is a real year, no placeholder
    ("cars", None, dict(task="compare", x="Year", y="Horsepower"), "impossible-value"),
]


@pytest.mark.parametrize("name, pick, kw, code", QUIET, ids=[q[0] + "-" + q[3] for q in QUIET])
def test_open_data_raises_no_false_alarm(name, pick, kw, code):
    import sys
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "judgement"))
    import judgement_data

    df = getattr(judgement_data, name)()
    if pick is not None:
        df = pick(df)
    assert code not in codes(plotwise.advise(df, **kw))
