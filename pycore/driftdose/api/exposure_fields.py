"""The inputs of an exposure: aerosol, particles, breathing and duration, declared once.

The deposition calculation and the burden and uncertainty calculations, which take its
aerosol, breathing and exposure, share these fields and read them into the composers' inputs
(:func:`aerosol_of`, :func:`subject_of`) the same way.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from ..compose.aerosol import Aerosol, ModeSpec, aerosol_from_modes
from ..compose.deposition import breathing_subject
from ..deposition import Subject
from ..diameters import ParticleDescription
from ..distribution import GSD_MAX, MAX_MODES
from .declare import bounded, spread
from .demos import DEMOS
from .fields import Field, FieldError
from .particle_air_fields import (
    DENSITY_BASIS,
    DIAMETER_TYPE_CHOICES,
    PARTICLE_DENSITY,
    SHAPE_FACTOR,
)
from .spectrum_fields import (
    D_RANGE,
    NUMBER_MAX,
    NUMBER_MIN,
    import_spectrum,
    spectrum_aerosol,
    spectrum_fields,
)

__all__ = [
    "ACTIVITY",
    "CORE_BASIS",
    "EXPOSURE_FIELDS",
    "MEDIAN_NAMES",
    "MEDIAN_WORDS",
    "MODE_FIELDS",
    "MODE_GSD",
    "MODE_MEDIAN",
    "ROUTE",
    "aerosol_of",
    "particle_description",
    "subject_of",
]

CORE_BASIS = {"count": "number", "mass": "mass"}
"""A mode's basis as the page, links and saved inputs write it -> the core's word (the core
says ``number`` for counts everywhere: number, surface and mass weights and concentrations)."""
MEDIAN_WORDS = {"number": "count", "mass": "mass"}
"""The trade's words for a mode's median by the core's basis: count median, mass median."""

MASS_MAX = 1e-2
"""Largest accepted mass concentration of a mode, 10 g/m³ [kg/m³]."""
MASS_MIN = 1e-15
"""Smallest accepted mass concentration of a mode, 10⁻⁶ µg/m³ [kg/m³]."""
BENCHMARK_NUMBER_MIN = 1.0
"""Smallest benchmark number concentration [1/m³]: smaller ones make the ratio overflow."""
BENCHMARK_MASS_MIN = 1e-12
"""Smallest benchmark mass concentration, 1 ng/m³ [kg/m³]."""

MEDIAN_NAMES = {
    "count": {
        "volume_equivalent": "count median diameter, volume-equivalent (CMD)",
        "optical": "count median optical diameter (taken as volume-equivalent)",
        "mobility": "count median mobility diameter",
        "aerodynamic": "count median aerodynamic diameter (CMAD)",
    },
    "mass": {
        "volume_equivalent": "mass median diameter, geometric (MMD)",
        "optical": "mass median optical diameter (taken as volume-equivalent)",
        "mobility": "mass median mobility diameter",
        "aerodynamic": "mass median aerodynamic diameter (MMAD)",
    },
}
"""What a mode's median is, by basis and diameter type (shown beside the median field)."""

_CONCENTRATION_LABEL = "Concentration (number for count modes, mass for mass modes)"
_DIAMETER_TYPE = Field(
    "diameter_type",
    "The median is a diameter of type",
    "choice",
    "volume_equivalent",
    choices=DIAMETER_TYPE_CHOICES,
    help="Mass mode: aerodynamic gives the MMAD, volume-equivalent the geometric mass median. "
    "Left out: volume-equivalent for a count mode, aerodynamic for a mass mode.",
)
_CONCENTRATION_UNITS = {
    "number_concentration": ("1/cm3", "1/m3"),
    "mass_concentration": ("mg/m3", "ug/m3"),
}
"""Units offered for a number and for a mass concentration, the default's first."""


def _concentration(
    name: str, label: str, kind: str, minimum: float, maximum: float, **more: Any
) -> Field:
    """A number or mass concentration (``kind``) with no default value, in its own units."""
    units = _CONCENTRATION_UNITS[kind]
    return bounded(name, label, kind, (None, units[0]), units, minimum, maximum, **more)


_BY_COUNT = ("basis", ("count",))
_NUMBER_CONCENTRATION = _concentration(
    "concentration",
    _CONCENTRATION_LABEL,
    "number_concentration",
    NUMBER_MIN,
    NUMBER_MAX,
    applies=_BY_COUNT,
)
_MASS_CONCENTRATION = _concentration(
    "concentration",
    _CONCENTRATION_LABEL,
    "mass_concentration",
    MASS_MIN,
    MASS_MAX,
    applies=("basis", ("mass",)),
)

