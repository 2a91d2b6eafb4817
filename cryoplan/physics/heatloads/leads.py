"""Conduction-cooled current leads: the optimum shape and the heat of a given lead, from
the one-dimensional heat equation with Joule heating and the Wiedemann-Franz law.
"""

from __future__ import annotations

import math
from typing import NamedTuple

import numpy as np

from .. import checks
from ..errors import InputError, TemperatureError
from ._common import _as_function, _gauss, brentq

# current leads
# --------------------------------------------------------------------------------------------


class LeadSolution(NamedTuple):
    """State of a current lead between two fixed end temperatures.

    cold_end_heat : heat into the cold stage, [W].
    warm_end_heat : heat entering the lead at the warm end, [W]; negative when Joule heat
        flows out there (the lead is run above its optimum current).
    peak_temperature : highest temperature along the lead, [K].
    """

    cold_end_heat: float
    warm_end_heat: float
    peak_temperature: float


class _ToPeak:
    r"""Quadrature of :math:`\int_{T_0}^{T_m} k\,dT / \sqrt{a^2 + L_0 (T_m^2 - T^2)}` for any a >= 0.

    Below T_m / 2 in T (geometric panels, for a conductivity that peaks at low temperature);
    above, in u = sqrt(T_m^2 - T^2), which removes the inverse square root at T_m.
    """

    def __init__(self, k, T_from: float, T_peak: float, lorenz: float):
        self.lorenz = lorenz
        split = max(T_from, 0.5 * T_peak)
        if split > T_from:
            T1, w1 = _gauss(T_from, split, geometric=True)
            self.w1k1 = w1 * k(T1)
            self.g1 = lorenz * (T_peak**2 - T1**2)
        else:
            self.w1k1 = np.zeros(0)
            self.g1 = np.zeros(0)
        top = math.sqrt(max(T_peak**2 - split**2, 0.0))
        if top == 0.0:  # an empty range
            self.f2 = self.lu2 = np.zeros(0)
            return
        u, w2 = _gauss(0.0, top)
        T2 = np.sqrt(T_peak**2 - u**2)
        self.f2 = w2 * k(T2) * u / T2
        self.lu2 = lorenz * u**2

    def __call__(self, a: float) -> float:
        lower = np.sum(self.w1k1 / np.sqrt(a * a + self.g1))
        upper = np.sum(self.f2 / np.sqrt(a * a + self.lu2))
        return float(lower + upper)


def _check_lead(current, T_low, T_high, lorenz):
    amps = float(current)
    if not math.isfinite(amps):
        raise InputError("current must be finite", key="current", found=repr(current))
    Tl = float(checks.temperature(T_low, "T_low"))
    Th = float(checks.temperature(T_high, "T_high"))
    if Tl >= Th:
        raise TemperatureError(
            f"a current lead needs T_low below T_high; found {Tl:g} K and {Th:g} K"
        )
    L0 = float(checks.positive(lorenz, "lorenz", "W Ohm/K^2", key="lorenz"))
    return abs(amps), Tl, Th, L0


