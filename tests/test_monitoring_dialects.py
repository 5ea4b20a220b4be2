"""Plant data as plants export it: delimiter, decimal comma, day-first timestamps, time zones, and the
steady-state filter's settings and counts.

Every data set here is invented in the test; the expected values follow from how it was made (the numbers written
to the file, the instants the timestamps were printed from). Time-zone offsets from the IANA time-zone database
(Europe/Berlin: UTC+1 in winter, UTC+2 in summer; the 2031 change to summer time is on the last Sunday of March,
30 March 2031, 02:00 -> 03:00 local; EU rule, Directive 2000/84/EC).
"""
import numpy as np
import pandas as pd
import pytest

from revamp.errors import InputError
from revamp.monitoring import CsvDialect, read_plant_data, steady_filter, steady_state

COLS = ["timestamp", "shell_flow", "shell_t_in", "shell_t_out", "tube_flow", "tube_t_in", "tube_t_out"]


def _numbers(n, seed=0):
    rng = np.random.default_rng(seed)
    return {"shell_flow": np.round(10 + rng.normal(0, 0.05, n), 3),
            "shell_t_in": np.round(450 + rng.normal(0, 0.1, n), 2),
            "shell_t_out": np.round(400 + rng.normal(0, 0.1, n), 2),
            "tube_flow": np.round(20 + rng.normal(0, 0.05, n), 3),
            "tube_t_in": np.round(300 + rng.normal(0, 0.1, n), 2),
            "tube_t_out": np.round(330 + rng.normal(0, 0.1, n), 2)}


def _write(path, times, nums, sep=",", decimal=".", fmt="%Y-%m-%d %H:%M"):
    lines = [sep.join(COLS)]
    for i, t in enumerate(times):
        cells = [t.strftime(fmt)] + [f"{nums[c][i]}".replace(".", decimal) for c in COLS[1:]]
        lines.append(sep.join(cells))
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return str(path)


# ------------------------------------------------------------------------------------------------ delimiter, decimal
def test_semicolon_decimal_comma_file_gives_one_hint(tmp_path):
    times = pd.date_range("2031-01-01", periods=24, freq="h")
    path = _write(tmp_path / "p.csv", times, _numbers(24), sep=";", decimal=",")
    with pytest.raises(InputError) as err:
        read_plant_data(path)
    e = err.value
    # one error, on the setting that is wrong, naming the separator and the decimal comma it saw
    assert e.field == "delimiter"
    assert "';'" in str(e) and "decimal" in str(e) and "','" in str(e)
    assert "must be a column" not in str(e)


def test_semicolon_decimal_comma_read_with_settings(tmp_path):
    times = pd.date_range("2031-01-01", periods=24, freq="h")
    nums = _numbers(24)
    path = _write(tmp_path / "p.csv", times, nums, sep=";", decimal=",")
    pdata = read_plant_data(path, dialect=CsvDialect(delimiter=";", decimal=","))
    f = pdata.frame
    assert pdata.counts["valid"] == 24
    for c in COLS[1:]:
        assert f[c].to_numpy() == pytest.approx(nums[c], rel=1e-12)  # the numbers written to the file
    assert list(f["timestamp"]) == list(times)
    # a dict works as well
    same = read_plant_data(path, dialect={"delimiter": ";", "decimal": ","})
    pd.testing.assert_frame_equal(same.frame, f)


def test_decimal_comma_without_the_setting_is_named(tmp_path):
    times = pd.date_range("2031-01-01", periods=24, freq="h")
    path = _write(tmp_path / "p.csv", times, _numbers(24), sep=";", decimal=",")
    with pytest.raises(InputError) as err:
        read_plant_data(path, dialect={"delimiter": ";"})
    assert err.value.field == "decimal" and "','" in str(err.value)


def test_tab_separated_is_recognised(tmp_path):
    times = pd.date_range("2031-01-01", periods=5, freq="h")
    path = _write(tmp_path / "p.tsv", times, _numbers(5), sep="\t")
    with pytest.raises(InputError) as err:
        read_plant_data(path)
    assert err.value.field == "delimiter" and "tab" in str(err.value)
    assert read_plant_data(path, dialect={"delimiter": "\t"}).counts["valid"] == 5


