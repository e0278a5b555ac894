"""The magics in a real IPython shell."""

import matplotlib.pyplot as plt
import pandas as pd
import pytest
from IPython.core.error import UsageError
from IPython.utils.capture import capture_output
from open_data import grunfeld

import plotwise


@pytest.fixture
def ip(ipshell):
    return ipshell


@pytest.fixture
def fresh(ip):
    for k in [k for k, v in ip.user_ns.items() if isinstance(v, pd.DataFrame)]:
        del ip.user_ns[k]
    ip.user_ns["Out"].clear()
    ip.user_ns["grunfeld"] = grunfeld()
    return ip


def outputs(c):
    return [o.data for o in c.outputs]


def test_cell_magic_takes_last_expression_and_keeps_assignments(fresh):
    with capture_output() as c:
        fresh.run_cell_magic("plotwise", "compare --x firm --y invest --static",
                             "recent = grunfeld[grunfeld.year >= 1950]\nrecent")
    assert "recent" in fresh.user_ns and len(fresh.user_ns["recent"]) == 55
    data = outputs(c)
    assert len(data) == 1 and {"text/html", "image/png"} <= set(data[0])
    a = plotwise.last()
    assert a.profile.rows == 55 and a.task == "compare" and a.designs[0].x == "firm"
    assert not c.stderr


def test_cell_magic_dataframe_by_name(fresh):
    with capture_output() as c:
        fresh.run_cell_magic("plotwise", "trend grunfeld --x year --y invest --static", "x = 1")
    assert fresh.user_ns["x"] == 1
    assert plotwise.last().designs[0].kind in ("line", "area") and not c.stderr


def test_cell_magic_falls_back_to_displayed_frame(fresh):
    fresh.run_cell("shown = grunfeld.head(40)\nshown", store_history=True)
    with capture_output() as c:
        fresh.run_cell_magic("plotwise", "distribution --x value --static", "pass")
    assert not c.stderr, c.stderr
    assert plotwise.last().profile.rows == 40
    # IPython itself refuses a cell magic with an empty body, with a UsageError.
    with pytest.raises(UsageError):
        fresh.run_cell_magic("plotwise", "distribution", "")


def test_cell_magic_missing_and_ambiguous(fresh):
    with pytest.raises(UsageError) as e:
        fresh.run_cell_magic("plotwise", "compare", "y = 2")
    assert "no DataFrame" in str(e.value) and "grunfeld (220×5)" in str(e.value)
    with pytest.raises(UsageError) as e:
        fresh.run_cell_magic("plotwise", "compare", "grunfeld, grunfeld.head()")
    assert "several DataFrames" in str(e.value)


def test_line_magic_and_errors(fresh):
    with capture_output() as c:
        fresh.run_line_magic("plotwise", "correlate grunfeld --static")
    assert not c.stderr and plotwise.last().task == "correlate"
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "compare nothing_here")
    assert "no variable named 'nothing_here'" in str(e.value)
    fresh.user_ns["numbers"] = [1, 2, 3]
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "compare numbers")
    assert "is a list, not a DataFrame" in str(e.value)
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "compare grunfeld --x nope")
    assert "plotwise: no column named 'nope'" in str(e.value)
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "explain grunfeld")
    assert "unknown task 'explain'" in str(e.value)
    with pytest.raises(UsageError) as e:
        fresh.run_cell_magic("plotwise", "explain", "x = 3")
    assert "neither a task" in str(e.value)
    # As a cell: one line, no traceback, and the cell fails (so "Run All" stops there).
    with capture_output() as c:
        result = fresh.run_cell("%plotwise explain grunfeld")
    assert not result.success and isinstance(result.error_in_exec, UsageError)
    shown = c.stdout + c.stderr
    assert "unknown task 'explain'" in shown and "Traceback" not in shown


def test_bad_options_raise_usage_error(fresh):
    with pytest.raises(UsageError):
        fresh.run_line_magic("plotwise", "compare grunfeld --top many")
    with pytest.raises(UsageError):
        fresh.run_line_magic("plotwise", "compare grunfeld --colour red")
    with pytest.raises(UsageError):
        fresh.run_line_magic("plotwise", "compare")
    doc = fresh.find_line_magic("plotwise").__doc__
    assert "--hue" in doc and "code N" in doc


def test_cell_body_error_shows_users_traceback(fresh):
    with capture_output() as c:
        fresh.run_cell_magic("plotwise", "compare", "1 / 0")
    assert "ZeroDivisionError" in c.stdout + c.stderr


def test_code_n_puts_runnable_code_in_next_cell(fresh, monkeypatch):
    got = {}
    monkeypatch.setattr(fresh, "set_next_input", lambda text, replace=False: got.setdefault("code", text))
    fresh.run_line_magic("plotwise", "compare grunfeld --x firm --y invest --static")
    fresh.run_line_magic("plotwise", "code 2")
    code = got["code"]
    assert "grunfeld['firm']" in code and "grunfeld['invest']" in code
    ns = {"grunfeld": fresh.user_ns["grunfeld"]}
    exec(code, ns)
    assert ns["fig"].axes
    plt.close(ns["fig"])
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "code 99")
    assert "no design 99" in str(e.value)


