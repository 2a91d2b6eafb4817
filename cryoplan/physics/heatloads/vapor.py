"""Vapour-cooled current leads and necks: a conductor cooled by its own bath's boil-off
gas in counterflow, solved by shooting on the coupled heat balances.
"""

from __future__ import annotations

import math

import numpy as np

from .. import checks
from ..errors import TemperatureError
from ._common import _as_function, _gauss, brentq, solve_ivp
from .leads import _check_lead

#: Minimum heat into a 4.2 K bath of a vapour-cooled current lead of optimum shape, with
#: perfect heat exchange to its own boil-off helium, warm end at room temperature, [W/A]:
#: about 1.04 mW/A per lead, nearly independent of the metal (Lock, Cryogenics 9, 438, 1969;
#: Wilson, "Superconducting Magnets", 1983, ch. 11; from memory).
VAPOR_COOLED_LEAD_HEAT_PER_AMPERE: float = 1.04e-3


class _FastScalar:
    """A vectorised property f(T) tabulated once on [T_lo, T_hi] for fast scalar calls.

    Cubic Hermite interpolation in ln T on 2048 intervals, slopes from central differences
    (relative error about 1e-8 for smooth data); outside the table f itself is called.
    The shooting integrators call their right-hand side tens of thousands of times, where
    the per-call overhead of a material or fluid object would dominate.
    """

    def __init__(self, f, T_lo: float, T_hi: float, n: int = 2048):
        self.f, self.T_lo, self.T_hi = f, T_lo, T_hi
        self.x0 = math.log(T_lo)
        self.dx = (math.log(T_hi) - self.x0) / n
        self.n = n
        T = np.exp(self.x0 + self.dx * np.arange(-1, n + 2))
        T[1], T[-2] = T_lo, T_hi  # the end nodes exactly on the range
        v = np.asarray(f(T[1:-1]), dtype=float)
        # one node beyond each end by linear extension, for the end slopes
        v = np.concatenate([[2 * v[0] - v[1]], v, [2 * v[-1] - v[-2]]])
        self.v = v[1:-1].tolist()
        self.m = (0.5 * (v[2:] - v[:-2])).tolist()

    def __call__(self, T: float) -> float:
        if not (self.T_lo <= T <= self.T_hi):
            return float(self.f(np.asarray(T)))
        u = (math.log(T) - self.x0) / self.dx
        i = min(int(u), self.n - 1)
        t = u - i
        t2, t3 = t * t, t * t * t
        return (
            (2 * t3 - 3 * t2 + 1) * self.v[i]
            + (t3 - 2 * t2 + t) * self.m[i]
            + (-2 * t3 + 3 * t2) * self.v[i + 1]
            + (t3 - t2) * self.m[i + 1]
        )


