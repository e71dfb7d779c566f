"""Terminal settling velocity in still air: Stokes's law with slip and two drag laws beyond it.

The drag laws (Clift & Gauvin 1970, default; Schiller & Naumann 1933) are those of
:mod:`driftdose.particle.drag`; warnings and regime names say which law set a velocity.
"""

from __future__ import annotations

from .. import gas
from ..constants import P_DEFAULT, STANDARD_GRAVITY, T_DEFAULT
from .diffusion import relaxation_time
from .drag import (
    _DRAG_BALANCES,
    _DRAG_NAMES,
    _DRAG_RE_MAX,
    STOKES_RE_MAX,
    reynolds_number,
)

SETTLING_MODELS = ("clift_gauvin1970", "schiller_naumann1933", "stokes")
"""Valid ``model`` keys of :func:`settling_velocity` (the first is the default)."""


def settling_velocity_stokes(
    d: float, density: float, T: float = T_DEFAULT, P: float = P_DEFAULT, shape_factor: float = 1.0
) -> float:
    """Terminal settling velocity by Stokes's law with slip and shape factor.

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
        Settling velocity. [m/s]

    Notes
    -----
    v = rho_p d^2 g Cc / (18 mu chi) (Hinds 1999, eqs. 3.21 and 3.29). Valid for particle
    Reynolds number below about 0.1.

    """
    return relaxation_time(d, density, T, P, shape_factor) * STANDARD_GRAVITY


def _settling_with_drag(
    d: float, density: float, T: float, P: float, shape_factor: float, model: str
) -> float:
    """Solve V f(Re(V)) = V_Stokes for the terminal velocity with the drag law ``model``."""
    v_st = settling_velocity_stokes(d, density, T, P, shape_factor)
    k = gas.air_density(T, P) * d / gas.air_viscosity(T)  # Re = k V
    return _drag_velocity(v_st, k, _DRAG_BALANCES[model])


def _drag_velocity(v_st: float, k: float, balance) -> float:
    """Terminal velocity [m/s] from the Stokes velocity ``v_st`` [m/s], Re = ``k`` V [s/m].

    The force balance V f(Re(V)) = V_Stokes, written in Re: g(Re) = Re f(Re) - Re_st = 0 with
    Re_st = k V_Stokes. ``balance`` gives f and the slope d(Re f)/dRe (both >= 1, so g rises).
    Since f rises with Re, the root lies in [Re_st / f(Re_st), Re_st]; Newton's method starts
    at the lower end, which for small Re_st is already within about 0.7 (f - 1)^2 of the root
    (one fixed-point step), and a step that would leave the shrinking bracket is replaced by
    bisection (``rtsafe``, Press, Teukolsky, Vetterling & Flannery 2007, Numerical Recipes,
    3rd ed., section 9.4). It stops after the first step shorter than 1e-7 of the iterate:
    the quadratic convergence leaves an error of order 1e-14 relative.
    """
    re_st = k * v_st
    if re_st <= 0.0:
        return v_st
    f_st, _ = balance(re_st)
    if f_st - 1.0 < 1e-12:
        return v_st
    if f_st - 1.0 < 1e-8:  # the first guess is within 0.7 (f - 1)^2 < 1e-16 of the root
        return v_st / f_st
    lo = x = re_st / f_st
    hi = re_st
    for _ in range(100):
        f, slope = balance(x)
        g = x * f - re_st
        if g == 0.0:
            break
        if g < 0.0:
            lo = x
        else:
            hi = x
        new = x - g / slope
        if not lo <= new <= hi:
            new = 0.5 * (lo + hi)
        step = abs(new - x)
        x = new
        if step <= 1e-7 * x or hi - lo <= 1e-15 * hi:
            break
    return x / k


def settling_velocity_clift_gauvin1970(
    d: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
) -> float:
    """Terminal settling velocity with the Clift & Gauvin (1970) drag correlation.

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
        Settling velocity. [m/s]

    Notes
    -----
    The drag is Stokes's with slip and shape factor times the factor of
    :func:`drag_factor_clift_gauvin1970`, F = 3 pi mu d V chi f(Re) / Cc; the force balance
    V f(Re(V)) = V_Stokes is solved by safeguarded Newton steps in Re. Valid to Re = 3e5
    (Clift, Grace & Weber 1978, Table 5.2, from memory); beyond it :func:`settling_warnings`
    says so. The
    factor tends to 1 as Re -> 0, so small particles keep the Stokes-with-slip value.

    References
    ----------
    .. [1] Clift, R., Gauvin, W. H. (1970), Proc. Chemeca '70, 1:14-28.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    """
    return _settling_with_drag(d, density, T, P, shape_factor, "clift_gauvin1970")


