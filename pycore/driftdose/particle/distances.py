"""Distances and times of Brownian motion and of settling, and the size where they cross.

The rms Brownian displacement sqrt(2 D t) against the settling distance v_ts t (Hinds 1999,
section 7.3), the times to cover a reference distance by each, and the crossover diameter.
"""

from __future__ import annotations

import math

from .._numerics import brent_root
from ..constants import P_DEFAULT, T_DEFAULT
from .diffusion import diffusion_coefficient
from .settling import settling_velocity


def rms_displacement(
    d: float, t: float, T: float = T_DEFAULT, P: float = P_DEFAULT, shape_factor: float = 1.0
) -> float:
    """Root-mean-square Brownian displacement in one direction, sqrt(2 D t).

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    t : float
        Time. [s]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    shape_factor : float
        Dynamic shape factor chi. [-]

    Returns
    -------
    float
        One-dimensional rms displacement. [m]

    Notes
    -----
    x_rms = sqrt(2 D t) (Einstein 1905; Hinds 1999, eq. 7.17). Valid for t much longer than
    the relaxation time.

    """
    return math.sqrt(2.0 * diffusion_coefficient(d, T, P, shape_factor) * t)


def settling_distance(
    d: float,
    t: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
) -> float:
    """Distance settled at terminal velocity in time ``t``.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    t : float
        Time. [s]
    density : float
        Particle density. [kg/m^3]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    shape_factor : float
        Dynamic shape factor chi. [-]

    Returns
    -------
    float
        Distance. [m]

    Notes
    -----
    v_ts t (Hinds 1999, section 7.3, compares it with sqrt(2 D t)); valid for t much
    longer than the relaxation time.

    """
    return settling_velocity(d, density, T, P, shape_factor) * t


def brownian_time(
    d: float, distance: float, T: float = T_DEFAULT, P: float = P_DEFAULT, shape_factor: float = 1.0
) -> float:
    """Time for the one-dimensional rms Brownian displacement to reach ``distance``.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    distance : float
        Reference distance. [m]
    T, P, shape_factor : float
        Temperature [K], pressure [Pa], dynamic shape factor [-].

    Returns
    -------
    float
        t = x^2 / (2 D) (inverse of Hinds 1999, eq. 7.17). [s]

    """
    return distance * distance / (2.0 * diffusion_coefficient(d, T, P, shape_factor))


def settling_time(
    d: float,
    distance: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
) -> float:
    """Time to settle through ``distance`` at terminal velocity, t = x / v_ts.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    distance : float
        Reference distance. [m]
    density : float
        Particle density. [kg/m^3]
    T, P, shape_factor : float
        Temperature [K], pressure [Pa], dynamic shape factor [-].

    Returns
    -------
    float
        Time. [s]

    """
    return distance / settling_velocity(d, density, T, P, shape_factor)


def crossover_diameter(
    t: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
    d_min: float = 1e-10,
    d_max: float = 1e-3,
) -> float | None:
    """Diameter at which settling distance equals rms Brownian displacement in time ``t``.

    Parameters
    ----------
    t : float
        Time. [s]
    density : float
        Particle density. [kg/m^3]
    T, P, shape_factor : float
        Temperature [K], pressure [Pa], dynamic shape factor [-].
    d_min, d_max : float
        Search interval. [m]

    Returns
    -------
    float or None
        Volume-equivalent diameter where v_ts t = sqrt(2 D t) [m], or None when the two do
        not cross inside the interval.

    Notes
    -----
    Settling distance over rms displacement, v_ts sqrt(t / (2 D)), grows monotonically with
    size (Hinds 1999, section 7.3 and Table 7.3 discuss the comparison), so the root is
    unique; it is found by Brent's method in ln d.

    """

    def f(log_d: float) -> float:
        d = math.exp(log_d)
        return math.log(
            settling_distance(d, t, density, T, P, shape_factor)
            / rms_displacement(d, t, T, P, shape_factor)
        )

    a, b = math.log(d_min), math.log(d_max)
    if (f(a) > 0) == (f(b) > 0):
        return None
    return math.exp(brent_root(f, a, b, xtol=1e-12))
