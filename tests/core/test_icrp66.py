"""ICRP Publication 66 regional deposition model.

Published-value checks: the ICRP's own tabulated regional deposition for the reference
worker (ICRP 66, Table 5 / ICRP 68; values as recalled, "from memory" — see each case),
and the reference breathing parameters (ICRP 66, Annex B). The tolerance, 3 %, allows for
the slip-correction set (up to about 3 % in diffusion coefficients) and
for the recalled table's four printed digits. The shape factor enters only the aerodynamic
diameter (ICRP 66 convention, the default); with it in the mobility as well, bb and AI at
1 um AMAD fall outside the tolerance, which the tests show. Then: the shape of the curves,
consistency checks.
"""

from __future__ import annotations

import pytest

from driftdose.deposition import (
    ACTIVITIES,
    REFERENCE_WORKER,
    Subject,
    activity,
    icrp66,
    icrp66_curves,
    icrp66_lognormal,
    inhalability,
    reference_worker,
)

REL = 0.03

# ICRP 66 (1994) regional deposition, reference worker (normal nose breather, 2.5 h sitting
# + 5.5 h light exercise), density 3 g/cm3, shape factor 1.5, fraction of inhaled activity
# in ambient air. 5 um AMAD (GSD 2.5): from memory
# (ET1 ~0.34, ET2 ~0.40, BB ~0.018, bb ~0.011, AI ~0.053); printed to 4 digits as
# percentages 33.93, 39.94, 1.78, 1.10, 5.32, total 82.07 (from memory).
WORKER_5UM = {
    "ET1": 0.3393,
    "ET2": 0.3994,
    "BB": 0.0178,
    "bb": 0.0110,
    "AI": 0.0532,
    "total": 0.8207,
}
# 1 um AMAD (GSD 2.47), same table (from memory, less certain than the 5 um column).
WORKER_1UM = {
    "ET1": 0.1652,
    "ET2": 0.2112,
    "BB": 0.0124,
    "bb": 0.0165,
    "AI": 0.1066,
    "total": 0.5119,
}


@pytest.mark.parametrize(
    ("region", "expected"),
    list(WORKER_5UM.items()),
    ids=[f"icrp66-table-worker-5um-{k}" for k in WORKER_5UM],
)
def test_icrp66_lognormal_reference_worker_5um(region, expected):
    r = icrp66_lognormal(5e-6, 2.5, 3000.0, 1.5, REFERENCE_WORKER)
    assert r[region] == pytest.approx(expected, rel=REL)


@pytest.mark.parametrize(
    ("region", "expected"),
    list(WORKER_1UM.items()),
    ids=[f"icrp66-table-worker-1um-{k}" for k in WORKER_1UM],
)
def test_icrp66_lognormal_reference_worker_1um(region, expected):
    r = icrp66_lognormal(1e-6, 2.47, 3000.0, 1.5, REFERENCE_WORKER)
    assert r[region] == pytest.approx(expected, rel=REL)


@pytest.mark.parametrize(
    ("region", "expected", "low"),
    # same table (from memory); with chi also in the diffusion coefficient bb comes out
    # 10 % and AI 5 % low, outside the 3 % the table and the slip sets allow
    [("bb", 0.0165, 0.08), ("AI", 0.1066, 0.04)],
    ids=["icrp66-table-worker-1um-bb-mobility", "icrp66-table-worker-1um-AI-mobility"],
)
def test_icrp66_mobility_convention_departs_from_table(region, expected, low):
    r = icrp66_lognormal(1e-6, 2.47, 3000.0, 1.5, REFERENCE_WORKER, thermodynamic="mobility")
    assert r[region] < expected * (1 - low)


def test_icrp66_conventions_agree_for_spheres():
    # chi = 1: both conventions are the same sphere (definition)
    a = icrp66_curves([20e-9, 0.3e-6, 3e-6], 2000.0, 1.0)
    b = icrp66_curves([20e-9, 0.3e-6, 3e-6], 2000.0, 1.0, thermodynamic="mobility")
    for k in ("ET1", "ET2", "BB", "bb", "AI", "total"):
        assert a[k] == pytest.approx(b[k], rel=1e-12)


def test_icrp66_unknown_convention_lists_valid():
    with pytest.raises(ValueError, match="mobility"):
        icrp66(1e-6, thermodynamic="nonsense")


# --- shape of the curves (ICRP 66 Fig. of regional deposition; Hinds 1999 Fig. 11.4) ----


def _curves_unit_density():
    xs = [10 ** (-9 + 0.02 * i) for i in range(251)]  # 1 nm to 100 um
    return xs, icrp66_curves(xs, 1000.0, 1.0, REFERENCE_WORKER)


