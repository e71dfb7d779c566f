"""Composition of the shift calculation: statistics per period and for the shift, the 8-h TWA,
the background used, and the deposited dose per task summed over the shift.

Order: background per reading (:mod:`driftdose.shift.background`) → statistics of each period
and of the shift (:func:`driftdose.shift.stats.stats_over`) → 8-h TWA
(:func:`driftdose.shift.stats.twa8h`) → per task, a size distribution scaled to the task's
measurements and the deposited dose behind the protection (:mod:`driftdose.shift.taskdose`),
added over the tasks.

The shift runs from the start of the first period to the end of the last (the whole logged
time when no period is marked); break periods are left out of the shift's statistics and
count as unmeasured time in the TWA (the worker is away from the monitored air).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any

from ..diameters import ParticleDescription
from ..distribution import WEIGHTS
from ..shift.background import Background, background_values
from ..shift.periods import MAX_PERIODS, Period, check_periods
from ..shift.series import TimeSeries
from ..shift.stats import PeriodStats, mean_over, stats_over, twa8h
from ..shift.taskdose import TaskDose, channel_spectrum, scaled, shape_amount, task_dose

__all__ = ["DoseSetup", "ShiftDose", "ShiftResult", "compose_shift"]

UNIT_DENSITY = ParticleDescription(1000.0)
"""Unit-density spheres, the description of channels when none is given."""


@dataclass(frozen=True)
class DoseSetup:
    """How each task's aerosol is built.

    Attributes
    ----------
    size_source : str
        ``channels``, ``spectrum`` or ``modes``.
    shape : Any
        For ``spectrum``/``modes``: the distribution giving the shape (its amount is
        replaced by the task's measurement).
    scale_key : str
        For ``spectrum``/``modes``: the series column scaled to.
    scale_quantity : str
        What that column holds: ``number`` [1/m^3], ``mass`` [kg/m^3] or ``ldsa`` [m^2/m^3].
    channel_keys : tuple of str
        For ``channels``: series columns of the size channels, by increasing diameter.
    channel_diameters : tuple of float
        Their mid-point diameters. [m]
    channel_per_log10 : bool
        Channels hold dN/dlog10 d rather than particles per bin.
    description : ParticleDescription
        The particles of ``channels``: density [kg/m^3], dynamic shape factor [-] and density
        basis (material or effective); unit-density spheres when left out.
    diameter_type : str
        Which equivalent diameter the channels are: ``volume_equivalent``, ``optical``,
        ``mobility`` or ``aerodynamic`` (converted to the models' diameter).
    model : str
        ``icrp66`` or ``simplified``.
    corrected : bool
        Use the background-corrected means (the task's own contribution) instead of the
        measured ones (what was breathed).

    """

    size_source: str
    shape: Any = None
    scale_key: str = ""
    scale_quantity: str = "number"
    channel_keys: tuple[str, ...] = ()
    channel_diameters: tuple[float, ...] = ()
    channel_per_log10: bool = False
    description: ParticleDescription = UNIT_DENSITY
    diameter_type: str = "volume_equivalent"
    model: str = "icrp66"
    corrected: bool = False


@dataclass(frozen=True)
class ShiftDose:
    """Deposited dose per task and over the shift.

    Attributes
    ----------
    tasks : tuple of (int, TaskDose)
        Index of the task in the periods, and its dose.
    regions : tuple of str
        Region keys, ``total`` last.
    totals : dict
        ``totals[region][weight]`` summed over the tasks: [1], [m^2], [kg].
    skipped : tuple of (int, str)
        Tasks without a dose and why (nothing measured).

    """

    tasks: tuple[tuple[int, TaskDose], ...]
    regions: tuple[str, ...]
    totals: dict[str, dict[str, float]]
    skipped: tuple[tuple[int, str], ...] = ()


@dataclass(frozen=True)
class ShiftResult:
    """Everything the shift calculation found. Concentrations in SI of the quantity.

    Attributes
    ----------
    span : tuple of float
        Start and end of the shift. [s from the first reading]
    periods : tuple of (Period, PeriodStats)
        Each period with its statistics, in the order entered.
    shift : PeriodStats
        Statistics over the shift, breaks left out.
    twa8h, twa8h_corrected : float or None
        8-h TWA of the measured and of the background-corrected values.
    twa_ratio : float or None
        twa8h ÷ benchmark. [-]
    unmeasured : float
        Unmeasured part of the 8-h reference period (0 when 8 h or more were measured). [s]
    unmeasured_as : str
        How it counted: ``zero``, ``background`` or ``excluded``.
    background : Background
        Background per reading and the method used.
    dose : ShiftDose or None
        Dose per task, when asked for.
    notes : tuple of str
        What the user should know.

    """

    span: tuple[float, float]
    periods: tuple[tuple[Period, PeriodStats], ...]
    shift: PeriodStats
    twa8h: float | None
    twa8h_corrected: float | None
    twa_ratio: float | None
    unmeasured: float
    unmeasured_as: str
    background: Background
    dose: ShiftDose | None = None
    notes: tuple[str, ...] = field(default_factory=tuple)


def _minus_breaks(
    span: tuple[float, float], periods: Sequence[Period]
) -> list[tuple[float, float]]:
    out: list[tuple[float, float]] = []
    a = span[0]
    for p in sorted((p for p in periods if p.kind == "break"), key=lambda p: p.start):
        if p.start > a:
            out.append((a, p.start))
        a = max(a, p.end)
    if span[1] > a:
        out.append((a, span[1]))
    return out


_recent: dict[str, list[tuple[tuple[Any, ...], Any, Any]]] = {"background": [], "stats": []}
"""The last backgrounds and period statistics found, so that moving one period redoes only
what depends on it (objects in a key compared by identity, the rest by value)."""


def _remembered(kind: str, objects: tuple[Any, ...], values: Any, build: Any, keep: int) -> Any:
    kept = _recent[kind]
    for objs, vals, result in kept:
        if vals == values and all(a is b for a, b in zip(objs, objects, strict=True)):
            return result
    result = build()
    kept.insert(0, (objects, values, result))
    del kept[keep:]
    return result


def _background(
    method: str,
    series: TimeSeries,
    values: Sequence[float | None],
    periods: Sequence[Period],
    far: TimeSeries | None,
    far_key: str | None,
) -> Background:
    """:func:`background_values`, kept for the periods it reads (background periods; every
    period for ``pre_post``, whose notes name the tasks)."""
    if method == "far_field":
        used: tuple[Any, ...] = (far_key,)
    elif method == "pre_post":
        used = tuple((p.kind, p.label, p.start, p.end) for p in periods)
    else:
        used = tuple((p.kind, p.label, p.start, p.end) for p in periods if p.kind == "background")
    return _remembered(  # type: ignore[no-any-return]
        "background",
        (series, values, far),
        (method, used),
        lambda: background_values(method, series, values, periods, far, far_key),
        2,
    )


def _stats(
    series: TimeSeries,
    values: Sequence[float | None],
    intervals: list[tuple[float, float]],
    background: Sequence[float | None] | None,
    benchmark: float | None,
) -> PeriodStats:
    """:func:`stats_over`, kept per period bounds (a period that did not move is not redone)."""
    return _remembered(  # type: ignore[no-any-return]
        "stats",
        (series, values, background),
        (tuple(intervals), benchmark),
        lambda: stats_over(series, values, intervals, background, benchmark),
        3 * MAX_PERIODS,
    )


def compose_shift(
    series: TimeSeries,
    key: str,
    periods: Sequence[Period],
    background_method: str = "none",
    unmeasured_as: str = "zero",
    benchmark: float | None = None,
    far: TimeSeries | None = None,
    far_key: str | None = None,
    dose: DoseSetup | None = None,
) -> ShiftResult:
    """Statistics, TWA and dose of a shift (see the module notes).

    Parameters
    ----------
    series : TimeSeries
        The near-field readings.
    key : str
        The column summarised (its values in SI: 1/m^3, m^2/m^3 or kg/m^3).
    periods : sequence of Period
        Tasks, background periods and breaks.
    background_method : str
        ``none``, ``marked_mean``, ``pre_post`` or ``far_field``.
    unmeasured_as : str
        ``zero``, ``background`` or ``excluded``.
    benchmark : float, optional
        Value of the summarised quantity to compare with, > 0. [SI]
    far : TimeSeries, optional
        The far-field series (``far_field``).
    far_key : str, optional
        Its column of the same quantity.
    dose : DoseSetup, optional
        How to build each task's aerosol; no dose without it.

    Returns
    -------
    ShiftResult
        The statistics, TWA, background and dose.

    Raises
    ------
    PeriodError, BackgroundError, ValueError
        Unusable periods, a background method that cannot apply, or counting unmeasured
        time as background without one.

    """
    check_periods(periods, 0.0, series.end, series.start)
    values = series.values[key]
    bg = _background(background_method, series, values, periods, far, far_key)
    b = bg.values
    rows = tuple((p, _stats(series, values, [(p.start, p.end)], b, benchmark)) for p in periods)
    span = (
        (min(p.start for p in periods), max(p.end for p in periods))
        if periods
        else (0.0, series.end)
    )
    shift = _stats(series, values, _minus_breaks(span, periods), b, benchmark)
    notes: list[str] = list(bg.notes)
    if unmeasured_as == "background" and shift.background_mean is None:
        raise ValueError("counting unmeasured time as background needs a background method")
    twa = twa8h(shift.integral, shift.measured, unmeasured_as, shift.background_mean)
    twa_c = None
    if b is not None:
        if unmeasured_as == "excluded":
            twa_c = twa8h(shift.corrected_integral, shift.background_time, "excluded")
        else:  # unmeasured time at the background adds nothing above it
            twa_c = twa8h(shift.corrected_integral, shift.background_time, "zero")
    unmeasured = max(0.0, 8 * 3600.0 - shift.measured)
    if unmeasured_as == "excluded" and unmeasured > 0:
        notes.append(
            "The TWA is the mean over the measured time only; it is not an 8-h TWA because "
            "less than 8 h were measured."
        )
    ratio = twa / benchmark if (benchmark is not None and twa is not None) else None
    shift_dose = _dose(series, key, rows, dose, notes) if dose is not None else None
    return ShiftResult(
        span,
        rows,
        shift,
        twa,
        twa_c,
        ratio,
        unmeasured,
        unmeasured_as,
        bg,
        shift_dose,
        tuple(notes),
    )


def _dose(
    series: TimeSeries,
    key: str,
    rows: Sequence[tuple[Period, PeriodStats]],
    setup: DoseSetup,
    notes: list[str],
) -> ShiftDose:
    tasks: list[tuple[int, TaskDose]] = []
    skipped: list[tuple[int, str]] = []
    unit_amount = None
    if setup.size_source in ("spectrum", "modes"):
        unit_amount = shape_amount(setup.shape, setup.scale_quantity, setup.model)
        if not unit_amount > 0.0:
            raise ValueError("the size distribution holds none of the quantity it is scaled to")
    if setup.corrected and (setup.size_source == "channels" or setup.scale_key != key):
        notes.append(
            "The dose uses measured (not background-corrected) concentrations: the background "
            "is found for the summarised column only."
        )
    for i, (p, st) in enumerate(rows):
        if p.kind != "task":
            continue
        if setup.size_source == "channels":
            means = [
                mean_over(series, series.values[k], [(p.start, p.end)])[0]
                for k in setup.channel_keys
            ]
            if any(m is None for m in means):
                skipped.append((i, "no size-channel readings in the task"))
                continue
            ambient = channel_spectrum(
                setup.channel_diameters,
                [float(m) for m in means if m is not None],
                setup.channel_per_log10,
                setup.description,
                setup.diameter_type,
            )
            if ambient.total("number") <= 0.0:
                skipped.append((i, "every size channel is zero in the task"))
                continue
        else:
            if setup.scale_key == key:
                level = st.corrected_mean if setup.corrected else st.mean
                if level is None:
                    level = st.mean
            else:
                level = mean_over(series, series.values[setup.scale_key], [(p.start, p.end)])[0]
            if level is None:
                skipped.append((i, "no readings of the scaling quantity in the task"))
                continue
            assert unit_amount is not None
            ambient = scaled(setup.shape, max(0.0, level) / unit_amount)
        td = task_dose(ambient, p.activity, p.route, p.duration, p.protection_factor, setup.model)
        tasks.append((i, td))
    regions = tasks[0][1].result.regions if tasks else ()
    totals = {
        r: {w: math.fsum(td.result.doses[r][w] for _, td in tasks) for w in WEIGHTS}
        for r in regions
    }
    return ShiftDose(tuple(tasks), regions, totals, tuple(skipped))
