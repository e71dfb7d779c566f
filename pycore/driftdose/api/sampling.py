"""Calculation ``sampling``: does a chain of sampling stages deliver the sizes that matter?

Inputs: ``stages``, an ordered list of stage objects, each ``{"type": ..., <parameter>:
{"value": ..., "unit": ...}, ...}`` with the parameters of :data:`STAGE_FIELDS` for its type
(checked by the same :class:`~driftdose.api.fields.Field` machinery as every other input;
errors name the field as ``stages.<index>.<parameter>``, index from 0); the sampling
``flow`` used by every stage that gives no flow of its own; air ``temperature`` and
``pressure``; ``particle_density``; an optional ``target`` curve (an ISO 7708 fraction or a
regional deposition curve, see :data:`TARGETS`); and, with ``spectrum_source`` set to
``csv``, a measured spectrum read from CSV text by the same fields (and the same importer)
as the deposition calculation: ``csv_text``, ``csv_diameter_column``,
``csv_concentration_column``, ``csv_concentration_type``, ``csv_diameter_unit``,
``csv_concentration_unit``, plus ``spectrum_diameter_type``.

Reply:

- ``curves``: penetration versus volume-equivalent diameter on 241 sizes from 1 nm to
  100 um, ``stages`` (one series per stage, in order), ``overall``, ``target`` (the target
  fraction at each size's aerodynamic diameter; ``None`` where the target is not defined),
  ``x_aerodynamic`` (um) and, with a spectrum, ``spectrum`` (measured and corrected per bin);
- ``results``: the overall penetration at 10 nm, 100 nm, 1 um and 10 um, the size band
  passed with at least 50 %, the departure from the target (:func:`_departure`), a
  ``stages_table`` (per stage: regime, key numbers, penetration at those sizes, its 50 %
  sizes, warnings) and, with a spectrum, a ``spectrum_table`` with bins flagged where the
  chain's penetration is below 50 % (correction unreliable);
- ``warnings``: transition flow, Reynolds or Stokes numbers outside a model's range,
  compressible speeds, extrapolated size ranges;
- ``sources``: the published methods used.

Bad input gives ``{"ok": false, "errors": [...]}`` with one message per faulty field.

:data:`DEMOS` holds invented example chains (clearly labelled as such; none copies a
published or commercial sampler) that the page can load; they are also offered through the
``stages`` field's description.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Any

from .._numerics import logspace
from ..conventions import D_AE_MAX as ISO7708_MAX_DIAMETER
from ..conventions import iso7708_fraction
from ..deposition import REFERENCE_WORKER, icrp66_curves, simplified_icrp
from ..diameters import ParticleDescription
from ..sources import cite
from ..transport import STAGE_KINDS, Chain, StageInputError, build_stage, correct_spectrum
from ..transport.chain import UNRELIABLE_BELOW
from ..transport.impactor import DEFAULT_STEEPNESS
from .fields import Field, FieldError, parse_fields
from .labels import DIAMETER_TYPE_WORDS, REGION_LABELS
from .particle_air_fields import (
    DENSITY_BASIS,
    PARTICLE_DENSITY,
    PRESSURE,
    SHAPE_FACTOR,
    TEMPERATURE,
)
from .reply import quantity, text_result
from .spectrum_fields import import_spectrum, spectrum_fields
from .units import auto_unit, from_si, unit_label

TITLE = "Sampling line and pre-separator penetration"

CURVE_POINTS = 241
CURVE_RANGE = (1e-9, 100e-6)  # [m]
MAX_STAGES = 20
FLOW_MIN = 1e-9  # [m^3/s], 0.06 mL/min: below it a flow is taken as a typing mistake
BORE_MIN = 1e-5  # [m], 10 um: narrowest tube or nozzle accepted (smaller ones overflow)
WIRE_MIN = 1e-7  # [m], 0.1 um: thinnest screen wire accepted
REFERENCE_SIZES = (("10nm", 10e-9), ("100nm", 100e-9), ("1um", 1e-6), ("10um", 10e-6))  # [m]
DEPARTURE_RANGE = (0.1e-6, 100e-6)
"""Aerodynamic diameters over which the departure from an ISO 7708 target is measured [m]:
the sizes that carry the mass of workplace aerosols and for which the ISO 7708 conventions
are meant (our choice of range)."""
DEPOSITION_TARGET_RANGE = (1e-9, 100e-6)
"""Aerodynamic diameters over which a deposition target is given and the departure from it
measured [m]: the stated range of both deposition models (ICRP 66 Annex D; Hinds 1999,
section 11.4)."""

# ---------------------------------------------------------------------------------------------
# Per-stage fields
# ---------------------------------------------------------------------------------------------


def _name() -> Field:
    return Field(
        "name",
        "Stage name",
        "text",
        "",
        required=False,
        help="Your label for this stage.",
        extra={"max_length": 60},
    )


def _flow() -> Field:
    return Field(
        "flow",
        "Flow through this stage",
        "flow",
        (None, "L/min"),
        ("L/min", "m3/h", "cm3/s", "m3/s"),
        minimum=FLOW_MIN,
        maximum=0.1,
        required=False,
        help="Leave empty to use the sampling flow.",
    )


def _tube_diameter() -> Field:
    return Field(
        "tube_diameter",
        "Tube inner diameter",
        "length",
        (4.0, "mm"),
        ("mm", "cm", "m"),
        minimum=BORE_MIN,
        maximum=1.0,
    )


STAGE_FIELDS: dict[str, tuple[Field, ...]] = {
    "tube": (
        _name(),
        Field(
            "length",
            "Tube length",
            "length",
            (1.0, "m"),
            ("m", "cm", "mm"),
            minimum=0.0,
            maximum=1000.0,
            exclusive_min=True,
        ),
        _tube_diameter(),
        Field(
            "inclination",
            "Inclination from horizontal",
            "angle",
            (0.0, "deg"),
            ("deg",),
            minimum=-math.pi / 2,
            maximum=math.pi / 2,
            help="0° horizontal, 90° vertical.",
        ),
        Field(
            "mechanisms",
            "Loss mechanisms",
            "choice",
            "both",
            choices=(
                ("both", "Diffusion and settling"),
                ("diffusion", "Diffusion only"),
                ("settling", "Settling only"),
            ),
        ),
        _flow(),
    ),
    "bend": (
        _name(),
        _tube_diameter(),
        Field(
            "bend_angle",
            "Bend angle",
            "angle",
            (90.0, "deg"),
            ("deg",),
            minimum=0.0,
            maximum=2 * math.pi,
            exclusive_min=True,
        ),
        Field(
            "curvature_radius",
            "Bend radius (to the tube axis)",
            "length",
            (5.0, "cm"),
            ("cm", "mm", "m"),
            minimum=0.0,
            maximum=10.0,
            exclusive_min=True,
            help="Must exceed half the tube's inner diameter.",
        ),
        _flow(),
    ),
    "cyclone": (
        _name(),
        Field(
            "curve",
            "Penetration curve",
            "choice",
            "lognormal",
            choices=(
                ("lognormal", "Lognormal from cut size and steepness"),
                ("iso7708_respirable", "Ideal ISO 7708 respirable curve"),
            ),
        ),
        Field(
            "d50",
            "Cut size (aerodynamic, 50 % penetration)",
            "length",
            (4.0, "um"),
            ("um",),
            minimum=0.05e-6,
            maximum=100e-6,
        ),
        Field(
            "steepness",
            "Steepness (GSD of the curve)",
            "dimensionless",
            (1.5, "1"),
            ("1",),
            minimum=1.0,
            maximum=5.0,
            exclusive_min=True,
            help="d50 / d84; smaller is sharper. Above 1.",
        ),
    ),
    "impactor": (
        _name(),
        Field(
            "jet",
            "Jet shape",
            "choice",
            "round",
            choices=(("round", "Round nozzles"), ("rectangular", "Rectangular slits")),
        ),
        Field(
            "nozzle_diameter",
            "Nozzle diameter or slit width",
            "length",
            (1.0, "mm"),
            ("mm", "um", "cm"),
            minimum=BORE_MIN,
            maximum=0.1,
        ),
        Field(
            "n_nozzles",
            "Number of nozzles",
            "integer",
            1,
            minimum=1,
            maximum=10000,
        ),
        Field(
            "slit_length",
            "Slit length (rectangular jets)",
            "length",
            (10.0, "mm"),
            ("mm", "cm"),
            minimum=0.0,
            maximum=1.0,
            exclusive_min=True,
        ),
        Field(
            "steepness",
            "Steepness of the efficiency curve",
            "dimensionless",
            (DEFAULT_STEEPNESS, "1"),
            ("1",),
            minimum=1.0,
            maximum=5.0,
            exclusive_min=True,
            help="Width in √Stk around the cut; 1.2 is a plain default, not a published value.",
        ),
        _flow(),
    ),
    "screens": (
        _name(),
        Field(
            "wire_diameter",
            "Wire diameter",
            "length",
            (50.0, "um"),
            ("um", "mm"),
            minimum=WIRE_MIN,
            maximum=5e-3,
        ),
        Field(
            "solidity",
            "Solidity (solid volume fraction)",
            "dimensionless",
            (0.3, "1"),
            ("1",),
            minimum=0.0,
            maximum=1.0,
            exclusive_min=True,
            help="Between 0 and 1; ordinary mesh screens are about 0.2 to 0.4.",
        ),
        Field(
            "thickness",
            "Thickness of one screen",
            "length",
            (100.0, "um"),
            ("um", "mm"),
            minimum=0.0,
            maximum=0.05,
            exclusive_min=True,
            help="About twice the wire diameter for plain-woven screens.",
        ),
        Field(
            "screen_diameter",
            "Exposed screen diameter",
            "length",
            (25.0, "mm"),
            ("mm", "cm"),
            minimum=0.0,
            maximum=1.0,
            exclusive_min=True,
        ),
        Field(
            "n_screens",
            "Number of screens",
            "integer",
            1,
            minimum=1,
            maximum=500,
        ),
        Field(
            "impaction",
            "Impaction on the wires",
            "choice",
            "off",
            choices=(("off", "Not included"), ("on", "Isolated-cylinder estimate")),
            help="The fan-model fit covers diffusion and interception.",
        ),
        _flow(),
    ),
}
"""Parameters of each stage type, validated with :func:`~driftdose.api.fields.parse_fields`."""

STAGE_LABELS: dict[str, str] = {key: kind.label for key, kind in STAGE_KINDS.items()}
STAGE_HELP: dict[str, str] = {key: kind.help for key, kind in STAGE_KINDS.items()}


def _q(value: float, unit: str) -> dict[str, Any]:
    return {"value": value, "unit": unit}


DEMOS: dict[str, dict[str, Any]] = {
    "long_narrow_tube": {
        "label": "Long narrow sampling tube (invented demo)",
        "description": (
            "An invented example, not a real installation: 10 m of 4 mm tubing laid "
            "horizontally and one 90° bend, at 1.5 L/min."
        ),
        "inputs": {
            "flow": _q(1.5, "L/min"),
            "particle_density": _q(1.0, "g/cm3"),
            "target": "none",
            "stages": [
                {
                    "type": "tube",
                    "name": "10 m of 4 mm tubing",
                    "length": _q(10.0, "m"),
                    "tube_diameter": _q(4.0, "mm"),
                    "inclination": _q(0.0, "deg"),
                    "mechanisms": "both",
                },
                {
                    "type": "bend",
                    "name": "90° bend",
                    "tube_diameter": _q(4.0, "mm"),
                    "bend_angle": _q(90.0, "deg"),
                    "curvature_radius": _q(5.0, "cm"),
                },
            ],
        },
    },
    "screen_stack": {
        "label": "Screen stack (invented demo)",
        "description": (
            "An invented example, not a real instrument: 30 cm of 6 mm tubing feeding a "
            "stack of 20 generic wire screens (40 µm wire, solidity 0.3) 20 mm across, "
            "at 1.5 L/min."
        ),
        "inputs": {
            "flow": _q(1.5, "L/min"),
            "particle_density": _q(1.0, "g/cm3"),
            "target": "none",
            "stages": [
                {
                    "type": "tube",
                    "name": "Inlet tube",
                    "length": _q(30.0, "cm"),
                    "tube_diameter": _q(6.0, "mm"),
                    "inclination": _q(0.0, "deg"),
                    "mechanisms": "both",
                },
                {
                    "type": "screens",
                    "name": "20 screens",
                    "wire_diameter": _q(40.0, "um"),
                    "solidity": _q(0.3, "1"),
                    "thickness": _q(80.0, "um"),
                    "screen_diameter": _q(20.0, "mm"),
                    "n_screens": 20,
                    "impaction": "off",
                },
            ],
        },
    },
    "respirable_line": {
        "label": "Short line with a respirable pre-separator (invented demo)",
        "description": (
            "An invented example: 1 m of 6 mm horizontal tubing to a pre-separator "
            "with a lognormal curve (cut 4 µm, steepness 1.5), compared with the ISO 7708 "
            "respirable convention, at 2.5 L/min."
        ),
        "inputs": {
            "flow": _q(2.5, "L/min"),
            "particle_density": _q(2.0, "g/cm3"),
            "target": "respirable",
            "stages": [
                {
                    "type": "tube",
                    "name": "Inlet tube",
                    "length": _q(1.0, "m"),
                    "tube_diameter": _q(6.0, "mm"),
                    "inclination": _q(0.0, "deg"),
                    "mechanisms": "both",
                },
                {
                    "type": "cyclone",
                    "name": "Pre-separator",
                    "curve": "lognormal",
                    "d50": _q(4.0, "um"),
                    "steepness": _q(1.5, "1"),
                },
            ],
        },
    },
}
"""Invented demonstration chains for the page; none copies a published or commercial design."""

ISO_TARGETS = (
    ("inhalable", "ISO 7708 inhalable"),
    ("thoracic", "ISO 7708 thoracic"),
    ("respirable", "ISO 7708 respirable"),
    ("high_risk_respirable", "ISO 7708 high-risk respirable"),
)

ICRP66_TARGET_REGIONS = ("total", "ET1", "ET2", "BB", "bb", "AI")
SIMPLIFIED_TARGET_REGIONS = ("total", "head_airways", "tracheobronchial", "alveolar")

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
_SPECTRUM_FIELDS = {f.name: f for f in spectrum_fields("spectrum_source")}

SPECTRUM_FIELDS: tuple[Field, ...] = (
    Field(
        "spectrum_source",
        "Measured spectrum to correct",
        "choice",
        "none",
        choices=(("none", "None"), ("csv", "Measured spectrum (CSV file)")),
        help="Correct a spectrum measured behind this chain for the chain's losses.",
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
            "stage_types": {
                kind: {
                    "label": STAGE_LABELS[kind],
                    "help": STAGE_HELP[kind],
                    "fields": [f.describe() for f in fields],
                }
                for kind, fields in STAGE_FIELDS.items()
            },
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
)


# ---------------------------------------------------------------------------------------------
# Building the chain
# ---------------------------------------------------------------------------------------------


def _stage_error(index: int, kind: str | None, field: str, message: str) -> dict[str, str]:
    label = STAGE_LABELS.get(kind or "")
    where = f"Stage {index + 1} ({label.lower()})" if label else f"Stage {index + 1}"
    return {"field": f"stages.{index}.{field}", "message": f"{where}: {message}"}


def _build_stage(index: int, raw: Any, flow: float, T: float, P: float):
    """Validate one stage description; return (stage, errors)."""
    if not isinstance(raw, dict):
        return None, [_stage_error(index, None, "type", "must be an object with a type.")]
    kind = raw.get("type")
    if not isinstance(kind, str) or kind not in STAGE_KINDS:
        return None, [
            _stage_error(index, None, "type", f"type must be one of {', '.join(STAGE_KINDS)}.")
        ]
    v, errors = parse_fields(STAGE_FIELDS[kind], raw)
    if errors:
        return None, [_stage_error(index, kind, e["field"], e["message"]) for e in errors]
    own_flow = v.get("flow")
    q = own_flow if own_flow is not None else flow
    name = v.get("name") or f"{index + 1}. {STAGE_LABELS[kind]}"
    try:
        stage = build_stage(kind, v, q, name)
        stage.report(T, P)  # refuses near-sonic speeds
    except StageInputError as exc:
        field = exc.parameter
        if field == "flow" and own_flow is None:
            return None, [
                {
                    "field": "flow",
                    "message": f"Sampling flow, at stage {index + 1} "
                    f"({STAGE_LABELS[kind].lower()}): {exc.message}",
                }
            ]
        return None, [_stage_error(index, kind, field, exc.message)]
    return stage, []


# ---------------------------------------------------------------------------------------------
# The measured spectrum
# ---------------------------------------------------------------------------------------------


def _parse_spectrum(
    v: dict[str, Any], desc: ParticleDescription, T: float, P: float
) -> tuple[dict[str, Any], dict[str, Any]]:
    """Read the measured spectrum from the CSV fields; raise FieldError on a fault.

    The text goes through the shared spectrum importer (same fields, checks and
    messages); the bins' concentrations become particles per bin, shown per cm^3.
    Aerodynamic diameters are turned into volume-equivalent ones for spheres of the
    particle density at the air's T and P; mobility, volume-equivalent and optical ones into
    the chain's diameter (:class:`~driftdose.diameters.ParticleDescription`). Returns (bins,
    import report).
    """
    imported, report = import_spectrum(v)
    d_type = v["spectrum_diameter_type"]
    diameters = list(imported.diameters)
    bins = {
        "diameters": diameters,
        "diameters_model": [desc.to_model(d, d_type, T, P) for d in diameters],
        "values": [n / 1e6 for n in imported.numbers],  # per bin, shown per cm^3
        "unit": "particles/cm³ per bin",
        "diameter_type": d_type,
    }
    return bins, report


# ---------------------------------------------------------------------------------------------
# Helpers for the reply
# ---------------------------------------------------------------------------------------------


def _crossings(xs: list[float], ys: list[float], level: float) -> list[float]:
    """Sizes where the curve crosses ``level`` (linear in y, logarithmic in x)."""
    out = []
    for i in range(len(xs) - 1):
        y0, y1 = ys[i] - level, ys[i + 1] - level
        if (y0 < 0.0) != (y1 < 0.0):
            t = y0 / (y0 - y1)
            out.append(math.exp(math.log(xs[i]) + t * (math.log(xs[i + 1]) - math.log(xs[i]))))
    return out


def _length_text(x: float) -> str:
    unit = auto_unit("length", x)
    return f"{from_si(x, 'length', unit):.3g} {unit_label(unit)}"


def _band_text(xs: list[float], ys: list[float]) -> str:
    """Describe the size bands where the curve is at or above 50 %."""
    above = [y >= 0.5 for y in ys]
    if not any(above):
        return "No size between 1 nm and 100 µm passes with 50 % or more."
    if all(above):
        return "Every size from 1 nm to 100 µm passes with at least 50 %."
    edges = _crossings(xs, ys, 0.5)
    points = (["1 nm"] if above[0] else []) + [_length_text(x) for x in edges]
    if above[-1]:
        points.append("100 µm")
    bands = [f"{points[i]} to {points[i + 1]}" for i in range(0, len(points) - 1, 2)]
    return "From " + "; from ".join(bands) + "."


def _fraction_row(label: str, p: float, note: str = "") -> dict[str, Any]:
    return {
        "label": label,
        "symbol": "",
        "value": 100.0 * p,
        "unit": "%",
        "si": p,
        "si_unit": "–",
        "note": note,
    }


_UNIT_KINDS = {"m/s": "velocity", "m": "length", "s": "time"}


def _report_rows(quantities: dict[str, tuple[str, float, str]]) -> list[dict[str, Any]]:
    rows = []
    for key, (label, si, unit) in quantities.items():
        kind = _UNIT_KINDS.get(unit)
        row = quantity(label, si, kind) if kind else quantity(label, si, None, unit)
        row["key"] = key
        rows.append(row)
    return rows


def _departure(
    xs_ae: list[float],
    overall: list[float],
    target: list[float | None],
    size_range: tuple[float, float] = DEPARTURE_RANGE,
) -> dict[str, Any]:
    """Maximum and mean absolute difference between the chain and the target.

    Both are taken over the curve's sizes whose aerodynamic diameter lies in ``size_range``
    (:data:`DEPARTURE_RANGE`, 0.1 to 100 um, for ISO 7708 targets;
    :data:`DEPOSITION_TARGET_RANGE`, 1 nm to 100 um, for deposition targets): the maximum
    of |P - E| with the size where it occurs, and the mean of |P - E| over those sizes,
    which are evenly spaced in log d, so the mean weights every decade of size alike. Both
    are in fraction units (0.1 = 10 percentage points).
    """
    lo, hi = size_range
    diffs = [
        (abs(p - e), x)
        for x, p, e in zip(xs_ae, overall, target, strict=True)
        if e is not None and lo <= x <= hi
    ]
    if not diffs:
        return {}
    worst, at = max(diffs)
    mean = sum(d for d, _ in diffs) / len(diffs)
    if lo >= 0.1e-6:
        span = f"{lo * 1e6:g}–{_length_text(hi)} aerodynamic"
    else:
        span = f"{_length_text(lo)} – {_length_text(hi)} aerodynamic"
    return {
        "departure_max": _fraction_row(
            f"Largest departure from the target ({span})",
            worst,
            note=f"at {_length_text(at)} aerodynamic; percentage points",
        ),
        "departure_mean": _fraction_row(
            f"Mean departure from the target ({span}, log-size average)",
            mean,
            note="percentage points",
        ),
    }


def _target_curve(target: str, xs_ae: list[float]) -> tuple[list[float | None], list[str]]:
    """The target fraction at each aerodynamic diameter [m], and the sources it rests on.

    ISO 7708 fractions are given up to 100 um aerodynamic. Deposition targets are the
    regional deposition fractions (of the particles in the ambient air) of unit-density
    spheres of each aerodynamic diameter, from 1 nm to 100 um: ``icrp66_<region>`` from the
    full ICRP 66 model for the ICRP reference worker (ICRP 68's breathing, normal nose
    breather), ``simplified_<region>`` from the algebraic fits of Hinds (1999, eqs.
    11.1-11.5), which average over their own breathing conditions. ``None`` marks sizes
    where the target is not given.
    """
    if target.startswith("icrp66_") or target.startswith("simplified_"):
        lo, hi = DEPOSITION_TARGET_RANGE
        inside = [i for i, x in enumerate(xs_ae) if lo <= x <= hi]
        sizes = [xs_ae[i] for i in inside]
        ys: list[float | None] = [None] * len(xs_ae)
        if target.startswith("icrp66_"):
            region = target.removeprefix("icrp66_")
            # unit-density spheres: aerodynamic and volume-equivalent diameters coincide
            fractions = icrp66_curves(sizes, 1000.0, 1.0, REFERENCE_WORKER, "aerodynamic")[region]
            keys = ["icrp66", "icrp68"]
        else:
            region = target.removeprefix("simplified_")
            fractions = [simplified_icrp(x)[region] for x in sizes]
            keys = ["hinds1999_ch11", "icrp66"]
        for i, y in zip(inside, fractions, strict=True):
            ys[i] = min(1.0, max(0.0, y))
        return ys, keys
    ys_iso = [iso7708_fraction(x, target) if x <= ISO7708_MAX_DIAMETER else None for x in xs_ae]
    return ys_iso, ["iso7708"]


# ---------------------------------------------------------------------------------------------
# The calculation
# ---------------------------------------------------------------------------------------------


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the sampling reply from validated SI inputs."""
    T, P, rho, flow = v["temperature"], v["pressure"], v["particle_density"], v["flow"]
    basis = v.get("density_basis") or "material"
    # the stages model spheres: with a material density the shape factor does not enter
    desc = ParticleDescription(rho, v["shape_factor"] if basis == "effective" else 1.0, basis)
    coord = "volume-equivalent" if basis == "material" else "mobility-equivalent"
    raw_stages = v["stages"]
    if not isinstance(raw_stages, list) or not raw_stages:
        raise FieldError("stages", "Add at least one stage to the sampling chain.")
    if len(raw_stages) > MAX_STAGES:
        raise FieldError("stages", f"A chain may hold at most {MAX_STAGES} stages.")
    stages, errors = [], []
    for i, raw in enumerate(raw_stages):
        stage, errs = _build_stage(i, raw, flow, T, P)
        errors += errs
        stages.append(stage)
    spectrum, csv_report = None, None
    if v["spectrum_source"] == "csv":
        try:
            spectrum, csv_report = _parse_spectrum(v, desc, T, P)
        except FieldError as exc:
            errors.append({"field": exc.field, "message": exc.message})
    if errors:
        return {"ok": False, "errors": errors}

    chain = Chain(tuple(stages))
    xs = logspace(*CURVE_RANGE, CURVE_POINTS)
    result = chain.evaluate(xs, rho, T, P)
    x_um = [x * 1e6 for x in xs]
    warnings: list[str] = []
    sources: list[str] = [
        "sutherland_ussa1976",
        "willeke1976",
        "kim2005",
        "einstein1905",
        "hinds1999",
        "schiller_naumann1933",
    ]

    stage_rows = []
    curves: dict[str, Any] = {
        "x_label": f"Particle diameter ({coord})",
        "x_unit": "µm",
        "y_label": "Penetration",
        "y_unit": "–",
        "x_aerodynamic": [x * 1e6 for x in result.aerodynamic_diameters],
        "stages": [],
    }
    for i, (stage, report, row, more) in enumerate(
        zip(stages, result.reports, result.stage_penetrations, result.size_warnings, strict=True)
    ):
        curves["stages"].append({"label": report.name, "x": x_um, "y": row})
        stage_warnings = list(report.warnings) + more
        for w in stage_warnings:
            warnings.append(f"Stage {i + 1} ({report.name}): {w}")
        for key in report.sources:
            if key not in sources:
                sources.append(key)
        stage_rows.append(
            {
                "index": i,
                "name": report.name,
                "type": stage.kind,
                "type_label": STAGE_LABELS[stage.kind],
                "regime": report.regime,
                "quantities": _report_rows(report.quantities),
                "penetration_at": [
                    _fraction_row(_length_text(d), stage.penetration(d, rho, T, P))
                    for _, d in REFERENCE_SIZES
                ],
                "half_penetration_sizes": [
                    quantity("50 % size", x, "length") for x in _crossings(xs, row, 0.5)
                ],
                "warnings": stage_warnings,
            }
        )
    curves["overall"] = {"label": "Whole chain", "x": x_um, "y": result.overall}

    results: dict[str, Any] = {}
    for key, d in REFERENCE_SIZES:
        results[f"overall_{key}"] = _fraction_row(
            f"Whole chain, {_length_text(d)}", chain.penetration(d, rho, T, P)
        )
    results["pass_band"] = text_result(
        "Sizes passed with at least 50 %", _band_text(xs, result.overall), coord
    )

    target = v["target"]
    if target != "none":
        label = dict(TARGETS)[target]
        ys_target, target_sources = _target_curve(target, result.aerodynamic_diameters)
        curves["target"] = {"label": label, "x": x_um, "y": ys_target}
        deposition_target = target not in dict(ISO_TARGETS)
        size_range = DEPOSITION_TARGET_RANGE if deposition_target else DEPARTURE_RANGE
        results.update(
            _departure(result.aerodynamic_diameters, result.overall, ys_target, size_range)
        )
        for key in target_sources:
            if key not in sources:
                sources.append(key)
        if deposition_target:
            who = (
                "the ICRP reference worker"
                if target.startswith("icrp66_")
                else "the breathing conditions the simplified fits average over"
            )
            warnings.append(
                "The target is the fraction of the particles in the air that deposits in that "
                f"region, for {who} and unit-density spheres of each aerodynamic diameter; a "
                "sampler that matches it collects what would deposit there."
                + (
                    " Below about 0.5 µm deposition depends on the particles' physical size, "
                    "so for your particle density the target is only indicative there."
                    if rho != 1000.0
                    else ""
                )
            )

    results["stages_table"] = {
        "label": "Stages",
        "reference_sizes": [_length_text(d) for _, d in REFERENCE_SIZES],
        "rows": stage_rows,
    }

    if csv_report is not None:
        results["csv_rows"] = text_result(
            "Spectrum imported",
            f"{csv_report['rows']} rows (lines {csv_report['first_line']}–"
            f"{csv_report['last_line']}), {csv_report['delimiter']}-separated",
        )
        warnings.extend(f"CSV import: {n}" for n in csv_report["notes"])
    if spectrum is not None:
        corrected = correct_spectrum(
            chain, spectrum["diameters_model"], spectrum["values"], rho, T, P
        )
        shown = [s * 1e6 for s in spectrum["diameters"]]
        results["spectrum_table"] = {
            "label": "Measured spectrum corrected for the chain's losses",
            "diameter_type": spectrum["diameter_type"],
            "diameter_unit": "µm",
            "concentration_unit": spectrum["unit"],
            "unreliable_below": UNRELIABLE_BELOW,
            "rows": [
                {
                    "diameter": x,
                    "measured": m,
                    "penetration": p,
                    "corrected": c,
                    "unreliable": flag,
                }
                for x, m, p, c, flag in zip(
                    shown,
                    corrected.measured,
                    corrected.penetration,
                    corrected.corrected,
                    corrected.unreliable,
                    strict=True,
                )
            ],
        }
        n_bad = sum(corrected.unreliable)
        if n_bad:
            warnings.append(
                f"{n_bad} of {len(corrected.unreliable)} spectrum bins pass the chain with less "
                "than 50 %: their correction is unreliable (flagged)."
            )
        curves["spectrum"] = {
            "x_label": "Diameter"
            + (
                f" ({DIAMETER_TYPE_WORDS[spectrum['diameter_type']]})"
                if spectrum["diameter_type"] != "volume_equivalent"
                else ""
            ),
            "x_unit": "µm",
            "y_label": "Concentration",
            "y_unit": spectrum["unit"],
            "measured": {"label": "Measured", "x": shown, "y": corrected.measured},
            "corrected": {"label": "Corrected for losses", "x": shown, "y": corrected.corrected},
            "unreliable": corrected.unreliable,
        }

    if basis == "effective":
        warnings.append(
            "Sizes on the chart are mobility diameters: the chain acts on spheres of the "
            "mobility diameter and the effective density, which have the particles' mass, "
            "mobility and aerodynamic diameter (DeCarlo et al. 2004); interception on screens "
            "and drag beyond Stokes flow are those of that sphere."
        )
        if "decarlo2004" not in sources:
            sources.append("decarlo2004")
    elif rho != 1000.0:
        warnings.append(
            "Sizes on the chart are volume-equivalent diameters of spheres of the given "
            "density; cyclone curves and targets act on the aerodynamic diameter and are "
            "converted."
        )
    if basis == "material" and v["shape_factor"] != 1.0:
        warnings.append(
            "The sampling stages treat particles as spheres: the shape factor is used only "
            "with an effective density, and was not applied."
        )
    if (
        spectrum is not None
        and spectrum["diameter_type"] == "mobility"
        and "decarlo2004" not in sources
    ):
        sources.append("decarlo2004")
    return {"results": results, "curves": curves, "warnings": warnings, "sources": cite(*sources)}
