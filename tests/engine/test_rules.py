"""The channel tables and scores reproduce the published rankings."""

import pandas as pd
import pytest

from plotwise import Design, profile_frame
from plotwise.engine.design import DesignOptions
from plotwise.engine.rules import MACKINLAY_1986
from plotwise.engine.scoring import channel_score, effectiveness

PROFILE = profile_frame(pd.DataFrame({"g": list("abcdab") * 3, "h": list("xy") * 9,
                                      "v": [float(i) for i in range(18)]}))


def _eff(kind, encoding, roles=None, **options):
    d = Design(kind, "compare", encoding, roles or {"measure": "v", "category": "g"}, x="g",
               y="v", options=DesignOptions(**options))
    return effectiveness(d, PROFILE)[0]


def test_scorer_ranks_a_measure_by_mackinlay_quantitative_order():
    # Mackinlay (1986), quantitative column (../shared/reference.md section 1): position (1st) >
    # length (2nd) > density / grey level (7th). Designs that differ only in the measure's channel
    # (the category stays on x position): the scorer must rank them in that order.
    position = _eff("dot", {"x position": "g", "y position": "v"})
    length = _eff("bar", {"x position": "g", "length": "v"})
    lightness = _eff("heatmap", {"x position": "g", "lightness": "v"})
    assert position > length > lightness


def test_scorer_ranks_a_category_by_mackinlay_nominal_order():
    # Mackinlay (1986), nominal column: position (1st) > colour hue (2nd). The measure stays on
    # length; only the category's channel differs.
    on_position = _eff("bar", {"x position": "g", "length": "v"})
    on_hue = _eff("bar", {"hue": "g", "length": "v"})
    assert on_position > on_hue


def test_mackinlay_ordinal_and_nominal_order():
    # Mackinlay (1986), ordinal and nominal columns.
    assert MACKINLAY_1986["ordinal"][:4] == ("position", "density", "colour saturation", "colour hue")
    assert MACKINLAY_1986["ordinal"][-1] == "shape"
    assert MACKINLAY_1986["nominal"][:5] == ("position", "colour hue", "texture", "connection",
                                             "containment")
    assert MACKINLAY_1986["nominal"][-5:] == ("length", "angle", "slope", "area", "volume")
    for level, table in MACKINLAY_1986.items():
        assert len(table) == len(set(table)) == 13, level


def test_scores_follow_mackinlay_for_quantities():
    # Mackinlay (1986): position > length > angle > area > density(lightness) > colour hue.
    order = ["x position", "length", "angle", "area", "lightness", "hue"]
    scores = [channel_score("quantitative", ch) for ch in order]
    assert scores == sorted(scores, reverse=True)
    assert len(set(scores)) == len(scores)


def test_scores_follow_cleveland_mcgill():
    # Cleveland & McGill (1984): position (level 1) beats length/angle (level 3) beats area
    # (level 4) beats shading/saturation (level 6).
    assert channel_score("quantitative", "x position") > channel_score("quantitative", "length") \
        > channel_score("quantitative", "area") > channel_score("quantitative", "lightness")


def test_scorer_puts_non_aligned_segments_below_aligned_bars():
    # Cleveland & McGill (1984): judgements of position along non-aligned scales are less
    # accurate than along a common scale; stacked segments (shifting baselines) must score
    # below grouped bars with the same encoding.
    enc = {"x position": "g", "length": "v", "hue": "h"}
    roles = {"measure": "v", "category": "g", "hue": "h"}
    aligned = _eff("grouped-bar", enc, roles)
    stacked = _eff("stacked-bar", enc, roles, non_aligned=True)
    assert stacked < aligned


def test_nominal_hue_beats_length_for_categories():
    # Mackinlay (1986): for nominal data colour hue is 2nd, length 9th.
    assert channel_score("nominal", "hue") > channel_score("nominal", "length")
    # ...but for quantities, length (2nd) beats hue (9th).
    assert channel_score("quantitative", "length") > channel_score("quantitative", "hue")


@pytest.mark.parametrize("level", ["quantitative", "ordinal", "nominal"])
def test_score_range(level):
    for ch in ("x position", "length", "angle", "area", "hue", "lightness", "facet"):
        assert 0.0 <= channel_score(level, ch) <= 1.0
    assert channel_score(level, "y position") == 1.0
