"""Two plans compared: a plan against itself shows no differences; the demo without its
nitrogen precool needs far more helium; text fits 80 columns; bad input exits 2."""

from __future__ import annotations

import json
import os
import shutil

import pytest

from cryoplan.cli import main
from cryoplan.commands.compare import render_comparison
from cryoplan.evaluation import evaluate
from cryoplan.evaluation.compare import compare_results, compare_summaries, flatten, label_and_unit
from cryoplan.plan import demo_plan_path, load_plan


def _without_nitrogen_precool(text: str) -> str:
    """The demo plan with its liquid-nitrogen cooldown step taken out (helium does it all)."""
    lines = [ln for ln in text.splitlines() if not ln.strip().startswith('{ cryogen = "nitrogen"')]
    assert len(lines) == len(text.splitlines()) - 1  # exactly the one step line went
    return "\n".join(lines) + "\n"


@pytest.fixture(scope="module")
def plans(tmp_path_factory):
    folder = tmp_path_factory.mktemp("plans")
    demo = demo_plan_path()
    copy = folder / "demo-copy.toml"
    shutil.copyfile(demo, copy)
    variant = folder / "demo-no-precool.toml"
    with open(demo, encoding="utf-8") as fh:
        variant.write_text(_without_nitrogen_precool(fh.read()), encoding="utf-8")
    return {
        "demo": demo,
        "copy": str(copy),
        "variant": str(variant),
        "data": evaluate(load_plan(demo)).to_dict(),
        "variant_data": evaluate(load_plan(str(variant))).to_dict(),
    }


def _row(comparison: dict, key: str) -> dict:
    return next(r for r in comparison["rows"] if r["key"] == key)


# --- the pure comparison -----------------------------------------------------------------------


def test_flatten_nested_summary():
    assert flatten({"a": {"b": {"c": 1.0}}, "d": 2.0}) == {"a.b.c": 1.0, "d": 2.0}


def test_labels_for_design_keys_and_unknown_keys():
    assert label_and_unit("hold_time_h.helium") == ("Hold time, helium", "h")
    assert label_and_unit("lowest_oxygen_percent") == ("Lowest oxygen", "%")
    assert label_and_unit("something_new") == ("Something new", "")


def test_differences_and_percentages():
    a = {
        "order_L": {"helium": 200.0},
        "hold_time_h": {"helium": 100.0},
        "lowest_oxygen_percent": 19.0,
        "minimum_work_J": 0.0,
    }
    b = {
        "order_L": {"helium": 250.0, "nitrogen": 60.0},
        "lowest_oxygen_percent": 17.5,
        "minimum_work_J": 5.0,
    }
    rows = {r.key: r for r in compare_summaries(a, b)}
    assert rows["order_L.helium"].difference == 50.0
    assert rows["order_L.helium"].percent == 25.0  # 50 / 200, exact in binary floats
    assert rows["order_L.nitrogen"].a == 0.0  # a cryogen not used: none ordered
    assert rows["order_L.nitrogen"].percent is None  # no percentage of nothing
    assert rows["hold_time_h.helium"].b is None  # no bath: no hold time, not zero
    assert rows["hold_time_h.helium"].difference is None
    assert rows["lowest_oxygen_percent"].difference == pytest.approx(-1.5, abs=1e-12)
    assert rows["lowest_oxygen_percent"].percent is None  # points, not % of a %
    assert rows["minimum_work_J"].percent is None and not rows["minimum_work_J"].same


def test_costs_in_two_currencies_are_not_subtracted():
    rows = compare_summaries(
        {"cost": {"helium": 100.0}, "currency": "USD"},
        {"cost": {"helium": 90.0}, "currency": "EUR"},
    )
    assert len(rows) == 1 and rows[0].difference is None and not rows[0].same
    assert "USD" in rows[0].label and "EUR" in rows[0].label


def test_noise_below_printing_counts_as_same():
    rows = compare_summaries({"x_L": 1.0}, {"x_L": 1.0 + 1e-12})  # far below 3 figures
    assert rows[0].same and rows[0].difference == 0.0
    rows = compare_summaries({"x_L": 1.0}, {"x_L": 1.001})  # a difference one can print
    assert not rows[0].same


