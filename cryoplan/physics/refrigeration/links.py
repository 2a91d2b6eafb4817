"""Thermal links between the stages of a cooler: fixed conductances or conductivity
integrals over a length and an area.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from .. import checks
from ..errors import InputError, TemperatureError

# links between stages


@dataclass(frozen=True)
class Link:
    """A thermal link between two stages: a given conductance, or a conductor of given shape.

    Heat flows into ``first`` at :math:`G (T_{second} - T_{first})`, or, for a conductor of
    cross-section :math:`A` and length :math:`L`, at
    :math:`(A/L) \\int_{T_{first}}^{T_{second}} k\\,dT`; the same heat leaves ``second``.

    Parameters
    ----------
    first, second : int or str
        The two stages, by index or by name.
    conductance : float, optional
        A given conductance, [W/K].
    conductivity : callable, optional
        ``k(T)``, [W/(m K)], vectorised in ``T`` [K].
    conductivity_integral : callable, optional
        ``I(T_low, T_high)``, [W/m], the integral of ``k dT``.
    area : float, optional
        Total cross-section of the conductor(s), [m^2].
    length : float, optional
        Length, [m].

    Give exactly one of ``conductance``, ``conductivity`` or ``conductivity_integral``; the
    last two need ``area`` and ``length``.

    Examples
    --------
    >>> Link(0, 1, conductance=0.5).conductance
    0.5
    """

    first: int | str
    second: int | str
    conductance: float | None = None
    conductivity: Callable | None = None
    conductivity_integral: Callable | None = None
    area: float | None = None
    length: float | None = None

    def __post_init__(self) -> None:
        given = [
            self.conductance is not None,
            self.conductivity is not None,
            self.conductivity_integral is not None,
        ]
        if sum(given) != 1:
            raise InputError(
                "a link between stages needs exactly one of a conductance, a conductivity "
                "or a conductivity integral",
                expected="conductance in W/K, or a material with area and length",
                found=f"{sum(given)} of them",
            )
        if self.conductance is not None:
            g = self.conductance
            if not checks.is_number(g) or not math.isfinite(g) or g < 0.0:
                raise InputError(
                    "a link's conductance must be 0 W/K or more",
                    expected="a conductance of 0 W/K or more",
                    found=checks.short(g),
                )
        else:
            for name in ("area", "length"):
                v = getattr(self, name)
                if v is None or not checks.is_number(v) or not math.isfinite(v) or v <= 0.0:
                    raise InputError(
                        f"a link through a conductor needs a {name} above 0",
                        key=name,
                        expected=f"a {name} above 0",
                        found=checks.short(v),
                    )


def link_conductance(conductivity_integral, area, length, T_cold, T_warm):
    """Mean conductance of a conductor between two temperatures, from its conductivity integral.

    .. math::

        G = \\frac{A}{L} \\frac{\\int_{T_c}^{T_w} k\\,dT}{T_w - T_c}

    Parameters
    ----------
    conductivity_integral : callable
        ``I(T_low, T_high)``, [W/m].
    area : float
        Cross-section, [m^2].
    length : float
        Length, [m].
    T_cold, T_warm : float
        End temperatures, [K], ``T_cold < T_warm``.

    Returns
    -------
    float
        Conductance, [W/K].

    Notes
    -----
    Exact for the heat flow between those two end temperatures (steady conduction, no
    heat sunk along the way).

    References
    ----------
    1. Ekin, J. W., *Experimental Techniques for Low-Temperature Measurements*, Oxford
       University Press, 2006, section 2.2 (conductivity integrals).

    Examples
    --------
    A conductor with k = 2 W/(m K), 1 cm^2 by 0.1 m:

    >>> round(link_conductance(lambda a, b: 2.0 * (b - a), 1e-4, 0.1, 4.0, 50.0), 6)
    0.002
    """
    Tc = float(checks.temperature(T_cold, "T_cold"))
    Tw = float(checks.temperature(T_warm, "T_warm"))
    if Tw <= Tc:
        raise TemperatureError(f"T_warm ({Tw:g} K) must lie above T_cold ({Tc:g} K)")
    return float(area) / float(length) * float(conductivity_integral(Tc, Tw)) / (Tw - Tc)


# --------------------------------------------------------------------------------------
