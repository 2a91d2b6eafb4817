"""The loads step: static heat loads of a plan, boil-off, hold times, the refill calendar and
the month's order and cost.

Reads the plan's ``[[load]]`` and ``[[bath]]`` tables and returns a
:class:`~cryoplan.evaluation.results.LoadsResult`. Each load's heat comes from its kind's
function in :mod:`cryoplan.evaluation.load_kinds`; the physics is in
:mod:`cryoplan.physics.heatloads`. :func:`bath_boiloff` accepts arrays of load factors.
"""

from __future__ import annotations

import datetime as _dt
import math

import numpy as np

from ..errors import InputError
from ..physics import heatloads as hl
from ..plan import Plan
from .load_kinds import LoadContext, load_ends, load_kind
from .results import BathBoiloff, Figure, LoadsResult
from .supply import choose_dewars, transfer_loss

SOURCES = [
    "Radiation between gray surfaces: e.g. R. F. Barron, Cryogenic Systems, 2nd ed. (1985), "
    "ch. 6; multilayer insulation: C. W. Keller, G. R. Cunnington, A. P. Glassford, "
    "Thermal performance of multilayer insulations, NASA CR-134477 (1974), the Lockheed "
    "correlation.",
    "Conduction from thermal-conductivity integrals; current leads: R. McFee, Rev. Sci. "
    "Instrum. 30 (1959) 98 (conduction-cooled optimum) and J. M. Lock, Cryogenics 9 (1969) "
    "438 (vapour-cooled leads); residual gas in the free-molecular regime: R. J. Corruccini, "
    "Vacuum 7-8 (1959) 19.",
]


def stage_loads(
    plan: Plan, temps: dict[str, float], ctx: LoadContext | None = None
) -> tuple[list[dict], dict[str, float]]:
    """Every load's contributions at the given stage temperatures; totals by stage [W]."""
    ctx = LoadContext(plan) if ctx is None else ctx
    items = []
    totals = {s.name: 0.0 for s in plan.stages}
    # necks cooled by boil-off gas depend on the other loads of their bath: do them last
    ordered = sorted(plan.loads, key=lambda ld: ld.kind == "neck")
    for load in ordered:
        ctx.other_on_bath = totals.get(load.stage, 0.0) if load.kind == "neck" else 0.0
        kind = load_kind(load)
        try:
            t_cold, t_warm, via = load_ends(load, temps)
            flows = kind.heat(load, t_cold, t_warm, ctx, via)
            detail = kind.detail(load, t_cold, t_warm, ctx)
        except InputError as exc:
            if exc.file is None:
                exc.file, exc.line = plan.path, load.line
                exc.key = exc.key or load.key
            raise
        contrib: dict[str, float] = {}
        for stage, power in flows:
            contrib[stage] = contrib.get(stage, 0.0) + float(power)
        for stage, power in contrib.items():
            totals[stage] = totals.get(stage, 0.0) + power
            v = load.values
            warm = v.get("from_stage") or (f"{v['from']:g} K" if v.get("from") else "")
            items.append(
                {
                    "stage": stage,
                    "name": load.values.get("name", load.kind),
                    "kind": load.kind,
                    "from": warm,
                    "power_W": power,
                    "detail": detail if stage == load.stage else f"{detail} (intercepted here)",
                }
            )
    ctx.other_on_bath = 0.0
    return items, totals


def bath_boiloff(
    plan: Plan, totals: dict[str, float], load_factor: Figure = 1.0
) -> list[BathBoiloff]:
    """Boil-off and hold time of every bath under its stage's static load times a factor.

    Several baths on one stage share its load in proportion to their volumes.

    Parameters
    ----------
    plan : Plan
    totals : dict
        Static load per stage [W] (from :func:`stage_loads`).
    load_factor : float or ndarray (n,)
        Multiplies every stage's load (n variants in one pass), [-].

    Returns
    -------
    list of BathBoiloff
        One per bath, in the plan's order; floats, or arrays of shape (n,).
    """
    from ..data.fluids import cryogen

    out = []
    for b in plan.baths:
        fluid = cryogen(b.cryogen, pressure=b.pressure)
        same_stage = [x for x in plan.baths if x.stage == b.stage]
        share = b.volume / sum(x.volume for x in same_stage)
        q = totals.get(b.stage, 0.0) * share
        if np.ndim(load_factor) or load_factor != 1.0:
            q = q * np.asarray(load_factor, float)
            q = float(q) if np.ndim(q) == 0 else q
        h, rho = fluid.latent_heat, fluid.liquid_density
        out.append(
            BathBoiloff(
                name=b.name,
                load_W=q,
                rate_m3_s=hl.boiloff_rate(q, h, rho),
                hold_s=hl.hold_time(b.volume, q, h, rho),
                hold_to_refill_s=hl.hold_time(b.volume - b.refill_at, q, h, rho),
            )
        )
    return out


