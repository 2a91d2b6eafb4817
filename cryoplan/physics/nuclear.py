"""Nuclear heat capacity of metals in a field (copper), to extend the solids below 1 K.

Pure physics: SI floats and numpy arrays in and out (tesla, kelvin, J/(K mol)). A nucleus
of spin I and magnetic moment mu has 2I+1 levels split by mu B_eff / I; above the
millikelvin range its heat capacity is the high-temperature tail

.. math:: C_n = \\frac{n \\lambda_n (B^2 + b^2)}{\\mu_0 T^2},
          \\qquad \\lambda_n = \\frac{\\mu_0 N_A I (I+1) g_n^2 \\mu_N^2}{3 k_B}
          = \\frac{\\mu_0 N_A \\mu^2 (I+1)}{3 I k_B}

(Pobell [1]_, sections 10.1 and 3.1.4), summed over the isotopes by abundance. The full
Brillouin form (:func:`nuclear_heat_capacity` with ``exact=True``) is the same model
without the expansion; it stays finite as T -> 0, so that S and H can be integrated
from 0 K.

References
----------
.. [1] F. Pobell, "Matter and Methods at Low Temperatures", 3rd ed., Springer (2007),
   section 3.1.4 (the nuclear heat capacity) and chapter 10 (nuclear refrigeration), table
   10.1 (copper: C_n T^2 / (n B^2) about 3.22 uJ K/(mol T^2) and an internal field of
   about 0.36 mT; both from memory).
.. [2] N. J. Stone, "Table of nuclear magnetic dipole and electric quadrupole moments",
   At. Data Nucl. Data Tables 90, 75 (2005): mu(63Cu) = +2.2233 mu_N, mu(65Cu) =
   +2.3817 mu_N, I = 3/2 (from memory).
.. [3] IUPAC isotopic compositions of the elements (2009): 63Cu 69.15 %, 65Cu 30.85 %
   (from memory).
"""

from __future__ import annotations

from functools import lru_cache
from types import SimpleNamespace

import numpy as np

from . import paramagnets
from .errors import InputError, TemperatureError

__all__ = [
    "COPPER_ISOTOPES",
    "COPPER_INTERNAL_FIELD",
    "COPPER_MOLAR_MASS",
    "nuclear_heat_capacity_coefficient",
    "nuclear_curie_constant",
    "nuclear_heat_capacity",
    "nuclear_entropy",
    "copper_nuclear_heat_capacity",
    "copper_nuclear_entropy",
]

#: Copper's isotopes as (abundance, spin I, moment in nuclear magnetons): IUPAC abundances
#: and Stone's moments, both from memory (see the module's references).
COPPER_ISOTOPES = ((0.6915, 1.5, 2.2233), (0.3085, 1.5, 2.3817))
#: Internal field of copper's nuclear spins, [T]: 0.36 mT, Pobell (2007), chapter 10, from
#: memory.
COPPER_INTERNAL_FIELD = 0.36e-3
#: Molar mass of copper, [kg/mol]: 63.546 g/mol, IUPAC standard atomic weight, from memory
#: (the material file materials/copper.toml carries the same value).
COPPER_MOLAR_MASS = 63.546e-3


@lru_cache(maxsize=1)
def _constants() -> SimpleNamespace:
    from scipy import constants as c

    return SimpleNamespace(
        k=c.k,
        N_A=c.N_A,
        mu_0=c.mu_0,
        mu_N=c.physical_constants["nuclear magneton"][0],
        mu_B=c.physical_constants["Bohr magneton"][0],
    )


def _isotopes(isotopes) -> list[tuple[float, float, float]]:
    out = []
    for entry in isotopes:
        abundance, spin, moment = (float(v) for v in entry)
        if not (0 <= abundance <= 1 and spin > 0 and moment != 0):
            raise InputError(
                "isotopes: an entry out of range",
                expected="(abundance in [0, 1], spin > 0, moment in mu_N, not 0)",
                found=repr(entry),
            )
        out.append((abundance, spin, moment))
    return out


