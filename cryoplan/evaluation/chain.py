"""Plan -> Results: runs every analysis a plan asks for and gathers the figures.

Views (text, Markdown, JSON, PDF, the dashboard) read :meth:`Results.to_dict` and format
it; they compute no physics.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .. import __version__
from ..physics.cooldown import BAND_NAMES, cumulative_cryogen_mass, state_budget
from ..plan import BOILING_POINT_SNAP_K, DEFAULT_TRANSFER_LOSS, DEFAULT_TRANSFER_LOSS_OTHER, Plan
from .cooler import analyse_cooler
from .loads import analyse_loads
from .rooms import analyse_rooms
from .supply import liquefaction, order

CASES = ("low", "nominal", "high")

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


@dataclass
class Results:
    """Everything the analyses found for one plan; :meth:`to_dict` is the JSON report."""

    plan: Plan
    data: dict[str, Any] = field(default_factory=dict)

    def to_dict(self) -> dict[str, Any]:
        return self.data

    @property
    def summary(self) -> dict[str, Any]:
        return self.data["summary"]


def _cached_specific_heat(m, cache: dict):
    """m.specific_heat, remembered per node set: the three cases share the same nodes."""

    def c(x):
        key = (m.id, x.size, float(x[0]), float(x[-1]))
        if key not in cache:
            cache[key] = m.specific_heat(x)
        return cache[key]

    return c


def _cooldown_steps(
    plan: Plan, case: str, c_cache: dict | None = None
) -> tuple[list[dict], dict[str, float], list]:
    """Litres per step for one case, the cumulative curves, and the parts' final temperatures."""
    c_cache = {} if c_cache is None else c_cache
    from ..data.fluids import cryogen
    from ..data.materials import material

    factor = {"low": 1 - plan.mass_margin, "nominal": 1.0, "high": 1 + plan.mass_margin}[case]
    temps = {
        (s.name, i): (p.start if p.start is not None else plan.cooldown.start)
        for s in plan.stages
        for i, p in enumerate(s.parts)
    }
    steps_out = []
    per_cryogen: dict[str, float] = {}
    curves = []
    for n, step in enumerate(plan.cooldown.steps):
        fluid = cryogen(step.cryogen, pressure=step.pressure)
        gas_use = {"low": step.gas_use_high, "nominal": step.gas_use, "high": step.gas_use_low}[
            case
        ]
        tb = fluid.boiling_point
        vap = fluid.boiloff_gas_enthalpy
        kg_total = 0.0
        cooled = []
        curve_T, curve_m = [], []
        for s in plan.stages:
            target = max(step.to, s.temperature)
            for i, p in enumerate(s.parts):
                t_now = temps[(s.name, i)]
                if t_now <= target + BOILING_POINT_SNAP_K:
                    # already there: a 77 K stage after a nitrogen step that ended at the
                    # boiling point, 77.35 K
                    continue
                m = material(p.material)
                T, cum = cumulative_cryogen_mass(
                    _cached_specific_heat(m, c_cache),
                    p.mass * factor,
                    t_now,
                    target,
                    fluid.latent_heat,
                    vap,
                    gas_use,
                )
                kg_total += float(cum[-1])
                curve_T.append(T)
                curve_m.append(cum)
                cooled.append(
                    {
                        "stage": s.name,
                        "part": p.name,
                        "from_K": t_now,
                        "to_K": target,
                        "liquid_L": float(cum[-1]) / fluid.liquid_density * 1000,
                    }
                )
                temps[(s.name, i)] = target
        litres = kg_total / fluid.liquid_density * 1000.0
        per_cryogen[step.cryogen] = per_cryogen.get(step.cryogen, 0.0) + litres
        steps_out.append(
            {
                "step": n + 1,
                "cryogen": step.cryogen,
                "to_K": step.to,
                "written_to_K": step.written_to,
                "pressure_Pa": step.pressure,
                "boiling_point_K": tb,
                "gas_use": gas_use,
                "liquid_L": litres,
                "parts": cooled,
                "note": step.note,
            }
        )
        if case == "nominal" and curve_T:
            grid = np.linspace(max(T[0] for T in curve_T), step.to, 40)
            total = np.zeros_like(grid)
            for T, cum in zip(curve_T, curve_m):
                # T runs warm -> cold; interpolate on ascending axes
                total += np.interp(-grid, -T, cum, left=0.0, right=float(cum[-1]))
            curves.append(
                {
                    "step": n + 1,
                    "cryogen": step.cryogen,
                    "temperature_K": grid.tolist(),
                    "liquid_L": (total / fluid.liquid_density * 1000).tolist(),
                }
            )
    return steps_out, per_cryogen, curves


def _insert_litres(plan: Plan, factor: float) -> dict[str, float]:
    from ..data.fluids import cryogen
    from ..data.materials import material
    from ..physics.cooldown import cryogen_mass_for_cooldown

    out: dict[str, float] = {}
    for ins in plan.inserts:
        fluid = cryogen(ins.into)
        tb = fluid.boiling_point
        m = material(ins.material)
        kg = cryogen_mass_for_cooldown(
            m.specific_heat,
            ins.mass * factor,
            ins.start,
            tb,
            fluid.latent_heat,
            fluid.boiloff_gas_enthalpy,
            ins.gas_use,
        )
        out[ins.into] = out.get(ins.into, 0.0) + kg / fluid.liquid_density * 1000 * ins.times
    return out


