"""The evaluation of whole plans: loads, boil-off, refrigeration, rooms; the command line."""

from __future__ import annotations

import json
import math
import subprocess
import sys
import textwrap

import pytest

import cryoplan
from cryoplan.cli import main
from cryoplan.errors import InputError, InputErrors
from cryoplan.plan import demo_plan_path, parse_plan

BATH = textwrap.dedent(
    """\
    title = "bath"
    ambient = "293 K"

    [[stage]]
    name = "shield"
    temperature = "77 K"
    parts = [ { name = "shield", material = "copper", mass = "5 kg" } ]

    [[stage]]
    name = "cold plate"
    temperature = "4.2 K"
    parts = [ { name = "plate", material = "copper", mass = "2 kg" } ]

    [cooldown]
    steps = [ { cryogen = "helium", to = "4.2 K" } ]

    [[bath]]
    cryogen = "helium"
    volume = "100 L"
    stage = "cold plate"

    [[load]]
    stage = "cold plate"
    kind = "fixed"
    power = "1 W"
    """
)


def evaluate_text(text: str) -> dict:
    return cryoplan.evaluate(parse_plan(text, "plan.toml")).to_dict()


def test_one_watt_on_a_helium_bath_boils_about_1_4_litres_per_hour():
    # common practice: 1 W boils about 1.4 L/h of liquid helium; the exact figure is
    # 3600 / (L rho) = 3600 / (20.56 kJ/kg * 124.7 kg/m^3) = 1.404 L/h (CoolProp)
    data = evaluate_text(BATH)
    bath = data["loads"]["baths"][0]
    assert bath["load_W"] == pytest.approx(1.0)
    assert bath["boiloff_L_per_h"] == pytest.approx(1.4, rel=0.03)  # the rule's 2 figures
    he = cryoplan.cryogen("helium")
    exact = 3600.0 / (he.latent_heat * he.liquid_density) * 1000
    assert bath["boiloff_L_per_h"] == pytest.approx(exact, rel=1e-9)
    # hold time = volume / rate, exactly (DESIGN.md)
    assert data["summary"]["hold_time_h"]["helium"] == pytest.approx(100.0 / exact, rel=1e-9)
    assert data["summary"]["static_boiloff_L_per_day"]["helium"] == pytest.approx(exact * 24)


def test_radiation_load_against_stefan_boltzmann_by_hand():
    # gray parallel plates: q = sigma A (Tw^4 - Tc^4) / (1/e1 + 1/e2 - 1), exact
    text = BATH.replace(
        'kind = "fixed"\npower = "1 W"',
        'kind = "radiation"\narea = "0.5 m^2"\nfrom = "shield"\n'
        "emissivity = 0.05\narea_ratio = 1.0",
    )
    data = evaluate_text(text)
    sigma = 5.670374419e-8  # CODATA 2018, exact in the SI
    expected = sigma * 0.5 * (77.0**4 - 4.2**4) / (1 / 0.05 + 1 / 0.05 - 1)
    got = [i for i in data["loads"]["items"] if i["kind"] == "radiation"][0]["power_W"]
    assert got == pytest.approx(expected, rel=1e-9)


def test_intercepted_support_loads_both_stages_and_less_reaches_the_cold_end():
    base = BATH.replace(
        'kind = "fixed"\npower = "1 W"',
        'kind = "support"\nmaterial = "stainless-304"\narea = "20 mm^2"\n'
        'length = "250 mm"\ncount = 3\nfrom = "293 K"',
    )
    direct = evaluate_text(base)["loads"]["by_stage"]
    sunk = evaluate_text(base.replace('from = "293 K"', 'from = "293 K"\nvia = ["shield"]'))
    sunk = sunk["loads"]["by_stage"]
    cold = {s["stage"]: s["total_W"] for s in direct}
    cold_sunk = {s["stage"]: s["total_W"] for s in sunk}
    # by hand from the conductivity integrals: n A / L * int k dT, the sunk support in two
    # equal halves (exact, same integrals as the library's)
    ss = cryoplan.material("stainless-304")
    g = 3 * 20e-6 / 0.25
    assert cold["cold plate"] == pytest.approx(g * ss.conductivity_integral(4.2, 293.0))
    assert cold_sunk["cold plate"] == pytest.approx(2 * g * ss.conductivity_integral(4.2, 77.0))
    assert cold_sunk["shield"] == pytest.approx(
        2 * g * ss.conductivity_integral(77.0, 293.0) - cold_sunk["cold plate"]
    )
    assert cold_sunk["cold plate"] < cold["cold plate"]


