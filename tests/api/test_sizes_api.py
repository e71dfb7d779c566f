"""Boundary tests of diameter types, effective density, per-mode rows and LDSA.

Expected values come from the core's published relations (Hatch & Choate 1929 as in Hinds
1999, eqs. 4.47 and 4.52; Hinds 1999, eq. 3.30; DeCarlo et al. 2004, from memory) evaluated
by hand in the test, and from the LDSA definition (Fissan et al. 2007, from memory).
"""

from __future__ import annotations

import copy
import math

import pytest

from driftdose import diameters as dia
from driftdose import particle
from driftdose.api import describe, handle
from driftdose.deposition import REFERENCE_WORKER, icrp66_curves
from driftdose.transport import Chain, Tube


def _run(**inputs):
    return handle({"kind": "deposition", "inputs": inputs})


def _mode(basis="count", median=(50, "nm"), gsd=1.8, conc=(10000, "1/cm3"), dtype=None):
    m = {
        "basis": basis,
        "median": {"value": median[0], "unit": median[1]},
        "gsd": gsd,
        "concentration": {"value": conc[0], "unit": conc[1]},
    }
    if dtype is not None:
        m["diameter_type"] = dtype
    return m


def _ok(reply):
    assert reply["ok"] is True, reply.get("errors")
    return reply["results"]


# ---- item fields and declarations -------------------------------------------------------------


def test_declarations_offer_the_diameter_types_and_density_basis():
    dep = {f["name"]: f for f in describe()["calculations"]["deposition"]["fields"]}
    item = {f["name"]: f for f in dep["modes"]["item_fields"]}
    types = [c["value"] for c in item["diameter_type"]["choices"]]
    assert types == ["volume_equivalent", "optical", "mobility", "aerodynamic"]
    assert "count median" in item["median"]["label"] and "mass median" in item["median"]["label"]
    assert [c["value"] for c in dep["density_basis"]["choices"]] == ["material", "effective"]
    samp = {f["name"]: f for f in describe()["calculations"]["sampling"]["fields"]}

    # the same declaration; when it applies depends on each calculation's own source choice
    def declared(f):
        return {k: v for k, v in f.items() if k != "applies_when"}

    assert declared(samp["spectrum_diameter_type"]) == declared(dep["spectrum_diameter_type"])
    assert samp["spectrum_diameter_type"]["applies_when"]["field"] == "size_source"
    assert dep["spectrum_diameter_type"]["applies_when"]["field"] == "size_source"
    assert samp["density_basis"]["choices"] == dep["density_basis"]["choices"]
    assert "shape_factor" in samp


# ---- what a mass median means -------------------------------------------------------------------


def test_mmad_at_5_g_cm3_is_converted_and_explained():
    """0.3 um MMAD at 5 g/cm3: the volume-equivalent mass median solves Hinds (1999) eq. 3.30,
    the count median follows from Hatch-Choate CMD = MMD exp(-3 ln^2 GSD), and the number
    from N = M / (rho pi/6 CMD^3 exp(4.5 ln^2 GSD)) (Hinds 1999, eqs. 4.47, 4.52)."""
    gsd, mass = 2.0, 1e-9  # 1 ug/m3
    res = _ok(
        _run(
            modes=[_mode("mass", (0.3, "um"), gsd, (1, "ug/m3"), "aerodynamic")],
            particle_density={"value": 5, "unit": "g/cm3"},
        )
    )
    mmd = res["mode1_mass_median"]["si"]
    # the chart's axis is volume-equivalent: the mass median sits well below 0.3 um
    assert particle.aerodynamic_diameter(mmd, 5000.0) == pytest.approx(0.3e-6, rel=1e-9)
    # continuum limit 0.3/sqrt(5) = 0.134 um (Hinds 1999, eq. 3.27) is an upper bound:
    # slip is larger for the smaller particle, so it needs even less size (about 98 nm)
    assert mmd < 0.3e-6 / math.sqrt(5)
    assert res["mode1_mmad"]["si"] == pytest.approx(0.3e-6, rel=1e-9)
    s2 = math.log(gsd) ** 2
    cmd = mmd * math.exp(-3 * s2)
    assert res["mode1_count_median"]["si"] == pytest.approx(cmd, rel=1e-12)
    n = mass / (5000.0 * math.pi / 6 * cmd**3 * math.exp(4.5 * s2))
    assert res["mode1_number"]["si"] == pytest.approx(n, rel=1e-12)
    assert res["mode1_number"]["unit"] == "1/cm3"
    assert res["mode1_number"]["value"] == pytest.approx(n / 1e6, rel=1e-12)
    assert res["mode1_mass"]["si"] == pytest.approx(mass, rel=1e-12)
    assert "volume-equivalent" in res["mode1_count_median"]["label"]
    assert "aerodynamic" in res["mode1_count_median"]["note"]


