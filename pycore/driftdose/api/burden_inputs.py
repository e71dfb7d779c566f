"""Inputs of the retained-burden calculation, shared by ``burden`` and its ranges (``uncertainty``).

The work-pattern fields, the region labels and units of retained amounts, and the readers that
turn validated SI inputs into what the retention models take (particle description, aerosol and
breathing, exposure schedule, reported moments). Both calculations import this module; neither
imports the other.
"""

from __future__ import annotations

import math
from typing import Any

from ..retention import DAY, YEAR
from ..retention.model import exposure_end, single_exposure, work_schedule
from .declare import whole
from .demos import BURDEN_DEMOS as DEMOS
from .exposure_fields import EXPOSURE_FIELDS, aerosol_of, subject_of
from .fields import Field

REGION_LABELS = {
    "ET": "Extrathoracic airways (ET1, ET2)",
    "BB": "Bronchi (BB)",
    "bb": "Bronchioles (bb)",
    "AI": "Alveolar-interstitial (AI)",
    "LN": "Lymph nodes (LNET, LNTH)",
    "lungs": "Lungs (BB + bb + AI)",
    "GI": "Cleared to the gut (cumulative)",
    "environment": "Removed by nose blowing (cumulative)",
    "deposited": "Deposited (cumulative)",
}
RETAINED = ("ET", "BB", "bb", "AI", "LN", "lungs")
UNITS = {  # weight -> (factor to SI, unit code, SI unit code)
    "number": (1.0, "particles", "1"),
    "surface": (1e-6, "mm2", "m2"),
    "mass": (1e-6, "mg", "kg"),
}
SERIES_PER_DECADE = 48

_AT_WORK = ("exposure_pattern", ("work",))

BURDEN_FIELDS: tuple[Field, ...] = (
    Field(
        "transport_rates",
        "Clearance (particle transport) model",
        "choice",
        "icrp66",
        choices=(
            ("icrp66", "ICRP 66 (1994): with the slow-cleared bronchial fraction"),
            ("icrp130", "ICRP 130 (2015): revised, slower alveolar clearance"),
        ),
        help="Published rate constants for insoluble particles; no absorption to blood.",
        extra={"demos": [dict(d) for d in DEMOS]},
    ),
    Field(
        "exposure_pattern",
        "Exposure repeated",
        "choice",
        "work",
        choices=(
            ("work", "Every shift of a working life"),
            ("single", "Once (a single exposure)"),
        ),
        help="The exposure duration above is one shift; a working life repeats it.",
    ),
    whole(
        "shifts_per_week",
        "Shifts per week",
        5,
        1,
        7,
        applies=_AT_WORK,
        help="On consecutive days, each shift starting at the same time of day.",
    ),
    whole("weeks_per_year", "Working weeks per year", 48, 1, 52, applies=_AT_WORK),
    whole("working_years", "Working years", 40, 1, 50, applies=_AT_WORK),
    whole(
        "years_after",
        "Follow-up after exposure ends (years)",
        10,
        0,
        50,
        help="How long after the last exposure the retained amounts are followed.",
    ),
)

FIELDS: tuple[Field, ...] = EXPOSURE_FIELDS + BURDEN_FIELDS
"""Every input of the burden calculation."""


def aerosol_and_subject(v: dict[str, Any]) -> tuple[Any, Any, dict | None, tuple]:
    """Distribution, breathing, CSV report and the modes as entered, from the deposition
    inputs (validated SI), read as the deposition calculation reads them."""
    aerosol, report = aerosol_of(v)
    return aerosol.distribution, subject_of(v), report, aerosol.modes


def schedule_of(v: dict[str, Any]) -> Any:
    """The exposure blocks of the chosen pattern."""
    if v["exposure_pattern"] == "single":
        return single_exposure(v["exposure_duration"])
    return work_schedule(
        v["exposure_duration"] / 3600.0,
        v["shifts_per_week"],
        v["weeks_per_year"],
        v["working_years"],
    )


def milestones(v: dict[str, Any]) -> list[tuple[str, str, float]]:
    """(key, label, time [s]) of the reported moments."""
    shift = v["exposure_duration"]
    after = v["years_after"] * YEAR
    if v["exposure_pattern"] == "single":
        out = [
            ("end", "at the end of the exposure", shift),
            ("day", "1 day after the start", max(DAY, shift)),
            ("month", "30 days after the start", 30 * DAY),
            ("year", "1 year after the start", YEAR),
        ]
        if after > YEAR:
            out.append(("after", f"{v['years_after']} years after the exposure", shift + after))
        return out
    life = v["working_years"] * YEAR
    out = [
        ("shift", "at the end of the first shift", shift),
        ("week", "at the end of the first week", 7 * DAY),
        ("year", "after the first year", YEAR),
        ("life", f"after {v['working_years']} working years", life),
    ]
    if after > 0:
        out.append(("after", f"{v['years_after']} years after exposure ends", life + after))
    return out


def series_times(start: float, end: float) -> list[float]:
    """Log-spaced times from ``start`` to ``end`` [s], SERIES_PER_DECADE per decade."""
    n = max(2, math.ceil(math.log10(end / start) * SERIES_PER_DECADE) + 1)
    step = math.log(end / start) / (n - 1)
    return [start * math.exp(i * step) for i in range(n - 1)] + [end]


def exposure_end_of(v: dict[str, Any]) -> float:
    """End of the last exposure of the chosen pattern. [s]"""
    return exposure_end(schedule_of(v))
