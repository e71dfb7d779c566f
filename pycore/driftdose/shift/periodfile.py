"""A shift's periods read from a table a hygienist keeps (a task log exported from a
spreadsheet as CSV or TSV).

The file is read by the shared reader of measured files (:mod:`driftdose.tables`: separator,
decimal mark, notes above the header row, byte-order mark, Latin-1 text decoded before). Its
columns are found by their headers, as the reader picks a measured file's columns (whole
header or its name without a unit first, then a part of one, any case):

========================  ====================================================
period part               headers it is found under
========================  ====================================================
``label``                 label, name, task, period, description
``kind``                  kind, type (task, background or break; blank: task)
``start``, ``end``        start, begin, from / end, stop, until, to
``activity``              activity (sleep, sitting, light exercise, heavy exercise)
``route``                 route, breathing (mixed, nose, mouth, mouth breather)
``protection_factor``     protection factor, APF, protection (blank: 1)
========================  ====================================================

Only ``start`` and ``end`` are required. A file without a header row holds the columns in
that order. Each row becomes one period record of the shift calculation, its times kept as
written (``hh:mm[:ss]``, or a date and time ``YYYY-MM-DD hh:mm[:ss]``): they are placed on
the logged file's date when the calculation runs (a clock time before the first reading is
the next day's), so one task log serves a folder of logged days; a 12-hour clock time
(``6:30 PM``) is written on the 24-hour clock. Words are matched without
regard to case, blanks, hyphens or underscores. Every refusal names the file line and the
column.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from ..deposition import ACTIVITIES, ROUTES
from ..tables import CellError, Column, Table, TableError, number, pick_column, read_table
from ..textfile import LineError
from .clock import ClockError, parse_clock_time, parse_iso
from .periods import MAX_PERIODS, PERIOD_KINDS, PROTECTION_MAX

__all__ = ["PART_NAMES", "PeriodFileError", "PeriodRows", "read_period_file"]

PART_NAMES: dict[str, tuple[str, ...]] = {
    "label": ("label", "name", "task", "period", "description"),
    "kind": ("kind", "type", "period type", "task type"),
    "start": ("start", "begin", "from"),
    "end": ("end", "stop", "until", "to"),
    "activity": ("activity", "activity level"),
    "route": ("route", "breathing route", "breathing"),
    "protection_factor": ("protection factor", "apf", "protection"),
}
"""Headers each part of a period is found under: whole headers, in this order of preference;
the first name of each is also looked for as a part of a header."""

REQUIRED = ("start", "end")
LABEL_CHARS = 80
"""Longest label kept (the calculation's limit)."""

_WORD = re.compile(r"[\s\-_]+")


class PeriodFileError(LineError):
    """A periods file that cannot be used.

    Attributes
    ----------
    message : str
        What is wrong, without the line number.
    line : int or None
        The file's 1-based line at fault, if one is.
    part : str
        The period part (``start``, ``kind``, ...) or ``file`` / ``header_line``.

    """


@dataclass(frozen=True)
class PeriodRows:
    """Periods read from a file.

    Attributes
    ----------
    records : tuple of dict
        One record per row, keys of :data:`PART_NAMES` (parts the file does not give are
        left out; the calculation's defaults apply), values as the calculation takes them:
        words as its keys, the protection factor a number [-], times as written.
    lines : tuple of int
        The file line of each record.
    columns : dict of str to str
        The header (or ``Column N``) each part was read from.
    table : Table
        The table as the reader found it.

    """

    records: tuple[dict[str, object], ...]
    lines: tuple[int, ...]
    columns: dict[str, str]
    table: Table


def _norm(word: str) -> str:
    return _WORD.sub(" ", word.strip().casefold()).strip()


def _find_columns(table: Table) -> dict[str, Column]:
    """The column of each part: whole headers first, then the first name as a part."""
    if table.header is None:
        return {
            part: table.columns[i] for i, part in enumerate(PART_NAMES) if i < len(table.columns)
        }
    found: dict[str, Column] = {}
    taken: set[int] = set()
    whole: dict[str, dict[int, Column]] = {}
    for c in table.columns:
        for key in (_norm(c.name), _norm(c.unit.label)):
            whole.setdefault(key, {})[c.index] = c
    for part, names in PART_NAMES.items():
        for name in names:
            hits = [c for c in whole.get(name, {}).values() if c.index not in taken]
            if len(hits) > 1:
                raise PeriodFileError(
                    f"{len(hits)} columns are headed {name!r}: columns "
                    f"{', '.join(str(c.index + 1) for c in hits)}; keep one.",
                    table.header_line,
                    "header_line",
                )
            if hits:
                found[part] = hits[0]
                taken.add(hits[0].index)
                break
    for part, names in PART_NAMES.items():
        if part in found:
            continue
        try:
            column = pick_column(table, names[0], part.replace("_", " "))
        except TableError as exc:
            if exc.candidates:
                raise PeriodFileError(exc.message, table.header_line, "header_line") from None
            continue
        if column.index not in taken:
            found[part] = column
            taken.add(column.index)
    missing = [p for p in REQUIRED if p not in found]
    if missing:
        heads = ", ".join(repr(c.name[:40]) for c in table.columns[:12])
        raise PeriodFileError(
            f"no {' and no '.join(missing)} column: the header has {heads}. Name the columns "
            "label, kind, start, end, activity, route, protection factor (start and end are "
            "needed).",
            table.header_line,
            "header_line",
        )
    return found


def _choice(cell: str, valid: tuple[str, ...], labels: dict[str, str], what: str) -> str:
    word = _norm(cell)
    for key in valid:
        if word in (_norm(key), _norm(labels.get(key, key))):
            return key
    shown = ", ".join(k.replace("_", " ") for k in valid)
    raise ValueError(f"the {what} {cell[:40]!r} is none of {shown}.")


_ACTIVITY_WORDS = {"sitting": "sitting awake"}
_ROUTE_WORDS = {"mouth_breather": "habitual mouth breather"}


_AM_PM = re.compile(r"(\d{1,2}):(\d{2})(?::(\d{2}))?\s*([AaPp])\.?[Mm]\.?")


def _time(cell: str) -> str:
    """A period time as the calculation reads it; a 12-hour clock time (``6:30 PM``, as
    spreadsheets set to US English export it) is written on the 24-hour clock."""
    text = cell.strip()
    if not text:
        raise ValueError("no time.")
    if len(text) > 40:
        raise ValueError("a time is at most 40 characters.")
    twelve = _AM_PM.fullmatch(text)
    if twelve:
        hh, mm, ss, half = twelve.groups()
        if not 1 <= int(hh) <= 12:
            raise ValueError(f"{text!r}: the hour of a 12-hour clock time is from 1 to 12.")
        hour = int(hh) % 12 + (12 if half in "Pp" else 0)
        text = f"{hour:02d}:{mm}" + (f":{ss}" if ss else "")
    try:
        if len(text) <= 12 and "-" not in text:
            parse_clock_time(text)
        else:
            _, offset = parse_iso(text)
            if offset is not None:
                raise ValueError("write the local time without a UTC offset.")
    except ClockError as exc:
        raise ValueError(
            f"{exc.message.rstrip('.')}; write hh:mm, hh:mm:ss or a date and time 2026-03-05 08:00."
        ) from None
    return text


def _protection(cell: str, decimal: str) -> float:
    try:
        value = number(cell, decimal)
    except CellError as exc:
        raise ValueError(f"the protection factor {cell[:20]!r}: {exc.message}") from None
    if value is None:
        return 1.0
    if not (math.isfinite(value) and 1.0 <= value <= PROTECTION_MAX):
        raise ValueError(
            f"the assigned protection factor must be from 1 (no protection) to "
            f"{PROTECTION_MAX:g}; {cell[:20]!r} was given."
        )
    return value


def read_period_file(text: str, header_line: int = 0) -> PeriodRows:
    """Read a table of periods (see the module notes).

    Parameters
    ----------
    text : str
        The decoded file (:func:`driftdose.textfile.decode_text`).
    header_line : int
        The line of the column names; 0 to find it, -1 for a file without one. [-]

    Returns
    -------
    PeriodRows
        A record per row, with its line.

    Raises
    ------
    PeriodFileError
        Unreadable text, no start or end column, more than ``MAX_PERIODS`` rows, or a cell
        that cannot be used (its line and column named).

    Examples
    --------
    >>> rows = read_period_file("Label;Start;End;APF\\nGrinding;06:30;09:00;10\\n")
    >>> rows.records[0]["label"], rows.records[0]["protection_factor"], rows.lines
    ('Grinding', 10.0, (2,))

    """
    try:
        table = read_table(text, header_line)
    except TableError as exc:
        raise PeriodFileError(exc.message, exc.line, exc.part) from None
    columns = _find_columns(table)
    if len(table.rows) > MAX_PERIODS:
        raise PeriodFileError(
            f"the file holds {len(table.rows)} periods; at most {MAX_PERIODS} are read."
        )
    records: list[dict[str, object]] = []
    for line, cells in table.rows:
        record: dict[str, object] = {}
        for part, column in columns.items():
            cell = cells[column.index].strip() if column.index < len(cells) else ""
            where = f"column {column.index + 1} ({column.name[:40]!r})"
            try:
                if part in ("start", "end"):
                    record[part] = _time(cell)
                elif not cell:
                    continue
                elif part == "label":
                    record[part] = cell[:LABEL_CHARS]
                elif part == "kind":
                    record[part] = _choice(cell, PERIOD_KINDS, {}, "kind")
                elif part == "activity":
                    record[part] = _choice(cell, tuple(ACTIVITIES), _ACTIVITY_WORDS, "activity")
                elif part == "route":
                    record[part] = _choice(cell, tuple(ROUTES), _ROUTE_WORDS, "route")
                else:
                    record[part] = _protection(cell, table.decimal)
            except ValueError as exc:
                raise PeriodFileError(f"{where}: {exc}", line, part) from None
        records.append(record)
    return PeriodRows(
        tuple(records),
        tuple(line for line, _ in table.rows),
        {part: c.name for part, c in columns.items()},
        table,
    )
