"""Properties of air as the carrier gas: viscosity, mean free path, density.

Interfaces: :func:`air_viscosity`, :func:`mean_free_path`, :func:`air_density`.
Correlations: Sutherland's law (U.S. Standard Atmosphere 1976 constants) and the
Willeke (1976) scaling of a reference mean free path.
"""

from __future__ import annotations

from .constants import AIR_MOLAR_MASS, GAS_CONSTANT, P_DEFAULT, T_DEFAULT

__all__ = [
    "MEAN_FREE_PATH_REFERENCES",
    "SUTHERLAND_CONSTANT",
    "air_density",
    "air_viscosity",
    "mean_free_path",
]

SUTHERLAND_BETA = 1.458e-6
"""Sutherland coefficient for air, U.S. Standard Atmosphere 1976. [kg/(m s K^0.5)]"""

SUTHERLAND_CONSTANT = 110.4
"""Sutherland temperature for air, U.S. Standard Atmosphere 1976. [K]"""

MEAN_FREE_PATH_REFERENCES: dict[str, tuple[float, float, float]] = {
    # key: (lambda_ref [m], T_ref [K], P_ref [Pa])
    "kim2005": (67.3e-9, 296.15, 101325.0),
    "allen_raabe1985": (67.3e-9, 296.15, 101325.0),
    "hinds1999": (66.0e-9, 293.15, 101325.0),
}
"""Reference mean free paths of air, each paired with the slip-correction fit that used it.

- ``kim2005``: Kim, Mulholland, Kukuck & Pui (2005), J. Res. NIST 110:31-54, 67.3 nm at
  296.15 K and 101.3 kPa (adopted by ISO 15900:2020).
- ``allen_raabe1985``: Allen & Raabe (1985), Aerosol Sci. Technol. 4:269-286, 0.0673 um at
  23 degrees C and 1 atm.
- ``hinds1999``: Hinds (1999), Aerosol Technology, 2nd ed., section 2.5: 0.066 um at 20
  degrees C and 1 atm.
"""


def air_viscosity(T: float = T_DEFAULT) -> float:
    """Dynamic viscosity of air by Sutherland's law.

    Parameters
    ----------
    T : float
        Absolute temperature. [K]

    Returns
    -------
    float
        Dynamic viscosity. [Pa s]

    Notes
    -----
    mu = beta T^1.5 / (T + S) with beta = 1.458e-6 kg m^-1 s^-1 K^-1/2 and S = 110.4 K
    (U.S. Standard Atmosphere 1976, eq. 51). Valid for air at ordinary pressures from about
    100 K to 1900 K; independent of pressure in this range.

    References
    ----------
    .. [1] Sutherland, W. (1893), Phil. Mag. 36:507-531.
    .. [2] NOAA/NASA/USAF (1976), U.S. Standard Atmosphere 1976, eq. 51.

    Examples
    --------
    Hinds (1999) Appendix A1 gives 1.81e-5 Pa s for air at 20 degrees C:

    >>> round(air_viscosity(293.15), 7)
    1.81e-05

    """
    return SUTHERLAND_BETA * T**1.5 / (T + SUTHERLAND_CONSTANT)


def mean_free_path(T: float = T_DEFAULT, P: float = P_DEFAULT, reference: str = "kim2005") -> float:
    """Mean free path of air molecules at temperature ``T`` and pressure ``P``.

    Parameters
    ----------
    T : float
        Absolute temperature. [K]
    P : float
        Absolute pressure. [Pa]
    reference : str
        Key of :data:`MEAN_FREE_PATH_REFERENCES`: the reference state scaled from.

    Returns
    -------
    float
        Mean free path. [m]

    Notes
    -----
    Willeke (1976), J. Aerosol Sci. 7:381-387, eq. 2:
    lambda = lambda_r (P_r / P) (T / T_r) (1 + S / T_r) / (1 + S / T), with S = 110.4 K.

    References
    ----------
    .. [1] Willeke, K. (1976), Temperature dependence of particle slip in a gaseous
       medium, J. Aerosol Sci. 7:381-387.

    Examples
    --------
    Hinds (1999) section 2.5 gives 0.066 um at 20 degrees C and 1 atm:

    >>> round(mean_free_path(293.15, 101325.0) * 1e6, 3)
    0.066

    """
    try:
        lam_r, T_r, P_r = MEAN_FREE_PATH_REFERENCES[reference]
    except KeyError:
        raise ValueError(
            f"unknown reference {reference!r}; valid: {sorted(MEAN_FREE_PATH_REFERENCES)}"
        ) from None
    S = SUTHERLAND_CONSTANT
    return lam_r * (P_r / P) * (T / T_r) * (1.0 + S / T_r) / (1.0 + S / T)


def air_density(T: float = T_DEFAULT, P: float = P_DEFAULT) -> float:
    """Density of dry air from the ideal gas law.

    Parameters
    ----------
    T : float
        Absolute temperature. [K]
    P : float
        Absolute pressure. [Pa]

    Returns
    -------
    float
        Density. [kg/m^3]

    Notes
    -----
    rho = P M / (R T), M = 0.0289644 kg/mol (U.S. Standard Atmosphere 1976).

    Examples
    --------
    Hinds (1999) Appendix A1 gives 1.20 kg/m^3 at 20 degrees C and 1 atm:

    >>> round(air_density(293.15, 101325.0), 2)
    1.2

    """
    return P * AIR_MOLAR_MASS / (GAS_CONSTANT * T)
