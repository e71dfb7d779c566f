"""The shift calculation at the JSON boundary: reply shape, numbers equal to the core's,
errors naming the sub-field, and hostile requests refused with nothing changed."""

from __future__ import annotations

import copy
import itertools
import json
import math

import pytest

from driftdose import api, export
from driftdose.compose.shift import compose_shift
from driftdose.shift.clock import TimeParser
from driftdose.shift.periods import Period
from driftdose.shift.series import ColumnSpec, read_series
from driftdose.tables import read_table


def invented_log(hours: float = 8.0, step: int = 10, gap: tuple[int, int] | None = None) -> str:
    """An invented logged file: metadata lines, units in the header, decimal commas."""
    head = "Date;Time;Number [#/cm3];LDSA [um2/cm3]"
    lines = ["Invented logger for tests", "Site;none", "", head]
    for k in range(0, int(hours * 3600), step):
        if gap and gap[0] <= k < gap[1]:
            continue
        h, m, s = 6 + k // 3600, k % 3600 // 60, k % 60
        n = 2000 + 8000 * (1 + math.sin(k / 1500.0)) / 2
        lines.append(f"05.03.2026;{h:02d}:{m:02d}:{s:02d};{n:.1f};{n / 200:.2f}")
    text = "\n".join(lines) + "\n"
    # decimal commas in the value cells only (the date keeps its points)
    out = []
    for line in text.splitlines():
        cells = line.split(";")
        if len(cells) == 4 and cells[2][:1].isdigit():
            cells[2], cells[3] = cells[2].replace(".", ","), cells[3].replace(".", ",")
        out.append(";".join(cells))
    return "\n".join(out) + "\n"


PERIODS = [
    {"label": "Before work", "kind": "background", "start": "06:00", "end": "06:30"},
    {
        "label": "Grinding",
        "kind": "task",
        "start": "06:30",
        "end": "09:00",
        "protection_factor": 10,
    },
    {"label": "Lunch", "kind": "break", "start": "09:00", "end": "09:30"},
    {
        "label": "Welding",
        "kind": "task",
        "start": "09:30",
        "end": "13:30",
        "activity": "heavy_exercise",
        "route": "mixed",
    },
    {"label": "After work", "kind": "background", "start": "13:30", "end": "14:00"},
]


def request(**extra):
    inputs = {
        "series_text": invented_log(),
        "series_time_format": "day_first",
        "series_time_column": "time",
        "series_date_column": "date",
        "quantity_columns": [
            {"column": "number", "quantity": "number"},
            {"column": "ldsa", "quantity": "ldsa"},
        ],
        "periods": copy.deepcopy(PERIODS),
        "background_method": "pre_post",
        "benchmark": {"value": 5000, "unit": "1/cm3"},
    }
    inputs.update(extra)
    return {"kind": "shift", "inputs": inputs}


def test_describe_lists_the_shift():
    calc = api.describe()["calculations"]["shift"]
    assert calc["title"] == "Shift exposure and dose from logged data"
    names = {f["name"] for f in calc["fields"]}
    assert {"series_text", "quantity_columns", "periods", "background_method"} <= names


