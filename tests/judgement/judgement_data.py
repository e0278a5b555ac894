"""Open datasets for the judgement corpus, all shipped inside installed packages (vega_datasets'
bundled files, palmerpenguins, scikit-learn, statsmodels): nothing is downloaded. Where a case
needs a column the dataset holds in another form (a coded rating as its documented words, a
year as text), the conversion is written here and follows the dataset's own documentation."""

from functools import cache

import pandas as pd


def _vega(name: str) -> pd.DataFrame:
    from vega_datasets import local_data

    return getattr(local_data, name)()


@cache
def barley() -> pd.DataFrame:
    """Barley yields of 10 varieties at 6 sites in 1931 and 1932 (vega_datasets, bundled)."""
    return _vega("barley")


@cache
def seattle() -> pd.DataFrame:
    """Daily Seattle weather 2012–2015 (vega_datasets, bundled)."""
    return _vega("seattle_weather")


def seattle_months() -> pd.DataFrame:
    """The same days with the month's name as text (a calendar scale held as words)."""
    w = seattle().copy()
    w["month"] = w["date"].dt.month_name()
    return w


@cache
def airports() -> pd.DataFrame:
    """US airports with state and coordinates (vega_datasets, bundled)."""
    return _vega("airports")


@cache
def cars() -> pd.DataFrame:
    """Car models 1970–1982 (vega_datasets, bundled)."""
    return _vega("cars")


@cache
def stocks() -> pd.DataFrame:
    """Monthly prices of five stocks, 2000–2010: 560 rows (vega_datasets, bundled)."""
    return _vega("stocks")


@cache
def electricity() -> pd.DataFrame:
    """Iowa's net electricity generation by source and year (vega_datasets, bundled)."""
    return _vega("iowa_electricity")


@cache
def employment() -> pd.DataFrame:
    """US employment by sector, monthly 2006–2015, dates held as text (vega_datasets)."""
    return _vega("us_employment")


@cache
def penguins() -> pd.DataFrame:
    """Palmer penguins (Gorman, Williams & Fraser 2014), shipped with palmerpenguins."""
    import palmerpenguins

    return palmerpenguins.load_penguins()


@cache
def wine() -> pd.DataFrame:
    """UCI wine recognition data, shipped with scikit-learn (class codes 0, 1, 2)."""
    from sklearn.datasets import load_wine

    return load_wine(as_frame=True).frame


@cache
def iris() -> pd.DataFrame:
    """Fisher's iris, shipped with scikit-learn, species as text."""
    from sklearn.datasets import load_iris

    b = load_iris(as_frame=True)
    f = b.frame.drop(columns="target")
    f["species"] = b.target_names[b.target]
    return f


@cache
def grunfeld() -> pd.DataFrame:
    """Grunfeld (1958) investment of 11 US firms, 1935–1954, shipped with statsmodels."""
    import statsmodels.api as sm

    return sm.datasets.grunfeld.load_pandas().data


def grunfeld_two_years(as_text: bool = False) -> pd.DataFrame:
    """Grunfeld's 1935 and 1954 only; the year as text ("1935") when asked."""
    g = grunfeld()
    two = g[g["year"].isin([1935.0, 1954.0])].copy()
    if as_text:
        two["year"] = two["year"].astype(int).astype(str)
    return two


def grunfeld_waves() -> pd.DataFrame:
    """Grunfeld's 1935 and 1954 as survey-style waves 1 and 2 (integers)."""
    two = grunfeld_two_years()
    two["wave"] = (two["year"] == 1954.0).astype(int) + 1
    return two.drop(columns="year")


@cache
def fair() -> pd.DataFrame:
    """Fair (1978) affairs survey, shipped with statsmodels."""
    import statsmodels.api as sm

    return sm.datasets.fair.load_pandas().data


def fair_rated() -> pd.DataFrame:
    """Fair's data with the marriage rating as the words its documentation gives
    (1 = very poor, 2 = poor, 3 = fair, 4 = good, 5 = very good)."""
    f = fair().copy()
    words = {1: "very poor", 2: "poor", 3: "fair", 4: "good", 5: "very good"}
    f["marriage"] = f["rate_marriage"].astype(int).map(words)
    return f.drop(columns="rate_marriage")


@cache
def nile() -> pd.DataFrame:
    """Annual flow of the Nile at Aswan, 1871–1970, shipped with statsmodels."""
    import statsmodels.api as sm

    return sm.datasets.nile.load_pandas().data


def nile_periods() -> pd.DataFrame:
    """Nile flow labelled before/after 1898, the year of the documented drop (Cobb 1978)."""
    n = nile().copy()
    n["period"] = ["before" if y < 1898 else "after" for y in n["year"]]
    return n


@cache
def statecrime() -> pd.DataFrame:
    """US state crime rates and percentages (one row per state), shipped with statsmodels."""
    import statsmodels.api as sm

    return sm.datasets.statecrime.load_pandas().data.reset_index()


@cache
def star98() -> pd.DataFrame:
    """California school districts 1998 (percentages per district), shipped with statsmodels;
    with a size band of enrolment-like counts as a category."""
    import statsmodels.api as sm

    d = sm.datasets.star98.load_pandas().data.copy()
    d["size_band"] = pd.qcut(d["NABOVE"] + d["NBELOW"], 4,
                             labels=["small", "medium", "large", "very large"]).astype(str)
    return d


def with_identifiers() -> pd.DataFrame:
    """Cars with a running row id and a constant numeric code in front, as wide exports have."""
    c = cars().copy()
    c.insert(0, "row_id", range(1, len(c) + 1))
    c.insert(1, "dataset_code", 7)
    return c


def large_cars(times: int = 150) -> pd.DataFrame:
    """The car models repeated (about 61,000 rows): a large frame of real values."""
    return pd.concat([cars()] * times, ignore_index=True)
