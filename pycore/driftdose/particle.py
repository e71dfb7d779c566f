"""Motion of single aerosol particles in air: slip, mobility, diffusion, settling, inertia.

Interfaces (stable names, SI units, defaults 293.15 K and 101325 Pa):
:func:`slip_correction`, :func:`mobility`, :func:`diffusion_coefficient`,
:func:`relaxation_time`, :func:`settling_velocity`, :func:`stopping_distance`,
:func:`aerodynamic_diameter`, :func:`volume_equivalent_diameter`,
:func:`rms_displacement`, :func:`settling_distance`, :func:`crossover_diameter`,
:func:`brownian_time`, :func:`settling_time`.

Correlations: slip correction by Kim et al. (2005) or Allen & Raabe (1985); drag beyond
the Stokes regime by Schiller & Naumann (1933); non-Stokesian stopping distance from the
Klyachko drag law (as given by Hinds 1999, eq. 5.27, from memory).

Diameters are volume-equivalent unless the name says aerodynamic. Buoyancy of the particle
in air is neglected (particle density >> gas density; common practice).
"""

from __future__ import annotations

import math

from . import gas
from ._numerics import brent_root
from .constants import BOLTZMANN, P_DEFAULT, STANDARD_GRAVITY, T_DEFAULT, WATER_DENSITY

__all__ = [
    "SETTLING_MODELS",
    "SLIP_MODELS",
    "aerodynamic_diameter",
    "brownian_time",
    "crossover_diameter",
    "diffusion_coefficient",
    "knudsen_number",
    "mobility",
    "mobility_diameter",
    "relaxation_time",
    "reynolds_number",
    "rms_displacement",
    "settling_distance",
    "settling_time",
    "settling_velocity",
    "settling_velocity_schiller_naumann1933",
    "settling_velocity_stokes",
    "slip_correction",
    "stopping_distance",
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

SETTLING_MODELS = ("schiller_naumann1933", "stokes")
"""Valid ``model`` keys of :func:`settling_velocity`."""

SCHILLER_NAUMANN_RE_MAX = 800.0
"""Upper particle Reynolds number of the Schiller & Naumann (1933) drag fit
(Clift, Grace & Weber 1978, Table 5.2). [-]"""


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
    Re^0.687), valid to Re of about 800 (Clift, Grace & Weber 1978, Table 5.2). The force
    balance V (1 + 0.15 Re(V)^0.687) = V_Stokes is solved by Brent's method. The factor
    tends to 1 as Re -> 0, so small particles keep the Stokes-with-slip value.

    References
    ----------
    .. [1] Schiller, L., Naumann, A. (1933), Z. Ver. Dtsch. Ing. 77:318-320.
    .. [2] Clift, R., Grace, J. R., Weber, M. E. (1978), Bubbles, Drops and Particles,
       Academic Press, Table 5.2.

    """
    v_st = settling_velocity_stokes(d, density, T, P, shape_factor)
    k = gas.air_density(T, P) * d / gas.air_viscosity(T)  # Re = k V
    if 0.15 * (k * v_st) ** 0.687 < 1e-12:
        return v_st

    def balance(v: float) -> float:
        return v * (1.0 + 0.15 * (k * v) ** 0.687) - v_st

    return brent_root(balance, 0.0, v_st, xtol=v_st * 1e-14, rtol=1e-13)


def settling_velocity(
    d: float,
    density: float,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    shape_factor: float = 1.0,
    model: str = "schiller_naumann1933",
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
        ``schiller_naumann1933`` (default: Stokes with slip, corrected beyond the Stokes
        regime) or ``stokes`` (Stokes with slip only).

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

    Returns
    -------
    float
        Stopping distance. [m]

    Notes
    -----
    For an initial Reynolds number Re0 <= 1, S = V0 tau (Hinds 1999, eq. 5.19). Above it,
    the drag law C_D = (24/Re)(1 + Re^(2/3)/6) (Klyachko 1934, as given by Hinds) integrates
    in closed form to S = (rho_p d / rho_g) [Re0^(1/3) - sqrt(6) arctan(Re0^(1/3)/sqrt(6))]
    (Hinds 1999, eq. 5.27, from memory; derivation: S = integral of tau dV /
    (1 + Re^(2/3)/6) with u = Re^(1/3)), valid for Re0 up to about 1500. The tests check it
    against numerical integration of the equation of motion with scipy. Following Hinds's
    split, the result steps down by about 9 % as Re0 passes 1 (the Klyachko drag there is
    17 % above Stokes's); the real drag lies between the two laws.

    """
    re0 = reynolds_number(d, initial_velocity, T, P)
    tau = relaxation_time(d, density, T, P, shape_factor)
    if re0 <= 1.0:
        return initial_velocity * tau
    u = re0 ** (1.0 / 3.0)
    root6 = math.sqrt(6.0)
    # tau mu / (rho_g d) * 18 reduces to rho_p d / rho_g for chi = 1 and Cc = 1; keeping tau
    # carries slip and shape factor consistently into the Stokes limit.
    scale = 18.0 * tau * gas.air_viscosity(T) / (gas.air_density(T, P) * d)
    return scale * (u - root6 * math.atan(u / root6))


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
    (Hinds 1999, eq. 3.30 with slip) by Brent's method in ln d_ae.

    Examples
    --------
    In the continuum limit d_ae = d sqrt(rho_p / (rho_0 chi)) (Hinds 1999, eq. 3.27); a
    10 um sphere of density 4000 kg/m^3 is about 20 um aerodynamic (slip adds a little):

    >>> round(aerodynamic_diameter(10e-6, 4000.0) * 1e6, 1)
    20.1

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return d
    target = d * d * slip_correction(d, T, P) * density / shape_factor

    def f(log_dae: float) -> float:
        dae = math.exp(log_dae)
        return math.log(dae * dae * slip_correction(dae, T, P) * WATER_DENSITY / target)

    return math.exp(
        brent_root(f, *_ratio_bracket(d, density / (WATER_DENSITY * shape_factor)), xtol=1e-13)
    )


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
    solved for d.

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return d_ae
    target = d_ae * d_ae * slip_correction(d_ae, T, P) * WATER_DENSITY

    def f(log_d: float) -> float:
        de = math.exp(log_d)
        return math.log(de * de * slip_correction(de, T, P) * density / shape_factor / target)

    ratio = WATER_DENSITY * shape_factor / density
    return math.exp(brent_root(f, *_ratio_bracket(d_ae, ratio), xtol=1e-13))


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
