"""Colour science for the engine: which colour scheme fits the data, whether a palette's colours
stay distinct under colour-vision deficiency, and whether a colormap's lightness is monotonic.

Simulation of colour-vision deficiency follows Machado, Oliveira & Fernandes (2009) as
implemented by the colorspacious library; distances are CAM02-UCS ΔE (colorspacious.deltaE)."""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from plotwise.engine.profile import few_integers
from plotwise.engine.rules import (
    DIVERGING_CMAP,
    DIVERGING_PALETTE,
    OKABE_ITO,
    ORDERED_PALETTE,
    SEQUENTIAL_CMAP,
    THRESHOLDS,
)
from plotwise.errors import PlotwiseError

CVD_TYPES = {"protanomaly": "protan (red-weak)", "deuteranomaly": "deutan (green-weak)",
             "tritanomaly": "tritan (blue-weak)"}


def hex_to_rgb(colour: str) -> tuple[float, float, float]:
    """sRGB in 0..1 from '#rrggbb' (or '#rrggbbaa'; alpha ignored). Colour names are turned into
    hex codes before they reach the engine (plotwise.drawing.colours)."""
    text = str(colour).strip()
    if not (text.startswith("#") and len(text) in (7, 9)):
        raise PlotwiseError(f"palette: {colour!r} is not a hex colour; give colours as names or "
                            "hex codes, e.g. ['#0072B2', '#E69F00'].")
    try:
        return tuple(int(text[i:i + 2], 16) / 255 for i in (1, 3, 5))  # type: ignore[return-value]
    except ValueError:
        raise PlotwiseError(f"palette: {colour!r} is not a hex colour.") from None


def to_rgb_array(colours) -> np.ndarray:
    return np.array([hex_to_rgb(c) for c in colours], dtype=float)


@dataclass
class Confusion:
    delta_e: float
    pair: tuple[str, str]
    vision: str  # "normal" or one of CVD_TYPES
    index: tuple[int, int] = (0, 0)


def closest_pair(colours, cvd: str | None = None, severity: int = 100) -> Confusion:
    """The two colours that look most alike (smallest CAM02-UCS ΔE), optionally as seen with
    a simulated colour-vision deficiency at the given severity (0-100)."""
    import colorspacious as cs

    rgb = to_rgb_array(colours)
    if cvd:
        space = {"name": "sRGB1+CVD", "cvd_type": cvd, "severity": severity}
        rgb = np.clip(cs.cspace_convert(rgb, space, "sRGB1"), 0, 1)
    best = Confusion(float("inf"), ("", ""), cvd or "normal")
    for i, j in itertools.combinations(range(len(rgb)), 2):
        d = float(cs.deltaE(rgb[i], rgb[j], input_space="sRGB1"))
        if d < best.delta_e:
            best = Confusion(d, (str(colours[i]), str(colours[j])), cvd or "normal", (i, j))
    return best


def worst_confusion(colours) -> Confusion | None:
    """Over normal vision and the three simulated deficiencies, the closest pair of colours."""
    if len(colours) < 2:
        return None
    return _worst(tuple(str(c) for c in colours))


@lru_cache(maxsize=256)
def _worst(colours: tuple[str, ...]) -> Confusion:
    found = [closest_pair(list(colours), cvd) for cvd in (None, *CVD_TYPES)]
    return min(found, key=lambda c: c.delta_e)


def lightness(rgb: np.ndarray) -> np.ndarray:
    """CAM02-UCS lightness J′ of an (n, 3) array of sRGB colours (a colormap's samples)."""
    import colorspacious as cs

    return cs.cspace_convert(np.asarray(rgb, dtype=float)[:, :3], "sRGB1", "CAM02-UCS")[:, 0]


@dataclass
class LightnessProfile:
    kind: str  # sequential | diverging | non-monotonic
    turns: int
    start: float
    end: float
    extreme_at: float | None
    asymmetry: float


def lightness_profile(rgb: np.ndarray) -> LightnessProfile:
    """Classify a colormap, given as 256 sRGB samples along it, by its lightness: monotonic
    (sequential), one turn in the middle with
    matched halves (diverging), or rising and falling (non-monotonic, like a rainbow).

    Lightness is smoothed over 9 of 256 steps before its turns are counted (our own rule)."""
    J = lightness(rgb)
    w = THRESHOLDS["lightness_smoothing"]
    smooth = np.convolve(J, np.ones(w) / w, mode="valid")
    steps = np.sign(np.diff(smooth))
    steps = steps[steps != 0]
    turns = np.nonzero(np.diff(steps))[0]
    asym = float(np.mean(np.abs(J - J[::-1])))
    at = float((turns[0] + w // 2) / (len(J) - 1)) if len(turns) else None
    if len(turns) == 0:
        kind = "sequential"
    elif (len(turns) == 1 and abs(at - 0.5) <= THRESHOLDS["diverging_centre"]
          and asym < THRESHOLDS["diverging_asymmetry"]
          and abs(J[0] - J[-1]) < THRESHOLDS["diverging_asymmetry"]):
        kind = "diverging"
    else:
        kind = "non-monotonic"
    return LightnessProfile(kind, len(turns), float(J[0]), float(J[-1]), at, asym)


def scheme_for(level: str, signed: bool = False, n_levels: int = 0) -> tuple[str, str]:
    """Which colour scheme the data wants, and why, in one sentence."""
    if level in ("nominal",):
        return ("categorical", f"categorical colours (Okabe & Ito 2008, safe for colour-vision "
                f"deficiencies) for {n_levels} unordered groups")
    if signed:
        return ("diverging", f"diverging colormap '{DIVERGING_CMAP}' centred on zero: the values "
                "are signed, so zero is a meaningful midpoint")
    return ("sequential", f"sequential colormap '{SEQUENTIAL_CMAP}': lightness rises steadily with "
            "the value (perceptually uniform; Smith & van der Walt 2015)")


def default_palette(n: int) -> list[str]:
    return list(OKABE_ITO[:n])


def ordered_palette(f) -> str | None:
    """The palette name for colouring the levels of ``f`` (a FieldProfile): sequential for an
    ordered scale, diverging for one with a neutral middle; None for unordered labels."""
    if f is not None and few_integers(f):
        return ORDERED_PALETTE
    if f is None or f.level != "ordinal" or not f.order:
        return None
    return DIVERGING_PALETTE if f.neutral_middle else ORDERED_PALETTE
