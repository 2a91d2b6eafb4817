"""Plan -> Results: the evaluation chain, one named step after another.

:func:`evaluate` reads top to bottom as the chain: materials, cooldown budget, supply and
order, loads, cooler, rooms, then the invariants. Each step is a plain function of its own
module; it takes the plan and the typed results of earlier steps and returns a typed result
(:mod:`cryoplan.evaluation.results`). Views (text, Markdown, JSON, PDF, the dashboard) read
:meth:`Results.to_dict`, assembled in :func:`cryoplan.evaluation.results.results_to_dict`; they compute no
physics.
"""

from __future__ import annotations

from ..plan import DEFAULT_TRANSFER_LOSS, DEFAULT_TRANSFER_LOSS_OTHER, Plan
from .budget import CASES, cooldown_budget, materials
from .cooler import cooler_step
from .invariants import check_invariants
from .loads import static_loads
from .results import Results
from .rooms import rooms_step
from .supply import supply_and_order

__all__ = ["CASES", "METHOD_SOURCES", "Results", "evaluate"]

METHOD_SOURCES = {
    "cooldown": "Cryogen for a cooldown, dm = m c dT / (L + f [h_v(T) - h_v(T_b)]): J. W. Ekin, "
    "Experimental Techniques for Low-Temperature Measurements, Oxford University Press "
    "(2006), section 1.5; G. K. White and P. J. Meeson, Experimental Techniques in "
    "Low-Temperature Physics, 4th ed., Oxford University Press (2002), chapter 2.",
    "work": "Minimum (reversible) work of cooling and of liquefaction, W = T0 dS - dH: "
    "R. F. Barron, Cryogenic Systems, 2nd ed., Oxford University Press (1985), chapter 3.",
    "fluids": "Fluid properties: CoolProp (I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, "
    "Ind. Eng. Chem. Res. 53 (2014) 2498-2508) and the reference equations of state it "
    "implements.",
    "transfer": "Transfer losses and dewar heels: defaults are common practice (10-25 % of "
    "liquid helium, 5-10 % of liquid nitrogen lost per transfer), to be replaced by the "
    "site's own figures.",
}


def evaluate(plan: Plan) -> Results:
    """Run every analysis the plan asks for, as the chain of named steps.

    Parameters
    ----------
    plan : Plan
        From :func:`cryoplan.load_plan`.

    Returns
    -------
    Results
        The steps' typed results; ``results.to_dict()`` starts with the ``summary`` object
        of DESIGN.md.

    Examples
    --------
    >>> import cryoplan
    >>> from cryoplan.plan import demo_plan_path
    >>> r = evaluate(cryoplan.load_plan(demo_plan_path()))
    >>> r.order.order_L["helium"] >= r.budget.cases["nominal"].cooldown_L["helium"]
    True
    """
    mats = materials(plan)
    budget = cooldown_budget(plan)
    order = supply_and_order(plan, budget)
    loads = static_loads(plan)
    cooler = cooler_step(plan, loads)
    rooms = rooms_step(plan, loads)
    invariants = check_invariants(plan, budget, order, loads, cooler, rooms)

    sources = list(METHOD_SOURCES.values()) + [
        s for s in mats.sources if s not in METHOD_SOURCES.values()
    ]
    later = loads.sources + (cooler.sources if cooler else []) + (rooms.sources if rooms else [])
    sources = sources + [s for s in later if s not in sources]
    assumptions = _assumptions(plan) + loads.assumptions + (rooms.assumptions if rooms else [])
    return Results(
        plan, mats, budget, order, loads, cooler, rooms, invariants, sources, assumptions
    )


def _assumptions(plan: Plan) -> list[str]:
    out = [
        f"Heat is rejected at the ambient, {plan.ambient:g} K, for the minimum work.",
        "Each cooldown step cools every part warmer than the step's end, down to the higher "
        "of that end and the part's stage temperature.",
        "gas_use is the fraction of the cold boil-off gas's enthalpy that cools the parts "
        "(0: latent heat only; 1: the gas leaves at the parts' temperature).",
        "Litres are liquid at the cryogen's boiling point at the step's or bath's pressure.",
    ]
    if plan.mass_margin:
        out.append(
            f"Masses carry a margin of +/-{plan.mass_margin * 100:g} % in the low and high cases."
        )
    used = sorted({s.cryogen for s in plan.cooldown.steps} | {b.cryogen for b in plan.baths})
    for cry in used:
        supply = plan.supplies.get(cry)
        if supply is None or supply.transfer_loss is None:
            loss = DEFAULT_TRANSFER_LOSS.get(cry, DEFAULT_TRANSFER_LOSS_OTHER)
            out.append(
                f"Transfer loss of {cry}: {loss * 100:g} % of what is transferred "
                "(common practice; set transfer_loss in [[supply]] for your site)."
            )
    return out