class _VaporLead:
    """Shooting on the counterflow-cooled lead, in eta = I x / A and s = q / I (volts).

    State (T, R): dT/deta = s / k(T), dR/deta = L0 T / k(T), with
    s = s0 (1 + [dh(T) - dh(T_c)] / latent) - R (the gas takes up s0 / latent kg/s per ampere).
    """

    def __init__(self, k, dh, Tl, Th, latent, L0):
        self.k, self.dh = _FastScalar(k, Tl, Th), _FastScalar(dh, Tl, Th)
        self.Tl, self.Th, self.latent, self.L0 = Tl, Th, latent, L0
        self.dh0 = self.dh(Tl)

    def _s(self, s0, T, R, clamp=math.inf):
        h = self.dh(min(max(T, self.Tl), clamp))
        return s0 * (1.0 + (h - self.dh0) / self.latent) - R

    def _rhs(self, s0, clamp=math.inf):
        # Properties are taken within [T_c, clamp]. The integrator's trial stages may step a
        # little below T_c, and on the way up to the first crossing of T_h (clamp = T_h)
        # beyond T_h; the solution between T_c and T_h does not depend on what happens
        # outside, so properties need not be known there.
        def rhs(eta, y):
            T = max(y[0], 1e-3)
            kT = self.k(min(max(T, self.Tl), clamp))
            return [self._s(s0, T, y[1], clamp) / kT, self.L0 * T / kT]

        return rhs

    def climb(self, s0, stop_at_hot=True, T_cap=math.inf):
        """From the cold end up to the first crossing of T_h, or to the temperature peak.

        Events: 0 the crossing (if ``stop_at_hot``), 1 the peak (s = 0), 2 the cap.
        """

        def hot(eta, y):
            return y[0] - self.Th

        clamp = self.Th if stop_at_hot else math.inf

        def peak(eta, y):
            return self._s(s0, y[0], y[1], clamp)

        def cap(eta, y):
            return y[0] - T_cap

        hot.terminal, hot.direction = stop_at_hot, 1.0
        peak.terminal, peak.direction = True, -1.0
        cap.terminal = True
        return solve_ivp(
            self._rhs(s0, clamp),
            (0.0, 1e30),
            [self.Tl, 0.0],
            method="DOP853",
            rtol=1e-8,
            atol=[1e-9 * self.Th, 1e-14],
            events=[hot, peak, cap],
            dense_output=True,
        )

    def _crossing(self, sol):
        """eta where T first reaches T_h on the climb (None if it peaks below T_h)."""
        if sol.t_events[0].size:
            return float(sol.t_events[0][0]), float(sol.y_events[0][0][1])
        eta_p, T_p = float(sol.t_events[1][0]), float(sol.y_events[1][0][0])
        if T_p <= self.Th:
            return None
        # T rose through T_h and peaked within one step: find the crossing on the
        # interpolant (T increases monotonically up to the peak)
        eta = brentq(lambda e: sol.sol(e)[0] - self.Th, 0.0, eta_p, rtol=1e-12)
        return eta, float(sol.sol(eta)[1])

    def tangency(self, s0):
        """> 0 if a lead with cold-end heat s0 reaches T_h still conducting downward."""
        sol = self.climb(s0)
        hit = self._crossing(sol)
        if hit is not None:
            s_hot = max(self._s(s0, self.Th, hit[1]), 0.0)
            peak_excess = float(sol.y_events[1][0][0]) - self.Th if sol.t_events[1].size else 0.0
            return s_hot**2 / (2.0 * self.L0 * self.Th) + peak_excess
        return -(self.Th - float(sol.y_events[1][0][0]))

    def optimum(self):
        s_cc = math.sqrt(self.L0 * (self.Th**2 - self.Tl**2))
        hi = s_cc
        while self.tangency(hi) <= 0.0:
            hi *= 2.0
        lo = 1e-4 * s_cc
        s_star = brentq(self.tangency, lo, hi, xtol=1e-12 * s_cc, rtol=1e-11)
        return s_star, self.eta_first(s_star)

    def eta_first(self, s0):
        sol = self.climb(s0)
        hit = self._crossing(sol)
        return hit[0] if hit is not None else float(sol.t_events[1][0])

    def eta_second(self, s0, T_cap):
        """eta where T, having peaked above T_h, returns to T_h; OverflowError above T_cap."""
        sol = self.climb(s0, stop_at_hot=False, T_cap=T_cap)
        if sol.t_events[2].size:
            raise OverflowError
        eta_p = float(sol.t_events[1][0])
        T_p, R_p = (float(v) for v in sol.y_events[1][0])
        if T_p <= self.Th:
            return eta_p, T_p

        def back(eta, y):
            return y[0] - self.Th

        back.terminal, back.direction = True, -1.0
        down = solve_ivp(
            self._rhs(s0),
            (eta_p, 1e30),
            [T_p, R_p],
            method="DOP853",
            rtol=1e-8,
            atol=[1e-9 * self.Th, 1e-14],
            events=[back],
            first_step=1e-6 * eta_p,
        )
        return float(down.t_events[0][0]), T_p


def _vapor_inputs(conductivity, vapor_enthalpy, T_low, latent_heat):
    k = _as_function(conductivity, "conductivity")
    latent = float(checks.positive(latent_heat, "latent_heat", "J/kg", key="latent_heat"))
    if callable(vapor_enthalpy):
        dh = _as_function(vapor_enthalpy, "vapor_enthalpy")
    else:
        cp = float(
            checks.positive(vapor_enthalpy, "vapor_enthalpy", "J/(kg K)", key="vapor_enthalpy")
        )
        Tl = float(T_low)
        dh = lambda T: cp * (np.asarray(T, dtype=float) - Tl)  # noqa: E731
    return k, dh, latent


