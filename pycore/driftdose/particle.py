"""Motion of single aerosol particles in air: slip, mobility, diffusion, settling, inertia.

Interfaces (stable names, SI units, defaults 293.15 K and 101325 Pa):
:func:`slip_correction`, :func:`mobility`, :func:`diffusion_coefficient`,
:func:`relaxation_time`, :func:`settling_velocity`, :func:`stopping_distance`,
:func:`aerodynamic_diameter`, :func:`volume_equivalent_diameter`,
:func:`rms_displacement`, :func:`settling_distance`, :func:`crossover_diameter`,
:func:`brownian_time`, :func:`settling_time`.

Correlations: slip correction by Kim et al. (2005) or Allen & Raabe (1985); drag beyond
the Stokes regime by Clift & Gauvin (1970) (default, to Re 3e5) or Schiller & Naumann (1933)
(to Re 800); stopping distance by integrating the equation of motion with the same drag
law, or by Hinds's closed forms (Stokes and Klyachko, Hinds 1999 eqs. 5.19 and 5.27).

Diameters are volume-equivalent unless the name says aerodynamic. Buoyancy of the particle
in air is neglected (particle density >> gas density; common practice).
"""

from __future__ import annotations

import math

from . import gas
from ._numerics import brent_root, newton_bracketed
from .constants import BOLTZMANN, P_DEFAULT, STANDARD_GRAVITY, T_DEFAULT, WATER_DENSITY

__all__ = [
    "SETTLING_MODELS",
    "SLIP_MODELS",
    "aerodynamic_diameter",
    "brownian_time",
    "crossover_diameter",
    "diffusion_coefficient",
    "drag_factor_clift_gauvin1970",
    "drag_factor_schiller_naumann1933",
    "knudsen_number",
    "mobility",
    "mobility_diameter",
    "relaxation_time",
    "reynolds_number",
    "rms_displacement",
    "settling_distance",
    "settling_regime",
    "settling_time",
    "settling_velocity",
    "settling_velocity_clift_gauvin1970",
    "settling_velocity_schiller_naumann1933",
    "settling_velocity_stokes",
    "settling_warnings",
    "slip_correction",
    "stopping_distance",
    "stopping_distance_klyachko",
    "stopping_regime",
    "volume_equivalent_diameter",
]

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

SETTLING_MODELS = ("clift_gauvin1970", "schiller_naumann1933", "stokes")
"""Valid ``model`` keys of :func:`settling_velocity` (the first is the default)."""

SCHILLER_NAUMANN_RE_MAX = 800.0
"""Upper particle Reynolds number of the Schiller & Naumann (1933) drag fit
(Clift, Grace & Weber 1978, Table 5.2). [-]"""

CLIFT_GAUVIN_RE_MAX = 3e5
"""Upper particle Reynolds number of the Clift & Gauvin (1970) drag fit, just below the
drag crisis of a sphere (Clift, Grace & Weber 1978, Table 5.2, from memory). [-]"""

STOKES_RE_MAX = 0.1
"""Particle Reynolds number below which Stokes's law is within about 3 % of the standard
drag curve (Hinds 1999 ch. 3; common practice). [-]"""

STOKES_STOPPING_RE_MAX = 1.0
"""Initial Reynolds number up to which Hinds (1999, eq. 5.19) uses S = V0 tau. [-]"""


def drag_factor_clift_gauvin1970(re: float) -> float:
    """Drag over Stokes drag, C_D Re / 24, of the Clift & Gauvin (1970) correlation.

    Parameters
    ----------
    re : float
        Particle Reynolds number. [-]

    Returns
    -------
    float
        f = 1 + 0.15 Re^0.687 + 0.0175 Re / (1 + 42500 Re^-1.16), i.e.
        C_D = (24/Re)(1 + 0.15 Re^0.687) + 0.42 / (1 + 42500 Re^-1.16). [-]

    Notes
    -----
    Clift & Gauvin (1970) as given by Clift, Grace & Weber (1978), Table 5.2 (from memory):
    within a few per cent of the standard drag curve for Re < 3e5. It is the Schiller &
    Naumann (1933) form plus a term that brings C_D to about 0.42-0.47 in the Newton regime
    (Re 1e3 to 2e5, where Hinds 1999 quotes C_D of about 0.44). At Re = 800 the extra term
    adds 2.6 % to the drag.

    References
    ----------
    .. [1] Clift, R., Gauvin, W. H. (1970), The motion of particles in turbulent gas
       streams, Proc. Chemeca '70, 1:14-28.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    Examples
    --------
    >>> round(drag_factor_clift_gauvin1970(1000.0) * 24 / 1000.0, 3)  # C_D at Re 1000
    0.466

    """
    if re <= 0.0:
        return 1.0
    # 0.0175 Re / (1 + 42500 Re^-1.16) written with Re^1.16 in the numerator, so that a
    # Reynolds number near the smallest float (Re^-1.16 overflows) gives the Stokes limit
    re_116 = re**1.16
    return 1.0 + 0.15 * re**0.687 + 0.0175 * re * re_116 / (re_116 + 42500.0)


