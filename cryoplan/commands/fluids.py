"""``cryoplan cryogens``: the six cryogens side by side, at 1 atm or a given bath pressure."""

from __future__ import annotations

import json
import sys
import textwrap
import time

from ..errors import InputError

#: Temperature of the gas in the expansion column [K] (20 degC).
T_ROOM = 293.15
#: Ambient of the ideal-liquefaction column [K].
T_AMBIENT = 300.0
#: One kilowatt-hour [J].
KWH = 3.6e6
#: One litre [m^3].
LITRE = 1e-3

CAUTION = (
    "Caution: a litre of liquid makes hundreds of litres of gas. Vented into a room it "
    "displaces the air and can leave too little oxygen to breathe; trapped in a closed "
    "volume it builds pressure; the cold liquid and gas burn skin; surfaces colder than "
    "90 K condense oxygen out of the air. Local codes, the site's safety office and "
    "licensed practice decide on ventilation, relief, oxygen monitoring and handling."
)


def register(subparsers) -> None:
    """Add the ``cryogens`` command to the command line."""
    parser = subparsers.add_parser(
        "cryogens",
        help="properties of the cryogens at 1 atm or a bath pressure",
        description="Boiling point, latent heat, liquid density, expansion to room "
        "temperature, ideal liquefaction work and boil-off per watt of the cryogens, "
        "from CoolProp (cached after the first run).",
    )
    parser.add_argument(
        "names",
        nargs="*",
        metavar="CRYOGEN",
        help="cryogens to show (default: all six), e.g. helium LN2",
    )
    parser.add_argument(
        "--pressure",
        default=None,
        metavar="P",
        help="pressure over the bath, e.g. '120 kPa' or '3 bar' (default: 1 atm)",
    )
    parser.add_argument(
        "--format",
        choices=["text", "json"],
        default="text",
        help="output format (default: text)",
    )
    parser.add_argument(
        "--warm",
        action="store_true",
        help="build the fluid tables in the cache (at 1 atm and at --pressure) and exit",
    )
    parser.set_defaults(func=run)


def run(args) -> int:
    from ..data import fluids
    from ..units import parse_quantity

    pressure = fluids.ATMOSPHERE
    if args.pressure is not None:
        pressure = parse_quantity(args.pressure, "pressure", key="--pressure")
        if not pressure > 0:
            raise InputError(
                "a bath pressure must be above zero",
                key="--pressure",
                expected="a pressure such as '120 kPa'",
                found=repr(args.pressure),
            )
    names = [fluids.resolve_cryogen_name(n) for n in args.names] or fluids.cryogen_names()
    if args.warm:
        start = time.perf_counter()
        made = fluids.warm_cache([pressure], names=args.names or None)
        took = time.perf_counter() - start
        print(
            f"Fluid tables ready for {len(made)} cryogen-pressure pairs in "
            f"{fluids.cache_dir()} ({took:.1f} s)."
        )
        return 0
    rows = []
    for name in dict.fromkeys(names):
        try:
            rows.append(fluids.cryogen(name, pressure))
        except InputError as exc:
            if args.names:  # asked for by name: the user should hear why
                raise
            rows.append((name, exc))
    if args.format == "json":
        json.dump(_as_dict(pressure, rows, fluids), sys.stdout, indent=2)
        sys.stdout.write("\n")
    else:
        sys.stdout.write(_as_text(pressure, rows, fluids))
    return 0


def _figures(c) -> dict:
    """The figures of one cryogen, converted to the units of the table (no physics here)."""
    work = c.ideal_liquefaction_work(T_AMBIENT)
    return {
        "name": c.name,
        "pressure_Pa": c.pressure,
        "boiling_point_K": c.boiling_point,
        "latent_heat_J_per_kg": c.latent_heat,
        "latent_heat_J_per_L": c.volumetric_latent_heat * LITRE,
        "liquid_density_kg_per_m3": c.liquid_density,
        "vapor_density_kg_per_m3": c.vapor_density,
        "expansion_ratio_293K": c.expansion_ratio(T_ROOM),
        "ideal_liquefaction_work_J_per_kg": work,
        "ideal_liquefaction_work_kWh_per_L": work * c.liquid_density * LITRE / KWH,
        "boiled_L_per_h_per_W": 3600.0 / c.volumetric_latent_heat / LITRE,
        "triple_point_K": c.triple_point,
        "critical_temperature_K": c.critical_temperature,
        "source": c.source,
    }


