"""Tests of cryoplan.report.cautions: the handling cautions and the planning-aid notice.

The texts are the tool's own words; these tests check that each one defers to local codes
and the safety office, and that the topics the room-check issue lists each have a caution.
"""

from __future__ import annotations

import pytest

from cryoplan.report.cautions import CAUTIONS, DEFERRAL, PLANNING_AID_NOTICE


def test_every_caution_ends_with_the_deferral():
    assert "local codes" in DEFERRAL.lower()
    assert "safety office" in DEFERRAL and "licensed practice" in DEFERRAL
    assert len(CAUTIONS) == 8
    for title, text in CAUTIONS:
        assert title and text.endswith(DEFERRAL)
    assert len({c.title for c in CAUTIONS}) == len(CAUTIONS)
    assert "planning aid" in PLANNING_AID_NOTICE
    assert "not a risk assessment" in PLANNING_AID_NOTICE
    assert PLANNING_AID_NOTICE.endswith(DEFERRAL)


@pytest.mark.parametrize(
    "word",
    ["breathlessness", "face shield", "relief valve", "90 K", "plug", "pits", "lift", "outdoors"],
)
def test_cautions_cover_each_topic(word):
    # the topics the issue lists, one caution each
    assert sum(word in c.text for c in CAUTIONS) >= 1
