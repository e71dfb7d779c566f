"""How a measured table is laid out: its separator, the data's signature (which columns hold
values), where the data start below an instrument's notes, summary rows after the data, and
the decimal mark (see :mod:`driftdose.tables`)."""

from __future__ import annotations

import csv
import re

from . import cells as _cells

__all__ = [
    "DELIMITERS",
    "NO_SEPARATOR",
    "SAMPLE",
    "data_like",
    "data_profile",
    "decimal_mark",
    "find_start",
    "fits",
    "is_summary",
    "pick_delimiter",
    "split_blanks",
]

DELIMITERS = (("\t", "tab"), (";", "semicolon"), (",", "comma"), (" ", "whitespace"))
"""Separators tried, in the order that breaks a tie."""

SAMPLE = 400
"""Rows examined from the top (and 50 from the end) to choose the separator and header."""

NO_SEPARATOR = (
    "No column separator found: expected at least two columns of values (numbers, dates or "
    "times) separated by commas, semicolons, tabs or blanks."
)
_WHITESPACE_CELL = re.compile(r'"([^"]*)"|(\S+)')
_SUMMARY = re.compile(
    r"^(total|totals|sum|summe|gesamt|mean|average|avg|median|min|max|minimum|maximum|std|"
    r"sd|count|n|moyenne|somme|end)\b",
    re.IGNORECASE,
)


def split_blanks(line: str) -> list[str]:
    """Split a line into cells separated by blanks (spaces or tabs); a quoted cell may hold
    blanks.

    Parameters
    ----------
    line : str
        One line of the file.
    """
    return [
        m.group(1) if m.group(1) is not None else m.group(2)
        for m in _WHITESPACE_CELL.finditer(line)
    ]


def _sample(lines: list[str]) -> list[str]:
    """The first :data:`SAMPLE` lines with content (not blank, not ``#``) and the last 50
    after them, found without reading the lines in between."""

    def content(ln: str) -> bool:
        return bool(ln.strip()) and not ln.lstrip().startswith("#")

    head: list[str] = []
    stop = len(lines)
    for k, ln in enumerate(lines):
        if content(ln):
            head.append(ln)
            if len(head) == SAMPLE:
                stop = k + 1
                break
    tail: list[str] = []
    for ln in reversed(lines[stop:]):
        if content(ln):
            tail.append(ln)
            if len(tail) == 50:
                break
    return head + tail[::-1]


def pick_delimiter(lines: list[str]) -> str | None:
    """The separator giving at least two consistent columns with the most values (ties
    broken in the order of :data:`DELIMITERS`, then by the rows that agree).

    Parameters
    ----------
    lines : list of str
        The file's lines.
    """
    sample = _sample(lines)
    best: tuple[int, int, int, str] | None = None
    for rank, (delim, _name) in enumerate(DELIMITERS):
        if delim == " ":
            rows = [split_blanks(ln) for ln in sample]
        else:
            rows = list(csv.reader(sample, delimiter=delim))
        counts = [len(r) for r in rows if len(r) >= 2]
        if not counts:
            continue
        mode = max(set(counts), key=lambda c: (counts.count(c), c))
        fit = [r for r in rows if len(r) == mode]
        values = sum(1 for r in fit for c in r if _cells.is_value(c))
        score = (values, -rank, len(fit), delim)
        if best is None or score > best:
            best = score
    return None if best is None else best[3]


def value_columns(rows: list[list[str]]) -> int:
    """How many columns hold a value in some row.

    Parameters
    ----------
    rows : list of list of str
        Rows split into cells.
    """
    width = max((len(r) for r in rows), default=0)
    return sum(any(i < len(r) and _cells.is_value(r[i]) for r in rows) for i in range(width))


def is_summary(cells: list[str]) -> bool:
    """A summary row after the data: it starts with a word such as ``Total`` or ``Mean``, or
    holds a single text cell (``End of file``).

    Parameters
    ----------
    cells : list of str
        The row's cells.
    """
    filled = [c for c in cells if c]
    if not filled or _cells.is_value(filled[0]):
        return False
    return len(filled) == 1 or bool(_SUMMARY.match(filled[0]))


