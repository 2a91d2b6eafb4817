"""The materials and cooldown-budget steps: the cold mass, its heat, entropy and minimum work
by temperature band, and the litres of cryogen each cooldown step and insert boils.

The physics is in :mod:`cryoplan.physics.cooldown`; materials and fluids come from the data
layer. :func:`cooldown_litres` accepts arrays of masses (n variants of one plan in one pass):
the litres are linear in the mass, so the integral is taken once per kilogram and scaled.
"""

from __future__ import annotations

import numpy as np

from ..physics.cooldown import (
    BAND_NAMES,
    cryogen_mass_for_cooldown,
    cumulative_cryogen_mass,
    state_budget,
)
from ..plan import BOILING_POINT_SNAP_K, Plan
from .results import BudgetResult, CooldownLitres, Figure, MaterialsResult

CASES = ("low", "nominal", "high")


def case_factor(plan: Plan, case: str) -> float:
    """The mass factor of a case: 1 -/+ the plan's mass margin for the low and high cases."""
    return {"low": 1 - plan.mass_margin, "nominal": 1.0, "high": 1 + plan.mass_margin}[case]


def materials(plan: Plan) -> MaterialsResult:
    """The materials step: each part's material looked up once; the cold mass as listed."""
    from ..data.materials import material

    cold_mass = [
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
    sources: list[str] = []
    ids = [p.material for s in plan.stages for p in s.parts] + [i.material for i in plan.inserts]
    for mid in ids:
        for src in material(mid).sources:
            if src not in sources:
                sources.append(src)
    return MaterialsResult(cold_mass, sources)


def _cached_specific_heat(m, cache: dict):
    """m.specific_heat, remembered per node set: the three cases share the same nodes."""

    def c(x):
        key = (m.id, x.size, float(x[0]), float(x[-1]))
        if key not in cache:
            cache[key] = m.specific_heat(x)
        return cache[key]

    return c


def cooldown_litres(
    plan: Plan,
    factor: Figure = 1.0,
    case: str = "nominal",
    masses: dict[tuple[str, int], Figure] | None = None,
    c_cache: dict | None = None,
    curves: bool = False,
) -> CooldownLitres:
    """Litres per cooldown step and per cryogen, at the parts' masses times ``factor``.

    Parameters
    ----------
    plan : Plan
    factor : float or ndarray (n,)
        Multiplies every part's mass (the low/high cases, or n variants), [-].
    case : str
        Which gas use of each step: "nominal" its ``gas_use``, "low" litres its high gas
        use, "high" litres its low gas use.
    masses : dict, optional
        Masses by (stage name, part index) in place of the plan's, [kg]; floats or arrays
        of shape (n,).
    c_cache : dict, optional
        Specific heats remembered between calls (the three cases share their nodes).
    curves : bool
        Also the cumulative litres against temperature (scalar masses only).

    Returns
    -------
    CooldownLitres
        ``liquid_L`` of each step row and ``cooldown_L``/``inserts_L`` are floats, or
        arrays of shape (n,) where a mass or the factor is an array.
    """
    from ..data.fluids import cryogen
    from ..data.materials import material

    c_cache = {} if c_cache is None else c_cache
    masses = masses or {}
    temps = {
        (s.name, i): (p.start if p.start is not None else plan.cooldown.start)
        for s in plan.stages
        for i, p in enumerate(s.parts)
    }
    steps_out = []
    per_cryogen: dict[str, Figure] = {}
    curves_out = []
    for n, step in enumerate(plan.cooldown.steps):
        fluid = cryogen(step.cryogen, pressure=step.pressure)
        tb = fluid.boiling_point
        vap = fluid.boiloff_gas_enthalpy
        gas_use = {"low": step.gas_use_high, "nominal": step.gas_use, "high": step.gas_use_low}[
            case
        ]
        kg_total: Figure = 0.0
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
                mass = masses.get((s.name, i), p.mass) * factor
                c = _cached_specific_heat(m, c_cache)
                if np.ndim(mass) == 0:
                    T, cum = cumulative_cryogen_mass(
                        c, mass, t_now, target, fluid.latent_heat, vap, gas_use
                    )
                    kg = float(cum[-1])
                    curve_T.append(T)
                    curve_m.append(cum)
                else:  # n variants: the integral per kilogram, scaled
                    per_kg = cryogen_mass_for_cooldown(
                        c, 1.0, t_now, target, fluid.latent_heat, vap, gas_use
                    )
                    kg = np.asarray(mass, float) * per_kg
                kg_total = kg_total + kg
                cooled.append(
                    {
                        "stage": s.name,
                        "part": p.name,
                        "from_K": t_now,
                        "to_K": target,
                        "liquid_L": kg / fluid.liquid_density * 1000,
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
        if curves and curve_T:
            grid = np.linspace(max(T[0] for T in curve_T), step.to, 40)
            total = np.zeros_like(grid)
            for T, cum in zip(curve_T, curve_m):
                # T runs warm -> cold; interpolate on ascending axes
                total += np.interp(-grid, -T, cum, left=0.0, right=float(cum[-1]))
            curves_out.append(
                {
                    "step": n + 1,
                    "cryogen": step.cryogen,
                    "temperature_K": grid.tolist(),
                    "liquid_L": (total / fluid.liquid_density * 1000).tolist(),
                }
            )
    return CooldownLitres(steps_out, per_cryogen, insert_litres(plan, factor), curves_out)


def insert_litres(plan: Plan, factor: Figure = 1.0) -> dict[str, Figure]:
    """Litres boiled per cryogen by the inserts (each ``times``), masses times ``factor``."""
    from ..data.fluids import cryogen
    from ..data.materials import material

    out: dict[str, Figure] = {}
    for ins in plan.inserts:
        fluid = cryogen(ins.into)
        m = material(ins.material)
        mass = ins.mass * factor
        scalar = np.ndim(mass) == 0
        kg = cryogen_mass_for_cooldown(
            m.specific_heat,
            mass if scalar else 1.0,
            ins.start,
            fluid.boiling_point,
            fluid.latent_heat,
            fluid.boiloff_gas_enthalpy,
            ins.gas_use,
        )
        if not scalar:
            kg = np.asarray(mass, float) * kg
        out[ins.into] = out.get(ins.into, 0.0) + kg / fluid.liquid_density * 1000 * ins.times
    return out


def state_budget_by_band(plan: Plan) -> dict:
    """Heat, entropy and minimum work of every part, stage and the whole, by band."""
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


def cooldown_budget(plan: Plan) -> BudgetResult:
    """The cooldown-budget step: the state budget by band and the litres of each case."""
    budget = state_budget_by_band(plan)
    c_cache: dict = {}
    cases = {
        case: cooldown_litres(
            plan, case_factor(plan, case), case, c_cache=c_cache, curves=case == "nominal"
        )
        for case in CASES
    }
    inserts = [
        {
            "name": i.name,
            "material": i.material,
            "mass_kg": i.mass,
            "into": i.into,
            "times": i.times,
        }
        for i in plan.inserts
    ]
    return BudgetResult(
        budget,
        heat_J=float(sum(budget["total"]["heat_J"])),
        minimum_work_J=float(sum(budget["total"]["work_J"])),
        cases=cases,
        inserts=inserts,
    )
