"""Gravitational settling losses in straight circular tubes, horizontal or inclined.

Interface: :func:`tube_settling_penetration` (regime chosen by the Reynolds number).

Correlations: Fuchs (1964) / Thomas (1958) for horizontal tubes in laminar flow, extended to
inclined tubes by Heyder & Gebhart (1977) (:func:`penetration_heyder_gebhart1977` and
:func:`tube_settling_penetration_heyder_gebhart1977`); well-mixed turbulent flow by
Schwendiman et al. (1975) (:func:`tube_settling_penetration_schwendiman1975`).

The ``inclination`` is the angle of the tube axis from the horizontal [rad]: 0 horizontal,
pi/2 vertical (no settling loss to the wall in either model).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .. import particle
from ..constants import P_DEFAULT, T_DEFAULT
from .flow import blend_curves, blend_regimes, regime_weight, tube_velocity

__all__ = [
    "penetration_heyder_gebhart1977",
    "settling_parameter",
    "tube_settling_curve",
    "tube_settling_penetration",
    "tube_settling_penetration_heyder_gebhart1977",
    "tube_settling_penetration_schwendiman1975",
]


def settling_parameter(
    d: float,
    length: float,
    flow: float,
    tube_diameter: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Settling parameter Z = L v_ts / (d_t U) of a tube.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    length : float
        Tube length. [m]
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
        Z: settling velocity times residence time over tube diameter (Brockmann 2001). [-]

    """
    v_ts = particle.settling_velocity(d, density, T, P)
    return length * v_ts / (tube_diameter * tube_velocity(flow, tube_diameter))


def penetration_heyder_gebhart1977(kappa: float) -> float:
    """Laminar-flow settling penetration as a function of kappa = (3/4) Z cos(theta).

    Parameters
    ----------
    kappa : float
        (3/4) L v_ts cos(theta) / (d_t U). [-]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    P = 1 - (2/pi) [2 kappa sqrt(1 - kappa^(2/3)) - kappa^(1/3) sqrt(1 - kappa^(2/3))
    + arcsin(kappa^(1/3))] for kappa < 1, and 0 from kappa = 1 on (Fuchs 1964 and Thomas 1958
    for the horizontal tube; Heyder & Gebhart 1977 for inclined tubes, with kappa carrying
    cos(theta); as given by Brockmann 2001, from memory). It is exact for Poiseuille flow and
    a uniform settling velocity: complete deposition at kappa = 1 is the particle entering
    at the top of the tube on the axis plane, and for small kappa P -> 1 - (16 / (3 pi))
    kappa, the flux of particles settling through the tube's horizontal section.

    References
    ----------
    .. [1] Fuchs, N. A. (1964), The Mechanics of Aerosols, Pergamon.
    .. [2] Thomas, J. W. (1958), Gravity settling of particles in a horizontal tube,
       J. Air Pollut. Control Assoc. 8:32-34.
    .. [3] Heyder, J., Gebhart, J. (1977), Gravitational deposition of particles from
       laminar aerosol flow through inclined circular tubes, J. Aerosol Sci. 8:289-295.

    Examples
    --------
    >>> penetration_heyder_gebhart1977(0.0), penetration_heyder_gebhart1977(1.0)
    (1.0, 0.0)

    """
    if kappa <= 0.0:
        return 1.0
    if kappa >= 1.0:
        return 0.0
    k13 = kappa ** (1.0 / 3.0)
    root = math.sqrt(1.0 - k13 * k13)
    p = 1.0 - (2.0 / math.pi) * (2.0 * kappa * root - k13 * root + math.asin(k13))
    return min(1.0, max(0.0, p))


