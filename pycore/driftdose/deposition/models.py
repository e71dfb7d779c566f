"""The registry of regional deposition models, each with its regions and validity range.

:data:`DEPOSITION_MODELS` maps a model key to a :class:`DepositionModel`: ``icrp66`` (the full
ICRP Publication 66 model, :mod:`.icrp66`) and ``simplified`` (the algebraic fits of Hinds
1999, :mod:`.simplified`). Each entry carries its region keys, the size range its source
states (:attr:`DepositionModel.d_min`, :attr:`DepositionModel.d_max`), the bibliography keys
of :mod:`driftdose.sources`, and two functions: the deposition fractions at many sizes and the
warnings for a size range and a breathing pattern. :func:`deposition_curves` and
:func:`deposition_model` dispatch by key; an unknown key raises ``ValueError``.
"""

from __future__ import annotations

from collections import OrderedDict
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from .. import particle
from . import simplified as _simplified
from .breathing import Subject
from .icrp66 import D_MAX as ICRP66_D_MAX
from .icrp66 import D_MIN as ICRP66_D_MIN
from .icrp66 import REGIONS as ICRP66_REGIONS
from .icrp66 import THERMODYNAMIC_CONVENTIONS, icrp66_curves
from .icrp66 import warnings_for as icrp66_warnings

__all__ = [
    "DEPOSITION_MODELS",
    "DepositionModel",
    "deposition_curves",
    "deposition_model",
    "simplified_curves",
]

Curves = Callable[[Sequence[float], float, float, Subject, str], dict[str, list[float]]]
Warnings = Callable[[float, float, "Subject | None"], list[str]]


@dataclass(frozen=True)
class DepositionModel:
    """One regional deposition model.

    Attributes
    ----------
    key : str
        Registry key.
    label : str
        Name for people.
    regions : tuple of str
        Region keys, ``total`` last.
    d_min, d_max : float
        Smallest and largest diameter of the range the model's source states. [m]
    sources : tuple of str
        Keys of :data:`driftdose.sources.SOURCES`.
    curves : callable
        ``curves(diameters, density, shape_factor, subject, thermodynamic)``: fractions of
        the particles in the ambient air deposited in each region [-] at volume-equivalent
        ``diameters`` [m], density [kg/m^3], shape factor [-].
    warnings : callable
        ``warnings(d_min, d_max, subject)``: sentences for sizes [m] outside the range and
        breathing far from the model's.

    """

    key: str
    label: str
    regions: tuple[str, ...]
    d_min: float
    d_max: float
    sources: tuple[str, ...]
    curves: Curves
    warnings: Warnings


def simplified_curves(
    diameters: Sequence[float],
    density: float,
    shape_factor: float,
    subject: Subject | None = None,
    thermodynamic: str = "icrp66",
) -> dict[str, list[float]]:
    """Simplified fits (Hinds 1999, eqs. 11.1-11.5) at many volume-equivalent sizes.

    Parameters
    ----------
    diameters : sequence of float
        Volume-equivalent diameters. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]
    subject : Subject, optional
        Ignored: the fits average over their own breathing conditions (Hinds 1999, §11.4).
    thermodynamic : str
        ``icrp66``: diffusion terms on the volume-equivalent diameter; ``mobility``: on the
        mobility diameter (:func:`driftdose.particle.mobility_diameter`).

    Returns
    -------
    dict
        ``head_airways``, ``tracheobronchial``, ``alveolar``, ``total``: lists of
        fractions [-], one per diameter.

    Notes
    -----
    Diffusion terms on the thermodynamic diameter, inertial terms and inhalability on the
    aerodynamic one (Hinds 1999, eq. 3.30 with slip); see
    :func:`~driftdose.deposition.simplified.simplified_icrp`.

    """
    keys = (*_simplified.REGIONS, "total")
    out: dict[str, list[float]] = {k: [] for k in keys}
    for d in diameters:
        d_ae = particle.aerodynamic_diameter(d, density, shape_factor)
        d_th = d if thermodynamic == "icrp66" else particle.mobility_diameter(d, shape_factor)
        r = _simplified.simplified_icrp(d_th, d_ae)
        for k in keys:
            out[k].append(r[k])
    return out


