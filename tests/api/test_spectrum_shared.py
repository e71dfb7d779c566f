"""One spectrum importer for every calculation that reads a spectrum file.

The shift's dose per task from an imported spectrum shape is read by the same importer as the
deposition calculation's measured spectrum, so the same file gives the same dose, and the same
file faults are refused on the shift's own file input with the request left unchanged; the
deposition, sampling and burden replies report an import with the same row and notes.
"""

from __future__ import annotations

import copy

import pytest

from driftdose import api

CHANNELS_NM = (300.0, 500.0, 800.0, 1300.0, 2000.0, 3500.0)
COUNTS = (40.0, 25.0, 12.0, 6.0, 2.5, 0.8)  # invented, particles per cm³ in each bin


def _log() -> str:
    """An invented 20-min log at 10 s of a steady total number concentration."""
    lines = ["time,total [1/cm3]"]
    for k in range(120):
        lines.append(f"2026-03-05T08:{k * 10 // 60:02d}:{k * 10 % 60:02d},{sum(COUNTS):g}")
    return "\n".join(lines) + "\n"


def _spectrum(diameters: tuple[float, ...] = CHANNELS_NM) -> str:
    return "d [nm];n [1/cm3]\n" + "".join(
        f"{d:g};{c:g}\n" for d, c in zip(diameters, COUNTS, strict=True)
    )


# a 15-min task; its route is the default, mixed
TASK = {"kind": "task", "start": "08:02", "end": "08:17", "activity": "heavy_exercise"}


def _shift(**inputs) -> dict:
    return {
        "kind": "shift",
        "inputs": {
            "series_text": _log(),
            "quantity_columns": [{"column": "total", "quantity": "number"}],
            "periods": [TASK],
            "size_source": "spectrum",
            "spectrum_text": _spectrum(),
            "spectrum_concentration_type": "per_bin",
            "spectrum_diameter_unit": "nm",
            "particle_density": {"value": 2.0, "unit": "g/cm3"},
            "model": "icrp66",
            **inputs,
        },
    }


def test_spectrum_dose_equals_the_deposition_calculation():
    """The spectrum's total is the task's measured number, so the shape is used as it is: the
    dose per task is the deposition calculation's dose of the same file, breathing and duration,
    region by region (both through ``api.handle``)."""
    shift = api.handle(_shift())
    assert shift["ok"], shift
    deposition = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "size_source": "csv",
                "csv_text": _spectrum(),
                "csv_diameter_unit": "nm",
                "csv_concentration_unit": "1/cm3",
                "csv_concentration_type": "per_bin",
                "particle_density": {"value": 2.0, "unit": "g/cm3"},
                "breathing": "activity",
                "activity": "heavy_exercise",
                "route": "mixed",
                "exposure_duration": {"value": 15, "unit": "min"},
                "model": "icrp66",
            },
        }
    )
    assert deposition["ok"], deposition
    dose = shift["results"]["dose"]
    factor = {"1": 1.0, "mm2": 1e-6, "ug": 1e-9}  # the shift's dose units to SI
    weights = ("number", "surface", "mass")
    shift_si = {
        (region, w): dose["tasks"][0][w][k] * factor[dose["units"][w]]
        for k, region in enumerate(dose["regions"])
        for w in weights
    }
    deposition_si = {
        key: deposition["results"]["dose_{}_{}".format(*key)]["si"] for key in shift_si
    }
    # the same numbers through two paths: agreement to rounding
    assert shift_si == pytest.approx(deposition_si, rel=1e-9, abs=0.0)


@pytest.mark.parametrize(
    ("inputs", "says"),
    [
        ({"spectrum_text": None}, "Choose a CSV file"),
        ({"spectrum_text": "   \n"}, "Choose a CSV file"),
        ({"spectrum_text": _spectrum(), "spectrum_diameter_unit": "um"}, "100 µm"),
        ({"spectrum_text": _spectrum((0.1, 0.2, 0.3, 0.4, 0.5, 0.6))}, "1 nm"),
        ({"spectrum_text": "d [nm];n\n100;0\n200;0\n"}, "zero"),
        ({"spectrum_text": "d [nm];n\n100;1\n100;2\n"}, ""),
    ],
)
def test_spectrum_faults_are_refused_on_the_file_input(inputs, says):
    """No file, a blank one, sizes outside 1 nm – 100 µm (a wrong diameter unit), all zero,
    a repeated size: refused on ``spectrum_text`` with the reason; the request is unchanged."""
    request = _shift(**inputs)
    before = copy.deepcopy(request)
    reply = api.handle(request)
    assert not reply["ok"], reply
    assert reply["errors"][0]["field"] == "spectrum_text", reply["errors"]
    assert says in reply["errors"][0]["message"], reply["errors"]
    assert request == before


# An invented instrument export: a metadata line above the header, decimal commas.
_NOTED = "Invented sizer export\nd [nm];dN/dlogDp [1/cm3]\n20;1000,5\n50;4000,0\n100;2500,0\n"
_CSV_INPUTS = {
    "size_source": "csv",
    "csv_text": _NOTED,
    "csv_diameter_unit": "nm",
    "csv_concentration_unit": "1/cm3",
    "csv_concentration_type": "dN/dlogDp",
}


def test_a_spectrum_import_is_reported_alike_by_every_calculation():
    """Deposition, sampling and burden read the same file with the same importer, so they
    report it with the same row and the same import notes (the metadata line set aside and
    the decimal commas), each marked as the import's."""
    deposition = api.handle({"kind": "deposition", "inputs": dict(_CSV_INPUTS)})
    sampling = api.handle(
        {
            "kind": "sampling",
            "inputs": {
                **_CSV_INPUTS,
                "stages": [{"type": "tube", "length": {"value": 1, "unit": "m"}}],
            },
        }
    )
    burden = api.handle({"kind": "burden", "inputs": dict(_CSV_INPUTS)})
    replies = (deposition, sampling, burden)
    assert all(r["ok"] for r in replies), [r.get("errors") for r in replies]
    notes = [w for w in deposition["warnings"] if w.startswith("CSV import: ")]
    assert any("set aside" in w for w in notes), notes
    assert any("Decimal commas" in w for w in notes), notes
    for reply in (sampling, burden):
        assert [w for w in reply["warnings"] if w.startswith("CSV import: ")] == notes
    # the row: three rows read, on file lines 3 to 5
    assert deposition["results"]["csv_rows"]["text"].startswith("3 rows (lines 3–5)")
    assert sampling["results"]["csv_rows"] == deposition["results"]["csv_rows"]
