"""Reading a logged file's table: delimiter, header row below metadata lines, decimal comma.

One small function, :func:`read_table`, stands between the time-series code and the text of
the file, so that the reader shared by every measured file can take its place without other
changes. Rules (common practice for instrument exports opened in spreadsheets):

- the delimiter is a ``sep=X`` first line when there is one, else the first of semicolon,
  tab and comma that splits two thirds of the last lines into the same number (≥ 2) of
  cells, that number being the width of the table;
- the header row is the nearest line above the first three consecutive data rows (rows of
  that many cells with at least one number) that has as many cells, one of them a name
  without digits; metadata lines above it are skipped; the user may name the header line
  instead (``header_line``, counted from 1; 0 detects it);
- when cells are not separated by commas, a comma inside a number is a decimal comma;
- a unit written in brackets at the end of a header (``Number [1/cm³]``, ``LDSA (µm²/cm³)``)
  is read as that column's unit.
"""

from __future__ import annotations

import csv
import re
from collections.abc import Iterator
from dataclasses import dataclass

__all__ = ["MAX_COLUMNS", "MAX_ROWS", "Table", "TableError", "find_column", "read_table"]

MAX_ROWS = 200_000
"""Most data rows read (a 48 h file at 1 s has 172 800)."""

MAX_COLUMNS = 400
"""Most columns per row."""

_NUMBER = re.compile(r"^\s*[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?\s*$")
_DIGIT = re.compile(r"\d")
_SEP_LINE = re.compile(r'^\s*"?sep=(.)"?\s*$', re.IGNORECASE)
_UNIT = re.compile(r"[\[(]\s*([^\[\]()]+?)\s*[\])]\s*$")
_DELIMITERS = ((";", "semicolon"), ("\t", "tab"), (",", "comma"))


