"""Import of measured size spectra from plain CSV text with a user-chosen column mapping.

Interface: :func:`parse_spectrum_csv` returns a :class:`SpectrumImport` (bin mid-points in m,
particles per bin in 1/m^3, and a report of what was detected) or raises
:class:`SpectrumError` with a plain message and, where the problem is in the content, the
line number.

The format is generic: any text table with one row per size, a diameter column and a
concentration column, separated by commas, semicolons or tabs (detected and reported).
Concentrations may be given per bin, as dN/dlogDp or as dN/dDp. A byte-order mark, decimal
commas (with semicolon or tab separators, or inside quoted cells), blank lines and lines
starting with ``#`` are accepted and reported. Refused with a message: empty or binary
content, more than 5 MB, no recognisable separator, non-numeric cells, negative, zero,
unsorted or repeated diameters, negative concentrations, and fewer than two data rows.

Unit names are not interpreted here: the caller (the API boundary) passes the factors that
turn the file's numbers into SI (``diameter_scale`` to m, ``concentration_scale`` to
1/m^3); for dN/dDp the value is read per file diameter unit and divided by
``diameter_scale``.
"""

from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Iterator
from dataclasses import dataclass, field
from typing import Any

from . import textfile
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

MAX_LINE = 100_000
"""Longest line accepted, in characters (the csv module refuses cells above 131 072)."""

CONCENTRATION_TYPES = ("per_bin", "dN/dlogDp", "dN/dDp")
"""How the concentration column is expressed: particles per bin, per unit log10 of the
diameter, or per unit diameter."""

_DELIMITERS = ((";", "semicolon"), ("\t", "tab"), (",", "comma"))
_DECIMAL_COMMA = re.compile(r"^[+-]?\d*,\d+([eE][+-]?\d+)?$")
_AMBIGUOUS = re.compile(r"^[+-]?[1-9]\d{0,2},\d{3}$")
"""A number that reads as a thousands group or a decimal comma: ``1,000``."""
_SEP_LINE = re.compile(r'^\s*"?sep=(.)"?\s*$', re.IGNORECASE)
"""A spreadsheet's first line naming the separator: ``sep=;``."""


