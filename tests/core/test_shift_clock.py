"""Time stamps of logged files against the standard library's datetime (an independent
implementation of the proleptic Gregorian calendar)."""

from __future__ import annotations

import datetime as dt

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose.shift.clock import (
    ClockError,
    TimeParser,
    clock_text,
    days_from_civil,
    parse_clock_time,
    parse_iso,
)

EPOCH = dt.datetime(1970, 1, 1)


def _seconds(d: dt.datetime) -> float:
    return (d - EPOCH).total_seconds()


moments = st.datetimes(min_value=dt.datetime(1900, 1, 1), max_value=dt.datetime(2200, 12, 31))


@given(st.dates(min_value=dt.date(1, 1, 1), max_value=dt.date(9999, 12, 31)))
def test_days_from_civil_matches_datetime(d):
    assert days_from_civil(d.year, d.month, d.day) == (d - dt.date(1970, 1, 1)).days


@settings(max_examples=300)
@given(moments.map(lambda d: d.replace(microsecond=d.microsecond // 1000 * 1000)))
def test_every_form_reads_what_datetime_writes(d):
    expected = _seconds(d)
    ms = f".{d.microsecond // 1000:03d}"
    assert parse_iso(d.strftime("%Y-%m-%dT%H:%M:%S") + ms)[0] == pytest.approx(expected, abs=1e-6)
    assert TimeParser("iso")(d.strftime("%Y-%m-%d %H:%M:%S") + ms) == pytest.approx(
        expected, abs=1e-6
    )
    assert TimeParser("day_first")(d.strftime("%d/%m/%Y %H:%M:%S") + ms) == pytest.approx(
        expected, abs=1e-6
    )
    assert TimeParser("day_first")(d.strftime("%d.%m.%Y %H:%M:%S") + ms) == pytest.approx(
        expected, abs=1e-6
    )
    assert TimeParser("month_first")(d.strftime("%m/%d/%Y %I:%M:%S") + ms + d.strftime(" %p")) == (
        pytest.approx(expected, abs=1e-6)
    )
    # date and time in two columns
    assert TimeParser("day_first")(d.strftime("%H:%M:%S"), d.strftime("%d/%m/%Y")) == (
        pytest.approx(expected - d.microsecond / 1e6, abs=1e-6)
    )


@settings(max_examples=200)
@given(moments)
def test_clock_text_round_trips(d):
    d = d.replace(microsecond=0)
    assert clock_text(_seconds(d)) == d.isoformat()


def test_offsets_move_to_the_first_offset():
    # a summer-time change inside a file: 02:59:59+02:00 is followed by 02:00:00+01:00
    p = TimeParser("iso")
    a = p("2026-10-25T02:59:59+02:00")
    b = p("2026-10-25T02:00:00+01:00")
    assert b - a == 1.0
    with pytest.raises(ClockError, match="offset is missing"):
        p("2026-10-25T02:00:01")


def test_elapsed_seconds_from_a_start():
    start = parse_iso("2026-03-05T23:59:30")[0]
    p = TimeParser("elapsed_seconds", start)
    assert clock_text(p("45,5")) == "2026-03-06T00:00:15.5"


@pytest.mark.parametrize(
    ("form", "text", "words"),
    [
        ("iso", "2026-02-29T08:00:00", "does not exist"),
        ("iso", "2026-13-01T08:00:00", "month 13"),
        ("iso", "2026-03-05", "time of day must follow"),
        ("iso", "2026-03-05T24:00:00", "not a time of day"),
        ("iso", "2026-03-05T08:00:00 CET", "unexpected"),
        ("iso", "05/03/2026 08:00", "not an ISO 8601"),
        ("day_first", "05/03/26 08:00", "four digits"),
        ("day_first", "31/04/2026 08:00", "does not exist"),
        ("day_first", "05/03/2026 8h00", "time of day"),
        ("day_first", "05/03/2026 08:00 PM", "AM/PM is read only"),
        ("month_first", "13/05/2026 08:00", "month 13"),
        ("month_first", "03/05/2026 13:00 PM", "1-12"),
        ("elapsed_seconds", "-1", "from 0"),
        ("elapsed_seconds", "nan", "from 0"),
        ("elapsed_seconds", "1e9", "from 0"),
    ],
)
def test_bad_time_stamps_say_why(form, text, words):
    with pytest.raises(ClockError, match=words):
        TimeParser(form)(text)


def test_clock_time_of_day():
    assert parse_clock_time("07:05") == 7 * 3600 + 300
    with pytest.raises(ClockError):
        parse_clock_time("7 o'clock")


@settings(max_examples=50)
@given(st.lists(st.integers(0, 86_399_999), min_size=1, max_size=50), st.dates())
def test_one_reader_over_many_rows_of_a_day(millis, day):
    # rows after the first of a date take a shorter path; it must read the same
    day = max(day, dt.date(1900, 1, 1))
    iso, dmy = TimeParser("iso"), TimeParser("day_first")
    base = dt.datetime.combine(min(day, dt.date(2200, 1, 1)), dt.time())
    for ms in millis:
        d = base + dt.timedelta(milliseconds=ms)
        frac = f".{d.microsecond // 1000:03d}" if ms % 2 else ""
        expected = _seconds(d) if ms % 2 else _seconds(d.replace(microsecond=0))
        assert iso(d.strftime("%Y-%m-%d %H:%M:%S") + frac) == pytest.approx(expected, abs=1e-6)
        assert dmy(d.strftime("%d/%m/%Y %H:%M:%S") + frac) == pytest.approx(expected, abs=1e-6)
    with pytest.raises(ClockError, match="where earlier rows had none"):
        iso(base.strftime("%Y-%m-%dT%H:%M:%S+01:00"))
