"""The stages of a sampling chain: each a small frozen dataclass holding its geometry in SI
units and calling the model functions of this package (numbers are checked at the function
level), with the checks and warnings every stage shares.

Here: :class:`Tube` (diffusion and settling in a straight tube) and :class:`Bend`, with the
report and checks every stage shares; the size-selective stages are in
:mod:`driftdose.transport.selectors`.
They are composed in order by :class:`driftdose.transport.chain.Chain`; the registry of stage
kinds (labels, builders from named parameters) is :mod:`driftdose.transport.kinds`.

Diameters are volume-equivalent sphere diameters (dynamic shape factor 1) of particles of
one density; stages that act on the aerodynamic diameter convert.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from .. import particle
from ..particle.grid import ParticleGrid
from . import bend as _bend
from . import settling as _settling
from . import tube as _tube
from .flow import (
    MACH_ERROR,
    MACH_WARNING,
    RE_LAMINAR_MAX,
    RE_TURBULENT_MIN,
    REGIMES,
    flow_regime,
    mach_number,
    transition_weight,
    tube_reynolds_number,
    tube_velocity,
)

__all__ = [
    "Bend",
    "StageInputError",
    "StageReport",
    "Tube",
]


class StageInputError(ValueError):
    """An impossible or unusable stage parameter; ``parameter`` names it."""

    def __init__(self, parameter: str, message: str) -> None:
        super().__init__(message)
        self.parameter = parameter
        self.message = message


@dataclass(frozen=True)
class StageReport:
    """What one stage reports besides its curve.

    ``quantities`` maps a key to (label, SI value, SI unit label); ``warnings`` are plain
    sentences.
    """

    name: str
    kind: str
    regime: str | None
    quantities: dict[str, tuple[str, float, str]]
    warnings: list[str]
    sources: tuple[str, ...]


def _positive(parameter: str, value: float, what: str) -> None:
    if not (isinstance(value, int | float) and math.isfinite(value) and value > 0.0):
        raise StageInputError(parameter, f"{what} must be a positive number.")


def _check_speed(parameter: str, velocity: float, T: float, what: str) -> list[str]:
    """Refuse near-sonic speeds; warn above Mach 0.3."""
    ma = mach_number(velocity, T)
    if ma >= MACH_ERROR:
        raise StageInputError(
            parameter,
            f"{what} would be {velocity:.3g} m/s (Mach {ma:.2f}), near or above the speed "
            "of sound; reduce the flow or widen the passage.",
        )
    if ma > MACH_WARNING:
        return [
            f"{what} is {velocity:.3g} m/s (Mach {ma:.2f}): above Mach 0.3 air is "
            "compressible and these incompressible models are extrapolated."
        ]
    return []


def _check_regime(regime: str) -> None:
    if regime not in REGIMES:
        raise StageInputError("regime", "Regime must be auto, laminar or turbulent.")


def _shown_regime(regime: str, re: float) -> str:
    """The regime a stage reports: the one chosen, or for ``auto`` the flow's at ``re``."""
    return regime if regime != "auto" else flow_regime(re)


def _regime_warnings(re: float, what: str, models: str, regime: str) -> list[str]:
    if regime == "auto" and RE_LAMINAR_MAX <= re <= RE_TURBULENT_MIN:
        w = transition_weight(re)
        return [
            f"{what}: Reynolds number {re:.0f} is in the transition range 2000 to 4000, where "
            f"the flow may be laminar or turbulent; the penetration is interpolated between "
            f"{models} ({w * 100:.0f} % turbulent, linearly over 2000-4000; this "
            "tool's interpolation, not a published model)."
        ]
    return []


