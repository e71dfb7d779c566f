"""The columns of a :class:`~driftdose.tables.reader.Table`: their catalogue (name, unit,
kind, gaps), picking one by number or by name, and the JSON description the page shows."""

from __future__ import annotations

from typing import Any

from . import cells as _cells
from .reader import Column, Table, TableError
from .units import HeaderUnit, header_unit, unit_code

__all__ = ["build_columns", "describe_table", "pick_column"]

PREVIEW_ROWS = 8
"""Data rows shown in a preview."""

PREVIEW_COLUMNS = 40
"""Columns shown in a preview (a file of size channels may have hundreds)."""

CELL_CHARS = 60
"""Characters of a cell shown in a preview or a message."""

_GAP_LINES = 20


def _width(cells: list[str] | tuple[str, ...]) -> int:
    n = len(cells)
    while n and not cells[n - 1]:
        n -= 1
    return n


def _kind(values: list[str]) -> str:
    filled = [v for v in values if v]
    if not filled:
        return "empty"
    numbers = sum(map(_cells.is_number, filled))
    times = sum(1 for v in filled if not _cells.is_number(v) and _cells.is_time(v))
    if numbers * 2 > len(filled):
        return "number"
    if (numbers + times) * 2 > len(filled):
        return "time"
    return "text"


def build_columns(
    header: list[str] | None,
    units_row: list[str] | None,
    body: list[tuple[int, list[str]]],
    profile: list[bool],
    sample: list[list[str]],
) -> tuple[Column, ...]:
    """Catalogue the columns: names (``Column N`` without a header), units from the header
    or the units row, kind from the first rows, and gaps over every data row.

    Parameters
    ----------
    header : list of str or None
        The header row's cells, if the file has one.
    units_row : list of str or None
        The units row's cells, if the file has one.
    body : list of (int, list of str)
        Data rows with their file line numbers.
    profile : list of bool
        Which columns hold values in the data (:func:`~driftdose.tables.detect.data_profile`).
    sample : list of list of str
        The first data rows, which decide each column's kind.
    """
    rows = [c for _, c in body]
    longest = max(map(len, rows), default=0)
    if any(len(c) == longest and c[-1] for c in rows):  # a row ends with a filled cell
        width = max(_width(header or []), longest)
    else:
        width = max([_width(header or [])] + [_width(c) for c in rows])
    gaps = [0] * width
    gap_lines: list[list[int]] = [[] for _ in range(width)]
    full = min(map(len, rows), default=0) == longest == width and all(map(all, rows))
    for line, cells in () if full else body:  # every row full: no gap to count
        n = len(cells)
        if n >= width and all(cells[:width]):
            continue
        for i in range(width):
            if i >= n or not cells[i]:
                gaps[i] += 1
                if len(gap_lines[i]) < _GAP_LINES:
                    gap_lines[i].append(line)
    out = []
    for i in range(width):
        written = header[i] if header is not None and i < len(header) else ""
        name = written or f"Column {i + 1}"
        unit = header_unit(written) if written else HeaderUnit(name)
        if units_row is not None and i < len(units_row) and units_row[i]:
            text = units_row[i].strip().strip("[]()").strip()
            known = unit_code(text)
            unit = HeaderUnit(
                unit.label, text, *(known or (None, None)), distribution=unit.distribution
            )
        kind = _kind([r[i] if i < len(r) else "" for r in sample])
        out.append(Column(i, name, unit, kind, gaps[i], tuple(gap_lines[i])))
    return tuple(out)


def _norm(name: str) -> str:
    return " ".join(name.strip().strip('"').casefold().split())


def _listed(columns: tuple[Column, ...] | list[Column]) -> str:
    shown = ", ".join(f"{c.index + 1} {c.name[:CELL_CHARS]!r}" for c in list(columns)[:12])
    more = f" and {len(columns) - 12} more" if len(columns) > 12 else ""
    return shown + more