ASSUMPTION = (
    "Static loads are taken with every stage at its own temperature; a support or wire "
    "heat-sunk at intermediate stages is split into equal lengths between them. Several "
    "baths on one stage share its load in proportion to their volumes."
)


def _month_row(plan: Plan, b, fig: BathBoiloff, start_dt, horizon: float) -> dict:
    """The JSON row of one bath: boil-off, hold, refill calendar, the month's order."""
    rate, hold, hold_refill = fig.rate_m3_s, fig.hold_s, fig.hold_to_refill_s
    refills = []
    if math.isfinite(hold_refill) and hold_refill > 0:
        refills = [
            d.strftime("%a %d %b") for d in hl.refill_schedule(start_dt, hold_refill, horizon)
        ]
    boiled = rate * horizon * 1000.0  # L
    supply = plan.supplies.get(b.cryogen)
    loss = transfer_loss(plan, b.cryogen, b.transfer_loss)
    transferred = boiled / (1 - loss)
    price = supply.price if supply and supply.price is not None else None
    dewars = []
    if supply and supply.dewars:
        dewars = choose_dewars(transferred, [d * 1000 for d in supply.dewars], supply.heel * 1000)
    ordered = sum(s * n for s, n in dewars) if dewars else transferred
    return {
        "name": b.name,
        "cryogen": b.cryogen,
        "stage": b.stage,
        "volume_L": b.volume * 1000,
        "refill_at_L": b.refill_at * 1000,
        "load_W": fig.load_W,
        "boiloff_L_per_h": rate * 3.6e6,
        "boiloff_L_per_day": rate * 8.64e7,
        "hold_h": hold / 3600 if math.isfinite(hold) else None,
        "hold_to_refill_h": hold_refill / 3600 if math.isfinite(hold_refill) else None,
        "refills": refills,
        "month_days": plan.horizon_days,
        "month_boiloff_L": boiled,
        "month_refills": len(refills),
        "month_transfer_L": transferred,
        "month_order_L": ordered,
        "month_dewars": [{"size_L": s, "count": n} for s, n in dewars],
        "month_cost": None if price is None else ordered / 1000 * price,
        "currency": supply.currency if supply else "",
    }


def static_loads(plan: Plan) -> LoadsResult:
    """The loads step: loads by stage and cause, boil-off, hold time, calendar, month.

    The static table is computed for every plan (the cooler step reads it); the JSON shows
    it only where the plan has loads or baths (``LoadsResult.shown``).
    """
    temps = {s.name: s.temperature for s in plan.stages}
    items, totals = stage_loads(plan, temps)
    by_stage = []
    for s in plan.stages:
        kinds: dict[str, float] = {}
        for it in items:
            if it["stage"] == s.name:
                kinds[it["kind"]] = kinds.get(it["kind"], 0.0) + it["power_W"]
        by_stage.append(
            {
                "stage": s.name,
                "temperature_K": s.temperature,
                "total_W": totals.get(s.name, 0.0),
                "by_kind": kinds,
            }
        )
    start = plan.start_date or _dt.date.today()
    start_dt = _dt.datetime.combine(start, _dt.time(9, 0))
    horizon = plan.horizon_days * 86400.0
    boiloff = bath_boiloff(plan, totals)
    baths = [_month_row(plan, b, f, start_dt, horizon) for b, f in zip(plan.baths, boiloff)]
    notes = []
    if any(ld.kind == "neck" and ld.values.get("vapor_cooled") for ld in plan.loads):
        notes.append(
            "Necks marked vapor_cooled carry the bath's boil-off gas in perfect "
            "exchange (the published counterflow model); a real neck lies between "
            "this figure and its bare conduction."
        )
    shown = bool(plan.loads or plan.baths)
    return LoadsResult(
        items=items,
        totals=totals,
        by_stage=by_stage,
        baths=baths,
        boiloff=boiloff,
        notes=notes,
        start_date=start.isoformat(),
        shown=shown,
        sources=list(SOURCES) if shown else [],
        assumptions=[ASSUMPTION] if shown else [],
    )
