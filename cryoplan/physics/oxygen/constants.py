"""The oxygen levels and planning defaults of the room checks, each with its source, and the
check of an oxygen level given as an argument.
"""

from __future__ import annotations

import numpy as np

from .. import checks
from ..errors import InputError

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


def check_percent(value, name: str) -> np.ndarray:
    """An oxygen level, 0 to :data:`AIR_OXYGEN_PERCENT` [%], as a float ndarray.

    >>> float(check_percent(19.5, "alarm level"))
    19.5
    >>> check_percent(25.0, "alarm level")
    Traceback (most recent call last):
        ...
    cryoplan.physics.errors.InputError: alarm level must be an oxygen level between 0 and 20.9 % (expected 0 to 20.9 %; found 25 %)
    """
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
