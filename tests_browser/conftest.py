"""A real JupyterLab on 127.0.0.1 driven by headless Chromium (Debian's /usr/bin/chromium via
the playwright package). The server gets a free port, a random token, a temporary root and
settings folder, and is always stopped at the end."""

import json
import os
import secrets
import shutil
import signal
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import nbformat
import pytest
from nbformat.v4 import new_code_cell, new_notebook

ROOT = Path(__file__).resolve().parent.parent
SHOTS = ROOT / "build" / "browser"
CHROMIUM = shutil.which("chromium") or "/usr/bin/chromium"

SETUP = """%load_ext plotwise
from plotwise.demo import demo_data
sailings = demo_data()["sailings"]"""


# The SHA-256 of an image as the page holds it (compared before and after a change).
DIGEST_JS = """async (sel) => {
  const img = document.querySelector(sel);
  if (!img || !img.src) return null;
  const buf = await (await fetch(img.src)).arrayBuffer();
  const d = await crypto.subtle.digest('SHA-256', buf);
  return Array.from(new Uint8Array(d)).map(b => b.toString(16).padStart(2, '0')).join('');
}"""


def digest(page, sel):
    return page.evaluate(DIGEST_JS, sel)


NB = ".jp-NotebookPanel:not(.lm-mod-hidden)"  # the notebook in front


def notebook_of(*sources: str) -> nbformat.NotebookNode:
    return new_notebook(cells=[new_code_cell(src) for src in sources],
                        metadata={"kernelspec": {"name": "python3", "display_name": "Python 3",
                                                 "language": "python"}})


def run_all(page, lab, name: str, before=None) -> None:
    """Open notebook ``name`` alone (a reset workspace), wait for its kernel, call ``before(page)``
    if given, then run all cells from the Run menu (keystrokes sent while the page settles can
    be lost)."""
    page.goto(f"{lab.url}/lab/tree/{name}?reset&token={lab.token}")
    page.wait_for_selector(f"{NB} .jp-Notebook", timeout=120_000)
    lab.wait_session(name)
    time.sleep(1)  # let the page settle (Lab keeps polling, so no "network idle" state)
    if before is not None:
        before(page)
    page.locator(".lm-MenuBar-itemLabel", has_text="Run").first.click()
    page.locator(".lm-Menu-itemLabel", has_text="Run All Cells").first.click()


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def panel_notebook() -> nbformat.NotebookNode:
    return notebook_of(SETUP, "%plotwise compare sailings --x pier --y fare_revenue")


def write_settings(folder: Path) -> None:
    """User settings for this server only: every cell kept in the page, no news toast."""
    (folder / "@jupyterlab" / "notebook-extension").mkdir(parents=True)
    (folder / "@jupyterlab" / "notebook-extension" / "tracker.jupyterlab-settings").write_text(
        json.dumps({"windowingMode": "none"}))
    (folder / "@jupyterlab" / "apputils-extension").mkdir(parents=True)
    (folder / "@jupyterlab" / "apputils-extension" / "notification.jupyterlab-settings").write_text(
        json.dumps({"fetchNews": "false", "checkForUpdates": False}))


class Lab:
    def __init__(self, url: str, token: str, root: Path):
        self.url, self.token, self.root = url, token, root

    def api(self, path: str):
        with urllib.request.urlopen(f"{self.url}{path}?token={self.token}", timeout=10) as r:
            return json.load(r)

    def wait_session(self, path: str, timeout: float = 180) -> None:
        """Wait until the notebook at ``path`` has a kernel and that kernel is idle."""
        end = time.time() + timeout
        while time.time() < end:
            for s in self.api("/api/sessions"):
                if s.get("path") == path and s["kernel"]["execution_state"] == "idle":
                    return
            time.sleep(0.5)
        raise TimeoutError(f"no idle kernel for {path}")

    def wait_idle(self, timeout: float = 180) -> None:
        end = time.time() + timeout
        while time.time() < end:
            kernels = self.api("/api/kernels")
            if kernels and all(k["execution_state"] == "idle" for k in kernels):
                return
            time.sleep(0.5)
        raise TimeoutError("kernel did not become idle")


@pytest.fixture(scope="session")
def lab(tmp_path_factory):
    root = tmp_path_factory.mktemp("lab-root")
    settings = tmp_path_factory.mktemp("lab-settings")
    write_settings(settings)
    nbformat.write(panel_notebook(), root / "panel.ipynb")
    port, token = free_port(), secrets.token_hex(16)
    # settings and workspaces of this server only (a remembered workspace would reopen
    # notebooks of an earlier run beside the one a test opens)
    env = dict(os.environ, JUPYTERLAB_SETTINGS_DIR=str(settings),
               JUPYTERLAB_WORKSPACES_DIR=str(tmp_path_factory.mktemp("lab-workspaces")))
    env.pop("MPLBACKEND", None)  # the kernel must use the inline backend, as users' do
    log = open(root.parent / "jupyter-lab.log", "w")
    proc = subprocess.Popen(
        [sys.executable, "-m", "jupyter", "lab", "--allow-root", "--no-browser", "--ip=127.0.0.1",
         f"--port={port}", f"--IdentityProvider.token={token}", f"--ServerApp.root_dir={root}"],
        env=env, stdout=log, stderr=subprocess.STDOUT, start_new_session=True)
    url = f"http://127.0.0.1:{port}"
    try:
        end = time.time() + 120
        while True:
            try:
                urllib.request.urlopen(f"{url}/api/status?token={token}", timeout=2)
                break
            except OSError:
                if time.time() > end or proc.poll() is not None:
                    raise RuntimeError("JupyterLab did not start; see jupyter-lab.log") from None
                time.sleep(0.5)
        yield Lab(url, token, root)
    finally:
        os.killpg(proc.pid, signal.SIGTERM)
        try:
            proc.wait(timeout=20)
        except subprocess.TimeoutExpired:
            os.killpg(proc.pid, signal.SIGKILL)
        log.close()


@pytest.fixture(scope="session")
def browser():
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, headless=True, args=[
            "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
            "--disable-background-networking", "--disable-component-update", "--disable-sync"])
        try:
            yield b
        finally:
            b.close()


@pytest.fixture(scope="session")
def shots():
    SHOTS.mkdir(parents=True, exist_ok=True)
    return SHOTS