def test_geometric_mass_median_is_taken_as_is():
    res = _ok(
        _run(
            modes=[_mode("mass", (0.3, "um"), 2.0, (1, "ug/m3"), "volume_equivalent")],
            particle_density={"value": 5, "unit": "g/cm3"},
        )
    )
    assert res["mode1_mass_median"]["si"] == pytest.approx(0.3e-6, rel=1e-12)
    assert res["mode1_mmad"]["si"] == pytest.approx(
        particle.aerodynamic_diameter(0.3e-6, 5000.0), rel=1e-9
    )


def test_old_links_keep_their_meaning_mass_aerodynamic_count_geometric():
    """Modes without a diameter type: a mass median is aerodynamic, a count median
    volume-equivalent, as before the choice existed (links and saved files)."""
    kw = {"particle_density": {"value": 3, "unit": "g/cm3"}}
    old = _run(modes=[_mode("mass", (2, "um"), 2.0, (1, "mg/m3"))], **kw)
    new = _run(modes=[_mode("mass", (2, "um"), 2.0, (1, "mg/m3"), "aerodynamic")], **kw)
    assert old["results"] == new["results"]
    old = _run(modes=[_mode("count", (80, "nm"))], **kw)
    new = _run(modes=[_mode("count", (80, "nm"), dtype="volume_equivalent")], **kw)
    assert old["results"] == new["results"]


def test_mobility_count_median_material_basis():
    chi = 1.6
    res = _ok(
        _run(
            modes=[_mode("count", (80, "nm"), 1.7, (2e4, "1/cm3"), "mobility")],
            shape_factor={"value": chi, "unit": "1"},
        )
    )
    assert res["mode1_count_median"]["si"] == pytest.approx(
        dia.volume_equivalent_from_mobility(80e-9, chi), rel=1e-12
    )
    assert res["mode1_number"]["value"] == pytest.approx(2e4, rel=1e-12)


def test_optical_is_volume_equivalent():
    a = _run(modes=[_mode("count", (300, "nm"), dtype="optical")])
    b = _run(modes=[_mode("count", (300, "nm"), dtype="volume_equivalent")])
    assert a["results"]["mode1_count_median"]["si"] == b["results"]["mode1_count_median"]["si"]
    assert a["results"]["fraction_AI_number"] == b["results"]["fraction_AI_number"]


# ---- agglomerates: effective density ------------------------------------------------------------


def test_effective_density_works_on_the_mobility_sphere():
    """With an effective density the models use the mobility-equivalent sphere: a mode of
    80 nm mobility diameter deposits as spheres of 80 nm and the effective density."""
    rho_eff = 600.0
    res_eff = _ok(
        _run(
            modes=[_mode("count", (80, "nm"), 1.7, (2e4, "1/cm3"), "mobility")],
            particle_density={"value": rho_eff, "unit": "kg/m3"},
            density_basis="effective",
            shape_factor={"value": 2.0, "unit": "1"},
        )
    )
    res_sph = _ok(
        _run(
            modes=[_mode("count", (80, "nm"), 1.7, (2e4, "1/cm3"), "volume_equivalent")],
            particle_density={"value": rho_eff, "unit": "kg/m3"},
        )
    )
    for key in ("fraction_AI_number", "fraction_total_mass", "ldsa_alveolar", "mode1_mmad"):
        assert res_eff[key]["si"] == pytest.approx(res_sph[key]["si"], rel=1e-12), key
    assert res_eff["mode1_count_median"]["si"] == pytest.approx(80e-9, rel=1e-12)
    assert "mobility-equivalent" in res_eff["mode1_count_median"]["label"]


