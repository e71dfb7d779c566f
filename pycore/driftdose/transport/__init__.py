"""Sampling-line and stage penetration: what fraction of each particle size gets through.

Stable interfaces (SI units; defaults 293.15 K and 101325 Pa):

- :func:`tube_diffusion_penetration` ``(d, length, flow, T, P)``: laminar tube diffusion
  (Gormley & Kennedy 1949);
- :func:`screen_penetration` ``(d, wire_diameter, solidity, thickness, face_velocity,
  n_screens, T, P)``: wire screens as a fan-model filter (Cheng & Yeh 1980);
- :func:`impactor_cut_diameter` ``(nozzle_diameter, flow, n_nozzles, density, jet, T, P)``:
  impactor cut size with slip solved consistently (Marple & Willeke 1976).

Modules: :mod:`.tube` (diffusion, laminar and turbulent), :mod:`.settling` (gravitational
settling in horizontal and inclined tubes), :mod:`.bend` (inertial loss in bends),
:mod:`.cyclone` (penetration curves; the ISO 7708 curves come from
:mod:`driftdose.conventions`), :mod:`.impactor`, :mod:`.screen`, :mod:`.stages` and
:mod:`.selectors` (the stage classes), :mod:`.chain` (stages composed in order; spectrum
correction), :mod:`.kinds` (the registry of stage kinds, from which stages are built by key).
"""

from __future__ import annotations

from .bend import bend_penetration, bend_stokes_number
from .chain import (
    Bend,
    Chain,
    ChainResult,
    CorrectedSpectrum,
    Cyclone,
    Impactor,
    ScreenStack,
    StageInputError,
    StageReport,
    Tube,
    correct_spectrum,
)
from .cyclone import cyclone_penetration, lognormal_penetration
from .impactor import (
    impactor_cut_diameter,
    impactor_efficiency,
    impactor_penetration,
    impactor_stokes_number,
)
from .kinds import STAGE_KINDS, StageKind, build_stage
from .screen import screen_penetration, single_wire_efficiency
from .settling import tube_settling_penetration
from .tube import (
    tube_diffusion_penetration,
    tube_diffusion_penetration_any,
    tube_diffusion_penetration_friedlander1977,
)

__all__ = [
    "STAGE_KINDS",
    "Bend",
    "Chain",
    "ChainResult",
    "CorrectedSpectrum",
    "Cyclone",
    "Impactor",
    "ScreenStack",
    "StageInputError",
    "StageKind",
    "StageReport",
    "Tube",
    "bend_penetration",
    "bend_stokes_number",
    "build_stage",
    "correct_spectrum",
    "cyclone_penetration",
    "impactor_cut_diameter",
    "impactor_efficiency",
    "impactor_penetration",
    "impactor_stokes_number",
    "lognormal_penetration",
    "screen_penetration",
    "single_wire_efficiency",
    "tube_diffusion_penetration",
    "tube_diffusion_penetration_any",
    "tube_diffusion_penetration_friedlander1977",
    "tube_settling_penetration",
]
