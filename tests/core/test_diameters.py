"""Equivalent diameters and effective density (DeCarlo et al. 2004 relations).

No worked numerical example of DeCarlo et al. (2004) is recalled with enough confidence to
be used here, so the checks are the relations' published limits (continuum and
free-molecular), identities that follow from the definitions (two independent routes to the
same number), and scipy's ``brentq`` solving the same implicit equations independently
(labelled as scipy cross-checks).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from driftdose import diameters as dia
from driftdose import particle
from driftdose.diameters import DIAMETER_TYPES, ParticleDescription

CHIS = (1.08, 1.5, 2.4)


# ---- limits of the mobility relation (DeCarlo et al. 2004, from memory) -------------------


@pytest.mark.parametrize("chi", CHIS)
def test_mobility_diameter_continuum_limit_is_chi_times_dve(chi):
    # DeCarlo et al. (2004): in the continuum regime d_m = chi d_ve. At 50 um, Cc - 1 is
    # about 0.3 %, so the ratio of slip corrections departs from 1 by less than 0.3 %.
    d = 50e-6
    assert dia.mobility_diameter(d, chi) / d == pytest.approx(chi, rel=3e-3)


@pytest.mark.parametrize("chi", CHIS)
def test_mobility_diameter_free_molecular_limit_is_sqrt_chi_times_dve(chi):
    # DeCarlo et al. (2004): in the free-molecular regime (Cc proportional to 1/d)
    # d_m = sqrt(chi) d_ve. At 1 nm and 10 kPa, Kn is about 1300; the next terms of Cc are
    # of order 1/Kn, so 2e-3 covers them.
    d = 1e-9
    dm = dia.mobility_diameter(d, chi, P=10e3)
    assert dm / d == pytest.approx(math.sqrt(chi), rel=2e-3)


@pytest.mark.parametrize("chi", CHIS)
def test_effective_density_continuum_limit_is_rho_over_chi_cubed(chi):
    # DeCarlo et al. (2004): rho_eff = rho_p / chi^3 in the continuum regime
    assert dia.effective_density(50e-6, 3000.0, chi) == pytest.approx(3000.0 / chi**3, rel=1e-2)


def test_spheres_have_equal_mobility_and_volume_equivalent_diameters():
    # DeCarlo et al. (2004): for spheres (chi = 1) d_m = d_ve and rho_eff = rho_p
    for d in (3e-9, 80e-9, 2e-6):
        assert dia.mobility_diameter(d, 1.0) == d
        assert dia.effective_density(d, 2200.0, 1.0) == pytest.approx(2200.0, rel=1e-15)


# ---- scipy cross-checks (independent solution of the same implicit equations) ---------------


@pytest.mark.parametrize("d", [2e-9, 30e-9, 300e-9, 3e-6])
@pytest.mark.parametrize("chi", CHIS)
def test_mobility_diameter_matches_scipy_brentq(d, chi):
    """Cross-check with scipy: brentq on d_m / Cc(d_m) = chi d / Cc(d)."""
    cc = particle.slip_correction
    target = chi * d / cc(d)
    ref = brentq(lambda x: x / cc(x) - target, d * 0.5, d * chi * 2.0, xtol=1e-22, rtol=1e-14)
    assert dia.mobility_diameter(d, chi) == pytest.approx(ref, rel=1e-10)


@pytest.mark.parametrize("dm", [5e-9, 150e-9, 4e-6])
def test_mobility_from_aerodynamic_matches_scipy_brentq(dm):
    """Cross-check with scipy: brentq on rho_0 d_a^2 Cc(d_a) = rho_eff d_m^2 Cc(d_m)."""
    cc = particle.slip_correction
    rho_eff = 700.0
    da = dia.aerodynamic_from_mobility(dm, rho_eff)
    ref = brentq(
        lambda x: 1000.0 * da * da * cc(da) - rho_eff * x * x * cc(x),
        dm * 0.2,
        dm * 5.0,
        xtol=1e-22,
        rtol=1e-14,
    )
    assert ref == pytest.approx(dm, rel=1e-9)
    assert dia.mobility_from_aerodynamic(da, rho_eff) == pytest.approx(dm, rel=1e-9)


# ---- identities between the definitions ------------------------------------------------------


@pytest.mark.parametrize("d", [3e-9, 40e-9, 400e-9, 4e-6, 40e-6])
@pytest.mark.parametrize("chi", CHIS)
def test_aerodynamic_diameter_same_by_volume_and_by_mobility_route(d, chi):
    """Identity (DeCarlo et al. 2004): rho_0 d_a^2 Cc(d_a) = rho_eff d_m^2 Cc(d_m).

    Route 1: d_a from d_ve, rho_p and chi (Hinds 1999, eq. 3.30). Route 2: d_a of the
    mobility-equivalent sphere with the effective density. Both describe one particle.
    """
    rho = 4500.0
    da_1 = particle.aerodynamic_diameter(d, rho, chi)
    dm = dia.mobility_diameter(d, chi)
    da_2 = dia.aerodynamic_from_mobility(dm, dia.effective_density(d, rho, chi))
    assert da_2 == pytest.approx(da_1, rel=1e-9)


@pytest.mark.parametrize("d", [3e-9, 60e-9, 2e-6])
@pytest.mark.parametrize("chi", CHIS)
def test_mobility_sphere_has_the_particles_mobility_and_relaxation_time(d, chi):
    """The mobility-equivalent sphere (d_m, rho_eff, chi = 1) reproduces the particle's
    diffusion coefficient (same mobility, by definition of d_m) and relaxation time m B
    (same mass, by definition of rho_eff): Hinds (1999) eqs. 3.25, 5.3, 7.23 with slip."""
    rho = 2500.0
    dm = dia.mobility_diameter(d, chi)
    rho_eff = dia.effective_density(d, rho, chi)
    assert particle.diffusion_coefficient(dm) == pytest.approx(
        particle.diffusion_coefficient(d, shape_factor=chi), rel=1e-10
    )
    assert particle.relaxation_time(dm, rho_eff) == pytest.approx(
        particle.relaxation_time(d, rho, shape_factor=chi), rel=1e-10
    )
    mass_sphere = rho_eff * math.pi / 6.0 * dm**3
    assert mass_sphere == pytest.approx(rho * math.pi / 6.0 * d**3, rel=1e-12)


# ---- ParticleDescription ---------------------------------------------------------------------


def test_description_rejects_unknown_basis_type_and_bad_values():
    with pytest.raises(ValueError):
        ParticleDescription(1000.0, 1.0, "bulk")
    with pytest.raises(ValueError):
        ParticleDescription(-1.0)
    with pytest.raises(ValueError):
        ParticleDescription(1000.0, 0.9)
    with pytest.raises(ValueError):
        ParticleDescription(1000.0).to_model(1e-7, "stokes")
    with pytest.raises(ValueError):
        ParticleDescription(1000.0).from_model(1e-7, "__proto__")


def test_description_material_basis_uses_volume_equivalent_sphere():
    desc = ParticleDescription(3000.0, 1.5)
    assert desc.coordinate == "volume_equivalent"
    assert (desc.model_density, desc.model_shape_factor) == (3000.0, 1.5)
    assert desc.to_model(1e-6, "aerodynamic") == pytest.approx(
        particle.volume_equivalent_diameter(1e-6, 3000.0, 1.5), rel=1e-12
    )
    assert desc.to_model(2e-7, "optical") == 2e-7
    assert desc.to_model(2e-7, "volume_equivalent") == 2e-7


def test_description_effective_basis_uses_mobility_sphere():
    desc = ParticleDescription(800.0, 1.8, "effective")
    assert desc.coordinate == "mobility"
    assert (desc.model_density, desc.model_shape_factor) == (800.0, 1.0)
    assert desc.to_model(1e-7, "mobility") == 1e-7
    assert desc.to_model(1e-7, "volume_equivalent") == pytest.approx(
        dia.mobility_diameter(1e-7, 1.8), rel=1e-12
    )
    # implied material density: rho_eff (d_m/d_ve)^3, about chi^3 rho_eff at 50 um
    assert desc.implied_material_density(50e-6) == pytest.approx(800.0 * 1.8**3, rel=1e-2)


@settings(max_examples=60, deadline=None)
@given(
    d=st.floats(1e-9, 1e-4),
    rho=st.floats(100.0, 25000.0),
    chi=st.floats(1.0, 5.0),
    basis=st.sampled_from(("material", "effective")),
    kind=st.sampled_from(DIAMETER_TYPES),
)
def test_description_round_trip_and_monotone(d, rho, chi, basis, kind):
    desc = ParticleDescription(rho, chi, basis)
    m = desc.to_model(d, kind)
    assert desc.from_model(m, kind) == pytest.approx(d, rel=1e-9)
    assert desc.to_model(d * 1.01, kind) > m
