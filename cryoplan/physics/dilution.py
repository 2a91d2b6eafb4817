"""Helium-3/helium-4 dilution refrigeration: the mixing chamber's enthalpy balance, still and precooling.

Pure physics: SI floats and numpy arrays in and out (mol/s, kelvin, watts). The cooling
power at the mixing chamber is the enthalpy balance of the helium-3 that crosses the
phase boundary: it enters as concentrated liquid at the exit temperature of the last heat
exchanger, T_ex, and leaves in the dilute phase at the chamber's temperature T_mc. With
the Fermi-liquid enthalpies of the two phases (H_d - H_3(0) = 95 T^2 and H_c - H_3(0) =
11 T^2, J/mol),

.. math:: \\dot Q_{mc} = \\dot n_3 (95\\,T_{mc}^2 - 11\\,T_{ex}^2)

(Pobell [1]_, chapter 7, section 7.3; the coefficients 95 and 11 J/(mol K^2) as printed in
the 3rd edition, from memory; the 11 is half the molar heat-capacity coefficient of pure
liquid helium-3, C = gamma R T with gamma = 2.78 /K at zero pressure, Greywall [2]_: 11.6,
which the tests check; with a perfect exchanger, T_ex = T_mc, 95 - 11 = 84).

Arguments that cannot be physical raise :class:`cryoplan.physics.errors.InputError`;
temperatures below 0 K :class:`cryoplan.physics.errors.TemperatureError`.

References
----------
.. [1] F. Pobell, "Matter and Methods at Low Temperatures", 3rd ed., Springer (2007),
   chapter 7 (the 3He-4He dilution refrigerator), sections 7.3 (cooling power) and 7.4
   (the still, the heat exchangers).
.. [2] D. S. Greywall, "3He specific heat and thermometry at millikelvin temperatures",
   Phys. Rev. B 33, 7520 (1986): C/RT = 2.784 /K at zero pressure (as transcribed in the
   he3lib library's he3_gammaf).
"""

from __future__ import annotations

from functools import lru_cache
from types import SimpleNamespace

import numpy as np

from . import helium3
from .errors import InputError, TemperatureError

__all__ = [
    "DILUTE_ENTHALPY_COEFFICIENT",
    "CONCENTRATED_ENTHALPY_COEFFICIENT",
    "PERFECT_EXCHANGER_COEFFICIENT",
    "mixing_chamber_cooling_power",
    "mixing_chamber_temperature",
    "circulation_for_cooling_power",
    "still_heat",
    "precooling_load",
    "condensing_load",
]

#: Enthalpy of helium-3 in the dilute phase above its zero, 95 T^2 [J/(mol K^2)]; Pobell
#: (2007), section 7.3, from memory.
DILUTE_ENTHALPY_COEFFICIENT = 95.0
#: Enthalpy of concentrated (pure) liquid helium-3 above its zero, 11 T^2 [J/(mol K^2)];
#: Pobell (2007), section 7.3, from memory.
CONCENTRATED_ENTHALPY_COEFFICIENT = 11.0
#: 95 - 11: the cooling power per mol/s and K^2 with a perfect heat exchanger, T_ex = T_mc.
PERFECT_EXCHANGER_COEFFICIENT = DILUTE_ENTHALPY_COEFFICIENT - CONCENTRATED_ENTHALPY_COEFFICIENT


@lru_cache(maxsize=1)
def _constants() -> SimpleNamespace:
    from scipy import constants as c

    return SimpleNamespace(R=c.R)


def _nonnegative(name: str, value, what: str) -> np.ndarray:
    v = np.asarray(value, dtype=float)
    if np.any(np.isnan(v)) or np.any(v < 0):
        raise InputError(f"{name}: below zero", expected=f"{what} >= 0", found=repr(value))
    return v


def _positive(name: str, value, what: str) -> np.ndarray:
    v = np.asarray(value, dtype=float)
    if np.any(np.isnan(v)) or np.any(v <= 0):
        raise InputError(f"{name}: not above zero", expected=f"{what} > 0", found=repr(value))
    return v


def _temperature(name: str, value) -> np.ndarray:
    t = np.asarray(value, dtype=float)
    if np.any(np.isnan(t)) or np.any(t < 0):
        raise TemperatureError(f"{name}: {value!r} K is below 0 K or not a number")
    return t


def _scalar(a: np.ndarray):
    return float(a) if np.ndim(a) == 0 else a


