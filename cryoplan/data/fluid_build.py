"""Building a cryogen's tables with CoolProp: the only module of cryoplan that imports it.

:func:`build` computes, for one cryogen and pressure, the saturation scalars, the triple
and critical points, the reference of the equation of state, and a table of the gas
enthalpy, entropy and density against temperature from the boiling point to
:data:`~cryoplan.data.cryogen.T_MAX` with their temperature derivatives, on a grid refined
until cubic Hermite interpolation in :math:`\\ln T` is within :data:`INTERPOLATION_TOLERANCE`
of CoolProp at every interval midpoint [1]_. CoolProp is imported on the first build only.

References
----------
.. [1] I. H. Bell, J. Wronski, S. Quoilin and V. Lemort, "Pure and pseudo-pure fluid
   thermophysical property evaluation and the open-source thermophysical property library
   CoolProp", Ind. Eng. Chem. Res. 53 (2014) 2498-2508.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np

from ..errors import CryoplanError, InputError
from .cryogen import COOLPROP_NAMES, T_MAX, TABLE_COLUMNS, check_pressure, hermite, kpa

#: Largest relative error of the interpolated gas tables against CoolProp, checked at the
#: midpoint of every interval when a table is built (the tables promise 1e-4; this is 50
#: times tighter, because a cubic's error between midpoint checks can be somewhat larger).
INTERPOLATION_TOLERANCE = 2e-6


def _coolprop():
    try:
        import CoolProp.CoolProp as CP
    except ImportError as exc:  # pragma: no cover - CoolProp is a dependency
        raise CryoplanError(
            f"cryoplan needs CoolProp to build its fluid tables ({exc}); "
            "install it with 'pip install CoolProp'"
        ) from None
    return CP


def build(name: str, p: float, version: str) -> dict:
    """Compute the saturation scalars and the gas table of ``name`` at ``p`` with CoolProp."""
    CP = _coolprop()
    fluid = COOLPROP_NAMES[name]
    state = CP.AbstractState("HEOS", fluid)
    p_triple = state.trivial_keyed_output(CP.iP_triple)
    p_crit = state.p_critical()
    check_pressure(name, p, p_triple, p_crit)
    try:
        state.update(CP.PQ_INPUTS, p, 0.0)
        T_b = state.T()
        liquid = (state.hmass(), state.smass(), state.rhomass())
        state.update(CP.PQ_INPUTS, p, 1.0)
        vapour = (state.hmass(), state.smass(), state.rhomass())
        T_nodes, columns = _gas_table(CP, fluid, p, T_b, vapour)
    except ValueError as exc:  # CoolProp's solvers fail very close to the critical point
        raise InputError(
            f"CoolProp cannot compute {name} at {kpa(p)} ({exc})",
            key="pressure",
            expected=f"a pressure further below the critical pressure {kpa(p_crit)}",
            found=kpa(p),
        ) from None
    table = {"T": T_nodes}
    table.update(columns)
    return {
        "coolprop": version,
        "fluid": name,
        "coolprop_fluid": fluid,
        "pressure": p,
        "boiling_point": T_b,
        "liquid_enthalpy": liquid[0],
        "liquid_entropy": liquid[1],
        "liquid_density": liquid[2],
        "vapor_enthalpy": vapour[0],
        "vapor_entropy": vapour[1],
        "vapor_density": vapour[2],
        "triple_point": state.Ttriple(),
        "triple_pressure": p_triple,
        "critical_temperature": state.T_critical(),
        "critical_pressure": p_crit,
        "molar_mass": state.molar_mass(),
        "eos_reference": _eos_reference(CP, fluid),
        "table": {k: [float(v) for v in table[k]] for k in TABLE_COLUMNS},
    }


def _gas_table(CP, fluid: str, p: float, T_b: float, vapour) -> tuple[list, dict]:
    """Nodes in T and the gas columns, refined until Hermite midpoints match CoolProp."""
    gas = CP.AbstractState("HEOS", fluid)
    T_c = gas.T_critical()

    def point(T: float, saturated: bool = False) -> tuple:
        if T < T_c:  # below the critical temperature, say which root is wanted
            gas.specify_phase(CP.iphase_gas)
        else:
            gas.unspecify_phase()
        gas.update(CP.PT_INPUTS, p, T)
        h, s, rho = vapour if saturated else (gas.hmass(), gas.smass(), gas.rhomass())
        cp = gas.cpmass()
        drho_dT = gas.first_partial_deriv(CP.iDmass, CP.iT, CP.iP)
        return (h, T * cp, s, cp, math.log(rho), T * drho_dT / rho)

    x0, x1 = math.log(T_b), math.log(T_MAX)
    xs = list(np.linspace(x0, x1, 25))
    values = {x: point(math.exp(x), saturated=(i == 0)) for i, x in enumerate(xs)}
    h_v, s_v = vapour[0], vapour[1]
    for _ in range(30):
        xs = sorted(values)
        split = []
        for a, b in zip(xs[:-1], xs[1:], strict=True):
            m = 0.5 * (a + b)
            true = point(math.exp(m))
            va, vb = values[a], values[b]
            arr = np.array([a, b])
            h_i = hermite(m, arr, np.array([va[0], vb[0]]), np.array([va[1], vb[1]]))
            s_i = hermite(m, arr, np.array([va[2], vb[2]]), np.array([va[3], vb[3]]))
            r_i = hermite(m, arr, np.array([va[4], vb[4]]), np.array([va[5], vb[5]]))
            err = max(
                abs(h_i - true[0]) / max(abs(true[0] - h_v), 1e-300),
                abs(s_i - true[2]) / max(abs(true[2] - s_v), 1e-300),
                abs(r_i - true[4]),
            )
            if err > INTERPOLATION_TOLERANCE:
                split.append((m, true))
        if not split:
            break
        values.update(split)
    xs = sorted(values)
    rows = [values[x] for x in xs]
    T_nodes = [T_b] + [math.exp(x) for x in xs[1:-1]] + [T_MAX]
    columns = {
        "h": [r[0] for r in rows],
        "dh_dlnT": [r[1] for r in rows],
        "s": [r[2] for r in rows],
        "ds_dlnT": [r[3] for r in rows],
        "lnrho": [r[4] for r in rows],
        "dlnrho_dlnT": [r[5] for r in rows],
    }
    return T_nodes, columns


def _eos_reference(CP, fluid: str) -> str:
    """A short citation of the fluid's equation of state, from CoolProp's BibTeX keys."""
    try:
        keys = CP.get_BibTeXKey(fluid, "EOS")
    except Exception:  # pragma: no cover - an older CoolProp
        return f"the CoolProp reference equation of state for {fluid}"
    entries = _bibtex_entries(CP)
    parts = []
    for key in [k.strip() for k in keys.split(",") if k.strip()]:
        fields = entries.get(key)
        parts.append(f"{_citation(fields)} [{key}]" if fields else key)
    return "; ".join(parts)


def _bibtex_entries(CP) -> dict[str, dict[str, str]]:
    """Entries of CoolProp's own BibTeX library (shipped beside its module), by key."""
    path = Path(CP.__file__).with_name("CoolPropBibTeXLibrary.bib")
    try:
        text = path.read_text(encoding="utf-8", errors="replace")
    except OSError:
        return {}
    entries: dict[str, dict[str, str]] = {}
    for match in re.finditer(r"@\w+\{([^,\s]+),(.*?)\n\}", text, flags=re.S):
        fields = {}
        for f in re.finditer(r"(\w+)\s*=\s*\{(.*?)\},?\s*$", match.group(2), flags=re.M):
            fields[f.group(1).lower()] = re.sub(r"[{}]", "", f.group(2)).strip()
        entries[match.group(1)] = fields
    return entries


def _citation(fields: dict[str, str]) -> str:
    """'Span et al., J. Phys. Chem. Ref. Data 29 (2000) 1361-1433' from BibTeX fields."""
    authors = [a.strip() for a in fields.get("author", "").split(" and ") if a.strip()]

    def surname(a: str) -> str:
        return a.split(",")[0].strip() if "," in a else a.split()[-1]

    if not authors:
        who = "anonymous"
    elif len(authors) == 1:
        who = surname(authors[0])
    elif len(authors) == 2:
        who = f"{surname(authors[0])} and {surname(authors[1])}"
    else:
        who = f"{surname(authors[0])} et al."
    year = fields.get("year", "").split(",")[0].strip()
    journal = fields.get("journal")
    if journal:
        where = journal
        if fields.get("volume"):
            where += f" {fields['volume']}"
        where += f" ({year})" if year else ""
        if fields.get("pages"):
            where += f" {fields['pages']}"
        return f"{who}, {where}"
    title = fields.get("title", "")
    return f"{who}, {title} ({fields.get('note', 'unpublished').split(' - ')[0]}, {year})"
