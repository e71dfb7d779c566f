"""The measured-spectrum inputs that several calculations share, declared once.

The deposition calculation (and burden and uncertainty, which take its aerosol) and the
sampling calculation read a measured size spectrum from the same CSV fields with the same
importer, so the page, the command line and the messages agree. Each calculation decides with
its own choice field when the spectrum applies: :func:`spectrum_fields` returns the
declarations bound to that field.
"""

from __future__ import annotations

import copy
import re
from collections.abc import Mapping
from dataclasses import replace
from functools import lru_cache
from typing import Any

from .. import tables
from ..compose.aerosol import Aerosol, aerosol_from_spectrum
from ..diameters import ParticleDescription
from ..spectrum_import import MAX_BYTES, SpectrumError, SpectrumImport, parse_spectrum_csv
from .fields import Field, FieldError
from .particle_air_fields import DIAMETER_TYPE_CHOICES
from .reply import text_result
from .units import to_si

__all__ = [
    "CONCENTRATION_TYPES",
    "CSV_INPUTS",
    "D_RANGE",
    "NUMBER_MAX",
    "NUMBER_MIN",
    "SPECTRUM_DIAMETER_TYPE",
    "SPECTRUM_FIELD_NAMES",
    "describe_spectrum_file",
    "import_row",
    "import_spectrum",
    "import_warnings",
    "spectrum_aerosol",
    "spectrum_fields",
]

D_RANGE = (1e-9, 100e-6)
"""Diameters the deposition models cover, and so the accepted spectrum range [m]."""
NUMBER_MAX = 1e15
"""Largest accepted total number concentration, 1e9 per cm³ [1/m³]; above it an input is
taken as a mistake."""
MAX_HEADER_LINE = 1_000_000
"""Largest header line accepted (a 5 MB file has fewer lines)."""
NUMBER_MIN = 1.0
"""Smallest accepted total number concentration [1/m³]; below it doses fall under what a
number can hold."""

SPECTRUM_DIAMETER_TYPE = Field(
    "spectrum_diameter_type",
    "Diameters in the file are",
    "choice",
    "volume_equivalent",
    choices=DIAMETER_TYPE_CHOICES,
    help="The instrument's diameter: mobility for differential mobility sizers, "
    "aerodynamic for impactors and time-of-flight sizers, optical for light-scattering "
    "counters.",
)
"""Which equivalent diameter a measured spectrum's sizes are (also the size channels of a
logged shift)."""

CONCENTRATION_TYPES: tuple[tuple[str, str], ...] = (
    ("per_bin", "per size bin (dN)"),
    ("dN/dlogDp", "per log10 of diameter (dN/dlogDp)"),
    ("dN/dDp", "per unit diameter (dN/dDp)"),
)
"""How a spectrum's concentration column is given (the shift's spectrum offers the same)."""

_FIELDS: tuple[Field, ...] = (
    Field(
        "csv_text",
        "Spectrum CSV file",
        "data",
        None,
        required=False,
        help="Plain text table, one row per size; commas, semicolons, tabs or blanks; notes "
        "above the header are set aside; at most 5 MB.",
        extra={"max_bytes": MAX_BYTES, "accept": ".csv,.txt,.tsv", "describe": "spectrum"},
    ),
    Field(
        "csv_header_line",
        "Header is on line",
        "integer",
        0,
        minimum=-1,
        maximum=MAX_HEADER_LINE,
        required=False,
        help="0: found in the file (the line is shown under the file); -1: the file has no "
        "header row.",
        extra={"file": "csv_text"},
    ),
    Field(
        "csv_diameter_column",
        "Diameter column",
        "text",
        "1",
        required=False,
        help="Picked from the file's header; a name, part of one, or a number also works "
        "in a link or on the command line.",
        extra={"max_length": 80, "picker": "csv_text"},
    ),
    Field(
        "csv_concentration_column",
        "Concentration column",
        "text",
        "2",
        required=False,
        extra={"max_length": 80, "picker": "csv_text"},
    ),
    Field(
        "csv_concentration_type",
        "Concentration is given",
        "choice",
        "dN/dlogDp",
        choices=CONCENTRATION_TYPES,
    ),
    Field(
        "csv_diameter_unit",
        "Diameter unit in the file",
        "choice",
        "nm",
        choices=(("nm", "nm"), ("um", "µm"), ("m", "m")),
    ),
    SPECTRUM_DIAMETER_TYPE,
    Field(
        "csv_concentration_unit",
        "Concentration unit in the file",
        "choice",
        "1/cm3",
        choices=(("1/cm3", "particles per cm³"), ("1/m3", "particles per m³")),
        help="For dN/dDp, per diameter unit of the file (e.g. per cm³ per nm).",
    ),
)