def drag_factor_schiller_naumann1933(re: float) -> float:
    """Drag over Stokes drag of the Schiller & Naumann (1933) fit, 1 + 0.15 Re^0.687.

    Parameters
    ----------
    re : float
        Particle Reynolds number. [-]

    Returns
    -------
    float
        C_D Re / 24 with C_D = (24/Re)(1 + 0.15 Re^0.687), valid to Re of about 800 (Clift,
        Grace & Weber 1978, Table 5.2). [-]

    """
    return 1.0 + 0.15 * max(re, 0.0) ** 0.687


_DRAG_FACTORS = {
    "clift_gauvin1970": drag_factor_clift_gauvin1970,
    "schiller_naumann1933": drag_factor_schiller_naumann1933,
}
_DRAG_RE_MAX = {"clift_gauvin1970": CLIFT_GAUVIN_RE_MAX, "schiller_naumann1933": 800.0}
_DRAG_NAMES = {
    "clift_gauvin1970": "Clift & Gauvin (1970)",
    "schiller_naumann1933": "Schiller & Naumann (1933)",
    "stokes": "Stokes's law",
}


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


def reynolds_number(d: float, velocity: float, T: float = T_DEFAULT, P: float = P_DEFAULT) -> float:
    """Particle Reynolds number Re = rho_g V d / mu.

    Parameters
    ----------
    d : float
        Diameter. [m]
    velocity : float
        Speed of the particle relative to the gas. [m/s]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Reynolds number. [-]

    """
    return gas.air_density(T, P) * abs(velocity) * d / gas.air_viscosity(T)


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
    d: float, density: float, T: float, P: float, shape_factor: float, factor
) -> float:
    """Solve V f(Re(V)) = V_Stokes for the terminal velocity with a drag factor f."""
    v_st = settling_velocity_stokes(d, density, T, P, shape_factor)
    k = gas.air_density(T, P) * d / gas.air_viscosity(T)  # Re = k V
    if factor(k * v_st) - 1.0 < 1e-12:
        return v_st

    def balance(v: float) -> float:
        return v * factor(k * v) - v_st

    return brent_root(balance, 0.0, v_st, xtol=v_st * 1e-14, rtol=1e-13)


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
    V f(Re(V)) = V_Stokes is solved by Brent's method. Valid to Re = 3e5 (Clift, Grace &
    Weber 1978, Table 5.2, from memory); beyond it :func:`settling_warnings` says so. The
    factor tends to 1 as Re -> 0, so small particles keep the Stokes-with-slip value.

    References
    ----------
    .. [1] Clift, R., Gauvin, W. H. (1970), Proc. Chemeca '70, 1:14-28.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    """
    return _settling_with_drag(d, density, T, P, shape_factor, drag_factor_clift_gauvin1970)


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
    is solved by Brent's method.

    References
    ----------
    .. [1] Schiller, L., Naumann, A. (1933), Z. Ver. Dtsch. Ing. 77:318-320.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    """
    return _settling_with_drag(d, density, T, P, shape_factor, drag_factor_schiller_naumann1933)


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
    Klyachko law). The integral is evaluated by Simpson's rule in ln Re (600 intervals over
    eight decades below Re0, the part below by f ~ 1; relative error below 1e-9). One drag
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
    n = 600
    lo, hi = math.log(a), math.log(re0)
    h = (hi - lo) / n
    total = 0.0
    for i in range(n + 1):
        r = math.exp(lo + i * h)
        w = 1.0 if i in (0, n) else (4.0 if i % 2 else 2.0)
        total += w * r / factor(r)
    return tau / k * (head + total * h / 3.0)


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


def aerodynamic_diameter(
    d: float, density: float, shape_factor: float = 1.0, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Aerodynamic diameter of a particle of volume-equivalent diameter ``d``.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Aerodynamic diameter (unit-density sphere with the same settling velocity). [m]

    Notes
    -----
    Solves d_ae^2 Cc(d_ae) rho_0 = d^2 Cc(d) rho_p / chi with rho_0 = 1000 kg/m^3
    (Hinds 1999, eq. 3.30 with slip) by Newton's method in ln d_ae, kept inside the bracket
    between the continuum and free-molecular limits (:func:`driftdose._numerics.newton_bracketed`).

    Examples
    --------
    In the continuum limit d_ae = d sqrt(rho_p / (rho_0 chi)) (Hinds 1999, eq. 3.27); a
    10 um sphere of density 4000 kg/m^3 is about 20 um aerodynamic (slip adds a little):

    >>> round(aerodynamic_diameter(10e-6, 4000.0) * 1e6, 1)
    20.1

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return d
    ratio = density / (WATER_DENSITY * shape_factor)
    return _solve_equal_settling(d, ratio, T, P)


def volume_equivalent_diameter(
    d_ae: float,
    density: float,
    shape_factor: float = 1.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Volume-equivalent diameter of a particle of aerodynamic diameter ``d_ae``.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Volume-equivalent diameter. [m]

    Notes
    -----
    Inverse of :func:`aerodynamic_diameter`, the same relation (Hinds 1999, eq. 3.30)
    solved for d, by the same safeguarded Newton iteration.

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return d_ae
    ratio = WATER_DENSITY * shape_factor / density
    return _solve_equal_settling(d_ae, ratio, T, P)


def mobility_diameter(
    d: float, shape_factor: float = 1.0, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Diameter of the sphere with the same mechanical mobility as a particle.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        d_m with Cc(d_m) / d_m = Cc(d) / (d chi) (Hinds 1999, eqs. 3.16 and 3.25: equal
        B = Cc / (3 pi mu d chi)); d chi in the continuum limit, d sqrt(chi) in the
        free-molecular one. Solved by Brent's method in ln d_m. [m]

    Examples
    --------
    Near the continuum limit d chi = 15 um; slip, smaller at 15 um than at 10 um, takes a
    little off:

    >>> round(mobility_diameter(10e-6, 1.5) * 1e6, 2)
    14.92

    """
    if shape_factor == 1.0:
        return d
    target = slip_correction(d, T, P) / (d * shape_factor)

    def f(log_dm: float) -> float:
        dm = math.exp(log_dm)
        return math.log(slip_correction(dm, T, P) / dm / target)

    r = shape_factor
    lo = min(r, math.sqrt(r), 1.0)
    hi = max(r, math.sqrt(r), 1.0)
    return math.exp(brent_root(f, math.log(d * lo * 0.5), math.log(d * hi * 2.0), xtol=1e-13))


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


