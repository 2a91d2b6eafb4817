"""Single figures of the public API: one mass of one material, by material id.

These are the library's entry points for notebooks and scripts
(``cryoplan.minimum_work``, ``cryoplan.liquid_for_cooldown``). They look the material and
the cryogen up in the data layer, check their arguments with the same located errors as the
plan reader, and call the pure functions of :mod:`cryoplan.physics.cooldown`.
"""

from __future__ import annotations

import math

from ..data.fluids import cryogen as _cryogen
from ..data.materials import material
from ..errors import InputError, TemperatureError
from ..physics.cooldown import cryogen_mass_for_cooldown, state_budget


def _positive_mass(mass_kg) -> float:
    if isinstance(mass_kg, bool) or not isinstance(mass_kg, (int, float)):
        raise InputError(
            "not a number", key="mass_kg", expected="a mass in kg above 0", found=repr(mass_kg)
        )
    mass = float(mass_kg)
    if not (math.isfinite(mass) and mass > 0.0):
        raise InputError(
            "not a positive mass",
            key="mass_kg",
            expected="a mass in kg above 0",
            found=repr(mass_kg),
        )
    return mass


def _temperature(value, key: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError("not a number", key=key, expected="a temperature in K", found=repr(value))
    t = float(value)
    if not (math.isfinite(t) and t >= 0.0):
        raise TemperatureError(
            f"{key} = {value!r}: a temperature must be a finite number of kelvin, 0 K or more"
        )
    return t


def _order(t_start: float, t_end: float) -> None:
    if t_end > t_start:
        raise InputError(
            "the end is warmer than the start",
            key="T_end",
            expected=f"a temperature at or below T_start ({t_start:g} K)",
            found=f"{t_end:g} K",
        )


def minimum_work(
    material_id: str, mass_kg: float, T_start: float, T_end: float, T_ambient: float
) -> float:
    r"""Reversible work to cool a mass of a material from T_start to T_end, rejecting at T_ambient.

    :math:`W = m \{T_0 [S(T_1) - S(T_2)] - [H(T_1) - H(T_2)]\}`, see :func:`cryoplan.physics.cooldown.state_budget`.

    Parameters
    ----------
    material_id : str
        An id of the material library.
    mass_kg : float
        [kg].
    T_start, T_end, T_ambient : float
        [K].

    Returns
    -------
    float
        [J].

    Examples
    --------
    >>> w = minimum_work("copper", 1.0, 300.0, 4.2, 300.0)
    >>> 6e4 < w < 1e5  # about 78 kJ: T0 S(300 K) = 156 kJ less H(300 K) = 80 kJ
    True
    """
    mass_kg = _positive_mass(mass_kg)
    T_start = _temperature(T_start, "T_start")
    T_end = _temperature(T_end, "T_end")
    T_ambient = _temperature(T_ambient, "T_ambient")
    _order(T_start, T_end)
    m = material(material_id)
    return float(
        state_budget(m.enthalpy, m.entropy, mass_kg, T_start, T_end, T_ambient)["work"].sum()
    )


def liquid_for_cooldown(
    material_id: str, mass_kg: float, T_start: float, T_end: float, cryogen, gas_use: float = 0.0
) -> float:
    """Litres of liquid cryogen boiled to cool a mass of a material (no transfer loss).

    See :func:`cryoplan.physics.cooldown.cryogen_mass_for_cooldown` for the method.

    Parameters
    ----------
    material_id : str
        An id of the material library.
    mass_kg : float
        [kg].
    T_start, T_end : float
        [K]; ``T_end`` at or above the cryogen's boiling point (up to 0.5 K below it is
        read as the boiling point: "77 K" for nitrogen).
    cryogen : str or Cryogen
        A cryogen name ("helium", "nitrogen", ...) at 1 atm, or a Cryogen object.
    gas_use : float
        Fraction of the cold gas's enthalpy used, [0, 1].

    Returns
    -------
    float
        Liquid boiled, [L] at the normal boiling point.

    Examples
    --------
    >>> v = liquid_for_cooldown("copper", 1.0, 300.0, 77.0, "nitrogen", 0.0)
    >>> 0.3 < v < 0.6
    True
    """
    mass_kg = _positive_mass(mass_kg)
    T_start = _temperature(T_start, "T_start")
    T_end = _temperature(T_end, "T_end")
    _order(T_start, T_end)
    if (
        isinstance(gas_use, bool)
        or not isinstance(gas_use, (int, float))
        or not 0.0 <= gas_use <= 1.0
    ):
        raise InputError(
            "gas_use outside 0..1",
            key="gas_use",
            expected="a number from 0 to 1",
            found=repr(gas_use),
        )
    c = _cryogen(cryogen) if isinstance(cryogen, str) else cryogen
    if c.boiling_point - 0.5 <= T_end < c.boiling_point:
        T_end = c.boiling_point  # "77 K" for nitrogen means its boiling point, 77.35 K
    if T_end < c.boiling_point - 1e-9:
        raise TemperatureError(
            f"{c.name} boils at {c.boiling_point:.2f} K; it cannot cool to {T_end:g} K"
        )
    m = material(material_id)
    vap = c.boiloff_gas_enthalpy if gas_use else (lambda T: 0 * T)
    kg = cryogen_mass_for_cooldown(
        m.specific_heat, mass_kg, T_start, T_end, c.latent_heat, vap, gas_use
    )
    return kg / c.liquid_density * 1000.0