def test_bad_dialect_settings_are_refused():
    with pytest.raises(InputError, match="delimiter"):
        CsvDialect(delimiter=";;")
    with pytest.raises(InputError, match="decimal"):
        CsvDialect(decimal=";")
    with pytest.raises(InputError, match="decimal"):
        CsvDialect(delimiter=",", decimal=",")  # the same character cannot be both
    with pytest.raises(InputError, match="timezone"):
        CsvDialect(timezone="Mars/Olympus")
    with pytest.raises(InputError, match="dayfirst"):
        CsvDialect(dayfirst="yes")
    with pytest.raises(InputError, match="dialect.sep"):
        read_plant_data(pd.DataFrame(), dialect={"sep": ";"})


# ------------------------------------------------------------------------------------------------------- day first
def test_day_first_timestamps_are_read_as_written(tmp_path):
    # 20 days of hourly rows printed day-first: days 13-20 only parse day-first, so that reading is the only one
    # that reads every row
    times = pd.date_range("2031-01-01", periods=480, freq="h")
    path = _write(tmp_path / "p.csv", times, _numbers(480), fmt="%d/%m/%Y %H:%M")
    pdata = read_plant_data(path)
    assert list(pdata.frame["timestamp"]) == list(times)
    assert pdata.counts["valid"] == 480 and "bad timestamp" not in pdata.counts
    assert pdata.dialect.dayfirst is True and pdata.dialect.dayfirst_from == "only reading"


def test_ambiguous_day_first_is_picked_by_time_order_and_said(tmp_path):
    # 10 days (1-10 March) printed day-first: every row also parses month-first (as 3 January .. 3 October), so the
    # reading is chosen by the time order: day-first gives steady hourly steps, month-first jumps by months
    times = pd.date_range("2031-03-01", periods=240, freq="h")
    path = _write(tmp_path / "p.csv", times, _numbers(240), fmt="%d/%m/%Y %H:%M")
    pdata = read_plant_data(path)
    assert list(pdata.frame["timestamp"]) == list(times)
    d = pdata.dialect
    assert d.dayfirst is True and d.dayfirst_from == "time order"
    assert any("dayfirst" in h for h in d.hints)  # says what it picked and how to fix it
    # the setting, when given, is obeyed: month-first reads 01/03 as 3 January
    forced = read_plant_data(path, dialect={"dayfirst": False})
    assert forced.frame["timestamp"].iloc[0] == pd.Timestamp("2031-01-03")
    assert forced.dialect.dayfirst_from == "given"


def test_ambiguity_that_time_order_cannot_settle_requires_the_setting(tmp_path):
    # two rows: 01/02 -> 03/04 is a forward step read either way (1 Feb -> 3 Apr, or 2 Jan -> 4 Mar)
    times = [pd.Timestamp("2031-02-01"), pd.Timestamp("2031-04-03")]
    nums = _numbers(2)
    path = _write(tmp_path / "p.csv", times, nums, fmt="%d/%m/%Y %H:%M")
    with pytest.raises(InputError) as err:
        read_plant_data(path)
    assert err.value.field == "dayfirst"
    assert read_plant_data(path, dialect={"dayfirst": True}).frame["timestamp"].iloc[1] == times[1]


def test_iso_timestamps_are_not_ambiguous(tmp_path):
    times = pd.date_range("2031-03-01", periods=48, freq="h")
    path = _write(tmp_path / "p.csv", times, _numbers(48))
    pdata = read_plant_data(path)
    assert list(pdata.frame["timestamp"]) == list(times)
    assert pdata.dialect.dayfirst_from == "not ambiguous" and not pdata.dialect.hints


def test_explicit_timestamp_format(tmp_path):
    times = pd.date_range("2031-03-01", periods=24, freq="h")
    path = _write(tmp_path / "p.csv", times, _numbers(24), fmt="%d.%m.%Y %H:%M")
    pdata = read_plant_data(path, dialect={"timestamp_format": "%d.%m.%Y %H:%M"})
    assert list(pdata.frame["timestamp"]) == list(times)


# ------------------------------------------------------------------------------------------------------- time zone
def test_local_time_zone_is_converted_to_utc_and_the_gap_flagged(tmp_path):
    local = [pd.Timestamp("2031-01-15 12:00"), pd.Timestamp("2031-03-30 01:30"), pd.Timestamp("2031-03-30 02:30"),
             pd.Timestamp("2031-03-30 03:30"), pd.Timestamp("2031-07-01 12:00")]
    path = _write(tmp_path / "p.csv", local, _numbers(5))
    pdata = read_plant_data(path, dialect={"timezone": "Europe/Berlin"})
    ts = pdata.frame["timestamp"]
    assert ts.iloc[0] == pd.Timestamp("2031-01-15 11:00")  # CET = UTC+1
    assert ts.iloc[1] == pd.Timestamp("2031-03-30 00:30")  # still CET
    assert ts.iloc[3] == pd.Timestamp("2031-03-30 01:30")  # CEST = UTC+2
    assert ts.iloc[4] == pd.Timestamp("2031-07-01 10:00")
    # 02:30 on 30 March 2031 does not exist in Berlin (clocks jump 02:00 -> 03:00): flagged, not guessed
    assert "timestamp not a time in Europe/Berlin" in pdata.frame.loc[2, "flag"]
    assert pdata.counts["valid"] == 4


