"""Stopping distance of a projected particle: the equation of motion with a drag law.

Also Hinds's closed forms (Stokes and Klyachko, Hinds 1999 eqs. 5.19 and 5.27), kept as the
published reference.
"""

from __future__ import annotations

import math

from .. import gas
from .._numerics import gauss_legendre
from ..constants import P_DEFAULT, T_DEFAULT
from .diffusion import relaxation_time
from .drag import _DRAG_FACTORS, _DRAG_NAMES, STOKES_RE_MAX, reynolds_number
from .settling import SETTLING_MODELS

_PANELS = 8
"""Panels of the stopping-distance integral, one per decade of Re below Re0. [-]"""
_NODES_PER_PANEL = 10
"""Gauss-Legendre nodes per panel. [-]"""

STOKES_STOPPING_RE_MAX = 1.0
"""Initial Reynolds number up to which Hinds (1999, eq. 5.19) uses S = V0 tau. [-]"""


def stopping_distance(
    d: float,
    initial_velocity: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
    model: str = "clift_gauvin1970",
) -> float:
    """Distance a particle travels in still air after being projected at ``initial_velocity``.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    initial_velocity : float
        Initial speed relative to the air. [m/s]
    density : float
        Particle density. [kg/m^3]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]
    shape_factor : float
        Dynamic shape factor chi. [-]
    model : str
        Drag law: ``clift_gauvin1970`` (default), ``schiller_naumann1933`` or ``stokes``
        (S = V0 tau, Hinds 1999 eq. 5.19).

    Returns
    -------
    float
        Stopping distance. [m]

    Notes
    -----
    The equation of motion m dV/dt = -F(V), with the drag F = (m / tau) V f(Re) of the
    chosen law (f = C_D Re / 24; tau carries slip and shape factor), integrates once to

        S = tau integral_0^V0 dV / f(Re(V)) = (tau / k) integral_0^Re0 dRe / f(Re),

    k = rho_g d / mu (Hinds 1999 section 5.5 derives his eq. 5.27 the same way from the
    Klyachko law). The integral is evaluated in ln Re by Gauss-Legendre quadrature, 10 nodes
    on each of the eight decades below Re0 (quadrature error below 1e-13 relative against a
    200 000-interval Simpson's rule, Re0 from 1e-3 to 1e6), the part below to first order
    in 0.15 Re^0.687 (below 1e-11 of the whole). One drag
    law from Re0 = 0 up, so there is no step at Re0 = 1: Hinds's split (eq. 5.19 below
    Re0 = 1, eq. 5.27 above) stepped down by 9.8 % there. For Re0 << 1 the result tends to
    V0 tau (Hinds 1999, eq. 5.19); at Re0 = 1 it is 6 % below it.

    References
    ----------
    .. [1] Hinds, W. C. (1999), Aerosol Technology, 2nd ed., Wiley, section 5.5.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    Examples
    --------
    Hinds (1999) Table 5.2 lists 2.3 mm for a 10 um unit-density sphere projected at
    10 m/s (from memory), computed with the Klyachko law; the Clift & Gauvin drag is 2.4 %
    lower at Re0 = 6.6, so the particle travels a little farther:

    >>> round(stopping_distance_klyachko(10e-6, 10.0, 1000.0) * 1e3, 1)
    2.3
    >>> round(stopping_distance(10e-6, 10.0, 1000.0) * 1e3, 1)
    2.4

    """
    tau = relaxation_time(d, density, T, P, shape_factor)
    v0 = abs(initial_velocity)
    if model == "stokes":
        return v0 * tau
    try:
        factor = _DRAG_FACTORS[model]
    except KeyError:
        raise ValueError(
            f"unknown drag model {model!r}; valid: {sorted(SETTLING_MODELS)}"
        ) from None
    k = gas.air_density(T, P) * d / gas.air_viscosity(T)
    re0 = k * v0
    if re0 <= 0.0 or factor(re0) - 1.0 < 1e-12:
        return v0 * tau
    a = re0 * 1e-8
    # below a: f = 1 + 0.15 Re^0.687 + ..., integrated to first order
    head = a / (1.0 + 0.15 * a**0.687 / 1.687)
    nodes, weights = gauss_legendre(_NODES_PER_PANEL)
    lo = math.log(a)
    h = (math.log(re0) - lo) / _PANELS
    total = 0.0
    for p in range(_PANELS):
        mid = lo + (p + 0.5) * h
        for x, w in zip(nodes, weights, strict=True):
            r = math.exp(mid + 0.5 * h * x)
            total += w * r / factor(r)
    return tau / k * (head + total * 0.5 * h)


def stopping_distance_klyachko(
    d: float,
    initial_velocity: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
) -> float:
    """Stopping distance by Hinds's split: Stokes up to Re0 = 1, Klyachko's law above.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter [m].
    initial_velocity : float
        Initial velocity relative to the air [m/s].
    density : float
        Particle density [kg/m^3].
    T : float
        Air temperature [K].
    P : float
        Air pressure [Pa].
    shape_factor : float
        Dynamic shape factor [-].

    Returns
    -------
    float
        S = V0 tau for Re0 <= 1 (Hinds 1999, eq. 5.19), else the closed form of the
        Klyachko drag law C_D = (24/Re)(1 + Re^(2/3)/6),
        S = (rho_p d / rho_g) [Re0^(1/3) - sqrt(6) arctan(Re0^(1/3) / sqrt(6))]
        (Hinds 1999, eq. 5.27, from memory), with slip and shape factor carried through tau.
        Kept as the published reference; it steps down 9.8 % as Re0 passes 1. [m]

    """
    re0 = reynolds_number(d, initial_velocity, T, P)
    tau = relaxation_time(d, density, T, P, shape_factor)
    if re0 <= STOKES_STOPPING_RE_MAX:
        return abs(initial_velocity) * tau
    u = re0 ** (1.0 / 3.0)
    root6 = math.sqrt(6.0)
    # 18 tau mu / (rho_g d) is rho_p d / rho_g for chi = 1 and Cc = 1
    scale = 18.0 * tau * gas.air_viscosity(T) / (gas.air_density(T, P) * d)
    return scale * (u - root6 * math.atan(u / root6))


def stopping_regime(re0: float, model: str = "clift_gauvin1970") -> str:
    """Name how the stopping distance was found at initial Reynolds number ``re0``.

    Parameters
    ----------
    re0 : float
        Particle Reynolds number at the initial velocity [-].
    model : str
        The drag model used, a key of :data:`SETTLING_MODELS`.
    """
    if model == "stokes":
        return "Stokes: S = V₀τ"
    if re0 <= STOKES_RE_MAX:
        return f"Equation of motion, {_DRAG_NAMES[model]} drag (≈ V₀τ at this Re₀)"
    return f"Equation of motion, {_DRAG_NAMES[model]} drag"
