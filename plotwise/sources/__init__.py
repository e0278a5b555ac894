"""Data held by an engine (Polars, PyArrow, DuckDB, Dask, Spark) or a Parquet/CSV file."""