def _budget(plan: Plan) -> dict[str, Any]:
    from ..data.materials import material

    parts, stages = [], []
    total = {k: np.zeros(len(BAND_NAMES)) for k in ("heat", "entropy", "work")}
    for s in plan.stages:
        st = {k: np.zeros(len(BAND_NAMES)) for k in ("heat", "entropy", "work")}
        for p in s.parts:
            m = material(p.material)
            start = p.start if p.start is not None else plan.cooldown.start
            b = state_budget(m.enthalpy, m.entropy, p.mass, start, s.temperature, plan.ambient)
            for k in st:
                st[k] += b[k]
                total[k] += b[k]
            parts.append(
                {
                    "stage": s.name,
                    "part": p.name,
                    "material": m.id,
                    "material_name": m.name,
                    "mass_kg": p.mass,
                    "start_K": start,
                    "end_K": s.temperature,
                    "heat_J": b["heat"].tolist(),
                    "entropy_J_per_K": b["entropy"].tolist(),
                    "work_J": b["work"].tolist(),
                }
            )
        stages.append(
            {
                "stage": s.name,
                "temperature_K": s.temperature,
                "mass_kg": sum(p.mass for p in s.parts),
                "heat_J": st["heat"].tolist(),
                "entropy_J_per_K": st["entropy"].tolist(),
                "work_J": st["work"].tolist(),
            }
        )
    return {
        "bands": list(BAND_NAMES),
        "parts": parts,
        "stages": stages,
        "total": {
            "heat_J": total["heat"].tolist(),
            "entropy_J_per_K": total["entropy"].tolist(),
            "work_J": total["work"].tolist(),
        },
    }


def evaluate(plan: Plan) -> Results:
    """Run every analysis the plan asks for.

    Parameters
    ----------
    plan : Plan
        From :func:`cryoplan.load_plan`.

    Returns
    -------
    Results
        ``results.to_dict()`` starts with the ``summary`` object of DESIGN.md.
    """
    from ..data.materials import material

    data: dict[str, Any] = {"summary": {}}
    data["plan"] = {
        "title": plan.title,
        "file": plan.path,
        "ambient_K": plan.ambient,
        "cooldown_start_K": plan.cooldown.start,
        "mass_margin": plan.mass_margin,
        "cryoplan_version": __version__,
        "date": _dt.date.today().isoformat(),
    }
    data["cold_mass"] = [
        {
            "stage": s.name,
            "temperature_K": s.temperature,
            "parts": [
                {
                    "name": p.name,
                    "material": p.material,
                    "material_name": material(p.material).name,
                    "mass_kg": p.mass,
                    "start_K": p.start if p.start is not None else plan.cooldown.start,
                }
                for p in s.parts
            ],
        }
        for s in plan.stages
    ]
    data["budget"] = _budget(plan)

    cases = {}
    c_cache: dict = {}
    for case in CASES:
        steps, per_cryogen, curves = _cooldown_steps(plan, case, c_cache)
        factor = {"low": 1 - plan.mass_margin, "nominal": 1.0, "high": 1 + plan.mass_margin}[case]
        inserts = _insert_litres(plan, factor)
        cases[case] = {
            "steps": steps,
            "cooldown_L": per_cryogen,
            "order": order(plan, per_cryogen, inserts, steps),
        }
        if case == "nominal":
            data["cumulative_liquid"] = curves
            data["inserts"] = [
                {
                    "name": i.name,
                    "material": i.material,
                    "mass_kg": i.mass,
                    "into": i.into,
                    "times": i.times,
                }
                for i in plan.inserts
            ]
    data["steps"] = cases["nominal"]["steps"]
    data["order"] = {
        cry: {
            **entry,
            "range": {
                c: {
                    "order_L": cases[c]["order"].get(cry, {}).get("order_L"),
                    "needed_L": cases[c]["order"].get(cry, {}).get("needed_L"),
                    "cost": cases[c]["order"].get(cry, {}).get("cost"),
                }
                for c in CASES
            },
        }
        for cry, entry in cases["nominal"]["order"].items()
    }
    data["steps_range"] = [
        {"step": s["step"], **{c: cases[c]["steps"][i]["liquid_L"] for c in CASES}}
        for i, s in enumerate(cases["nominal"]["steps"])
    ]
    data["liquefaction"] = liquefaction(plan, data["order"])
    total_work = float(sum(data["budget"]["total"]["work_J"]))

    summary = data["summary"]
    summary["cooldown_liquid_L"] = {c: v for c, v in cases["nominal"]["cooldown_L"].items()}
    summary["order_L"] = {c: e["order_L"] for c, e in data["order"].items()}
    summary["static_boiloff_L_per_day"] = {}
    summary["hold_time_h"] = {}
    summary["minimum_work_J"] = total_work
    summary["cooldown_time_h"] = None
    summary["lowest_oxygen_percent"] = None
    summary["cost"] = {c: e["cost"] for c, e in data["order"].items() if e["cost"] is not None}
    summary["currency"] = next(
        (e["currency"] for e in data["order"].values() if e["currency"]), ""
    )
    summary["heat_J"] = float(sum(data["budget"]["total"]["heat_J"]))

    # the later steps, in order: loads first (the room checks use the baths' boil-off)
    analyse_loads(plan, data)
    analyse_cooler(plan, data)
    analyse_rooms(plan, data)

    sources = list(METHOD_SOURCES.values())
    for s in plan.stages:
        for p in s.parts:
            for src in material(p.material).sources:
                if src not in sources:
                    sources.append(src)
    for ins in plan.inserts:
        for src in material(ins.material).sources:
            if src not in sources:
                sources.append(src)
    data.setdefault("sources", [])
    data["sources"] = sources + [s for s in data["sources"] if s not in sources]
    data["notes"] = list(plan.notes) + data.get("notes", [])
    data["assumptions"] = _assumptions(plan) + data.get("assumptions", [])
    return Results(plan, data)


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
