"""Reading decoded text into a :class:`Table`: separator, decimal mark, header row below an
instrument's notes, units row, summary rows at the end (see :mod:`driftdose.tables`)."""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, field
from itertools import repeat

from .. import textfile
from . import cells as _cells
from .detect import (
    DELIMITERS,
    NO_SEPARATOR,
    SAMPLE,
    data_profile,
    decimal_mark,
    find_start,
    fits,
    is_summary,
    pick_delimiter,
    split_blanks,
)
from .units import HeaderUnit, is_unit

__all__ = ["MAX_CHARS", "MAX_LINE", "Column", "Table", "TableError", "read_table"]

MAX_CHARS = textfile.MAX_BYTES
"""Longest text read, in characters (every file within the 5 MB file limit fits)."""

MAX_LINE = 100_000
"""Longest line read, in characters (the csv module refuses cells above 131 072)."""

_LINE_BREAK = re.compile(r"\r\n|\r|\n")
_SEP_LINE = re.compile(r'^\s*"?sep=(.)"?\s*$', re.IGNORECASE)


class TableError(textfile.LineError):
    """A problem with a measured file.

    Attributes
    ----------
    message : str
        What is wrong, in plain words (without the line number).
    line : int or None
        The file's 1-based line where the problem lies, if any.
    part : str
        Which control is wrong: ``"file"``, ``"header_line"`` or ``"column"``.
    candidates : list of str
        For a column name that matches several headers, those headers.

    """

    def __init__(
        self,
        message: str,
        line: int | None = None,
        part: str = "file",
        candidates: list[str] | None = None,
    ) -> None:
        super().__init__(message, line, part)
        self.candidates = candidates or []


@dataclass(frozen=True)
class Column:
    """One column of a table.

    Attributes
    ----------
    index : int
        0-based position (the user-facing number is ``index + 1``).
    name : str
        The header as written, or ``Column N`` without a header.
    unit : HeaderUnit
        Name and unit read from the header (or from a units row below it).
    kind : str
        ``number``, ``time``, ``text`` or ``empty`` (from the first rows).
    gaps : int
        Empty cells in the data rows (a short row's missing cells count too).
    gap_lines : tuple of int
        The file lines of the first 20 gaps.

    """

    index: int
    name: str
    unit: HeaderUnit
    kind: str
    gaps: int = 0
    gap_lines: tuple[int, ...] = ()


@dataclass(frozen=True)
class Table:
    """A measured table read from text.

    Attributes
    ----------
    rows : tuple of (int, list of str)
        Data rows: the file line where each starts and its cells (blanks trimmed; not to be
        changed).
    columns : tuple of Column
        Every column, in file order.
    header : tuple of str or None
        The header row's cells, or None when the file has none.
    header_line : int or None
        The header's file line (1-based).
    header_given : bool
        True when the header line was given by the user rather than found.
    units_line : int or None
        A row of units right below the header, if found.
    delimiter : str
        ``comma``, ``semicolon``, ``tab`` or ``whitespace``.
    decimal : str
        ``point`` or ``comma``.
    metadata : tuple of (int, str)
        Lines above the header (an instrument's notes), with their line numbers.
    footer : tuple of (int, str)
        Summary rows after the data (``Total;...``), left out of ``rows``.
    skipped : int
        Blank and comment (``#``) lines among the data and below the header.
    notes : tuple of str
        What the reader decided that the user should know.

    """

    rows: tuple[tuple[int, list[str]], ...]
    columns: tuple[Column, ...]
    header: tuple[str, ...] | None
    header_line: int | None
    header_given: bool
    units_line: int | None
    delimiter: str
    decimal: str
    metadata: tuple[tuple[int, str], ...] = ()
    footer: tuple[tuple[int, str], ...] = ()
    skipped: int = 0
    notes: tuple[str, ...] = field(default_factory=tuple)

    def numbers(
        self, column: Column | int, what: str | None = None
    ) -> list[tuple[int, float | None]]:
        """Read a column as numbers: (line, value) per data row, None for a gap.

        Parameters
        ----------
        column : Column or int
            The column, or its 0-based index.
        what : str, optional
            The column's role in messages (``diameter``); its name if not given.

        Raises
        ------
        TableError
            With the line of the first cell that is not a number (or reads two ways).

        """
        i = column.index if isinstance(column, Column) else column
        name = what or repr(self.columns[i].name)
        out: list[tuple[int, float | None]] = []
        number, decimal = _cells.number, self.decimal
        for line, cells in self.rows:
            cell = cells[i] if i < len(cells) else ""
            try:
                out.append((line, number(cell, decimal)))
            except _cells.CellError as exc:
                raise TableError(
                    f"the {name} cell (column {i + 1}): {exc.message}", line, "file"
                ) from None
        return out


