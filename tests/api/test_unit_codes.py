"""Replies name units by code only; the one table that ``describe`` sends labels them.

Every result row (``unit``, ``si_unit``), every row of a result table and every curve axis of
every calculation carries a code of ``describe()["units"]``, and the shown value agrees with
the SI value through the table's factors (a check of the table against the row builders: both
are this project's own definitions, so this is a consistency check, not a reference value).
The printed labels (``text``) are common practice: nothing after a pure number.
"""

from __future__ import annotations

import math
from typing import Any

import pytest
from test_shift_api import request as shift_request

from driftdose import api
from driftdose.api import demos, sampling_demos
from driftdose.api.reply import quantity, row
from driftdose.unit_labels import unit_label, unit_text

TABLE = api.describe()["units"]
UNIT_KEYS = ("unit", "si_unit", "x_unit", "y_unit", "ldsa_unit")


def _requests() -> list[tuple[str, dict[str, Any]]]:
    out: list[tuple[str, dict[str, Any]]] = [("motion", {}), ("sampling", {})]
    out += [("deposition", d["inputs"]) for d in demos.DEMOS]
    for d in demos.BURDEN_DEMOS:
        out.append(("burden", {**d["deposition"], **d["burden"]}))
        out.append(
            ("uncertainty", {**d["deposition"], **d["burden"], **d["ranges"], "samples": 40})
        )
    out += [("sampling", d.get("inputs", d)) for d in sampling_demos.DEMOS.values()]
    shift = shift_request()
    out.append(("shift", shift["inputs"]))
    return out


REPLIES = [
    pytest.param(kind, inputs, id=f"{kind}-{i}") for i, (kind, inputs) in enumerate(_requests())
]


def _units(obj: Any, path: str = "") -> list[tuple[str, str]]:
    """Every (path, unit) in a reply's results and curves, skipping the file's own headers."""
    found: list[tuple[str, str]] = []
    if isinstance(obj, dict):
        for k, v in obj.items():
            if k == "import" or k == "background_import":  # a read file's header units, as found
                continue
            if k in UNIT_KEYS and isinstance(v, str):
                found.append((f"{path}.{k}", v))
            elif k == "units" and isinstance(v, dict):  # the shift dose's unit per weight
                found += [(f"{path}.units.{w}", u) for w, u in v.items()]
            else:
                found += _units(v, f"{path}.{k}")
    elif isinstance(obj, list):
        for i, v in enumerate(obj[:4]):
            found += _units(v, f"{path}[{i}]")
    return found


def _rows(obj: Any) -> list[dict[str, Any]]:
    """Every row with a value, its SI value and both units, at any depth."""
    out: list[dict[str, Any]] = []
    if isinstance(obj, dict):
        if {"value", "si", "unit", "si_unit"} <= set(obj):
            out.append(obj)
        for v in obj.values():
            out += _rows(v)
    elif isinstance(obj, list):
        for v in obj:
            out += _rows(v)
    return out


@pytest.mark.parametrize(("kind", "inputs"), REPLIES)
def test_every_unit_in_a_reply_is_a_code_of_the_table(kind: str, inputs: dict[str, Any]) -> None:
    reply = api.handle({"kind": kind, "inputs": inputs})
    assert reply["ok"], reply
    found = _units(reply["results"], "results") + _units(reply["curves"], "curves")
    assert found, "no units found: the walk itself is wrong"
    wrong = [(p, u) for p, u in found if u not in TABLE]
    assert not wrong, wrong


@pytest.mark.parametrize(("kind", "inputs"), REPLIES)
def test_shown_value_equals_si_value_through_the_table(kind: str, inputs: dict[str, Any]) -> None:
    reply = api.handle({"kind": kind, "inputs": inputs})
    rows = _rows(reply["results"])
    assert rows
    for r in rows:
        shown, si = TABLE[r["unit"]], TABLE[r["si_unit"]]
        base = (r["value"] + shown["offset"]) * shown["factor"]
        assert math.isclose(base, (r["si"] + si["offset"]) * si["factor"], rel_tol=1e-12), r


def test_labels_and_printed_text_of_the_table() -> None:
    for code, spec in TABLE.items():
        assert set(spec) == {"label", "text", "kind", "factor", "offset"}, code
        assert spec["label"] == unit_label(code) and spec["text"] == unit_text(code)
        assert spec["text"] in ("", spec["label"]), code
    # a pure number: named "–" in a column, nothing after the number (common practice)
    assert TABLE["1"]["label"] == "\u2013" and TABLE["1"]["text"] == ""
    assert [c for c, s in TABLE.items() if s["text"] == ""] == ["1"]
    assert TABLE["%"]["text"] == "%" and TABLE["particles"]["text"] == "particles"
    # labels of the codes results added (typography, common practice)
    assert TABLE["m2/s"]["label"] == "m\u00b2/s"
    assert TABLE["Pa.s"]["label"] == "Pa\u00b7s"
    assert TABLE["ug/h"]["label"] == "\u00b5g/h"
    assert TABLE["mm2/h"]["label"] == "mm\u00b2/h"
    # factors by definition: 1 % = 0.01; 1 µg = 1e-9 kg; 1 mm² = 1e-6 m²; 1 d = 86 400 s
    assert TABLE["%"]["factor"] == 0.01
    assert TABLE["ug/h"]["factor"] == pytest.approx(1e-9, rel=1e-15)
    assert TABLE["mm2/h"]["factor"] == pytest.approx(1e-6, rel=1e-15)
    assert TABLE["d"]["factor"] == 86400.0


@pytest.mark.parametrize("label", ["\u00b5m", "m\u00b2/s", "\u2013", "", "particles per hour"])
def test_row_builders_refuse_a_label_for_a_code(label: str) -> None:
    with pytest.raises(ValueError, match="not a unit code"):
        row("x", 1.0, 1.0, label, "m")
    with pytest.raises(ValueError, match="not a unit code"):
        row("x", 1.0, 1.0, "m", label)
    if label:  # an empty unit means a pure number in quantity()
        with pytest.raises(ValueError, match="not a unit code"):
            quantity("x", 1.0, None, label)


def test_quantity_gives_codes_for_a_kind_and_for_a_pure_number() -> None:
    r = quantity("d", 2.5e-6, "length")
    assert (r["unit"], r["si_unit"], r["value"]) == ("um", "m", pytest.approx(2.5))
    r = quantity("Kn", 0.3, None, "1")
    assert (r["unit"], r["si_unit"], r["value"]) == ("1", "1", 0.3)
    assert quantity("Kn", 0.3)["unit"] == "1"
