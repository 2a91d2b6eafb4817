"""Reading one material file into a :class:`~cryoplan.data.material.Material`: the file's
TOML, its heat-capacity model (Debye, Debye with a varying temperature, tabulated, or a
mixture of other materials) and its conductivity model, each value checked and each problem
located by file, key and line. The file format is described in DEVELOPERS.md ("Material
files").
"""

from __future__ import annotations

import re
import sys
from pathlib import Path

import numpy as np

from ..errors import InputError
from ..physics import solids
from .material import CLASSES, Material, ReferenceSet
from .material_reader import MaterialFileReader, parse_value, unit_factor

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib


def _terms(reader: MaterialFileReader, hc: dict) -> dict:
    """Einstein, Schottky and superconducting terms of a Debye-type model."""
    einstein = []
    for i, term in enumerate(hc.get("einstein", [])):
        key = f"heat_capacity.einstein[{i}]"
        theta = reader.quantity(term, "temperature", key + ".temperature", "temperature")
        atoms = reader.number(term, "atoms", key + ".atoms", low=0.0, high=1e4)
        reader.note_source(term, key)
        einstein.append((theta, atoms))
    schottky = []
    for i, term in enumerate(hc.get("schottky", [])):
        key = f"heat_capacity.schottky[{i}]"
        gap = reader.quantity(term, "gap", key + ".gap", "temperature")
        centres = reader.number(term, "centres", key + ".centres", low=0.0, high=1e4)
        ratio = reader.number(
            term,
            "degeneracy_ratio",
            key + ".degeneracy_ratio",
            required=False,
            default=1.0,
            low=1e-6,
            high=1e6,
        )
        reader.note_source(term, key)
        schottky.append((gap, centres, ratio))
    superconducting = None
    if "superconducting" in hc:
        term = hc["superconducting"]
        key = "heat_capacity.superconducting"
        if not isinstance(term, dict):
            raise reader.error(
                "not a table", key, expected="{ tc = '9.25 K', ... }", found=repr(term)
            )
        tc = reader.quantity(term, "tc", key + ".tc", "temperature")
        b = reader.number(term, "b", key + ".b", required=False, default=1.44, low=0.5, high=5.0)
        reader.note_source(term, key)
        superconducting = (tc, b)
    return {
        "einstein": tuple(einstein),
        "schottky": tuple(schottky),
        "superconducting": superconducting,
    }


