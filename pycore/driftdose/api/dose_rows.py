"""Result rows of a deposited dose, shared by the deposition, burden and uncertainty replies.

One table of display units per weight, one row per region and weight, and the bars of the dose
chart, so the three calculations show a dose the same way.
"""

from __future__ import annotations

from typing import Any

from ..dose import DoseResult
from .labels import REGION_LABELS, WEIGHT_WORDS
from .reply import quantity, row

__all__ = ["DOSE_UNITS", "dose_bars", "region_rows"]

DOSE_UNITS: dict[str, tuple[float, str, str]] = {
    "number": (1.0, "particles", "1"),
    "surface": (1e-6, "mm2", "m2"),
    "mass": (1e-9, "ug", "kg"),
}
"""Display of a deposited amount by weight: (factor to SI, unit code, SI unit code)."""


def region_rows(res: DoseResult) -> dict[str, Any]:
    """Rows of the deposited fraction, rate per hour and dose per region and weight.

    Parameters
    ----------
    res : DoseResult
        Fractions [-], rates (number [1/s], surface [m^2/s], mass [kg/s]) and doses over
        ``res.duration`` [s] per region.

    Returns
    -------
    dict
        ``fraction_<region>_<weight>``, ``rate_<region>_<weight>`` and
        ``dose_<region>_<weight>`` rows, region by region.
    """
    out: dict[str, Any] = {}
    hours = res.duration / 3600.0
    for r in res.regions:
        name = REGION_LABELS[r]
        for w in ("number", "surface", "mass"):
            out[f"fraction_{r}_{w}"] = quantity(
                f"{name}: deposited fraction by {WEIGHT_WORDS[w]}", res.fractions[r][w]
            )
        for w in ("number", "surface", "mass"):
            factor, unit, si_unit = DOSE_UNITS[w]
            out[f"rate_{r}_{w}"] = row(
                f"{name}: {WEIGHT_WORDS[w]} deposited per hour",
                res.rates[r][w] * 3600.0,
                factor,
                f"{unit}/h",
                f"{si_unit}/h",
            )
            out[f"dose_{r}_{w}"] = row(
                f"{name}: {WEIGHT_WORDS[w]} deposited in {hours:g} h",
                res.doses[r][w],
                factor,
                unit,
                si_unit,
            )
    return out


def dose_bars(res: DoseResult) -> dict[str, Any]:
    """The dose chart's bars: deposited amount per region over the exposure and per hour.

    Parameters
    ----------
    res : DoseResult
        Doses over ``res.duration`` [s] and rates per region.

    Returns
    -------
    dict
        ``regions`` (labels), ``keys``, ``per`` and per weight its label, unit and values.
    """
    hours = res.duration / 3600.0
    bars: dict[str, Any] = {
        "regions": [REGION_LABELS[r] for r in res.regions],
        "keys": list(res.regions),
        "per": f"{hours:g} h",
    }
    for w in ("number", "surface", "mass"):
        factor, unit, _ = DOSE_UNITS[w]
        bars[w] = {
            "label": f"Deposited {WEIGHT_WORDS[w]} in {hours:g} h",
            "unit": unit,
            "y": [res.doses[r][w] / factor for r in res.regions],
            "per_hour": [res.rates[r][w] * 3600.0 / factor for r in res.regions],
            "per_hour_label": f"Deposited {WEIGHT_WORDS[w]} per hour",
        }
    return bars
