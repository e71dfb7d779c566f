"""Equivalent diameters of non-spherical particles and agglomerates, and effective density.

Instruments report different equivalent diameters of the same particle: a differential
mobility analyser the electrical *mobility* diameter, an impactor or time-of-flight sizer the
*aerodynamic* diameter, an optical counter a light-scattering diameter (taken here as the
*volume-equivalent* diameter, an assumption stated to the user), a microscope a *geometric*
size (also taken as volume-equivalent). This module converts between them with the relations
collected by DeCarlo et al. (2004), all for particles in Stokes flow with slip:

- mobility diameter d_m:  d_m / Cc(d_m) = chi d_ve / Cc(d_ve)
  (same mobility as the particle; chi the dynamic shape factor in the transition regime);
- aerodynamic diameter d_a:  rho_0 d_a^2 Cc(d_a) = rho_p d_ve^2 Cc(d_ve) / chi
  (same settling velocity; Hinds 1999, eq. 3.30 with slip);
- mass-mobility effective density rho_eff = 6 m / (pi d_m^3) = rho_p (d_ve / d_m)^3,
  which links mobility and aerodynamic diameters directly:
  rho_0 d_a^2 Cc(d_a) = rho_eff d_m^2 Cc(d_m).

The last line follows from the first two and the definition of rho_eff (settling velocity =
m g B, with the mobility B of the sphere d_m); DeCarlo et al. (2004) list it among their
effective-density definitions. The equations are quoted from memory of that paper; its
equation numbers are not given here because they were not checked against the text.

:class:`ParticleDescription` turns the user's description of the particles (a material
density with a shape factor, or an effective density) into the sphere the models compute
with, and a measured diameter of any type into that sphere's diameter:

- ``material`` basis: spheres of the volume-equivalent diameter, density rho_p, shape
  factor chi (compact particles; the models use chi where they use it);
- ``effective`` basis: the *mobility-equivalent sphere* of diameter d_m and density rho_eff
  with shape factor 1. It has the particle's mass (by the definition of rho_eff), its
  mobility, hence its diffusion coefficient, and its relaxation time m B, hence its
  aerodynamic diameter and inertial behaviour, exactly, at every size; only its surface area
  (pi d_m^2) and the drag beyond Stokes flow are those of a sphere. The shape factor is used
  only to relate d_m to a volume-equivalent (or optical) diameter the user enters.

Slip is by :func:`driftdose.particle.slip_correction` (Kim et al. 2005), at the air's
temperature and pressure.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from . import particle
from .constants import P_DEFAULT, T_DEFAULT
from .particle.equivalent import equal_mobility_diameter

__all__ = [
    "DENSITY_BASES",
    "DIAMETER_TYPES",
    "ParticleDescription",
    "aerodynamic_from_mobility",
    "effective_density",
    "mobility_diameter",
    "mobility_from_aerodynamic",
    "volume_equivalent_from_mobility",
]

DIAMETER_TYPES = ("volume_equivalent", "optical", "mobility", "aerodynamic")
"""Diameter types a measured size can be: volume-equivalent (geometric), optical (taken as
volume-equivalent), electrical mobility, aerodynamic."""

DENSITY_BASES = ("material", "effective")
"""``material``: particle (material) density with a dynamic shape factor; ``effective``:
mass-mobility effective density (DeCarlo et al. 2004)."""


def mobility_diameter(
    d_ve: float, shape_factor: float = 1.0, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Electrical mobility diameter of a particle of volume-equivalent diameter ``d_ve``.

    Parameters
    ----------
    d_ve : float
        Volume-equivalent diameter. [m]
    shape_factor : float
        Dynamic shape factor chi (transition-regime definition), >= 1. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Mobility diameter d_m: the sphere with the particle's mobility. [m]

    Notes
    -----
    Solves d_m / Cc(d_m) = chi d_ve / Cc(d_ve) (DeCarlo et al. 2004, Aerosol Sci. Technol.
    38:1185-1205, mobility diameter and dynamic shape factor; from memory). In the continuum
    limit d_m = chi d_ve; in the free-molecular limit (Cc proportional to 1/d)
    d_m = sqrt(chi) d_ve. For spheres (chi = 1) d_m = d_ve.

    Examples
    --------
    >>> round(mobility_diameter(100e-9, 1.0) * 1e9, 6)
    100.0

    """
    # the same equation (equal mechanical mobility) is solved once, in particle
    return particle.mobility_diameter(d_ve, shape_factor, T, P)


