"""Sampling stages at the boundary: each kind's field declarations, and the chain's parser.

:data:`STAGE_FIELDS` declares, per stage kind of the core registry
(:data:`driftdose.transport.STAGE_KINDS`), the parameters a stage object carries in a request
(``{"type": <kind>, <parameter>: {"value": ..., "unit": ...}, ...}``); they are checked by the
same :class:`~driftdose.api.fields.Field` machinery as every other input. :func:`parse_stages`
validates a list of stage objects and builds the stages through the registry; its errors name
the field as ``stages.<index>.<parameter>`` (index from 0). :func:`stage_types` describes the
kinds for the form.
"""

from __future__ import annotations

import math
from typing import Any

from ..transport import STAGE_KINDS, StageInputError, build_stage
from ..transport.chain import Stage
from ..transport.impactor import DEFAULT_EFFICIENCY_WIDTH
from .declare import bounded, positive, spread, whole
from .fields import Field, parse_fields

__all__ = [
    "BORE_MIN",
    "FLOW_MIN",
    "MAX_STAGES",
    "STAGE_FIELDS",
    "WIRE_MIN",
    "ParsedStage",
    "parse_stages",
    "stage_types",
]

MAX_STAGES = 20
"""Most stages a chain may hold."""
FLOW_MIN = 1e-9
"""Smallest flow accepted [m^3/s], 0.06 mL/min: below it a flow is taken as a typing mistake."""
BORE_MIN = 1e-5
"""Narrowest tube or nozzle accepted [m], 10 um (smaller ones overflow)."""
WIRE_MIN = 1e-7
"""Thinnest screen wire accepted [m], 0.1 um."""


_NAME = Field(
    "name",
    "Stage name",
    "text",
    "",
    required=False,
    help="Your label for this stage.",
    extra={"max_length": 60},
)
_FLOW = bounded(
    "flow",
    "Flow through this stage",
    "flow",
    (None, "L/min"),
    ("L/min", "m3/h", "cm3/s", "m3/s"),
    FLOW_MIN,
    0.1,
    required=False,
    help="Leave empty to use the sampling flow.",
)
_BORE = bounded(
    "tube_diameter", "Tube inner diameter", "length", (4.0, "mm"), ("mm", "cm", "m"), BORE_MIN, 1.0
)

