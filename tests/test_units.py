"""Unit parsing: the fast table agrees with pint; wrong units are refused clearly."""

from __future__ import annotations

import pytest

from cryoplan import units
from cryoplan.errors import InputError


@pytest.mark.parametrize(
    "dimension, unit",
    [(d, u) for d, table in units.FAST_UNITS.items() for u in table],
)
def test_fast_table_agrees_with_pint(dimension, unit):
    # pint is the reference: every shortcut must give pint's factor (to rounding)
    ureg = units.registry()
    dim, si = units.DIMENSIONS[dimension]
    text = unit.replace("^", "**")
    q = ureg.Quantity(1.0, "1 " + text if text.startswith("/") else text)
    assert q.check(dim)
    assert units.FAST_UNITS[dimension][unit] == pytest.approx(q.m_as(si), rel=1e-12)


def test_offset_temperatures_and_slow_path():
    assert units.parse_temperature("20 degC") == pytest.approx(293.15)  # exact definition
    assert units.parse_quantity("3 ft", "length") == pytest.approx(0.9144)  # exact, 1959
    assert units.parse_quantity("1 torr", "pressure") == pytest.approx(101325 / 760)


@pytest.mark.parametrize(
    "text, dimension, words",
    [
        ("10 kgs", "mass", "unknown unit"),
        ("4 K", "mass", "wrong kind"),
        ("12", "mass", "units are missing"),
        ("kg", "mass", "not a number"),
        ("-1 K", "temperature", "below absolute zero"),
    ],
)
def test_bad_quantities(text, dimension, words):
    parse = (
        units.parse_temperature
        if dimension == "temperature"
        else (lambda t: units.parse_quantity(t, dimension))
    )
    with pytest.raises(InputError, match=words) as info:
        parse(text)
    assert info.value.found == repr(text)
    assert info.value.expected


def test_price_per_volume():
    per_m3, currency, _ = units.parse_price("18 USD/L")
    assert (per_m3, currency) == (pytest.approx(18000.0), "USD")
    with pytest.raises(InputError):
        units.parse_price("18 USD")
