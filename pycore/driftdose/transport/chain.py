"""A sampling chain: stages in order, each stage's and the overall penetration versus size.

The chain only dispatches: the stages (:mod:`driftdose.transport.stages`) are small frozen
dataclasses holding their geometry in SI units and calling the model functions of this
package. Results are gathered in dataclasses whose field comments state their units.

Stages: :class:`Tube` (diffusion and settling in a straight tube), :class:`Bend`,
:class:`Cyclone`, :class:`Impactor`, :class:`ScreenStack`. Compose them with :class:`Chain`
and call :meth:`Chain.evaluate`; correct a measured spectrum with :func:`correct_spectrum`.
The registry of stage kinds (labels, builders from named parameters) is
:mod:`driftdose.transport.kinds`.

Diameters are volume-equivalent sphere diameters (dynamic shape factor 1) of particles of
one density; stages that act on the aerodynamic diameter convert.
"""

from __future__ import annotations

from dataclasses import dataclass

from .. import particle
from ..constants import P_DEFAULT, T_DEFAULT
from .selectors import Cyclone, Impactor, ScreenStack
from .stages import Bend, StageInputError, StageReport, Tube

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

Stage = Tube | Bend | Cyclone | Impactor | ScreenStack
"""Any stage of a chain."""

UNRELIABLE_BELOW = 0.5
"""Penetration below which a spectrum correction is flagged as unreliable: dividing by a
small, uncertain penetration amplifies its error (our threshold). [-]"""


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

    def penetrations(
        self,
        diameters: list[float],
        density: float = 1000.0,
        T: float = T_DEFAULT,
        P: float = P_DEFAULT,
    ) -> list[float]:
        """Overall penetration at each of ``diameters`` [m] (sorted or not): :meth:`penetration`
        size by size, from the particle's properties taken once (kept). [-]"""
        grid = particle.particle_grid(diameters, density, T, P)
        overall = [1.0] * len(diameters)
        for stage in self.stages:
            overall = [p * q for p, q in zip(overall, stage.penetrations(grid), strict=True)]
        return overall

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
        stage to the next). The particle's properties at the sizes are computed once for all
        stages and kept (:func:`driftdose.particle.particle_grid`), so a change of flow or
        geometry does not recompute them; each stage's ``penetrations`` gives the values of its
        ``penetration`` size by size.

        """
        reports = [s.report(T, P) for s in self.stages]
        grid = particle.particle_grid(diameters, density, T, P)
        per_stage = [s.penetrations(grid) for s in self.stages]
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
            aerodynamic_diameters=list(grid.aerodynamic),
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
    pen = chain.penetrations(list(diameters), density, T, P)
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
