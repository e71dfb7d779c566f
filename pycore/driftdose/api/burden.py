"""Calculation ``burden``: what stays in the respiratory tract over months and years.

Takes the inputs of the ``deposition`` calculation (aerosol, breathing, exposure duration per
shift) and a work pattern (shifts per week, weeks per year, working years) or a single
exposure, and answers with the retained number, surface area and mass per region (ET, BB,
bb, AI, lymph nodes) at milestones (end of the first shift, week and year, end of the working
life, years after exposure ends), the amounts cleared to the gut and removed by nose blowing,
and curves of the retained amounts against time. Particles are taken as insoluble: the
particle-transport model of ICRP Publication 66 (1994), or its revision in ICRP Publication
130 (2015), with no absorption to blood.
"""

from __future__ import annotations

import math
from typing import Any

from ..compose.deposition import validity_warnings
from ..diameters import ParticleDescription
from ..retention import DAY, YEAR, compartment_inputs, retained_burden
from ..retention.model import RATE_SETS, exposure_end, single_exposure, work_schedule
from ..sources import cite
from .demos import BURDEN_DEMOS as DEMOS
from .exposure_fields import EXPOSURE_FIELDS, aerosol_of, subject_of
from .fields import Field, FieldError
from .labels import WEIGHT_WORDS
from .reply import row

TITLE = "Retained burden over months and years"

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
UNITS = {  # weight -> (factor to SI, unit, SI unit)
    "number": (1.0, "particles", "1"),
    "surface": (1e-6, "mm²", "m²"),
    "mass": (1e-6, "mg", "kg"),
}
SERIES_PER_DECADE = 48

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
    Field(
        "shifts_per_week",
        "Shifts per week",
        "integer",
        5,
        minimum=1,
        maximum=7,
        applies=("exposure_pattern", ("work",)),
        help="On consecutive days, each shift starting at the same time of day.",
    ),
    Field(
        "weeks_per_year",
        "Working weeks per year",
        "integer",
        48,
        minimum=1,
        maximum=52,
        applies=("exposure_pattern", ("work",)),
    ),
    Field(
        "working_years",
        "Working years",
        "integer",
        40,
        minimum=1,
        maximum=50,
        applies=("exposure_pattern", ("work",)),
    ),
    Field(
        "years_after",
        "Follow-up after exposure ends (years)",
        "integer",
        10,
        minimum=0,
        maximum=50,
        help="How long after the last exposure the retained amounts are followed.",
    ),
)

FIELDS: tuple[Field, ...] = EXPOSURE_FIELDS + BURDEN_FIELDS


def particle_description(v: dict[str, Any], f_density: float = 1.0, f_shape: float = 1.0) -> Any:
    """The particle description of the deposition inputs, density and shape scaled."""
    return ParticleDescription(
        v["particle_density"] * f_density,
        v["shape_factor"] * f_shape,
        v.get("density_basis") or "material",
    )


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


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the burden reply from validated SI inputs."""
    if v["model"] != "icrp66":
        raise FieldError(
            "model",
            "The retained burden needs the regional deposition of the full ICRP 66 model "
            "(its ET, BB, bb and AI regions); choose that model.",
        )
    aerosol, report = aerosol_of(v)
    dist, subject = aerosol.distribution, subject_of(v)
    rate_set = v["transport_rates"]
    try:
        inputs = compartment_inputs(
            dist, subject, rate_set, thermodynamic=v["thermodynamic_convention"]
        )
        schedule = schedule_of(v)
    except ValueError as exc:
        raise FieldError("", str(exc)) from None
    marks = milestones(v)
    end = max(t for _, _, t in marks)
    series = series_times(min(0.1 * 3600.0, v["exposure_duration"] / 4), end)
    times = [t for _, _, t in marks] + series
    res = retained_burden(inputs, schedule, times, rate_set)
    nm = len(marks)
    results: dict[str, Any] = {}
    rs = RATE_SETS[rate_set]
    results["transport_rates"] = {
        "label": "Clearance model",
        "text": f"{rs.label}, insoluble particles",
        "note": "",
    }
    for i, (key, label, _) in enumerate(marks):
        for w in ("mass", "number", "surface"):
            factor, unit, si_unit = UNITS[w]
            for region in (*RETAINED, "GI", "environment", "deposited"):
                si = res.regions[w][region][i]
                results[f"burden_{key}_{region}_{w}"] = row(
                    f"{REGION_LABELS[region]}, {WEIGHT_WORDS[w]}, {label}",
                    si,
                    factor,
                    unit,
                    si_unit,
                )
    life_index = nm - 2 if marks[-1][0] == "after" else nm - 1
    results["compartments"] = _compartment_table(res, rs, life_index, marks[life_index][1])
    curves: dict[str, Any] = {
        "region_labels": dict(REGION_LABELS),
        "milestones": [{"key": k, "label": lab, "t_days": t / DAY} for k, lab, t in marks],
    }
    for w in ("mass", "number", "surface"):
        factor, unit, _ = UNITS[w]
        x = [t / DAY for t in series]
        curves[w] = {
            "x_label": "Time from the first exposure",
            "x_unit": "d",
            "y_label": f"Retained {WEIGHT_WORDS[w]}",
            "y_unit": unit,
            "series": {
                r: {
                    "label": REGION_LABELS[r],
                    "x": x,
                    "y": [y / factor for y in res.regions[w][r][nm:]],
                }
                for r in (*RETAINED, "GI")
            },
        }
    warnings = validity_warnings(
        aerosol,
        subject,
        "icrp66",
        v["thermodynamic_convention"],
        custom_breathing=v["breathing"] == "custom",
    )
    warnings.append(
        "Insoluble particles assumed: the clearance model moves particles mechanically and "
        "ignores dissolution and absorption to blood, so soluble material is overestimated."
    )
    if report is not None:
        warnings.extend(f"CSV import: {n}" for n in report["notes"])
    sources = ["icrp66", "icrp66_transport", "hatch_choate1929", "kim2005"]
    if rate_set == "icrp130":
        sources.insert(2, "icrp130")
    return {
        "results": results,
        "curves": curves,
        "warnings": warnings,
        "sources": cite(*sources),
    }


def _compartment_table(res: Any, rs: Any, i: int, when: str) -> dict[str, Any]:
    rows = []
    for c in rs.compartments:
        rows.append(
            {
                "compartment": c,
                "quantities": [
                    {
                        "label": f"Retained {WEIGHT_WORDS[w]} {when}",
                        "unit": UNITS[w][1],
                        "value": res.compartments[w][c][i] / UNITS[w][0],
                    }
                    for w in ("mass", "number", "surface")
                ],
            }
        )
    return {"label": f"Amounts by compartment, {when}", "rows": rows}


def exposure_end_of(v: dict[str, Any]) -> float:
    """End of the last exposure of the chosen pattern. [s]"""
    return exposure_end(schedule_of(v))
