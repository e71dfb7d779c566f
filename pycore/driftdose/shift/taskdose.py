"""Deposited dose of one task: a size distribution scaled to what was measured, breathed
behind the protection worn.

Each task's aerosol is a size distribution whose amount comes from the task's measurements:

- ``channels``: the task-period mean of the logged size channels, as a binned spectrum;
- ``spectrum`` or ``modes``: an imported spectrum or lognormal modes that give the *shape*,
  scaled so that its number concentration, mass concentration or alveolar LDSA equals the
  task's measured mean of that quantity.

The breathing is the task's activity level and route (ICRP 66 reference values,
:func:`driftdose.deposition.activity`). The assigned protection factor divides the
concentration that is inhaled (the definition of an assigned protection factor: the ratio of
the ambient to the inhaled concentration, EN 529:2005, from memory). The dose is then
:func:`driftdose.dose.deposited_dose` over the task's duration; being linear in the
concentration and the duration, doses of tasks add up.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace
from typing import Any

from ..deposition import REFERENCE_WORKER, Subject, activity
from ..distribution import BinnedSpectrum, LognormalMode, Multimodal, bin_edges
from ..dose import DoseResult, deposited_dose
from ..ldsa import lung_deposited_surface_area

__all__ = [
    "SCALE_QUANTITIES",
    "channel_spectrum",
    "scaled",
    "shape_amount",
    "task_dose",
]

SCALE_QUANTITIES = ("number", "mass", "ldsa")
"""Measured quantities a size distribution's shape can be scaled to."""


def channel_spectrum(
    diameters: Sequence[float],
    means: Sequence[float],
    per_log10: bool,
    density: float = 1000.0,
    shape_factor: float = 1.0,
) -> BinnedSpectrum:
    """A binned spectrum from the mean of each size channel over a task.

    Parameters
    ----------
    diameters : sequence of float
        Channel mid-point diameters, increasing. [m]
    means : sequence of float
        Task mean of each channel: particles per bin [1/m^3], or dN/dlog10 d [1/m^3].
    per_log10 : bool
        Whether the channels are dN/dlog10 d (converted to per bin with the bin widths of
        :func:`driftdose.distribution.bin_edges`).
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]

    Returns
    -------
    BinnedSpectrum
        Negative means (instrument noise) are taken as zero.

    """
    numbers = [max(0.0, m) for m in means]
    if per_log10:
        edges = bin_edges(diameters)
        numbers = [
            n * math.log10(b / a) for n, a, b in zip(numbers, edges, edges[1:], strict=False)
        ]
    return BinnedSpectrum(tuple(diameters), tuple(numbers), density, shape_factor)


def shape_amount(dist: Any, quantity: str, model: str = "icrp66") -> float:
    """Amount of ``quantity`` in a distribution: number [1/m^3], mass [kg/m^3] or alveolar
    LDSA for the ICRP reference worker [m^2/m^3].

    Parameters
    ----------
    dist : LognormalMode, Multimodal or BinnedSpectrum
        The airborne particles.
    quantity : str
        ``number``, ``mass`` or ``ldsa``.
    model : str
        Deposition model for the LDSA: ``icrp66`` or ``simplified``.
    """
    if quantity == "number":
        return dist.total("number")
    if quantity == "mass":
        return dist.total("mass")
    if quantity == "ldsa":
        r = deposited_dose(dist, REFERENCE_WORKER, 3600.0, model)
        return lung_deposited_surface_area(r)["alveolar"]
    raise ValueError(f"unknown quantity {quantity!r}; valid: {', '.join(SCALE_QUANTITIES)}")


def scaled(dist: Any, factor: float) -> Any:
    """The distribution with every concentration multiplied by ``factor`` (≥ 0).

    Parameters
    ----------
    dist : LognormalMode, Multimodal or BinnedSpectrum
        The airborne particles.
    factor : float
        Factor on every concentration [-].
    """
    if isinstance(dist, LognormalMode):
        return replace(dist, number_concentration=dist.number_concentration * factor)
    if isinstance(dist, Multimodal):
        return Multimodal(tuple(scaled(m, factor) for m in dist.modes))
    if isinstance(dist, BinnedSpectrum):
        return replace(dist, numbers=tuple(n * factor for n in dist.numbers), edges=dist.edges)
    raise TypeError(f"cannot scale {type(dist).__name__}")


@dataclass(frozen=True)
class TaskDose:
    """Dose of one task.

    Attributes
    ----------
    ambient : Any
        The task's airborne distribution (before protection).
    inhaled_factor : float
        1 / protection factor. [-]
    result : DoseResult
        Deposited dose behind the protection over the task.
    ldsa : dict of str to float
        Alveolar, tracheobronchial and total LDSA of the inhaled air. [m^2/m^3]

    """

    ambient: Any
    inhaled_factor: float
    result: DoseResult
    ldsa: dict[str, float]


def task_dose(
    ambient: Any,
    activity_level: str,
    route: str,
    duration: float,
    protection_factor: float = 1.0,
    model: str = "icrp66",
) -> TaskDose:
    """Deposited number, surface area and mass per region over one task.

    Parameters
    ----------
    ambient : LognormalMode, Multimodal or BinnedSpectrum
        Airborne particles during the task (concentrations in 1/m^3, densities kg/m^3).
    activity_level : str
        Activity level (``sitting``, ``light_exercise``, ...).
    route : str
        Breathing route (``mixed``, ``nose``, ``mouth``, ``mouth_breather``).
    duration : float
        Length of the task, above 0 and at most 24 h. [s]
    protection_factor : float
        Assigned protection factor, ≥ 1. [-]
    model : str
        ``icrp66`` or ``simplified``.

    Returns
    -------
    TaskDose
        The dose behind the protection (ambient concentration ÷ protection factor).

    """
    if not protection_factor >= 1.0:
        raise ValueError("the protection factor must be at least 1")
    subject = Subject.single(activity(activity_level, route))
    inhaled = scaled(ambient, 1.0 / protection_factor)
    result = deposited_dose(inhaled, subject, duration, model)
    return TaskDose(ambient, 1.0 / protection_factor, result, lung_deposited_surface_area(result))