def test_reply_shape_and_numbers_equal_the_core():
    reply = api.handle(request())
    assert reply["ok"], reply
    res = reply["results"]
    imp = res["import"]
    assert imp["header_line"] == 4 and imp["delimiter"] == "semicolon" and imp["decimal"] == "comma"
    assert imp["interval_s"] == 10.0 and imp["rows"] == 8 * 360
    assert [c["unit"] for c in imp["columns"]] == ["", "", "#/cm3", "um2/cm3"]
    assert res["preview"]["header"] == ["Date", "Time", "Number [#/cm3]", "LDSA [um2/cm3]"]
    assert res["preview"]["rows"][0]["line"] == 5
    rows = res["tasks"]["rows"]
    assert [r["period"] for r in rows] == [p["label"] for p in PERIODS]
    assert res["tasks"]["unit"] == "1/cm3"  # a unit code
    # the same numbers straight from the core, in 1/cm3
    table = read_table(invented_log())
    series = read_series(table, TimeParser("day_first"), 1, [ColumnSpec(2, "n", 1e6)], 0)
    periods = [
        Period("Before work", "background", 0.0, 1800.0),
        Period("Grinding", "task", 1800.0, 10800.0, protection_factor=10.0),
        Period("Lunch", "break", 10800.0, 12600.0),
        Period("Welding", "task", 12600.0, 27000.0, "heavy_exercise"),
        Period("After work", "background", 27000.0, 28800.0),
    ]
    core = compose_shift(series, "n", periods, "pre_post", "zero", 5e9)
    for row, (_, st) in zip(rows, core.periods, strict=True):
        assert row["mean"] == pytest.approx(st.mean / 1e6, rel=1e-12)
        assert row["p95"] == pytest.approx(st.p95 / 1e6, rel=1e-12)
        assert row["corrected_mean"] == pytest.approx(st.corrected_mean / 1e6, rel=1e-12)
    shift = res["shift"]["rows"][0]
    assert shift["twa8h"] == pytest.approx(core.twa8h / 1e6, rel=1e-12)
    assert res["twa8h"]["value"] == pytest.approx(core.twa8h / 1e6, rel=1e-12)
    assert "interpolated" in shift["background_method"]
    # thinned series keep the extremes of the full series
    curve = reply["curves"]["series"]
    number = next(s for s in curve["series"] if s["key"] == "c0")
    full = [x / 1e6 for x in series.values["n"]]
    assert max(y for y in number["y"] if y is not None) == pytest.approx(max(full))
    assert min(y for y in number["y"] if y is not None) == pytest.approx(min(full))
    assert len(curve["t_s"]) <= 2100
    # CSV export: the period and shift tables as blocks
    text = export.results_csv(reply)
    assert "\r\nPeriods\r\n" in text and "\r\nShift\r\n" in text and "Grinding" in text
    json.dumps(reply, allow_nan=False)


def test_dose_per_task_with_modes():
    reply = api.handle(request(size_source="modes"))
    assert reply["ok"], reply
    dose = reply["results"]["dose"]
    assert dose["regions"][-1] == "total" and [t["period"] for t in dose["tasks"]] == [
        "Grinding",
        "Welding",
    ]
    for w in ("number", "surface", "mass"):
        for k in range(len(dose["regions"])):
            assert dose["total"][w][k] == pytest.approx(sum(t[w][k] for t in dose["tasks"]))
    assert "Deposited dose per task" in export.results_csv(reply)


def test_gaps_are_reported():
    reply = api.handle(request(series_text=invented_log(gap=(7200, 7800))))
    assert reply["ok"], reply
    gaps = reply["results"]["import"]["gaps"]
    assert len(gaps) == 1 and gaps[0]["seconds"] == pytest.approx(600.0)  # 60 readings of 10 s
    assert any("gap" in w for w in reply["warnings"])


@pytest.mark.parametrize(
    ("change", "field", "words"),
    [
        ({"periods": [{**PERIODS[1], "end": "06:00"}]}, "periods.0.end", "before or when"),
        ({"periods": [PERIODS[0], {**PERIODS[0], "label": "x"}]}, "periods.1.start", "overlaps"),
        (
            {"periods": [PERIODS[0], PERIODS[1], {**PERIODS[2], "end": "23:00"}]},
            "periods.2.end",
            "after the logged time",
        ),
        ({"periods": [{**PERIODS[1], "start": "5:00"}]}, "periods.0.start", "before the first"),
        (
            {"periods": [{**PERIODS[1], "protection_factor": 0.5}]},
            "periods.0.protection_factor",
            "from 1",
        ),
        ({"periods": [{**PERIODS[1], "kind": "lunch"}]}, "periods.0.kind", "task, background"),
        ({"periods": [{**PERIODS[1], "start": "half past six"}]}, "periods.0.start", "clock"),
        (
            {"quantity_columns": [{"column": "pm10", "quantity": "mass"}]},
            "quantity_columns.0.column",
            "No column named 'pm10'",
        ),
        (
            {"quantity_columns": [{"column": "number", "quantity": "number", "unit": "ppm"}]},
            "quantity_columns.0.unit",
            "unknown unit",
        ),
        (
            {"quantity_columns": [{"column": "number", "quantity": "mass"}]},
            "quantity_columns.0.unit",
            "Give the unit",
        ),
        ({"series_time_format": "iso"}, "series_text", "Line 5:"),
        ({"background_method": "far_field"}, "background_text", "far-field"),
        ({"periods": [], "background_method": "marked_mean"}, "background_method", "background"),
        ({"benchmark": {"value": 5, "unit": "mg/m3"}}, "benchmark", "unit"),
        # one or a thousand? refused as in every plain field (api.fields.parse_number)
        ({"benchmark": {"value": "1,000", "unit": "1/cm3"}}, "benchmark", "ambiguous"),
        ({"benchmark": {"value": "1_000", "unit": "1/cm3"}}, "benchmark", "not '1_000'"),
        ({"unmeasured_as": "background", "background_method": "none"}, "unmeasured_as", "method"),
        ({"series_text": None}, "series_text", "Choose"),
    ],
)
def test_errors_name_the_sub_field(change, field, words):
    req = request(**change)
    before = copy.deepcopy(req)
    reply = api.handle(req)
    assert not reply["ok"]
    assert reply["errors"][0]["field"] == field, reply
    assert words in reply["errors"][0]["message"], reply
    assert req == before  # nothing changed in the request


