"""plotwise: chart advice for pandas DataFrames in notebooks and scripts.

    advice = plotwise.advise(df, "compare", x="region", y="revenue")
    advice.designs   # ranked designs, best first
    advice.hazards   # what could mislead, with fixes
    advice.show()    # matplotlib Figure with the top three side by side
"""

from plotwise.advice import Advice, advise
from plotwise.engine.candidates import KINDS, Design
from plotwise.engine.hazards import HAZARD_CHECKS, Hazard, hazard_codes
from plotwise.engine.profile import FieldProfile, Profile, profile_frame
from plotwise.engine.rules import TASKS
from plotwise.errors import PlotwiseError

__version__ = "0.1.0"


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
    "Advice", "Design", "FieldProfile", "HAZARD_CHECKS", "Hazard", "KINDS", "PlotwiseError",
    "Profile", "TASKS", "advise", "hazard_codes", "last", "load_ipython_extension",
    "profile_frame", "unload_ipython_extension", "__version__",
]
