"""Health-related sampling conventions of ISO 7708:1995 (identical to EN 481:1993).

Interfaces (stable names; aerodynamic diameter in m, fraction of total airborne particles
[-]): :func:`inhalable`, :func:`thoracic`, :func:`respirable`, :func:`high_risk_respirable`,
and the registry :data:`CONVENTIONS` with :func:`iso7708_fraction` dispatching by key;
derived sub-fractions :func:`extrathoracic` and :func:`tracheobronchial`; and
:func:`convention_fractions`, the share of a distribution's number or mass in each. This is
the only home of the ISO 7708 curves: sampling stages and targets call it.

ISO 7708 defines the conventions for aerodynamic diameters up to 100 um. The inhalable
convention is stated for wind speeds up to 4 m/s; the standard notes that the conventions
are approximations of average human inhalation and penetration, not of any one person.
"""

from __future__ import annotations

import math
from functools import lru_cache

from . import particle
from .distribution import WEIGHTS, Distribution, LognormalMode, parts

__all__ = [
    "CONVENTIONS",
    "D_AE_MAX",
    "convention_fractions",
    "convention_shares",
    "extrathoracic",
    "high_risk_respirable",
    "inhalable",
    "iso7708_fraction",
    "respirable",
    "thoracic",
    "tracheobronchial",
]

D_AE_MAX = 100e-6
"""Largest aerodynamic diameter for which ISO 7708 defines the conventions. [m]"""

SIGMA = 1.5
"""Geometric standard deviation of the cumulative lognormals in ISO 7708. [-]"""

GAMMA_THORACIC = 11.64e-6
"""Median of the thoracic cumulative lognormal, ISO 7708 clause 6. [m]"""

GAMMA_RESPIRABLE = 4.25e-6
"""Median of the respirable cumulative lognormal, ISO 7708 clause 7. [m]"""

GAMMA_HIGH_RISK = 2.5e-6
"""Median of the high-risk respirable cumulative lognormal, ISO 7708 clause 7.1. [m]"""


def _phi(x: float) -> float:
    """Return the standard normal cumulative distribution function at x."""
    return 0.5 * math.erfc(-x / math.sqrt(2.0))


def inhalable(d_ae: float) -> float:
    """ISO 7708 inhalable convention: fraction of airborne particles that are inhalable.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter, 0 to 100 um. [m]

    Returns
    -------
    float
        E_I = 0.5 (1 + exp(-0.06 D)), D in um. [-]

    Notes
    -----
    ISO 7708:1995, clause 5 (EN 481:1993, clause 5.1). Not defined above 100 um; the value
    there is extrapolated (about 0.5).

    Examples
    --------
    ISO 7708 tabulates 77.4 % at 10 um (from memory; it follows from the definition):

    >>> round(inhalable(10e-6), 3)
    0.774

    """
    return 0.5 * (1.0 + math.exp(-0.06 * d_ae * 1e6))


def _penetration(d_ae: float, gamma: float) -> float:
    if d_ae <= 0.0:
        return 1.0
    x = math.log(d_ae / gamma) / math.log(SIGMA)
    return 1.0 - _phi(x)


def thoracic(d_ae: float) -> float:
    """ISO 7708 thoracic convention (fraction of total airborne particles).

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]

    Returns
    -------
    float
        E_T = E_I [1 - F(x)], x = ln(D / 11.64 um) / ln 1.5, F the standard normal
        cumulative distribution (ISO 7708:1995, clause 6). [-]

    Notes
    -----
    Gamma = 11.64 um is chosen so that, with the inhalable factor, 50 % of total airborne
    particles at 10 um aerodynamic diameter fall in the thoracic fraction.

    Examples
    --------
    >>> round(thoracic(10e-6), 3)
    0.5

    """
    return inhalable(d_ae) * _penetration(d_ae, GAMMA_THORACIC)


def respirable(d_ae: float) -> float:
    """ISO 7708 respirable convention (fraction of total airborne particles).

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]

    Returns
    -------
    float
        E_R = E_I [1 - F(x)], x = ln(D / 4.25 um) / ln 1.5 (ISO 7708:1995, clause 7). [-]

    Notes
    -----
    Gamma = 4.25 um gives, with the inhalable factor, 50 % of total airborne particles at
    4 um aerodynamic diameter.

    Examples
    --------
    >>> round(respirable(4e-6), 3)
    0.5

    """
    return inhalable(d_ae) * _penetration(d_ae, GAMMA_RESPIRABLE)


def high_risk_respirable(d_ae: float) -> float:
    """ISO 7708 high-risk respirable convention (for the sick or infirm, or children).

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]

    Returns
    -------
    float
        E_HR = E_I [1 - F(x)], x = ln(D / 2.5 um) / ln 1.5 (ISO 7708:1995, clause 7.1). [-]

    Notes
    -----
    Here Gamma = 2.5 um is the median of the cumulative lognormal itself; with the
    inhalable factor the convention is 0.465 of total airborne particles at 2.5 um.

    """
    return inhalable(d_ae) * _penetration(d_ae, GAMMA_HIGH_RISK)


