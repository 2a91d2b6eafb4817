"""Solid conduction through supports, straps and wires, whole or heat-sunk at intermediate
stages, from conductivity integrals; wire diameters of the American Wire Gauge.
"""

from __future__ import annotations

import math

import numpy as np

from .. import checks
from ..errors import InputError

# solid conduction
# --------------------------------------------------------------------------------------------


def conduction_load(
    conductivity_integral, T_low, T_high, area, length, count=1
) -> float | np.ndarray:
    r"""Heat conducted along uniform supports, from the thermal conductivity integral.

    .. math::

        \dot Q = n \frac{A}{L} \int_{T_\mathrm{low}}^{T_\mathrm{high}} k(T)\, dT

    Parameters
    ----------
    conductivity_integral : callable
        ``conductivity_integral(T_a, T_b)`` -> :math:`\int_{T_a}^{T_b} k\,dT` for
        ``T_a <= T_b``, [W/m] (a material's ``conductivity_integral``).
    T_low, T_high : float or ndarray
        Temperatures of the cold and warm ends, [K].
    area : float or ndarray
        Cross-section of one support, [m^2].
    length : float or ndarray
        Length between the two ends, [m].
    count : float or ndarray, optional
        Number of identical supports, [-].

    Returns
    -------
    float or ndarray
        Heat arriving at the cold end, [W]; negative if ``T_low > T_high``.

    Notes
    -----
    One-dimensional steady conduction in a uniform section, both ends at fixed temperature,
    no radiation from the side. The temperature range is that of the material's data.

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 2.2 and appendix A2.1 (conductivity integrals).

    Examples
    --------
    Constant conductivity 15 W/(m K): 3 rods of 20 mm^2, 250 mm long, from 77 K to 4.2 K.

    >>> k_integral = lambda a, b: 15.0 * (b - a)
    >>> round(conduction_load(k_integral, 4.2, 77.0, 20e-6, 0.25, count=3), 4)
    0.2621
    """
    Tl = checks.temperature(T_low, "T_low")
    Th = checks.temperature(T_high, "T_high")
    A = checks.nonnegative(area, "area", "m^2", key="area")
    L = checks.positive(length, "length", "m", key="length")
    n = checks.nonnegative(count, "count", key="count")
    if Tl.ndim == 0 and Th.ndim == 0:
        if float(Tl) == float(Th):
            integral = 0.0
        elif float(Tl) < float(Th):
            integral = float(conductivity_integral(float(Tl), float(Th)))
        else:
            integral = -float(conductivity_integral(float(Th), float(Tl)))
    else:
        lo, hi = np.minimum(Tl, Th), np.maximum(Tl, Th)
        sign = np.where(Th >= Tl, 1.0, -1.0)
        integral = sign * np.asarray(conductivity_integral(lo, hi), dtype=float)
    return checks.scalar(n * A / L * integral)


def segmented_conduction(
    conductivity_integral, temperatures, lengths, area, count=1
) -> np.ndarray:
    r"""Loads on each stage from a support heat-sunk at intermediate stages.

    A support runs from the warmest node 0 down to the coldest node m and is thermally
    anchored at every node in between. Segment i (from node i to node i+1) carries

    .. math::

        \dot Q_i = n \frac{A_i}{L_i} \int_{T_{i+1}}^{T_i} k\,dT

    and the load on node j (j = 1 ... m) is what arrives from above minus what leaves below:

    .. math::

        \dot Q^{\mathrm{stage}}_j = \dot Q_{j-1} - \dot Q_j \quad (j < m), \qquad
        \dot Q^{\mathrm{stage}}_m = \dot Q_{m-1}

    Parameters
    ----------
    conductivity_integral : callable
        ``conductivity_integral(T_a, T_b)`` for ``T_a <= T_b``, [W/m].
    temperatures : sequence of float
        Node temperatures from warmest to coldest, non-increasing, at least two, [K].
    lengths : sequence of float
        Length of each segment (one fewer than the nodes), [m].
    area : float or sequence of float
        Cross-section, one value or one per segment, [m^2].
    count : float, optional
        Number of identical supports, [-].

    Returns
    -------
    ndarray
        Load on nodes 1 ... m (every node but the warmest), [W]. The sum equals the heat
        drawn from the warmest node. An intermediate load is negative if the segment below
        it draws more heat than the segment above delivers.

    Notes
    -----
    Each anchor is assumed perfect: the support takes the node's temperature there.

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 2.2 (heat sinking).

    Examples
    --------
    A constant conductivity of 10 W/(m K), 1 mm^2, 300 K -> 77 K -> 4.2 K in 0.2 m + 0.2 m:

    >>> k_integral = lambda a, b: 10.0 * (b - a)
    >>> loads = segmented_conduction(k_integral, [300.0, 77.0, 4.2], [0.2, 0.2], 1e-6)
    >>> [round(float(q), 5) for q in loads]
    [0.00751, 0.00364]
    """
    T = checks.temperature(temperatures, "temperatures").ravel()
    L = checks.positive(lengths, "lengths", "m", key="lengths").ravel()
    if T.size < 2:
        raise InputError(
            "a segmented support needs at least two node temperatures",
            key="temperatures",
            expected="two or more temperatures, warmest first",
            found=repr(temperatures),
        )
    if np.any(np.diff(T) > 0.0):
        raise InputError(
            "node temperatures must run from the warmest to the coldest",
            key="temperatures",
            expected="non-increasing temperatures",
            found=repr(temperatures),
        )
    if L.size != T.size - 1:
        raise InputError(
            "one length is needed for each segment between two nodes",
            key="lengths",
            expected=f"{T.size - 1} lengths",
            found=f"{L.size}",
        )
    A = np.broadcast_to(checks.nonnegative(area, "area", "m^2", key="area"), L.shape)
    n = checks.nonnegative(count, "count", key="count")
    segments = np.array(
        [
            conduction_load(conductivity_integral, T[i + 1], T[i], A[i], L[i], n)
            for i in range(L.size)
        ]
    )
    loads = segments.copy()
    loads[:-1] -= segments[1:]
    return loads


