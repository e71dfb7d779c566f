"""Mechanical mobility, diffusion coefficient and relaxation time of a particle (Stokes drag).

All three follow from the mobility B = Cc / (3 pi mu d chi) (Hinds 1999, eqs. 3.16 and
3.25): D = k T B, tau = m B.
"""

from __future__ import annotations

import math

from .. import gas
from ..constants import BOLTZMANN, P_DEFAULT, T_DEFAULT
from .slip import slip_correction


def mobility(
    d: float, T: float = T_DEFAULT, P: float = P_DEFAULT, shape_factor: float = 1.0
) -> float:
    """Mechanical mobility B = Cc / (3 pi mu d chi).

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    shape_factor : float
        Dynamic shape factor chi. [-]

    Returns
    -------
    float
        Mechanical mobility. [s/kg]

    Notes
    -----
    Stokes drag with slip and dynamic shape factor (Hinds 1999, eqs. 3.16 and 3.25).

    """
    mu = gas.air_viscosity(T)
    return slip_correction(d, T, P) / (3.0 * math.pi * mu * d * shape_factor)


def diffusion_coefficient(
    d: float, T: float = T_DEFAULT, P: float = P_DEFAULT, shape_factor: float = 1.0
) -> float:
    """Particle diffusion coefficient by the Stokes-Einstein relation with slip.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    shape_factor : float
        Dynamic shape factor chi. [-]

    Returns
    -------
    float
        Diffusion coefficient. [m^2/s]

    Notes
    -----
    D = k T B = k T Cc / (3 pi mu d chi) (Einstein 1905; Hinds 1999, eq. 7.7).

    References
    ----------
    .. [1] Einstein, A. (1905), Ann. Phys. 17:549-560.
    .. [2] Hinds, W. C. (1999), Aerosol Technology, 2nd ed., Wiley, eq. 7.7.

    Examples
    --------
    Hinds (1999) Appendix A11 lists about 2.77e-11 m^2/s at 1 um and 20 degrees C (from
    memory; computed there with another slip set, hence the 1 % difference):

    >>> f"{diffusion_coefficient(1e-6):.2e}"
    '2.73e-11'

    """
    return BOLTZMANN * T * mobility(d, T, P, shape_factor)


def relaxation_time(
    d: float, density: float, T: float = T_DEFAULT, P: float = P_DEFAULT, shape_factor: float = 1.0
) -> float:
    """Particle relaxation time tau = rho_p d^2 Cc / (18 mu chi) (Stokes regime).

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
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
        Relaxation time. [s]

    Notes
    -----
    tau = m B (Hinds 1999, eq. 5.3).

    """
    mass = density * math.pi * d**3 / 6.0
    return mass * mobility(d, T, P, shape_factor)
