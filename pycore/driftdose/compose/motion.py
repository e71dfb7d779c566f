"""Composition of the motion calculation: how one particle moves in air by diffusion and settling.

:func:`compose_motion` takes one particle (diameter of a given type, density, shape factor),
the air's temperature and pressure, a time, a reference distance and an initial velocity, all
in SI units, and returns a :class:`MotionResult`: slip, mobility, diffusion, settling,
relaxation time, stopping distance, the rms Brownian displacement and the settling distance in
that time, the crossover size, the times to cover the reference distance, the curves of both
displacements from 1 nm to 100 um, the warnings and the bibliography keys. Every number comes
from :mod:`driftdose.particle` and :mod:`driftdose.gas`; the rules of the calculation (which
warnings, which diameter the curves use) live here. It never imports :mod:`driftdose.api`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from .. import gas, particle
from .._numerics import logspace

__all__ = [
    "CURVE_POINTS",
    "CURVE_RANGE",
    "D_MIN",
    "MotionResult",
    "compose_motion",
]

CURVE_POINTS = 241
"""Sizes on the displacement curves, evenly spaced in ln d. [-]"""
CURVE_RANGE = (1e-9, 100e-6)
"""Smallest and largest size of the displacement curves. [m]"""
D_MIN = 0.5e-9
"""Smallest volume-equivalent diameter computed. [m]"""

SOURCES = (
    "sutherland_ussa1976",
    "willeke1976",
    "kim2005",
    "einstein1905",
    "hinds1999",
    "clift_gauvin1970",
)
"""Bibliography keys of the calculation."""


@dataclass(frozen=True)
class MotionResult:
    """How one particle moves in air.

    Attributes
    ----------
    diameter : float
        Volume-equivalent diameter d. [m]
    aerodynamic_diameter : float
        Aerodynamic diameter. [m]
    mean_free_path : float
        Mean free path of air. [m]
    air_viscosity : float
        Dynamic viscosity of air. [Pa s]
    knudsen_number, slip_correction : float
        Kn = 2 lambda / d and Cc. [-]
    mobility : float
        Mechanical mobility. [s/kg]
    diffusion_coefficient : float
        [m^2/s]
    settling_velocity : float
        Terminal settling velocity. [m/s]
    reynolds_number : float
        Particle Reynolds number at the settling velocity. [-]
    settling_model : str
        The drag law that applied, in words.
    relaxation_time : float
        [s]
    stopping_distance : float
        Distance to stop from the initial velocity. [m]
    initial_reynolds_number : float
        Particle Reynolds number at the initial velocity. [-]
    stopping_model : str
        How the stopping distance was found, in words.
    rms_displacement : float
        One-dimensional rms Brownian displacement sqrt(2 D t). [m]
    settling_distance : float
        Settling velocity times the time. [m]
    displacement_ratio : float
        Brownian over settling distance. [-]
    crossover_diameter : float or None
        Volume-equivalent diameter where both distances are equal, None if none. [m]
    brownian_time, settling_time : float
        Time each mechanism needs to cover the reference distance. [s]
    curve_diameters : list of float
        Sizes of the curves, of the type the particle was given in. [m]
    brownian, settling : list of float
        Both distances at those sizes in the chosen time. [m]
    crossover_shown : float or None
        The crossover size, of the type the particle was given in. [m]
    crossover_distance : float or None
        The distance both cover at the crossover. [m]
    warnings : list of str
    sources : tuple of str

    """

    diameter: float
    aerodynamic_diameter: float
    mean_free_path: float
    air_viscosity: float
    knudsen_number: float
    slip_correction: float
    mobility: float
    diffusion_coefficient: float
    settling_velocity: float
    reynolds_number: float
    settling_model: str
    relaxation_time: float
    stopping_distance: float
    initial_reynolds_number: float
    stopping_model: str
    rms_displacement: float
    settling_distance: float
    displacement_ratio: float
    crossover_diameter: float | None
    brownian_time: float
    settling_time: float
    curve_diameters: list[float]
    brownian: list[float]
    settling: list[float]
    crossover_shown: float | None
    crossover_distance: float | None
    warnings: list[str]
    sources: tuple[str, ...]


def compose_motion(
    diameter: float,
    aerodynamic: bool,
    density: float,
    shape_factor: float,
    T: float,
    P: float,
    t: float,
    reference_distance: float,
    initial_velocity: float,
) -> MotionResult:
    """Motion of one particle in air: diffusion against settling, and its stopping distance.

    Parameters
    ----------
    diameter : float
        Particle diameter, aerodynamic if ``aerodynamic`` else volume-equivalent. [m]
    aerodynamic : bool
        Whether ``diameter`` is aerodynamic.
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]
    T : float
        Air temperature. [K]
    P : float
        Air pressure. [Pa]
    t : float
        Time over which the displacements are compared. [s]
    reference_distance : float
        Distance to cover, for the times of each mechanism. [m]
    initial_velocity : float
        Speed at which the particle is projected, for its stopping distance. [m/s]

    Returns
    -------
    MotionResult
        Every quantity in SI units, the curves and the warnings.

    Raises
    ------
    ValueError
        When an aerodynamic diameter corresponds to a volume-equivalent one below
        :data:`D_MIN`.

    Notes
    -----
    Stokes-Einstein diffusion with slip (Einstein 1905; Hinds 1999, eq. 7.7), settling with
    the Clift & Gauvin (1970) drag law, the aerodynamic diameter by Hinds (1999), eq. 3.30
    with slip; see :mod:`driftdose.particle` for each.

    """
    if aerodynamic:
        d_ae = diameter
        d = particle.volume_equivalent_diameter(d_ae, density, shape_factor, T, P)
        if d < D_MIN:
            raise ValueError(
                "This aerodynamic diameter corresponds to a volume-equivalent diameter below "
                "0.5 nm; enter a larger size."
            )
    else:
        d = diameter
        d_ae = particle.aerodynamic_diameter(d, density, shape_factor, T, P)
    lam = gas.mean_free_path(T, P)
    cc = particle.slip_correction(d, T, P)
    v_ts = particle.settling_velocity(d, density, T, P, shape_factor)
    tau = particle.relaxation_time(d, density, T, P, shape_factor)
    re = particle.reynolds_number(d, v_ts, T, P)
    x_b = particle.rms_displacement(d, t, T, P, shape_factor)
    x_s = v_ts * t
    re0 = particle.reynolds_number(d, initial_velocity, T, P)
    curves = _curves(aerodynamic, density, shape_factor, T, P, t)
    d_cross = curves.crossover

    return MotionResult(
        diameter=d,
        aerodynamic_diameter=d_ae,
        mean_free_path=lam,
        air_viscosity=gas.air_viscosity(T),
        knudsen_number=2 * lam / d,
        slip_correction=cc,
        mobility=particle.mobility(d, T, P, shape_factor),
        diffusion_coefficient=particle.diffusion_coefficient(d, T, P, shape_factor),
        settling_velocity=v_ts,
        reynolds_number=re,
        settling_model=particle.settling_regime(re),
        relaxation_time=tau,
        stopping_distance=particle.stopping_distance(
            d, initial_velocity, density, T, P, shape_factor
        ),
        initial_reynolds_number=re0,
        stopping_model=particle.stopping_regime(re0),
        rms_displacement=x_b,
        settling_distance=x_s,
        displacement_ratio=x_b / x_s,
        crossover_diameter=d_cross,
        brownian_time=particle.brownian_time(d, reference_distance, T, P, shape_factor),
        settling_time=particle.settling_time(d, reference_distance, density, T, P, shape_factor),
        curve_diameters=list(curves.diameters),
        brownian=list(curves.brownian),
        settling=list(curves.settling),
        crossover_shown=curves.crossover_shown,
        crossover_distance=curves.crossover_distance,
        warnings=_warnings(d, re, tau, t, d_cross, cc)
        + particle.settling_warnings(d, density, T, P, shape_factor)
        + _stopping_warnings(re0),
        sources=SOURCES,
    )


@dataclass(frozen=True)
class _Curves:
    """What does not depend on the particle's own size: the curves and the crossover."""

    diameters: tuple[float, ...]  # curve sizes, of the type the particle is given in [m]
    brownian: tuple[float, ...]  # rms displacement at each size [m]
    settling: tuple[float, ...]  # settling distance at each size [m]
    crossover: float | None  # volume-equivalent crossover diameter [m]
    crossover_shown: float | None  # the same, of the type the particle is given in [m]
    crossover_distance: float | None  # distance both cover at the crossover [m]


