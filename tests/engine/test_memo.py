"""A frame memo (what a panel keeps between questions on one frame): the same advice as without
it, the frame profiled once, and nothing reused once the frame's shape or dtypes change."""

import numpy as np
import pandas as pd
from open_data import grunfeld

import plotwise
import plotwise.pipeline as pipeline
from plotwise.engine.memo import FrameMemo, fingerprint, using


def summary(a):
    return ([(d.kind, d.task, d.x, d.y, d.hue, d.score) for d in a.designs],
            [(h.code, h.message) for h in a.hazards],
            [(s.code, s.message) for s in a.surprises], a.headline)


QUESTIONS = [("compare", dict(x="firm", y="invest")), ("trend", dict(x="year", y="value")),
             ("distribution", dict(x="capital")), ("correlate", dict(x="value", y="invest")),
             ("compare", dict(x="firm", y="value"))]


def test_memo_gives_the_same_advice_and_profiles_once(monkeypatch):
    d = grunfeld()  # statsmodels' Grunfeld investment data
    plain = [summary(plotwise.advise(d, t, **kw)) for t, kw in QUESTIONS]
    opened = []
    real = pipeline.open_data
    monkeypatch.setattr(pipeline, "open_data", lambda df: opened.append(1) or real(df))
    memo = FrameMemo(d)
    with using(memo, d):
        kept = [summary(plotwise.advise(d, t, **kw)) for t, kw in QUESTIONS]
    assert kept == plain
    assert len(opened) == 1  # one profile for five questions
    assert memo.hits >= len(QUESTIONS) - 1


def test_a_changed_frame_is_profiled_afresh(monkeypatch):
    d = grunfeld()
    memo = FrameMemo(d)
    with using(memo, d):
        before = plotwise.advise(d, "compare", x="firm", y="invest")
    d["invest"] = d["invest"].astype("float32")  # a dtype changes: the fingerprint too
    assert not memo.valid_for(d)
    with using(memo, d):
        after = plotwise.advise(d, "compare", x="firm", y="invest")
    assert after.fields["invest"].dtype == "float32" != before.fields["invest"].dtype
    other = d.copy()  # another object with equal contents is another frame
    assert fingerprint(other) != fingerprint(d) and not memo.valid_for(other)


def test_repeated_rows_found_through_the_row_hash_match_pandas():
    # pandas' own DataFrame.duplicated is the reference; hashing only narrows the rows compared.
    rng = np.random.default_rng(3)
    d = pd.DataFrame({"g": rng.choice(list("abc"), 400), "v": rng.integers(0, 5, 400),
                      "w": rng.integers(0, 4, 400).astype(float)})
    d.loc[[7, 90], "w"] = np.nan
    from plotwise.engine.surprises import _exact_repeats

    pos, twin = _exact_repeats(d)
    expected = np.flatnonzero(d.duplicated().to_numpy())
    np.testing.assert_array_equal(pos, expected)
    first = d.iloc[expected[0]]
    assert (d.iloc[twin].fillna(-1) == first.fillna(-1)).all() and twin < expected[0]
    mixed = pd.DataFrame({"a": [[1], 2.5, [1], 2.5], "b": [1, 2, 1, 2]})  # unhashable: no answer
    assert _exact_repeats(mixed) is None
