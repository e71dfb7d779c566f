"""Calculation ``sampling``: does a chain of sampling stages deliver the sizes that matter?

Inputs: ``stages``, an ordered list of stage objects (declared and parsed in
:mod:`driftdose.api.stages`, built through the core registry of stage kinds); the sampling
``flow`` used by every stage that gives no flow of its own; air ``temperature`` and
``pressure``; ``particle_density`` (material or effective, ``density_basis``); an optional
``target`` curve (an ISO 7708 fraction or a regional deposition curve, :data:`TARGETS`); and,
with ``size_source`` set to ``csv``, a measured spectrum read by the shared spectrum
fields and importer.

``run`` only translates: it parses, calls :func:`driftdose.compose.sampling.compose_sampling`
and shapes the reply. Reply:

- ``curves``: penetration versus diameter (``x_unit`` a unit code, ``um``) on 241 sizes from
  1 nm to 100 um, sent once in ``axes["diameter"]`` and named by each curve's ``x`` (the
  measured spectrum's diameters likewise in ``axes["spectrum_diameter"]``), ``stages`` (one
  series per stage, in order, each with its ``index``, ``type``, ``type_label`` and the
  user's ``name``), ``overall``, ``target`` (``None`` where not defined), ``x_aerodynamic``
  (the name of the axis of the same sizes' aerodynamic diameters) and, with a spectrum,
  ``spectrum``;
- ``results``: the overall penetration at 10 nm, 100 nm, 1 um and 10 um, the size band
  passed with at least 50 %, the departure from the target, a ``stages_table`` (per stage:
  ``index``, ``type``, ``type_label``, the user's ``name`` (``""`` if none), regime, key
  numbers, penetration at those sizes, its 50 % sizes, warnings), with ``sizes`` typed a
  ``sizes_table`` (:func:`driftdose.api.size_list.sizes_table`: every stage, the whole chain
  and the target at each size) and, with a spectrum, a ``spectrum_table`` in the file's own
  concentration terms with bins flagged where the chain passes less than 50 %, and the totals
  ``spectrum_total_measured`` and ``spectrum_total_corrected``
  (:mod:`driftdose.api.sampling_spectrum`);
- ``warnings`` and ``sources``.

Bad input gives ``{"ok": false, "errors": [...]}`` with one message per faulty field.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from ..compose.sampling import (
    CURVE_POINTS,
    CURVE_RANGE,
    REFERENCE_SIZES,
    SamplingResult,
    compose_sampling,
)
from ..compose.targets import (
    DEPARTURE_RANGE,
    DEPOSITION_TARGET_RANGE,
    ICRP66_TARGET_REGIONS,
    SIMPLIFIED_TARGET_REGIONS,
)
from ..diameters import ParticleDescription
from ..sources import cite
from ..transport import STAGE_KINDS
from .encoding import kept_array
from .fields import Field, FieldError
from .labels import REGION_LABELS
from .particle_air_fields import (
    DENSITY_BASIS,
    PARTICLE_DENSITY,
    PRESSURE,
    SHAPE_FACTOR,
    TEMPERATURE,
)
from .reply import quantity, shared_axis, text_result
from .sampling_demos import DEMOS
from .sampling_spectrum import read_spectrum, spectrum_reply
from .size_list import SIZES, sizes_table
from .spectrum_fields import import_row, import_warnings, spectrum_fields
from .stages import FLOW_MIN, MAX_STAGES, STAGE_FIELDS, parse_stages, stage_types
from .units import auto_unit, from_si, unit_label

__all__ = [
    "CURVE_POINTS",
    "CURVE_RANGE",
    "DEMOS",
    "DEPARTURE_RANGE",
    "DEPOSITION_TARGET_RANGE",
    "FIELDS",
    "STAGE_FIELDS",
    "TARGETS",
    "TITLE",
    "run",
]

TITLE = "Sampling line and pre-separator penetration"

ISO_TARGETS = (
    ("inhalable", "ISO 7708 inhalable"),
    ("thoracic", "ISO 7708 thoracic"),
    ("respirable", "ISO 7708 respirable"),
    ("high_risk_respirable", "ISO 7708 high-risk respirable"),
)

TARGETS: tuple[tuple[str, str], ...] = (
    ("none", "None"),
    *ISO_TARGETS,
    *(
        (
            f"icrp66_{r}",
            "ICRP 66 total deposition, reference worker"
            if r == "total"
            else f"ICRP 66 deposition in {REGION_LABELS[r]}, reference worker",
        )
        for r in ICRP66_TARGET_REGIONS
    ),
    *(
        (
            f"simplified_{r}",
            f"Simplified ICRP fit: {REGION_LABELS[r].lower()} deposition",
        )
        for r in SIMPLIFIED_TARGET_REGIONS
    ),
)
"""Target curves: ISO 7708 fractions, and regional deposition fractions of unit-density
spheres of each aerodynamic diameter, from the full ICRP 66 model for the ICRP reference
worker (ICRP 66 with ICRP 68's breathing) or from the simplified fits (Hinds 1999, which
average over their own breathing conditions)."""

# The spectrum import: the shared declarations and importer (one declaration, so page,
# command line and messages agree), applying while the spectrum source is a CSV file.
_SPECTRUM_FIELDS = {f.name: f for f in spectrum_fields("size_source")}

SPECTRUM_FIELDS: tuple[Field, ...] = (
    Field(
        "size_source",
        "Measured spectrum to correct",
        "choice",
        "none",
        choices=(("none", "None"), ("csv", "Measured spectrum (CSV file)")),
        help="Correct a spectrum measured behind this chain for the chain's losses.",
        formerly=("spectrum_source",),
    ),
    *(
        _SPECTRUM_FIELDS[name]
        for name in (
            "csv_text",
            "csv_diameter_column",
            "csv_concentration_column",
            "csv_concentration_type",
            "csv_diameter_unit",
            "csv_concentration_unit",
            "spectrum_diameter_type",
        )
    ),
)

FIELDS: tuple[Field, ...] = (
    Field(
        "stages",
        "Sampling chain",
        "data",
        DEMOS["long_narrow_tube"]["inputs"]["stages"],
        help="Stages in the order the air passes them.",
        extra={
            "max_stages": MAX_STAGES,
            "stage_types": stage_types(),
            "demos": DEMOS,
        },
    ),
    Field(
        "flow",
        "Sampling flow",
        "flow",
        (1.5, "L/min"),
        ("L/min", "m3/h", "cm3/s", "m3/s"),
        minimum=FLOW_MIN,
        maximum=0.1,
        help="Used by every stage that does not set its own flow.",
    ),
    replace(
        PARTICLE_DENSITY,
        help="Density of the spheres, or the effective density of agglomerates if chosen below.",
    ),
    replace(
        DENSITY_BASIS,
        help="The stages treat particles as spheres. For agglomerates give the effective "
        "density: the chain then acts on the sphere with the particle's mobility and mass "
        "(DeCarlo et al. 2004), exact for diffusion, settling and impaction in Stokes flow.",
    ),
    replace(
        SHAPE_FACTOR,
        applies=("density_basis", ("effective",)),
        help="Used with an effective density only: turns volume-equivalent and optical "
        "sizes of a spectrum into mobility sizes.",
    ),
    TEMPERATURE,
    PRESSURE,
    Field(
        "target",
        "Target curve",
        "choice",
        "none",
        choices=TARGETS,
        help="A health-related fraction, or where particles deposit in the airways, that the "
        "chain should reproduce.",
    ),
    *SPECTRUM_FIELDS,
    SIZES,
)


def _length_text(x: float) -> str:
    unit = auto_unit("length", x)
    return f"{from_si(x, 'length', unit):.3g} {unit_label(unit)}"


def _band_text(bands: list[tuple[float | None, float | None]]) -> str:
    """The size bands passed with at least 50 %, in words."""
    if not bands:
        return "No size between 1 nm and 100 µm passes with 50 % or more."
    if bands == [(None, None)]:
        return "Every size from 1 nm to 100 µm passes with at least 50 %."
    words = [
        f"{'1 nm' if lo is None else _length_text(lo)} to "
        f"{'100 µm' if hi is None else _length_text(hi)}"
        for lo, hi in bands
    ]
    return "From " + "; from ".join(words) + "."


def _fraction_row(label: str, p: float, note: str = "") -> dict[str, Any]:
    return {
        "label": label,
        "symbol": "",
        "value": 100.0 * p,
        "unit": "%",
        "si": p,
        "si_unit": "1",
        "note": note,
    }


_UNIT_KINDS = {"m/s": "velocity", "m": "length", "s": "time"}
_UNIT_CODES = {"–": "1"}  # the stage models' words for a pure number, as a unit code


def _report_rows(quantities: dict[str, tuple[str, float, str]]) -> list[dict[str, Any]]:
    rows = []
    for key, (label, si, unit) in quantities.items():
        kind = _UNIT_KINDS.get(unit)
        code = _UNIT_CODES.get(unit, unit)
        row = quantity(label, si, kind) if kind else quantity(label, si, None, code)
        row["key"] = key
        rows.append(row)
    return rows


def _departure_rows(result: SamplingResult) -> dict[str, Any]:
    dep = result.target.departure if result.target else None
    if dep is None:
        return {}
    lo, hi = dep.size_range
    if lo >= 0.1e-6:
        span = f"{lo * 1e6:g}–{_length_text(hi)} aerodynamic"
    else:
        span = f"{_length_text(lo)} – {_length_text(hi)} aerodynamic"
    return {
        "departure_max": _fraction_row(
            f"Largest departure from the target ({span})",
            dep.largest,
            note=f"at {_length_text(dep.at)} aerodynamic; percentage points",
        ),
        "departure_mean": _fraction_row(
            f"Mean departure from the target ({span}, log-size average)",
            dep.mean,
            note="percentage points",
        ),
    }


def _size_columns(result: SamplingResult) -> list[tuple[str, str]]:
    """Columns of the table at the typed sizes: each stage, the whole chain, the target."""
    columns = [(f"stage_{s.index}", _stage_label(s.index, s.kind, s.name)) for s in result.stages]
    columns.append(("overall", "Whole chain"))
    if result.target is not None:
        columns.append(("target", f"Target: {dict(TARGETS)[result.target.key]}"))
    return columns


def _stage_label(index: int, kind: str, name: str) -> str:
    """The series label of a stage in charts and exports: its own name, else number and kind."""
    return name or f"{index + 1}. {STAGE_KINDS[kind].label}"


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Parse the validated SI inputs, compose the chain's answer and shape the reply."""
    T, P, rho, flow = v["temperature"], v["pressure"], v["particle_density"], v["flow"]
    effective = (v.get("density_basis") or "material") == "effective"
    # the stages model spheres: with a material density the shape factor does not enter
    desc = ParticleDescription(
        rho, v["shape_factor"] if effective else 1.0, "effective" if effective else "material"
    )
    parsed, errors = parse_stages(v["stages"], flow, T, P)
    if errors and errors[0]["field"] == "stages":
        raise FieldError("stages", errors[0]["message"])
    spectrum, csv_report, terms = None, None, None
    if v["size_source"] == "csv":
        try:
            spectrum, csv_report, terms = read_spectrum(v, desc, T, P)
        except FieldError as exc:
            errors.append({"field": exc.field, "message": exc.message})
    if errors:
        return {"ok": False, "errors": errors}

    result = compose_sampling(
        [p.stage for p in parsed],
        rho,
        T,
        P,
        effective_density=effective,
        shape_factor=v["shape_factor"],
        target=v["target"],
        spectrum=spectrum,
        names=[p.name for p in parsed],
        sizes=v.get("sizes") or (),
    )
    curves: dict[str, Any] = {}
    # axes written as JSON once (api.encoding): an edit of a stage leaves them as they were
    x_um = shared_axis(curves, "diameter", kept_array(result.diameters, 1e6))
    curves |= {
        "x_label": f"Particle diameter ({result.coordinate})",
        "x_unit": "um",
        "y_label": "Penetration",
        "y_unit": "1",
        "stages": [],
    }
    # the aerodynamic diameters of the same sizes: the same axis when they are the shown ones
    curves["x_aerodynamic"] = (
        x_um
        if result.aerodynamic_diameters == result.diameters
        else shared_axis(curves, "aerodynamic", kept_array(result.aerodynamic_diameters, 1e6))
    )
    stage_rows = []
    for s in result.stages:
        who = {
            "index": s.index,
            "type": s.kind,
            "type_label": STAGE_KINDS[s.kind].label,
            "name": s.name,
        }
        curves["stages"].append(
            {"label": _stage_label(s.index, s.kind, s.name), **who, "x": x_um, "y": s.penetration}
        )
        stage_rows.append(
            {
                **who,
                "regime": s.report.regime,
                "quantities": _report_rows(s.report.quantities),
                "penetration_at": [
                    _fraction_row(_length_text(d), p)
                    for (_, d), p in zip(REFERENCE_SIZES, s.penetration_at, strict=True)
                ],
                "half_penetration_sizes": [
                    quantity("50 % size", x, "length") for x in s.half_penetration_sizes
                ],
                "warnings": s.warnings,
            }
        )
    curves["overall"] = {"label": "Whole chain", "x": x_um, "y": result.overall}

    results: dict[str, Any] = {}
    for (key, d), p in zip(REFERENCE_SIZES, result.overall_at, strict=True):
        results[f"overall_{key}"] = _fraction_row(f"Whole chain, {_length_text(d)}", p)
    results["pass_band"] = text_result(
        "Sizes passed with at least 50 %", _band_text(result.pass_bands), result.coordinate
    )
    if result.target is not None:
        curves["target"] = {
            "label": dict(TARGETS)[result.target.key],
            "x": x_um,
            "y": result.target.values,
        }
        results.update(_departure_rows(result))
    results["stages_table"] = {
        "label": "Stages",
        "reference_sizes": [_length_text(d) for _, d in REFERENCE_SIZES],
        "rows": stage_rows,
    }
    warnings = list(result.warnings) + import_warnings(csv_report)
    if csv_report is not None:
        results["csv_rows"] = import_row(csv_report)
    if result.spectrum is not None and terms is not None:
        spectrum_reply(result, terms, results, curves)
    if result.at_sizes is not None:
        results["sizes_table"] = sizes_table(
            result.at_sizes, _size_columns(result), result.coordinate
        )
    return {
        "results": results,
        "curves": curves,
        "warnings": warnings,
        "sources": cite(*result.sources),
    }
