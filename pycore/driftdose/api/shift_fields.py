"""Input fields of the shift calculation (kind ``shift``): the files and how their time
stamps are written, the value columns, the periods, the background and TWA choices, and the
dose choices. The reply and the meaning of each input: :mod:`driftdose.api.shift`."""

from __future__ import annotations

from dataclasses import replace

from .. import textfile
from ..shift.periods import MAX_PERIODS
from .declare import text
from .exposure_fields import DEPOSITION_MODEL
from .fields import Field
from .particle_air_fields import DENSITY_BASIS, PARTICLE_DENSITY, SHAPE_FACTOR
from .period_file import PERIOD_FILE
from .shift_inputs import COLUMN_FIELDS, MAX_COLUMNS, MODE_FIELDS, PERIOD_FIELDS
from .spectrum_fields import CONCENTRATION_TYPES, SPECTRUM_DIAMETER_TYPE

__all__ = ["FIELDS", "MAX_BYTES"]

MAX_BYTES = textfile.MAX_BYTES
"""Largest time-series file, the shared 5 MB (a 24 h file at 1 s with ISO date-times and two
value columns is about 2.7 MB)."""

_TIME_FORMATS = (
    ("iso", "ISO 8601 (2026-03-05T08:00:00 or 2026-03-05 08:00:00)"),
    ("day_first", "Day first (05/03/2026 08:00:00)"),
    ("month_first", "Month first (03/05/2026 08:00:00, AM/PM allowed)"),
    ("elapsed_seconds", "Seconds elapsed since a start time"),
)


_FAR = ("background_method", ("far_field",))


def _file_fields(prefix: str, label: str, far: bool) -> tuple[Field, ...]:
    when = _FAR if far else None
    fields = (
        Field(
            f"{prefix}text",
            label,
            "data",
            None,
            required=False,
            help="Plain text table with a time column; commas, semicolons or tabs; notes above "
            "the header row are skipped; at most 5 MB.",
            extra={
                "max_bytes": MAX_BYTES,
                "accept": ".csv,.txt,.tsv",
                "record_field": f"{prefix}file",
            },
        ),
        Field(f"{prefix}file", f"{label}: name and SHA-256", "data", None, required=False),
        Field(
            f"{prefix}header_line",
            "Header is on line (0: find it, -1: none)",
            "integer",
            0,
            minimum=-1,
            maximum=1000,
            required=False,
        ),
        Field(f"{prefix}time_format", "Time stamps", "choice", "iso", choices=_TIME_FORMATS),
        Field(
            f"{prefix}time_column",
            "Time column (header name or number)",
            "text",
            "1",
            required=False,
            extra={"max_length": 80},
        ),
        Field(
            f"{prefix}date_column",
            "Date column, when date and time are in two columns",
            "text",
            "",
            required=False,
            extra={"max_length": 80},
        ),
        Field(
            f"{prefix}start_time",
            "Start time of elapsed seconds (2026-03-05T08:00:00)",
            "text",
            "",
            required=False,
            extra={"max_length": 40},
            applies=(f"{prefix}time_format", ("elapsed_seconds",)),
        ),
    )
    return tuple(
        f if f.applies is not None or when is None else replace(f, applies=when) for f in fields
    )


_DOSE = ("size_source", ("channels", "modes", "spectrum"))
_SPECTRUM = ("size_source", ("spectrum",))


