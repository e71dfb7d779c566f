"""The ``records`` field kind (lognormal modes) as a hostile sender would fill it.

Every value of a record goes through its sub-field's declaration, exactly as a plain field
does, so a mode refuses what a plain field refuses; every refusal names the path of the value
(``modes.<index>.<name>``) and changes nothing in the request.
"""

from __future__ import annotations

import copy
import json

import pytest

from driftdose.api import handle, handle_json
from driftdose.api.deposition import MODE_FIELDS
from driftdose.api.fields import Field, FieldError, FieldsError, parse_fields


def _mode(**over):
    mode = {
        "basis": "count",
        "median": {"value": 50, "unit": "nm"},
        "diameter_type": "volume_equivalent",
        "gsd": 1.8,
        "concentration": {"value": 10000, "unit": "1/cm3"},
    }
    mode.update(over)
    return mode


def _refused(modes, **inputs):
    sent = copy.deepcopy(modes)
    reply = handle({"kind": "deposition", "inputs": {"modes": modes, **inputs}})
    assert reply["ok"] is False, reply
    assert "results" not in reply
    assert modes == sent  # the request is not changed
    return reply["errors"]


@pytest.mark.parametrize("modes", ["[]", "one mode", 5, {"0": {}}, True, [[]][0]])
def test_not_a_list_or_empty_is_refused_on_the_field(modes):
    errors = _refused(modes)
    assert [e["field"] for e in errors] == ["modes"]


def test_too_many_records_refused_before_any_is_read():
    errors = _refused([_mode()] * 5)
    assert errors == [
        {
            "field": "modes",
            "message": "Lognormal modes: at most 4 modes can be combined; 5 were given.",
        }
    ]
    # a thousand hostile records: one message, no record read
    assert len(_refused([{"gsd": "x"}] * 1000)) == 1


@pytest.mark.parametrize("item", [None, "mode", 3, [1, 2], True])
def test_a_record_that_is_not_an_object_is_named_by_its_index(item):
    errors = _refused([_mode(), item])
    assert [e["field"] for e in errors] == ["modes.1"]
    assert errors[0]["message"].startswith("Mode 2:")


def test_prototype_and_unknown_keys_are_ignored_as_for_plain_inputs():
    hostile = _mode(__proto__={"gsd": 9}, constructor={"prototype": {"gsd": 9}}, extra=1)
    reply = handle({"kind": "deposition", "inputs": {"modes": [hostile]}})
    plain = handle({"kind": "deposition", "inputs": {"modes": [_mode()]}})
    assert reply["ok"] and plain["ok"]
    assert reply["results"] == plain["results"]


def test_nested_values_are_refused_by_the_sub_field():
    deep = {"value": {"value": {"value": 50}}, "unit": "nm"}
    errors = _refused([_mode(median=deep)])
    assert [e["field"] for e in errors] == ["modes.0.median"]
    # deeper than JSON allows: one refusal of the whole request, no internal error
    text = '{"kind": "deposition", "inputs": {"modes": [' + "[" * 100000 + "]" * 100000 + "]}}"
    reply = json.loads(handle_json(text))
    assert reply["ok"] is False
    assert "Internal error" not in reply["errors"][0]["message"]


@pytest.mark.parametrize(
    ("over", "path"),
    [
        ({"basis": "volume"}, "basis"),
        ({"basis": ["count"]}, "basis"),
        ({"median": {"value": "abc", "unit": "nm"}}, "median"),
        ({"median": {"value": 50, "unit": "furlong"}}, "median"),
        ({"median": {"value": 50, "unit": ["nm"]}}, "median"),
        ({"median": True}, "median"),
        ({"median": {"value": None, "unit": "nm"}}, "median"),
        ({"diameter_type": "stokes"}, "diameter_type"),
        ({"diameter_type": 3}, "diameter_type"),
        ({"gsd": "1_000"}, "gsd"),
        ({"gsd": "nan"}, "gsd"),
        ({"gsd": 1e400}, "gsd"),
        ({"gsd": {"value": 2, "unit": "m"}}, "gsd"),
        ({"concentration": {"value": "inf", "unit": "1/cm3"}}, "concentration"),
        ({"concentration": {"value": 5, "unit": "ug/m3"}}, "concentration"),
        ({"basis": "mass", "concentration": {"value": 5, "unit": "1/cm3"}}, "concentration"),
    ],
)
def test_each_sub_field_error_names_its_path(over, path):
    errors = _refused([_mode(), _mode(**over)])
    assert [e["field"] for e in errors] == [f"modes.1.{path}"]
    assert errors[0]["message"].startswith("Mode 2: ")