@pytest.mark.parametrize(
    "old, new, key, words",
    [
        (
            'stage = "cold plate"\nkind',
            'stage = "cold plat"\nkind',
            "load[0].stage",
            "unknown stage",
        ),
        (
            'kind = "fixed"\npower = "1 W"',
            'kind = "radiation"\narea = "1 m^2"\nfrom = "2 K"',
            "load[0].from",
            "not warmer",
        ),
        (
            'kind = "fixed"\npower = "1 W"',
            'kind = "radiation"\narea = "1 m^2"\nfrom = "77 K"\nemissivity = 1.5',
            "load[0].emissivity",
            "outside (0, 1]",
        ),
        (
            'kind = "fixed"\npower = "1 W"',
            'kind = "support"\nmaterial = "copper"\narea = "-2 mm^2"\nlength = "1 m"\nfrom = "77 K"',
            "load[0].area",
            "not positive",
        ),
        (
            'kind = "fixed"\npower = "1 W"',
            'kind = "support"\nmaterial = "copper"\narea = "2 mm^2"\nlength = "1 m"\ncount = -1\n'
            'from = "77 K"',
            "load[0].count",
            "whole number",
        ),
        ('volume = "100 L"', 'volume = "100 kg"', "bath[0].volume", "wrong kind"),
        (
            'cryogen = "helium"\nvolume',
            'cryogen = "nitrogen"\nvolume',
            "bath[0].stage",
            "holds 77",
        ),
    ],
)
def test_bad_loads_and_baths(old, new, key, words):
    assert old in BATH
    with pytest.raises((InputError, InputErrors)) as info:
        parse_plan(BATH.replace(old, new, 1), "plan.toml")
    errs = info.value.errors if isinstance(info.value, InputErrors) else [info.value]
    hit = [e for e in errs if e.key == key]
    assert hit, [str(e) for e in errs]
    assert words in str(hit[0])
    assert hit[0].line is not None


def test_support_of_a_material_without_conductivity_is_refused():
    from cryoplan.data.materials import material, material_ids

    without = [i for i in material_ids() if not material(i).has_conductivity]
    if not without:
        pytest.skip("every bundled material has conductivity data")
    text = BATH.replace(
        'kind = "fixed"\npower = "1 W"',
        f'kind = "support"\nmaterial = "{without[0]}"\narea = "2 mm^2"\n'
        'length = "1 m"\nfrom = "77 K"',
    )
    with pytest.raises(InputError, match="no thermal-conductivity"):
        parse_plan(text, "plan.toml")


COOLER = textwrap.dedent(
    """\
    title = "cooler"
    ambient = "300 K"

    [[stage]]
    name = "plate"
    temperature = "4.2 K"
    parts = [ { name = "plate", material = "copper", mass = "10 kg" } ]

    [cooldown]
    start = "300 K"

    [cooler]
    input_power = "7 kW"
    [[cooler.stage]]
    stage = "plate"
    capacity = [[4.2, 20], [300, 20]]
    """
)


def test_constant_capacity_cooldown_time_matches_enthalpy_over_power():
    # t = m [H(T1) - H(T2)] / Q for a constant capacity and no load (exact energy balance)
    data = evaluate_text(COOLER)
    m = cryoplan.material("copper")
    expected_h = 10.0 * float(m.enthalpy(300.0) - m.enthalpy(4.2)) / 20.0 / 3600.0
    # 0.5 %: the bar for the integration
    assert data["summary"]["cooldown_time_h"] == pytest.approx(expected_h, rel=0.005)
    cd = data["refrigeration"]["cooldown"]
    assert abs(cd["closure"]) < 0.005
    # the electrical energy is the input power times the time, exactly
    assert cd["electrical_kWh"] == pytest.approx(7.0 * expected_h, rel=0.005)
    # Carnot: 300/4.2 - 1 W per W (exact)
    assert data["refrigeration"]["stages"][0]["carnot_W_per_W"] == pytest.approx(300 / 4.2 - 1)


@pytest.mark.parametrize(
    "capacity, words",
    [
        ("[[4.2, 1.5], [10]]", "not a capacity table"),
        ("[[10, 1.5], [4.2, 5]]", "not increasing"),
        ("[[4.2, -1.5], [10, 5]]", "negative"),
    ],
)
def test_bad_capacity_tables(capacity, words):
    text = COOLER.replace("[[4.2, 20], [300, 20]]", capacity)
    with pytest.raises(InputError, match=words) as info:
        parse_plan(text, "plan.toml")
    assert info.value.key == "cooler.stage[0].capacity"
    assert info.value.line is not None


def test_cooler_stage_naming_no_stage():
    with pytest.raises(InputError, match="unknown stage"):
        parse_plan(
            COOLER.replace('stage = "plate"\ncapacity', 'stage = "plat"\ncapacity'), "plan.toml"
        )


