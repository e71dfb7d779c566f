"""Diffusion losses of particles to the wall of a straight circular tube.

Interfaces: :func:`tube_diffusion_penetration` (laminar flow, stable name) and
:func:`tube_diffusion_penetration_any` (picks the laminar or turbulent form from the flow's
Reynolds number).

Correlations: Gormley & Kennedy (1949) for fully developed laminar flow, in its original
three-term form (:func:`penetration_gormley_kennedy1949`) or the two-term form of Hinds (1999)
(:func:`penetration_gormley_kennedy_hinds1999`); Friedlander (1977) for turbulent flow
(:func:`tube_diffusion_penetration_friedlander1977`).

All forms assume a fully developed velocity profile from the tube entrance on, a perfectly
absorbing wall, and a volumetric flow at the stated T and P.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from .. import gas, particle
from ..constants import P_DEFAULT, T_DEFAULT
from .flow import (
    blend_curves,
    blend_regimes,
    regime_weight,
    tube_reynolds_number,
    tube_velocity,
)

__all__ = [
    "LAMINAR_MODELS",
    "diffusion_parameter",
    "penetration_gormley_kennedy1949",
    "penetration_gormley_kennedy_hinds1999",
    "tube_diffusion_curve",
    "tube_diffusion_penetration",
    "tube_diffusion_penetration_any",
    "tube_diffusion_penetration_friedlander1977",
]

LAMINAR_MODELS = ("gormley_kennedy1949", "hinds1999")
"""Valid ``model`` keys of :func:`tube_diffusion_penetration`."""

GK_XI_SWITCH = 0.02
"""Branch switch of the three-term form, in xi = pi D L / Q (Gormley & Kennedy 1949). [-]"""

HINDS_MU_SWITCH = 0.009
"""Branch switch of the two-term form, in mu = D L / Q (Hinds 1999, eqs. 7.29-7.30). [-]"""


def diffusion_parameter(
    d: float, length: float, flow: float, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Deposition parameter mu = D L / Q of a tube (without the factor pi).

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    length : float
        Tube length. [m]
    flow : float
        Volumetric flow rate. [m^3/s]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        mu = D L / Q (Hinds 1999, ch. 7). [-]

    """
    return particle.diffusion_coefficient(d, T, P) * length / flow


def penetration_gormley_kennedy1949(mu: float) -> float:
    """Laminar tube penetration, three-term form of Gormley & Kennedy (1949).

    Parameters
    ----------
    mu : float
        Deposition parameter D L / Q. [-]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    With xi = pi mu = pi D L / Q (Gormley & Kennedy 1949, as given by Brockmann 2001, from
    memory):

    - xi < 0.02: P = 1 - 2.56 xi^(2/3) + 1.2 xi + 0.177 xi^(4/3)
    - xi >= 0.02: P = 0.819 exp(-3.657 xi) + 0.097 exp(-22.3 xi) + 0.032 exp(-57 xi)

    The first exponent, 3.657, is the first eigenvalue of the Graetz problem (the Sherwood
    number 3.66 of fully developed laminar tube flow). The branches meet to within 0.003 at
    the switch. The parameter here is ``mu`` without pi (the two-term form's definition);
    the pi is applied inside, so the two forms are not mixed.

    References
    ----------
    .. [1] Gormley, P. G., Kennedy, M. (1949), Diffusion from a stream flowing through a
       cylindrical tube, Proc. R. Irish Acad. 52A:163-169.
    .. [2] Brockmann, J. E. (2001), Sampling and transport of aerosols, in Baron, P. A.,
       Willeke, K. (eds.), Aerosol Measurement, 2nd ed., Wiley, ch. 8.

    Examples
    --------
    >>> round(penetration_gormley_kennedy1949(0.1), 3)
    0.26

    """
    xi = math.pi * mu
    if xi < GK_XI_SWITCH:
        return 1.0 - 2.56 * xi ** (2.0 / 3.0) + 1.2 * xi + 0.177 * xi ** (4.0 / 3.0)
    return (
        0.819 * math.exp(-3.657 * xi) + 0.097 * math.exp(-22.3 * xi) + 0.032 * math.exp(-57.0 * xi)
    )


def penetration_gormley_kennedy_hinds1999(mu: float) -> float:
    """Laminar tube penetration, two-term form (Hinds 1999, eqs. 7.29-7.30).

    Parameters
    ----------
    mu : float
        Deposition parameter D L / Q. [-]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    Hinds (1999), eq. 7.29 for mu < 0.009: P = 1 - 5.50 mu^(2/3) + 3.77 mu; eq. 7.30 for
    mu >= 0.009: P = 0.819 exp(-11.5 mu) + 0.0975 exp(-70.1 mu) (from memory). These are the
    Gormley & Kennedy series with pi folded into the constants (11.5 = 3.657 pi). The
    branches meet to within about 0.006.

    References
    ----------
    .. [1] Hinds, W. C. (1999), Aerosol Technology, 2nd ed., Wiley, eqs. 7.29-7.30.

    """
    if mu < HINDS_MU_SWITCH:
        return 1.0 - 5.50 * mu ** (2.0 / 3.0) + 3.77 * mu  # [1] eq. 7.29
    return 0.819 * math.exp(-11.5 * mu) + 0.0975 * math.exp(-70.1 * mu)  # [1] eq. 7.30


