"""The exported tour (from make demo) read offline: with every network request blocked, its
figures and tables still render."""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
TOUR = ROOT / "build" / "demo" / "tour.html"


def offline_page(browser):
    """A page on which every request other than file:// and data: is refused."""
    page = browser.new_page(viewport={"width": 1280, "height": 800})
    blocked = []

    def block(route):
        if route.request.url.startswith("file://") or route.request.url.startswith("data:"):
            return route.continue_()
        blocked.append(route.request.url)
        return route.abort()

    page.route("**/*", block)
    return page, blocked


def test_exported_tour_reads_offline(browser, shots):
    if not TOUR.exists():
        subprocess.run([sys.executable, str(ROOT / "tools" / "export_tour.py"),
                        str(ROOT / "demo_notebooks" / "tour.ipynb"), str(TOUR)], check=True)
    page, _ = offline_page(browser)
    page.goto(TOUR.as_uri())
    page.wait_for_load_state("load")
    images = page.evaluate("""Array.from(document.images).map(i => [i.complete, i.naturalWidth, i.alt])""")
    figures = [i for i in images if i[2].startswith("plotwise's top designs side by side: 1. ")]
    assert len(figures) >= 8, images[:5]
    assert all(done and width > 600 for done, width, _ in figures)
    tables = page.locator(".pw-advice table").count()
    assert tables >= 9  # at least the ranked table of each of the nine advice cells
    text = page.locator("body").inner_text()
    for code in ("skewed", "not-a-whole", "hidden-spread", "truncated-baseline"):
        assert code in text
    page.screenshot(path=str(shots / "06-static-tour.png"), full_page=False)
    page.close()


def test_cli_page_for_a_parquet_file_reads_offline(browser, shots, tmp_path):
    """`plotwise advise FILE --out PAGE` on a Parquet file of open data (Grunfeld 1958, shipped
    with statsmodels): the page renders offline with its figure, hazards, ranked designs and
    code, and needs no horizontal scrolling at 1280 px."""
    import statsmodels.api as sm

    data = tmp_path / "grunfeld.parquet"
    sm.datasets.grunfeld.load_pandas().data.to_parquet(data)
    out = tmp_path / "advice.html"
    subprocess.run([sys.executable, "-m", "plotwise", "advise", str(data), "--task", "compare",
                    "--x", "firm", "--y", "invest", "--out", str(out)], check=True, timeout=300)
    page, blocked = offline_page(browser)
    page.goto(out.as_uri())
    page.wait_for_load_state("load")
    done, width = page.evaluate(
        """(() => { const i = document.images[0]; return [i.complete, i.naturalWidth]; })()""")
    assert done and width > 1000
    text = page.locator("body").inner_text()
    for part in ("Hazards", "skewed", "All candidate designs", "DuckDB computed", "Code for 1. bar"):
        assert part in text, part
    page.locator("summary").first.click()
    assert "duckdb.read_parquet" in page.locator("details pre").first.inner_text()
    assert page.evaluate("document.documentElement.scrollWidth") <= 1280
    assert not blocked
    page.screenshot(path=str(shots / "07-cli-page.png"), full_page=False)
    page.close()
