"""Composer of the deposition calculation: where an aerosol deposits, and the dose per shift.

Calls, in order: the breathing (ICRP reference worker, one activity or custom parameters), the
regional deposition model over the aerosol's sizes (:func:`driftdose.dose.deposited_dose`),
the ISO 7708 convention shares of the airborne aerosol, the lung-deposited surface area, the
deposition curves with the distribution overlaid, and the warnings about validity. SI in, a
frozen :class:`Deposition` out; the api only translates.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from operator import itemgetter

from ..conventions import convention_shares
from ..deposition import BreathingPattern, Subject, activity, reference_worker
from ..deposition.icrp66 import warnings_for as icrp66_warnings
from ..deposition.simplified import validity_warnings as simplified_warnings
from ..distribution import GRID_LATTICE_STEP, Distribution, LognormalMode, parts
from ..dose import DoseResult, deposited_dose, deposition_curves, model_regions
from ..ldsa import lung_deposited_surface_area
from .aerosol import Aerosol, ModeSpec, is_converted
from .at_sizes import SizeAnswers, deposition_at_sizes
from .overlay import OVERLAY_POINTS, OVERLAY_SIZES, distribution_overlay

__all__ = [
    "CURVE_POINTS",
    "CURVE_RANGE",
    "DENSEST_MATERIAL",
    "OVERLAY_POINTS",
    "Deposition",
    "ModeNumbers",
    "breathing_subject",
    "compose_deposition",
    "validity_warnings",
]

CURVE_POINTS = 121
"""Sizes of the deposition curves (24 per decade, every other size of the 241 the curves had
before). Drawn as straight lines between sizes on a logarithmic axis, they depart from the
model by at most 9.2e-4 in a deposition fraction (against 2001 sizes, ICRP 66 model, densities
0.3 to 11 g/cm³; 2.3e-4 with 241 sizes): under a third of a pixel on a 0–1 axis 300 pixels
high, so the eye cannot tell them apart, and the model runs at half as many sizes for the
chart (``tests/core/test_compose_deposition.py``)."""
CURVE_RANGE = (1e-9, 100e-6)
"""Size range of the deposition curves, the stated range of both models [m]."""
# ln d = k h with h = GRID_LATTICE_STEP (24 per decade), the lattice of the lognormal modes'
# integration grids (their nodes are the same floats), the ends exactly the range's
_CURVE_SIZES = (
    CURVE_RANGE[0],
    *(math.exp(k * GRID_LATTICE_STEP) for k in range(-215, -96)),
    CURVE_RANGE[1],
)


def _within_0_1(ys: Sequence[float]) -> tuple[float, ...]:
    """Deposition fractions ``ys`` [-] limited to 0 to 1 (a model's rounding can leave them)."""
    if ys and min(ys) > 0.0 and max(ys) < 1.0:  # nothing to limit (min and max run in C)
        return tuple(ys)
    return tuple((y if y < 1.0 else 1.0) if y > 0.0 else 0.0 for y in ys)


DENSEST_MATERIAL = 22.6e3
"""Density of osmium, the densest element (common practice); an effective density and shape
factor implying a denser material cannot describe one particle. [kg/m^3]"""


@dataclass(frozen=True)
class ModeNumbers:
    """One lognormal mode as the models use it.

    Attributes
    ----------
    entered : ModeSpec
        The mode as entered.
    converted : bool
        Whether its median was converted to the models' diameter type.
    count_median : float
        Count median diameter on the models' size axis. [m]
    mass_median : float
        Mass median diameter on the models' size axis. [m]
    mmad : float
        Mass median aerodynamic diameter. [m]
    number : float
        Number concentration. [1/m^3]
    mass : float
        Mass concentration. [kg/m^3]
    """

    entered: ModeSpec
    converted: bool
    count_median: float
    mass_median: float
    mmad: float
    number: float
    mass: float


@dataclass(frozen=True)
class Deposition:
    """The deposition of one aerosol for one breathing over one exposure.

    Attributes
    ----------
    aerosol : Aerosol
        The aerosol in the models' diameters.
    subject : Subject
        The breathing.
    dose : DoseResult
        Deposited fractions [-], rates and doses per region and weight (number [1/s] and
        [-], surface [m^2/s] and [m^2], mass [kg/s] and [kg]).
    shares : dict
        ``shares[weight][fraction]``: share of the airborne number or mass in each ISO 7708
        fraction. [-]
    ldsa : dict
        Lung-deposited surface area, ``alveolar``, ``tracheobronchial`` and ``total``. [m^2/m^3]
    sizes : tuple of float
        Sizes of the deposition curves (:data:`CURVE_POINTS`), on the models' size axis. [m]
    fractions : dict
        ``fractions[region]``: deposition fraction at each size, within 0 to 1. [-]
    overlay_sizes : tuple of float
        Sizes of the overlay (:data:`OVERLAY_POINTS`), on the models' size axis. [m]
    overlay : dict
        ``overlay[weight]``: the distribution's dW/dln d at each size of ``overlay_sizes``
        (``number`` and ``mass``), scaled to a peak of 1. [-]
    modes : tuple of ModeNumbers
        The modes as the models use them (empty for a spectrum).
    warnings : tuple of str
        Validity ranges left, assumptions to know, benchmarks exceeded.
    at_sizes : SizeAnswers or None
        Deposition fraction per region and the ISO 7708 conventions at the sizes asked for
        (:func:`driftdose.compose.at_sizes.deposition_at_sizes`); None when none were asked.
    """

    aerosol: Aerosol
    subject: Subject
    dose: DoseResult
    shares: dict[str, dict[str, float]]
    ldsa: dict[str, float]
    sizes: tuple[float, ...]
    fractions: dict[str, tuple[float, ...]]
    overlay_sizes: tuple[float, ...]
    overlay: dict[str, tuple[float, ...]]
    modes: tuple[ModeNumbers, ...]
    warnings: tuple[str, ...]
    at_sizes: SizeAnswers | None = None


def breathing_subject(
    breathing: str,
    route: str = "mixed",
    activity_level: str = "light_exercise",
    tidal_volume: float = 1.25e-3,
    frequency: float = 20.0 / 60.0,
    nasal_fraction: float = 1.0,
) -> Subject:
    """The breathing of an exposure.

    Parameters
    ----------
    breathing : str
        ``reference_worker`` (ICRP 66 with ICRP 68's worker: 2.5 h sitting, 5.5 h light
        exercise), ``activity`` (one activity level throughout) or ``custom``.
    route : str
        Breathing route for the reference worker and an activity (``mixed``, ``nose``,
        ``mouth``, ``mouth_breather``).
    activity_level : str
        ICRP 66 activity level for ``activity``.
    tidal_volume : float
        Tidal volume for ``custom``. [m^3]
    frequency : float
        Breathing frequency for ``custom``. [1/s]
    nasal_fraction : float
        Share of the air breathed through the nose for ``custom``. [-]

    Returns
    -------
    Subject
        The activities and hours the deposition model averages over.

    Raises
    ------
    ValueError
        For custom breathing parameters outside what the model takes.
    """
    if breathing == "reference_worker":
        return reference_worker(route)
    if breathing == "activity":
        return Subject.single(activity(activity_level, route))
    pattern = BreathingPattern("custom breathing", tidal_volume, frequency, nasal_fraction)
    return Subject.single(pattern)


def compose_deposition(
    aerosol: Aerosol,
    subject: Subject,
    duration: float,
    model: str = "icrp66",
    thermodynamic: str = "icrp66",
    benchmark_number: float | None = None,
    benchmark_mass: float | None = None,
    custom_breathing: bool = False,
    sizes: Sequence[float] = (),
) -> Deposition:
    """Deposition fractions, doses, convention shares, LDSA, curves and warnings.

    Parameters
    ----------
    aerosol : Aerosol
        The aerosol in the models' diameters (diameters [m], concentrations [1/m^3]).
    subject : Subject
        The breathing.
    duration : float
        Exposure duration. [s]
    model : str
        ``icrp66`` (ICRP 66, 1994, Annex D) or ``simplified`` (Hinds 1999, eqs. 11.1–11.5).
    thermodynamic : str
        Sphere of the diffusion terms: ``icrp66`` (volume-equivalent, as ICRP 66) or
        ``mobility`` (the shape factor slows diffusion too).
    benchmark_number : float or None
        A number concentration to compare the airborne one with. [1/m^3]
    benchmark_mass : float or None
        A mass concentration to compare the airborne one with. [kg/m^3]
    custom_breathing : bool
        Whether the breathing was given as custom parameters (its mouth share is warned of).
    sizes : sequence of float
        Sizes on the models' axis at which to give the exact deposition fractions and ISO
        7708 conventions (at most a few). [m]

    Returns
    -------
    Deposition
        Everything the reply shows, in SI.

    Raises
    ------
    ValueError
        When the dose cannot be computed for these inputs.
    """
    dist, desc = aerosol.distribution, aerosol.description
    density, chi = desc.model_density, desc.model_shape_factor
    shared = _shared_curves(model, dist, density, chi, subject, thermodynamic)
    res = deposited_dose(
        dist,
        subject,
        duration,
        model,
        benchmark_number=benchmark_number,
        benchmark_mass=benchmark_mass,
        thermodynamic=thermodynamic,
        curves=shared,
    )
    xs = _CURVE_SIZES
    if shared is not None:
        dep = shared(xs, density, chi)
    else:
        dep = deposition_curves(model, xs, density, chi, subject, res.thermodynamic)
    fractions = {r: _within_0_1(dep[r]) for r in res.regions}
    overlay_xs = OVERLAY_SIZES
    overlay = {w: distribution_overlay(dist, w) for w in ("number", "mass")}
    warnings = validity_warnings(
        aerosol, subject, model, thermodynamic, res.benchmark, custom_breathing
    )
    return Deposition(
        aerosol=aerosol,
        subject=subject,
        dose=res,
        shares=convention_shares(dist, ("mass", "number")),
        ldsa=lung_deposited_surface_area(res),
        sizes=tuple(xs),
        fractions=fractions,
        overlay_sizes=tuple(overlay_xs),
        overlay=overlay,
        modes=_mode_numbers(aerosol),
        warnings=tuple(warnings + _basis_warnings(aerosol)),
        at_sizes=(
            deposition_at_sizes(model, sizes, desc, subject, res.thermodynamic) if sizes else None
        ),
    )


def _shared_curves(
    model: str,
    dist: Distribution,
    density: float,
    shape_factor: float,
    subject: Subject,
    thermodynamic: str,
) -> Callable[[Sequence[float], float, float], dict[str, list[float]]] | None:
    """The model evaluated once at the curves' sizes and every mode's grid together.

    The grids of lognormal modes lie on the lattice of the curves' sizes
    (:data:`driftdose.distribution.GRID_LATTICE_STEP`), so most of their nodes are sizes of
    the curves: the model (``model``, ``subject``, ``thermodynamic``; ``density``
    [kg/m^3], ``shape_factor`` [-]) runs once over the union of the sizes, and the returned
    function, ``(sizes [m], density, shape_factor) -> {region: fractions [-]}``, picks a
    grid's fractions from it. None for a spectrum or modes of another particle (each
    evaluated on its own).
    """
    sizes = set(_CURVE_SIZES)
    for mode in parts(dist):
        if not isinstance(mode, LognormalMode):
            return None
        if mode.density != density or mode.shape_factor != shape_factor:
            return None
        sizes.update(mode.grid())
    union = sorted(sizes)
    regions = model_regions(model)
    curves = deposition_curves(model, union, density, shape_factor, subject, thermodynamic)
    where = {d: i for i, d in enumerate(union)}

    def at(ds: Sequence[float], rho: float, chi: float) -> dict[str, list[float]]:
        try:
            if rho != density or chi != shape_factor:
                raise KeyError(rho)
            pick = itemgetter(*map(where.__getitem__, ds)) if len(ds) > 1 else None
        except KeyError:  # not among the sizes evaluated: on its own
            return deposition_curves(model, ds, rho, chi, subject, thermodynamic)
        if pick is None:
            return deposition_curves(model, ds, rho, chi, subject, thermodynamic)
        return {r: list(pick(curves[r])) for r in regions}

    return at


def _mode_numbers(aerosol: Aerosol) -> tuple[ModeNumbers, ...]:
    """Per mode: the medians the models use, the MMAD and both concentrations."""
    desc = aerosol.description
    modes = getattr(aerosol.distribution, "modes", ())
    out = []
    for mode, entered in zip(modes, aerosol.modes, strict=True):
        mmd = mode.median("mass")
        out.append(
            ModeNumbers(
                entered=entered,
                converted=is_converted(desc, entered.diameter_type),
                count_median=mode.cmd,
                mass_median=mmd,
                mmad=desc.from_model(mmd, "aerodynamic"),
                number=mode.number_concentration,
                mass=mode.total("mass"),
            )
        )
    return tuple(out)


def _basis_warnings(aerosol: Aerosol) -> list[str]:
    """Notes on the effective-density description, and a check that it is possible."""
    desc, dist = aerosol.description, aerosol.distribution
    if desc.basis != "effective":
        return []
    modes = getattr(dist, "modes", None)
    if modes is not None:
        sizes = [d for m in modes for d in (m.cmd, m.median("mass"))]
    else:
        sizes = [dist.diameters[0], dist.diameters[-1]]
    implied = max(desc.implied_material_density(d) for d in sizes)
    out = [
        "With an effective density the sizes are mobility diameters, and the models use the "
        "sphere with the particles' mobility and mass (DeCarlo et al. 2004); surface areas, "
        "and so the LDSA, are those of that sphere, less than the real surface of an "
        "agglomerate of primary particles. The choice of shape factor in diffusion makes no "
        "difference here: that sphere already has the particles' mobility."
    ]
    if implied > DENSEST_MATERIAL:
        out.append(
            f"The effective density and shape factor do not fit together: with them a particle "
            f"of this size would be made of a material of {implied / 1000.0:.3g} g/cm³, denser "
            "than any element. Check both values."
        )
    return out


def validity_warnings(
    aerosol: Aerosol,
    subject: Subject,
    model: str = "icrp66",
    thermodynamic: str = "icrp66",
    benchmark: dict[str, float] | None = None,
    custom_breathing: bool = False,
) -> list[str]:
    """Warnings about a deposition: validity ranges, assumptions, benchmarks exceeded.

    Parameters
    ----------
    aerosol : Aerosol
        The aerosol in the models' diameters.
    subject : Subject
        The breathing.
    model : str
        ``icrp66`` or ``simplified``.
    thermodynamic : str
        ``icrp66`` or ``mobility`` (sphere of the diffusion terms).
    benchmark : dict or None
        Airborne concentration ÷ benchmark by metric (``number``, ``mass``). [-]
    custom_breathing : bool
        Whether the breathing was given as custom parameters.

    Returns
    -------
    list of str
        The warnings, in the order the page shows them.
    """
    lo, hi = aerosol.size_span()
    out = icrp66_warnings(lo, hi, subject) if model == "icrp66" else simplified_warnings(lo, hi)
    if model == "simplified":
        out.append(
            "The simplified fits describe unit-density spheres averaged over breathing "
            "conditions; for other particles their diffusion terms are entered with the "
            "volume-equivalent (thermodynamic) diameter and their impaction and settling "
            "terms with the aerodynamic diameter, and they ignore the breathing chosen "
            "except for the ventilation."
        )
    desc = aerosol.description
    if thermodynamic == "mobility" and desc.shape_factor != 1.0 and desc.basis == "material":
        out.append(
            "Diffusion is computed with the shape factor in the mobility (mobility-equivalent "
            "sphere); ICRP 66 and its tables use a sphere of the volume-equivalent diameter, "
            "so results for fine particles are lower than the published model's."
        )
    for metric, ratio in (benchmark or {}).items():
        if ratio > 1.0:
            out.append(
                f"The airborne {metric} concentration is {ratio:.3g} times the "
                "benchmark you entered."
            )
    mouth = any(p.nasal_fraction < 1.0 for p, _ in subject.periods)
    if custom_breathing and mouth and model == "icrp66":
        out.append(
            "Part of the air is breathed through the mouth: the mouth deposits fewer coarse "
            "particles than the nose, so more reach the lungs."
        )
    return out
