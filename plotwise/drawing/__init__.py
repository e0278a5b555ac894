"""Code generation and drawing: a Design becomes a pandas + seaborn snippet, run on a matplotlib Figure."""