def vapor_cooled_lead_optimum(
    current,
    T_low,
    T_high,
    latent_heat,
    vapor_enthalpy,
    conductivity=None,
    lorenz=2.45e-8,
) -> tuple[float, float]:
    r"""Minimum cold-end heat of a current lead cooled by its own boil-off, and its shape.

    Counterflow-cooled lead with perfect heat exchange (the gas at the lead's temperature
    everywhere), fed by the boil-off of its own cold-end heat, :math:`\dot m = \dot Q_0 /
    h_{fg}`, Wiedemann-Franz resistivity :math:`\rho = L_0 T/k`. With :math:`q` the heat
    conducted toward the cold end and :math:`\Delta h(T)` the vapour enthalpy above the
    saturated vapour:

    .. math::

        q(x) = \dot Q_0 + \dot m\, \Delta h(T) - \frac{I^2}{A}\int_0^x \rho\, dx',
        \qquad kA \frac{dT}{dx} = q

    The optimum shape makes :math:`q = 0` just at the warm end; :math:`\dot Q_0 / I` at the
    optimum depends only on :math:`L_0`, the end temperatures and the gas (Lock 1969), found
    here by shooting. :data:`VAPOR_COOLED_LEAD_HEAT_PER_AMPERE` is the published figure.

    Parameters
    ----------
    current : float
        Current, [A].
    T_low, T_high : float
        Bath and warm-end temperatures, [K].
    latent_heat : float
        Latent heat of the bath liquid, [J/kg].
    vapor_enthalpy : callable or float
        :math:`\Delta h(T) = h(T) - h_\mathrm{sat.vap.}` of the gas at the bath pressure,
        vectorised, [J/kg]; a float is a constant gas specific heat c_p, [J/(kg K)].
    conductivity : callable or float, optional
        k(T) of the lead metal, [W/(m K)], for the shape factor; NaN without it.
    lorenz : float, optional
        Lorenz number, [W Ohm/K^2].

    Returns
    -------
    heat : float
        Minimum heat into the bath, per lead, [W].
    shape_factor : float
        Optimum :math:`L/A`, [1/m].

    Notes
    -----
    Steady state, one dimension, perfect heat exchange, all of the lead's own boil-off and
    no more passing along it. About 1.04 mW/A for helium from 4.2 K to room temperature,
    some 40-45 times less than without the gas (47 W/kA). If the gas flow stops (a closed valve, a blocked
    passage) the lead overheats within seconds to minutes and can burn out; a closed
    cryostat also builds up pressure. Protection and relief follow local codes, the site's
    safety office and licensed practice.

    References
    ----------
    1. Lock, J. M., "Optimization of current leads into a cryostat", Cryogenics 9, 438
       (1969).
    2. Wilson, M. N., "Superconducting Magnets", Oxford University Press, 1983, ch. 11.
    3. Efferson, K. R., "Helium vapor cooled current leads", Rev. Sci. Instrum. 38, 1776
       (1967).

    Examples
    --------
    Helium with a constant c_p of 5193 J/(kg K) and a latent heat of 20.7 kJ/kg:

    >>> heat, shape = vapor_cooled_lead_optimum(1000.0, 4.2, 300.0, 20.7e3, 5193.0)
    >>> round(heat, 2)
    1.12
    """
    amps, Tl, Th, L0 = _check_lead(current, T_low, T_high, lorenz)
    k, dh, latent = _vapor_inputs(
        1.0 if conductivity is None else conductivity, vapor_enthalpy, Tl, latent_heat
    )
    s_star, eta = _VaporLead(k, dh, Tl, Th, latent, L0).optimum()
    if amps == 0.0:
        return 0.0, math.inf if conductivity is not None else math.nan
    return amps * s_star, (eta / amps if conductivity is not None else math.nan)


