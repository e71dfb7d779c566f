"""Inertial losses of particles in tube bends.

Interface: :func:`bend_penetration` (regime chosen by the Reynolds number).

Correlations: the empirical fits of Pui, Romay-Novas & Liu (1987) for laminar
(:func:`penetration_pui1987_laminar`) and turbulent (:func:`penetration_pui1987_turbulent`)
flow, both in the bend Stokes number and the bend angle.

Doubts, stated plainly: the forms and constants are recalled (from memory), as given by
Brockmann (2001). Pui et al. define the Stokes number with the tube radius,
Stk = rho_p Cc d^2 U / (9 mu d_t) = 2 tau U / d_t; their turbulent fit for a 90 degree bend,
1 - 10^(-0.963 Stk), becomes exp(-2.823 Stk' theta) for any angle theta when written with
Stk' = tau U / d_t (0.963 ln 10 (2/pi) 2 = 2.823), which is how Brockmann prints it. This
module uses Pui's Stokes number for both fits and converts.
"""

from __future__ import annotations

import math

from .. import particle
from ..constants import P_DEFAULT, T_DEFAULT
from ._common import flow_regime, tube_reynolds_number, tube_velocity

__all__ = [
    "PUI1987_RE_RANGE",
    "bend_penetration",
    "bend_stokes_number",
    "penetration_pui1987_laminar",
    "penetration_pui1987_turbulent",
]

PUI1987_RE_RANGE = (100.0, 10000.0)
"""Flow Reynolds numbers covered by the measurements of Pui et al. (1987): 100 and 1000
(laminar), 6000 and 10000 (turbulent). [-]"""


def bend_stokes_number(
    d: float,
    flow: float,
    tube_diameter: float,
    density: float = 1000.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Bend Stokes number Stk = rho_p Cc d^2 U / (9 mu d_t) (Pui et al. 1987).

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    density : float
        Particle density. [kg/m^3]
    T, P : float
        Temperature [K], pressure [Pa].

    Returns
    -------
    float
        Stk = 2 tau U / d_t, i.e. the relaxation time over the time to cross a tube radius.
        [-]

    """
    tau = particle.relaxation_time(d, density, T, P)
    return 2.0 * tau * tube_velocity(flow, tube_diameter) / tube_diameter


def penetration_pui1987_laminar(stk: float, angle: float) -> float:
    """Bend penetration in laminar flow, fit of Pui, Romay-Novas & Liu (1987).

    Parameters
    ----------
    stk : float
        Bend Stokes number, :func:`bend_stokes_number`. [-]
    angle : float
        Bend angle. [rad]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    P = [1 + (Stk/0.171)^(0.452 Stk/0.171 + 2.242)]^(-2 theta/pi) (Pui et al. 1987, as given
    by Brockmann 2001, from memory). At theta = pi/2 the 50 % point is Stk = 0.171. Fitted to
    measurements at flow Reynolds numbers 100 and 1000 in 90 degree bends; other angles
    follow from the exponent's proportionality to theta.

    References
    ----------
    .. [1] Pui, D. Y. H., Romay-Novas, F., Liu, B. Y. H. (1987), Experimental study of
       particle deposition in bends of circular cross section, Aerosol Sci. Technol.
       7:301-315.

    Examples
    --------
    >>> penetration_pui1987_laminar(0.171, math.pi / 2)
    0.5

    """
    if stk <= 0.0:
        return 1.0
    x = stk / 0.171
    exponent = 0.452 * x + 2.242
    log_term = exponent * math.log(x)
    if log_term > 700.0:  # (Stk/0.171)^n overflows: nothing passes
        return 0.0
    return (1.0 + math.exp(log_term)) ** (-2.0 * angle / math.pi)


def penetration_pui1987_turbulent(stk: float, angle: float) -> float:
    """Bend penetration in turbulent flow, fit of Pui, Romay-Novas & Liu (1987).

    Parameters
    ----------
    stk : float
        Bend Stokes number, :func:`bend_stokes_number` (2 tau U / d_t). [-]
    angle : float
        Bend angle. [rad]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    For a 90 degree bend P = 10^(-0.963 Stk) (Pui et al. 1987, from memory), independent of
    the Reynolds number between 6000 and 10000. Generalised to any angle with the exponent
    proportional to theta, P = exp(-0.963 ln(10) (2 theta / pi) Stk), which equals
    Brockmann's (2001) exp(-2.823 Stk' theta) with Stk' = Stk / 2.

    Examples
    --------
    >>> round(penetration_pui1987_turbulent(1.0, math.pi / 2), 4)
    0.1089

    """
    return math.exp(-0.963 * math.log(10.0) * (2.0 * angle / math.pi) * max(stk, 0.0))


def bend_penetration(
    d: float,
    flow: float,
    tube_diameter: float,
    bend_angle: float = math.pi / 2,
    density: float = 1000.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    regime: str = "auto",
) -> float:
    """Inertial penetration of a tube bend, regime chosen by the Reynolds number.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    bend_angle : float
        Angle turned by the bend. [rad]
    density : float
        Particle density. [kg/m^3]
    T, P : float
        Temperature [K], pressure [Pa].
    regime : str
        ``auto`` (laminar below Re = 2300), ``laminar`` or ``turbulent``.

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    Neither fit depends on the bend's radius of curvature; diffusion and settling in the
    bend are not included (add the bend's length to a straight tube stage for those).

    """
    stk = bend_stokes_number(d, flow, tube_diameter, density, T, P)
    if regime == "auto":
        regime = flow_regime(tube_reynolds_number(flow, tube_diameter, T, P))
    if regime == "laminar":
        return penetration_pui1987_laminar(stk, bend_angle)
    if regime == "turbulent":
        return penetration_pui1987_turbulent(stk, bend_angle)
    raise ValueError(f"unknown regime {regime!r}; valid: auto, laminar, turbulent")
