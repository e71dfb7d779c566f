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

from typing import Any

from ..compose.deposition import validity_warnings
from ..retention import DAY, compartment_inputs, retained_burden
from ..retention.model import RATE_SETS
from ..sources import cite
from .burden_inputs import (
    BURDEN_FIELDS,
    FIELDS,
    REGION_LABELS,
    RETAINED,
    UNITS,
    exposure_end_of,
    milestones,
    schedule_of,
    series_times,
)
from .demos import BURDEN_DEMOS as DEMOS
from .exposure_fields import aerosol_of, particle_description, subject_of
from .fields import FieldError
from .labels import WEIGHT_WORDS
from .reply import row, shared_axis
from .spectrum_fields import import_warnings

__all__ = [
    "BURDEN_FIELDS",
    "DEMOS",
    "FIELDS",
    "TITLE",
    "exposure_end_of",
    "milestones",
    "particle_description",
    "run",
    "schedule_of",
]

TITLE = "Retained burden over months and years"


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
    x = shared_axis(curves, "time", [t / DAY for t in series])
    for w in ("mass", "number", "surface"):
        factor, unit, _ = UNITS[w]
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
    warnings.extend(import_warnings(report))
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
