"""A measured spectrum's file is parsed once for a run of edits of other inputs.

``spectrum_fields.import_spectrum`` keeps the parse of the last two files and column choices;
the reply must be the same as from a fresh parse, and what one reply carries must not leak
into the next (each gets its own copy of the import report).
"""

from __future__ import annotations

from driftdose import api
from driftdose.api import spectrum_fields

CSV = "d_nm,dN\n" + "\n".join(f"{10 * 1.2**i:.4g},{1000 + 10 * i}" for i in range(40))


def _request(flow: str, text: str = CSV) -> dict:
    inputs = {
        "flow": {"value": flow, "unit": "L/min"},
        "size_source": "csv",
        "csv_text": text,
        "csv_diameter_unit": "nm",
        "stages": [
            {
                "type": "tube",
                "length": {"value": 2, "unit": "m"},
                "tube_diameter": {"value": 4, "unit": "mm"},
            }
        ],
    }
    return {"kind": "sampling", "inputs": inputs}


def test_spectrum_parsed_once_across_flow_edits_with_the_same_replies() -> None:
    spectrum_fields._parse_kept.cache_clear()
    first = api.handle(_request("1.5"))
    assert first["ok"], first
    second = api.handle(_request("3"))
    info = spectrum_fields._parse_kept.cache_info()
    assert (info.misses, info.hits) == (1, 1)
    spectrum_fields._parse_kept.cache_clear()
    fresh = api.handle(_request("3"))
    assert second == fresh
    assert api.handle(_request("1.5")) == first


def test_each_import_gets_its_own_report() -> None:
    v = {
        "csv_text": CSV,
        "csv_header_line": 0,
        "csv_diameter_column": "1",
        "csv_concentration_column": "2",
        "csv_concentration_type": "dN/dlogDp",
        "csv_diameter_unit": "nm",
        "csv_concentration_unit": "1/cm3",
    }
    first, _ = spectrum_fields.import_spectrum(v)
    first.report["notes"].append("changed by a caller")
    first.report["rows"] = -1
    second, _ = spectrum_fields.import_spectrum(dict(v))
    assert "changed by a caller" not in second.report["notes"]
    assert second.report["rows"] == 40
    assert second.diameters == first.diameters


def test_another_file_is_parsed_again() -> None:
    spectrum_fields._parse_kept.cache_clear()
    api.handle(_request("1.5"))
    other = CSV.replace("1000", "2000")
    api.handle(_request("1.5", other))
    assert spectrum_fields._parse_kept.cache_info().misses == 2
