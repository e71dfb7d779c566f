"""A sampling chain: stages in order, each stage's and the overall penetration versus size.

The chain only dispatches: every stage is a small frozen dataclass holding its geometry in SI
units and calling the model functions of this package; numbers are checked at the function
level. Results are gathered in dataclasses whose field comments state their units.

Stages: :class:`Tube` (diffusion and settling in a straight tube), :class:`Bend`,
:class:`Cyclone`, :class:`Impactor`, :class:`ScreenStack`. Compose them with :class:`Chain`
and call :meth:`Chain.evaluate`; correct a measured spectrum with :func:`correct_spectrum`.
The registry of stage kinds (labels, builders from named parameters) is
:mod:`driftdose.transport.kinds`.

Diameters are volume-equivalent sphere diameters (dynamic shape factor 1) of particles of
one density; stages that act on the aerodynamic diameter convert.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from .. import gas, particle
from ..constants import P_DEFAULT, T_DEFAULT
from . import bend as _bend
from . import cyclone as _cyclone
from . import impactor as _impactor
from . import screen as _screen
from . import settling as _settling
from . import tube as _tube
from .flow import (
    MACH_ERROR,
    MACH_WARNING,
    RE_LAMINAR_MAX,
    RE_TURBULENT_MIN,
    flow_regime,
    mach_number,
    transition_weight,
    tube_reynolds_number,
    tube_velocity,
)

__all__ = [
    "UNRELIABLE_BELOW",
    "Bend",
    "Chain",
    "ChainResult",
    "CorrectedSpectrum",
    "Cyclone",
    "Impactor",
    "ScreenStack",
    "Stage",
    "StageInputError",
    "StageReport",
    "Tube",
    "correct_spectrum",
]

UNRELIABLE_BELOW = 0.5
"""Penetration below which a spectrum correction is flagged as unreliable: dividing by a
small, uncertain penetration amplifies its error (our threshold). [-]"""


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
        if self.regime not in ("auto", "laminar", "turbulent"):
            raise StageInputError("regime", "Regime must be auto, laminar or turbulent.")

    def _regime(self, T: float, P: float) -> str:
        if self.regime != "auto":
            return self.regime
        return flow_regime(tube_reynolds_number(self.flow, self.tube_diameter, T, P))

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

    def report(self, T: float, P: float) -> StageReport:
        """Reynolds number, mean velocity, residence time and warnings."""
        u = tube_velocity(self.flow, self.tube_diameter)
        re = tube_reynolds_number(self.flow, self.tube_diameter, T, P)
        regime = self._regime(T, P)
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
        if self.regime not in ("auto", "laminar", "turbulent"):
            raise StageInputError("regime", "Regime must be auto, laminar or turbulent.")

    def penetration(self, d: float, density: float, T: float, P: float) -> float:
        """Penetration at diameter ``d`` [m]."""
        return _bend.bend_penetration(
            d, self.flow, self.tube_diameter, self.bend_angle, density, T, P, self.regime
        )

    def report(self, T: float, P: float) -> StageReport:
        """Reynolds and Dean numbers, curvature ratio and warnings."""
        u = tube_velocity(self.flow, self.tube_diameter)
        re = tube_reynolds_number(self.flow, self.tube_diameter, T, P)
        regime = self.regime if self.regime != "auto" else flow_regime(re)
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


@dataclass(frozen=True)
class Cyclone:
    """Cyclone or other pre-separator described by its penetration curve.

    Attributes: ``d50`` [m] aerodynamic cut size and ``curve_gsd`` [-] of a lognormal curve,
    or ``curve="iso7708_respirable"`` for the ideal respirable convention.
    """

    d50: float = 4.0e-6
    curve_gsd: float = 1.5
    curve: str = "lognormal"
    name: str = "Cyclone"
    kind: str = field(default="cyclone", init=False)

    def __post_init__(self) -> None:
        if self.curve not in _cyclone.CYCLONE_CURVES:
            raise StageInputError("curve", "Curve must be lognormal or iso7708_respirable.")
        if self.curve == "lognormal":
            _positive("d50", self.d50, "Cut size")
            if not (math.isfinite(self.curve_gsd) and self.curve_gsd > 1.0):
                raise StageInputError("curve_gsd", "The curve's GSD must be greater than 1.")

    def penetration(self, d: float, density: float, T: float, P: float) -> float:
        """Penetration at volume-equivalent diameter ``d`` [m]."""
        return _cyclone.cyclone_penetration(d, self.d50, self.curve_gsd, density, self.curve, T, P)

    def report(self, T: float, P: float) -> StageReport:
        """Cut size and the curve's GSD."""
        q: dict[str, tuple[str, float, str]] = {}
        if self.curve == "lognormal":
            q["d50"] = ("Cut size (aerodynamic)", self.d50, "m")
            q["curve_gsd"] = ("GSD of the curve", self.curve_gsd, "–")
            sources: tuple[str, ...] = ()  # a user-defined curve: nothing to cite
        else:
            sources = ("iso7708",)
        return StageReport(self.name, self.kind, None, q, [], sources)


