"""Import of measured size spectra from delimited text with a user-chosen column mapping.

Interface: :func:`parse_spectrum_csv` returns a :class:`SpectrumImport` (bin mid-points in m,
particles per bin in 1/m^3, and a report of what was detected) or raises
:class:`SpectrumError` with a plain message, the line number where the content is at fault,
and the part of the mapping that is wrong (``part``: ``file``, ``header_line``,
``diameter_column`` or ``concentration_column``).

The table is read by :mod:`driftdose.tables`, the reader of every measured file: separator
(commas, semicolons, tabs or blanks), decimal commas, the header row below an instrument's
notes (or on the line the user names), units in the headers, summary rows at the end. Columns
are chosen by number or by name (a whole header, else a part of one, any case).
Concentrations may be given per bin, as dN/dlogDp or as dN/dDp. Refused with a message: empty
or binary content, more than 5 MB, no recognisable separator, non-numeric or empty cells,
negative, zero, unsorted or repeated diameters, negative concentrations, and fewer than two
data rows.

Unit names are not interpreted here: the caller (the API boundary) passes the factors that
turn the file's numbers into SI (``diameter_scale`` to m, ``concentration_scale`` to
1/m^3); for dN/dDp the value is read per file diameter unit and divided by
``diameter_scale``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from . import tables, textfile
from .distribution import BinnedSpectrum, bin_edges

__all__ = [
    "CONCENTRATION_TYPES",
    "MAX_BYTES",
    "MAX_ROWS",
    "SpectrumError",
    "SpectrumImport",
    "parse_spectrum_csv",
]

MAX_BYTES = 5 * 1024 * 1024
"""Largest accepted file, 5 MB."""

MAX_ROWS = 20000
"""Largest number of data rows accepted."""

CONCENTRATION_TYPES = ("per_bin", "dN/dlogDp", "dN/dDp")
"""How the concentration column is expressed: particles per bin, per unit log10 of the
diameter, or per unit diameter."""


class SpectrumError(textfile.LineError):
    """A spectrum import problem; ``line`` is the 1-based line number where it lies, if any,
    and ``part`` the input that is wrong (``file``, ``header_line``, ``diameter_column`` or
    ``concentration_column``)."""


@dataclass(frozen=True)
class SpectrumImport:
    """A spectrum read from CSV.

    Attributes
    ----------
    diameters : tuple of float
        Bin mid-point diameters. [m]
    numbers : tuple of float
        Particles per volume of air in each bin. [1/m^3]
    edges : tuple of float
        Bin edges (geometric means of neighbours, outer edges mirrored). [m]
    report : dict
        What was detected: ``delimiter``, ``decimal_comma``, ``bom``, ``encoding``,
        ``header`` (list or None), ``rows``, ``first_line``, ``last_line``,
        ``skipped_lines`` (blank or comment), ``notes``.

    """

    diameters: tuple[float, ...]
    numbers: tuple[float, ...]
    edges: tuple[float, ...]
    report: dict[str, Any] = field(default_factory=dict)

    def to_distribution(self, density: float = 1000.0, shape_factor: float = 1.0) -> BinnedSpectrum:
        """Return the spectrum as a :class:`~driftdose.distribution.BinnedSpectrum`."""
        return BinnedSpectrum(self.diameters, self.numbers, density, shape_factor, self.edges)


def _decode(data: bytes | str) -> tuple[str, bool, str, list[str]]:
    """Return (text, had_bom, encoding, notes); bytes go through the shared decoder
    (:func:`driftdose.textfile.decode_text`), text (what the page sends after that same
    decoder read the file) as it is."""
    if isinstance(data, str):
        return data, data.startswith("\ufeff"), "text", []
    if not isinstance(data, bytes | bytearray):
        raise SpectrumError("The spectrum must be given as text.")
    try:
        decoded = textfile.decode_text(data, MAX_BYTES)
    except textfile.TextFileError as exc:
        extra = ""
        if len(data) > MAX_BYTES:
            extra = " Export only the diameter and concentration columns, or fewer rows."
        raise SpectrumError(exc.message + extra) from None
    notes = [n for n in decoded.notes if "byte-order mark at the start" not in n]
    return decoded.text, decoded.bom, decoded.encoding, notes


def _values(
    table: tables.Table, column: tables.Column, what: str, part: str
) -> list[tuple[int, float]]:
    """The column's numbers with their lines; a gap, text or a non-finite number refused."""
    out = []
    i = column.index
    for line, cells in table.rows:
        if i >= len(cells):
            raise SpectrumError(
                f"this row has {len(cells)} column(s) but column {i + 1} is needed "
                f"(separator: {table.delimiter}).",
                line,
            )
        plain = cells[i].strip().strip('"').strip()
        try:
            v = tables.number(plain, table.decimal)
        except tables.CellError as exc:
            if "ambiguous" in exc.message:
                raise SpectrumError(
                    f"the {what} cell {plain!r} (column {i + 1}) is ambiguous: "
                    + exc.message.split("ambiguous", 1)[1].lstrip(": "),
                    line,
                ) from None
            raise SpectrumError(
                f"the {what} cell {plain[:30]!r} (column {i + 1}) is not a number.", line
            ) from None
        if v is None:
            raise SpectrumError(
                f"the {what} cell (column {i + 1}) is empty; fill the gap or remove the row.",
                line,
            )
        if not math.isfinite(v):
            raise SpectrumError(f"the {what} cell {plain[:30]!r} is not a finite number.", line)
        out.append((line, v))
    return out


