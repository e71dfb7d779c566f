"""Particle size distributions: lognormal modes, multimodal sums, binned measured spectra.

Interfaces: :class:`LognormalMode` (count- or mass-based, converted with the Hatch–Choate
equations), :class:`Multimodal` (a sum of up to four modes), :class:`BinnedSpectrum` (a
measured spectrum as numbers per bin), and :func:`integrate`, which integrates any per-size
quantity over a distribution weighted by number, surface area or mass.

Every distribution is described by its volume-equivalent (geometric) diameter ``d`` [m], a
particle density [kg/m^3] and a dynamic shape factor [-]; the aerodynamic diameter of each
size is derived from them where a model needs it. Each distribution offers
``quadrature(weight)``: a list of (diameter [m], weight) pairs such that
``sum(w * f(d))`` approximates the integral of ``f`` over the distribution, in
[1/m^3] (number), [m^2/m^3] (surface area) or [kg/m^3] (mass).

Numerics: a lognormal mode is integrated by the trapezoidal rule on a uniform grid in ln d
that covers the number, surface and mass distributions alike (so a model is evaluated once
per size for all three weights); for a Gaussian weight the rule converges exponentially,
and the tests check 1e-6 relative agreement with ``scipy.integrate.quad``. Gauss–Hermite
nodes (:func:`gauss_hermite`, from :mod:`driftdose._numerics`) are offered for integrals of
narrow, smooth integrands.
Surface area and mass assume spheres of the volume-equivalent diameter.
"""

from __future__ import annotations

import bisect
import itertools
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from functools import lru_cache

from ._numerics import gauss_hermite

__all__ = [
    "GRID_LATTICE_STEP",
    "GRID_SPAN",
    "GRID_STEP_MAX",
    "GSD_MAX",
    "MAX_MODES",
    "WEIGHTS",
    "BinnedSpectrum",
    "LognormalMode",
    "Multimodal",
    "gauss_hermite",
    "hatch_choate_median",
    "integrate",
    "lognormal_pdf_ln",
    "parts",
]

WEIGHTS = ("number", "surface", "mass")
"""Valid ``weight`` keys: by number [1/m^3], surface area [m^2/m^3] or mass [kg/m^3]."""

MAX_MODES = 4
"""Largest number of lognormal modes a :class:`Multimodal` holds."""

GSD_MAX = 5.0
"""Largest geometric standard deviation accepted as plausible for one mode. [-]"""

GRID_STEP_MAX = 0.2
"""Largest ln-d step of a lognormal mode's integration grid. [-]

The deposition fractions vary on a scale of their own in ln d, whatever the width of the
mode: the trapezoidal rule with steps up to 0.2 keeps deposited fractions above 1e-4 within
2e-10 of a grid of step 0.0025 over GSDs 1.05 to 5 (0.25 gave 7e-9, 0.3 gave 1e-7)."""

GRID_LATTICE_STEP = math.log(10.0) / 24.0
"""Step in ln d of the deposition curves' sizes (24 per decade). A mode's integration step is
this times a power of 2, so that its nodes and the curves' sizes lie on one lattice and the
models are evaluated once at the sizes both need. [-]"""

GRID_SPAN = 7.0
"""Standard deviations of the integration grid below the count median and above the mass
median: the weight outside is below 1.3e-12 of the total. [-]"""

_MOMENT = {"number": 0, "surface": 2, "mass": 3}


def hatch_choate_median(cmd: float, gsd: float, q: float) -> float:
    """Median diameter of the q-th-moment distribution of a lognormal count distribution.

    Parameters
    ----------
    cmd : float
        Count median diameter. [m]
    gsd : float
        Geometric standard deviation. [-]
    q : float
        Moment: 2 for the surface-area median, 3 for the mass (volume) median. [-]

    Returns
    -------
    float
        Median of the q-weighted distribution, CMD exp(q ln^2 GSD). [m]

    Notes
    -----
    Hatch & Choate (1929), J. Franklin Inst. 207:369-387; Hinds (1999), eq. 4.47.

    Examples
    --------
    A count median of 1 um and GSD 2 gives a mass median of 1 um x exp(3 ln^2 2), about
    4.23 um:

    >>> round(hatch_choate_median(1e-6, 2.0, 3) * 1e6, 2)
    4.23

    """
    return cmd * math.exp(q * math.log(gsd) ** 2)


