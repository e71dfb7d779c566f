"""Slip correction of small particles: Knudsen number and the Cunningham factor.

Coefficient sets of Kim et al. (2005) (default) and Allen & Raabe (1985), each with the mean
free path of its own fit (:mod:`driftdose.gas`).
"""

from __future__ import annotations

import math

from .. import gas
from ..constants import P_DEFAULT, T_DEFAULT

SLIP_MODELS: dict[str, tuple[float, float, float]] = {
    "kim2005": (1.165, 0.483, 0.997),
    "allen_raabe1985": (1.142, 0.558, 0.999),
}
"""Empirical coefficients (alpha, beta, gamma) of Cc = 1 + Kn [alpha + beta exp(-gamma/Kn)].

Each set was fitted with its own mean free path (see ``gas.MEAN_FREE_PATH_REFERENCES``,
same key): both use 67.3 nm at 296.15 K and 101.3 kPa.

- ``kim2005``: Kim, Mulholland, Kukuck & Pui (2005), J. Res. NIST 110:31-54, eq. 9;
  the set adopted by ISO 15900:2020. Default.
- ``allen_raabe1985``: Allen & Raabe (1985), Aerosol Sci. Technol. 4:269-286.
"""


def knudsen_number(
    d: float, T: float = T_DEFAULT, P: float = P_DEFAULT, model: str = "kim2005"
) -> float:
    """Particle Knudsen number Kn = 2 lambda / d.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    model : str
        Slip model key; selects the mean free path reference that goes with it.

    Returns
    -------
    float
        Knudsen number. [-]

    """
    return 2.0 * gas.mean_free_path(T, P, reference=model) / d


def slip_correction(
    d: float, T: float = T_DEFAULT, P: float = P_DEFAULT, model: str = "kim2005"
) -> float:
    """Cunningham slip correction factor.

    Parameters
    ----------
    d : float
        Particle diameter. [m]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    model : str
        Coefficient set, a key of :data:`SLIP_MODELS` (default ``kim2005``).

    Returns
    -------
    float
        Slip correction factor Cc. [-]

    Notes
    -----
    Cc = 1 + Kn [alpha + beta exp(-gamma / Kn)], Kn = 2 lambda / d (Knudsen & Weber 1911
    form; Kim et al. 2005, eq. 9; Allen & Raabe 1985). The mean free path is scaled to T and
    P from the reference state used by the fit (Willeke 1976). The Kim et al. fit covers
    Kn from 0.5 to 83 (particles of about 1.6 nm to 270 nm at 1 atm) and tends to the
    continuum and free-molecular limits outside it.

    References
    ----------
    .. [1] Kim, J. H., Mulholland, G. W., Kukuck, S. R., Pui, D. Y. H. (2005), Slip
       correction measurements of certified PSL nanoparticles using a nanometer
       differential mobility analyzer (nano-DMA) for Knudsen number from 0.5 to 83,
       J. Res. NIST 110:31-54.
    .. [2] Allen, M. D., Raabe, O. G. (1985), Slip correction measurements of spherical
       solid aerosol particles in an improved Millikan apparatus, Aerosol Sci. Technol.
       4:269-286.

    Examples
    --------
    Seinfeld & Pandis (2006), Table 9.3, list Cc = 1.164 at 1 um and 298 K, computed with
    an older coefficient set (sets differ by up to about 3 %); the Kim et al. set gives:

    >>> round(slip_correction(1e-6, T=298.15), 3)
    1.158

    """
    try:
        alpha, beta, gamma = SLIP_MODELS[model]
    except KeyError:
        raise ValueError(f"unknown slip model {model!r}; valid: {sorted(SLIP_MODELS)}") from None
    kn = knudsen_number(d, T, P, model)
    return 1.0 + kn * (alpha + beta * math.exp(-gamma / kn))


def _slip_and_log_slope(d: float, two_lambda: float) -> tuple[float, float]:
    """Slip correction Cc(d) [-] and its logarithmic slope d ln Cc / d ln d [-].

    ``d`` [m]; ``two_lambda`` [m] twice the mean free path of the Kim et al. (2005) set.
    Cc = 1 + Kn [alpha + beta exp(-gamma / Kn)] with Kn = 2 lambda / d (the default set of
    :func:`slip_correction`, Kim et al. 2005, eq. 9); since d Kn / d ln d = -Kn,
    d Cc / d ln d = -Kn [alpha + beta exp(-gamma / Kn)] - beta gamma exp(-gamma / Kn).
    """
    alpha, beta, gamma = SLIP_MODELS["kim2005"]
    kn = two_lambda / d
    e = beta * math.exp(-gamma / kn)
    cc = 1.0 + kn * (alpha + e)
    return cc, (-kn * (alpha + e) - gamma * e) / cc
