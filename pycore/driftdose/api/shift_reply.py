"""Shaping the shift calculation's reply (layout in :mod:`driftdose.api.shift`), and reading
its dose choices into the composer's :class:`~driftdose.compose.shift.DoseSetup`."""

from __future__ import annotations

import bisect
import copy
import hashlib
import itertools
import json
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from ..compose.shift import DoseSetup, ShiftResult
from ..diameters import ParticleDescription
from ..distribution import BinnedSpectrum, Multimodal
from ..shift.periods import Period
from ..shift.series import TimeSeries
from ..shift.stats import PeriodStats
from ..shift.thin import thin_minmax
from ..sources import cite
from ..tables import Table, describe_table
from .deposition import REGION_LABELS
from .fields import FieldError
from .reply import row, text_result
from .shift_inputs import SI_UNITS, quantity_scale
from .spectrum_fields import import_spectrum, spectrum_aerosol

__all__ = ["TableFacts", "dose_setup", "shape", "table_facts"]

CURVE_POINTS = 2000
QUANTITY_WORDS = {
    "number": "Number concentration",
    "ldsa": "LDSA",
    "mass": "Mass concentration",
    "channel": "Size channel",
}
DOSE_UNITS = {"number": (1.0, "1"), "surface": (1e-6, "mm2"), "mass": (1e-9, "ug")}
"""Dose per weight: (factor to SI, unit code): particles, mm², µg."""
RULE_WORDS = {
    "zero": "unmeasured time of the 8 h counted as zero",
    "background": "unmeasured time of the 8 h counted at the mean background",
    "excluded": "mean over the measured time (unmeasured time left out)",
}


def dose_setup(
    v: dict[str, Any],
    columns: list[dict[str, Any]],
    units: tuple[str, ...],
    q_index: int,
    parse_modes: Callable[[Any, ParticleDescription], Any],
) -> DoseSetup | None:
    """The dose choices as the composer takes them (None for no dose)."""
    source = v["size_source"]
    if source == "none":
        return None
    desc = ParticleDescription(
        v["particle_density"], v["shape_factor"], v.get("density_basis") or "material"
    )
    diameter_type = v.get("spectrum_diameter_type") or "volume_equivalent"
    corrected = v["dose_basis"] == "corrected"
    if source == "channels":
        chans = sorted(
            (c["diameter"], str(i)) for i, c in enumerate(columns) if c["quantity"] == "channel"
        )
        if len(chans) < 2:
            raise FieldError("quantity_columns", "Add at least two size-channel columns.")
        for (d0, _), (d1, k1) in itertools.pairwise(chans):
            if d1 <= d0:
                raise FieldError(
                    f"quantity_columns.{k1}.diameter", "Two size channels have the same diameter."
                )
        return DoseSetup(
            "channels",
            channel_keys=tuple(k for _, k in chans),
            channel_diameters=tuple(d for d, _ in chans),
            channel_per_log10=v["channel_type"] == "dN/dlogDp",
            description=desc,
            diameter_type=diameter_type,
            model=v["model"],
            corrected=corrected,
        )
    scale = (v.get("scale_column") or "").strip()
    s_index = q_index
    if scale:
        match = [i for i, c in enumerate(columns) if c["column"].lower() == scale.lower()]
        if not match:
            raise FieldError("scale_column", f"{scale[:40]!r} is none of the value columns.")
        s_index = match[0]
    s_quantity = columns[s_index]["quantity"]
    if s_quantity == "channel":
        raise FieldError("scale_column", "Scale to a number, mass or LDSA column.")
    if source == "modes":
        shape = parse_modes(v.get("modes"), desc)
    else:
        shape = _spectrum(v, desc, diameter_type)
    return DoseSetup(
        source,
        shape=shape,
        scale_key=str(s_index),
        scale_quantity=s_quantity,
        model=v["model"],
        corrected=corrected,
    )


_SHAPE_INPUTS = {
    "file": "spectrum_text",
    "diameter_column": "spectrum_diameter_column",
    "concentration_column": "spectrum_concentration_column",
    "concentration_type": "spectrum_concentration_type",
    "diameter_unit": "spectrum_diameter_unit",
}
"""The shift's inputs of a spectrum shape, read by the shared spectrum importer."""


def _spectrum(
    v: dict[str, Any], desc: ParticleDescription, diameter_type: str
) -> Multimodal | BinnedSpectrum:
    imported, _ = import_spectrum(v, _SHAPE_INPUTS, shape_only=True)
    return spectrum_aerosol(imported, diameter_type, desc, "spectrum_text").distribution


def _q(x: float | None, f: float) -> float | None:
    return None if x is None else x / f


