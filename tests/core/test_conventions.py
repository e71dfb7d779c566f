"""ISO 7708:1995 sampling conventions against the standard's defined points and table.

Published-value checks: the defining 50 % points in the text of ISO 7708 (identical to
EN 481:1993) and values of its Table 1 (from memory; they follow from the definitions and
are printed to 0.1 %, so the tolerance is 0.05 percentage points).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from driftdose import conventions as c
from driftdose.distribution import LognormalMode


@pytest.mark.parametrize(
    ("func", "d_um", "expected"),
    [
        # ISO 7708 clause 7: 50 % of total airborne particles at 4 um in the respirable
        # convention (Gamma 4.25 um includes the inhalable factor)
        (c.respirable, 4.0, 0.500),
        # ISO 7708 clause 6: 50 % at 10 um in the thoracic convention (Gamma 11.64 um)
        (c.thoracic, 10.0, 0.500),
        # ISO 7708 clause 5: E_I = 0.5 (1 + exp(-0.06 D)): 100 % at 0, 50.1 % at 100 um
        (c.inhalable, 0.0, 1.000),
        (c.inhalable, 100.0, 0.501),
    ],
    ids=[
        "iso7708-respirable-50pct-4um",
        "iso7708-thoracic-50pct-10um",
        "iso7708-inhalable-0um",
        "iso7708-inhalable-100um",
    ],
)
def test_conventions_iso7708_defined_points(func, d_um, expected):
    assert func(d_um * 1e-6) == pytest.approx(expected, abs=5e-4)


def test_high_risk_respirable_iso7708_median_2p5um():
    # ISO 7708 clause 7.1: the high-risk respirable cumulative lognormal has median 2.5 um
    # and GSD 1.5; the 50 % point is of the penetration factor, which the inhalable
    # convention multiplies (so the convention itself is 46.5 % at 2.5 um)
    d = 2.5e-6
    assert c.high_risk_respirable(d) / c.inhalable(d) == pytest.approx(0.5, abs=1e-12)


@pytest.mark.parametrize(
    ("d_um", "expected_pct"),
    # EN 481:1993 / ISO 7708:1995 Table 1, respirable convention, % of total airborne
    # particles (from memory)
    [(1, 97.1), (2, 91.4), (3, 73.9), (5, 30.0), (6, 16.8), (7, 9.0), (8, 4.8), (10, 1.3)],
    ids=lambda v: f"iso7708-table1-respirable-{v}",
)
def test_respirable_iso7708_table(d_um, expected_pct):
    assert 100 * c.respirable(d_um * 1e-6) == pytest.approx(expected_pct, abs=0.05)


@pytest.mark.parametrize(
    ("d_um", "expected_pct"),
    # EN 481:1993 / ISO 7708:1995 Table 1, inhalable convention (from memory)
    [(1, 97.1), (2, 94.3), (10, 77.4), (20, 65.1), (50, 52.5)],
    ids=lambda v: f"iso7708-table1-inhalable-{v}",
)
def test_inhalable_iso7708_table(d_um, expected_pct):
    assert 100 * c.inhalable(d_um * 1e-6) == pytest.approx(expected_pct, abs=0.05)


@pytest.mark.parametrize(
    ("d_um", "expected_pct"),
    # EN 481:1993 / ISO 7708:1995 Table 1, thoracic convention beyond 10 um, % of total
    # airborne particles (from memory, to the whole per cent: tolerance half a unit)
    [(12, 35), (14, 23), (16, 15), (20, 6), (25, 2), (30, 1), (40, 0)],
    ids=lambda v: f"iso7708-table1-thoracic-{v}",
)
def test_thoracic_iso7708_table_beyond_10um(d_um, expected_pct):
    assert 100 * c.thoracic(d_um * 1e-6) == pytest.approx(expected_pct, abs=0.5)


@pytest.mark.parametrize("d_um", [10.5, 12, 15, 20, 30, 50, 80, 100])
def test_thoracic_iso7708_definition_beyond_10um_scipy(d_um):
    # ISO 7708 clause 6: E_T = E_I [1 - F(x)], x = ln(D / Gamma) / ln(Sigma), Gamma =
    # 11.64 um, Sigma = 1.5, F the standard normal cumulative distribution (scipy here).
    from scipy.stats import norm

    e_i = 0.5 * (1 + math.exp(-0.06 * d_um))
    expected = e_i * norm.sf(math.log(d_um / 11.64) / math.log(1.5))
    assert c.thoracic(d_um * 1e-6) == pytest.approx(expected, rel=1e-9, abs=1e-15)


@given(st.floats(min_value=0.0, max_value=100e-6))
def test_conventions_property_nested(d):
    # ISO 7708 clause 8: respirable within thoracic within inhalable; high-risk within
    # respirable (its median 2.5 um is below 4.25 um)
    assert 0.0 <= c.high_risk_respirable(d) <= c.respirable(d) + 1e-15
    assert c.respirable(d) <= c.thoracic(d) + 1e-15 <= c.inhalable(d) + 2e-15
    assert c.inhalable(d) <= 1.0


def test_convention_fractions_of_fine_aerosol_all_respirable():
    # ISO 7708: below about 1 um the thoracic and respirable penetration factors are 1, so
    # a 50 nm aerosol's respirable share equals its inhalable share
    r = c.convention_fractions(LognormalMode(50e-9, 1.5, 1e10), "mass")
    assert r["respirable"] == pytest.approx(r["inhalable"], rel=1e-6)
    assert r["thoracic"] == pytest.approx(r["inhalable"], rel=1e-6)
    assert 0.99 < r["inhalable"] < 1.0
