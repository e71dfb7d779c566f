"""Boundary tests of the ``burden`` calculation: replies, consistency, validation, exports."""

from __future__ import annotations

import copy
import csv
import io
import itertools
import json

import pytest

from driftdose import cli, export
from driftdose.api import describe, handle
from driftdose.api.burden import BURDEN_FIELDS
from driftdose.deposition import REFERENCE_WORKER
from driftdose.distribution import LognormalMode, Multimodal
from driftdose.retention import YEAR, compartment_inputs, retained_burden, work_schedule

MODES = [
    {
        "basis": "mass",
        "median": {"value": 3, "unit": "um"},
        "gsd": 2,
        "concentration": {"value": 1, "unit": "mg/m3"},
    }
]
BASE = {"modes": MODES, "particle_density": {"value": 4, "unit": "g/cm3"}}


def _run(**inputs):
    return handle({"kind": "burden", "inputs": {**BASE, **inputs}})


@pytest.mark.parametrize("rates", ["icrp66", "icrp130"])
def test_burden_balances_at_every_milestone(rates):
    r = _run(transport_rates=rates)
    assert r["ok"], r
    res = r["results"]
    for key in ("shift", "week", "year", "life", "after"):
        for w in ("mass", "number", "surface"):
            parts = [
                res[f"burden_{key}_{g}_{w}"]["si"]
                for g in ("ET", "BB", "bb", "AI", "LN", "GI", "environment")
            ]
            assert sum(parts) == pytest.approx(res[f"burden_{key}_deposited_{w}"]["si"], rel=1e-9)
            lungs = sum(res[f"burden_{key}_{g}_{w}"]["si"] for g in ("BB", "bb", "AI"))
            assert res[f"burden_{key}_lungs_{w}"]["si"] == pytest.approx(lungs, rel=1e-12)


def test_first_shift_deposit_equals_deposition_dose():
    burden = _run()
    dose = handle({"kind": "deposition", "inputs": BASE})
    for w in ("mass", "number", "surface"):
        assert burden["results"][f"burden_shift_deposited_{w}"]["si"] == pytest.approx(
            dose["results"][f"dose_total_{w}"]["si"], rel=1e-12
        )


def test_working_life_alveolar_mass_equals_core():
    r = _run(working_years=25, weeks_per_year=46, shifts_per_week=4)
    mode = LognormalMode.from_mass(
        __import__("driftdose.particle", fromlist=["x"]).volume_equivalent_diameter(
            3e-6, 4000.0, 1.0
        ),
        2.0,
        1e-6,
        4000.0,
        1.0,
    )
    inputs = compartment_inputs(Multimodal((mode,)), REFERENCE_WORKER, "icrp66")
    core = retained_burden(inputs, work_schedule(8.0, 4, 46, 25), [25 * YEAR], "icrp66")
    assert r["results"]["burden_life_AI_mass"]["si"] == pytest.approx(
        core.regions["mass"]["AI"][0], rel=1e-12
    )


def test_single_exposure_milestones_and_no_follow_up():
    r = _run(exposure_pattern="single", years_after=0)
    assert r["ok"], r
    keys = {k.split("_")[1] for k in r["results"] if k.startswith("burden_")}
    assert keys == {"end", "day", "month", "year"}
    # nothing is deposited after the exposure
    dep = [r["results"][f"burden_{k}_deposited_mass"]["si"] for k in ("end", "day", "year")]
    assert dep[0] == dep[1] == dep[2]
    ai = [r["results"][f"burden_{k}_AI_mass"]["si"] for k in ("end", "day", "month", "year")]
    assert ai == sorted(ai, reverse=True)


def test_curves_are_log_spaced_series_per_region():
    r = _run()
    mass = r["curves"]["mass"]
    assert mass["x_unit"] == "d"
    ai = mass["series"]["AI"]
    # the output times are sent once, shared by every series of every weight
    weights = ("mass", "number", "surface")
    assert all(s["x"] == "time" for w in weights for s in r["curves"][w]["series"].values())
    times = export.curve_x(r["curves"], ai)
    assert len(times) == len(ai["y"]) > 200
    assert times[-1] == pytest.approx(50 * 365.25)
    assert all(b > a for a, b in itertools.pairwise(times))
    assert all(y >= 0 for y in ai["y"])


def test_icrp130_keeps_more_in_the_alveoli_after_exposure_ends():
    # ICRP 130 clears the alveolar region more slowly than ICRP 66 (0.003 /d from ALV
    # against 0.02 /d for the 30 % in AI1; a third to the interstitium at 0.00003 /d)
    a = _run(transport_rates="icrp66")["results"]["burden_after_AI_mass"]["si"]
    b = _run(transport_rates="icrp130")["results"]["burden_after_AI_mass"]["si"]
    assert b > a


def test_simplified_model_is_refused_with_the_model_field():
    r = _run(model="simplified")
    assert r["ok"] is False
    assert r["errors"][0]["field"] == "model"


@pytest.mark.parametrize(
    ("name", "value"),
    [
        ("shifts_per_week", 0),
        ("shifts_per_week", 8),
        ("shifts_per_week", 2.5),
        ("weeks_per_year", 53),
        ("working_years", 51),
        ("working_years", "forty"),
        ("years_after", -1),
        ("transport_rates", "icrp99"),
        ("exposure_pattern", {"__proto__": 1}),
        ("working_years", [40]),
    ],
)
def test_bad_work_pattern_is_refused_and_request_unchanged(name, value):
    request = {"kind": "burden", "inputs": {**BASE, name: value}}
    before = copy.deepcopy(request)
    r = handle(request)
    assert r["ok"] is False
    assert r["errors"][0]["field"] == name
    assert request == before


def test_describe_lists_burden_fields_after_the_deposition_ones():
    d = describe()["calculations"]["burden"]
    names = [f["name"] for f in d["fields"]]
    assert names[-len(BURDEN_FIELDS) :] == [f.name for f in BURDEN_FIELDS]
    assert "modes" in names and "exposure_duration" in names


def test_csv_exports_hold_milestones_compartments_and_series():
    r = _run()
    text = export.results_csv(r)
    rows = list(csv.reader(io.StringIO(text)))
    labels = [row[0] for row in rows if row]
    assert any("Alveolar-interstitial (AI), mass, after 40 working years" == x for x in labels)
    assert any(x.startswith("Amounts by compartment") for x in labels)
    curves = export.curves_csv(r)
    head = curves.splitlines()[0]
    assert head == "curve,Time from the first exposure [d],Retained mass [mg]"
    assert "Alveolar-interstitial (AI)" in curves


def test_cli_burden_json_equals_api(capsys):
    code = cli.main(
        [
            "burden",
            "--modes",
            json.dumps(MODES),
            "--particle-density",
            "4g/cm3",
            "--working-years",
            "20",
            "--format",
            "json",
        ]
    )
    out, err = capsys.readouterr()
    assert code == 0, err
    reply = json.loads(out)
    assert reply == _run(working_years=20)


def test_cli_burden_refuses_bad_years(capsys):
    code = cli.main(["burden", "--working-years", "0"])
    _, err = capsys.readouterr()
    assert code == 2
    assert err.startswith("working_years:")