def lognormal_pdf_ln(d: float, median: float, gsd: float) -> float:
    """Lognormal probability density per unit ln d, df/dln d. [-]

    Parameters
    ----------
    d : float
        Diameter. [m]
    median : float
        Median diameter. [m]
    gsd : float
        Geometric standard deviation. [-]

    Returns
    -------
    float
        exp(-(ln d - ln median)^2 / (2 ln^2 gsd)) / (sqrt(2 pi) ln gsd) (Hinds 1999, eq. 4.33
        per unit ln d). [-]

    """
    s = math.log(gsd)
    z = (math.log(d) - math.log(median)) / s
    return math.exp(-0.5 * z * z) / (math.sqrt(2.0 * math.pi) * s)


def _check_weight(weight: str) -> int:
    try:
        return _MOMENT[weight]
    except KeyError:
        raise ValueError(f"unknown weight {weight!r}; valid: {', '.join(WEIGHTS)}") from None


@dataclass(frozen=True)
class LognormalMode:
    """One lognormal mode of a particle population, held by number.

    Attributes
    ----------
    cmd : float
        Count median (volume-equivalent) diameter. [m]
    gsd : float
        Geometric standard deviation, > 1. [-]
    number_concentration : float
        Particles per volume of air. [1/m^3]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]

    """

    cmd: float
    gsd: float
    number_concentration: float
    density: float = 1000.0
    shape_factor: float = 1.0

    def __post_init__(self) -> None:
        """Reject values no lognormal mode can have."""
        if not (self.cmd > 0.0 and math.isfinite(self.cmd)):
            raise ValueError("cmd must be positive")
        if not (self.gsd > 1.0 and math.isfinite(self.gsd)):
            raise ValueError("gsd must be greater than 1")
        if not (self.number_concentration >= 0.0 and math.isfinite(self.number_concentration)):
            raise ValueError("number_concentration must be non-negative")
        if not self.density > 0.0:
            raise ValueError("density must be positive")

    @classmethod
    def from_number(
        cls,
        cmd: float,
        gsd: float,
        number_concentration: float,
        density: float = 1000.0,
        shape_factor: float = 1.0,
    ) -> LognormalMode:
        """Build a mode from its count median diameter [m] and number concentration [1/m^3]."""
        return cls(cmd, gsd, number_concentration, density, shape_factor)

    @classmethod
    def from_mass(
        cls,
        mmd: float,
        gsd: float,
        mass_concentration: float,
        density: float,
        shape_factor: float = 1.0,
    ) -> LognormalMode:
        """Build a mode from its mass median (volume-equivalent) diameter and mass.

        Parameters
        ----------
        mmd : float
            Mass median volume-equivalent diameter. [m]
        gsd : float
            Geometric standard deviation. [-]
        mass_concentration : float
            Mass of particles per volume of air. [kg/m^3]
        density : float
            Particle density. [kg/m^3]
        shape_factor : float
            Dynamic shape factor. [-]

        Returns
        -------
        LognormalMode
            The same population held by number.

        Notes
        -----
        Hatch & Choate (1929): CMD = MMD exp(-3 ln^2 GSD); the mean particle mass is
        rho (pi/6) CMD^3 exp(4.5 ln^2 GSD) (Hinds 1999, eqs. 4.47 and 4.52), so
        N = M / [rho (pi/6) CMD^3 exp(4.5 ln^2 GSD)]. A mass median *aerodynamic* diameter
        is converted to a volume-equivalent one by the caller (``particle
        .volume_equivalent_diameter``); with slip this holds exactly at the median only.

        """
        if not (mmd > 0.0 and gsd > 1.0):
            raise ValueError("mmd must be positive and gsd greater than 1")
        if not (mass_concentration >= 0.0 and math.isfinite(mass_concentration)):
            raise ValueError("mass_concentration must be non-negative")
        cmd = hatch_choate_median(mmd, gsd, -3.0)
        mean_mass = density * math.pi / 6.0 * cmd**3 * math.exp(4.5 * math.log(gsd) ** 2)
        return cls(cmd, gsd, mass_concentration / mean_mass, density, shape_factor)

    @property
    def ln_gsd(self) -> float:
        """Natural log of the GSD. [-]"""
        return math.log(self.gsd)

    def median(self, weight: str = "number") -> float:
        """Median diameter of the number, surface-area or mass distribution. [m]"""
        return hatch_choate_median(self.cmd, self.gsd, _check_weight(weight))

    def moment(self, q: float) -> float:
        """Raw moment N <d^q> = N CMD^q exp(q^2 ln^2 GSD / 2) (Hinds 1999, eq. 4.51). [m^q/m^3]"""
        return self.number_concentration * self.cmd**q * math.exp(0.5 * (q * self.ln_gsd) ** 2)

    def total(self, weight: str = "number") -> float:
        """Total number [1/m^3], surface area [m^2/m^3] or mass [kg/m^3] per volume of air."""
        q = _check_weight(weight)
        if q == 0:
            return self.number_concentration
        if q == 2:
            return math.pi * self.moment(2)
        return self.density * math.pi / 6.0 * self.moment(3)

    @property
    def mass_concentration(self) -> float:
        """Mass per volume of air. [kg/m^3]"""
        return self.total("mass")

    def step(self) -> float:
        """Default ln-d step of the integration grid [-].

        The largest :data:`GRID_LATTICE_STEP` times a power of 2 (0.192, 0.096, 0.048, ...)
        not above min(ln GSD / 3, :data:`GRID_STEP_MAX`): never coarser than that rule, whose
        accuracy ``tests/core/test_dose.py`` checks, and on the lattice of the deposition
        curves' sizes.
        """
        limit = min(self.ln_gsd / 3.0, GRID_STEP_MAX)
        h = 2.0 * GRID_LATTICE_STEP
        while h > limit:
            h *= 0.5
        return h

    def _lattice(self, step: float | None) -> tuple[float, range]:
        """The grid's step h [-] and the integers k of its nodes ln d = k h (see :meth:`grid`)."""
        s = self.ln_gsd
        h = step or self.step()
        lo = math.log(self.cmd) - GRID_SPAN * s
        hi = math.log(self.cmd) + 3.0 * s * s + GRID_SPAN * s
        return h, range(math.floor(lo / h), math.ceil(hi / h) + 1)

    def grid(self, step: float | None = None) -> list[float]:
        """Diameters [m] of the integration grid shared by all three weights.

        Uniform in ln d with ``step`` (default :meth:`step`), from :data:`GRID_SPAN` standard
        deviations below the count median to as many above the mass median, its nodes on
        the lattice ln d = k h (k an integer): a mode whose median moves keeps the nodes the
        two positions share, so per-size terms computed before can be reused. With the
        default step, deposited fractions above 1e-4 agree to 1e-8 with a grid of step
        0.0025 (measured: below 2e-10; ``tests/core/test_dose.py``).
        """
        h, ks = self._lattice(step)
        return list(_lattice_sizes(h, ks.start, ks.stop))

    def quadrature(
        self, weight: str = "number", step: float | None = None
    ) -> list[tuple[float, float]]:
        """(diameter [m], weight) pairs integrating over this mode by ``weight``.

        Trapezoidal rule on the uniform ln-d grid of :meth:`grid`. For a Gaussian in ln d
        the rule converges exponentially (error of order exp(-2 pi^2 s^2 / h^2)); for
        smooth per-size quantities the tests check 1e-6 against scipy's ``quad``.
        """
        total = self.total(weight)
        lm = math.log(self.median(weight))
        s = self.ln_gsd
        h, ks = self._lattice(step)
        c = total * h / (math.sqrt(2.0 * math.pi) * s)
        sizes = _lattice_sizes(h, ks.start, ks.stop)
        return [(d, c * g) for d, g in zip(sizes, _lattice_gauss(lm, s, h, ks), strict=True)]

    def quadrature_weights(self, weight: str = "number", step: float | None = None) -> list[float]:
        """The weights of :meth:`quadrature` alone (the same numbers), in the grid's order. [-]"""
        total = self.total(weight)
        lm = math.log(self.median(weight))
        s = self.ln_gsd
        h, ks = self._lattice(step)
        c = total * h / (math.sqrt(2.0 * math.pi) * s)
        return [c * g for g in _lattice_gauss(lm, s, h, ks)]

    def density_per_ln_d(self, d: float, weight: str = "number") -> float:
        """dW/dln d of the chosen weight at diameter ``d``. [unit of :meth:`total`]"""
        return self.total(weight) * lognormal_pdf_ln(d, self.median(weight), self.gsd)

    def density_curve(
        self, ds: Sequence[float], weight: str = "number", ln_ds: Sequence[float] | None = None
    ) -> list[float]:
        """:meth:`density_per_ln_d` at every diameter of ``ds`` [m] (constants computed once).

        Parameters
        ----------
        ds : sequence of float
            Diameters. [m]
        weight : str
            ``number``, ``surface`` or ``mass``.
        ln_ds : sequence of float, optional
            ln of each diameter in metres, if known (saves computing them). [-]

        Returns
        -------
        list of float
            dW/dln d at each diameter (Hinds 1999, eq. 4.33 per unit ln d, times the total
            of the weight). [unit of :meth:`total`]
        """
        s = self.ln_gsd
        c = self.total(weight) / (math.sqrt(2.0 * math.pi) * s)
        lm = math.log(self.median(weight))
        exp = math.exp
        out = []
        for ln_d in ln_ds if ln_ds is not None else [math.log(d) for d in ds]:
            z = (ln_d - lm) / s
            out.append(c * exp(-0.5 * z * z))
        return out


