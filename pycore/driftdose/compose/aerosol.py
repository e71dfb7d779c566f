"""The aerosol as the models see it, from what was entered: lognormal modes or a spectrum.

Each mode's median, and each bin of a measured spectrum, is given as a diameter of a declared
type (volume-equivalent, optical, mobility or aerodynamic). :class:`ParticleDescription`
turns it into the diameter of the sphere the models compute with (volume-equivalent with a
material density, mobility-equivalent with an effective density; DeCarlo et al. 2004); each
mode keeps its GSD and becomes a Hatch–Choate lognormal mode by count or by mass.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, replace

from ..constants import P_DEFAULT, T_DEFAULT
from ..diameters import ParticleDescription
from ..distribution import BinnedSpectrum, LognormalMode, Multimodal

__all__ = [
    "Aerosol",
    "ModeSpec",
    "aerosol_from_modes",
    "aerosol_from_spectrum",
    "is_converted",
    "scaled_modes",
]

T_MEASURED = T_DEFAULT
"""Air temperature at which measured diameters are converted: 20 °C. [K]"""
P_MEASURED = P_DEFAULT
"""Air pressure at which measured diameters are converted: 1 atm. [Pa]"""


@dataclass(frozen=True)
class ModeSpec:
    """One lognormal mode as entered.

    Attributes
    ----------
    basis : str
        ``number`` (the median is a count median, the concentration a number concentration)
        or ``mass`` (mass median, mass concentration).
    median : float
        Median diameter, of the type ``diameter_type``. [m]
    diameter_type : str
        ``volume_equivalent``, ``optical``, ``mobility`` or ``aerodynamic``.
    gsd : float
        Geometric standard deviation, above 1. [-]
    concentration : float
        Number concentration [1/m^3] for a number mode, mass concentration [kg/m^3] for a
        mass mode.
    """

    basis: str
    median: float
    diameter_type: str
    gsd: float
    concentration: float


@dataclass(frozen=True)
class Aerosol:
    """An aerosol in the models' diameters.

    Attributes
    ----------
    distribution : Multimodal or BinnedSpectrum
        The size distribution on the models' size axis (``description.coordinate``):
        diameters [m], number concentrations [1/m^3].
    description : ParticleDescription
        The particles (density [kg/m^3], shape factor [-], density basis).
    modes : tuple of ModeSpec
        The modes as entered (empty for a spectrum).
    spectrum_diameter_type : str or None
        The diameter type of the spectrum's bins as measured (None for modes).
    """

    distribution: Multimodal | BinnedSpectrum
    description: ParticleDescription
    modes: tuple[ModeSpec, ...] = ()
    spectrum_diameter_type: str | None = None

    def size_span(self) -> tuple[float, float]:
        """Smallest and largest size that carries the aerosol, on the models' axis.

        Returns
        -------
        tuple of float
            For modes, the size below which 0.05 % of the number and above which 0.05 % of
            the mass lie (median ÷ GSD^3.29 and × GSD^3.29, the 99.9 % two-sided range of a
            normal variable in ln d, common practice); for a spectrum its outer bin edges. [m]
        """
        dist = self.distribution
        if isinstance(dist, Multimodal):
            lo = min(m.median("number") / m.gsd**3.29 for m in dist.modes)
            hi = max(m.median("mass") * m.gsd**3.29 for m in dist.modes)
            return lo, hi
        return dist.edges[0], dist.edges[-1]

    def mobility_used(self) -> bool:
        """Whether a mobility diameter was entered or the effective-density basis is used."""
        return (
            self.description.basis == "effective"
            or any(m.diameter_type == "mobility" for m in self.modes)
            or self.spectrum_diameter_type == "mobility"
        )


def is_converted(description: ParticleDescription, diameter_type: str) -> bool:
    """Whether a diameter of ``diameter_type`` differs from the models' diameter.

    Parameters
    ----------
    description : ParticleDescription
        The particles; its ``coordinate`` is the models' diameter type.
    diameter_type : str
        Type of the diameter entered (an optical diameter is taken as volume-equivalent).

    Returns
    -------
    bool
        True when :meth:`ParticleDescription.to_model` changes the diameter.
    """
    coordinate = description.coordinate
    return diameter_type != coordinate and not (
        coordinate == "volume_equivalent" and diameter_type == "optical"
    )


def aerosol_from_modes(modes: Sequence[ModeSpec], description: ParticleDescription) -> Aerosol:
    """Lognormal modes in the models' diameters.

    Parameters
    ----------
    modes : sequence of ModeSpec
        One to ``distribution.MAX_MODES`` modes as entered (medians [m], concentrations
        [1/m^3] or [kg/m^3]).
    description : ParticleDescription
        The particles (density [kg/m^3], shape factor [-], density basis).

    Returns
    -------
    Aerosol
        A :class:`Multimodal` of Hatch–Choate modes (Hatch & Choate 1929) whose medians are
        converted at 20 °C and 1 atm; each GSD is kept.

    Raises
    ------
    ValueError
        For a mode no lognormal can describe (checked by the distribution classes).
    """
    rho, chi = description.model_density, description.model_shape_factor
    built = []
    for m in modes:
        d_model = description.to_model(m.median, m.diameter_type, T_MEASURED, P_MEASURED)
        make = LognormalMode.from_number if m.basis == "number" else LognormalMode.from_mass
        built.append(make(d_model, m.gsd, m.concentration, rho, chi))
    return Aerosol(Multimodal(tuple(built)), description, tuple(modes))


def scaled_modes(
    modes: Sequence[ModeSpec],
    median: float = 1.0,
    gsd: float = 1.0,
    concentration: float = 1.0,
) -> tuple[ModeSpec, ...]:
    """The modes with every median, GSD and concentration multiplied by a factor.

    Parameters
    ----------
    modes : sequence of ModeSpec
        Modes as entered.
    median : float
        Factor on each median. [-]
    gsd : float
        Factor on each GSD. [-]
    concentration : float
        Factor on each concentration. [-]

    Returns
    -------
    tuple of ModeSpec
        The scaled modes.
    """
    return tuple(
        replace(
            m,
            median=m.median * median,
            gsd=m.gsd * gsd,
            concentration=m.concentration * concentration,
        )
        for m in modes
    )


def aerosol_from_spectrum(
    diameters: Sequence[float],
    numbers: Sequence[float],
    diameter_type: str,
    description: ParticleDescription,
    T: float = T_MEASURED,
    P: float = P_MEASURED,
) -> Aerosol:
    """A measured spectrum in the models' diameters.

    Each bin keeps its particles; its mid-point is converted from ``diameter_type`` by
    :meth:`ParticleDescription.to_model`, which is monotone, so the bins stay in order.

    Parameters
    ----------
    diameters : sequence of float
        Bin mid-point diameters as measured, increasing. [m]
    numbers : sequence of float
        Particles per bin. [1/m^3]
    diameter_type : str
        Type of the measured diameters.
    description : ParticleDescription
        The particles (density [kg/m^3], shape factor [-], density basis).
    T : float
        Air temperature at which the diameters were measured. [K]
    P : float
        Air pressure at which the diameters were measured. [Pa]

    Returns
    -------
    Aerosol
        A :class:`BinnedSpectrum` on the models' size axis.

    Raises
    ------
    ValueError
        When two bins fall on the same size after the conversion.
    """
    d = tuple(diameters)
    if is_converted(description, diameter_type):
        d = tuple(description.to_model(x, diameter_type, T, P) for x in d)
    dist = BinnedSpectrum(
        d, tuple(numbers), description.model_density, description.model_shape_factor
    )
    return Aerosol(dist, description, (), diameter_type)
