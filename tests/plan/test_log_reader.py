"""Reading a cryostat's log (cryoplan/plan/log_reader.py): values, faults, time zones, errors.

Expected values are worked by hand from the rows written in each test; the daylight-saving
times are made from the EU rule itself (Directive 2000/84/EC: summer time from 01:00 UTC on
the last Sunday of March to 01:00 UTC on the last Sunday of October), not from zoneinfo,
which the reader uses.
"""

from __future__ import annotations

from datetime import datetime, timedelta, timezone
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cryoplan.errors import InputError
from cryoplan.plan import log_reader as lr
from cryoplan.plan.log_reader import read_log

MAPPING = {"helium level [%]": {"sensor_length": "50 cm", "litres_per_cm": 2.0}}


def _write(tmp_path: Path, text: str, name: str = "log.csv") -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


def _minutes(start: str, n: int, step: int = 10) -> list[str]:
    t0 = datetime.fromisoformat(start)
    return [(t0 + timedelta(minutes=step * i)).strftime("%Y-%m-%dT%H:%MZ") for i in range(n)]


def test_values_in_si_and_percent_to_litres_through_the_sensor(tmp_path):
    times = _minutes("2027-01-11T00:00", 3)
    text = "# invented\ntime,helium level [%],cold plate temperature [mK],helium fill [L]\n"
    text += f"{times[0]},49.9,4200,\n{times[1]},49.8,4210,\n{times[2]},90.0,4200,60\n"
    log = read_log(_write(tmp_path, text), MAPPING)
    lvl = log.series["helium level [%]"]
    assert lvl.quantity == "fraction" and lvl.target == "helium" and lvl.what == "level"
    # 49.9 % of a 50 cm sensor is 24.95 cm; at 2 L/cm, 49.9 L
    assert np.allclose(lvl.volume, [49.9e-3, 49.8e-3, 90.0e-3], rtol=1e-12)
    temp = log.series["cold plate temperature [mK]"]
    assert np.allclose(temp.values, [4.2, 4.21, 4.2])  # mK -> K, exact factor 1e-3
    fill = log.series["helium fill [L]"]
    assert fill.valid.tolist() == [False, False, True]  # blank: nothing delivered, not a fault
    assert fill.volume[2] == pytest.approx(0.06)
    assert log.counts == {} and log.time.tolist() == [0.0, 600.0, 1200.0]
    assert log.start == datetime(2027, 1, 11, tzinfo=timezone.utc)
    assert log.lines.tolist() == [3, 4, 5]


def test_faulty_rows_are_reported_with_their_line_numbers(tmp_path):
    rows = [
        "# invented data: Harwick Low Temperature Facility",  # 1
        "time,helium level [%],cold plate temperature [K],helium fill [L]",  # 2
        "2027-01-11T00:00Z,50.0,4.20,",  # 3
        "2027-01-11T00:10Z,49.9,4.20,",  # 4
        "2027-01-11T00:20Z,,4.21,",  # 5 blank level
        "2027-01-11T00:30Z,49.7,abc,",  # 6 unparseable temperature
        "2027-01-11T00:40Z,nan,4.20,",  # 7 NaN
        "2027-01-11T00:40Z,49.5,4.20,",  # 8 duplicate time
        "2027-01-11T01:00Z,0,4.20,",  # 9 disconnected meter
        "2027-01-11T01:10Z,0,4.20,",  # 10 disconnected meter
        "2027-01-11T00:50Z,49.4,4.20,",  # 11 out of order
        "2027-01-11T01:20Z,49.1,4.20,",  # 12
        "not a time,49.0,4.2,",  # 13 unparseable time
        "2027-01-11T01:30Z,49.0",  # 14 short row: padded; temperature blank
        "2027-01-11T01:40Z,48.9,4.2,,5",  # 15 too many cells
        "",  # 16 blank line: skipped
        "2027-01-11T06:00Z,48.5,4.2,",  # 17 after a gap of 4 h 30 min
    ]
    rows += [
        f"{t},{48.4 - 0.1 * i:.1f},4.2," for i, t in enumerate(_minutes("2027-01-11T06:10", 8))
    ]
    log = read_log(_write(tmp_path, "\n".join(rows) + "\n"), MAPPING)
    expected = {
        lr.R_BLANK: [5, 14],
        lr.R_BAD: [6],
        lr.R_NAN: [7],
        lr.R_DUPLICATE: [8],
        lr.R_DISCONNECTED: [9, 10],
        lr.R_ORDER: [11],
        lr.R_BAD_TIME: [13],
        lr.R_CELLS: [15],
        lr.R_GAP: [17],
    }
    named = {r: [p.line for p in log.problems if p.reason == r] for r in expected}
    assert named == expected
    assert log.counts == {r: len(v) for r, v in expected.items()}
    # rows: 22 data lines (3-15, 17, 18-25); dropped whole: 13 (time), 15 (cells), 8 (duplicate)
    assert log.rows_read == 22 and log.rows_kept == 19
    lvl = log.series["helium level [%]"]
    assert not lvl.valid[log.lines.tolist().index(9)]  # the disconnected reading is out
    assert lvl.valid.sum() == 19 - 4  # lines 5, 7, 9, 10
    assert np.all(np.diff(log.time) > 0)  # sorted, line 11 in its place
    assert log.lines.tolist()[:6] == [3, 4, 5, 6, 7, 11]
    sentences = log.describe_problems()
    assert any("duplicate time (line 8)" in s for s in sentences)


