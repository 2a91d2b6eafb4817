"""Gas from a liquid, and the oxygen left in a room after a sudden release: well-mixed,
displacement and dilution models, and the room volume a release calls for.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from .. import checks
from .constants import (
    AIR_OXYGEN_PERCENT,
    DEFAULT_SUDDEN_MODEL,
    LOSS_OF_VACUUM_HEAT_FLUX_BARE,
    check_percent,
)

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
    c0 = check_percent(initial_percent, "initial oxygen")
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
    c0 = check_percent(initial_percent, "initial oxygen")
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
    c0 = check_percent(initial_percent, "initial oxygen")
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
        from ..errors import UnknownNameError

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
    c = check_percent(level_percent, "oxygen level")
    with np.errstate(divide="ignore", invalid="ignore"):
        v = _ROOM_VOLUME_FOR[model](vg, c)
    v = np.where(vg == 0.0, 0.0, np.where(c >= AIR_OXYGEN_PERCENT, np.inf, v))
    return checks.scalar(v)


# ---------------------------------------------------------------------------------------