def _row(p: Period | None, st: PeriodStats, f: float, series: TimeSeries) -> dict[str, Any]:
    out: dict[str, Any] = {}
    if p is not None:
        out.update(
            {
                "period": p.label,
                "kind": p.kind,
                "start": series.clock(p.start),
                "end": series.clock(p.end),
                "start_s": p.start,
                "end_s": p.end,
            }
        )
    out.update(
        {
            "duration_s": st.duration,
            "coverage": st.coverage,
            "readings": st.readings,
            "mean": _q(st.mean, f),
            "median": _q(st.median, f),
            "p95": _q(st.p95, f),
            "max": _q(st.maximum, f),
            "peak15": _q(st.peak15, f),
            "background": _q(st.background_mean, f),
            "corrected_mean": _q(st.corrected_mean, f),
            "below_background_share": st.below_background_share,
            "ratio": st.ratio,
            "share_above": st.share_above,
        }
    )
    if p is not None:
        out.update(
            {
                "activity": p.activity if p.kind == "task" else None,
                "route": p.route if p.kind == "task" else None,
                "protection_factor": p.protection_factor if p.kind == "task" else None,
            }
        )
    return out


@dataclass(frozen=True)
class TableFacts:
    """What a reply says of a read table: kept in place of the table, whose rows (a list
    and a tuple per file line) the series no longer needs once it is read."""

    columns: tuple[tuple[str, str], ...]
    """(name, unit as the header writes it) per column."""
    header_line: int | None
    delimiter: str
    decimal: str
    described: dict[str, Any]
    """:func:`~driftdose.tables.describe_table` of the table (copied into each reply)."""


def table_facts(table: Table) -> TableFacts:
    """The facts of ``table`` a reply uses (see :class:`TableFacts`).

    Parameters
    ----------
    table : Table
        The file's table as :func:`driftdose.tables.read_table` read it.
    """
    return TableFacts(
        tuple((c.name, c.unit.unit or "") for c in table.columns),
        table.header_line,
        table.delimiter,
        table.decimal,
        describe_table(table),
    )


def _import(
    table: TableFacts, series: TimeSeries, v: dict[str, Any], prefix: str
) -> dict[str, Any]:
    rec = v.get(f"{prefix}file")
    file = None
    if isinstance(rec, dict):
        file = {
            k: rec[k]
            for k in ("name", "sha256", "bytes")
            if isinstance(rec.get(k), str | int) and not isinstance(rec.get(k), bool)
        }
        file = {k: (x[:200] if isinstance(x, str) else x) for k, x in file.items()}
    return {
        "rows": len(series.t),
        "columns": [{"name": name, "unit": unit} for name, unit in table.columns],
        "header_line": table.header_line,
        "delimiter": table.delimiter,
        "decimal": table.decimal,
        "interval_s": series.interval,
        "start": series.clock(0.0),
        "end": series.clock(series.end),
        "gaps": [
            {"start": series.clock(g.start), "end": series.clock(g.end), "seconds": g.seconds}
            for g in series.gaps[:200]
        ],
        "gap_count": len(series.gaps),
        "file": file,
        "table": copy.deepcopy(table.described),
    }


_THINNED: list[tuple[TimeSeries, tuple[Any, ...], Any]] = []


def _curve(
    series: TimeSeries, cols: list[tuple[str, str, str, Any, float]], drawn: set[str]
) -> tuple[dict[str, Any], list[float]]:
    """Thinned columns: (key, label, unit label, values in SI, factor to SI). The thinning of
    a series read earlier is kept (the last two), so moving a period does not redo it.

    The curve carries ``key``, a digest of its times, values, labels and units; when the
    request names that key in ``drawn`` (the page keeps that series), the times and values
    are left out and ``held`` is true. Returns the curve and its times [s]."""
    keys = tuple((k, lab, u, f) for k, lab, u, _, f in cols)
    hit = next((r for s, k, r in _THINNED if s is series and k == keys), None)
    if hit is None:
        t, ys = thin_minmax(
            series.t, [vals for *_, vals, _ in cols], CURVE_POINTS, [g.start for g in series.gaps]
        )
        shown = [[None if y is None else y / f for y in ys[i]] for i, (*_, f) in enumerate(cols)]
        digest = json.dumps([keys, list(t), shown], allow_nan=True).encode()
        hit = (list(t), shown, hashlib.sha256(digest).hexdigest()[:32])
        _THINNED.insert(0, (series, keys, hit))
        del _THINNED[2:]
    t, shown, key = hit
    held = key in drawn
    out: dict[str, Any] = {
        "start": series.clock(0.0),
        "x_label": "Time since the first reading",
        "x_unit": "s",
        "key": key,
        "held": held,
        "t_s": None if held else list(t),
        "series": [
            {"key": k, "label": lab, "unit": u, **({} if held else {"y": list(shown[i])})}
            for i, (k, lab, u, _, _) in enumerate(cols)
        ],
        "gaps": [{"start_s": g.start, "end_s": g.end} for g in series.gaps[:200]],
    }
    if held:
        del out["t_s"]
    return out, t


