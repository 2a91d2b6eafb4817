"""Commands for the material database: ``materials``, ``material ID`` and ``fit FILE``.

A thin shell: it parses arguments, asks the library, and formats; no physics here.
"""

from __future__ import annotations

import json
import re
import sys
import textwrap
from pathlib import Path

from ..errors import InputError

_KELVIN = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*K\s*$")


def register(subparsers) -> None:
    """Add the material commands to the command line."""
    p = subparsers.add_parser(
        "materials",
        help="list the material database",
        description="List every material: id, name, class, data range and where it came "
        "from (bundled, or the path of your own file).",
    )
    p.add_argument("--format", choices=("text", "json"), default="text")
    p.set_defaults(func=run_materials)

    p = subparsers.add_parser(
        "material",
        help="specific heat, enthalpy, entropy and conductivity of one material",
        description="Print c, H - H(0 K), S and k of a material at standard temperatures "
        "or at the temperatures given with --at.",
    )
    p.add_argument("id", help="material id or alias, e.g. copper")
    p.add_argument(
        "--at",
        metavar="TEMPS",
        help='comma-separated temperatures with units, e.g. "4.2 K, 20 K, 77 K"',
    )
    p.add_argument("--rrr", type=float, help="residual resistance ratio (copper, aluminium)")
    p.add_argument(
        "--extrapolate",
        action="store_true",
        help="use the model above the range of its data (flagged in the output)",
    )
    p.add_argument("--format", choices=("text", "json"), default="text")
    p.set_defaults(func=run_material)

    p = subparsers.add_parser(
        "fit",
        help="fit a material file's model to its reference points",
        description="Fit the model parameters of a material file (Debye temperature knots, "
        "gamma where asked) to its reference points and report the largest deviation; "
        "--write stores the result in the file, keeping its comments.",
    )
    p.add_argument("file", help="a material file (or the id of a loaded material)")
    p.add_argument("--write", action="store_true", help="write the fitted parameters")
    p.add_argument(
        "--knots", type=int, metavar="N", help="choose N knots among the reference temperatures"
    )
    p.set_defaults(func=run_fit)


def _warn_problems() -> None:
    from ..data.materials import library_problems

    for problem in library_problems():
        for line in str(problem).splitlines():
            print(f"warning: {line}", file=sys.stderr)


def run_materials(args) -> int:
    from ..data.materials import all_materials

    materials = all_materials()
    _warn_problems()
    if args.format == "json":
        print(json.dumps({"materials": [m.summary() for m in materials]}, indent=2))
        return 0
    print(f"{'id':<24} {'class':<10} {'range K':>9}  name / origin")
    for m in materials:
        klass = "sc. comp." if m.klass == "superconductor composite" else m.klass
        span = f"{m.t_min:g}-{m.t_max:g}"
        name = m.name if len(m.name) <= 33 else m.name[:32] + "…"
        print(f"{m.id:<24} {klass:<10} {span:>9}  {name}")
        if not m.bundled:
            print(f"{'':<46}from {m.origin}")
    print(f"{len(materials)} materials; all bundled unless a path is shown.")
    return 0


def parse_temperatures(text: str) -> list[float]:
    """``"4.2 K, 20 K, 77 K"`` -> [4.2, 20.0, 77.0]; other units through pint."""
    values = []
    for part in text.split(","):
        part = part.strip()
        if not part:
            continue
        match = _KELVIN.match(part)
        if match:
            value = float(match.group(1))
        else:
            from ..units import parse_temperature

            value = parse_temperature(part, key="--at")
        if value < 0:
            raise InputError(
                "a temperature below absolute zero",
                key="--at",
                expected="0 K or more",
                found=repr(part),
            )
        values.append(value)
    if not values:
        raise InputError(
            "no temperatures given",
            key="--at",
            expected='e.g. "4.2 K, 20 K, 77 K"',
            found=repr(text),
        )
    return values


def material_table(m, temperatures, rrr=None, extrapolate=False) -> list[dict]:
    """Rows of c, H, S, k at the temperatures (the library computes; this only gathers)."""
    import numpy as np

    t = np.asarray(temperatures, dtype=float)
    c = m.specific_heat(t, extrapolate=extrapolate)
    h = m.enthalpy(t, extrapolate=extrapolate)
    s = m.entropy(t, extrapolate=extrapolate)
    k = m.conductivity(t, rrr=rrr, extrapolate=extrapolate) if m.has_conductivity else None
    rows = []
    for i, temp in enumerate(t):
        beyond = bool(temp > m.t_max * 1.005 or (m.has_conductivity and temp > m.k_t_max * 1.005))
        rows.append(
            {
                "T_K": float(temp),
                "specific_heat_J_per_kg_K": float(c[i]),
                "enthalpy_J_per_kg": float(h[i]),
                "entropy_J_per_kg_K": float(s[i]),
                "conductivity_W_per_m_K": None if k is None else float(k[i]),
                "extrapolated": beyond,
            }
        )
    return rows