UNKNOWN_KEYS = [
    {"__proto__": {"polluted": 1}},
    {"constructor": {"prototype": {"polluted": 1}}},
    {"extra": "x", "toString": [1, 2]},
]


@pytest.mark.parametrize("keys", UNKNOWN_KEYS)
def test_unknown_keys_in_records_are_ignored_and_change_nothing(keys):
    # records take their declared sub-fields only (as plain inputs ignore unknown names)
    plain = api.handle(request())
    req = request(
        periods=[{**p, **keys} for p in PERIODS],
        quantity_columns=[
            {"column": "number", "quantity": "number", **keys},
            {"column": "ldsa", "quantity": "ldsa"},
        ],
    )
    before = copy.deepcopy(req)
    assert api.handle(req) == plain
    assert req == before
    assert not hasattr(object, "polluted") and not hasattr({}, "polluted")


HOSTILE = [
    {"periods": [{**PERIODS[1], "label": ["a"]}]},
    {"periods": [{**PERIODS[1], "start": {"value": {"value": {}}}}]},
    {"periods": [{**PERIODS[1], "start": 7}]},
    {"periods": [{**PERIODS[1], "protection_factor": True}]},
    {"periods": [{**PERIODS[1], "protection_factor": "1e400"}]},
    {"periods": [{**PERIODS[1], "label": "x" * 10_000}]},
    {"periods": [PERIODS[1]] * 100_000},
    {"periods": "06:00-07:00"},
    {"periods": {"0": PERIODS[1]}},
    {"quantity_columns": [{"column": "number"}] * 10_000},
    {"quantity_columns": [[["number"]]]},
    {"quantity_columns": None},
    {"quantity_columns": [{"column": {"$ne": 1}, "quantity": "number"}]},
    {"quantity_columns": [{"column": "number", "quantity": "__proto__"}]},
    {"series_text": 12345},
    {"series_text": ["a", "b"]},
    {"series_text": "\x00" * 100},
    {"series_text": "a;b\n" * 300_000},
    {"benchmark": {"value": float("nan"), "unit": "1/cm3"}},
    {"benchmark": {"value": "1e999", "unit": "1/cm3"}},
    {"benchmark": {"value": 1, "unit": "1/cm3", "__proto__": 1}},
    {"quantity": {"toString": 1}},
    {"series_header_line": 10**12},
    {"series_time_column": "x" * 100_000},
]


def _deep(n: int):
    out: list = []
    for _ in range(n):
        out = [out]
    return out


@pytest.mark.parametrize("change", [*HOSTILE, {"periods": _deep(200)}, {"modes": _deep(50)}])
def test_hostile_inputs_are_refused_and_change_nothing(change):
    good = api.handle(request())
    req = request(**change)
    if "modes" in change:
        req["inputs"]["size_source"] = "modes"
    before = copy.deepcopy(req)
    reply = api.handle(req)
    assert reply["ok"] is False, change
    err = reply["errors"][0]
    assert "Internal error" not in err["message"], err
    assert len(err["message"]) < 400
    assert req == before
    assert api.handle(request()) == good  # nothing left behind
    assert not hasattr(object, "polluted")


