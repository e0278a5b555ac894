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
