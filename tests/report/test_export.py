"""CSV for spreadsheets: one file per table and chart of the printed budget, read back equal;
the cooldown curve; a failed write leaves no partial file."""

from __future__ import annotations

import csv
import glob
import io
import os

import pytest

from cryoplan.cli import main
from cryoplan.errors import InputError
from cryoplan.evaluation import evaluate
from cryoplan.plan import demo_plan_path, examples_dir, load_plan
from cryoplan.report import export
from cryoplan.report.budget import build_document
from cryoplan.report.document import Chart, Heading, Table
from cryoplan.report.export import chart_csv, csv_files, curve_csv, table_csv, write_csv_folder


def _read(text: str) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text)))


@pytest.fixture(scope="module")
def demo():
    return evaluate(load_plan(demo_plan_path())).to_dict()


def test_one_file_per_table_and_chart(demo, tmp_path):
    blocks = build_document(demo)
    named = [b for b in blocks if isinstance(b, (Table, Chart))]
    all_paths = write_csv_folder(demo, str(tmp_path / "out"))
    assert sorted(os.listdir(tmp_path / "out")) == sorted(os.path.basename(p) for p in all_paths)
    # the printed tables and charts, then the raw-number files (values_*.csv)
    paths = [p for p in all_paths if not os.path.basename(p).startswith("values_")]
    assert len(paths) == len(named) and len(set(all_paths)) == len(all_paths)
    for block, path in zip(named, paths):
        if block.name:
            assert os.path.basename(path) == f"{block.name}.csv"
        with open(path, encoding="utf-8", newline="") as fh:
            rows = list(csv.reader(fh))
        if isinstance(block, Table):
            assert rows[0] == block.headers
            assert rows[1:] == [[str(c) for c in r] for r in block.rows]


def test_chart_points_at_full_precision(demo):
    charts = [b for b in build_document(demo) if isinstance(b, Chart)]
    assert charts  # the demo's cumulative liquid against temperature
    for chart in charts:
        rows = _read(chart_csv(chart))
        points = (
            [(label, float(x), float(y)) for label, x, y in rows[1:]]
            if (rows[0][0] == "series")
            else None
        )
        expected = [
            (str(lb), float(x), float(y)) for lb, xs, ys in chart.series for x, y in zip(xs, ys)
        ]
        if points is None:  # wide: one x column, one column per series
            points = [
                (chart.series[k][0], float(r[0]), float(r[k + 1]))
                for r in rows[1:]
                for k in range(len(chart.series))
            ]
            expected.sort(key=lambda p: (p[1], p[0]))
            points.sort(key=lambda p: (p[1], p[0]))
        assert points == expected  # repr round-trips a float exactly


def test_chart_wide_when_series_share_x():
    c = Chart(
        "T(t)",
        "time [h]",
        "T [K]",
        [("shield", [0.0, 1.0], [293.0, 200.5]), ("plate", [0.0, 1.0], [293.0, 250.25])],
    )
    assert _read(chart_csv(c)) == [
        ["time [h]", "shield: T [K]", "plate: T [K]"],
        ["0.0", "293.0", "293.0"],
        ["1.0", "200.5", "250.25"],
    ]


def test_names_unique_and_from_titles():
    blocks = [
        Heading("Order"),
        Table(["a"], [["1"]]),
        Table(["a"], [["2"]]),
        Table(["b"], [["3"]], title="Dewars and range"),
        Table(["c"], [], name="x"),
        Table(["c"], [], name="x"),
    ]
    assert list(csv_files(blocks)) == [
        "order.csv",
        "order_2.csv",
        "dewars_and_range.csv",
        "x.csv",
        "x_2.csv",
    ]


def test_short_rows_padded_and_commas_quoted():
    text = table_csv(Table(["Cryogen", "Cost", "Note"], [["helium", "3,600 USD"]]))
    assert text.splitlines() == ["Cryogen,Cost,Note", 'helium,"3,600 USD",']


def test_every_example_writes(tmp_path):
    for k, path in enumerate(sorted(glob.glob(os.path.join(examples_dir(), "*.toml")))):
        data = evaluate(load_plan(path)).to_dict()
        assert write_csv_folder(data, str(tmp_path / f"ex{k}"))