def test_json_boundary_refuses_non_finite_and_deep_json():
    text = json.dumps(request())
    out = json.loads(api.handle_json(text))
    assert out["ok"]
    deep = '{"kind": "shift", "inputs": {"periods": ' + "[" * 100_000 + "]" * 100_000 + "}}"
    assert json.loads(api.handle_json(deep))["ok"] is False


def test_far_field_background_is_the_second_file():
    # far field at a constant 1500/cm3 logged every 60 s, its own header and separator
    far = "Time,Far [1/cm3]\n" + "".join(
        f"2026-03-05T{6 + m // 60:02d}:{m % 60:02d}:00,1500\n" for m in range(8 * 60)
    )
    reply = api.handle(
        request(
            background_method="far_field",
            background_text=far,
            background_time_format="iso",
            background_column="far",
        )
    )
    assert reply["ok"], reply
    shift = reply["results"]["shift"]["rows"][0]
    assert shift["background"] == pytest.approx(1500.0)
    assert "far-field" in shift["background_method"]
    assert reply["curves"]["background"]["series"][0]["y"][0] == pytest.approx(1500.0)
    for row in reply["results"]["tasks"]["rows"]:
        assert row["corrected_mean"] >= 0.0


def test_elapsed_seconds_with_a_start_time():
    text = "seconds;N [1/cm3]\n" + "".join(f"{k * 10};{1000 + k}\n" for k in range(360))
    reply = api.handle(
        request(
            series_text=text,
            series_time_format="elapsed_seconds",
            series_time_column="seconds",
            series_date_column="",
            series_start_time="2026-03-05T23:30:00",
            quantity_columns=[{"column": "n", "quantity": "number"}],
            periods=[
                {"label": "Night task", "kind": "task", "start": "23:45", "end": "00:15"},
            ],
            background_method="none",
        )
    )
    assert reply["ok"], reply
    row = reply["results"]["tasks"]["rows"][0]
    # 23:45 to 00:15 the next day: readings 90..269 (k), mean 1000 + 179.5
    assert row["start"] == "2026-03-05T23:45:00" and row["end"] == "2026-03-06T00:15:00"
    assert row["mean"] == pytest.approx(1179.5)


def test_dose_from_size_channels():
    # two channels, 50 nm and 200 nm, per channel (dN), 1000 and 10 per cm3
    lines = ["time,n [1/cm3],c50 [1/cm3],c200 [1/cm3]"]
    for k in range(720):
        lines.append(f"2026-03-05T08:{k // 60 % 60:02d}:{k % 60:02d},1010,1000,10")
    text = "\n".join(lines[:3601]) + "\n"
    reply = api.handle(
        {
            "kind": "shift",
            "inputs": {
                "series_text": text,
                "quantity_columns": [
                    {"column": "n", "quantity": "number"},
                    {
                        "column": "c50",
                        "quantity": "channel",
                        "diameter": {"value": 50, "unit": "nm"},
                    },
                    {
                        "column": "c200",
                        "quantity": "channel",
                        "diameter": {"value": 200, "unit": "nm"},
                    },
                ],
                "periods": [{"label": "T", "kind": "task", "start": "08:00", "end": "08:10"}],
                "size_source": "channels",
            },
        }
    )
    assert reply["ok"], reply
    dose = reply["results"]["dose"]
    # the deposited number equals the same spectrum through the dose functions directly
    from driftdose.deposition import Subject, activity
    from driftdose.distribution import BinnedSpectrum
    from driftdose.dose import deposited_dose

    spectrum = BinnedSpectrum((50e-9, 200e-9), (1e9, 1e7))
    direct = deposited_dose(spectrum, Subject.single(activity("light_exercise", "mixed")), 600.0)
    k = dose["regions"].index("AI")
    assert dose["tasks"][0]["number"][k] == pytest.approx(direct.doses["AI"]["number"], rel=1e-9)


def test_channel_without_diameter_names_the_sub_field():
    reply = api.handle(
        request(
            quantity_columns=[{"column": "number", "quantity": "channel"}], size_source="channels"
        )
    )
    assert not reply["ok"]
    assert reply["errors"][0]["field"] == "quantity_columns.0.diameter"