def _heat_capacity(
    reader: MaterialFileReader, data: dict, molar_mass: float | None, allow_unfitted: bool = False
):
    """(model name, c(T) function, breakpoints, references, t_min, t_max)."""
    hc = reader.get(data, "heat_capacity", "heat_capacity")
    if not isinstance(hc, dict):
        raise reader.error(
            "not a table", "heat_capacity", expected="[heat_capacity]", found=repr(hc)[:40]
        )
    model = reader.get(hc, "model", "heat_capacity.model")
    known = sorted(solids.HEAT_CAPACITY_MODELS) + ["mixture"]
    if model not in known:
        raise reader.error(
            "unknown heat-capacity model",
            "heat_capacity.model",
            expected="one of " + ", ".join(repr(k) for k in known),
            found=repr(model),
        )
    if "source" in hc:
        reader.note_source(hc, "heat_capacity")

    references = []
    for i, ref in enumerate(hc.get("reference", [])):
        key = f"heat_capacity.reference[{i}]"
        if not isinstance(ref, dict):
            raise reader.error(
                "not a table", key, expected="{ source = ..., points = ... }", found=repr(ref)[:40]
            )
        reader.note_source(ref, key)
        if "source" not in ref:
            raise reader.error(
                "reference points without their source",
                key + ".source",
                expected="a source",
                found="nothing",
            )
        t, y = reader.pairs(
            reader.get(ref, "points", key + ".points"), key + ".points", "specific heat", minimum=1
        )
        unit = ref.get("unit", "J/(kg K)")
        factor, molar = unit_factor(unit, "specific heat", reader.where(key + ".unit"))
        y = y * factor
        if molar:
            if molar_mass is None:
                raise reader.error(
                    "per-mole reference points need the molar mass",
                    key + ".unit",
                    expected="molar_mass in the file",
                    found=repr(unit),
                )
            y = y / molar_mass
        references.append(ReferenceSet(ref["source"], t, y))

    gamma, gamma_per_kg = 0.0, False
    if "gamma" in hc:
        gamma, molar, raw, _ = reader.quantity_with_basis(
            hc, "gamma", "heat_capacity.gamma", "electronic coefficient"
        )
        gamma_per_kg = not molar
        if gamma < 0:
            raise reader.error(
                "a negative electronic coefficient",
                "heat_capacity.gamma",
                expected="gamma of 0 or more",
                found=repr(raw),
            )

    breakpoints: list[float] = []
    if model in ("debye", "debye-varying"):
        if molar_mass is None:
            raise reader.error(
                "a Debye model needs the molar mass",
                "molar_mass",
                expected="molar_mass = { value = '63.546 g/mol', ... }",
                found="nothing",
            )
        atoms = reader.number(
            hc,
            "atoms_per_formula",
            "heat_capacity.atoms_per_formula",
            required=False,
            default=1.0,
            low=0.01,
            high=1e4,
        )
        if gamma_per_kg:
            gamma = gamma * molar_mass
        terms = _terms(reader, hc)
        terms["dilation"] = 0.0
        if "dilation" in hc:
            terms["dilation"] = reader.number(
                hc, "dilation", "heat_capacity.dilation", low=0.0, high=1e-2
            )
        if terms["superconducting"]:
            breakpoints.append(terms["superconducting"][0])
        if model == "debye":
            theta = reader.quantity(
                hc, "debye_temperature", "heat_capacity.debye_temperature", "temperature"
            )

            def c(t, theta=theta):
                return solids.debye_specific_heat(t, theta, molar_mass, atoms, gamma, **terms)

            knot_temperatures = None
        elif "theta_knots" not in hc and allow_unfitted:
            knot_temperatures = None
            c = None
        else:
            if "theta_knots" not in hc:
                raise reader.error(
                    "the model has not been fitted yet",
                    "heat_capacity.theta_knots",
                    expected="theta_knots, written by 'cryoplan fit FILE --write'",
                    found="nothing",
                )
            knots_raw = hc["theta_knots"]
            kt, kv = reader.pairs(knots_raw, "heat_capacity.theta_knots", "Debye temperature")
            breakpoints.extend(kt.tolist())
            knot_temperatures = kt

            def c(t, kt=kt, kv=kv):
                return solids.varying_debye_specific_heat(
                    t, kt, kv, molar_mass, atoms, gamma, **terms
                )

        params = {
            "atoms": atoms,
            "gamma_molar": gamma,
            "terms": terms,
            "fit_gamma": bool(hc.get("fit_gamma", False)),
            "fit_dilation": bool(hc.get("fit_dilation", False)),
        }
        if knot_temperatures is not None:
            params["knot_temperatures"] = knot_temperatures
    elif model == "tabulated":
        table = hc.get("table")
        if table is None:
            if not references:
                raise reader.error(
                    "a tabulated model needs a table",
                    "heat_capacity.table",
                    expected="table = [[T, c], ...] or reference points",
                    found="nothing",
                )
            tt, tv = references[0].temperatures, references[0].values
        else:
            tt, tv = reader.pairs(table, "heat_capacity.table", "specific heat")
        if gamma and not gamma_per_kg and molar_mass is None:
            raise reader.error(
                "a per-mole gamma needs the molar mass",
                "heat_capacity.gamma",
                expected="molar_mass in the file, or gamma per kg",
                found=repr(hc["gamma"]),
            )
        g = gamma if gamma_per_kg else gamma / (molar_mass or 1.0)
        breakpoints.extend(tt.tolist())

        def c(t, tt=tt, tv=tv, g=g):
            return solids.tabulated_specific_heat(t, tt, tv, g)

        params = {}
    else:  # mixture: resolved against the other materials after loading
        parts = reader.get(hc, "components", "heat_capacity.components")
        if not isinstance(parts, list) or not parts:
            raise reader.error(
                "a mixture needs components",
                "heat_capacity.components",
                expected="[{ material = 'copper', mass_fraction = 0.6 }, ...]",
                found=repr(parts)[:40],
            )
        comps = []
        for i, part in enumerate(parts):
            key = f"heat_capacity.components[{i}]"
            mid = reader.get(part, "material", key + ".material")
            frac = reader.number(part, "mass_fraction", key + ".mass_fraction", low=0.0, high=1.0)
            comps.append((str(mid), frac))
        total = sum(f for _, f in comps)
        if abs(total - 1.0) > 1e-3:
            raise reader.error(
                "mass fractions do not add up to 1",
                "heat_capacity.components",
                expected="a sum of 1",
                found=f"{total:g}",
            )
        c = None
        params = {"components": comps}

    if references:
        t_all = np.concatenate([r.temperatures for r in references])
        t_min, t_max = float(t_all.min()), float(t_all.max())
    else:
        t_min = t_max = None
    rng = hc.get("range")
    if rng is not None:
        if not (isinstance(rng, list) and len(rng) == 2):
            raise reader.error(
                "not a range", "heat_capacity.range", expected="['4 K', '300 K']", found=repr(rng)
            )
        t_min = parse_value(rng[0], "temperature", reader.where("heat_capacity.range"))[0]
        t_max = parse_value(rng[1], "temperature", reader.where("heat_capacity.range"))[0]
    if t_max is None:
        raise reader.error(
            "no temperature range",
            "heat_capacity.range",
            expected="reference points or range = ['4 K', '300 K']",
            found="neither",
        )
    if not (0 <= t_min < t_max):
        raise reader.error(
            "an empty temperature range",
            "heat_capacity.range",
            expected="t_min below t_max",
            found=f"{t_min:g} K to {t_max:g} K",
        )
    return model, c, tuple(breakpoints), references, t_min, t_max, params