def volume_equivalent_from_mobility(
    d_m: float, shape_factor: float = 1.0, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Volume-equivalent diameter of a particle of mobility diameter ``d_m``.

    Parameters
    ----------
    d_m : float
        Mobility diameter. [m]
    shape_factor : float
        Dynamic shape factor chi, >= 1. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Volume-equivalent diameter d_ve. [m]

    Notes
    -----
    The relation of :func:`mobility_diameter` (DeCarlo et al. 2004) solved for d_ve.

    """
    if shape_factor == 1.0:
        return d_m
    # the relation of mobility_diameter, solved once in particle
    return equal_mobility_diameter(d_m, 1.0 / shape_factor, T, P)


def effective_density(
    d_ve: float,
    density: float,
    shape_factor: float = 1.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Mass-mobility effective density of a particle.

    Parameters
    ----------
    d_ve : float
        Volume-equivalent diameter. [m]
    density : float
        Particle (material) density rho_p. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        rho_eff = 6 m / (pi d_m^3) = rho_p (d_ve / d_m)^3. [kg/m^3]

    Notes
    -----
    Definition of the effective density measured by mobility and mass classification
    (DeCarlo et al. 2004; McMurry et al. 2002, Aerosol Sci. Technol. 36:227; from memory).
    In the continuum limit rho_eff = rho_p / chi^3.

    """
    return density * (d_ve / mobility_diameter(d_ve, shape_factor, T, P)) ** 3


def aerodynamic_from_mobility(
    d_m: float, effective_density: float, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Aerodynamic diameter of a particle of mobility diameter ``d_m``.

    Parameters
    ----------
    d_m : float
        Mobility diameter. [m]
    effective_density : float
        Mass-mobility effective density. [kg/m^3]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Aerodynamic diameter d_a. [m]

    Notes
    -----
    rho_0 d_a^2 Cc(d_a) = rho_eff d_m^2 Cc(d_m), rho_0 = 1000 kg/m^3 (DeCarlo et al. 2004;
    from memory): the settling velocity m g B written once with the mobility-equivalent
    sphere and once with the unit-density sphere. It is the aerodynamic diameter of a sphere
    of diameter d_m and density rho_eff, so it is computed by
    :func:`driftdose.particle.aerodynamic_diameter`.

    """
    return particle.aerodynamic_diameter(d_m, effective_density, 1.0, T, P)


def mobility_from_aerodynamic(
    d_a: float, effective_density: float, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Mobility diameter of a particle of aerodynamic diameter ``d_a``.

    Parameters
    ----------
    d_a : float
        Aerodynamic diameter. [m]
    effective_density : float
        Mass-mobility effective density. [kg/m^3]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Mobility diameter d_m. [m]

    Notes
    -----
    The relation of :func:`aerodynamic_from_mobility` solved for d_m.

    """
    return particle.volume_equivalent_diameter(d_a, effective_density, 1.0, T, P)


def _same(d: float) -> float:
    """The diameter itself [m]: the measured type is the model sphere's."""
    return d


@dataclass(frozen=True)
class ParticleDescription:
    """How the user describes the particles, and the sphere the models compute with.

    Attributes
    ----------
    density : float
        Particle (material) density for the ``material`` basis, mass-mobility effective
        density for the ``effective`` basis. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    basis : str
        ``material`` or ``effective`` (:data:`DENSITY_BASES`).

    """

    density: float
    shape_factor: float = 1.0
    basis: str = "material"

    def __post_init__(self) -> None:
        """Reject a basis or values no particle can have."""
        if self.basis not in DENSITY_BASES:
            raise ValueError(f"unknown density basis {self.basis!r}; valid: {DENSITY_BASES}")
        if not (self.density > 0.0 and math.isfinite(self.density)):
            raise ValueError("density must be positive")
        if not (self.shape_factor >= 1.0 and math.isfinite(self.shape_factor)):
            raise ValueError("shape_factor must be at least 1")

    @property
    def coordinate(self) -> str:
        """Diameter the models' size axis holds: ``volume_equivalent`` or ``mobility``."""
        return "volume_equivalent" if self.basis == "material" else "mobility"

    @property
    def model_density(self) -> float:
        """Density of the sphere the models compute with. [kg/m^3]"""
        return self.density

    @property
    def model_shape_factor(self) -> float:
        """Shape factor of the sphere the models compute with. [-]"""
        return self.shape_factor if self.basis == "material" else 1.0

    def to_model(
        self, d: float, diameter_type: str, T: float = T_DEFAULT, P: float = P_DEFAULT
    ) -> float:
        """Diameter of the model sphere for a measured diameter ``d`` [m] of ``diameter_type``.

        Optical and geometric sizes are taken as volume-equivalent. Each conversion is
        monotone in size, so a median of a distribution converts to the median of the
        converted distribution exactly.
        """
        return self._conversions(diameter_type, T, P)[0](d)

    def from_model(
        self, d: float, diameter_type: str, T: float = T_DEFAULT, P: float = P_DEFAULT
    ) -> float:
        """Diameter of ``diameter_type`` [m] of the particle whose model diameter is ``d``."""
        return self._conversions(diameter_type, T, P)[1](d)

    def _conversions(
        self, diameter_type: str, T: float, P: float
    ) -> tuple[Callable[[float], float], Callable[[float], float]]:
        """(measured to model, model to measured) diameter [m] for ``diameter_type``.

        One table for both directions, so that each pair stays a pair of inverses.
        """
        if diameter_type not in DIAMETER_TYPES:
            raise ValueError(f"unknown diameter type {diameter_type!r}; valid: {DIAMETER_TYPES}")
        rho, chi = self.density, self.shape_factor
        if diameter_type == "aerodynamic":
            if self.basis == "material":
                return (
                    lambda d: particle.volume_equivalent_diameter(d, rho, chi, T, P),
                    lambda d: particle.aerodynamic_diameter(d, rho, chi, T, P),
                )
            return (
                lambda d: mobility_from_aerodynamic(d, rho, T, P),
                lambda d: aerodynamic_from_mobility(d, rho, T, P),
            )
        measured = "mobility" if diameter_type == "mobility" else "volume_equivalent"
        if measured == self.coordinate:
            return _same, _same

        def to_mobility(d: float) -> float:
            return mobility_diameter(d, chi, T, P)

        def to_volume_equivalent(d: float) -> float:
            return volume_equivalent_from_mobility(d, chi, T, P)

        if self.basis == "material":
            return to_volume_equivalent, to_mobility
        return to_mobility, to_volume_equivalent

    def implied_material_density(
        self, d: float, T: float = T_DEFAULT, P: float = P_DEFAULT
    ) -> float:
        """Particle density rho_p that the description implies at model diameter ``d``.

        For the ``effective`` basis rho_p = rho_eff (d_m / d_ve)^3 (the definition of
        rho_eff inverted); a value above any material's density shows that the effective
        density and shape factor do not fit together. [kg/m^3]
        """
        if self.basis == "material":
            return self.density
        d_ve = volume_equivalent_from_mobility(d, self.shape_factor, T, P)
        return self.density * (d / d_ve) ** 3