def nuclear_heat_capacity_coefficient(isotopes=COPPER_ISOTOPES):
    """High-temperature coefficient A of C_n = A B_eff^2 / T^2, summed over the isotopes.

    .. math:: A = \\sum_i x_i \\frac{N_A \\mu_i^2 (I_i + 1)}{3 I_i k_B} = \\frac{\\lambda_n}{\\mu_0}

    Parameters
    ----------
    isotopes : sequence of (float, float, float)
        (abundance, spin I, magnetic moment in nuclear magnetons) of each isotope.

    Returns
    -------
    float
        A, [J K/(T^2 mol)].

    References
    ----------
    .. [1] Pobell (2007), section 3.1.4.

    Examples
    --------
    >>> round(nuclear_heat_capacity_coefficient() * 1e6, 2)   # copper, uJ K/(T^2 mol)
    3.19
    """
    c = _constants()
    total = 0.0
    for x, spin, moment in _isotopes(isotopes):
        mu = moment * c.mu_N
        total += x * c.N_A * mu**2 * (spin + 1) / (3 * spin * c.k)
    return total


def nuclear_curie_constant(isotopes=COPPER_ISOTOPES):
    """Molar nuclear Curie constant lambda_n = mu0 A of Pobell's form of C_n.

    .. math:: \\lambda_n = \\mu_0 \\sum_i x_i \\frac{N_A \\mu_i^2 (I_i + 1)}{3 I_i k_B}

    Parameters
    ----------
    isotopes : sequence of (float, float, float)
        As in :func:`nuclear_heat_capacity_coefficient`.

    Returns
    -------
    float
        lambda_n, [m^3 K/mol].

    References
    ----------
    .. [1] Pobell (2007), sections 3.1.4 and 10.1.

    Examples
    --------
    >>> round(nuclear_curie_constant() * 1e12, 2)   # copper, 1e-12 m^3 K/mol
    4.01
    """
    return _constants().mu_0 * nuclear_heat_capacity_coefficient(isotopes)


def _fields(field, temperature, internal_field):
    b = np.asarray(field, dtype=float)
    bi = np.asarray(internal_field, dtype=float)
    t = np.asarray(temperature, dtype=float)
    if np.any(np.isnan(b)) or np.any(b < 0) or np.any(bi < 0):
        raise InputError("field: below zero or not a number", expected=">= 0 T", found=repr(field))
    if np.any(np.isnan(t)) or np.any(t < 0):
        raise TemperatureError(f"temperature: {temperature!r} K is below 0 K or not a number")
    return b, t, bi


def nuclear_heat_capacity(
    field, temperature, isotopes=COPPER_ISOTOPES, internal_field=COPPER_INTERNAL_FIELD, exact=False
):
    """Molar nuclear heat capacity of a metal in a field.

    .. math:: C_n = \\frac{\\lambda_n (B^2 + b^2)}{\\mu_0 T^2}

    or, with ``exact=True``, the Brillouin heat capacity of each isotope's 2I+1 levels
    (:func:`cryoplan.physics.paramagnets.heat_capacity` with g = mu / (I muB)).

    Parameters
    ----------
    field : float or ndarray
        Applied field B, [T].
    temperature : float or ndarray
        T, [K]; above 0 for the high-temperature form.
    isotopes : sequence of (float, float, float), optional
        As in :func:`nuclear_heat_capacity_coefficient`; copper's by default.
    internal_field : float, optional
        b, [T]; copper's by default.
    exact : bool, optional
        Use the full Brillouin form instead of the T^-2 tail.

    Returns
    -------
    float or ndarray
        C_n, [J/(K mol of atoms)].

    Notes
    -----
    The tail overstates the exact form by 0.2 % at 100 mK, 1.3 % at 40 mK and 22 % at
    10 mK for copper in 9 T; below a few tens of millikelvin in teslas use ``exact=True``. Electronic (gamma T) and
    lattice terms are the solid's own models and are not included here.

    References
    ----------
    .. [1] Pobell (2007), section 3.1.4.

    Examples
    --------
    >>> round(nuclear_heat_capacity(9.0, 0.01), 3)   # J/(K mol), copper, 9 T, 10 mK
    2.588
    """
    b, t, bi = _fields(field, temperature, internal_field)
    if not exact:
        if np.any(t <= 0):
            raise TemperatureError("temperature: the T^-2 tail needs a temperature above 0 K")
        a = nuclear_heat_capacity_coefficient(isotopes)
        out = a * (b**2 + bi**2) / t**2
        return float(out) if np.ndim(out) == 0 else out
    c = _constants()
    total = 0.0
    for x, spin, moment in _isotopes(isotopes):
        g = abs(moment) * c.mu_N / (spin * c.mu_B)
        total = total + x * np.asarray(paramagnets.heat_capacity(b, t, spin, g, bi))
    return float(total) if np.ndim(total) == 0 else total


