"""Target curves a sampling chain is compared with, and how far a chain departs from one.

:data:`TARGETS` maps a key to a target: the four ISO 7708 fractions of
:mod:`driftdose.conventions`, and regional deposition fractions from the models of
:data:`driftdose.deposition.DEPOSITION_MODELS`; :func:`target_curve` evaluates one at
aerodynamic diameters and :func:`departure` measures the largest and mean difference. Used by
:mod:`driftdose.compose.sampling`; it never imports :mod:`driftdose.api`.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache

from .. import conventions
from ..deposition import REFERENCE_WORKER, deposition_model

__all__ = [
    "DEPARTURE_RANGE",
    "DEPOSITION_TARGET_RANGE",
    "ICRP66_TARGET_REGIONS",
    "SIMPLIFIED_TARGET_REGIONS",
    "TARGETS",
    "Departure",
    "TargetOutcome",
    "departure",
    "target_curve",
]

DEPARTURE_RANGE = (0.1e-6, 100e-6)
"""Aerodynamic diameters over which the departure from an ISO 7708 target is measured [m]:
the sizes that carry the mass of workplace aerosols and for which the ISO 7708 conventions
are meant (our choice of range)."""
DEPOSITION_TARGET_RANGE = (1e-9, 100e-6)
"""Aerodynamic diameters over which a deposition target is given and the departure from it
measured [m]: the stated range of both deposition models (ICRP 66 Annex D; Hinds 1999,
section 11.4)."""
ICRP66_TARGET_REGIONS = ("total", "ET1", "ET2", "BB", "bb", "AI")
"""Regions of the ICRP 66 model offered as targets."""
SIMPLIFIED_TARGET_REGIONS = ("total", "head_airways", "tracheobronchial", "alveolar")
"""Regions of the simplified fits offered as targets."""

TARGETS: dict[str, tuple[str, str]] = {
    **{key: ("iso7708", key) for key in conventions.CONVENTIONS},
    **{f"icrp66_{r}": ("icrp66", r) for r in ICRP66_TARGET_REGIONS},
    **{f"simplified_{r}": ("simplified", r) for r in SIMPLIFIED_TARGET_REGIONS},
}
"""Target curves by key: (family, region or convention). The family is ``iso7708`` (a key of
:data:`driftdose.conventions.CONVENTIONS`) or a deposition model key."""


@dataclass(frozen=True)
class Departure:
    """How far the chain's penetration departs from a target curve.

    Attributes
    ----------
    largest : float
        Largest |P - E| over the range. [-]
    at : float
        Aerodynamic diameter where it occurs. [m]
    mean : float
        Mean |P - E| over the range's sizes (evenly spaced in ln d). [-]
    size_range : tuple of float
        The aerodynamic diameters it was taken over. [m]

    """

    largest: float
    at: float
    mean: float
    size_range: tuple[float, float]


@dataclass(frozen=True)
class TargetOutcome:
    """A target curve and the chain's departure from it.

    Attributes
    ----------
    key : str
        A key of :data:`TARGETS`.
    family : str
        ``iso7708``, ``icrp66`` or ``simplified``.
    values : list of float or None
        Target fraction at each size's aerodynamic diameter; None where it is not given. [-]
    departure : Departure or None
        None when no size of the range has a target value.
    sources : list of str
        Bibliography keys.

    """

    key: str
    family: str
    values: list[float | None]
    departure: Departure | None
    sources: list[str]


def departure(
    xs_ae: Sequence[float],
    overall: Sequence[float],
    target: Sequence[float | None],
    size_range: tuple[float, float] = DEPARTURE_RANGE,
) -> Departure | None:
    """Largest and mean absolute difference between the chain and a target.

    Parameters
    ----------
    xs_ae : sequence of float
        Aerodynamic diameters of the curve's sizes, evenly spaced in ln d. [m]
    overall : sequence of float
        The chain's penetration at those sizes. [-]
    target : sequence of float or None
        The target at those sizes; None where it is not given. [-]
    size_range : tuple of float
        Aerodynamic diameters taken into account: :data:`DEPARTURE_RANGE` for ISO 7708
        targets, :data:`DEPOSITION_TARGET_RANGE` for deposition targets. [m]

    Returns
    -------
    Departure or None
        The maximum of |P - E| with the size where it occurs, and the mean of |P - E|
        (the sizes are evenly spaced in log d, so the mean weights every decade of size
        alike), in fraction units (0.1 = 10 percentage points); None if no size of the
        range has a target value.

    """
    lo, hi = size_range
    diffs = [
        (abs(p - e), x)
        for x, p, e in zip(xs_ae, overall, target, strict=True)
        if e is not None and lo <= x <= hi
    ]
    if not diffs:
        return None
    worst, at = max(diffs)
    return Departure(worst, at, sum(d for d, _ in diffs) / len(diffs), size_range)


def target_curve(key: str, xs_ae: Sequence[float]) -> TargetOutcome:
    """A target curve at aerodynamic diameters ``xs_ae``.

    Parameters
    ----------
    key : str
        A key of :data:`TARGETS`: an ISO 7708 fraction (``respirable``, ...), or
        ``icrp66_<region>`` / ``simplified_<region>`` for regional deposition.
    xs_ae : sequence of float
        Aerodynamic diameters. [m]

    Returns
    -------
    TargetOutcome
        The fraction at each size [-] (None where the target is not given), without a
        departure (:func:`compose_sampling` adds it).

    Notes
    -----
    ISO 7708 fractions (ISO 7708:1995, through :mod:`driftdose.conventions`) are given up to
    :data:`driftdose.conventions.D_AE_MAX`. Deposition targets are the regional deposition
    fractions (of the particles in the ambient air) of unit-density spheres of each
    aerodynamic diameter, inside the model's stated range: the full ICRP 66 model for the
    ICRP reference worker (ICRP 66 Annex D with ICRP 68's breathing, normal nose breather),
    or the fits of Hinds (1999, eqs. 11.1-11.5), which average over their own breathing.

    """
    if key not in TARGETS:
        raise ValueError(f"unknown target {key!r}; valid: {', '.join(TARGETS)}")
    family, values, sources = _target_values(key, tuple(xs_ae))
    return TargetOutcome(key, family, list(values), None, list(sources))


@lru_cache(maxsize=8)
def _target_values(
    key: str, xs_ae: tuple[float, ...]
) -> tuple[str, tuple[float | None, ...], tuple[str, ...]]:
    """Family, values and sources of :func:`target_curve`, kept: they depend only on the sizes."""
    family, part = TARGETS[key]
    if family == "iso7708":
        values: list[float | None] = [
            conventions.iso7708_fraction(x, part) if x <= conventions.D_AE_MAX else None
            for x in xs_ae
        ]
        return family, tuple(values), ("iso7708",)
    model = deposition_model(family)
    lo, hi = (
        max(model.d_min, DEPOSITION_TARGET_RANGE[0]),
        min(model.d_max, DEPOSITION_TARGET_RANGE[1]),
    )
    inside = [i for i, x in enumerate(xs_ae) if lo <= x <= hi]
    # unit-density spheres: aerodynamic and volume-equivalent diameters coincide
    fractions = model.curves([xs_ae[i] for i in inside], 1000.0, 1.0, REFERENCE_WORKER, "icrp66")
    values = [None] * len(xs_ae)
    for i, y in zip(inside, fractions[part], strict=True):
        values[i] = min(1.0, max(0.0, y))
    sources = ("icrp66", "icrp68") if family == "icrp66" else ("hinds1999_ch11", "icrp66")
    return family, tuple(values), sources
