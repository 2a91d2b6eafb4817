"""The paramagnetic salts of demagnetization stages: files under materials/salts/, read into Salt.

One TOML file per salt, every value beside its source (the format is shown by the
bundled files: ``spin``, ``g_factor``, ``molar_mass`` of the formula unit,
``ions_per_formula``, ``density``, ``internal_field``, ``ordering_temperature`` and,
where the data give it, ``lattice``, the coefficient a of C = a T^3 per mol of magnetic
ions). Quantities are strings with units, parsed at this boundary into SI floats; the
state functions are those of :mod:`cryoplan.physics.paramagnets`.

The bundled folder is found with :func:`cryoplan.resources.bundled` ("materials"), the
same lookup the material library uses; the salts sit in its ``salts`` subfolder, which
the material library does not read (it globs the top folder only).
"""

from __future__ import annotations

import re
import sys
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path

from ..errors import InputError, UnknownNameError
from ..physics import paramagnets
from ..resources import bundled
from ..units import parse_quantity, registry
from .materials import parse_value

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

__all__ = ["Salt", "salt", "salt_ids", "salts_folder", "read_salt_file"]

_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")
_FIELD_UNITS = {"T": 1.0, "mT": 1e-3, "uT": 1e-6, "G": 1e-4, "gauss": 1e-4, "kG": 0.1}
_ID = re.compile(r"[a-z0-9][a-z0-9.\-]*")


@dataclass(frozen=True)
class Salt:
    """A paramagnetic salt: its data (SI) and its state functions per mol of magnetic ions.

    Attributes
    ----------
    id, name : str
        Identifier (as in ``salt(id)``) and display name.
    spin : float
        J, [-].
    g_factor : float
        g, [-].
    internal_field : float
        b of the Brillouin model, [T].
    molar_mass : float
        Mass per mol of magnetic ions, [kg/mol] (the formula unit's over the ions in it).
    formula_molar_mass : float
        Mass per mol of formula units, [kg/mol].
    ions_per_formula : int
        Magnetic ions per formula unit.
    density : float
        [kg/m^3].
    ordering_temperature : float
        [K]; the model does not hold near and below it.
    lattice : float
        a of C_lattice = a T^3, [J/(K^4 mol of magnetic ions)]; 0 where not given.
    hydrated : bool
        Whether the salt holds water of crystallisation (lost if warmed under vacuum).
    sources : list of str
        The published sources behind the values.
    """

    id: str
    name: str
    spin: float
    g_factor: float
    internal_field: float
    molar_mass: float
    formula_molar_mass: float
    ions_per_formula: int
    density: float
    ordering_temperature: float
    lattice: float = 0.0
    hydrated: bool = False
    formula: str = ""
    ion: str = ""
    aliases: tuple[str, ...] = ()
    notes: str = ""
    origin: str = ""
    sources: list[str] = field(default_factory=list)

    @property
    def ion_density(self) -> float:
        """Magnetic ions per volume, [mol/m^3]."""
        return self.density / self.molar_mass

    @property
    def entropy_limit(self) -> float:
        """R ln(2J+1), [J/(K mol of magnetic ions)]."""
        return paramagnets.spin_entropy_limit(self.spin)

    def moles(self, mass_kg: float) -> float:
        """Moles of magnetic ions in a mass of salt, [mol]."""
        return float(mass_kg) / self.molar_mass

    def entropy(self, field_T, temperature_K):
        """Molar entropy S(B, T), [J/(K mol of magnetic ions)]; arrays broadcast."""
        return paramagnets.entropy(
            field_T, temperature_K, self.spin, self.g_factor, self.internal_field, self.lattice
        )

    def heat_capacity(self, field_T, temperature_K):
        """Molar heat capacity at constant field, [J/(K mol of magnetic ions)]."""
        return paramagnets.heat_capacity(
            field_T, temperature_K, self.spin, self.g_factor, self.internal_field, self.lattice
        )

    def magnetization(self, field_T, temperature_K):
        """Molar magnetic moment along the field, [A m^2 per mol of magnetic ions]."""
        return paramagnets.magnetization(
            field_T, temperature_K, self.spin, self.g_factor, self.internal_field
        )

    def demagnetization_temperature(self, initial_temperature, initial_field, final_field=0.0):
        """End of the isentrope from (B_i, T_i) at B_f, [K] (0 T: the lowest temperature)."""
        return paramagnets.demagnetization_temperature(
            initial_temperature,
            initial_field,
            final_field,
            self.spin,
            self.g_factor,
            self.internal_field,
            self.lattice,
        )

    def to_dict(self) -> dict:
        """The salt's data for JSON and look-ups (SI units in the key names)."""
        return {
            "id": self.id,
            "name": self.name,
            "formula": self.formula,
            "ion": self.ion,
            "spin": self.spin,
            "g_factor": self.g_factor,
            "internal_field_T": self.internal_field,
            "molar_mass_kg_per_mol_ions": self.molar_mass,
            "ions_per_formula": self.ions_per_formula,
            "density_kg_m3": self.density,
            "ion_density_mol_m3": self.ion_density,
            "ordering_temperature_K": self.ordering_temperature,
            "lattice_J_per_K4_mol": self.lattice,
            "hydrated": self.hydrated,
            "entropy_limit_J_per_K_mol": self.entropy_limit,
            "sources": list(self.sources),
        }


