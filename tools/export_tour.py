"""Execute a demo notebook in a real kernel and write it as static HTML (readable offline).

    python tools/export_tour.py demo_notebooks/tour.ipynb build/demo/tour.html
"""

import sys
import tempfile
from pathlib import Path

import nbformat
from nbclient import NotebookClient
from nbconvert import HTMLExporter


def execute(path: Path, timeout: int = 600) -> nbformat.NotebookNode:
    nb = nbformat.read(path, as_version=4)
    with tempfile.TemporaryDirectory() as tmp:
        # Widget state is not stored: an exported page would otherwise fetch widget JavaScript
        # from the internet; the panel's static HTML/PNG fallback is shown instead.
        NotebookClient(nb, timeout=timeout, kernel_name="python3", store_widget_state=False,
                       resources={"metadata": {"path": tmp}}).execute()
    return nb


def main(argv):
    src, out = Path(argv[0]), Path(argv[1])
    nb = execute(src)
    html, _ = HTMLExporter(template_name="lab").from_notebook_node(nb)
    out.parent.mkdir(parents=True, exist_ok=True)
    out.write_text(html, encoding="utf-8")
    print(f"executed {src} and wrote {out.resolve()}")


if __name__ == "__main__":
    main(sys.argv[1:])
