"""The cryogen-handling cautions and notices printed with the room figures.

Words for the report, not physics: the budget, the dashboard and the comparison print them
beside the oxygen figures of :mod:`cryoplan.physics.oxygen`. Written for this tool.
"""

from __future__ import annotations

from typing import NamedTuple

__all__ = ["DEFERRAL", "Caution", "CAUTIONS", "PLANNING_AID_NOTICE"]

#: The sentence every caution ends with.
DEFERRAL = "Local codes, the site's safety office and licensed practice decide."


class Caution(NamedTuple):
    """A handling caution: a short title and its text (in the tool's own words)."""

    title: str
    text: str


#: Cryogen-handling cautions printed with the room figures, each ending in
#: :data:`DEFERRAL`. Written for this tool.
CAUTIONS: tuple[Caution, ...] = (
    Caution(
        "Asphyxiation without warning",
        "Helium, nitrogen and argon have no smell and no colour, and air short of oxygen "
        "gives no feeling of breathlessness: the urge to breathe comes from carbon "
        "dioxide, not from a lack of oxygen. A person can lose judgement and then "
        "consciousness within a few breaths without noticing anything wrong. Leave at "
        "once when an oxygen alarm sounds, and never go in after someone who has "
        "collapsed without breathing apparatus. " + DEFERRAL,
    ),
    Caution(
        "Cold burns and eye protection",
        "Cryogenic liquid and cold gas burn skin as heat does, and a splash can blind. "
        "Wear a full face shield over safety glasses when pouring or transferring, "
        "loose-fitting insulated gloves that can be thrown off at once, long sleeves and "
        "closed shoes, and no rings or watches. Bare skin can freeze to cold metal. " + DEFERRAL,
    ),
    Caution(
        "Liquid trapped in a closed volume",
        "Liquid shut into a pipe, a valve section or a vessel turns to gas as it warms "
        "and can raise the pressure far beyond what the part can hold. Every volume that "
        "can trap liquid, for example between two closed valves, needs its own relief "
        "valve or burst disc, sized for the worst heat input, free of ice and never "
        "capped or blocked. " + DEFERRAL,
    ),
    Caution(
        "Oxygen condensing on cold surfaces",
        "Surfaces colder than about 90 K (the boiling point of oxygen), such as lines "
        "and traps cooled by liquid nitrogen or uninsulated helium transfer lines, "
        "condense liquid out of the air that is richer in oxygen than air itself. "
        "Dripping onto oil, grease, wood, fabric or other organic matter it can start a "
        "violent fire. Keep such surfaces insulated or enclosed and clean of organic "
        "matter, and use only parts cleaned for oxygen service near them. " + DEFERRAL,
    ),
    Caution(
        "Ice plugs in helium necks",
        "Air or moisture that gets into the neck of a helium vessel freezes there into a "
        "solid plug; the boil-off then has no way out and the pressure climbs. Keep "
        "necks closed with a non-return valve or relief fitting, never leave a vessel "
        "open to the air, and if a neck seems blocked, clear the area and call someone "
        "trained to clear it. " + DEFERRAL,
    ),
    Caution(
        "Gas gathering high and low",
        "Warm helium rises and collects under ceilings and in roof voids; cold helium "
        "just after a quench can first spill downwards. Cold nitrogen gas and argon are "
        "heavier than air and flow into pits, trenches, basements and stairwells, where "
        "the oxygen can stay low long after the room above has cleared. Place oxygen "
        "sensors where the gas will gather and treat low spaces near cryogens as "
        "confined spaces. " + DEFERRAL,
    ),
    Caution(
        "Dewars and lifts",
        "Never ride in a lift with a dewar of liquid (common practice): if the lift stops "
        "between floors, the boil-off can fill the small car with gas within minutes. "
        "Send the dewar up alone, with a notice at each landing and someone waiting to "
        "receive it, and keep others from calling the lift meanwhile. " + DEFERRAL,
    ),
    Caution(
        "Quench vent lines led outdoors",
        "A quenching magnet can release most of its helium within a minute. Lead the "
        "quench vent line and the cryostat's relief devices outdoors, to a place away "
        "from air intakes, windows and walkways, through a line wide enough not to build "
        "up back pressure, and keep it free of ice and obstructions. " + DEFERRAL,
    ),
)

#: Printed with every oxygen figure.
PLANNING_AID_NOTICE = (
    "These oxygen figures are a planning aid, not a risk assessment. They assume the "
    "released gas mixes evenly through the whole room at once; near the release, and in "
    "low or high spots, the air can be far worse. " + DEFERRAL
)