class SpectrumError(ValueError):
    """A CSV import problem; ``line`` is the 1-based line number where it lies, if any."""

    def __init__(self, message: str, line: int | None = None) -> None:
        super().__init__(message if line is None else f"Line {line}: {message}")
        self.message = message
        self.line = line


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
    """Return (text, had_bom, encoding, notes) or raise for empty, large or binary content.

    Bytes go through the shared decoder (:func:`driftdose.textfile.decode_text`); text (what
    the page sends after that same decoder read the file) is limited to as many characters
    as the file limit has bytes, which every file within the limit satisfies.
    """
    notes: list[str] = []
    if isinstance(data, str):
        if len(data) > MAX_BYTES:
            raise SpectrumError(
                f"The text is {len(data):,} characters long; at most {MAX_BYTES:,} (a 5 MB "
                "file) can be imported. Export only the diameter and concentration columns, "
                "or fewer rows."
            )
        if not data:
            raise SpectrumError("The file is empty.")
        if "\x00" in data:
            head = data[:4096]
            raise SpectrumError(
                textfile.nul_message(head[::2].count("\x00"), head[1::2].count("\x00"))
            )
        text, bom, encoding = data, False, "text"
    elif isinstance(data, bytes | bytearray):
        try:
            decoded = textfile.decode_text(data, MAX_BYTES)
        except textfile.TextFileError as exc:
            extra = ""
            if len(data) > MAX_BYTES:
                extra = " Export only the diameter and concentration columns, or fewer rows."
            raise SpectrumError(exc.message + extra) from None
        text, bom, encoding = decoded.text, decoded.bom, decoded.encoding
        notes = [n for n in decoded.notes if "byte-order mark at the start" not in n]
    else:
        raise SpectrumError("The spectrum must be given as text.")
    if text.startswith("\ufeff"):
        text, bom = text[1:], True
    control = sum(1 for ch in text[:65536] if ord(ch) < 32 and ch not in "\t\r\n\f")
    if control > max(2, len(text[:65536]) // 100):
        raise SpectrumError(
            "The file looks binary (many control characters); export it as plain text CSV."
        )
    if not text.strip():
        raise SpectrumError("The file contains no text.")
    return text, bom, encoding, notes


def _to_number(cell: str, decimal_comma: bool) -> float | None:
    """Parse one cell, or return None if it is not a number."""
    s = cell.strip().strip('"').strip().replace("\u2212", "-").replace("\u00a0", "")
    if not s or "_" in s:  # float() reads "1_000", a person's file never means that
        return None
    if _DECIMAL_COMMA.match(s) and (decimal_comma or "." not in s):
        s = s.replace(",", ".")
    try:
        value = float(s)
    except ValueError:
        return None
    return value


def _guarded(reader: Any) -> Iterator[list[str]]:
    """Rows of a csv reader, its own errors turned into messages with the line number."""
    while True:
        try:
            cells = next(reader)
        except StopIteration:
            return
        except csv.Error as exc:
            raise SpectrumError(
                f"the line cannot be read as CSV ({exc}).", reader.line_num
            ) from None
        yield cells


def _is_skippable(line: str) -> bool:
    s = line.strip()
    return not s or s.startswith("#")


def _detect_delimiter(lines: list[str]) -> tuple[str, str]:
    """Pick the separator giving at least two consistent columns with the most numbers."""
    sample = [ln for ln in lines if not _is_skippable(ln)][:50]
    best: tuple[int, int, str, str] | None = None
    for delim, name in _DELIMITERS:
        rows = list(csv.reader(sample, delimiter=delim))
        counts = [len(r) for r in rows]
        if not counts:
            continue
        mode = max(set(counts), key=counts.count)
        consistent = counts.count(mode)
        if mode < 2 or consistent < 0.5 * len(counts):
            continue
        numeric = sum(
            1 for r in rows for c in r if _to_number(c, decimal_comma=delim != ",") is not None
        )
        score = (numeric, consistent, delim, name)
        if best is None or score[:2] > best[:2]:
            best = score
    if best is None:
        raise SpectrumError(
            "No column separator found: expected at least two columns separated by commas, "
            "semicolons or tabs on every data line."
        )
    return best[2], best[3]


def _find_columns(
    table: list[tuple[int, list[str]]], d_spec: Any, c_spec: Any, decimal_comma: bool
) -> tuple[list[str] | None, int, int, int]:
    """Find the header row and the two columns; return (header, i_d, i_c, first data index).

    Columns given by name: the header is the first row holding both names, and rows above
    it are notes (an instrument's metadata). Given by number: rows before the first one with
    a number in either chosen column are notes and the header (the last of them).
    """
    if not table:
        raise SpectrumError("The file has no data rows (only a header, blank or comment lines).")
    by_number = all(_is_number_spec(x) for x in (d_spec, c_spec))
    if by_number:
        idx = [_column_index(x, None, "column") for x in (d_spec, c_spec)]
        start = 0
        for start, (_, cells) in enumerate(table):  # noqa: B007 - start is used below
            looked = [cells[i] for i in idx if i < len(cells)]
            if any(_to_number(c, decimal_comma) is not None for c in looked):
                break
        else:
            start = len(table)
        header = table[start - 1][1] if start else None
    else:
        wanted = [
            str(x).strip().strip('"').strip().lower()
            for x in (d_spec, c_spec)
            if not _is_number_spec(x)
        ]
        start = 0
        for i, (_, cells) in enumerate(table):
            names = [h.strip().strip('"').strip().lower() for h in cells]
            if all(w in names for w in wanted):
                start = i + 1
                break
        if start:
            header = table[start - 1][1]
        else:  # no row names both: the first row's own message says what is there
            cells = table[0][1]
            numeric = all(_to_number(c, decimal_comma) is not None for c in cells)
            header, start = (None, 0) if numeric else (cells, 1)
    i_d = _column_index(d_spec, header, "diameter")
    i_c = _column_index(c_spec, header, "concentration")
    if i_d == i_c:
        raise SpectrumError("The diameter and concentration columns are the same.")
    return header, i_d, i_c, start


def _shows_decimal_commas(data: list[tuple[int, list[str]]], columns: tuple[int, ...]) -> bool:
    """Tell whether the file's numbers settle ``1,000`` as a decimal comma: some cell has a
    decimal comma that cannot be a thousands group (``12,5``, ``0,125``) and none a point."""
    comma = False
    for _, cells in data:
        for i in columns:
            if i >= len(cells):
                continue
            plain = cells[i].strip().strip('"').strip()
            if "." in plain:
                return False
            if _DECIMAL_COMMA.match(plain) and not _AMBIGUOUS.match(plain):
                comma = True
    return comma


def _is_number_spec(spec: Any) -> bool:
    """Tell whether a column is given by number (int or digit string)."""
    if isinstance(spec, bool):
        return False
    return isinstance(spec, int) or (isinstance(spec, str) and spec.strip().isdigit())


def _column_index(spec: Any, header: list[str] | None, label: str) -> int:
    """Resolve a column given by 1-based number or by header name to a 0-based index."""
    if isinstance(spec, bool):
        spec = str(spec)
    if isinstance(spec, int):
        if spec < 1:
            raise SpectrumError(f"The {label} column number must be 1 or more.")
        return spec - 1
    if not isinstance(spec, str) or not spec.strip():
        raise SpectrumError(f"Give the {label} column by its header name or its number.")
    s = spec.strip()
    if s.isdigit():
        return _column_index(int(s), header, label)
    if header is None:
        raise SpectrumError(
            f"The file has no header row, so the {label} column {s!r} cannot be found by "
            "name; give its number (1 for the first column)."
        )
    names = [h.strip().strip('"').strip().lower() for h in header]
    wanted = s.strip('"').strip().lower()  # the same trimming as the header's names
    if wanted in names:
        return names.index(wanted)
    shown = ", ".join(repr(h.strip()) for h in header[:12])
    raise SpectrumError(f"No column named {s!r} for {label}; the header has {shown}.")


def parse_spectrum_csv(
    data: bytes | str,
    diameter_column: int | str = 1,
    concentration_column: int | str = 2,
    concentration_type: str = "dN/dlogDp",
    diameter_scale: float = 1e-9,
    concentration_scale: float = 1e6,
) -> SpectrumImport:
    """Read a measured spectrum from CSV text.

    Parameters
    ----------
    data : bytes or str
        The file's content.
    diameter_column, concentration_column : int or str
        1-based column number, or header name (case-insensitive).
    concentration_type : str
        One of :data:`CONCENTRATION_TYPES`.
    diameter_scale : float
        Metres per file diameter unit (1e-9 for nm). [m]
    concentration_scale : float
        Particles per m^3 per file concentration unit (1e6 for 1/cm^3). [1/m^3]

    Returns
    -------
    SpectrumImport
        Bins in SI, numbers per bin, and a report of what was detected.

    Raises
    ------
    SpectrumError
        With a message naming the line where the content is at fault.

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
    lines = text.splitlines()
    for number, line_text in enumerate(lines, start=1):
        if len(line_text) > MAX_LINE:
            raise SpectrumError(
                f"this line is {len(line_text):,} characters long; at most {MAX_LINE:,} can be "
                "read. Each line should hold one size bin.",
                number,
            )
    sep_line = _SEP_LINE.match(lines[0]) if lines else None
    first_line = lines[0] if lines else ""
    if sep_line:  # a spreadsheet's "sep=;" first line names the separator
        delim = sep_line.group(1)
        names = dict(_DELIMITERS)
        if delim not in names:
            raise SpectrumError(
                f"the first line names the separator {delim!r}; only commas, semicolons and "
                "tabs are read.",
                1,
            )
        delim_name = names[delim]
        text = text[len(lines[0]) :].lstrip("\r").removeprefix("\n")
        text = "\n" + text  # keep the line numbers of the file
        lines = ["", *lines[1:]]
    else:
        delim, delim_name = _detect_delimiter(lines)
    decimal_comma_allowed = delim != ","

    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delim)
    table: list[tuple[int, list[str]]] = []
    skipped = -1 if sep_line else 0
    for cells in _guarded(reader):
        if not cells or all(not c.strip() for c in cells) or cells[0].lstrip().startswith("#"):
            skipped += 1
        else:
            table.append((reader.line_num, cells))
        if len(table) > MAX_ROWS + 100:
            break  # the row limit is reported below, with its line

    header, i_d, i_c, start = _find_columns(
        table, diameter_column, concentration_column, decimal_comma_allowed
    )
    metadata = start - (header is not None)  # lines of notes above the header
    data = table[start:]
    decimal_comma_file = _shows_decimal_commas(data, (i_d, i_c))
    rows: list[tuple[int, float, float]] = []
    used_decimal_comma = False
    for line, cells in data:
        need = max(i_d, i_c) + 1
        if len(cells) < need:
            raise SpectrumError(
                f"this row has {len(cells)} column(s) but column {need} is needed "
                f"(separator: {delim_name}).",
                line,
            )
        values = []
        for idx, what in ((i_d, "diameter"), (i_c, "concentration")):
            cell = cells[idx]
            plain = cell.strip().strip('"').strip()
            if _AMBIGUOUS.match(plain) and not decimal_comma_file:
                raise SpectrumError(
                    f"the {what} cell {plain!r} (column {idx + 1}) is ambiguous: one thousand "
                    "with a thousands separator, or one with a decimal comma? Write numbers "
                    "without a thousands separator, with a point or a comma for decimals.",
                    line,
                )
            v = _to_number(cell, decimal_comma_allowed)
            if v is None and not plain:
                raise SpectrumError(
                    f"the {what} cell (column {idx + 1}) is empty; fill the gap or remove the row.",
                    line,
                )
            if v is None:
                hint = ""
                if not rows:
                    hint = (
                        " If lines above the header hold notes, choose the columns by their "
                        "header names, or start those lines with #."
                    )
                raise SpectrumError(
                    f"the {what} cell {cell.strip()[:30]!r} (column {idx + 1}) is not a "
                    f"number.{hint}",
                    line,
                )
            if not math.isfinite(v):
                raise SpectrumError(
                    f"the {what} cell {cell.strip()[:30]!r} is not a finite number.", line
                )
            if "," in cell and _DECIMAL_COMMA.match(plain):
                used_decimal_comma = True
            values.append(v)
        d, c = values
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
        if len(rows) > MAX_ROWS:
            raise SpectrumError(f"more than {MAX_ROWS} data rows; reduce the file.", line)
    if not rows:
        raise SpectrumError("The file has no data rows (only a header, blank or comment lines).")
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
    notes = list(decode_notes)
    if bom:
        notes.append("A byte-order mark at the start was ignored.")
    if used_decimal_comma:
        notes.append("Decimal commas were read as decimal points.")
    if sep_line:
        notes.append(f"The first line {first_line.strip()!r} named the separator.")
    if metadata:
        notes.append(f"{metadata} line(s) of notes above the header were skipped.")
    if skipped:
        notes.append(f"{skipped} blank or comment line(s) were skipped.")
    report = {
        "delimiter": delim_name,
        "decimal_comma": used_decimal_comma,
        "bom": bom,
        "encoding": encoding,
        "header": [h.strip() for h in header] if header is not None else None,
        "rows": len(rows),
        "first_line": rows[0][0],
        "last_line": rows[-1][0],
        "skipped_lines": skipped + metadata,
        "concentration_type": concentration_type,
        "notes": notes,
    }
    return SpectrumImport(tuple(diam), tuple(numbers), edges, report)
