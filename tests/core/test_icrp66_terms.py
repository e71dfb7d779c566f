"""ICRP 66 batch curves: the shared-term form against Annex D's equations written out directly.

:func:`driftdose.deposition.icrp66_curves` computes each term a (x y)^p as (a y^p) x^p, so
that powers of the size are shared by the breathing patterns, and it keeps the diffusion
(thermodynamic) terms of each size between calls. Here the equations of the module
docstring (ICRP 66, Annex D, as the module states them) are written out once more in the
order the publication gives them, one filter after another for each path and pattern, and
the two must agree to rounding. Then: what is kept between calls never changes a result.
"""

from __future__ import annotations

import importlib
import math

import pytest

from driftdose import particle
from driftdose._numerics import logspace
from driftdose.deposition import (
    BreathingPattern,
    Subject,
    activity,
    icrp66_curves,
    inhalability,
    reference_worker,
)

icrp66_module = importlib.import_module("driftdose.deposition.icrp66")

BODY = 310.15


def _efficiency(ae: float, th: float) -> float:
    return min(1.0, math.sqrt(ae * ae + th * th))


def _pattern(p: BreathingPattern, d_ae: float, dcm: float, psi: float) -> list[float]:
    """ET1, ET2, BB, bb, AI per inhaled particle for one pattern (Annex D, written out)."""
    vt, frc, q = p.tidal_volume * 1e6, p.frc * 1e6, p.flow * 1e6
    v_et, v_bb, v_b = p.dead_space_et * 1e6, p.dead_space_bb_big * 1e6, p.dead_space_bb_small * 1e6
    phi_bb = 1.0 - v_et / vt
    phi_b = 1.0 - (v_et + v_bb * (1.0 + vt / frc)) / vt
    phi_ai = max(0.0, 1.0 - (v_et + (v_bb + v_b) * (1.0 + vt / frc)) / vt)
    t_bb = v_bb * (1.0 + vt / (2.0 * frc)) / q
    t_b = v_b * (1.0 + vt / (2.0 * frc)) / q
    t_ai = phi_ai * vt / q
    s_t, s_b, s_a = p.scale_t, p.scale_b, p.scale_a
    da = d_ae * 1e6

    def thoracic(a_ae: float, r_ae: float, p_ae: float, a_th: float, r_th: float, p_th: float):
        return _efficiency(1.0 - math.exp(-a_ae * r_ae**p_ae), 1.0 - math.exp(-a_th * r_th**p_th))

    r_bb = da * da * q * s_t**2.3
    th_bb = (22.02 * s_t**1.24 * psi, dcm * t_bb, 0.6391)
    bb_in = thoracic(4.08e-6, r_bb, 1.152, *th_bb)
    bb_out = thoracic(2.04e-6, r_bb, 1.152, *th_bb)
    r_b = (0.056 + t_b**1.5) * da ** (t_b**-0.25)
    b = thoracic(0.1147, r_b, 1.173, -76.8 + 167.0 * s_b**0.65, dcm * t_b, 0.5676)
    ai = thoracic(
        0.146 * s_a**0.98, da * da * t_ai, 0.6495, 170.0 + 103.0 * s_a**2.13, dcm * t_ai, 0.6101
    )
    paths = []
    if p.nasal_fraction > 0.0:
        qn = p.nasal_fraction * q
        r = da * da * qn * s_t**3
        th_r = dcm * (qn * s_t) ** -0.25
        et1 = _efficiency(
            0.5 * (1.0 - 1.0 / (1.0 + 3.0e-4 * r)), 0.5 * (1.0 - math.exp(-18.0 * th_r**0.5))
        )
        et2 = _efficiency(1.0 - 1.0 / (1.0 + 5.5e-5 * r**1.17), 1.0 - math.exp(-15.1 * th_r**0.538))
        paths.append((p.nasal_fraction, et1, et2))
    if p.nasal_fraction < 1.0:
        qm = (1.0 - p.nasal_fraction) * q
        r = da * da * qm**0.6 * vt**-0.2 * s_t**1.4
        th_r = dcm * (qm * s_t) ** -0.25
        et2 = _efficiency(1.0 - 1.0 / (1.0 + 1.1e-4 * r**1.4), 1.0 - math.exp(-9.0 * th_r**0.5))
        paths.append((1.0 - p.nasal_fraction, 0.0, et2))
    out = [0.0] * 5
    for share, e1, e2 in paths:
        # filters in turn: (region index, volumetric fraction, efficiency)
        filters = [
            (0, 1.0, e1),
            (1, 1.0, e2),
            (2, phi_bb, bb_in),
            (3, phi_b, b),
            (4, phi_ai, ai),
            (3, phi_b, b),
            (2, phi_bb, bb_out),
            (1, 1.0, e2),
            (0, 1.0, e1),
        ]
        reach = 1.0
        for region, phi, eta in filters:
            out[region] += share * phi * reach * eta
            reach *= 1.0 - eta
    return out