@dataclass(frozen=True)
class Impactor:
    """Impactor stage: cut size from Stk50, sigmoid efficiency around it.

    Attributes: ``nozzle_diameter`` [m] (or slit width), ``flow`` [m^3/s], ``n_nozzles``,
    ``jet`` (``round`` or ``rectangular``), ``slit_length`` [m], ``efficiency_width`` [-].
    """

    nozzle_diameter: float
    flow: float
    n_nozzles: int = 1
    jet: str = "round"
    slit_length: float | None = None
    efficiency_width: float = _impactor.DEFAULT_EFFICIENCY_WIDTH
    name: str = "Impactor"
    kind: str = field(default="impactor", init=False)

    def __post_init__(self) -> None:
        _positive("nozzle_diameter", self.nozzle_diameter, "Nozzle diameter")
        _positive("flow", self.flow, "Flow")
        if not (isinstance(self.n_nozzles, int) and self.n_nozzles >= 1):
            raise StageInputError("n_nozzles", "Number of nozzles must be a whole number ≥ 1.")
        if self.jet not in _impactor.STK50:
            raise StageInputError("jet", "Jet shape must be round or rectangular.")
        if self.jet == "rectangular":
            if self.slit_length is None:
                raise StageInputError("slit_length", "A rectangular jet needs a slit length.")
            _positive("slit_length", self.slit_length, "Slit length")
            if self.slit_length < self.nozzle_diameter:
                raise StageInputError("slit_length", "Slit length must be at least the slit width.")
        if not (math.isfinite(self.efficiency_width) and self.efficiency_width > 1.0):
            raise StageInputError(
                "efficiency_width", "The width of the efficiency curve must be greater than 1."
            )

    def velocity(self) -> float:
        """Jet velocity [m/s]."""
        return _impactor.jet_velocity(
            self.nozzle_diameter, self.flow, self.n_nozzles, self.jet, self.slit_length
        )

    def penetration(self, d: float, density: float, T: float, P: float) -> float:
        """Penetration at diameter ``d`` [m]."""
        return _impactor.impactor_penetration(
            d,
            self.nozzle_diameter,
            self.flow,
            self.n_nozzles,
            density,
            self.jet,
            self.efficiency_width,
            T,
            P,
            self.slit_length,
        )

    def cut_diameter(self, density: float, T: float, P: float) -> float:
        """Cut diameter d50 [m] at ``density``."""
        return _impactor.impactor_cut_diameter(
            self.nozzle_diameter,
            self.flow,
            self.n_nozzles,
            density,
            self.jet,
            T,
            P,
            self.slit_length,
        )

    def report(self, T: float, P: float) -> StageReport:
        """Jet velocity, jet Reynolds number, aerodynamic cut size and warnings."""
        u = self.velocity()
        re = _impactor.impactor_jet_reynolds_number(
            self.nozzle_diameter, self.flow, self.n_nozzles, self.jet, self.slit_length, T, P
        )
        warnings = _check_speed("flow", u, T, "Jet velocity")
        lo, hi = _impactor.JET_RE_RANGE
        if not lo <= re <= hi:
            warnings.append(
                f"Jet Reynolds number {re:.3g} is outside 500 to 3000, where Stk50 is nearly "
                "constant; the cut size is less certain."
            )
        d50_ae = self.cut_diameter(1000.0, T, P)
        return StageReport(
            name=self.name,
            kind=self.kind,
            regime=None,
            quantities={
                "velocity": ("Jet velocity", u, "m/s"),
                "reynolds": ("Jet Reynolds number", re, "–"),
                "stk50": ("Stokes number at the cut", _impactor.STK50[self.jet], "–"),
                "d50_aerodynamic": ("Cut size (aerodynamic)", d50_ae, "m"),
            },
            warnings=warnings,
            sources=("marple_willeke1976", "hinds1999"),
        )


