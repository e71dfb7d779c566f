"""Deposited dose per respiratory region: number, surface area and mass, per hour and shift.

Interface: :func:`deposited_dose` combines a size distribution
(:mod:`driftdose.distribution`), a deposition model (:mod:`driftdose.deposition`), a
person's breathing (:class:`~driftdose.deposition.Subject`) and an exposure duration into
a :class:`DoseResult`. Optionally the airborne concentrations are compared with benchmark
concentrations the user enters; no limit values are built in.

The dose of region r by weight w (number, surface area, mass) is

    dose_r,w = V_E T integral of DF_r(d) dW(d)

with V_E the time-averaged minute ventilation [m^3/s], T the duration [s] and DF_r the
deposition fraction of region r (fraction of the particles in the ambient air, so the
inhalability is included). With several activities the deposition fractions are weighted
by the air volume inhaled in each (ICRP 66 practice) and the activity mix keeps its time
shares over any duration. Surface area and mass are those of spheres of the
volume-equivalent diameter (common practice).
"""

from __future__ import annotations

import math
import operator
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

from .deposition import DEPOSITION_MODELS, Subject, deposition_curves, deposition_model
from .distribution import WEIGHTS, Distribution, LognormalMode, parts

__all__ = [
    "DURATION_MAX",
    "MODELS",
    "DoseResult",
    "deposited_dose",
    "deposition_curves",
    "model_regions",
]

MODELS = tuple(DEPOSITION_MODELS)
"""Deposition models (keys of :data:`driftdose.deposition.DEPOSITION_MODELS`): the full ICRP
66 model, or the simplified fits of Hinds (1999)."""

DURATION_MAX = 24 * 3600.0
"""Longest exposure duration accepted, one day. [s]"""


def model_regions(model: str) -> tuple[str, ...]:
    """Return the region keys of a model, ``total`` last (from the model registry).

    Parameters
    ----------
    model : str
        A key of :data:`driftdose.deposition.DEPOSITION_MODELS` (``icrp66`` or
        ``simplified``).
    """
    return deposition_model(model).regions


@dataclass(frozen=True)
class DoseResult:
    """Deposited dose by region and weight.

    Attributes
    ----------
    model : str
        ``icrp66`` or ``simplified``.
    regions : tuple of str
        Region keys, ``total`` last.
    duration : float
        Exposure duration. [s]
    ventilation : float
        Time-averaged minute ventilation. [m^3/s]
    inhaled_volume : float
        Air inhaled over the duration. [m^3]
    ambient : dict
        Airborne concentration by weight: ``number`` [1/m^3], ``surface`` [m^2/m^3],
        ``mass`` [kg/m^3].
    fractions : dict
        ``fractions[region][weight]``: deposited share of the airborne amount. [-]
    rates : dict
        ``rates[region][weight]``: deposition rate [1/s], [m^2/s], [kg/s].
    doses : dict
        ``doses[region][weight]``: deposited over the duration [1], [m^2], [kg].
    benchmark : dict
        Ratios of the airborne concentration to the benchmarks entered (``number``,
        ``mass``), only for those given. [-]
    thermodynamic : str
        How the shape factor entered diffusion (``icrp66`` or ``mobility``).

    """

    model: str
    regions: tuple[str, ...]
    duration: float
    ventilation: float
    inhaled_volume: float
    ambient: dict[str, float]
    fractions: dict[str, dict[str, float]]
    rates: dict[str, dict[str, float]]
    doses: dict[str, dict[str, float]]
    benchmark: dict[str, float] = field(default_factory=dict)
    thermodynamic: str = "icrp66"


