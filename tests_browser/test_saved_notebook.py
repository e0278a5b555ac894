"""A notebook saved after the panel changed the advice, reopened with no kernel state: the reader
sees the changed advice (image, hazards), not a widget error."""

import json
import time
import urllib.request

import nbformat
import pytest
from conftest import SETUP
from nbformat.v4 import new_code_cell, new_notebook

pytestmark = pytest.mark.filterwarnings("ignore::DeprecationWarning")

DIGEST_JS = """async (sel) => {
  const img = document.querySelector(sel);
  if (!img || !img.src) return null;
  const buf = await (await fetch(img.src)).arrayBuffer();
  const d = await crypto.subtle.digest('SHA-256', buf);
  return Array.from(new Uint8Array(d)).map(b => b.toString(16).padStart(2, '0')).join('');
}"""
NB = ".jp-NotebookPanel:not(.lm-mod-hidden)"  # the notebook in front
STATIC_IMG = f"{NB} .pw-static img"


def digest(page):
    return page.evaluate(DIGEST_JS, STATIC_IMG)


def shut_down_kernels(lab) -> None:
    for k in lab.api("/api/kernels"):
        req = urllib.request.Request(f"{lab.url}/api/kernels/{k['id']}?token={lab.token}",
                                     method="DELETE")
        urllib.request.urlopen(req, timeout=30)


def test_reopened_notebook_shows_the_changed_advice(lab, browser, shots):
    nb = new_notebook(cells=[new_code_cell(SETUP),
                             new_code_cell("%plotwise compare sailings --x pier --y fare_revenue")],
                      metadata={"kernelspec": {"name": "python3", "display_name": "Python 3",
                                               "language": "python"}})
    nbformat.write(nb, lab.root / "saved.ipynb")
    page = browser.new_page(viewport={"width": 1280, "height": 900})
    try:
        page.goto(f"{lab.url}/lab/tree/saved.ipynb?token={lab.token}")
        page.wait_for_selector(f"{NB} .jp-Notebook", timeout=120_000)
        lab.wait_idle()
        page.locator(f"{NB} .jp-Cell .jp-InputArea-editor").first.click()
        page.keyboard.press("Shift+Enter")
        page.keyboard.press("Shift+Enter")
        page.wait_for_selector(f"{NB} .pw-panel img.pw-top", timeout=180_000)
        lab.wait_idle()
        # While the panel lives, the static copy is there but hidden (no duplicate advice).
        assert page.locator(STATIC_IMG).count() == 1
        assert not page.locator(STATIC_IMG).is_visible()
        before = digest(page)
        page.locator(f"{NB} .pw-y select").first.select_option(label="passengers")
        lab.wait_idle()
        end = time.time() + 60
        while digest(page) == before and time.time() < end:
            time.sleep(0.3)
        changed = digest(page)
        assert changed and changed != before
        page.keyboard.press("Control+s")
        end = time.time() + 30
        while time.time() < end:
            saved = json.loads((lab.root / "saved.ipynb").read_text(encoding="utf-8"))
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
        assert digest(page) == changed  # the advice the controls last produced
        hazards = page.locator(f"{NB} .pw-static").inner_text()
        assert "Hazards" in hazards and "passengers" in hazards
        errors = page.locator("text=Error displaying widget")
        assert all(not errors.nth(i).is_visible() for i in range(errors.count()))
    finally:
        page.close()