def mixing_chamber_cooling_power(circulation, mixing_temperature, exchanger_temperature=None):
    """Cooling power of a dilution refrigerator's mixing chamber, from the enthalpy balance.

    .. math:: \\dot Q_{mc} = \\dot n_3 (95\\,T_{mc}^2 - 11\\,T_{ex}^2)

    Parameters
    ----------
    circulation : float or ndarray
        Helium-3 circulation rate n3, [mol/s].
    mixing_temperature : float or ndarray
        T_mc, [K].
    exchanger_temperature : float or ndarray, optional
        T_ex, the concentrated helium-3's temperature as it leaves the last heat exchanger,
        [K]; None for a perfect exchanger (T_ex = T_mc, 84 n3 T_mc^2).

    Returns
    -------
    float or ndarray
        Q_mc, [W]; below zero where the incoming helium-3 brings more heat than its
        dilution absorbs (T_ex above 2.94 T_mc).

    Notes
    -----
    Holds where both phases are degenerate Fermi liquids, below about 40 mK; above, the
    T^2 laws overstate the enthalpies increasingly (Pobell [1]_, section 7.3). Viscous
    heating and the heat the dilute stream conducts are not included.

    References
    ----------
    .. [1] Pobell (2007), section 7.3.

    Examples
    --------
    >>> round(mixing_chamber_cooling_power(100e-6, 0.01) * 1e6, 3)   # uW at 10 mK
    0.84
    >>> round(mixing_chamber_cooling_power(100e-6, 0.01, 0.02) * 1e6, 3)
    0.51
    """
    n = _nonnegative("circulation", circulation, "a circulation rate")
    tm = _temperature("mixing_temperature", mixing_temperature)
    tx = (
        tm
        if exchanger_temperature is None
        else _temperature("exchanger_temperature", exchanger_temperature)
    )
    return _scalar(
        n * (DILUTE_ENTHALPY_COEFFICIENT * tm**2 - CONCENTRATED_ENTHALPY_COEFFICIENT * tx**2)
    )


def mixing_chamber_temperature(circulation, load, exchanger_temperature=None):
    """Temperature a mixing chamber settles at under a load (the enthalpy balance inverted).

    .. math::

        T_{mc} = \\sqrt{\\frac{\\dot Q / \\dot n_3 + 11\\,T_{ex}^2}{95}}
        \\quad\\text{or, with a perfect exchanger,}\\quad
        T_{mc} = \\sqrt{\\frac{\\dot Q}{84\\,\\dot n_3}}

    Parameters
    ----------
    circulation : float or ndarray
        n3, [mol/s], above 0.
    load : float or ndarray
        Q, the heat load on the mixing chamber (experiment, wiring, radiation), [W].
    exchanger_temperature : float or ndarray, optional
        T_ex, [K]; None for a perfect exchanger.

    Returns
    -------
    float or ndarray
        T_mc, [K].

    References
    ----------
    .. [1] Pobell (2007), section 7.3.

    Examples
    --------
    >>> round(mixing_chamber_temperature(100e-6, 0.84e-6) * 1e3, 3)   # mK
    10.0
    """
    n = _positive("circulation", circulation, "a circulation rate")
    q = _nonnegative("load", load, "a load")
    if exchanger_temperature is None:
        return _scalar(np.sqrt(q / (PERFECT_EXCHANGER_COEFFICIENT * n)))
    tx = _temperature("exchanger_temperature", exchanger_temperature)
    return _scalar(
        np.sqrt((q / n + CONCENTRATED_ENTHALPY_COEFFICIENT * tx**2) / DILUTE_ENTHALPY_COEFFICIENT)
    )


def circulation_for_cooling_power(load, mixing_temperature, exchanger_temperature=None):
    """Helium-3 circulation a mixing chamber needs to lift a load at a temperature.

    .. math:: \\dot n_3 = \\frac{\\dot Q}{95\\,T_{mc}^2 - 11\\,T_{ex}^2}

    Parameters
    ----------
    load : float or ndarray
        Q, [W].
    mixing_temperature : float or ndarray
        T_mc, [K].
    exchanger_temperature : float or ndarray, optional
        T_ex, [K]; None for a perfect exchanger.

    Returns
    -------
    float or ndarray
        n3, [mol/s].

    Raises
    ------
    InputError
        Where T_ex is so high (above sqrt(95/11) T_mc) that no circulation reaches T_mc.

    References
    ----------
    .. [1] Pobell (2007), section 7.3.

    Examples
    --------
    >>> round(circulation_for_cooling_power(0.84e-6, 0.01) * 1e6, 3)   # umol/s
    100.0
    """
    q = _nonnegative("load", load, "a load")
    per_mol = np.asarray(
        mixing_chamber_cooling_power(1.0, mixing_temperature, exchanger_temperature)
    )
    if np.any(per_mol <= 0):
        raise InputError(
            "exchanger_temperature: too high for the mixing chamber to reach its temperature",
            expected="T_ex below sqrt(95/11) T_mc = 2.94 T_mc",
            found=repr(exchanger_temperature),
        )
    return _scalar(q / per_mol)