def _eu_local(utc: datetime) -> datetime:
    """Berlin's local time by the EU rule: +1 h, +2 h in summer time (Directive 2000/84/EC)."""

    def last_sunday(year: int, month: int) -> datetime:
        d = datetime(year, month, 31, 1, 0)
        return d - timedelta(days=(d.weekday() + 1) % 7)

    summer = last_sunday(utc.year, 3) <= utc < last_sunday(utc.year, 10)
    return utc + timedelta(hours=2 if summer else 1)


@pytest.mark.parametrize(
    ("first_utc", "reason", "clock_before", "clock_after"),
    [
        ("2027-03-28T00:00", lr.R_SKIPPED, "01:50", "03:00"),  # 28 March 2027, a Sunday
        ("2027-10-30T23:30", lr.R_REPEATED, "02:50", "02:00"),  # 31 October 2027
    ],
)
def test_daylight_saving_jump_in_berlin_local_times(
    tmp_path, first_utc, reason, clock_before, clock_after
):
    t0 = datetime.fromisoformat(first_utc)
    utc = [t0 + timedelta(minutes=10 * i) for i in range(30)]
    local = [_eu_local(t).strftime("%Y-%m-%dT%H:%M") for t in utc]
    text = "time,helium level [L]\n" + "".join(
        f"{s},{80 - i * 0.1:.1f}\n" for i, s in enumerate(local)
    )
    log = read_log(_write(tmp_path, text), timezone_name="Europe/Berlin")
    assert np.allclose(np.diff(log.time), 600.0)  # every step 10 min in real time
    assert log.rows_kept == 30 and log.counts == {reason: 1}
    (problem,) = log.problems
    where = next(
        i
        for i in range(1, 30)
        if local[i].endswith(clock_after) and local[i - 1].endswith(clock_before)
    )
    assert problem.line == where + 2  # header on line 1
    assert log.start == t0.replace(tzinfo=timezone.utc)
    # without the zone the second pass of the repeated hour collides with the first: its
    # six readings are reported as duplicates (five of them out of order too), not lost
    if reason == lr.R_REPEATED:
        naive = read_log(_write(tmp_path, text))
        assert naive.counts == {lr.R_ORDER: 5, lr.R_DUPLICATE: 6} and naive.rows_kept == 24


def test_a_time_inside_the_skipped_hour_is_dropped(tmp_path):
    text = "time,helium level [L]\n2027-03-28T01:50,80\n2027-03-28T02:30,79.9\n2027-03-28T03:00,79.8\n"
    log = read_log(_write(tmp_path, text), timezone_name="Europe/Berlin")
    assert log.counts[lr.R_NONEXISTENT] == 1 and log.lines.tolist() == [2, 4]
    assert log.time.tolist() == [0.0, 600.0]  # 01:50 CET is 00:50 UTC, 03:00 CEST 01:00 UTC


def test_tsv_offsets_and_relative_hours(tmp_path):
    text = "time\thelium level [L]\n2027-01-11T08:00+01:00\t80\n2027-01-11T07:10Z\t79\n"
    log = read_log(_write(tmp_path, text, "log.tsv"))
    assert log.delimiter == "\t" and log.time.tolist() == [0.0, 600.0]  # 07:00Z then 07:10Z
    text = "time [h];nitrogen level [cm]\n0;30\n0.5;29.5\n1;29\n"
    m = {"time [h]": {"what": "time", "start": "2027-01-11T08:00+01:00"}}
    log = read_log(
        _write(tmp_path, text), {**m, "nitrogen level [cm]": {"litres_per_cm": "1.5 L/cm"}}
    )
    assert log.delimiter == ";" and log.time.tolist() == [0.0, 1800.0, 3600.0]
    assert log.start == datetime(2027, 1, 11, 7, tzinfo=timezone.utc)
    assert np.allclose(log.series["nitrogen level [cm]"].volume, [45e-3, 44.25e-3, 43.5e-3])