def test_icrp66_total_minimum_between_0_2_and_0_6um():
    # ICRP 66 (1994) and Hinds (1999) Fig. 11.4: total deposition is least for particles
    # of a few tenths of a micrometre, where neither diffusion nor inertia is effective
    # (common practice: minimum near 0.3-0.5 um); read to a factor of 1.5 either side
    xs, c = _curves_unit_density()
    x_min = xs[min(range(len(xs)), key=c["total"].__getitem__)]
    assert 0.2e-6 < x_min < 0.6e-6
    assert min(c["total"]) < 0.3


def test_icrp66_alveolar_peak_near_20nm():
    # ICRP 66 (1994) regional curves, Hinds (1999) Fig. 11.4: alveolar deposition of
    # ultrafine particles peaks near 20 nm (from memory), at about half the particles
    xs, c = _curves_unit_density()
    fine = [i for i, x in enumerate(xs) if x < 0.2e-6]
    i_max = max(fine, key=c["AI"].__getitem__)
    assert 10e-9 < xs[i_max] < 40e-9
    assert 0.35 < c["AI"][i_max] < 0.6


def test_icrp66_et_deposition_near_complete_at_1nm_and_10um():
    # ICRP 66 (1994): the extrathoracic airways take most 1 nm particles (diffusion) and
    # most particles of about 10 um aerodynamic (impaction) (common practice, from memory)
    c = icrp66_curves([1e-9, 10e-6], 1000.0, 1.0, REFERENCE_WORKER)
    assert c["ET1"][0] + c["ET2"][0] > 0.8
    assert (c["ET1"][1] + c["ET2"][1]) / c["inhalable"][1] > 0.8


@pytest.mark.parametrize(
    ("name", "m3_per_h"),
    # ICRP 66 Annex B (reference adult male): ventilation 0.45, 0.54, 1.5, 3.0 m3/h;
    # printed to 2-3 digits
    [("sleep", 0.45), ("sitting", 0.54), ("light_exercise", 1.5), ("heavy_exercise", 3.0)],
    ids=lambda v: f"icrp66-annexB-ventilation-{v}",
)
def test_activities_icrp66_ventilation(name, m3_per_h):
    assert ACTIVITIES[name].ventilation * 3600 == pytest.approx(m3_per_h, rel=0.005)


def test_reference_worker_icrp66_inhaled_volume():
    # ICRP 66 / ICRP 68: the reference worker inhales 9.6 m3 in an 8-h shift
    w = reference_worker()
    assert w.hours == 8.0
    assert w.inhaled_volume == pytest.approx(9.6, rel=1e-9)


def test_inhalability_icrp66_equation():
    # ICRP 66 Annex D: IF = 1 - 0.5 (1 - 1/(1 + 7.6e-4 d^2.8)); at 10 um (d in um):
    # 0.5 + 0.5 / (1 + 7.6e-4 * 10^2.8) = 0.5 + 0.5 / 1.47953 = 0.83795 (computed by hand)
    assert inhalability(10e-6) == pytest.approx(0.83795, abs=5e-5)


# --- consistency ------------------------------------------------------------------------


def test_icrp66_curves_equal_single_size():
    xs = [3e-9, 80e-9, 2e-6, 30e-6]
    c = icrp66_curves(xs, 2000.0, 1.3)
    for i, x in enumerate(xs):
        one = icrp66(x, 2000.0, 1.3)
        for k, v in one.items():
            assert c[k][i] == pytest.approx(v, rel=1e-14)


def test_icrp66_aerodynamic_and_volume_equivalent_agree():
    c = icrp66_curves([1e-6], 3000.0, 1.5)
    d_ae = c["d_ae"][0]
    a = icrp66(d_ae, 3000.0, 1.5, diameter_type="aerodynamic")
    assert a["total"] == pytest.approx(c["total"][0], rel=1e-9)


def test_icrp66_mouth_breathing_deposits_less_coarse_in_et():
    # ICRP 66: the mouth filters coarse particles less than the nose, more reach the lung
    nose = icrp66(5e-6, subject=Subject.single(activity("light_exercise", "nose")))
    mouth = icrp66(5e-6, subject=Subject.single(activity("light_exercise", "mouth")))
    assert mouth["ET1"] == 0.0
    assert mouth["ET1"] + mouth["ET2"] < nose["ET1"] + nose["ET2"]
    assert mouth["AI"] > nose["AI"]


def test_icrp66_normal_nose_breather_heavy_exercise_is_half_mouth():
    # ICRP 66 Annex B: the normal nose breather takes half the air through the mouth at
    # heavy exercise (F_n = 0.5), all through the nose at lighter activity
    assert activity("heavy_exercise", "mixed").nasal_fraction == 0.5
    assert activity("light_exercise", "mixed").nasal_fraction == 1.0
    assert activity("sitting", "mouth_breather").nasal_fraction == 0.7


def test_breathing_pattern_rejects_tidal_volume_below_dead_space():
    from driftdose.deposition import BreathingPattern

    with pytest.raises(ValueError, match="dead space"):
        Subject.single(BreathingPattern("tiny", 100e-6, 0.5))
