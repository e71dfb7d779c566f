"""The sampling calculation's measured spectrum: read from the shared spectrum fields, and its
correction for the chain's losses shaped into the reply in the units it was imported in.

The composer works with particles per bin in SI; here the table goes back to the file's own
terms: its concentration type (per bin, dN/dlogDp or dN/dDp) and unit (per cm³ or per m³;
for dN/dDp per the file's diameter unit). Totals of the measured and corrected number
concentration are the sums of the particles per bin: the channel counts added for data per
bin, Σ (dN/dlogDp)_i Δlog10 Dp_i for dN/dlogDp and Σ (dN/dDp)_i ΔDp_i for dN/dDp, with each
bin's edges at the geometric means of neighbouring diameters (outer edges mirrored), as the
import forms the particles per bin.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from ..compose.sampling import MeasuredSpectrum, SamplingResult
from ..diameters import ParticleDescription
from .labels import DIAMETER_TYPE_WORDS
from .reply import row, shared_axis
from .spectrum_fields import import_spectrum
from .units import to_si, unit_label

__all__ = ["FileTerms", "read_spectrum", "spectrum_reply"]

_TYPE_WORDS = {
    "per_bin": "particles per bin",
    "dN/dlogDp": "dN/dlogDp",
    "dN/dDp": "dN/dDp",
}


@dataclass(frozen=True)
class FileTerms:
    """How the file gave its concentrations, to show the corrected spectrum the same way.

    Attributes
    ----------
    concentration_type : str
        ``per_bin``, ``dN/dlogDp`` or ``dN/dDp``.
    concentration_unit : str
        Unit code of the file's concentrations (``1/cm3`` or ``1/m3``).
    diameter_unit : str
        Unit code of the file's diameters (``nm``, ``um``, ``m``).
    per_bin : tuple of float
        For each bin, the particles per bin [1/m^3] that one unit of the file's value
        stands for.
    """

    concentration_type: str
    concentration_unit: str
    diameter_unit: str
    per_bin: tuple[float, ...]

    def unit_text(self) -> str:
        """The file's concentration unit in words (``1/cm³``, ``1/cm³ per nm``)."""
        text = unit_label(self.concentration_unit)
        if self.concentration_type == "dN/dDp":
            text += f" per {unit_label(self.diameter_unit)}"
        return text


def read_spectrum(
    v: dict[str, Any], desc: ParticleDescription, T: float, P: float
) -> tuple[MeasuredSpectrum, dict[str, Any], FileTerms]:
    """Read the measured spectrum from the CSV fields; raise FieldError on a fault.

    Parameters
    ----------
    v : dict
        Validated inputs holding the shared spectrum fields and ``spectrum_diameter_type``.
    desc : ParticleDescription
        The spheres the chain acts on (measured diameters are turned into theirs).
    T : float
        Air temperature. [K]
    P : float
        Air pressure. [Pa]

    Returns
    -------
    tuple
        The spectrum (particles per bin [1/m^3]), the import report and the file's terms.
    """
    imported, report = import_spectrum(v)
    d_type = v["spectrum_diameter_type"]
    diameters = list(imported.diameters)
    kind = v["csv_concentration_type"]
    c_unit, d_unit = v["csv_concentration_unit"], v["csv_diameter_unit"]
    c_scale = to_si(1.0, "number_concentration", c_unit)
    d_scale = to_si(1.0, "length", d_unit)
    e = imported.edges
    if kind == "dN/dlogDp":
        widths = [math.log10(e[i + 1] / e[i]) for i in range(len(diameters))]
    elif kind == "dN/dDp":
        widths = [(e[i + 1] - e[i]) / d_scale for i in range(len(diameters))]
    else:
        widths = [1.0] * len(diameters)
    spectrum = MeasuredSpectrum(
        diameters=diameters,
        model_diameters=[desc.to_model(d, d_type, T, P) for d in diameters],
        concentrations=list(imported.numbers),
        diameter_type=d_type,
    )
    terms = FileTerms(kind, c_unit, d_unit, tuple(c_scale * w for w in widths))
    return spectrum, report, terms


def spectrum_reply(
    result: SamplingResult, terms: FileTerms, results: dict[str, Any], curves: dict[str, Any]
) -> None:
    """Add the corrected spectrum to the reply: a table in the file's terms, the totals of
    measured and corrected number concentration, and a chart of particles per bin per cm³.

    Parameters
    ----------
    result : SamplingResult
        The composed result (with a spectrum).
    terms : FileTerms
        How the file gave its concentrations.
    results : dict
        The reply's results, completed here.
    curves : dict
        The reply's curves, completed here.
    """
    sp = result.spectrum
    assert sp is not None
    shown_um = [d * 1e6 for d in sp.diameters]
    in_file = [
        (m / k, None if c is None else c / k)
        for m, c, k in zip(sp.measured, sp.corrected, terms.per_bin, strict=True)
    ]
    what = _TYPE_WORDS[terms.concentration_type]
    results["spectrum_table"] = {
        "label": "Measured spectrum corrected for the chain's losses "
        f"({what}, {terms.unit_text()})",
        "diameter_type": sp.diameter_type,
        "diameter_type_label": DIAMETER_TYPE_WORDS[sp.diameter_type],
        "diameter_unit": "um",
        "concentration_type": terms.concentration_type,
        "concentration_unit": terms.concentration_unit,
        "concentration_label": f"{what}, {terms.unit_text()}",
        "unreliable_below": sp.threshold,
        "rows": [
            {"diameter": x, "measured": m, "penetration": p, "corrected": c, "unreliable": flag}
            for x, (m, c), p, flag in zip(
                shown_um, in_file, sp.penetration, sp.unreliable, strict=True
            )
        ],
    }
    factor = to_si(1.0, "number_concentration", terms.concentration_unit)
    unit = terms.concentration_unit
    how = {
        "per_bin": "sum of the bins' particle numbers",
        "dN/dlogDp": "Σ dN/dlogDp × Δlog10 Dp over the bins",
        "dN/dDp": "Σ dN/dDp × ΔDp over the bins",
    }[terms.concentration_type]
    left = len(sp.corrected) - sp.corrected_bins
    results["spectrum_total_measured"] = row(
        "Total number concentration, measured", sp.measured_total, factor, unit, "1/m3", "N", how
    )
    results["spectrum_total_corrected"] = row(
        "Total number concentration, corrected for the chain's losses",
        sp.corrected_total,
        factor,
        unit,
        "1/m3",
        "N",
        how + (f"; {left} bins with no corrected value left out" if left else ""),
    )
    shown = shared_axis(curves, "spectrum_diameter", shown_um)
    curves["spectrum"] = {
        "x_label": "Diameter"
        + (
            f" ({DIAMETER_TYPE_WORDS[sp.diameter_type]})"
            if sp.diameter_type != "volume_equivalent"
            else ""
        ),
        "x_unit": "um",
        "y_label": "Concentration per bin",
        "y_unit": "1/cm3",
        "measured": {"label": "Measured", "x": shown, "y": [m / 1e6 for m in sp.measured]},
        "corrected": {
            "label": "Corrected for losses",
            "x": shown,
            "y": [None if c is None else c / 1e6 for c in sp.corrected],
        },
        "unreliable": sp.unreliable,
    }
