"""Audit of figures drawn by matplotlib, seaborn and pandas: each hazard fires on a flawed
figure and not on a near-identical clean one."""

import subprocess
import sys

import matplotlib.pyplot as plt
import numpy as np
import pandas as pd
import pytest
import seaborn as sns
from IPython.utils.capture import capture_output

import plotwise
from plotwise.figure_audit.figure import audit


@pytest.fixture(autouse=True)
def close_all():
    yield
    plt.close("all")


def codes(fig):
    return set(audit(fig).hazard_codes())


def test_lie_factor_tufte_fuel_economy():
    # Tufte (1983): data 18 -> 27.5 drawn as lengths 0.6 -> 5.3: Lie Factor 14.8. An axis from
    # 16.787 makes the drawn lengths 1.213 and 10.713, the same ratio as 0.6 : 5.3.
    lo = (5.3 * 18 - 0.6 * 27.5) / (5.3 - 0.6)
    fig, ax = plt.subplots()
    ax.bar(["1978", "1985"], [18, 27.5])
    ax.set_ylim(lo, 30)
    ax.set_ylabel("miles per gallon")
    r = audit(fig)
    assert r.axes[0].lie_factor == pytest.approx(14.8, abs=0.05)
    assert "truncated-baseline" in r.hazard_codes() and r.worst == "severe"
    fig2, ax2 = plt.subplots()
    ax2.bar(["1978", "1985"], [18, 27.5])
    ax2.set_ylabel("miles per gallon")
    r2 = audit(fig2)
    assert r2.axes[0].lie_factor == pytest.approx(1.0, abs=1e-9)
    assert not r2.hazards


def test_truncated_bars_seaborn_and_pandas():
    df = pd.DataFrame({"shop": list("ABCD"), "sales": [91.0, 94, 97, 99]})
    ax = sns.barplot(data=df, x="shop", y="sales")
    ax.set_ylim(90, 100)
    assert "truncated-baseline" in codes(ax.figure)
    plt.close("all")
    assert "truncated-baseline" not in codes(sns.barplot(data=df, x="shop", y="sales").figure)
    plt.close("all")
    ax = df.plot.barh(x="shop", y="sales", xlim=(90, 100))
    assert "truncated-baseline" in codes(ax.figure)
    plt.close("all")
    ax = df.plot.barh(x="shop", y="sales")
    assert "truncated-baseline" not in codes(ax.figure)


def test_filled_area_truncated():
    fig, ax = plt.subplots()
    ax.fill_between([1, 2, 3], [50, 55, 53])
    ax.set_ylim(45, 60)
    ax.set_xlabel("t"), ax.set_ylabel("v")
    assert "truncated-baseline" in codes(fig)
    fig2, ax2 = plt.subplots()
    ax2.fill_between([1, 2, 3], [50, 55, 53])
    ax2.set_xlabel("t"), ax2.set_ylabel("v")
    assert "truncated-baseline" not in codes(fig2)


def test_pies():
    fig, ax = plt.subplots()
    ax.pie([30, 20, 15, 12, 10, 8, 3, 2])
    assert "too-many-slices" in codes(fig)
    fig2, ax2 = plt.subplots()
    ax2.pie([40, 30, 20, 10])
    assert not codes(fig2) & {"too-many-slices", "not-a-whole"}
    fig3, ax3 = plt.subplots()
    ax3.pie([0.3, 0.2, 0.1], normalize=False)  # 60% of a circle
    assert "not-a-whole" in codes(fig3)
    fig4, ax4 = plt.subplots()
    ax4.pie([50, 30, 20], labels=["a", "b", "c"])
    ax4.text(0, 0, "50%"), ax4.text(0, 0, "40%"), ax4.text(0, 0, "30%")  # labels adding to 120
    assert "not-a-whole" in codes(fig4)