CSV_INPUTS: dict[str, str] = {
    "file": "csv_text",
    "header_line": "csv_header_line",
    "diameter_column": "csv_diameter_column",
    "concentration_column": "csv_concentration_column",
    "concentration_type": "csv_concentration_type",
    "diameter_unit": "csv_diameter_unit",
    "concentration_unit": "csv_concentration_unit",
}
"""The input holding each part of an import, in the fields of :func:`spectrum_fields`."""
_BLAMED = ("file", "header_line", "diameter_column", "concentration_column")
"""The parts of an import that can be wrong, each blamed on its own input."""
_PART_FIELD = {part: CSV_INPUTS[part] for part in _BLAMED}

SPECTRUM_FIELD_NAMES: tuple[str, ...] = tuple(f.name for f in _FIELDS)
"""Names of the spectrum inputs, in the order :func:`spectrum_fields` gives them."""


def spectrum_fields(source: str, value: str = "csv") -> tuple[Field, ...]:
    """The spectrum inputs, each applying while the choice ``source`` is ``value``.

    Parameters
    ----------
    source : str
        Name of the calculation's choice field that selects the measured spectrum.
    value : str
        The value of that choice for which the spectrum inputs apply.

    Returns
    -------
    tuple of Field
        The declarations named in :data:`SPECTRUM_FIELD_NAMES`, in that order.
    """
    return tuple(replace(f, applies=(source, (value,))) for f in _FIELDS)


@lru_cache(maxsize=2)
def _parse_kept(
    text: str,
    diameter_column: str,
    concentration_column: str,
    concentration_type: str,
    d_scale: float,
    c_scale: float,
    header_line: int,
) -> SpectrumImport:
    """:func:`parse_spectrum_csv` of the last two files and mappings, kept: an edit of any
    other input (a flow, a density) reads the same file again without parsing it."""
    return parse_spectrum_csv(
        text,
        diameter_column,
        concentration_column,
        concentration_type,
        d_scale,
        c_scale,
        header_line,
    )


