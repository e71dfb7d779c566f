"""Input fields of the particle and the air that several calculations share, declared once.

A calculation that needs its own help text uses ``dataclasses.replace(FIELD, help=...)``.
"""

from __future__ import annotations

from .declare import bounded, ratio
from .fields import Field

__all__ = [
    "DENSITY_BASIS",
    "DIAMETER_TYPE_CHOICES",
    "PARTICLE_DENSITY",
    "PRESSURE",
    "SHAPE_FACTOR",
    "TEMPERATURE",
]

PARTICLE_DENSITY = bounded(
    "particle_density",
    "Particle density",
    "density",
    (1.0, "g/cm3"),
    ("g/cm3", "kg/m3"),
    100.0,
    25000.0,
    help="Material density of the particles (1 g/cm³ for unit-density spheres).",
)

DENSITY_BASIS = Field(
    "density_basis",
    "Density given as",
    "choice",
    "material",
    choices=(
        ("material", "Particle (material) density: compact particles"),
        ("effective", "Effective density (mass ÷ volume of the mobility sphere): agglomerates"),
    ),
    help="Agglomerates (fume, soot, nanopowders): give the effective density measured with "
    "mobility sizing (DeCarlo et al. 2004); the models then use the sphere with the "
    "particle's mobility and mass.",
)

DIAMETER_TYPE_CHOICES: tuple[tuple[str, str], ...] = (
    ("volume_equivalent", "volume-equivalent (geometric, e.g. microscopy)"),
    ("optical", "optical, light scattering (taken as volume-equivalent)"),
    ("mobility", "electrical mobility (differential mobility sizing)"),
    ("aerodynamic", "aerodynamic (impactor, time-of-flight sizing)"),
)
"""Which equivalent diameter a measured size is (keys of ``diameters.DIAMETER_TYPES``)."""

SHAPE_FACTOR = ratio(
    "shape_factor",
    "Dynamic shape factor",
    1.0,
    1.0,
    5.0,
    help="1 for spheres; about 1.1 to 2 for irregular dust.",
)

TEMPERATURE = bounded(
    "temperature", "Air temperature", "temperature", (20.0, "degC"), ("degC", "K"), 223.15, 773.15
)

PRESSURE = bounded(
    "pressure",
    "Air pressure",
    "pressure",
    (101.325, "kPa"),
    ("kPa", "atm", "hPa", "Pa"),
    10e3,
    200e3,
)
