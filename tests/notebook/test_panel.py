"""The widget panel, driven in the kernel: each control changes what it should and no figure
is left open."""

import base64
import html
import re

import matplotlib.pyplot as plt
import pytest
from open_data import grunfeld, iris

import plotwise
from plotwise.notebook.panel import AdvicePanel


@pytest.fixture
def panel():
    return AdvicePanel(plotwise.advise(grunfeld(), "compare", x="firm", y="invest"), "grunfeld")


def test_initial_state(panel):
    assert panel._top_png.startswith(b"\x89PNG")
    assert "src='data:image/png;base64," + base64.b64encode(panel._top_png).decode() in (
        panel.top_image.value)
    # alt text: what each image shows, by kind and columns
    top = re.search(r"<img class='pw-top' alt='([^']*)'", panel.top_image.value)
    assert top and html.unescape(top.group(1)).startswith("plotwise's top designs side by side: 1.")
    assert "&#x27;invest&#x27;" in top.group(1) and "&#x27;firm&#x27;" in top.group(1)
    assert "<img class='pw-detail' alt='design 1 of the ranked list: " in panel.detail_image.value
    assert len(panel.designs.options) == len(panel.advice.designs)
    assert "grunfeld['invest']" in panel.code.value
    assert panel.bins.layout.display == "none"


def test_switch_task(panel):
    before = panel.top_image.value
    panel.task.value = "trend"
    panel.x.value = "year"
    assert panel.advice.task == "trend"
    assert panel.top_image.value != before
    assert panel.advice.designs[0].kind in ("line", "area")
    assert "year" in panel.code.value
    assert plt.get_fignums() == []


def test_pick_design_beyond_top_three(panel):
    before = panel.detail_image.value
    panel.designs.value = 4
    d = panel.advice.designs[4]
    assert panel.selected is d
    assert panel.detail_image.value != before
    assert d.title in panel.reasons.value
    assert panel.code.value == d.code("grunfeld")


def test_swap_column(panel):
    panel.y.value = "value"
    assert panel.advice.designs[0].y == "value"
    assert "grunfeld['value']" in panel.code.value and "grunfeld['invest']" not in panel.code.value


def test_bad_choice_shows_message_not_traceback(panel):
    panel.y.value = "firm"  # text is not a measure
    assert "firm" in panel.message.value and "Traceback" not in panel.message.value
    # The reader is told that what is still on screen is the earlier advice.
    assert "Still showing the previous advice (compare; x = firm, y = invest)" in panel.message.value
    assert panel.advice.designs[0].y == "invest"  # the previous advice stays


def test_bins_control_on_histogram():
    p = AdvicePanel(plotwise.advise(iris(), "distribution", x="petal length (cm)"), "iris")
    assert p.selected.kind == "histogram"
    assert p.bins.layout.display == "flex"
    before = p.detail_image.value
    p.bins.value = 7
    assert p.detail_image.value != before
    assert "bins=np.histogram_bin_edges(d['petal length (cm)'], bins=7)" in p.code.value
    p.designs.value = 1  # not a histogram: the control hides
    assert p.bins.layout.display == "none"
    assert plt.get_fignums() == []


def test_static_fallback_in_bundle(panel):
    bundle = panel._repr_mimebundle_()
    assert "application/vnd.jupyter.widget-view+json" in bundle
    assert "<img" in bundle["text/html"] and bundle["image/png"]


def test_panel_on_a_parquet_file_keeps_reading_the_file(tmp_path):
    """A panel on advice for a file path re-advises through DuckDB on the same file when the
    task changes, and its code keeps opening that file."""
    path = tmp_path / "grunfeld.parquet"
    grunfeld().to_parquet(path)
    p = AdvicePanel(plotwise.advise(str(path), "compare", x="firm", y="invest"))
    p.task.value = "trend"
    p.x.value = "year"
    assert p.advice.engine == "DuckDB" and p.advice.task == "trend"
    assert f"duckdb.read_parquet({str(path)!r})" in p.code.value
    assert plt.get_fignums() == []


def test_controls_left_to_plotwise_show_auto_not_blank():
    # ipywidgets shows a Dropdown whose value is None as an empty control; the panel's
    # "(auto)" and "any task" entries must be selected instead, and mean "plotwise chooses".
    p = AdvicePanel(plotwise.advise(grunfeld(), None, x="firm"), "grunfeld")
    assert (p.task.label, p.x.label, p.y.label, p.hue.label) == ("any task", "firm", "(auto)",
                                                                  "(auto)")
    p.task.value = "compare"
    assert p.advice.task == "compare" and p.advice.request.get("y") is None


def test_controls_wait_with_a_status_line_and_going_back_is_from_the_cache(panel, monkeypatch):
    import plotwise.notebook.panel as panel_module

    seen = []
    real = panel_module.advise

    def watching(*args, **kw):
        seen.append((panel.task.disabled, panel.y.disabled, panel.message.value))
        return real(*args, **kw)

    monkeypatch.setattr(panel_module, "advise", watching)
    first = panel.top_image.value
    panel.y.value = "value"  # a new question: advised while the controls wait
    assert len(seen) == 1
    task_off, y_off, status = seen[0]
    assert task_off and y_off and "Advising on 220 rows (pandas)" in status
    assert not panel.task.disabled and not panel.y.disabled and panel.message.value == ""
    panel.y.value = "invest"  # back to the first question: no advising, the same image
    assert len(seen) == 1
    assert panel.top_image.value == first and panel.advice.best.y == "invest"
    panel.y.value = "value"
    assert len(seen) == 1 and panel.advice.best.y == "value"
    assert plt.get_fignums() == []


def test_panel_profiles_its_frame_once(monkeypatch):
    import plotwise.pipeline as pipeline

    p = AdvicePanel(plotwise.advise(grunfeld(), "compare", x="firm", y="invest"), "grunfeld")
    opened = []
    real = pipeline.open_data
    monkeypatch.setattr(pipeline, "open_data", lambda df: opened.append(1) or real(df))
    p.y.value = "value"
    p.task.value = "distribution"
    p.task.value = "compare"
    p.y.value = "capital"
    assert p.advice.designs[0].y == "capital"
    assert len(opened) == 1
