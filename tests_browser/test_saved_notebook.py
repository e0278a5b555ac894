"""A notebook saved after the panel changed the advice, reopened with no kernel state: the reader
sees the changed advice (image, hazards), not a widget error."""

import json
import time
import urllib.request

import nbformat
import pytest
from conftest import NB, SETUP, digest, notebook_of, run_all

pytestmark = pytest.mark.filterwarnings("ignore::DeprecationWarning")

STATIC_IMG = f"{NB} .pw-static img"


def static_digest(page):
    return digest(page, STATIC_IMG)


def open_and_run(page, lab, name, theme=None) -> None:
    """Run all cells of ``name`` (in ``theme``) and wait for the panel."""
    run_all(page, lab, name, before=(lambda pg: set_theme(pg, theme)) if theme else None)
    page.wait_for_selector(f"{NB} .pw-panel img.pw-top", timeout=180_000)
    lab.wait_idle()


def shut_down_kernels(lab) -> None:
    for k in lab.api("/api/kernels"):
        req = urllib.request.Request(f"{lab.url}/api/kernels/{k['id']}?token={lab.token}",
                                     method="DELETE")
        urllib.request.urlopen(req, timeout=30)


def test_reopened_notebook_shows_the_changed_advice(lab, browser, shots):
    nb = notebook_of(SETUP, "%plotwise compare sailings --x pier --y fare_revenue")
    nbformat.write(nb, lab.root / "saved.ipynb")
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    try:
        open_and_run(page, lab, "saved.ipynb")
        # While the panel lives, the static copy is there but hidden (no duplicate advice).
        assert page.locator(STATIC_IMG).count() == 1
        assert not page.locator(STATIC_IMG).is_visible()
        before = static_digest(page)
        page.locator(f"{NB} .pw-y select").first.select_option(label="passengers")
        lab.wait_idle()
        end = time.time() + 60
        while static_digest(page) == before and time.time() < end:
            time.sleep(0.3)
        changed = static_digest(page)
        assert changed and changed != before
        page.keyboard.press("Control+s")
        end, text = time.time() + 30, ""
        while time.time() < end:
            try:
                saved = json.loads((lab.root / "saved.ipynb").read_text(encoding="utf-8"))
            except json.JSONDecodeError:  # caught while the server writes it
                time.sleep(0.5)
                continue
            text = json.dumps(saved["cells"][1].get("outputs", []))
            if "passengers" in text and "pw-static" in text:
                break
            time.sleep(0.5)
        assert "passengers" in text and "pw-static" in text
        shut_down_kernels(lab)
        page.reload()
        page.wait_for_selector(f"{NB} .jp-Notebook", timeout=120_000)
        page.wait_for_selector(STATIC_IMG, state="visible", timeout=60_000)
        time.sleep(1)
        page.locator(STATIC_IMG).scroll_into_view_if_needed()
        page.screenshot(path=str(shots / "07-reopened.png"))
        assert static_digest(page) == changed  # the advice the controls last produced
        hazards = page.locator(f"{NB} .pw-static").inner_text()
        assert "Hazards" in hazards and "passengers" in hazards
        errors = page.locator("text=Error displaying widget")
        assert all(not errors.nth(i).is_visible() for i in range(errors.count()))
    finally:
        page.close()