def _icrp66_curves(
    diameters: Sequence[float],
    density: float,
    shape_factor: float,
    subject: Subject,
    thermodynamic: str,
) -> dict[str, list[float]]:
    return icrp66_curves(diameters, density, shape_factor, subject, thermodynamic=thermodynamic)


def _simplified_warnings(d_min: float, d_max: float, subject: Subject | None) -> list[str]:
    return _simplified.validity_warnings(d_min, d_max)


DEPOSITION_MODELS: dict[str, DepositionModel] = {
    m.key: m
    for m in (
        DepositionModel(
            "icrp66",
            "ICRP 66 regional model",
            (*ICRP66_REGIONS, "total"),
            ICRP66_D_MIN,
            ICRP66_D_MAX,
            ("icrp66", "icrp68"),
            _icrp66_curves,
            icrp66_warnings,
        ),
        DepositionModel(
            "simplified",
            "Simplified fits to ICRP 66 (Hinds 1999)",
            (*_simplified.REGIONS, "total"),
            _simplified.D_MIN,
            _simplified.D_MAX,
            ("hinds1999_ch11", "icrp66"),
            simplified_curves,
            _simplified_warnings,
        ),
    )
}
"""Deposition models by key."""


def deposition_model(key: str) -> DepositionModel:
    """Return the registry entry of deposition model ``key``.

    Parameters
    ----------
    key : str
        ``icrp66`` or ``simplified`` (the keys of :data:`DEPOSITION_MODELS`).

    Returns
    -------
    DepositionModel
        Its regions, validity range [m], sources and functions.

    Examples
    --------
    >>> m = deposition_model("simplified")
    >>> m.regions[-1], m.d_min, m.d_max
    ('total', 1e-09, 0.0001)

    """
    try:
        return DEPOSITION_MODELS[key]
    except KeyError:
        raise ValueError(f"unknown model {key!r}; valid: {', '.join(DEPOSITION_MODELS)}") from None


def deposition_curves(
    model: str,
    diameters: Sequence[float],
    density: float,
    shape_factor: float,
    subject: Subject,
    thermodynamic: str = "icrp66",
) -> dict[str, list[float]]:
    """Deposition fractions of a model at volume-equivalent ``diameters`` (by region).

    Parameters
    ----------
    model : str
        A key of :data:`DEPOSITION_MODELS`.
    diameters : sequence of float
        Volume-equivalent diameters. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]
    subject : Subject
        Breathing (used by ``icrp66``).
    thermodynamic : str
        How the shape factor enters diffusion: ``icrp66`` (published convention, default)
        or ``mobility`` (see :mod:`driftdose.deposition.icrp66`).

    Returns
    -------
    dict
        The model's region keys (``total`` included): lists of fractions of the particles
        in the ambient air [-], one per diameter (fresh lists the caller may change).

    Notes
    -----
    The curves depend only on the arguments, so the last :data:`CURVE_CACHE_SIZE` are kept,
    keyed by all of them (the diameters as a tuple): a page that changes only the amounts,
    medians or spreads of an aerosol, or the exposure duration, gets the chart's curve back
    without evaluating the model again.

    """
    if thermodynamic not in THERMODYNAMIC_CONVENTIONS:
        raise ValueError(
            f"unknown thermodynamic convention {thermodynamic!r}; valid: "
            + ", ".join(THERMODYNAMIC_CONVENTIONS)
        )
    entry = deposition_model(model)
    key: tuple | None = (model, tuple(diameters), density, shape_factor, subject, thermodynamic)
    try:
        kept = _curve_cache.get(key)
    except TypeError:  # a subject with unhashable parts: computed, not kept
        key = kept = None
    if kept is not None:
        _curve_cache.move_to_end(key)
        return {k: list(v) for k, v in kept.items()}
    curves = entry.curves(diameters, density, shape_factor, subject, thermodynamic)
    if key is not None:
        _curve_cache[key] = {k: tuple(v) for k, v in curves.items()}
        while len(_curve_cache) > CURVE_CACHE_SIZE:
            _curve_cache.popitem(last=False)
    return curves


CURVE_CACHE_SIZE = 24
"""Deposition curves kept by :func:`deposition_curves` (least recently used dropped first)."""

_curve_cache: OrderedDict[tuple, dict[str, tuple[float, ...]]] = OrderedDict()