MODE_MEDIAN = bounded(
    "median",
    "Median diameter: count median (count mode) or mass median (mass mode)",
    "length",
    (None, "nm"),
    ("nm", "um"),
    *D_RANGE,
)
"""A lognormal mode's median diameter (the shift's modes reuse it with their own label)."""
MODE_GSD = spread(
    "gsd",
    "Geometric standard deviation",
    None,
    GSD_MAX,
    help="Above 1 (1 would mean all particles share one size; e.g. 1.05 for a nearly "
    f"uniform aerosol); above {GSD_MAX:g} is implausible for one mode: use several modes.",
)
"""A lognormal mode's geometric standard deviation."""

MODE_FIELDS: tuple[Field, ...] = (
    Field(
        "basis",
        "Mode given by",
        "choice",
        "count",
        choices=(
            ("count", "Count (CMD, number concentration)"),
            ("mass", "Mass (mass median, mass concentration)"),
        ),
    ),
    MODE_MEDIAN,
    replace(
        _DIAMETER_TYPE,
        variants=(
            replace(_DIAMETER_TYPE, applies=_BY_COUNT),
            replace(_DIAMETER_TYPE, default="aerodynamic", applies=("basis", ("mass",))),
        ),
    ),
    MODE_GSD,
    replace(
        _NUMBER_CONCENTRATION,
        units=_NUMBER_CONCENTRATION.units + _MASS_CONCENTRATION.units,
        minimum=None,
        maximum=None,
        applies=None,
        variants=(_NUMBER_CONCENTRATION, _MASS_CONCENTRATION),
    ),
)
"""What each lognormal mode holds; parsed as every other field is."""

DEPOSITION_MODEL = Field(
    "model",
    "Deposition model",
    "choice",
    "icrp66",
    choices=(
        ("icrp66", "ICRP 66 full regional model (ET1, ET2, BB, bb, AI)"),
        ("simplified", "Simplified fits to ICRP 66 (Hinds 1999)"),
    ),
)
"""The choice of deposition model, shared by every calculation that gives a dose."""

ACTIVITY = Field(
    "activity",
    "Activity level",
    "choice",
    "light_exercise",
    choices=(
        ("sleep", "Sleep"),
        ("sitting", "Sitting awake"),
        ("light_exercise", "Light exercise"),
        ("heavy_exercise", "Heavy exercise"),
    ),
    applies=("breathing", ("activity",)),
)
"""One activity level of the ICRP breathing rates (the shift's task periods reuse it)."""
ROUTE = Field(
    "route",
    "Breathing route",
    "choice",
    "mixed",
    choices=(
        ("mixed", "Normal nose breather (ICRP: mouth joins at heavy exercise)"),
        ("nose", "Nose only"),
        ("mouth", "Mouth only"),
        ("mouth_breather", "Habitual mouth breather (ICRP)"),
    ),
    applies=("breathing", ("reference_worker", "activity")),
)
"""The breathing route of the ICRP model."""

_CUSTOM = ("breathing", ("custom",))
_BENCHMARK_HELP = "A value you choose to compare with, with its source; none is built in."
_LONGEST = 24 * 3600.0
"""Longest exposure, a day [s]."""

