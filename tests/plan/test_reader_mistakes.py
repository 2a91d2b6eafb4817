"""Mistakes in a plan that used to crash the reader or come in instalments (issue 14, items 4
and 8), and the one cryogen-name resolver (issue 12).

Each test mutates the bundled demo plan (or a small plan written here) with :mod:`tomlkit`
and checks that the reader answers with located errors naming the plan's key: no
TypeError, OverflowError or RecursionError, no internal variable name, every independent
mistake in one run and in file order. No figure is computed here.
"""

from __future__ import annotations

import datetime as dt
import textwrap

import pytest
import tomlkit

from cryoplan.data import fluids
from cryoplan.errors import InputError, InputErrors
from cryoplan.plan import demo_plan_path, examples_dir, parse_plan
from cryoplan.plan.schema import MAX_COUNT, MAX_DAYS, MAX_LAYERS, MAX_TIMES

DEMO = open(demo_plan_path(), encoding="utf-8").read()


def mutated(text: str, **changes) -> str:
    """``text`` with values set at dotted paths (``load.3.gas``: the fourth load's gas)."""
    doc = tomlkit.parse(text)
    for path, value in changes.items():
        node = doc
        parts = path.split(".")
        for part in parts[:-1]:
            node = node[int(part)] if part.isdigit() else node[part]
        last = parts[-1]
        node[int(last) if last.isdigit() else last] = value
    return doc.as_string()


def errors_of(text: str) -> list[InputError]:
    with pytest.raises((InputError, InputErrors)) as info:
        parse_plan(text, "plan.toml")
    exc = info.value
    return exc.errors if isinstance(exc, InputErrors) else [exc]


def only_error(text: str) -> InputError:
    errs = errors_of(text)
    assert len(errs) == 1, [str(e) for e in errs]
    return errs[0]


def test_the_demo_reads():
    parse_plan(DEMO, "plan.toml")  # the base every mutation below starts from


# --- wrong types: a list or a table where a name is expected -----------------------------

DIMENSIONED = {"stage.0.parts.0": {"name": "block", "material": "copper"}}


@pytest.mark.parametrize(
    "path, value, key, words",
    [
        ("load.3.cooling", [], "load[3].cooling", "not a cooling of a lead"),
        ("load.2.material", ["copper"], "load[2].material", "not a material id"),
        ("room.0.sudden_model", [], "room[0].sudden_model", "not a sudden-release model"),
        ("room.0.sudden_model", {}, "room[0].sudden_model", "not a sudden-release model"),
        ("cooldown.steps.0.cryogen", ["helium"], "cooldown.steps[0].cryogen", "not a cryogen"),
        ("bath.0.cryogen", {"a": 1}, "bath[0].cryogen", "not a cryogen"),
        ("load.4.via", [["nitrogen shield"]], "load[4].via[0]", "not a stage's name"),
        ("load.0.name", [], "load[0].name", "not a name"),
        ("room.0.vessel.0.cryogen", [], "room[0].vessel[0].cryogen", "not a cryogen"),
    ],
)
def test_a_list_where_a_name_is_expected_is_a_located_error(path, value, key, words):
    e = only_error(mutated(DEMO, **{path: value}))
    assert e.key == key and words in str(e)
    assert e.line is not None and e.expected and e.found


def test_a_list_as_a_shape_or_a_gas_is_a_located_error():
    block = {"name": "block", "material": "copper", "dimensions": ["1 cm", "1 cm", "1 cm"]}
    e = only_error(mutated(DEMO, **{"stage.0.parts.0": block | {"shape": []}}))
    assert e.key == "stage[0].parts[0].shape" and "not a shape" in str(e)
    gas = {"name": "gas", "stage": "cold plate", "kind": "gas", "area": "1 m^2"}
    gas |= {"from": "nitrogen shield", "pressure": "1e-4 Pa", "gas": ["helium"]}
    e = only_error(mutated(DEMO, **{"load.0": gas}))
    assert e.key == "load[0].gas" and "not a gas" in str(e)


def test_a_cooler_link_naming_a_list_is_a_located_error():
    text = open(f"{examples_dir()}/cooler-two-stage.toml", encoding="utf-8").read()
    e = only_error(mutated(text, **{"cooler.link.0.between": [["a"], "b"]}))
    assert e.key == "cooler.link[0].between" and "two stage names" in str(e)