STAGE_FIELDS: dict[str, tuple[Field, ...]] = {
    "tube": (
        _NAME,
        positive("length", "Tube length", "length", (1.0, "m"), ("m", "cm", "mm"), 1000.0),
        _BORE,
        bounded(
            "inclination",
            "Inclination from horizontal",
            "angle",
            (0.0, "deg"),
            ("deg",),
            -math.pi / 2,
            math.pi / 2,
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
        _FLOW,
    ),
    "bend": (
        _NAME,
        _BORE,
        positive("bend_angle", "Bend angle", "angle", (90.0, "deg"), ("deg",), 2 * math.pi),
        positive(
            "curvature_radius",
            "Bend radius (to the tube axis)",
            "length",
            (5.0, "cm"),
            ("cm", "mm", "m"),
            10.0,
            help="Must exceed half the tube's inner diameter.",
        ),
        _FLOW,
    ),
    "cyclone": (
        _NAME,
        Field(
            "curve",
            "Penetration curve",
            "choice",
            "lognormal",
            choices=(
                ("lognormal", "Lognormal from cut size and GSD"),
                ("iso7708_respirable", "Ideal ISO 7708 respirable curve"),
            ),
        ),
        bounded(
            "d50",
            "Cut size (aerodynamic, 50 % penetration)",
            "length",
            (4.0, "um"),
            ("um",),
            0.05e-6,
            100e-6,
        ),
        spread(
            "curve_gsd",
            "GSD of the curve",
            1.5,
            5.0,
            help="d50 / d84; smaller is sharper. Above 1.",
            formerly=("steepness",),
        ),
    ),
    "impactor": (
        _NAME,
        Field(
            "jet",
            "Jet shape",
            "choice",
            "round",
            choices=(("round", "Round nozzles"), ("rectangular", "Rectangular slits")),
        ),
        bounded(
            "nozzle_diameter",
            "Nozzle diameter or slit width",
            "length",
            (1.0, "mm"),
            ("mm", "um", "cm"),
            BORE_MIN,
            0.1,
        ),
        whole("n_nozzles", "Number of nozzles", 1, 1, 10000),
        positive(
            "slit_length",
            "Slit length (rectangular jets)",
            "length",
            (10.0, "mm"),
            ("mm", "cm"),
            1.0,
        ),
        spread(
            "efficiency_width",
            "Width of the efficiency curve",
            DEFAULT_EFFICIENCY_WIDTH,
            5.0,
            help="Width in √Stk around the cut; 1.2 is a plain default, not a published value.",
            formerly=("steepness",),
        ),
        _FLOW,
    ),
    "screens": (
        _NAME,
        bounded(
            "wire_diameter", "Wire diameter", "length", (50.0, "um"), ("um", "mm"), WIRE_MIN, 5e-3
        ),
        positive(
            "solidity",
            "Solidity (solid volume fraction)",
            "dimensionless",
            (0.3, "1"),
            ("1",),
            1.0,
            help="Between 0 and 1; ordinary mesh screens are about 0.2 to 0.4.",
        ),
        positive(
            "thickness",
            "Thickness of one screen",
            "length",
            (100.0, "um"),
            ("um", "mm"),
            0.05,
            help="About twice the wire diameter for plain-woven screens.",
        ),
        positive(
            "screen_diameter", "Exposed screen diameter", "length", (25.0, "mm"), ("mm", "cm"), 1.0
        ),
        whole("n_screens", "Number of screens", 1, 1, 500),
        Field(
            "impaction",
            "Impaction on the wires",
            "choice",
            "off",
            choices=(("off", "Not included"), ("on", "Isolated-cylinder estimate")),
            help="The fan-model fit covers diffusion and interception.",
        ),
        _FLOW,
    ),
}
"""Parameters of each stage type, validated with :func:`~driftdose.api.fields.parse_fields`."""


def stage_types() -> dict[str, dict[str, Any]]:
    """Each stage kind for the form: its label, help and field descriptions, in registry order."""
    return {
        key: {
            "label": kind.label,
            "help": kind.help,
            "fields": [f.describe() for f in STAGE_FIELDS[key]],
        }
        for key, kind in STAGE_KINDS.items()
    }


class ParsedStage:
    """A validated stage: the core stage, its kind and the user's own name (``""`` if none)."""

    __slots__ = ("kind", "name", "stage")

    def __init__(self, stage: Stage, kind: str, name: str) -> None:
        self.stage, self.kind, self.name = stage, kind, name


def parse_stages(
    raw_stages: Any, flow: float, T: float, P: float
) -> tuple[list[ParsedStage], list[dict[str, str]]]:
    """Validate the stage objects of a request and build the stages.

    Parameters
    ----------
    raw_stages : any
        The request's ``stages``: a list of stage objects.
    flow : float
        The sampling flow, used by stages that give none of their own. [m^3/s]
    T : float
        Air temperature, for the speed check. [K]
    P : float
        Air pressure. [Pa]

    Returns
    -------
    tuple
        The stages (empty if any is faulty) and the errors, ``{"field", "message"}`` each.

    """
    if not isinstance(raw_stages, list) or not raw_stages:
        return [], [{"field": "stages", "message": "Add at least one stage to the sampling chain."}]
    if len(raw_stages) > MAX_STAGES:
        return [], [
            {"field": "stages", "message": f"A chain may hold at most {MAX_STAGES} stages."}
        ]
    stages, errors = [], []
    for i, raw in enumerate(raw_stages):
        stage, errs = _build_stage(i, raw, flow, T, P)
        errors += errs
        if stage is not None:
            stages.append(stage)
    return (stages if not errors else []), errors


def _stage_error(index: int, kind: str | None, field: str, message: str) -> dict[str, str]:
    label = STAGE_KINDS[kind].label if kind in STAGE_KINDS else ""
    where = f"Stage {index + 1} ({label.lower()})" if label else f"Stage {index + 1}"
    return {"field": f"stages.{index}.{field}", "message": f"{where}: {message}"}


def _build_stage(
    index: int, raw: Any, flow: float, T: float, P: float
) -> tuple[ParsedStage | None, list[dict[str, str]]]:
    """Validate one stage description; return (stage, errors)."""
    if not isinstance(raw, dict):
        return None, [_stage_error(index, None, "type", "must be an object with a type.")]
    kind = raw.get("type")
    if not isinstance(kind, str) or kind not in STAGE_KINDS:
        return None, [
            _stage_error(index, None, "type", f"type must be one of {', '.join(STAGE_KINDS)}.")
        ]
    v, errors = parse_fields(STAGE_FIELDS[kind], raw)  # former names read by parse_fields
    if errors:
        return None, [_stage_error(index, kind, e["field"], e["message"]) for e in errors]
    own_flow = v.get("flow")
    q = own_flow if own_flow is not None else flow
    label = STAGE_KINDS[kind].label
    own_name = v.get("name") or ""
    try:
        stage = build_stage(kind, v, q, own_name or label)
        stage.report(T, P)  # refuses near-sonic speeds
    except StageInputError as exc:
        field = exc.parameter
        if field == "flow" and own_flow is None:
            return None, [
                {
                    "field": "flow",
                    "message": f"Sampling flow, at stage {index + 1} "
                    f"({label.lower()}): {exc.message}",
                }
            ]
        return None, [_stage_error(index, kind, field, exc.message)]
    return ParsedStage(stage, kind, own_name), []
