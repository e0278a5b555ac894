"""plotwise: chart advice for pandas DataFrames in notebooks and scripts.

    advice = plotwise.advise(df, "compare", x="region", y="revenue")
    advice.designs   # ranked designs, best first
    advice.hazards   # what could mislead, with fixes
    advice.surprises # what in the data deserves a second look
    advice.show()    # matplotlib Figure with the top three side by side
    advice.why_not("pie"), advice.sheet()
"""

from plotwise.advice import Advice
from plotwise.alternatives import WhyNot
from plotwise.drawing import codegen as _codegen  # noqa: F401  (gives Design.code() its writer)
from plotwise.engine.checking import hazard_codes
from plotwise.engine.design import Design, DesignOptions
from plotwise.engine.hazards import HAZARD_CHECKS, Hazard
from plotwise.engine.kinds import KINDS, REGISTRY, ChartKind
from plotwise.engine.profile import FieldProfile, Profile, profile_frame
from plotwise.engine.stats import DesignStats
from plotwise.engine.surprises import SURPRISE_CHECKS, Mark, Surprise
from plotwise.engine.vocab import TASKS
from plotwise.errors import PlotwiseError
from plotwise.pipeline import advise

try:  # one version source: the installed package's metadata (pyproject.toml)
    from importlib.metadata import PackageNotFoundError
    from importlib.metadata import version as _version

    __version__ = _version("plotwise")
except PackageNotFoundError:  # pragma: no cover - run from a source tree that is not installed
    __version__ = "0+unknown"


def audit(fig_or_axes):
    """Report the hazards in an already drawn matplotlib Figure or Axes (see plotwise.audit)."""
    from plotwise.figure_audit.figure import audit as _audit

    return _audit(fig_or_axes)


def __getattr__(name):
    if name == "AuditReport":  # imported on first use: it needs matplotlib
        from plotwise.figure_audit.figure import AuditReport

        return AuditReport
    raise AttributeError(f"module 'plotwise' has no attribute {name!r}")


def last():
    """The Advice from the most recent %plotwise / %%plotwise in this session (or None)."""
    from plotwise.notebook.magics import last as _last

    return _last()


def load_ipython_extension(ipython):
    """``%load_ext plotwise``: register the %plotwise and %%plotwise magics."""
    from plotwise.notebook.magics import load_ipython_extension as _load

    _load(ipython)


def unload_ipython_extension(ipython):
    from plotwise.notebook.magics import unload_ipython_extension as _unload

    _unload(ipython)


__all__ = [
    "Advice", "AuditReport", "ChartKind", "Design", "DesignOptions", "DesignStats",
    "FieldProfile", "HAZARD_CHECKS", "Hazard", "KINDS", "Mark", "PlotwiseError", "Profile",
    "REGISTRY", "SURPRISE_CHECKS", "Surprise", "TASKS", "WhyNot", "advise", "audit",
    "hazard_codes", "last", "load_ipython_extension",
    "profile_frame", "unload_ipython_extension", "__version__",
]
