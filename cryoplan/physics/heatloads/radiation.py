"""Radiation between gray surfaces and through multilayer insulation (MLI)."""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from .. import checks
from ..errors import InputError, UnknownNameError
from ._common import _TORR, _area_ratio, _const

# --------------------------------------------------------------------------------------------
# radiation
# --------------------------------------------------------------------------------------------


def gray_body_exchange(
    area, T_cold, T_warm, emissivity_cold, emissivity_warm, area_ratio=0.0
) -> float | np.ndarray:
    r"""Net radiation onto a cold gray surface from a warmer one (diffuse gray-body exchange).

    .. math::

        \dot Q = \frac{\sigma A_c \left(T_w^4 - T_c^4\right)}
                      {\dfrac{1}{\varepsilon_c} + \dfrac{A_c}{A_w}
                       \left(\dfrac{1}{\varepsilon_w} - 1\right)}

    Parameters
    ----------
    area : float or ndarray
        Area of the cold surface :math:`A_c`, [m^2].
    T_cold, T_warm : float or ndarray
        Temperatures of the cold and the warm surface, [K].
    emissivity_cold, emissivity_warm : float or ndarray
        Total hemispherical emissivities, in (0, 1], [-].
    area_ratio : float or ndarray, optional
        :math:`A_c/A_w`, in [0, 1], the cold surface being enclosed by the warm one
        (concentric cylinders or spheres). ``1`` is the parallel-plate (or closely spaced
        concentric) case, :math:`1/\varepsilon_c + 1/\varepsilon_w - 1`; ``0`` (the default)
        is a small cold body in a large warm enclosure, where only the cold emissivity counts.
        For a given pair of emissivities the default gives the largest load.

    Returns
    -------
    float or ndarray
        Heat absorbed by the cold surface, [W]; negative where ``T_cold > T_warm``.

    Notes
    -----
    Gray, diffuse surfaces, a non-participating medium (vacuum), the cold surface convex and
    seeing only the warm one. Emissivities of metals fall with temperature; use values at
    the temperature of each surface.

    References
    ----------
    1. Incropera, F. P., DeWitt, D. P., "Fundamentals of Heat and Mass Transfer", Wiley,
       chapter 13 (radiation exchange between surfaces, two-surface enclosure).
    2. Barron, R. F., "Cryogenic Systems", 2nd ed., Oxford University Press, 1985, ch. 8.

    Examples
    --------
    >>> round(gray_body_exchange(1.0, 77.0, 300.0, 1.0, 1.0), 1)        # black bodies
    457.3
    >>> round(gray_body_exchange(1.0, 77.0, 300.0, 0.05, 0.05, 1.0), 3)  # parallel plates
    11.726
    """
    A = checks.nonnegative(area, "area", "m^2", key="area")
    Tc = checks.temperature(T_cold, "T_cold")
    Tw = checks.temperature(T_warm, "T_warm")
    ec = checks.fraction(emissivity_cold, "emissivity_cold", key="emissivity_cold")
    ew = checks.fraction(emissivity_warm, "emissivity_warm", key="emissivity_warm")
    ratio = _area_ratio(area_ratio)
    denominator = 1.0 / ec + ratio * (1.0 / ew - 1.0)
    return checks.scalar(_const.sigma * A * (Tw**4 - Tc**4) / denominator)


# --------------------------------------------------------------------------------------------
# multilayer insulation
# --------------------------------------------------------------------------------------------

#: Lockheed correlation for double-aluminised polyester film with silk-net spacers, the
#: coefficients for q in W/m^2 with the layer density in layers per centimetre and the
#: interstitial pressure in torr. Keller, Cunnington and Glassford, NASA CR-134477 (1974),
#: Lockheed equation; values from memory, as they are reproduced in later NASA work.
MLI_LOCKHEED_DAP_NET: dict[str, float] = {
    "solid": 8.95e-8,  # C_s, solid (spacer) conduction; from memory
    "density_exponent": 2.56,  # exponent of the layer density; from memory
    "radiation": 5.39e-10,  # C_r; from memory
    "emissivity": 0.031,  # room-temperature emissivity of the aluminised film; from memory
    "radiation_exponent": 4.67,  # from memory
    "gas": 1.46e4,  # C_g, interstitial gas conduction, pressure in torr; from memory
    "gas_exponent": 0.52,  # from memory
}

