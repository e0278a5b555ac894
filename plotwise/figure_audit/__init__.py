"""Audit of figures that are already drawn, with the engine's Hazard registry."""
