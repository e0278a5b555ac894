"""The engine: profile → roles → candidates → scoring → hazards → headline. Imports no
matplotlib, seaborn, notebook or engine-data code."""
