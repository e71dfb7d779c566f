"""Sizes the user types (sampling and deposition), and the corrected spectrum in the file's terms.

References: the models called directly at the typed diameters; ISO 7708:1995 (respirable
convention 50 % at 4 µm aerodynamic, tabulated value, from memory); totals of a spectrum by a
hand sum and by numpy (Σ (dN/dlogDp)_i Δlog10 Dp_i with the bin edges at the geometric means
of neighbouring diameters, outer edges mirrored, as the import documents them).
"""

from __future__ import annotations

import copy
import csv
import io
import math

import numpy as np
import pytest

from driftdose import export
from driftdose.api import deposition as deposition_api
from driftdose.api import describe, handle
from driftdose.api import sampling as sampling_api
from driftdose.api.size_list import MAX_SIZES, SIZES
from driftdose.transport import Bend, Chain, Tube


def q(value, unit):
    return {"value": value, "unit": unit}


TUBE = {"type": "tube", "length": q(2, "m"), "tube_diameter": q(4, "mm")}
BEND = {"type": "bend", "tube_diameter": q(4, "mm"), "bend_angle": q(90, "deg")}
FLOW = q(1, "L/min")


def sampling(**inputs):
    return handle({"kind": "sampling", "inputs": {"stages": [TUBE, BEND], "flow": FLOW, **inputs}})


def deposition(**inputs):
    return handle({"kind": "deposition", "inputs": inputs})


def _table(reply):
    assert reply["ok"] is True, reply.get("errors")
    return reply["results"]["sizes_table"]


def _cells(table, key):
    return [next(c for c in r["quantities"] if c["key"] == key) for r in table["rows"]]


# ---- the declaration ----------------------------------------------------------------------------


def test_one_declaration_for_both_calculations():
    assert next(f for f in sampling_api.FIELDS if f.name == "sizes") is SIZES
    assert next(f for f in deposition_api.FIELDS if f.name == "sizes") is SIZES
    for calc in ("sampling", "deposition"):
        fd = {f["name"]: f for f in describe()["calculations"][calc]["fields"]}["sizes"]
        assert fd["kind"] == "sizes"
        assert [u["unit"] for u in fd["units"]] == ["nm", "um"]
        assert fd["default"] == {"value": "", "unit": "nm"}
        assert fd["max_sizes"] == MAX_SIZES == 12
        assert fd["range"] == "up to 12 sizes, each from 1 nm to 100 µm"


def test_no_sizes_no_table():
    assert "sizes_table" not in sampling()["results"]
    assert "sizes_table" not in deposition(sizes=q("  ", "nm"))["results"]


# ---- reading what is typed ----------------------------------------------------------------------


@pytest.mark.parametrize(
    ("typed", "unit", "expected"),
    [
        ("25 nm, 0.3 µm, 4 µm", "nm", [25e-9, 0.3e-6, 4e-6]),
        ("25nm,0.3um,4um", "nm", [25e-9, 0.3e-6, 4e-6]),
        ("25 300 4000", "nm", [25e-9, 300e-9, 4000e-9]),
        ("0,3; 4", "um", [0.3e-6, 4e-6]),  # decimal commas, semicolons between sizes
        ("4 µm, 25", "nm", [4e-6, 25e-9]),  # order kept; a bare number takes the field's unit
        ("1e2 nm; 2,5 μm", "nm", [100e-9, 2.5e-6]),
        ("\u22125e1", "nm", None),  # a minus sign: refused as outside the range
    ],
)
def test_sizes_read_with_their_units(typed, unit, expected):
    reply = sampling(sizes=q(typed, unit))
    if expected is None:
        assert reply["ok"] is False and reply["errors"][0]["field"] == "sizes"
        return
    sizes = [c["si"] for c in _cells(_table(reply), "diameter")]
    assert sizes == pytest.approx(expected, rel=1e-12)


def test_plain_text_takes_the_default_unit():
    """The command line sends the text alone; bare numbers are then in nm."""
    table = _table(sampling(sizes="25, 4 um"))
    assert [r["label"] for r in table["rows"]] == ["25 nm", "4 µm"]


# ---- values: the models at those diameters ------------------------------------------------------


