"""Exact group statistics of engine data: what design_stats() asks the engine for."""

from __future__ import annotations

import pandas as pd

from plotwise.sources.base import Source
from plotwise.sources.queries import _fresh, complete_rows, count_name, grouped_expr


class EngineStats:
    """The exact numbers design_stats() asks of engine data (complete rows, grouped counts, sums
    and sums of squares), each computed once by the engine and kept."""

    def __init__(self, src: Source, profile):
        self.src = src
        self.profile = profile
        self._cache: dict = {}

    def _finite(self, cols) -> tuple:
        return tuple(c for c in cols if self.profile.fields[c].level == "quantitative"
                     and self.profile.fields[c].minimum is not None)

    def complete(self, cols: list[str]) -> int:
        key = ("complete", tuple(cols))
        if key not in self._cache:
            base = complete_rows(self.src, cols, self._finite(cols))
            expr = (f"len({base})" if self.src.engine == "dask" else
                    f'int({base}.select(nw.len()).collect("pandas").to_native().iloc[0, 0])')
            self._cache[key] = self.src.run(expr)
        return self._cache[key]

    def table(self, keys: list[str], y: str | None, others: tuple = ()) -> pd.DataFrame:
        """Per group of ``keys`` (after plotwise's column conversions): count, sum, sumsq;
        rows are those complete in keys, y and ``others``."""
        cache_key = ("table", tuple(keys), y, tuple(others))
        if cache_key in self._cache:
            return self._cache[cache_key]
        from plotwise.engine.working import working_frame

        cols = list(dict.fromkeys(keys + list(others)))
        fin = y is not None and bool(self._finite([y]))
        raw = self.src.run(grouped_expr(self.src, cols, y, squares=y is not None, finite=fin))
        n = count_name(cols, y)
        w = working_frame(raw, self.profile, keys)
        w["count"] = raw[n].to_numpy(dtype=float)
        if y is not None:
            sq = _fresh(f"{y}_squares", set(cols + [y]))
            w["sum"] = raw[y].to_numpy(dtype=float)
            w["sumsq"] = raw[sq].to_numpy(dtype=float)
        t = w.dropna(subset=keys).groupby(keys, observed=True, sort=True).sum()
        self.src.note("totals, means and group sizes from all rows")
        self._cache[cache_key] = t
        return t

    def grouped(self, x: str, y: str | None, others: tuple = ()):
        """Like plotwise.engine.stats.grouped(), from the engine: a GroupSums."""
        from plotwise.engine.stats import GroupSums

        t = self.table([x], y, others)
        g = GroupSums(t.index, t["count"].to_numpy())
        if y is not None:
            g.sum = t["sum"].to_numpy()
            g.sumsq = t["sumsq"].to_numpy()
        return g

    def medians(self, x: str, y: str, others: tuple = ()) -> pd.Series:
        """The median of ``y`` per group of ``x``, computed by the engine (rows complete in x, y
        and ``others``)."""
        from plotwise.engine.working import working_frame

        raw = self.src.run(grouped_expr(self.src, [x], y, stat="median",
                                        finite=bool(self._finite([y])), complete_in=others))
        w = working_frame(raw, self.profile, [x])
        w["median"] = raw[y].to_numpy(dtype=float)
        # One row per group unless x has several raw values for one label (text parsed as the
        # same date, say): then the median of their medians, a close stand-in.
        return w.dropna(subset=[x]).groupby(x, observed=True, sort=True)["median"].median()

    def unique_keys(self, keys: list[str], y: str) -> bool:
        """Does every group of ``keys`` hold exactly one complete row?"""
        t = self.table(keys, None, (y,))
        return bool(len(t) and t["count"].max() == 1)
