"""Supply and order: what to order per cryogen, in which dewars, and the liquefaction work.

The cooldown's litres, the bath fills and the inserts become litres transferred (each through
its transfer loss), then whole dewars less their heels; the ideal liquefaction work of what
is ordered is set against the supplier's liquefier energy where the plan gives it.
"""

from __future__ import annotations

import math

import numpy as np

from ..plan import DEFAULT_TRANSFER_LOSS, DEFAULT_TRANSFER_LOSS_OTHER, Plan
from .budget import CASES
from .results import BudgetResult, CooldownLitres, Figure, OrderResult


def transfer_loss(plan: Plan, cryogen: str, override: float | None) -> float:
    """The transfer loss of a cryogen: the entry's own, else the supply's, else the default
    of common practice (:data:`cryoplan.plan.DEFAULT_TRANSFER_LOSS`)."""
    if override is not None:
        return override
    supply = plan.supplies.get(cryogen)
    if supply is not None and supply.transfer_loss is not None:
        return supply.transfer_loss
    return DEFAULT_TRANSFER_LOSS.get(cryogen, DEFAULT_TRANSFER_LOSS_OTHER)


def choose_dewars(needed_L: float, sizes_L: list[float], heel_L: float) -> list[tuple[float, int]]:
    """Whole dewars of the given sizes whose usable liquid (size - heel) covers ``needed_L``,
    with the least liquid ordered (then the fewest dewars).

    >>> choose_dewars(230.0, [100.0, 250.0], 10.0)
    [(250.0, 1)]
    >>> choose_dewars(300.0, [100.0, 250.0], 10.0)
    [(100.0, 1), (250.0, 1)]
    """
    sizes = sorted(s for s in sizes_L if s - heel_L > 0)
    if needed_L <= 0 or not sizes:
        return []
    need = int(math.ceil(needed_L - 1e-9))
    usable = [max(1, int(math.floor(s - heel_L))) for s in sizes]
    inf = (math.inf, math.inf)
    best: list[tuple[float, float]] = [(0.0, 0.0)] + [inf] * need
    choice = [-1] * (need + 1)
    for x in range(1, need + 1):
        for k, (s, u) in enumerate(zip(sizes, usable)):
            prev = best[max(0, x - u)]
            cand = (prev[0] + s, prev[1] + 1)
            if cand < best[x]:
                best[x], choice[x] = cand, k
    counts = [0] * len(sizes)
    x = need
    while x > 0:
        k = choice[x]
        counts[k] += 1
        x = max(0, x - usable[k])
    return [(s, n) for s, n in zip(sizes, counts) if n]


def order_litres(
    plan: Plan, litres: CooldownLitres, losses: dict[str, Figure] | None = None
) -> dict[str, dict]:
    """What to order per cryogen: cooldown + bath fill + inserts + transfer losses + heels.

    Parameters
    ----------
    plan : Plan
    litres : CooldownLitres
        The litres of one case (from :func:`cryoplan.evaluation.budget.cooldown_litres`).
    losses : dict, optional
        Transfer loss per cryogen in place of the plan's (every step, bath and insert of
        that cryogen), [-]; floats or arrays of shape (n,).

    Returns
    -------
    dict
        Cryogen -> the order entry of the JSON. With arrays (of litres or of losses) the
        litres are arrays of shape (n,) and no dewars are chosen (``order_L`` is then
        the litres needed; dewar rounding is for one plan at a time).
    """
    losses = losses or {}
    cooldown_L, inserts_L = litres.cooldown_L, litres.inserts_L
    cryogens = set(cooldown_L) | set(inserts_L) | {b.cryogen for b in plan.baths}
    order = {}
    for cry in sorted(cryogens):

        def loss_of(override, cry=cry):
            return losses[cry] if cry in losses else transfer_loss(plan, cry, override)

        transferred: Figure = 0.0
        delivered: Figure = 0.0
        for step, s in zip(plan.cooldown.steps, litres.steps):
            if step.cryogen == cry:
                loss = loss_of(step.transfer_loss)
                delivered = delivered + s["liquid_L"]
                transferred = transferred + s["liquid_L"] / (1 - loss)
        fill = 0.0
        for bath in plan.baths:
            if bath.cryogen == cry:
                loss = loss_of(bath.transfer_loss)
                fill += bath.volume * 1000
                transferred = transferred + bath.volume * 1000 / (1 - loss)
        ins = inserts_L.get(cry, 0.0)
        transferred = transferred + ins / (1 - loss_of(None))
        delivered = delivered + fill + ins
        supply = plan.supplies.get(cry)
        heel = supply.heel * 1000 if supply else 0.0
        scalar = np.ndim(transferred) == 0
        dewars = (
            choose_dewars(transferred, [d * 1000 for d in supply.dewars], heel)
            if (scalar and supply and supply.dewars)
            else []
        )
        n_dewars = sum(n for _, n in dewars)
        ordered = sum(s * n for s, n in dewars) if dewars else transferred + heel * 0
        price = supply.price if supply and supply.price is not None else None
        entry = {
            "cooldown_L": cooldown_L.get(cry, 0.0),
            "bath_fill_L": fill,
            "inserts_L": ins,
            "transfer_loss_L": transferred - delivered,
            "needed_L": transferred,
            "heel_L": heel * n_dewars,
            "dewars": [{"size_L": s, "count": n} for s, n in dewars],
            "order_L": ordered,
            "spare_L": ordered - transferred - heel * n_dewars if dewars else 0.0,
            "cost": None if price is None else ordered / 1000 * price,
            "currency": supply.currency if supply else "",
        }
        order[cry] = entry
    return order


def supply_and_order(plan: Plan, budget: BudgetResult) -> OrderResult:
    """The supply-and-order step: each case's order, the nominal one with its range, and the
    ideal (and the supplier's) liquefaction work of what is ordered."""
    cases = {case: order_litres(plan, budget.cases[case]) for case in CASES}
    merged = {
        cry: {
            **entry,
            "range": {
                c: {
                    "order_L": cases[c].get(cry, {}).get("order_L"),
                    "needed_L": cases[c].get(cry, {}).get("needed_L"),
                    "cost": cases[c].get(cry, {}).get("cost"),
                }
                for c in CASES
            },
        }
        for cry, entry in cases["nominal"].items()
    }
    steps_range = [
        {"step": s["step"], **{c: budget.cases[c].steps[i]["liquid_L"] for c in CASES}}
        for i, s in enumerate(budget.cases["nominal"].steps)
    ]
    return OrderResult(cases, merged, steps_range, liquefaction(plan, merged))


def liquefaction(plan: Plan, order: dict[str, dict]) -> dict[str, dict]:
    from ..data.fluids import cryogen

    out = {}
    for cry, entry in order.items():
        fluid = cryogen(cry)
        kg = entry["order_L"] / 1000 * fluid.liquid_density
        ideal = fluid.ideal_liquefaction_work(plan.ambient) * kg
        supply = plan.supplies.get(cry)
        real = None
        if supply and supply.liquefier_energy is not None:
            real = supply.liquefier_energy * entry["order_L"] / 1000
        out[cry] = {
            "ideal_J": ideal,
            "ideal_kWh": ideal / 3.6e6,
            "real_J": real,
            "real_kWh": None if real is None else real / 3.6e6,
            "percent_of_ideal": None if not real else 100 * ideal / real,
        }
    return out