def _as_dict(pressure: float, rows, fluids) -> dict:
    out = []
    for row in rows:
        if isinstance(row, tuple):
            name, exc = row
            out.append({"name": name, "error": str(exc)})
        else:
            out.append(_figures(row))
    return {
        "pressure_Pa": pressure,
        "coolprop_version": fluids.coolprop_version(),
        "expansion_gas_temperature_K": T_ROOM,
        "liquefaction_ambient_K": T_AMBIENT,
        "cryogens": out,
        "notes": _notes(),
        "caution": CAUTION,
    }


def _notes() -> list[str]:
    return [
        f"Expansion: volume of gas at {T_ROOM:g} K and 1 atm per volume of liquid at the "
        "bath pressure.",
        f"Ideal liquefaction: reversible work to make saturated liquid from gas at "
        f"{T_AMBIENT:g} K and 1 atm, all heat rejected at {T_AMBIENT:g} K; real "
        "liquefiers need several to tens of times more.",
        "Boiled per W: litres of liquid that one watt of heat evaporates in an hour.",
        "Hydrogen is para-hydrogen; its liquefaction work leaves out the ortho-para "
        "conversion of room-temperature hydrogen.",
    ]


def _as_text(pressure: float, rows, fluids) -> str:
    width = 79
    lines = [f"Cryogens boiling at {pressure / 1000:.6g} kPa", ""]
    lines.append(
        f"{'':<10}{'boiling':>8}{'latent heat':^16}{'liquid':>9}{'gas per':>9}"
        f"{' liquefaction work':<18}{'boiled':>9}"
    )
    lines.append(
        f"{'':<10}{'point':>8}{'':16}{'density':>9}{'liquid':>9}"
        f"{' ideal, from ' + format(T_AMBIENT, 'g') + ' K':<18}{'per W':>9}"
    )
    lines.append(
        f"{'cryogen':<10}{'K':>8}{'kJ/kg':>8}{'kJ/L':>8}{'kg/m^3':>9}"
        f"{'at 293 K':>9}{'MJ/kg':>9}{'kWh/L':>9}{'L/h':>9}"
    )
    lines.append("-" * width)
    used = []
    for row in rows:
        if isinstance(row, tuple):
            name, exc = row
            message = getattr(exc, "message", str(exc))
            expected = getattr(exc, "expected", None)
            text = f"{message}; needs {expected}" if expected else message
            wrapped = textwrap.wrap(text, width - 10, break_on_hyphens=False)
            lines.append(f"{name:<10}{wrapped[0]}")
            lines.extend(f"{'':<10}{w}" for w in wrapped[1:])
            continue
        f = _figures(row)
        used.append(row)
        lines.append(
            f"{row.name:<10}{f['boiling_point_K']:>#8.4g}"
            f"{f['latent_heat_J_per_kg'] / 1000:>#8.4g}{f['latent_heat_J_per_L'] / 1000:>#8.4g}"
            f"{f['liquid_density_kg_per_m3']:>9.1f}{f['expansion_ratio_293K']:>9.0f}"
            f"{f['ideal_liquefaction_work_J_per_kg'] / 1e6:>#9.4g}"
            f"{f['ideal_liquefaction_work_kWh_per_L']:>#9.3g}{f['boiled_L_per_h_per_W']:>#9.3g}"
        )
    lines.append("")
    for note in _notes():
        lines.extend(textwrap.wrap(note, width, subsequent_indent="  "))
    if used:
        lines.append("")
        lines.extend(
            textwrap.wrap(
                f"Properties: CoolProp {fluids.coolprop_version()} (Bell et al., Ind. Eng. "
                "Chem. Res. 53 (2014) 2498-2508), reference equations of state:",
                width,
            )
        )
        for c in used:
            eos = c.source.split("equation of state: ", 1)[-1]
            lines.extend(
                textwrap.wrap(
                    eos,
                    width,
                    initial_indent=f"  {c.name + ':':<10}",
                    subsequent_indent=" " * 12,
                    break_on_hyphens=False,
                )
            )
    lines.append("")
    lines.extend(textwrap.wrap(CAUTION, width))
    return "\n".join(lines) + "\n"