def vapor_cooled_lead_load(
    current,
    length,
    area,
    conductivity,
    T_low,
    T_high,
    latent_heat,
    vapor_enthalpy,
    lorenz=2.45e-8,
) -> float:
    r"""Heat into the bath from a vapour-cooled current lead of given shape (Lock's model).

    The model of :func:`vapor_cooled_lead_optimum` at a given current and shape:

    .. math::

        kA\frac{dT}{dx} = \dot Q_0 \left(1 + \frac{\Delta h(T)}{h_{fg}}\right)
            - \frac{I^2}{A}\int_0^x \frac{L_0 T}{k}\, dx',
        \qquad T(0) = T_c,\; T(L) = T_h

    solved for :math:`\dot Q_0` by shooting (scipy ``solve_ivp`` and ``brentq``). Where
    :math:`L/A` exceeds the optimum for the current, the temperature peaks above the warm
    end and the second return to :math:`T_h` is used.

    Parameters
    ----------
    current : float
        Current, [A]; zero gives the gas-cooled neck (:func:`vapor_cooled_neck_load`).
    length : float
        Lead length, [m].
    area : float
        Cross-section, [m^2].
    conductivity : callable or float
        k(T) of the lead metal, vectorised, [W/(m K)].
    T_low, T_high : float
        Bath and warm-end temperatures, [K].
    latent_heat : float
        Latent heat of the bath liquid, [J/kg].
    vapor_enthalpy : callable or float
        :math:`\Delta h(T)`, [J/kg], or a constant c_p, [J/(kg K)].
    lorenz : float, optional
        Lorenz number, [W Ohm/K^2].

    Returns
    -------
    float
        Heat into the bath, per lead, [W].

    Raises
    ------
    TemperatureError
        If the lead overheats beyond its data or beyond five times T_high.

    Notes
    -----
    Assumptions and cautions as :func:`vapor_cooled_lead_optimum`.

    References
    ----------
    1. Lock, J. M., Cryogenics 9, 438 (1969).
    2. Wilson, M. N., "Superconducting Magnets", Oxford University Press, 1983, ch. 11.

    Examples
    --------
    >>> q = vapor_cooled_lead_load(100.0, 0.5, 1.5e-5, 400.0, 4.2, 300.0, 20.7e3, 5193.0)
    >>> round(q, 3)
    0.221
    """
    amps, Tl, Th, L0 = _check_lead(current, T_low, T_high, lorenz)
    L = float(checks.positive(length, "length", "m", key="length"))
    A = float(checks.positive(area, "area", "m^2", key="area"))
    if amps == 0.0:
        return vapor_cooled_neck_load(conductivity, A, L, Tl, Th, latent_heat, vapor_enthalpy)
    k, dh, latent = _vapor_inputs(conductivity, vapor_enthalpy, Tl, latent_heat)
    model = _VaporLead(k, dh, Tl, Th, latent, L0)
    s_star, eta_opt = model.optimum()
    beta = amps * L / A
    if beta <= eta_opt:
        if model.eta_first(s_star) <= beta:
            return amps * s_star
        hi = 2.0 * s_star
        while model.eta_first(hi) > beta:
            hi *= 2.0
        s0 = brentq(lambda s: model.eta_first(s) - beta, s_star, hi, xtol=1e-12 * hi, rtol=1e-10)
        return amps * s0

    T_cap = 5.0 * Th

    def overheated(detail: str) -> TemperatureError:
        return TemperatureError(
            f"the vapour-cooled lead overheats: at {amps:g} A its L/A of {L / A:.4g} /m is above "
            f"the optimum {eta_opt / amps:.4g} /m and its temperature peaks {detail}; lower the "
            "current or shorten the lead"
        )

    def excess(s):
        # eta at the return to T_h grows with s0 and so does the peak temperature; a peak
        # beyond T_cap counts as "too long" so that the bracket closes on the cap.
        try:
            return model.eta_second(s, T_cap)[0] - beta
        except OverflowError:
            return math.inf
        except Exception as exc:
            raise overheated(
                f"above the warm end ({Th:g} K), where the properties are not known ({exc})"
            ) from None

    if excess(s_star) >= 0.0:  # at the optimum to within the shooting tolerance
        return amps * s_star
    step = 1e-6 * s_star
    while excess(s_star + step) < 0.0:
        step *= 2.0
    hi = s_star + step
    s0 = brentq(lambda s: min(excess(s), 1.0e300), s_star, hi, xtol=1e-13 * hi, rtol=1e-12)
    if not abs(excess(s0)) <= 1e-6 * beta:
        raise overheated(f"above {T_cap:g} K")
    return amps * s0


