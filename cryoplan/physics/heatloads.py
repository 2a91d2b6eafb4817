"""Static heat loads on the cold stages of a cryostat, and the boil-off and hold time they drive.

Pure physics: SI floats and numpy arrays in and out (kelvin, watts, metres, pascals, seconds),
no units library, no files. Radiation between gray surfaces and through multilayer
insulation; solid conduction through supports, straps and wires (whole or heat-sunk at
intermediate stages); current leads, conduction-cooled and vapour-cooled; residual gas in the
free-molecular regime; a neck cooled by its own boil-off gas; boil-off rate, hold time and the
refill calendar.

Arguments that cannot be physical (an emissivity outside (0, 1], a negative area, length or
count) raise :class:`cryoplan.errors.InputError` naming the argument; a temperature at or
below 0 K raises :class:`cryoplan.errors.TemperatureError`.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from datetime import datetime, timedelta
from typing import NamedTuple

import numpy as np

from . import checks
from .errors import InputError, TemperatureError, UnknownNameError


def solve_ivp(*args, **kwargs):
    """scipy.integrate.solve_ivp, imported on first use (keeps ``cryoplan print`` fast)."""
    from scipy.integrate import solve_ivp as _solve_ivp

    return _solve_ivp(*args, **kwargs)


def brentq(*args, **kwargs):
    """scipy.optimize.brentq, imported on first use."""
    from scipy.optimize import brentq as _brentq

    return _brentq(*args, **kwargs)


__all__ = [
    "stefan_boltzmann",  # noqa: F822 (module __getattr__)
    "LORENZ_NUMBER",  # noqa: F822 (module __getattr__)
    "gray_body_exchange",
    "MLI_LOCKHEED_DAP_NET",
    "MLI_COMMON_PRACTICE",
    "MLI_MODELS",
    "mli_heat_flux",
    "mli_load",
    "conduction_load",
    "segmented_conduction",
    "awg_diameter",
    "wire_load",
    "LeadSolution",
    "conduction_cooled_lead_optimum",
    "conduction_cooled_lead_solution",
    "conduction_cooled_lead_load",
    "VAPOR_COOLED_LEAD_HEAT_PER_AMPERE",
    "vapor_cooled_lead_optimum",
    "vapor_cooled_lead_load",
    "vapor_cooled_neck_load",
    "GASES",
    "RegimeError",
    "mean_free_path",
    "free_molecular_conduction",
    "boiloff_rate",
    "hold_time",
    "refill_schedule",
]


class _Constants:
    """scipy.constants, imported on first use (keeps ``cryoplan print`` fast)."""

    def __getattr__(self, name):
        from scipy import constants

        return getattr(constants, name)


_const = _Constants()


def __getattr__(name):
    # stefan_boltzmann: Stefan-Boltzmann constant, [W/(m^2 K^4)] (scipy.constants, CODATA).
    # LORENZ_NUMBER: Sommerfeld value of the Lorenz number, pi^2 k_B^2 / (3 e^2),
    # [W Ohm/K^2] (about 2.443e-8; the round 2.45e-8 is the value used in the lead
    # literature, e.g. McFee 1959).
    if name == "stefan_boltzmann":
        return _const.sigma
    if name == "LORENZ_NUMBER":
        return math.pi**2 * _const.k**2 / (3.0 * _const.e**2)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


_TORR = 101325.0 / 760.0  # Pa per torr (exact by definition)


class RegimeError(InputError):
    """The residual gas is not free-molecular: its mean free path is shorter than the gap."""


# --------------------------------------------------------------------------------------------
# argument checks
# --------------------------------------------------------------------------------------------


def _area_ratio(value) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    if arr.size and (not np.all(np.isfinite(arr)) or np.any(arr < 0.0) or np.any(arr > 1.0)):
        raise InputError(
            "area_ratio (cold area / warm area) must lie in [0, 1]: the cold surface is the "
            "enclosed one",
            key="area_ratio",
            expected="0 <= value <= 1",
            found=repr(value),
        )
    return arr


def _as_function(f, name: str) -> Callable[[np.ndarray], np.ndarray]:
    """A property as a vectorised function of T: a constant becomes a constant function."""
    if callable(f):

        def vectorised(T):
            T = np.asarray(T, dtype=float)
            try:
                out = np.asarray(f(T), dtype=float)
            except TypeError:  # a callable that only takes scalars
                out = None
            if out is None or out.shape != T.shape:
                out = np.array([float(f(float(t))) for t in T.ravel()]).reshape(T.shape)
            return out

        return vectorised
    value = float(f)
    if not math.isfinite(value):
        raise InputError(f"{name} must be finite", key=name, found=repr(f))
    return lambda T: np.full(np.shape(T), value)


# composite Gauss-Legendre quadrature: 16 nodes per panel
_GL_X, _GL_W = np.polynomial.legendre.leggauss(16)


def _gauss(a: float, b: float, panels: int = 24, geometric: bool = False):
    """Nodes and weights of composite Gauss-Legendre quadrature on [a, b]."""
    if geometric and a > 0.0:
        edges = np.geomspace(a, b, panels + 1)
    else:
        edges = np.linspace(a, b, panels + 1)
    mid = 0.5 * (edges[1:] + edges[:-1])
    half = 0.5 * (edges[1:] - edges[:-1])
    x = (mid[:, None] + half[:, None] * _GL_X).ravel()
    w = (half[:, None] * _GL_W).ravel()
    return x, w


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
# solid conduction
# --------------------------------------------------------------------------------------------


def conduction_load(
    conductivity_integral, T_low, T_high, area, length, count=1
) -> float | np.ndarray:
    r"""Heat conducted along uniform supports, from the thermal conductivity integral.

    .. math::

        \dot Q = n \frac{A}{L} \int_{T_\mathrm{low}}^{T_\mathrm{high}} k(T)\, dT

    Parameters
    ----------
    conductivity_integral : callable
        ``conductivity_integral(T_a, T_b)`` -> :math:`\int_{T_a}^{T_b} k\,dT` for
        ``T_a <= T_b``, [W/m] (a material's ``conductivity_integral``).
    T_low, T_high : float or ndarray
        Temperatures of the cold and warm ends, [K].
    area : float or ndarray
        Cross-section of one support, [m^2].
    length : float or ndarray
        Length between the two ends, [m].
    count : float or ndarray, optional
        Number of identical supports, [-].

    Returns
    -------
    float or ndarray
        Heat arriving at the cold end, [W]; negative if ``T_low > T_high``.

    Notes
    -----
    One-dimensional steady conduction in a uniform section, both ends at fixed temperature,
    no radiation from the side. The temperature range is that of the material's data.

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 2.2 and appendix A2.1 (conductivity integrals).

    Examples
    --------
    Constant conductivity 15 W/(m K): 3 rods of 20 mm^2, 250 mm long, from 77 K to 4.2 K.

    >>> k_integral = lambda a, b: 15.0 * (b - a)
    >>> round(conduction_load(k_integral, 4.2, 77.0, 20e-6, 0.25, count=3), 4)
    0.2621
    """
    Tl = checks.temperature(T_low, "T_low")
    Th = checks.temperature(T_high, "T_high")
    A = checks.nonnegative(area, "area", "m^2", key="area")
    L = checks.positive(length, "length", "m", key="length")
    n = checks.nonnegative(count, "count", key="count")
    if Tl.ndim == 0 and Th.ndim == 0:
        if float(Tl) == float(Th):
            integral = 0.0
        elif float(Tl) < float(Th):
            integral = float(conductivity_integral(float(Tl), float(Th)))
        else:
            integral = -float(conductivity_integral(float(Th), float(Tl)))
    else:
        lo, hi = np.minimum(Tl, Th), np.maximum(Tl, Th)
        sign = np.where(Th >= Tl, 1.0, -1.0)
        integral = sign * np.asarray(conductivity_integral(lo, hi), dtype=float)
    return checks.scalar(n * A / L * integral)


def segmented_conduction(
    conductivity_integral, temperatures, lengths, area, count=1
) -> np.ndarray:
    r"""Loads on each stage from a support heat-sunk at intermediate stages.

    A support runs from the warmest node 0 down to the coldest node m and is thermally
    anchored at every node in between. Segment i (from node i to node i+1) carries

    .. math::

        \dot Q_i = n \frac{A_i}{L_i} \int_{T_{i+1}}^{T_i} k\,dT

    and the load on node j (j = 1 ... m) is what arrives from above minus what leaves below:

    .. math::

        \dot Q^{\mathrm{stage}}_j = \dot Q_{j-1} - \dot Q_j \quad (j < m), \qquad
        \dot Q^{\mathrm{stage}}_m = \dot Q_{m-1}

    Parameters
    ----------
    conductivity_integral : callable
        ``conductivity_integral(T_a, T_b)`` for ``T_a <= T_b``, [W/m].
    temperatures : sequence of float
        Node temperatures from warmest to coldest, non-increasing, at least two, [K].
    lengths : sequence of float
        Length of each segment (one fewer than the nodes), [m].
    area : float or sequence of float
        Cross-section, one value or one per segment, [m^2].
    count : float, optional
        Number of identical supports, [-].

    Returns
    -------
    ndarray
        Load on nodes 1 ... m (every node but the warmest), [W]. The sum equals the heat
        drawn from the warmest node. An intermediate load is negative if the segment below
        it draws more heat than the segment above delivers.

    Notes
    -----
    Each anchor is assumed perfect: the support takes the node's temperature there.

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 2.2 (heat sinking).

    Examples
    --------
    A constant conductivity of 10 W/(m K), 1 mm^2, 300 K -> 77 K -> 4.2 K in 0.2 m + 0.2 m:

    >>> k_integral = lambda a, b: 10.0 * (b - a)
    >>> loads = segmented_conduction(k_integral, [300.0, 77.0, 4.2], [0.2, 0.2], 1e-6)
    >>> [round(float(q), 5) for q in loads]
    [0.00751, 0.00364]
    """
    T = checks.temperature(temperatures, "temperatures").ravel()
    L = checks.positive(lengths, "lengths", "m", key="lengths").ravel()
    if T.size < 2:
        raise InputError(
            "a segmented support needs at least two node temperatures",
            key="temperatures",
            expected="two or more temperatures, warmest first",
            found=repr(temperatures),
        )
    if np.any(np.diff(T) > 0.0):
        raise InputError(
            "node temperatures must run from the warmest to the coldest",
            key="temperatures",
            expected="non-increasing temperatures",
            found=repr(temperatures),
        )
    if L.size != T.size - 1:
        raise InputError(
            "one length is needed for each segment between two nodes",
            key="lengths",
            expected=f"{T.size - 1} lengths",
            found=f"{L.size}",
        )
    A = np.broadcast_to(checks.nonnegative(area, "area", "m^2", key="area"), L.shape)
    n = checks.nonnegative(count, "count", key="count")
    segments = np.array(
        [
            conduction_load(conductivity_integral, T[i + 1], T[i], A[i], L[i], n)
            for i in range(L.size)
        ]
    )
    loads = segments.copy()
    loads[:-1] -= segments[1:]
    return loads


def awg_diameter(gauge) -> float | np.ndarray:
    r"""Diameter of a solid round wire of American Wire Gauge ``gauge`` (ASTM B258).

    .. math::

        d = 0.127\ \mathrm{mm} \times 92^{(36 - n)/39}

    Parameters
    ----------
    gauge : int, float, str or ndarray
        Gauge number n, from -3 (0000) to 40; the strings "0", "00", "000", "0000" and
        "1/0" ... "4/0" are also accepted, [-].

    Returns
    -------
    float or ndarray
        Diameter, [m].

    Notes
    -----
    The definition is exact: 36 AWG is 0.0050 in and 0000 AWG is 0.4600 in, with 38 gauges
    in geometric progression between them. Tabulated diameters are these values rounded.

    References
    ----------
    1. ASTM B258, "Standard Specification for Standard Nominal Diameters and Cross-Sectional
       Areas of AWG Sizes of Solid Round Wires Used as Electrical Conductors".

    Examples
    --------
    >>> round(awg_diameter(36) * 1e3, 4)
    0.127
    >>> round(awg_diameter("0000") / 0.0254, 4)
    0.46
    """
    if isinstance(gauge, str):
        text = gauge.strip()
        zeros = {
            "0": 0,
            "00": -1,
            "000": -2,
            "0000": -3,
            "1/0": 0,
            "2/0": -1,
            "3/0": -2,
            "4/0": -3,
        }
        if text in zeros:
            n = np.asarray(float(zeros[text]))
        else:
            try:
                n = np.asarray(float(text))
            except ValueError:
                raise InputError(
                    "not a wire gauge",
                    key="gauge",
                    expected="an AWG number from 0000 to 40",
                    found=repr(gauge),
                ) from None
    else:
        n = np.asarray(gauge, dtype=float)
    if n.size and (not np.all(np.isfinite(n)) or np.any(n < -3) or np.any(n > 40)):
        raise InputError(
            "wire gauge out of range",
            key="gauge",
            expected="an AWG number from 0000 (-3) to 40",
            found=repr(gauge),
        )
    return checks.scalar(0.127e-3 * 92.0 ** ((36.0 - n) / 39.0))


def wire_load(conductivity_integral, T_low, T_high, length, diameter, count=1):
    r"""Heat conducted along round wires, from the conductivity integral.

    .. math::

        \dot Q = n \frac{\pi d^2}{4 L} \int_{T_\mathrm{low}}^{T_\mathrm{high}} k\,dT

    Parameters
    ----------
    conductivity_integral : callable
        ``conductivity_integral(T_a, T_b)`` for ``T_a <= T_b``, [W/m].
    T_low, T_high : float or ndarray
        Temperatures of the cold and warm ends, [K].
    length : float or ndarray
        Wire length between the two ends, [m].
    diameter : float or ndarray
        Conductor diameter, [m] (see :func:`awg_diameter`).
    count : float or ndarray, optional
        Number of wires, [-].

    Returns
    -------
    float or ndarray
        Heat arriving at the cold end, [W].

    Notes
    -----
    Conduction only: the insulation's share is neglected, and so is Joule heat (for wires
    that carry current see the current-lead functions).

    References
    ----------
    1. Ekin, J. W., "Experimental Techniques for Low-Temperature Measurements", Oxford
       University Press, 2006, sec. 3.3 (wiring heat leaks).

    Examples
    --------
    Twelve 36 AWG wires with a constant 20 W/(m K), 1 m long, 300 K to 4.2 K:

    >>> k_integral = lambda a, b: 20.0 * (b - a)
    >>> round(wire_load(k_integral, 4.2, 300.0, 1.0, awg_diameter(36), 12) * 1e3, 3)
    0.899
    """
    d = checks.nonnegative(diameter, "diameter", "m", key="diameter")
    return conduction_load(
        conductivity_integral, T_low, T_high, math.pi * d**2 / 4.0, length, count
    )


# --------------------------------------------------------------------------------------------
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