def test_effective_density_mmad_converts_to_mobility_median():
    rho_eff = 900.0
    r = _run(
        modes=[_mode("mass", (0.5, "um"), 1.9, (0.2, "mg/m3"), "aerodynamic")],
        particle_density={"value": rho_eff, "unit": "kg/m3"},
        density_basis="effective",
        shape_factor={"value": 1.8, "unit": "1"},
    )
    res = _ok(r)
    assert res["mode1_mass_median"]["si"] == pytest.approx(
        dia.mobility_from_aerodynamic(0.5e-6, rho_eff), rel=1e-12
    )
    assert r["curves"]["x_label"] == "Particle diameter (mobility-equivalent)"
    assert "decarlo2004" in [s["key"] for s in r["sources"]]


def test_effective_density_csv_spectrum_bins_are_converted():
    text = "d_nm;dN\n50;100\n100;300\n200;50\n"
    base = {
        "size_source": "csv",
        "csv_text": text,
        "csv_concentration_type": "per_bin",
        "particle_density": {"value": 1.2, "unit": "g/cm3"},
    }
    vol = _ok(_run(**base, spectrum_diameter_type="volume_equivalent"))
    mob = _ok(_run(**base, spectrum_diameter_type="mobility"))
    shape = {"shape_factor": {"value": 1.7, "unit": "1"}}
    mob_chi = _ok(_run(**base, **shape, spectrum_diameter_type="mobility"))
    # spheres (chi = 1): mobility = volume-equivalent
    assert mob["fraction_AI_number"] == vol["fraction_AI_number"]
    # chi 1.7: the 100 nm mobility bin is a smaller volume-equivalent particle
    assert mob_chi["surface_concentration"]["si"] < mob["surface_concentration"]["si"]
    d_ve = [dia.volume_equivalent_from_mobility(d, 1.7) for d in (50e-9, 100e-9, 200e-9)]
    surface = sum(n * 1e6 * math.pi * d * d for n, d in zip((100, 300, 50), d_ve, strict=True))
    assert mob_chi["surface_concentration"]["si"] == pytest.approx(surface, rel=1e-12)


def test_effective_density_warns_when_it_cannot_fit_the_shape_factor():
    r = _run(
        modes=[_mode("count", (5, "um"), 1.5, (1, "1/cm3"), "mobility")],
        particle_density={"value": 10, "unit": "g/cm3"},
        density_basis="effective",
        shape_factor={"value": 3.0, "unit": "1"},
    )
    assert r["ok"] is True
    assert any("do not fit together" in w for w in r["warnings"]), r["warnings"]


@pytest.mark.parametrize(
    "bad",
    ["stokes", "__proto__", "", None.__class__.__name__, ["aerodynamic"], {"a": 1}, 3, True],
)
def test_bad_diameter_type_is_refused_without_a_result(bad):
    mode = _mode("count", (80, "nm"))
    mode["diameter_type"] = bad
    sent = copy.deepcopy(mode)
    r = _run(modes=[mode])
    assert r["ok"] is False and "results" not in r
    assert r["errors"][0]["field"] == "modes.0.diameter_type"
    assert "diameter of type" in r["errors"][0]["message"]
    assert mode == sent  # the request is not changed


@pytest.mark.parametrize("bad", ["bulk", "__proto__", "", ["effective"], 1])
def test_bad_density_basis_is_refused(bad):
    for kind in ("deposition", "sampling"):
        r = handle({"kind": kind, "inputs": {"density_basis": bad}})
        assert r["ok"] is False and "results" not in r
        assert any(e["field"] == "density_basis" for e in r["errors"])


# ---- LDSA ------------------------------------------------------------------------------------


def test_ldsa_rows_units_and_hand_calculation():
    """A narrow mode (GSD 1.01) of 100 nm, 10 000 /cm3: airborne surface
    N pi CMD^2 exp(2 ln^2 GSD) (Hinds 1999, eq. 4.51), alveolar LDSA = surface x DF_AI(100 nm)
    within the spread of DF over the mode (GSD 1.01: below 1e-3)."""
    r = _run(modes=[_mode("count", (100, "nm"), 1.01, (1e4, "1/cm3"), "volume_equivalent")])
    res = _ok(r)
    s = 1e4 * math.pi * 0.1**2 * math.exp(2 * math.log(1.01) ** 2)  # um^2/cm^3
    df = icrp66_curves([100e-9], 1000.0, 1.0, REFERENCE_WORKER)
    row = res["ldsa_alveolar"]
    assert row["unit"] == "um2/cm3" and row["si_unit"] == "m2/m3"
    assert row["value"] == pytest.approx(row["si"] * 1e6, rel=1e-12)
    assert row["value"] == pytest.approx(s * df["AI"][0], rel=1e-3)
    assert res["ldsa_tracheobronchial"]["value"] == pytest.approx(
        s * (df["BB"][0] + df["bb"][0]), rel=1e-3
    )
    assert res["ldsa_total"]["value"] == pytest.approx(s * df["total"][0], rel=1e-3)
    assert "ldsa_fissan2007" in [x["key"] for x in r["sources"]]