def test_timestamps_with_offsets_are_put_in_utc(tmp_path):
    path = tmp_path / "p.csv"
    nums = _numbers(2)
    rows = ["2031-07-01T12:00:00+02:00", "2031-07-01T13:00:00+02:00"]
    lines = [",".join(COLS)] + [",".join([r] + [str(nums[c][i]) for c in COLS[1:]]) for i, r in enumerate(rows)]
    path.write_text("\n".join(lines) + "\n")
    f = read_plant_data(str(path)).frame
    assert list(f["timestamp"]) == [pd.Timestamp("2031-07-01 10:00"), pd.Timestamp("2031-07-01 11:00")]


# ------------------------------------------------------------------------------------------------- steady settings
def _cooling_water_day(n=24 * 6, amplitude=2.0):
    """Hourly rows: steady flows and shell inlet; the cooling-water inlet swings ±amplitude K over each day."""
    t = np.arange(n) * 3600.0
    ts = pd.date_range("2031-06-01", periods=n, freq="h")
    tw = 300.0 + amplitude * np.sin(2 * np.pi * t / 86400.0)
    return pd.DataFrame({"timestamp": ts, "shell_flow": 10.0 + 0.01 * np.sin(t / 5000.0), "shell_t_in": 450.0,
                         "shell_t_out": 400.0, "tube_flow": 20.0 + 0.01 * np.cos(t / 7000.0), "tube_t_in": tw,
                         "tube_t_out": tw + 28.0}), tw


def test_steady_filter_counts_rows_removed_by_each_setting():
    df, tw = _cooling_water_day()
    res = steady_filter(df, window="4 h", flow_rsd=0.02, t_range=2.0, min_rows=3)
    # independent count of the rule, row by row: the trailing window (t − 4 h, t] holds this row and the 3 before;
    # with hourly rows the first 2 rows hold fewer than 3 readings; the others fail when the cooling-water inlet
    # moves by more than 2 K within the window (the shell inlet is constant and the flows move by 0.1 %)
    few = np.arange(len(df)) < 2
    rng = np.array([np.ptp(tw[max(0, i - 3):i + 1]) for i in range(len(df))])
    too_wide = rng > 2.0
    assert res.removed_min_rows == int(few.sum())
    assert res.removed_t_range == {"shell_t_in": 0, "tube_t_in": int(too_wide.sum())}
    assert res.removed_flow_rsd == {"shell_flow": 0, "tube_flow": 0}
    assert res.steady == int((~few & ~too_wide).sum()) == int(res.mask.sum())
    assert res.checked == len(df)
    assert res.removed == len(df) - res.steady
    assert np.array_equal(res.mask, steady_state(df))  # the mask-only call gives the same rows
    # wider inlet range: the daily swing no longer removes rows
    wide = steady_filter(df, t_range=5.0)
    assert wide.removed_t_range["tube_t_in"] == 0 and wide.steady == len(df) - 2


def test_steady_filter_settings_are_checked():
    df, _ = _cooling_water_day(24)
    with pytest.raises(InputError, match="min_rows"):
        steady_filter(df, min_rows=0)
    with pytest.raises(InputError, match="t_range"):
        steady_filter(df, t_range=-1)


