"""Room oxygen-deficiency estimates and cryogen-handling cautions.

The physics core of the room checks: well-mixed room models of a sudden release, a
continuous release with fresh-air ventilation, and a release that changes rate over time
(solved exactly, piece by piece); the ventilation or room volume a release calls for; the
physiological effects of low oxygen; a plain-words verdict per room; and the fixed caution
texts.

Conventions
-----------
- Volumes in m^3. Gas volumes and gas flows are *at room conditions* (room temperature,
  1 atm): a liquid volume times its expansion ratio. The expansion ratio is passed in by
  the caller (``cryoplan.fluids.cryogen(name).expansion_ratio(T_room)``); this module
  does not import the fluid layer.
- Flows in m^3/s. ``ventilation`` is always the flow of *fresh air supplied* to the room;
  the room's outflow is the fresh air plus the released gas, so the room volume stays
  constant.
- Times in s.
- Oxygen as a percentage by volume (20.9 for fresh air) in every argument and result whose
  name ends in ``_percent``, and in ``level_percent``.
- Bad inputs raise :class:`cryoplan.errors.InputError` (a ``ValueError``) with a message
  that says what was expected and what was found; the caller adds file, line and key.

Every figure here is a planning aid, not a risk assessment (:data:`PLANNING_AID_NOTICE`):
local codes, the site's safety office and licensed practice decide.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

from . import checks
from .errors import InputError

__all__ = [
    "AIR_OXYGEN_PERCENT",
    "DEFICIENT_PERCENT",
    "DEFAULT_SUDDEN_MODEL",
    "DEFAULT_QUENCH_FRACTION",
    "DEFAULT_QUENCH_DURATION_S",
    "LOSS_OF_VACUUM_HEAT_FLUX_BARE",
    "LOSS_OF_VACUUM_HEAT_FLUX_INSULATED",
    "SUDDEN_RELEASE_MODELS",
    "OXYGEN_EFFECTS",
    "CAUTIONS",
    "DEFERRAL",
    "PLANNING_AID_NOTICE",
    "PRACTICAL_AIR_CHANGES_PER_HOUR",
    "EffectBand",
    "Caution",
    "Release",
    "Lowest",
    "ReleaseAssessment",
    "gas_volume",
    "gas_rate",
    "air_change_flow",
    "loss_of_vacuum_gas_rate",
    "mixed_release_percent",
    "displacement_release_percent",
    "dilution_release_percent",
    "sudden_release_percent",
    "minimum_room_volume",
    "steady_state_percent",
    "time_constant",
    "continuous_release_percent",
    "recovery_percent",
    "ventilation_to_hold",
    "ventilation_to_restore",
    "sudden_release_case",
    "quench_case",
    "loss_of_vacuum_case",
    "boiloff_case",
    "ventilation_failure_case",
    "oxygen_curve",
    "lowest_oxygen",
    "time_to_level",
    "time_to_recover",
    "ventilation_for_release",
    "assess_release",
    "oxygen_effect",
    "room_verdict",
]

# ---------------------------------------------------------------------------------------
# Constants
# ---------------------------------------------------------------------------------------

#: Oxygen in fresh dry air, percent by volume. U.S. Standard Atmosphere 1976 (NOAA, NASA,
#: USAF), table of sea-level composition of dry air: O2 mole fraction 0.209476 (from
#: memory), rounded to 20.9 % as in the oxygen-deficiency literature.
AIR_OXYGEN_PERCENT = 20.9

#: An atmosphere with less oxygen than this (percent by volume) is oxygen-deficient:
#: US OSHA 29 CFR 1910.134(b), definition of "oxygen deficient atmosphere" (from memory);
#: the same level is used by the Compressed Gas Association and the British Compressed
#: Gases Association as the lowest level for normal work (from memory).
DEFICIENT_PERCENT = 19.5

#: The sudden-release model used unless the caller picks another; see
#: :func:`sudden_release_percent` for why.
DEFAULT_SUDDEN_MODEL = "mixed"

#: Share of a magnet's helium inventory released by a quench when the plan does not say:
#: all of it (a conservative planning value, common practice).
DEFAULT_QUENCH_FRACTION = 1.0

#: Duration over which a quench releases its helium when the plan does not say [s]. A
#: laboratory magnet vents most of its helium within tens of seconds (common practice,
#: from memory); a shorter duration gives a deeper drop.
DEFAULT_QUENCH_DURATION_S = 30.0

#: Heat flux into a liquid-helium vessel whose insulating vacuum is lost to air, bare
#: wall [W/m^2]: 3.8 W/cm^2. W. Lehmann and G. Zahn, "Safety aspects for LHe cryostats
#: and LHe transport containers", Proc. ICEC 7, London, 1978 (from memory).
LOSS_OF_VACUUM_HEAT_FLUX_BARE = 3.8e4

#: As :data:`LOSS_OF_VACUUM_HEAT_FLUX_BARE` with multilayer insulation on the wall
#: [W/m^2]: 0.6 W/cm^2. Lehmann and Zahn, ICEC 7, 1978 (from memory).
LOSS_OF_VACUUM_HEAT_FLUX_INSULATED = 0.6e4

# ---------------------------------------------------------------------------------------
# Checking inputs
# ---------------------------------------------------------------------------------------


def _check_percent(value, name: str) -> np.ndarray:
    if type(value) is float and 0.0 <= value <= AIR_OXYGEN_PERCENT:
        return np.asarray(value)
    arr = checks.as_array(value, name)
    bad = ~((arr >= 0.0) & (arr <= AIR_OXYGEN_PERCENT))
    if np.any(bad):
        raise InputError(
            f"{name} must be an oxygen level between 0 and {AIR_OXYGEN_PERCENT} %",
            expected=f"0 to {AIR_OXYGEN_PERCENT} %",
            found=f"{checks.first_bad(arr, bad):g} %",
        )
    return arr


# ---------------------------------------------------------------------------------------
# Gas from liquid, flows
# ---------------------------------------------------------------------------------------


def gas_volume(liquid_volume, expansion_ratio):
    """Volume of gas at room conditions made by a volume of liquid (expansion ratio).

    .. math:: V_{gas} = \\varepsilon \\, V_{liquid}

    Parameters
    ----------
    liquid_volume : float or ndarray
        Liquid volume, [m^3].
    expansion_ratio : float or ndarray
        Gas volume at room temperature and 1 atm per volume of liquid at its normal
        boiling point, [-]; from ``cryoplan.fluids.cryogen(name).expansion_ratio(T)``.

    Returns
    -------
    float or ndarray
        Gas volume at room conditions, [m^3].

    Notes
    -----
    About 700 for nitrogen and 750 for helium near 20 degC (common practice). The ratio
    assumes the gas has warmed to room temperature; cold gas just after release takes
    less room but is heavier and gathers low (see :data:`CAUTIONS`).

    References
    ----------
    1. Compressed Gas Association, CGA P-12, "Safe Handling of Cryogenic Liquids"
       (from memory: expansion ratios of the common cryogens).

    Examples
    --------
    >>> gas_volume(0.250, 750.0)  # 250 L of liquid helium
    187.5
    """
    v = checks.nonnegative(liquid_volume, "liquid volume", "m^3")
    e = checks.positive(expansion_ratio, "expansion ratio", "")
    return checks.scalar(v * e)


def gas_rate(liquid_rate, expansion_ratio):
    """Gas flow at room conditions made by a liquid evaporating at a volume rate.

    .. math:: R = \\varepsilon \\, \\dot V_{liquid}

    Parameters
    ----------
    liquid_rate : float or ndarray
        Liquid evaporated per second, [m^3/s].
    expansion_ratio : float or ndarray
        Gas volume at room conditions per volume of liquid, [-].

    Returns
    -------
    float or ndarray
        Gas flow into the room at room conditions, [m^3/s].

    Notes
    -----
    For the normal boil-off of a dewar, sum this over every vessel in the room. Dewar
    makers quote a new vessel's loss; older vessels lose more, and doubling the quoted
    figure is a usual allowance (common practice; University of Oxford Safety Office,
    policy S4/03, Appendix 1).

    References
    ----------
    1. University of Oxford Safety Office, policy statement S4/03, Appendix 1,
       "Calculation of oxygen depletion due to liquid nitrogen losses" (British
       Compressed Gases Association method).

    Examples
    --------
    >>> r = gas_rate(1.0e-3 / 86400.0, 700.0)  # 1 L/day of liquid nitrogen
    >>> round(r * 3600.0, 4)  # m^3/h of gas
    0.0292
    """
    v = checks.nonnegative(liquid_rate, "liquid evaporation rate", "m^3/s")
    e = checks.positive(expansion_ratio, "expansion ratio", "")
    return checks.scalar(v * e)


def air_change_flow(air_changes, room_volume):
    """Fresh-air flow from an air-change rate (room volumes per unit time).

    .. math:: Q = n \\, V_{room}

    Parameters
    ----------
    air_changes : float or ndarray
        Air changes per second, [1/s] (2 per hour is ``2 / 3600``).
    room_volume : float or ndarray
        Room volume, [m^3].

    Returns
    -------
    float or ndarray
        Fresh-air flow, [m^3/s].

    Notes
    -----
    Only air drawn from outside counts: air recirculated within the building does not
    dilute the released gas.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory: ventilation as a fresh-air flow).

    Examples
    --------
    >>> round(air_change_flow(2.0 / 3600.0, 100.0) * 3600.0, 6)  # m^3/h
    200.0
    """
    n = checks.nonnegative(air_changes, "air-change rate", "1/s")
    v = checks.positive(room_volume, "room volume", "m^3")
    return checks.scalar(n * v)


def loss_of_vacuum_gas_rate(
    wetted_area,
    latent_heat,
    liquid_density,
    expansion_ratio,
    heat_flux=LOSS_OF_VACUUM_HEAT_FLUX_BARE,
):
    """Gas flow from a vessel whose insulating vacuum fails (heat flux times wetted area).

    .. math:: R = \\varepsilon \\, \\frac{q \\, A}{L \\, \\rho_l}

    Parameters
    ----------
    wetted_area : float or ndarray
        Inner-vessel wall area in contact with the liquid, [m^2].
    latent_heat : float or ndarray
        Latent heat of the liquid at the normal boiling point, [J/kg].
    liquid_density : float or ndarray
        Liquid density at the normal boiling point, [kg/m^3].
    expansion_ratio : float or ndarray
        Gas volume at room conditions per volume of liquid, [-].
    heat_flux : float or ndarray, optional
        Heat flux into the liquid, [W/m^2]; default the bare-wall figure for liquid
        helium, :data:`LOSS_OF_VACUUM_HEAT_FLUX_BARE`.

    Returns
    -------
    float or ndarray
        Gas flow into the room at room conditions, [m^3/s].

    Notes
    -----
    The default fluxes are for liquid-helium vessels with air rushing into the vacuum
    space and condensing on the cold wall; a liquid-nitrogen vessel takes far less. The
    release lasts until the liquid is gone (:func:`loss_of_vacuum_case`).

    References
    ----------
    1. W. Lehmann and G. Zahn, "Safety aspects for LHe cryostats and LHe transport
       containers", Proc. 7th International Cryogenic Engineering Conference, London,
       1978 (from memory).

    Examples
    --------
    >>> # 0.5 m^2 wetted, helium: L = 20.9 kJ/kg, rho = 125 kg/m^3, ratio 750
    >>> round(loss_of_vacuum_gas_rate(0.5, 20.9e3, 125.0, 750.0), 2)  # m^3/s
    5.45
    """
    a = checks.nonnegative(wetted_area, "wetted area", "m^2")
    lat = checks.positive(latent_heat, "latent heat", "J/kg")
    rho = checks.positive(liquid_density, "liquid density", "kg/m^3")
    e = checks.positive(expansion_ratio, "expansion ratio", "")
    q = checks.nonnegative(heat_flux, "heat flux", "W/m^2")
    return checks.scalar(e * q * a / (lat * rho))


# ---------------------------------------------------------------------------------------
# Sudden release
# ---------------------------------------------------------------------------------------


def mixed_release_percent(gas_volume, room_volume, initial_percent=AIR_OXYGEN_PERCENT):
    """Oxygen after a sudden release into a well-mixed room, mixture leaving as gas enters.

    The gas enters a room of fixed volume, mixes at once with the room air, and the same
    volume of *mixture* leaves. This is the no-ventilation well-mixed room model
    integrated over the whole release.

    .. math:: C = C_0 \\exp(-V_{gas} / V_{room})

    Parameters
    ----------
    gas_volume : float or ndarray
        Released gas at room conditions, [m^3].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    initial_percent : float or ndarray, optional
        Oxygen before the release, [%]; fresh air by default.

    Returns
    -------
    float or ndarray
        Oxygen just after the release, [%].

    Notes
    -----
    Holds for any release much faster than the room's air-change time, so that
    ventilation does nothing meanwhile. The same result as the continuous-release model
    with no ventilation, :math:`C_0 \\exp(-R t / V)`, at :math:`R t = V_{gas}`.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)": oxygen in
       a room without ventilation during a release at a constant rate (from memory).
    2. European Industrial Gases Association, EIGA Doc 44, "Hazards of inert gases and
       oxygen depletion" (from memory).

    Examples
    --------
    >>> round(mixed_release_percent(187.5, 100.0), 2)  # 250 L liquid helium, 100 m^3
    3.21
    """
    vg = checks.nonnegative(gas_volume, "gas volume", "m^3")
    vr = checks.positive(room_volume, "room volume", "m^3")
    c0 = _check_percent(initial_percent, "initial oxygen")
    return checks.scalar(c0 * np.exp(-vg / vr))


def displacement_release_percent(gas_volume, room_volume, initial_percent=AIR_OXYGEN_PERCENT):
    """Oxygen after a sudden release that pushes out an equal volume of unmixed room air.

    The British Compressed Gases Association method: the released gas takes the place of
    the same volume of room air, which leaves before any mixing; what stays is the room
    volume less the gas volume of air.

    .. math:: C = C_0 \\max(0, 1 - V_{gas} / V_{room})

    Parameters
    ----------
    gas_volume : float or ndarray
        Released gas at room conditions, [m^3].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    initial_percent : float or ndarray, optional
        Oxygen before the release, [%].

    Returns
    -------
    float or ndarray
        Oxygen in the room after the release, [%]; zero once the gas fills the room.

    Notes
    -----
    The lowest of the three sudden-release models: a bound for a release that stays
    stratified (cold gas pooling). Within a few percent of :func:`mixed_release_percent`
    for small releases (the two agree to first order in :math:`V_{gas}/V_{room}`).

    References
    ----------
    1. University of Oxford Safety Office, policy statement S4/03, Appendix 1,
       "Calculation of oxygen depletion due to liquid nitrogen losses" (after the British
       Compressed Gases Association): oxygen = 100 x 0.21 (V_room - V_gas) / V_room.

    Examples
    --------
    >>> round(displacement_release_percent(7.0, 36.0), 2)  # 10 L liquid nitrogen, 36 m^3
    16.84
    """
    vg = checks.nonnegative(gas_volume, "gas volume", "m^3")
    vr = checks.positive(room_volume, "room volume", "m^3")
    c0 = _check_percent(initial_percent, "initial oxygen")
    return checks.scalar(c0 * np.maximum(0.0, 1.0 - vg / vr))


def dilution_release_percent(gas_volume, room_volume, initial_percent=AIR_OXYGEN_PERCENT):
    """Oxygen after a sudden release that mixes with all the room air before any leaves.

    The room air and the released gas form one uniform mixture of volume
    :math:`V_{room} + V_{gas}` (a sealed room that could swell), of which the excess then
    leaves.

    .. math:: C = C_0 \\frac{V_{room}}{V_{room} + V_{gas}}

    Parameters
    ----------
    gas_volume : float or ndarray
        Released gas at room conditions, [m^3].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    initial_percent : float or ndarray, optional
        Oxygen before the release, [%].

    Returns
    -------
    float or ndarray
        Oxygen in the room after the release, [%].

    Notes
    -----
    The highest (least conservative) of the three sudden-release models, since
    :math:`1 - x \\le e^{-x} \\le 1/(1 + x)`. Offered for comparison, never the default.

    References
    ----------
    1. Mass balance of a closed volume (simple dilution); see also EIGA Doc 44, "Hazards
       of inert gases and oxygen depletion" (from memory).

    Examples
    --------
    >>> round(dilution_release_percent(187.5, 100.0), 2)
    7.27
    """
    vg = checks.nonnegative(gas_volume, "gas volume", "m^3")
    vr = checks.positive(room_volume, "room volume", "m^3")
    c0 = _check_percent(initial_percent, "initial oxygen")
    return checks.scalar(c0 * vr / (vr + vg))


#: The sudden-release models by name, most conservative first: ``"displacement"``
#: (BCGA method, air leaves unmixed), ``"mixed"`` (well mixed while the gas enters; the
#: default), ``"dilution"`` (mixed before anything leaves).
SUDDEN_RELEASE_MODELS: dict[str, Callable] = {
    "displacement": displacement_release_percent,
    "mixed": mixed_release_percent,
    "dilution": dilution_release_percent,
}


def _model(name: str) -> Callable:
    try:
        return SUDDEN_RELEASE_MODELS[name]
    except (KeyError, TypeError):
        from .errors import UnknownNameError

        raise UnknownNameError("sudden-release model", str(name), SUDDEN_RELEASE_MODELS) from None


def sudden_release_percent(
    gas_volume, room_volume, model=DEFAULT_SUDDEN_MODEL, initial_percent=AIR_OXYGEN_PERCENT
):
    """Oxygen after a sudden release, by the named well-mixed room model.

    .. math::

        C = C_0 e^{-x} \\;(\\text{mixed}), \\quad C_0 \\max(0, 1 - x)
        \\;(\\text{displacement}), \\quad \\frac{C_0}{1 + x} \\;(\\text{dilution}),
        \\qquad x = V_{gas} / V_{room}

    Parameters
    ----------
    gas_volume : float or ndarray
        Released gas at room conditions, [m^3].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    model : str, optional
        A key of :data:`SUDDEN_RELEASE_MODELS`; default :data:`DEFAULT_SUDDEN_MODEL`.
    initial_percent : float or ndarray, optional
        Oxygen before the release, [%].

    Returns
    -------
    float or ndarray
        Oxygen just after the release, [%].

    Notes
    -----
    Why ``"mixed"`` is the default: it is the same well-mixed model as every continuous
    case here (a sudden release is its short-duration limit, so a quench over 1 s and a
    sudden release give the same figure), and it is more conservative than simple
    dilution. The ``"displacement"`` form assumes no mixing at all and gives still lower
    figures for large releases; near the 19.5 % threshold, where monitors and room sizes
    are decided, the three differ by well under 1 % of the room volume needed. Near the
    release, and in low or high spots, the air can be worse than any well-mixed figure.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory).
    2. University of Oxford Safety Office, policy statement S4/03, Appendix 1 (British
       Compressed Gases Association method).

    Examples
    --------
    >>> [round(sudden_release_percent(187.5, 100.0, m), 2) for m in SUDDEN_RELEASE_MODELS]
    [0.0, 3.21, 7.27]
    """
    return _model(model)(gas_volume, room_volume, initial_percent)


def _mixed_volume(gas_volume, level):
    return gas_volume / np.log(AIR_OXYGEN_PERCENT / level)


def _displacement_volume(gas_volume, level):
    return gas_volume / (1.0 - level / AIR_OXYGEN_PERCENT)


def _dilution_volume(gas_volume, level):
    return gas_volume * level / (AIR_OXYGEN_PERCENT - level)


_ROOM_VOLUME_FOR = {
    "displacement": _displacement_volume,
    "mixed": _mixed_volume,
    "dilution": _dilution_volume,
}


def minimum_room_volume(gas_volume, level_percent, model=DEFAULT_SUDDEN_MODEL):
    """Smallest room in which a sudden release leaves the oxygen at a level (model inverted).

    .. math::

        V_{room} = \\frac{V_{gas}}{\\ln(20.9 / C)} \\;(\\text{mixed}), \\quad
        \\frac{V_{gas}}{1 - C / 20.9} \\;(\\text{displacement}), \\quad
        \\frac{V_{gas} \\, C}{20.9 - C} \\;(\\text{dilution})

    Parameters
    ----------
    gas_volume : float or ndarray
        Released gas at room conditions, [m^3].
    level_percent : float or ndarray
        Oxygen that must remain, [%], from 0 to 20.9.
    model : str, optional
        A key of :data:`SUDDEN_RELEASE_MODELS`.

    Returns
    -------
    float or ndarray
        Free room volume, [m^3]; ``inf`` for a level of 20.9 % and any gas; 0 for no gas.

    Notes
    -----
    Ventilation cannot help against a sudden release (it acts only afterwards), so this
    volume is the one remedy short of keeping less liquid in the room. Starts from fresh
    air (20.9 %).

    References
    ----------
    1. As :func:`sudden_release_percent`.

    Examples
    --------
    >>> round(minimum_room_volume(187.5, 19.5), 0)  # m^3
    2704.0
    """
    _model(model)
    vg = checks.nonnegative(gas_volume, "gas volume", "m^3")
    c = _check_percent(level_percent, "oxygen level")
    with np.errstate(divide="ignore", invalid="ignore"):
        v = _ROOM_VOLUME_FOR[model](vg, c)
    v = np.where(vg == 0.0, 0.0, np.where(c >= AIR_OXYGEN_PERCENT, np.inf, v))
    return checks.scalar(v)


# ---------------------------------------------------------------------------------------
# Continuous release with ventilation
# ---------------------------------------------------------------------------------------


def steady_state_percent(release_rate, ventilation):
    """Oxygen a continuous release settles at with fresh-air ventilation (well-mixed room).

    .. math:: C_\\infty = 20.9 \\, \\frac{Q}{Q + R}

    Parameters
    ----------
    release_rate : float or ndarray
        Released gas at room conditions, [m^3/s].
    ventilation : float or ndarray
        Fresh air supplied to the room, [m^3/s].

    Returns
    -------
    float or ndarray
        Steady-state oxygen, [%]; 20.9 with no release, 0 with a release and no
        ventilation.

    Notes
    -----
    Independent of the room volume; the room only sets how fast it is reached
    (:func:`time_constant`). Where a plan gives an *exhaust* flow that draws its make-up
    air from outside, the fresh air is the exhaust flow less the release.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory).
    2. University of Oxford Safety Office, policy S4/03, Appendix 1 (normal evaporative
       losses, in linearised form).

    Examples
    --------
    >>> round(steady_state_percent(0.01, 0.05), 3)
    17.417
    """
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    q = checks.nonnegative(ventilation, "ventilation", "m^3/s")
    with np.errstate(divide="ignore", invalid="ignore"):
        c = np.where(r > 0.0, AIR_OXYGEN_PERCENT * q / (q + r), AIR_OXYGEN_PERCENT)
    return checks.scalar(c)


def time_constant(room_volume, ventilation, release_rate=0.0):
    """Time constant of a well-mixed room: its volume over the total outflow.

    .. math:: \\tau = \\frac{V}{Q + R}

    Parameters
    ----------
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    ventilation : float or ndarray
        Fresh air supplied, [m^3/s].
    release_rate : float or ndarray, optional
        Released gas at room conditions, [m^3/s].

    Returns
    -------
    float or ndarray
        Time constant, [s]; ``inf`` when nothing flows.

    Notes
    -----
    After one time constant the oxygen has gone 63 % of the way to its steady state;
    after three, 95 %.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> time_constant(100.0, 200.0 / 3600.0) / 60.0  # 2 air changes per hour: minutes
    30.0
    """
    v = checks.positive(room_volume, "room volume", "m^3")
    q = checks.nonnegative(ventilation, "ventilation", "m^3/s")
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    with np.errstate(divide="ignore"):
        return checks.scalar(v / (q + r))


def continuous_release_percent(
    time, release_rate, room_volume, ventilation, initial_percent=AIR_OXYGEN_PERCENT
):
    """Oxygen during a constant release into a ventilated, well-mixed room (mass balance).

    .. math::

        V \\frac{dC}{dt} = 20.9\\,Q - (Q + R)\\,C
        \\;\\Rightarrow\\;
        C(t) = C_\\infty + (C_0 - C_\\infty)\\, e^{-(Q + R)\\,t / V},
        \\quad C_\\infty = 20.9 \\frac{Q}{Q + R}

    From fresh air (:math:`C_0 = 20.9`) this is
    :math:`20.9\\,[Q/(Q+R)] + 20.9\\,[R/(Q+R)]\\,e^{-(Q+R)t/V}`, and with no ventilation
    :math:`20.9\\, e^{-R t / V}`.

    Parameters
    ----------
    time : float or ndarray
        Time since the release began, [s], 0 or more.
    release_rate : float or ndarray
        Released gas at room conditions, [m^3/s].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    ventilation : float or ndarray
        Fresh air supplied, [m^3/s].
    initial_percent : float or ndarray, optional
        Oxygen at the start, [%].

    Returns
    -------
    float or ndarray
        Oxygen, [%], broadcast over the inputs.

    Notes
    -----
    Assumes the room air is perfectly mixed at every instant and the fresh air holds
    20.9 % oxygen. With ``release_rate = 0`` this is the recovery after a release
    (:func:`recovery_percent`).

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory: the formulas with and without ventilation).
    2. EIGA Doc 44, "Hazards of inert gases and oxygen depletion" (from memory).

    Examples
    --------
    >>> round(continuous_release_percent(600.0, 0.01, 100.0, 0.0), 3)  # no ventilation
    19.683
    >>> continuous_release_percent([0.0, 1e9], 0.01, 100.0, 0.05).round(3)
    array([20.9  , 17.417])
    """
    t = checks.nonnegative(time, "time", "s", inf=True)
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    v = checks.positive(room_volume, "room volume", "m^3")
    q = checks.nonnegative(ventilation, "ventilation", "m^3/s")
    c0 = _check_percent(initial_percent, "initial oxygen")
    flow = q + r
    with np.errstate(divide="ignore", invalid="ignore"):
        c_inf = np.where(flow > 0.0, AIR_OXYGEN_PERCENT * q / flow, c0)
        decay = np.where(flow > 0.0, np.exp(-flow * t / v), 1.0)
    return checks.scalar(c_inf + (c0 - c_inf) * decay)


def recovery_percent(time, start_percent, room_volume, ventilation):
    """Oxygen returning to fresh-air level once a release has stopped (well-mixed room).

    .. math:: C(t) = 20.9 - (20.9 - C_0)\\, e^{-Q t / V}

    Parameters
    ----------
    time : float or ndarray
        Time since the release stopped, [s].
    start_percent : float or ndarray
        Oxygen when the release stopped, [%].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    ventilation : float or ndarray
        Fresh air supplied, [m^3/s].

    Returns
    -------
    float or ndarray
        Oxygen, [%].

    Notes
    -----
    The zero-release case of :func:`continuous_release_percent`; nothing recovers
    without ventilation.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> round(recovery_percent(1800.0, 3.2, 100.0, 200.0 / 3600.0), 2)  # one tau later
    14.39
    """
    return continuous_release_percent(time, 0.0, room_volume, ventilation, start_percent)


def ventilation_to_hold(level_percent, release_rate):
    """Fresh-air flow that keeps a continuous release at or above a level (steady state).

    The steady state :math:`20.9\\,Q/(Q+R)` solved for :math:`Q`:

    .. math:: Q = R \\, \\frac{C}{20.9 - C}

    Parameters
    ----------
    level_percent : float or ndarray
        Oxygen to hold, [%], from 0 to 20.9.
    release_rate : float or ndarray
        Released gas at room conditions, [m^3/s].

    Returns
    -------
    float or ndarray
        Fresh-air flow, [m^3/s]; ``inf`` for a level of 20.9 % with any release.

    Notes
    -----
    Holds for a release that lasts: the room never falls below the steady state, so
    this flow keeps any release of this rate above the level, however long. A release
    of limited duration needs less (:func:`ventilation_for_release`).

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> round(ventilation_to_hold(19.5, 0.01) * 3600.0, 1)  # m^3/h for 36 m^3/h of gas
    501.4
    """
    c = _check_percent(level_percent, "oxygen level")
    r = checks.nonnegative(release_rate, "release rate", "m^3/s")
    with np.errstate(divide="ignore", invalid="ignore"):
        q = np.where(r > 0.0, r * c / (AIR_OXYGEN_PERCENT - c), 0.0)
    return checks.scalar(q)


def ventilation_to_restore(level_percent, start_percent, room_volume, within):
    """Fresh-air flow that brings the oxygen back to a level within a time (recovery inverted).

    .. math:: Q = \\frac{V}{t} \\ln \\frac{20.9 - C_0}{20.9 - C}

    Parameters
    ----------
    level_percent : float or ndarray
        Oxygen to get back to, [%], below 20.9.
    start_percent : float or ndarray
        Oxygen just after the release, [%].
    room_volume : float or ndarray
        Free volume of the room, [m^3].
    within : float or ndarray
        Time allowed after the release, [s], above zero.

    Returns
    -------
    float or ndarray
        Fresh-air flow, [m^3/s]; 0 where the oxygen never fell below the level; ``inf``
        for a level of 20.9 %.

    Notes
    -----
    No ventilation prevents the drop itself after a sudden release: it only shortens the
    time before the room is safe to enter. To avoid the drop, the room must be larger
    (:func:`minimum_room_volume`) or hold less liquid.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> round(ventilation_to_restore(19.5, 3.2, 100.0, 1800.0) * 3600.0, 0)  # m^3/h
    507.0
    """
    c = _check_percent(level_percent, "oxygen level")
    c0 = _check_percent(start_percent, "oxygen after the release")
    v = checks.positive(room_volume, "room volume", "m^3")
    t = checks.positive(within, "time allowed", "s", inf=True)
    with np.errstate(divide="ignore", invalid="ignore"):
        q = v / t * np.log((AIR_OXYGEN_PERCENT - c0) / (AIR_OXYGEN_PERCENT - c))
    q = np.where(c0 >= c, 0.0, np.where(c >= AIR_OXYGEN_PERCENT, np.inf, q))
    return checks.scalar(q)


# ---------------------------------------------------------------------------------------
# Release cases: a sudden volume at t = 0 and a piecewise-constant rate
# ---------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Release:
    """One release case in a room: a sudden gas volume at t = 0, then a rate that changes.

    Parameters
    ----------
    label : str
        A short name of the case, for tables ("quench", "vessel rupture", ...).
    sudden_volume : float
        Gas released at once at t = 0, [m^3] at room conditions.
    schedule : sequence of (float, float)
        Pairs (start [s], rate [m^3/s]): from each start on, gas enters at that rate,
        until the next start. Starts 0 or more, strictly increasing; no gas before the
        first start.
    ventilation_working : float
        Share of the room's fresh-air flow that runs during this case, 0 to 1
        (0: ventilation failure).
    """

    label: str = "release"
    sudden_volume: float = 0.0
    schedule: tuple[tuple[float, float], ...] = ()
    ventilation_working: float = 1.0

    def __post_init__(self) -> None:
        sudden = float(checks.nonnegative(self.sudden_volume, "sudden gas volume", "m^3"))
        working = float(
            checks.fraction(self.ventilation_working, "working share of ventilation", zero=True)
        )
        pairs = []
        last = -math.inf
        for item in self.schedule:
            try:
                start, rate = item
            except (TypeError, ValueError):
                raise InputError(
                    "a release schedule entry must be a pair (start, rate)",
                    expected="(start [s], rate [m^3/s])",
                    found=repr(item),
                ) from None
            start = float(checks.nonnegative(start, "release start", "s"))
            rate = float(checks.nonnegative(rate, "release rate", "m^3/s"))
            if not start > last:
                raise InputError(
                    "release schedule starts must increase",
                    expected=f"a start after {last:g} s",
                    found=f"{start:g} s",
                )
            pairs.append((start, rate))
            last = start
        object.__setattr__(self, "sudden_volume", sudden)
        object.__setattr__(self, "ventilation_working", working)
        object.__setattr__(self, "schedule", tuple(pairs))

    @property
    def total_gas(self) -> float:
        """Gas released in all [m^3]; ``inf`` if the last rate goes on for ever."""
        total = self.sudden_volume
        for (start, rate), nxt in zip(
            self.schedule, self.schedule[1:] + ((math.inf, 0.0),), strict=True
        ):
            if rate > 0.0:
                total += rate * (nxt[0] - start)
        return total


def sudden_release_case(
    liquid_volume, expansion_ratio, *, background_rate=0.0, label="vessel rupture"
):
    """Case: a vessel's whole liquid flashes to gas at once (rupture, sudden release).

    .. math:: V_{gas} = \\varepsilon V_{liquid}, \\text{ at } t = 0; \\quad
        R(t) = R_{boil-off} \\text{ after}

    Parameters
    ----------
    liquid_volume : float
        Liquid in the vessel, [m^3] (its full capacity, for the worst case).
    expansion_ratio : float
        Gas volume at room conditions per volume of liquid, [-].
    background_rate : float, optional
        Normal boil-off of every other vessel in the room, gas at room conditions,
        [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    Notes
    -----
    The British Compressed Gases Association advises taking the loss of a full vessel's
    contents just after filling as the worst case (University of Oxford Safety Office,
    policy S4/03, Appendix 1).

    References
    ----------
    1. University of Oxford Safety Office, policy statement S4/03, Appendix 1.

    Examples
    --------
    >>> sudden_release_case(0.250, 750.0).sudden_volume
    187.5
    """
    volume = float(gas_volume(liquid_volume, expansion_ratio))
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    schedule = ((0.0, background),) if background > 0.0 else ()
    return Release(label, volume, schedule)


def quench_case(
    liquid_volume,
    expansion_ratio,
    *,
    fraction=DEFAULT_QUENCH_FRACTION,
    duration=DEFAULT_QUENCH_DURATION_S,
    background_rate=0.0,
    label="quench",
):
    """Case: a magnet quench vents a share of its helium at a steady rate over a duration.

    .. math::

        R(t) = \\frac{f \\, \\varepsilon \\, V_{liquid}}{t_q} + R_b \\;
        (0 \\le t < t_q), \\qquad R(t) = R_b \\; (t \\ge t_q)

    Parameters
    ----------
    liquid_volume : float
        Helium liquid in the magnet's cryostat, [m^3].
    expansion_ratio : float
        Gas volume at room conditions per volume of liquid, [-].
    fraction : float, optional
        Share of the liquid that the quench boils away, 0 to 1.
    duration : float, optional
        Time over which it vents, [s], above zero.
    background_rate : float, optional
        Normal boil-off of every other vessel, [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    Notes
    -----
    A steady rate over the window is a planning simplification (a real quench peaks
    early). Where the quench gas is led outdoors through a vent line, only what escapes
    into the room belongs here.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory: a release of limited duration,
       followed by recovery).

    Examples
    --------
    >>> quench_case(0.100, 750.0, fraction=1.0, duration=30.0).schedule
    ((0.0, 2.5), (30.0, 0.0))
    """
    total = float(gas_volume(liquid_volume, expansion_ratio))
    f = float(checks.fraction(fraction, "quench fraction", zero=True))
    tq = float(checks.positive(duration, "quench duration", "s"))
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    return Release(label, 0.0, ((0.0, f * total / tq + background), (tq, background)))


def loss_of_vacuum_case(
    liquid_volume, expansion_ratio, gas_rate, *, background_rate=0.0, label="loss of vacuum"
):
    """Case: a failed vessel boils at a steady gas rate until its liquid is gone.

    .. math:: R(t) = R_v + R_b \\; (t < \\varepsilon V_{liquid} / R_v), \\quad R_b \\text{ after}

    Parameters
    ----------
    liquid_volume : float or None
        Liquid in the vessel, [m^3]; ``None`` for a release that goes on (a vessel kept
        topped up).
    expansion_ratio : float
        Gas volume at room conditions per volume of liquid, [-].
    gas_rate : float
        The failed vessel's gas flow at room conditions, [m^3/s] (from the plan, or
        :func:`loss_of_vacuum_gas_rate`).
    background_rate : float, optional
        Normal boil-off of every other vessel, [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    Notes
    -----
    The steady rate ends when the vessel's inventory has left as gas.

    References
    ----------
    1. W. Lehmann and G. Zahn, Proc. ICEC 7, 1978 (from memory).

    Examples
    --------
    >>> loss_of_vacuum_case(0.250, 750.0, 0.5).schedule
    ((0.0, 0.5), (375.0, 0.0))
    """
    rv = float(checks.nonnegative(gas_rate, "loss-of-vacuum gas rate", "m^3/s"))
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    if liquid_volume is None or rv == 0.0:
        checks.positive(expansion_ratio, "expansion ratio", "")
        return Release(label, 0.0, ((0.0, rv + background),))
    total = float(gas_volume(liquid_volume, expansion_ratio))
    if total == 0.0:
        return Release(label, 0.0, ((0.0, background),))
    return Release(label, 0.0, ((0.0, rv + background), (total / rv, background)))


def boiloff_case(background_rate, *, label="normal boil-off"):
    """Case: the normal boil-off of every vessel in the room, going on for ever.

    .. math:: R(t) = R_b = \\sum_i \\varepsilon_i \\dot V_{liquid,i}

    Parameters
    ----------
    background_rate : float
        Sum of the vessels' boil-off, gas at room conditions, [m^3/s] (:func:`gas_rate`).
    label : str, optional
        Name of the case.

    Returns
    -------
    Release

    References
    ----------
    1. University of Oxford Safety Office, policy S4/03, Appendix 1 (normal evaporative
       losses).

    Examples
    --------
    >>> boiloff_case(1e-5).schedule
    ((0.0, 1e-05),)
    """
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    return Release(label, 0.0, ((0.0, background),))


def ventilation_failure_case(background_rate, *, label="ventilation failure"):
    """Case: the ventilation stops while the vessels keep boiling off.

    .. math:: C(t) = 20.9 \\, e^{-R_b t / V}

    Parameters
    ----------
    background_rate : float
        Sum of the vessels' normal boil-off, gas at room conditions, [m^3/s].
    label : str, optional
        Name of the case.

    Returns
    -------
    Release
        With ``ventilation_working = 0``.

    Notes
    -----
    Without any air exchange the oxygen falls for ever; the figure that matters is the
    time to the alarm level and to 19.5 % (:func:`time_to_level`). Real rooms leak some
    air, so this is conservative.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory: the no-ventilation formula).

    Examples
    --------
    >>> ventilation_failure_case(1e-5).ventilation_working
    0.0
    """
    background = float(checks.nonnegative(background_rate, "background boil-off", "m^3/s"))
    return Release(label, 0.0, ((0.0, background),), ventilation_working=0.0)


class _Segments(NamedTuple):
    start: np.ndarray  # [s]
    end: np.ndarray  # [s], inf for the last
    c_start: np.ndarray  # [%]
    c_end: np.ndarray  # [%], the asymptote for the last
    c_inf: np.ndarray  # [%], where each segment heads
    rate: np.ndarray  # [1/s], (Q + R) / V


def _segments(room_volume, ventilation, release, sudden_model, initial_percent) -> _Segments:
    """The exact piecewise solution: in each segment C = c_inf + (c_start - c_inf) e^{-k t}."""
    if not isinstance(release, Release):
        raise InputError("not a release case", expected="a Release", found=type(release).__name__)
    v = float(checks.positive(room_volume, "room volume", "m^3"))
    q = (
        float(checks.nonnegative(ventilation, "ventilation", "m^3/s"))
        * release.ventilation_working
    )
    c = float(_check_percent(initial_percent, "initial oxygen"))
    if release.sudden_volume > 0.0:
        c = float(_model(sudden_model)(release.sudden_volume, v, c))
    else:
        _model(sudden_model)
    pairs = list(release.schedule)
    if not pairs or pairs[0][0] > 0.0:
        pairs.insert(0, (0.0, 0.0))
    starts = [p[0] for p in pairs]
    ends = starts[1:] + [math.inf]
    rows = []
    for (t0, r), t1 in zip(pairs, ends, strict=True):
        flow = q + r
        if flow > 0.0:
            c_inf = AIR_OXYGEN_PERCENT * q / flow
            k = flow / v
            c_end = c_inf + (c - c_inf) * math.exp(-k * (t1 - t0)) if t1 < math.inf else c_inf
        else:
            c_inf, k, c_end = c, 0.0, c
        rows.append((t0, t1, c, c_end, c_inf, k))
        c = c_end
    return _Segments(*(np.array(col, dtype=float) for col in zip(*rows, strict=True)))


def oxygen_curve(
    time,
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
):
    """Oxygen over time for a release case in a ventilated, well-mixed room (exact, piecewise).

    A sudden volume at t = 0 (:func:`sudden_release_percent`), then in each interval of
    constant release rate :math:`R_i` the exact solution of the room's mass balance,
    each interval starting where the last one ended:

    .. math::

        C(t) = C_{\\infty,i} + (C(t_i) - C_{\\infty,i})\\, e^{-(Q + R_i)(t - t_i)/V},
        \\quad C_{\\infty,i} = 20.9 \\frac{Q}{Q + R_i}, \\quad t_i \\le t < t_{i+1}

    Parameters
    ----------
    time : float or ndarray
        Times since the case began, [s], 0 or more; any shape.
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s] (scaled by the case's ``ventilation_working``).
    release : Release
        The case (:func:`quench_case`, :func:`sudden_release_case`, ...).
    sudden_model : str, optional
        Model for the sudden volume, a key of :data:`SUDDEN_RELEASE_MODELS`.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float or ndarray
        Oxygen, [%], the shape of ``time``. At t = 0 the value just after any sudden
        release.

    Notes
    -----
    Exact for a perfectly mixed room; the error of the piecewise solution is rounding
    only. Vectorised over ``time``.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240, "Oxygen Deficiency Hazards (ODH)" (from
       memory: constant-rate release with ventilation, then recovery).

    Examples
    --------
    >>> case = quench_case(0.100, 750.0, duration=30.0)  # 75 m^3 of helium in 30 s
    >>> oxygen_curve([0.0, 30.0, 3600.0], 100.0, 200.0 / 3600.0, case).round(2)
    array([20.9 ,  9.95, 19.39])
    """
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    t = checks.nonnegative(time, "time", "s", inf=True)
    i = np.searchsorted(seg.start, t, side="right") - 1
    dt = t - seg.start[i]
    k = seg.rate[i]
    with np.errstate(invalid="ignore"):
        decay = np.where(k > 0.0, np.exp(-k * dt), 1.0)
    return checks.scalar(seg.c_inf[i] + (seg.c_start[i] - seg.c_inf[i]) * decay)


class Lowest(NamedTuple):
    """The lowest oxygen of a case and when it occurs."""

    percent: float  #: lowest oxygen [%]
    time_s: float  #: when [s]; ``inf`` where the curve only approaches it for ever


def lowest_oxygen(
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
    horizon=math.inf,
) -> Lowest:
    """Lowest oxygen of a release case, exactly (each piece of the curve is monotone).

    .. math:: C_{min} = \\min_i \\{ C(t_i), C(t_{i+1}) \\}, \\quad C(\\infty) = C_{\\infty,last}

    Parameters
    ----------
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].
    horizon : float, optional
        Look no further than this time, [s]; default for ever. A case without
        ventilation falls for ever, towards 0 %; a horizon (a working day, the time to
        the next check) gives the lowest level within it.

    Returns
    -------
    Lowest
        ``percent`` [%] and ``time_s`` [s]; the earliest time where there is a tie.

    Notes
    -----
    On each interval of constant rate the oxygen moves monotonically towards that
    interval's steady state, so the lowest value is at an interval's end, or the last
    steady state when the last interval falls towards it for ever.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> low = lowest_oxygen(100.0, 200.0 / 3600.0, quench_case(0.100, 750.0))
    >>> round(low.percent, 2), low.time_s
    (9.95, 30.0)
    """
    horizon = float(checks.positive(horizon, "horizon", "s", inf=True))
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    best, when = float(seg.c_start[0]), 0.0
    for t0, t1, cs, ce, ci, k in zip(*seg, strict=True):
        if t0 >= horizon:
            break
        if t1 > horizon:  # the curve where the horizon cuts this interval
            t1, ce = horizon, ci + (cs - ci) * math.exp(-k * (horizon - t0))
        if ce < best:
            best, when = float(ce), float(t1)
    return Lowest(best, when)


def time_to_level(
    level_percent,
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
) -> float:
    """First time the oxygen falls to a level during a release case (closed form per piece).

    .. math:: t = t_i + \\frac{V}{Q + R_i} \\ln \\frac{C(t_i) - C_{\\infty,i}}{C - C_{\\infty,i}}

    in the first interval whose curve reaches the level :math:`C`.

    Parameters
    ----------
    level_percent : float
        The level, [%], 0 to 20.9 (an alarm level, or 19.5).
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float
        Time [s]; 0 if the level is reached at once (a sudden release); ``inf`` if never.

    Notes
    -----
    "Reaching" means at or below the level. A curve that only approaches the level
    as its steady state never reaches it.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> case = ventilation_failure_case(1e-4)  # 0.36 m^3/h of gas, no air change
    >>> round(time_to_level(19.5, 100.0, 0.05, case) / 3600.0, 1)  # hours
    19.3
    """
    level = float(_check_percent(level_percent, "oxygen level"))
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    if seg.c_start[0] <= level:
        return 0.0
    for t0, _t1, cs, ce, ci, k in zip(*seg, strict=True):
        if ce <= level and ci < level < cs:
            return float(t0 + math.log((cs - ci) / (level - ci)) / k)
    return math.inf


def time_to_recover(
    level_percent,
    room_volume,
    ventilation,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
) -> float:
    """Time after which the oxygen stays at or above a level for good (re-entry time).

    .. math:: t_r = \\sup \\{ t : C(t) < C_{level} \\}

    found in closed form on each interval of constant rate.

    Parameters
    ----------
    level_percent : float
        The level, [%], 0 to 20.9.
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float
        Time since the case began, [s]; 0 if it never falls below; ``inf`` if it never
        comes back (the steady state is below the level, or there is no ventilation).

    Notes
    -----
    A well-mixed figure: check the air with a monitor before anyone enters.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> case = sudden_release_case(0.250, 750.0)
    >>> round(time_to_recover(19.5, 100.0, 600.0 / 3600.0, case) / 60.0, 1)  # minutes
    25.4
    """
    level = float(_check_percent(level_percent, "oxygen level"))
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    last = 0.0
    for t0, t1, cs, ce, ci, k in zip(*seg, strict=True):
        if cs < level <= ce and ci > cs:  # rises through the level in this interval
            if ci > level:
                last = max(last, float(t0 + math.log((ci - cs) / (ci - level)) / k))
            else:  # only approaches the level as its steady state
                last = math.inf
        elif ce < level:
            last = max(last, float(t1))
    return last


def ventilation_for_release(
    level_percent,
    room_volume,
    release,
    *,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
) -> float:
    """Smallest fresh-air flow that keeps a release case at or above a level throughout.

    The lowest oxygen rises with the ventilation (more fresh air never lowers the
    oxygen), so the flow is found by bisection between no ventilation and the steady-state
    flow of the largest rate:

    .. math::

        \\min_t C(t; Q) = C_{level}, \\qquad
        0 \\le Q \\le \\max_i R_i \\frac{C_{level}}{20.9 - C_{level}}

    Parameters
    ----------
    level_percent : float
        The level to hold, [%], 0 to 20.9.
    room_volume : float
        Free volume of the room, [m^3].
    release : Release
        The case.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].

    Returns
    -------
    float
        The room's fresh-air flow, [m^3/s] (before the case's ``ventilation_working``
        share); 0 if none is needed; ``inf`` if no ventilation can do it (a sudden release
        below the level, a case with failed ventilation, or a level of 20.9 %).

    Notes
    -----
    Returns the upper end of the final bracket (relative width 1e-10), so the flow
    returned always holds the level.

    References
    ----------
    1. Fermilab ES&H Manual, chapter 4240 (from memory).

    Examples
    --------
    >>> case = quench_case(0.100, 750.0, duration=30.0)
    >>> round(ventilation_for_release(19.5, 1000.0, case) * 3600.0)  # m^3/h, large room
    18653
    """
    level = float(_check_percent(level_percent, "oxygen level"))

    def low(q: float) -> float:
        return lowest_oxygen(
            room_volume, q, release, sudden_model=sudden_model, initial_percent=initial_percent
        ).percent

    if low(0.0) >= level:
        return 0.0
    start = _segments(room_volume, 0.0, release, sudden_model, initial_percent).c_start[0]
    if start < level or release.ventilation_working == 0.0 or level >= AIR_OXYGEN_PERCENT:
        return math.inf
    top_rate = max(rate for _, rate in release.schedule)
    hi = top_rate * level / (AIR_OXYGEN_PERCENT - level) / release.ventilation_working
    hi *= 1.0 + 1e-9
    while low(hi) < level:  # rounding at the exact bound only
        hi *= 1.0 + 1e-6
    lo = 0.0
    while hi - lo > 1e-7 * hi:  # a flow to seven figures: far finer than any fan is set
        mid = 0.5 * (lo + hi)
        if low(mid) >= level:
            hi = mid
        else:
            lo = mid
    return hi


@dataclass(frozen=True)
class ReleaseAssessment:
    """The figures of one release case in one room (see :func:`assess_release`)."""

    label: str
    lowest_percent: float  #: lowest oxygen [%]
    lowest_time_s: float  #: when [s]; inf if approached for ever
    time_to_alarm_s: float  #: first time at or below the alarm level [s]; inf if never
    time_to_deficient_s: float  #: first time at or below 19.5 % [s]; inf if never
    time_to_recover_s: float  #: after this the oxygen stays at or above the alarm level [s]
    sudden_drop_percent: float  #: oxygen just after the sudden part [%]; initial if none
    ventilation_needed: float  #: fresh air to stay at or above the alarm level [m^3/s]
    continuous_ventilation_needed: float  #: the same for the continuous part alone [m^3/s]
    minimum_room_volume: float  #: room for the sudden part to stay above the alarm [m^3]


def assess_release(
    room_volume,
    ventilation,
    release,
    *,
    alarm_percent=DEFICIENT_PERCENT,
    sudden_model=DEFAULT_SUDDEN_MODEL,
    initial_percent=AIR_OXYGEN_PERCENT,
    horizon=math.inf,
) -> ReleaseAssessment:
    """All the figures of one release case in one room, from the well-mixed room model.

    .. math::

        C_{min}, \\; t(C = C_{alarm}), \\; t(C = 19.5), \\; t_{recover}, \\;
        Q_{needed}, \\; V_{room,min}

    Parameters
    ----------
    room_volume : float
        Free volume of the room, [m^3].
    ventilation : float
        The room's fresh-air flow, [m^3/s].
    release : Release
        The case.
    alarm_percent : float, optional
        The site's alarm level, [%], 0 to 20.9; default 19.5.
    sudden_model : str, optional
        Model for the sudden volume.
    initial_percent : float, optional
        Oxygen before the case, [%].
    horizon : float, optional
        Time up to which the lowest oxygen is sought, [s] (:func:`lowest_oxygen`); the
        other figures look for ever.

    Returns
    -------
    ReleaseAssessment

    Notes
    -----
    ``continuous_ventilation_needed`` leaves out the sudden volume, so that a verdict can
    name the ventilation a continuous release calls for even where a sudden release in
    the same case is beyond any ventilation.

    References
    ----------
    1. As :func:`oxygen_curve`.

    Examples
    --------
    >>> a = assess_release(100.0, 200.0 / 3600.0, quench_case(0.100, 750.0))
    >>> round(a.lowest_percent, 2), round(a.time_to_alarm_s, 1), a.ventilation_needed > 0
    (9.95, 2.8, True)
    """
    alarm = float(_check_percent(alarm_percent, "alarm level"))
    kw = {"sudden_model": sudden_model, "initial_percent": initial_percent}
    low = lowest_oxygen(room_volume, ventilation, release, horizon=horizon, **kw)
    seg = _segments(room_volume, ventilation, release, sudden_model, initial_percent)
    continuous = Release(release.label, 0.0, release.schedule, release.ventilation_working)
    if release.sudden_volume > 0.0:
        v_min = float(minimum_room_volume(release.sudden_volume, alarm, sudden_model))
    else:
        v_min = 0.0
    return ReleaseAssessment(
        label=release.label,
        lowest_percent=low.percent,
        lowest_time_s=low.time_s,
        time_to_alarm_s=time_to_level(alarm, room_volume, ventilation, release, **kw),
        time_to_deficient_s=time_to_level(
            DEFICIENT_PERCENT, room_volume, ventilation, release, **kw
        ),
        time_to_recover_s=time_to_recover(alarm, room_volume, ventilation, release, **kw),
        sudden_drop_percent=float(seg.c_start[0]),
        ventilation_needed=ventilation_for_release(alarm, room_volume, release, **kw),
        continuous_ventilation_needed=ventilation_for_release(
            alarm, room_volume, continuous, **kw
        ),
        minimum_room_volume=v_min,
    )


# ---------------------------------------------------------------------------------------
# Physiological effects of low oxygen
# ---------------------------------------------------------------------------------------


class EffectBand(NamedTuple):
    """A band of oxygen levels and what breathing such air does, with its source."""

    low_percent: float  #: lower end of the band [%], included
    high_percent: float  #: upper end [%], excluded (20.9 included in the top band)
    effect: str  #: in plain words
    source: str  #: where the band comes from


_CGA_SB2 = (
    "Compressed Gas Association, CGA SB-2, 'Oxygen-Deficient Atmospheres' (from memory); "
    "the same bands appear in CGA P-12, 'Safe Handling of Cryogenic Liquids' (from memory)"
)

#: Effects of breathing air low in oxygen at sea-level pressure, highest band first.
#: Rough guides: people differ, and effort, health and altitude shift every band (the
#: body responds to the oxygen partial pressure, so at altitude the same effects come at
#: higher percentages).
OXYGEN_EFFECTS: tuple[EffectBand, ...] = (
    EffectBand(
        19.5,
        AIR_OXYGEN_PERCENT,
        "Normal work is possible; 19.5 % is the lowest level at which anyone should "
        "enter without breathing apparatus.",
        "US OSHA 29 CFR 1910.134(b), definition of an oxygen-deficient atmosphere (from "
        "memory); fresh air 20.9 %, U.S. Standard Atmosphere 1976 (from memory)",
    ),
    EffectBand(
        15.0,
        19.5,
        "Hard physical work becomes difficult and coordination may suffer; people with "
        "heart, lung or circulation problems may show early symptoms.",
        _CGA_SB2,
    ),
    EffectBand(
        12.0,
        15.0,
        "Breathing deepens and the pulse quickens on effort; coordination, perception "
        "and judgement are impaired.",
        _CGA_SB2,
    ),
    EffectBand(
        10.0,
        12.0,
        "Breathing becomes faster and deeper still, judgement is poor and the lips turn blue.",
        _CGA_SB2,
    ),
    EffectBand(
        8.0,
        10.0,
        "The mind fails: fainting and loss of consciousness, a grey face, blue lips, "
        "nausea and vomiting.",
        _CGA_SB2,
    ),
    EffectBand(
        6.0,
        8.0,
        "Fatal after about 8 minutes and fatal to half of those exposed after about 6; "
        "recovery with treatment is possible after 4 to 5 minutes.",
        _CGA_SB2,
    ),
    EffectBand(
        0.0,
        6.0,
        "Coma within about 40 seconds, convulsions, breathing stops, death.",
        _CGA_SB2,
    ),
)


def oxygen_effect(percent) -> EffectBand:
    """The band of :data:`OXYGEN_EFFECTS` an oxygen level falls in (table look-up).

    .. math:: C_{low} \\le C < C_{high}

    Parameters
    ----------
    percent : float
        Oxygen, [%], 0 to 20.9.

    Returns
    -------
    EffectBand

    Notes
    -----
    Sea-level figures for a healthy adult; see :data:`OXYGEN_EFFECTS`.

    References
    ----------
    1. Compressed Gas Association, CGA SB-2, "Oxygen-Deficient Atmospheres" (from
       memory).
    2. US OSHA 29 CFR 1910.134(b) (from memory).

    Examples
    --------
    >>> oxygen_effect(11.0).low_percent
    10.0
    """
    c = float(_check_percent(percent, "oxygen level"))
    for band in OXYGEN_EFFECTS:
        if band.low_percent <= c:
            return band
    return OXYGEN_EFFECTS[-1]  # pragma: no cover - the last band starts at 0


# ---------------------------------------------------------------------------------------
# Verdict and cautions
# ---------------------------------------------------------------------------------------


def _round_up(x: float, digits: int = 2) -> float:
    """Round up to ``digits`` significant figures (what to ask for, never less)."""
    if not x > 0.0 or not math.isfinite(x):
        return x
    step = 10.0 ** (math.floor(math.log10(x)) - digits + 1)
    return math.ceil(x / step - 1e-9) * step


def _number(x: float) -> str:
    return f"{x:,.0f}" if x >= 100 else f"{x:.3g}"


def _within(t: float, up: bool = False) -> str:
    """A time in words, rounded down (time to an alarm) or up (time to recover)."""
    whole = math.ceil if up else math.floor
    if t <= 60.0:
        return "within a minute"
    if t < 2 * 3600.0:
        return f"within {max(1, whole(t / 60.0))} minutes"
    return f"within {whole(t / 3600.0)} hours"


#: Above this many air changes per hour a ventilation figure is not worth asking for:
#: laboratories run at about 6 to 20-odd air changes per hour (common practice).
PRACTICAL_AIR_CHANGES_PER_HOUR = 30.0


def room_verdict(
    lowest_percent,
    time_to_alarm_s,
    alarm_percent=DEFICIENT_PERCENT,
    *,
    ventilation=None,
    ventilation_needed=None,
    ventilation_case="a continuous release",
    sudden_drop_percent=None,
    minimum_room_volume=None,
    room_volume=None,
    time_to_recover_s=None,
    practical_air_changes_per_hour=PRACTICAL_AIR_CHANGES_PER_HOUR,
) -> list[str]:
    """Plain-words verdict for a room from its worst case (rules of the trade, our words).

    .. math:: C_{min} < C_{alarm} \\Rightarrow \\text{monitor, alarm, no entry, ...}

    Parameters
    ----------
    lowest_percent : float
        Lowest oxygen over the room's cases, [%].
    time_to_alarm_s : float
        Shortest time to the alarm level over the cases, [s]; ``inf`` if never.
    alarm_percent : float, optional
        The site's alarm level, [%], 0 to 20.9.
    ventilation : float, optional
        The room's fresh-air flow now, [m^3/s].
    ventilation_needed : float, optional
        Fresh air that keeps the releases without a sudden part above the alarm level,
        [m^3/s] (the largest ``continuous_ventilation_needed`` of the cases).
    ventilation_case : str, optional
        What that flow is for, in words ("a quench", "a loss of vacuum").
    sudden_drop_percent : float, optional
        Lowest oxygen just after a sudden release, [%].
    minimum_room_volume : float, optional
        Room a sudden release needs to stay above the alarm level, [m^3].
    room_volume : float, optional
        The room's free volume, [m^3]; needed to judge whether a flow is practical.
    time_to_recover_s : float, optional
        Longest time before the oxygen is back above the alarm level for good, [s].
    practical_air_changes_per_hour : float, optional
        Above this, a flow is reported as beyond practical ventilation, [1/h].

    Returns
    -------
    list of str
        Short sentences, most important first.

    Notes
    -----
    Flows are given in m^3/h and rounded up to two significant figures; the time to the
    alarm level is rounded down, the time to recover up. The sentences are a planning
    aid: local codes, the site's safety office and licensed practice decide
    (:data:`PLANNING_AID_NOTICE`).

    References
    ----------
    1. US OSHA 29 CFR 1910.134 (from memory: 19.5 %).
    2. Fermilab ES&H Manual, chapter 4240 (from memory: monitors, alarms and ventilation
       as controls).

    Examples
    --------
    >>> for line in room_verdict(3.2, 0.0, 19.5)[:2]:
    ...     print(line)
    An oxygen monitor with an audible and visible alarm is needed in this room, set to alarm at 19.5 %.
    After a sudden release the oxygen would fall below the alarm level at once: leave as soon as the alarm sounds.
    """
    low = float(_check_percent(lowest_percent, "lowest oxygen"))
    alarm = float(_check_percent(alarm_percent, "alarm level"))
    t_alarm = float(checks.nonnegative(time_to_alarm_s, "time to the alarm level", "s", inf=True))
    v_room = None
    if room_volume is not None:
        v_room = float(checks.positive(room_volume, "room volume", "m^3"))
    safe = max(alarm, DEFICIENT_PERCENT)
    lines: list[str] = []
    if low >= safe:
        lines.append(
            f"In every case estimated the oxygen stays at or above {low:.1f} %, above the "
            f"alarm level of {alarm:.1f} %: these figures alone do not call for an oxygen "
            "monitor, but the safety office may still ask for one."
        )
        return lines
    if low >= alarm:
        lines.append(
            f"The oxygen could fall to {low:.1f} %, below the {DEFICIENT_PERCENT} % that "
            f"defines an oxygen-deficient atmosphere, without reaching the alarm level of "
            f"{alarm:.1f} %: set the alarm higher."
        )
    else:
        lines.append(
            "An oxygen monitor with an audible and visible alarm is needed in this room, "
            f"set to alarm at {alarm:.1f} %."
        )
        if t_alarm <= 1.0:
            lines.append(
                "After a sudden release the oxygen would fall below the alarm level at "
                "once: leave as soon as the alarm sounds."
            )
        elif math.isfinite(t_alarm):
            lines.append(
                f"The oxygen could reach the alarm level {_within(t_alarm)} of a release "
                "starting: leave as soon as the alarm sounds."
            )
    lines.append(
        f"Do not enter after an alarm until the monitor shows the oxygen back above "
        f"{safe:.1f} %, and never go in to help someone who has collapsed: raise the "
        "alarm and wait for rescuers with breathing apparatus."
    )
    if time_to_recover_s is not None:
        t_rec = float(checks.nonnegative(time_to_recover_s, "time to recover", "s", inf=True))
        if math.isfinite(t_rec) and t_rec > 0.0:
            lines.append(
                f"With the present ventilation the oxygen is back above {alarm:.1f} % "
                f"{_within(t_rec, up=True)} of the start of the worst case."
            )
        elif not math.isfinite(t_rec):
            lines.append(
                f"With the present ventilation the oxygen does not come back above "
                f"{alarm:.1f} % while the release lasts."
            )
    if ventilation_needed is not None:
        need = float(
            checks.nonnegative(ventilation_needed, "ventilation needed", "m^3/s", inf=True)
        )
        now = (
            None
            if ventilation is None
            else float(checks.nonnegative(ventilation, "ventilation", "m^3/s"))
        )
        if math.isfinite(need) and need > 0.0 and (now is None or need > now):
            ask = _number(_round_up(need * 3600.0))
            changes = None if v_room is None else need * 3600.0 / v_room
            if changes is not None and changes > practical_air_changes_per_hour:
                lines.append(
                    f"No practical ventilation keeps the oxygen above the alarm level during "
                    f"{ventilation_case}: it would take {ask} m^3/h of fresh air, "
                    f"{_number(changes)} air changes per hour. Lead the gas outdoors or keep "
                    "less liquid in this room."
                )
            else:
                have = "" if now is None else f" (it has {_number(now * 3600.0)} m^3/h)"
                lines.append(
                    f"Ask the facility for at least {ask} m^3/h of fresh air{have} to keep "
                    f"the oxygen above the alarm level during {ventilation_case}."
                )
    if sudden_drop_percent is not None:
        drop = float(_check_percent(sudden_drop_percent, "oxygen after a sudden release"))
        if drop < alarm:
            text = (
                "No ventilation prevents the drop after a sudden release: the room is too "
                "small for this inventory."
            )
            if minimum_room_volume is not None:
                need_v = float(
                    checks.nonnegative(minimum_room_volume, "minimum room volume", "m^3", inf=True)
                )
                if math.isfinite(need_v):
                    has = "" if v_room is None else f" (it has {_number(v_room)} m^3)"
                    text += (
                        f" It would need at least {_number(_round_up(need_v))} m^3{has}; keep "
                        "less liquid here or move it to a larger room."
                    )
            lines.append(text)
    band = oxygen_effect(low)
    lines.append(f"At the lowest estimate, {low:.1f} %: {band.effect}")
    return lines


#: The sentence every caution ends with.
DEFERRAL = "Local codes, the site's safety office and licensed practice decide."


class Caution(NamedTuple):
    """A handling caution: a short title and its text (in the tool's own words)."""

    title: str
    text: str


#: Cryogen-handling cautions printed with the room figures, each ending in
#: :data:`DEFERRAL`. Written for this tool.
CAUTIONS: tuple[Caution, ...] = (
    Caution(
        "Asphyxiation without warning",
        "Helium, nitrogen and argon have no smell and no colour, and air short of oxygen "
        "gives no feeling of breathlessness: the urge to breathe comes from carbon "
        "dioxide, not from a lack of oxygen. A person can lose judgement and then "
        "consciousness within a few breaths without noticing anything wrong. Leave at "
        "once when an oxygen alarm sounds, and never go in after someone who has "
        "collapsed without breathing apparatus. " + DEFERRAL,
    ),
    Caution(
        "Cold burns and eye protection",
        "Cryogenic liquid and cold gas burn skin as heat does, and a splash can blind. "
        "Wear a full face shield over safety glasses when pouring or transferring, "
        "loose-fitting insulated gloves that can be thrown off at once, long sleeves and "
        "closed shoes, and no rings or watches. Bare skin can freeze to cold metal. " + DEFERRAL,
    ),
    Caution(
        "Liquid trapped in a closed volume",
        "Liquid shut into a pipe, a valve section or a vessel turns to gas as it warms "
        "and can raise the pressure far beyond what the part can hold. Every volume that "
        "can trap liquid, for example between two closed valves, needs its own relief "
        "valve or burst disc, sized for the worst heat input, free of ice and never "
        "capped or blocked. " + DEFERRAL,
    ),
    Caution(
        "Oxygen condensing on cold surfaces",
        "Surfaces colder than about 90 K (the boiling point of oxygen), such as lines "
        "and traps cooled by liquid nitrogen or uninsulated helium transfer lines, "
        "condense liquid out of the air that is richer in oxygen than air itself. "
        "Dripping onto oil, grease, wood, fabric or other organic matter it can start a "
        "violent fire. Keep such surfaces insulated or enclosed and clean of organic "
        "matter, and use only parts cleaned for oxygen service near them. " + DEFERRAL,
    ),
    Caution(
        "Ice plugs in helium necks",
        "Air or moisture that gets into the neck of a helium vessel freezes there into a "
        "solid plug; the boil-off then has no way out and the pressure climbs. Keep "
        "necks closed with a non-return valve or relief fitting, never leave a vessel "
        "open to the air, and if a neck seems blocked, clear the area and call someone "
        "trained to clear it. " + DEFERRAL,
    ),
    Caution(
        "Gas gathering high and low",
        "Warm helium rises and collects under ceilings and in roof voids; cold helium "
        "just after a quench can first spill downwards. Cold nitrogen gas and argon are "
        "heavier than air and flow into pits, trenches, basements and stairwells, where "
        "the oxygen can stay low long after the room above has cleared. Place oxygen "
        "sensors where the gas will gather and treat low spaces near cryogens as "
        "confined spaces. " + DEFERRAL,
    ),
    Caution(
        "Dewars and lifts",
        "Never ride in a lift with a dewar of liquid (common practice): if the lift stops "
        "between floors, the boil-off can fill the small car with gas within minutes. "
        "Send the dewar up alone, with a notice at each landing and someone waiting to "
        "receive it, and keep others from calling the lift meanwhile. " + DEFERRAL,
    ),
    Caution(
        "Quench vent lines led outdoors",
        "A quenching magnet can release most of its helium within a minute. Lead the "
        "quench vent line and the cryostat's relief devices outdoors, to a place away "
        "from air intakes, windows and walkways, through a line wide enough not to build "
        "up back pressure, and keep it free of ice and obstructions. " + DEFERRAL,
    ),
)

#: Printed with every oxygen figure.
PLANNING_AID_NOTICE = (
    "These oxygen figures are a planning aid, not a risk assessment. They assume the "
    "released gas mixes evenly through the whole room at once; near the release, and in "
    "low or high spots, the air can be far worse. " + DEFERRAL
)
