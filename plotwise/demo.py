"""Demo data: an invented harbour ferry network ("Oskavel Water"), generated reproducibly.

Twelve piers, a skewed fare revenue per sailing, a two-peaked crossing time (express and
regular boats), a daily passenger series with a three-week dock closure, a fare-type breakdown
that adds to 100%, passenger counts for each pier in two seasons, and wind speed against
delay; and for the surprises, a fleet list (one boat filed under the wrong class, one listed
twice), a daily fuel log (a new engine lowers the level; a sensor writes -999) and parcel masses
(one depot weighs in grams). Everything here is made up by this code; it is for the demo only,
never for tests of the method (those use published data, see tests/)."""

from __future__ import annotations

import numpy as np
import pandas as pd

# Invented names (checked to be nobody's line, pier or company that we know of).
PIERS = ("Brannoch Quay", "Ostrel Point", "Vennick Steps", "Calvenna Slip", "Drewmoor Wharf",
         "Pelgrin Bay", "Hasket Rock", "Vimmery Pier", "Corrowen Isle", "Ambervane Quay",
         "Luttering Landing", "Quenmarch Steps")
NETWORK = "Oskavel Water"
FARE_TYPES = ("single", "return", "day pass", "commuter card", "concession")


def sailings(seed: int = 7, n: int = 2400) -> pd.DataFrame:
    """One row per sailing."""
    rng = np.random.default_rng(seed)
    popularity = np.linspace(2.0, 0.4, len(PIERS))
    pier = rng.choice(len(PIERS), size=n, p=popularity / popularity.sum())
    express = rng.random(n) < 0.45
    minutes = np.where(express, rng.normal(14, 2.0, n), rng.normal(31, 3.5, n)).round(1)
    passengers = rng.poisson(40 + 25 * popularity[pier])
    fare = rng.lognormal(mean=np.log(3.2) + 0.25 * popularity[pier], sigma=0.6, size=n)
    revenue = (passengers * fare).round(2)
    wind = rng.gamma(3.0, 4.0, n).round(1)
    delay = np.clip(0.15 * wind ** 1.4 + rng.normal(0, 3, n), 0, None).round(1)
    day = pd.Timestamp("2025-03-01") + pd.to_timedelta(rng.integers(0, 180, n), unit="D")
    return pd.DataFrame({
        "pier": pd.Categorical(np.array(PIERS)[pier]).astype(str),
        "sailed_on": day,
        "boat": np.where(express, "express", "regular"),
        "crossing_minutes": minutes,
        "passengers": passengers,
        "fare_revenue": revenue,
        "wind_knots": wind,
        "delay_minutes": delay,
    })


def daily_passengers(seed: int = 11) -> pd.DataFrame:
    """Passengers per day over two years, with a 21-day dock closure left out of the data."""
    rng = np.random.default_rng(seed)
    days = pd.date_range("2024-01-01", "2025-12-31", freq="D")
    t = np.arange(len(days))
    season = 1 + 0.35 * np.sin(2 * np.pi * (t - 100) / 365.25)
    weekly = np.where(days.day_of_week >= 5, 1.25, 1.0)
    level = 4200 * (1 + 0.0004 * t) * season * weekly
    passengers = rng.poisson(level)
    df = pd.DataFrame({"day": days, "passengers": passengers})
    closed = (df["day"] >= "2025-02-03") & (df["day"] < "2025-02-24")
    return df.loc[~closed].reset_index(drop=True)


def fare_mix() -> pd.DataFrame:
    """Share of tickets by fare type (adds to 100)."""
    return pd.DataFrame({"fare_type": list(FARE_TYPES),
                         "share_pct": [38.5, 24.0, 17.5, 14.0, 6.0]})


def survey_reasons() -> pd.DataFrame:
    """Why riders chose the ferry; several answers allowed, so shares add to more than 100."""
    return pd.DataFrame({"reason": ["speed", "price", "view", "no parking", "habit"],
                         "share_pct": [52.0, 41.0, 23.0, 19.0, 12.0]})


def season_passengers(seed: int = 5) -> pd.DataFrame:
    """Average weekday passengers per pier in summer 2024 and summer 2025."""
    rng = np.random.default_rng(seed)
    base = rng.uniform(300, 1500, len(PIERS)).round()
    change = rng.normal(1.05, 0.15, len(PIERS))
    rows = []
    for p, b, c in zip(PIERS, base, change):
        rows.append({"pier": p, "season": "summer 2024", "weekday_passengers": b})
        rows.append({"pier": p, "season": "summer 2025", "weekday_passengers": round(b * c)})
    df = pd.DataFrame(rows)
    df["season"] = pd.Categorical(df["season"], ["summer 2024", "summer 2025"], ordered=True)
    return df