_NEGATIVE: list[tuple[TimeSeries, str, int]] = []


def _negatives(series: TimeSeries, key: str) -> int:
    """Readings below zero in a column (counted once per series read)."""
    hit = next((n for s, k, n in _NEGATIVE if s is series and k == key), None)
    if hit is None:
        hit = sum(1 for x in series.values[key] if x is not None and x < 0)
        _NEGATIVE.insert(0, (series, key, hit))
        del _NEGATIVE[4:]
    return hit


def _at_points(series: TimeSeries, values: Any, ts: list[float], f: float) -> list[float | None]:
    """Values per reading taken at drawing times (the reading in force at each), in display
    units; None inside gaps."""
    out: list[float | None] = []
    for t in ts:
        k = max(0, bisect.bisect_right(series.t, t) - 1)
        v = values[k] if t < series.t[k] + series.hold[k] else None
        out.append(None if v is None else v / f)
    return out


def _plain(label: str, si: float | None, f: float, unit: str, si_unit: str, note: str = "") -> Any:
    """A result row in ``unit`` (``si / f``), or "not available" without a value."""
    if si is None:
        return text_result(label, "not available", note)
    return row(label, si, f, unit, si_unit, note=note)


def shape(
    v: dict[str, Any],
    table: TableFacts,
    series: TimeSeries,
    columns: list[dict[str, Any]],
    units: tuple[str, ...],
    q_index: int,
    unit: str,
    r: ShiftResult,
    far_table: TableFacts | None,
    far: TimeSeries | None,
    far_unit: str,
) -> dict[str, Any]:
    """The reply of the shift calculation (layout in :mod:`driftdose.api.shift`)."""
    quantity = columns[q_index]["quantity"]
    f = quantity_scale(quantity, unit)
    si_unit = SI_UNITS[quantity]
    warnings: list[str] = list(r.notes)
    results: dict[str, Any] = {
        "import": _import(table, series, v, "series_"),
    }
    results["preview"] = results["import"]["table"]["preview"]
    if far is not None and far_table is not None:
        results["background_import"] = _import(far_table, far, v, "background_")
    rows = []
    for i, (p, st) in enumerate(r.periods):
        row = {"index": i, **_row(p, st, f, series), "unit": unit}
        rows.append(row)
        if st.coverage < 0.9:
            warnings.append(
                f"Period {p.label!r}: readings cover {st.coverage:.0%} of it (gaps or missing "
                "values)."
            )
        if st.peak15 is None and p.duration >= 900:
            warnings.append(f"Period {p.label!r}: no 15-minute window is half measured.")
    results["tasks"] = {"label": "Periods", "unit": unit, "rows": rows}
    if any(p.kind == "task" and p.protection_factor > 1.0 for p, _ in r.periods):
        warnings.append(
            "Concentrations, peaks and the TWA are those of the air around the worker, outside "
            "the respiratory protection (as exposure is compared with limits); the protection "
            "factor enters the dose only."
        )
    s = r.shift
    shift_row = {
        "period": "Shift",
        "start": series.clock(r.span[0]),
        "end": series.clock(r.span[1]),
        **_row(None, s, f, series),
        "twa8h": _q(r.twa8h, f),
        "twa8h_corrected": _q(r.twa8h_corrected, f),
        "twa_ratio": r.twa_ratio,
        "unmeasured_s": r.unmeasured,
        "unmeasured_as": RULE_WORDS[r.unmeasured_as],
        "background_method": r.background.words,
        "unit": unit,
    }
    results["shift"] = {"label": "Shift", "unit": unit, "rows": [shift_row]}
    twa_label = "8-h TWA" if r.unmeasured_as != "excluded" else "Mean over measured time"
    results["twa8h"] = _plain(twa_label, r.twa8h, f, unit, si_unit, RULE_WORDS[r.unmeasured_as])
    if r.twa8h_corrected is not None:
        results["twa8h_corrected"] = _plain(
            f"{twa_label}, background-corrected", r.twa8h_corrected, f, unit, si_unit
        )
    if r.twa_ratio is not None:
        results["twa_ratio"] = _plain("8-h TWA ÷ benchmark", r.twa_ratio, 1.0, "1", "1")
    results["shift_mean"] = _plain("Shift mean (breaks left out)", s.mean, f, unit, si_unit)
    results["shift_peak15"] = _plain("Highest 15-min mean", s.peak15, f, unit, si_unit)
    results["shift_max"] = _plain("Highest reading", s.maximum, f, unit, si_unit)
    results["coverage"] = _plain("Shift measured", s.coverage * 100, 1.0, "%", "%")
    results["twa_rule"] = {"label": "TWA rule", "text": RULE_WORDS[r.unmeasured_as], "note": ""}
    results["background_method"] = {
        "label": "Background",
        "text": r.background.words,
        "note": "",
    }
    if series.gaps:
        total = sum(g.seconds for g in series.gaps)
        warnings.append(
            f"{len(series.gaps)} gap(s) in the logging, {total / 60:.3g} min in all (a gap: a "
            "spacing over twice the logging interval)."
        )
    negative = _negatives(series, str(q_index))
    if negative:
        warnings.append(f"{negative} reading(s) below zero are used as logged.")
    if series.end > 24 * 3600.0:
        warnings.append("The file covers more than 24 h; mark the shift with periods.")
    # curves
    cols = [
        (
            f"c{i}",
            f"{QUANTITY_WORDS[c['quantity']]} ({c['column']})",
            units[i],
            series.values[str(i)],
            quantity_scale(c["quantity"], units[i]),
        )
        for i, c in enumerate(columns)
        if c["quantity"] != "channel"
    ]
    drawn = set((v.get("series_drawn") or "").split())
    curve, ts = _curve(series, cols, drawn)
    if r.background.values is not None:
        # per reading, and moved with the periods: its values have a key of their own
        used = _at_points(series, r.background.values, ts, f)
        used_key = hashlib.sha256(json.dumps(used).encode()).hexdigest()[:32]
        entry: dict[str, Any] = {
            "key": "background",
            "label": "Background used",
            "unit": unit,
            "values_key": used_key,
            "held": used_key in drawn,
        }
        if not entry["held"]:
            entry["y"] = used
        curve["series"].append(entry)
    curve["periods"] = [
        {"index": i, "label": p.label, "kind": p.kind, "start_s": p.start, "end_s": p.end}
        for i, (p, _) in enumerate(r.periods)
    ]
    curves: dict[str, Any] = {"series": curve}
    if far is not None:
        bf = quantity_scale(quantity, far_unit)
        far_cols = [("far", "Far-field series", far_unit, far.values["0"], bf)]
        far_curve, _ = _curve(far, far_cols, drawn)
        far_curve["offset_s"] = far.start - series.start
        curves["background"] = far_curve
    model = v["model"]
    if r.dose is not None:
        results["dose"] = _dose(r, series)
        for i, why in r.dose.skipped:
            warnings.append(f"Task {r.periods[i][0].label!r}: no dose ({why}).")
        if not r.dose.tasks:
            warnings.append("No task has a dose: mark task periods.")
    keys = ["en689_2018", "hyndman_fan1996"]
    if r.dose is not None:
        keys += ["en529_2005", "icrp66" if model == "icrp66" else "hinds1999", "ldsa_fissan2007"]
    return {"results": results, "curves": curves, "warnings": warnings, "sources": cite(*keys)}


