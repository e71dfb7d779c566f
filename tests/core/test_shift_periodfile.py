"""Periods read from a task log kept in a spreadsheet: columns found by their headers as the
measured-file reader finds them, spreadsheet habits accepted (notes above the header, decimal
commas, semicolons, a 12-hour clock, a byte-order mark), and every malformed or hostile file
refused with a message naming its line and column (all invented files)."""

from __future__ import annotations

import pytest

from driftdose import textfile
from driftdose.api.period_file import PERIOD_FILE_BYTES, describe_period_file
from driftdose.shift.periodfile import PeriodFileError, read_period_file

LOG = (
    "Task log, invented survey\n"
    "Worker;A\n"
    "\n"
    "Label;Kind;Start;End;Activity level;Breathing route;Protection factor (APF)\n"
    "Before work;Background;06:00;06:30;;;\n"
    "Grinding;task;06:30;09:00;Light exercise;Mixed;10\n"
    "Lunch;break;09:00;09:30;;;\n"
    "Welding;Task;09:30;13:30;heavy-exercise;mouth breather;2,5\n"
)


def test_a_spreadsheet_task_log_reads():
    rows = read_period_file(LOG)
    assert rows.lines == (5, 6, 7, 8)
    assert rows.records[1] == {
        "label": "Grinding",
        "kind": "task",
        "start": "06:30",
        "end": "09:00",
        "activity": "light_exercise",
        "route": "mixed",
        "protection_factor": 10.0,
    }
    # the decimal comma of the file; the trade's words without case, hyphens or blanks
    assert rows.records[3]["protection_factor"] == 2.5
    assert rows.records[3]["activity"] == "heavy_exercise"
    assert rows.records[3]["route"] == "mouth_breather"
    # blank cells are left out (the calculation's defaults apply)
    assert rows.records[0] == {
        "label": "Before work",
        "kind": "background",
        "start": "06:00",
        "end": "06:30",
    }
    assert rows.columns["protection_factor"] == "Protection factor (APF)"


def test_other_headers_and_order_are_found():
    text = "End time,Start time,Task,APF\n10:00,09:00,Sweeping,4\n"
    rows = read_period_file(text)
    assert rows.records == (
        {"end": "10:00", "start": "09:00", "label": "Sweeping", "protection_factor": 4.0},
    )


def test_a_file_without_header_holds_the_columns_in_order():
    rows = read_period_file("Grinding,task,06:30,09:00,sitting,nose,20\n", -1)
    assert rows.records[0] == {
        "label": "Grinding",
        "kind": "task",
        "start": "06:30",
        "end": "09:00",
        "activity": "sitting",
        "route": "nose",
        "protection_factor": 20.0,
    }


def test_twelve_hour_clock_and_dates_are_read():
    text = (
        "Label,Start,End\nA,6:30 AM,12:15 p.m.\nB,12:15 PM,12:30:10 am\n"
        "C,2026-03-05 13:00,2026-03-05T14:00\n"
    )
    rows = read_period_file(text)
    # 12 AM is midnight, 12 PM noon (common practice of the 12-hour clock)
    assert [(r["start"], r["end"]) for r in rows.records] == [
        ("06:30", "12:15"),
        ("12:15", "00:30:10"),
        ("2026-03-05 13:00", "2026-03-05T14:00"),
    ]


def test_latin1_and_byte_order_mark_are_decoded_first():
    raw = "Label;Kind;Start;End\nSchleifen (Stäube);task;06:30;09:00\n".encode("latin-1")
    text = textfile.decode_text(raw).text
    assert read_period_file(text).records[0]["label"] == "Schleifen (Stäube)"
    bom = "\ufeffLabel,Start,End\nA,06:00,07:00\n"
    assert read_period_file(bom).records[0]["label"] == "A"


