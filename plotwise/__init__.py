"""plotwise: chart advice for pandas DataFrames in notebooks and scripts.

    advice = plotwise.advise(df, "compare", x="region", y="revenue")
    advice.designs   # ranked designs, best first
    advice.hazards   # what could mislead, with fixes
    advice.show()    # matplotlib Figure with the top three side by side
"""

from .advice import Advice, advise
from .designs import KINDS, Design
from .errors import PlotwiseError
from .hazards import HAZARD_CHECKS, Hazard, hazard_codes
from .profile import FieldProfile, Profile, profile_frame
from .rules import TASKS

__version__ = "0.1.0"


def last():
    """The Advice from the most recent %plotwise / %%plotwise in this session (or None)."""
    from .magics import last as _last

    return _last()


def load_ipython_extension(ipython):
    """``%load_ext plotwise``: register the %plotwise and %%plotwise magics."""
    from .magics import load_ipython_extension as _load

    _load(ipython)


def unload_ipython_extension(ipython):
    from .magics import unload_ipython_extension as _unload

    _unload(ipython)


__all__ = [
    "Advice", "Design", "FieldProfile", "HAZARD_CHECKS", "Hazard", "KINDS", "PlotwiseError",
    "Profile", "TASKS", "advise", "hazard_codes", "last", "load_ipython_extension",
    "profile_frame", "unload_ipython_extension", "__version__",
]