LATTICE_KEPT = 64
"""Lattices whose nodes and Gaussian factors :class:`LognormalMode` keeps (each function)."""


@lru_cache(maxsize=LATTICE_KEPT)
def _lattice_sizes(h: float, start: int, stop: int) -> tuple[float, ...]:
    """Diameters exp(k h) [m] of the lattice nodes k = start .. stop - 1 (step ``h`` [-])."""
    return tuple(math.exp(k * h) for k in range(start, stop))


@lru_cache(maxsize=LATTICE_KEPT)
def _lattice_gauss(lm: float, s: float, h: float, ks: range) -> tuple[float, ...]:
    """exp(-z^2 / 2), z = (k h - ``lm``) / ``s``, at the nodes ``ks`` of step ``h`` [-].

    The lognormal factor of a mode's quadrature weights (``lm`` the log of the weight's
    median in metres, ``s`` = ln GSD): it depends on the median and GSD only, so a mode whose
    amount or density changed (its mass weight) finds it kept.
    """
    exp = math.exp
    out = []
    for k in ks:
        z = (k * h - lm) / s
        out.append(exp(-0.5 * z * z))
    return tuple(out)


@dataclass(frozen=True)
class Multimodal:
    """A sum of one to four lognormal modes.

    Attributes
    ----------
    modes : tuple of LognormalMode
        The modes; each keeps its own density and shape factor.

    """

    modes: tuple[LognormalMode, ...]

    def __post_init__(self) -> None:
        """Hold between one and :data:`MAX_MODES` modes."""
        if not 1 <= len(self.modes) <= MAX_MODES:
            raise ValueError(f"between 1 and {MAX_MODES} modes are allowed")

    def total(self, weight: str = "number") -> float:
        """Total of the chosen weight over all modes."""
        return sum(m.total(weight) for m in self.modes)

    def quadrature(
        self, weight: str = "number", step: float | None = None
    ) -> list[tuple[float, float]]:
        """Concatenated quadrature of every mode (see :meth:`LognormalMode.quadrature`)."""
        out: list[tuple[float, float]] = []
        for m in self.modes:
            out.extend(m.quadrature(weight, step))
        return out

    def density_per_ln_d(self, d: float, weight: str = "number") -> float:
        """dW/dln d summed over the modes."""
        return sum(m.density_per_ln_d(d, weight) for m in self.modes)

    def density_curve(
        self, ds: Sequence[float], weight: str = "number", ln_ds: Sequence[float] | None = None
    ) -> list[float]:
        """dW/dln d summed over the modes at every diameter of ``ds``.

        Parameters
        ----------
        ds : sequence of float
            Diameters. [m]
        weight : str
            ``number``, ``surface`` or ``mass``.
        ln_ds : sequence of float, optional
            ln of each diameter in metres, if known. [-]

        Returns
        -------
        list of float
            The sum of the modes' :meth:`LognormalMode.density_curve`. [unit of :meth:`total`]
        """
        if ln_ds is None:
            ln_ds = [math.log(d) for d in ds]
        curves = [m.density_curve(ds, weight, ln_ds) for m in self.modes]
        return [sum(v) for v in zip(*curves, strict=True)]