def import_spectrum(
    v: dict[str, Any], inputs: Mapping[str, str] = CSV_INPUTS, shape_only: bool = False
) -> tuple[SpectrumImport, dict[str, Any]]:
    """Read the spectrum from the validated CSV inputs, as given in the file.

    Parameters
    ----------
    v : dict
        Validated inputs holding the fields of :func:`spectrum_fields` (units as the file's
        unit codes).
    inputs : mapping
        The input holding each part of the import (keys of :data:`CSV_INPUTS`); a calculation
        with its own names for them (the shift's spectrum shape) gives its own. Without a
        ``header_line`` input the header is found in the file; without a
        ``concentration_unit`` the concentrations are read per cm³.
    shape_only : bool
        True when only the spectrum's shape is used (it is scaled to a measurement
        afterwards): its total is then not checked against ``NUMBER_MIN``–``NUMBER_MAX``.

    Returns
    -------
    tuple
        The imported spectrum (diameters [m] as the file gives them, with no conversion to
        another diameter type; particles per bin [1/m³]) and the import report.

    Raises
    ------
    FieldError
        On the input that is wrong: the header line's input for a header line that does not
        hold names, the column's input for a column not found (or a part of a name that
        matches several), else the file's input for a missing, blank or unreadable file,
        diameters outside :data:`D_RANGE`, or a total concentration outside
        ``NUMBER_MIN``–``NUMBER_MAX``.
    """
    file = inputs["file"]
    text = v.get(file)
    if text is None:
        raise FieldError(file, "Choose a CSV file with the measured spectrum.")
    if isinstance(text, str) and not text.strip():
        raise FieldError(
            file,
            f"The file is {'empty' if not text else 'blank'}. Choose a CSV file with the "
            "measured spectrum.",
        )
    if not isinstance(text, str):
        raise FieldError(file, "The spectrum must be sent as text.")
    d_scale = to_si(1.0, "length", v[inputs["diameter_unit"]])
    c_unit = v.get(inputs.get("concentration_unit", "")) or "1/cm3"
    c_scale = to_si(1.0, "number_concentration", c_unit)
    try:
        imported = _parse_kept(
            text,
            v.get(inputs["diameter_column"]) or "1",
            v.get(inputs["concentration_column"]) or "2",
            v.get(inputs["concentration_type"]) or "dN/dlogDp",
            d_scale,
            c_scale,
            v.get(inputs.get("header_line", "")) or 0,
        )
        imported = replace(imported, report=copy.deepcopy(imported.report))
    except SpectrumError as exc:
        blamed = inputs.get(exc.part, file) if exc.part in _BLAMED else file
        raise FieldError(blamed, str(exc)) from None
    if imported.diameters[0] < D_RANGE[0] * 0.999 or imported.diameters[-1] > D_RANGE[1] * 1.001:
        raise FieldError(
            file,
            f"Diameters run from {imported.diameters[0] * 1e9:.3g} nm to "
            f"{imported.diameters[-1] * 1e6:.3g} µm; the models cover 1 nm to 100 µm. Check "
            "the diameter unit.",
        )
    total = sum(imported.numbers)
    if total <= 0.0:
        raise FieldError(file, "All concentrations in the spectrum are zero.")
    if total < NUMBER_MIN and not shape_only:
        raise FieldError(
            file,
            "The spectrum adds up to less than 10⁻⁶ particles per cm³ (1 per m³); check the "
            "concentration unit and type.",
        )
    if total > NUMBER_MAX and not shape_only:
        raise FieldError(
            file,
            "The spectrum adds up to more than 10⁹ particles per cm³; check the "
            "concentration unit and type.",
        )
    return imported, imported.report


def import_row(report: dict[str, Any]) -> dict[str, Any]:
    """The result row saying what a spectrum import read: rows, file lines and delimiter.

    Parameters
    ----------
    report : dict
        The import report of :func:`import_spectrum`.

    Returns
    -------
    dict
        A text result row.
    """
    return text_result(
        "Spectrum imported",
        f"{report['rows']} rows (lines {report['first_line']}–{report['last_line']}), "
        f"{report['delimiter']}-separated",
    )


def import_warnings(report: dict[str, Any] | None) -> list[str]:
    """The reply's warnings from a spectrum import's notes (none without an import).

    Parameters
    ----------
    report : dict or None
        The import report of :func:`import_spectrum`, None for lognormal modes.

    Returns
    -------
    list of str
        One warning per note, marked as the import's.
    """
    return [] if report is None else [f"CSV import: {n}" for n in report["notes"]]


def spectrum_aerosol(
    imported: SpectrumImport,
    diameter_type: str,
    desc: ParticleDescription,
    field: str = "csv_text",
) -> Aerosol:
    """The aerosol of an imported spectrum in the models' diameters.

    Parameters
    ----------
    imported : SpectrumImport
        The spectrum as :func:`import_spectrum` read it (diameters [m], particles per bin
        [1/m³]).
    diameter_type : str
        What the file's diameters are (a key of ``diameters.DIAMETER_TYPES``).
    desc : ParticleDescription
        The particles' density [kg/m³], shape factor and density basis.
    field : str
        The file's input, blamed when two bins fall on one size after the conversion.

    Returns
    -------
    Aerosol
        The spectrum as the deposition models take it.
    """
    try:
        return aerosol_from_spectrum(imported.diameters, imported.numbers, diameter_type, desc)
    except ValueError:
        raise FieldError(
            field,
            "Two bins of the spectrum fall on the same size after conversion to the models' "
            "diameter; merge them.",
        ) from None


_DIAMETER_UNITS = ("nm", "um", "m")
_CONCENTRATION_UNITS = ("1/cm3", "1/m3")
_SIZE_NAME = re.compile(r"(^|[^a-z])(d_?p|dm|da|diam|size|gr(ö|oe)(ß|ss)e|midpoint|mid)", re.I)


