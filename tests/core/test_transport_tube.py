"""Diffusion losses in straight tubes against published values and an independent solution.

Three groups, kept apart:

1. published-value checks (source beside each case; "from memory" where a value was
   recalled rather than read from the printed page);
2. a cross-check against an independent numerical solution of the same physics (the Graetz
   problem for fully developed laminar flow, solved with scipy);
3. regression pins, labelled as such, with no claim of truth.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg

from driftdose import gas, particle
from driftdose.transport import tube
from driftdose.transport.flow import tube_reynolds_number

# ---------------------------------------------------------------------------------------------
# 1. Published values
# ---------------------------------------------------------------------------------------------


def test_penetration_gormley_kennedy1949_graetz_eigenvalue() -> None:
    # Far downstream only the first mode survives: -d ln P / d xi -> the first Graetz
    # eigenvalue, the fully developed Sherwood (Nusselt) number 3.66 of laminar tube flow at
    # uniform wall concentration (Incropera & DeWitt, Fundamentals of Heat and Mass
    # Transfer, 5th ed. 2002, Nu_D = 3.66; from memory). Printed to 3 digits:
    # tolerance half a unit in the last digit.
    xi1, xi2 = 0.5, 0.6
    p1 = tube.penetration_gormley_kennedy1949(xi1 / math.pi)
    p2 = tube.penetration_gormley_kennedy1949(xi2 / math.pi)
    slope = -math.log(p2 / p1) / (xi2 - xi1)
    assert slope == pytest.approx(3.66, abs=0.005)


def test_penetration_gormley_kennedy1949_leveque_limit() -> None:
    # Entrance region: mean Sherwood number 1.615 (Re Sc d/L)^(1/3) (Leveque 1928; Incropera
    # & DeWitt 2002, from memory). With Re Sc d/L = 4/xi the loss is
    # 1 - P = 1.615 4^(1/3) xi^(2/3) = 2.5637 xi^(2/3), the 2.56 of Gormley & Kennedy.
    # The next term is smaller by 1.2 xi^(1/3) / 2.56, below 1e-5 at xi = 1e-15. The model
    # carries Gormley & Kennedy's 2.56, printed to 3 digits: tolerance half a unit, 0.005.
    xi = 1e-15
    loss = 1.0 - tube.penetration_gormley_kennedy1949(xi / math.pi)
    assert loss / xi ** (2.0 / 3.0) == pytest.approx(1.615 * 4.0 ** (1.0 / 3.0), abs=0.005)


@pytest.mark.parametrize(
    ("function", "switch", "tolerance"),
    [
        # Gormley & Kennedy (1949) three-term form, branches at xi = 0.02 (Brockmann 2001,
        # from memory); coefficients printed to 3 digits -> the branches may differ by a few
        # thousandths.
        pytest.param(
            tube.penetration_gormley_kennedy1949, 0.02 / math.pi, 0.005, id="gk1949-three-term"
        ),
        # Hinds (1999) eqs. 7.29-7.30 with the switch at mu = 0.009 (from memory); two-term
        # series printed to 3 digits: the branches meet to within 0.01.
        pytest.param(
            tube.penetration_gormley_kennedy_hinds1999, 0.009, 0.01, id="hinds1999-eq7.29-7.30"
        ),
    ],
)
def test_penetration_branches_continuous_at_switch(function, switch, tolerance) -> None:
    below = function(switch * (1.0 - 1e-12))
    above = function(switch)
    assert abs(below - above) < tolerance
    # Both branches decrease through the switch (the jump is downwards, keeping P monotonic).
    assert below >= above


@pytest.mark.parametrize(
    ("mu", "expected"),
    [
        # Hinds (1999) eq. 7.29 evaluated by hand: 1 - 5.50 (0.001)^(2/3) + 3.77 (0.001)
        # = 1 - 0.0550 + 0.00377 = 0.94877.
        pytest.param(0.001, 0.94877, id="hinds1999-eq7.29-mu0.001"),
        # Hinds (1999) eq. 7.30 by hand: 0.819 e^-1.15 + 0.0975 e^-7.01
        # = 0.819 (0.316637) + 0.0975 (0.000902) = 0.259326 + 0.000088 = 0.259414.
        pytest.param(0.1, 0.25941, id="hinds1999-eq7.30-mu0.1"),
    ],
)
def test_penetration_gormley_kennedy_hinds1999_equations(mu, expected) -> None:
    # Hand evaluation of the printed equations, to the 5 digits carried by hand.
    assert tube.penetration_gormley_kennedy_hinds1999(mu) == pytest.approx(expected, abs=1e-5)


@pytest.mark.parametrize("mu", [1e-4, 1e-3, 5e-3, 0.009, 0.02, 0.05, 0.1, 0.3])
def test_penetration_two_published_forms_agree(mu) -> None:
    # Hinds's two-term form is the Gormley & Kennedy series with pi folded in (11.5 = 3.657 pi,
    # 70.1 = 22.3 pi); it drops the third exponential, worth at most 0.032 e^-(57 pi mu).
    # They must agree to the 0.01 the shorter form is good for.
    three = tube.penetration_gormley_kennedy1949(mu)
    two = tube.penetration_gormley_kennedy_hinds1999(mu)
    assert abs(three - two) < 0.01


def test_tube_diffusion_penetration_independent_of_tube_diameter() -> None:
    # Laminar losses depend on mu = D L / Q only (Hinds 1999, ch. 7): the stable
    # interface has no tube diameter, and the auto-regime one gives the same answer for any
    # diameter that keeps the flow laminar.
    d, length, flow = 20e-9, 2.0, 1e-3 / 60
    ref = tube.tube_diffusion_penetration(d, length, flow)
    for dt in (4e-3, 10e-3, 25e-3):
        assert tube_reynolds_number(flow, dt) < 2000
        assert tube.tube_diffusion_penetration_any(d, length, flow, dt) == ref


def test_tube_diffusion_penetration_friedlander1977_schmidt_scaling() -> None:
    # Friedlander (1977): V_d = 0.04 U Re^-1/4 Sc^-2/3, so at fixed flow ln P is proportional
    # to D^(2/3) (Sc = nu / D). Structural check of the published form.
    length, flow, dt = 5.0, 100e-3 / 60, 10e-3
    assert tube_reynolds_number(flow, dt) > 4000
    d1, d2 = 10e-9, 50e-9
    ln1 = math.log(tube.tube_diffusion_penetration_friedlander1977(d1, length, flow, dt))
    ln2 = math.log(tube.tube_diffusion_penetration_friedlander1977(d2, length, flow, dt))
    ratio = (particle.diffusion_coefficient(d1) / particle.diffusion_coefficient(d2)) ** (2 / 3)
    assert ln1 / ln2 == pytest.approx(ratio, rel=1e-12)


def test_tube_diffusion_penetration_friedlander1977_hand_calculation() -> None:
    # Hand calculation from the printed formula for 20 nm, 5 m of 10 mm tube at 100 L/min,
    # 20 degC: U = 21.22 m/s, Re = 14 070, Sc = nu / D; P = exp(-pi d_t L V_d / Q).
    d, length, flow, dt = 20e-9, 5.0, 100e-3 / 60, 10e-3
    u = 4 * flow / (math.pi * dt**2)
    nu = gas.air_viscosity() / gas.air_density()
    re = u * dt / nu
    sc = nu / particle.diffusion_coefficient(d)
    v_d = 0.04 * u / (re**0.25 * sc ** (2 / 3))
    expected = math.exp(-math.pi * dt * length * v_d / flow)
    got = tube.tube_diffusion_penetration_friedlander1977(d, length, flow, dt)
    assert got == pytest.approx(expected, rel=1e-9)


def test_tube_diffusion_penetration_any_laminar_below_2000_turbulent_above_4000() -> None:
    # Pipe flow is laminar below Re 2000 and turbulent above 4000 (common practice); the
    # published forms apply unchanged there.
    d, length, dt = 20e-9, 1.0, 10e-3
    nu = gas.air_viscosity() / gas.air_density()
    flow_lo = 1999 * nu * math.pi * dt / 4
    flow_hi = 4001 * nu * math.pi * dt / 4
    assert tube.tube_diffusion_penetration_any(d, length, flow_lo, dt) == (
        tube.tube_diffusion_penetration(d, length, flow_lo)
    )
    assert tube.tube_diffusion_penetration_any(d, length, flow_hi, dt) == (
        tube.tube_diffusion_penetration_friedlander1977(d, length, flow_hi, dt)
    )


def test_tube_diffusion_penetration_no_jump_at_2300() -> None:
    # The switch at Re 2300 jumped (10 nm, 2 m, 10 mm: 0.972 -> 0.898); across 2300 the
    # interpolated answer now moves by less than 0.001 per 0.1 % of flow.
    d, length, dt = 10e-9, 2.0, 10e-3
    nu = gas.air_viscosity() / gas.air_density()
    lo = tube.tube_diffusion_penetration_any(d, length, 2299 * nu * math.pi * dt / 4, dt)
    hi = tube.tube_diffusion_penetration_any(d, length, 2301 * nu * math.pi * dt / 4, dt)
    assert abs(hi - lo) < 1e-3


def test_tube_diffusion_penetration_unknown_model() -> None:
    with pytest.raises(ValueError, match="valid"):
        tube.tube_diffusion_penetration(1e-8, 1.0, 1e-5, model="nope")


# ---------------------------------------------------------------------------------------------
# 2. Cross-check: the Graetz problem solved numerically with scipy
# ---------------------------------------------------------------------------------------------


def _graetz_penetration(n_cells: int = 400):
    """Fully developed laminar flow, absorbing wall: finite volumes in r, scipy eigh in xi.

    Dimensionless: r in (0, 1), u = 2 (1 - r^2), and the axial coordinate D z / (U R^2)
    equals xi = pi D L / Q. M dc/dxi = -K c with M = diag(r u dr); P = 1'M c / 1'M 1.
    """
    h = 1.0 / n_cells
    r = (np.arange(n_cells) + 0.5) * h
    faces = np.arange(1, n_cells + 1) * h
    m = r * h * 2.0 * (1.0 - r**2)
    k = np.zeros((n_cells, n_cells))
    g = faces[:-1] / h
    idx = np.arange(n_cells - 1)
    k[idx, idx] += g
    k[idx + 1, idx + 1] += g
    k[idx, idx + 1] -= g
    k[idx + 1, idx] -= g
    k[-1, -1] += faces[-1] / (h / 2.0)  # c = 0 at the wall
    lam, phi = scipy.linalg.eigh(k, np.diag(m))
    a = phi.T @ m
    total = m.sum()
    return lam, lambda xi: float(np.sum(a**2 * np.exp(-lam * xi)) / total)


@pytest.fixture(scope="module")
def graetz():
    return _graetz_penetration()


def test_graetz_eigenvalues_match_gormley_kennedy_exponents(graetz) -> None:
    # The exponents 3.657, 22.3 and 57 of the three-term form are the first three Graetz
    # eigenvalues; printed to 4, 3 and 2 digits.
    lam, _ = graetz
    assert lam[0] == pytest.approx(3.657, abs=5e-4)
    assert lam[1] == pytest.approx(22.3, abs=0.05)
    assert lam[2] == pytest.approx(57.0, abs=0.5)


@pytest.mark.parametrize("xi", [1e-5, 1e-4, 1e-3, 0.01, 0.0199, 0.02, 0.05, 0.1, 0.3, 1.0])
def test_penetration_gormley_kennedy1949_vs_numerical_graetz(graetz, xi) -> None:
    # Coefficients printed to 3 digits; the branch joint differs by up to 0.003, so the
    # series is good to about 0.005 in P.
    _, exact = graetz
    assert tube.penetration_gormley_kennedy1949(xi / math.pi) == pytest.approx(exact(xi), abs=0.005)


@pytest.mark.parametrize("mu", [1e-5, 1e-4, 1e-3, 0.005, 0.009, 0.02, 0.05, 0.1, 0.3])
def test_penetration_gormley_kennedy_hinds1999_vs_numerical_graetz(graetz, mu) -> None:
    # The two-term form is good to about 0.01 (its branches meet to 0.006).
    _, exact = graetz
    assert tube.penetration_gormley_kennedy_hinds1999(mu) == pytest.approx(
        exact(math.pi * mu), abs=0.01
    )


# ---------------------------------------------------------------------------------------------
# 3. Regression pins (no claim of truth; they catch unintended changes)
# ---------------------------------------------------------------------------------------------


def test_tube_diffusion_penetration_regression_pin() -> None:
    # Regression pin: 10 nm, 1 m, 1 L/min, 20 degC, 1 atm, Kim et al. (2005) slip.
    assert tube.tube_diffusion_penetration(10e-9, 1.0, 1e-3 / 60) == pytest.approx(
        0.89347, abs=1e-5
    )
