"""Reversible (minimum) work to cool a mass from ambient, from its enthalpy and entropy or
its heat capacity.
"""

from __future__ import annotations

import numpy as np
from scipy import integrate

from .. import checks

# --------------------------------------------------------------------------------------
# reversible work of a cooldown


def reversible_work(enthalpy, entropy, T_start, T_end, T_ambient):
    """Reversible (minimum) work to cool a body, from its enthalpy and entropy: the exergy change.

    .. math::

        W = T_0 [S(T_1) - S(T_2)] - [H(T_1) - H(T_2)]

    Parameters
    ----------
    enthalpy : callable
        ``H(T)`` of the body, [J] (total; any zero).
    entropy : callable
        ``S(T)`` of the body, [J/K].
    T_start, T_end : float or ndarray
        Start and end temperatures, [K].
    T_ambient : float
        Heat-rejection temperature, [K].

    Returns
    -------
    float or ndarray
        Minimum work, [J].

    Notes
    -----
    For a body cooled below ambient; the cooler's heat is rejected at ``T_ambient``.

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985, chapter 5.

    Examples
    --------
    A constant heat capacity of 1 J/K from 300 K to 150 K with T0 = 300 K:
    W = 300 ln 2 - 150 = 57.94 J.

    >>> round(reversible_work(lambda T: T, np.log, 300.0, 150.0, 300.0), 2)
    57.94
    """
    T1 = checks.temperature(T_start, "T_start")
    T2 = checks.temperature(T_end, "T_end")
    T0 = checks.temperature(T_ambient, "T_ambient")
    dS = np.asarray(entropy(T1), dtype=float) - np.asarray(entropy(T2), dtype=float)
    dH = np.asarray(enthalpy(T1), dtype=float) - np.asarray(enthalpy(T2), dtype=float)
    return checks.scalar(T0 * dS - dH)


def reversible_work_from_heat_capacity(heat_capacity, T_start, T_end, T_ambient):
    """Reversible (minimum) work to cool a body from its heat capacity alone.

    .. math::

        W = \\int_{T_2}^{T_1} C(T) \\left( \\frac{T_0}{T} - 1 \\right) dT

    Parameters
    ----------
    heat_capacity : callable
        ``C(T)`` of the body, [J/K].
    T_start, T_end : float
        Start and end temperatures, [K].
    T_ambient : float
        Heat-rejection temperature, [K].

    Returns
    -------
    float
        Minimum work, [J].

    Notes
    -----
    The same quantity as :func:`reversible_work`; integrated by adaptive quadrature
    (scipy ``quad``) with a relative tolerance of 1e-10.

    References
    ----------
    1. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985, chapter 5.

    Examples
    --------
    >>> round(reversible_work_from_heat_capacity(lambda T: 1.0, 300.0, 150.0, 300.0), 2)
    57.94
    """
    T1 = float(checks.temperature(T_start, "T_start"))
    T2 = float(checks.temperature(T_end, "T_end"))
    T0 = float(checks.temperature(T_ambient, "T_ambient"))

    def integrand(T: float) -> float:
        return float(np.asarray(heat_capacity(T), dtype=float)) * (T0 / T - 1.0)

    value, _ = integrate.quad(integrand, T2, T1, epsrel=1e-10, limit=200)
    return float(value)