def test_colours_and_colormaps():
    x = np.arange(10)
    fig, ax = plt.subplots()
    for i in range(9):
        ax.plot(x, x * i, label=f"s{i}")
    ax.legend(), ax.set_xlabel("x"), ax.set_ylabel("y")
    assert {"too-many-colors", "cvd-confusable"} <= codes(fig)  # tab10: orange/green for protans
    fig2, ax2 = plt.subplots()
    for i, c in enumerate(["#0072B2", "#E69F00", "#009E73"]):
        ax2.plot(x, x * i, label=f"s{i}", color=c)
    ax2.legend(), ax2.set_xlabel("x"), ax2.set_ylabel("y")
    assert not codes(fig2) & {"too-many-colors", "cvd-confusable"}
    data = np.random.default_rng(0).random((8, 8))
    fig3, ax3 = plt.subplots()
    ax3.imshow(data, cmap="jet")
    assert "rainbow-colormap" in codes(fig3)
    fig4, ax4 = plt.subplots()
    sns.heatmap(data, cmap="viridis", ax=ax4)
    assert "rainbow-colormap" not in codes(fig4)


def test_lines_over_categories_seaborn_pandas():
    df = pd.DataFrame({"city": ["Oslo", "Lima", "Pune", "Kyiv"], "v": [3, 5, 2, 4]})
    assert "line-over-categories" in codes(sns.lineplot(data=df, x="city", y="v").figure)
    plt.close("all")
    assert "line-over-categories" in codes(df.set_index("city")["v"].plot().figure)
    plt.close("all")
    assert "line-over-categories" not in codes(sns.barplot(data=df, x="city", y="v").figure)
    plt.close("all")
    months = df.assign(city=["Jan", "Feb", "Mar", "Apr"])
    assert "line-over-categories" not in codes(sns.lineplot(data=months, x="city", y="v").figure)
    plt.close("all")
    # Regression: a cumulative line on a log axis (ticks 10⁰, 10¹ written as maths) is numeric
    fig, ax = plt.subplots()
    ax.step([1, 3, 10, 40, 200], [0.2, 0.4, 0.6, 0.8, 1.0])
    ax.set_xscale("log")
    assert "line-over-categories" not in codes(fig)
    plt.close(fig)


def test_overplotting_and_area_encoding():
    rng = np.random.default_rng(0)
    fig, ax = plt.subplots()
    ax.scatter(rng.normal(size=5000), rng.normal(size=5000))
    ax.set_xlabel("a"), ax.set_ylabel("b")
    assert "overplotting" in codes(fig)
    fig2, ax2 = plt.subplots()
    ax2.scatter(rng.normal(size=100), rng.normal(size=100))
    ax2.set_xlabel("a"), ax2.set_ylabel("b")
    assert "overplotting" not in codes(fig2)
    fig3, ax3 = plt.subplots()
    ax3.scatter(rng.normal(size=60), rng.normal(size=60), s=rng.uniform(10, 400, 60))
    ax3.set_xlabel("a"), ax3.set_ylabel("b")
    h = [h for h in audit(fig3).hazards if h.code == "area-encoding"]
    assert h and "about 5× larger" in h[0].message  # Stevens (1957): 10^0.7 ≈ 5


def test_three_d_dual_axis_labels_ticks():
    fig = plt.figure()
    ax = fig.add_subplot(projection="3d")
    ax.bar3d([0, 1], [0, 0], [0, 0], 0.5, 0.5, [3, 4])
    assert "three-d" in codes(fig)
    fig2, ax2 = plt.subplots()
    ax2.plot([1, 2, 3], [1, 2, 3])
    ax2.set_xlabel("t"), ax2.set_ylabel("a")
    assert not codes(fig2)
    ax3 = ax2.twinx()
    ax3.plot([1, 2, 3], [30, 10, 20])
    ax3.set_ylabel("b")
    assert "dual-axis" in codes(fig2)
    fig4, ax4 = plt.subplots()
    ax4.plot([1, 2, 3], [1, 2, 3])
    assert "unlabelled-axis" in codes(fig4)
    fig5, ax5 = plt.subplots(figsize=(3, 2))
    labels = [f"a long category name {i}" for i in range(12)]
    ax5.bar(labels, np.arange(12) + 1)
    ax5.set_ylabel("n")
    assert "crowded-ticks" in codes(fig5)
    fig6, ax6 = plt.subplots(figsize=(3, 4))
    ax6.barh(labels, np.arange(12) + 1)
    ax6.set_xlabel("n")
    assert "crowded-ticks" not in codes(fig6)