def vapor_cooled_neck_load(
    conductivity,
    area,
    length,
    T_low,
    T_high,
    latent_heat,
    vapor_enthalpy,
    other_load=0.0,
) -> float:
    r"""Heat into the bath along a neck or support cooled by the rising boil-off gas.

    Counterflow cooling with perfect heat exchange: the gas, at the neck's temperature
    everywhere, carries away :math:`\dot m\,\Delta h(T)`, so the conducted heat grows upward,

    .. math::

        k(T) A \frac{dT}{dx} = \dot Q_0 + \dot m\, \Delta h(T), \qquad
        \dot m = \frac{\dot Q_0 + \dot Q_\mathrm{other}}{h_{fg}}

    whence

    .. math::

        \frac{L}{A} = \int_{T_c}^{T_h} \frac{k(T)\, dT}{\dot Q_0 + \dot m\, \Delta h(T)}

    solved for :math:`\dot Q_0` (in closed form when :math:`\dot Q_\mathrm{other} = 0`:
    :math:`\dot Q_0 = (A/L) \int k\,dT / (1 + \Delta h/h_{fg})`).

    Parameters
    ----------
    conductivity : callable or float
        k(T) of the neck wall, vectorised, [W/(m K)].
    area : float
        Wall cross-section, [m^2].
    length : float
        Length from the bath to the warm end, [m].
    T_low, T_high : float
        Bath and warm-end temperatures, [K].
    latent_heat : float
        Latent heat of the bath liquid, [J/kg].
    vapor_enthalpy : callable or float
        :math:`\Delta h(T) = h(T) - h_\mathrm{sat.vap.}` at the bath pressure, vectorised,
        [J/kg] (a cryogen's ``vapor_enthalpy``); a float is a constant c_p, [J/(kg K)].
    other_load : float, optional
        Heat from other causes on the same bath whose boil-off also rises through this neck,
        [W].

    Returns
    -------
    float
        Heat into the bath along the neck, [W].

    Notes
    -----
    Perfect heat exchange is the best case: real necks, where the gas does not reach the
    wall temperature, gain less. With no cooling (the latent heat very large) this tends to
    the plain conduction :math:`(A/L)\int k\,dT`. For a constant k and c_p the result is
    :math:`(kA/L)(h_{fg}/c_p)\ln(1 + c_p (T_h - T_c)/h_{fg})`.

    References
    ----------
    1. Barron, R. F., "Cryogenic Systems", 2nd ed., Oxford University Press, 1985, ch. 7
       (vapour-cooled necks and supports).
    2. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 2.2.

    Examples
    --------
    A constant k of 10 W/(m K), helium with c_p = 5193 J/(kg K), h_fg = 20.7 kJ/kg:

    >>> round(vapor_cooled_neck_load(10.0, 1e-4, 0.5, 4.2, 300.0, 20.7e3, 5193.0), 4)
    0.0344
    """
    Tl = float(checks.temperature(T_low, "T_low"))
    Th = float(checks.temperature(T_high, "T_high"))
    A = float(checks.nonnegative(area, "area", "m^2", key="area"))
    L = float(checks.positive(length, "length", "m", key="length"))
    other = float(checks.nonnegative(other_load, "other_load", "W", key="other_load"))
    if Th <= Tl or A == 0.0:
        if Th < Tl:
            raise TemperatureError(
                f"the neck's warm end ({Th:g} K) is colder than the bath ({Tl:g} K)"
            )
        return 0.0
    k, dh, latent = _vapor_inputs(conductivity, vapor_enthalpy, Tl, latent_heat)
    T, w = _gauss(Tl, Th, panels=48, geometric=True)
    wk = w * k(T)
    x = (dh(T) - float(dh(np.asarray(Tl)))) / latent  # dh / h_fg, zero at the cold end
    if other == 0.0:
        return float(A / L * np.sum(wk / (1.0 + x)))
    shape = L / A
    uncooled = A / L * float(np.sum(wk))

    def excess(Q0):
        return float(np.sum(wk / (Q0 + (Q0 + other) * x))) - shape

    lo = 1e-12 * uncooled
    if excess(lo) <= 0.0:
        return lo
    return brentq(excess, lo, uncooled, xtol=1e-15 * uncooled, rtol=1e-13)


# --------------------------------------------------------------------------------------------
