"""The measured-spectrum inputs that several calculations share, declared once.

The deposition calculation (and burden and uncertainty, which take its aerosol) and the
sampling calculation read a measured size spectrum from the same CSV fields with the same
importer, so the page, the command line and the messages agree. Each calculation decides with
its own choice field when the spectrum applies: :func:`spectrum_fields` returns the
declarations bound to that field.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from ..spectrum_import import MAX_BYTES, SpectrumError, SpectrumImport, parse_spectrum_csv
from .fields import Field, FieldError
from .particle_air_fields import DIAMETER_TYPE_CHOICES
from .units import to_si

__all__ = [
    "D_RANGE",
    "NUMBER_MAX",
    "NUMBER_MIN",
    "SPECTRUM_FIELD_NAMES",
    "import_spectrum",
    "spectrum_fields",
]

D_RANGE = (1e-9, 100e-6)
"""Diameters the deposition models cover, and so the accepted spectrum range [m]."""
NUMBER_MAX = 1e15
"""Largest accepted total number concentration, 1e9 per cm³ [1/m³]; above it an input is
taken as a mistake."""
NUMBER_MIN = 1.0
"""Smallest accepted total number concentration [1/m³]; below it doses fall under what a
number can hold."""

_FIELDS: tuple[Field, ...] = (
    Field(
        "csv_text",
        "Spectrum CSV file",
        "data",
        None,
        required=False,
        help="Plain text table, one row per size; commas, semicolons or tabs; at most 5 MB.",
        extra={"max_bytes": MAX_BYTES, "accept": ".csv,.txt,.tsv"},
    ),
    Field(
        "csv_diameter_column",
        "Diameter column (header name or number)",
        "text",
        "1",
        required=False,
        extra={"max_length": 80},
    ),
    Field(
        "csv_concentration_column",
        "Concentration column (header name or number)",
        "text",
        "2",
        required=False,
        extra={"max_length": 80},
    ),
    Field(
        "csv_concentration_type",
        "Concentration is given",
        "choice",
        "dN/dlogDp",
        choices=(
            ("per_bin", "per size bin (dN)"),
            ("dN/dlogDp", "per log10 of diameter (dN/dlogDp)"),
            ("dN/dDp", "per unit diameter (dN/dDp)"),
        ),
    ),
    Field(
        "csv_diameter_unit",
        "Diameter unit in the file",
        "choice",
        "nm",
        choices=(("nm", "nm"), ("um", "µm"), ("m", "m")),
    ),
    Field(
        "spectrum_diameter_type",
        "Diameters in the file are",
        "choice",
        "volume_equivalent",
        choices=DIAMETER_TYPE_CHOICES,
        help="The instrument's diameter: mobility for differential mobility sizers, "
        "aerodynamic for impactors and time-of-flight sizers, optical for light-scattering "
        "counters.",
    ),
    Field(
        "csv_concentration_unit",
        "Concentration unit in the file",
        "choice",
        "1/cm3",
        choices=(("1/cm3", "particles per cm³"), ("1/m3", "particles per m³")),
        help="For dN/dDp, per diameter unit of the file (e.g. per cm³ per nm).",
    ),
)

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


def import_spectrum(v: dict[str, Any]) -> tuple[SpectrumImport, dict[str, Any]]:
    """Read the spectrum from the validated CSV inputs, as given in the file.

    Parameters
    ----------
    v : dict
        Validated inputs holding the fields of :func:`spectrum_fields` (units as the file's
        unit codes).

    Returns
    -------
    tuple
        The imported spectrum (diameters [m] as the file gives them, with no conversion to
        another diameter type; particles per bin [1/m³]) and the import report.

    Raises
    ------
    FieldError
        On ``csv_text`` for a missing, blank or unreadable file, diameters outside
        :data:`D_RANGE`, or a total concentration outside ``NUMBER_MIN``–``NUMBER_MAX``.
    """
    text = v.get("csv_text")
    if text is None:
        raise FieldError("csv_text", "Choose a CSV file with the measured spectrum.")
    if isinstance(text, str) and not text.strip():
        raise FieldError(
            "csv_text",
            f"The file is {'empty' if not text else 'blank'}. Choose a CSV file with the "
            "measured spectrum.",
        )
    if not isinstance(text, str):
        raise FieldError("csv_text", "The spectrum must be sent as text.")
    d_scale = to_si(1.0, "length", v["csv_diameter_unit"])
    c_scale = to_si(1.0, "number_concentration", v["csv_concentration_unit"])
    try:
        imported = parse_spectrum_csv(
            text,
            v.get("csv_diameter_column") or "1",
            v.get("csv_concentration_column") or "2",
            v["csv_concentration_type"],
            d_scale,
            c_scale,
        )
    except SpectrumError as exc:
        raise FieldError("csv_text", str(exc)) from None
    if imported.diameters[0] < D_RANGE[0] * 0.999 or imported.diameters[-1] > D_RANGE[1] * 1.001:
        raise FieldError(
            "csv_text",
            f"Diameters run from {imported.diameters[0] * 1e9:.3g} nm to "
            f"{imported.diameters[-1] * 1e6:.3g} µm; the models cover 1 nm to 100 µm. Check "
            "the diameter unit.",
        )
    if sum(imported.numbers) <= 0.0:
        raise FieldError("csv_text", "All concentrations in the spectrum are zero.")
    if sum(imported.numbers) < NUMBER_MIN:
        raise FieldError(
            "csv_text",
            "The spectrum adds up to less than 10⁻⁶ particles per cm³ (1 per m³); check the "
            "concentration unit and type.",
        )
    if sum(imported.numbers) > NUMBER_MAX:
        raise FieldError(
            "csv_text",
            "The spectrum adds up to more than 10⁹ particles per cm³; check the "
            "concentration unit and type.",
        )
    return imported, imported.report