# --------------------------------------------------------------------------------------
# Reading one file
# --------------------------------------------------------------------------------------


class _File:
    """One parsed salt file: values with their sources, errors located by file, line, key."""

    def __init__(self, path: Path, text: str, data: dict) -> None:
        self.path = path
        self.lines = text.splitlines()
        self.data = data
        self.sources: list[str] = []

    def line_of(self, key: str) -> int | None:
        pattern = re.compile(rf"^\s*{re.escape(key)}\s*=")
        for i, line in enumerate(self.lines):
            if pattern.match(line):
                return i + 1
        return None

    def where(self, key: str) -> dict:
        return {"file": str(self.path), "line": self.line_of(key), "key": key}

    def error(self, message: str, key: str, expected=None, found=None) -> InputError:
        return InputError(message, expected=expected, found=found, **self.where(key))

    def raw(self, key: str, required: bool = True):
        """The value of ``key``, its source noted; {value, source} tables unwrapped."""
        if key not in self.data:
            if required:
                raise self.error("a required key is missing", key, f"'{key}'", "nothing")
            return None
        entry = self.data[key]
        if isinstance(entry, dict):
            source = entry.get("source")
            if not isinstance(source, str) or not source.strip():
                raise self.error(
                    "a value without its source",
                    key,
                    'value = ..., source = "author, title, year, table"',
                    repr(source),
                )
            if source not in self.sources:
                self.sources.append(source)
            if "value" not in entry:
                raise self.error("a table without its value", key, "value = ...", "nothing")
            return entry["value"]
        raise self.error(
            "a value without its source", key, '{ value = ..., source = "..." }', repr(entry)
        )

    def number(self, key: str, low: float | None = None) -> float:
        value = self.raw(key)
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise self.error("not a number", key, "a plain number", repr(value))
        if low is not None and not value > low:
            raise self.error("out of range", key, f"a number above {low:g}", repr(value))
        return float(value)

    def quantity(self, key: str, kind: str, required: bool = True, positive: bool = True):
        value = self.raw(key, required)
        if value is None:
            return None
        where = self.where(key)
        if kind == "molar mass":
            si = parse_value(value, "molar mass", where)[0]
        elif kind == "field":
            si = _parse_field(value, where)
        elif kind == "lattice":
            si = _parse_pint(
                value,
                "[energy] / [temperature] ** 4 / [substance]",
                "J/(K**4*mol)",
                "a coefficient such as '1.2e-3 J/(K^4 mol)'",
                where,
            )
        else:
            si = parse_quantity(value, kind, **where)
        if positive and not si > 0:
            raise self.error(
                f"a {kind} that is not positive", key, f"a {kind} above 0", repr(value)
            )
        if not positive and si < 0:
            raise self.error(f"a {kind} below zero", key, f"a {kind} of 0 or more", repr(value))
        return si


def _parse_pint(text, dimension: str, si: str, expected: str, where: dict) -> float:
    if isinstance(text, bool) or not isinstance(text, str):
        raise InputError("not a quantity with units", expected=expected, found=repr(text), **where)
    match = _NUMBER.match(text)
    if not match or not match.group(2):
        raise InputError("not a number with units", expected=expected, found=repr(text), **where)
    try:
        quantity = registry().Quantity(float(match.group(1)), match.group(2).replace("^", "**"))
    except Exception:
        raise InputError(
            f"unknown unit {match.group(2)!r}", expected=expected, found=repr(text), **where
        ) from None
    if not quantity.check(dimension):
        raise InputError(
            "wrong kind of quantity", expected=expected, found=repr(text), **where
        ) from None
    return float(quantity.m_as(si))


def _parse_field(text, where: dict) -> float:
    """A magnetic field such as '0.05 T' or '40 mT' into tesla (pint for other units)."""
    expected = "a magnetic field such as '0.05 T' or '40 mT'"
    if isinstance(text, str):
        match = _NUMBER.match(text)
        if match and match.group(2) in _FIELD_UNITS:
            return float(match.group(1)) * _FIELD_UNITS[match.group(2)]
    return _parse_pint(text, "[mass] / [current] / [time] ** 2", "T", expected, where)


