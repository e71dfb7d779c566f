"""Simplified algebraic fits to the ICRP 66 deposition model (Hinds 1999, eqs. 11.1-11.5).

For unit-density spheres at standard conditions, nose breathing; the fits describe the
ICRP Publication 66 model's deposition fractions averaged over the breathing conditions
stated by Hinds (1999, section 11.4). The total is its own fit, not the sum of the
regions. Valid for 0.001 to 100 um (Hinds 1999, section 11.4); outside that range
:func:`simplified_icrp` still returns values but :func:`validity_warnings` says so.
"""

from __future__ import annotations

import math

__all__ = ["D_MAX", "D_MIN", "REGIONS", "simplified_icrp", "validity_warnings"]

D_MIN = 1e-9
"""Smallest diameter of the fits' stated range. [m]"""

D_MAX = 100e-6
"""Largest diameter of the fits' stated range. [m]"""

REGIONS = ("head_airways", "tracheobronchial", "alveolar")
"""The regional keys of :func:`simplified_icrp` (plus ``inhalable`` and ``total``)."""


def simplified_icrp(d: float, d_ae: float | None = None) -> dict[str, float]:
    """Regional deposition fractions from the algebraic fits to the ICRP 66 model.

    Parameters
    ----------
    d : float
        Particle diameter of a unit-density sphere (aerodynamic and physical diameter
        coincide for it); with ``d_ae`` given, the thermodynamic diameter (the size that
        sets diffusion). [m]
    d_ae : float, optional
        Aerodynamic diameter, for particles that are not unit-density spheres. [m]

    Returns
    -------
    dict
        ``inhalable``, ``head_airways``, ``tracheobronchial``, ``alveolar``, ``total``:
        fractions of the particles in the ambient air [-].

    Notes
    -----
    With d_p in um (Hinds 1999, eqs. 11.1-11.5):

    - IF = 1 - 0.5 (1 - 1 / (1 + 0.00076 d_p^2.8))                                  (11.1)
    - DF_HA = IF [1 / (1 + exp(6.84 + 1.183 ln d_p)) + 1 / (1 + exp(0.924 - 1.885 ln d_p))]
                                                                                    (11.2)
    - DF_TB = (0.00352 / d_p) [exp(-0.234 (ln d_p + 3.40)^2)
      + 63.9 exp(-0.819 (ln d_p - 1.61)^2)]                                          (11.3)
    - DF_AL = (0.0155 / d_p) [exp(-0.416 (ln d_p + 2.84)^2)
      + 19.11 exp(-0.482 (ln d_p - 1.362)^2)]                                        (11.4)
    - DF = IF [0.0587 + 0.911 / (1 + exp(4.77 + 1.485 ln d_p))
      + 0.943 / (1 + exp(0.508 - 2.58 ln d_p))]                                      (11.5)

    The coefficients are written as recalled from Hinds (1999); the tests check them
    against values printed from the same equations in the literature and against the full
    model of :mod:`driftdose.deposition.icrp66`.

    Other particles (``d_ae`` given). Each fit is a sum of a term that falls with size
    (diffusion: the first logistic of 11.2 and 11.5, the first Gaussian of 11.3 and 11.4)
    and a term that rises with it (impaction and settling: the second ones). The diffusion
    terms, with their 1/d_p prefactor, are entered with the thermodynamic diameter ``d``,
    the inertial terms and the inhalability with ``d_ae``; the constant 0.0587 of 11.5 is
    kept. This follows ICRP 66's own split of every efficiency into a thermodynamic and an
    aerodynamic part (Annex D); it is this tool's way of applying the fits, not Hinds's.
    It is continuous in size for any density, unlike a switch from the physical to the
    aerodynamic diameter at 0.5 um (the usual advice, Hinds 1999 ch. 11, from memory),
    which made the total jump by up to 31 % at the switch for densities of 2-11 g/cm^3. For
    a unit-density sphere both diameters are equal and the fits are unchanged.

    References
    ----------
    .. [1] Hinds, W. C. (1999), Aerosol Technology, 2nd ed., Wiley, section 11.4,
       eqs. 11.1-11.5.
    .. [2] ICRP (1994), Human Respiratory Tract Model for Radiological Protection, ICRP
       Publication 66, Ann. ICRP 24(1-3).

    Examples
    --------
    >>> r = simplified_icrp(1e-6)
    >>> round(r["inhalable"], 4)
    0.9996

    """
    dp = d * 1e6  # thermodynamic size: diffusion terms
    da = dp if d_ae is None else d_ae * 1e6  # aerodynamic size: inhalability, inertial terms
    ln = math.log(dp)
    la = math.log(da)
    inh = 1.0 - 0.5 * (1.0 - 1.0 / (1.0 + 0.00076 * da**2.8))  # eq. 11.1
    ha = inh * (
        1.0 / (1.0 + math.exp(min(700.0, 6.84 + 1.183 * ln)))
        + 1.0 / (1.0 + math.exp(min(700.0, 0.924 - 1.885 * la)))
    )  # eq. 11.2
    tb = (0.00352 / dp) * math.exp(-0.234 * (ln + 3.40) ** 2) + (0.00352 / da) * 63.9 * math.exp(
        -0.819 * (la - 1.61) ** 2
    )  # eq. 11.3
    al = (0.0155 / dp) * math.exp(-0.416 * (ln + 2.84) ** 2) + (0.0155 / da) * 19.11 * math.exp(
        -0.482 * (la - 1.362) ** 2
    )  # eq. 11.4
    total = inh * (
        0.0587
        + 0.911 / (1.0 + math.exp(min(700.0, 4.77 + 1.485 * ln)))
        + 0.943 / (1.0 + math.exp(min(700.0, 0.508 - 2.58 * la)))
    )  # eq. 11.5
    return {
        "inhalable": inh,
        "head_airways": ha,
        "tracheobronchial": tb,
        "alveolar": al,
        "total": total,
    }


def validity_warnings(d_min: float, d_max: float) -> list[str]:
    """Warnings when diameters from ``d_min`` to ``d_max`` leave the fits' range.

    Parameters
    ----------
    d_min, d_max : float
        Smallest and largest diameter used [m].
    """
    out = []
    if d_min < D_MIN:
        out.append(
            "Below 1 nm the simplified ICRP fits (Hinds 1999) are extrapolated beyond "
            "their stated range."
        )
    if d_max > D_MAX:
        out.append(
            "Above 100 µm the simplified ICRP fits (Hinds 1999) are extrapolated beyond "
            "their stated range."
        )
    return out
