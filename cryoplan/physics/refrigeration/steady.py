"""Steady state under load: the temperature at which each stage's capacity meets its load
and the heat carried by the links.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from scipy import optimize

from .. import checks
from ..errors import InputError
from .links import Link
from .network import _check_gets_cold, _Network

# steady state


@dataclass
class SteadyStateResult:
    """The outcome of :func:`steady_state`. Units: K, W.

    Attributes
    ----------
    names : tuple of str
        Stage names.
    temperatures : ndarray, shape (n,)
        Steady temperatures, where each stage's capacity meets its load, [K].
    capacity, load : ndarray, shape (n,)
        Cooler capacity and load (static load plus heat in through links) there, [W].
    targets : ndarray, shape (n,)
        Target temperatures, [K].
    capacity_at_target, load_at_target : ndarray, shape (n,)
        Capacity and load with every stage at its target, [W].
    over_capacity : ndarray of bool, shape (n,)
        True where the load exceeds the capacity at the target: the stage sits above it.
    margin_at_target : ndarray, shape (n,)
        ``capacity_at_target - load_at_target``, [W].
    converged : bool
        Whether the coupled solution met its tolerance.
    """

    names: tuple[str, ...]
    temperatures: np.ndarray
    capacity: np.ndarray
    load: np.ndarray
    targets: np.ndarray
    capacity_at_target: np.ndarray
    load_at_target: np.ndarray
    over_capacity: np.ndarray
    margin_at_target: np.ndarray
    converged: bool


def _highest_balance(f: Callable[[np.ndarray], np.ndarray], lo: float, hi: float) -> float:
    """The highest temperature in [lo, hi] below which the net cooling ``f`` is not positive.

    A stage cooling from ``hi`` stops there. Scan on a log grid, then bisect on the sign.
    """
    scan = np.geomspace(lo, hi, 801)
    g = f(scan)
    bad = np.nonzero(g <= 0.0)[0]
    if bad.size == 0:
        return lo
    k = int(bad[-1])
    if k == scan.size - 1:
        return hi
    a, b = scan[k], scan[k + 1]  # f(a) <= 0 < f(b)
    for _ in range(60):
        m = 0.5 * (a + b)
        if float(f(np.array([m]))[0]) > 0.0:
            b = m
        else:
            a = m
        if b - a <= 1e-12 * b:
            break
    return 0.5 * (a + b)


def steady_state(
    capacity,
    load=None,
    links: Sequence[Link] = (),
    *,
    targets,
    ambient: float,
    names: Sequence[str] | None = None,
    lowest: float | None = None,
) -> SteadyStateResult:
    """Steady stage temperatures under load: where each stage's cooler capacity meets its load.

    .. math::

        Q_{cooler,i}(\\mathbf T) = Q_{load,i}(\\mathbf T) + \\sum_j Q_{link,ij}(T_i, T_j)

    solved stage by stage (the highest balance below ambient, which a stage cooling from
    ambient stops at), repeated until the stages agree, then polished by a Newton-type
    root finder on the coupled system.

    Parameters
    ----------
    capacity : CapacityMap, sequence of CapacityCurve or None, or callable
        The cooler, as in :func:`simulate_cooldown`.
    load : callable or sequence of float, optional
        Static loads [W], as in :func:`simulate_cooldown`.
    links : sequence of Link, optional
        Thermal links between stages.
    targets : sequence of float
        Target temperature of each stage, [K].
    ambient : float
        Ambient temperature, [K]: the top of the search.
    names : sequence of str, optional
        Stage names (default ``stage 1``, ``stage 2``, ...).
    lowest : float, optional
        Bottom of the search, [K] (default a tenth of the lowest target). A stage whose
        capacity exceeds its load all the way down is reported there.

    Returns
    -------
    SteadyStateResult
        Temperatures, capacities and loads there, and a flag per stage whose load exceeds
        its capacity at its target.

    Raises
    ------
    CoolingShortfallError
        A stage whose capacity is below its load at every temperature from its target up to
        ambient (other stages at their targets); the message says by how much.

    Notes
    -----
    Where capacity and load cross more than once, the highest crossing below ambient is
    taken: a stage cooling down from ambient stops at the first balance it meets.

    References
    ----------
    1. Powell, M. J. D., "A hybrid method for nonlinear equations", in *Numerical Methods
       for Nonlinear Algebraic Equations*, ed. Rabinowitz, Gordon and Breach, 1970
       (scipy's ``hybr``).

    Examples
    --------
    A capacity of 0.6 W/K above 2.5 K against a constant 1 W: 2.5 + 1/0.6 = 4.1667 K.

    >>> from cryoplan.physics.refrigeration import CapacityCurve
    >>> curve = CapacityCurve([[2.5, 0.0], [12.5, 6.0]])
    >>> result = steady_state([curve], [1.0], targets=[4.2], ambient=300.0)
    >>> round(float(result.temperatures[0]), 4), bool(result.over_capacity[0])
    (4.1667, False)
    """
    targets = np.array([float(x) for x in np.atleast_1d(np.asarray(targets, dtype=float))])
    checks.temperature(targets, "a target temperature")
    n = targets.size
    names = tuple(names) if names is not None else tuple(f"stage {i + 1}" for i in range(n))
    if len(names) != n:
        raise InputError("one name per stage", expected=f"{n} names", found=f"{len(names)}")
    ambient = float(checks.temperature(ambient, "ambient"))
    lo = float(lowest) if lowest is not None else 0.1 * float(targets.min())
    checks.temperature(lo, "lowest")
    hi = ambient
    grid = np.geomspace(lo, hi, 800)
    net = _Network(n, names, capacity, load, links, grid, probe=targets.copy())
    _check_gets_cold(net, names, targets, np.full(n, hi), targets)

    def residual(T: np.ndarray) -> np.ndarray:
        return net.net_cooling(T)

    def balanced(T: np.ndarray) -> bool:
        """Capacity meets load at every stage not pinned at an end of the search."""
        inside = (T > lo * (1 + 1e-9)) & (T < hi * (1 - 1e-9))
        scale = np.abs(net.capacity(T)) + np.abs(net.load(T)) + np.abs(net.link_heat(T))
        return bool(np.all(np.abs(residual(T))[inside] <= 1e-7 * scale[inside] + 1e-12))

    # stage by stage (Gauss-Seidel), each at its highest balance with the others fixed
    T = targets.copy()
    settled = False
    for _sweep in range(100):
        previous = T.copy()
        for i in range(n):

            def f(x, i=i, T=T):
                M = np.repeat(T[:, None], x.size, axis=1)
                M[i] = x
                return net.net_cooling(M)[i]

            T[i] = _highest_balance(f, lo, hi)
        if np.all(np.abs(T - previous) <= 1e-10 * T):
            settled = True
            break
    converged = settled and balanced(T)
    if not converged and n > 1:
        # strongly coupled stages settle slowly stage by stage: finish with Powell's method
        sol = optimize.root(residual, T, method="hybr")
        if sol.success and np.all(sol.x > lo) and np.all(sol.x < hi) and balanced(sol.x):
            T, converged = sol.x, True

    cap_t = net.capacity(targets)
    load_t = net.load(targets) + net.link_heat(targets)
    return SteadyStateResult(
        names=names,
        temperatures=T,
        capacity=net.capacity(T),
        load=net.load(T) + net.link_heat(T),
        targets=targets,
        capacity_at_target=cap_t,
        load_at_target=load_t,
        over_capacity=load_t > cap_t,
        margin_at_target=cap_t - load_t,
        converged=converged,
    )
