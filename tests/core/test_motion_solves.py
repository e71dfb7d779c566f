"""The motion calculation's solves against scipy: settling velocity, stopping integral, grids.

No published values here (those are in test_particle.py): the force balance
V f(Re(V)) = V_Stokes is written out independently and solved with scipy's ``brentq`` to
near machine precision; the core's safeguarded Newton solve must agree to 1e-13 relative
(its stopping rule leaves an error of order 1e-14). The Brent solve the core used before
(rtol 1e-13) is kept here as a second reference: the two differ by at most its tolerance.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.optimize import brentq

from driftdose import gas, particle
from driftdose._numerics import brent_root, gauss_legendre, logspace
from driftdose.constants import STANDARD_GRAVITY


def _clift_gauvin(re: float) -> float:
    # Clift & Gauvin (1970) as in Clift, Grace & Weber (1978) Table 5.2, written out here
    if re <= 0.0:
        return 1.0
    return 1.0 + 0.15 * re**0.687 + (0.42 / 24.0) * re / (1.0 + 42500.0 * re**-1.16)


def _schiller_naumann(re: float) -> float:
    return 1.0 + 0.15 * max(re, 0.0) ** 0.687


LAWS = {"clift_gauvin1970": _clift_gauvin, "schiller_naumann1933": _schiller_naumann}


def _stokes_and_k(d, rho, chi, T, P):
    mu, rho_g = gas.air_viscosity(T), gas.air_density(T, P)
    cc = particle.slip_correction(d, T, P)
    v_st = rho * d * d * cc * STANDARD_GRAVITY / (18.0 * mu * chi)
    return v_st, rho_g * d / mu


def _scipy_velocity(d, rho, chi, T, P, model) -> float:
    v_st, k = _stokes_and_k(d, rho, chi, T, P)
    f = LAWS[model]
    if f(k * v_st) - 1.0 < 1e-15:
        return v_st / f(k * v_st)
    return brentq(lambda v: v * f(k * v) - v_st, 0.0, v_st, xtol=v_st * 1e-17, rtol=8.9e-16)


def _previous_brent_velocity(d, rho, chi, T, P, model) -> float:
    # the solve the core used before: Brent's method on V, rtol 1e-13
    v_st, k = _stokes_and_k(d, rho, chi, T, P)
    f = LAWS[model]
    if f(k * v_st) - 1.0 < 1e-12:
        return v_st
    return brent_root(lambda v: v * f(k * v) - v_st, 0.0, v_st, xtol=v_st * 1e-14, rtol=1e-13)


SIZES = [1e-10 * 10 ** (i * 7.5 / 150) for i in range(151)]  # 0.1 nm to 3 mm
CASES = [
    (rho, chi, T, P, model)
    for model in LAWS
    for rho, chi in ((100.0, 1.0), (1000.0, 1.0), (2650.0, 1.36), (19300.0, 1.0))
    for T, P in ((293.15, 101325.0), (243.15, 60e3), (373.15, 120e3))
]


@pytest.mark.parametrize(("rho", "chi", "T", "P", "model"), CASES)
def test_settling_velocity_vs_brentq_over_sizes(rho, chi, T, P, model) -> None:
    worst_scipy = worst_previous = 0.0
    for d in SIZES:
        got = particle.settling_velocity(d, rho, T, P, chi, model)
        ref = _scipy_velocity(d, rho, chi, T, P, model)
        worst_scipy = max(worst_scipy, abs(got - ref) / ref)
        prev = _previous_brent_velocity(d, rho, chi, T, P, model)
        worst_previous = max(worst_previous, abs(got - prev) / prev)
    assert worst_scipy < 1e-13
    # the previous solve stopped within 2 rtol |V| + xtol / 2 (5e-13 relative)
    assert worst_previous < 5e-13


def test_settling_velocity_reaches_newton_regime() -> None:
    # a 3 mm gold sphere settles at Re of several thousand; the solve still agrees
    d, rho = 3e-3, 19300.0
    v = particle.settling_velocity(d, rho)
    assert particle.reynolds_number(d, v) > 1e3
    assert v == pytest.approx(
        _scipy_velocity(d, rho, 1.0, 293.15, 101325.0, "clift_gauvin1970"), rel=1e-13
    )
    assert math.isfinite(v)


# ---------------------------------------------------------------------------------------------
# Stopping distance: the integral (tau / k) int_0^Re0 dRe / f(Re) against scipy's quad
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize("re0", [1e-3, 0.3, 1.0, 20.0, 400.0, 1500.0, 1e4, 4e4, 1e5, 3e5, 1e6])
def test_stopping_distance_integral_vs_quad(re0: float) -> None:
    d, rho = 50e-6, 1000.0
    mu, rho_g = gas.air_viscosity(), gas.air_density()
    k = rho_g * d / mu
    v0 = re0 / k
    tau = particle.relaxation_time(d, rho)
    # the same integral in ln Re, written out here, to machine precision by adaptive quadrature
    # over each decade (the part below 1e-8 Re0 contributes 1e-8 of the whole)
    total = 0.0
    lo = math.log(re0 * 1e-14)
    for i in range(14):
        a, b = lo + i * math.log(10.0), lo + (i + 1) * math.log(10.0)
        total += quad(
            lambda s: math.exp(s) / _clift_gauvin(math.exp(s)), a, b, epsabs=0, epsrel=1e-13
        )[0]
    ref = tau / k * (re0 * 1e-14 + total)
    # the core takes the part below 1e-8 Re0 to first order in 0.15 Re^0.687 (about 4e-12 of
    # the whole at Re0 3e5) and its quadrature is good to 1e-13: 1e-10 leaves room for both
    assert particle.stopping_distance(d, v0, rho) == pytest.approx(ref, rel=1e-10)


@pytest.mark.parametrize("n", [1, 2, 3, 8, 10, 33])
def test_gauss_legendre_vs_numpy(n: int) -> None:
    x, w = gauss_legendre(n)
    ref_x, ref_w = np.polynomial.legendre.leggauss(n)
    assert np.allclose(x, ref_x, rtol=0, atol=1e-14)
    assert np.allclose(w, ref_w, rtol=1e-13, atol=0)


@pytest.mark.parametrize("n", [10, 64, 100])
def test_gauss_legendre_integrates_polynomials_exactly(n: int) -> None:
    # exact for degree up to 2n - 1: the integral of x^k over [-1, 1] is 2 / (k + 1), k even
    x, w = gauss_legendre(n)
    for k in range(0, 2 * n, 2):
        got = math.fsum(wi * xi**k for xi, wi in zip(x, w, strict=True))
        assert got == pytest.approx(2.0 / (k + 1), rel=1e-12)


def test_gauss_legendre_refuses_bad_counts() -> None:
    for n in (0, 101):
        with pytest.raises(ValueError):
            gauss_legendre(n)


# ---------------------------------------------------------------------------------------------
# Properties on a size grid against the one-size functions (same formulas, computed once)
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("rho", "chi", "T", "P"), [(1000.0, 1.0, 293.15, 101325.0), (7800.0, 1.4, 253.15, 70e3)]
)
def test_particle_grid_matches_one_size_functions(rho, chi, T, P) -> None:
    sizes = logspace(1e-9, 1e-3, 97)
    grid = particle.particle_grid(sizes, rho, T, P, chi)
    for i, d in enumerate(sizes):
        assert grid.slip[i] == particle.slip_correction(d, T, P)
        assert grid.mobility[i] == particle.mobility(d, T, P, chi)
        assert grid.diffusion[i] == particle.diffusion_coefficient(d, T, P, chi)
        assert grid.relaxation[i] == particle.relaxation_time(d, rho, T, P, chi)
        assert grid.settling[i] == particle.settling_velocity(d, rho, T, P, chi)
        assert grid.aerodynamic[i] == pytest.approx(
            particle.aerodynamic_diameter(d, rho, chi, T, P), rel=1e-13
        )
    # kept: the same inputs give the same object
    assert particle.particle_grid(list(sizes), rho, T, P, chi) is grid


@pytest.mark.parametrize(("rho", "chi"), [(1000.0, 1.0), (2650.0, 1.36), (300.0, 1.0)])
def test_volume_equivalent_diameters_of_a_grid_vs_one_at_a_time(rho, chi) -> None:
    sizes = logspace(1e-9, 100e-6, 241)
    got = particle.volume_equivalent_diameters(sizes, rho, chi)
    for d_ae, d in zip(sizes, got, strict=True):
        assert d == pytest.approx(particle.volume_equivalent_diameter(d_ae, rho, chi), rel=1e-13)
        assert particle.aerodynamic_diameter(d, rho, chi) == pytest.approx(d_ae, rel=1e-12)
