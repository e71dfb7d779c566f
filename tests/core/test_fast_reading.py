"""Short paths of the file readers against their general paths.

``tables.reader`` splits a text without quotes at its separator instead of running the csv
module; ``shift.fastread`` reads a plain logger file column by column. Each must give what the
general path gives (the csv module, and the row-by-row reader with its refusals); any file the
short path doubts goes the general way, so every refusal keeps its line number.
"""

from __future__ import annotations

import datetime
import random

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from driftdose.shift import series as series_module
from driftdose.shift.clock import TimeParser
from driftdose.shift.fastread import fast_columns
from driftdose.shift.series import ColumnSpec, SeriesError, read_series
from driftdose.tables import read_table
from driftdose.tables import reader as reader_module


def general_records(text: str, delim: str):
    """The csv path of the reader, whatever the text."""
    original = reader_module._plain_records
    reader_module._plain_records = lambda *a: None
    try:
        return reader_module._records(text, delim)
    finally:
        reader_module._plain_records = original


CELLS = st.sampled_from(["", "a", "12", "1.5", "x y", " pad", "pad ", "\t", "é", "3,5", "-"])


@settings(max_examples=150, deadline=None)
@given(
    rows=st.lists(st.lists(CELLS, max_size=5), min_size=1, max_size=12),
    delim=st.sampled_from([",", ";", "\t"]),
    ending=st.sampled_from(["\n", "\r\n", "\r"]),
    last=st.booleans(),
)
def test_plain_records_are_those_of_the_csv_module(rows, delim, ending, last):
    text = ending.join(delim.join(r) for r in rows) + (ending if last else "")
    assert reader_module._records(text, delim) == general_records(text, delim)


def test_quotes_and_edges_take_the_csv_path():
    assert reader_module._plain_records('a,"b,c"\n', ",", None) is None
    assert reader_module._plain_records("a, b\n", ",", None) is None
    assert reader_module._plain_records(" a,b\n", ",", None) is None
    assert reader_module._plain_records("a,b\u00a0\n", ",", None) is None
    assert reader_module._plain_records("a b,c\n", ",", None) is not None


def logger_file(rng: random.Random, n: int, comma: bool, step: int = 1) -> str:
    start = datetime.datetime(2026, 2, 27, 23, 59, 0)
    lines = ["Invented logger", "Time;Number;Mass" if comma else "Time,Number,Mass"]
    for k in range(n):
        t = (start + datetime.timedelta(seconds=step * k)).isoformat(sep=rng.choice("T "))
        a, b = rng.uniform(0, 1e5), rng.lognormvariate(0, 3)
        cells = [t, f"{a:.3f}", f"{b:.6g}"]
        if comma:
            cells = [t, cells[1].replace(".", ","), cells[2].replace(".", ",")]
        lines.append((";" if comma else ",").join(cells))
    return "\n".join(lines) + "\n"


def both_ways(text: str):
    table = read_table(text)
    specs = [ColumnSpec(1, "n", 1e6), ColumnSpec(2, "m", 1e-9)]
    fast = fast_columns(table, 0, specs)
    original = series_module.fast_columns
    series_module.fast_columns = lambda *a: None
    try:
        general = read_series(table, TimeParser("iso"), 0, specs)
    except SeriesError as exc:
        general = exc.message
    finally:
        series_module.fast_columns = original
    try:
        combined = read_series(table, TimeParser("iso"), 0, specs)
    except SeriesError as exc:
        combined = exc.message
    return fast, general, combined


@pytest.mark.parametrize("comma", [False, True])
@pytest.mark.parametrize("seed", [1, 2])
def test_plain_logger_files_read_alike(comma, seed):
    # across a month's end and midnight, ISO with T or a blank, decimal points or commas
    fast, general, combined = both_ways(logger_file(random.Random(seed), 400, comma, 7))
    assert fast is not None  # the short path reads it
    assert combined == general


@pytest.mark.parametrize(
    ("cell", "row"),
    [
        ("12,", 5),
        ("1,e3", 5),
        ("nan", 5),
        ("1e500", 5),
        ("1_000", 5),
        ("", 5),
        ("1.000", 5),
        ("١٢", 5),
    ],
)
def test_doubtful_cells_go_the_general_way(cell, row):
    for comma in (False, True):
        text = logger_file(random.Random(3), 12, comma)
        lines = text.split("\n")
        sep = ";" if comma else ","
        cells = lines[row + 1].split(sep)
        cells[1] = cell
        lines[row + 1] = sep.join(cells)
        _, general, combined = both_ways("\n".join(lines))
        assert combined == general


@pytest.mark.parametrize(
    "stamp",
    [
        "2026-02-30 00:00:05",
        "2026-02-28 23:59:01",
        "2026-02-28 24:00:00",
        "1899-12-31 00:00:00",
        "2026-02-28T23:59:00Z",
        "2026-02-28 23:59",
    ],
)
def test_doubtful_time_stamps_go_the_general_way(stamp):
    text = logger_file(random.Random(4), 12, False)
    lines = text.split("\n")
    cells = lines[6].split(",")
    cells[0] = stamp
    lines[6] = ",".join(cells)
    fast, general, combined = both_ways("\n".join(lines))
    assert fast is None
    assert combined == general
    if isinstance(general, str):  # the changed row, or the row after it (out of order)
        assert general.startswith(("Line 7:", "Line 8:"))
