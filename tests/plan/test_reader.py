"""Plan files: the core schema, the extensions, and every bad input named by the issues."""

from __future__ import annotations

import glob
import os
import textwrap

import pytest

import cryoplan
from cryoplan.errors import InputError, InputErrors
from cryoplan.plan import examples_dir, parse_plan

CORE = textwrap.dedent(
    """\
    title = "core"
    ambient = "293 K"

    [[stage]]
    name = "cold plate"
    temperature = "4.2 K"
    parts = [
      { name = "solenoid", material = "nbti-copper-wire", mass = "14 kg" },
      { name = "former",   material = "stainless-304",    mass = "22 kg" },
    ]

    [cooldown]
    start = "293 K"
    steps = [
      { cryogen = "nitrogen", to = "80 K",  gas_use = 0.4 },
      { cryogen = "helium",   to = "4.2 K", gas_use = 0.5 },
    ]
    """
)


def errors_of(text: str) -> list[InputError]:
    with pytest.raises((InputError, InputErrors)) as info:
        parse_plan(text, "plan.toml")
    exc = info.value
    return exc.errors if isinstance(exc, InputErrors) else [exc]


def test_core_schema_loads_as_written():
    plan = parse_plan(CORE, "plan.toml")
    assert plan.title == "core"
    assert plan.ambient == pytest.approx(293.0)
    stage = plan.stage("cold plate")
    assert [p.mass for p in stage.parts] == pytest.approx([14.0, 22.0])
    assert [s.cryogen for s in plan.cooldown.steps] == ["nitrogen", "helium"]
    # "4.2 K" for helium is within half a kelvin below its normal boiling point
    # (4.22 K, CoolProp) and is read as the boiling point, with a note
    assert plan.cooldown.steps[1].to == pytest.approx(4.22, abs=0.01)
    assert any("boiling point" in n for n in plan.notes)


def test_units_are_parsed_with_pint():
    text = CORE.replace('mass = "14 kg"', 'mass = "500 g"').replace(
        'ambient = "293 K"', 'ambient = "20 degC"'
    )
    plan = parse_plan(text, "plan.toml")
    assert plan.stage("cold plate").parts[0].mass == pytest.approx(0.5)
    assert plan.ambient == pytest.approx(293.15)  # exact definition of the Celsius scale


def test_part_by_dimensions_uses_the_density():
    from cryoplan import material

    text = CORE.replace(
        '{ name = "former",   material = "stainless-304",    mass = "22 kg" }',
        '{ name = "block", material = "copper", dimensions = ["100 mm", "50 mm", "10 mm"] }',
    )
    plan = parse_plan(text, "plan.toml")
    block = plan.stage("cold plate").parts[1]
    assert block.mass == pytest.approx(5e-5 * material("copper").density)  # V * rho, exact


@pytest.mark.parametrize(
    "old, new, key, words",
    [
        ('mass = "14 kg"', 'mass = "-3 kg"', "stage[0].parts[0].mass", "not positive"),
        ('mass = "14 kg"', 'mass = "0 kg"', "stage[0].parts[0].mass", "not positive"),
        ('mass = "14 kg"', 'mass = "14 K"', "stage[0].parts[0].mass", "wrong kind"),
        ('mass = "14 kg"', 'mass = "10 kgs"', "stage[0].parts[0].mass", "unknown unit"),
        (
            'temperature = "4.2 K"',
            'temperature = "-4 K"',
            "stage[0].temperature",
            "below absolute zero",
        ),
        ("gas_use = 0.4", "gas_use = 1.4", "cooldown.steps[0].gas_use", "out of range"),
        ('"nbti-copper-wire"', '"nbti-coper-wire"', "stage[0].parts[0].material", "did you mean"),
        (
            'cryogen = "nitrogen"',
            'cryogen = "nitrogn"',
            "cooldown.steps[0].cryogen",
            "did you mean 'nitrogen'",
        ),
        ('to = "80 K"', 'to = "20 K"', "cooldown.steps[0].to", "boils at 77"),
        ('to = "80 K"', 'to = "310 K"', "cooldown.steps[0].to", "above where the parts are"),
        ('ambient = "293 K"', 'ambiant = "293 K"', "ambiant", "did you mean 'ambient'"),
        ('name = "cold plate"\n', "", "stage[0].name", "missing"),
    ],
)
def test_bad_input_names_file_line_key_expected_found(old, new, key, words):
    assert old in CORE
    errs = errors_of(CORE.replace(old, new, 1))
    hit = [e for e in errs if e.key == key]
    assert hit, [str(e) for e in errs]
    e = hit[0]
    assert words in str(e)
    assert e.file == "plan.toml"
    assert e.line is not None
    # the line named holds the key's text
    line = CORE.replace(old, new, 1).splitlines()[e.line - 1]
    leaf = key.split(".")[-1].split("[")[0]
    assert leaf in line or "[[stage]]" in line or "name" in key
    if "missing" not in words:
        assert e.expected and e.found


def test_broken_toml_names_the_line():
    errs = errors_of(CORE.replace('title = "core"', 'title = "core'))
    assert errs[0].line == 1
    assert "TOML" in str(errs[0])


def test_several_mistakes_reported_together():
    text = CORE.replace('mass = "14 kg"', 'mass = "-1 kg"').replace("gas_use = 0.5", "gas_use = 2")
    errs = errors_of(text)
    assert len(errs) >= 2
    assert {e.key for e in errs} >= {"stage[0].parts[0].mass", "cooldown.steps[1].gas_use"}


def test_unknown_material_suggests_closest():
    errs = errors_of(CORE.replace('"stainless-304"', '"stainles-304"'))
    assert "stainless-304" in str(errs[0])


def test_every_example_loads_and_evaluates():
    paths = sorted(glob.glob(os.path.join(examples_dir(), "*.toml")))
    assert len(paths) >= 3
    for path in paths:
        results = cryoplan.evaluate(cryoplan.load_plan(path))
        summary = results.to_dict()["summary"]
        for key in (
            "cooldown_liquid_L",
            "order_L",
            "static_boiloff_L_per_day",
            "hold_time_h",
            "minimum_work_J",
            "cooldown_time_h",
            "lowest_oxygen_percent",
        ):
            assert key in summary
        assert summary["minimum_work_J"] > 0
