"""Logged time series: readings on one clock, the logging interval and the gaps.

A :class:`TimeSeries` holds the readings of one file: times (seconds from the first
reading), the clock time of the first reading and one or more columns of values in SI.
:func:`read_series` builds it from a file's table (:mod:`driftdose.tables`) and
refuses duplicated or backward time stamps with their line numbers.

Each reading stands for the time from its own time stamp to the next one (sample and hold,
common practice for logged data), but for no longer than one logging interval when the next
one is late: the **logging interval** is the median spacing of the time stamps, and a spacing
of more than :data:`GAP_FACTOR` logging intervals is a **gap** (unmeasured time).
"""

from __future__ import annotations

import bisect
import itertools
import math
import operator
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace
from functools import cached_property

from ..tables import CellError, Table
from ..tables import number as read_number
from .clock import ClockError, TimeParser, clock_text
from .fastread import fast_columns

__all__ = [
    "GAP_FACTOR",
    "ColumnSpec",
    "Gap",
    "SeriesError",
    "TimeSeries",
    "aligned_values",
    "read_series",
    "with_sum",
]

GAP_FACTOR = 2.0
"""A spacing of more than this many logging intervals is a gap (our rule, stated on screen)."""

MISSING = ("", "nan", "na", "n/a", "-", "--", "null", "none")
"""Cells read as a missing reading (case ignored)."""


