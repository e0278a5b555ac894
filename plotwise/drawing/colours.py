"""Colours as matplotlib and seaborn know them: colormap names resolved to Colormaps and sampled
for the engine's lightness check, colour names turned into hex codes, and the colours a design
draws for n groups (as the generated code picks them)."""

from __future__ import annotations

import numpy as np

from plotwise.engine.colour import ordered_palette
from plotwise.engine.design import Design
from plotwise.engine.rules import DIVERGING_CMAP, OKABE_ITO, SEQUENTIAL_CMAP
from plotwise.errors import PlotwiseError

CMAP_SAMPLES = 256


def resolve_cmap(cmap):
    """A matplotlib Colormap from a name (matplotlib's or seaborn's) or a Colormap object."""
    import matplotlib as mpl
    from matplotlib.colors import Colormap

    if isinstance(cmap, Colormap):
        return cmap
    if isinstance(cmap, str):
        if cmap in mpl.colormaps:
            return mpl.colormaps[cmap]
        try:
            import seaborn as sns

            return sns.color_palette(cmap, as_cmap=True)
        except (ValueError, TypeError):
            pass
    raise PlotwiseError(f"colormap {cmap!r} is not a matplotlib or seaborn colormap name; try "
                        f"'{SEQUENTIAL_CMAP}' (sequential) or '{DIVERGING_CMAP}' (diverging).")


def cmap_rgb(cmap) -> np.ndarray:
    """The colormap sampled at 256 evenly spaced points, as an (n, 3) sRGB array."""
    return np.asarray(resolve_cmap(cmap)(np.linspace(0, 1, CMAP_SAMPLES)))[:, :3]


def to_hex_list(colours) -> list[str]:
    """Colour names or codes as '#rrggbb' codes; a PlotwiseError for anything else."""
    from matplotlib.colors import to_hex

    try:
        return [to_hex(c) for c in colours]
    except ValueError as exc:
        raise PlotwiseError(f"palette: {exc}; give colours as names or hex codes, e.g. "
                            "['#0072B2', '#E69F00'].") from None


def drawn_colours(d: Design, n: int) -> list[str]:
    """The colours a design draws for n groups (as codegen picks them)."""
    pal = d.options.palette
    if pal:
        return [pal[i % len(pal)] for i in range(n)]
    named = ordered_palette(d.profile.fields.get(d.encoding.get("hue") or "")) if d.profile else None
    if named:
        import seaborn as sns

        return [to_hex_list([c])[0] for c in sns.color_palette(named, n)]
    if n <= len(OKABE_ITO):
        return list(OKABE_ITO[:n])
    import seaborn as sns

    return [f"#{int(r * 255):02x}{int(g * 255):02x}{int(b * 255):02x}"
            for r, g, b in sns.color_palette("husl", n)]