def test_per_task_and_shift_tables_export_through_the_one_door():
    req = request(size_source="modes")
    reply = api.handle(req)
    assert reply["ok"], reply
    out = api.handle(
        {
            "kind": "export",
            "inputs": {
                "calculation": "shift",
                "part": "results",
                "inputs": req["inputs"],
                "reply": reply,
                "bom": False,
            },
        }
    )
    assert out["ok"], out
    text = out["text"]
    assert text.startswith("Drift & Dose export")
    # the imported file by size and SHA-256 in the header block, not its text
    assert "Invented logger for tests" not in text
    for block in ("\r\nPeriods\r\n", "\r\nShift\r\n", "\r\nDeposited dose per task\r\n"):
        assert block in text
    periods = text.split("\r\nPeriods\r\n", 1)[1].split("\r\n\r\n", 1)[0].splitlines()
    head = periods[0].split(",")
    assert {"period", "mean", "p95", "peak15", "corrected_mean", "unit"} <= set(head)
    assert [line.split(",")[head.index("period")] for line in periods[1:]] == [
        p["label"] for p in PERIODS
    ]
    grinding = periods[2].split(",")
    assert float(grinding[head.index("mean")]) == reply["results"]["tasks"]["rows"][1]["mean"]


CHANNELS_NM = (300.0, 500.0, 800.0, 1300.0, 2000.0, 3500.0)
CHANNEL_COUNTS = (40.0, 25.0, 12.0, 6.0, 2.5, 0.8)  # invented, per cm³


def channel_log(values: tuple[float, ...] = CHANNEL_COUNTS, total: bool = True) -> str:
    """An invented 20-min log at 10 s of a total and six size channels, each steady."""
    head = "time,total [1/cm3]," if total else "time,"
    lines = [head + ",".join(f"ch{d:g} [1/cm3]" for d in CHANNELS_NM)]
    for k in range(120):
        cells = ",".join(f"{v:g}" for v in ((sum(values),) if total else ()) + values)
        lines.append(f"2026-03-05T08:{k * 10 // 60:02d}:{k * 10 % 60:02d},{cells}")
    return "\n".join(lines) + "\n"


def channel_columns() -> list[dict]:
    return [{"column": "total", "quantity": "number"}] + [
        {"column": f"ch{d:g}", "quantity": "channel", "diameter": {"value": d, "unit": "nm"}}
        for d in CHANNELS_NM
    ]


PARTICLES = [
    # (diameter type, density basis, density g/cm³, shape factor)
    ("aerodynamic", "material", 2.5, 1.4),
    ("aerodynamic", "effective", 1.2, 1.0),
    ("mobility", "material", 4.0, 1.2),
    ("optical", "effective", 0.8, 1.6),
]


@pytest.mark.parametrize("channel_type", ["per_bin", "dN/dlogDp"])
@pytest.mark.parametrize(("diameter_type", "basis", "density", "chi"), PARTICLES)
def test_channel_dose_equals_the_deposition_calculation(
    channel_type, diameter_type, basis, density, chi
):
    """The dose per task from size channels of a declared diameter type and density basis
    is the deposition calculation's dose of the same spectrum with the same choices, the same
    breathing and the task's duration, region by region (both through ``api.handle``)."""
    particle = {
        "particle_density": {"value": density, "unit": "g/cm3"},
        "density_basis": basis,
        "shape_factor": chi,
        "spectrum_diameter_type": diameter_type,
        "model": "icrp66",
    }
    task = {
        "label": "Sanding",
        "kind": "task",
        "start": "08:02",
        "end": "08:17",
        "activity": "heavy_exercise",
        "route": "mixed",
    }
    shift = api.handle(
        {
            "kind": "shift",
            "inputs": {
                "series_text": channel_log(),
                "quantity_columns": channel_columns(),
                "periods": [task],
                "size_source": "channels",
                "channel_type": channel_type,
                **particle,
            },
        }
    )
    assert shift["ok"], shift
    spectrum = "d [nm],c [1/cm3]\n" + "".join(
        f"{d:g},{c:g}\n" for d, c in zip(CHANNELS_NM, CHANNEL_COUNTS, strict=True)
    )
    deposition = api.handle(
        {
            "kind": "deposition",
            "inputs": {
                "size_source": "csv",
                "csv_text": spectrum,
                "csv_diameter_unit": "nm",
                "csv_concentration_unit": "1/cm3",
                "csv_concentration_type": channel_type,
                "breathing": "activity",
                "activity": "heavy_exercise",
                "route": "mixed",
                "exposure_duration": {"value": 15, "unit": "min"},
                **particle,
            },
        }
    )
    assert deposition["ok"], deposition
    dose = shift["results"]["dose"]
    to_si = {"1": 1.0, "mm2": 1e-6, "ug": 1e-9}
    got = dose["tasks"][0]
    for k, region in enumerate(dose["regions"]):
        for weight in ("number", "surface", "mass"):
            expected = deposition["results"][f"dose_{region}_{weight}"]["si"]
            value = got[weight][k] * to_si[dose["units"][weight]]
            assert value == pytest.approx(expected, rel=1e-9, abs=0.0), (region, weight)


