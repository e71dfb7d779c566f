"""Shares of a distribution in the ISO 7708 fractions: the fast shared quadrature."""

from __future__ import annotations

import math

import pytest
from scipy import integrate

from driftdose import conventions, particle
from driftdose.distribution import LognormalMode, Multimodal


def _scipy_share(mode: LognormalMode, weight: str, convention) -> float:
    """Independent reference: scipy quad of the convention over the weight's lognormal."""
    med, s = mode.median(weight), math.log(mode.gsd)

    def integrand(z: float) -> float:
        d = med * math.exp(s * z)
        d_ae = particle.aerodynamic_diameter(d, mode.density, mode.shape_factor)
        return convention(d_ae) * math.exp(-0.5 * z * z) / math.sqrt(2 * math.pi)

    value, _ = integrate.quad(integrand, -12, 12, limit=200, epsabs=1e-12)
    return value


@pytest.mark.parametrize("weight", ["mass", "number"])
@pytest.mark.parametrize(
    ("cmd", "gsd", "rho", "chi"),
    [(40e-9, 1.8, 5000.0, 1.2), (1.5e-6, 2.2, 2600.0, 1.4), (6e-6, 1.3, 1000.0, 1.0)],
)
def test_convention_shares_vs_scipy_quad(weight, cmd, gsd, rho, chi):
    # cross-check against scipy.integrate.quad (independent numerical reference)
    mode = LognormalMode.from_number(cmd, gsd, 1e9, rho, chi)
    shares = conventions.convention_shares(mode, (weight,))[weight]
    for name, conv in conventions.CONVENTIONS.items():
        assert shares[name] == pytest.approx(_scipy_share(mode, weight, conv), abs=1e-6), name


def test_convention_shares_equal_convention_fractions_for_multimodal():
    dist = Multimodal(
        (
            LognormalMode.from_number(50e-9, 1.7, 1e11, 2000.0, 1.0),
            LognormalMode.from_number(3e-6, 2.0, 1e6, 2000.0, 1.0),
        )
    )
    both = conventions.convention_shares(dist, ("mass", "number"))
    for weight in ("mass", "number"):
        assert both[weight] == conventions.convention_fractions(dist, weight)


@pytest.mark.parametrize(
    ("cmd", "gsd", "rho", "chi"),
    [
        (5e-9, 1.05, 1000.0, 1.0),
        (40e-9, 1.8, 5000.0, 1.2),
        (0.3e-6, 2.2, 2600.0, 1.4),
        (100e-9, 5.0, 1000.0, 1.0),
        (1e-6, 5.0, 8000.0, 1.0),
        (8e-6, 3.5, 2000.0, 1.2),
    ],
)
def test_convention_shares_default_step_match_a_fine_grid(monkeypatch, cmd, gsd, rho, chi):
    # numerical check of the quadrature: the default step (ln GSD / 2, at most 0.3) against
    # a step of 0.002; shares above 1e-4 agree to 1e-8 (measured: below 2e-12; 0.4 gave 5e-9)
    mode = LognormalMode.from_number(cmd, gsd, 1e9, rho, chi)
    weights = ("mass", "number", "surface")
    coarse = conventions.convention_shares(mode, weights)
    monkeypatch.setattr(conventions, "CONVENTION_STEP", 0.002)
    fine = conventions.convention_shares(mode, weights)
    compared = 0
    for weight in weights:
        for name, value in fine[weight].items():
            if value > 1e-4:
                assert coarse[weight][name] == pytest.approx(value, rel=0, abs=1e-8), name
                compared += 1
    assert compared >= 4


def test_convention_shares_of_a_mode_do_not_depend_on_its_amount():
    # the shares a mode keeps are those of a unit concentration; a distribution's are the
    # modes' weighted by their totals
    one = LognormalMode.from_number(60e-9, 1.9, 1e9, 2500.0, 1.3)
    other = LognormalMode.from_number(60e-9, 1.9, 7e11, 2500.0, 1.3)
    a = conventions.convention_shares(one, ("mass", "number"))
    b = conventions.convention_shares(other, ("mass", "number"))
    for weight in ("mass", "number"):
        for name in conventions.CONVENTIONS:
            assert b[weight][name] == pytest.approx(a[weight][name], rel=1e-14)
    coarse = LognormalMode.from_number(3e-6, 2.0, 1e6, 2500.0, 1.3)
    both = conventions.convention_shares(Multimodal((one, coarse)), ("mass",))["mass"]
    alone = conventions.convention_shares(coarse, ("mass",))["mass"]
    m1, m2 = one.total("mass"), coarse.total("mass")
    for name, value in both.items():
        expected = (m1 * a["mass"][name] + m2 * alone[name]) / (m1 + m2)
        assert value == pytest.approx(expected, rel=1e-14)


def test_convention_shares_follow_the_step_in_force(monkeypatch):
    # what is kept is keyed by the quadrature step: another step is computed anew
    mode = LognormalMode.from_number(1e-6, 3.0, 1e6, 1000.0, 1.0)
    conventions.convention_shares(mode, ("mass",))
    before = conventions._mode_shares.cache_info()
    conventions.convention_shares(mode, ("mass",))
    again = conventions._mode_shares.cache_info()
    assert (again.hits, again.misses) == (before.hits + 1, before.misses)
    monkeypatch.setattr(conventions, "CONVENTION_STEP", 0.01)
    conventions.convention_shares(mode, ("mass",))
    assert conventions._mode_shares.cache_info().misses == before.misses + 1


def test_convention_table_is_the_one_size_conventions_written_out():
    # the shares' loop over sizes repeats the one-size values (themselves checked against
    # the ISO 7708 definitions in test_conventions.py) to the last bit
    sizes = [0.0, -1e-6] + [1e-9 * 10 ** (i / 24) for i in range(121)] + [150e-6]
    table = conventions._convention_table(sizes)
    assert table == [conventions._convention_values(d) for d in sizes]
    single = [
        (
            conventions.inhalable(d),
            conventions.thoracic(d),
            conventions.respirable(d),
            conventions.high_risk_respirable(d),
        )
        for d in sizes[2:]
    ]
    assert table[2:] == single
