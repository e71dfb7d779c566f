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


def _decode(data: bytes | str) -> tuple[str, bool, str]:
    """Return (text, had_bom, encoding) or raise for empty, large or binary content."""
    if isinstance(data, str):
        size = len(data.encode("utf-8", "surrogatepass"))
        raw = None
    elif isinstance(data, bytes | bytearray):
        size = len(data)
        raw = bytes(data)
    else:
        raise SpectrumError("The spectrum must be given as text.")
    if size > MAX_BYTES:
        raise SpectrumError(
            f"The file is {size / 1048576:.1f} MB; at most 5 MB can be imported. Export only "
            "the diameter and concentration columns, or fewer rows."
        )
    if size == 0:
        raise SpectrumError("The file is empty.")
    if raw is not None:
        if b"\x00" in raw:
            raise SpectrumError(_nul_message(raw[:4096:2].count(0), raw[1:4096:2].count(0)))
        try:
            text, encoding = raw.decode("utf-8"), "utf-8"
        except UnicodeDecodeError:
            text, encoding = raw.decode("cp1252", errors="replace"), "cp1252"
    else:
        text, encoding = data, "text"
        if "\x00" in text:
            raise SpectrumError(
                _nul_message(text[:4096:2].count("\x00"), text[1:4096:2].count("\x00"))
            )
    bom = text.startswith("\ufeff")
    if bom:
        text = text[1:]
    control = sum(1 for ch in text[:65536] if ord(ch) < 32 and ch not in "\t\r\n\f")
    if control > max(2, len(text[:65536]) // 100):
        raise SpectrumError(
            "The file looks binary (many control characters); export it as plain text CSV."
        )
    if not text.strip():
        raise SpectrumError("The file contains no text.")
    return text, bom, encoding


def _nul_message(even: int, odd: int) -> str:
    """Explain NUL characters: UTF-16 text without a byte-order mark, or a binary file."""
    if max(even, odd) > 10 * (min(even, odd) + 1):  # one byte in two is NUL: UTF-16
        return (
            "The file looks like UTF-16 text without a byte-order mark; save it as UTF-8 "
            "(or plain text) CSV."
        )
    return "The file looks binary (it contains NUL characters); export it as plain text CSV."


def _to_number(cell: str, decimal_comma: bool) -> float | None:
    """Parse one cell, or return None if it is not a number."""
    s = cell.strip().strip('"').strip().replace("\u2212", "-").replace("\u00a0", "")
    if not s:
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
    text, bom, encoding = _decode(data)
    lines = text.splitlines()
    for number, line_text in enumerate(lines, start=1):
        if len(line_text) > MAX_LINE:
            raise SpectrumError(
                f"this line is {len(line_text):,} characters long; at most {MAX_LINE:,} can be "
                "read. Each line should hold one size bin.",
                number,
            )
    delim, delim_name = _detect_delimiter(lines)
    decimal_comma_allowed = delim != ","

    reader = csv.reader(io.StringIO(text, newline=""), delimiter=delim)
    header: list[str] | None = None
    i_d = i_c = -1
    rows: list[tuple[int, float, float]] = []
    skipped = 0
    used_decimal_comma = False
    first_row = True
    for cells in _guarded(reader):
        line = reader.line_num
        if not cells or all(not c.strip() for c in cells) or cells[0].lstrip().startswith("#"):
            skipped += 1
            continue
        if first_row:
            first_row = False
            by_number = all(_is_number_spec(x) for x in (diameter_column, concentration_column))
            if by_number:
                idx = [
                    _column_index(x, None, "column")
                    for x in (diameter_column, concentration_column)
                ]
                looked = [cells[i] for i in idx if i < len(cells)]
            else:
                looked = cells
            numeric = [_to_number(c, decimal_comma_allowed) is not None for c in looked]
            if not all(numeric):
                header = cells
                i_d = _column_index(diameter_column, header, "diameter")
                i_c = _column_index(concentration_column, header, "concentration")
                if i_d == i_c:
                    raise SpectrumError("The diameter and concentration columns are the same.")
                continue
            i_d = _column_index(diameter_column, None, "diameter")
            i_c = _column_index(concentration_column, None, "concentration")
            if i_d == i_c:
                raise SpectrumError("The diameter and concentration columns are the same.")
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
            v = _to_number(cell, decimal_comma_allowed)
            if v is None:
                raise SpectrumError(
                    f"the {what} cell {cell.strip()[:30]!r} (column {idx + 1}) is not a number.",
                    line,
                )
            if not math.isfinite(v):
                raise SpectrumError(
                    f"the {what} cell {cell.strip()[:30]!r} is not a finite number.", line
                )
            if "," in cell and _DECIMAL_COMMA.match(cell.strip().strip('"').strip()):
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
    notes = []
    if bom:
        notes.append("A byte-order mark at the start was ignored.")
    if used_decimal_comma:
        notes.append("Decimal commas were read as decimal points.")
    if skipped:
        notes.append(f"{skipped} blank or comment line(s) were skipped.")
    if encoding == "cp1252":
        notes.append("The file is not UTF-8; it was read as Windows-1252.")
    report = {
        "delimiter": delim_name,
        "decimal_comma": used_decimal_comma,
        "bom": bom,
        "encoding": encoding,
        "header": [h.strip() for h in header] if header is not None else None,
        "rows": len(rows),
        "first_line": rows[0][0],
        "last_line": rows[-1][0],
        "skipped_lines": skipped,
        "concentration_type": concentration_type,
        "notes": notes,
    }
    return SpectrumImport(tuple(diam), tuple(numbers), edges, report)
