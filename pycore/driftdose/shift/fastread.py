"""The short path of :func:`driftdose.shift.series.read_series` for the common logger file.

A file whose time stamps are all ``YYYY-MM-DD hh:mm:ss`` (or with ``T``), increasing, and
whose value cells are all plain decimal numbers (no gaps, no text, no ``nan``, no thousands
separators) is read column by column: one pattern check over the whole time column, the
standard library's ISO 8601 reader for the dates and times, ``float`` for the numbers. Any
other file, and any file this path doubts, is read row by row by ``read_series``, which
gives every refusal with its line number; the two paths give the same numbers (the clock
times are whole seconds, exact in both).
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from datetime import datetime, timedelta
from itertools import islice, repeat
from operator import lt, mul, sub
from typing import Any

from ..tables import Table

__all__ = ["fast_columns"]

_STAMP = r"[0-9]{4}-[0-9]{2}-[0-9]{2}[T ](?:[01][0-9]|2[0-3]):[0-5][0-9]:[0-5][0-9]"
_STAMPS = re.compile(rf"(?:{_STAMP}\n)*{_STAMP}")
"""A time column of whole-second ISO 8601 local date-times, one per line."""

_BARE_COMMA = re.compile(r",(?![0-9])")
_EPOCH = datetime(1970, 1, 1)
_SECOND = timedelta(seconds=1)
_NUMBER_CHARS = re.compile(r"[0-9+\-.eE \t]*")
"""Characters of plain decimal numbers (``float`` then reads what ``tables.number`` would);
a column whose cells hold only these is matched in one pass over their joined text."""
_COMMA_CHARS = re.compile(r"[0-9+\-.eE \t,]*")
"""The same with decimal commas."""


def _clock(stamps: list[str]) -> list[float] | None:
    """Seconds since 1970-01-01 of each stamp, or None when the column is not plain."""
    if not _STAMPS.fullmatch("\n".join(stamps)):
        return None
    try:
        times = list(map(datetime.fromisoformat, stamps))
    except ValueError:  # a day that does not exist: the row-by-row path says where
        return None
    if not (1900 <= times[0].year and times[-1].year <= 2200):
        return None
    clock = list(map(timedelta.__truediv__, map(sub, times, repeat(_EPOCH)), repeat(_SECOND)))
    if not all(map(lt, clock, islice(clock, 1, None))):
        return None  # repeated or backward: the row-by-row path names the lines
    return clock


def _numbers(cells: list[str], decimal: str, scale: float) -> list[float | None] | None:
    """The cells as numbers times ``scale``, or None unless every one is a plain number."""
    joined = "".join(cells)
    if not _NUMBER_CHARS.fullmatch(joined):
        if decimal != "comma" or "." in joined or not _COMMA_CHARS.fullmatch(joined):
            return None
        column = "\n".join(cells)
        if _BARE_COMMA.search(column):
            return None  # "12," or "1,e3": refused by the row-by-row path
        cells = column.replace(",", ".").split("\n")
    elif decimal == "comma" and "." in joined:
        return None  # "1.000" reads two ways in a file of decimal commas
    try:
        xs = list(map(float, cells))
    except ValueError:  # an empty cell, or two points: the row-by-row path says where
        return None
    if math.isinf(max(xs)) or math.isinf(min(xs)):
        return None
    return list(map(mul, xs, repeat(scale)))


def fast_columns(
    table: Table, time_index: int, columns: Sequence[Any]
) -> tuple[list[float], dict[str, list[float | None]], list[int]] | None:
    """Clock times, values and file lines of a plain file, or None (see the module notes).

    Parameters
    ----------
    table : Table
        The file's cells.
    time_index : int
        Column of the ISO 8601 time stamps (0-based) [-].
    columns : sequence of ColumnSpec
        Value columns: ``index``, ``key`` and ``scale`` (factor to SI).

    Returns
    -------
    tuple or None
        Clock times [s since 1970-01-01, local], values per key [SI] and file lines; None
        when the file needs the row-by-row reader.
    """
    rows = table.rows
    try:
        clock = _clock([cells[time_index] for _, cells in rows])
        if clock is None:
            return None
        values: dict[str, list[float | None]] = {}
        for c in columns:
            got = _numbers([cells[c.index] for _, cells in rows], table.decimal, c.scale)
            if got is None:
                return None
            values[c.key] = got
    except IndexError:  # a short row: the row-by-row path reads it as a gap
        return None
    return clock, values, [line for line, _ in rows]
