import matplotlib

matplotlib.use("Agg")  # set in the test process only (kernels under test keep their own backend)

import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
import pytest  # noqa: E402


@pytest.fixture(autouse=True)
def no_open_figures():
    """Every test must leave no pyplot figure open."""
    before = set(plt.get_fignums())
    yield
    leaked = set(plt.get_fignums()) - before
    plt.close("all")
    assert not leaked, f"figures left open: {leaked}"


@pytest.fixture
def rng():
    return np.random.default_rng(12345)


FROM_WORKERS: dict[str, int] = {}  # property-test counts sent back by pytest-xdist workers


def _property_counts() -> dict[str, int]:
    import sys

    mod = sys.modules.get("test_properties")
    return dict(mod.COUNT) if mod is not None else {}


def pytest_sessionfinish(session):
    if hasattr(session.config, "workeroutput"):  # a pytest-xdist worker: report to the controller
        session.config.workeroutput["property_counts"] = _property_counts()


@pytest.hookimpl(optionalhook=True)
def pytest_testnodedown(node, error):
    for k, v in getattr(node, "workeroutput", {}).get("property_counts", {}).items():
        FROM_WORKERS[k] = FROM_WORKERS.get(k, 0) + v


def pytest_terminal_summary(terminalreporter):
    """Report how many frames the property test generated (it must be at least 3,000 in CI)."""
    c = dict(FROM_WORKERS)
    for k, v in _property_counts().items():
        c[k] = c.get(k, 0) + v
    if c.get("frames"):
        terminalreporter.write_line(
            f"property test: {c['frames']} generated frames ({c['advice']} advised, "
            f"{c['errors']} clear PlotwiseErrors; {c['full']} drawn, displayed and their code "
            "run)")


@pytest.fixture(scope="session")
def ipshell():
    """One real IPython shell for the whole run, with plotwise's magics loaded."""
    from IPython.testing.globalipapp import get_ipython, start_ipython

    shell = start_ipython() or get_ipython()
    shell.run_cell("%load_ext plotwise")
    return shell


def pytest_collection_modifyitems(config, items):
    """Each property-test shard first in one half of the run: pytest-xdist's worksteal gives each
    of the two workers one half to start with, so the two long shards run side by side (it never
    splits off the last test a worker has queued)."""
    shards = [i for i in items if "test_any_frame_gives_advice_or_clear_error[" in i.nodeid]
    if len(shards) != 2:
        return
    rest = [i for i in items if i not in shards]
    half = len(rest) // 2
    items[:] = [shards[0]] + rest[:half] + [shards[1]] + rest[half:]
