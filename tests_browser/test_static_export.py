"""The exported tour (from make demo) read offline: with every network request blocked, its
figures and tables still render."""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
TOUR = ROOT / "build" / "demo" / "tour.html"


def test_exported_tour_reads_offline(browser, shots):
    if not TOUR.exists():
        subprocess.run([sys.executable, str(ROOT / "tools" / "export_tour.py"),
                        str(ROOT / "demo_notebooks" / "tour.ipynb"), str(TOUR)], check=True)
    page = browser.new_page(viewport={"width": 1280, "height": 800})
    blocked = []

    def block(route):
        if route.request.url.startswith("file://") or route.request.url.startswith("data:"):
            return route.continue_()
        blocked.append(route.request.url)
        return route.abort()

    page.route("**/*", block)
    page.goto(TOUR.as_uri())
    page.wait_for_load_state("load")
    images = page.evaluate("""Array.from(document.images).map(i => [i.complete, i.naturalWidth, i.alt])""")
    figures = [i for i in images if i[2] == "top designs side by side"]
    assert len(figures) >= 8, images[:5]
    assert all(done and width > 600 for done, width, _ in figures)
    tables = page.locator(".pw-advice table").count()
    assert tables >= 9  # at least the ranked table of each of the nine advice cells
    text = page.locator("body").inner_text()
    for code in ("skewed", "not-a-whole", "hidden-spread", "truncated-baseline"):
        assert code in text
    page.screenshot(path=str(shots / "06-static-tour.png"), full_page=False)
    page.close()