def test_ldsa_is_surface_concentration_times_surface_fraction():
    res = _ok(_run())
    s = res["surface_concentration"]["si"]
    assert res["ldsa_alveolar"]["si"] == pytest.approx(
        s * res["fraction_AI_surface"]["si"], rel=1e-12
    )
    assert res["ldsa_total"]["si"] == pytest.approx(
        s * res["fraction_total_surface"]["si"], rel=1e-12
    )


def test_ldsa_simplified_model_rows():
    res = _ok(_run(model="simplified"))
    s = res["surface_concentration"]["si"]
    assert res["ldsa_alveolar"]["si"] == pytest.approx(
        s * res["fraction_alveolar_surface"]["si"], rel=1e-12
    )
    assert res["ldsa_tracheobronchial"]["si"] == pytest.approx(
        s * res["fraction_tracheobronchial_surface"]["si"], rel=1e-12
    )


# ---- sampling ----------------------------------------------------------------------------------


def _sampling(**inputs):
    stages = [
        {
            "type": "tube",
            "length": {"value": 2, "unit": "m"},
            "tube_diameter": {"value": 4, "unit": "mm"},
        }
    ]
    return handle({"kind": "sampling", "inputs": {"stages": stages, **inputs}})


def test_sampling_spectrum_mobility_with_effective_density():
    text = "d_nm;dN\n20;100\n80;300\n400;50\n"
    chi, rho_eff = 1.9, 700.0
    base = {
        "size_source": "csv",
        "csv_text": text,
        "csv_concentration_type": "per_bin",
        "particle_density": {"value": rho_eff, "unit": "kg/m3"},
        "density_basis": "effective",
        "shape_factor": {"value": chi, "unit": "1"},
    }
    chain = Chain((Tube(2.0, 4e-3, 1.5e-3 / 60.0),))
    for dtype, convert in (
        ("mobility", lambda d: d),
        ("volume_equivalent", lambda d: dia.mobility_diameter(d, chi)),
        ("aerodynamic", lambda d: dia.mobility_from_aerodynamic(d, rho_eff)),
    ):
        r = _sampling(**base, spectrum_diameter_type=dtype)
        rows = _ok(r)["spectrum_table"]["rows"]
        for row, d in zip(rows, (20e-9, 80e-9, 400e-9), strict=True):
            assert row["diameter"] == pytest.approx(d * 1e6, rel=1e-12)
            expected = chain.penetration(convert(d), rho_eff)
            assert row["penetration"] == pytest.approx(expected, rel=1e-9), dtype
        assert r["curves"]["x_label"] == "Particle diameter (mobility-equivalent)"


def test_sampling_shape_factor_ignored_for_spheres_with_a_warning():
    a = _sampling(shape_factor={"value": 2.0, "unit": "1"})
    b = _sampling()
    assert a["results"] == b["results"]
    assert any("shape factor" in w for w in a["warnings"])
    assert not any("shape factor" in w for w in b["warnings"])


def test_effective_density_same_under_either_diffusion_convention():
    """The mobility-equivalent sphere has shape factor 1, so whether the shape factor also
    enters diffusion (ICRP 66 convention or mobility) changes nothing with an effective
    density, and no warning about it is given."""
    base = {
        "modes": [_mode("count", (40, "nm"), 1.8, (5e4, "1/cm3"), "mobility")],
        "particle_density": {"value": 0.8, "unit": "g/cm3"},
        "density_basis": "effective",
        "shape_factor": {"value": 2.2, "unit": "1"},
    }
    a = _run(**base, thermodynamic_convention="icrp66")
    b = _run(**base, thermodynamic_convention="mobility")
    assert _ok(a) == _ok(b)
    assert not any("Diffusion is computed with the shape factor" in w for w in b["warnings"])