FIELDS: tuple[Field, ...] = (
    *_file_fields("series_", "Near-field (worker) time series file", False),
    Field(
        "quantity_columns",
        "Value columns",
        "records",
        [{"column": "2", "quantity": "number", "unit": ""}],
        help="Each logged column used: number concentration, LDSA, mass concentration, or a "
        "size channel with its diameter. A unit left out is read from the header.",
        item_fields=COLUMN_FIELDS,
        min_items=1,
        max_items=MAX_COLUMNS,
        item_label="Column",
    ),
    Field(
        "quantity",
        "Summarise column",
        "text",
        "",
        required=False,
        help="The column (as named in the value columns) whose statistics and TWA are shown.",
        extra={"max_length": 80},
    ),
    Field(
        "series_drawn",
        "Series the page keeps drawn (keys from earlier replies)",
        "text",
        "",
        required=False,
        help="The page's own bookkeeping: the keys (``curves.series.key``, a background's "
        "``values_key``) of the thinned series it keeps, separated by blanks. A reply whose "
        "series has one of these keys leaves that series' times and values out (``held``). "
        "Blank: every series is sent.",
        extra={"max_length": 200, "bookkeeping": True},
    ),
    *_file_fields("background_", "Far-field (background) time series file", True),
    text(
        "background_column",
        "Far-field column of the same quantity",
        "2",
        80,
        required=False,
        applies=_FAR,
    ),
    text(
        "background_unit",
        "Its unit (blank: from its header, else the near-field unit)",
        "",
        20,
        required=False,
        applies=_FAR,
    ),
    Field(
        "periods",
        "Periods (tasks, background, breaks)",
        "records",
        [],
        required=False,
        help="Typed, dragged on the chart, or read from a task log (CSV or TSV with columns "
        "label, kind, start, end, activity, route, protection factor; start and end needed).",
        item_fields=PERIOD_FIELDS,
        max_items=MAX_PERIODS,
        item_label="Period",
        extra={"table_file": PERIOD_FILE},
    ),
    Field(
        "background_method",
        "Background",
        "choice",
        "none",
        choices=(
            ("none", "No background correction"),
            ("marked_mean", "Mean of the periods marked as background"),
            ("pre_post", "Interpolated between background periods before and after"),
            ("far_field", "Concurrent far-field series (second file)"),
        ),
    ),
    Field(
        "unmeasured_as",
        "Unmeasured time of the 8 h counts as",
        "choice",
        "zero",
        choices=(
            ("zero", "Zero exposure"),
            ("background", "The background"),
            ("excluded", "Left out (mean over measured time)"),
        ),
        help="Time of the 8-h reference period without readings, and breaks.",
    ),
    Field(
        "benchmark",
        "Benchmark for the summarised quantity (optional)",
        "data",
        None,
        required=False,
        help="A value you choose to compare with, with its source; none is built in.",
    ),
    Field(
        "size_source",
        "Dose per task from",
        "choice",
        "none",
        choices=(
            ("none", "No dose"),
            ("channels", "The task mean of the size channels"),
            ("modes", "Lognormal modes scaled to the task's measurement"),
            ("spectrum", "An imported spectrum scaled to the task's measurement"),
        ),
    ),
    Field(
        "channel_type",
        "Size channels hold",
        "choice",
        "per_bin",
        choices=(("per_bin", "particles per channel (dN)"), ("dN/dlogDp", "dN/dlogDp")),
        applies=("size_source", ("channels",)),
    ),
    Field(
        "modes",
        "Shape of the size distribution (lognormal modes, count medians)",
        "records",
        [{"median": {"value": 50, "unit": "nm"}, "gsd": 1.8, "share": 1.0}],
        required=False,
        help="Count median (volume-equivalent), GSD and the share of the particle number "
        "of each mode; the amount comes from the task's measurement.",
        applies=("size_source", ("modes",)),
        item_fields=MODE_FIELDS,
        min_items=1,
        max_items=4,
        item_label="Mode",
    ),
    Field(
        "spectrum_text",
        "Spectrum CSV file (shape)",
        "data",
        None,
        required=False,
        extra={"max_bytes": MAX_BYTES, "accept": ".csv,.txt,.tsv"},
        applies=_SPECTRUM,
    ),
    Field(
        "spectrum_diameter_column",
        "Diameter column",
        "text",
        "1",
        required=False,
        applies=_SPECTRUM,
    ),
    Field(
        "spectrum_concentration_column",
        "Concentration column",
        "text",
        "2",
        required=False,
        applies=_SPECTRUM,
    ),
    Field(
        "spectrum_concentration_type",
        "Spectrum concentration is given",
        "choice",
        "dN/dlogDp",
        choices=CONCENTRATION_TYPES,
        applies=_SPECTRUM,
    ),
    Field(
        "spectrum_diameter_unit",
        "Diameter unit in the file",
        "choice",
        "nm",
        choices=(("nm", "nm"), ("um", "µm")),
        applies=_SPECTRUM,
    ),
    Field(
        "scale_column",
        "Scale the shape to column",
        "text",
        "",
        required=False,
        help="A number, mass or LDSA column (blank: the summarised column).",
        extra={"max_length": 80},
        applies=("size_source", ("modes", "spectrum")),
    ),
    Field(
        "dose_basis",
        "Dose from",
        "choice",
        "measured",
        choices=(
            ("measured", "Measured concentrations (what was breathed)"),
            ("corrected", "Background-corrected concentrations (the tasks' own share)"),
        ),
        applies=_DOSE,
    ),
    replace(
        SPECTRUM_DIAMETER_TYPE,
        label="Diameters of the size channels or spectrum are",
        applies=("size_source", ("channels", "spectrum")),
    ),
    replace(
        PARTICLE_DENSITY,
        help="Material density, or the effective density if chosen below (applies to every "
        "channel, bin or mode).",
        applies=_DOSE,
    ),
    replace(DENSITY_BASIS, applies=_DOSE),
    replace(SHAPE_FACTOR, applies=_DOSE),
    replace(DEPOSITION_MODEL, applies=_DOSE),
)