def compatible(a: list[str], b: list[str]) -> bool:
    """Two rows of one kind: where both have a cell, both are values or both are text.

    Parameters
    ----------
    a, b : list of str
        The two rows' cells.
    """
    return all(
        not x or not y or _cells.is_value(x) == _cells.is_value(y)
        for x, y in zip(a, b, strict=False)
    )


def data_profile(rows: list[list[str]]) -> list[bool]:
    """Which columns hold values in the data (its signature), from the last run of rows of
    one kind at the end of ``rows``; up to three rows at the very end (a summary) may break
    the run.

    Parameters
    ----------
    rows : list of list of str
        The file's rows split into cells.
    """
    tail = rows[-200:]
    seen: dict[str, bool] = {}  # each cell is asked about up to eight times below

    def value(cell: str) -> bool:
        known = seen.get(cell)
        if known is None:
            known = seen[cell] = _cells.is_value(cell)
        return known

    def alike(a: list[str], b: list[str]) -> bool:  # compatible(), with the answers kept
        return all(not x or not y or value(x) == value(y) for x, y in zip(a, b, strict=False))

    best: list[list[str]] = []
    for skip in range(min(4, len(tail))):
        end = len(tail) - 1 - skip
        run = [tail[end]]
        for i in range(end - 1, -1, -1):
            if not alike(tail[i], tail[end]) or not alike(tail[i], tail[i + 1]):
                break
            run.append(tail[i])
        if (value_columns(run), len(run)) > (value_columns(best), len(best)):
            best = run
    width = max((len(r) for r in best), default=0)
    return [any(i < len(r) and r[i] and _cells.is_value(r[i]) for r in best) for i in range(width)]


def fits(cells: list[str], profile: list[bool]) -> bool:
    """A data row: every value column holds a value or nothing, at least one a value.

    Parameters
    ----------
    cells : list of str
        The row's cells.
    profile : list of bool
        Which columns hold values in the data (:func:`data_profile`).
    """
    seen = False
    for i, is_val in enumerate(profile):
        if not is_val or i >= len(cells) or not cells[i]:
            continue
        if not _cells.is_value(cells[i]):
            return False
        seen = True
    return seen


def data_like(cells: list[str], profile: list[bool]) -> bool:
    """A data row, perhaps with a bad cell: it fits, or its first value-column cell is a value
    and so are at least half of its value-column cells (a header's first cell is a name).

    Parameters
    ----------
    cells : list of str
        The row's cells.
    profile : list of bool
        Which columns hold values in the data (:func:`data_profile`).
    """
    if fits(cells, profile):
        return True
    filled = [cells[i] for i, v in enumerate(profile) if v and i < len(cells) and cells[i]]
    if not filled or not _cells.is_value(filled[0]):
        return False
    return sum(map(_cells.is_value, filled)) * 2 >= len(filled)


def find_start(records: list[tuple[int, list[str]]], profile: list[bool]) -> int:
    """Index of the first data record: it fits, and 90 % of the records after it do.

    Parameters
    ----------
    records : list of (int, list of str)
        The file's rows with their line numbers.
    profile : list of bool
        Which columns hold values in the data (:func:`data_profile`).
    """
    top = records[:SAMPLE]
    fits = [data_like(c, profile) for _, c in top]
    if len(records) <= SAMPLE:  # summary rows at the end do not count against the data
        for _ in range(3):
            if len(fits) > 1 and not fits[-1]:
                fits.pop()
        top = top[: len(fits)]
    after = [0] * (len(top) + 1)
    for i in range(len(top) - 1, -1, -1):
        after[i] = after[i + 1] + fits[i]
    for i, ok in enumerate(fits):
        if ok and after[i] >= 0.9 * (len(top) - i):
            return i
    return 0


def decimal_mark(rows: list[list[str]], delim: str) -> str:
    """The decimal mark of a file: ``comma`` when its cells show decimal commas and no decimal
    points, else ``point``.

    Parameters
    ----------
    rows : list of list of str
        The data rows' cells.
    delim : str
        The file's separator.
    """
    comma = point = False
    for r in rows:
        for c in r:
            shows_comma, shows_point = _cells.decimal_evidence(c)
            comma, point = comma or shows_comma, point or shows_point
    if delim == "," and not comma:
        return "point"
    return "comma" if comma and not point else "point"