def conduction_cooled_lead_optimum(
    current, T_low, T_high, conductivity=None, lorenz=2.45e-8
) -> tuple[float, float]:
    r"""Minimum cold-end heat of a conduction-cooled current lead, and its shape (McFee 1959).

    With the Wiedemann-Franz law :math:`k \rho = L_0 T`, the lead of optimum shape (no heat
    flow at its warm end) delivers to the cold end

    .. math::

        \dot Q_\mathrm{min} = I \sqrt{L_0 (T_h^2 - T_c^2)}

    whatever the metal, and its length-to-area ratio is

    .. math::

        \left(\frac{L}{A}\right)_\mathrm{opt}
          = \frac{1}{I} \int_{T_c}^{T_h} \frac{k(T)\,dT}{\sqrt{L_0 (T_h^2 - T^2)}}
          \;\; \left(= \frac{k}{I\sqrt{L_0}} \arccos\frac{T_c}{T_h}
          \text{ for constant } k\right)

    Parameters
    ----------
    current : float
        Current carried, [A].
    T_low, T_high : float
        Temperatures of the cold and warm ends, [K].
    conductivity : callable or float, optional
        Thermal conductivity k(T), [W/(m K)], needed for the shape factor only; without it
        the shape factor is returned as NaN.
    lorenz : float, optional
        Lorenz number :math:`L_0`, [W Ohm/K^2]; 2.45e-8 by default (McFee 1959).

    Returns
    -------
    heat : float
        Minimum heat into the cold end, per lead, [W].
    shape_factor : float
        Optimum :math:`L/A`, [1/m] (infinite at zero current).

    Notes
    -----
    Steady state, one dimension, the lead cooled by conduction only (no gas), its resistivity
    tied to its conductivity by the Wiedemann-Franz law. With 2.45e-8 W Ohm/K^2 the minimum
    from 300 K to 4.2 K is 47.0 W/kA per lead; real copper, whose Lorenz ratio falls below
    L0 at intermediate temperatures, does slightly better (about 42-43 W/kA, from memory).
    The product :math:`I (L/A)_\mathrm{opt}` is fixed by the material: a lead of optimum shape
    for one current is too long for a larger one, and run above it the lead's temperature
    peaks above the warm end; a lead left carrying current without its warm-end heat
    sinking can overheat and burn out.

    References
    ----------
    1. McFee, R., "Optimum input leads for cryogenic apparatus", Rev. Sci. Instrum. 30, 98
       (1959).
    2. Wilson, M. N., "Superconducting Magnets", Oxford University Press, 1983, ch. 11.

    Examples
    --------
    >>> heat, shape = conduction_cooled_lead_optimum(1000.0, 4.2, 300.0)
    >>> round(heat, 2)
    46.95
    >>> heat, shape = conduction_cooled_lead_optimum(1000.0, 4.2, 300.0, conductivity=400.0)
    >>> round(shape, 1)
    3978.4
    """
    amps, Tl, Th, L0 = _check_lead(current, T_low, T_high, lorenz)
    heat = amps * math.sqrt(L0 * (Th**2 - Tl**2))
    if conductivity is None:
        return heat, math.nan
    if amps == 0.0:
        return 0.0, math.inf
    k = _as_function(conductivity, "conductivity")
    return heat, _ToPeak(k, Tl, Th, L0)(0.0) / amps


