"""Regional deposition of inhaled particles in the human respiratory tract.

Modules: :mod:`.models` (the registry of deposition models, each with its regions and
validity range: :data:`DEPOSITION_MODELS`, :func:`deposition_model`,
:func:`deposition_curves`), :mod:`.icrp66` (the full ICRP Publication 66 regional model:
:func:`icrp66` at one size, :func:`icrp66_curves` at many, :func:`icrp66_lognormal` for a
lognormal aerosol by AMAD), :mod:`.simplified` (the algebraic fits of Hinds 1999,
:func:`simplified_icrp`), :mod:`.breathing` (breathing of the ICRP reference adult:
:data:`ACTIVITIES`, :func:`activity`, :func:`reference_worker`, :data:`REFERENCE_WORKER`,
:class:`BreathingPattern`, :class:`Subject`).
"""

from __future__ import annotations

from .breathing import (
    ACTIVITIES,
    REFERENCE_WORKER,
    ROUTES,
    BreathingPattern,
    Subject,
    activity,
    breathing_warnings,
    reference_worker,
)
from .icrp66 import REGIONS, icrp66, icrp66_curves, icrp66_lognormal, inhalability
from .models import DEPOSITION_MODELS, DepositionModel, deposition_curves, deposition_model
from .simplified import simplified_icrp

__all__ = [
    "ACTIVITIES",
    "DEPOSITION_MODELS",
    "REFERENCE_WORKER",
    "REGIONS",
    "ROUTES",
    "BreathingPattern",
    "DepositionModel",
    "Subject",
    "activity",
    "breathing_warnings",
    "deposition_curves",
    "deposition_model",
    "icrp66",
    "icrp66_curves",
    "icrp66_lognormal",
    "inhalability",
    "reference_worker",
    "simplified_icrp",
]