def fleet(seed: int = 3) -> pd.DataFrame:
    """One row per boat: hull length and top speed by class. Boat 'OW-17' is an express boat
    filed as regular, and 'OW-30' is listed twice."""
    rng = np.random.default_rng(seed)
    n = 48
    express = np.arange(n) % 2 == 0
    hull = np.where(express, rng.normal(24, 1.5, n), rng.normal(38, 2.5, n)).round(2)
    speed = np.where(express, rng.normal(31, 1.8, n), rng.normal(18, 1.5, n)).round(2)
    df = pd.DataFrame({"boat_class": np.where(express, "express", "regular"),
                       "hull_m": hull, "top_knots": speed},
                      index=[f"OW-{i:02d}" for i in range(n)])
    df.loc["OW-16", "boat_class"] = "regular"  # filed under the wrong class
    df.index.name = "boat"
    return pd.concat([df, df.loc[["OW-30"]]])  # listed twice


def fuel_log(seed: int = 9) -> pd.DataFrame:
    """Fuel burnt per day by one boat; a new engine fitted on 2025-06-02 burns about 15% less,
    and on one day the sensor wrote its missing-value code -999."""
    rng = np.random.default_rng(seed)
    days = pd.date_range("2025-03-01", periods=200, freq="D")
    litres = rng.normal(820, 25, len(days))
    litres[days >= "2025-06-02"] *= 0.85
    litres = litres.round(1)
    litres[57] = -999.0
    return pd.DataFrame({"day": days, "fuel_litres": litres})


def parcels(seed: int = 21) -> pd.DataFrame:
    """Parcel masses per depot; the Vennick Steps depot records grams, the others kilograms,
    and one Ostrel Point parcel was typed with an extra digit."""
    rng = np.random.default_rng(seed)
    depots = np.array(["Brannoch Quay", "Ostrel Point", "Vennick Steps", "Hasket Rock"])
    depot = rng.choice(depots, 400)
    mass = rng.lognormal(np.log(4.0), 0.2, 400).round(2)
    grams = depot == "Vennick Steps"
    mass[grams] = (mass[grams] * 1000).round()
    first = int(np.flatnonzero(depot == "Ostrel Point")[0])
    mass[first] = 41.0  # 4.1 kg typed with an extra digit
    return pd.DataFrame({"depot": depot, "parcel_mass": mass})


def demo_data() -> dict[str, pd.DataFrame]:
    """All demo frames by name."""
    return {"sailings": sailings(), "daily": daily_passengers(), "fares": fare_mix(),
            "survey": survey_reasons(), "seasons": season_passengers(), "fleet": fleet(),
            "fuel": fuel_log(), "parcels": parcels()}


# The tour of the five tasks: (title, frame name, task, x, y, hue).
TOUR = (
    ("compare", "sailings", "compare", "pier", "fare_revenue", None),
    ("trend", "daily", "trend", "day", "passengers", None),
    ("proportion", "fares", "proportion", "fare_type", "share_pct", None),
    ("correlate", "sailings", "correlate", "wind_knots", "delay_minutes", None),
    ("distribution", "sailings", "distribution", "crossing_minutes", None, None),
)
# More cases that show hazards being caught: (title, frame name, task, x, y, hue).
HAZARD_TOUR = (
    ("survey-shares", "survey", "proportion", "reason", "share_pct", None),
    ("crossing-by-pier", "sailings", "compare", "pier", "crossing_minutes", None),
    ("two-summers", "seasons", "compare", "pier", "weekday_passengers", "season"),
)

# Data with something to look at twice: (title, frame name, task, x, y, hue).
SURPRISE_TOUR = (
    ("mislabelled-boat", "fleet", "correlate", "hull_m", "top_knots", "boat_class"),
    ("new-engine", "fuel", "trend", "day", "fuel_litres", None),
    ("parcel-units", "parcels", "compare", "depot", "parcel_mass", None),
)


def main(argv=None) -> int:
    import argparse
    from pathlib import Path

    from plotwise.notebook.display import advice_html, figure_png
    from plotwise.pipeline import advise

    parser = argparse.ArgumentParser(description="Write plotwise's demo charts and summary.")
    parser.add_argument("out", nargs="?", default="build/demo", help="output folder")
    args = parser.parse_args(argv)
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    data = demo_data()
    sections, texts = [], []
    for title, frame, task, x, y, hue in TOUR + HAZARD_TOUR + SURPRISE_TOUR:
        advice = advise(data[frame], task, x=x, y=y, hue=hue)
        png = figure_png(advice.show())
        (out / f"{title}.png").write_bytes(png)
        sections.append(f"<h2>{title}: {frame}</h2>" + advice_html(advice, png=png, profile=False))
        texts.append(f"=== {title} ({frame}) ===\n{advice.text()}\n")
        print(f"{title:>16}: {', '.join(d.title for d in advice.shown())}; hazards: "
              f"{', '.join(advice.hazard_codes()) or 'none'}; surprises: "
              f"{', '.join(dict.fromkeys(advice.surprise_codes())) or 'none'}")
    (out / "summary.html").write_text(
        "<!doctype html><meta charset='utf-8'><title>plotwise demo</title>"
        f"<h1>plotwise demo: {NETWORK} ferries</h1>" + "".join(sections), encoding="utf-8")
    (out / "summary.txt").write_text("\n".join(texts), encoding="utf-8")
    shown = len(TOUR) + len(HAZARD_TOUR) + len(SURPRISE_TOUR)
    print(f"wrote {shown} PNGs, summary.html and summary.txt to {out.resolve()}")
    return 0


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
