"""Generated code quotes every user string as an inert literal, and HTML escapes them."""

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest

import plotwise

HOSTILE = [
    "<img src=x onerror=alert(1)>",
    "'); SENTINEL['hit'] = True; ('",
    '"); SENTINEL["hit"] = True; ("',
    "line one\nSENTINEL['hit'] = True\n",
    "back\\slash\\' quote",
    "x" * 300,
    "\r\nSENTINEL['hit'] = True #",
    "{SENTINEL}",
]


@pytest.mark.parametrize("name", HOSTILE)
@pytest.mark.parametrize("task", ["compare", "distribution", "trend"])
def test_hostile_column_names_stay_inert(name, task):
    rng = np.random.default_rng(0)
    cat = f"{name} [cat]"
    df = pd.DataFrame({
        cat: np.array([f"{name} {i}" for i in range(4)])[rng.integers(0, 4, 60)],
        name: rng.normal(10, 2, 60),
        "when": pd.date_range("2024-01-01", periods=60, freq="D"),
    })
    kw = {"compare": dict(x=cat, y=name), "distribution": dict(x=name), "trend": dict(x="when", y=name)}[task]
    a = plotwise.advise(df, task, **kw)
    for d in a.designs[:3]:
        sentinel = {"hit": False}
        ns = {"df": df, "SENTINEL": sentinel}
        exec(compile(d.code(), "<snippet>", "exec"), ns)
        try:
            assert ns["fig"].axes, "the snippet drew nothing"
            for ax in ns["fig"].axes:
                for label in (ax.get_xlabel(), ax.get_ylabel()):
                    plain = label.replace("\n(axis does not start at zero)", "")
                    assert len(label) <= 80 and "\n" not in plain
        finally:
            plt.close(ns["fig"])
        assert sentinel == {"hit": False}
    html = a.html(image=False, profile=True)
    assert "<img src=x" not in html
    if "<" in name:
        assert "&lt;img src=x onerror=alert(1)&gt;" in html


def test_mimebundle_escapes_hostile_names():
    name = "<img src=x onerror=alert(1)>"
    df = pd.DataFrame({name: list("abcab"), "v": [1.0, 2, 3, 4, 5]})
    bundle, _ = plotwise.advise(df, "compare")._repr_mimebundle_()
    assert set(bundle) == {"text/plain", "text/html", "image/png"}
    assert name not in bundle["text/html"]
    assert "&lt;img" in bundle["text/html"]


def test_code_uses_callers_variable_name():
    df = pd.DataFrame({"a": list("xyzxyz"), "b": [1.0, 2, 3, 4, 5, 6]})
    code = plotwise.advise(df, "compare").designs[0].code("sales_2024")
    assert "sales_2024['a']" in code and "df[" not in code
    with pytest.raises(ValueError):
        plotwise.advise(df, "compare").designs[0].code("not a name")


def test_non_string_column_names():
    df = pd.DataFrame({0: list("abcabc"), 1: [1.0, 2, 3, 4, 5, 6]})
    a = plotwise.advise(df, "compare")
    ns = {"df": df}
    exec(a.designs[0].code(), ns)
    plt.close(ns["fig"])
    assert "df[0]" in a.designs[0].code()
