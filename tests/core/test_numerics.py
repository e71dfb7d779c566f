"""Cross-checks against scipy and numpy as independent numerical references.

No published values here: each test solves the same equation as the core with a scipy
routine (root finding, ODE integration) and compares. Tolerances follow the solvers'
requested accuracies.
"""

from __future__ import annotations

import math
from decimal import Decimal, localcontext

import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

from driftdose import gas, particle
from driftdose._numerics import brent_root, logspace, newton_bracketed
from driftdose.constants import STANDARD_GRAVITY

# ---------------------------------------------------------------------------------------------
# brent_root vs scipy.optimize.brentq
# ---------------------------------------------------------------------------------------------

ROOT_PROBLEMS = [
    pytest.param(lambda x: x**3 - 2 * x - 5, 2.0, 3.0, id="wallis-cubic"),
    pytest.param(lambda x: math.cos(x) - x, 0.0, 1.0, id="cos-fixed-point"),
    pytest.param(lambda x: math.exp(x) - 10.0, -5.0, 5.0, id="exp"),
    pytest.param(lambda x: x**9, -1.0, 2.0, id="flat-ninth-power"),
    pytest.param(lambda x: math.log(x) - math.log(3e-9), 1e-12, 1.0, id="log-wide-bracket"),
    pytest.param(lambda x: math.atan(1e4 * (x - 0.3)), -1.0, 1.0, id="steep-atan"),
    pytest.param(lambda x: (x - 1e-7) * 1e20, 0.0, 1.0, id="tiny-root"),
    pytest.param(lambda x: math.tanh(x - 7.5) + 1e-3, 0.0, 20.0, id="tanh-plateaus"),
]


@pytest.mark.parametrize(("f", "a", "b"), ROOT_PROBLEMS)
def test_brent_root_vs_brentq(f, a: float, b: float) -> None:
    ours = brent_root(f, a, b)
    ref = brentq(f, a, b, xtol=1e-15, rtol=4 * np.finfo(float).eps, maxiter=500)
    assert ours == pytest.approx(ref, rel=1e-11, abs=1e-14)


@pytest.mark.parametrize(("f", "a", "b"), ROOT_PROBLEMS)
def test_brent_root_reversed_bracket(f, a: float, b: float) -> None:
    assert brent_root(f, b, a) == pytest.approx(brent_root(f, a, b), rel=1e-11, abs=1e-14)


def test_brent_root_endpoint_root() -> None:
    assert brent_root(lambda x: x - 2.0, 2.0, 5.0) == 2.0
    assert brent_root(lambda x: x - 5.0, 2.0, 5.0) == 5.0


def test_brent_root_not_bracketed() -> None:
    with pytest.raises(ValueError, match="bracketed"):
        brent_root(lambda x: x * x + 1.0, -1.0, 1.0)


def test_brent_root_counts_evaluations_like_brentq() -> None:
    # Brent's method needs about as many evaluations as scipy's implementation of it.
    calls = {"ours": 0, "scipy": 0}

    def counted(key):
        def f(x: float) -> float:
            calls[key] += 1
            return x**3 - 2 * x - 5

        return f

    brent_root(counted("ours"), 2.0, 3.0, xtol=1e-12, rtol=1e-12)
    brentq(counted("scipy"), 2.0, 3.0, xtol=1e-12, rtol=1e-12)
    assert calls["ours"] <= calls["scipy"] + 3


# ---------------------------------------------------------------------------------------------
# logspace vs numpy.geomspace
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("start", "stop", "num"),
    [
        (1e-9, 100e-6, 241),
        (1e-9, 100e-6, 200),
        (1.0, 10.0, 2),
        (1.0, 10.0, 1),
        (1.0, 10.0, 0),
        (100.0, 1e-3, 17),
        (3.0, 3.0, 5),
    ],
)
def test_logspace_vs_geomspace(start: float, stop: float, num: int) -> None:
    ours = logspace(start, stop, num)
    ref = np.geomspace(start, stop, num)
    assert len(ours) == len(ref)
    np.testing.assert_allclose(ours, ref, rtol=1e-13)
    if num >= 2:
        assert ours[0] == start and ours[-1] == stop


