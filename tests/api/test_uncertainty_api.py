"""Boundary tests of the ``uncertainty`` calculation: exactness, blocks, seed, validation."""

from __future__ import annotations

import copy
import csv
import io
import json

import pytest

from driftdose import cli, export
from driftdose.api import handle
from driftdose.api import uncertainty as unc
from driftdose.api.deposition import DEMOS
from driftdose.uncertainty import INPUTS

FUME = dict(DEMOS[0]["inputs"])  # invented demo: two fine modes
REGIONS = ("ET1", "ET2", "BB", "bb", "AI", "total")
WEIGHTS = ("mass", "number", "surface")


def _run(**inputs):
    return handle({"kind": "uncertainty", "inputs": {**FUME, "samples": 200, **inputs}})


def _none():
    return {f"{name}_spread": "none" for name in INPUTS}


@pytest.mark.parametrize("thermo", ["icrp66", "mobility"])
def test_zero_width_ranges_equal_deposition_and_burden_exactly(thermo):
    r = _run(**_none(), thermodynamic_convention=thermo)
    assert r["ok"], r
    inputs = {**FUME, "thermodynamic_convention": thermo}
    dose = handle({"kind": "deposition", "inputs": inputs})["results"]
    burden = handle({"kind": "burden", "inputs": inputs})["results"]
    res = r["results"]
    for g in REGIONS:
        for w in WEIGHTS:
            for p in ("p5", "p50", "p95", "nominal"):
                assert res[f"range_dose_{g}_{w}_{p}"]["si"] == dose[f"dose_{g}_{w}"]["si"]
    for m in ("life", "after"):
        for g in ("AI", "lungs", "LN"):
            for w in WEIGHTS:
                for p in ("p5", "p50", "p95", "nominal"):
                    got = res[f"range_burden_{m}_{g}_{w}_{p}"]["si"]
                    assert got == burden[f"burden_{m}_{g}_{w}"]["si"]
    assert res["range_dose_AI_mass_leading"]["text"] == "none"


def test_zero_width_with_effective_density_and_mobility_diameter_equals_deposition():
    modes = [dict(FUME["modes"][0], diameter_type="mobility"), FUME["modes"][1]]
    inputs = {**FUME, "modes": modes, "density_basis": "effective", "shape_factor": 1.6}
    r = handle({"kind": "uncertainty", "inputs": {**inputs, **_none(), "samples": 20}})
    assert r["ok"], r
    dose = handle({"kind": "deposition", "inputs": inputs})["results"]
    for g in REGIONS:
        assert r["results"][f"range_dose_{g}_mass_p95"]["si"] == dose[f"dose_{g}_mass"]["si"]


def test_percentiles_are_ordered_and_bracket_the_nominal_value():
    r = _run(samples=400)
    res = r["results"]
    for g in REGIONS:
        for w in WEIGHTS:
            lo, mid, hi = (res[f"range_dose_{g}_{w}_{p}"]["si"] for p in ("p5", "p50", "p95"))
            assert lo < mid < hi
            assert lo < res[f"range_dose_{g}_{w}_nominal"]["si"] < hi


def test_blocks_give_the_same_reply_as_one_run():
    whole = _run(samples=250, seed=4)
    unc._CACHE.clear()
    step = unc.BLOCK
    for b in range(1, 5):
        part = _run(samples=250, seed=4, block=b)
        assert part["results"]["progress"]["value"] == step * b
        assert part["curves"]["progress"] == {"done": step * b, "total": 250}
    last = _run(samples=250, seed=4, block=250 // step)
    assert last["results"] == whole["results"]
    assert last["curves"]["dose_bands"] == whole["curves"]["dose_bands"]


def test_same_seed_same_numbers_other_seed_other_numbers():
    a = _run(seed=11)
    unc._CACHE.clear()
    b = _run(seed=11)
    c = _run(seed=12)
    key = "range_dose_AI_mass_p95"
    assert a["results"][key]["si"] == b["results"][key]["si"]
    assert a["results"][key]["si"] != c["results"][key]["si"]
    assert a["results"]["propagation"]["text"] == "200 samples, Latin hypercube, seed 11"


def test_record_names_every_spread():
    r = _run(density_spread="uniform", density_percent=15, concentration_gsd=1.4)
    res = r["results"]
    assert res["spread_density"]["text"].startswith("uniform, ± 15 %")
    assert res["spread_concentration"]["text"].startswith("lognormal factor, GSD 1.4")
    assert res["spread_shape_factor"]["text"] == "none (as entered)"


@pytest.mark.parametrize(
    ("inputs", "field"),
    [
        ({"gsd_spread": "uniform", "gsd_percent": 60}, "gsd_spread"),
        ({"shape_factor_spread": "uniform", "shape_factor": 1.0}, "shape_factor_spread"),
        ({"size_source": "csv"}, "size_source"),
        ({"model": "simplified"}, "model"),
        ({"samples": 5}, "samples"),
        ({"samples": 5001}, "samples"),
        ({"seed": -1}, "seed"),
        ({"seed": 2.5}, "seed"),
        ({"median_spread": "gaussian"}, "median_spread"),
        ({"concentration_gsd": 0.9}, "concentration_gsd"),
        ({"density_percent": 95}, "density_percent"),
        ({"block": {"constructor": 1}}, "block"),
    ],
)
def test_bad_inputs_refused_and_request_unchanged(inputs, field):
    request = {"kind": "uncertainty", "inputs": {**FUME, "samples": 50, **inputs}}
    before = copy.deepcopy(request)
    r = handle(request)
    assert r["ok"] is False, r
    assert r["errors"][0]["field"] == field
    assert request == before


def test_csv_source_with_a_spectrum_is_refused_by_source():
    spectrum = dict(DEMOS[2]["inputs"])
    r = handle({"kind": "uncertainty", "inputs": {**spectrum, "samples": 50}})
    assert r["ok"] is False
    assert r["errors"][0]["field"] == "size_source"


def test_exports_hold_bands_and_correlations():
    r = _run()
    rows = list(csv.reader(io.StringIO(export.results_csv(r))))
    labels = [row[0] for row in rows if row]
    assert "Propagation" in labels
    assert any(x.startswith("Spearman rank correlation") for x in labels)
    curves = export.curves_csv(r)
    assert "Mass deposited in 8 h, 95th percentile [µg]" in curves


def test_cli_prints_seed_and_ranges(capsys):
    code = cli.main(
        [
            "uncertainty",
            "--modes",
            json.dumps(FUME["modes"]),
            "--particle-density",
            "5g/cm3",
            "--samples",
            "100",
            "--seed",
            "3",
        ]
    )
    out, err = capsys.readouterr()
    assert code == 0, err
    assert "100 samples, Latin hypercube, seed 3" in out
    assert "triangular, ± 20 %" in out
    assert "95th percentile" in out