# ------------------------------------------------------------------------------------------------ through monitor()
def test_monitor_takes_the_dialect_and_the_steady_settings(tmp_path):
    import revamp as rv
    from test_monitoring import HX, SERVICE, _plant

    df = _plant(3e-4, n=72)
    # the cooling-water inlet swings ±4 K over the day (up to 3.1 K within a 4 h window); the outlet follows it
    # (data made here; Rf is not checked, the steady filter is)
    swing = 4.0 * np.sin(2 * np.pi * np.arange(72) / 24.0)
    df["tube_t_in"] += swing
    df["tube_t_out"] += swing
    path = tmp_path / "plant.csv"
    out = df.copy()
    out["timestamp"] = out["timestamp"].dt.strftime("%d/%m/%Y %H:%M")  # 1-3 March 2031, day-first
    out.to_csv(path, sep=";", decimal=",", index=False)
    with pytest.raises(InputError, match="delimiter"):
        rv.monitor(HX, SERVICE, str(path), mc_draws=0)
    m = rv.monitor(HX, SERVICE, str(path), mc_draws=0, dialect={"delimiter": ";", "decimal": ","})
    assert list(m.table["timestamp"]) == list(df["timestamp"])
    assert m.dialect.dayfirst is True and m.dialect.dayfirst_from == "time order"
    assert "dayfirst" in m.summary["plant data file"]
    sf = m.steady_filter
    assert sf.removed_t_range["tube_t_in"] > 0 and sf.t_range == 2.0
    assert m.summary[f"steady filter: removed, tube_t_in range > 2 K"] == sf.removed_t_range["tube_t_in"]
    assert m.counts["not steady"] == sf.removed
    relaxed = rv.monitor(HX, SERVICE, str(path), mc_draws=0, dialect={"delimiter": ";", "decimal": ","},
                         steady={"t_range": "5 delta_degC", "window": "3 h"})
    assert relaxed.steady_filter.removed_t_range["tube_t_in"] == 0
    assert relaxed.steady_filter.window == 3 * 3600.0 and relaxed.steady_filter.t_range == 5.0
    assert relaxed.counts["used"] > m.counts["used"]
    with pytest.raises(InputError, match="steady.t_rang"):
        rv.monitor(HX, SERVICE, df, mc_draws=0, steady={"t_rang": 5})
    assert rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False).steady_filter is None


def test_run_start_in_the_local_time_zone():
    import revamp as rv
    from test_monitoring import HX, SERVICE, _plant

    df = _plant(3e-4, n=30)  # starts 2031-03-01 00:00 local (CET, UTC+1)
    df["timestamp"] = df["timestamp"].dt.strftime("%Y-%m-%d %H:%M")
    m = rv.monitor(HX, SERVICE, df, mc_draws=0, steady=False, dialect={"timezone": "Europe/Berlin"},
                   run_start="2031-03-01 00:00")
    assert m.table["timestamp"].iloc[0] == pd.Timestamp("2031-02-28 23:00")
    assert m.run_start == pd.Timestamp("2031-02-28 23:00")
    assert m.table["run_time"].iloc[0] == 0.0


def test_dataframe_times_take_the_time_zone_too():
    df = pd.DataFrame({"timestamp": pd.to_datetime(["2031-07-01 12:00", "2031-07-01 13:00"]), **{
        c: v[:2] for c, v in _numbers(2).items()}})
    f = read_plant_data(df, dialect={"timezone": "Europe/Berlin"}).frame
    assert list(f["timestamp"]) == [pd.Timestamp("2031-07-01 10:00"), pd.Timestamp("2031-07-01 11:00")]  # CEST


def test_a_bare_temperature_column_in_celsius_is_refused():
    # a column mapped without its unit is read as kelvin; cooling-water readings of 25-40 (°C) would be −248 °C
    df = pd.DataFrame({"timestamp": pd.date_range("2031-01-01", periods=4, freq="h").astype(str),
                       "shell_flow": 10.0, "shell_t_in": 450.0, "shell_t_out": 400.0, "tube_flow": 20.0,
                       "TW_IN": [25.0, 25.5, 26.0, 25.2], "tube_t_out": 330.0})
    cols = {"tube_t_in": "TW_IN"}
    with pytest.raises(InputError) as err:
        read_plant_data(df, columns=cols, flat_rows=10)
    assert err.value.field == "columns.tube_t_in" and "degC" in str(err.value)
    f = read_plant_data(df, columns={"tube_t_in": ("TW_IN", "degC")}, flat_rows=10).frame
    assert f["tube_t_in"].iloc[0] == pytest.approx(298.15)  # 25 °C (SI definition of the kelvin scale)
    # said to be kelvin: read as written (and then flagged by the second-law checks, not refused)
    assert read_plant_data(df, columns={"tube_t_in": ("TW_IN", "K")}, flat_rows=10).frame["tube_t_in"].iloc[0] == 25.0


def test_thousands_separators_are_not_taken_for_decimal_commas_silently(tmp_path):
    path = tmp_path / "p.csv"
    rows = [",".join(COLS)] + [f'2031-01-01 0{i}:00,"12,345",450,400,20,300,330' for i in range(3)]
    path.write_text("\n".join(rows) + "\n")
    with pytest.raises(InputError) as err:
        read_plant_data(str(path))
    assert err.value.field == "decimal" and "thousands" in str(err.value)
