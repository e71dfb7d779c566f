"""Calculation ``motion``: how a particle of one size moves in air by diffusion and settling.

Answers: slip, mobility, diffusion coefficient, settling velocity, relaxation time, stopping
distance, aerodynamic diameter; the one-dimensional rms Brownian displacement and the settling
distance in a chosen time, their ratio, the crossover size, and the time each mechanism needs
to cover a reference distance; curves of both displacements over 1 nm to 100 um.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Any

from .. import gas, particle
from .._numerics import logspace
from ..sources import cite
from .fields import Field, FieldError
from .particle_air_fields import PARTICLE_DENSITY, PRESSURE, SHAPE_FACTOR, TEMPERATURE
from .reply import quantity, text_result

TITLE = "Particle motion: diffusion versus settling"

CURVE_POINTS = 241
CURVE_RANGE = (1e-9, 100e-6)  # [m]

FIELDS: tuple[Field, ...] = (
    Field(
        "particle_diameter",
        "Particle diameter",
        "length",
        (100.0, "nm"),
        ("nm", "um"),
        minimum=0.5e-9,
        maximum=1e-3,
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
    Field(
        "time",
        "Time",
        "time",
        (1.0, "s"),
        ("s", "min", "h"),
        minimum=1e-3,
        maximum=86400.0,
        help="Time over which displacements are compared.",
    ),
    Field(
        "reference_distance",
        "Reference distance",
        "length",
        (0.2, "mm"),
        ("um", "mm", "m"),
        minimum=1e-7,
        maximum=10.0,
        help="A length to compare with, e.g. about 0.2 mm, a typical alveolus diameter.",
    ),
    Field(
        "initial_velocity",
        "Initial velocity",
        "velocity",
        (1.0, "m/s"),
        ("m/s", "cm/s"),
        minimum=0.0,
        maximum=100.0,
        exclusive_min=True,
        help="Speed at which the particle is projected, for its stopping distance.",
    ),
)


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the motion reply from validated SI inputs."""
    T, P, rho, chi, t = (
        v["temperature"],
        v["pressure"],
        v["particle_density"],
        v["shape_factor"],
        v["time"],
    )
    L = v["reference_distance"]
    aerodynamic = v["diameter_type"] == "aerodynamic"
    if aerodynamic:
        d_ae = v["particle_diameter"]
        d = particle.volume_equivalent_diameter(d_ae, rho, chi, T, P)
        if d < 0.5e-9:
            raise FieldError(
                "particle_diameter",
                "This aerodynamic diameter corresponds to a "
                "volume-equivalent diameter below 0.5 nm; enter a larger size.",
            )
    else:
        d = v["particle_diameter"]
        d_ae = particle.aerodynamic_diameter(d, rho, chi, T, P)

    lam = gas.mean_free_path(T, P)
    cc = particle.slip_correction(d, T, P)
    D = particle.diffusion_coefficient(d, T, P, chi)
    vts = particle.settling_velocity(d, rho, T, P, chi)
    tau = particle.relaxation_time(d, rho, T, P, chi)
    re = particle.reynolds_number(d, vts, T, P)
    x_b = particle.rms_displacement(d, t, T, P, chi)
    x_s = vts * t
    d_cross = particle.crossover_diameter(t, rho, T, P, chi)
    t_b = particle.brownian_time(d, L, T, P, chi)
    t_s = particle.settling_time(d, L, rho, T, P, chi)
    stop = particle.stopping_distance(d, v["initial_velocity"], rho, T, P, chi)
    re0 = particle.reynolds_number(d, v["initial_velocity"], T, P)
    ratio = x_b / x_s

    results = {
        "volume_equivalent_diameter": quantity(
            "Volume-equivalent diameter", d, "length", symbol="d"
        ),
        "aerodynamic_diameter": quantity("Aerodynamic diameter", d_ae, "length", symbol="dₐₑ"),
        "mean_free_path": quantity("Mean free path of air", lam, "length", "nm", symbol="λ"),
        "air_viscosity": quantity("Air viscosity", gas.air_viscosity(T), None, "Pa·s", symbol="μ"),
        "knudsen_number": quantity("Knudsen number", 2 * lam / d, None, "–", symbol="Kn"),
        "slip_correction": quantity("Slip correction", cc, None, "–", symbol="Cc"),
        "mobility": quantity(
            "Mechanical mobility", particle.mobility(d, T, P, chi), None, "s/kg", symbol="B"
        ),
        "diffusion_coefficient": quantity("Diffusion coefficient", D, None, "m²/s", symbol="D"),
        "settling_velocity": quantity("Settling velocity", vts, "velocity", symbol="vₜₛ"),
        "reynolds_number": quantity(
            "Particle Reynolds number at settling", re, None, "–", symbol="Re"
        ),
        "settling_model": text_result("Settling velocity from", particle.settling_regime(re)),
        "relaxation_time": quantity("Relaxation time", tau, None, "s", symbol="τ"),
        "stopping_distance": quantity("Stopping distance", stop, "length", symbol="S"),
        "initial_reynolds_number": quantity(
            "Particle Reynolds number at the initial velocity", re0, None, "–", symbol="Re₀"
        ),
        "stopping_model": text_result("Stopping distance from", particle.stopping_regime(re0)),
        "rms_displacement": quantity(
            "Brownian rms displacement (one direction)", x_b, "length", symbol="√(2Dt)"
        ),
        "settling_distance": quantity("Settling distance", x_s, "length", symbol="vₜₛ·t"),
        "displacement_ratio": quantity("Brownian ÷ settling distance", ratio, None, "–"),
        "dominant": text_result(
            "Dominant motion in this time",
            "Brownian diffusion" if ratio > 1 else "Gravity settling",
        ),
        "crossover_diameter": (
            quantity(
                "Crossover diameter (equal distances)", d_cross, "length", note="volume-equivalent"
            )
            if d_cross is not None
            else text_result("Crossover diameter", "none in range")
        ),
        "brownian_time": quantity("Time to diffuse the reference distance", t_b, "time"),
        "settling_time": quantity("Time to settle the reference distance", t_s, "time"),
    }
    return {
        "results": results,
        "curves": _curves(v, d_ae if aerodynamic else d, d_cross, x_b, x_s),
        "warnings": _warnings(d, re, tau, t, d_cross, cc)
        + particle.settling_warnings(d, rho, T, P, chi)
        + _stopping_warnings(re0),
        "sources": cite(
            "sutherland_ussa1976",
            "willeke1976",
            "kim2005",
            "einstein1905",
            "hinds1999",
            "clift_gauvin1970",
        ),
    }


