"""Every demo notebook runs top to bottom in a real ipykernel (via nbclient): no errors, every
advice cell shows an image and the hazard codes it is expected to catch."""

from pathlib import Path

import nbformat
import pytest
from nbclient import NotebookClient

ROOT = Path(__file__).resolve().parents[2]
NOTEBOOKS = sorted((ROOT / "demo_notebooks").glob("*.ipynb"))


def test_all_tasks_have_a_notebook():
    names = {p.stem for p in NOTEBOOKS}
    assert {"tour", "compare", "trend", "proportion", "correlate", "distribution"} <= names


@pytest.mark.parametrize("path", NOTEBOOKS, ids=[p.stem for p in NOTEBOOKS])
def test_notebook_runs(path, tmp_path):
    nb = nbformat.read(path, as_version=4)
    NotebookClient(nb, timeout=600, kernel_name="python3", store_widget_state=False,
                   resources={"metadata": {"path": str(tmp_path)}}).execute()
    advice_cells = 0
    for cell in nb.cells:
        if cell.cell_type != "code":
            continue
        for out in cell.outputs:
            assert out.output_type != "error", f"{path.name}: {out.get('ename')}: {out.get('evalue')}"
            if out.output_type == "stream":
                assert out.name == "stdout", f"{path.name}: stderr output: {out.text[:300]}"
        expect = cell.metadata.get("plotwise")
        if expect is None:
            continue
        advice_cells += 1
        text = " ".join(str(v) for out in cell.outputs for v in out.get("data", {}).values())
        if not cell.source.startswith("check ="):
            assert any("image/png" in out.get("data", {}) for out in cell.outputs), cell.source
        for code in expect["expect_hazards"] + expect.get("expect_surprises", []):
            assert code in text, f"{path.name}: {cell.source!r} should show {code}"
    assert advice_cells >= 1