@dataclass(frozen=True)
class BinnedSpectrum:
    """A measured spectrum: number of particles per size bin.

    Attributes
    ----------
    diameters : tuple of float
        Bin mid-point (volume-equivalent) diameters, strictly increasing. [m]
    numbers : tuple of float
        Particles per volume of air in each bin. [1/m^3]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor. [-]
    edges : tuple of float
        Bin edges, one more than the diameters: geometric means between neighbours, the
        outer edges mirrored in log space (common practice for spectra given by mid-points).

    """

    diameters: tuple[float, ...]
    numbers: tuple[float, ...]
    density: float = 1000.0
    shape_factor: float = 1.0
    edges: tuple[float, ...] = ()

    def __post_init__(self) -> None:
        """Check the bins and derive their edges."""
        d, n = self.diameters, self.numbers
        if len(d) != len(n) or len(d) < 2:
            raise ValueError("at least two bins with one number each are needed")
        if any(not (x > 0.0 and math.isfinite(x)) for x in d):
            raise ValueError("diameters must be positive")
        if any(b <= a for a, b in itertools.pairwise(d)):
            raise ValueError("diameters must increase strictly")
        if any(not (x >= 0.0 and math.isfinite(x)) for x in n):
            raise ValueError("numbers must be non-negative")
        if not self.edges:
            object.__setattr__(self, "edges", bin_edges(d))

    def total(self, weight: str = "number") -> float:
        """Total of the chosen weight over all bins (each bin at its mid-point)."""
        return sum(w for _, w in self.quadrature(weight))

    def grid(self, step: float | None = None) -> list[float]:
        """Bin mid-point diameters. [m]"""
        return list(self.diameters)

    def quadrature(
        self, weight: str = "number", step: float | None = None
    ) -> list[tuple[float, float]]:
        """(mid-point diameter, bin total of the weight) pairs (mid-point rule per bin)."""
        q = _check_weight(weight)
        return [(d, self._bin_total(i, q)) for i, d in enumerate(self.diameters)]

    def _bin_total(self, i: int, q: int) -> float:
        """Total of the ``q``-th moment weight in bin ``i`` (at its mid-point)."""
        d, n = self.diameters[i], self.numbers[i]
        if q == 0:
            return n
        if q == 2:
            return n * math.pi * d * d
        return n * self.density * math.pi / 6.0 * d**3

    def density_per_ln_d(self, d: float, weight: str = "number") -> float:
        """dW/dln d, constant across each bin, zero outside the spectrum.

        The bin holding ``d`` is found by bisection of the edges, so a spectrum of many
        rows is looked up in a few steps. [1/m^3, m^2/m^3 or kg/m^3 per unit ln d]
        """
        q = _check_weight(weight)
        e = self.edges
        i = bisect.bisect_right(e, d) - 1
        if not 0 <= i < len(self.diameters):
            return 0.0
        return self._bin_total(i, q) / math.log(e[i + 1] / e[i])

    def density_curve(
        self, ds: Sequence[float], weight: str = "number", ln_ds: Sequence[float] | None = None
    ) -> list[float]:
        """:meth:`density_per_ln_d` at every diameter of ``ds``.

        Parameters
        ----------
        ds : sequence of float
            Diameters. [m]
        weight : str
            ``number``, ``surface`` or ``mass``.
        ln_ds : sequence of float, optional
            Not needed here (the bins are found from the diameters). [-]

        Returns
        -------
        list of float
            dW/dln d at each diameter, constant across each bin, zero outside the spectrum.
            [1/m^3, m^2/m^3 or kg/m^3 per unit ln d]
        """
        return [self.density_per_ln_d(d, weight) for d in ds]


