"""Cooldown-time integration: the stages' heat balances as an ODE in time, integrated from
the start temperatures to the targets.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from scipy import integrate

from .. import checks
from ..errors import InputError
from .links import Link
from .network import _check_gets_cold, _Network
from .work import reversible_work

SECONDS_PER_DAY = 86400.0


# cooldown-time integration


@dataclass
class CooldownStage:
    """One stage of a cryostat for the cooldown integration.

    Parameters
    ----------
    name : str
        The stage's name (for results and messages).
    heat_capacity : callable
        Total heat capacity of the stage's parts, ``C(T)`` [J/K], vectorised in ``T`` [K]:
        the sum of mass times specific heat of its parts.
    initial_temperature : float
        Temperature at the start, [K] (ambient, or 77 K after a liquid-nitrogen precool).
    target_temperature : float
        Temperature at which the stage counts as cold, [K].
    enthalpy : callable, optional
        Total enthalpy ``H(T)`` [J] of the stage's parts (any zero): used for the
        energy-closure check instead of the integral of ``heat_capacity``.
    entropy : callable, optional
        Total entropy ``S(T)`` [J/K]; with ``enthalpy``, gives the reversible work exactly.

    Examples
    --------
    A cold plate precooled to 77 K, to be cooled to 4.2 K, with a stand-in heat capacity
    C = 4 T J/K (a plan builds ``heat_capacity`` from the material library: the sum of
    mass times ``specific_heat`` of the stage's parts):

    >>> stage = CooldownStage("cold plate", lambda T: 40.0 * 0.1 * T, 77.0, 4.2)
    >>> stage.initial_temperature, stage.target_temperature
    (77.0, 4.2)
    """

    name: str
    heat_capacity: Callable
    initial_temperature: float
    target_temperature: float
    enthalpy: Callable | None = None
    entropy: Callable | None = None


@dataclass
class CooldownResult:
    """The outcome of :func:`simulate_cooldown`. Units: s, K, J.

    Attributes
    ----------
    names : tuple of str
        Stage names, in order.
    t : ndarray, shape (m,)
        Times of the solution, [s].
    temperatures : ndarray, shape (n, m)
        Stage temperatures at those times, [K] (also as ``T``).
    targets : ndarray, shape (n,)
        Target temperatures, [K].
    time_to_target : list of float or None
        Time each stage first reached its target, [s]; None where it did not.
    cooldown_time : float or None
        Time at which every stage had reached its target, [s]; None if one did not.
    not_reached : list of str
        Stages that did not reach their target by the end.
    electrical_energy : float or None
        Electrical energy into the cooler over the run, [J]; None without an input power.
    cooler_heat, load_heat, link_heat : ndarray, shape (n,)
        Integrals over the run of the cooler's capacity, the loads, and the net heat in
        through links, per stage, [J].
    enthalpy_change : ndarray, shape (n,)
        H(end) - H(start) of each stage, [J] (negative on cooling).
    stage_closure_error, closure_error : ndarray, float
        Relative energy-closure error per stage and over all stages:
        ``|∫Q_cooler dt - (-ΔH + ∫Q_load dt + ∫Q_link dt)|`` over the largest of those
        terms (per stage), or over the largest of the summed terms (all stages).
    minimum_work : ndarray or None
        Reversible work to cool each stage's parts from start to end temperature with heat
        rejected at ambient, [J]; None without ``ambient``.
    carnot_work : ndarray or None
        Carnot work of the heat the cooler actually lifted, ``∫Q_cooler (T0/T - 1) dt``,
        per stage, [J]; None without ``ambient``.
    ambient : float or None
        Heat-rejection temperature, [K].
    evaluations : int
        Right-hand-side evaluations used by the integrator.
    """

    names: tuple[str, ...]
    t: np.ndarray
    temperatures: np.ndarray
    targets: np.ndarray
    time_to_target: list
    cooldown_time: float | None
    not_reached: list
    electrical_energy: float | None
    cooler_heat: np.ndarray
    load_heat: np.ndarray
    link_heat: np.ndarray
    enthalpy_change: np.ndarray
    stage_closure_error: np.ndarray
    closure_error: float
    minimum_work: np.ndarray | None
    carnot_work: np.ndarray | None
    ambient: float | None
    evaluations: int = 0
    message: str = ""

    @property
    def T(self) -> np.ndarray:
        """Alias of :attr:`temperatures`, [K], shape (n, m)."""
        return self.temperatures

    def temperatures_at(self, times) -> np.ndarray:
        """Stage temperatures [K] at the given times [s], linear between solution points.

        Returns shape ``(n,) + shape(times)``; times beyond the run take its end values.
        """
        times = np.asarray(times, dtype=float)
        return np.stack([np.interp(times, self.t, row) for row in self.temperatures])

    @property
    def fraction_of_carnot(self) -> float | None:
        """Carnot work of the lifted heat over the electrical energy, [-]."""
        if self.carnot_work is None or not self.electrical_energy:
            return None
        return float(np.sum(self.carnot_work) / self.electrical_energy)


def _tables(stages, lo: float, hi: float, points: int):
    grid = np.geomspace(lo, hi, points)
    C = np.empty((len(stages), points))
    for i, s in enumerate(stages):
        c = np.asarray(s.heat_capacity(grid), dtype=float)
        if c.shape != grid.shape:
            c = np.array([float(s.heat_capacity(float(t))) for t in grid])
        if not np.all(np.isfinite(c)) or np.any(c <= 0.0):
            raise InputError(
                f"stage {s.name!r} has a heat capacity that is not positive between "
                f"{lo:.3g} K and {hi:.3g} K",
                expected="a heat capacity above 0 J/K (does the stage have parts?)",
                found=f"{float(np.nanmin(c)):.3g} J/K",
            )
        C[i] = c
    # H(T) - H(lo): the exact integral of the piecewise-linear table.
    H = np.concatenate(
        [np.zeros((len(stages), 1)), np.cumsum(0.5 * (C[:, 1:] + C[:, :-1]) * np.diff(grid), 1)],
        axis=1,
    )
    return grid, C, H


def simulate_cooldown(
    stages: Sequence[CooldownStage],
    capacity,
    load=None,
    links: Sequence[Link] = (),
    *,
    input_power=None,
    ambient: float | None = None,
    t_max: float = 30.0 * SECONDS_PER_DAY,
    stop_when_cold: bool = True,
    rtol: float = 1.0e-6,
    method: str = "LSODA",
    table_points: int = 600,
) -> CooldownResult:
    """Cooldown time of cryostat stages on a cryocooler: the stages' energy balances integrated.

    .. math::

        C_i(T_i) \\frac{dT_i}{dt} = -Q_{cooler,i}(\\mathbf T) + Q_{load,i}(\\mathbf T)
        + \\sum_j Q_{link,ij}(T_i, T_j)

    integrated with a stiff-capable solver (LSODA, or backward differentiation formulae),
    with an event per stage at its target temperature.

    Parameters
    ----------
    stages : sequence of CooldownStage
        The stages: heat capacity [J/K], start and target temperatures [K].
    capacity : CapacityMap, sequence of CapacityCurve or None, or callable
        The cooler: a two-stage map; one curve per stage (None for a stage it does not
        cool); or ``f(T) -> Q`` [W] of the stage-temperature vector.
    load : callable or sequence of float, optional
        Static heat loads [W]: ``f(T)`` of the stage-temperature vector (shape (n,) or
        (n, k), returning the same shape; a function of (n,) only is called per column), or
        one constant per stage. Default: no load.
    links : sequence of Link, optional
        Thermal links between stages.
    input_power : float or callable, optional
        Electrical input of the cooler, [W]: a constant while it runs, or ``f(T)`` of the
        stage-temperature vector (shape (n,) -> float).
    ambient : float, optional
        Heat-rejection temperature, [K], for the reversible and Carnot work; also the top
        of the "never gets cold" check (default: the highest start temperature).
    t_max : float, optional
        Longest simulated time, [s] (default 30 days).
    stop_when_cold : bool, optional
        Stop once every stage has reached its target (default); otherwise run to ``t_max``.
    rtol : float, optional
        Relative tolerance of the integrator (default 1e-6).
    method : str, optional
        ``"LSODA"`` (default: switches between Adams and BDF formulae as the problem turns
        stiff), ``"BDF"`` or ``"Radau"``: solvers of :func:`scipy.integrate.solve_ivp`.
    table_points : int, optional
        Points of the heat-capacity tables (default 600, log-spaced).

    Returns
    -------
    CooldownResult
        Temperatures against time, time to each target, energies and the closure check.

    Raises
    ------
    CoolingShortfallError
        A stage whose cooler capacity is below its load at every temperature from its
        target up to ambient (checked before integrating, with the other stages at their
        targets); the message says by how much it falls short.
    cryoplan.errors.InputError
        Inconsistent inputs (a capacity map for other than two stages, a link to a stage
        that does not exist, a heat capacity that is not positive).

    Notes
    -----
    Each stage's heat capacity is tabulated once on a log-spaced grid from a quarter of the
    lowest target (or start) temperature to the highest start (or ambient) temperature and
    interpolated linearly; below the grid it is held at the grid's first value (a stage
    far below its target cools more slowly than it would, which changes no time to target).
    The integration goes on physically after a stage reaches its target (it is not held
    there); the time recorded is the first crossing. The cooler's heat, the loads, the link
    heat and the electrical energy are integrated alongside the temperatures, so the
    energy closure measures the integration itself. The problem is stiff at low
    temperature (heat capacities fall as T^3), hence a stiff solver.

    References
    ----------
    1. Shampine, L. F. and Reichelt, M. W., "The MATLAB ODE suite", SIAM J. Sci. Comput.
       18 (1997) 1-22 (the BDF/NDF method of scipy's ``BDF``).
    2. Petzold, L., "Automatic selection of methods for solving stiff and nonstiff systems
       of ordinary differential equations", SIAM J. Sci. Stat. Comput. 4 (1983) 136-148.
    3. Barron, R. F., *Cryogenic Systems*, 2nd ed., Oxford University Press, 1985.

    Examples
    --------
    10 kg with c = 0.1 T J/(kg K) on a constant 10 W from 300 K to 10 K: the time is
    m a (T1^2 - T2^2) / (2 Q) = 4495 s.

    >>> from cryoplan.physics.refrigeration import CapacityCurve
    >>> stage = CooldownStage("cold plate", lambda T: 10 * 0.1 * T, 300.0, 10.0)
    >>> result = simulate_cooldown([stage], [CapacityCurve([[1, 10], [300, 10]])])
    >>> round(result.time_to_target[0])
    4495
    >>> result.closure_error < 1e-4
    True
    """
    stages = list(stages)
    n = len(stages)
    if n == 0:
        raise InputError(
            "a cooldown needs at least one stage", expected="1 stage or more", found="none"
        )
    names = tuple(s.name for s in stages)
    T_start = np.array(
        [
            float(checks.temperature(s.initial_temperature, f"start temperature of {s.name!r}"))
            for s in stages
        ]
    )
    targets = np.array(
        [float(checks.temperature(s.target_temperature, f"target of {s.name!r}")) for s in stages]
    )
    if ambient is not None:
        ambient = float(checks.temperature(ambient, "ambient"))
    if not (t_max > 0.0 and math.isfinite(t_max)):
        raise InputError(
            "t_max must be a time above 0", expected="seconds above 0", found=checks.short(t_max)
        )

    lo = 0.25 * float(min(targets.min(), T_start.min()))
    hi = float(max(T_start.max(), ambient or 0.0))
    hi = max(hi, 1.001 * float(targets.max()))
    grid, Ctab, Htab = _tables(stages, lo, hi, table_points)
    net = _Network(n, names, capacity, load, links, grid, probe=T_start.copy())
    _check_gets_cold(net, names, targets, np.full(n, hi), targets)

    if input_power is None:
        power_const, power_func = None, None
    elif callable(input_power):
        power_const, power_func = None, input_power
        float(power_func(T_start))  # fails early on a bad function
    else:
        power_const = float(checks.nonnegative(input_power, "the cooler's input power", "W"))
        power_func = None
    T0 = ambient

    # state: T (n) | cooler heat (n) | load heat (n) | link heat (n) | Carnot work (n) | E_el
    nT = n
    S = 5 * n + 1
    floor = grid[0] * 1e-3

    def rhs(t, y):
        T = np.maximum(y[:nT], floor)
        C = np.empty_like(T)
        for i in range(n):
            C[i] = np.interp(T[i], grid, Ctab[i])
        qc = net.capacity(T)
        ql = net.load(T)
        qk = net.link_heat(T)
        dT = (ql + qk - qc) / C
        if T0 is not None:
            wc = qc * np.maximum(T0 / T - 1.0, 0.0)
        else:
            wc = np.zeros_like(qc)
        if power_func is not None:
            pe = np.array([[float(power_func(T[:, c])) for c in range(T.shape[1])]])
        else:
            pe = np.zeros((1, T.shape[1]))
        return np.concatenate([dT, qc, ql, qk, wc, pe], axis=0)

    y0 = np.concatenate([T_start, np.zeros(S - n)])
    energy_scale = float(np.max(np.interp(T_start, grid, Htab.max(axis=0)))) + 1.0
    atol = np.concatenate(
        [np.full(n, 1e-6 * float(targets.min())), np.full(S - n, 1e-9 * energy_scale)]
    )

    time_to_target: list = [None] * n
    for i in range(n):
        if T_start[i] <= targets[i]:
            time_to_target[i] = 0.0

    ts = [np.array([0.0])]
    ys = [y0[:, None]]
    t_now, y_now = 0.0, y0
    evaluations = 0
    message = ""
    while True:
        pending = [i for i in range(n) if time_to_target[i] is None]
        if stop_when_cold and not pending:
            message = "every stage reached its target"
            break
        if t_now >= t_max:
            message = "reached t_max"
            break
        events = []
        for i in pending:

            def ev(t, y, i=i):
                return y[i] - targets[i]

            ev.terminal = True
            ev.direction = -1.0
            events.append(ev)
        sol = integrate.solve_ivp(
            rhs,
            (t_now, t_max),
            y_now,
            method=method,
            rtol=rtol,
            atol=atol,
            vectorized=True,
            events=events or None,
        )
        evaluations += int(sol.nfev)
        if sol.status < 0:
            raise InputError(
                "the cooldown integration failed",
                expected="an integrable cooldown",
                found=sol.message,
            )
        ts.append(sol.t[1:])
        ys.append(sol.y[:, 1:])
        t_now, y_now = float(sol.t[-1]), sol.y[:, -1].copy()
        if sol.status == 1:
            for k, i in enumerate(pending):
                if len(sol.t_events[k]) and time_to_target[i] is None:
                    time_to_target[i] = float(sol.t_events[k][0])
        else:
            message = "reached t_max"
            break

    t = np.concatenate(ts)
    Y = np.concatenate(ys, axis=1)
    temps = Y[:n]
    y_end = Y[:, -1]
    Ec, El, Ek, Wc = (y_end[n * (k + 1) : n * (k + 2)] for k in range(4))
    t_end = float(t[-1])

    T_end = temps[:, -1]
    dH = np.empty(n)
    for i, s in enumerate(stages):
        if s.enthalpy is not None:
            dH[i] = float(s.enthalpy(T_end[i])) - float(s.enthalpy(T_start[i]))
        else:
            dH[i] = float(
                np.interp(T_end[i], grid, Htab[i]) - np.interp(T_start[i], grid, Htab[i])
            )
    # ∫Q_cooler dt = -ΔH + ∫Q_load dt + ∫Q_link dt
    # relative to the largest term of each balance (a stage without a cooler has Ec = 0)
    rhs_side = -dH + El + Ek
    terms = np.stack([np.abs(Ec), np.abs(dH), np.abs(El), np.abs(Ek)])
    stage_closure = np.abs(Ec - rhs_side) / np.maximum(terms.max(axis=0), 1e-300)
    total_closure = float(
        abs(Ec.sum() - rhs_side.sum()) / max(abs(Ec.sum()), abs(dH.sum()), abs(El.sum()), 1e-300)
    )

    if power_func is not None:
        electrical = float(y_end[-1])
    elif power_const is not None:
        electrical = power_const * t_end
    else:
        electrical = None

    minimum = carnot = None
    if T0 is not None:
        carnot = Wc.copy()
        minimum = np.empty(n)
        for i, s in enumerate(stages):
            a, b = float(T_end[i]), float(T_start[i])
            if s.enthalpy is not None and s.entropy is not None:
                minimum[i] = reversible_work(s.enthalpy, s.entropy, b, a, T0)
            else:
                fine = np.geomspace(min(a, b), max(a, b), 2001)
                c = np.interp(fine, grid, Ctab[i])
                w = np.trapezoid(c * (T0 / fine - 1.0), fine)
                minimum[i] = w if b >= a else -w

    reached = [x for x in time_to_target if x is not None]
    cooldown_time = max(reached) if len(reached) == n else None
    return CooldownResult(
        names=names,
        t=t,
        temperatures=temps,
        targets=targets,
        time_to_target=time_to_target,
        cooldown_time=cooldown_time,
        not_reached=[names[i] for i in range(n) if time_to_target[i] is None],
        electrical_energy=electrical,
        cooler_heat=Ec.copy(),
        load_heat=El.copy(),
        link_heat=Ek.copy(),
        enthalpy_change=dH,
        stage_closure_error=stage_closure,
        closure_error=total_closure,
        minimum_work=minimum,
        carnot_work=carnot,
        ambient=T0,
        evaluations=evaluations,
        message=message,
    )


# --------------------------------------------------------------------------------------