def extrathoracic(d_ae: float) -> float:
    """Extrathoracic sub-fraction, E_I - E_T (ISO 7708:1995, clause 8). [-]

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter [m].
    """
    return inhalable(d_ae) - thoracic(d_ae)


def tracheobronchial(d_ae: float) -> float:
    """Tracheobronchial sub-fraction, E_T - E_R (ISO 7708:1995, clause 8). [-]

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter [m].
    """
    return thoracic(d_ae) - respirable(d_ae)


CONVENTIONS = {
    "inhalable": inhalable,
    "thoracic": thoracic,
    "respirable": respirable,
    "high_risk_respirable": high_risk_respirable,
}
"""The four ISO 7708 conventions by key; each is defined for aerodynamic diameters from 0 to
:data:`D_AE_MAX`."""


def iso7708_fraction(d_ae: float, fraction: str) -> float:
    """ISO 7708 health-related sampling convention ``fraction`` at aerodynamic diameter ``d_ae``.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter, 0 to 100 um (:data:`D_AE_MAX`). [m]
    fraction : str
        A key of :data:`CONVENTIONS`: ``inhalable``, ``thoracic``, ``respirable`` or
        ``high_risk_respirable``.

    Returns
    -------
    float
        Fraction of the total airborne particles of that size to be collected. [-]

    Notes
    -----
    ISO 7708:1995 (EN 481): inhalable E_I = 0.5 (1 + exp(-0.06 D)), D in um, defined to
    100 um; the thoracic, respirable and high-risk respirable conventions are
    E_I [1 - Phi(ln(D / Gamma) / ln(Sigma))] with Gamma = 11.64, 4.25 and 2.5 um and
    Sigma = 1.5. An unknown key raises ``ValueError``.

    References
    ----------
    .. [1] ISO 7708:1995, Air quality - Particle size fraction definitions for health-related
       sampling.

    Examples
    --------
    The respirable convention passes 50 % of 4 um particles (ISO 7708 tabulates 50.0 %
    at 4 um, from memory):

    >>> round(iso7708_fraction(4e-6, "respirable") * 100, 1)
    50.0

    """
    try:
        convention = CONVENTIONS[fraction]
    except KeyError:
        raise ValueError(f"unknown fraction {fraction!r}; valid: {sorted(CONVENTIONS)}") from None
    return convention(d_ae)


def convention_fractions(
    distribution: Distribution,
    weight: str = "mass",
    T: float = 293.15,
    P: float = 101325.0,
) -> dict[str, float]:
    """Share of a distribution's number, surface or mass in each ISO 7708 fraction.

    Parameters
    ----------
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        Particle population (volume-equivalent diameters with density and shape factor).
    weight : str
        ``number``, ``surface`` or ``mass``.
    T, P : float
        Temperature [K] and pressure [Pa] for the aerodynamic diameter (slip).

    Returns
    -------
    dict
        ``inhalable``, ``thoracic``, ``respirable``, ``high_risk_respirable``: fraction of
        the total airborne amount of the chosen weight. [-]

    """
    return convention_shares(distribution, (weight,), T, P)[weight]


CONVENTION_STEP = 0.3
"""Largest ln-d step of the quadrature used for convention shares (ln GSD / 2 for narrower
modes). [-]

The conventions vary on the scale ln(Sigma) = ln 1.5 = 0.41 and the lognormal weight on
ln GSD, so the trapezoidal rule with these steps keeps the shares within 1e-12 of a grid of
step 0.002 (GSD 1.05 to 5; 0.4 gave 5e-9), far beyond the printed precision of ISO 7708,
at a third of the nodes of the deposition grid."""


def convention_shares(
    distribution: Distribution,
    weights: tuple[str, ...] = ("mass", "number"),
    T: float = 293.15,
    P: float = 101325.0,
) -> dict[str, dict[str, float]]:
    """:func:`convention_fractions` for several weights at once, sharing the size solves.

    Parameters
    ----------
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        Particle population.
    weights : tuple of str
        Any of ``number``, ``surface``, ``mass``.
    T, P : float
        Temperature [K] and pressure [Pa].

    Returns
    -------
    dict
        ``{weight: {convention: share}}``. [-]

    Notes
    -----
    Each quadrature node's aerodynamic diameter (Hinds 1999, eq. 3.30 with slip) is solved
    once (:func:`driftdose.particle.aerodynamic_diameters`, a mode's nodes in order) and
    reused for every weight and convention. A lognormal mode's own shares do not depend on
    its concentration: they are kept per median, GSD, density and shape factor (the last
    :data:`SHARES_KEPT`), and a distribution's shares are the modes' weighted by their
    totals, so a change of amount, or of one mode, solves no node of the others again.
    """
    modes = parts(distribution)
    kept = [_kept_mode_shares(m, T, P) if isinstance(m, LognormalMode) else None for m in modes]
    spectra: dict[int, list[tuple[float, ...]]] = {}
    result: dict[str, dict[str, float]] = {}
    for weight in weights:
        total = distribution.total(weight)
        if total <= 0.0:
            result[weight] = dict.fromkeys(CONVENTIONS, 0.0)
            continue
        sums = [0.0] * len(CONVENTIONS)
        for i, m in enumerate(modes):
            own = kept[i]
            if isinstance(m, LognormalMode):
                if own is None:  # no particles: nothing to add
                    continue
                amount = m.total(weight)
                for j, share in enumerate(own[weight]):
                    sums[j] += amount * share
                continue
            nodes = m.quadrature(weight)
            if i not in spectra:
                solved = particle.aerodynamic_diameters(
                    [d for d, _ in nodes], m.density, m.shape_factor, T, P
                )
                spectra[i] = _convention_table(solved)
            _add_weighted(sums, [w for _, w in nodes], spectra[i])
        result[weight] = {k: v / total for k, v in zip(CONVENTIONS, sums, strict=True)}
    return result