# WCAG 2.1 contrast of every visible text node under `root`: the text colour over the background
# composited up the tree (relative luminance and ratio as WCAG 2.1 defines them).
CONTRAST_JS = """(sel) => {
  const parse = (c) => { const m = c.match(/rgba?\\(([^)]+)\\)/); if (!m) return null;
    const p = m[1].split(',').map(Number); return {r: p[0], g: p[1], b: p[2], a: p.length > 3 ? p[3] : 1}; };
  const over = (c, b) => ({r: c.r * c.a + b.r * (1 - c.a), g: c.g * c.a + b.g * (1 - c.a),
                           b: c.b * c.a + b.b * (1 - c.a)});
  const lum = ({r, g, b}) => { const f = (v) => { v /= 255;
    return v <= 0.03928 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4); };
    return 0.2126 * f(r) + 0.7152 * f(g) + 0.0722 * f(b); };
  const background = (el) => { const layers = [];
    for (let e = el; e; e = e.parentElement) { const c = parse(getComputedStyle(e).backgroundColor);
      if (c && c.a > 0) { layers.push(c); if (c.a >= 1) break; } }
    let base = {r: 255, g: 255, b: 255};
    for (let i = layers.length - 1; i >= 0; i--) base = over(layers[i], base);
    return base; };
  const out = []; let checked = 0;
  for (const root of document.querySelectorAll(sel)) {
    const walk = document.createTreeWalker(root, NodeFilter.SHOW_TEXT);
    while (walk.nextNode()) { const t = walk.currentNode; const el = t.parentElement;
      if (!t.textContent.trim() || !el || !el.getClientRects().length) continue;
      if (getComputedStyle(el).visibility === 'hidden') continue;
      const bg = background(el); const fg = over(parse(getComputedStyle(el).color), bg);
      const [a, b] = [lum(fg), lum(bg)];
      const ratio = (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05); checked++;
      if (ratio < 4.5) out.push(t.textContent.trim().slice(0, 40) + ' ' + ratio.toFixed(2)); } }
  return {checked, low: out};
}"""


def set_theme(page, name):
    page.locator(".lm-MenuBar-itemLabel", has_text="Settings").click()
    page.locator(".lm-Menu-itemLabel", has_text="Theme").first.hover()
    page.locator(".lm-Menu-itemLabel", has_text=name).first.click()
    page.wait_for_function(f"document.body.dataset.jpThemeName === {name!r}", timeout=30_000)
    time.sleep(1)


@pytest.mark.parametrize("theme", ["JupyterLab Light", "JupyterLab Dark"])
def test_text_contrast_in_light_and_dark(lab, browser, shots, theme):
    nb = notebook_of(SETUP, "%plotwise compare sailings --x pier --y passengers")
    name = f"contrast-{theme.split()[-1].lower()}.ipynb"
    nbformat.write(nb, lab.root / name)
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    try:
        open_and_run(page, lab, name, theme)
        live = page.evaluate(CONTRAST_JS, f"{NB} .pw-panel")
        page.locator(f"{NB} .pw-panel").scroll_into_view_if_needed()
        page.screenshot(path=str(shots / f"08-panel-{theme.split()[-1].lower()}.png"))
        page.keyboard.press("Control+s")
        time.sleep(2)
        shut_down_kernels(lab)
        page.reload()
        page.wait_for_selector(STATIC_IMG, state="visible", timeout=120_000)
        time.sleep(1)
        stored = page.evaluate(CONTRAST_JS, f"{NB} .pw-static")
        page.locator(f"{NB} .pw-static table").first.scroll_into_view_if_needed()
        page.screenshot(path=str(shots / f"08-static-{theme.split()[-1].lower()}.png"))
        assert live["checked"] > 20 and stored["checked"] > 50
        assert live["low"] == [] and stored["low"] == [], (live["low"], stored["low"])
    finally:
        try:
            set_theme(page, "JupyterLab Light")  # the next test meets the default theme
        finally:
            page.close()


def test_run_all_stops_at_a_bad_magic(lab, browser, shots):
    nb = notebook_of(SETUP, "%plotwise explain sailings", "after = 'this cell ran'\nafter")
    nbformat.write(nb, lab.root / "runall.ipynb")
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    try:
        run_all(page, lab, "runall.ipynb")
        page.wait_for_function(
            "document.querySelector('.jp-NotebookPanel:not(.lm-mod-hidden)').innerText"
            ".includes('UsageError')", timeout=120_000)
        lab.wait_idle()
        time.sleep(1)
        text = page.locator(NB).inner_text()
        page.screenshot(path=str(shots / "09-run-all-stops.png"))
        outputs = " ".join(page.locator(f"{NB} .jp-OutputArea").all_inner_texts())
        assert "unknown task 'explain'" in outputs and "Traceback" not in text
        assert "this cell ran" not in outputs  # Run All stopped at the bad magic
    finally:
        page.close()
