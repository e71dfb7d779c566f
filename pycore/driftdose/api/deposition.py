"""Calculation ``deposition``: where a workplace aerosol deposits in the respiratory tract.

Answers, for a size distribution given as up to four lognormal modes (count- or mass-based)
or as a measured spectrum in CSV, the deposition fraction per region (ICRP 66 regions, or
head airways / tracheobronchial / alveolar for the simplified fits), the deposited number,
surface area and mass per hour and per exposure, for the ICRP reference worker, one
activity or custom breathing, with an optional comparison with benchmark concentrations the
user enters. Curves: deposition fraction per region versus size with the distribution
overlaid, and dose per region as bars.

The inputs are those of :mod:`.exposure_fields` (shared with burden and uncertainty); the
composition is :func:`driftdose.compose.deposition.compose_deposition`; this module only
translates its result into the reply. Invented demos: :mod:`.demos`.
"""

from __future__ import annotations

from typing import Any

from ..compose.deposition import Deposition, compose_deposition
from ..sources import cite
from .demos import DEMOS, demo_scenarios
from .dose_rows import dose_bars, region_rows
from .encoding import kept_array
from .exposure_fields import EXPOSURE_FIELDS, MEDIAN_WORDS, MODE_FIELDS, aerosol_of, subject_of
from .fields import Field, FieldError
from .labels import COORDINATE_WORDS, DIAMETER_TYPE_WORDS, REGION_LABELS
from .reply import quantity, row, shared_axis, text_result
from .size_list import SIZES, sizes_table
from .spectrum_fields import import_row, import_warnings

__all__ = ["DEMOS", "FIELDS", "MODE_FIELDS", "TITLE", "compute", "demo_scenarios", "run"]

TITLE = "Respiratory deposition and dose per shift"

FIELDS: tuple[Field, ...] = (*EXPOSURE_FIELDS, SIZES)


