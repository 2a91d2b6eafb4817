"""Heat conducted by residual gas in the free-molecular regime, and the mean free path that
decides whether the regime holds.
"""

from __future__ import annotations

import math

import numpy as np

from .. import checks
from ..errors import InputError, UnknownNameError
from ._common import _area_ratio, _const


class RegimeError(InputError):
    """The residual gas is not free-molecular: its mean free path is shorter than the gap."""


# residual gas
# --------------------------------------------------------------------------------------------

#: Gases for free-molecular conduction: ratio of specific heats gamma [-] (room temperature),
#: molar mass [kg/mol] and kinetic (hard-sphere, from viscosity) diameter [m].
#: Molar masses: IUPAC standard atomic weights. Diameters: from memory, as tabulated in
#: vacuum texts (e.g. Jousten (ed.), "Handbook of Vacuum Technology", Wiley-VCH, 2008).
GASES: dict[str, dict[str, float]] = {
    "helium": {"gamma": 5.0 / 3.0, "molar_mass": 4.002602e-3, "diameter": 2.18e-10},
    "neon": {"gamma": 5.0 / 3.0, "molar_mass": 20.1797e-3, "diameter": 2.58e-10},
    "argon": {"gamma": 5.0 / 3.0, "molar_mass": 39.948e-3, "diameter": 3.64e-10},
    "hydrogen": {"gamma": 1.40, "molar_mass": 2.01588e-3, "diameter": 2.74e-10},
    "nitrogen": {"gamma": 1.40, "molar_mass": 28.0134e-3, "diameter": 3.75e-10},
    "air": {"gamma": 1.40, "molar_mass": 28.965e-3, "diameter": 3.72e-10},
}


def _gas(name: str) -> dict[str, float]:
    key = str(name).strip().lower()
    if key not in GASES:
        raise UnknownNameError("gas", name, GASES, key="gas")
    return GASES[key]


def mean_free_path(gas: str, pressure, temperature) -> float | np.ndarray:
    r"""Mean free path of a gas of hard spheres (kinetic theory).

    .. math::

        \lambda = \frac{k_B T}{\sqrt{2}\,\pi d^2 p}

    Parameters
    ----------
    gas : str
        One of :data:`GASES`.
    pressure : float or ndarray
        Local pressure, [Pa] (> 0).
    temperature : float or ndarray
        Local temperature, [K].

    Returns
    -------
    float or ndarray
        Mean free path, [m].

    Notes
    -----
    Hard-sphere diameters from viscosity at room temperature; at cryogenic temperatures the
    effective diameter grows somewhat, so the path is an upper estimate there. For air at
    20 degC, :math:`\lambda p \approx 6.6\times10^{-3}` Pa m (common practice).

    References
    ----------
    1. Jousten, K. (ed.), "Handbook of Vacuum Technology", Wiley-VCH, 2008, ch. 3.
    2. Roth, A., "Vacuum Technology", 3rd ed., North-Holland, 1990, ch. 2.

    Examples
    --------
    >>> round(mean_free_path("air", 1.0, 293.15) * 1e3, 2)     # mm at 1 Pa
    6.58
    """
    d = _gas(gas)["diameter"]
    p = checks.positive(pressure, "pressure", "Pa", key="pressure")
    T = checks.temperature(temperature, "temperature")
    return checks.scalar(_const.k * T / (math.sqrt(2.0) * math.pi * d**2 * p))