def _wrap(label: str, text: str) -> list[str]:
    return textwrap.wrap(text, width=79, initial_indent=f"{label:<13}", subsequent_indent=" " * 13)


def run_material(args) -> int:
    from ..data.materials import STANDARD_TEMPERATURES, material

    m = material(args.id)
    if args.at:
        temperatures = parse_temperatures(args.at)
    else:
        temperatures = [t for t in STANDARD_TEMPERATURES if t <= m.t_max * 1.005]
    rows = material_table(m, temperatures, rrr=args.rrr, extrapolate=args.extrapolate)
    rrr = args.rrr if args.rrr is not None else m.default_rrr
    if args.format == "json":
        out = m.summary()
        out["rrr"] = rrr if m.has_conductivity else None
        out["points"] = rows
        print(json.dumps(out, indent=2))
        return 0
    lines = _wrap("material", f"{m.name} ({m.id})")
    facts = f"{m.klass}; density {m.density:g} kg/m^3"
    if m.molar_mass:
        facts += f"; molar mass {m.molar_mass * 1e3:.4g} g/mol"
    lines += _wrap("", facts)
    lines += _wrap(
        "data",
        f"{m.t_min:g} K to {m.t_max:g} K (model: {m.model}; below "
        f"{m.t_min:g} K gamma T + beta T^3)",
    )
    if m.has_conductivity:
        k = f"{m.conductivity_model}, {m.k_t_min:g} K to {m.k_t_max:g} K"
        if rrr is not None:
            k += f", RRR {rrr:g}" + (" (default)" if args.rrr is None else "")
        lines += _wrap("conductivity", k)
    else:
        lines += _wrap("conductivity", "no data in cryoplan's file")
    if m.emissivity is not None:
        lines += _wrap("emissivity", f"{m.emissivity:g} (typical; see the file)")
    lines += _wrap("origin", "bundled" if m.bundled else m.origin)
    print("\n".join(lines))
    print()
    print(f"{'T':>8}  {'c':>11}  {'H - H(0)':>11}  {'S':>11}  {'k':>11}")
    print(f"{'K':>8}  {'J/(kg K)':>11}  {'J/kg':>11}  {'J/(kg K)':>11}  {'W/(m K)':>11}")
    for row in rows:
        k = row["conductivity_W_per_m_K"]
        mark = " *" if row["extrapolated"] else ""
        print(
            f"{row['T_K']:>8.4g}  {row['specific_heat_J_per_kg_K']:>11.4g}  "
            f"{row['enthalpy_J_per_kg']:>11.4g}  {row['entropy_J_per_kg_K']:>11.4g}  "
            f"{'-' if k is None else format(k, '.4g'):>11}{mark}"
        )
    if any(r["extrapolated"] for r in rows):
        print("* above the range of the data: the model is extrapolated")
    print()
    for i, source in enumerate(m.sources, 1):
        for line in textwrap.wrap(
            source, width=79, initial_indent=f"[{i}] ", subsequent_indent="    "
        ):
            print(line)
    return 0


def run_fit(args) -> int:
    from ..data import fitting
    from ..data.materials import material, read_material_file

    path = Path(args.file)
    if path.is_file():
        m = read_material_file(path, allow_unfitted=True)
        if m.model == "mixture":
            m = material(m.id)
    elif path.suffix == ".toml" or "/" in args.file:
        raise InputError(
            "no such file", file=str(path), expected="a material file", found="nothing there"
        )
    else:
        m = material(args.file)
        path = Path(m.origin)
    result = fitting.fit_material(m, knot_count=args.knots)
    print(
        f"{m.id}: model {m.model}, {result.reference.size} reference points "
        f"from {m.t_min:g} K to {m.t_max:g} K"
    )
    params = result.parameters
    if "theta_knots" in params:
        print("theta_D knots [K, K]:")
        for a, b in params["theta_knots"]:
            print(f"  {a:>8.4g} K  {b:>9.2f} K")
    if "debye_temperature" in params:
        print(f"theta_D = {params['debye_temperature']:.2f} K")
    if "gamma_mJ_per_mol_K2" in params:
        print(f"gamma = {params['gamma_mJ_per_mol_K2']:.4g} mJ/(mol K^2)")
    if "dilation" in params:
        print(f"dilation (Nernst-Lindemann) A = {params['dilation']:.4g} mol/J")
    if not params:
        print("nothing to fit for this model; deviations of the model from the points:")
    print(
        f"largest deviation {100 * result.max_deviation:.2f} % at {result.worst_temperature:g} K"
    )
    if args.write:
        if not params:
            print("nothing written: the model has no fitted parameters")
        else:
            fitting.write_fit(path, result)
            print(f"written to {path}")
    return 0
