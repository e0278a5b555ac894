"""A one-sentence headline computed from the data, offered when a single number says it better
than a chart: the biggest share, the biggest and smallest value, the biggest change between two
time points. Percentages of a whole change in percentage points, never in percent."""

from __future__ import annotations

import pandas as pd

from plotwise.engine.working import aggregate


def fmt(v: float) -> str:
    # 12 significant digits first: sums added in another order (an engine's) print the same
    v = float(f"{v:.12g}")
    a = abs(v)
    if a >= 1000:
        return f"{v:,.0f}"
    if a >= 10:
        return f"{v:,.1f}".rstrip("0").rstrip(".")
    return f"{v:.3g}"


def label(k) -> str:
    """A category as the reader knows it: whole numbers stored as floats without '.0'."""
    if isinstance(k, float) and k.is_integer():
        return f"{k:.0f}"
    return str(k)


def pct(v: float) -> str:
    return f"{v:.1f}%"


def proportion_headline(vals: pd.Series, y: str | None, share_like: bool) -> str | None:
    if len(vals) < 2 or (vals < 0).any():
        return None
    total = float(vals.sum())
    if total <= 0:
        return None
    top = label(vals.idxmax())
    share = float(vals.max()) / total * 100
    what = f"'{y}'" if y else "rows"
    if share_like and abs(total - 100) <= 0.5 * len(vals):
        return f"'{top}' is the largest part: {pct(float(vals.max()))} of the whole ({what} as given)."
    return (f"'{top}' is the largest part: {fmt(float(vals.max()))} of {fmt(total)} "
            f"{what} in all, {pct(share)} of the whole.")


def compare_headline(vals: pd.Series, y: str | None, stat_word: str) -> str | None:
    if len(vals) < 2:
        return None
    hi, lo = label(vals.idxmax()), label(vals.idxmin())
    vhi, vlo = float(vals.max()), float(vals.min())
    what = f"{stat_word} '{y}'".strip() if y else "number of rows"
    if vhi == vlo:
        return f"All {len(vals)} groups have the same {what} ({fmt(vhi)})."
    if vlo > 0:
        return (f"'{hi}' has the highest {what} ({fmt(vhi)}), {vhi / vlo:.1f}× that of '{lo}', "
                f"the lowest ({fmt(vlo)}).")
    return (f"'{hi}' has the highest {what} ({fmt(vhi)}), {fmt(vhi - vlo)} more than '{lo}', "
            f"the lowest ({fmt(vlo)}).")


def change_headline(w: pd.DataFrame, group: str, period: str, y: str, stat: str,
                    share_like: bool) -> str | None:
    t = aggregate(w, [group, period], y, stat).unstack(period).dropna()
    if t.shape[1] != 2 or len(t) == 0:
        return None
    c1, c2 = t.columns
    change = t[c2] - t[c1]
    key = change.abs().idxmax()
    a, b, c = float(t.loc[key, c1]), float(t.loc[key, c2]), float(change[key])
    g, first, second = label(key), label(c1), label(c2)
    if share_like:
        return (f"'{g}' changed most: '{y}' went from {pct(a)} to {pct(b)} between {first} and "
                f"{second} ({c:+.1f} percentage points).")
    rel = f", {c / a:+.1%}" if a > 0 else ""
    return (f"'{g}' changed most: '{y}' went from {fmt(a)} to {fmt(b)} between {first} and "
            f"{second} ({'+' if c >= 0 else '−'}{fmt(abs(c))}{rel}).")