@dataclass(frozen=True)
class ScreenStack:
    """Stack of identical wire screens (fan model).

    Attributes: ``wire_diameter`` [m], ``solidity`` [-], ``thickness`` [m] of one screen,
    ``flow`` [m^3/s], ``screen_diameter`` [m] of the exposed circular area, ``n_screens``,
    ``impaction`` adds the isolated-cylinder impaction estimate.
    """

    wire_diameter: float
    solidity: float
    thickness: float
    flow: float
    screen_diameter: float
    n_screens: int = 1
    impaction: bool = False
    name: str = "Wire screens"
    kind: str = field(default="screens", init=False)

    def __post_init__(self) -> None:
        _positive("wire_diameter", self.wire_diameter, "Wire diameter")
        _positive("thickness", self.thickness, "Screen thickness")
        _positive("flow", self.flow, "Flow")
        _positive("screen_diameter", self.screen_diameter, "Screen diameter")
        if not (math.isfinite(self.solidity) and 0.0 < self.solidity < 1.0):
            raise StageInputError("solidity", "Solidity must be between 0 and 1 (exclusive).")
        if self.thickness < self.wire_diameter:
            raise StageInputError(
                "thickness",
                "Screen thickness must be at least the wire diameter (a woven screen is "
                "about two wire diameters thick).",
            )
        if self.screen_diameter <= self.wire_diameter:
            raise StageInputError(
                "screen_diameter", "Screen diameter must be larger than the wire diameter."
            )
        if not (isinstance(self.n_screens, int) and self.n_screens >= 1):
            raise StageInputError("n_screens", "Number of screens must be a whole number ≥ 1.")

    def face_velocity(self) -> float:
        """Face velocity U0 = Q / A [m/s]."""
        return self.flow / (math.pi * self.screen_diameter**2 / 4.0)

    def penetration(self, d: float, density: float, T: float, P: float) -> float:
        """Penetration at diameter ``d`` [m]."""
        return _screen.screen_penetration(
            d,
            self.wire_diameter,
            self.solidity,
            self.thickness,
            self.face_velocity(),
            self.n_screens,
            T,
            P,
            density,
            self.impaction,
        )

    def report(self, T: float, P: float) -> StageReport:
        """Face velocity, wire Reynolds number, screen parameter and warnings."""
        u0 = self.face_velocity()
        u_in = u0 / (1.0 - self.solidity)
        re_f = gas.air_density(T, P) * u0 * self.wire_diameter / gas.air_viscosity(T)
        warnings = _check_speed("flow", u_in, T, "Air speed between the wires")
        if self.solidity > 0.5:
            warnings.append(
                f"Solidity {self.solidity:.2g} is high for a wire screen; the fan model was "
                "checked on ordinary mesh screens (solidity about 0.2 to 0.4)."
            )
        if re_f > 1.0:
            warnings.append(
                f"Wire Reynolds number {re_f:.2g} exceeds 1; the fan model assumes creeping "
                "flow around the wires."
            )
        lo, hi = _screen.SCREEN_SIZE_RANGE
        warnings.append(
            f"Screen efficiencies were measured for particles of {lo * 1e9:.0f} nm to "
            f"{hi * 1e6:.0f} µm; outside that range the screen curve is extrapolated."
        )
        sources: tuple[str, ...] = ("cheng_yeh1980", "cheng_yeh_brinsko1985", "kirsch1978")
        if self.impaction:
            sources += ("landahl_herrmann1949",)
        return StageReport(
            name=self.name,
            kind=self.kind,
            regime=None,
            quantities={
                "face_velocity": ("Face velocity", u0, "m/s"),
                "wire_reynolds": ("Wire Reynolds number", re_f, "–"),
                "screen_parameter": (
                    "Screen parameter B",
                    _screen.screen_parameter(self.wire_diameter, self.solidity, self.thickness),
                    "–",
                ),
            },
            warnings=warnings,
            sources=sources,
        )

    def impaction_warning(self, d_max: float, density: float, T: float, P: float) -> str:
        """Warning text when impaction is off but the wire Stokes number is not small."""
        if self.impaction:
            return (
                "Impaction on the wires uses an isolated-cylinder fit (Landahl & Herrmann "
                "1949) made for wire Reynolds numbers near 10; at lower wire Reynolds "
                "numbers it overstates impaction."
            )
        stk = 2.0 * particle.relaxation_time(d_max, density, T, P) * self.face_velocity()
        stk /= self.wire_diameter
        if stk > 0.1:
            return (
                f"Impaction on the wires is not included, but the wire Stokes number reaches "
                f"{stk:.2g} for the largest particles: the screen curve may overstate their "
                "penetration."
            )
        return ""


Stage = Tube | Bend | Cyclone | Impactor | ScreenStack


@dataclass(frozen=True)
class ChainResult:
    """Penetration of a chain on a grid of sizes."""

    diameters: list[float]  # volume-equivalent diameter [m]
    aerodynamic_diameters: list[float]  # aerodynamic diameter [m]
    stage_names: list[str]
    stage_penetrations: list[list[float]]  # per stage, per size [-]
    overall: list[float]  # product over stages, per size [-]
    reports: list[StageReport]
    size_warnings: list[list[str]]  # per stage: warnings that depend on the size range
    density: float  # particle density [kg/m^3]
    temperature: float  # [K]
    pressure: float  # [Pa]