def bin_edges(diameters: Sequence[float]) -> tuple[float, ...]:
    """Bin edges for mid-point diameters: geometric means of neighbours, ends mirrored.

    Parameters
    ----------
    diameters : sequence of float
        Increasing mid-point diameters (at least two). [m]

    Returns
    -------
    tuple of float
        ``len(diameters) + 1`` edges. [m]

    """
    d = list(diameters)
    inner = [math.sqrt(a * b) for a, b in itertools.pairwise(d)]
    first = d[0] * d[0] / inner[0]
    last = d[-1] * d[-1] / inner[-1]
    return (first, *inner, last)


Distribution = LognormalMode | Multimodal | BinnedSpectrum


def parts(distribution: Distribution) -> tuple[LognormalMode | BinnedSpectrum, ...]:
    """The single populations a distribution is made of, each with its density and shape.

    Parameters
    ----------
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        The distribution.

    Returns
    -------
    tuple
        The modes of a :class:`Multimodal`, else the distribution itself, alone.

    """
    return getattr(distribution, "modes", (distribution,))


def integrate(
    f: Callable[[float], float],
    distribution: Distribution,
    weight: str = "number",
    step: float | None = None,
) -> float:
    """Integrate a per-size quantity over a distribution.

    Parameters
    ----------
    f : callable
        Per-particle quantity as a function of volume-equivalent diameter [m], e.g. a
        deposition fraction [-].
    distribution : LognormalMode, Multimodal or BinnedSpectrum
        The particle population.
    weight : str
        ``number``, ``surface`` or ``mass``.
    step : float, optional
        Grid step in ln d for lognormal modes [-] (ignored for binned spectra).

    Returns
    -------
    float
        Integral of f over the chosen weight: [1/m^3], [m^2/m^3] or [kg/m^3] times the unit
        of ``f``. Divide by ``distribution.total(weight)`` for a weighted mean.

    Examples
    --------
    The mass of a lognormal mode equals rho pi/6 N CMD^3 exp(4.5 ln^2 GSD) (Hatch & Choate
    1929); integrating f = 1 by mass returns it:

    >>> m = LognormalMode(100e-9, 1.8, 1e10, density=1000.0)
    >>> abs(integrate(lambda d: 1.0, m, "mass") / m.total("mass") - 1.0) < 1e-12
    True

    """
    return math.fsum(w * f(d) for d, w in distribution.quadrature(weight, step))