def test_channel_diameter_type_changes_the_dose():
    """Aerodynamic channels of dense particles are smaller volume-equivalent spheres than the
    same numbers read as volume-equivalent sizes: less deposits by impaction in the nose."""

    def et1(diameter_type: str) -> float:
        reply = api.handle(
            {
                "kind": "shift",
                "inputs": {
                    "series_text": channel_log(),
                    "quantity_columns": channel_columns(),
                    "periods": [{"kind": "task", "start": "08:00", "end": "08:15"}],
                    "size_source": "channels",
                    "particle_density": {"value": 5, "unit": "g/cm3"},
                    "spectrum_diameter_type": diameter_type,
                },
            }
        )
        assert reply["ok"], reply
        dose = reply["results"]["dose"]
        return dose["tasks"][0]["mass"][dose["regions"].index("ET1")]

    assert et1("aerodynamic") < 0.9 * et1("volume_equivalent")


@pytest.mark.parametrize("channel_type", ["per_bin", "dN/dlogDp"])
def test_a_file_of_size_channels_only_is_summarised_by_their_total(channel_type):
    """An optical counter's log without a total column: the shift is summarised by the
    channels' total number concentration (hand calculation: the sum of the steady channels,
    or of dN/dlogDp times each channel's width in log10 d, the widths from geometric-mean
    edges, common practice), and the dose from the channels is given as well."""
    text = channel_log(total=False)
    reply = api.handle(
        {
            "kind": "shift",
            "inputs": {
                "series_text": text,
                "quantity_columns": channel_columns()[1:],
                "periods": [{"kind": "task", "start": "08:02", "end": "08:17"}],
                "size_source": "channels",
                "channel_type": channel_type,
            },
        }
    )
    assert reply["ok"], reply
    d = CHANNELS_NM
    if channel_type == "per_bin":
        expected = sum(CHANNEL_COUNTS)
    else:
        inner = [math.sqrt(a * b) for a, b in itertools.pairwise(d)]
        edges = [d[0] ** 2 / inner[0], *inner, d[-1] ** 2 / inner[-1]]
        expected = sum(
            c * math.log10(b / a) for c, a, b in zip(CHANNEL_COUNTS, edges, edges[1:], strict=False)
        )
    row = reply["results"]["tasks"]["rows"][0]
    assert row["mean"] == pytest.approx(expected, rel=1e-12)
    assert row["unit"] == "1/cm3"
    assert reply["results"]["shift_mean"]["value"] == pytest.approx(expected, rel=1e-12)
    labels = [s["label"] for s in reply["curves"]["series"]["series"]]
    assert any("Total of the size channels" in lab for lab in labels)
    assert reply["results"]["dose"]["tasks"][0]["number"][-1] > 0


def test_a_single_channel_of_dn_dlogdp_cannot_be_summarised():
    text = "time,c [1/cm3]\n" + "".join(f"2026-03-05T08:00:{k:02d},5\n" for k in range(30))
    reply = api.handle(
        {
            "kind": "shift",
            "inputs": {
                "series_text": text,
                "quantity_columns": [
                    {"column": "c", "quantity": "channel", "diameter": {"value": 300, "unit": "nm"}}
                ],
                "channel_type": "dN/dlogDp",
            },
        }
    )
    assert not reply["ok"] and reply["errors"][0]["field"] == "quantity_columns"