def test_panel_shown_by_default_beside_a_static_copy_it_keeps_current(fresh, monkeypatch):
    from plotwise.notebook.magics import _LAST

    with capture_output() as c:
        fresh.run_line_magic("plotwise", "compare grunfeld --x firm --y invest")
    static, panel = outputs(c)[:2]
    # the advice as ordinary display data (kept in the saved notebook), then the controls
    assert "text/html" in static and "image/png" in static and "pw-static" in static["text/html"]
    assert "application/vnd.jupyter.widget-view+json" in panel and "text/html" not in panel
    # the controls update the static copy in place: same display id, update=True
    sent = []

    def record(data, metadata=None, source=None, *, transient=None, update=False, **kw):
        sent.append((data, transient, update))

    monkeypatch.setattr(fresh.display_pub, "publish", record)
    live = _LAST["panel"]
    live.task.value = "trend"
    live.x.value = "year"
    updates = [(d, t) for d, t, u in sent if u]
    assert updates and updates[-1][1]["display_id"]
    assert "task: trend" in updates[-1][0]["text/plain"]
    assert plotwise.last().task == "trend"  # %plotwise code N follows the panel too


def test_magics_take_engine_data_and_file_paths(fresh, tmp_path):
    """A Polars frame returned by the cell, and a Parquet path on the magic line (scanned by
    DuckDB), are advised on like a pandas frame; the code then reads the same engine."""
    import polars as pl

    with capture_output() as c:
        fresh.run_cell_magic("plotwise", "compare --x firm --y invest --static",
                             "import polars as pl\nlazy = pl.from_pandas(grunfeld).lazy()\nlazy")
    assert not c.stderr, c.stderr
    a = plotwise.last()
    assert a.engine == "Polars" and a.profile.rows == 220
    assert isinstance(fresh.user_ns["lazy"], pl.LazyFrame)
    path = tmp_path / "grunfeld.parquet"
    grunfeld().to_parquet(path)
    with capture_output() as c:
        fresh.run_line_magic("plotwise", f"compare {path} --x firm --y invest --static")
    assert not c.stderr, c.stderr
    a = plotwise.last()
    assert a.engine == "DuckDB" and f"duckdb.read_parquet({str(path)!r})" in a.code(0)
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "compare missing.parquet --static")
    assert "no file at 'missing.parquet'" in str(e.value)


def test_why_and_sheet_magics_answer_about_the_last_advice(fresh):
    fresh.run_line_magic("plotwise", "compare grunfeld --x firm --y invest --static")
    with capture_output() as c:
        fresh.run_line_magic("plotwise", "why pie")
    assert "A pie cannot show these data truthfully" in c.outputs[0].data["text/plain"]
    assert "data:image/png;base64," in c.outputs[0].data["text/html"]
    with capture_output() as c:
        fresh.run_line_magic("plotwise", "sheet")
    assert "image/png" in c.outputs[0].data
    with pytest.raises(UsageError, match="why KIND"):
        fresh.run_line_magic("plotwise", "why")
    with pytest.raises(UsageError) as e:
        fresh.run_line_magic("plotwise", "why radar")
    assert "unknown chart kind 'radar'" in str(e.value)


def test_every_advise_option_has_a_magic_flag_and_the_panel_keeps_them(fresh):
    fresh.run_line_magic("plotwise", "compare grunfeld --x firm --y invest --agg mean "
                                      "--palette '#0072B2,#E69F00' --cmap viridis "
                                      "--value-range 0,900 --top 2 --static")
    a = plotwise.last()
    assert a.request["agg"] == "mean" and a.request["value_range"] == (0.0, 900.0)
    assert a.request["palette"] == ["#0072B2", "#E69F00"] and a.request["cmap"] == "viridis"
    assert len(a.shown()) == 2 and a.best.stat == "mean"
    with pytest.raises(UsageError, match="--value-range takes LOW,HIGH"):
        fresh.run_line_magic("plotwise", "compare grunfeld --value-range 5 --static")
    with pytest.raises(UsageError, match="unknown agg 'most'"):
        fresh.run_line_magic("plotwise", "compare grunfeld --agg most --static")
    from plotwise.notebook.panel import AdvicePanel

    panel = AdvicePanel(a, frame_name="grunfeld")
    panel.y.value = "value"  # a new question: the caller's other options stay
    assert panel.advice.request["agg"] == "mean" and panel.advice.request["cmap"] == "viridis"
    assert panel.advice.request["value_range"] == (0.0, 900.0) and panel.advice.best.y == "value"
    plt.close("all")


def test_a_frame_named_code_is_advised_and_engine_data_get_a_status_line(fresh, tmp_path):
    fresh.user_ns["code"] = grunfeld()
    with capture_output():
        fresh.run_line_magic("plotwise", "code --static")
    assert plotwise.last().profile.rows == 220
    path = tmp_path / "g.parquet"
    grunfeld().to_parquet(path)
    try:
        with capture_output() as c:
            fresh.run_line_magic("plotwise", f"compare {path} --x firm --y invest --static")
        texts = [o.data.get("text/plain", "") for o in c.outputs]
        assert texts[0].startswith("plotwise: advising on")
        assert "" in texts  # the status line is emptied (updated in place) once advice is there
        with capture_output() as c:
            fresh.run_line_magic("plotwise", f"compare {path} --x firm --y invest --static "
                                             "--quiet")
        assert not any(o.data.get("text/plain", "").startswith("plotwise: advising")
                       for o in c.outputs)
    finally:
        del fresh.user_ns["code"]
