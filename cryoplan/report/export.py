"""CSV for spreadsheets: the printed budget's tables and curves, one file each.

- :func:`curve_csv`: the cooler's cooldown curve T(t), one column per stage.
- :func:`write_csv_folder`: one CSV per table block (``Table.name``) and per chart block
  (``Chart.name``) of :func:`cryoplan.report.budget.build_document`, into a folder.

Tables are written as printed (the same rounded figures and units as the text budget);
charts with every computed point at full precision. A chart whose series share one x axis
becomes one column per series ("wide"); otherwise one row per point with the series named
in the first column ("long"), which a spreadsheet's pivot table or filter reads directly.
Files are UTF-8, comma-separated, with a header row. No physics here.
"""

from __future__ import annotations

import csv
import io
import os
import re
import shutil
import tempfile

from ..errors import InputError
from .document import Chart, Heading, Table


def _csv_text(rows) -> str:
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    writer.writerows(rows)
    return buf.getvalue()


def _number(value) -> str:
    """A float written in full (``repr``), so a spreadsheet reads back the same number.

    >>> _number(1.0), _number(0.1 + 0.2), _number(None), _number(float("nan"))
    ('1.0', '0.30000000000000004', '', '')
    """
    if value is None:
        return ""
    value = float(value)
    if value != value:  # NaN: an empty cell, which spreadsheets leave out of sums and charts
        return ""
    return repr(value)


def _cell(value) -> str:
    if isinstance(value, bool) or value is None or isinstance(value, str):
        return "" if value is None else str(value)
    return _number(value)


def values_files(data: dict) -> dict[str, str]:
    """Raw-number CSVs of the main figures, from the results themselves (full precision).

    The printed tables' CSVs carry the printed strings ("1.50 MJ"); these carry numbers in
    SI or the unit named in each column, for spreadsheets. File name -> CSV text.

    >>> files = values_files({"steps": [], "steps_range": [], "order": {}, "budget": {
    ...     "bands": ["a"], "stages": [], "total": {}}})
    >>> sorted(files)
    ['values_budget.csv', 'values_order.csv', 'values_steps.csv']
    """
    files: dict[str, str] = {}
    rows = [
        ["step", "cryogen", "to_K", "gas_use", "liquid_low_L", "liquid_nominal_L", "liquid_high_L"]
    ]
    for s, r in zip(data.get("steps", []), data.get("steps_range", [])):
        rows.append(
            [s["step"], s["cryogen"], s["to_K"], s["gas_use"], r["low"], r["nominal"], r["high"]]
        )
    files["values_steps.csv"] = _csv_text([[_cell(c) for c in row] for row in rows])
    keys = [
        "cooldown_L",
        "bath_fill_L",
        "inserts_L",
        "transfer_loss_L",
        "heel_L",
        "needed_L",
        "order_L",
        "cost",
    ]
    rows = [["cryogen", *keys, "currency", "order_low_L", "order_high_L"]]
    for cry, e in data.get("order", {}).items():
        rng = e.get("range", {})
        rows.append(
            [
                cry,
                *[e.get(k) for k in keys],
                e.get("currency", ""),
                rng.get("low", {}).get("order_L"),
                rng.get("high", {}).get("order_L"),
            ]
        )
    files["values_order.csv"] = _csv_text([[_cell(c) for c in row] for row in rows])
    b = data.get("budget", {})
    rows = [["stage", "band", "heat_J", "entropy_J_per_K", "minimum_work_J"]]
    for st in b.get("stages", []):
        for i, band in enumerate(b.get("bands", [])):
            rows.append(
                [st["stage"], band, st["heat_J"][i], st["entropy_J_per_K"][i], st["work_J"][i]]
            )
    files["values_budget.csv"] = _csv_text([[_cell(c) for c in row] for row in rows])
    loads = data.get("loads")
    if loads:
        rows = [["stage", "load", "kind", "from", "power_W"]]
        for it in loads["items"]:
            rows.append([it["stage"], it["name"], it["kind"], it.get("from", ""), it["power_W"]])
        files["values_loads.csv"] = _csv_text([[_cell(c) for c in row] for row in rows])
        bkeys = [
            "load_W",
            "boiloff_L_per_h",
            "boiloff_L_per_day",
            "hold_h",
            "hold_to_refill_h",
            "month_boiloff_L",
            "month_transfer_L",
            "month_order_L",
            "month_cost",
        ]
        rows = [["bath", "cryogen", *bkeys, "currency"]]
        for x in loads.get("baths", []):
            rows.append([x["name"], x["cryogen"], *[x.get(k) for k in bkeys], x["currency"]])
        files["values_baths.csv"] = _csv_text([[_cell(c) for c in row] for row in rows])
    rooms = data.get("rooms")
    if rooms:
        ckeys = [
            "lowest_percent",
            "time_to_alarm_s",
            "time_to_deficient_s",
            "time_to_recover_s",
            "ventilation_needed_m3_per_h",
        ]
        rows = [["room", "case", *ckeys]]
        for room in rooms:
            for c in room["cases"]:
                rows.append([room["name"], c["case"], *[c.get(k) for k in ckeys]])
        files["values_rooms.csv"] = _csv_text([[_cell(c) for c in row] for row in rows])
    return files