EXPOSURE_FIELDS: tuple[Field, ...] = (
    Field(
        "size_source",
        "Size distribution from",
        "choice",
        "lognormal",
        choices=(("lognormal", "Lognormal modes"), ("csv", "Measured spectrum (CSV file)")),
        help="Describe the aerosol by up to four lognormal modes, or import a measured spectrum.",
        extra={"demos": [dict(d) for d in DEMOS]},
        formerly=("distribution_source",),
    ),
    Field(
        "modes",
        "Lognormal modes",
        "records",
        [
            {
                "basis": "count",
                "median": {"value": 50, "unit": "nm"},
                "diameter_type": "volume_equivalent",
                "gsd": 1.8,
                "concentration": {"value": 10000, "unit": "1/cm3"},
            }
        ],
        required=False,
        applies=("size_source", ("lognormal",)),
        help="Up to four modes, each by count (count median, GSD, number concentration) or "
        "by mass (mass median, GSD, mass concentration); say which diameter each median is.",
        item_fields=MODE_FIELDS,
        min_items=1,
        max_items=MAX_MODES,
        item_label="Mode",
        extra={"median_names": MEDIAN_NAMES},
    ),
    *spectrum_fields("size_source"),
    replace(
        PARTICLE_DENSITY,
        help="Material density, or the effective density if chosen below (applies to every "
        "mode or bin).",
    ),
    DENSITY_BASIS,
    replace(SHAPE_FACTOR, help="1 for spheres; ICRP's default worker aerosol uses 1.5."),
    DEPOSITION_MODEL,
    Field(
        "thermodynamic_convention",
        "Shape factor in diffusion",
        "choice",
        "icrp66",
        choices=(
            ("icrp66", "As ICRP 66 (volume-equivalent sphere)"),
            ("mobility", "Slows diffusion too (mobility-equivalent sphere)"),
        ),
        help=(
            "The shape factor always enters the aerodynamic diameter. ICRP 66 computes "
            "diffusion for a sphere of the volume-equivalent diameter, and its own tables "
            "follow from that; the second choice also slows diffusion by the shape factor "
            "(physically fuller, but it departs from the published model)."
        ),
    ),
    Field(
        "breathing",
        "Breathing",
        "choice",
        "reference_worker",
        choices=(
            ("reference_worker", "ICRP reference worker (2.5 h sitting, 5.5 h light exercise)"),
            ("activity", "One activity level"),
            ("custom", "Custom breathing parameters"),
        ),
    ),
    ACTIVITY,
    ROUTE,
    bounded(
        "tidal_volume",
        "Tidal volume (custom)",
        "volume",
        (1.25, "L"),
        ("L", "m3"),
        0.1e-3,
        4e-3,
        applies=_CUSTOM,
    ),
    bounded(
        "breathing_frequency",
        "Breathing frequency (custom), breaths per minute",
        "dimensionless",
        (20.0, "1"),
        ("1",),
        4.0,
        60.0,
        applies=_CUSTOM,
    ),
    bounded(
        "nasal_fraction",
        "Share of air through the nose (custom)",
        "dimensionless",
        (1.0, "1"),
        ("1",),
        0.0,
        1.0,
        applies=_CUSTOM,
    ),
    bounded(
        "exposure_duration", "Exposure duration", "time", (8.0, "h"), ("h", "min"), 1.0, _LONGEST
    ),
    _concentration(
        "benchmark_number",
        "Benchmark number concentration (optional)",
        "number_concentration",
        BENCHMARK_NUMBER_MIN,
        NUMBER_MAX,
        required=False,
        help=_BENCHMARK_HELP,
    ),
    _concentration(
        "benchmark_mass",
        "Benchmark mass concentration (optional)",
        "mass_concentration",
        BENCHMARK_MASS_MIN,
        MASS_MAX,
        required=False,
        help=_BENCHMARK_HELP,
    ),
)


def particle_description(
    v: dict[str, Any], f_density: float = 1.0, f_shape: float = 1.0
) -> ParticleDescription:
    """The particle of the validated inputs, its density and shape factor scaled.

    Parameters
    ----------
    v : dict
        Inputs validated by :data:`EXPOSURE_FIELDS` (SI).
    f_density : float
        Factor on the particle density [-] (the ranges vary it).
    f_shape : float
        Factor on the dynamic shape factor [-].

    Returns
    -------
    ParticleDescription
        Density [kg/m³], shape factor and the density's basis.
    """
    return ParticleDescription(
        v["particle_density"] * f_density,
        v["shape_factor"] * f_shape,
        v.get("density_basis") or "material",
    )


def aerosol_of(v: dict[str, Any]) -> tuple[Aerosol, dict[str, Any] | None]:
    """The aerosol of the validated inputs, and the CSV import report for a spectrum.

    Parameters
    ----------
    v : dict
        Inputs validated by :data:`EXPOSURE_FIELDS` (SI).

    Returns
    -------
    tuple
        The :class:`~driftdose.compose.aerosol.Aerosol` and the import report (None for
        lognormal modes).
    """
    desc = particle_description(v)
    if v["size_source"] == "lognormal":
        modes = [ModeSpec(**{**m, "basis": CORE_BASIS[m["basis"]]}) for m in v["modes"]]
        return aerosol_from_modes(modes, desc), None
    imported, report = import_spectrum(v)
    diameter_type = v.get("spectrum_diameter_type") or "volume_equivalent"
    return spectrum_aerosol(imported, diameter_type, desc), report


def subject_of(v: dict[str, Any]) -> Subject:
    """The breathing of the validated inputs.

    Parameters
    ----------
    v : dict
        Inputs validated by :data:`EXPOSURE_FIELDS` (SI).

    Returns
    -------
    Subject
        The breathing the deposition model averages over.
    """
    if v["breathing"] != "custom":
        return breathing_subject(v["breathing"], v["route"], v["activity"] or "light_exercise")
    try:
        return breathing_subject(
            "custom",
            tidal_volume=v["tidal_volume"],
            frequency=v["breathing_frequency"] / 60.0,
            nasal_fraction=v["nasal_fraction"],
        )
    except ValueError as exc:
        raise FieldError("tidal_volume", f"Custom breathing: {exc}.") from None
