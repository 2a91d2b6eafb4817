"""Static heat loads of a plan, boil-off, hold times, the refill calendar and the month's cost.

An evaluation hook (see :mod:`cryoplan.evaluation`): reads the plan's ``[[load]]`` and
``[[bath]]`` tables, writes ``data["loads"]`` and the summary's ``static_boiloff_L_per_day``
and ``hold_time_h``. The physics is in :mod:`cryoplan.heatloads`.
"""

from __future__ import annotations

import datetime as _dt
import math

from ..errors import InputError
from ..physics import heatloads as hl
from ..plan.reader import Plan

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


_VAPOR_LEAD_CACHE: dict = {}


def _vapor_lead_per_ampere(cryogen_name: str, t_bath: float, t_warm: float) -> float:
    """Optimum heat per ampere of a vapour-cooled lead [W/A].

    For a helium bath near 4.2 K with the warm end near room temperature this is the
    published figure (:data:`cryoplan.heatloads.VAPOR_COOLED_LEAD_HEAT_PER_AMPERE`,
    1.04 mW/A); elsewhere Lock's counterflow model is solved once per temperatures.
    """
    if cryogen_name == "helium" and abs(t_bath - 4.22) < 0.3 and 270.0 <= t_warm <= 310.0:
        return hl.VAPOR_COOLED_LEAD_HEAT_PER_AMPERE
    key = (cryogen_name, round(t_bath, 3), round(t_warm, 3))
    if key not in _VAPOR_LEAD_CACHE:
        from ..data.fluids import cryogen

        fluid = cryogen(cryogen_name)
        q, _ = hl.vapor_cooled_lead_optimum(
            1000.0,
            t_bath,
            t_warm,
            fluid.latent_heat,
            fluid.boiloff_gas_enthalpy,
        )
        _VAPOR_LEAD_CACHE[key] = float(q) / 1000.0
    return _VAPOR_LEAD_CACHE[key]


def _stage_temps(plan: Plan) -> dict[str, float]:
    return {s.name: s.temperature for s in plan.stages}


def _bath_on(plan: Plan, stage: str):
    for b in plan.baths:
        if b.stage == stage:
            return b
    return None