# --- flags ------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "path, value, key",
    [
        ("room.0.quench", "false", "room[0].quench"),
        ("room.0.include_baths", "yes", "room[0].include_baths"),
        ("room.0.vessel.0.quench", 0, "room[0].vessel[0].quench"),
        ("load.2.vapor_cooled", "true", "load[2].vapor_cooled"),
    ],
)
def test_a_flag_must_be_true_or_false(path, value, key):
    # "false" is a non-empty string, which Python's bool() reads as True: it used to turn
    # the quench case on
    e = only_error(mutated(DEMO, **{path: value}))
    assert e.key == key and "not true or false" in str(e)


# --- bounds of counts, days and dates ---------------------------------------------------


@pytest.mark.parametrize(
    "path, value, key, bound",
    [
        ("load.7.layers", 1_000_000_000, "load[7].layers", MAX_LAYERS),
        ("insert.0.times", 1_000_000_000, "insert[0].times", MAX_TIMES),
        ("load.1.count", 10**18, "load[1].count", MAX_COUNT),
        ("load.4.count", MAX_COUNT + 1, "load[4].count", MAX_COUNT),
        ("load.3.count", 10**6, "load[3].count", MAX_COUNT),
        ("operation.days", 1e9, "operation.days", MAX_DAYS),
        ("operation.days", float("inf"), "operation.days", MAX_DAYS),
    ],
)
def test_counts_and_days_have_an_upper_bound(path, value, key, bound):
    e = only_error(mutated(DEMO, **{path: value}))
    assert e.key == key
    assert f"{bound:,}" in e.expected or str(bound) in e.expected


def test_counts_at_their_bound_are_accepted():
    plan = parse_plan(mutated(DEMO, **{"load.7.layers": MAX_LAYERS}), "plan.toml")
    assert plan.loads[7].values["layers"] == MAX_LAYERS
    plan = parse_plan(mutated(DEMO, **{"insert.0.times": MAX_TIMES}), "plan.toml")
    assert plan.inserts[0].times == MAX_TIMES


@pytest.mark.parametrize(
    "start, days", [(dt.date(9999, 12, 31), 30), (dt.date(9999, 12, 1), 60), (dt.date.max, 1)]
)
def test_a_calendar_past_the_last_date_is_refused(start, days):
    e = only_error(mutated(DEMO, **{"operation.start_date": start, "operation.days": days}))
    assert e.key == "operation.start_date"
    assert "last date" in e.message and start.isoformat() in e.found


def test_the_last_calendar_that_fits_is_accepted():
    # date.max is 9999-12-31; 30 days and the day after them still fit from 9999-11-30
    start = dt.date(9999, 11, 30)
    plan = parse_plan(mutated(DEMO, **{"operation.start_date": start}), "plan.toml")
    assert plan.start_date == start


def test_messages_name_the_plans_keys_not_internal_names():
    text = mutated(
        DEMO,
        **{
            "operation.days": float("inf"),
            "supply.0.dewars": ["100 L", "-3 L"],
            "cooldown.steps.0.gas_use_range": [0.1, 7],
        },
    )
    errs = errors_of(text)
    keys = {e.key for e in errs}
    assert keys == {"operation.days", "supply[0].dewars[1]", "cooldown.steps[0].gas_use_range[1]"}
    for e in errs:
        for internal in ("horizon_seconds", "hold_seconds", "other_load", ".d", ".v"):
            assert not e.key.endswith(internal) and internal + " " not in str(e)


# --- deep nesting -----------------------------------------------------------------------


@pytest.mark.parametrize("opening, closing", [("[", "]"), ("{a = ", "}")])
def test_toml_nested_a_thousand_deep_is_a_located_error(opening, closing):
    text = 'title = "deep"\n\nx = ' + opening * 1000 + "1" * (opening == "{a = ") + closing * 1000
    e = only_error(text)
    assert "nested too deep" in e.message
    assert e.line == 3  # the line where the brackets start


