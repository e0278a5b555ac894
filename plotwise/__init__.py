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

__all__ = [
    "Advice", "Design", "FieldProfile", "HAZARD_CHECKS", "Hazard", "KINDS", "PlotwiseError",
    "Profile", "TASKS", "advise", "hazard_codes", "profile_frame", "__version__",
]
