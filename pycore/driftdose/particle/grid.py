"""A particle's properties at every size of a grid, computed once and shared by its users.

The curves of the motion and sampling calculations need, at each of a few hundred sizes, the
slip correction, the mobility, the diffusion coefficient, the relaxation time, the settling
velocity and the aerodynamic diameter; each stage or curve asking for them one size at a time
repeated the same work. :func:`particle_grid` computes them once per (sizes, density, shape
factor, T, P) with the air's properties taken once, by the same formulas and in the same order
as the one-size functions of this package, and keeps its last results (the values are
immutable tuples), so an edit that changes neither the particle nor the air reuses them.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import cached_property, lru_cache

from .. import gas
from ..constants import BOLTZMANN, STANDARD_GRAVITY
from .drag import _DRAG_BALANCES
from .equivalent import aerodynamic_diameters
from .settling import _drag_velocity
from .slip import SLIP_MODELS

__all__ = ["ParticleGrid", "particle_grid"]


@dataclass(frozen=True)
class ParticleGrid:
    """Properties of spheres of one density at each size of a grid (Clift & Gauvin drag).

    Attributes
    ----------
    diameters : tuple of float
        Volume-equivalent diameters. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T, P : float
        Air temperature [K] and pressure [Pa].
    slip : tuple of float
        Slip correction Cc (Kim et al. 2005). [-]
    mobility : tuple of float
        Mechanical mobility B = Cc / (3 pi mu d chi). [s/kg]
    diffusion : tuple of float
        Diffusion coefficient k T B. [m^2/s]
    relaxation : tuple of float
        Relaxation time m B. [s]
    settling : tuple of float
        Terminal settling velocity, Clift & Gauvin (1970) drag. [m/s]

    """

    diameters: tuple[float, ...]
    density: float
    shape_factor: float
    T: float
    P: float
    slip: tuple[float, ...]
    mobility: tuple[float, ...]
    diffusion: tuple[float, ...]
    relaxation: tuple[float, ...]
    settling: tuple[float, ...]

    @cached_property
    def aerodynamic(self) -> tuple[float, ...]:
        """Aerodynamic diameters (:func:`driftdose.particle.aerodynamic_diameters`). [m]"""
        return tuple(
            aerodynamic_diameters(self.diameters, self.density, self.shape_factor, self.T, self.P)
        )


def particle_grid(
    diameters: Sequence[float],
    density: float,
    T: float,
    P: float,
    shape_factor: float = 1.0,
) -> ParticleGrid:
    """Slip, mobility, diffusion, relaxation time and settling velocity at every size.

    Parameters
    ----------
    diameters : sequence of float
        Volume-equivalent diameters. [m]
    density : float
        Particle density. [kg/m^3]
    T : float
        Air temperature. [K]
    P : float
        Air pressure. [Pa]
    shape_factor : float
        Dynamic shape factor chi. [-]

    Returns
    -------
    ParticleGrid
        The same values as :func:`slip_correction`, :func:`mobility`,
        :func:`diffusion_coefficient`, :func:`relaxation_time` and :func:`settling_velocity`
        size by size (Kim et al. 2005, eq. 9; Hinds 1999, eqs. 3.16, 3.25, 5.3 and 7.7;
        Clift & Gauvin 1970 drag); the last 16 results are kept.

    """
    return _grid(tuple(diameters), float(density), float(T), float(P), float(shape_factor))


@lru_cache(maxsize=16)
def _grid(ds: tuple[float, ...], density: float, T: float, P: float, chi: float) -> ParticleGrid:
    alpha, beta, gamma = SLIP_MODELS["kim2005"]
    two_lambda = 2.0 * gas.mean_free_path(T, P)
    mu = gas.air_viscosity(T)
    rho_g = gas.air_density(T, P)
    kt = BOLTZMANN * T
    balance = _DRAG_BALANCES["clift_gauvin1970"]
    slip, mob, diff, relax, settle = [], [], [], [], []
    for d in ds:
        kn = two_lambda / d
        cc = 1.0 + kn * (alpha + beta * math.exp(-gamma / kn))
        b = cc / (3.0 * math.pi * mu * d * chi)
        tau = density * math.pi * d**3 / 6.0 * b
        slip.append(cc)
        mob.append(b)
        diff.append(kt * b)
        relax.append(tau)
        settle.append(_drag_velocity(tau * STANDARD_GRAVITY, rho_g * d / mu, balance))
    return ParticleGrid(
        ds, density, chi, T, P, tuple(slip), tuple(mob), tuple(diff), tuple(relax), tuple(settle)
    )