def load_contributions(
    plan: Plan, load, temps: dict[str, float], other_on_bath=0.0, steady: bool = True
) -> tuple[dict[str, float], str]:
    """Heat of one ``[[load]]`` on each stage [W] at the given stage temperatures [K].

    Returns the contributions by stage and a short detail text for the report.
    """
    from ..data.fluids import cryogen
    from ..data.materials import material

    v = load.values
    t_cold = temps[load.stage]
    t_warm = temps[v["from_stage"]] if v.get("from_stage") else v.get("from")
    kind = load.kind
    if kind == "fixed":
        return {load.stage: v["power"]}, ""
    if kind == "radiation":
        if t_warm <= t_cold:
            return {load.stage: 0.0}, ""
        if v["layers"]:
            opts = {}
            q = hl.mli_load(
                v["area"], t_cold, t_warm, v["layers"], v["layer_density"] or 2000.0, **opts
            )
            return {load.stage: float(q)}, f"MLI, {v['layers']} layers"
        ec, ew = v["emissivity"]
        q = hl.gray_body_exchange(v["area"], t_cold, t_warm, ec, ew, v["area_ratio"])
        return {load.stage: float(q)}, f"e = {ec:g}/{ew:g}"
    if kind in ("support", "wire"):
        m = material(v["material"])
        rrr = v.get("rrr")

        def integral(a, b, m=m, rrr=rrr):
            return m.conductivity_integral(a, b, rrr=rrr, extrapolate=True)

        if kind == "wire":
            d = hl.awg_diameter(v["gauge"]) if "gauge" in v else v["diameter"]
            area = math.pi / 4 * d * d
            detail = f"{v['count']} x {'AWG ' + str(v['gauge']) if 'gauge' in v else ''}"
            detail = detail.strip() + f" {m.id}"
        else:
            area = v["area"]
            detail = f"{v['count']} x {m.id}"
        nodes = [t_warm] + [temps[s] for s in v["via"]] + [t_cold]
        names = [None] + list(v["via"]) + [load.stage]
        if any(b > a for a, b in zip(nodes, nodes[1:])):
            nodes = sorted(nodes, reverse=True)
        lengths = [v["length"] / (len(nodes) - 1)] * (len(nodes) - 1)
        q = hl.segmented_conduction(integral, nodes, lengths, area, v["count"])
        out: dict[str, float] = {}
        for name, power in zip(names[1:], q):
            out[name] = out.get(name, 0.0) + float(power)
        if v["via"]:
            detail += ", sunk at " + ", ".join(v["via"])
        return out, detail
    if kind == "lead":
        current, count = v["current"], v["count"]
        bath = _bath_on(plan, load.stage)
        if v["cooling"] == "vapor":
            if bath is None:
                raise InputError(
                    "a vapour-cooled lead needs a bath on its stage",
                    key=f"{load.key}.cooling",
                    file=plan.path,
                    line=load.line,
                    expected="a [[bath]] on this stage",
                    found="no bath",
                )
            fluid = cryogen(bath.cryogen, pressure=bath.pressure)
            tb = fluid.boiling_point
            q = _vapor_lead_per_ampere(bath.cryogen, tb, t_warm) * current
            return {load.stage: q * count}, f"{count} x {current:g} A, vapour-cooled optimum"
        m = material(v["material"] or "copper")
        if v.get("length") and v.get("area"):
            q = hl.conduction_cooled_lead_load(
                current,
                v["length"],
                v["area"],
                lambda T, m=m: m.conductivity(T, extrapolate=True),
                t_cold,
                t_warm,
            )
            detail = f"{count} x {current:g} A, given shape"
        else:
            q, _ = hl.conduction_cooled_lead_optimum(current, t_cold, t_warm)
            detail = f"{count} x {current:g} A, conduction-cooled optimum"
        return {load.stage: float(q) * count}, detail
    if kind == "gas":
        acc = v["accommodation"] if v["accommodation"] is not None else 1.0
        q = hl.free_molecular_conduction(v["area"], t_cold, t_warm, v["pressure"], v["gas"], acc)
        return {load.stage: float(q)}, f"{v['gas']} at {v['pressure']:.2g} Pa"
    if kind == "neck":
        m = material(v["material"])
        bath = _bath_on(plan, load.stage)
        if v.get("vapor_cooled") and bath is not None and steady:
            fluid = cryogen(bath.cryogen, pressure=bath.pressure)
            tb = fluid.boiling_point
            q = hl.vapor_cooled_neck_load(
                lambda T, m=m: m.conductivity(T, extrapolate=True),
                v["area"],
                v["length"],
                tb,
                t_warm,
                fluid.latent_heat,
                fluid.boiloff_gas_enthalpy,
                other_load=other_on_bath,
            )
            return {load.stage: float(q) * v["count"]}, f"{m.id}, cooled by the boil-off gas"
        q = hl.conduction_load(
            lambda a, b, m=m: m.conductivity_integral(a, b, extrapolate=True),
            t_cold,
            t_warm,
            v["area"],
            v["length"],
            v["count"],
        )
        return {load.stage: float(q)}, f"{m.id}, not gas-cooled"
    raise InputError(f"unknown kind of load {kind!r}", key=f"{load.key}.kind")  # pragma: no cover


def stage_loads(plan: Plan, temps: dict[str, float]) -> tuple[list[dict], dict[str, float]]:
    """Every load's contributions at the given stage temperatures; totals by stage [W]."""
    items = []
    totals = {s.name: 0.0 for s in plan.stages}
    # necks cooled by boil-off gas depend on the other loads of their bath: do them last
    ordered = sorted(plan.loads, key=lambda ld: ld.kind == "neck")
    for load in ordered:
        other = totals.get(load.stage, 0.0) if load.kind == "neck" else 0.0
        try:
            contrib, detail = load_contributions(plan, load, temps, other)
        except InputError as exc:
            if exc.file is None:
                exc.file, exc.line = plan.path, load.line
                exc.key = exc.key or load.key
            raise
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
    return items, totals


