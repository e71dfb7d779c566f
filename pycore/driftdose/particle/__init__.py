"""Motion of single aerosol particles in air: slip, mobility, diffusion, settling, inertia.

Interfaces (stable names, SI units, defaults 293.15 K and 101325 Pa):
:func:`slip_correction`, :func:`mobility`, :func:`diffusion_coefficient`,
:func:`relaxation_time`, :func:`settling_velocity`, :func:`stopping_distance`,
:func:`aerodynamic_diameter`, :func:`volume_equivalent_diameter`,
:func:`rms_displacement`, :func:`settling_distance`, :func:`crossover_diameter`,
:func:`brownian_time`, :func:`settling_time`.

Correlations: slip correction by Kim et al. (2005) or Allen & Raabe (1985); drag beyond
the Stokes regime by Clift & Gauvin (1970) (default, to Re 3e5) or Schiller & Naumann (1933)
(to Re 800); stopping distance by integrating the equation of motion with the same drag
law, or by Hinds's closed forms (Stokes and Klyachko, Hinds 1999 eqs. 5.19 and 5.27).

Diameters are volume-equivalent unless the name says aerodynamic. Buoyancy of the particle
in air is neglected (particle density >> gas density; common practice).

One module per topic, every name re-exported here:

- :mod:`.slip`: Knudsen number, slip correction and its coefficient sets;
- :mod:`.diffusion`: mechanical mobility, diffusion coefficient, relaxation time;
- :mod:`.drag`: particle Reynolds number, drag factors beyond Stokes's law, their ranges;
- :mod:`.settling`: terminal settling velocity, its warnings and regime names;
- :mod:`.stopping`: stopping distance (equation of motion; Hinds's closed forms);
- :mod:`.equivalent`: aerodynamic, volume-equivalent and mobility diameters;
- :mod:`.distances`: Brownian and settling distances and times, crossover diameter;
- :mod:`.grid`: all of these properties at every size of a grid, computed once and kept.
"""

from __future__ import annotations

from .diffusion import diffusion_coefficient, mobility, relaxation_time
from .distances import (
    brownian_time,
    crossover_diameter,
    rms_displacement,
    settling_distance,
    settling_time,
)
from .drag import (
    CLIFT_GAUVIN_RE_MAX,
    SCHILLER_NAUMANN_RE_MAX,
    STOKES_RE_MAX,
    drag_factor_clift_gauvin1970,
    drag_factor_schiller_naumann1933,
    reynolds_number,
)
from .equivalent import (
    aerodynamic_diameter,
    aerodynamic_diameters,
    mobility_diameter,
    volume_equivalent_diameter,
    volume_equivalent_diameters,
)
from .grid import ParticleGrid, particle_grid
from .settling import (
    SETTLING_MODELS,
    settling_regime,
    settling_velocity,
    settling_velocity_clift_gauvin1970,
    settling_velocity_schiller_naumann1933,
    settling_velocity_stokes,
    settling_warnings,
)
from .slip import SLIP_MODELS, knudsen_number, slip_correction
from .stopping import (
    STOKES_STOPPING_RE_MAX,
    stopping_distance,
    stopping_distance_klyachko,
    stopping_regime,
)

__all__ = [
    "CLIFT_GAUVIN_RE_MAX",
    "SCHILLER_NAUMANN_RE_MAX",
    "SETTLING_MODELS",
    "SLIP_MODELS",
    "STOKES_RE_MAX",
    "STOKES_STOPPING_RE_MAX",
    "ParticleGrid",
    "aerodynamic_diameter",
    "aerodynamic_diameters",
    "brownian_time",
    "crossover_diameter",
    "diffusion_coefficient",
    "drag_factor_clift_gauvin1970",
    "drag_factor_schiller_naumann1933",
    "knudsen_number",
    "mobility",
    "mobility_diameter",
    "particle_grid",
    "relaxation_time",
    "reynolds_number",
    "rms_displacement",
    "settling_distance",
    "settling_regime",
    "settling_time",
    "settling_velocity",
    "settling_velocity_clift_gauvin1970",
    "settling_velocity_schiller_naumann1933",
    "settling_velocity_stokes",
    "settling_warnings",
    "slip_correction",
    "stopping_distance",
    "stopping_distance_klyachko",
    "stopping_regime",
    "volume_equivalent_diameter",
    "volume_equivalent_diameters",
]