def _solve_equal_settling(d: float, r: float, T: float, P: float) -> float:
    """Diameter d_x [m] with d_x^2 Cc(d_x) = r d^2 Cc(d), ``d`` [m], ``r`` [-].

    Newton's method in u = ln d_x on g(u) = ln(d_x^2 Cc(d_x)) - ln(r d^2 Cc(d)), whose slope
    2 + d ln Cc / d ln d lies between 1 (free-molecular) and 2 (continuum), so g is
    increasing; the iterates stay inside :func:`_ratio_bracket`. Starts from the continuum
    solution d sqrt(r). The slip correction is that of :func:`slip_correction` (default set).
    """
    two_lambda = 2.0 * gas.mean_free_path(T, P, reference="kim2005")
    cc_d, _ = _slip_and_log_slope(d, two_lambda)
    log_target = math.log(r * d * d * cc_d)

    def g(u: float) -> tuple[float, float]:
        x = math.exp(u)
        cc, slope = _slip_and_log_slope(x, two_lambda)
        return math.log(x * x * cc) - log_target, 2.0 + slope

    lo, hi = _ratio_bracket(d, r)
    return math.exp(newton_bracketed(g, lo, hi, math.log(d) + 0.5 * math.log(r)))


def _ratio_bracket(d: float, r: float) -> tuple[float, float]:
    """Bracket (in ln d) the solution of d_x^2 Cc(d_x) = r d^2 Cc(d).

    Between the continuum limit (factor sqrt(r)) and the free-molecular one (factor r).
    """
    lo = min(r, math.sqrt(r), 1.0)
    hi = max(r, math.sqrt(r), 1.0)
    return math.log(d * lo * 0.5), math.log(d * hi * 2.0)


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
