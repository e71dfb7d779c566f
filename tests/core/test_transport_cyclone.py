"""Cyclone penetration curves: lognormal from a cut size, or the ideal ISO 7708 curve."""

from __future__ import annotations

import math

import pytest

from driftdose import conventions, particle
from driftdose.transport import cyclone


@pytest.mark.parametrize(
    ("d_um", "percent"),
    [
        # ISO 7708:1995 tabulated values, respirable convention, % of total airborne particles
        # (from memory); printed to 0.1 %: tolerance 0.05 percentage points.
        pytest.param(1.0, 97.1, id="iso7708-1um"),
        pytest.param(3.0, 73.9, id="iso7708-3um"),
        pytest.param(4.0, 50.0, id="iso7708-4um"),
        pytest.param(5.0, 30.0, id="iso7708-5um"),
        pytest.param(10.0, 1.3, id="iso7708-10um"),
    ],
)
def test_cyclone_penetration_iso7708_respirable_table(d_um, percent) -> None:
    # Unit density: volume-equivalent equals aerodynamic diameter.
    p = cyclone.cyclone_penetration(d_um * 1e-6, curve="iso7708_respirable", density=1000.0)
    assert p * 100.0 == pytest.approx(percent, abs=0.05)


def test_lognormal_penetration_definition_of_curve_gsd() -> None:
    # 50 % at the cut; at d50 * sigma the penetration is 1 - Phi(1) = 0.1587 (standard normal
    # table, Abramowitz & Stegun 1964, Table 26.1; 4 digits).
    assert cyclone.lognormal_penetration(3.5e-6, 3.5e-6, 1.4) == pytest.approx(0.5, abs=1e-15)
    assert cyclone.lognormal_penetration(3.5e-6 * 1.4, 3.5e-6, 1.4) == pytest.approx(
        0.1587, abs=5e-5
    )
    assert cyclone.lognormal_penetration(3.5e-6 / 1.4, 3.5e-6, 1.4) == pytest.approx(
        0.8413, abs=5e-5
    )


def test_cyclone_penetration_uses_aerodynamic_diameter() -> None:
    # A dense particle is cut at a smaller physical size: P(d, rho) = P_ae(d_ae(d, rho)).
    d, rho = 2e-6, 3000.0
    d_ae = particle.aerodynamic_diameter(d, rho)
    assert cyclone.cyclone_penetration(d, 4e-6, 1.5, rho) == pytest.approx(
        cyclone.lognormal_penetration(d_ae, 4e-6, 1.5), rel=1e-12
    )
    assert d_ae == pytest.approx(d * math.sqrt(3.0), rel=0.03)


def test_iso7708_fraction_names() -> None:
    # The ISO 7708 curves live in conventions only; the cyclone's ideal curve is that one.
    assert conventions.iso7708_fraction(10e-6, "thoracic") == pytest.approx(0.5, abs=5e-4)
    with pytest.raises(ValueError, match="valid"):
        conventions.iso7708_fraction(1e-6, "nasal")
    assert not hasattr(cyclone, "iso7708_fraction")
    assert cyclone.cyclone_penetration(3e-6, curve="iso7708_respirable") == pytest.approx(
        conventions.respirable(3e-6), rel=1e-15
    )
    with pytest.raises(ValueError, match="valid"):
        cyclone.cyclone_penetration(1e-6, curve="flat")