def test_logspace_negative_count() -> None:
    with pytest.raises(ValueError):
        logspace(1.0, 10.0, -1)


# ---------------------------------------------------------------------------------------------
# newton_bracketed (safeguarded Newton) vs scipy.optimize.brentq
# ---------------------------------------------------------------------------------------------

# increasing functions with their derivatives: (f_df, a, b, first guess)
NEWTON_PROBLEMS = [
    pytest.param(lambda x: (x**3 - 2 * x - 5, 3 * x * x - 2), 2.0, 3.0, 2.9, id="wallis-cubic"),
    pytest.param(lambda x: (math.exp(x) - 10.0, math.exp(x)), -5.0, 5.0, -4.9, id="exp-far-guess"),
    # Newton from x0 = 0.9 jumps far outside the bracket: bisection must take over
    pytest.param(
        lambda x: (math.atan(1e4 * (x - 0.3)), 1e4 / (1 + (1e4 * (x - 0.3)) ** 2)),
        -1.0,
        1.0,
        0.9,
        id="steep-atan-overshoot",
    ),
    pytest.param(
        lambda x: (math.tanh(x - 7.5) + 1e-3, 1.0 / math.cosh(x - 7.5) ** 2),
        0.0,
        20.0,
        0.5,
        id="tanh-plateaus",
    ),
    pytest.param(lambda x: (x**3, 3 * x * x), -1.0, 2.0, 1.5, id="triple-root"),
    pytest.param(lambda x: (x - 0.25, 1.0), 0.0, 1.0, 5.0, id="guess-outside-bracket"),
]


@pytest.mark.parametrize(("f_df", "a", "b", "x0"), NEWTON_PROBLEMS)
def test_newton_bracketed_vs_brentq(f_df, a: float, b: float, x0: float) -> None:
    ours = newton_bracketed(f_df, a, b, x0)
    ref = brentq(lambda x: f_df(x)[0], a, b, xtol=1e-15, rtol=4 * np.finfo(float).eps, maxiter=500)
    # at a triple root Newton converges only linearly (error shrinks by 2/3 a step), so the
    # iteration ends with an error of a few step tolerances (1e-7); simple roots to 1e-11
    assert ours == pytest.approx(ref, rel=1e-11, abs=1e-6 if abs(ref) < 1e-9 else 1e-14)


def test_newton_bracketed_bad_bracket() -> None:
    with pytest.raises(ValueError, match="a < b"):
        newton_bracketed(lambda x: (x, 1.0), 1.0, -1.0, 0.0)


@pytest.mark.parametrize("d", [1e-9 * 10 ** (i / 10) for i in range(0, 51, 2)])
@pytest.mark.parametrize(
    ("rho", "chi", "T", "P"),
    [
        (100.0, 1.0, 293.15, 101325.0),
        (1500.0, 1.3, 310.15, 101325.0),
        (3000.0, 1.5, 310.15, 101325.0),
        (22000.0, 4.0, 250.0, 50e3),
    ],
)
def test_aerodynamic_newton_vs_brentq_and_previous_solve(d, rho, chi, T, P) -> None:
    # The aerodynamic diameter is solved by safeguarded Newton steps. Checked against brentq
    # on the same relation, and against the solve it replaced (Brent's method in ln d_ae,
    # xtol 1e-13; pinned here as that previous method): the change is at most 1e-10 relative.
    target = d * d * particle.slip_correction(d, T, P) * rho / chi

    def g(x: float) -> float:
        return x * x * particle.slip_correction(x, T, P) * 1000.0 - target

    def g_ln(u: float) -> float:
        x = math.exp(u)
        return math.log(x * x * particle.slip_correction(x, T, P) * 1000.0 / target)

    ours = particle.aerodynamic_diameter(d, rho, chi, T, P)
    ref = brentq(g, d * 1e-3, d * 1e3, xtol=1e-30, rtol=1e-14, maxiter=500)
    assert ours == pytest.approx(ref, rel=1e-12)
    previous = math.exp(brent_root(g_ln, math.log(d * 1e-3), math.log(d * 1e3), xtol=1e-13))
    assert ours == pytest.approx(previous, rel=1e-10)


