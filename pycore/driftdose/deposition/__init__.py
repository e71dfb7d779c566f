"""Regional deposition of inhaled particles in the human respiratory tract.

Stable names: :func:`simplified_icrp` (the algebraic fits of Hinds 1999 to the ICRP 66
model), :func:`icrp66` (the full ICRP Publication 66 regional model, one size),
:func:`icrp66_curves` (the same at many sizes, fast), :func:`icrp66_lognormal` (fractions
of inhaled activity for a lognormal aerosol by AMAD). Breathing data: :data:`ACTIVITIES`,
:func:`activity`, :func:`reference_worker`, :data:`REFERENCE_WORKER`,
:class:`BreathingPattern`, :class:`Subject`.
"""

from __future__ import annotations

from .icrp66 import (
    ACTIVITIES,
    REFERENCE_WORKER,
    REGIONS,
    ROUTES,
    BreathingPattern,
    Subject,
    activity,
    icrp66,
    icrp66_curves,
    icrp66_lognormal,
    inhalability,
    reference_worker,
)
from .simplified import simplified_icrp

__all__ = [
    "ACTIVITIES",
    "REFERENCE_WORKER",
    "REGIONS",
    "ROUTES",
    "BreathingPattern",
    "Subject",
    "activity",
    "icrp66",
    "icrp66_curves",
    "icrp66_lognormal",
    "inhalability",
    "reference_worker",
    "simplified_icrp",
]
