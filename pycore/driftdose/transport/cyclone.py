"""Size-selective pre-separators described by a penetration curve (cyclones and the like).

Interfaces: :func:`cyclone_penetration` (a lognormal curve from a cut size and its GSD, or
the ideal ISO 7708 respirable curve, taken from :mod:`driftdose.conventions`, the one home of
the ISO 7708 curves).

The curves are functions of the aerodynamic diameter; :func:`cyclone_penetration` takes the
volume-equivalent diameter and the particle density and converts.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from functools import lru_cache

from .. import conventions, particle
from .._numerics import normal_cdf
from ..constants import P_DEFAULT, T_DEFAULT

__all__ = ["CYCLONE_CURVES", "cyclone_curve", "cyclone_penetration", "lognormal_penetration"]

CYCLONE_CURVES = ("lognormal", "iso7708_respirable")
"""Valid ``curve`` keys of :func:`cyclone_penetration`."""


def lognormal_penetration(d_ae: float, d50: float, curve_gsd: float) -> float:
    """Penetration curve falling as a cumulative lognormal through a cut size.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]
    d50 : float
        Aerodynamic diameter of 50 % penetration (cut size). [m]
    curve_gsd : float
        Geometric standard deviation of the curve, d50 / d84 = d16 / d50, where dXX is the
        size passed with XX % penetration; must exceed 1 (smaller is sharper). [-]

    Returns
    -------
    float
        P = 1 - Phi(ln(d_ae / d50) / ln(curve_gsd)). [-]

    Notes
    -----
    The usual description of a cyclone's penetration by a cut size and a slope (common
    practice).

    Examples
    --------
    >>> lognormal_penetration(4e-6, 4e-6, 1.5)
    0.5

    """
    return 1.0 - normal_cdf(math.log(d_ae / d50) / math.log(curve_gsd))


def cyclone_penetration(
    d: float,
    d50: float = 4.0e-6,
    curve_gsd: float = 1.5,
    density: float = 1000.0,
    curve: str = "lognormal",
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Penetration of a cyclone or other size-selective pre-separator.

    Parameters
    ----------
    d : float
        Volume-equivalent particle diameter. [m]
    d50 : float
        Aerodynamic cut size (``lognormal`` only). [m]
    curve_gsd : float
        Geometric standard deviation of the curve (``lognormal`` only). [-]
    density : float
        Particle density, to convert to the aerodynamic diameter. [kg/m^3]
    curve : str
        ``lognormal`` (:func:`lognormal_penetration`) or ``iso7708_respirable`` (the ideal
        respirable convention, inhalability included, as the penetration of a sampler
        that matches it exactly).
    T, P : float
        Temperature [K], pressure [Pa].

    Returns
    -------
    float
        Penetration. [-]

    """
    d_ae = particle.aerodynamic_diameter(d, density, 1.0, T, P)
    if curve == "lognormal":
        return lognormal_penetration(d_ae, d50, curve_gsd)
    if curve == "iso7708_respirable":
        return conventions.respirable(d_ae)
    raise ValueError(f"unknown curve {curve!r}; valid: {sorted(CYCLONE_CURVES)}")


def cyclone_curve(
    aerodynamic_diameters: Sequence[float],
    d50: float = 4.0e-6,
    curve_gsd: float = 1.5,
    curve: str = "lognormal",
) -> list[float]:
    """:func:`cyclone_penetration` at many sizes, from their aerodynamic diameters.

    Parameters
    ----------
    aerodynamic_diameters : sequence of float
        Aerodynamic diameters, one per size. [m]
    d50 : float
        Aerodynamic cut diameter of the lognormal curve. [m]
    curve_gsd : float
        Geometric standard deviation of the lognormal curve. [-]
    curve : str
        ``lognormal`` or ``iso7708_respirable`` (ISO 7708:1995 respirable convention).

    Returns
    -------
    list of float
        Penetration at each size. [-]

    """
    if curve not in CYCLONE_CURVES:
        raise ValueError(f"unknown curve {curve!r}; valid: {sorted(CYCLONE_CURVES)}")
    return list(_cyclone_curve(tuple(aerodynamic_diameters), d50, curve_gsd, curve))


@lru_cache(maxsize=8)
def _cyclone_curve(
    d_aes: tuple[float, ...], d50: float, curve_gsd: float, curve: str
) -> tuple[float, ...]:
    """:func:`cyclone_curve`, kept: a flow edit leaves a cyclone's curve as it was."""
    if curve == "lognormal":
        return tuple(lognormal_penetration(d_ae, d50, curve_gsd) for d_ae in d_aes)
    return tuple(conventions.respirable(d_ae) for d_ae in d_aes)