class SeriesError(ValueError):
    """A time series that cannot be used; ``where`` names the input, ``line`` the file line."""

    def __init__(self, message: str, where: str = "", line: int | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.where = where
        self.line = line


@dataclass(frozen=True)
class Gap:
    """Unmeasured time between two readings.

    Attributes
    ----------
    start, end : float
        From the end of the last reading's interval to the next reading. [s from start]

    """

    start: float
    end: float

    @property
    def seconds(self) -> float:
        """Length of the gap. [s]"""
        return self.end - self.start


@dataclass(frozen=True)
class ColumnSpec:
    """Which file column to read and how.

    Attributes
    ----------
    index : int
        Column index (0-based).
    key : str
        Name the column gets in the series.
    scale : float
        Factor from the file's unit to SI. [SI per file unit]

    """

    index: int
    key: str
    scale: float = 1.0


@dataclass(frozen=True)
class TimeSeries:
    """Readings of one file on one clock.

    Attributes
    ----------
    start : float
        Clock time of the first reading, seconds since 1970-01-01 local. [s]
    t : tuple of float
        Time of each reading after the first (``t[0] == 0``), strictly increasing. [s]
    hold : tuple of float
        Time each reading stands for (to the next reading, at most one logging interval
        across a gap). [s]
    values : dict of str to tuple
        Values per column key in SI, None for a missing reading.
    lines : tuple of int
        File line of each reading.
    interval : float
        Logging interval, the median spacing. [s]
    gaps : tuple of Gap
        Unmeasured stretches between readings.

    """

    start: float
    t: tuple[float, ...]
    hold: tuple[float, ...]
    values: dict[str, tuple[float | None, ...]]
    lines: tuple[int, ...]
    interval: float
    gaps: tuple[Gap, ...]

    @property
    def end(self) -> float:
        """End of the last reading's interval. [s from start]"""
        return self.t[-1] + self.hold[-1]

    @cached_property
    def ends(self) -> tuple[float, ...]:
        """End of each reading's interval, ``t + hold`` (computed once). [s from start]"""
        return tuple(map(operator.add, self.t, self.hold))

    @cached_property
    def lengths(self) -> tuple[float, ...]:
        """Each reading's interval as ``ends - t`` (the rounding the statistics use). [s]"""
        return tuple(map(operator.sub, self.ends, self.t))

    def clock(self, t: float) -> str:
        """Clock time of ``t`` [s from start] as ISO 8601 text."""
        return clock_text(self.start + t)

    def index_at(self, t: float) -> int:
        """Index of the first reading at or after ``t`` [s from start]."""
        return bisect.bisect_left(self.t, t)


def _median(xs: Sequence[float]) -> float:
    s = sorted(xs)
    n = len(s)
    return s[n // 2] if n % 2 else 0.5 * (s[n // 2 - 1] + s[n // 2])


def read_series(
    table: Table,
    parse_time: TimeParser,
    time_index: int,
    columns: Sequence[ColumnSpec],
    date_index: int | None = None,
    where: str = "series_text",
) -> TimeSeries:
    """Read time stamps and value columns from a table.

    Parameters
    ----------
    table : Table
        The file's cells (:func:`driftdose.tables.read_table`).
    parse_time : TimeParser
        Reader of the time stamps in the form the user chose.
    time_index : int
        Column of the time stamps (0-based).
    columns : sequence of ColumnSpec
        Value columns with their keys and factors to SI.
    date_index : int, optional
        Column of the dates when date and time are written in two columns.
    where : str
        Input named in error messages.

    Returns
    -------
    TimeSeries
        At least two readings.

    Raises
    ------
    SeriesError
        Unreadable time stamps or numbers, repeated or backward time stamps (with the line
        numbers), fewer than two readings.

    """
    rows = table.rows
    if len(rows) < 2:
        raise SeriesError("At least two readings are needed.", where)
    fast = None
    if date_index is None and parse_time.form == "iso" and not parse_time.offsets_seen:
        fast = fast_columns(table, time_index, columns)
    if fast is not None:
        clock, values, lines = fast
    else:
        clock, values, lines = _each_row(table, parse_time, time_index, columns, date_index, where)
    return _series(clock, values, lines)


def _each_row(
    table: Table,
    parse_time: TimeParser,
    time_index: int,
    columns: Sequence[ColumnSpec],
    date_index: int | None,
    where: str,
) -> tuple[list[float], dict[str, list[float | None]], list[int]]:
    """Time stamps and values read row by row, each with its line-numbered refusal."""
    rows = table.rows
    clock: list[float] = []
    values: dict[str, list[float | None]] = {c.key: [] for c in columns}
    lines: list[int] = []
    specs = [(c.index, c.scale, values[c.key], table.columns[c.index].name) for c in columns]
    decimal = table.decimal
    for line, cells in rows:
        try:
            width = len(cells)
            date = None
            if date_index is not None:
                date = cells[date_index] if date_index < width else ""
            stamp = cells[time_index] if time_index < width else ""
            now = parse_time(stamp, date)
        except ClockError as exc:
            hint = ""
            if table.delimiter == "whitespace" and date_index is None:
                hint = (
                    " The columns were read as separated by blanks, which splits a date from "
                    "its time: look for rows with another separator, or name the date column."
                )
            raise SeriesError(f"Line {line}: {exc.message}{hint}", where, line) from None
        if clock and now <= clock[-1]:
            before = lines[-1]
            what = "repeats the time" if now == clock[-1] else "goes back in time from"
            raise SeriesError(
                f"Line {line}: the time stamp {stamp.strip()[:30]!r} {what} line "
                f"{before} ({clock_text(clock[-1])}); time stamps must increase.",
                where,
                line,
            )
        clock.append(now)
        lines.append(line)
        for index, scale, out, name in specs:
            cell = cells[index] if index < width else ""
            out.append(_number(cell, decimal, scale, line, name, where))
    return clock, values, lines


def _series(
    clock: list[float], values: dict[str, list[float | None]], lines: list[int]
) -> TimeSeries:
    """The series of increasing clock times (logging interval, holds and gaps)."""
    start = clock[0]
    t = [c - start for c in clock]
    spacing = [b - a for a, b in itertools.pairwise(t)]
    interval = _median(spacing)
    limit = GAP_FACTOR * interval
    hold = [s if s <= limit else interval for s in spacing]
    hold.append(interval)
    gaps = tuple(Gap(t[i] + interval, t[i + 1]) for i, s in enumerate(spacing) if s > limit)
    return TimeSeries(
        start,
        tuple(t),
        tuple(hold),
        {k: tuple(v) for k, v in values.items()},
        tuple(lines),
        interval,
        gaps,
    )


def _number(
    cell: str, decimal: str, scale: float, line: int, name: str, where: str
) -> float | None:
    try:
        x = read_number(cell, decimal)
    except CellError as exc:
        if cell.strip().strip('"').lower() in MISSING:
            return None
        raise SeriesError(
            f"Line {line}: column {name[:40]!r}: {exc.message}", where, line
        ) from None
    if x is None or math.isnan(x):
        return None
    if math.isinf(x):
        raise SeriesError(
            f"Line {line}: {cell.strip()[:30]!r} in column {name[:40]!r} is not a finite number.",
            where,
            line,
        )
    return x * scale


def aligned_values(target: TimeSeries, other: TimeSeries, key: str) -> list[float | None]:
    """Values of ``other``'s column ``key`` at ``target``'s reading times.

    Linear interpolation in time between the two readings of ``other`` around each time
    (common practice for aligning two loggers); None where ``other`` has no reading on both
    sides within its own gap rule, or outside its time span.

    Parameters
    ----------
    target : TimeSeries
        The series whose reading times are used.
    other : TimeSeries
        The series to read values from (its own clock start may differ).
    key : str
        Column key of ``other``.

    Returns
    -------
    list of float or None
        One value per reading of ``target`` [SI of the column].

    """
    ys = other.values[key]
    ts = other.t
    shift = target.start - other.start
    limit = GAP_FACTOR * other.interval
    out: list[float | None] = []
    n = len(ts)
    j = 0
    for t in target.t:
        x = t + shift  # on other's clock
        while j < n - 1 and ts[j + 1] <= x:
            j += 1
        if x < ts[0] or x > ts[-1] + other.hold[-1]:
            out.append(None)
        elif x >= ts[-1] or j == n - 1:
            out.append(ys[-1] if x <= ts[-1] + other.hold[-1] else None)
        else:
            a, b = ys[j], ys[j + 1]
            span = ts[j + 1] - ts[j]
            if a is None or b is None or span > limit:
                out.append(a if (a is not None and x - ts[j] <= other.hold[j]) else None)
            else:
                f = (x - ts[j]) / span
                out.append(a + f * (b - a))
    return out


def with_sum(
    series: TimeSeries, keys: Sequence[str], weights: Sequence[float], key: str
) -> TimeSeries:
    """The series with one more column: the weighted sum of others, reading by reading.

    Parameters
    ----------
    series : TimeSeries
        The readings.
    keys : sequence of str
        The columns added up (size channels, say) [SI of the column].
    weights : sequence of float
        The factor on each column (1 for particles per channel, the channel's width in
        log10 d for dN/dlog10 d) [-].
    key : str
        The new column's key.

    Returns
    -------
    TimeSeries
        The same readings with ``values[key]``: the sum, None where a column is missing.

    """
    columns = [series.values[k] for k in keys]
    total: list[float | None] = []
    for row in zip(*columns, strict=True):
        if any(x is None for x in row):
            total.append(None)
        else:
            total.append(
                math.fsum(w * x for w, x in zip(weights, row, strict=True) if x is not None)
            )
    return replace(series, values={**series.values, key: tuple(total)})


TimeReader = Callable[[str, str | None], float]