def test_sampling_values_equal_the_stages_at_those_sizes():
    table = _table(sampling(sizes=q("25 nm, 0.3 µm, 4 µm", "nm"), target="respirable"))
    d = [25e-9, 0.3e-6, 4e-6]
    tube = Tube(2.0, 4e-3, 1e-3 / 60)
    bend = Bend(4e-3, 1e-3 / 60, math.pi / 2, 0.05)
    for key, stage in (("stage_0", tube), ("stage_1", bend)):
        got = _cells(table, key)
        for cell, x in zip(got, d, strict=True):
            p = stage.penetration(x, 1000.0, 293.15, 101325.0)
            assert cell["si"] == pytest.approx(p, rel=1e-12)
            assert cell["value"] == pytest.approx(100 * p, rel=1e-12) and cell["unit"] == "%"
    chain = Chain((tube, bend))
    for cell, x in zip(_cells(table, "overall"), d, strict=True):
        assert cell["si"] == pytest.approx(chain.penetration(x, 1000.0, 293.15, 101325.0))
    # ISO 7708:1995, respirable 50 % at 4 µm aerodynamic (unit density: d_ae = d)
    assert _cells(table, "target")[2]["si"] == pytest.approx(0.50, abs=0.001)
    labels = [c["label"] for c in table["rows"][0]["quantities"]]
    assert labels[2:] == [
        "1. Straight tube",
        "2. Bend",
        "Whole chain",
        "Target: ISO 7708 respirable",
    ]


def test_deposition_values_equal_the_curves_at_grid_sizes():
    """1 µm and 10 nm lie on the chart's grid: the typed value is the curve's value there."""
    reply = deposition(sizes=q("10 nm, 1 µm", "nm"))
    table = _table(reply)
    curves = reply["curves"]["deposition"]
    x = export.curve_x(reply["curves"], curves["total"])
    for j, size_um in enumerate((0.01, 1.0)):
        k = min(range(len(x)), key=lambda i: abs(x[i] - size_um))
        assert x[k] == pytest.approx(size_um, rel=1e-9)
        for region, curve in curves.items():
            assert _cells(table, region)[j]["si"] == pytest.approx(curve["y"][k], rel=1e-12)
    iso = _cells(table, "iso7708_respirable")
    assert [c["label"] for c in iso] == ["ISO 7708 respirable"] * 2


def test_deposition_iso7708_respirable_at_4_um_aerodynamic():
    """Unit density: 4 µm is 4 µm aerodynamic, 50 % respirable (ISO 7708:1995, from memory)."""
    table = _table(deposition(sizes=q("4", "um"), particle_density=q(1, "g/cm3")))
    assert _cells(table, "aerodynamic")[0]["si"] == pytest.approx(4e-6, rel=1e-12)
    assert _cells(table, "iso7708_respirable")[0]["value"] == pytest.approx(50.0, abs=0.1)


# ---- hostile input: refused beside the field, nothing changed -----------------------------------


HOSTILE = [
    (", ".join(["5 nm"] * 13), "at most 12 sizes"),
    ("-5 nm", "outside"),
    ("NaN", "not a number"),
    ("inf nm", "not a number"),
    ("1e999 nm", "outside"),
    ("0 nm", "outside"),
    ("200 µm", "outside"),
    ("2,5 µm", "decimal comma or two sizes"),
    ("1,000 nm; 5", "ambiguous"),
    ("5 furlong", "unknown unit"),
    ("5 nm; __proto__", "not a number"),
    ("9" * 301, "at most 300 characters"),
    ("5" * 10_000_000, "at most 300 characters"),
    (["5 nm"], "type sizes as text"),
    ({"value": {"value": "5"}}, "type sizes as text"),
    (True, "type sizes as text"),
    (q("5", "__proto__"), "choose a unit"),
    (q("5", None), "choose a unit"),
]


@pytest.mark.parametrize(("raw", "words"), HOSTILE, ids=lambda v: repr(v)[:24])
@pytest.mark.parametrize("run", [sampling, deposition])
def test_hostile_sizes_are_refused_beside_the_field(run, raw, words):
    good = run(sizes=q("25 nm", "nm"))
    sent = {"sizes": raw}
    before = copy.deepcopy(sent)
    reply = run(**sent)
    assert reply["ok"] is False
    assert [e["field"] for e in reply["errors"]] == ["sizes"]
    assert words in reply["errors"][0]["message"], reply["errors"][0]["message"]
    assert len(reply["errors"][0]["message"]) < 400  # a huge entry is not echoed
    assert sent == before  # the request is not changed
    assert run(sizes=q("25 nm", "nm")) == good  # nor is anything kept between requests


# ---- exports and the command line ---------------------------------------------------------------


def test_results_csv_holds_the_sizes_table():
    reply = deposition(sizes=q("25 nm, 4 µm", "nm"))
    text = export.results_csv(reply)
    block = text.split("Values at your sizes", 1)[1].strip().splitlines()
    rows = list(csv.reader(io.StringIO("\n".join(block))))
    head = rows[0]
    assert head[:3] == [
        "label",
        "Diameter (volume-equivalent) [µm]",
        "Aerodynamic diameter [µm]",
    ]
    assert "ET1 deposition [%]" in head and "ISO 7708 respirable [%]" in head
    col = head.index("ISO 7708 respirable [%]")
    table = reply["results"]["sizes_table"]
    assert [r[0] for r in rows[1:3]] == ["25 nm", "4 µm"]
    assert float(rows[2][col]) == _cells(table, "iso7708_respirable")[1]["value"]