def deposited_dose(
    distribution: Distribution,
    subject: Subject,
    duration: float,
    model: str = "icrp66",
    benchmark_number: float | None = None,
    benchmark_mass: float | None = None,
    step: float | None = None,
    thermodynamic: str = "icrp66",
    curves: Callable[[Sequence[float], float, float], dict[str, list[float]]] | None = None,
) -> DoseResult:
    """Deposited number, surface area and mass per region over an exposure.

    Parameters
    ----------
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        Airborne particles (volume-equivalent diameters, each mode with its own density and
        shape factor).
    subject : Subject
        Breathing: activities with their time shares (the reference worker, one activity,
        or custom parameters).
    duration : float
        Exposure duration, above 0 and at most 24 h. [s]
    model : str
        ``icrp66`` (default) or ``simplified``.
    benchmark_number : float, optional
        A number concentration to compare with. [1/m^3]
    benchmark_mass : float, optional
        A mass concentration to compare with. [kg/m^3]
    step : float, optional
        Integration grid step in ln d for lognormal modes [-] (default: see
        :meth:`~driftdose.distribution.LognormalMode.grid`).
    thermodynamic : str
        How the shape factor enters diffusion: ``icrp66`` (default) or ``mobility``.
    curves : callable, optional
        ``curves(sizes, density, shape_factor)``: the model's deposition fractions by region
        at a mode's grid (sizes [m], density [kg/m^3], shape factor [-]), if the caller
        has them already (the deposition composer evaluates the model once at the sizes of
        its curves and of the grids together); default :func:`deposition_curves` of
        ``model``, ``subject`` and ``thermodynamic``.

    Returns
    -------
    DoseResult
        Fractions, rates and doses by region and weight.

    Examples
    --------
    >>> from driftdose.distribution import LognormalMode
    >>> from driftdose.deposition import REFERENCE_WORKER
    >>> aerosol = LognormalMode(50e-9, 1.8, 1e10)  # 10 000 particles per cm^3
    >>> r = deposited_dose(aerosol, REFERENCE_WORKER, 8 * 3600.0)
    >>> round(r.inhaled_volume, 1)  # 9.6 m^3 in a reference worker's shift
    9.6

    """
    if not (0.0 < duration <= DURATION_MAX) or not math.isfinite(duration):
        raise ValueError("duration must be above 0 and at most 24 h")
    regions = model_regions(model)
    ventilation = subject.mean_ventilation
    volume = ventilation * duration
    sums = {r: dict.fromkeys(WEIGHTS, 0.0) for r in regions}
    for mode in parts(distribution):
        sizes = mode.grid(step)
        if curves is None:
            at = deposition_curves(
                model, sizes, mode.density, mode.shape_factor, subject, thermodynamic
            )
        else:
            at = curves(sizes, mode.density, mode.shape_factor)
        for w in WEIGHTS:
            if isinstance(mode, LognormalMode):
                qs = mode.quadrature_weights(w, step)
            else:
                qs = [q for _, q in mode.quadrature(w, step)]
            if len(qs) != len(sizes):
                raise ValueError("quadrature and grid differ in length")
            for r in regions:
                sums[r][w] += math.fsum(map(operator.mul, qs, at[r]))
    ambient = {w: distribution.total(w) for w in WEIGHTS}
    fractions = {
        r: {w: (sums[r][w] / ambient[w] if ambient[w] > 0 else 0.0) for w in WEIGHTS}
        for r in regions
    }
    rates = {r: {w: sums[r][w] * ventilation for w in WEIGHTS} for r in regions}
    doses = {r: {w: rates[r][w] * duration for w in WEIGHTS} for r in regions}
    bench: dict[str, float] = {}
    if benchmark_number is not None:
        if not benchmark_number > 0.0:
            raise ValueError("benchmark_number must be positive")
        bench["number"] = ambient["number"] / benchmark_number
    if benchmark_mass is not None:
        if not benchmark_mass > 0.0:
            raise ValueError("benchmark_mass must be positive")
        bench["mass"] = ambient["mass"] / benchmark_mass
    return DoseResult(
        model,
        regions,
        duration,
        ventilation,
        volume,
        ambient,
        fractions,
        rates,
        doses,
        bench,
        thermodynamic,
    )