def _plain_records(
    text: str, delim: str, lines: list[str] | None
) -> tuple[list[tuple[int, list[str]]], list[int]] | None:
    """:func:`_records` of a text without quotes, NULs or blanks around its cells: each line
    is one record, split at the separator (as the csv module would split it); None for any
    other text."""
    if '"' in text or "\x00" in text or delim == " ":
        return None
    for w in _SPACES:  # a cell to trim (or a line of blanks): the csv path
        if w in text and w != delim and any(p in text for p in _trimmed(w, delim)):
            return None
        if text[:1] == w or text[-1:] == w:
            return None
    if lines is None:
        lines = _LINE_BREAK.split(text)
    if lines and not lines[-1]:
        lines = lines[:-1]  # the line break ending the last line starts no line
    if delim != text[:1] and "\n" + delim not in text and "\r" + delim not in text:
        # no line starts with a separator, so only empty lines are blank (the common file):
        # they are found at the list's own speed, and every other line is a record
        records = list(enumerate(map(str.split, lines, repeat(delim)), 1))
        blank: list[int] = []
        at = -1
        for _ in range(lines.count("")):
            at = lines.index("", at + 1)
            blank.append(at + 1)
        for n in reversed(blank):
            del records[n - 1]
        return records, blank
    out = [(n, line.split(delim)) for n, line in enumerate(lines, 1) if line.strip(delim)]
    blank = [n for n, line in enumerate(lines, 1) if not line.strip(delim)]
    return out, blank


_SPACES = tuple(c for c in map(chr, range(0x3001)) if c.isspace() and c not in "\r\n")
"""White space that ``str.strip`` removes from a cell (besides line breaks)."""


def _trimmed(w: str, delim: str) -> tuple[str, ...]:
    """Pairs of characters showing white space ``w`` at the edge of a cell."""
    return (delim + w, w + delim, "\n" + w, w + "\n", "\r" + w, w + "\r")


def _records(
    text: str, delim: str, lines: list[str] | None = None
) -> tuple[list[tuple[int, list[str]]], list[int]]:
    """(first line, cells with blanks trimmed) of every record that is not blank, and the
    lines of the blank ones (``lines``: the text split at its line breaks, if at hand)."""
    plain = _plain_records(text, delim, lines)
    if plain is not None:
        return plain
    out: list[tuple[int, list[str]]] = []
    blank: list[int] = []
    strip = str.strip
    if delim == " ":
        lines = _LINE_BREAK.split(text)
        if lines and not lines[-1]:
            lines.pop()  # the line break ending the last line starts no line
        for n, line in enumerate(lines, start=1):
            cells = split_blanks(line)
            (out.append((n, cells)) if cells else blank.append(n))
        return out, blank
    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delim)
    start = 1
    try:
        for row in reader:
            cells = list(map(strip, row))
            if any(cells):
                out.append((start, cells))
            else:
                blank.append(start)
            start = reader.line_num + 1
    except csv.Error as exc:
        raise TableError(f"the line cannot be read as CSV ({exc}).", reader.line_num) from None
    return out, blank


