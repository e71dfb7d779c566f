"""Composition of the sampling calculation: a chain of stages, its target, a corrected spectrum.

:func:`compose_sampling` takes stages already built (:func:`driftdose.transport.build_stage`),
the particles' density and the air's temperature and pressure, an optional target curve and an
optional measured spectrum, all in SI units, and returns a :class:`SamplingResult`: the
penetration of every stage and of the chain on a grid of sizes, its values at reference sizes,
the sizes where it crosses 50 %, the departure from the target, the corrected spectrum, the
warnings and the bibliography keys. The domain rules of the calculation live here: where a
curve crosses a level, how the departure from a target is measured, which target curves exist
(:mod:`driftdose.compose.targets`: ISO 7708 fractions from :mod:`driftdose.conventions`,
regional deposition from the models of :data:`driftdose.deposition.DEPOSITION_MODELS`), and
what the warnings say.

It never imports :mod:`driftdose.api`; labels and display units are the api's.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from .._numerics import logspace
from ..transport import Chain, StageReport, correct_spectrum
from ..transport.chain import UNRELIABLE_BELOW, Stage
from .at_sizes import SizeAnswers, sampling_at_sizes
from .levels import crossings, pass_bands
from .targets import (
    DEPARTURE_RANGE,
    DEPOSITION_TARGET_RANGE,
    TARGETS,
    Departure,
    TargetOutcome,
    departure,
    target_curve,
)

__all__ = [
    "CURVE_POINTS",
    "CURVE_RANGE",
    "DEPARTURE_RANGE",
    "DEPOSITION_TARGET_RANGE",
    "REFERENCE_SIZES",
    "TARGETS",
    "Departure",
    "MeasuredSpectrum",
    "SamplingResult",
    "SizeAnswers",
    "SpectrumOutcome",
    "StageOutcome",
    "TargetOutcome",
    "compose_sampling",
    "crossings",
    "departure",
    "pass_bands",
    "target_curve",
]

CURVE_POINTS = 241
"""Sizes on the penetration curves, evenly spaced in ln d. [-]"""
CURVE_RANGE = (1e-9, 100e-6)
"""Smallest and largest size of the penetration curves. [m]"""
_SIZES = tuple(logspace(*CURVE_RANGE, CURVE_POINTS))
"""The sizes of the curves, computed once. [m]"""
REFERENCE_SIZES = (("10nm", 10e-9), ("100nm", 100e-9), ("1um", 1e-6), ("10um", 10e-6))
"""Sizes at which every stage's and the chain's penetration is reported (key, [m])."""


@dataclass(frozen=True)
class MeasuredSpectrum:
    """A measured spectrum to correct for the chain's losses.

    Attributes
    ----------
    diameters : list of float
        Bin diameters as measured (of type ``diameter_type``). [m]
    model_diameters : list of float
        The same bins as diameters of the spheres the chain acts on. [m]
    concentrations : list of float
        Measured number of particles per volume of air in each bin. [1/m^3]
    diameter_type : str
        ``volume_equivalent``, ``optical``, ``mobility`` or ``aerodynamic``.

    """

    diameters: list[float]
    model_diameters: list[float]
    concentrations: list[float]
    diameter_type: str


@dataclass(frozen=True)
class StageOutcome:
    """One stage of the chain, evaluated.

    Attributes
    ----------
    index : int
        Position in the chain, from 0.
    kind : str
        Stage kind (a key of :data:`driftdose.transport.STAGE_KINDS`).
    name : str
        The user's name for the stage, ``""`` if none was given.
    report : StageReport
        Regime, key quantities (SI) and the stage's own warnings and sources.
    penetration : list of float
        Penetration at each size of :attr:`SamplingResult.diameters`. [-]
    penetration_at : list of float
        Penetration at each of :data:`REFERENCE_SIZES`. [-]
    half_penetration_sizes : list of float
        Sizes where the penetration crosses 50 %. [m]
    warnings : list of str
        The stage's warnings, those that depend on the size range included.

    """

    index: int
    kind: str
    name: str
    report: StageReport
    penetration: list[float]
    penetration_at: list[float]
    half_penetration_sizes: list[float]
    warnings: list[str]


@dataclass(frozen=True)
class SpectrumOutcome:
    """A measured spectrum corrected for the chain's losses.

    Attributes
    ----------
    diameters : list of float
        Bin diameters as measured. [m]
    diameter_type : str
        Their type (``volume_equivalent``, ``optical``, ``mobility``, ``aerodynamic``).
    measured, corrected : list
        Particles per bin, measured and divided by the penetration (None where the
        penetration is below 1e-6). [1/m^3]
    penetration : list of float
        The chain's penetration at each bin. [-]
    unreliable : list of bool
        Bins whose penetration is below ``threshold``.
    threshold : float
        :data:`driftdose.transport.chain.UNRELIABLE_BELOW`. [-]
    measured_total : float
        Total number concentration measured: the sum of the particles per bin over all
        bins (for dN/dlogDp data, Σ (dN/dlogDp)_i Δlog10 Dp_i over the bins' widths). [1/m^3]
    corrected_total : float
        The same sum of the corrected bins, over the bins that have a corrected value. [1/m^3]
    corrected_bins : int
        How many bins ``corrected_total`` sums (bins with no corrected value are left out).

    """

    diameters: list[float]
    diameter_type: str
    measured: list[float]
    corrected: list[float | None]
    penetration: list[float]
    unreliable: list[bool]
    threshold: float
    measured_total: float
    corrected_total: float
    corrected_bins: int


@dataclass(frozen=True)
class SamplingResult:
    """What a sampling chain does to each particle size.

    Attributes
    ----------
    coordinate : str
        ``volume-equivalent`` or ``mobility-equivalent``: what :attr:`diameters` are.
    diameters : list of float
        Sizes of the curves (:data:`CURVE_POINTS` from 1 nm to 100 um). [m]
    aerodynamic_diameters : list of float
        Their aerodynamic diameters. [m]
    stages : tuple of StageOutcome
        Every stage, in the order the air passes them.
    overall : list of float
        The chain's penetration at each size. [-]
    overall_at : list of float
        The chain's penetration at :data:`REFERENCE_SIZES`. [-]
    pass_bands : list of tuple
        Size bands passed with at least 50 %: (lower, upper) [m], None for an end of the
        curve's range.
    target : TargetOutcome or None
    spectrum : SpectrumOutcome or None
    at_sizes : SizeAnswers or None
        Every stage's and the chain's penetration and the target at the sizes asked for
        (:func:`driftdose.compose.at_sizes.sampling_at_sizes`); None when none were asked.
    warnings : list of str
    sources : list of str
        Bibliography keys, in the order first used.

    """

    coordinate: str
    diameters: list[float]
    aerodynamic_diameters: list[float]
    stages: tuple[StageOutcome, ...]
    overall: list[float]
    overall_at: list[float]
    pass_bands: list[tuple[float | None, float | None]]
    target: TargetOutcome | None
    spectrum: SpectrumOutcome | None
    at_sizes: SizeAnswers | None
    warnings: list[str]
    sources: list[str]


_BASE_SOURCES = (
    "sutherland_ussa1976",
    "willeke1976",
    "kim2005",
    "einstein1905",
    "hinds1999",
    "schiller_naumann1933",
)


def _add(sources: list[str], keys: Sequence[str]) -> None:
    for key in keys:
        if key not in sources:
            sources.append(key)


def compose_sampling(
    stages: Sequence[Stage],
    density: float,
    T: float,
    P: float,
    *,
    effective_density: bool = False,
    shape_factor: float = 1.0,
    target: str | None = None,
    spectrum: MeasuredSpectrum | None = None,
    names: Sequence[str] | None = None,
    sizes: Sequence[float] = (),
) -> SamplingResult:
    """Penetration of a sampling chain, compared with a target, and a corrected spectrum.

    Parameters
    ----------
    stages : sequence of Stage
        The stages in the order the air passes them (at least one).
    density : float
        Density of the spheres the chain acts on: the particle density, or the effective
        density of agglomerates. [kg/m^3]
    T : float
        Air temperature. [K]
    P : float
        Air pressure. [Pa]
    effective_density : bool
        True when ``density`` is an effective density (the chain then acts on the sphere of
        the mobility diameter, DeCarlo et al. 2004).
    shape_factor : float
        The dynamic shape factor given; with a material density the stages do not use it
        and a warning says so. [-]
    target : str, optional
        A key of :data:`TARGETS`, or None for no target.
    spectrum : MeasuredSpectrum, optional
        A measured spectrum to correct.
    names : sequence of str, optional
        The user's name of each stage (``""`` for none); the stages' own names otherwise.
    sizes : sequence of float
        Sizes at which to give the exact values of every curve (at most a few). [m]

    Returns
    -------
    SamplingResult
        Curves on :data:`CURVE_POINTS` sizes from 1 nm to 100 um, per-stage outcomes,
        target, corrected spectrum, warnings and bibliography keys.

    Notes
    -----
    Stages act independently, so the chain's penetration is the product of theirs (common
    practice); see :meth:`driftdose.transport.Chain.evaluate`. A spectrum bin is divided by
    the chain's penetration at its diameter and flagged below 50 %
    (:func:`driftdose.transport.correct_spectrum`).

    """
    if not stages:
        raise ValueError("a sampling chain needs at least one stage")
    user_names = list(names) if names is not None else [s.name for s in stages]
    chain = Chain(tuple(stages))
    xs = list(_SIZES)
    evaluated = chain.evaluate(xs, density, T, P)
    warnings: list[str] = []
    sources: list[str] = list(_BASE_SOURCES)
    outcomes = []
    for i, (stage, report, row, more) in enumerate(
        zip(
            stages,
            evaluated.reports,
            evaluated.stage_penetrations,
            evaluated.size_warnings,
            strict=True,
        )
    ):
        stage_warnings = list(report.warnings) + list(more)
        shown = user_names[i] or report.name
        warnings.extend(f"Stage {i + 1} ({shown}): {w}" for w in stage_warnings)
        _add(sources, report.sources)
        outcomes.append(
            StageOutcome(
                index=i,
                kind=stage.kind,
                name=user_names[i],
                report=report,
                penetration=row,
                penetration_at=[stage.penetration(d, density, T, P) for _, d in REFERENCE_SIZES],
                half_penetration_sizes=crossings(xs, row, 0.5),
                warnings=stage_warnings,
            )
        )

    target_outcome = None
    if target is not None and target != "none":
        curve = target_curve(target, evaluated.aerodynamic_diameters)
        deposition_target = curve.family != "iso7708"
        size_range = DEPOSITION_TARGET_RANGE if deposition_target else DEPARTURE_RANGE
        target_outcome = TargetOutcome(
            curve.key,
            curve.family,
            curve.values,
            departure(evaluated.aerodynamic_diameters, evaluated.overall, curve.values, size_range),
            curve.sources,
        )
        _add(sources, curve.sources)
        if deposition_target:
            who = (
                "the ICRP reference worker"
                if curve.family == "icrp66"
                else "the breathing conditions the simplified fits average over"
            )
            warnings.append(
                "The target is the fraction of the particles in the air that deposits in that "
                f"region, for {who} and unit-density spheres of each aerodynamic diameter; a "
                "sampler that matches it collects what would deposit there."
                + (
                    " Below about 0.5 µm deposition depends on the particles' physical size, "
                    "so for your particle density the target is only indicative there."
                    if density != 1000.0
                    else ""
                )
            )

    spectrum_outcome = None
    if spectrum is not None:
        corrected = correct_spectrum(
            chain, spectrum.model_diameters, spectrum.concentrations, density, T, P
        )
        spectrum_outcome = SpectrumOutcome(
            diameters=list(spectrum.diameters),
            diameter_type=spectrum.diameter_type,
            measured=corrected.measured,
            corrected=corrected.corrected,
            penetration=corrected.penetration,
            unreliable=corrected.unreliable,
            threshold=UNRELIABLE_BELOW,
            measured_total=math.fsum(corrected.measured),
            corrected_total=math.fsum(c for c in corrected.corrected if c is not None),
            corrected_bins=sum(c is not None for c in corrected.corrected),
        )
        n_bad = sum(corrected.unreliable)
        if n_bad:
            warnings.append(
                f"{n_bad} of {len(corrected.unreliable)} spectrum bins pass the chain with less "
                "than 50 %: their correction is unreliable (flagged)."
            )

    if effective_density:
        warnings.append(
            "Sizes on the chart are mobility diameters: the chain acts on spheres of the "
            "mobility diameter and the effective density, which have the particles' mass, "
            "mobility and aerodynamic diameter (DeCarlo et al. 2004); interception on screens "
            "and drag beyond Stokes flow are those of that sphere."
        )
        _add(sources, ("decarlo2004",))
    else:
        if density != 1000.0:
            warnings.append(
                "Sizes on the chart are volume-equivalent diameters of spheres of the given "
                "density; cyclone curves and targets act on the aerodynamic diameter and are "
                "converted."
            )
        if shape_factor != 1.0:
            warnings.append(
                "The sampling stages treat particles as spheres: the shape factor is used only "
                "with an effective density, and was not applied."
            )
    if spectrum is not None and spectrum.diameter_type == "mobility":
        _add(sources, ("decarlo2004",))

    return SamplingResult(
        coordinate="mobility-equivalent" if effective_density else "volume-equivalent",
        diameters=list(xs),
        aerodynamic_diameters=evaluated.aerodynamic_diameters,
        stages=tuple(outcomes),
        overall=evaluated.overall,
        overall_at=[chain.penetration(d, density, T, P) for _, d in REFERENCE_SIZES],
        pass_bands=pass_bands(xs, evaluated.overall),
        target=target_outcome,
        spectrum=spectrum_outcome,
        at_sizes=sampling_at_sizes(stages, sizes, density, T, P, target) if sizes else None,
        warnings=warnings,
        sources=sources,
    )
