"""Running the hazard checks: every registered check (see checks_encoding and checks_evidence,
registered in that order) on every design, or once per advice."""

from __future__ import annotations

from plotwise.engine import checks_encoding, checks_evidence  # noqa: F401  (they register)
from plotwise.engine.design import Design
from plotwise.engine.hazards import HAZARD_CHECKS, Hazard, HazardContext


def run_checks(ctx: HazardContext, designs: list[Design]) -> list[Hazard]:
    """Attach per-design hazards to every design; return the advice-wide hazards."""
    for d in designs:
        d.hazards = []
        for hc in HAZARD_CHECKS:
            if hc.per_design:
                ctx.design = d
                d.hazards.extend(hc.func(ctx))
    ctx.design = None
    found: list[Hazard] = []
    for hc in HAZARD_CHECKS:
        if not hc.per_design:
            found.extend(hc.func(ctx))
    return found


def hazard_codes() -> list[str]:
    """Every registered hazard code, in registration order."""
    return list(dict.fromkeys(hc.code for hc in HAZARD_CHECKS))