def nuclear_entropy(
    field, temperature, isotopes=COPPER_ISOTOPES, internal_field=COPPER_INTERNAL_FIELD
):
    """Molar nuclear spin entropy of a metal in a field (full Brillouin form per isotope).

    .. math:: S_n = \\sum_i x_i S_\\mathrm{Brillouin}(I_i, g_i = \\mu_i / I_i \\mu_B; B_\\mathrm{eff}, T)

    Parameters
    ----------
    field : float or ndarray
        B, [T].
    temperature : float or ndarray
        T, [K].
    isotopes, internal_field
        As in :func:`nuclear_heat_capacity`.

    Returns
    -------
    float or ndarray
        S_n, [J/(K mol of atoms)], up to R ln(2I+1) (R ln 4 for copper).

    Notes
    -----
    In the cryostat's plan the nuclear entropy is constant above a few millikelvin (it
    stays near R ln 4 and does not change with T); only its change with field and its
    heat capacity matter there.

    References
    ----------
    .. [1] Pobell (2007), section 10.1.

    Examples
    --------
    >>> round(nuclear_entropy(0.0, 1.0) / 8.314462618, 4)   # ln 4
    1.3863
    """
    b, t, bi = _fields(field, temperature, internal_field)
    c = _constants()
    total = 0.0
    for x, spin, moment in _isotopes(isotopes):
        g = abs(moment) * c.mu_N / (spin * c.mu_B)
        total = total + x * np.asarray(paramagnets.entropy(b, t, spin, g, bi))
    return float(total) if np.ndim(total) == 0 else total


def copper_nuclear_heat_capacity(field, temperature, exact=True):
    """Nuclear specific heat of copper in a field, per kilogram, for the copper material below 1 K.

    .. math:: c_n = \\frac{C_n}{M_\\mathrm{Cu}}

    Parameters
    ----------
    field : float or ndarray
        B, [T].
    temperature : float or ndarray
        T, [K].
    exact : bool, optional
        The full Brillouin form (default; finite at 0 K) or the T^-2 tail.

    Returns
    -------
    float or ndarray
        c_n, [J/(kg K)].

    References
    ----------
    .. [1] Pobell (2007), section 3.1.4; moments and abundances as in the module.

    Examples
    --------
    >>> round(copper_nuclear_heat_capacity(9.0, 0.01, exact=False), 1)   # J/(kg K)
    40.7
    """
    out = np.asarray(nuclear_heat_capacity(field, temperature, exact=exact)) / COPPER_MOLAR_MASS
    return float(out) if np.ndim(out) == 0 else out


def copper_nuclear_entropy(field, temperature):
    """Nuclear spin entropy of copper in a field, per kilogram.

    .. math:: s_n = \\frac{S_n}{M_\\mathrm{Cu}}

    Parameters
    ----------
    field : float or ndarray
        B, [T].
    temperature : float or ndarray
        T, [K].

    Returns
    -------
    float or ndarray
        s_n, [J/(kg K)].

    References
    ----------
    .. [1] Pobell (2007), section 10.1.

    Examples
    --------
    >>> round(copper_nuclear_entropy(0.0, 1.0), 1)   # R ln 4 / M
    181.4
    """
    out = np.asarray(nuclear_entropy(field, temperature)) / COPPER_MOLAR_MASS
    return float(out) if np.ndim(out) == 0 else out
