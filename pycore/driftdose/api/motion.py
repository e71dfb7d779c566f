"""Calculation ``motion``: how a particle of one size moves in air by diffusion and settling.

Answers: slip, mobility, diffusion coefficient, settling velocity, relaxation time, stopping
distance, aerodynamic diameter; the one-dimensional rms Brownian displacement and the settling
distance in a chosen time, their ratio, the crossover size, and the time each mechanism needs
to cover a reference distance; curves of both displacements over 1 nm to 100 um (``x_unit``
and ``y_unit`` are unit codes). ``run`` only translates: it calls
:func:`driftdose.compose.motion.compose_motion` and shapes the reply.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from ..compose.motion import CURVE_POINTS, CURVE_RANGE, MotionResult, compose_motion
from ..sources import cite
from .declare import bounded, positive
from .encoding import kept_array
from .fields import Field, FieldError
from .particle_air_fields import PARTICLE_DENSITY, PRESSURE, SHAPE_FACTOR, TEMPERATURE
from .reply import quantity, shared_axis, text_result

TITLE = "Particle motion: diffusion versus settling"

__all__ = ["CURVE_POINTS", "CURVE_RANGE", "FIELDS", "TITLE", "run"]

_TIME = "Time over which displacements are compared."

FIELDS: tuple[Field, ...] = (
    bounded(
        "particle_diameter",
        "Particle diameter",
        "length",
        (100.0, "nm"),
        ("nm", "um"),
        0.5e-9,
        1e-3,
        help="Diameter of the particle, of the type chosen below.",
    ),
    Field(
        "diameter_type",
        "Diameter type",
        "choice",
        "volume_equivalent",
        choices=(
            ("volume_equivalent", "Volume-equivalent (geometric)"),
            ("aerodynamic", "Aerodynamic"),
        ),
        help="Aerodynamic: the unit-density sphere that settles at the same speed.",
    ),
    replace(
        PARTICLE_DENSITY,
        help="Material density of the particle (1 g/cm³ for unit-density spheres).",
    ),
    SHAPE_FACTOR,
    TEMPERATURE,
    PRESSURE,
    bounded("time", "Time", "time", (1.0, "s"), ("s", "min", "h"), 1e-3, 86400.0, help=_TIME),
    bounded(
        "reference_distance",
        "Reference distance",
        "length",
        (0.2, "mm"),
        ("um", "mm", "m"),
        1e-7,
        10.0,
        help="A length to compare with, e.g. about 0.2 mm, a typical alveolus diameter.",
    ),
    positive(
        "initial_velocity",
        "Initial velocity",
        "velocity",
        (1.0, "m/s"),
        ("m/s", "cm/s"),
        100.0,
        help="Speed at which the particle is projected, for its stopping distance.",
    ),
)


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Parse the validated SI inputs, compose the particle's motion and shape the reply."""
    aerodynamic = v["diameter_type"] == "aerodynamic"
    try:
        r = compose_motion(
            v["particle_diameter"],
            aerodynamic,
            v["particle_density"],
            v["shape_factor"],
            v["temperature"],
            v["pressure"],
            v["time"],
            v["reference_distance"],
            v["initial_velocity"],
        )
    except ValueError as exc:
        raise FieldError("particle_diameter", str(exc)) from None
    results = {
        "volume_equivalent_diameter": quantity(
            "Volume-equivalent diameter", r.diameter, "length", symbol="d"
        ),
        "aerodynamic_diameter": quantity(
            "Aerodynamic diameter", r.aerodynamic_diameter, "length", symbol="dₐₑ"
        ),
        "mean_free_path": quantity(
            "Mean free path of air", r.mean_free_path, "length", "nm", symbol="λ"
        ),
        "air_viscosity": quantity("Air viscosity", r.air_viscosity, None, "Pa.s", symbol="μ"),
        "knudsen_number": quantity("Knudsen number", r.knudsen_number, None, "1", symbol="Kn"),
        "slip_correction": quantity("Slip correction", r.slip_correction, None, "1", symbol="Cc"),
        "mobility": quantity("Mechanical mobility", r.mobility, None, "s/kg", symbol="B"),
        "diffusion_coefficient": quantity(
            "Diffusion coefficient", r.diffusion_coefficient, None, "m2/s", symbol="D"
        ),
        "settling_velocity": quantity(
            "Settling velocity", r.settling_velocity, "velocity", symbol="vₜₛ"
        ),
        "reynolds_number": quantity(
            "Particle Reynolds number at settling", r.reynolds_number, None, "1", symbol="Re"
        ),
        "settling_model": text_result("Settling velocity from", r.settling_model),
        "relaxation_time": quantity("Relaxation time", r.relaxation_time, None, "s", symbol="τ"),
        "stopping_distance": quantity(
            "Stopping distance", r.stopping_distance, "length", symbol="S"
        ),
        "initial_reynolds_number": quantity(
            "Particle Reynolds number at the initial velocity",
            r.initial_reynolds_number,
            None,
            "1",
            symbol="Re₀",
        ),
        "stopping_model": text_result("Stopping distance from", r.stopping_model),
        "rms_displacement": quantity(
            "Brownian rms displacement (one direction)",
            r.rms_displacement,
            "length",
            symbol="√(2Dt)",
        ),
        "settling_distance": quantity(
            "Settling distance", r.settling_distance, "length", symbol="vₜₛ·t"
        ),
        "displacement_ratio": quantity(
            "Brownian ÷ settling distance", r.displacement_ratio, None, "1"
        ),
        "dominant": text_result(
            "Dominant motion in this time",
            "Brownian diffusion" if r.displacement_ratio > 1 else "Gravity settling",
        ),
        "crossover_diameter": (
            quantity(
                "Crossover diameter (equal distances)",
                r.crossover_diameter,
                "length",
                note="volume-equivalent",
            )
            if r.crossover_diameter is not None
            else text_result("Crossover diameter", "none in range")
        ),
        "brownian_time": quantity(
            "Time to diffuse the reference distance", r.brownian_time, "time"
        ),
        "settling_time": quantity("Time to settle the reference distance", r.settling_time, "time"),
    }
    return {
        "results": results,
        "curves": _curves(r, v, aerodynamic),
        "warnings": r.warnings,
        "sources": cite(*r.sources),
    }