def _direct(d: float, rho: float, chi: float, subject: Subject, thermodynamic: str) -> list[float]:
    """ET1, ET2, BB, bb, AI of the particles in ambient air, one size at a time."""
    d_ae = particle.aerodynamic_diameter(d, rho, chi, BODY)
    chi_th = chi if thermodynamic == "mobility" else 1.0
    dcm = particle.diffusion_coefficient(d, BODY, 101325.0, chi_th) * 1e4
    d_th = d * chi_th * 1e6
    psi = 1.0 + 100.0 * math.exp(-(math.log10(100.0 + 10.0 / d_th**0.9) ** 2))
    volumes = [(p, p.ventilation * h) for p, h in subject.periods if h > 0.0]
    total = sum(v for _, v in volumes)
    out = [0.0] * 5
    for p, v in volumes:
        for i, x in enumerate(_pattern(p, d_ae, dcm, psi)):
            out[i] += v / total * x
    inh = inhalability(d_ae, subject.wind_speed)
    return [inh * x for x in out]


SUBJECTS = {
    "worker_nose": reference_worker("nose"),
    "worker_mixed": reference_worker("mixed"),
    "worker_mouth_breather": reference_worker("mouth_breather"),
    "heavy_exercise_mouth": Subject.single(activity("heavy_exercise", "mouth")),
    "custom_half_nose": Subject.single(BreathingPattern("custom", 1.0e-3, 0.3, 0.5)),
    "worker_in_wind": Subject("in wind", reference_worker("mixed").periods, wind_speed=3.0),
}


@pytest.mark.parametrize("subject", SUBJECTS.values(), ids=SUBJECTS.keys())
@pytest.mark.parametrize(("rho", "chi"), [(1000.0, 1.0), (3000.0, 1.5), (11000.0, 1.2)])
@pytest.mark.parametrize("thermodynamic", ["icrp66", "mobility"])
def test_batch_curves_equal_equations_written_out(subject, rho, chi, thermodynamic):
    # same equations, written out filter by filter: agreement to rounding (1e-13 absolute;
    # the grid's aerodynamic solves differ from one-at-a-time solves by about 1e-14)
    sizes = logspace(1e-9, 100e-6, 61)
    curves = icrp66_curves(sizes, rho, chi, subject, thermodynamic=thermodynamic)
    for k, d in enumerate(sizes):
        direct = _direct(d, rho, chi, subject, thermodynamic)
        for i, region in enumerate(("ET1", "ET2", "BB", "bb", "AI")):
            assert curves[region][k] == pytest.approx(direct[i], rel=1e-11, abs=1e-13), (region, d)


def test_kept_diffusion_terms_change_no_result():
    # a second density reuses the kept terms; the results equal those computed from nothing
    sizes = logspace(1e-9, 100e-6, 41)
    subject = reference_worker("mouth_breather")
    icrp66_module._thermo_kept.clear()
    icrp66_curves(sizes, 1000.0, 1.5, subject)
    assert icrp66_module._thermo_kept
    kept = icrp66_curves(sizes, 2500.0, 1.5, subject)
    icrp66_module._thermo_kept.clear()
    fresh = icrp66_curves(sizes, 2500.0, 1.5, subject)
    assert kept == fresh


def test_kept_diffusion_terms_are_per_convention():
    # the mobility convention puts the shape factor in diffusion: its terms are kept apart
    sizes = [20e-9, 50e-9, 100e-9]
    subject = reference_worker("mixed")
    icrp66_module._thermo_kept.clear()
    published = icrp66_curves(sizes, 1000.0, 1.5, subject)
    mobility = icrp66_curves(sizes, 1000.0, 1.5, subject, thermodynamic="mobility")
    assert all(m < p for m, p in zip(mobility["AI"], published["AI"], strict=True))
    icrp66_module._thermo_kept.clear()
    assert icrp66_curves(sizes, 1000.0, 1.5, subject, thermodynamic="mobility") == mobility


def test_kept_diffusion_terms_are_bounded():
    subject = reference_worker("mixed")
    icrp66_module._thermo_kept.clear()
    for shift in range(12):
        sizes = logspace(1.01e-9 * (1.0 + shift / 100.0), 90e-6, 1000)
        icrp66_curves(sizes, 1000.0, 1.0, subject)
        kept = sum(len(v) for v in icrp66_module._thermo_kept.values())
        assert kept <= icrp66_module.THERMO_KEPT