def free_molecular_conduction(
    area,
    T_cold,
    T_warm,
    pressure,
    gas: str = "helium",
    accommodation=1.0,
    area_ratio=0.0,
    gauge_temperature=None,
    gap=None,
) -> float | np.ndarray:
    r"""Heat carried by residual gas between two surfaces, free-molecular regime (Corruccini).

    .. math::

        \dot Q = A_c\, a_0 \frac{\gamma + 1}{\gamma - 1}
                 \sqrt{\frac{R}{8 \pi M T_g}}\; p\, (T_w - T_c),
        \qquad
        a_0 = \frac{a_c a_w}{a_w + a_c (1 - a_w) A_c / A_w}

    with :math:`p` the pressure read by a gauge at temperature :math:`T_g`.

    Parameters
    ----------
    area : float or ndarray
        Area of the cold surface :math:`A_c`, [m^2].
    T_cold, T_warm : float or ndarray
        Surface temperatures, [K].
    pressure : float or ndarray
        Gas pressure read at the gauge, [Pa].
    gas : str, optional
        One of :data:`GASES`.
    accommodation : float or (float, float), optional
        Accommodation coefficient of both surfaces, or (cold, warm), in (0, 1], [-]. The
        default 1 is the upper bound.
    area_ratio : float, optional
        :math:`A_c / A_w` in [0, 1], cold surface enclosed by the warm one; 1 for parallel
        plates, 0 (default, the upper bound) for a small cold body in a large enclosure.
    gauge_temperature : float, optional
        Temperature :math:`T_g` at which the pressure is measured, [K]; default ``T_warm``.
    gap : float, optional
        Distance between the surfaces, [m]. If given, the regime is checked: the mean free
        path, taken at the cold wall with the gas in thermal transpiration from the gauge
        (:math:`n = p / (k_B \sqrt{T_g T_c})`), must be at least the gap.

    Returns
    -------
    float or ndarray
        Heat onto the cold surface, [W].

    Raises
    ------
    RegimeError
        If ``gap`` is given and the gas is not free-molecular there.

    Notes
    -----
    Valid while the mean free path exceeds the gap (Knudsen number above about 1); at
    higher pressure the conduction stops rising with pressure, and this formula
    overestimates it. For air at 300 K the coefficient
    :math:`\frac{\gamma+1}{\gamma-1}\sqrt{R/(8\pi M T)}` is about 1.17 W/(m^2 Pa K); for helium
    about 2.10 W/(m^2 Pa K). Measured accommodation coefficients of helium on clean metals
    are well below 1 at room temperature, rising toward cryogenic temperatures (Corruccini
    1959, from memory).

    References
    ----------
    1. Corruccini, R. J., "Gaseous heat conduction at low pressures and temperatures",
       Vacuum 7-8, 19 (1959).
    2. Barron, R. F., "Cryogenic Systems", 2nd ed., Oxford University Press, 1985, ch. 8
       (residual gas conduction).
    3. Roth, A., "Vacuum Technology", 3rd ed., North-Holland, 1990.

    Examples
    --------
    Helium at 1 mPa (gauge at 300 K), 1 m^2, 300 K to 77 K, accommodation 1:

    >>> round(free_molecular_conduction(1.0, 77.0, 300.0, 1e-3, "helium"), 4)
    0.4682
    """
    props = _gas(gas)
    A = checks.nonnegative(area, "area", "m^2", key="area")
    Tc = checks.temperature(T_cold, "T_cold")
    Tw = checks.temperature(T_warm, "T_warm")
    p = checks.nonnegative(pressure, "pressure", "Pa", key="pressure")
    if np.ndim(accommodation) == 0:
        a_c = a_w = checks.fraction(accommodation, "accommodation", key="accommodation")
    else:
        pair = np.asarray(accommodation, dtype=float)
        if pair.shape != (2,):
            raise InputError(
                "accommodation is one value or a pair (cold, warm)",
                key="accommodation",
                expected="a number or [cold, warm]",
                found=repr(accommodation),
            )
        a_c, a_w = (
            checks.fraction(pair[0], "accommodation", key="accommodation"),
            checks.fraction(pair[1], "accommodation", key="accommodation"),
        )
    ratio = _area_ratio(area_ratio)
    Tg = (
        Tw
        if gauge_temperature is None
        else checks.temperature(gauge_temperature, "gauge_temperature")
    )
    if gap is not None:
        g = checks.positive(gap, "gap", "m", key="gap")
        if np.any(p > 0):
            d = props["diameter"]
            with np.errstate(divide="ignore"):
                path = _const.k * np.sqrt(Tg * Tc) / (math.sqrt(2.0) * math.pi * d**2 * p)
            if np.any(path < g):
                raise RegimeError(
                    f"the {gas} is not free-molecular: its mean free path "
                    f"({np.min(path):.3g} m) is shorter than the gap ({np.max(g):.3g} m); "
                    "lower the pressure or use a conduction model for the transition regime",
                    key="pressure",
                    expected="mean free path >= gap",
                    found=f"{np.min(path):.3g} m",
                )
    gamma, M = props["gamma"], props["molar_mass"]
    a0 = a_c * a_w / (a_w + a_c * (1.0 - a_w) * ratio)
    coefficient = (gamma + 1.0) / (gamma - 1.0) * np.sqrt(_const.R / (8.0 * math.pi * M * Tg))
    return checks.scalar(A * a0 * coefficient * p * (Tw - Tc))


# --------------------------------------------------------------------------------------------