@dataclass(frozen=True)
class Chain:
    """Stages in the order the air passes them."""

    stages: tuple[Stage, ...]
    name: str = ""

    def penetration(
        self, d: float, density: float = 1000.0, T: float = T_DEFAULT, P: float = P_DEFAULT
    ) -> float:
        """Overall penetration at diameter ``d`` [m]: product of the stage penetrations."""
        p = 1.0
        for stage in self.stages:
            p *= stage.penetration(d, density, T, P)
        return p

    def evaluate(
        self,
        diameters: list[float],
        density: float = 1000.0,
        T: float = T_DEFAULT,
        P: float = P_DEFAULT,
    ) -> ChainResult:
        """Penetration of every stage and of the chain at each diameter.

        Parameters
        ----------
        diameters : list of float
            Volume-equivalent particle diameters. [m]
        density : float
            Particle density. [kg/m^3]
        T, P : float
            Temperature [K], pressure [Pa].

        Returns
        -------
        ChainResult

        Notes
        -----
        Stages act independently, so the overall penetration is the product of the stage
        penetrations (common practice; it ignores changes of the velocity profile from one
        stage to the next).

        """
        reports = [s.report(T, P) for s in self.stages]
        per_stage = [[s.penetration(d, density, T, P) for d in diameters] for s in self.stages]
        overall = []
        for i in range(len(diameters)):
            p = 1.0
            for row in per_stage:
                p *= row[i]
            overall.append(p)
        size_warnings: list[list[str]] = []
        d_max = max(diameters) if diameters else 0.0
        for stage in self.stages:
            text = ""
            if isinstance(stage, Tube):
                text = stage.axial_settling_warning(d_max, density, T, P)
            elif isinstance(stage, ScreenStack):
                text = stage.impaction_warning(d_max, density, T, P)
            size_warnings.append([text] if text else [])
        return ChainResult(
            diameters=list(diameters),
            aerodynamic_diameters=[
                particle.aerodynamic_diameter(d, density, 1.0, T, P) for d in diameters
            ],
            stage_names=[s.name for s in self.stages],
            stage_penetrations=per_stage,
            overall=overall,
            reports=reports,
            size_warnings=size_warnings,
            density=density,
            temperature=T,
            pressure=P,
        )


@dataclass(frozen=True)
class CorrectedSpectrum:
    """A measured spectrum divided by the chain's penetration, bin by bin."""

    diameters: list[float]  # bin diameters, volume-equivalent [m]
    measured: list[float]  # as given (any concentration unit)
    penetration: list[float]  # overall penetration at each bin [-]
    corrected: list[float | None]  # measured / penetration, same unit; None if P is ~0
    unreliable: list[bool]  # True where penetration < threshold
    threshold: float  # [-]


def correct_spectrum(
    chain: Chain,
    diameters: list[float],
    concentrations: list[float],
    density: float = 1000.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
    threshold: float = UNRELIABLE_BELOW,
) -> CorrectedSpectrum:
    """Correct a measured size spectrum for the losses of a sampling chain.

    Parameters
    ----------
    chain : Chain
        The chain between the sampled air and the instrument.
    diameters : list of float
        Bin diameters (volume-equivalent; convert aerodynamic sizes first). [m]
    concentrations : list of float
        Measured concentration per bin, in any unit (dN, dN/dlogD, mass...). [any]
    density : float
        Particle density. [kg/m^3]
    T, P : float
        Temperature [K], pressure [Pa].
    threshold : float
        Bins with penetration below it are flagged unreliable. [-]

    Returns
    -------
    CorrectedSpectrum
        Each bin's concentration divided by the chain's penetration at the bin diameter.

    Notes
    -----
    The ambient concentration of a bin is the measured one over the penetration at its
    representative diameter (common practice). Inside a wide bin the penetration varies;
    the correction assumes it does not. Where the penetration is below 1e-6 the correction
    is not given (None).

    """
    if len(diameters) != len(concentrations):
        raise ValueError("diameters and concentrations must have the same length")
    pen = [chain.penetration(d, density, T, P) for d in diameters]
    corrected: list[float | None] = [
        c / p if p > 1e-6 else None for c, p in zip(concentrations, pen, strict=True)
    ]
    return CorrectedSpectrum(
        diameters=list(diameters),
        measured=list(concentrations),
        penetration=pen,
        corrected=corrected,
        unreliable=[p < threshold for p in pen],
        threshold=threshold,
    )
