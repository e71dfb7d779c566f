"""Size distributions: Hatch–Choate conversions and integration, checked against scipy.

Sections: cross-checks against scipy.integrate.quad and numpy (independent numerics);
published relations (Hatch & Choate 1929); behaviour of binned spectra.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import integrate as sint

from driftdose.deposition import icrp66
from driftdose.distribution import (
    WEIGHTS,
    BinnedSpectrum,
    LognormalMode,
    Multimodal,
    bin_edges,
    gauss_hermite,
    hatch_choate_median,
    integrate,
)


def _quad_lognormal(f, mode: LognormalMode, q: int) -> float:
    """Integral of f(d) d^q n(ln d) d ln d by scipy quad over +-12 sigma (reference)."""
    s = mode.ln_gsd
    mu = math.log(mode.cmd)

    def g(x: float) -> float:
        d = math.exp(x)
        pdf = math.exp(-0.5 * ((x - mu) / s) ** 2) / (math.sqrt(2 * math.pi) * s)
        return f(d) * d**q * pdf

    lo, hi = mu + (q * s * s) - 12 * s, mu + (q * s * s) + 12 * s
    val, _ = sint.quad(g, lo, hi, epsabs=0.0, epsrel=1e-12, limit=500)
    return mode.number_concentration * val


# --- cross-checks against numpy / scipy -------------------------------------------------


@pytest.mark.parametrize("n", [8, 24, 48, 96], ids=lambda n: f"numpy-hermgauss-{n}")
def test_gauss_hermite_matches_numpy(n):
    x, w = gauss_hermite(n)
    xr, wr = np.polynomial.hermite.hermgauss(n)
    assert np.allclose(x, xr, rtol=0, atol=1e-12)
    assert np.allclose(w, wr, rtol=1e-10, atol=0)


@pytest.mark.parametrize(
    ("cmd", "gsd"),
    [(20e-9, 1.5), (100e-9, 2.0), (1e-6, 2.5), (5e-6, 3.5), (50e-9, 5.0)],
    ids=["20nm-1.5", "100nm-2.0", "1um-2.5", "5um-3.5", "50nm-5.0"],
)
@pytest.mark.parametrize("weight", ["number", "surface", "mass"])
def test_integrate_matches_scipy_quad_for_deposition(cmd, gsd, weight):
    # cross-check: Gauss-Hermite integration of a smooth per-size quantity (the ICRP 66
    # alveolar fraction) against scipy.integrate.quad, 1e-6 relative (as the README states)
    mode = LognormalMode(cmd, gsd, 1e10, density=1000.0)

    def f(d: float) -> float:
        return icrp66(d)["AI"]

    q = {"number": 0, "surface": 2, "mass": 3}[weight]
    factor = {"number": 1.0, "surface": math.pi, "mass": 1000.0 * math.pi / 6}[weight]
    ref = factor * _quad_lognormal(f, mode, q)
    got = integrate(f, mode, weight)
    assert got == pytest.approx(ref, rel=1e-6)


@pytest.mark.parametrize("q", [0, 1, 2, 3, 6], ids=lambda q: f"moment-{q}")
def test_moment_matches_scipy_quad(q):
    # cross-check of the Hatch-Choate moment formula N CMD^q exp(q^2 ln^2 s / 2) by quad
    mode = LognormalMode(80e-9, 2.2, 3e9)
    assert mode.moment(q) == pytest.approx(_quad_lognormal(lambda d: 1.0, mode, q), rel=1e-9)


# --- published relations (Hatch & Choate 1929; Hinds 1999, eqs. 4.47-4.52) --------------


@pytest.mark.parametrize(
    ("q", "expected"),
    # Hatch & Choate (1929): median of the q-weighted distribution = CMD exp(q ln^2 GSD);
    # for CMD 1 um, GSD 2: surface median exp(2 * 0.480453) = 2.614 um, mass median
    # exp(3 * 0.480453) = 4.226 um (values computed from the published relation)
    [(2, 2.6141), (3, 4.2264)],
    ids=["hatch_choate1929-surface-median", "hatch_choate1929-mass-median"],
)
def test_hatch_choate_median_published_relation(q, expected):
    assert hatch_choate_median(1e-6, 2.0, q) * 1e6 == pytest.approx(expected, abs=5e-5)


def test_lognormalmode_from_mass_round_trip():
    # Hatch & Choate (1929): CMD = MMD exp(-3 ln^2 GSD); the mass is conserved
    m = LognormalMode.from_mass(3e-6, 2.0, 2e-6, 2500.0)
    assert m.median("mass") == pytest.approx(3e-6, rel=1e-12)
    assert m.mass_concentration == pytest.approx(2e-6, rel=1e-12)
    assert m.cmd == pytest.approx(3e-6 * math.exp(-3 * math.log(2.0) ** 2), rel=1e-12)


def test_integrate_mass_of_multimodal_is_sum_of_modes():
    a = LognormalMode(30e-9, 1.6, 1e11, 2000.0)
    b = LognormalMode.from_mass(4e-6, 2.1, 1e-6, 2000.0)
    mm = Multimodal((a, b))
    got = integrate(lambda d: 1.0, mm, "mass")
    assert got == pytest.approx(a.mass_concentration + b.mass_concentration, rel=1e-12)


def test_multimodal_rejects_five_modes():
    m = LognormalMode(1e-7, 2.0, 1.0)
    with pytest.raises(ValueError, match="between 1 and 4"):
        Multimodal((m,) * 5)


@pytest.mark.parametrize("gsd", [1.0, 0.9])
def test_lognormalmode_rejects_gsd_not_above_one(gsd):
    with pytest.raises(ValueError, match="gsd"):
        LognormalMode(1e-7, gsd, 1.0)


# --- binned spectra ------------------------------------------------------------------------


def test_bin_edges_geometric_midpoints():
    e = bin_edges([10e-9, 20e-9, 40e-9])
    assert e[1] == pytest.approx(math.sqrt(200) * 1e-9)
    assert e[0] == pytest.approx(10e-9 / math.sqrt(2))
    assert e[-1] == pytest.approx(40e-9 * math.sqrt(2))


def test_binned_spectrum_of_fine_bins_reproduces_lognormal():
    # cross-check: a finely binned lognormal integrates to the lognormal's own mass
    mode = LognormalMode(100e-9, 1.8, 1e10, 1500.0)
    ln = np.linspace(math.log(5e-9), math.log(3e-6), 400)
    d = np.exp(ln)
    dln = ln[1] - ln[0]
    n = [mode.density_per_ln_d(x) * dln for x in d]
    spec = BinnedSpectrum(tuple(d), tuple(n), 1500.0)
    assert spec.total("mass") == pytest.approx(mode.total("mass"), rel=1e-4)
    f = lambda x: icrp66(x)["AI"]  # noqa: E731
    assert integrate(f, spec, "number") == pytest.approx(integrate(f, mode, "number"), rel=1e-3)


def test_binned_spectrum_rejects_unsorted():
    with pytest.raises(ValueError, match="increase"):
        BinnedSpectrum((2e-8, 1e-8), (1.0, 1.0))


@pytest.mark.parametrize("weight", ["number", "surface", "mass"])
def test_density_curve_equals_density_per_ln_d(weight):
    sizes = [1e-9 * 1.3**k for k in range(60)]
    modes = (LognormalMode(40e-9, 1.8, 1e11, 3000.0), LognormalMode(2e-6, 2.2, 1e6, 1500.0))
    spectrum = BinnedSpectrum((20e-9, 50e-9, 100e-9, 300e-9), (1e9, 3e9, 2e9, 1e8), 2000.0)
    for dist in (*modes, Multimodal(modes), spectrum):
        curve = dist.density_curve(sizes, weight)
        for d, y in zip(sizes, curve, strict=True):
            assert y == pytest.approx(dist.density_per_ln_d(d, weight), rel=1e-13, abs=0.0)


def test_density_curve_takes_the_logs_of_the_diameters():
    sizes = [1e-9 * 1.3**k for k in range(60)]
    logs = [math.log(d) for d in sizes]
    modes = (LognormalMode(40e-9, 1.8, 1e11, 3000.0), LognormalMode(2e-6, 2.2, 1e6, 1500.0))
    for dist in (*modes, Multimodal(modes)):
        assert dist.density_curve(sizes, "mass", logs) == dist.density_curve(sizes, "mass")


def test_kept_lattice_factors_are_never_stale():
    # a mode's nodes and Gaussian factors are kept per lattice and median; every change of
    # amount, density, median, GSD or step gives what a computation with nothing kept gives
    from driftdose import distribution

    modes = [
        LognormalMode(50e-9, 1.8, 1e10, 1000.0),
        LognormalMode(50e-9, 1.8, 1e10, 2500.0),  # only the density: the mass weight scales
        LognormalMode(50e-9, 1.8, 3e9, 2500.0),
        LognormalMode(51e-9, 1.8, 3e9, 2500.0),
        LognormalMode(51e-9, 2.4, 3e9, 2500.0, 1.5),
        LognormalMode(50e-9, 1.8, 1e10, 1000.0),
    ]
    for mode in modes:
        for step in (None, 0.05):
            kept = [mode.grid(step)] + [mode.quadrature(w, step) for w in WEIGHTS]
            distribution._lattice_sizes.cache_clear()
            distribution._lattice_gauss.cache_clear()
            fresh = [mode.grid(step)] + [mode.quadrature(w, step) for w in WEIGHTS]
            assert kept == fresh
            for w in WEIGHTS:  # the weights alone are the quadrature's, bit for bit
                assert mode.quadrature_weights(w, step) == [q for _, q in mode.quadrature(w, step)]
            grid = mode.grid(step)
            grid.append(1.0)  # a caller's change of its list changes nothing kept
            assert mode.grid(step) == fresh[0]