def _conductivity(reader: MaterialFileReader, data: dict):
    """(model, factory rrr -> k(T), default rrr, t_min, t_max) or Nones."""
    k = data.get("conductivity")
    if k is None:
        return None, None, None, None, None
    key = "conductivity"
    if not isinstance(k, dict):
        raise reader.error("not a table", key, expected="[conductivity]", found=repr(k)[:40])
    model = reader.get(k, "model", key + ".model")
    if model not in solids.CONDUCTIVITY_MODELS:
        known = ", ".join(repr(m) for m in sorted(solids.CONDUCTIVITY_MODELS))
        raise reader.error(
            "unknown conductivity model",
            key + ".model",
            expected=f"one of {known}",
            found=repr(model),
        )
    reader.note_source(k, key)
    if "source" not in k:
        raise reader.error(
            "conductivity data without a source",
            key + ".source",
            expected="a source",
            found="nothing",
        )
    default_rrr = None
    if model == "nist-log-polynomial":
        coefficients = reader.get(k, "coefficients", key + ".coefficients")
        if not (
            isinstance(coefficients, list)
            and 2 <= len(coefficients) <= 12
            and all(isinstance(x, (int, float)) for x in coefficients)
        ):
            raise reader.error(
                "not a list of coefficients",
                key + ".coefficients",
                expected="[a, b, c, ...] numbers",
                found=repr(coefficients)[:60],
            )

        def factory(rrr, coefficients=tuple(float(x) for x in coefficients)):
            return lambda t: solids.nist_log_polynomial(t, coefficients)
    elif model == "tabulated":
        tt, tv = reader.pairs(
            reader.get(k, "points", key + ".points"), key + ".points", "conductivity"
        )

        def factory(rrr, tt=tt, tv=tv):
            return lambda t: solids.tabulated_conductivity(t, tt, tv)
    elif model == "hust-lankford":
        names = ("p1", "p2", "p3", "p4", "p5", "p6", "p7")
        params = {n: reader.number(k, n, f"{key}.{n}") for n in names}
        params["p7_exponent"] = reader.number(
            k, "p7_exponent", key + ".p7_exponent", required=False, default=0.0
        )
        params["rho_273"] = reader.quantity(k, "rho_273", key + ".rho_273", "resistivity")
        default_rrr = reader.number(k, "rrr", key + ".rrr", low=1.0001, high=1e5)

        def factory(rrr, params=params):
            return lambda t: solids.hust_lankford_conductivity(t, rrr, **params)
    else:  # nist-rational
        coefficients = reader.get(k, "coefficients", key + ".coefficients")

        def factory(rrr, coefficients=tuple(float(x) for x in coefficients)):
            return lambda t: solids.nist_rational_conductivity(t, coefficients)

    rng = reader.get(k, "range", key + ".range")
    if not (isinstance(rng, list) and len(rng) == 2):
        raise reader.error(
            "not a range", key + ".range", expected="['4 K', '300 K']", found=repr(rng)
        )
    t_min = parse_value(rng[0], "temperature", reader.where(key + ".range"))[0]
    t_max = parse_value(rng[1], "temperature", reader.where(key + ".range"))[0]
    if not 0 < t_min < t_max:
        raise reader.error(
            "an empty temperature range",
            key + ".range",
            expected="0 K < t_min < t_max",
            found=repr(rng),
        )
    return model, factory, default_rrr, t_min, t_max


