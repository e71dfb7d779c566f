"""Size-selective pre-separators described by a penetration curve (cyclones and the like).

Interfaces: :func:`cyclone_penetration` (a lognormal curve from a cut size and a steepness, or
the ideal ISO 7708 respirable curve), :func:`iso7708_fraction` (the four health-related
sampling conventions, for target overlays).

The curves are functions of the aerodynamic diameter; :func:`cyclone_penetration` takes the
volume-equivalent diameter and the particle density and converts.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from .. import conventions, particle
from .._numerics import normal_cdf
from ..constants import P_DEFAULT, T_DEFAULT

__all__ = [
    "CYCLONE_CURVES",
    "ISO7708_FRACTIONS",
    "ISO7708_MAX_DIAMETER",
    "cyclone_penetration",
    "iso7708_fraction",
    "lognormal_penetration",
]

CYCLONE_CURVES = ("lognormal", "iso7708_respirable")
"""Valid ``curve`` keys of :func:`cyclone_penetration`."""

ISO7708_FRACTIONS: dict[str, Callable[[float], float]] = {
    "inhalable": conventions.inhalable,
    "thoracic": conventions.thoracic,
    "respirable": conventions.respirable,
    "high_risk_respirable": conventions.high_risk_respirable,
}
"""The ISO 7708:1995 conventions by name, from :mod:`driftdose.conventions`."""

ISO7708_MAX_DIAMETER = conventions.D_AE_MAX
"""Largest aerodynamic diameter for which ISO 7708 defines the conventions. [m]"""


def lognormal_penetration(d_ae: float, d50: float, steepness: float) -> float:
    """Penetration curve falling as a cumulative lognormal through a cut size.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]
    d50 : float
        Aerodynamic diameter of 50 % penetration (cut size). [m]
    steepness : float
        Geometric standard deviation of the curve, d50 / d84 = d16 / d50, where dXX is the
        size passed with XX % penetration; must exceed 1 (smaller is sharper). [-]

    Returns
    -------
    float
        P = 1 - Phi(ln(d_ae / d50) / ln(steepness)). [-]

    Notes
    -----
    The usual description of a cyclone's penetration by a cut size and a slope (common
    practice).

    Examples
    --------
    >>> lognormal_penetration(4e-6, 4e-6, 1.5)
    0.5

    """
    return 1.0 - normal_cdf(math.log(d_ae / d50) / math.log(steepness))


def iso7708_fraction(d_ae: float, fraction: str) -> float:
    """ISO 7708 health-related sampling convention at aerodynamic diameter ``d_ae``.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]
    fraction : str
        ``inhalable``, ``thoracic``, ``respirable`` or ``high_risk_respirable``.

    Returns
    -------
    float
        Fraction of the total airborne particles of that size to be collected. [-]

    Notes
    -----
    ISO 7708:1995 (EN 481): inhalable E_I = 0.5 (1 + exp(-0.06 D)), D in um, defined to
    100 um; the thoracic, respirable and high-risk respirable conventions are
    E_I [1 - Phi(ln(D / Gamma) / ln(Sigma))] with Gamma = 11.64, 4.25 and 2.5 um and
    Sigma = 1.5. Dispatches to :mod:`driftdose.conventions`.

    References
    ----------
    .. [1] ISO 7708:1995, Air quality - Particle size fraction definitions for health-related
       sampling.

    Examples
    --------
    The respirable convention passes 50 % of 4 um particles (ISO 7708 tabulates 50.0 %
    at 4 um, from memory):

    >>> round(iso7708_fraction(4e-6, "respirable") * 100, 1)
    50.0

    """
    try:
        convention = ISO7708_FRACTIONS[fraction]
    except KeyError:
        raise ValueError(
            f"unknown fraction {fraction!r}; valid: {sorted(ISO7708_FRACTIONS)}"
        ) from None
    return convention(d_ae)


def cyclone_penetration(
    d: float,
    d50: float = 4.0e-6,
    steepness: float = 1.5,
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
    steepness : float
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
        return lognormal_penetration(d_ae, d50, steepness)
    if curve == "iso7708_respirable":
        return iso7708_fraction(d_ae, "respirable")
    raise ValueError(f"unknown curve {curve!r}; valid: {sorted(CYCLONE_CURVES)}")
