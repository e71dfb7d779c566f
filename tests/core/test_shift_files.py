"""Malformed time-series files: each refused with a message that says what and where (the
line number), as a person would need to fix the file. Real instrument habits are accepted:
metadata above the header, units in the header, decimal commas, blank lines, missing cells."""

from __future__ import annotations

import pytest

from driftdose.shift.clock import TimeParser
from driftdose.shift.series import ColumnSpec, SeriesError, read_series
from driftdose.tables import TableError, pick_column, read_table

GOOD = "time,number [1/cm3]\n" + "".join(
    f"2026-03-05 08:{k // 6:02d}:{k % 6 * 10:02d},{1000 + 100 * k}\n" for k in range(30)
)
"""An invented 5-min log at 10 s; line 4 holds 08:00:20 and 1200."""


def read(text, form="iso", time_col="1", value_col="2", header_line=0):
    table = read_table(text, header_line)
    t = pick_column(table, time_col, "time").index
    v = pick_column(table, value_col, "value").index
    return read_series(table, TimeParser(form), t, [ColumnSpec(v, "n", 1e6)])


def test_good_file_reads():
    s = read(GOOD)
    assert s.t[:4] == (0.0, 10.0, 20.0, 30.0) and s.values["n"][0] == 1e9 and s.interval == 10.0


def test_instrument_habits_are_read():
    text = (
        "Instrument;invented logger\n"
        "Serial;1234\n"
        "\n"
        "Date;Time;Number (#/cm³);LDSA [µm²/cm³]\n"
        "05.03.2026;08:00:00;1000,5;30,1\n"
        "05.03.2026;08:00:01;;30,2\n"
        "05.03.2026;08:00:02;NaN;30,3\n"
        "05.03.2026;08:00:03;1002,5;30,4\n"
    )
    table = read_table(text)
    assert [c.unit.label for c in table.columns] == ["Date", "Time", "Number", "LDSA"]
    assert [c.unit.code for c in table.columns] == [None, None, "1/cm3", "um2/cm3"]
    assert table.header_line == 4 and table.delimiter == "semicolon" and table.decimal == "comma"
    s = read_series(table, TimeParser("day_first"), 1, [ColumnSpec(2, "n")], date_index=0)
    assert s.values["n"] == (1000.5, None, None, 1002.5)
    assert s.lines == (5, 6, 7, 8)


BAD = [
    # (file text, form, words expected in the message, line named or None)
    (GOOD.replace("08:00:20", "08:00:10"), "iso", "repeats the time", 4),
    (GOOD.replace("08:00:30,", "08:00:05,"), "iso", "goes back in time", 5),
    (GOOD.replace("08:00:20", "08:00:2x"), "iso", "unexpected ':2x' after the time", 4),
    (GOOD.replace("1200", "12O0"), "iso", "is not a number", 4),
    (GOOD.replace("1200", "1_200"), "iso", "is not a number", 4),
    (GOOD.replace("1200", "inf"), "iso", "not a finite number", 4),
    (GOOD.replace("2026-03-05 08:00:20", "2026-02-30 08:00:20"), "iso", "does not exist", 4),
    (GOOD.replace("2026-03-05 08:00:20", "2026-03-05"), "iso", "time of day must follow", 4),
    (GOOD.replace("2026-03-05 08:00:20", "05/03/2026 08:00:20"), "iso", "not an ISO 8601", 4),
    (GOOD.replace("2026-03-05 08:00:20", "2026-03-05 25:00:20"), "iso", "not a time of day", 4),
    (GOOD.replace("08:00:20", "08:00:20+01:00"), "iso", "where earlier rows had none", 4),
    (GOOD.replace(":00,", ":00+01:00,", 1), "iso", "offset is missing", 3),
    (GOOD, "day_first", "date is not DD/MM/YYYY", 2),
    (GOOD.replace("2026-03-05", "05/03/26"), "day_first", "four digits", 2),
    (GOOD, "elapsed_seconds", "not a number of seconds", 2),
    (
        "time,number\n" + "".join(f"{k},-{k}\n" for k in range(3)) + "-1,5\n",
        "elapsed_seconds",
        "from 0",
        5,
    ),
    ("time,number\n0,1\n", "elapsed_seconds", "At least two readings", None),
]


@pytest.mark.parametrize(("text", "form", "words", "line"), BAD)
def test_malformed_series_say_what_and_where(text, form, words, line):
    with pytest.raises((SeriesError, TableError)) as info:
        read(text, form)
    message = info.value.message
    assert any(w in message for w in words.split("|")), message
    if line is not None:
        assert f"Line {line}:" in message, message
        assert info.value.line == line


TABLE_BAD = [
    ("", "empty"),
    ("\n\n  \n", "empty|no text"),
    ("just one column\n1\n2\n3\n", "No column separator"),
    # one row with a stray separator: the reader takes blanks as the separator, the message
    # says so
    (GOOD + "2026-03-05 08:05:00,1400,extra\n", "separated by blanks"),
    (GOOD.replace("2026-03-05 08:00:20,1200", "2026-03-05 08:00:20;1200"), "separated by blanks"),
    ("a,b\nx,y\nz,w\nu,v\n", "no data rows"),
]


@pytest.mark.parametrize(("text", "words"), TABLE_BAD)
def test_unreadable_tables_say_why(text, words):
    with pytest.raises((TableError, SeriesError)) as info:
        read(text)
    assert any(w in info.value.message for w in words.split("|")), info.value.message


def test_24_hours_at_one_second_fit():
    rows = "".join(f"{k},{k % 97}\n" for k in range(86_400))
    s = read("t,n\n" + rows, "elapsed_seconds")
    assert len(s.t) == 86_400 and s.interval == 1.0 and not s.gaps