def pick_column(table: Table, spec: Any, what: str = "column") -> Column:
    """Find a column by its 1-based number or by its header (whole or in part, any case).

    Parameters
    ----------
    table : Table
        The table read.
    spec : int or str
        A column number (``2``, ``"2"``) or a name or part of one (``"dlogdp"``). A name
        equal to a whole header (or to its name without the unit) wins over a part.
    what : str
        The column's role in messages (``diameter``).

    Raises
    ------
    TableError
        With ``part == "column"``: no such number or name, or a part that matches several
        headers (``candidates`` lists them).

    Examples
    --------
    >>> from driftdose.tables import read_table
    >>> t = read_table("Dp [nm];dN/dlogDp [#/cm³];dN [#/cm³]\\n10;1;2\\n20;3;4\\n")
    >>> pick_column(t, "dlogdp").index, pick_column(t, "DN").index, pick_column(t, 1).name
    (1, 2, 'Dp [nm]')

    """
    columns = table.columns
    if isinstance(spec, bool) or spec is None or (isinstance(spec, str) and not spec.strip()):
        raise TableError(f"Choose the {what} column.", None, "column")
    if isinstance(spec, int) or (isinstance(spec, str) and spec.strip().isdigit()):
        n = int(spec)
        if 1 <= n <= len(columns):
            return columns[n - 1]
        raise TableError(
            f"There is no column {n} for the {what}; the table has {len(columns)} column(s): "
            f"{_listed(columns)}.",
            None,
            "column",
        )
    if not isinstance(spec, str):
        raise TableError(f"Give the {what} column by its name or its number.", None, "column")
    wanted = _norm(spec)
    if table.header is None:
        raise TableError(
            f"The file has no header row, so the {what} column {spec.strip()[:CELL_CHARS]!r} "
            "cannot be found by name; give its number (1 for the first column).",
            None,
            "column",
        )
    for key in (lambda c: _norm(c.name), lambda c: _norm(c.unit.label)):
        exact = [c for c in columns if key(c) == wanted]
        if len(exact) == 1:
            return exact[0]
        if len(exact) > 1:
            return _ambiguous(exact, spec, what)
    partial = [c for c in columns if wanted in _norm(c.name)]
    if len(partial) == 1:
        return partial[0]
    if partial:
        return _ambiguous(partial, spec, what)
    raise TableError(
        f"No column named {spec.strip()[:CELL_CHARS]!r} for the {what}; the header has "
        f"{_listed(columns)}.",
        None,
        "column",
    )


def _ambiguous(found: list[Column], spec: str, what: str) -> Column:
    raise TableError(
        f"{spec.strip()[:CELL_CHARS]!r} matches {len(found)} columns for the {what}: "
        f"{_listed(found)}; give more of the name or the number.",
        None,
        "column",
        [c.name for c in found],
    )


def _clip(cells: tuple[str, ...] | list[str]) -> list[str]:
    return [c[:CELL_CHARS] for c in list(cells)[:PREVIEW_COLUMNS]]


def describe_table(table: Table, preview_rows: int = PREVIEW_ROWS) -> dict[str, Any]:
    """The JSON description of a table that the page shows (shape in :mod:`driftdose.tables`).

    Parameters
    ----------
    table : Table
        The table read.
    preview_rows : int
        How many data rows the preview holds [-].
    """
    columns = [
        {
            "number": c.index + 1,
            "name": c.name,
            "label": c.unit.label,
            "unit": c.unit.unit,
            "unit_code": c.unit.code,
            "quantity": c.unit.quantity,
            "distribution": c.unit.distribution,
            "kind": c.kind,
            "gaps": c.gaps,
        }
        for c in table.columns
    ]
    gaps = [
        {"number": c.index + 1, "name": c.name, "count": c.gaps, "lines": list(c.gap_lines)}
        for c in table.columns
        if c.gaps and c.kind != "text"
    ]
    return {
        "delimiter": table.delimiter,
        "decimal": table.decimal,
        "header_line": table.header_line,
        "header_given": table.header_given,
        "units_line": table.units_line,
        "rows": len(table.rows),
        "first_line": table.rows[0][0],
        "last_line": table.rows[-1][0],
        "columns": columns,
        "gaps": gaps,
        "metadata": [{"line": n, "text": t[:200]} for n, t in table.metadata[:20]],
        "footer": [{"line": n, "text": t[:200]} for n, t in table.footer[:5]],
        "skipped_lines": table.skipped,
        "preview": {
            "header": _clip(table.header) if table.header is not None else None,
            "rows": [{"line": n, "cells": _clip(c)} for n, c in table.rows[:preview_rows]],
        },
        "notes": list(table.notes),
    }