def _curves(r: MotionResult, v: dict[str, Any], aerodynamic: bool) -> dict[str, Any]:
    """The displacement curves, sizes in um (unit code ``um``), distances in m."""
    axes: dict[str, Any] = {}
    # the curves, kept per particle and air by the core, are written as JSON once: an edit of
    # the diameter, the distance or the speed leaves them as they were (api.encoding)
    x_all = kept_array(r.curve_diameters, 1e6)
    x_um = shared_axis(axes, "diameter", x_all)
    shown = r.aerodynamic_diameter if aerodynamic else r.diameter
    curves: dict[str, Any] = {
        **axes,
        "x_label": "Aerodynamic diameter" if aerodynamic else "Volume-equivalent diameter",
        "x_unit": "um",
        "y_label": "Distance in the chosen time",
        "y_unit": "m",
        "brownian": {
            "label": "Brownian rms displacement √(2Dt), one direction",
            "x": x_um,
            "y": kept_array(r.brownian),
        },
        "settling": {"label": "Settling distance vₜₛ·t", "x": x_um, "y": kept_array(r.settling)},
        "reference": {
            "label": "Reference distance",
            "x": [x_all[0], x_all[-1]],
            "y": [v["reference_distance"]] * 2,
        },
        "this_particle": {
            "label": "This particle",
            "x": [shown * 1e6] * 2,
            "y": [r.rms_displacement, r.settling_distance],
        },
    }
    if r.crossover_shown is not None:
        curves["crossover"] = {
            "label": "Crossover",
            "x": [r.crossover_shown * 1e6],
            "y": [r.crossover_distance],
        }
    return curves
