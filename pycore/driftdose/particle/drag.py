"""Drag on a sphere beyond Stokes's law: particle Reynolds number and drag correlations.

The drag factor f = C_D Re / 24 (drag over Stokes drag) of Clift & Gauvin (1970) and of
Schiller & Naumann (1933), their ranges of validity, and the Reynolds number limits the
settling and stopping calculations share.
"""

from __future__ import annotations

from .. import gas
from ..constants import P_DEFAULT, T_DEFAULT

SCHILLER_NAUMANN_RE_MAX = 800.0
"""Upper particle Reynolds number of the Schiller & Naumann (1933) drag fit
(Clift, Grace & Weber 1978, Table 5.2). [-]"""

CLIFT_GAUVIN_RE_MAX = 3e5
"""Upper particle Reynolds number of the Clift & Gauvin (1970) drag fit, just below the
drag crisis of a sphere (Clift, Grace & Weber 1978, Table 5.2, from memory). [-]"""

STOKES_RE_MAX = 0.1
"""Particle Reynolds number below which Stokes's law is within about 3 % of the standard
drag curve (Hinds 1999 ch. 3; common practice). [-]"""


def drag_factor_clift_gauvin1970(re: float) -> float:
    """Drag over Stokes drag, C_D Re / 24, of the Clift & Gauvin (1970) correlation.

    Parameters
    ----------
    re : float
        Particle Reynolds number. [-]

    Returns
    -------
    float
        f = 1 + 0.15 Re^0.687 + 0.0175 Re / (1 + 42500 Re^-1.16), i.e.
        C_D = (24/Re)(1 + 0.15 Re^0.687) + 0.42 / (1 + 42500 Re^-1.16). [-]

    Notes
    -----
    Clift & Gauvin (1970) as given by Clift, Grace & Weber (1978), Table 5.2 (from memory):
    within a few per cent of the standard drag curve for Re < 3e5. It is the Schiller &
    Naumann (1933) form plus a term that brings C_D to about 0.42-0.47 in the Newton regime
    (Re 1e3 to 2e5, where Hinds 1999 quotes C_D of about 0.44). At Re = 800 the extra term
    adds 2.6 % to the drag.

    References
    ----------
    .. [1] Clift, R., Gauvin, W. H. (1970), The motion of particles in turbulent gas
       streams, Proc. Chemeca '70, 1:14-28.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    Examples
    --------
    >>> round(drag_factor_clift_gauvin1970(1000.0) * 24 / 1000.0, 3)  # C_D at Re 1000
    0.466

    """
    if re <= 0.0:
        return 1.0
    # 0.0175 Re / (1 + 42500 Re^-1.16) written with Re^1.16 in the numerator, so that a
    # Reynolds number near the smallest float (Re^-1.16 overflows) gives the Stokes limit
    re_116 = re**1.16
    return 1.0 + 0.15 * re**0.687 + 0.0175 * re * re_116 / (re_116 + 42500.0)


def drag_factor_schiller_naumann1933(re: float) -> float:
    """Drag over Stokes drag of the Schiller & Naumann (1933) fit, 1 + 0.15 Re^0.687.

    Parameters
    ----------
    re : float
        Particle Reynolds number. [-]

    Returns
    -------
    float
        C_D Re / 24 with C_D = (24/Re)(1 + 0.15 Re^0.687), valid to Re of about 800 (Clift,
        Grace & Weber 1978, Table 5.2). [-]

    """
    return 1.0 + 0.15 * max(re, 0.0) ** 0.687


def _balance_clift_gauvin1970(re: float) -> tuple[float, float]:
    """Drag factor f(Re) [-] and the slope d(Re f) / dRe [-] of Clift & Gauvin (1970).

    f as :func:`drag_factor_clift_gauvin1970` (Clift, Grace & Weber 1978, Table 5.2); with
    s = Re^1.16 / (Re^1.16 + 42500), Re f = Re + 0.15 Re^1.687 + 0.0175 Re^2 s and
    d(Re f) / dRe = 1 + 0.15 (1.687) Re^0.687 + 0.0175 Re s (2 + 1.16 (1 - s)). ``re`` > 0.
    """
    re_687 = re**0.687
    re_116 = re**1.16
    s = re_116 / (re_116 + 42500.0)
    f = 1.0 + 0.15 * re_687 + 0.0175 * re * s
    return f, 1.0 + 0.25305 * re_687 + 0.0175 * re * s * (3.16 - 1.16 * s)


def _balance_schiller_naumann1933(re: float) -> tuple[float, float]:
    """Drag factor f = 1 + 0.15 Re^0.687 [-] and d(Re f) / dRe [-] (Schiller & Naumann 1933).

    ``re`` > 0; the slope is 1 + 0.15 (1.687) Re^0.687.
    """
    re_687 = re**0.687
    return 1.0 + 0.15 * re_687, 1.0 + 0.25305 * re_687


_DRAG_BALANCES = {
    "clift_gauvin1970": _balance_clift_gauvin1970,
    "schiller_naumann1933": _balance_schiller_naumann1933,
}
"""Per drag law: Re -> (f(Re), d(Re f)/dRe), for the Newton solve of the settling velocity."""

_DRAG_FACTORS = {
    "clift_gauvin1970": drag_factor_clift_gauvin1970,
    "schiller_naumann1933": drag_factor_schiller_naumann1933,
}
_DRAG_RE_MAX = {
    "clift_gauvin1970": CLIFT_GAUVIN_RE_MAX,
    "schiller_naumann1933": SCHILLER_NAUMANN_RE_MAX,
}
_DRAG_NAMES = {
    "clift_gauvin1970": "Clift & Gauvin (1970)",
    "schiller_naumann1933": "Schiller & Naumann (1933)",
    "stokes": "Stokes's law",
}


def reynolds_number(d: float, velocity: float, T: float = T_DEFAULT, P: float = P_DEFAULT) -> float:
    """Particle Reynolds number Re = rho_g V d / mu.

    Parameters
    ----------
    d : float
        Diameter. [m]
    velocity : float
        Speed of the particle relative to the gas. [m/s]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Reynolds number. [-]

    """
    return gas.air_density(T, P) * abs(velocity) * d / gas.air_viscosity(T)