def still_heat(circulation, still_temperature=0.7):
    """Heat the still needs to evaporate the circulating helium-3.

    .. math:: \\dot Q_\\mathrm{still} = \\dot n_3\\,L_3(T_\\mathrm{still})

    Parameters
    ----------
    circulation : float or ndarray
        n3, [mol/s].
    still_temperature : float, optional
        T_still, [K], 0.7 K by default (the usual operating point, Pobell [1]_, 7.4).

    Returns
    -------
    float or ndarray
        Q_still, [W].

    Notes
    -----
    L_3 is pure helium-3's latent heat (:func:`cryoplan.physics.helium3.latent_heat_molar`,
    about 34 J/mol at 0.7 K); evaporating helium-3 out of the dilute mixture costs
    somewhat more (its binding in the helium-4), so this is a lower estimate; part of the
    still's heat is also supplied by the incoming helium-3 stream cooled there.

    References
    ----------
    .. [1] Pobell (2007), section 7.4 (the still).

    Examples
    --------
    >>> round(still_heat(100e-6) * 1e3, 2)   # mW
    3.37
    """
    n = _nonnegative("circulation", circulation, "a circulation rate")
    return _scalar(n * np.asarray(helium3.latent_heat_molar(still_temperature)))


def precooling_load(circulation, return_temperature, stage_temperature):
    """Load of the returning helium-3 gas on the stage that precools it (ideal monatomic gas).

    .. math:: \\dot Q = \\dot n_3\\,\\tfrac52 R\\,(T_\\mathrm{return} - T_\\mathrm{stage})

    Parameters
    ----------
    circulation : float or ndarray
        n3, [mol/s].
    return_temperature : float or ndarray
        T_return, the gas's temperature as it reaches the stage's heat exchanger (room
        temperature, or the warmer stage's), [K].
    stage_temperature : float or ndarray
        T_stage, the temperature it leaves at, [K].

    Returns
    -------
    float or ndarray
        Q, [W].

    Notes
    -----
    c_p = 5R/2 is exact for an ideal monatomic gas; helium-3 at a few hundred millibar
    departs from it by a few per cent near 4 K (from memory). With counterflow exchange
    against the outgoing gas (usual above the 4 K stage in a dry system) the load on the
    stage is smaller; this is the load without it.

    References
    ----------
    .. [1] Pobell (2007), section 7.4 (the circulating gas and its precooling).

    Examples
    --------
    >>> round(precooling_load(100e-6, 50.0, 4.0) * 1e3, 1)   # mW on a 4 K stage
    95.6
    """
    n = _nonnegative("circulation", circulation, "a circulation rate")
    tr = _temperature("return_temperature", return_temperature)
    ts = _temperature("stage_temperature", stage_temperature)
    if np.any(tr < ts):
        raise TemperatureError("return_temperature: below the stage's temperature")
    return _scalar(n * 2.5 * _constants().R * (tr - ts))


def condensing_load(circulation, inlet_temperature, condense_temperature):
    """Load of condensing the circulating helium-3 at the condenser (1 K pot or JT stage).

    .. math:: \\dot Q = \\dot n_3 \\left[\\tfrac52 R (T_\\mathrm{in} - T_c) + L_3(T_c)\\right]

    Parameters
    ----------
    circulation : float or ndarray
        n3, [mol/s].
    inlet_temperature : float or ndarray
        T_in, the gas's temperature as it reaches the condenser, [K].
    condense_temperature : float
        T_c, [K], 0.2 K to 3.2 K.

    Returns
    -------
    float or ndarray
        Q, [W].

    References
    ----------
    .. [1] Pobell (2007), section 7.4.

    Examples
    --------
    >>> round(condensing_load(100e-6, 4.2, 1.5) * 1e3, 2)   # mW
    10.57
    """
    n = _nonnegative("circulation", circulation, "a circulation rate")
    return _scalar(
        n * np.asarray(helium3.recondensation_heat(1.0, inlet_temperature, condense_temperature))
    )