def _curves(
    v: dict[str, Any], d_shown: float, d_cross: float | None, x_b: float, x_s: float
) -> dict[str, Any]:
    T, P, rho, chi, t = (
        v["temperature"],
        v["pressure"],
        v["particle_density"],
        v["shape_factor"],
        v["time"],
    )
    aerodynamic = v["diameter_type"] == "aerodynamic"
    xs = logspace(*CURVE_RANGE, CURVE_POINTS)
    brown, settle = [], []
    for x in xs:
        d = particle.volume_equivalent_diameter(x, rho, chi, T, P) if aerodynamic else x
        brown.append(particle.rms_displacement(d, t, T, P, chi))
        settle.append(particle.settling_velocity(d, rho, T, P, chi) * t)
    x_um = [x * 1e6 for x in xs]
    x_label = "Aerodynamic diameter" if aerodynamic else "Volume-equivalent diameter"
    curves: dict[str, Any] = {
        "x_label": x_label,
        "x_unit": "µm",
        "y_label": "Distance in the chosen time",
        "y_unit": "m",
        "brownian": {
            "label": "Brownian rms displacement √(2Dt), one direction",
            "x": x_um,
            "y": brown,
        },
        "settling": {"label": "Settling distance vₜₛ·t", "x": x_um, "y": settle},
        "reference": {
            "label": "Reference distance",
            "x": [x_um[0], x_um[-1]],
            "y": [v["reference_distance"]] * 2,
        },
        "this_particle": {"label": "This particle", "x": [d_shown * 1e6] * 2, "y": [x_b, x_s]},
    }
    if d_cross is not None:
        shown = particle.aerodynamic_diameter(d_cross, rho, chi, T, P) if aerodynamic else d_cross
        curves["crossover"] = {
            "label": "Crossover",
            "x": [shown * 1e6],
            "y": [particle.rms_displacement(d_cross, t, T, P, chi)],
        }
    return curves


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
