"""Hazard checks: what would make a chart of this data mislead, with a concrete fix.

Each check is a plain function registered in HAZARD_CHECKS with its code and a one-line
description (the README's table is generated from the same registry). A check receives the
HazardContext and returns a list of Hazard. Checks marked per_design run once per design and
the hazards are attached to that design; the others run once per advice."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from plotwise.engine.design import Design
from plotwise.engine.profile import Profile
from plotwise.engine.stats import DesignStats
from plotwise.engine.vocab import SEVERITIES, checked, severity_rank


@dataclass
class Finding:
    """What a check found: a stable code, a severity and a message naming columns and numbers
    (the common part of a Hazard and a Surprise)."""

    code: str
    severity: str  # a Severity: info | warn | severe
    message: str

    def __post_init__(self) -> None:
        checked(self.severity, SEVERITIES, "severity")


@dataclass
class Hazard(Finding):
    fix: str = ""
    kinds: tuple[str, ...] = ()  # design kinds concerned; empty = the data as a whole
    columns: tuple[str, ...] = ()

    def __str__(self) -> str:
        return f"[{self.severity}] {self.code}: {self.message} Fix: {self.fix}"


@dataclass
class HazardContext:
    df: pd.DataFrame
    profile: Profile
    task: str
    x: str | None
    y: str | None
    hue: str | None
    stat: str
    stats: DesignStats
    value_range: tuple[float, float] | None = None
    palette: list[str] | None = None
    cmap: object = None  # the caller's colormap as given (its name, or a Colormap)
    cmap_rgb: np.ndarray | None = None  # that colormap sampled as an (n, 3) array of sRGB values
    colours: Callable[[Design, int], list] | None = None  # set by drawing
    design: Design | None = None  # set for per-design checks
    working: pd.DataFrame | None = field(default=None, repr=False)


@dataclass(frozen=True)
class HazardCheck:
    code: str
    description: str
    func: Callable[[HazardContext], list[Hazard]]
    per_design: bool


HAZARD_CHECKS: list[HazardCheck] = []


def check(code: str, description: str, per_design: bool = False):
    def register(func):
        HAZARD_CHECKS.append(HazardCheck(code, description, func, per_design))
        return func
    return register


def by_severity(hazards: list[Hazard]) -> list[Hazard]:
    """Most severe first (stable within a severity): the one order of advice and audit."""
    return sorted(hazards, key=lambda h: -severity_rank(h.severity))