def test_explicit_mapping_and_a_calibration_table(tmp_path):
    text = "time,LHe,shield T,misc\n2027-01-11T00:00Z,20,77.1,a\n2027-01-11T00:10Z,40,77.2,b\n"
    mapping = {
        "LHe": {"what": "level", "cryogen": "helium", "unit": "%", "sensor_length": "50 cm",
                "calibration": [[0, 0], [10, 15], [50, 95]]},
        "shield T": {"what": "temperature", "stage": "nitrogen shield", "unit": "K"},
    }  # fmt: skip
    log = read_log(_write(tmp_path, text), mapping)
    # 20 % of 50 cm = 10 cm -> 15 L; 40 % = 20 cm -> 15 + 10 * 80/40 = 35 L
    assert np.allclose(log.series["LHe"].volume, [15e-3, 35e-3])
    assert log.find("temperature", "nitrogen shield")[0].column == "shield T"
    assert log.ignored == ["misc"]


@pytest.mark.parametrize(
    ("text", "mapping", "match"),
    [
        ("stamp,helium level [L]\n1,2\n", None, "no time column"),
        ("time,helium level [kg]\n2027-01-11T00:00Z,2\n", None, "does not fit a level"),
        ("time,neck temperature [L]\n2027-01-11T00:00Z,2\n", None, "does not fit a temperature"),
        ("time,helium level\n2027-01-11T00:00Z,2\n", None, "unit is missing"),
        ("time,helium level [L]\n", {"helium levle [L]": {}}, "did you mean 'helium level"),
        ("time,helium level [%]\n", {"helium level [%]": {"litres_per_cn": 2}}, "litres_per_cm"),
        ("time,helium level [L]\n,\n", None, "no reading with a valid time"),
        ("", None, "no header"),
    ],
)
def test_mistakes_are_located_input_errors(tmp_path, text, mapping, match):
    p = _write(tmp_path, text)
    with pytest.raises(InputError, match=match) as err:
        read_log(p, mapping)
    assert str(p) in str(err.value)


def test_file_bounds_and_missing_file(tmp_path):
    with pytest.raises(InputError, match="not found"):
        read_log(tmp_path / "nope.csv")
    p = _write(tmp_path, "time,helium level [L]\n" + "2027-01-11T00:00Z," + "1" * 20 + "\n")
    with pytest.raises(InputError, match="line too long") as err:
        read_log(p, max_line=30)
    assert err.value.line == 2
    with pytest.raises(InputError, match="too large"):
        read_log(p, max_bytes=10)
    with pytest.raises(InputError, match="unknown time zone"):
        read_log(p, timezone_name="Europe/Berlni")


# --- property tests ---------------------------------------------------------------------

_CELL = st.one_of(
    st.floats(min_value=-1e6, max_value=1e6, allow_nan=False).map(lambda x: f"{x:.6g}"),
    st.sampled_from(["", "nan", "0", "100", "x", "1,5", "inf", " 7 "]),
)
_TIME = st.one_of(
    st.integers(0, 50).map(lambda m: f"2027-01-11T{m // 60:02d}:{m % 60:02d}:00Z"),
    st.integers(0, 50).map(lambda m: f"2027-01-11T{(m // 60) + 1:02d}:{m % 60:02d}+01:00"),
    st.sampled_from(["", "yesterday", "2027-13-01T00:00Z", "12:00"]),
)


@settings(
    max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(rows=st.lists(st.tuples(_TIME, _CELL), min_size=0, max_size=40))
def test_no_valid_row_lost_or_reordered(tmp_path, rows):
    text = "time,helium level [L]\n" + "".join(f"{t},{c}\n" for t, c in rows)
    p = _write(tmp_path, text)
    good = {}  # the first row of each valid time, as (utc, line)
    for i, (t, cell) in enumerate(rows):
        if "," in cell:  # "1,5" is two cells: a row with too many, not a valid one
            continue
        try:
            utc = datetime.fromisoformat(t)
        except ValueError:
            continue
        good.setdefault(utc, i + 2)
    try:
        log = read_log(p)
    except InputError:
        assert not good  # only a log with no valid time at all is refused
        return
    expected = [good[k] for k in sorted(good)]
    assert log.lines.tolist() == expected
    lvl = log.series["helium level [L]"]
    for line, value, ok in zip(log.lines, lvl.values, lvl.valid):
        cell = rows[line - 2][1]
        try:
            written = float(cell)
        except ValueError:
            assert not ok
            continue
        if ok:
            assert value == pytest.approx(written * 1e-3)
        else:  # a written number is dropped only as NaN/inf or a disconnected meter's 0
            assert not np.isfinite(written) or written == 0.0


@settings(
    max_examples=80, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)
@given(text=st.text(alphabet='time,;\t"#\n\r x0123456789-:TZ.+[]%Lhelium level', max_size=300))
def test_any_text_gives_a_log_or_an_input_error(tmp_path, text):
    p = _write(tmp_path, text)
    try:
        log = read_log(p, timezone_name="Europe/Berlin")
    except InputError:
        return
    assert np.all(np.diff(log.time) > 0) and log.rows_kept == log.time.size
