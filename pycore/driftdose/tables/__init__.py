"""One reader for every measured text file: time series and size spectra alike.

Generic delimited text only (CSV, TSV, blank-separated columns), no instrument's own format.
The bytes are decoded first by :mod:`driftdose.textfile` (encoding, byte-order mark, size,
SHA-256 of the bytes); this package reads the decoded text.

Interface
---------
:func:`read_table` (text, ``header_line``) -> :class:`Table`
    Detects the separator (comma, semicolon, tab, or runs of blanks; a spreadsheet's
    ``sep=;`` first line names it), the decimal mark (a comma when the numbers show decimal
    commas that cannot be thousands groups and none shows a decimal point), the header row
    even below an instrument's notes (the row right above the first of the rows that fit the
    data's signature, values in the value columns; ``header_line=N`` says "the header is on
    line N", ``-1`` "there is none"), a row of units right below the header, and summary rows
    after the data (``Total;;2150``), which are left out. Blank lines and lines starting with
    ``#`` are skipped. Every row keeps its file line number.
:func:`pick_column` (table, spec, what) -> :class:`Column`
    By 1-based number, or by name: a whole header (or its name without the unit) first, else a
    part of one, case-insensitive; a part that matches several headers is refused with the
    candidates named.
:meth:`Table.numbers` (column) -> [(line, float or None)]
    The column's cells as numbers with the table's decimal mark, None for a gap; a cell that is
    text or reads two ways (``1,000``) is refused with its line.
:func:`header_unit` (header) -> :class:`HeaderUnit`
    The unit written in a header (``Dp [nm]``, ``dN/dlogDp (#/cm³)``, ``conc_mg/m3``) with its
    canonical code (``nm``, ``1/cm3``, ``mg/m3``) and kind of quantity.
:class:`TableError`
    Every refusal: ``message``, ``line`` (1-based, or None) and ``part``, the control that is
    wrong: ``"file"``, ``"header_line"`` or ``"column"`` (and ``candidates`` for an ambiguous
    name). ``str(error)`` is ``"Line N: message"`` when a line is known.

Reply shape of :func:`describe_table` (JSON-ready; what the page shows under the file control)::

    {
      "delimiter": "semicolon",          # comma | semicolon | tab | whitespace
      "decimal": "comma",                # point | comma
      "header_line": 5,                  # file line of the header, null without one
      "header_given": false,             # true when the user gave the line
      "units_line": null,                # a row of units below the header, if found
      "rows": 120, "first_line": 6, "last_line": 125,
      "columns": [{"number": 1, "name": "Dp [nm]", "label": "Dp", "unit": "nm",
                   "unit_code": "nm", "quantity": "length",
                   "distribution": null,            # dN/dlogDp | dN/dDp from the name
                   "kind": "number",                # number | time | text | empty
                   "gaps": 0}, ...],
      "gaps": [{"number": 2, "name": "...", "count": 3, "lines": [17, 18, 40]}],
      "metadata": [{"line": 1, "text": "Instrument;sizer"}, ...],   # notes above the header
      "footer": [{"line": 126, "text": "Total;;2150"}],             # summary rows left out
      "skipped_lines": 2,                # blank or comment lines below the header
      "preview": {"header": ["Dp [nm]", ...],
                  "rows": [{"line": 6, "cells": ["10,5", "1200"]}, ...]},   # first 8 rows
      "notes": ["4 line(s) of notes above the header were set aside.", ...]
    }

Gaps are listed for columns that hold numbers or times (an empty remark is no gap). Cells in
the preview are cut at 60 characters, rows at 40 columns.
"""

from __future__ import annotations

from .cells import CellError, number
from .columns import describe_table, pick_column
from .reader import MAX_LINE, Column, Table, TableError, read_table
from .units import HeaderUnit, header_unit, unit_code

__all__ = [
    "MAX_LINE",
    "CellError",
    "Column",
    "HeaderUnit",
    "Table",
    "TableError",
    "describe_table",
    "header_unit",
    "number",
    "pick_column",
    "read_table",
    "unit_code",
]