def compute(v: dict[str, Any]) -> tuple[Deposition, dict[str, Any] | None]:
    """The composed deposition of validated inputs, and the CSV import report if any.

    Parameters
    ----------
    v : dict
        Inputs validated by :data:`FIELDS` (SI).

    Returns
    -------
    tuple
        The :class:`~driftdose.compose.deposition.Deposition` and the import report (None
        for lognormal modes).
    """
    aerosol, report = aerosol_of(v)
    try:
        result = compose_deposition(
            aerosol,
            subject_of(v),
            v["exposure_duration"],
            v["model"],
            v["thermodynamic_convention"],
            benchmark_number=v.get("benchmark_number"),
            benchmark_mass=v.get("benchmark_mass"),
            custom_breathing=v["breathing"] == "custom",
            sizes=v.get("sizes") or (),
        )
    except ValueError as exc:
        raise FieldError("", str(exc)) from None
    return result, report


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the deposition reply from validated SI inputs."""
    result, report = compute(v)
    warnings = list(result.warnings) + import_warnings(report)
    sources = [
        "icrp66",
        "hatch_choate1929",
        "iso7708",
        "kim2005",
        "einstein1905",
        "ldsa_fissan2007",
    ]
    if result.aerosol.mobility_used():
        sources.append("decarlo2004")
    if v["model"] == "simplified":
        sources.insert(1, "hinds1999_ch11")
    if v["breathing"] == "reference_worker":
        sources.insert(1, "icrp68")
    return {
        "results": {
            **_results(result, report),
            **_ldsa_rows(result),
            **_mode_rows(result),
            **_size_rows(result),
        },
        "curves": _curves(result),
        "warnings": warnings,
        "sources": cite(*sources),
    }


_ISO_LABELS = {
    "inhalable": "inhalable",
    "thoracic": "thoracic",
    "respirable": "respirable",
    "high_risk_respirable": "high-risk respirable",
}


def _results(result: Deposition, report: dict[str, Any] | None) -> dict[str, Any]:
    res = result.dose
    out: dict[str, Any] = {
        "breathing": text_result("Breathing", result.subject.name),
        "inhaled_volume": row(
            "Air inhaled over the exposure", res.inhaled_volume, 1.0, "m3", "m3", "V"
        ),
        "ventilation": row("Mean ventilation", res.ventilation, 1.0 / 3600.0, "m3/h", "m3/s", "V̇ₑ"),
        "number_concentration": row(
            "Airborne number concentration", res.ambient["number"], 1e6, "1/cm3", "1/m3"
        ),
        "surface_concentration": row(
            "Airborne surface-area concentration",
            res.ambient["surface"],
            1e-6,
            "um2/cm3",
            "m2/m3",
        ),
        "mass_concentration": row(
            "Airborne mass concentration", res.ambient["mass"], 1e-9, "ug/m3", "kg/m3"
        ),
    }
    for w in ("mass", "number"):
        for key, label in _ISO_LABELS.items():
            out[f"iso7708_{key}_{w}"] = quantity(
                f"Share of airborne {w} in the ISO 7708 {label} fraction", result.shares[w][key]
            )
    if report is not None:
        out["csv_rows"] = import_row(report)
    out.update(region_rows(res))
    for metric, ratio in res.benchmark.items():
        out[f"benchmark_{metric}"] = row(
            f"Airborne {metric} concentration ÷ your benchmark", ratio, 1.0, "1", "1"
        )
    return out


_LDSA_LABELS = {
    "alveolar": "alveolar",
    "tracheobronchial": "tracheobronchial",
    "total": "total (all regions)",
}


def _ldsa_rows(result: Deposition) -> dict[str, Any]:
    """LDSA rows: deposited particle surface per volume of inhaled air, in um^2/cm^3."""
    return {
        f"ldsa_{key}": row(
            f"Lung-deposited surface area, {_LDSA_LABELS[key]}",
            result.ldsa[key],
            1e-6,
            "um2/cm3",
            "m2/m3",
            "LDSA",
            "deposited particle surface per cm³ of inhaled air",
        )
        for key in ("alveolar", "tracheobronchial", "total")
    }


def _mode_rows(result: Deposition) -> dict[str, Any]:
    """Per mode: the medians the models use, the MMAD and both concentrations."""
    out: dict[str, Any] = {}
    coord = COORDINATE_WORDS[result.aerosol.description.coordinate]
    for i, m in enumerate(result.modes, start=1):
        e = m.entered
        note = f"entered: {MEDIAN_WORDS[e.basis]} median, {DIAMETER_TYPE_WORDS[e.diameter_type]}"
        note += "; converted, GSD kept" if m.converted else ""
        out[f"mode{i}_count_median"] = row(
            f"Mode {i}: count median ({coord})", m.count_median, 1e-9, "nm", "m", "CMD", note
        )
        out[f"mode{i}_mass_median"] = row(
            f"Mode {i}: mass median ({coord})", m.mass_median, 1e-6, "um", "m", "MMD"
        )
        out[f"mode{i}_mmad"] = row(
            f"Mode {i}: mass median aerodynamic", m.mmad, 1e-6, "um", "m", "MMAD"
        )
        out[f"mode{i}_number"] = row(
            f"Mode {i}: number concentration", m.number, 1e6, "1/cm3", "1/m3"
        )
        out[f"mode{i}_mass"] = row(f"Mode {i}: mass concentration", m.mass, 1e-9, "ug/m3", "kg/m3")
    return out


def _size_rows(result: Deposition) -> dict[str, Any]:
    """The deposition fraction per region and the ISO 7708 conventions at the typed sizes."""
    if result.at_sizes is None:
        return {}
    columns = [(r, f"{REGION_LABELS[r].split(' (')[0]} deposition") for r in result.dose.regions]
    columns += [(f"iso7708_{k}", f"ISO 7708 {label}") for k, label in _ISO_LABELS.items()]
    coordinate = COORDINATE_WORDS[result.aerosol.description.coordinate]
    return {"sizes_table": sizes_table(result.at_sizes, columns, coordinate)}


def _curves(result: Deposition) -> dict[str, Any]:
    res = result.dose
    curves: dict[str, Any] = {}
    # the axes, and an overlay that an edit left as it was, are written as JSON once
    x_um = shared_axis(curves, "diameter", kept_array(result.sizes, 1e6))
    series = {
        r: {"label": REGION_LABELS[r], "x": x_um, "y": list(result.fractions[r])}
        for r in res.regions
    }
    x_overlay = shared_axis(curves, "overlay_diameter", kept_array(result.overlay_sizes, 1e6))
    overlay = {
        w: {
            "label": f"Your distribution by {w} (dW/dln d, scaled to peak 1)",
            "x": x_overlay,
            "y": kept_array(result.overlay[w]),
        }
        for w in ("number", "mass")
    }
    return {
        **curves,
        "x_label": f"Particle diameter ({COORDINATE_WORDS[result.aerosol.description.coordinate]})",
        "x_unit": "um",
        "y_label": "Deposition fraction",
        "y_unit": "1",
        "deposition": series,
        "distribution": {
            "y_label": "Your distribution, scaled to a peak of 1",
            "y_unit": "1",
            **overlay,
        },
        "dose_bars": dose_bars(res),
    }