# ---- the corrected spectrum in the file's terms, with totals ------------------------------------


def _edges(d):
    d = np.asarray(d, dtype=float)
    inner = np.sqrt(d[:-1] * d[1:])
    return np.concatenate([[d[0] ** 2 / inner[0]], inner, [d[-1] ** 2 / inner[-1]]])


def spectrum(text, **fields):
    return {"size_source": "csv", "csv_text": text, **fields}


def test_per_bin_spectrum_totals_are_the_channel_sums():
    reply = sampling(**spectrum("d;n\n10;100\n100;50\n1000;10\n", csv_concentration_type="per_bin"))
    assert reply["ok"], reply.get("errors")
    res = reply["results"]
    table = res["spectrum_table"]
    assert [r["measured"] for r in table["rows"]] == pytest.approx([100.0, 50.0, 10.0])
    assert table["concentration_type"] == "per_bin" and table["concentration_unit"] == "1/cm3"
    assert res["spectrum_total_measured"]["value"] == pytest.approx(160.0, rel=1e-12)  # by hand
    assert res["spectrum_total_measured"]["si"] == pytest.approx(160e6, rel=1e-12)
    chain = Chain((Tube(2.0, 4e-3, 1e-3 / 60), Bend(4e-3, 1e-3 / 60, math.pi / 2, 0.05)))
    corrected = sum(
        c / chain.penetration(d, 1000.0, 293.15, 101325.0)
        for d, c in ((10e-9, 100.0), (100e-9, 50.0), (1e-6, 10.0))
    )
    assert res["spectrum_total_corrected"]["value"] == pytest.approx(corrected, rel=1e-12)
    assert "sum of the bins' particle numbers" in res["spectrum_total_measured"]["note"]


def test_dndlogdp_spectrum_shown_as_imported_with_integrated_totals():
    d_nm = [20.0, 40.0, 80.0, 160.0, 320.0]
    c = [1000.0, 3000.0, 2000.0, 500.0, 100.0]
    text = "Dp [nm];dN/dlogDp [1/cm3]\n" + "".join(
        f"{a};{b}\n" for a, b in zip(d_nm, c, strict=True)
    )
    reply = sampling(**spectrum(text))
    assert reply["ok"], reply.get("errors")
    res = reply["results"]
    rows = res["spectrum_table"]["rows"]
    assert [r["measured"] for r in rows] == pytest.approx(c, rel=1e-12)  # the file's values
    for r in rows:
        assert r["corrected"] == pytest.approx(r["measured"] / r["penetration"], rel=1e-12)
    assert res["spectrum_table"]["concentration_label"] == "dN/dlogDp, 1/cm³"
    widths = np.diff(np.log10(_edges(d_nm)))
    total = float(np.sum(np.asarray(c) * widths))
    assert res["spectrum_total_measured"]["value"] == pytest.approx(total, rel=1e-12)
    corrected = float(np.sum([r["corrected"] for r in rows] * widths))
    assert res["spectrum_total_corrected"]["value"] == pytest.approx(corrected, rel=1e-12)
    # the chart stays per bin: measured particles per bin per cm3
    assert reply["curves"]["spectrum"]["measured"]["y"] == pytest.approx(
        list(np.asarray(c) * widths)
    )


def test_dnddp_per_m3_spectrum_shown_as_imported():
    d_um = [0.5, 1.0, 2.0, 4.0]
    c = [4e6, 2e6, 5e5, 1e5]  # per m3 per µm
    text = "d_um,dNdDp\n" + "".join(f"{a},{b}\n" for a, b in zip(d_um, c, strict=True))
    reply = sampling(
        **spectrum(
            text,
            csv_concentration_type="dN/dDp",
            csv_diameter_unit="um",
            csv_concentration_unit="1/m3",
        )
    )
    assert reply["ok"], reply.get("errors")
    res = reply["results"]
    assert [r["measured"] for r in res["spectrum_table"]["rows"]] == pytest.approx(c, rel=1e-12)
    assert res["spectrum_table"]["concentration_label"] == "dN/dDp, 1/m³ per µm"
    total = float(np.sum(np.asarray(c) * np.diff(_edges(d_um))))
    assert res["spectrum_total_measured"]["value"] == pytest.approx(total, rel=1e-12)
    assert res["spectrum_total_measured"]["unit"] == "1/m3"  # a code of the unit table
    assert "Σ dN/dDp × ΔDp" in res["spectrum_total_measured"]["note"]
