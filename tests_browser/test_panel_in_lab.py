"""The alternatives panel as a person meets it: JupyterLab in Chromium, clicking and choosing."""

import time

import pytest

# Steps share one page; each first puts the panel in the state it needs (set_request), so
# none depends on another having run before it.
from conftest import digest

pytestmark = pytest.mark.filterwarnings("ignore::DeprecationWarning")


class State:
    page = None
    lab = None
    console_errors: list = []


def wait_change(page, sel, before, timeout=60):
    end = time.time() + timeout
    while time.time() < end:
        now = digest(page, sel)
        if now and now != before:
            return now
        time.sleep(0.3)
    raise AssertionError(f"{sel} did not change")


def options_of(page):
    """The design list's entries, with the non-breaking spaces of <option> text made plain."""
    return [" ".join(t.split()) for t in page.locator(".pw-designs option").all_inner_texts()]


def wait_code(page, *needles, timeout=60):
    """Wait until the code area holds all the needles (the kernel updates it last)."""
    end = time.time() + timeout
    while time.time() < end:
        code = page.locator(".pw-code textarea").input_value()
        if all(n in code for n in needles):
            return code
        time.sleep(0.3)
    raise AssertionError(f"code area never mentioned {needles}: {code[:300]}")


def choose(page, control, label):
    """Pick a value and let the kernel finish handling it before the next action (fast successive
    changes otherwise race the kernel's replies)."""
    page.locator(f".pw-{control} select").first.select_option(label=label)
    State.lab.wait_idle()
    time.sleep(0.5)
    State.lab.wait_idle()


SELECTED_JS = "(s) => { const e = document.querySelector(s); return e.options[e.selectedIndex].text; }"


def set_request(page, task, x, y="(auto)"):
    """Put the panel's task, x and y controls at these labels (only those that differ change),
    and wait until the panel has answered."""
    changed = False
    for control, label in (("task", task), ("x", x), ("y", y)):
        now = " ".join(page.evaluate(SELECTED_JS, f".pw-{control} select").split())
        if now != label:
            choose(page, control, label)
            changed = True
    if changed:
        State.lab.wait_idle()
        time.sleep(1)
    return changed


@pytest.fixture(scope="module")
def page(lab, browser, shots):
    State.lab = lab
    pg = browser.new_page(viewport={"width": 1280, "height": 800})
    pg.on("console", lambda m: State.console_errors.append(m.text) if m.type == "error" else None)
    pg.on("pageerror", lambda e: State.console_errors.append(str(e)))
    pg.goto(f"{lab.url}/lab/tree/panel.ipynb?token={lab.token}")
    pg.wait_for_selector(".jp-Notebook", timeout=120_000)
    lab.wait_idle()
    pg.locator(".jp-Cell .jp-InputArea-editor").first.click()
    pg.keyboard.press("Shift+Enter")
    pg.keyboard.press("Shift+Enter")
    pg.wait_for_selector(".pw-panel img.pw-top", timeout=180_000)
    lab.wait_idle()
    time.sleep(1)
    yield pg
    pg.close()


def test_01_panel_renders(page, shots):
    set_request(page, "compare", "pier", "fare_revenue")  # what the magic line asked for
    page.locator(".pw-panel").scroll_into_view_if_needed()
    page.screenshot(path=str(shots / "01-panel.png"))
    assert page.locator(".pw-panel").count() == 1
    assert digest(page, ".pw-panel img.pw-top")
    # Each image has alt text saying what it shows.
    top_name = page.locator(".pw-panel img.pw-top").get_attribute("alt") or ""
    assert top_name.startswith("plotwise's top designs side by side: 1.") and "fare_revenue" in top_name
    assert "design 1 of the ranked list" in (
        page.locator(".pw-panel img.pw-detail").get_attribute("alt") or "")
    assert options_of(page)[0].startswith("1. bar")
    assert "skewed" in page.locator(".pw-hazards").inner_text()
    assert page.locator(".jp-OutputArea-output[data-mime-type='application/vnd.jupyter.stderr']").count() == 0
    # The panel fits the window: no horizontal scrolling at 1280×800.
    assert page.evaluate("document.documentElement.scrollWidth") <= 1280


def test_02_switch_task(page, shots):
    set_request(page, "compare", "pier", "fare_revenue")
    before = digest(page, ".pw-panel img.pw-top")
    choose(page, "task", "distribution")
    choose(page, "x", "crossing_minutes")
    wait_change(page, ".pw-panel img.pw-top", before)
    page.wait_for_function("document.querySelector('.pw-designs select')"
                           ".options[0].text.includes('histogram')",
                           timeout=60_000)
    page.screenshot(path=str(shots / "02-task-distribution.png"))


def test_03_bins_control(page, shots):
    set_request(page, "distribution", "crossing_minutes")
    assert page.locator(".pw-bins").is_visible()
    before = digest(page, ".pw-panel img.pw-detail")
    handle = page.locator(".pw-bins .noUi-handle").first
    handle.focus()
    for _ in range(5):
        page.keyboard.press("ArrowRight")
    wait_change(page, ".pw-panel img.pw-detail", before)
    wait_code(page, "bins=", "sailings['crossing_minutes']")
    page.locator(".pw-bins").scroll_into_view_if_needed()
    page.screenshot(path=str(shots / "03-bins.png"))


def test_04_back_to_compare_and_swap_column(page, shots):
    set_request(page, "distribution", "crossing_minutes")
    before = digest(page, ".pw-panel img.pw-top")
    choose(page, "task", "compare")
    choose(page, "x", "pier")
    choose(page, "y", "crossing_minutes")
    wait_change(page, ".pw-panel img.pw-top", before)
    page.wait_for_function("document.querySelector('.pw-hazards').innerText.includes('hidden-spread')",
                           timeout=60_000)
    wait_code(page, "sailings['crossing_minutes']", "sailings['pier']")
    page.locator(".pw-hazards").scroll_into_view_if_needed()
    page.screenshot(path=str(shots / "04-swap-column.png"))


def test_05_pick_design_beyond_top_three(page, shots):
    set_request(page, "compare", "pier", "crossing_minutes")
    options = options_of(page)
    assert len(options) > 4
    before = digest(page, ".pw-panel img.pw-detail")
    page.locator(".pw-designs select").select_option(index=4)
    wait_change(page, ".pw-panel img.pw-detail", before)
    kind = options[4].split(".", 1)[1].split("(")[0].strip()
    page.wait_for_function(f"document.querySelector('.pw-reasons').innerText.includes({kind!r})",
                           timeout=30_000)
    code = page.locator(".pw-code textarea").input_value()
    assert "sailings[" in code and "import seaborn as sns" in code
    page.locator(".pw-designs").scroll_into_view_if_needed()
    page.screenshot(path=str(shots / "05-design-5.png"))


def test_06_no_errors_anywhere(page):
    assert page.locator(".jp-OutputArea-output[data-mime-type='application/vnd.jupyter.stderr']").count() == 0
    assert page.locator(".jp-RenderedText[data-mime-type='application/vnd.jupyter.error']").count() == 0
    assert State.console_errors == [], State.console_errors