class TableError(ValueError):
    """A file that cannot be read as a table; ``line`` is the file line (1-based) or None."""

    def __init__(self, message: str, line: int | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.line = line


@dataclass(frozen=True)
class Table:
    """A file's table as text cells.

    Attributes
    ----------
    header : tuple of str
        Column names (``"1"``, ``"2"``... when the file has no header row).
    units : tuple of str
        The unit written in each header (empty when none).
    header_line : int
        File line of the header row (1-based; 0 when there is none).
    delimiter : str
        The cell separator.
    decimal : str
        ``"."`` or ``","``.
    rows : tuple of (int, list of str)
        Data rows with their file line numbers (1-based).

    """

    header: tuple[str, ...]
    units: tuple[str, ...]
    header_line: int
    delimiter: str
    decimal: str
    rows: tuple[tuple[int, list[str]], ...]

    @property
    def delimiter_name(self) -> str:
        """The delimiter in words."""
        return dict(_DELIMITERS).get(self.delimiter, repr(self.delimiter))


def _is_number(cell: str) -> bool:
    return bool(_NUMBER.match(cell))


def _split(line: str, delimiter: str) -> list[str]:
    if '"' not in line:
        return line.split(delimiter)
    return next(csv.reader([line], delimiter=delimiter), [])


def _detect(lines: list[str]) -> tuple[str, int]:
    """Delimiter and row width: the first of semicolon, tab and comma for which at least two
    thirds of the last (up to 12) lines have the same number (≥ 2) of cells."""
    tail = [ln for ln in lines[-12:] if ln.strip()]
    for delim, _ in _DELIMITERS:
        counts = [len(_split(ln, delim)) for ln in tail]
        width = max(set(counts), key=counts.count)
        if width >= 2 and 3 * counts.count(width) >= 2 * len(counts):
            return delim, width
    raise TableError(
        "No column separator found: the last lines do not split into the same number of "
        "cells by semicolons, tabs or commas."
    )


_NOT_NAMES = {"nan", "inf", "+inf", "-inf", "infinity", "na", "n/a", "null", "none", "-", "--"}


def _is_name(cell: str) -> bool:
    """A header name: text without digits that is not a number word (``NaN``, ``inf``)."""
    c = cell.strip().strip('"').strip()
    return bool(c) and not _DIGIT.search(c) and c.lower() not in _NOT_NAMES


def _data_like(cells: list[str], width: int) -> bool:
    return len(cells) == width and any(_is_number(c) for c in cells)


def read_table(text: str, header_line: int = 0) -> Table:
    """Split a file's text into a header and data rows (see the module notes).

    Parameters
    ----------
    text : str
        The decoded file.
    header_line : int
        File line of the header row (1-based), or 0 to detect it.

    Returns
    -------
    Table
        Header, units and rows with their line numbers.

    Raises
    ------
    TableError
        No separator, no data rows, too many rows or columns, or a row of another width.

    Examples
    --------
    >>> t = read_table("logger X\\ntime;N [1/cm3]\\n08:00;1,5\\n08:01;2\\n08:02;3\\n")
    >>> t.header, t.units, t.header_line, t.decimal, t.rows[0]
    (('time', 'N'), ('', '1/cm3'), 2, ',', (3, ['08:00', '1.5']))

    """
    lines = text.splitlines()
    if not any(ln.strip() for ln in lines):
        raise TableError("The file is empty.")
    first = 0
    sep = _SEP_LINE.match(lines[0]) if lines else None
    if sep:
        delimiter, first = sep.group(1), 1
        tail = [ln for ln in lines[-12:] if ln.strip()]
        counts = [len(_split(ln, delimiter)) for ln in tail]
        width = max(set(counts), key=counts.count)
    else:
        delimiter, width = _detect(lines)
    if width > MAX_COLUMNS:
        raise TableError(f"The rows have {width} columns; at most {MAX_COLUMNS} are read.")
    if header_line:
        if not first < header_line <= len(lines):
            raise TableError(f"The header line {header_line} is beyond the file's {len(lines)}.")
        head_idx = header_line - 1
        if len(_split(lines[head_idx], delimiter)) != width:
            raise TableError(
                f"Line {header_line} has {len(_split(lines[head_idx], delimiter))} cells, the "
                f"data rows {width}; it cannot be their header.",
                header_line,
            )
    else:
        head_idx = _find_header(lines, first, delimiter, width)
    header: list[str] = []
    units: list[str] = []
    if head_idx >= 0:
        for i, cell in enumerate(_split(lines[head_idx], delimiter), start=1):
            cell = cell.strip().strip('"').strip()
            m = _UNIT.search(cell)
            unit = m.group(1) if m else ""
            name = cell[: m.start()].strip() if m and m.start() else cell
            header.append(name or str(i))
            units.append(unit)
    else:
        header = [str(i) for i in range(1, width + 1)]
        units = [""] * width
    decimal = "," if delimiter != "," else "."
    rows = tuple(_rows(lines, head_idx + 1 if head_idx >= 0 else first, delimiter, width))
    if not rows:
        raise TableError("The file has no data rows below its header.")
    if decimal == "," and not any("," in c for _, cells in rows[:50] for c in cells):
        decimal = "."
    if decimal == ",":
        rows = tuple((n, [c.replace(",", ".") for c in cells]) for n, cells in rows)
    return Table(tuple(header), tuple(units), head_idx + 1, delimiter, decimal, rows)


def _last(lines: list[str]) -> str:
    for ln in reversed(lines):
        if ln.strip():
            return ln
    raise TableError("The file has no rows.")


def _find_header(lines: list[str], first: int, delimiter: str, width: int) -> int:
    """Index of the header line (-1 when the data start without one).

    The first three consecutive data rows are found; the header is the nearest line above
    them of the same width with a cell holding no digit (a name), passing over rows of digits
    that are not numbers (a damaged data row is reported with its line, not taken as the
    header); a line of another width ends the search.
    """
    n = len(lines)
    for i in range(first, n):
        if not _data_like(_split(lines[i], delimiter), width):
            continue
        run = [j for j in range(i, min(n, i + 3)) if lines[j].strip()]
        if all(_data_like(_split(lines[j], delimiter), width) for j in run):
            for prev in range(i - 1, first - 1, -1):
                if not lines[prev].strip():
                    continue
                cells = _split(lines[prev], delimiter)
                if len(cells) != width:
                    return -1
                if any(_is_name(c) for c in cells):
                    return prev
            return -1
    raise TableError(
        f"No data rows found: no three lines in a row of {width} cells with numbers "
        f"(separated by {dict(_DELIMITERS).get(delimiter, repr(delimiter))})."
    )


def _rows(
    lines: list[str], start: int, delimiter: str, width: int
) -> Iterator[tuple[int, list[str]]]:
    count = 0
    for i in range(start, len(lines)):
        line = lines[i]
        if not line.strip():
            continue
        cells = _split(line, delimiter)
        if len(cells) != width:
            raise TableError(
                f"Line {i + 1}: {len(cells)} cells where the header has {width}.", i + 1
            )
        count += 1
        if count > MAX_ROWS:
            raise TableError(f"The file has more than {MAX_ROWS} data rows.", i + 1)
        yield i + 1, cells


def find_column(table: Table, spec: str, what: str) -> int:
    """Index of the column named by ``spec``: a number from 1, or a header text matched
    whole or in part, ignoring case.

    Parameters
    ----------
    table : Table
        The file's cells (:func:`read_table`).
    spec : str
        Column number from 1, or header text.
    what : str
        What the column holds, for error messages.

    Raises
    ------
    TableError
        When no column or several columns match.

    """
    s = spec.strip()
    if s.isdigit():
        k = int(s)
        if not 1 <= k <= len(table.header):
            raise TableError(
                f"{what}: column {k} does not exist (the file has {len(table.header)})."
            )
        return k - 1
    low = s.lower()
    if not low:
        raise TableError(f"{what}: name a column.")
    exact = [i for i, h in enumerate(table.header) if h.lower() == low]
    if len(exact) == 1:
        return exact[0]
    part = [i for i, h in enumerate(table.header) if low in h.lower()]
    if len(part) == 1:
        return part[0]
    names = ", ".join(repr(h) for h in table.header[:12])
    if not part:
        raise TableError(f"{what}: no column matches {s[:40]!r}; the columns are {names}.")
    several = ", ".join(repr(table.header[i]) for i in part[:6])
    raise TableError(f"{what}: {s[:40]!r} matches several columns ({several}); be more precise.")