def conduction_cooled_lead_solution(
    current, length, area, conductivity, T_low, T_high, lorenz=2.45e-8
) -> LeadSolution:
    r"""Heat at both ends of a conduction-cooled current lead of given shape (McFee's analysis).

    Steady one-dimensional conduction with Joule heat, :math:`\rho = L_0 T / k`
    (Wiedemann-Franz), :math:`q = kA\,dT/dx` the heat flowing toward the cold end:

    .. math::

        \frac{d}{dx}\left(k A \frac{dT}{dx}\right) + \frac{I^2 \rho}{A} = 0
        \;\Rightarrow\;
        q(T)^2 = q_h^2 + I^2 L_0 (T_h^2 - T^2), \qquad
        \frac{I L}{A} = \int_{T_c}^{T_h} \frac{I\,k\,dT}{q(T)}

    solved for the warm-end heat :math:`q_h \ge 0`. When :math:`L/A` exceeds the optimum for
    the current, the temperature peaks at :math:`T_m > T_h` inside the lead and
    :math:`I L/A = \int_{T_c}^{T_m} + \int_{T_h}^{T_m} k\,dT / \sqrt{L_0 (T_m^2 - T^2)}`
    is solved for :math:`T_m`; then :math:`\dot Q_c = I \sqrt{L_0 (T_m^2 - T_c^2)}`.

    Parameters
    ----------
    current : float
        Current, [A].
    length : float
        Lead length, [m].
    area : float
        Cross-section, [m^2].
    conductivity : callable or float
        Thermal conductivity k(T), vectorised, [W/(m K)]; a float is a constant k.
    T_low, T_high : float
        Temperatures of the cold and warm ends, [K].
    lorenz : float, optional
        Lorenz number, [W Ohm/K^2].

    Returns
    -------
    LeadSolution
        Cold-end heat [W], warm-end heat [W] and peak temperature [K].

    Raises
    ------
    TemperatureError
        If the lead overheats beyond its conductivity data (or beyond ten times T_high).

    Notes
    -----
    Valid for a metal obeying the Wiedemann-Franz law (copper, brass, aluminium within about
    10 % above 20 K; less well at intermediate temperatures for pure metals). At zero
    current this is plain conduction. An overdriven lead can overheat and burn out; the
    peak temperature is reported so that it can be flagged.

    References
    ----------
    1. McFee, R., "Optimum input leads for cryogenic apparatus", Rev. Sci. Instrum. 30, 98
       (1959).
    2. Wilson, M. N., "Superconducting Magnets", Oxford University Press, 1983, ch. 11.

    Examples
    --------
    >>> s = conduction_cooled_lead_solution(0.0, 1.0, 1e-4, 400.0, 4.2, 300.0)
    >>> round(s.cold_end_heat, 3)   # plain conduction: 400 * 1e-4 * 295.8
    11.832
    >>> s = conduction_cooled_lead_solution(500.0, 0.5, 1e-4, 400.0, 4.2, 300.0)
    >>> round(s.cold_end_heat, 2), round(s.peak_temperature, 1)
    (28.08, 300.0)
    """
    amps, Tl, Th, L0 = _check_lead(current, T_low, T_high, lorenz)
    L = float(checks.positive(length, "length", "m", key="length"))
    A = float(checks.positive(area, "area", "m^2", key="area"))
    k = _as_function(conductivity, "conductivity")
    full = _ToPeak(k, Tl, Th, L0)
    if amps == 0.0:
        # plain conduction: the integral of k by the same quadrature (a -> infinity limit)
        T, w = _gauss(Tl, Th, panels=48, geometric=True)
        q = A / L * float(np.sum(w * k(T)))
        return LeadSolution(q, q, Th)
    beta = amps * L / A
    beta_opt = full(0.0)
    if beta <= beta_opt:
        # q_h >= 0: beta(s_h) = full(s_h) falls from beta_opt to 0 as s_h grows (s = q / I)
        integral_k = full(1.0e30) * 1.0e30  # = int k dT
        s_high = integral_k / beta
        s_h = brentq(lambda s: full(s) - beta, 0.0, s_high, xtol=1e-15 * s_high, rtol=1e-13)
        s_c = math.sqrt(s_h**2 + L0 * (Th**2 - Tl**2))
        return LeadSolution(amps * s_c, amps * s_h, Th)

    def excess(Tm):
        try:
            return _ToPeak(k, Tl, Tm, L0)(0.0) + _ToPeak(k, Th, Tm, L0)(0.0) - beta
        except Exception as exc:
            raise TemperatureError(
                f"the current lead overheats: at {amps:g} A its L/A of {L / A:.4g} /m is above "
                f"the optimum {beta_opt / amps:.4g} /m, its temperature peaks above the warm "
                f"end ({Th:g} K), and the conductivity is not known there ({exc}); "
                "lower the current or shorten the lead"
            ) from None

    T_top = 1.02 * Th
    while excess(T_top) < 0.0:
        T_top = Th + 2.0 * (T_top - Th)
        if T_top > 10.0 * Th:
            raise TemperatureError(
                f"the current lead overheats: at {amps:g} A its peak temperature would exceed "
                f"{10 * Th:g} K; lower the current or shorten the lead"
            )
    Tm = brentq(excess, Th, T_top, xtol=1e-10 * Th, rtol=1e-13)
    return LeadSolution(
        amps * math.sqrt(L0 * (Tm**2 - Tl**2)), -amps * math.sqrt(L0 * (Tm**2 - Th**2)), Tm
    )


def conduction_cooled_lead_load(
    current, length, area, conductivity, T_low, T_high, lorenz=2.45e-8
) -> float:
    r"""Heat into the cold end of a conduction-cooled current lead of given shape, [W].

    The cold-end heat of :func:`conduction_cooled_lead_solution`:

    .. math::

        \dot Q_c = \sqrt{q_h^2 + I^2 L_0 (T_h^2 - T_c^2)}

    Parameters
    ----------
    current, length, area, conductivity, T_low, T_high, lorenz
        As :func:`conduction_cooled_lead_solution`.

    Returns
    -------
    float
        Heat into the cold stage, per lead, [W].

    Notes
    -----
    As :func:`conduction_cooled_lead_solution`.

    References
    ----------
    1. McFee, R., Rev. Sci. Instrum. 30, 98 (1959).

    Examples
    --------
    >>> round(conduction_cooled_lead_load(500.0, 0.5, 1e-4, 400.0, 4.2, 300.0), 2)
    28.08
    """
    return conduction_cooled_lead_solution(
        current, length, area, conductivity, T_low, T_high, lorenz
    ).cold_end_heat
