"""Cryogen properties from CoolProp, cached so that a run does not pay CoolProp's import.

The six cryogens a low-temperature lab uses (helium, hydrogen, neon, nitrogen, argon,
oxygen) are taken from CoolProp's reference equations of state [1]_. CoolProp's import
alone takes seconds, so the properties cryoplan needs are computed once per cryogen,
pressure and CoolProp version, and written as small JSON tables to the user cache
directory (``platformdirs.user_cache_dir("cryoplan")``, or ``$CRYOPLAN_CACHE_DIR``):

* the saturation scalars at the pressure (boiling point, latent heat, densities, the
  liquid and vapour enthalpy and entropy), the triple and critical points and the
  reference of the equation of state;
* a table of the gas enthalpy, entropy and density against temperature at that pressure,
  from the boiling point to :data:`T_MAX`, with their temperature derivatives, on a grid
  refined until cubic Hermite interpolation in :math:`\\ln T` is within
  :data:`INTERPOLATION_TOLERANCE` of CoolProp at every interval midpoint.

Once a table exists, :func:`cryogen` reads it with :mod:`json` and :mod:`numpy` only; it
never imports CoolProp. The cache is untrusted input: each file carries a SHA-256 checksum
of its content and the CoolProp version, and a corrupted, truncated, edited or foreign
file, or one that is not a regular file, is noted once on standard error and rebuilt
(:mod:`cryoplan.data.fluid_cache`); a cache directory that cannot be written leaves the
tables in memory for the run.

This module is the fluid layer's public face; the work is done in
:mod:`cryoplan.data.cryogen` (the :class:`Cryogen` and the names),
:mod:`cryoplan.data.fluid_cache` (the files) and :mod:`cryoplan.data.fluid_build` (the
tables computed with CoolProp, the only module that imports it).

Hydrogen is para-hydrogen (CoolProp ``"ParaHydrogen"``): liquid hydrogen that is stored is
converted to (near) para-hydrogen in the liquefier, and its boil-off stays para while it
warms in a cryostat without a catalyst.

References
----------
.. [1] I. H. Bell, J. Wronski, S. Quoilin and V. Lemort, "Pure and pseudo-pure fluid
   thermophysical property evaluation and the open-source thermophysical property library
   CoolProp", Ind. Eng. Chem. Res. 53 (2014) 2498-2508.
"""

from __future__ import annotations

import shutil
from collections.abc import Iterable

from ..errors import InputError
from . import fluid_build, fluid_cache
from .cryogen import (
    ATMOSPHERE,
    COOLPROP_NAMES,
    CRYOGEN_ALIASES,
    SCALARS,
    T_MAX,
    TABLE_COLUMNS,
    Cryogen,
    check_pressure,
    cryogen_names,
    normal_pressure,
    resolve_cryogen_name,
)
from .fluid_build import INTERPOLATION_TOLERANCE
from .fluid_cache import CACHE_FORMAT, MAX_BYTES, cache_dir, coolprop_version

#: Earlier name of :func:`resolve_cryogen_name`, kept for callers that use it.
canonical_name = resolve_cryogen_name

#: Earlier names of the tables, kept for callers that use them.
_COOLPROP_NAMES = COOLPROP_NAMES
_ALIASES = CRYOGEN_ALIASES

#: Cryogen objects already loaded in this process, by (cache dir, version, name, pressure).
_MEMO: dict[tuple[str, str, str, float], Cryogen] = {}