@dataclass(frozen=True)
class Tube:
    """Straight circular tube: diffusion and gravitational settling.

    Attributes: ``length`` [m], ``tube_diameter`` [m] (inner), ``flow`` [m^3/s],
    ``inclination`` [rad] (from horizontal), ``diffusion`` and ``settling`` switch the
    mechanisms, ``regime`` is ``auto``, ``laminar`` or ``turbulent``.
    """

    length: float
    tube_diameter: float
    flow: float
    inclination: float = 0.0
    diffusion: bool = True
    settling: bool = True
    regime: str = "auto"
    name: str = "Straight tube"
    kind: str = field(default="tube", init=False)

    def __post_init__(self) -> None:
        _positive("length", self.length, "Tube length")
        _positive("tube_diameter", self.tube_diameter, "Tube inner diameter")
        _positive("flow", self.flow, "Flow")
        if not (-math.pi / 2 <= self.inclination <= math.pi / 2):
            raise StageInputError("inclination", "Inclination must be between -90° and 90°.")
        _check_regime(self.regime)

    def penetration(self, d: float, density: float, T: float, P: float) -> float:
        """Penetration at diameter ``d`` [m]: product of the diffusion and settling parts."""
        regime = self.regime  # auto interpolates across the transition range
        p = 1.0
        if self.diffusion:
            p *= _tube.tube_diffusion_penetration_any(
                d, self.length, self.flow, self.tube_diameter, T, P, regime
            )
        if self.settling:
            p *= _settling.tube_settling_penetration(
                d,
                self.length,
                self.flow,
                self.tube_diameter,
                density,
                self.inclination,
                T,
                P,
                regime,
            )
        return p

    def penetrations(self, grid: ParticleGrid) -> list[float]:
        """:meth:`penetration` at every size of ``grid`` (its density, T and P). [-]"""
        out = [1.0] * len(grid.diameters)
        if self.diffusion:
            out = _tube.tube_diffusion_curve(
                grid.diffusion,
                self.length,
                self.flow,
                self.tube_diameter,
                grid.T,
                grid.P,
                self.regime,
            )
        if self.settling:
            settle = _settling.tube_settling_curve(
                grid.settling,
                self.length,
                self.flow,
                self.tube_diameter,
                self.inclination,
                grid.T,
                grid.P,
                self.regime,
            )
            out = [p * q for p, q in zip(out, settle, strict=True)]
        return out

    def report(self, T: float, P: float) -> StageReport:
        """Reynolds number, mean velocity, residence time and warnings."""
        u = tube_velocity(self.flow, self.tube_diameter)
        re = tube_reynolds_number(self.flow, self.tube_diameter, T, P)
        regime = _shown_regime(self.regime, re)
        warnings = _check_speed("flow", u, T, "Mean air speed in the tube")
        models = []
        if self.diffusion:
            models.append("Gormley & Kennedy (laminar) and Friedlander (turbulent) for diffusion")
        if self.settling:
            models.append(
                "Heyder & Gebhart (laminar) and Schwendiman et al. (turbulent) for settling"
            )
        warnings += _regime_warnings(re, "Tube", "; ".join(models) or "the forms", self.regime)
        entrance = 0.05 * re * self.tube_diameter  # laminar entrance length, common practice
        if regime == "laminar" and self.diffusion and entrance > 0.1 * self.length:
            warnings.append(
                f"The laminar velocity profile needs about {entrance:.3g} m (0.05 Re d) to "
                f"develop, more than a tenth of the {self.length:.3g} m tube: diffusion "
                "losses near the entrance are larger than the fully developed model gives."
            )
        if regime in ("turbulent", "transition"):
            warnings.append(
                "Turbulent flow: inertial deposition to the tube wall (important for "
                "particles of several micrometres) is not included."
            )
        sources: tuple[str, ...] = ()
        if self.diffusion:
            if regime != "turbulent":
                sources += ("gormley_kennedy1949",)
            if regime != "laminar":
                sources += ("friedlander1977",)
            sources += ("brockmann2001",)
        if self.settling and math.cos(self.inclination) > 1e-12:
            if regime != "turbulent":
                sources += ("fuchs1964", "thomas1958", "heyder_gebhart1977")
            if regime != "laminar":
                sources += ("schwendiman1975",)
        return StageReport(
            name=self.name,
            kind=self.kind,
            regime=regime,
            quantities={
                "velocity": ("Mean air speed", u, "m/s"),
                "reynolds": ("Reynolds number", re, "–"),
                "residence_time": ("Residence time", self.length / u, "s"),
            },
            warnings=warnings,
            sources=sources,
        )

    def axial_settling_warning(self, d_max: float, density: float, T: float, P: float) -> str:
        """Warning text when settling along the axis is not small against the air speed."""
        if abs(math.sin(self.inclination)) < 1e-12 or not self.settling:
            return ""
        v = particle.settling_velocity(d_max, density, T, P)
        ratio = v * abs(math.sin(self.inclination)) / tube_velocity(self.flow, self.tube_diameter)
        if ratio > 0.1:
            return (
                f"Inclined tube: the largest particles settle along the axis at "
                f"{ratio * 100:.0f} % of the mean air speed; the inclined-tube formula "
                "assumes this is small (our limit 10 %)."
            )
        return ""