SHARES_KEPT = 32
"""Lognormal modes whose convention shares :func:`convention_shares` keeps."""


def _kept_mode_shares(
    mode: LognormalMode, T: float, P: float
) -> dict[str, tuple[float, ...]] | None:
    """The shares of one mode by weight (see :func:`_mode_shares`), or None if it has none."""
    if not mode.number_concentration > 0.0:
        return None
    step = min(mode.ln_gsd / 2.0, CONVENTION_STEP)
    return _mode_shares(mode.cmd, mode.gsd, mode.density, mode.shape_factor, step, T, P)


@lru_cache(maxsize=SHARES_KEPT)
def _mode_shares(
    cmd: float, gsd: float, density: float, shape_factor: float, step: float, T: float, P: float
) -> dict[str, tuple[float, ...]]:
    """Shares of a lognormal mode's number, surface and mass in each ISO 7708 fraction.

    ``cmd`` [m], ``gsd`` [-], ``density`` [kg/m^3], ``shape_factor`` [-], ``step`` the ln-d
    step of the trapezoidal rule [-], ``T`` [K], ``P`` [Pa]. The values of the conventions
    at each node are computed once for all weights (a unit concentration: the shares do not
    depend on it).
    """
    mode = LognormalMode(cmd, gsd, 1.0, density, shape_factor)
    grid = mode.grid(step)
    solved = particle.aerodynamic_diameters(grid, density, shape_factor, T, P)
    values = _convention_table(solved)
    out = {}
    for weight in WEIGHTS:
        total = mode.total(weight)
        sums = [0.0] * len(CONVENTIONS)
        _add_weighted(sums, mode.quadrature_weights(weight, step), values)
        out[weight] = tuple(x / total for x in sums)
    return out


def _add_weighted(
    sums: list[float], weights: list[float], values: list[tuple[float, float, float, float]]
) -> None:
    """Add sum_i weights[i] values[i][j] to ``sums[j]`` for the four conventions, in order."""
    s0, s1, s2, s3 = sums
    for w, (v0, v1, v2, v3) in zip(weights, values, strict=True):
        s0 += w * v0
        s1 += w * v1
        s2 += w * v2
        s3 += w * v3
    sums[:] = [s0, s1, s2, s3]


def _convention_table(d_aes: list[float]) -> list[tuple[float, float, float, float]]:
    """:func:`_convention_values` at every aerodynamic diameter of ``d_aes`` [m], written out.

    The same arithmetic in the same order as :func:`_convention_values` (so the same numbers
    to the last bit), without three function calls per size.
    """
    exp, log, erfc = math.exp, math.log, math.erfc
    ln_sigma, root2 = _LN_SIGMA, math.sqrt(2.0)
    g_t, g_r, g_h = _GAMMAS
    out = []
    for d_ae in d_aes:
        e_i = 0.5 * (1.0 + exp(-0.06 * d_ae * 1e6))
        if d_ae <= 0.0:
            out.append((e_i, e_i, e_i, e_i))
            continue
        out.append(
            (
                e_i,
                e_i * (1.0 - 0.5 * erfc(-(log(d_ae / g_t) / ln_sigma) / root2)),
                e_i * (1.0 - 0.5 * erfc(-(log(d_ae / g_r) / ln_sigma) / root2)),
                e_i * (1.0 - 0.5 * erfc(-(log(d_ae / g_h) / ln_sigma) / root2)),
            )
        )
    return out


_LN_SIGMA = math.log(SIGMA)
_GAMMAS = (GAMMA_THORACIC, GAMMA_RESPIRABLE, GAMMA_HIGH_RISK)


def _convention_values(d_ae: float) -> tuple[float, float, float, float]:
    """The four conventions of :data:`CONVENTIONS`, in its order, at ``d_ae`` [m].

    The same equations as :func:`inhalable` and :func:`_penetration` (ISO 7708:1995,
    clauses 5 to 7.1), with the inhalable fraction computed once for all four.
    """
    e_i = inhalable(d_ae)
    if d_ae <= 0.0:
        return (e_i, e_i, e_i, e_i)
    thoracic_, respirable_, high_risk = (
        e_i * (1.0 - _phi(math.log(d_ae / g) / _LN_SIGMA)) for g in _GAMMAS
    )
    return (e_i, thoracic_, respirable_, high_risk)