def test_stage_that_never_gets_cold_says_by_how_much():
    text = COOLER.replace("[[4.2, 20], [300, 20]]", "[[4.2, 0.1], [300, 0.1]]") + textwrap.dedent(
        """
        [[load]]
        stage = "plate"
        kind = "fixed"
        power = "2 W"
        """
    )
    with pytest.raises(InputError, match="never gets cold") as info:
        evaluate_text(text)
    assert "W" in str(info.value)


ROOM = textwrap.dedent(
    """\
    [room]
    volume = "100 m^3"
    ventilation = "2 /h"
    [[room.vessel]]
    cryogen = "helium"
    liquid = "250 L"
    """
)


def test_room_core_schema_sudden_release_by_hand():
    data = evaluate_text(BATH + ROOM)
    room = data["rooms"][0]
    he = cryoplan.cryogen("helium")
    gas = 0.25 * he.expansion_ratio(293.15)
    # well-mixed sudden release: 20.9 exp(-V_gas / V_room) (Fermilab ES&H 4240 / EIGA Doc 44
    # well-mixed model; from memory); the dewar's release is the worst case
    case = [c for c in room["cases"] if c["case"] == "sudden release: helium vessel 1"][0]
    assert case["lowest_percent"] == pytest.approx(20.9 * math.exp(-gas / 100.0), rel=1e-3)
    assert data["summary"]["lowest_oxygen_percent"] <= case["lowest_percent"]
    assert room["verdict"]


@pytest.mark.parametrize(
    "old, new, key",
    [
        ('volume = "100 m^3"', 'volume = "0 m^3"', "room.volume"),
        ('ventilation = "2 /h"', 'ventilation = "-2 /h"', "room.ventilation"),
        ('cryogen = "helium"\nliquid', 'cryogen = "helum"\nliquid', "room.vessel[0].cryogen"),
        ('ventilation = "2 /h"', 'ventilation = "2 /h"\nalarm = "25 %"', "room.alarm"),
    ],
)
def test_bad_rooms(old, new, key):
    with pytest.raises((InputError, InputErrors)) as info:
        parse_plan(BATH + ROOM.replace(old, new, 1), "plan.toml")
    errs = info.value.errors if isinstance(info.value, InputErrors) else [info.value]
    assert any(e.key == key for e in errs), [str(e) for e in errs]


