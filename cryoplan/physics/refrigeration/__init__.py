"""Refrigeration: Carnot and real work, cooler capacity curves and maps, cooldown time, steady state.

The pure physics of cooling a cryostat with a cryocooler. SI floats and numpy arrays in and
out: kelvin, watts, joules, seconds. Nothing here reads files, parses units or prints.

Contents
--------
- Ideal work (:mod:`.carnot`): :func:`carnot_specific_power`, :func:`carnot_power`,
  :func:`fraction_of_carnot`, :func:`input_power_at_fraction`.
- Real refrigerators as guidance (:mod:`.carnot`): :func:`survey_percent_carnot` and
  :func:`survey_percent_carnot_band` (the trend of Strobridge's 1974 survey).
- Cooler capacity (:mod:`.capacity`): :class:`CapacityCurve` (one stage, W against K) and
  :class:`CapacityMap` (two stages, each stage's capacity against both temperatures).
- Thermal links between stages (:mod:`.links`): :class:`Link`, :func:`link_conductance`.
- Cooldown-time integration (:mod:`.simulation`, on the network of :mod:`.network`): :class:`CooldownStage`, :func:`simulate_cooldown`,
  :class:`CooldownResult`.
- Steady state under load (:mod:`.steady`): :func:`steady_state`, :class:`SteadyStateResult`.
- Reversible work to cool a mass (:mod:`.work`): :func:`reversible_work`,
  :func:`reversible_work_from_heat_capacity`.

Shapes
------
Wherever a function takes "the stage-temperature vector" ``T``, it has shape ``(n,)`` or
``(n, k)`` (``n`` stages, ``k`` states evaluated at once) and the function returns the same
shape: row ``i`` belongs to stage ``i``.
"""

from __future__ import annotations

from .capacity import CapacityCurve, CapacityMap
from .carnot import (
    STROBRIDGE_TREND_POINTS,
    SURVEY_SCATTER_FACTOR,
    carnot_power,
    carnot_specific_power,
    fraction_of_carnot,
    input_power_at_fraction,
    survey_percent_carnot,
    survey_percent_carnot_band,
)
from .links import Link, link_conductance
from .network import CoolingShortfallError
from .simulation import SECONDS_PER_DAY, CooldownResult, CooldownStage, simulate_cooldown
from .steady import SteadyStateResult, steady_state
from .work import reversible_work, reversible_work_from_heat_capacity

__all__ = [
    "carnot_specific_power",
    "carnot_power",
    "fraction_of_carnot",
    "input_power_at_fraction",
    "survey_percent_carnot",
    "survey_percent_carnot_band",
    "SURVEY_SCATTER_FACTOR",
    "STROBRIDGE_TREND_POINTS",
    "CapacityCurve",
    "CapacityMap",
    "Link",
    "link_conductance",
    "CooldownStage",
    "CooldownResult",
    "simulate_cooldown",
    "SteadyStateResult",
    "steady_state",
    "CoolingShortfallError",
    "reversible_work",
    "reversible_work_from_heat_capacity",
    "SECONDS_PER_DAY",
]
