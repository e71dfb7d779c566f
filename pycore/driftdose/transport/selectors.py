"""Size-selective stages of a sampling chain: :class:`Cyclone`, :class:`Impactor` and
:class:`ScreenStack` (a diffusion battery of wire screens), each a small frozen dataclass
holding its geometry in SI units and calling the model functions of this package, with the
shared checks of :mod:`driftdose.transport.stages`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from .. import gas, particle
from ..particle.grid import ParticleGrid
from . import cyclone as _cyclone
from . import impactor as _impactor
from . import screen as _screen
from .stages import StageInputError, StageReport, _check_speed, _positive

__all__ = ["Cyclone", "Impactor", "ScreenStack"]


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

    def penetrations(self, grid: ParticleGrid) -> list[float]:
        """:meth:`penetration` at every size of ``grid`` (its aerodynamic diameters). [-]"""
        return _cyclone.cyclone_curve(grid.aerodynamic, self.d50, self.curve_gsd, self.curve)

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

    def penetrations(self, grid: ParticleGrid) -> list[float]:
        """:meth:`penetration` at every size of ``grid`` (its relaxation times). [-]"""
        return _impactor.impactor_curve(
            grid.relaxation,
            self.nozzle_diameter,
            self.flow,
            self.n_nozzles,
            self.jet,
            self.efficiency_width,
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

    def penetrations(self, grid: ParticleGrid) -> list[float]:
        """:meth:`penetration` at every size of ``grid`` (its diffusion and relaxation). [-]"""
        return _screen.screen_curve(
            grid.diameters,
            grid.diffusion,
            grid.relaxation,
            self.wire_diameter,
            self.solidity,
            self.thickness,
            self.face_velocity(),
            self.n_screens,
            grid.T,
            grid.P,
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