@lru_cache(maxsize=8)
def _curves(
    aerodynamic: bool, density: float, shape_factor: float, T: float, P: float, t: float
) -> _Curves:
    """Displacement curves and crossover for one particle material, air and time (kept).

    An edit of the diameter, the reference distance or the initial velocity reuses them; the
    properties at the curve sizes are those of :func:`driftdose.particle.particle_grid`.
    """
    xs = logspace(*CURVE_RANGE, CURVE_POINTS)
    ds = (
        particle.volume_equivalent_diameters(xs, density, shape_factor, T, P) if aerodynamic else xs
    )
    grid = particle.particle_grid(ds, density, T, P, shape_factor)
    brown = tuple(math.sqrt(2.0 * diff * t) for diff in grid.diffusion)
    settle = tuple(v * t for v in grid.settling)
    d_cross = particle.crossover_diameter(t, density, T, P, shape_factor)
    cross_shown = cross_distance = None
    if d_cross is not None:
        cross_shown = (
            particle.aerodynamic_diameter(d_cross, density, shape_factor, T, P)
            if aerodynamic
            else d_cross
        )
        cross_distance = particle.rms_displacement(d_cross, t, T, P, shape_factor)
    return _Curves(tuple(xs), brown, settle, d_cross, cross_shown, cross_distance)


def _stopping_warnings(re0: float) -> list[str]:
    if re0 <= particle.CLIFT_GAUVIN_RE_MAX:
        return []
    return [
        f"Initial Reynolds number {re0:.3g} exceeds 3e5, the upper limit of the Clift & "
        "Gauvin (1970) drag law; the stopping distance is extrapolated."
    ]


def _warnings(
    d: float, re: float, tau: float, t: float, d_cross: float | None, cc: float
) -> list[str]:
    out = []
    if d < 1.6e-9:
        out.append(
            "Below about 1.6 nm (Knudsen number above 83) the slip correction is "
            "extrapolated beyond the range of the Kim et al. (2005) fit, and molecular "
            "clusters may not behave as rigid spheres."
        )
    if particle.STOKES_RE_MAX < re <= particle.CLIFT_GAUVIN_RE_MAX:
        out.append(
            f"Particle Reynolds number {re:.2g} is beyond the Stokes regime (0.1); the "
            "settling velocity includes the Clift & Gauvin (1970) drag correction."
        )
    if t < 100.0 * tau:
        out.append(
            "The chosen time is less than 100 relaxation times: both distances assume "
            "steady motion (t ≫ τ) and overstate the movement in so short a time."
        )
    if d_cross is None:
        out.append("The two distances do not cross between 0.1 nm and 1 mm for this time.")
    if not math.isfinite(cc):
        out.append("Slip correction is not finite.")
    if d > 100e-6:
        out.append(
            "Above 100 µm particles hardly stay airborne; ISO 7708 conventions end at "
            "100 µm aerodynamic."
        )
    return out
