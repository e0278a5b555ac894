"""'Why not this chart?' and the sheet of alternatives, on open data."""

import matplotlib.pyplot as plt
import pytest
from open_data import grunfeld, iris

import plotwise
from plotwise.alternatives import SHEET_MAX


@pytest.fixture(scope="module")
def firms():
    # Grunfeld (1958) investment data (statsmodels): 11 firms, 20 years
    return plotwise.advise(grunfeld(), "compare", x="firm", y="invest")


def test_why_not_a_ranked_kind_gives_rank_parts_hazards_and_the_better_design(firms):
    w = firms.why_not("pie")
    rank = [d.kind for d in firms.designs].index("pie") + 1
    assert w.rank == rank and w.design.kind == "pie" and w.better is firms.best
    assert "cannot show these data truthfully" in w.verdict and "11 parts" in w.verdict
    assert any(d.startswith("its score parts") and "the bar's" in d for d in w.details)
    assert "too-many-slices" in {h.code for h in w.hazards}
    assert any(d.startswith("better: the bar") for d in w.details)
    fig = w.draw()
    assert fig.subfigs[0]._suptitle.get_text().startswith("not recommended · ")
    assert fig.subfigs[0].axes[0].patches  # the wedges
    plt.close(fig)


def test_why_not_the_top_design_says_it_is_already_recommended(firms):
    assert "already the top design" in firms.why_not(firms.best.kind).verdict


def test_why_not_a_ranked_expressive_kind_compares_scores(firms):
    w = firms.why_not("box")
    d = firms.design("box")
    assert f"{d.score:.2f}" in w.verdict and f"{firms.best.score:.2f}" in w.verdict
    assert w.design is d


def test_why_not_a_kind_of_another_task_answers_it_under_that_task(firms):
    w = firms.why_not("histogram")
    assert w.verdict.startswith("A histogram answers distribution, not compare")
    assert w.task == "distribution" and w.design.x == "invest"


def test_why_not_a_kind_that_cannot_show_the_columns_says_so_in_one_sentence(firms):
    w = firms.why_not("scatter")
    assert w.design is None and not w.drawable
    assert w.verdict.count(".") <= 2 and "'firm' nominal" in w.verdict
    with pytest.raises(plotwise.PlotwiseError, match="no scatter design"):
        w.draw()


def test_why_not_an_unknown_kind_lists_the_kinds(firms):
    with pytest.raises(plotwise.PlotwiseError, match="unknown chart kind 'radar'.*bar"):
        firms.why_not("radar")


def test_why_not_html_carries_the_chart_when_there_is_one(firms):
    html = firms.why_not("pie")._repr_html_()
    assert "data:image/png;base64," in html and "not recommended" in html
    assert "<img" not in firms.why_not("scatter")._repr_html_()


def test_sheet_draws_every_expressive_design_ranked():
    a = plotwise.advise(iris(), "distribution", x="petal length (cm)", hue="species")
    fig = a.sheet()
    expressive = [d for d in a.designs if d.expressive]
    titles = [sf._suptitle.get_text() for sf in fig.subfigs if sf._suptitle is not None]
    assert len(titles) == min(len(expressive), SHEET_MAX)
    for title, d in zip(titles, expressive):
        assert title.split(" · ")[1] == d.title[:34]
    plt.close(fig)


def test_sheet_counts_what_it_leaves_out(monkeypatch):
    import plotwise.alternatives as alt

    monkeypatch.setattr(alt, "SHEET_MAX", 2)
    a = plotwise.advise(grunfeld(), "compare", x="firm", y="invest")
    fig = a.sheet()
    more = len([d for d in a.designs if d.expressive]) - 2
    assert fig._supxlabel.get_text().startswith(f"and {more} more")
    plt.close(fig)


def test_cli_page_carries_surprises_why_not_and_the_sheet(tmp_path, capsys):
    import re

    import numpy as np
    import pandas as pd

    from plotwise.cli import main

    rng = np.random.default_rng(4)
    df = pd.DataFrame({"shop": np.repeat(["Alder", "Birch", "Cedar"], 40),
                       "basket": rng.normal(50, 5, 120).round(2)})
    df.loc[45, "basket"] = 500.0
    data = tmp_path / "baskets.csv"
    df.to_csv(data, index=False)
    out = tmp_path / "page.html"
    argv = ["advise", str(data), "--task", "compare", "--x", "shop", "--y", "basket",
            "--why", "pie", "--why", "scatter", "--sheet", "--out", str(out)]
    assert main(argv) == 0
    assert re.search(r"\b[1-9]\d* surprises\)", capsys.readouterr().out)
    page = out.read_text(encoding="utf-8")
    assert "Worth a second look" in page and "group-outlier" in page and "row 45" in page
    assert "Why not a pie?" in page and "Why not a scatter?" in page
    assert "Every design worth a look" in page
    # the top row, the pie drawn as not recommended, and the sheet
    assert len(re.findall(r"src='data:image/png;base64,", page)) == 3
    with pytest.raises(SystemExit):
        main(["advise", str(data), "--why", "radar", "--out", str(out)])
    assert "invalid choice: 'radar'" in capsys.readouterr().err


def test_cli_out_suffix_chooses_the_format(tmp_path, capsys):
    from plotwise.cli import main

    data = tmp_path / "grunfeld.csv"
    grunfeld().to_csv(data, index=False)
    out = tmp_path / "top.svg"
    assert main(["advise", str(data), "--task", "compare", "--x", "firm", "--y", "invest",
                 "--out", str(out)]) == 0
    assert out.read_text(encoding="utf-8").lstrip().startswith("<?xml")
    assert main(["advise", str(data), "--out", str(tmp_path / "top.docx")]) == 2
    assert "name the file with one of: .png" in capsys.readouterr().err


def test_static_html_carries_why_not_and_the_sheet_when_asked(firms):
    plain = firms.html()
    assert "Why not" not in plain and "Every design worth a look" not in plain
    asked = firms.html(why=("pie",), sheet=True)
    assert "Why not a pie?" in asked and "Every design worth a look" in asked
    assert asked.count("data:image/png;base64,") == 3
