"""Feedback on slow work: while the panel re-advises on a large Parquet file, the reader sees a
status line (what is computed, how many rows, which engine) and the controls are disabled; when
the new advice is in, the status line goes and the controls come back."""

import nbformat
import pytest
from conftest import NB, digest, notebook_of, run_all

pytestmark = pytest.mark.filterwarnings("ignore::DeprecationWarning")

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
    nbformat.write(notebook_of("%load_ext plotwise",
                               "%plotwise compare big.parquet --x region --y amount"),
                   lab.root / "slow.ipynb")
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    try:
        run_all(page, lab, "slow.ipynb")
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
