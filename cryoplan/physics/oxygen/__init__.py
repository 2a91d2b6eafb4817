"""Room oxygen-deficiency estimates.

The physics core of the room checks: well-mixed room models of a sudden release, a
continuous release with fresh-air ventilation, and a release that changes rate over time
(solved exactly, piece by piece); the ventilation or room volume a release calls for; the
physiological effects of low oxygen. The plain-words verdict per room is in
:mod:`cryoplan.evaluation.rooms_verdict`, the caution texts in :mod:`cryoplan.report.cautions`.

Modules: :mod:`.constants` (levels and defaults), :mod:`.release` (gas from liquid, sudden
release), :mod:`.ventilation` (continuous release), :mod:`.cases` (release cases),
:mod:`.curves` (a case through time, its assessment), :mod:`.effects` (effects of low
oxygen). Every public name is importable from this package.

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

Every figure here is a planning aid, not a risk assessment
(:data:`cryoplan.report.cautions.PLANNING_AID_NOTICE`):
local codes, the site's safety office and licensed practice decide.
"""

from __future__ import annotations

from .cases import (
    Release,
    boiloff_case,
    loss_of_vacuum_case,
    quench_case,
    sudden_release_case,
    ventilation_failure_case,
)
from .constants import (
    AIR_OXYGEN_PERCENT,
    DEFAULT_QUENCH_DURATION_S,
    DEFAULT_QUENCH_FRACTION,
    DEFAULT_SUDDEN_MODEL,
    DEFICIENT_PERCENT,
    LOSS_OF_VACUUM_HEAT_FLUX_BARE,
    LOSS_OF_VACUUM_HEAT_FLUX_INSULATED,
    check_percent,
)
from .curves import (
    Lowest,
    ReleaseAssessment,
    assess_release,
    lowest_oxygen,
    oxygen_curve,
    time_to_level,
    time_to_recover,
    ventilation_for_release,
)
from .effects import OXYGEN_EFFECTS, EffectBand, oxygen_effect
from .release import (
    SUDDEN_RELEASE_MODELS,
    air_change_flow,
    dilution_release_percent,
    displacement_release_percent,
    gas_rate,
    gas_volume,
    loss_of_vacuum_gas_rate,
    minimum_room_volume,
    mixed_release_percent,
    sudden_release_percent,
)
from .ventilation import (
    continuous_release_percent,
    recovery_percent,
    steady_state_percent,
    time_constant,
    ventilation_to_hold,
    ventilation_to_restore,
)

__all__ = [
    "AIR_OXYGEN_PERCENT",
    "DEFICIENT_PERCENT",
    "DEFAULT_SUDDEN_MODEL",
    "DEFAULT_QUENCH_FRACTION",
    "DEFAULT_QUENCH_DURATION_S",
    "LOSS_OF_VACUUM_HEAT_FLUX_BARE",
    "LOSS_OF_VACUUM_HEAT_FLUX_INSULATED",
    "check_percent",
    "SUDDEN_RELEASE_MODELS",
    "OXYGEN_EFFECTS",
    "EffectBand",
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
]