def test_audit_does_not_change_figure_and_marks_axes():
    fig, ax = plt.subplots()
    ax.bar(["a", "b"], [5, 6])
    ax.set_ylim(4, 7), ax.set_ylabel("v")
    before = (ax.get_ylim(), len(ax.patches), len(fig.axes))
    r = audit(fig)
    png = r.marked_png()
    assert png.startswith(b"\x89PNG")
    assert (ax.get_ylim(), len(ax.patches), len(fig.axes)) == before
    bundle = r._repr_mimebundle_()
    assert "truncated-baseline" in bundle["text/html"]
    with pytest.raises(plotwise.PlotwiseError, match="Figure or Axes"):
        audit("not a figure")


def test_audit_cell_magic(ipshell):
    ip = ipshell
    cell = ("import matplotlib.pyplot as plt\nfig, ax = plt.subplots()\n"
            "ax.bar(['a', 'b', 'c'], [91, 95, 99])\nax.set_ylim(90, 100)\nax.set_ylabel('sales')")
    with capture_output() as c:
        ip.run_cell_magic("plotwise", "audit", cell)
    kinds = [sorted(o.data) for o in c.outputs]
    assert len(c.outputs) >= 3  # the figure, its audit, the advised alternative from its data
    assert any("truncated-baseline" in o.data.get("text/plain", "") for o in c.outputs)
    assert any("plotwise advice" in o.data.get("text/plain", "") for o in c.outputs), kinds
    assert plt.get_fignums() == []
    from IPython.core.error import UsageError

    with pytest.raises(UsageError, match="drew no matplotlib figure"):
        ip.run_cell_magic("plotwise", "audit", "x = 1")


def _cli(tmp_path, source):
    script = tmp_path / "report.py"
    script.write_text(source)
    return subprocess.run([sys.executable, "-m", "plotwise", "audit", str(script)],
                          capture_output=True, text=True, cwd=tmp_path)


def test_cli_exit_codes(tmp_path):
    clean = ("import matplotlib.pyplot as plt\nfig, ax = plt.subplots()\n"
             "ax.bar(['a', 'b'], [3, 4])\nax.set_ylabel('n')\nplt.show()\n")
    r = _cli(tmp_path, clean)
    assert r.returncode == 0, r.stderr
    assert "no hazards" in r.stdout
    severe = clean.replace("ax.set_ylabel('n')", "ax.set_ylabel('n'); ax.set_ylim(2.5, 4.5)")
    r = _cli(tmp_path, severe)
    assert r.returncode == 1 and "truncated-baseline" in r.stdout
    r = _cli(tmp_path, "raise RuntimeError('broken report')\n")
    assert r.returncode == 2 and "RuntimeError: broken report" in r.stderr
    assert "Traceback" not in r.stderr
    missing = subprocess.run([sys.executable, "-m", "plotwise", "audit", str(tmp_path / "nope.py")],
                             capture_output=True, text=True)
    assert missing.returncode == 2 and "no such script" in missing.stderr


def test_cli_stops_a_script_that_never_ends(tmp_path):
    script = tmp_path / "forever.py"
    script.write_text("import matplotlib.pyplot as plt\nplt.plot([1, 2])\nwhile True:\n    pass\n")
    r = subprocess.run([sys.executable, "-m", "plotwise", "audit", "--timeout", "1", str(script)],
                       capture_output=True, text=True, timeout=60)
    assert r.returncode == 2 and "still running after 1 s" in r.stderr
    assert "Traceback" not in r.stderr


@pytest.mark.parametrize("body", ["raise KeyboardInterrupt\n",
                                  "class Stop(BaseException):\n    pass\nraise Stop('halt')\n"])
def test_cli_base_exceptions_are_reported_not_dumped(tmp_path, body):
    r = _cli(tmp_path, body)
    assert r.returncode == 2 and "Traceback" not in r.stderr and r.stderr.startswith("plotwise:")


def test_audit_reports_a_label_the_maths_parser_rejects():
    from matplotlib.figure import Figure

    fig = Figure()
    ax = fig.subplots()
    ax.bar(["$x^$", "b"], [3, 4])
    ax.set_ylabel("n")
    report = plotwise.audit(fig)
    assert [h.code for h in report.hazards] == ["unreadable-text"]
    assert report.worst == "severe"
