"""Lung-deposited surface area against hand calculations from its definition.

Definition (Fissan et al. 2007, J. Nanopart. Res. 9:53; from memory): LDSA of a region is
the airborne surface-area concentration times the region's deposition fraction, summed over
sizes. For one size the hand calculation is N pi d^2 DF(d), with DF read from the ICRP 66
curves (``icrp66_curves``, tested against the publication's tables in ``test_icrp66.py``) or
from the simplified fits (Hinds 1999, eqs. 11.1-11.5). No published LDSA value for a stated
aerosol and breathing is recalled with confidence, so none is used here.
"""

from __future__ import annotations

import math

import pytest

from driftdose.deposition import REFERENCE_WORKER, Subject, activity, icrp66_curves, simplified_icrp
from driftdose.distribution import BinnedSpectrum, LognormalMode, Multimodal
from driftdose.dose import deposited_dose
from driftdose.ldsa import lung_deposited_surface_area


def _one_size(d, n):
    # a spectrum whose only non-empty bin is at d: a monodisperse aerosol
    return BinnedSpectrum((d, d * 1.5), (n, 0.0))


@pytest.mark.parametrize("d", [20e-9, 100e-9, 300e-9])
def test_ldsa_monodisperse_icrp66_reference_worker_hand_calculation(d):
    n = 1e10  # 10 000 per cm^3
    r = deposited_dose(_one_size(d, n), REFERENCE_WORKER, 8 * 3600.0)
    df = icrp66_curves([d], 1000.0, 1.0, REFERENCE_WORKER)
    s = n * math.pi * d * d  # m^2/m^3
    ldsa = lung_deposited_surface_area(r)
    assert ldsa["alveolar"] == pytest.approx(s * df["AI"][0], rel=1e-12)
    assert ldsa["tracheobronchial"] == pytest.approx(s * (df["BB"][0] + df["bb"][0]), rel=1e-12)
    assert ldsa["total"] == pytest.approx(s * df["total"][0], rel=1e-12)


def test_ldsa_100nm_in_um2_per_cm3():
    # hand calculation in the trade's units: 10 000 /cm^3 x pi (0.1 um)^2 = 314.16 um^2/cm^3
    # of airborne surface; times DF_AI at 100 nm gives the alveolar LDSA in um^2/cm^3
    r = deposited_dose(_one_size(100e-9, 1e10), REFERENCE_WORKER, 3600.0)
    df_ai = icrp66_curves([100e-9], 1000.0, 1.0, REFERENCE_WORKER)["AI"][0]
    assert lung_deposited_surface_area(r)["alveolar"] * 1e6 == pytest.approx(
        314.159265 * df_ai, rel=1e-8
    )


def test_ldsa_simplified_model_hand_calculation():
    # below 0.5 um the simplified fits take the physical diameter (Hinds 1999, ch. 11)
    d, n = 50e-9, 2e10
    r = deposited_dose(_one_size(d, n), REFERENCE_WORKER, 3600.0, model="simplified")
    df = simplified_icrp(d)
    s = n * math.pi * d * d
    ldsa = lung_deposited_surface_area(r)
    for key in ("alveolar", "tracheobronchial", "total"):
        assert ldsa[key] == pytest.approx(s * df[key], rel=1e-12)


def test_ldsa_does_not_depend_on_duration_and_is_bounded_by_airborne_surface():
    aerosol = Multimodal(
        (LognormalMode(30e-9, 1.7, 5e10, 2000.0), LognormalMode(300e-9, 1.6, 1e9, 2000.0))
    )
    a = lung_deposited_surface_area(deposited_dose(aerosol, REFERENCE_WORKER, 3600.0))
    b = lung_deposited_surface_area(deposited_dose(aerosol, REFERENCE_WORKER, 8 * 3600.0))
    assert a == pytest.approx(b, rel=1e-12)
    s = aerosol.total("surface")
    assert 0.0 < a["alveolar"] < a["total"] <= s
    assert 0.0 < a["tracheobronchial"] < a["total"]
    assert a["alveolar"] + a["tracheobronchial"] < a["total"]  # the head airways add to it


def test_ldsa_follows_the_breathing_pattern():
    # heavy exercise with mouth breathing changes the deposition fractions, hence LDSA
    aerosol = LognormalMode(60e-9, 1.8, 1e10)
    rest = lung_deposited_surface_area(
        deposited_dose(aerosol, Subject.single(activity("sitting", "nose")), 3600.0)
    )
    heavy = lung_deposited_surface_area(
        deposited_dose(aerosol, Subject.single(activity("heavy_exercise", "mouth")), 3600.0)
    )
    assert heavy["alveolar"] != pytest.approx(rest["alveolar"], rel=1e-3)