def analyse_loads(plan: Plan, data: dict) -> None:
    """Evaluation hook: loads by stage and cause, boil-off, hold time, calendar, month."""
    if not plan.loads and not plan.baths:
        return
    from ..data.fluids import cryogen
    from .supply import choose_dewars

    temps = _stage_temps(plan)
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
    baths_out = []
    start = plan.start_date or _dt.date.today()
    start_dt = _dt.datetime.combine(start, _dt.time(9, 0))
    horizon = plan.horizon_days * 86400.0
    for b in plan.baths:
        fluid = cryogen(b.cryogen, pressure=b.pressure)
        same_stage = [x for x in plan.baths if x.stage == b.stage]
        share = b.volume / sum(x.volume for x in same_stage)
        q = totals.get(b.stage, 0.0) * share
        rate = float(hl.boiloff_rate(q, fluid.latent_heat, fluid.liquid_density))  # m^3/s
        hold = float(hl.hold_time(b.volume, q, fluid.latent_heat, fluid.liquid_density))
        hold_refill = float(
            hl.hold_time(b.volume - b.refill_at, q, fluid.latent_heat, fluid.liquid_density)
        )
        refills = []
        if math.isfinite(hold_refill) and hold_refill > 0:
            refills = [
                d.strftime("%a %d %b") for d in hl.refill_schedule(start_dt, hold_refill, horizon)
            ]
        boiled = rate * horizon * 1000.0  # L
        supply = plan.supplies.get(b.cryogen)
        from .supply import transfer_loss as _transfer_loss

        loss = _transfer_loss(plan, b.cryogen, b.transfer_loss)
        transferred = boiled / (1 - loss)
        price = supply.price if supply and supply.price is not None else None
        dewars = []
        if supply and supply.dewars:
            dewars = choose_dewars(
                transferred, [d * 1000 for d in supply.dewars], supply.heel * 1000
            )
        ordered = sum(s * n for s, n in dewars) if dewars else transferred
        baths_out.append(
            {
                "name": b.name,
                "cryogen": b.cryogen,
                "stage": b.stage,
                "volume_L": b.volume * 1000,
                "refill_at_L": b.refill_at * 1000,
                "load_W": q,
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
        )
    notes = []
    if any(ld.kind == "neck" and ld.values.get("vapor_cooled") for ld in plan.loads):
        notes.append(
            "Necks marked vapor_cooled carry the bath's boil-off gas in perfect "
            "exchange (the published counterflow model); a real neck lies between "
            "this figure and its bare conduction."
        )
    data["loads"] = {
        "items": items,
        "by_stage": by_stage,
        "baths": baths_out,
        "notes": notes,
        "start_date": start.isoformat(),
    }
    summary = data["summary"]
    per_day: dict[str, float] = {}
    hold: dict[str, float] = {}
    for b in baths_out:
        per_day[b["cryogen"]] = per_day.get(b["cryogen"], 0.0) + b["boiloff_L_per_day"]
        if b["hold_h"] is not None:
            hold[b["cryogen"]] = min(hold.get(b["cryogen"], math.inf), b["hold_h"])
    summary["static_boiloff_L_per_day"] = per_day
    summary["hold_time_h"] = hold
    summary["month_order_L"] = {}
    for b in baths_out:
        summary["month_order_L"][b["cryogen"]] = (
            summary["month_order_L"].get(b["cryogen"], 0.0) + b["month_order_L"]
        )
    data.setdefault("sources", []).extend(SOURCES)
    data.setdefault("assumptions", []).append(
        "Static loads are taken with every stage at its own temperature; a support or wire "
        "heat-sunk at intermediate stages is split into equal lengths between them. Several "
        "baths on one stage share its load in proportion to their volumes."
    )
