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


def pytest_terminal_summary(terminalreporter):
    """Report how many frames the property test generated (it must be at least 3,000 in CI)."""
    import sys

    mod = sys.modules.get("test_properties")
    if mod is not None and mod.COUNT["frames"]:
        c = mod.COUNT
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
