"""Physiological effects of breathing air low in oxygen: the published bands and their look-up."""

from __future__ import annotations

from typing import NamedTuple

from .constants import AIR_OXYGEN_PERCENT, check_percent

# Physiological effects of low oxygen
# ---------------------------------------------------------------------------------------


class EffectBand(NamedTuple):
    """A band of oxygen levels and what breathing such air does, with its source."""

    low_percent: float  #: lower end of the band [%], included
    high_percent: float  #: upper end [%], excluded (20.9 included in the top band)
    effect: str  #: in plain words
    source: str  #: where the band comes from


_CGA_SB2 = (
    "Compressed Gas Association, CGA SB-2, 'Oxygen-Deficient Atmospheres' (from memory); "
    "the same bands appear in CGA P-12, 'Safe Handling of Cryogenic Liquids' (from memory)"
)

#: Effects of breathing air low in oxygen at sea-level pressure, highest band first.
#: Rough guides: people differ, and effort, health and altitude shift every band (the
#: body responds to the oxygen partial pressure, so at altitude the same effects come at
#: higher percentages).
OXYGEN_EFFECTS: tuple[EffectBand, ...] = (
    EffectBand(
        19.5,
        AIR_OXYGEN_PERCENT,
        "Normal work is possible; 19.5 % is the lowest level at which anyone should "
        "enter without breathing apparatus.",
        "US OSHA 29 CFR 1910.134(b), definition of an oxygen-deficient atmosphere (from "
        "memory); fresh air 20.9 %, U.S. Standard Atmosphere 1976 (from memory)",
    ),
    EffectBand(
        15.0,
        19.5,
        "Hard physical work becomes difficult and coordination may suffer; people with "
        "heart, lung or circulation problems may show early symptoms.",
        _CGA_SB2,
    ),
    EffectBand(
        12.0,
        15.0,
        "Breathing deepens and the pulse quickens on effort; coordination, perception "
        "and judgement are impaired.",
        _CGA_SB2,
    ),
    EffectBand(
        10.0,
        12.0,
        "Breathing becomes faster and deeper still, judgement is poor and the lips turn blue.",
        _CGA_SB2,
    ),
    EffectBand(
        8.0,
        10.0,
        "The mind fails: fainting and loss of consciousness, a grey face, blue lips, "
        "nausea and vomiting.",
        _CGA_SB2,
    ),
    EffectBand(
        6.0,
        8.0,
        "Fatal after about 8 minutes and fatal to half of those exposed after about 6; "
        "recovery with treatment is possible after 4 to 5 minutes.",
        _CGA_SB2,
    ),
    EffectBand(
        0.0,
        6.0,
        "Coma within about 40 seconds, convulsions, breathing stops, death.",
        _CGA_SB2,
    ),
)


def oxygen_effect(percent) -> EffectBand:
    """The band of :data:`OXYGEN_EFFECTS` an oxygen level falls in (table look-up).

    .. math:: C_{low} \\le C < C_{high}

    Parameters
    ----------
    percent : float
        Oxygen, [%], 0 to 20.9.

    Returns
    -------
    EffectBand

    Notes
    -----
    Sea-level figures for a healthy adult; see :data:`OXYGEN_EFFECTS`.

    References
    ----------
    1. Compressed Gas Association, CGA SB-2, "Oxygen-Deficient Atmospheres" (from
       memory).
    2. US OSHA 29 CFR 1910.134(b) (from memory).

    Examples
    --------
    >>> oxygen_effect(11.0).low_percent
    10.0
    """
    c = float(check_percent(percent, "oxygen level"))
    for band in OXYGEN_EFFECTS:
        if band.low_percent <= c:
            return band
    return OXYGEN_EFFECTS[-1]  # pragma: no cover - the last band starts at 0


# ---------------------------------------------------------------------------------------