def _check_text(text: object) -> str:
    if not isinstance(text, str):
        raise TableError("The file must be given as text.")
    if len(text) > MAX_CHARS:
        raise TableError(
            f"The text is {len(text):,} characters long; at most {MAX_CHARS:,} (a 5 MB file) "
            "can be read."
        )
    if not text.strip("\ufeff"):
        raise TableError("The file is empty.")
    head = text[:65536]
    if "\x00" in head:
        raise TableError(textfile.nul_message(head[::2].count("\x00"), head[1::2].count("\x00")))
    control = sum(1 for ch in head if ord(ch) < 32 and ch not in "\t\r\n\f")
    if control > max(2, len(head) // 100):
        raise TableError("The file looks binary (many control characters); export it as text.")
    if not text.strip().strip("\ufeff"):
        raise TableError("The file contains no text.")
    return text


def read_table(text: str, header_line: int = 0) -> Table:
    """Read a measured table from decoded text (see :mod:`driftdose.tables`).

    Parameters
    ----------
    text : str
        The file's text, as :func:`driftdose.textfile.decode_text` gives it.
    header_line : int
        The file line (1-based) holding the column names; 0 to find it, -1 for a file
        without a header row.

    Returns
    -------
    Table
        The data rows with their line numbers, the columns and what was detected.

    Raises
    ------
    TableError
        For empty, binary or oversized text, no separator, a header line that does not exist
        or is blank (``part == "header_line"``), or no data rows.

    Examples
    --------
    >>> t = read_table("Sizer;invented\\nDp [nm];dN (#/cm³)\\n10,5;100\\n21;50\\n")
    >>> t.header_line, t.delimiter, t.decimal, [c.unit.code for c in t.columns]
    (2, 'semicolon', 'comma', ['nm', '1/cm3'])

    """
    text = _check_text(text)
    notes: list[str] = []
    if text.startswith("\ufeff"):
        text = text[1:]
        notes.append("A byte-order mark at the start was ignored.")
    lines = _LINE_BREAK.split(text)
    for number, line_text in enumerate(lines if max(map(len, lines)) > MAX_LINE else (), 1):
        if len(line_text) > MAX_LINE:
            raise TableError(
                f"this line is {len(line_text):,} characters long; at most {MAX_LINE:,} can be "
                "read. Each line should hold one row.",
                number,
            )
    sep_line = _SEP_LINE.match(lines[0])
    if sep_line:  # a spreadsheet's "sep=;" first line names the separator
        delim = sep_line.group(1)
        if delim not in dict(DELIMITERS) or delim == " ":
            raise TableError(
                f"the first line names the separator {delim!r}; only commas, semicolons and "
                "tabs are read.",
                1,
            )
        notes.append(f"The first line {lines[0].strip()!r} named the separator.")
        text = "\n" + text[len(lines[0]) :].lstrip("\r").removeprefix("\n")
    else:
        found = pick_delimiter(lines)
        if found is None:
            raise TableError(NO_SEPARATOR)
        delim = found
    kept, blank = _records(text, delim, None if sep_line else lines)
    if not isinstance(header_line, int) or isinstance(header_line, bool) or header_line < -1:
        raise TableError(
            "The header line must be a line number (0 to find it).", None, "header_line"
        )
    if "#" in text:
        content = [r for r in kept if r[1][0][:1] != "#"]
    else:  # no comment row can be there
        content = kept
    comments = [r[0] for r in kept if r[1][0][:1] == "#"] if len(content) < len(kept) else []
    if not content:
        raise TableError("The file has no rows (only blank or comment lines).")
    given = header_line > 0
    header: list[str] | None = None
    units_row: list[str] | None = None
    units_line = None
    if header_line > 0:
        at = [i for i, (n, _) in enumerate(kept) if n == header_line]
        if not at:
            last = len(lines) - (lines[-1] == "")
            where = (
                "is blank" if header_line <= last else f"does not exist (the file has {last} lines)"
            )
            raise TableError(
                f"Line {header_line} {where}; give the line that holds the column names.",
                None,
                "header_line",
            )
        i = at[0]
        header = list(kept[i][1])
        if header and header[0].startswith("#"):
            header[0] = header[0].lstrip("#").strip()
        above = kept[:i]
        body = [r for r in kept[i + 1 :] if r[1][0][:1] != "#"]
        profile = data_profile([c for _, c in body[:SAMPLE]])
    else:
        profile = data_profile([c for _, c in content[-200:]])
        start = 0 if header_line == -1 else find_start(content, profile)
        first_data = content[start][0]
        above = kept[: next(i for i, r in enumerate(kept) if r[0] >= first_data)]
        body = content[start:]
        if start > 0:
            header = list(content[start - 1][1])
            above = [(n, c) for n, c in above if n < content[start - 1][0]]
            if start > 1 and all(is_unit(c) for c in header if c) and any(header):
                units_row, units_line = header, content[start - 1][0]
                header = list(content[start - 2][1])
                above = [(n, c) for n, c in above if n < content[start - 2][0]]
                header_line = content[start - 2][0]
            else:
                header_line = content[start - 1][0]
    # summary rows after the data ("Total;;2150") do not fit the data's signature
    footer: list[tuple[int, list[str]]] = []
    while len(body) > 1 and len(footer) < 5 and is_summary(body[-1][1]):
        if fits(body[-1][1], profile):
            break
        footer.insert(0, body.pop())
    if sum(profile) == 1:
        raise TableError(NO_SEPARATOR)
    if given and (not body or not any(profile)):
        raise TableError(
            f"Below line {header_line} there are no rows of numbers or times; give the line "
            "that holds the column names.",
            None,
            "header_line",
        )
    if not body or not any(profile):
        raise TableError("The file has no data rows (only a header, blank or comment lines).")
    top = header_line or 0
    skipped = sum(1 for n in blank if n > top) + sum(1 for n in comments if n > top)
    sample = [c for _, c in body[:SAMPLE]] + [c for _, c in body[SAMPLE:][-50:]]
    decimal = decimal_mark(sample, delim)
    from .columns import build_columns  # the column catalogue needs the rows read here

    columns = build_columns(header, units_row, body, profile, sample)
    metadata = tuple((n, _line_text(lines, n)) for n, _ in above)
    if metadata:
        notes.append(f"{len(metadata)} line(s) of notes above the header were set aside.")
    if footer:
        notes.append(
            f"{len(footer)} summary line(s) after the data (line {footer[0][0]}: "
            f"{_line_text(lines, footer[0][0])[:40]!r}) were left out."
        )
    if skipped:
        notes.append(f"{skipped} blank or comment line(s) were skipped.")
    return Table(
        rows=tuple(body),
        columns=columns,
        header=tuple(header) if header is not None else None,
        header_line=header_line if header is not None else None,
        header_given=given,
        units_line=units_line,
        delimiter=dict(DELIMITERS)[delim],
        decimal=decimal,
        metadata=metadata,
        footer=tuple((n, _line_text(lines, n)) for n, _ in footer),
        skipped=skipped,
        notes=tuple(notes),
    )


def _line_text(lines: list[str], number: int) -> str:
    return lines[number - 1] if 0 < number <= len(lines) else ""