@pytest.mark.parametrize(
    ("rho", "chi", "T", "P"),
    [
        (100.0, 1.0, 293.15, 101325.0),
        (3000.0, 1.5, 310.15, 101325.0),
        (22000.0, 4.0, 250.0, 50e3),
        (1000.0, 1.0, 293.15, 101325.0),  # unit-density spheres: the sizes themselves
    ],
)
@pytest.mark.parametrize("order", ["increasing", "decreasing", "shuffled"])
def test_aerodynamic_diameters_of_a_grid_vs_brentq_and_one_at_a_time(rho, chi, T, P, order):
    # The grid solve starts each Newton iteration from its neighbours' solutions; the root is
    # the same: brentq on the same relation (rel 1e-12, as one solve at a time) and the single
    # solve (within 1e-13: both stop on a Newton step shorter than 1e-7 in ln d).
    sizes = [1e-9 * 10 ** (i / 48) for i in range(241)] + [3e-9, 3e-9]  # a repeated size too
    if order == "decreasing":
        sizes.reverse()
    elif order == "shuffled":
        sizes = [sizes[(i * 97) % len(sizes)] for i in range(len(sizes))]
    got = particle.aerodynamic_diameters(sizes, rho, chi, T, P)
    assert len(got) == len(sizes)
    for d, ours in zip(sizes[::12], got[::12], strict=True):
        target = d * d * particle.slip_correction(d, T, P) * rho / chi

        def g(x: float, target=target) -> float:
            return x * x * particle.slip_correction(x, T, P) * 1000.0 - target

        ref = brentq(g, d * 1e-3, d * 1e3, xtol=1e-30, rtol=1e-14, maxiter=500)
        assert ours == pytest.approx(ref, rel=1e-12)
    single = [particle.aerodynamic_diameter(d, rho, chi, T, P) for d in sizes]
    assert got == pytest.approx(single, rel=1e-13)
    assert particle.aerodynamic_diameters([], rho, chi, T, P) == []


@pytest.mark.parametrize(("rho", "chi"), [(100.0, 1.0), (3000.0, 1.5), (22000.0, 4.0)])
def test_grid_solve_of_one_size_agrees_with_the_single_solve(rho, chi):
    # one size, no neighbour to start from: the grid's loop (d^2 Cc(d) kept per grid, the
    # residual as 2 ln d_x + ln Cc - ln q, the closed form above about 5.5 um) and the single
    # solve (newton_bracketed on ln(d_x^2 Cc) - ln q) agree within the precision both
    # Newton iterations stop at (a step below 1e-7 leaves an error of order 1e-14)
    for i in range(0, 241, 5):
        d = 1e-9 * 10 ** (i / 48)
        for T, P in ((293.15, 101325.0), (310.15, 101325.0), (250.0, 50e3)):
            single = particle.aerodynamic_diameter(d, rho, chi, T, P)
            assert particle.aerodynamic_diameters([d], rho, chi, T, P) == [
                pytest.approx(single, rel=1e-13)
            ]
            back = particle.volume_equivalent_diameter(single, rho, chi, T, P)
            assert particle.volume_equivalent_diameters([single], rho, chi, T, P) == [
                pytest.approx(back, rel=1e-13)
            ]


def _d2cc_50_digits(x: Decimal, two_lambda: Decimal) -> Decimal:
    """d^2 Cc(d) of the Kim et al. (2005) slip set in 50-digit decimal arithmetic."""
    alpha, beta, gamma = (Decimal(repr(v)) for v in particle.SLIP_MODELS["kim2005"])
    kn = two_lambda / x
    return x * x * (1 + kn * (alpha + beta * (-gamma / kn).exp()))


