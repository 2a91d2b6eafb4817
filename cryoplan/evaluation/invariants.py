"""The invariants step of the chain: the checks an evaluation makes on its own figures before
anything is printed (energy balance of every stage, mass of every cryogen, gas released
against a room's inventory, efficiencies against their thermodynamic limits).

A placeholder today: the consistency work (issue 13) fills :func:`check_invariants`; it
already receives every earlier step's typed result.
"""

from __future__ import annotations

from ..plan import Plan
from .results import (
    BudgetResult,
    CoolerResult,
    InvariantsResult,
    LoadsResult,
    OrderResult,
    RoomsResult,
)


def check_invariants(
    plan: Plan,
    budget: BudgetResult,
    order: OrderResult,
    loads: LoadsResult,
    cooler: CoolerResult | None,
    rooms: RoomsResult | None,
) -> InvariantsResult:
    """Check the chain's invariants; none is checked yet (see the module's text)."""
    return InvariantsResult(checked=[])
