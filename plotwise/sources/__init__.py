"""Data held by an engine (Polars, PyArrow, DuckDB, Dask, Spark) or a Parquet/CSV file: where it
lives (base), the queries as source text (queries), its profile (profiling) and the exact group
statistics the advice asks for (stats). pandas frames never come here."""

from plotwise.sources.base import Source, is_engine_data, open_source
from plotwise.sources.profiling import profile_source
from plotwise.sources.stats import EngineStats

__all__ = ["EngineStats", "Source", "is_engine_data", "open_source", "profile_source"]