def read_material_file(
    path: Path, bundled: bool = False, allow_unfitted: bool = False
) -> Material:
    """Read and check one material file; raises InputError naming the file and key.

    ``allow_unfitted`` accepts a Debye-type model without its fitted parameters (for
    ``cryoplan fit``); such a material cannot compute anything until it is fitted.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise InputError(f"cannot read the file ({exc.strerror})", file=str(path)) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        line = None
        match = re.search(r"line (\d+)", str(exc))
        if match:
            line = int(match.group(1))
        raise InputError(f"not valid TOML: {exc}", file=str(path), line=line) from None
    reader = MaterialFileReader(path, text, data)
    try:
        return _read(reader, data, path, bundled, allow_unfitted)
    except InputError as exc:
        if exc.line is None and exc.key and exc.file == str(path):
            exc.line = reader.line_of(exc.key)
            exc.args = (str(exc),)
        raise


def _read(
    reader: MaterialFileReader, data: dict, path: Path, bundled: bool, allow_unfitted: bool
) -> Material:
    mid = reader.get(data, "id", "id")
    if not isinstance(mid, str) or not re.fullmatch(r"[a-z0-9][a-z0-9.\-]*", mid):
        raise reader.error(
            "not a valid id", "id", expected="lower-case letters, digits and '-'", found=repr(mid)
        )
    name = reader.get(data, "name", "name")
    klass = reader.get(data, "class", "class")
    if klass not in CLASSES:
        raise reader.error(
            "unknown class",
            "class",
            expected="one of " + ", ".join(repr(c) for c in CLASSES),
            found=repr(klass),
        )
    density = reader.quantity(data, "density", "density", "density", positive=False)
    if not density > 0:
        raw = data["density"]["value"] if isinstance(data["density"], dict) else data["density"]
        raise reader.error(
            "a density that is not positive",
            "density",
            expected="a density above zero such as '8960 kg/m^3'",
            found=repr(raw),
        )
    molar_mass = reader.quantity(data, "molar_mass", "molar_mass", "molar mass", required=False)
    emissivity = reader.number(data, "emissivity", "emissivity", required=False, low=0.0, high=1.0)
    aliases = data.get("aliases", [])
    if not (isinstance(aliases, list) and all(isinstance(a, str) for a in aliases)):
        raise reader.error(
            "not a list of names", "aliases", expected="['name', ...]", found=repr(aliases)
        )
    model, c, breakpoints, references, t_min, t_max, params = _heat_capacity(
        reader, data, molar_mass, allow_unfitted
    )
    k_model, k_factory, default_rrr, k_t_min, k_t_max = _conductivity(reader, data)
    for extra in data.get("sources", []):
        if isinstance(extra, str) and extra not in reader.sources:
            reader.sources.append(extra)
    material = Material(
        id=mid,
        name=str(name),
        klass=klass,
        density=density,
        molar_mass=molar_mass,
        t_min=t_min,
        t_max=t_max,
        emissivity=emissivity,
        sources=reader.sources,
        origin=str(path),
        bundled=bundled,
        model=model,
        formula=data.get("formula"),
        aliases=[a.lower() for a in aliases],
        references=references,
        notes=str(data.get("notes", "")),
        default_rrr=default_rrr,
        conductivity_model=k_model,
        k_t_min=k_t_min,
        k_t_max=k_t_max,
        _c=c,
        _breakpoints=breakpoints,
        _k_factory=k_factory,
        _params=params,
    )
    return material
