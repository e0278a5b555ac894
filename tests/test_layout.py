"""The architecture holds: the engine imports no drawing, notebook, engine-data or plotting
library; no module imports another that (directly or not) imports it back; the README's kind
and hazard tables, the kind registry, the hazard registry and the audit's codes agree (a drift
test: any of them changing alone fails here)."""

import ast
import re
import subprocess
import sys
from pathlib import Path

import pytest

import plotwise
from plotwise.engine.checking import hazard_codes
from plotwise.engine.kinds import KINDS, REGISTRY

ROOT = Path(__file__).resolve().parents[1]
PKG = ROOT / "plotwise"
README = (ROOT / "README.md").read_text(encoding="utf-8")


def _module_name(path: Path) -> str:
    rel = path.relative_to(ROOT).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


def _imports(path: Path) -> set[str]:
    """Every plotwise module (and outside package) a module imports, at module level or inside
    functions; imports under ``if TYPE_CHECKING:`` are for the type checker only and skipped."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    skip = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            skip |= {id(n) for n in ast.walk(node)}
    out = set()
    for node in ast.walk(tree):
        if id(node) in skip:
            continue
        if isinstance(node, ast.Import):
            out |= {a.name for a in node.names}
        elif isinstance(node, ast.ImportFrom) and node.module:
            if node.module == "plotwise.engine" or node.module == "plotwise.drawing":
                out |= {f"{node.module}.{a.name}" for a in node.names}
            else:
                out.add(node.module)
    return out


GRAPH = {_module_name(p): _imports(p) for p in PKG.rglob("*.py")}


def _internal(names: set[str]) -> set[str]:
    return {n for n in names if n in GRAPH and n != "plotwise"}


def test_engine_imports_only_the_engine():
    outside = ("matplotlib", "seaborn", "IPython", "ipywidgets", "plotwise.drawing",
               "plotwise.notebook", "plotwise.sources", "plotwise.figure_audit",
               "plotwise.pipeline", "plotwise.advice", "narwhals", "duckdb")
    for mod, names in GRAPH.items():
        if mod.startswith("plotwise.engine"):
            bad = sorted(n for n in names if n.startswith(outside))
            assert not bad, f"{mod} imports {bad}"


def test_lower_stages_do_not_import_higher_ones():
    above = {"plotwise.drawing": ("plotwise.notebook", "plotwise.pipeline", "plotwise.advice",
                                  "plotwise.figure_audit"),
             "plotwise.sources": ("plotwise.drawing", "plotwise.notebook", "plotwise.pipeline",
                                  "plotwise.advice", "plotwise.figure_audit")}
    for mod, names in GRAPH.items():
        for stage, higher in above.items():
            if mod.startswith(stage):
                bad = sorted(n for n in names if n.startswith(higher))
                assert not bad, f"{mod} imports {bad}"


def test_no_import_cycles():
    edges = {m: _internal(n) for m, n in GRAPH.items()}
    state: dict[str, int] = {}
    path: list[str] = []

    def visit(m):
        state[m] = 1
        path.append(m)
        for n in edges.get(m, ()):
            if state.get(n) == 1:
                cycle = path[path.index(n):] + [n]
                pytest.fail("import cycle: " + " -> ".join(cycle))
            if n not in state:
                visit(n)
        path.pop()
        state[m] = 2

    for m in sorted(edges):
        if m not in state:
            visit(m)


def test_engine_runs_without_matplotlib_in_a_fresh_interpreter():
    code = (
        "import sys, importlib, pkgutil\n"
        "import pandas as pd\n"
        "import plotwise, plotwise.engine as e\n"
        "for m in pkgutil.iter_modules(e.__path__):\n"
        "    importlib.import_module('plotwise.engine.' + m.name)\n"
        "df = pd.DataFrame({'g': list('abcab'), 'v': [1.0, 2, 3, 4, 5]})\n"
        "a = plotwise.advise(df, 'compare', x='g', y='v')\n"
        "assert a.designs\n"
        "print(sorted(m for m in ('matplotlib', 'seaborn') if m in sys.modules))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]", out.stdout + out.stderr


def test_advise_does_not_import_scipy_signal():
    # scipy.signal's import alone took 0.7-1.2 s of a first advise() here, scipy.stats' about
    # 0.9 s; the engine counts peaks and estimates densities itself (checked against scipy in
    # tests/engine/test_reference_numerics.py). seaborn, once drawing, imports scipy.stats.
    code = (
        "import sys\n"
        "import numpy as np, pandas as pd\n"
        "import plotwise\n"
        "rng = np.random.default_rng(0)\n"
        "df = pd.DataFrame({'g': rng.choice(list('abc'), 500), 'v': rng.lognormal(size=500)})\n"
        "for task in ('compare', 'distribution'):\n"
        "    plotwise.advise(df, task, x='g' if task == 'compare' else 'v',\n"
        "                    y='v' if task == 'compare' else None)\n"
        "print('scipy.signal' in sys.modules, 'scipy.stats' in sys.modules,\n"
        "      'seaborn' in sys.modules)\n"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    signal, stats, seaborn = out.stdout.split()
    assert signal == "False" and stats == seaborn, out.stdout + out.stderr


def _readme_table(heading: str) -> list[list[str]]:
    part = README.split(heading, 1)[1].split("\n## ", 1)[0]
    rows = [line for line in part.splitlines() if line.startswith("| `")]
    return [[c.strip() for c in row.strip("|").split("|")] for row in rows]


def test_readme_kind_table_matches_the_registry():
    rows = _readme_table("## Chart kinds")
    assert [r[0].strip("`") for r in rows] == list(KINDS)
    for name, tasks, draws, large, engine, log_axis, facets in rows:
        k = REGISTRY[name.strip("`")]
        listed = dict((t, float(v)) for t, v in (p.split() for p in tasks.split(", ")))
        assert listed == k.task_fit, name
        assert (draws, large, engine) == (k.draws, k.large, k.engine), name
        assert (log_axis == "yes", facets == "yes") == (k.log_axis, k.facets), name


def test_readme_hazard_table_matches_the_registry():
    rows = _readme_table("## Hazard codes")
    assert sorted(r[0].strip("`") for r in rows) == sorted(hazard_codes())


def test_readme_surprise_table_matches_the_registry():
    from plotwise.engine.surprises import SURPRISE_CHECKS

    rows = _readme_table("## Surprises: what deserves a second look")
    assert sorted(r[0].strip("`") for r in rows) == sorted(c.code for c in SURPRISE_CHECKS)


def test_audit_codes_are_registered_or_documented_as_audit_only():
    from plotwise.figure_audit.report import AUDIT_ONLY_CODES

    paragraph = README.split("## Auditing a chart that is already drawn", 1)[1].split("\n## ", 1)[0]
    named = set(re.findall(r"`([a-z0-9-]+)`", paragraph))
    source = "\n".join(p.read_text(encoding="utf-8") for p in (PKG / "figure_audit").glob("*.py"))
    emitted = set(re.findall(r'Hazard\(\s*"([a-z0-9-]+)"', source))
    assert emitted, "the audit emits no hazard codes?"
    assert emitted <= set(hazard_codes()) | set(AUDIT_ONLY_CODES)
    assert set(AUDIT_ONLY_CODES) <= named
    assert emitted <= named | {"plotwise"}


def test_every_kind_has_a_generator_and_records_refuse_unknown_names():
    from plotwise.drawing.snippet import GENERATORS

    assert set(GENERATORS) == set(KINDS)
    with pytest.raises(plotwise.PlotwiseError, match="unknown chart kind"):
        plotwise.Design("pie-3d", "compare", {}, {})
    with pytest.raises(plotwise.PlotwiseError, match="unknown task"):
        plotwise.Design("bar", "rank", {}, {})
    with pytest.raises(plotwise.PlotwiseError, match="unknown severity"):
        plotwise.Hazard("x", "critical", "m", "f")
