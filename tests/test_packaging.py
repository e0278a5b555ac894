"""One version source, the typing marker and the licence."""

from importlib.metadata import metadata, version
from pathlib import Path

import pytest

import plotwise
from plotwise.cli import main

ROOT = Path(__file__).resolve().parent.parent


def test_version_comes_from_the_package_metadata(capsys):
    assert plotwise.__version__ == version("plotwise")
    with pytest.raises(SystemExit) as e:
        main(["--version"])
    assert e.value.code == 0
    assert capsys.readouterr().out.strip() == f"plotwise {version('plotwise')}"


def test_typed_marker_licence_and_changelog():
    assert (Path(plotwise.__file__).parent / "py.typed").is_file()
    assert (ROOT / "LICENSE").read_text(encoding="utf-8").startswith("MIT License")
    assert metadata("plotwise")["License-Expression"] == "MIT"
    assert "## Unreleased" in (ROOT / "CHANGELOG.md").read_text(encoding="utf-8")