def test_every_wrong_value_is_reported_at_once():
    errors = _refused([_mode(gsd=0.5), _mode(median={"value": "x", "unit": "nm"}, gsd="1,5x")])
    assert [e["field"] for e in errors] == ["modes.0.gsd", "modes.1.median", "modes.1.gsd"]


def test_missing_values_required_or_defaulted():
    # basis and diameter type may be left out (older links): count, volume-equivalent;
    # a mass mode without a type keeps its old meaning, aerodynamic (an MMAD)
    a = {
        "median": {"value": 5, "unit": "um"},
        "gsd": 2,
        "concentration": {"value": 1, "unit": "mg/m3"},
    }
    reply = handle({"kind": "deposition", "inputs": {"modes": [dict(a, basis="mass")]}})
    assert reply["ok"], reply
    assert "aerodynamic" in reply["results"]["mode1_count_median"]["note"]
    errors = _refused([{"basis": "count", "gsd": 2}])
    assert [e["field"] for e in errors] == ["modes.0.median", "modes.0.concentration"]
    assert "required" in errors[0]["message"]


@pytest.mark.parametrize("text", ["1,000", "1,500", "2 000,5e0", "1_000", "0x10", " ", "−"])
def test_a_mode_value_is_read_as_a_plain_field_reads_it(text):
    """The same text gives the same value or the same refusal in a mode and in a plain field
    of the same declaration (a thousands separator was once read as a decimal comma in a mode)."""
    gsd = next(f for f in MODE_FIELDS if f.name == "gsd")
    plain = Field("gsd", gsd.label, "dimensionless", (1.8, "1"), ("1",), minimum=0.0, maximum=1e9)
    try:
        expected = plain.parse(text)
    except FieldError:
        expected = None
    modes = [_mode(median={"value": text, "unit": "nm"})]
    reply = handle({"kind": "deposition", "inputs": {"modes": modes}})
    if expected is None:
        assert reply["ok"] is False
        assert reply["errors"][0]["field"] == "modes.0.median"
    else:  # a number: read alike (then checked against the median's own range)
        median = next(f for f in MODE_FIELDS if f.name == "median")
        assert median.parse({"value": text, "unit": "um"}) == pytest.approx(expected * 1e-6)


def test_modes_not_used_for_a_spectrum_are_no_error():
    """The records apply only to lognormal modes (their ``applies``): with a spectrum chosen a
    broken mode list is not read."""
    csv = "diameter_nm;dN\n20;1000\n50;3000\n100;1000\n"
    inputs = {
        "size_source": "csv",
        "csv_text": csv,
        "csv_diameter_column": "diameter_nm",
        "csv_concentration_column": "dN",
        "modes": "not a list",
    }
    assert handle({"kind": "deposition", "inputs": inputs})["ok"] is True
    values, errors = parse_fields(
        (
            Field("source", "Source", "choice", "a", choices=(("a", "A"), ("b", "B"))),
            Field(
                "items",
                "Items",
                "records",
                [],
                item_fields=(Field("x", "X", "integer", 1, minimum=0, maximum=9),),
                max_items=2,
                applies=("source", ("b",)),
            ),
        ),
        {"source": "a", "items": [{"x": 99}]},
    )
    assert errors == [] and values["items"] is None


def test_records_field_parse_raises_all_errors_together():
    f = Field(
        "items",
        "Items",
        "records",
        [],
        item_fields=(Field("x", "X", "integer", 1, minimum=0, maximum=9),),
        max_items=3,
        item_label="Item",
    )
    assert f.parse([{"x": "3"}, {}]) == [{"x": 3}, {"x": 1}]
    with pytest.raises(FieldsError) as info:
        f.parse([{"x": 10}, {"x": 2}, {"x": "a"}])
    assert [e["field"] for e in info.value.errors] == ["items.0.x", "items.2.x"]
    described = f.describe()
    assert described["kind"] == "records" and described["max_items"] == 3
    assert [s["name"] for s in described["item_fields"]] == ["x"]
