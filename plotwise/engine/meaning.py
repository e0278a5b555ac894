"""What a numeric column means as a measure: does it add up (counts, money, quantities — totals
mean something), or does it describe each item (rates, percentages, averages, scores, sizes,
coordinates — only averages mean something)? Or is it no measure at all (a row identifier, a 0/1
flag, a constant)?

Data evidence comes first (bounds, ranges, running integers), names second; the reason recorded
on the FieldProfile says which. Every rule here is common practice unless it names a source."""

from __future__ import annotations

import re
from typing import TYPE_CHECKING, Literal

import numpy as np

from plotwise.engine.rules import (
    ADDITIVE_NAME_HINTS,
    IDENTIFIER_NAME_HINTS,
    INTERVAL_NAME_HINTS,
    NON_ADDITIVE_NAME_HINTS,
    SHARE_NAME_HINTS,
)

if TYPE_CHECKING:
    from plotwise.engine.profile import FieldProfile

Measure = Literal["additive", "non-additive", "unknown", "identifier", "flag", "constant"]

# Name prefixes of percentage columns ('percollege', 'PERBLACK', 'pctwhite'); only with values
# within 0–100 (common practice).
PERCENT_PREFIXES = ("per", "pct", "pc")

# Words that start like a percentage name but are not one (common practice).
NOT_PERCENT_WORDS = ("period", "periods", "person", "persons", "personal", "people", "perimeter",
                     "performance", "permit", "permits", "perch", "pcs")


def _percent_word(token: str) -> bool:
    """'pct', or a word glued to a percentage prefix ('percollege', 'perblack', 'pctwhite');
    'per' alone means 'for each' (miles per gallon) and is not one."""
    if token == "pct":
        return True
    return (token.startswith(PERCENT_PREFIXES) and len(token) >= 5
            and token not in NOT_PERCENT_WORDS)


# Columns whose role as a measure is ruled out.
NOT_MEASURES = ("identifier", "flag", "constant")


def name_tokens(label: str) -> list[str]:
    """Lower-case words of a column name, split at non-letters and at camelCase humps
    ('lifeExp' → life, exp; 'Miles_per_Gallon' → miles, per, gallon)."""
    spaced = re.sub(r"(?<=[a-z])(?=[A-Z])", " ", label)
    return [t for t in re.split(r"[^0-9a-zA-Z]+", spaced.lower()) if t]


def name_says(label: str, hints) -> str | None:
    """The first hint the name carries: a whole word, or the start of a word for hints of four
    letters or more ('investment' carries 'invest'); hints with symbols match anywhere."""
    tokens = name_tokens(label)
    low = label.lower()
    for hint in hints:
        if not hint.isalnum():
            if hint in low:
                return hint
        elif hint in tokens or (len(hint) >= 4 and any(t.startswith(hint) for t in tokens)):
            return hint
    return None


def classify_measure(fp: FieldProfile, finite: np.ndarray) -> tuple[Measure, str]:
    """The measure kind of a numeric column and the evidence for it, in words."""
    uniq = np.unique(finite)
    if len(uniq) <= 1:
        return "constant", "one value in every row: not a measure"
    if len(uniq) == 2 and set(uniq.tolist()) <= {0.0, 1.0}:
        return "flag", "0/1 values: a flag, whose mean is a rate"
    running = (fp.is_integer and len(uniq) == len(finite) and len(finite) > 20
               and uniq[-1] - uniq[0] + 1 <= 1.05 * len(uniq))
    id_name = name_says(fp.label, IDENTIFIER_NAME_HINTS)
    if running:
        return "identifier", "running integers, one per row: a row identifier, not a measure"
    if id_name and fp.is_integer and len(uniq) > 0.5 * len(finite):
        return "identifier", f"name says '{id_name}' and nearly every row differs: a code"
    data = _data_evidence(fp, uniq)
    if data:
        return "non-additive", data
    hint = name_says(fp.label, NON_ADDITIVE_NAME_HINTS)
    if hint:
        return "non-additive", f"name says '{hint}': a per-item measure, averaged"
    hint = name_says(fp.label, ADDITIVE_NAME_HINTS)
    if hint and fp.minimum is not None and fp.minimum >= 0:
        return "additive", f"name says '{hint}': totals mean something"
    return "unknown", "no evidence whether totals mean something"


def _data_evidence(fp: FieldProfile, uniq: np.ndarray) -> str | None:
    lo, hi = float(uniq[0]), float(uniq[-1])
    share_name = name_says(fp.label, SHARE_NAME_HINTS)
    if share_name and lo >= 0 and hi <= 100:
        return f"values within 0–{'1' if hi <= 1 else '100'} and the name says '{share_name}': a share"
    per = next((t for t in name_tokens(fp.label) if _percent_word(t)), None)
    if per and lo >= 0 and hi <= 100:
        return f"values within 0–100 and the name '{per}' reads as a percentage"
    if lo >= 0 and hi <= 1 and not fp.is_integer:
        return "fractions between 0 and 1: a rate or share of each item"
    coord = name_says(fp.label, ("lat", "latitude", "lon", "lng", "long", "longitude"))
    if coord and -180 <= lo and hi <= 180:
        return f"values within ±180 and the name says '{coord}': a coordinate"
    interval = name_says(fp.label, INTERVAL_NAME_HINTS)
    if interval:
        return f"name says '{interval}': an interval scale, whose sums mean nothing"
    return None


def adds_up(fp: FieldProfile | None) -> bool:
    """Totals of this measure mean something (a count or an additive quantity)."""
    return fp is None or fp.measure == "additive"


def is_non_additive(fp: FieldProfile | None) -> bool:
    return fp is not None and fp.measure in ("non-additive", "flag")


def measure_reason(fp: FieldProfile, stat: str, agg: str | None) -> str | None:
    """Why a design draws the totals or the averages of its measure, in one sentence."""
    if stat not in ("sum", "mean") or fp.measure is None:
        return None
    if agg:
        return f"{'totals' if stat == 'sum' else 'averages'} of '{fp.label}': as asked (agg='{agg}')"
    if stat == "sum":
        return f"totals of '{fp.label}': it adds up ({fp.measure_why})"
    why = fp.measure_why if fp.measure != "unknown" else ("whether its totals mean something is "
                                                          "not known, so averages (say agg='sum' "
                                                          "if they do)")
    return f"averages of '{fp.label}', not totals: {why}"