def tube_settling_penetration_heyder_gebhart1977(
    d: float,
    length: float,
    flow: float,
    tube_diameter: float,
    density: float = 1000.0,
    inclination: float = 0.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Settling penetration of a horizontal or inclined tube in laminar flow.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    length : float
        Tube length. [m]
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    density : float
        Particle density. [kg/m^3]
    inclination : float
        Inclination of the tube from the horizontal. [rad]
    T, P : float
        Temperature [K], pressure [Pa].

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    kappa = (3/4) Z cos(theta) with Z from :func:`settling_parameter`, then
    :func:`penetration_heyder_gebhart1977`. The inclined form assumes the settling speed
    along the tube axis, v_ts sin(theta), is small compared with the air speed.

    """
    z = settling_parameter(d, length, flow, tube_diameter, density, T, P)
    return penetration_heyder_gebhart1977(0.75 * z * abs(math.cos(inclination)))


def tube_settling_penetration_schwendiman1975(
    d: float,
    length: float,
    flow: float,
    tube_diameter: float,
    density: float = 1000.0,
    inclination: float = 0.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Settling penetration of a tube in well-mixed turbulent flow.

    Parameters
    ----------
    d, length, flow, tube_diameter : float
        Particle diameter [m], tube length [m], flow [m^3/s], inner tube diameter [m].
    density : float
        Particle density. [kg/m^3]
    inclination : float
        Inclination of the tube from the horizontal. [rad]
    T, P : float
        Temperature [K], pressure [Pa].

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    P = exp(-d_t L v_ts cos(theta) / Q) = exp(-(4/pi) Z cos(theta)) (Schwendiman et al.
    1975, as given by Brockmann 2001): turbulence keeps the section well mixed and particles
    settle through the projected area d_t L.

    References
    ----------
    .. [1] Schwendiman, L. C., Stegen, G. E., Glissmeyer, J. A. (1975), Report BNWL-SA-5138,
       Battelle Pacific Northwest Laboratories.

    """
    v_ts = particle.settling_velocity(d, density, T, P)
    return math.exp(-tube_diameter * length * v_ts * abs(math.cos(inclination)) / flow)


def tube_settling_penetration(
    d: float,
    length: float,
    flow: float,
    tube_diameter: float,
    density: float = 1000.0,
    inclination: float = 0.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    regime: str = "auto",
) -> float:
    """Settling penetration of a tube, regime chosen by the Reynolds number.

    Parameters
    ----------
    d, length, flow, tube_diameter : float
        Particle diameter [m], tube length [m], flow [m^3/s], inner tube diameter [m].
    density : float
        Particle density. [kg/m^3]
    inclination : float
        Inclination of the tube from the horizontal. [rad]
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

    """
    args = (d, length, flow, tube_diameter, density, inclination, T, P)
    return blend_regimes(
        lambda: tube_settling_penetration_heyder_gebhart1977(*args),
        lambda: tube_settling_penetration_schwendiman1975(*args),
        regime_weight(regime, flow, tube_diameter, T, P),
    )


def tube_settling_curve(
    settling_velocities: Sequence[float],
    length: float,
    flow: float,
    tube_diameter: float,
    inclination: float = 0.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    regime: str = "auto",
) -> list[float]:
    """:func:`tube_settling_penetration` at many sizes, from their settling velocities.

    Parameters
    ----------
    settling_velocities : sequence of float
        Terminal settling velocities, one per size. [m/s]
    length : float
        Tube length. [m]
    flow : float
        Volumetric flow rate. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    inclination : float
        Inclination of the tube from the horizontal. [rad]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    regime : str
        ``auto``, ``laminar`` or ``turbulent`` (see :func:`tube_settling_penetration`).

    Returns
    -------
    list of float
        Penetration at each size [-]: Heyder & Gebhart (1977) in laminar flow, Schwendiman
        et al. (1975) in turbulent flow, interpolated between; the flow's quantities once.

    """
    u = tube_velocity(flow, tube_diameter)
    cos_theta = abs(math.cos(inclination))
    return blend_curves(
        lambda: [
            penetration_heyder_gebhart1977(0.75 * (length * v_ts / (tube_diameter * u)) * cos_theta)
            for v_ts in settling_velocities
        ],
        lambda: [
            math.exp(-tube_diameter * length * v_ts * cos_theta / flow)
            for v_ts in settling_velocities
        ],
        regime_weight(regime, flow, tube_diameter, T, P),
    )
