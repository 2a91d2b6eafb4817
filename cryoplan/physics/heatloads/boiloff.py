"""Boil-off rate, hold time and refill calendar of a cryogen bath under a steady heat load."""

from __future__ import annotations

import math
from datetime import datetime, timedelta

import numpy as np

from .. import checks
from ..errors import InputError

# boil-off, hold time, refills
# --------------------------------------------------------------------------------------------


def boiloff_rate(heat_load, latent_heat, liquid_density) -> float | np.ndarray:
    r"""Volume of liquid boiled per second by a steady heat load.

    .. math::

        \dot V = \frac{\dot Q}{h_{fg}\, \rho_l}

    Parameters
    ----------
    heat_load : float or ndarray
        Heat into the bath, [W] (>= 0).
    latent_heat : float or ndarray
        Latent heat of vaporisation at the bath pressure, [J/kg].
    liquid_density : float or ndarray
        Density of the saturated liquid, [kg/m^3].

    Returns
    -------
    float or ndarray
        Liquid volume boiled, [m^3/s].

    Notes
    -----
    The latent heat alone: the vapour leaves at the bath temperature, and the vapour that
    fills the space left by the liquid is neglected (a few per cent for helium at 1 atm,
    where the vapour is about 1/7.4 as dense as the liquid). Common practice: 1 W boils about
    1.4 L/h of liquid helium and about 0.022 L/h of liquid nitrogen.

    Caution: the boil-off must vent freely. A closed or blocked vessel builds up pressure, and
    the vented gas displaces the room's oxygen (each litre of liquid helium makes some 750
    litres of gas at room temperature). Relief devices, venting and room ventilation follow
    local codes, the site's safety office and licensed practice.

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, ch. 1.

    Examples
    --------
    >>> round(boiloff_rate(1.0, 20.56e3, 124.7) * 3.6e6, 3)    # L/h of helium per watt
    1.404
    """
    Q = checks.nonnegative(heat_load, "heat_load", "W", key="heat_load")
    h = checks.positive(latent_heat, "latent_heat", "J/kg", key="latent_heat")
    rho = checks.positive(liquid_density, "liquid_density", "kg/m^3", key="liquid_density")
    return checks.scalar(Q / (h * rho))


def hold_time(usable_volume, heat_load, latent_heat, liquid_density) -> float | np.ndarray:
    r"""Time a bath lasts under a steady heat load: usable liquid over the boil-off rate.

    .. math::

        t = \frac{V\, h_{fg}\, \rho_l}{\dot Q}

    Parameters
    ----------
    usable_volume : float or ndarray
        Liquid that may boil away (full volume minus the refill level), [m^3].
    heat_load : float or ndarray
        Heat into the bath, [W]; zero gives an infinite hold time.
    latent_heat : float or ndarray
        Latent heat of vaporisation, [J/kg].
    liquid_density : float or ndarray
        Density of the saturated liquid, [kg/m^3].

    Returns
    -------
    float or ndarray
        Hold time, [s].

    Notes
    -----
    As :func:`boiloff_rate`; the load is taken as constant while the level falls.

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, ch. 1.

    Examples
    --------
    100 L of helium under 0.5 W:

    >>> round(hold_time(0.1, 0.5, 20.56e3, 124.7) / 3600.0, 1)     # hours
    142.4
    """
    V = checks.nonnegative(usable_volume, "usable_volume", "m^3", key="usable_volume")
    Q = checks.nonnegative(heat_load, "heat_load", "W", key="heat_load")
    h = checks.positive(latent_heat, "latent_heat", "J/kg", key="latent_heat")
    rho = checks.positive(liquid_density, "liquid_density", "kg/m^3", key="liquid_density")
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(Q > 0.0, V * h * rho / np.where(Q > 0.0, Q, 1.0), np.inf)
    return checks.scalar(t)


def refill_schedule(
    start_datetime: datetime, hold_seconds: float, horizon_seconds: float, limit: int = 10000
) -> list[datetime]:
    r"""Dates on which a bath filled at ``start_datetime`` falls to its refill level.

    .. math::

        t_j = t_0 + j\, t_\mathrm{hold}, \qquad j = 1, 2, \ldots, \quad t_j \le t_0 + t_H

    Parameters
    ----------
    start_datetime : datetime
        When the bath is full.
    hold_seconds : float
        Hold time from full to the refill level, [s] (> 0; infinite gives no refills).
    horizon_seconds : float
        How far ahead to plan, [s] (>= 0).
    limit : int, optional
        Largest number of dates returned before the request is refused.

    Returns
    -------
    list of datetime
        Refill dates after the start, each bath refilled to full.

    Notes
    -----
    Each refill is assumed to restore the bath to full at once, and the load to stay steady.

    References
    ----------
    1. Boil-off and hold time as :func:`hold_time`.

    Examples
    --------
    >>> from datetime import datetime
    >>> dates = refill_schedule(datetime(2025, 3, 3, 9, 0), 3.5 * 86400, 14 * 86400)
    >>> [d.strftime("%a %d %H:%M") for d in dates]
    ['Thu 06 21:00', 'Mon 10 09:00', 'Thu 13 21:00', 'Mon 17 09:00']
    """
    if not isinstance(start_datetime, datetime):
        raise InputError(
            "the refill calendar needs a start date and time",
            key="start",
            expected="a date and time",
            found=repr(start_datetime),
        )
    hold = float(hold_seconds)
    if math.isnan(hold) or hold <= 0.0:
        raise InputError(
            "hold time must be positive",
            key="hold_seconds",
            expected="> 0 s",
            found=repr(hold_seconds),
        )
    horizon = float(
        checks.nonnegative(horizon_seconds, "horizon_seconds", "s", key="horizon_seconds")
    )
    if math.isinf(hold):
        return []
    count = int(math.floor(horizon / hold * (1.0 + 1e-12)))
    if count > limit:
        raise InputError(
            "too many refills to list",
            key="hold_seconds",
            expected=f"at most {limit} refills within the horizon",
            found=f"{count}",
        )
    return [start_datetime + timedelta(seconds=j * hold) for j in range(1, count + 1)]