def test_a_protection_factor_is_said_to_enter_the_dose_only():
    """Exposure is the concentration outside the respiratory protection (common practice of
    exposure assessment against limits): the TWA does not change with the factor, the dose
    does, and the reply says so."""
    worn = api.handle(request(size_source="modes"))
    bare = api.handle(
        request(
            size_source="modes",
            periods=[{**p, "protection_factor": 1} for p in copy.deepcopy(PERIODS)],
        )
    )
    assert worn["ok"] and bare["ok"]
    assert worn["results"]["twa8h"]["value"] == bare["results"]["twa8h"]["value"]
    k = worn["results"]["dose"]["regions"].index("AI")
    grinding = next(t for t in worn["results"]["dose"]["tasks"] if t["period"] == "Grinding")
    same = next(t for t in bare["results"]["dose"]["tasks"] if t["period"] == "Grinding")
    assert grinding["number"][k] == pytest.approx(same["number"][k] / 10, rel=1e-12)
    said = [w for w in worn["warnings"] if "outside the respiratory protection" in w]
    assert said and not [w for w in bare["warnings"] if "outside the respiratory" in w]


def test_a_series_the_page_keeps_is_held_out_of_the_reply_and_nothing_else_changes():
    far = "Time,Far [1/cm3]\n" + "".join(
        f"2026-03-05T{6 + m // 60:02d}:{m % 60:02d}:00,1500\n" for m in range(8 * 60)
    )
    extra = {"background_text": far, "background_time_format": "iso", "background_column": "far"}
    full = api.handle(request(**extra))
    assert full["ok"], full
    near, far_curve = full["curves"]["series"], full["curves"]["background"]
    assert near["held"] is False and far_curve["held"] is False
    assert len(near["t_s"]) == len(near["series"][0]["y"]) > 100
    keys = f"{near['key']} {far_curve['key']}"
    held = api.handle(request(series_drawn=keys, **extra))
    assert held["results"] == full["results"] and held["warnings"] == full["warnings"]
    for name in ("series", "background"):
        curve = held["curves"][name]
        assert curve["held"] is True and "t_s" not in curve
        assert curve["key"] == full["curves"][name]["key"]
        for one, whole in zip(curve["series"], full["curves"][name]["series"], strict=True):
            if one["key"] == "background":  # moves with the periods: a key of its own
                assert one["held"] is False and one == whole
            else:
                assert "y" not in one and one == {k: whole[k] for k in ("key", "label", "unit")}
    # a key of another series (another file, another column) holds nothing back
    other = api.handle(request(series_drawn="0" * 32, **extra))
    assert other == full
    moved = copy.deepcopy(PERIODS)
    moved[1]["end"] = "08:45"
    a = api.handle(request(periods=moved))
    b = api.handle(request(periods=moved, series_drawn=near["key"]))
    assert a["curves"]["series"]["key"] == near["key"], "the key names the thinned series only"
    assert b["curves"]["series"]["held"] is True and a["results"] == b["results"]
    # another summarised column's values give another key
    ldsa = api.handle(
        request(
            quantity_columns=[{"column": "ldsa", "quantity": "ldsa"}],
            benchmark={"value": 10, "unit": "um2/cm3"},
            series_drawn=keys,
        )
    )
    assert ldsa["ok"], ldsa
    assert ldsa["curves"]["series"]["held"] is False
    assert ldsa["curves"]["series"]["key"] != near["key"]


def test_the_background_used_is_held_by_its_own_key_and_sent_again_when_it_moves():
    first = api.handle(request())
    near = first["curves"]["series"]
    used = next(x for x in near["series"] if x["key"] == "background")
    keys = f"{near['key']} {used['values_key']}"
    again = api.handle(request(series_drawn=keys))
    held = next(x for x in again["curves"]["series"]["series"] if x["key"] == "background")
    assert held["held"] is True and "y" not in held
    assert held["values_key"] == used["values_key"] and again["results"] == first["results"]
    # the pre-task background period moved: other background values, sent again
    moved = copy.deepcopy(PERIODS)
    moved[0]["end"] = "06:20"
    other = api.handle(request(periods=moved, series_drawn=keys))
    sent = next(x for x in other["curves"]["series"]["series"] if x["key"] == "background")
    assert sent["held"] is False and sent["values_key"] != used["values_key"]
    assert sent["y"] != used["y"]
