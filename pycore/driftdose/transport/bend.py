"""Inertial losses of particles in tube bends.

Interface: :func:`bend_penetration` (regime chosen by the Reynolds number).

Correlations: the empirical fits of Pui, Romay-Novas & Liu (1987) for laminar
(:func:`penetration_pui1987_laminar`) and turbulent (:func:`penetration_pui1987_turbulent`)
flow, both in the bend Stokes number and the bend angle.

Stokes-number conventions, settled as follows. Pui et al. define the Stokes number with
the tube radius, Stk = rho_p Cc d^2 U / (9 mu d_t) = 2 tau U / d_t (from memory); their
turbulent fit for a 90 degree bend, 1 - 10^(-0.963 Stk), becomes exp(-2.823 Stk' theta)
for any angle theta when written with Stk' = tau U / d_t (0.963 ln 10 (2/pi) 2 = 2.823),
which is how Brockmann (2001) prints it, in the chapter-wide convention Stk' = tau U / d_t.
In the same place and with the same Stk' he prints the laminar fit with its 50 % point at
Stk' = 0.171 (from memory). This module takes 0.171 in Stk' (= 0.342 in Pui's Stk); the
evidence is in :func:`penetration_pui1987_laminar`. :func:`bend_stokes_number` returns
Pui's Stk, and each fit converts.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .. import particle
from ..constants import P_DEFAULT, T_DEFAULT
from .flow import blend_curves, blend_regimes, regime_weight, tube_velocity

__all__ = [
    "PUI1987_RE_RANGE",
    "bend_curve",
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
        Bend Stokes number of Pui et al., 2 tau U / d_t (:func:`bend_stokes_number`). [-]
    angle : float
        Bend angle. [rad]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    P = [1 + (Stk'/0.171)^(0.452 Stk'/0.171 + 2.242)]^(-2 theta/pi) with Stk' = tau U / d_t
    = Stk / 2 (Pui et al. 1987, as given by Brockmann 2001, from memory). At theta = pi/2
    the 50 % point is Stk' = 0.171, i.e. Stk = 0.342. Fitted to measurements at flow
    Reynolds numbers 100 and 1000 in 90 degree bends; other angles follow from the
    exponent's proportionality to theta.

    Why 0.171 belongs to Stk' = tau U / d_t and not to Pui's 2 tau U / d_t (which changes
    the loss by up to a factor of two: 10 um, 4 mm tube, 1 L/min gives P = 0.78, not 0.37):

    1. Published definitions. Brockmann (2001) writes both Pui fits with one Stokes number,
       tau U / d_t, and the turbulent one demonstrably converted from Pui's 2 tau U / d_t
       (2.823 = 2 x 0.963 ln 10 x 2 / pi); the laminar fit printed beside it uses the same
       symbol (from memory).
    2. Independent small-Stk limit. With plug flow a particle drifts delta = tau U theta
       outward across a bend (centrifugal drift tau U^2 / R over the time R theta / U), and
       the fraction lost is the crescent of a circle of radius a = d_t / 2 shifted by delta,
       2 delta / (pi a) = (4/pi) Stk' theta for small delta (the plug-flow case treated by
       Crane & Evans 1977, from memory; the crescent form is derived here). In laminar flow
       the air near the wall is slow, so at small Stk the loss must stay below the plug-flow
       loss. With 0.171 in Stk' it does (90 degrees: 0.012 against 0.050 at Stk' = 0.025,
       0.051 against 0.100 at Stk' = 0.05); with 0.171 in Pui's Stk the fit loses 0.051 at
       Stk' = 0.025, as much as plug flow, and 0.21 at Stk' = 0.05, twice the plug-flow
       loss. The tests check this bound up to Stk' = 0.05.
    3. Pui et al. report that their Re = 1000 data agree with the laminar theory of Cheng &
       Wang (1981) (abstract), so the fit is a laminar-flow curve to which the bound applies.

    References
    ----------
    .. [1] Pui, D. Y. H., Romay-Novas, F., Liu, B. Y. H. (1987), Experimental study of
       particle deposition in bends of circular cross section, Aerosol Sci. Technol.
       7:301-315.
    .. [2] Brockmann, J. E. (2001), Sampling and transport of aerosols, in Baron, P. A.,
       Willeke, K. (eds.), Aerosol Measurement, 2nd ed., Wiley, ch. 8.
    .. [3] Crane, R. I., Evans, R. L. (1977), Inertial deposition of particles in a bent
       pipe, J. Aerosol Sci. 8:161-170.

    Examples
    --------
    >>> penetration_pui1987_laminar(0.342, math.pi / 2)
    0.5

    """
    if stk <= 0.0:
        return 1.0
    x = stk / 0.342  # Stk' / 0.171 with Stk' = Stk / 2
    exponent = 0.452 * x + 2.242
    log_term = exponent * math.log(x)
    if log_term > 700.0:  # (Stk'/0.171)^n overflows: nothing passes
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
        ``auto`` (laminar below Re = 2000, turbulent above 4000, interpolated between, see
        :func:`~driftdose.transport.flow.transition_weight`), ``laminar`` or
        ``turbulent``.

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
    return blend_regimes(
        lambda: penetration_pui1987_laminar(stk, bend_angle),
        lambda: penetration_pui1987_turbulent(stk, bend_angle),
        regime_weight(regime, flow, tube_diameter, T, P),
    )


def bend_curve(
    relaxation_times: Sequence[float],
    flow: float,
    tube_diameter: float,
    bend_angle: float = math.pi / 2,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    regime: str = "auto",
) -> list[float]:
    """:func:`bend_penetration` at many sizes, from their relaxation times.

    Parameters
    ----------
    relaxation_times : sequence of float
        Particle relaxation times, one per size. [s]
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    bend_angle : float
        Bend angle. [rad]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    regime : str
        ``auto``, ``laminar`` or ``turbulent`` (see :func:`bend_penetration`).

    Returns
    -------
    list of float
        Penetration at each size [-], Stk = 2 tau U / d_t, Pui et al. (1987) fits.

    """
    u = tube_velocity(flow, tube_diameter)
    stks = [2.0 * tau * u / tube_diameter for tau in relaxation_times]
    return blend_curves(
        lambda: [penetration_pui1987_laminar(stk, bend_angle) for stk in stks],
        lambda: [penetration_pui1987_turbulent(stk, bend_angle) for stk in stks],
        regime_weight(regime, flow, tube_diameter, T, P),
    )