@dataclass(frozen=True)
class Bend:
    """Tube bend: inertial loss by the fits of Pui et al. (1987).

    Attributes: ``tube_diameter`` [m], ``flow`` [m^3/s], ``bend_angle`` [rad],
    ``curvature_radius`` [m] (bend radius to the tube axis; used for checks only).
    """

    tube_diameter: float
    flow: float
    bend_angle: float = math.pi / 2
    curvature_radius: float = 0.05
    regime: str = "auto"
    name: str = "Bend"
    kind: str = field(default="bend", init=False)

    def __post_init__(self) -> None:
        _positive("tube_diameter", self.tube_diameter, "Tube inner diameter")
        _positive("flow", self.flow, "Flow")
        _positive("bend_angle", self.bend_angle, "Bend angle")
        _positive("curvature_radius", self.curvature_radius, "Bend radius")
        if self.bend_angle > 2 * math.pi:
            raise StageInputError("bend_angle", "Bend angle must be at most 360°.")
        if self.curvature_radius <= self.tube_diameter / 2:
            raise StageInputError(
                "curvature_radius",
                "Bend radius must be larger than the tube's radius (half its inner "
                "diameter); a smaller radius is geometrically impossible.",
            )
        _check_regime(self.regime)

    def penetration(self, d: float, density: float, T: float, P: float) -> float:
        """Penetration at diameter ``d`` [m]."""
        return _bend.bend_penetration(
            d, self.flow, self.tube_diameter, self.bend_angle, density, T, P, self.regime
        )

    def penetrations(self, grid: ParticleGrid) -> list[float]:
        """:meth:`penetration` at every size of ``grid`` (its density, T and P). [-]"""
        return _bend.bend_curve(
            grid.relaxation,
            self.flow,
            self.tube_diameter,
            self.bend_angle,
            grid.T,
            grid.P,
            self.regime,
        )

    def report(self, T: float, P: float) -> StageReport:
        """Reynolds and Dean numbers, curvature ratio and warnings."""
        u = tube_velocity(self.flow, self.tube_diameter)
        re = tube_reynolds_number(self.flow, self.tube_diameter, T, P)
        regime = _shown_regime(self.regime, re)
        ratio = self.curvature_radius / (self.tube_diameter / 2)
        warnings = _check_speed("flow", u, T, "Mean air speed in the bend")
        warnings += _regime_warnings(
            re, "Bend", "the laminar and turbulent fits of Pui et al. (1987)", self.regime
        )
        lo, hi = _bend.PUI1987_RE_RANGE
        if not lo <= re <= hi:
            warnings.append(
                f"Bend Reynolds number {re:.3g} is outside 100 to 10 000, the range of the "
                "Pui et al. (1987) measurements; the fit is extrapolated."
            )
        if ratio < 2.0:
            warnings.append(
                f"Curvature ratio {ratio:.2g} (bend radius over tube radius) is very tight; "
                "the fits come from bends of moderate curvature."
            )
        return StageReport(
            name=self.name,
            kind=self.kind,
            regime=regime,
            quantities={
                "velocity": ("Mean air speed", u, "m/s"),
                "reynolds": ("Reynolds number", re, "–"),
                "dean": ("Dean number", re / math.sqrt(ratio), "–"),
                "curvature_ratio": ("Curvature ratio R/a", ratio, "–"),
            },
            warnings=warnings,
            sources=("pui1987", "brockmann2001"),
        )