def test_a_deeply_nested_value_is_shown_short():
    text = mutated(DEMO, **{"room.0.quench": [[[[[[[[[[1]]]]]]]]]] * 100})
    e = only_error(text)
    assert e.key == "room[0].quench" and len(e.found) < 200


# --- every independent mistake in one run, in file order --------------------------------


def test_every_independent_mistake_is_reported_in_one_run_in_file_order():
    text = mutated(
        DEMO,
        **{
            "load.6.power": "3 kgs",  # a wrong unit, late in the file
            "load.0.aera": "1 m^2",  # an unknown key in an earlier load
            "room.1.quench": "no",
            "stage.0.parts.0.mass": "-1 kg",
            "title": 7,
        },
    )
    errs = errors_of(text)
    assert [e.key for e in errs] == [
        "title",
        "stage[0].parts[0].mass",
        "load[0].aera",
        "load[6].power",
        "room[1].quench",
    ]
    lines = [e.line for e in errs]
    assert lines == sorted(lines) and None not in lines


def test_a_stage_with_a_mistake_is_not_reported_again_where_it_is_named():
    # the shield's temperature is wrong; its baths, loads and the wiring's 'via' name it,
    # and must not each add "unknown stage 'nitrogen shield'"
    errs = errors_of(mutated(DEMO, **{"stage.0.temperature": "77 kgs"}))
    assert [e.key for e in errs] == ["stage[0].temperature"]


def test_a_plan_without_stages_says_so_beside_its_other_mistakes():
    text = 'title = 3\n\n[cooldown]\nstart = "293 K"\n'
    assert [e.key for e in errors_of(text)] == ["title", "stage"]


def test_a_vapour_cooled_lead_without_a_bath_is_a_plan_error():
    text = mutated(DEMO, **{"bath": tomlkit.aot()})
    errs = errors_of(text)
    assert "load[3].cooling" in {e.key for e in errs}


def test_a_cooler_map_with_its_stages_reversed_is_refused():
    text = open(f"{examples_dir()}/cooler-map-precool.toml", encoding="utf-8").read()
    e = only_error(mutated(text, **{"cooler.map.stages": ["second stage", "first stage"]}))
    assert e.key == "cooler.map.stages" and "wrong way round" in e.message


def test_a_leads_material_is_checked():
    e = only_error(mutated(DEMO, **{"load.3.material": "unobtainium"}))
    assert e.key == "load[3].material" and "unknown material" in e.message


# --- one cryogen-name resolver ----------------------------------------------------------

ALIAS_PLAN = textwrap.dedent(
    """\
    [[stage]]
    name = "plate"
    temperature = "95 K"
    parts = [{{ name = "block", material = "copper", mass = "1 kg" }}]

    [cooldown]
    steps = [{{ cryogen = "{name}", to = "95 K" }}]

    [[bath]]
    cryogen = "{name}"
    volume = "10 L"
    stage = "plate"

    [[room]]
    volume = "100 m^3"
    [[room.vessel]]
    cryogen = "{name}"
    liquid = "10 L"
    """
)

#: Every spelling the fluid layer accepts: its names, its aliases, and both in upper case
#: (the resolver compares in lower case).
SPELLINGS = sorted(
    set(fluids.cryogen_names()) | set(fluids._ALIASES) | {a.upper() for a in fluids._ALIASES}
)


@pytest.mark.parametrize("name", SPELLINGS)
def test_every_name_the_fluid_layer_accepts_is_accepted_in_a_plan(name):
    # 95 K is above every cryogen's normal boiling point (oxygen's is 90.19 K, CoolProp),
    # so the same step and bath suit them all
    canonical = fluids.canonical_name(name)
    plan = parse_plan(ALIAS_PLAN.format(name=name), "plan.toml")
    assert plan.cooldown.steps[0].cryogen == canonical
    assert plan.baths[0].cryogen == canonical
    assert plan.rooms[0].vessels[0].cryogen == canonical


def test_a_name_the_fluid_layer_refuses_is_refused_in_a_plan():
    with pytest.raises(InputError):
        fluids.canonical_name("LIN")
    errs = errors_of(ALIAS_PLAN.format(name="LIN"))
    assert {e.key for e in errs} == {
        "cooldown.steps[0].cryogen",
        "bath[0].cryogen",
        "room[0].vessel[0].cryogen",
    }