def settling_velocity_schiller_naumann1933(
    d: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
) -> float:
    """Terminal settling velocity with the Schiller & Naumann (1933) drag correction.

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
        Settling velocity. [m/s]

    Notes
    -----
    The drag force is Stokes's with slip and shape factor times the Schiller & Naumann
    factor: F = 3 pi mu d V chi (1 + 0.15 Re^0.687) / Cc, i.e. C_D = (24/Re)(1 + 0.15
    Re^0.687), valid to Re of about 800 (Clift, Grace & Weber 1978, Table 5.2); above it the
    fit is extrapolated (9 % fast at Re 1600 against the standard drag curve) and
    :func:`settling_warnings` says so. The force balance V (1 + 0.15 Re(V)^0.687) = V_Stokes
    is solved by safeguarded Newton steps in Re.

    References
    ----------
    .. [1] Schiller, L., Naumann, A. (1933), Z. Ver. Dtsch. Ing. 77:318-320.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    """
    return _settling_with_drag(d, density, T, P, shape_factor, "schiller_naumann1933")


def settling_warnings(
    d: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
    model: str = "clift_gauvin1970",
) -> list[str]:
    """Say when a settling velocity leaves the range of its drag law.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter [m].
    density : float
        Particle density [kg/m^3].
    T : float
        Air temperature [K].
    P : float
        Air pressure [Pa].
    shape_factor : float
        Dynamic shape factor [-].
    model : str
        The settling model used, a key of :data:`SETTLING_MODELS`.

    Returns
    -------
    list of str
        Empty inside the drag law's range (Stokes: Re <= 0.1; Schiller & Naumann: Re <= 800;
        Clift & Gauvin: Re <= 3e5), else one sentence naming the Reynolds number and limit.

    """
    v = settling_velocity(d, density, T, P, shape_factor, model)
    re = reynolds_number(d, v, T, P)
    limit = STOKES_RE_MAX if model == "stokes" else _DRAG_RE_MAX[model]
    if re <= limit:
        return []
    return [
        f"Particle Reynolds number {re:.3g} exceeds {limit:g}, the upper limit of "
        f"{_DRAG_NAMES[model]}; the settling velocity is extrapolated."
    ]


def settling_regime(re: float, model: str = "clift_gauvin1970") -> str:
    """Name the drag law that set a settling velocity at particle Reynolds number ``re``.

    Returns ``"Stokes with slip (Re ≤ 0.1)"`` in the Stokes regime, else the correlation's
    name with its range, e.g. ``"Clift & Gauvin (1970) drag (valid to Re 3×10⁵)"``.

    Parameters
    ----------
    re : float
        Particle Reynolds number at the settling velocity [-].
    model : str
        The settling model used, a key of :data:`SETTLING_MODELS`.
    """
    if model == "stokes" or re <= STOKES_RE_MAX:
        return "Stokes with slip (Re ≤ 0.1)" if re <= STOKES_RE_MAX else "Stokes with slip"
    limit = {"clift_gauvin1970": "3×10⁵", "schiller_naumann1933": "800"}[model]
    return f"{_DRAG_NAMES[model]} drag (valid to Re {limit})"


def settling_velocity(
    d: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
    model: str = "clift_gauvin1970",
) -> float:
    """Terminal settling velocity in still air (stable interface).

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
    model : str
        ``clift_gauvin1970`` (default: Stokes with slip, corrected beyond the Stokes regime
        by a drag law valid to Re 3e5), ``schiller_naumann1933`` (valid to Re 800) or
        ``stokes`` (Stokes with slip only).

    Returns
    -------
    float
        Settling velocity. [m/s]

    Examples
    --------
    Hinds (1999) Appendix A11 lists 3.5e-5 m/s for a 1 um unit-density sphere at 20
    degrees C:

    >>> f"{settling_velocity(1e-6, 1000.0):.1e}"
    '3.5e-05'

    """
    if model == "stokes":
        return settling_velocity_stokes(d, density, T, P, shape_factor)
    if model == "clift_gauvin1970":
        return settling_velocity_clift_gauvin1970(d, density, T, P, shape_factor)
    if model == "schiller_naumann1933":
        return settling_velocity_schiller_naumann1933(d, density, T, P, shape_factor)
    raise ValueError(f"unknown settling model {model!r}; valid: {sorted(SETTLING_MODELS)}")
