"""The display protocol: include/exclude, _repr_html_, alt text, 2× images, save() by suffix."""

import base64
import io

import matplotlib.pyplot as plt
import pytest
from open_data import grunfeld

import plotwise


@pytest.fixture(scope="module")
def advice():
    return plotwise.advise(grunfeld(), "compare", x="firm", y="invest")


def test_include_and_exclude_are_honoured_and_text_only_draws_nothing(advice, monkeypatch):
    data, meta = advice._repr_mimebundle_(include=["text/plain"])
    assert set(data) == {"text/plain"} and meta == {}
    data, _ = advice._repr_mimebundle_(exclude=["image/png"])
    assert set(data) == {"text/plain", "text/html"}
    calls = []
    monkeypatch.setattr(type(advice), "show", lambda self, top=None: calls.append(1))
    advice._repr_mimebundle_(include=["text/plain"])
    assert calls == []  # a terminal asking for text gets no figure drawn


def test_png_has_twice_the_pixels_and_is_shown_at_its_logical_size(advice):
    from PIL import Image

    data, meta = advice._repr_mimebundle_()
    img = Image.open(io.BytesIO(base64.b64decode(data["image/png"])))
    w, h = meta["image/png"]["width"], meta["image/png"]["height"]
    assert img.size == (2 * w, 2 * h)
    assert f"width='{w}'" in data["text/html"]


def test_alt_text_names_the_kinds_and_columns(advice):
    html = advice._repr_html_()
    alt = html.split("alt='", 1)[1].split("'", 1)[0]
    for d in advice.shown():
        assert d.kind in alt
    assert "firm" in alt and "invest" in alt


@pytest.mark.parametrize("suffix", [".png", ".svg", ".pdf", ".html"])
def test_save_writes_each_format_its_reader_opens(advice, tmp_path, suffix):
    path = tmp_path / f"advice{suffix}"
    advice.save(path)
    raw = path.read_bytes()
    if suffix == ".png":
        from PIL import Image

        assert Image.open(path).format == "PNG"
    elif suffix == ".svg":
        import xml.etree.ElementTree as ET

        assert ET.parse(path).getroot().tag.endswith("svg")
    elif suffix == ".pdf":
        assert raw.startswith(b"%PDF-") and b"%%EOF" in raw[-1024:]
    else:
        from html.parser import HTMLParser

        HTMLParser().feed(raw.decode("utf-8"))
        assert raw.startswith(b"<!DOCTYPE html>") and b"Hazards" in raw
    assert plt.get_fignums() == []


def test_save_refuses_an_unknown_suffix(advice, tmp_path):
    with pytest.raises(plotwise.PlotwiseError, match="cannot save as '.docx'.*\\.png"):
        advice.save(tmp_path / "advice.docx")


def test_data_keyword_and_a_series_where_a_name_belongs():
    df = grunfeld()
    assert plotwise.advise(data=df, task="compare", x="firm", y="invest").best.kind == "bar"
    with pytest.raises(plotwise.PlotwiseError) as e:
        plotwise.advise(df, "compare", x=df["firm"])
    assert str(e.value) == ("x takes a column's name, not the column itself (got a Series); "
                            "use x='firm'.")
    with pytest.raises(plotwise.PlotwiseError, match="give the data once"):
        plotwise.advise(df, data=df)