# --- on the demo plan ---------------------------------------------------------------------------


def test_plan_against_itself_shows_no_differences(plans):
    # two evaluations of two files with the same content
    a = evaluate(load_plan(plans["copy"])).to_dict()
    comparison = compare_results(plans["data"], a)
    assert comparison["rows"] and comparison["differences"] == 0
    assert all(r["same"] and r["difference"] in (0.0, None) for r in comparison["rows"])
    text = render_comparison(comparison)
    assert "No differences" in text


def test_every_summary_figure_has_a_row(plans):
    comparison = compare_results(plans["data"], plans["data"])
    keys = {r["key"] for r in comparison["rows"]}
    for key, value in flatten(plans["data"]["summary"]).items():
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            assert key in keys


def test_without_nitrogen_precool_helium_rises_sharply(plans):
    comparison = compare_results(plans["data"], plans["variant_data"])
    he = _row(comparison, "cooldown_liquid_L.helium")
    # Cooling from room temperature instead of 77 K takes several times the helium: with the
    # gas's enthalpy fully used, 1.6 L instead of 0.46 L per kg of copper, and with the
    # latent heat alone 31 L instead of 2.2 L (J. W. Ekin, Experimental Techniques for
    # Low-Temperature Measurements, 2006, chapter 1, the table of liquid cryogen needed to
    # cool metals; from memory). Even the least
    # favourable of these ratios (3.5) is well above doubling, so > 100 % is a safe bar.
    assert he["difference"] > 0
    assert he["percent"] > 100
    n2 = _row(comparison, "cooldown_liquid_L.nitrogen")
    assert n2["b"] == 0.0  # no nitrogen step left: no nitrogen boiled by the cooldown
    assert n2["difference"] == pytest.approx(-n2["a"], rel=1e-12)
    order = _row(comparison, "order_L.helium")
    assert order["difference"] >= 0  # whole dewars: the order cannot shrink
    heat = _row(comparison, "heat_J")
    assert heat["same"]  # the same cold mass over the same temperatures


def test_text_fits_80_columns_markdown_and_json(plans):
    comparison = compare_results(plans["data"], plans["variant_data"])
    text = render_comparison(comparison, "text", width=80)
    assert max(len(line) for line in text.splitlines()) <= 80
    assert "Cooldown liquid, helium" in text and "%" in text
    md = render_comparison(comparison, "markdown")
    assert md.count("\n| ") >= len(comparison["rows"]) + 1  # header and one line per row
    back = json.loads(render_comparison(comparison, "json"))
    assert back["differences"] == comparison["differences"] > 0


def test_oxygen_figures_carry_the_caution(plans):
    comparison = compare_results(plans["data"], plans["variant_data"])
    assert plans["data"]["summary"].get("lowest_oxygen_percent") is not None
    assert "safety office" in render_comparison(comparison)


# --- the command --------------------------------------------------------------------------------


def test_cli_same_path_twice(plans, capsys):
    assert main(["compare", plans["demo"], plans["demo"]]) == 0
    assert "No differences" in capsys.readouterr().out


def test_cli_json_to_file(plans, tmp_path):
    out = tmp_path / "cmp.json"
    assert main(["compare", plans["demo"], plans["variant"], "-f", "json", "-o", str(out)]) == 0
    assert json.loads(out.read_text())["differences"] > 0


def test_cli_missing_file_exits_2(plans, tmp_path, capsys):
    missing = os.path.join(tmp_path, "nowhere.toml")
    assert main(["compare", plans["demo"], missing]) == 2
    err = capsys.readouterr().err
    assert "nowhere.toml" in err and "Traceback" not in err


def test_cli_both_broken_names_both(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text('title = "x"\n[[stage]\n', encoding="utf-8")  # not TOML
    missing = tmp_path / "missing.toml"
    assert main(["compare", str(bad), str(missing)]) == 2
    err = capsys.readouterr().err
    assert "bad.toml" in err and "missing.toml" in err and "Traceback" not in err