def curve_csv(data: dict) -> str:
    """The cooler's cooldown curve, time against each stage's temperature, as CSV text.

    Parameters
    ----------
    data : dict
        ``Results.to_dict()``; the curve is ``data["refrigeration"]["curve"]``:
        ``{"time_h": [...], "stages": {name: [T, ...]}}``.

    Returns
    -------
    str
        A header ``time [h], <stage> [K], ...`` and one row per time point.

    Raises
    ------
    InputError
        When the plan has no cooler curve (no ``[cooler]``, or a cooler that does no
        cooldown).

    Examples
    --------
    >>> data = {"refrigeration": {"curve": {"time_h": [0.0, 1.5],
    ...                                     "stages": {"4K plate": [293.0, 250.0]}}}}
    >>> print(curve_csv(data), end="")
    time [h],4K plate [K]
    0.0,293.0
    1.5,250.0
    """
    curve = (data.get("refrigeration") or {}).get("curve")
    if not curve or not curve.get("time_h"):
        raise InputError(
            "this plan has no cooldown curve to write",
            key="--curve",
            expected="a plan with a [cooler] that does the cooldown",
            found="no cooler curve",
        )
    times = list(curve["time_h"])
    stages = curve.get("stages") or {}
    rows = [["time [h]"] + [f"{name} [K]" for name in stages]]
    columns = [list(v) for v in stages.values()]
    for k, t in enumerate(times):
        rows.append([_number(t)] + [_number(c[k]) if k < len(c) else "" for c in columns])
    return _csv_text(rows)


def table_csv(table: Table) -> str:
    """A table block as CSV text: its header row, then its rows, cells as printed.

    >>> print(table_csv(Table(["Cryogen", "Order [L]"], [["helium", "350"]])), end="")
    Cryogen,Order [L]
    helium,350
    """
    n = len(table.headers)
    rows = [list(table.headers)]
    rows += [
        [("" if c is None else str(c)) for c in list(r)[:n]] + [""] * (n - len(r))
        for r in table.rows
    ]
    return _csv_text(rows)


def chart_csv(chart: Chart) -> str:
    """A chart block as CSV text: wide when its series share the x values, long otherwise.

    >>> c = Chart("t", "time [h]", "T [K]", [("a", [0, 1], [9, 8]), ("b", [0, 1], [7, 6])])
    >>> print(chart_csv(c), end="")
    time [h],a: T [K],b: T [K]
    0.0,9.0,7.0
    1.0,8.0,6.0
    >>> c = Chart("t", "T [K]", "L", [("a", [1], [2]), ("b", [3, 4], [5, 6])])
    >>> print(chart_csv(c), end="")
    series,T [K],L
    a,1.0,2.0
    b,3.0,5.0
    b,4.0,6.0
    """
    series = [(str(label), list(xs), list(ys)) for label, xs, ys in chart.series]
    if series and all(xs == series[0][1] for _, xs, _ in series):
        rows = [[chart.x_label] + [f"{label}: {chart.y_label}" for label, _, _ in series]]
        for k, x in enumerate(series[0][1]):
            rows.append(
                [_number(x)] + [_number(ys[k]) if k < len(ys) else "" for _, _, ys in series]
            )
        return _csv_text(rows)
    rows = [["series", chart.x_label, chart.y_label]]
    for label, xs, ys in series:
        rows += [[label, _number(x), _number(y)] for x, y in zip(xs, ys)]
    return _csv_text(rows)


