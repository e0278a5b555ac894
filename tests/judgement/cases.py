"""The judgement corpus: questions an analyst would ask of open datasets, each with what a
practitioner would accept. ``why`` says where the expectation comes from: a published source, or
"common practice" (a rule of thumb with no single source).

Fields: ``best`` — kinds acceptable as the first design; ``never`` — kinds that must not be among
the designs shown; ``stat`` — the statistic the first design must draw (count, sum, mean...);
``must``/``must_not`` — hazard codes; ``order`` — labels that must appear in this order on the
first design's category axis or legend; ``columns`` — columns that must not be used at all."""

from dataclasses import dataclass, field

import judgement_data as data


@dataclass(frozen=True)
class Case:
    name: str
    load: object
    kw: dict
    best: frozenset
    why: str
    never: frozenset = frozenset()
    stat: str | None = None
    must: frozenset = frozenset()
    must_not: frozenset = frozenset()
    order: tuple = ()
    columns: frozenset = field(default_factory=frozenset)


def case(name, load, kw, best, why, **extra) -> Case:
    sets = {k: frozenset(v) for k, v in extra.items() if k in ("never", "must", "must_not",
                                                              "columns")}
    rest = {k: v for k, v in extra.items() if k not in sets}
    return Case(name, load, kw, frozenset(best), why, **sets, **rest)


BARS = {"bar", "dot", "lollipop"}
PARTS = {"bar", "dot", "stacked-bar-100", "pie"}
NO_SHARES = {"pie", "stacked-bar-100", "stacked-bar"}