def cryogen(name: str, pressure: float = ATMOSPHERE) -> Cryogen:
    """Properties of a cryogen boiling at ``pressure``, from CoolProp via the cache.

    .. math:: T_b = T_{sat}(p), \\quad L = h_v(p) - h_l(p)

    Parameters
    ----------
    name : str
        One of :func:`cryogen_names`, or an alias such as ``"LHe"``, ``"LN2"``, ``"N2"``,
        ``"para-hydrogen"`` (any case).
    pressure : float
        Pressure over the bath, [Pa]: 101325 for a bath open to the atmosphere, lower for
        a pumped bath, higher for a pressurised one.

    Returns
    -------
    Cryogen

    Raises
    ------
    UnknownNameError
        An unknown cryogen; the message suggests the closest names.
    InputError
        A pressure that is not a positive number, or outside the liquid-vapour range of
        the cryogen (from the triple point to the critical point).

    Notes
    -----
    The first call for a cryogen and pressure computes its tables with CoolProp [1]_ and
    writes them to :func:`cache_dir`; later calls, in any process, only read them.
    Hydrogen is para-hydrogen. Helium-4 is covered down to its lambda point (2.177 K,
    5.04 kPa), where CoolProp's equation of state ends: superfluid baths are refused.

    References
    ----------
    .. [1] I. H. Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508.

    Examples
    --------
    >>> c = cryogen("LHe")
    >>> c.name, round(c.boiling_point, 3), round(c.latent_heat)
    ('helium', 4.224, 20564)
    >>> round(cryogen("nitrogen", pressure=360.4e3).boiling_point, 1)   # pressurised
    90.0
    """
    key_name = resolve_cryogen_name(name)
    p = normal_pressure(pressure)
    version = coolprop_version()
    directory = cache_dir()
    memo_key = (str(directory), version, key_name, p)
    found = _MEMO.get(memo_key)
    if found is not None:
        return found
    ref = None
    if p != ATMOSPHERE:
        # The 1-atm table carries the fluid's range and serves the ratios to room conditions.
        ref = cryogen(key_name, ATMOSPHERE)
        check_pressure(key_name, p, ref.triple_pressure, ref.critical_pressure)
    path = fluid_cache.cache_file(key_name, p)
    data = fluid_cache.read(path, key_name, p, version)
    if data is None:
        data = fluid_build.build(key_name, p, version)
        fluid_cache.write(path, data)
    made = Cryogen(key_name, data, atmosphere=ref)
    _MEMO[memo_key] = made
    return made


def warm_cache(
    pressures: Iterable[float] = (ATMOSPHERE,), names: Iterable[str] | None = None
) -> list[Cryogen]:
    """Build (or load) the tables of the cryogens at the given pressures.

    Parameters
    ----------
    pressures : iterable of float
        Bath pressures, [Pa]. The 1-atm tables are always built.
    names : iterable of str, optional
        Cryogens to build; all of :func:`cryogen_names` when omitted. With names omitted,
        a pressure outside a cryogen's liquid-vapour range is skipped for that cryogen;
        with names given, it raises :class:`~cryoplan.errors.InputError`.

    Returns
    -------
    list of Cryogen
        The cryogens built or loaded, in order.

    Examples
    --------
    >>> [(c.name, c.pressure) for c in warm_cache([200e3], names=["nitrogen"])]
    [('nitrogen', 101325.0), ('nitrogen', 200000.0)]
    """
    strict = names is not None
    chosen = [resolve_cryogen_name(n) for n in names] if strict else cryogen_names()
    wanted = [ATMOSPHERE] + [normal_pressure(p) for p in pressures]
    made: list[Cryogen] = []
    for name in chosen:
        for p in dict.fromkeys(wanted):
            try:
                c = cryogen(name, p)
            except InputError:
                if strict:
                    raise
                continue
            if c not in made:
                made.append(c)
    return made


def clear_cache(files: bool = True) -> None:
    """Forget the tables loaded in this process and, with ``files``, delete the cache files.

    Only the ``fluids`` directory of the cache is removed (all CoolProp versions).

    Examples
    --------
    >>> clear_cache(files=False)   # the next cryogen() reads the files again
    """
    _MEMO.clear()
    if files:
        shutil.rmtree(cache_dir().parent, ignore_errors=True)


__all__ = [
    "ATMOSPHERE",
    "CACHE_FORMAT",
    "COOLPROP_NAMES",
    "CRYOGEN_ALIASES",
    "INTERPOLATION_TOLERANCE",
    "MAX_BYTES",
    "SCALARS",
    "TABLE_COLUMNS",
    "T_MAX",
    "Cryogen",
    "cache_dir",
    "canonical_name",
    "clear_cache",
    "coolprop_version",
    "cryogen",
    "cryogen_names",
    "resolve_cryogen_name",
    "warm_cache",
]