def _dose(r: ShiftResult, series: TimeSeries) -> dict[str, Any]:
    assert r.dose is not None
    regions = list(r.dose.regions)
    tasks = []
    rows = []
    for i, td in r.dose.tasks:
        p = r.periods[i][0]
        entry: dict[str, Any] = {
            "index": i,
            "period": p.label,
            "protection_factor": p.protection_factor,
            "duration_s": p.duration,
            "activity": p.activity,
            "route": p.route,
        }
        for w, (fac, _) in DOSE_UNITS.items():
            entry[w] = [td.result.doses[reg][w] / fac for reg in regions]
        entry["ldsa"] = {k: x * 1e6 for k, x in td.ldsa.items()}  # µm²/cm³
        tasks.append(entry)
        rows.append(_dose_row(p.label, entry, regions))
    total = {
        w: [r.dose.totals[reg][w] / fac for reg in regions] for w, (fac, _) in DOSE_UNITS.items()
    }
    rows.append(_dose_row("Shift total", {"index": None, **total}, regions))
    return {
        "label": "Deposited dose per task",
        "regions": regions,
        "region_labels": [REGION_LABELS.get(k, k) for k in regions],
        "units": {w: u for w, (_, u) in DOSE_UNITS.items()},
        "ldsa_unit": "um2/cm3",
        "tasks": tasks,
        "total": total,
        "rows": rows,
    }


def _dose_row(label: str, entry: dict[str, Any], regions: list[str]) -> dict[str, Any]:
    q = []
    for w, (_, u) in DOSE_UNITS.items():
        for k, reg in enumerate(regions):
            q.append({"label": f"{reg} {w}", "value": entry[w][k], "unit": u})
    for k, x in (entry.get("ldsa") or {}).items():
        q.append({"label": f"LDSA {k}", "value": x, "unit": "um2/cm3"})
    return {"task": label, "protection_factor": entry.get("protection_factor"), "quantities": q}