CASES = [
    # --- dense comparisons ----------------------------------------------------------------
    case("barley-varieties-by-site", data.barley,
         dict(task="compare", x="variety", y="yield", hue="site"), {"dot"},
         "10 varieties × 6 sites is 60 bars: one line of dots per variety reads better; "
         "Cleveland's Visualizing Data (1993) draws this very table as a dot plot (from memory)",
         stat="mean"),
    # --- measure meaning: count rows without y, never sum what does not add up -------------
    case("weather-days-per-type", data.seattle, dict(task="proportion", x="weather"), PARTS,
         "days per weather type: without y the parts are row counts, not summed rain "
         "(common practice)", stat="count"),
    case("airports-per-state", data.airports, dict(task="compare", x="state"), BARS,
         "airports per state are counted; latitudes never add up (common practice)",
         stat="count", columns={"latitude", "longitude"}, never={"pie"}),
    case("cars-per-origin", data.cars, dict(task="proportion", x="Origin"), PARTS,
         "share of models per origin: count rows (common practice)", stat="count"),
    case("mpg-by-origin-averaged", data.cars,
         dict(task="compare", x="Origin", y="Miles_per_Gallon"), BARS | {"box"},
         "miles per gallon is a per-car rate: averaged, never summed (common practice)",
         stat="mean"),
    case("mpg-proportion-refused-as-shares", data.cars,
         dict(task="proportion", x="Origin", y="Miles_per_Gallon"), BARS,
         "rates are not parts of a whole: no pie or 100% bar of summed mpg (common practice)",
         never=NO_SHARES, stat="mean"),
    case("penguin-mass-by-species", data.penguins,
         dict(task="compare", x="species", y="body_mass_g"), BARS | {"box"},
         "body mass per bird is averaged per species (common practice)", stat="mean"),
    case("percent-minority-by-size-band", data.star98,
         dict(task="proportion", x="size_band", y="PERMINTE"), BARS,
         "district percentages do not add up to a whole: averages, no shares (common practice)",
         never=NO_SHARES, stat="mean"),
    case("temperature-averaged-by-weather", data.seattle,
         dict(task="compare", x="weather", y="temp_max"), BARS | {"box"},
         "temperature is an interval scale: averaged; bars from zero mean nothing, so dots or "
         "boxes (Stevens 1946 levels of measurement)", stat="mean", never={"pie"}),
    case("generation-summed-by-source", data.electricity,
         dict(task="compare", x="source", y="net_generation"), BARS | {"box"},
         "net generation is energy: totals per source mean something (common practice)",
         stat="sum"),
    case("rain-total-by-weather", data.seattle,
         dict(task="compare", x="weather", y="precipitation", agg="sum"), BARS,
         "the caller's agg= overrides the default (API contract)", stat="sum"),
    case("identifiers-never-measures", data.with_identifiers, dict(), {"scatter", "regression", "line",
                                                                         "histogram", "bar",
                                                                         "dot", "box"},
         "a running row id and a constant code are not measures (common practice)",
         columns={"row_id", "dataset_code"}),
    case("poverty-percent-per-state", data.statecrime,
         dict(task="compare", x="state", y="poverty"), BARS,
         "one value per state: drawn as given, 50 states capped to the largest on one axis "
         "(common practice)", stat="value", never={"pie"}),
    # --- order and time -------------------------------------------------------------------
    case("marriage-rating-in-order", data.fair_rated, dict(task="proportion", x="marriage"),
         PARTS, "a rating scale keeps its order on the axis (common practice)",
         order=("very poor", "poor", "fair", "good", "very good"), stat="count"),
    case("affairs-by-marriage-rating", data.fair_rated,
         dict(task="compare", x="marriage", y="affairs"), BARS | {"box"},
         "a rating scale keeps its order; time spent is averaged per group (common practice)",
         order=("very poor", "poor", "fair", "good", "very good")),
    case("rating-split-by-religiousness", data.fair_rated,
         dict(task="proportion", x="marriage", hue="religious"),
         {"stacked-bar-100", "grouped-bar"},
         "stacked parts of an ordered scale stay in scale order (common practice)",
         order=("very poor", "poor", "fair", "good", "very good")),
    case("rain-by-month-name", data.seattle_months,
         dict(task="trend", x="month", y="precipitation"), {"line", "bar", "dot"},
         "month names are a calendar scale: January to December, not alphabetical "
         "(common practice)", order=("January", "February", "March", "April", "May", "June",
                                     "July", "August", "September", "October", "November",
                                     "December")),
    case("nile-before-after", data.nile_periods,
         dict(task="compare", x="period", y="volume"), BARS | {"box", "strip"},
         "before/after in that order (Cobb 1978 documents the 1898 drop); annual flows over "
         "periods of 27 and 73 years are compared by their averages, not totals "
         "(common practice)", order=("before", "after"), stat="mean"),
    case("years-as-text-slope", lambda: data.grunfeld_two_years(as_text=True),
         dict(task="compare", x="firm", y="invest", hue="year"),
         {"slope", "difference-bar", "grouped-bar", "dot"},
         "two years held as text are two time points: before/after designs come first "
         "(common practice)", never={"stacked-bar", "pie"}),
    case("years-as-text-offer-slope", lambda: data.grunfeld_two_years(as_text=True),
         dict(task="compare", x="firm", y="invest", hue="year"), {"slope", "difference-bar"},
         "change between two time points per group: slope or difference first "
         "(common practice)"),
    case("integer-waves-as-hue", data.grunfeld_waves,
         dict(task="compare", x="firm", y="invest", hue="wave"),
         {"slope", "difference-bar", "grouped-bar", "dot"},
         "an integer wave 1/2 is a period, usable as hue (common practice)"),
    case("cylinders-as-categories", data.cars,
         dict(task="compare", x="Cylinders", y="Miles_per_Gallon"), BARS | {"box"},
         "a few whole numbers are ordered categories on x (common practice)",
         order=("3", "4", "5", "6", "8"), stat="mean"),
    case("cylinders-as-hue", data.cars,
         dict(task="compare", x="Origin", y="Miles_per_Gallon", hue="Cylinders"),
         {"grouped-bar", "dot", "heatmap"}, "a few whole numbers as hue (common practice)"),
    case("wine-two-quantities-no-trend", data.wine,
         dict(x="alcohol", y="color_intensity"), {"scatter", "regression", "hexbin"},
         "two quantities are related by a scatter; a quantity is never a time axis "
         "(common practice)", never={"line", "area"}),
    case("wine-class-codes-as-x", data.wine, dict(task="compare", x="target", y="alcohol"),
         BARS | {"box"}, "class codes 0/1/2 are categories when named as x (common practice)"),
    case("stock-prices-over-time", data.stocks,
         dict(task="trend", x="date", y="price", hue="symbol"), {"line"},
         "prices over 123 months per stock, one row each: lines of the values (common practice)",
         never={"stacked-bar", "area"}, stat="value"),
    case("one-stock-no-bars-per-date", lambda: data.stocks()[data.stocks().symbol == "AAPL"],
         dict(task="trend", x="date", y="price"), {"line"},
         "123 monthly prices: a line; bars per date would print 123 labels (common practice)"),
    case("employment-dates-as-text", data.employment,
         dict(task="trend", x="month", y="nonfarm"), {"line", "area"},
         "dates held as text are parsed and drawn as a time axis (common practice)"),
    case("daily-temperature-trend", data.seattle, dict(task="trend", x="date", y="temp_max"),
         {"line"}, "1,461 days: a line (common practice)", never={"bar"}),
    case("generation-by-source-over-years", data.electricity,
         dict(task="trend", x="year", y="net_generation", hue="source"), {"line", "area"},
         "three sources over 17 years: one line each (common practice)"),
    # --- the question asked ---------------------------------------------------------------
    case("no-split-nobody-asked-for", data.grunfeld_two_years,
         dict(task="compare", x="firm", y="invest"), BARS | {"box"},
         "asked to compare firms, plotwise must not add the year as a split "
         "(common practice)", never={"slope", "difference-bar"}),
    case("penguins-nothing-stated", data.penguins, dict(),
         {"scatter", "regression", "histogram", "box", "bar", "dot"},
         "with nothing stated, no trend of row counts over three years (common practice)",
         never={"line", "area"}),
    case("penguin-mass-by-species-and-year", data.penguins,
         dict(task="compare", x="species", y="body_mass_g", hue="year"),
         {"grouped-bar", "dot", "heatmap", "slope"},
         "a year with three values works as hue (common practice)"),
    # --- readable layouts -----------------------------------------------------------------
    case("56-states-no-pie", data.airports, dict(task="proportion", x="state"), BARS,
         "56 parts: no pie or 100% stack, bars of the largest (common practice)",
         never={"pie", "stacked-bar-100"}),
    case("fifty-states-rates", data.statecrime,
         dict(task="compare", x="state", y="murder"), BARS,
         "50 states on one axis: capped, readable (common practice)"),
    # --- the other tasks ------------------------------------------------------------------
    case("penguin-bill-vs-flipper", data.penguins,
         dict(task="correlate", x="flipper_length_mm", y="body_mass_g"),
         {"scatter", "regression"}, "two measures of 342 birds: scatter (Cleveland 1985)"),
    case("iris-petals-by-species", data.iris,
         dict(task="correlate", x="petal length (cm)", y="petal width (cm)", hue="species"),
         {"scatter", "regression"}, "three species as hue on a scatter (common practice)"),
    case("airport-coordinates", data.airports,
         dict(task="correlate", x="longitude", y="latitude"), {"scatter", "hexbin", "heatmap"},
         "1,350 points: a scatter, or bins when they overprint (common practice)"),
    case("large-cars-correlate", data.large_cars,
         dict(task="correlate", x="Horsepower", y="Miles_per_Gallon"),
         {"hexbin", "heatmap", "scatter"},
         "61,000 rows: bins beat an overplotted scatter (Carr et al. 1987)"),
    case("large-cars-compare", data.large_cars,
         dict(task="compare", x="Origin", y="Miles_per_Gallon"), BARS | {"box"},
         "a large frame: averages per origin (common practice)", stat="mean"),
    case("mpg-distribution", data.cars, dict(task="distribution", x="Miles_per_Gallon"),
         {"histogram", "density", "ecdf"}, "one measure's shape: a histogram "
         "(Freedman & Diaconis 1981 bins)"),
    case("affairs-zero-inflated", data.fair, dict(task="distribution", x="affairs"),
         {"histogram", "ecdf", "density", "box"},
         "two thirds zeros, skewness 8.8: say so (Bulmer 1979, from memory)", must={"skewed"}),
    case("flipper-by-species", data.penguins,
         dict(task="distribution", x="flipper_length_mm", hue="species"),
         {"histogram", "density", "box", "violin", "ecdf", "strip"},
         "three species' distributions (common practice)"),
    case("nile-trend", data.nile, dict(task="trend", x="year", y="volume"), {"line", "area"},
         "100 annual flows: a line (common practice)"),
    case("nile-nothing-but-x", data.nile, dict(task="trend", x="year"), {"line", "area"},
         "one row per year: the measure is the series itself, not a count of rows "
         "(common practice)", stat="value"),
    case("children-count-bar", data.fair, dict(task="distribution", x="children"),
         {"count-bar", "histogram"}, "a few whole numbers: one bar per value "
         "(common practice)"),
]