def _suggest(table: tables.Table) -> tuple[int | None, int | None]:
    """The columns a spectrum most likely uses: the diameter (a length unit, else a size
    name, else the first column of numbers) and the concentration (a dN/dlogDp or dN/dDp
    name, else a number concentration unit, else the next column of numbers)."""
    numeric = [c for c in table.columns if c.kind == "number"]

    def first(rule: Any, among: list[tables.Column]) -> int | None:
        return next((c.index for c in among if rule(c)), None)

    d = first(lambda c: c.unit.quantity == "length", numeric)
    if d is None:
        d = first(lambda c: bool(_SIZE_NAME.search(c.unit.label)), numeric)
    if d is None and numeric:
        d = numeric[0].index
    rest = [c for c in numeric if c.index != d]
    c = first(lambda c: c.unit.distribution is not None, rest)
    if c is None:
        c = first(lambda c: c.unit.quantity == "number_concentration", rest)
    if c is None:
        c = first(lambda c: d is None or c.index > d, rest)
    return d, c


DESCRIBE_LINES = 2000
"""Lines of a longer file that its description for the page examines."""


def _nth_line_end(text: str, n: int) -> int:
    """The position just after the ``n``-th line break of ``text``."""
    at = -1
    for _ in range(n):
        at = text.index("\n", at + 1)
    return at + 1


def describe_spectrum_file(text: Any, header_line: Any = 0) -> dict[str, Any]:
    """What the page shows about a spectrum file before any calculation, and how it fills
    the column pickers and unit choices.

    Parameters
    ----------
    text : str
        The decoded file text.
    header_line : int
        The ``csv_header_line`` input: 0 to find the header, -1 for none, else its line.

    Returns
    -------
    dict
        ``{"ok": true, "table": <tables.describe_table reply>, "pickers": {field: {"options":
        [{"value", "label"}], "suggest": value or null, "fills": {value: {field: choice}}}}}``
        (for a file of more than :data:`DESCRIBE_LINES` lines, only those are examined and the
        table says so: ``examined_lines``, ``total_lines``)
        for ``csv_diameter_column`` and ``csv_concentration_column`` (an option's value is
        the header as written when it names one column, else the column number; ``fills``
        are the unit and concentration-type choices its header states); or ``{"ok": false,
        "field", "message", "line"}`` with the input that is wrong.
    """
    try:
        line = int(header_line or 0)
    except (TypeError, ValueError):
        line = 0
    total = None
    if isinstance(text, str) and text.count("\n", 0, 4 * 1024 * 1024) >= DESCRIBE_LINES:
        # a long file: its first lines show the layout and columns quickly; the calculation
        # reads every line
        total = text.count("\n") + (not text.endswith("\n"))
        text = text[: _nth_line_end(text, DESCRIBE_LINES)]
    try:
        table = tables.read_table(text, max(line, -1))
    except tables.TableError as exc:
        field = _PART_FIELD.get(exc.part, "csv_text")
        return {"ok": False, "field": field, "message": str(exc), "line": exc.line}
    options = []
    d_fills: dict[str, dict[str, str]] = {}
    c_fills: dict[str, dict[str, str]] = {}
    values: dict[int, str] = {}
    for col in table.columns:
        if col.kind == "empty":
            continue
        value = str(col.index + 1)
        if table.header is not None:
            try:
                if tables.pick_column(table, col.name).index == col.index:
                    value = col.name
            except tables.TableError:
                pass
        values[col.index] = value
        options.append({"value": value, "label": f"{col.index + 1}: {col.name}"})
        if col.unit.code in _DIAMETER_UNITS:
            d_fills[value] = {"csv_diameter_unit": col.unit.code}
        fill = {}
        if col.unit.code in _CONCENTRATION_UNITS:
            fill["csv_concentration_unit"] = col.unit.code
        if col.unit.distribution:
            fill["csv_concentration_type"] = col.unit.distribution
        if fill:
            c_fills[value] = fill
    d, c = _suggest(table)
    described = tables.describe_table(table)
    if total is not None:
        described["examined_lines"] = DESCRIBE_LINES
        described["total_lines"] = total
    return {
        "ok": True,
        "table": described,
        "pickers": {
            "csv_diameter_column": {
                "options": options,
                "suggest": values.get(d) if d is not None else None,
                "fills": d_fills,
            },
            "csv_concentration_column": {
                "options": options,
                "suggest": values.get(c) if c is not None else None,
                "fills": c_fills,
            },
        },
    }
