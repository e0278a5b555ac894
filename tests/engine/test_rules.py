"""The channel tables and scores reproduce the published rankings."""

import pytest

from plotwise.engine.rules import CLEVELAND_MCGILL_1984, MACKINLAY_1986
from plotwise.engine.scoring import channel_score


def test_mackinlay_quantitative_order():
    # Mackinlay (1986), quantitative column, as in ../shared/reference.md section 1.
    assert MACKINLAY_1986["quantitative"] == (
        "position", "length", "angle", "slope", "area", "volume", "density",
        "colour saturation", "colour hue", "texture", "connection", "containment", "shape")


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
    levels = {t: i for i, group in enumerate(CLEVELAND_MCGILL_1984) for t in group}
    assert levels["position along a common scale"] < levels["length"] < levels["area"] < levels["shading"]
    assert channel_score("quantitative", "x position") > channel_score("quantitative", "length") \
        > channel_score("quantitative", "area") > channel_score("quantitative", "lightness")


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