@pytest.mark.parametrize(
    ("rho", "chi", "T", "P"),
    [
        (1500.0, 1.0, 310.15, 101325.0),
        (3000.0, 1.5, 310.15, 101325.0),
        (22000.0, 4.0, 293.15, 101325.0),
        (100.0, 1.0, 250.0, 50e3),
    ],
)
def test_large_aerodynamic_diameters_vs_50_digit_arithmetic(rho, chi, T, P):
    # Above about 5.5 um (1 atm) the exponential of the slip correction is below double
    # precision and the grid solves d^2 + 2 lambda alpha d = q in closed form. Reference: the
    # full relation (exponential kept) solved by Newton's method in 50-digit decimal
    # arithmetic; the closed form is within a few units in the last place (rel 1e-15).
    # Smaller sizes of the same grid go through Newton's method (rel 1e-13, its precision).
    with localcontext() as context:
        context.prec = 50
        two_lambda = 2.0 * gas.mean_free_path(T, P, reference="kim2005")
        tl = Decimal(repr(two_lambda))
        r = Decimal(repr(rho / (1000.0 * chi)))
        sizes = [1e-6 * 10 ** (i / 24) for i in range(49)]
        got = particle.aerodynamic_diameters(sizes, rho, chi, T, P)
        closed_form = 0
        for d, ours in zip(sizes, got, strict=True):
            q = r * _d2cc_50_digits(Decimal(repr(d)), tl)
            x = q.sqrt()
            for _ in range(100):
                h = x * Decimal("1e-25")
                slope = (_d2cc_50_digits(x + h, tl) - _d2cc_50_digits(x - h, tl)) / (2 * h)
                step = (_d2cc_50_digits(x, tl) - q) / slope
                x -= step
                if abs(step) < x * Decimal("1e-40"):
                    break
            big = ours > 40.0 * two_lambda / 0.997
            closed_form += big
            assert ours == pytest.approx(float(x), rel=1e-15 if big else 1e-13)
    assert closed_form >= 10  # the closed form was checked


def test_kept_grid_terms_are_never_stale():
    # d^2 Cc(d) is kept per (grid, T, P); every change of density, shape factor, air or grid
    # must give exactly what a solve with nothing kept gives
    from driftdose.particle import equivalent

    grid = [1e-9 * 10 ** (i / 24) for i in range(121)]
    cases = [
        (grid, 1500.0, 1.0, 310.15, 101325.0),
        (grid, 3000.0, 1.5, 310.15, 101325.0),
        (grid, 3000.0, 1.5, 293.15, 101325.0),  # only T changed
        (grid, 3000.0, 1.5, 293.15, 80e3),  # only P changed
        (tuple(grid), 2000.0, 1.0, 293.15, 80e3),  # the same sizes as a tuple
        (grid[:60], 2000.0, 1.0, 293.15, 80e3),  # part of the grid
        ([d * 1.01 for d in grid], 2000.0, 1.0, 293.15, 80e3),  # sizes moved
        (grid, 1500.0, 1.0, 310.15, 101325.0),  # back to the first
    ]
    for sizes, rho, chi, T, P in cases:
        kept = particle.aerodynamic_diameters(sizes, rho, chi, T, P)
        inverse = particle.volume_equivalent_diameters(sizes, rho, chi, T, P)
        equivalent._grid_terms_kept.clear()
        assert kept == particle.aerodynamic_diameters(sizes, rho, chi, T, P)
        equivalent._grid_terms_kept.clear()
        assert inverse == particle.volume_equivalent_diameters(sizes, rho, chi, T, P)
    for i in range(equivalent.GRID_TERMS_KEPT + 3):  # more grids than are kept
        particle.aerodynamic_diameters([1e-7 * (1 + i / 100)], 2000.0)
    assert len(equivalent._grid_terms_kept) == equivalent.GRID_TERMS_KEPT


# ---------------------------------------------------------------------------------------------
# Aerodynamic <-> volume-equivalent diameter vs brentq on the same relation
# ---------------------------------------------------------------------------------------------

AERO_CASES = [
    pytest.param(1e-9, 2000.0, 1.0, 293.15, 101325.0, id="1nm-2000"),
    pytest.param(20e-9, 8000.0, 1.0, 293.15, 101325.0, id="20nm-8000"),
    pytest.param(0.3e-6, 500.0, 1.0, 293.15, 101325.0, id="0.3um-500"),
    pytest.param(2e-6, 2650.0, 1.36, 293.15, 101325.0, id="2um-quartz"),
    pytest.param(5e-6, 3000.0, 1.5, 310.15, 101325.0, id="5um-worker-aerosol"),
    pytest.param(50e-6, 19300.0, 1.0, 273.15, 70e3, id="50um-gold-low-pressure"),
    pytest.param(0.1e-6, 1000.0, 2.0, 293.15, 101325.0, id="0.1um-chi2"),
]


