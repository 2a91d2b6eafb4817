"""Commands for the paramagnetic salts of demagnetization stages: ``salts`` and ``salt ID``.

A thin shell: it parses arguments, asks the salt data set, and formats; no physics here.
"""

from __future__ import annotations

import json
import math

from ..errors import InputError


def register(subparsers) -> None:
    """Add the salt commands to the command line."""
    p = subparsers.add_parser(
        "salts",
        help="list the paramagnetic salts for demagnetization stages",
        description="List every salt: id, name, spin J, g-factor, internal field and the "
        "spin entropy R ln(2J+1) per mole of magnetic ions.",
    )
    p.add_argument("--format", choices=("text", "json"), default="text")
    p.set_defaults(func=run_salts)

    p = subparsers.add_parser(
        "salt",
        help="spin entropy and heat capacity of one salt against field and temperature",
        description="Print the molar spin entropy S(B, T) and heat capacity C(B, T) of a "
        "salt (Brillouin model with its internal field) at the given fields and "
        "temperatures, and where an isentropic demagnetization from each field ends.",
    )
    p.add_argument("id", help="salt id or alias, e.g. ferric-ammonium-alum")
    p.add_argument(
        "--field",
        default="0 T, 1 T",
        metavar="FIELDS",
        help='comma-separated fields, e.g. "0 T, 1 T, 6 T" (default: 0 T, 1 T)',
    )
    p.add_argument(
        "--at",
        default="0.05 K, 0.1 K, 0.5 K, 1 K, 2 K, 4.2 K",
        metavar="TEMPS",
        help='comma-separated temperatures, e.g. "0.1 K, 1.5 K"',
    )
    p.add_argument("--format", choices=("text", "json"), default="text")
    p.set_defaults(func=run_salt)


def _list(text: str, option: str, parse) -> list[float]:
    values = [t for t in (part.strip() for part in str(text).split(",")) if t]
    if not values:
        raise InputError(
            "nothing given", key=option, expected="a comma-separated list", found=repr(text)
        )
    return [parse(v, key=option) for v in values]


def _field(text: str, key: str) -> float:
    parts = text.split()
    try:
        number = float(parts[0])
    except (ValueError, IndexError):
        raise InputError(
            "not a field", key=key, expected="a field such as '1 T'", found=repr(text)
        ) from None
    unit = " ".join(parts[1:])
    factors = {"T": 1.0, "mT": 1e-3, "G": 1e-4, "kG": 0.1}
    if unit not in factors:
        raise InputError(
            "unknown unit of field",
            key=key,
            expected="a field in T, mT, G or kG, such as '1 T'",
            found=repr(text),
        )
    value = number * factors[unit]
    if not (math.isfinite(value) and 0.0 <= value <= 100.0):
        raise InputError(
            "a field out of range", key=key, expected="a field from 0 T to 100 T", found=repr(text)
        )
    return value


def run_salts(args) -> int:
    from ..data.salts import salt, salt_ids

    rows = [salt(i) for i in salt_ids()]
    if args.format == "json":
        print(json.dumps([s.to_dict() for s in rows], indent=2))
        return 0
    print(f"{'id':28} {'J':>4} {'g':>5} {'b [mT]':>7} {'R ln(2J+1) [J/(K mol)]':>23}")
    for s in rows:
        print(
            f"{s.id:28} {s.spin:4g} {s.g_factor:5.2f} {s.internal_field * 1e3:7.1f} "
            f"{s.entropy_limit:23.3f}"
        )
    print(
        "\nPer mole of magnetic ions. `cryoplan salt ID` shows S and C against field and "
        "temperature; each value's source is in its file under materials/salts/."
    )
    return 0


def run_salt(args) -> int:
    from ..data.salts import salt
    from ..units import parse_temperature

    s = salt(args.id)
    fields = _list(args.field, "--field", _field)
    temps = _list(args.at, "--at", lambda v, key: parse_temperature(v, key=key))
    for t in temps:
        if t <= 0.0:
            raise InputError(
                "a temperature of 0 K",
                key="--at",
                expected="temperatures above 0 K",
                found=args.at,
            )
    table = []
    for b in fields:
        for t in temps:
            table.append(
                {
                    "field_T": b,
                    "temperature_K": t,
                    "entropy_J_per_K_mol": float(s.entropy(b, t)),
                    "heat_capacity_J_per_K_mol": float(s.heat_capacity(b, t)),
                    "demagnetized_to_K": float(s.demagnetization_temperature(t, b, 0.0)),
                }
            )
    if args.format == "json":
        print(json.dumps({"salt": s.to_dict(), "points": table}, indent=2))
        return 0
    print(
        f"{s.name} ({s.id}): J = {s.spin:g}, g = {s.g_factor:g}, internal field "
        f"{s.internal_field * 1e3:g} mT; R ln(2J+1) = {s.entropy_limit:.3f} J/(K mol)"
    )
    print(
        f"\n{'B [T]':>7} {'T [K]':>8} {'S [J/(K mol)]':>14} {'C [J/(K mol)]':>14} "
        f"{'to 0 T [K]':>11}"
    )
    for r in table:
        print(
            f"{r['field_T']:7.3g} {r['temperature_K']:8.4g} "
            f"{r['entropy_J_per_K_mol']:14.4g} {r['heat_capacity_J_per_K_mol']:14.4g} "
            f"{r['demagnetized_to_K']:11.4g}"
        )
    print(
        "\nPer mole of magnetic ions. 'to 0 T' is where an isentropic demagnetization "
        "from that field and temperature ends (Brillouin model with the internal field)."
    )
    if getattr(s, "hydrated", False):
        print(
            "Caution: a hydrated salt loses its water if it is warmed under vacuum; keep "
            "the pill sealed. Local codes, the site's safety office and licensed practice "
            "decide on handling."
        )
    print("Sources:")
    for src in s.sources:
        print(f"  - {src}")
    return 0
