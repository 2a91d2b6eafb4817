"""Static heat loads on the cold stages of a cryostat, and the boil-off and hold time they drive.

Pure physics: SI floats and numpy arrays in and out (kelvin, watts, metres, pascals, seconds),
no units library, no files. Radiation between gray surfaces and through multilayer
insulation; solid conduction through supports, straps and wires (whole or heat-sunk at
intermediate stages); current leads, conduction-cooled and vapour-cooled; residual gas in the
free-molecular regime; a neck cooled by its own boil-off gas; boil-off rate, hold time and the
refill calendar.

One module per kind of load: :mod:`.radiation` (gray bodies, MLI), :mod:`.conduction`
(supports, segmented supports, wires), :mod:`.leads` (conduction-cooled leads),
:mod:`.vapor` (vapour-cooled leads and necks), :mod:`.gas` (free-molecular residual gas),
:mod:`.boiloff` (boil-off rate, hold time, refills). Every public name is importable from
this package, as ``from cryoplan.physics import heatloads as hl; hl.mli_load(...)``.

Arguments that cannot be physical (an emissivity outside (0, 1], a negative area, length or
count) raise :class:`cryoplan.errors.InputError` naming the argument; a temperature at or
below 0 K raises :class:`cryoplan.errors.TemperatureError`.
"""

from __future__ import annotations

import math

from ._common import _const
from .boiloff import boiloff_rate, hold_time, refill_schedule
from .conduction import awg_diameter, conduction_load, segmented_conduction, wire_load
from .gas import GASES, RegimeError, free_molecular_conduction, mean_free_path
from .leads import (
    LeadSolution,
    conduction_cooled_lead_load,
    conduction_cooled_lead_optimum,
    conduction_cooled_lead_solution,
)
from .radiation import (
    MLI_COMMON_PRACTICE,
    MLI_LOCKHEED_DAP_NET,
    MLI_MODELS,
    gray_body_exchange,
    mli_heat_flux,
    mli_load,
)
from .vapor import (
    VAPOR_COOLED_LEAD_HEAT_PER_AMPERE,
    vapor_cooled_lead_load,
    vapor_cooled_lead_optimum,
    vapor_cooled_neck_load,
)

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
