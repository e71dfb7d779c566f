"""Deposited dose of one task: a size distribution scaled to what was measured, breathed
behind the protection worn.

Each task's aerosol is a size distribution whose amount comes from the task's measurements:

- ``channels``: the task-period mean of the logged size channels, as a binned spectrum whose
  channel diameters, of the type the instrument measures (optical, mobility, aerodynamic or
  volume-equivalent), are converted to the diameter of the sphere the models compute with by
  :class:`driftdose.diameters.ParticleDescription` (DeCarlo et al. 2004; at 20 °C and 1 atm,
  where the aerosol was measured), as the deposition calculation converts a spectrum;
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

import functools
import math
from collections.abc import Sequence
from dataclasses import dataclass, replace
from typing import Any

from ..deposition import REFERENCE_WORKER, Subject, activity
from ..diameters import ParticleDescription
from ..distribution import BinnedSpectrum, LognormalMode, Multimodal, bin_edges
from ..dose import DoseResult, deposited_dose
from ..ldsa import lung_deposited_surface_area

__all__ = [
    "SCALE_QUANTITIES",
    "channel_spectrum",
    "model_diameters",
    "scaled",
    "shape_amount",
    "task_dose",
]

SCALE_QUANTITIES = ("number", "mass", "ldsa")
"""Measured quantities a size distribution's shape can be scaled to."""


@functools.lru_cache(maxsize=16)
def model_diameters(
    diameters: tuple[float, ...], description: ParticleDescription, diameter_type: str
) -> tuple[float, ...]:
    """Measured channel diameters as diameters of the models' sphere.

    Parameters
    ----------
    diameters : tuple of float
        Channel mid-point diameters as measured, increasing. [m]
    description : ParticleDescription
        The particles: density [kg/m^3], dynamic shape factor [-], density basis.
    diameter_type : str
        What the instrument measures: ``volume_equivalent``, ``optical`` (taken as
        volume-equivalent), ``mobility`` or ``aerodynamic``.

    Returns
    -------
    tuple of float
        :meth:`ParticleDescription.to_model` of each diameter at 20 °C and 1 atm (the
        relations of DeCarlo et al. 2004, monotone in size, so the channels stay in order);
        kept for the next task (the same channels serve every task). [m]

    """
    return tuple(description.to_model(d, diameter_type) for d in diameters)


def channel_spectrum(
    diameters: Sequence[float],
    means: Sequence[float],
    per_log10: bool,
    description: ParticleDescription | None = None,
    diameter_type: str = "volume_equivalent",
) -> BinnedSpectrum:
    """A binned spectrum from the mean of each size channel over a task.

    Parameters
    ----------
    diameters : sequence of float
        Channel mid-point diameters as measured, increasing. [m]
    means : sequence of float
        Task mean of each channel: particles per bin [1/m^3], or dN/dlog10 d [1/m^3].
    per_log10 : bool
        Whether the channels are dN/dlog10 d (converted to per bin with the widths of the
        measured channels, :func:`driftdose.distribution.bin_edges`).
    description : ParticleDescription, optional
        The particles (density [kg/m^3], shape factor [-], density basis); unit-density
        spheres when left out.
    diameter_type : str
        Which equivalent diameter the channels are (see :func:`model_diameters`).

    Returns
    -------
    BinnedSpectrum
        On the models' size axis (volume-equivalent with a material density, mobility with
        an effective density), with the model sphere's density and shape factor. Negative
        means (instrument noise) are taken as zero.

    """
    desc = description if description is not None else ParticleDescription(1000.0)
    numbers = [max(0.0, m) for m in means]
    if per_log10:
        edges = bin_edges(diameters)
        numbers = [
            n * math.log10(b / a) for n, a, b in zip(numbers, edges, edges[1:], strict=False)
        ]
    d = model_diameters(tuple(diameters), desc, diameter_type)
    return BinnedSpectrum(d, tuple(numbers), desc.model_density, desc.model_shape_factor)


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