def test_json_summary_keys_are_stable(capsys):
    assert main(["print", "--demo", "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert list(data)[0] == "summary"
    s = data["summary"]
    assert set(s) >= {
        "cooldown_liquid_L",
        "order_L",
        "static_boiloff_L_per_day",
        "hold_time_h",
        "minimum_work_J",
        "cooldown_time_h",
        "lowest_oxygen_percent",
    }
    assert s["order_L"]["helium"] >= s["cooldown_liquid_L"]["helium"]


def test_text_budget_fits_80_columns_and_carries_cautions(capsys):
    assert main(["print", "--demo"]) == 0
    out = capsys.readouterr().out
    assert max(len(line) for line in out.splitlines()) <= 80
    for words in (
        "SUMMARY",
        "ORDER",
        "ONCE COLD",
        "ROOM OXYGEN",
        "CAUTIONS",
        "SOURCES",
        "safety office",
    ):
        assert words in out


def test_bad_plan_exits_2_without_traceback(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text(BATH.replace('mass = "2 kg"', 'mass = "2 kgs"'))
    proc = subprocess.run(
        [sys.executable, "-m", "cryoplan", "print", str(bad)], capture_output=True, text=True
    )
    assert proc.returncode == 2
    assert "Traceback" not in proc.stderr
    assert "bad.toml:" in proc.stderr and "kgs" in proc.stderr


def test_output_file_is_written_whole(tmp_path):
    out = tmp_path / "budget.md"
    assert main(["print", demo_plan_path(), "--format", "markdown", "-o", str(out)]) == 0
    assert out.read_text().startswith("# Cryoplan budget")
    assert main(["print", "--demo", "-o", str(tmp_path / "nofolder" / "x.txt")]) == 2
    assert not (tmp_path / "nofolder").exists()


MAP = textwrap.dedent(
    """\
    title = "map"
    ambient = "300 K"

    [[stage]]
    name = "first"
    temperature = "50 K"
    parts = [ { name = "shield", material = "aluminium-6061", mass = "10 kg" } ]

    [[stage]]
    name = "second"
    temperature = "4.2 K"
    parts = [ { name = "plate", material = "copper", mass = "10 kg" } ]

    [cooldown]
    start = "300 K"

    [cooler]
    input_power = "7 kW"
    [cooler.map]
    stages = ["first", "second"]
    first_K = [15, 20, 300]
    second_K = [2.0, 2.5, 300]
    first_W = [[0, 0, 0], [40, 40, 40], [40, 40, 40]]
    second_W = [[0, 20, 20], [0, 20, 20], [0, 20, 20]]
    """
)


def test_two_stage_map_with_constant_capacities_matches_enthalpy_over_power():
    # a map flat above 20 K and 2.5 K is a constant capacity per stage there (the targets,
    # 50 K and 4.2 K, lie above), so each stage's time is
    # m [H(T1) - H(T2)] / Q (exact energy balance), to the integration's 0.5 %
    data = evaluate_text(MAP)
    times = data["refrigeration"]["cooldown"]["time_to_target_s"]
    al, cu = cryoplan.material("aluminium-6061"), cryoplan.material("copper")
    assert times["first"] == pytest.approx(
        10 * float(al.enthalpy(300) - al.enthalpy(50)) / 40, rel=0.005
    )
    assert times["second"] == pytest.approx(
        10 * float(cu.enthalpy(300) - cu.enthalpy(4.2)) / 20, rel=0.005
    )


def test_nitrogen_precool_shortens_the_cooler_cooldown():
    precool = MAP.replace(
        'start = "300 K"\n', 'start = "300 K"\nsteps = [ { cryogen = "nitrogen", to = "80 K" } ]\n'
    )
    plain = evaluate_text(MAP)["summary"]["cooldown_time_h"]
    with_n2 = evaluate_text(precool)
    assert with_n2["summary"]["cooldown_time_h"] < plain
    assert with_n2["summary"]["cooldown_liquid_L"]["nitrogen"] > 0
    # from 80 K the plate's time is m [H(80) - H(4.2)] / Q (exact energy balance)
    cu = cryoplan.material("copper")
    t = with_n2["refrigeration"]["cooldown"]["time_to_target_s"]["second"]
    assert t == pytest.approx(10 * float(cu.enthalpy(80) - cu.enthalpy(4.2)) / 20, rel=0.005)


@pytest.mark.parametrize(
    "old, new, key",
    [
        ('stages = ["first", "second"]', 'stages = ["first", "third"]', "cooler.map.stages"),
        ("first_K = [15, 20, 300]", "first_K = [300, 20, 15]", "cooler.map.first_K"),
        (
            "second_W = [[0, 20, 20], [0, 20, 20], [0, 20, 20]]",
            "second_W = [[0, 20, 20], [0, 20, 20], [0, 20]]",
            "cooler.map.second_W",
        ),
        ('input_power = "7 kW"\n', "", "cooler.input_power"),
    ],
)
def test_bad_cooler_maps_and_missing_input_power(old, new, key):
    with pytest.raises((InputError, InputErrors)) as info:
        parse_plan(MAP.replace(old, new, 1), "plan.toml")
    errs = info.value.errors if isinstance(info.value, InputErrors) else [info.value]
    assert any(e.key == key for e in errs), [str(e) for e in errs]


def test_percent_of_carnot_alone_gives_the_real_input_of_the_static_loads():
    # real input = Carnot input / fraction, with Carnot = (T0/T - 1) W per W (exact)
    text = textwrap.dedent(
        """\
        ambient = "300 K"
        [[stage]]
        name = "plate"
        temperature = "4.2 K"
        parts = [ { name = "plate", material = "copper", mass = "10 kg" } ]
        [cooler]
        percent_carnot = 1.5
        [[load]]
        stage = "plate"
        kind = "fixed"
        power = "1 W"
        """
    )
    r = evaluate_text(text)["refrigeration"]
    assert r["real_input_W"] == pytest.approx((300 / 4.2 - 1) / 0.015)
    assert r["survey_percent"] > 0  # guidance from the published trend is shown


def test_room_sudden_model_displacement_by_hand():
    # the displacement form, 20.9 (1 - V_gas / V_room) (BCGA method as published in the
    # University of Oxford Safety Office policy S4/03, appendix 1; from memory), floored at 0
    text = BATH + ROOM.replace(
        'ventilation = "2 /h"', 'ventilation = "2 /h"\nsudden_model = "displacement"'
    )
    text = text.replace('liquid = "250 L"', 'liquid = "50 L"')
    room = evaluate_text(text)["rooms"][0]
    gas = 0.05 * cryoplan.cryogen("helium").expansion_ratio(293.15)
    case = [c for c in room["cases"] if c["case"] == "sudden release: helium vessel 1"][0]
    assert case["sudden_drop_percent"] == pytest.approx(20.9 * (1 - gas / 100.0), rel=1e-6)
    with pytest.raises(InputError, match="did you mean 'mixed'"):
        parse_plan(
            BATH
            + ROOM.replace('ventilation = "2 /h"', 'ventilation = "2 /h"\nsudden_model = "mixd"'),
            "p.toml",
        )