def parse_spectrum_csv(
    data: bytes | str,
    diameter_column: int | str = 1,
    concentration_column: int | str = 2,
    concentration_type: str = "dN/dlogDp",
    diameter_scale: float = 1e-9,
    concentration_scale: float = 1e6,
    header_line: int = 0,
) -> SpectrumImport:
    """Read a measured spectrum from delimited text.

    Parameters
    ----------
    data : bytes or str
        The file's content.
    diameter_column, concentration_column : int or str
        1-based column number, or header name (whole or a part, any case).
    concentration_type : str
        One of :data:`CONCENTRATION_TYPES`.
    diameter_scale : float
        Metres per file diameter unit (1e-9 for nm). [m]
    concentration_scale : float
        Particles per m^3 per file concentration unit (1e6 for 1/cm^3). [1/m^3]
    header_line : int
        The file line holding the column names; 0 to find it, -1 for none.

    Returns
    -------
    SpectrumImport
        Bins in SI, numbers per bin, and a report of what was detected (with the table's
        description, :func:`driftdose.tables.describe_table`, under ``table``).

    Raises
    ------
    SpectrumError
        With a message naming the line where the content is at fault, and the wrong ``part``.

    Notes
    -----
    Per-bin numbers from dN/dlogDp: N_i = (dN/dlogDp)_i log10(e_{i+1}/e_i); from dN/dDp:
    N_i = (dN/dDp)_i (e_{i+1} - e_i), with edges e at the geometric means of neighbouring
    mid-points (common practice for mid-point spectra, e.g. Hinds 1999, section 4.2).

    Examples
    --------
    >>> s = parse_spectrum_csv("d_nm;dN\\n10;1000\\n20;2000\\n", "d_nm", "dN", "per_bin")
    >>> s.report["delimiter"], s.numbers
    ('semicolon', (1000000000.0, 2000000000.0))

    """
    if concentration_type not in CONCENTRATION_TYPES:
        raise SpectrumError(
            f"Unknown concentration type {concentration_type!r}; use one of "
            f"{', '.join(CONCENTRATION_TYPES)}."
        )
    if not (diameter_scale > 0.0 and concentration_scale > 0.0):
        raise SpectrumError("Unit factors must be positive.")
    text, bom, encoding, decode_notes = _decode(data)
    try:
        table = tables.read_table(text, header_line)
    except tables.TableError as exc:
        raise SpectrumError(exc.message, exc.line, exc.part) from None
    picked = []
    for spec, what in ((diameter_column, "diameter"), (concentration_column, "concentration")):
        try:
            picked.append(tables.pick_column(table, spec, what))
        except tables.TableError as exc:
            raise SpectrumError(exc.message, exc.line, f"{what}_column") from None
    d_col, c_col = picked
    for col, what in ((d_col, "diameter"), (c_col, "concentration")):
        head = [cells[col.index] for _, cells in table.rows[:50] if col.index < len(cells)]
        if not any(tables.cells.is_number(c) for c in head):
            holds = "text, not numbers" if any(head) else "no values"
            raise SpectrumError(
                f"Column {col.index + 1} {col.name!r} holds {holds}; choose the {what} column.",
                None,
                f"{what}_column",
            )
    if d_col.index == c_col.index:
        raise SpectrumError(
            "The diameter and concentration columns are the same.", None, "concentration_column"
        )
    if len(table.rows) > MAX_ROWS:
        raise SpectrumError(
            f"more than {MAX_ROWS} data rows; reduce the file.", table.rows[MAX_ROWS][0]
        )
    diam_rows = _values(table, d_col, "diameter", "diameter_column")
    conc_rows = _values(table, c_col, "concentration", "concentration_column")
    rows: list[tuple[int, float, float]] = []
    for (line, d), (_, c) in zip(diam_rows, conc_rows, strict=True):
        if d <= 0.0:
            raise SpectrumError(f"diameter {d:g} must be positive.", line)
        if c < 0.0:
            raise SpectrumError(f"concentration {c:g} must not be negative.", line)
        if rows:
            prev_line, prev_d, _ = rows[-1]
            if d == prev_d:
                raise SpectrumError(
                    f"diameter {d:g} repeats the one on line {prev_line}; each size bin must "
                    "appear once.",
                    line,
                )
            if d < prev_d:
                raise SpectrumError(
                    f"diameter {d:g} is smaller than {prev_d:g} on line {prev_line}; sort the "
                    "rows by increasing diameter.",
                    line,
                )
        rows.append((line, d, c))
    if len(rows) == 1:
        raise SpectrumError(
            "only one data row: at least two sizes are needed to define size bins.", rows[0][0]
        )

    diam = [d * diameter_scale for _, d, _ in rows]
    edges = bin_edges(diam)
    numbers = []
    for i, (_, _, c) in enumerate(rows):
        if concentration_type == "per_bin":
            n = c * concentration_scale
        elif concentration_type == "dN/dlogDp":
            n = c * concentration_scale * math.log10(edges[i + 1] / edges[i])
        else:  # dN/dDp, per file diameter unit
            n = c * concentration_scale / diameter_scale * (edges[i + 1] - edges[i])
        numbers.append(n)
    comma = table.decimal == "comma" or any(
        "," in table.rows[k][1][j] for k in range(len(rows)) for j in (d_col.index, c_col.index)
    )
    notes = list(decode_notes) + [n for n in table.notes if "byte-order" not in n]
    if bom:
        notes.insert(len(decode_notes), "A byte-order mark at the start was ignored.")
    if comma:
        notes.append("Decimal commas were read as decimal points.")
    described = tables.describe_table(table)
    above = rows[0][0] - 1 - (table.header_line is not None) - (table.units_line is not None)
    report = {
        "delimiter": table.delimiter,
        "decimal_comma": comma,
        "bom": bom,
        "encoding": encoding,
        "header": list(table.header) if table.header is not None else None,
        "header_line": table.header_line,
        "rows": len(rows),
        "first_line": rows[0][0],
        "last_line": rows[-1][0],
        "skipped_lines": above + table.skipped,
        "concentration_type": concentration_type,
        "columns": {"diameter": d_col.index + 1, "concentration": c_col.index + 1},
        "notes": notes,
        "table": described,
    }
    return SpectrumImport(tuple(diam), tuple(numbers), edges, report)