def read_salt_file(path) -> Salt:
    """Read and check one salt file; raises InputError naming the file, line and key.

    Parameters
    ----------
    path : str or Path
        A TOML file in the format of the bundled ``materials/salts/*.toml``.

    Returns
    -------
    Salt

    Examples
    --------
    >>> s = read_salt_file(salts_folder() / "ferric-ammonium-alum.toml")
    >>> s.spin, s.g_factor, s.internal_field
    (2.5, 2.0, 0.05)
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise InputError(f"cannot read the file ({exc.strerror})", file=str(path)) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        match = re.search(r"line (\d+)", str(exc))
        raise InputError(
            f"not valid TOML: {exc}", file=str(path), line=int(match.group(1)) if match else None
        ) from None
    f = _File(path, text, data)
    sid = data.get("id")
    if not isinstance(sid, str) or not _ID.fullmatch(sid):
        raise f.error("not a valid id", "id", "lower-case letters, digits and '-'", repr(sid))
    name = data.get("name")
    if not isinstance(name, str) or not name.strip():
        raise f.error("a required key is missing", "name", 'name = "..."', repr(name))
    aliases = data.get("aliases", [])
    if not (isinstance(aliases, list) and all(isinstance(a, str) for a in aliases)):
        raise f.error("not a list of names", "aliases", "['name', ...]", repr(aliases))
    hydrated = data.get("hydrated", False)
    if not isinstance(hydrated, bool):
        raise f.error("not true or false", "hydrated", "true or false", repr(hydrated))
    spin = f.number("spin", low=0.0)
    if abs(2 * spin - round(2 * spin)) > 1e-9:
        raise f.error("not a half-integer spin", "spin", "J = 0.5, 1, 1.5, ...", repr(spin))
    g = f.number("g_factor", low=0.0)
    formula_mass = f.quantity("molar_mass", "molar mass")
    ions = f.number("ions_per_formula", low=0.0)
    if ions != int(ions):
        raise f.error("not a whole number", "ions_per_formula", "1, 2, 3, ...", repr(ions))
    density = f.quantity("density", "density")
    b = f.quantity("internal_field", "field", positive=False)
    t_order = f.quantity("ordering_temperature", "temperature", positive=False)
    lattice = f.quantity("lattice", "lattice", required=False, positive=False) or 0.0
    return Salt(
        id=sid,
        name=name,
        spin=spin,
        g_factor=g,
        internal_field=b,
        molar_mass=formula_mass / ions,
        formula_molar_mass=formula_mass,
        ions_per_formula=int(ions),
        density=density,
        ordering_temperature=t_order,
        lattice=lattice,
        hydrated=hydrated,
        formula=str(data.get("formula", "")),
        ion=str(data.get("ion", "")),
        aliases=tuple(a.lower() for a in aliases),
        notes=str(data.get("notes", "")),
        origin=str(path),
        sources=f.sources,
    )


# --------------------------------------------------------------------------------------
# The set of salts
# --------------------------------------------------------------------------------------


def salts_folder() -> Path:
    """The folder of the bundled salt files (``materials/salts``).

    >>> salts_folder().name
    'salts'
    """
    materials = bundled("materials")
    if materials is None:  # pragma: no cover - a broken installation
        raise InputError("the bundled materials folder is missing; reinstall cryoplan")
    return materials / "salts"


@lru_cache(maxsize=8)
def _library(folder: str) -> dict[str, Salt]:
    salts: dict[str, Salt] = {}
    for path in sorted(Path(folder).glob("*.toml")):
        s = read_salt_file(path)
        if s.id in salts:
            raise InputError(
                f"the id {s.id!r} is also used by {salts[s.id].origin}", file=str(path), key="id"
            )
        salts[s.id] = s
    return salts


def salt_ids(folder=None) -> list[str]:
    """The ids of the known salts, sorted.

    Parameters
    ----------
    folder : str or Path, optional
        A folder of salt files; the bundled one by default.

    Returns
    -------
    list of str

    Examples
    --------
    >>> salt_ids()[:2]
    ['cerium-magnesium-nitrate', 'chromium-potassium-alum']
    """
    return sorted(_library(str(Path(folder) if folder else salts_folder())))


def salt(name: str, folder=None) -> Salt:
    """The salt with this id or alias (case-insensitive); unknown names suggest the closest.

    Parameters
    ----------
    name : str
        An id such as ``"ferric-ammonium-alum"`` or an alias such as ``"FAA"``.
    folder : str or Path, optional
        A folder of salt files; the bundled one by default.

    Returns
    -------
    Salt

    Raises
    ------
    UnknownNameError
        Naming the closest known ids.

    Examples
    --------
    >>> salt("FAA").id
    'ferric-ammonium-alum'
    >>> round(salt("ferric-ammonium-alum").entropy(0.0, 4.2) / 8.314462618, 3)   # ln 6 less b^2
    1.791
    """
    library = _library(str(Path(folder) if folder else salts_folder()))
    key = str(name).strip().lower()
    if key in library:
        return library[key]
    for s in library.values():
        if key in s.aliases:
            return s
    raise UnknownNameError("salt", str(name), sorted(library))