def tube_diffusion_penetration(
    d: float,
    length: float,
    flow: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    model: str = "gormley_kennedy1949",
) -> float:
    """Penetration of particles through a straight tube in laminar flow (stable interface).

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    length : float
        Tube length. [m]
    flow : float
        Volumetric flow rate at T and P. [m^3/s]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    model : str
        ``gormley_kennedy1949`` (three-term form, default) or ``hinds1999`` (two-term form).

    Returns
    -------
    float
        Fraction of particles leaving the tube, in [0, 1]. [-]

    Notes
    -----
    In fully developed laminar flow the loss depends only on mu = D L / Q, not on the tube
    diameter (Hinds 1999, ch. 7). The caller is responsible for checking that the flow
    is laminar (Re below about 2000); see :func:`tube_diffusion_penetration_any`.

    Examples
    --------
    10 nm particles through 1 m of tube at 1 L/min lose about a tenth:

    >>> round(tube_diffusion_penetration(10e-9, 1.0, 1e-3 / 60), 2)
    0.89

    """
    mu = diffusion_parameter(d, length, flow, T, P)
    if model == "gormley_kennedy1949":
        p = penetration_gormley_kennedy1949(mu)
    elif model == "hinds1999":
        p = penetration_gormley_kennedy_hinds1999(mu)
    else:
        raise ValueError(f"unknown laminar model {model!r}; valid: {sorted(LAMINAR_MODELS)}")
    return min(1.0, max(0.0, p))


def tube_diffusion_penetration_friedlander1977(
    d: float,
    length: float,
    flow: float,
    tube_diameter: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Penetration of particles through a straight tube in turbulent flow by diffusion.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    length : float
        Tube length. [m]
    flow : float
        Volumetric flow rate at T and P. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Penetration. [-]

    Notes
    -----
    Deposition velocity V_d = 0.04 U Re^(-1/4) Sc^(-2/3) (Friedlander 1977, as given by
    Brockmann 2001), Sc = mu / (rho_g D), and P = exp(-pi d_t L V_d / Q). Valid for fully
    turbulent flow (Re above about 4000) and particles small enough for inertial deposition
    to be negligible (turbulent inertial deposition is not included).

    References
    ----------
    .. [1] Friedlander, S. K. (1977), Smoke, Dust and Haze, Wiley.
    .. [2] Brockmann, J. E. (2001), in Baron & Willeke (eds.), Aerosol Measurement, 2nd ed.,
       ch. 8.

    """
    u = tube_velocity(flow, tube_diameter)
    re = tube_reynolds_number(flow, tube_diameter, T, P)
    diff = particle.diffusion_coefficient(d, T, P)
    return _friedlander(
        diff, length, flow, tube_diameter, u, re, gas.air_viscosity(T), gas.air_density(T, P)
    )


def _friedlander(
    diff: float,
    length: float,
    flow: float,
    tube_diameter: float,
    u: float,
    re: float,
    mu: float,
    rho_g: float,
) -> float:
    """Friedlander (1977) turbulent penetration from the diffusion coefficient ``diff`` [m^2/s].

    ``u`` mean air speed [m/s], ``re`` the tube's Reynolds number [-], ``mu`` [Pa s] and
    ``rho_g`` [kg/m^3] of the air; the other arguments as in
    :func:`tube_diffusion_penetration_friedlander1977`. [-]
    """
    sc = mu / (rho_g * diff)
    v_d = 0.04 * u * re**-0.25 * sc ** (-2.0 / 3.0)
    return math.exp(-math.pi * tube_diameter * length * v_d / flow)


def tube_diffusion_curve(
    diffusion_coefficients: Sequence[float],
    length: float,
    flow: float,
    tube_diameter: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    regime: str = "auto",
) -> list[float]:
    """:func:`tube_diffusion_penetration_any` at many sizes, from their diffusion coefficients.

    Parameters
    ----------
    diffusion_coefficients : sequence of float
        Particle diffusion coefficients, one per size. [m^2/s]
    length : float
        Tube length. [m]
    flow : float
        Volumetric flow rate at T and P. [m^3/s]
    tube_diameter : float
        Inner tube diameter. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    regime : str
        ``auto``, ``laminar`` or ``turbulent`` (see :func:`tube_diffusion_penetration_any`).

    Returns
    -------
    list of float
        Penetration at each size [-]: Gormley & Kennedy (1949) in laminar flow, Friedlander
        (1977) in turbulent flow, interpolated between, the flow's quantities taken once.

    """
    u = tube_velocity(flow, tube_diameter)
    re = tube_reynolds_number(flow, tube_diameter, T, P)
    mu, rho_g = gas.air_viscosity(T), gas.air_density(T, P)
    return blend_curves(
        lambda: [
            min(1.0, max(0.0, penetration_gormley_kennedy1949(diff * length / flow)))
            for diff in diffusion_coefficients
        ],
        lambda: [
            _friedlander(diff, length, flow, tube_diameter, u, re, mu, rho_g)
            for diff in diffusion_coefficients
        ],
        regime_weight(regime, flow, tube_diameter, T, P),
    )


def tube_diffusion_penetration_any(
    d: float,
    length: float,
    flow: float,
    tube_diameter: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    regime: str = "auto",
) -> float:
    """Diffusion penetration of a tube with the regime chosen by the Reynolds number.

    Parameters
    ----------
    d, length, flow, tube_diameter : float
        Particle diameter [m], tube length [m], flow [m^3/s], inner tube diameter [m].
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
    return blend_regimes(
        lambda: tube_diffusion_penetration(d, length, flow, T, P),
        lambda: tube_diffusion_penetration_friedlander1977(d, length, flow, tube_diameter, T, P),
        regime_weight(regime, flow, tube_diameter, T, P),
    )
