"""Feedback on slow work: while the panel re-advises on a large Parquet file, the reader sees a
status line (what is computed, how many rows, which engine) and the controls are disabled; when
the new advice is in, the status line goes and the controls come back."""

import time

import nbformat
import pytest
from conftest import digest
from nbformat.v4 import new_code_cell, new_notebook

pytestmark = pytest.mark.filterwarnings("ignore::DeprecationWarning")

NB = ".jp-NotebookPanel:not(.lm-mod-hidden)"
ROWS = 20_000_000


def write_parquet(path) -> None:
    """A generated file large enough that advising on it takes seconds (DuckDB writes it)."""
    import duckdb

    duckdb.sql(f"""COPY (SELECT 'region ' || chr(65 + (hash(i) % 12)::INTEGER) AS region,
                               (hash(i * 7) % 100000) / 100.0 AS amount,
                               (hash(i * 13) % 1000) / 10.0 AS score
                        FROM range({ROWS}) t(i)) TO '{path}' (FORMAT parquet)""")


def test_status_line_while_a_slow_advice_runs(lab, browser, shots):
    write_parquet(lab.root / "big.parquet")
    nb = new_notebook(cells=[new_code_cell("%load_ext plotwise"),
                             new_code_cell("%plotwise compare big.parquet --x region --y amount")],
                      metadata={"kernelspec": {"name": "python3", "display_name": "Python 3",
                                               "language": "python"}})
    nbformat.write(nb, lab.root / "slow.ipynb")
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    try:
        page.goto(f"{lab.url}/lab/tree/slow.ipynb?reset&token={lab.token}")
        page.wait_for_selector(f"{NB} .jp-Notebook", timeout=120_000)
        lab.wait_session("slow.ipynb")
        time.sleep(1)
        page.locator(".lm-MenuBar-itemLabel", has_text="Run").first.click()
        page.locator(".lm-Menu-itemLabel", has_text="Run All Cells").first.click()
        page.wait_for_selector(f"{NB} .pw-panel img.pw-top", timeout=300_000)
        lab.wait_idle(timeout=300)
        before = digest(page, f"{NB} .pw-panel img.pw-top")
        page.locator(f"{NB} .pw-y select").first.select_option(label="score")
        # The status line appears at once and stays while the kernel works.
        status = page.locator(f"{NB} .pw-status")
        status.wait_for(state="visible", timeout=20_000)
        text = " ".join(status.inner_text().split())
        assert f"{ROWS:,} rows" in text and "duckdb" in text.lower(), text
        assert page.locator(f"{NB} .pw-task select").first.is_disabled()
        assert page.locator(f"{NB} .pw-x select").first.is_disabled()
        page.locator(f"{NB} .pw-panel").scroll_into_view_if_needed()
        page.screenshot(path=str(shots / "10-status-line.png"))
        # Then the new advice replaces it and the controls come back.
        status.wait_for(state="detached", timeout=300_000)
        lab.wait_idle(timeout=300)
        assert digest(page, f"{NB} .pw-panel img.pw-top") != before
        assert not page.locator(f"{NB} .pw-task select").first.is_disabled()
        assert "score" in page.locator(f"{NB} .pw-code textarea").input_value()
    finally:
        page.close()