#: Rules of thumb for well-installed multilayer insulation, [W/m^2], keyed by the (warm, cold)
#: boundary temperatures in K. Common practice (e.g. Ekin, "Experimental Techniques for
#: Low-Temperature Measurements", Oxford, 2006, ch. 2; from memory).
MLI_COMMON_PRACTICE: dict[tuple[float, float], tuple[float, float]] = {
    (300.0, 77.0): (0.5, 1.5),  # "about 1 W/m^2"; common practice
    (77.0, 4.2): (0.05, 0.1),  # common practice
}


def _mli_lockheed(T_cold, T_warm, layers, layer_density, emissivity, pressure):
    c = MLI_LOCKHEED_DAP_NET
    n_cm = layer_density / 100.0  # layers per centimetre, as the correlation is written
    Tm = 0.5 * (T_warm + T_cold)
    solid = c["solid"] * n_cm ** c["density_exponent"] * Tm * (T_warm - T_cold) / (layers + 1.0)
    p = c["radiation_exponent"]
    radiation = c["radiation"] * emissivity * (T_warm**p - T_cold**p) / layers
    g = c["gas_exponent"]
    gas = c["gas"] * (pressure / _TORR) * (T_warm**g - T_cold**g) / layers
    return solid + radiation + gas


def _mli_shields(T_cold, T_warm, layers, layer_density, emissivity, pressure):
    return _const.sigma * (T_warm**4 - T_cold**4) / ((layers + 1.0) * (2.0 / emissivity - 1.0))


#: The multilayer-insulation models by name: ``"lockheed"`` the empirical correlation,
#: ``"shields"`` the ideal floating-radiation-shield model (a lower bound).
MLI_MODELS: dict[str, Callable] = {"lockheed": _mli_lockheed, "shields": _mli_shields}