MALFORMED = [
    # (file text, line, part, words in the message)
    ("Label;Start;End\nA;06:00;lunch\nB;07:00;08:00\n", 2, "end", ["column 3", "'lunch'"]),
    ("Label;Start;End\nA;06:00;25:00\nB;07:00;08:00\n", 2, "end", ["25:00", "not a time of day"]),
    ("Label;Start;End\nA;13:30 PM;14:00\nB;07:00;08:00\n", 2, "start", ["1 to 12"]),
    (
        "Label;Kind;Start;End\nA;lunch;06:00;07:00\nB;task;07:00;08:00\n",
        2,
        "kind",
        ["'lunch'", "task, background, break"],
    ),
    (
        "Label;Start;End;Activity\nA;06:00;07:00;jogging\nB;07:00;08:00;\n",
        2,
        "activity",
        ["'jogging'"],
    ),
    ("Label;Start;End;Route\nA;06:00;07:00;ears\nB;07:00;08:00;\n", 2, "route", ["'ears'"]),
    (
        "Label;Start;End;APF\nA;06:00;07:00;0,5\nB;07:00;08:00;\n",
        2,
        "protection_factor",
        ["from 1", "'0,5'"],
    ),
    (
        "Label;Start;End;APF\nA;06:00;07:00;1e9\nB;07:00;08:00;\n",
        2,
        "protection_factor",
        ["100000"],
    ),
    (
        "Label;Start;End;APF\nA;06:00;07:00;ten\nB;07:00;08:00;1\n",
        2,
        "protection_factor",
        ["'ten'"],
    ),
    ("Label;Start;End\nA;06:00;2026-03-05T07:00+01:00\nB;07:00;08:00\n", 2, "end", ["UTC offset"]),
    ("Label;Start;End\nA;;07:00\nB;07:00;08:00\n", 2, "start", ["no time"]),
    (
        "Label;Begin;Finish\nA;06:00;07:00\nB;07:00;08:00\n",
        1,
        "header_line",
        ["no end column", "'Finish'"],
    ),
    ("Start;End;start\n06:00;07:00;08:00\n", 1, "header_line", ["2 columns", "keep one"]),
]


@pytest.mark.parametrize(("text", "line", "part", "words"), MALFORMED)
def test_malformed_files_name_line_and_column(text, line, part, words):
    with pytest.raises(PeriodFileError) as caught:
        read_period_file(text)
    err = caught.value
    assert (err.line, err.part) == (line, part)
    assert str(err).startswith(f"Line {line}: ")
    for w in words:
        assert w in str(err), str(err)


def test_more_than_two_hundred_periods_are_refused():
    rows = "".join(
        f"P{k},{k // 60:02d}:{k % 60:02d},{k // 60:02d}:{k % 60:02d}:30\n" for k in range(201)
    )
    with pytest.raises(PeriodFileError, match="201 periods; at most 200"):
        read_period_file("Label,Start,End\n" + rows)


def test_long_labels_are_cut_to_the_calculation_limit():
    rows = read_period_file(f"Label,Start,End\n{'x' * 500},06:00,07:00\n")
    assert rows.records[0]["label"] == "x" * 80


HOSTILE = [
    ("", "empty"),
    ("\x00\x01\x02" * 100, "binary"),
    ("just a sentence without columns\n", "no data rows"),
    ("Label,Start,End\n", "no data rows"),
]


@pytest.mark.parametrize(("text", "words"), HOSTILE)
def test_unreadable_files_are_refused_with_a_message(text, words):
    reply = describe_period_file(text)
    assert reply["ok"] is False and reply["field"] == "periods"
    assert words in reply["message"].lower() or words in reply["message"], reply["message"]


def test_describer_refuses_what_is_not_text_or_too_large():
    assert describe_period_file(None)["ok"] is False
    assert describe_period_file(["Label,Start,End"])["ok"] is False
    big = "Label,Start,End\n" + "A,06:00,07:00\n" * (PERIOD_FILE_BYTES // 14 + 1)
    reply = describe_period_file(big)
    assert reply["ok"] is False and "larger than 256 KB" in reply["message"]


def test_formula_like_labels_stay_text():
    # a label a spreadsheet would run as a formula is kept as text; exports neutralise it
    reply = describe_period_file('Label,Start,End\n"=HYPERLINK(""http://x"")",06:00,07:00\n')
    assert reply["ok"] and reply["records"][0]["label"] == '=HYPERLINK("http://x")'
