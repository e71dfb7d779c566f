"""Exact values of a calculation's curves at sizes the user gives.

The charts draw curves on a grid of sizes; a reader who wants the value at 0.3 µm should not
have to interpolate. These functions call the same models as the curves at the given sizes
themselves: every stage's and the chain's penetration and the target curve (sampling), and the
deposition fraction per region and the ISO 7708 conventions (deposition). SI in, a frozen
:class:`SizeAnswers` out.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from .. import particle
from ..conventions import CONVENTIONS, D_AE_MAX, iso7708_fraction
from ..deposition import Subject
from ..diameters import ParticleDescription
from ..dose import deposition_curves
from ..transport.chain import Stage
from .targets import target_curve

__all__ = ["SIZE_RANGE", "SizeAnswers", "deposition_at_sizes", "sampling_at_sizes"]

SIZE_RANGE = (1e-9, 100e-6)
"""Sizes answered: the range of the curves of both calculations. [m]"""


@dataclass(frozen=True)
class SizeAnswers:
    """Values of a calculation's curves at given sizes.

    Attributes
    ----------
    sizes : tuple of float
        The sizes, on the calculation's size axis (volume-equivalent, or mobility with an
        effective density), in the order given. [m]
    aerodynamic : tuple of float
        Their aerodynamic diameters. [m]
    values : dict
        Series key -> value at each size [-]; ``None`` where the series is not defined
        (an ISO 7708 convention beyond 100 µm aerodynamic, a target outside its range).
    """

    sizes: tuple[float, ...]
    aerodynamic: tuple[float, ...]
    values: dict[str, tuple[float | None, ...]]


def sampling_at_sizes(
    stages: Sequence[Stage],
    sizes: Sequence[float],
    density: float,
    T: float,
    P: float,
    target: str | None = None,
) -> SizeAnswers:
    """Penetration of each stage and of the chain, and the target, at the given sizes.

    Parameters
    ----------
    stages : sequence of Stage
        The stages in the order the air passes them.
    sizes : sequence of float
        Diameters of the spheres the chain acts on. [m]
    density : float
        Density of those spheres (particle or effective density). [kg/m^3]
    T : float
        Air temperature. [K]
    P : float
        Air pressure. [Pa]
    target : str, optional
        A key of :data:`driftdose.compose.targets.TARGETS`; None or ``none`` for no target.

    Returns
    -------
    SizeAnswers
        Series ``stage_<index>`` (from 0), ``overall`` (the product over the stages, as
        :meth:`driftdose.transport.Chain.penetration`) and, with a target, ``target``.

    Notes
    -----
    Aerodynamic diameters as the chain's curves compute them: d_ae² Cc(d_ae) ρ₀ =
    d² Cc(d) ρ with shape factor 1 (Hinds 1999, eq. 3.30).
    """
    d_ae = tuple(particle.aerodynamic_diameter(d, density, 1.0, T, P) for d in sizes)
    values: dict[str, tuple[float | None, ...]] = {}
    overall = [1.0] * len(sizes)
    for i, stage in enumerate(stages):
        row = tuple(stage.penetration(d, density, T, P) for d in sizes)
        values[f"stage_{i}"] = row
        overall = [a * b for a, b in zip(overall, row, strict=True)]
    values["overall"] = tuple(overall)
    if target is not None and target != "none":
        values["target"] = tuple(target_curve(target, list(d_ae)).values)
    return SizeAnswers(tuple(sizes), d_ae, values)


def deposition_at_sizes(
    model: str,
    sizes: Sequence[float],
    description: ParticleDescription,
    subject: Subject,
    thermodynamic: str = "icrp66",
) -> SizeAnswers:
    """Deposition fraction per region and the ISO 7708 conventions at the given sizes.

    Parameters
    ----------
    model : str
        ``icrp66`` (ICRP 66, 1994, Annex D) or ``simplified`` (Hinds 1999, eqs. 11.1–11.5).
    sizes : sequence of float
        Sizes on the models' axis (volume-equivalent, or mobility with an effective
        density). [m]
    description : ParticleDescription
        The particles (density, shape factor, basis) the models compute with.
    subject : Subject
        The breathing.
    thermodynamic : str
        ``icrp66`` or ``mobility``: the sphere of the diffusion terms.

    Returns
    -------
    SizeAnswers
        The model's regions (``total`` included; fractions of the inhaled particles within
        0 to 1, as the curves) and ``iso7708_<fraction>`` for the four ISO 7708:1995
        conventions at each size's aerodynamic diameter (None beyond 100 µm aerodynamic).
    """
    fractions = deposition_curves(
        model,
        list(sizes),
        description.model_density,
        description.model_shape_factor,
        subject,
        thermodynamic,
    )
    values: dict[str, tuple[float | None, ...]] = {
        region: tuple(min(1.0, max(0.0, y)) for y in ys) for region, ys in fractions.items()
    }
    d_ae = tuple(description.from_model(d, "aerodynamic") for d in sizes)
    for key in CONVENTIONS:
        values[f"iso7708_{key}"] = tuple(
            iso7708_fraction(x, key) if x <= D_AE_MAX else None for x in d_ae
        )
    return SizeAnswers(tuple(sizes), d_ae, values)