def awg_diameter(gauge) -> float | np.ndarray:
    r"""Diameter of a solid round wire of American Wire Gauge ``gauge`` (ASTM B258).

    .. math::

        d = 0.127\ \mathrm{mm} \times 92^{(36 - n)/39}

    Parameters
    ----------
    gauge : int, float, str or ndarray
        Gauge number n, from -3 (0000) to 40; the strings "0", "00", "000", "0000" and
        "1/0" ... "4/0" are also accepted, [-].

    Returns
    -------
    float or ndarray
        Diameter, [m].

    Notes
    -----
    The definition is exact: 36 AWG is 0.0050 in and 0000 AWG is 0.4600 in, with 38 gauges
    in geometric progression between them. Tabulated diameters are these values rounded.

    References
    ----------
    1. ASTM B258, "Standard Specification for Standard Nominal Diameters and Cross-Sectional
       Areas of AWG Sizes of Solid Round Wires Used as Electrical Conductors".

    Examples
    --------
    >>> round(awg_diameter(36) * 1e3, 4)
    0.127
    >>> round(awg_diameter("0000") / 0.0254, 4)
    0.46
    """
    if isinstance(gauge, str):
        text = gauge.strip()
        zeros = {
            "0": 0,
            "00": -1,
            "000": -2,
            "0000": -3,
            "1/0": 0,
            "2/0": -1,
            "3/0": -2,
            "4/0": -3,
        }
        if text in zeros:
            n = np.asarray(float(zeros[text]))
        else:
            try:
                n = np.asarray(float(text))
            except ValueError:
                raise InputError(
                    "not a wire gauge",
                    key="gauge",
                    expected="an AWG number from 0000 to 40",
                    found=repr(gauge),
                ) from None
    else:
        n = np.asarray(gauge, dtype=float)
    if n.size and (not np.all(np.isfinite(n)) or np.any(n < -3) or np.any(n > 40)):
        raise InputError(
            "wire gauge out of range",
            key="gauge",
            expected="an AWG number from 0000 (-3) to 40",
            found=repr(gauge),
        )
    return checks.scalar(0.127e-3 * 92.0 ** ((36.0 - n) / 39.0))


def wire_load(conductivity_integral, T_low, T_high, length, diameter, count=1):
    r"""Heat conducted along round wires, from the conductivity integral.

    .. math::

        \dot Q = n \frac{\pi d^2}{4 L} \int_{T_\mathrm{low}}^{T_\mathrm{high}} k\,dT

    Parameters
    ----------
    conductivity_integral : callable
        ``conductivity_integral(T_a, T_b)`` for ``T_a <= T_b``, [W/m].
    T_low, T_high : float or ndarray
        Temperatures of the cold and warm ends, [K].
    length : float or ndarray
        Wire length between the two ends, [m].
    diameter : float or ndarray
        Conductor diameter, [m] (see :func:`awg_diameter`).
    count : float or ndarray, optional
        Number of wires, [-].

    Returns
    -------
    float or ndarray
        Heat arriving at the cold end, [W].

    Notes
    -----
    Conduction only: the insulation's share is neglected, and so is Joule heat (for wires
    that carry current see the current-lead functions).

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 3.3 (wiring heat leaks).

    Examples
    --------
    Twelve 36 AWG wires with a constant 20 W/(m K), 1 m long, 300 K to 4.2 K:

    >>> k_integral = lambda a, b: 20.0 * (b - a)
    >>> round(wire_load(k_integral, 4.2, 300.0, 1.0, awg_diameter(36), 12) * 1e3, 3)
    0.899
    """
    d = checks.nonnegative(diameter, "diameter", "m", key="diameter")
    return conduction_load(
        conductivity_integral, T_low, T_high, math.pi * d**2 / 4.0, length, count
    )


# --------------------------------------------------------------------------------------------