def test_existing_folder_is_updated_in_place(demo, tmp_path):
    (tmp_path / "mine.txt").write_text("keep me")
    (tmp_path / "summary.csv").write_text("old")
    write_csv_folder(demo, str(tmp_path))
    assert (tmp_path / "mine.txt").read_text() == "keep me"
    assert (tmp_path / "summary.csv").read_text().startswith("Figure,Value")
    assert not [n for n in os.listdir(tmp_path) if n.startswith(".cryoplan")]


def test_failure_midway_leaves_no_partial_file(demo, tmp_path, monkeypatch):
    real_open = open
    calls = {"n": 0}

    def failing_open(path, *args, **kwargs):
        calls["n"] += 1
        if calls["n"] == 3:
            raise OSError(28, "No space left on device")
        return real_open(path, *args, **kwargs)

    monkeypatch.setattr(export, "open", failing_open, raising=False)
    with pytest.raises(InputError, match="No space left"):
        write_csv_folder(demo, str(tmp_path / "new"))
    assert list(tmp_path.iterdir()) == []  # neither the folder nor a temporary one
    (tmp_path / "old").mkdir()
    calls["n"] = 0
    with pytest.raises(InputError):
        write_csv_folder(demo, str(tmp_path / "old"))
    assert list((tmp_path / "old").iterdir()) == []


def test_bad_folders(demo, tmp_path):
    afile = tmp_path / "a-file"
    afile.write_text("x")
    with pytest.raises(InputError, match="a folder"):
        write_csv_folder(demo, str(afile))
    with pytest.raises(InputError, match="parent"):
        write_csv_folder(demo, str(tmp_path / "no" / "such"))
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a-file"]


def test_cli_csv(tmp_path, capsys):
    out = tmp_path / "tables"
    assert main(["print", demo_plan_path(), "--format", "csv", "-o", str(out)]) == 0
    assert (out / "summary.csv").exists()
    assert (
        main(["print", demo_plan_path(), "--format", "csv", "-o", str(tmp_path / "x" / "y")]) == 2
    )
    assert "Traceback" not in capsys.readouterr().err


def test_curve_csv_columns():
    data = {
        "refrigeration": {
            "curve": {
                "time_h": [0.0, 2.0, 4.0],
                "stages": {"shield": [293.0, 120.0, 45.5], "4K plate": [293.0, 180.0, 20.0]},
            }
        }
    }
    rows = _read(curve_csv(data))
    assert rows[0] == ["time [h]", "shield [K]", "4K plate [K]"]
    assert [float(v) for v in rows[3]] == [4.0, 45.5, 20.0]


def test_curve_csv_without_a_cooler(demo, tmp_path, capsys):
    assert not (demo.get("refrigeration") or {}).get("curve")  # the demo is a bath cryostat
    with pytest.raises(InputError, match="no cooldown curve"):
        curve_csv(demo)
    target = tmp_path / "curve.csv"
    assert main(["print", demo_plan_path(), "--curve", str(target)]) == 2
    assert "cooler" in capsys.readouterr().err and not target.exists()


def test_value_csvs_carry_the_results_numbers_in_full(tmp_path):
    # the raw-number files read back exactly what the JSON report holds (same floats)
    import csv

    import cryoplan
    from cryoplan.plan import demo_plan_path
    from cryoplan.report.export import write_csv_folder

    data = cryoplan.evaluate(cryoplan.load_plan(demo_plan_path())).to_dict()
    write_csv_folder(data, str(tmp_path / "out"))
    with open(tmp_path / "out" / "values_order.csv", newline="") as fh:
        rows = {r["cryogen"]: r for r in csv.DictReader(fh)}
    for cry, entry in data["order"].items():
        assert float(rows[cry]["order_L"]) == entry["order_L"]
        assert float(rows[cry]["needed_L"]) == entry["needed_L"]
    with open(tmp_path / "out" / "values_baths.csv", newline="") as fh:
        baths = list(csv.DictReader(fh))
    assert [float(b["boiloff_L_per_day"]) for b in baths] == [
        b["boiloff_L_per_day"] for b in data["loads"]["baths"]
    ]