def mli_heat_flux(
    T_cold,
    T_warm,
    layers,
    layer_density=2000.0,
    *,
    model: str = "lockheed",
    emissivity=None,
    pressure=0.0,
    degradation=1.0,
) -> float | np.ndarray:
    r"""Heat flux through multilayer insulation, by the Lockheed correlation or ideal shields.

    ``model="lockheed"`` (default), the Lockheed correlation of Keller, Cunnington and
    Glassford (NASA CR-134477, 1974) for double-aluminised polyester film with silk-net
    spacers, with the layer density :math:`\bar N` in layers/cm and the interstitial pressure
    :math:`P` in torr:

    .. math::

        q = \frac{C_s \bar N^{2.56}\, T_m (T_w - T_c)}{N + 1}
          + \frac{C_r \varepsilon (T_w^{4.67} - T_c^{4.67})}{N}
          + \frac{C_g P (T_w^{0.52} - T_c^{0.52})}{N},
        \qquad T_m = \frac{T_w + T_c}{2}

    with the constants of :data:`MLI_LOCKHEED_DAP_NET`. ``model="shields"``: :math:`N`
    floating radiation shields between the two boundaries, all surfaces of emissivity
    :math:`\varepsilon`, radiation only,

    .. math::

        q = \frac{\sigma (T_w^4 - T_c^4)}{(N + 1)(2/\varepsilon - 1)}

    The result is multiplied by ``degradation``.

    Parameters
    ----------
    T_cold, T_warm : float or ndarray
        Temperatures of the cold and warm boundaries, [K].
    layers : float or ndarray
        Number of reflective layers :math:`N` (>= 1 for the correlation, >= 0 for shields), [-].
    layer_density : float or ndarray, optional
        Layers per metre of blanket thickness (2000 /m = 20 layers/cm, the default), [1/m].
        Used by the correlation only.
    model : {"lockheed", "shields"}, optional
        Which model (:data:`MLI_MODELS`).
    emissivity : float, optional
        Emissivity of the reflective film, [-]; default 0.031, the room-temperature value of
        the correlation (from memory).
    pressure : float or ndarray, optional
        Interstitial gas pressure, [Pa]; 0 (the default) for a well-pumped blanket.
        Correlation only.
    degradation : float, optional
        Factor applied to the result (>= 1 for an installed blanket), [-].

    Returns
    -------
    float or ndarray
        Heat flux onto the cold boundary, [W/m^2].

    Notes
    -----
    The correlation was fitted to flat-plate calorimeter measurements of small, carefully
    laid blankets without seams or penetrations, with the warm boundary near room
    temperature and the cold boundary between liquid-hydrogen and liquid-nitrogen
    temperatures (validity range from memory); from 77 K to 4 K it is an extrapolation. Real
    installed blankets, with seams, pins and penetrations, run 1.5 to 3 times the
    calorimeter value (common practice): pass that as ``degradation``. The shield model
    ignores conduction through the spacers and contacts and is a lower bound. Common
    practice for well-installed insulation (:data:`MLI_COMMON_PRACTICE`): about 1 W/m^2 from
    300 K to 77 K, 0.05-0.1 W/m^2 from 77 K to 4 K.

    References
    ----------
    1. Keller, C. W., Cunnington, G. R., Glassford, A. P., "Thermal Performance of
       Multi-Layer Insulations", final report, NASA CR-134477, Lockheed Missiles & Space
       Co., 1974.
    2. Barron, R. F., "Cryogenic Systems", 2nd ed., Oxford University Press, 1985, ch. 8
       (radiation shields).
    3. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, ch. 2.

    Examples
    --------
    >>> round(mli_heat_flux(77.0, 300.0, 30, 2000.0), 3)          # 30 layers at 20 /cm
    0.466
    >>> round(mli_heat_flux(77.0, 300.0, 30, model="shields"), 3)
    0.232
    """
    if model not in MLI_MODELS:
        raise UnknownNameError("multilayer insulation model", model, MLI_MODELS, key="model")
    Tc = checks.temperature(T_cold, "T_cold")
    Tw = checks.temperature(T_warm, "T_warm")
    N = checks.nonnegative(layers, "layers", key="layers")
    if model == "lockheed" and N.size and np.any(N < 1.0):
        raise InputError(
            "the Lockheed correlation needs at least one layer",
            key="layers",
            expected=">= 1",
            found=repr(layers),
        )
    density = checks.positive(layer_density, "layer_density", "1/m", key="layer_density")
    e = checks.fraction(
        MLI_LOCKHEED_DAP_NET["emissivity"] if emissivity is None else emissivity,
        "emissivity",
        key="emissivity",
    )
    p = checks.nonnegative(pressure, "pressure", "Pa", key="pressure")
    factor = checks.positive(degradation, "degradation", key="degradation")
    q = MLI_MODELS[model](Tc, Tw, N, density, e, p)
    return checks.scalar(factor * q)


def mli_load(area, T_cold, T_warm, layers, layer_density=2000.0, **options) -> float | np.ndarray:
    r"""Heat through a multilayer-insulation blanket of a given area: :math:`\dot Q = A\,q`.

    .. math::

        \dot Q = A \, q(T_c, T_w, N, \bar N)

    Parameters
    ----------
    area : float or ndarray
        Blanket area (at the cold side), [m^2].
    T_cold, T_warm, layers, layer_density
        As :func:`mli_heat_flux`.
    **options
        ``model``, ``emissivity``, ``pressure``, ``degradation`` as :func:`mli_heat_flux`.

    Returns
    -------
    float or ndarray
        Heat onto the cold boundary, [W].

    Notes
    -----
    Validity as :func:`mli_heat_flux`.

    References
    ----------
    1. Keller, C. W., Cunnington, G. R., Glassford, A. P., NASA CR-134477, 1974.

    Examples
    --------
    >>> round(mli_load(2.0, 77.0, 300.0, 30), 3)
    0.931
    """
    A = checks.nonnegative(area, "area", "m^2", key="area")
    return checks.scalar(A * mli_heat_flux(T_cold, T_warm, layers, layer_density, **options))


# --------------------------------------------------------------------------------------------