@pytest.mark.parametrize(("d", "rho", "chi", "T", "P"), AERO_CASES)
def test_aerodynamic_diameter_vs_brentq(d, rho, chi, T, P) -> None:
    target = d * d * particle.slip_correction(d, T, P) * rho / chi

    def g(x: float) -> float:
        return x * x * particle.slip_correction(x, T, P) * 1000.0 - target

    ref = brentq(g, d * 1e-3, d * 1e3, xtol=1e-30, rtol=1e-14, maxiter=500)
    assert particle.aerodynamic_diameter(d, rho, chi, T, P) == pytest.approx(ref, rel=1e-10)


@pytest.mark.parametrize(("d", "rho", "chi", "T", "P"), AERO_CASES)
def test_volume_equivalent_diameter_vs_brentq(d, rho, chi, T, P) -> None:
    d_ae = d  # read the same numbers as an aerodynamic diameter
    target = d_ae * d_ae * particle.slip_correction(d_ae, T, P) * 1000.0

    def g(x: float) -> float:
        return x * x * particle.slip_correction(x, T, P) * rho / chi - target

    ref = brentq(g, d_ae * 1e-3, d_ae * 1e3, xtol=1e-30, rtol=1e-14, maxiter=500)
    assert particle.volume_equivalent_diameter(d_ae, rho, chi, T, P) == pytest.approx(
        ref, rel=1e-10
    )


@pytest.mark.parametrize(("d", "rho", "chi", "T", "P"), AERO_CASES)
def test_aerodynamic_diameter_round_trip(d, rho, chi, T, P) -> None:
    d_ae = particle.aerodynamic_diameter(d, rho, chi, T, P)
    assert particle.volume_equivalent_diameter(d_ae, rho, chi, T, P) == pytest.approx(d, rel=1e-10)


# ---------------------------------------------------------------------------------------------
# Crossover diameter vs brentq
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("t", "rho", "chi", "T", "P"),
    [
        (1e-3, 1000.0, 1.0, 293.15, 101325.0),
        (1.0, 1000.0, 1.0, 293.15, 101325.0),
        (60.0, 1000.0, 1.0, 293.15, 101325.0),
        (3600.0, 2500.0, 1.4, 310.15, 90e3),
        (86400.0, 100.0, 1.0, 223.15, 10e3),
    ],
)
def test_crossover_diameter_vs_brentq(t, rho, chi, T, P) -> None:
    def g(log_d: float) -> float:
        d = math.exp(log_d)
        return particle.settling_distance(d, t, rho, T, P, chi) - particle.rms_displacement(
            d, t, T, P, chi
        )

    ref = math.exp(brentq(g, math.log(1e-10), math.log(1e-3), xtol=1e-14, rtol=1e-14))
    assert particle.crossover_diameter(t, rho, T, P, chi) == pytest.approx(ref, rel=1e-9)


def test_crossover_diameter_none_outside_interval() -> None:
    # With a search interval that does not contain the root there is no crossover.
    assert particle.crossover_diameter(60.0, 1000.0, d_min=1e-6, d_max=1e-3) is None


# ---------------------------------------------------------------------------------------------
# Schiller & Naumann settling vs scipy solving the same force balance
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("d", "rho", "chi", "T", "P"),
    [
        (1e-6, 1000.0, 1.0, 293.15, 101325.0),
        (20e-6, 1000.0, 1.0, 293.15, 101325.0),
        (50e-6, 1000.0, 1.0, 293.15, 101325.0),
        (100e-6, 1000.0, 1.0, 293.15, 101325.0),
        (200e-6, 2650.0, 1.36, 293.15, 101325.0),
        (500e-6, 7800.0, 1.0, 323.15, 95e3),
        (1e-3, 25000.0, 1.0, 773.15, 200e3),
    ],
)
def test_settling_velocity_schiller_naumann1933_vs_scipy(d, rho, chi, T, P) -> None:
    # Gravity m g = drag 3 pi mu d V chi (1 + 0.15 Re^0.687) / Cc, Re = rho_g V d / mu,
    # written out independently here and solved with brentq.
    mu, rho_g = gas.air_viscosity(T), gas.air_density(T, P)
    cc = particle.slip_correction(d, T, P)
    weight = rho * math.pi * d**3 / 6.0 * STANDARD_GRAVITY

    def balance(v: float) -> float:
        re = rho_g * v * d / mu
        return 3 * math.pi * mu * d * v * chi * (1 + 0.15 * re**0.687) / cc - weight

    ref = brentq(balance, 0.0, 1e3, xtol=1e-300, rtol=1e-14, maxiter=500)
    got = particle.settling_velocity_schiller_naumann1933(d, rho, T, P, chi)
    assert got == pytest.approx(ref, rel=1e-10)