def _slug(text: str, lower: bool = True) -> str:
    """A file-friendly name: letters, digits, ``-`` and ``_``.

    >>> _slug("Dewars and range"), _slug("  "), _slug("T(t) / 4K"), _slug("heat_J", False)
    ('dewars_and_range', '', 't_t_4k', 'heat_J')
    """
    text = text.lower() if lower else text
    return re.sub(r"[^A-Za-z0-9_-]+", "_", text).strip("_-")[:60]


def csv_files(blocks) -> dict[str, str]:
    """File name -> CSV text for every table and chart block, in reading order.

    A block's ``name`` names its file; a block without one takes its title or the heading
    above it. Names are made unique with a number, ignoring case (as some file systems do).
    """
    files: dict[str, str] = {}
    taken: set[str] = set()
    heading = "table"
    for b in blocks:
        if isinstance(b, Heading):
            heading = b.text
            continue
        if not isinstance(b, (Table, Chart)):
            continue
        base = _slug(b.name, lower=False) or _slug(b.title) or _slug(heading) or "table"
        name, k = base, 2
        while name.lower() in taken:
            name, k = f"{base}_{k}", k + 1
        taken.add(name.lower())
        files[f"{name}.csv"] = table_csv(b) if isinstance(b, Table) else chart_csv(b)
    return files


def write_csv_folder(data: dict, folder: str) -> list[str]:
    """Write one CSV per table and chart of the printed budget into ``folder``.

    The folder is created if it does not exist (its parent must). Every file is written
    into a temporary folder beside it first and moved into place only when all are
    written, so a failure leaves no partial file behind (and no new folder).

    Parameters
    ----------
    data : dict
        ``Results.to_dict()``.
    folder : str
        The output folder.

    Returns
    -------
    list of str
        The paths written, in reading order.

    Raises
    ------
    InputError
        When the folder cannot be made or written (a file of that name, no parent folder,
        no permission).
    """
    from .budget import build_document

    files = csv_files(build_document(data))
    files.update(values_files(data))
    folder = os.path.abspath(folder)
    parent = os.path.dirname(folder)
    if os.path.exists(folder) and not os.path.isdir(folder):
        raise InputError(
            "cannot write the CSV files",
            file=folder,
            expected="a folder",
            found="a file of that name",
        )
    if not os.path.isdir(parent):
        raise InputError(
            "cannot write the CSV files",
            file=folder,
            expected="a folder whose parent folder exists",
            found="no such parent folder",
        )
    existed = os.path.isdir(folder)
    try:
        staging = tempfile.mkdtemp(prefix=".cryoplan-csv-", dir=folder if existed else parent)
    except OSError as exc:
        raise InputError(f"cannot write the CSV files ({exc.strerror})", file=folder) from None
    try:
        for name, text in files.items():
            with open(os.path.join(staging, name), "w", encoding="utf-8", newline="") as fh:
                fh.write(text)
        if existed:
            for name in files:
                os.replace(os.path.join(staging, name), os.path.join(folder, name))
            os.rmdir(staging)
        else:
            os.chmod(staging, 0o777 & ~_umask())
            os.rename(staging, folder)
    except OSError as exc:
        shutil.rmtree(staging, ignore_errors=True)
        raise InputError(f"cannot write the CSV files ({exc.strerror})", file=folder) from None
    return [os.path.join(folder, name) for name in files]


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask
