"""The distribution drawn over the deposition curves: dW/dln d scaled to a peak of 1.

The overlay of the deposition calculation (:func:`distribution_overlay`), at
:data:`OVERLAY_POINTS` sizes over the curves' range. Lognormal modes are summed with their
amounts relative to the largest, so that the shape of a single mode depends on its median and
GSD only, and each mode's shape is kept per median and GSD: an edit of the density or of an
amount computes nothing again where the shape did not change.
"""

from __future__ import annotations

import math
from functools import lru_cache

from .._numerics import logspace
from ..distribution import Distribution, LognormalMode

__all__ = ["OVERLAY_KEPT", "OVERLAY_POINTS", "OVERLAY_SIZES", "distribution_overlay"]

OVERLAY_POINTS = 241
"""Sizes of the distribution drawn over the curves (48 per decade: a narrow mode keeps its
shape; it costs no model evaluation)."""
OVERLAY_SIZES = tuple(logspace(1e-9, 100e-6, OVERLAY_POINTS))
"""The overlay's sizes, 1 nm to 100 um (the deposition curves' range). [m]"""
_OVERLAY_LN = tuple(math.log(d) for d in OVERLAY_SIZES)


def distribution_overlay(dist: Distribution, weight: str) -> tuple[float, ...]:
    """dW/dln d of ``dist`` by ``weight`` at :data:`OVERLAY_POINTS` sizes, peak 1 [-].

    Lognormal modes (Hinds 1999, eq. 4.33 per unit ln d) are summed with their amounts
    relative to the largest: the shape of a single mode then depends on its median and GSD
    only, not on its amount or density, and is computed once for them (the last
    :data:`OVERLAY_KEPT` shapes are kept). A spectrum is computed each time.

    Parameters
    ----------
    dist : LognormalMode, Multimodal or BinnedSpectrum
        The airborne particles (diameters [m]).
    weight : str
        ``number`` or ``mass`` (or ``surface``).

    Returns
    -------
    tuple of float
        The distribution at each overlay size, scaled to a peak of 1 (zeros for an empty
        one). [-]
    """
    modes = getattr(dist, "modes", (dist,) if isinstance(dist, LognormalMode) else None)
    if modes is None:
        ys = dist.density_curve(OVERLAY_SIZES, weight, _OVERLAY_LN)
        top = max(ys) if ys else 0.0
        return tuple(y / top if top > 0 else 0.0 for y in ys)
    amounts = [m.total(weight) / m.ln_gsd for m in modes]
    largest = max(amounts)
    if not largest > 0.0:
        return (0.0,) * len(_OVERLAY_LN)
    return _mode_overlay(
        tuple(
            (a / largest, math.log(m.median(weight)), m.ln_gsd)
            for a, m in zip(amounts, modes, strict=True)
        )
    )


OVERLAY_KEPT = 16
"""Overlay shapes (and mode shapes) :func:`distribution_overlay` keeps."""


@lru_cache(maxsize=OVERLAY_KEPT)
def _mode_overlay(modes: tuple[tuple[float, float, float], ...]) -> tuple[float, ...]:
    """Sum of c exp(-(ln d - ln median)^2 / (2 s^2)) over ``modes`` = ((c, ln median, s)...),
    at the overlay's sizes, scaled to peak 1 (c [-] and s [-]; median [m])."""
    ys: list[float] = []
    for c, lm, s in modes:  # the modes added in order, size by size
        factors = _overlay_factors(lm, s)
        if ys:
            ys = [y + c * g for y, g in zip(ys, factors, strict=True)]
        else:
            ys = [c * g for g in factors]
    top = max(ys)
    return tuple(y / top if top > 0 else 0.0 for y in ys)


@lru_cache(maxsize=OVERLAY_KEPT)
def _overlay_factors(lm: float, s: float) -> tuple[float, ...]:
    """exp(-z^2 / 2), z = (ln d - ``lm``) / ``s``, at the overlay's sizes d [m] (``lm`` the
    log of a median in metres, ``s`` = ln GSD): one mode's shape, kept per median and GSD
    (a mode whose amounts moved relative to another's finds its own kept)."""
    exp = math.exp
    out = []
    for x in _OVERLAY_LN:
        z = (x - lm) / s
        out.append(exp(-0.5 * z * z))
    return tuple(out)