# ---------------------------------------------------------------------------------------------
# Stopping distance vs numerical integration of the equation of motion
# ---------------------------------------------------------------------------------------------


def _integrated_stopping_distance(d, v0, rho, drag_correction) -> float:
    """Integrate dv/dt = -(v/tau) f(Re), dx/dt = v with solve_ivp until the particle stops."""
    T, P = 293.15, 101325.0
    tau = particle.relaxation_time(d, rho, T, P)
    k = gas.air_density(T, P) * d / gas.air_viscosity(T)  # Re = k v

    def rhs(_t, y):
        _x, v = y
        return [v, -(v / tau) * drag_correction(k * max(v, 0.0))]

    # The drag is at least Stokes's, so v <= v0 exp(-t/tau): after 50 tau what is left to
    # travel is below v0 tau e^-50, nothing.
    sol = solve_ivp(
        rhs, (0.0, 50.0 * tau), [0.0, v0], method="DOP853", rtol=1e-12, atol=[1e-20, 1e-20]
    )
    assert sol.success
    return float(sol.y[0, -1])


def _klyachko(re: float) -> float:
    return 1.0 + re ** (2.0 / 3.0) / 6.0


@pytest.mark.parametrize("re0", [1.5, 5.0, 20.0, 100.0, 400.0, 1500.0])
def test_stopping_distance_closed_form_vs_solve_ivp(re0: float) -> None:
    # Above Re0 = 1 the core uses the closed form of the Klyachko drag law
    # C_D = (24/Re)(1 + Re^(2/3)/6); integrating the same law numerically must agree.
    d, rho = 50e-6, 1000.0
    v0 = re0 * gas.air_viscosity() / (gas.air_density() * d)
    ref = _integrated_stopping_distance(d, v0, rho, _klyachko)
    assert particle.stopping_distance_klyachko(d, v0, rho) == pytest.approx(ref, rel=1e-8)


@pytest.mark.parametrize("re0", [0.01, 0.5, 1.0])
def test_stopping_distance_stokes_vs_solve_ivp(re0: float) -> None:
    # At and below Re0 = 1 Hinds's split uses S = V0 tau, the integral of Stokes drag.
    d, rho = 20e-6, 2000.0
    v0 = re0 * gas.air_viscosity() / (gas.air_density() * d)
    ref = _integrated_stopping_distance(d, v0, rho, lambda re: 1.0)
    assert particle.stopping_distance_klyachko(d, v0, rho) == pytest.approx(ref, rel=1e-8)
    assert particle.stopping_distance(d, v0, rho, model="stokes") == pytest.approx(ref, rel=1e-8)


def _clift_gauvin(re: float) -> float:
    # Clift & Gauvin (1970) as in Clift, Grace & Weber (1978) Table 5.2, written out here
    if re <= 0.0:
        return 1.0
    return 1.0 + 0.15 * re**0.687 + (0.42 / 24.0) * re / (1.0 + 42500.0 * re**-1.16)


@pytest.mark.parametrize("re0", [1e-3, 0.5, 1.0, 1.5, 20.0, 400.0, 1500.0, 1e4, 1e5])
def test_stopping_distance_integrated_vs_solve_ivp(re0: float) -> None:
    # The default integrates the equation of motion with the Clift & Gauvin drag by
    # Simpson's rule in ln Re; scipy's DOP853 in time must agree (stated error 1e-12).
    d, rho = 50e-6, 1000.0
    v0 = re0 * gas.air_viscosity() / (gas.air_density() * d)
    ref = _integrated_stopping_distance(d, v0, rho, _clift_gauvin)
    assert particle.stopping_distance(d, v0, rho) == pytest.approx(ref, rel=1e-8)
