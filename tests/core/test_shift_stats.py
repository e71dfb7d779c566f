"""Statistics of a logged shift: hand calculations, numpy as an independent reference, and
properties (hypothesis).

Definitions checked: the time-weighted mean and the 8-h TWA = Σ cᵢ tᵢ / 8 h (EN 689:2018,
8-h reference period; the formula also in HSE EH40/2005, from memory); the 15-min
short-term reference period (EN 689:2018, from memory); percentiles by linear interpolation
(Hyndman & Fan 1996, definition 7 = numpy's default ``linear`` method).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from driftdose.compose.shift import DoseSetup, compose_shift
from driftdose.distribution import LognormalMode
from driftdose.shift.background import background_values
from driftdose.shift.clock import TimeParser
from driftdose.shift.periods import Period
from driftdose.shift.series import ColumnSpec, aligned_values, read_series
from driftdose.shift.stats import stats_over, twa8h
from driftdose.shift.taskdose import task_dose
from driftdose.tables import read_table


def make_series(times, *columns, start=0.0):
    """A series from elapsed seconds and value columns (through the file reader)."""
    lines = ["t," + ",".join(f"c{i}" for i in range(len(columns)))]
    for k, t in enumerate(times):
        lines.append(f"{t!r}," + ",".join("" if c[k] is None else repr(c[k]) for c in columns))
    table = read_table("\n".join(lines) + "\n")
    specs = [ColumnSpec(i + 1, str(i)) for i in range(len(columns))]
    return read_series(table, TimeParser("elapsed_seconds", start), 0, specs)


# --- hand calculations ------------------------------------------------------------------


def test_hand_calculation_one_hour_of_minutes():
    # 60 readings, one a minute: 1, 2, ..., 60; each holds 60 s
    values = [float(k) for k in range(1, 61)]
    s = make_series([60.0 * k for k in range(60)], values)
    r = stats_over(s, s.values["0"], [(0.0, 3600.0)])
    assert r.measured == 3600.0 and r.coverage == 1.0
    assert r.mean == pytest.approx(30.5)  # (1 + 60) / 2
    assert r.median == pytest.approx(30.5)
    assert r.p95 == pytest.approx(1 + 0.95 * 59)  # h = 59 * 0.95 = 56.05 -> 57.05
    assert r.maximum == 60.0
    # highest 15-min mean: the last 15 readings, 46..60, mean 53
    assert r.peak15 == pytest.approx(53.0)
    # 8-h TWA, rest of the 8 h as zero: 30.5 * 1 h / 8 h
    assert twa8h(r.integral, r.measured, "zero") == pytest.approx(30.5 / 8)
    # rest at a background of 2: (30.5 * 1 h + 2 * 7 h) / 8 h
    assert twa8h(r.integral, r.measured, "background", 2.0) == pytest.approx((30.5 + 14) / 8)
    assert twa8h(r.integral, r.measured, "excluded") == pytest.approx(30.5)


def test_hand_calculation_period_cuts_readings():
    # readings at 0, 100, 200 s of 10, 20, 30; period 50-250 s takes 50 s of the first,
    # 100 s of the second, 50 s of the third: (500 + 2000 + 1500) / 200 = 20
    s = make_series([0.0, 100.0, 200.0], [10.0, 20.0, 30.0])
    r = stats_over(s, s.values["0"], [(50.0, 250.0)])
    assert r.mean == pytest.approx(20.0)
    assert r.readings == 3


def test_gaps_are_unmeasured_time():
    # 10 s logging; a 300 s hole after the reading at 50 s
    times = [0.0, 10.0, 20.0, 30.0, 40.0, 50.0, 350.0, 360.0, 370.0]
    s = make_series(times, [1.0] * 9)
    assert s.interval == 10.0
    assert len(s.gaps) == 1 and s.gaps[0].start == 60.0 and s.gaps[0].end == 350.0
    r = stats_over(s, s.values["0"], [(0.0, 380.0)])
    assert r.measured == pytest.approx(90.0)
    assert r.coverage == pytest.approx(90.0 / 380.0)


def test_missing_values_are_unmeasured():
    s = make_series([0.0, 10.0, 20.0, 30.0], [1.0, None, 3.0, 5.0])
    r = stats_over(s, s.values["0"], [(0.0, 40.0)])
    assert r.measured == 30.0 and r.mean == pytest.approx(3.0)


def test_background_correction_hand():
    s = make_series([0.0, 10.0, 20.0, 30.0], [5.0, 1.0, 8.0, 2.0])
    bg = [3.0, 3.0, 3.0, 3.0]
    r = stats_over(s, s.values["0"], [(0.0, 40.0)], bg, benchmark=4.0)
    # corrected: 2, 0 (below), 5, 0 (below) -> mean 1.75; below-background share 0.5
    assert r.corrected_mean == pytest.approx(1.75)
    assert r.below_background_share == pytest.approx(0.5)
    assert r.ratio == pytest.approx(4.0 / 4.0)
    assert r.share_above == pytest.approx(0.5)  # 5 and 8 are above 4


def test_pre_post_interpolates_between_background_periods():
    # background 2 from 0-100 s, 6 from 300-400 s; mid-times 50 and 350
    times = [float(t) for t in range(0, 400, 10)]
    values = [2.0 if t < 100 else 6.0 if t >= 300 else 10.0 for t in times]
    s = make_series(times, values)
    periods = [
        Period("pre", "background", 0.0, 100.0),
        Period("work", "task", 100.0, 300.0),
        Period("post", "background", 300.0, 400.0),
    ]
    b = background_values("pre_post", s, s.values["0"], periods)
    for t, x in zip(s.t, b.values, strict=True):
        expected = 2.0 if t <= 50 else 6.0 if t >= 350 else 2.0 + (t - 50) / 300 * 4.0
        assert x == pytest.approx(expected)
    marked = background_values("marked_mean", s, s.values["0"], periods)
    assert marked.values[0] == pytest.approx(4.0)


# --- numpy as reference -------------------------------------------------------------------


@settings(max_examples=60, deadline=None)
@given(
    st.lists(st.floats(0.5, 20.0), min_size=5, max_size=200),
    st.lists(st.floats(0.0, 1e4), min_size=5, max_size=200),
)
def test_statistics_match_numpy(steps, values):
    n = min(len(steps), len(values))
    steps, values = steps[:n], values[:n]
    times = np.concatenate([[0.0], np.cumsum(steps[:-1])])
    spacing = np.diff(times)
    assume(spacing.max() <= 2 * np.median(spacing))  # no gaps: each reading holds to the next
    s = make_series([float(t) for t in times], values)
    end = s.end
    r = stats_over(s, s.values["0"], [(0.0, end)])
    holds = np.append(spacing, np.median(spacing))  # the last reading holds one interval
    vals = np.array(values)
    assert r.mean == pytest.approx(np.average(vals, weights=holds), rel=1e-9, abs=1e-9)
    assert r.median == pytest.approx(np.percentile(vals, 50), rel=1e-12, abs=1e-12)
    assert r.p95 == pytest.approx(np.percentile(vals, 95), rel=1e-12, abs=1e-12)
    assert r.maximum == vals.max()


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_peak15_matches_a_rolling_mean(seed):
    # regular 1-min logging: the highest 15-min mean is the highest mean of 15 readings
    rng = np.random.default_rng(seed)
    vals = rng.lognormal(8.0, 1.0, 240)
    s = make_series([60.0 * k for k in range(240)], [float(v) for v in vals])
    r = stats_over(s, s.values["0"], [(0.0, s.end)])
    rolling = np.convolve(vals, np.ones(15) / 15, mode="valid")
    assert r.peak15 == pytest.approx(rolling.max(), rel=1e-12)


def test_peak15_irregular_against_a_fine_scan():
    # irregular logging, every window start scanned at 0.5 s on the exact integral
    rng = np.random.default_rng(7)
    steps = rng.uniform(5.0, 15.0, 400)
    times = np.concatenate([[0.0], np.cumsum(steps[:-1])])
    vals = rng.lognormal(5.0, 0.8, 400)
    s = make_series([float(t) for t in times], [float(v) for v in vals])
    r = stats_over(s, s.values["0"], [(0.0, s.end)])
    edges = np.concatenate([times, [s.end]])
    cum = np.concatenate([[0.0], np.cumsum(vals * np.diff(edges))])
    starts = np.arange(0.0, s.end - 900.0, 0.5)
    scan = (np.interp(starts + 900.0, edges, cum) - np.interp(starts, edges, cum)) / 900.0
    assert scan.max() <= r.peak15 * (1 + 1e-12)
    assert r.peak15 == pytest.approx(scan.max(), rel=2e-3)


def test_far_field_alignment_matches_numpy_interp():
    near = make_series([float(t) for t in range(0, 600, 7)], [1.0] * len(range(0, 600, 7)))
    far_t = [float(t) for t in range(0, 600, 10)]
    far_v = [float(math.sin(t / 50.0) + 2) for t in far_t]
    far = make_series(far_t, far_v)
    got = aligned_values(near, far, "0")
    expected = np.interp(near.t, far_t, far_v)
    for g, e, t in zip(got, expected, near.t, strict=True):
        assert g == pytest.approx(e, rel=1e-12), t


# --- properties ---------------------------------------------------------------------------


@settings(max_examples=60, deadline=None)
@given(
    st.lists(st.floats(0.0, 1e6), min_size=3, max_size=120),
    st.lists(st.floats(0.0, 1e6), min_size=3, max_size=120),
    st.sampled_from(["zero", "background", "excluded"]),
    st.floats(1.0, 240.0),
)
def test_twa_never_above_the_highest_value_within_8_h(values, background, rule, step):
    # for a shift of at most 8 h; longer shifts divide more than 8 h of exposure by 8 h
    n = min(len(values), len(background))
    s = make_series([step * k for k in range(n)], values[:n], background[:n])
    assume(s.end <= 8 * 3600)
    st_ = stats_over(s, s.values["0"], [(0.0, s.end)], s.values["1"])
    twa = twa8h(st_.integral, st_.measured, rule, st_.background_mean)
    top = max(values[:n]) if rule != "background" else max(max(values[:n]), max(background[:n]))
    assert twa <= top * (1 + 1e-12)
    # the corrected values are never negative and never above the measured ones
    assert st_.corrected_mean >= 0.0
    assert st_.corrected_mean <= st_.mean * (1 + 1e-12) + 1e-12


@settings(max_examples=15, deadline=None)
@given(st.floats(60.0, 4 * 3600.0), st.floats(60.0, 4 * 3600.0), st.floats(1.0, 50.0))
def test_dose_adds_over_tasks(t1, t2, pf):
    aerosol = LognormalMode(80e-9, 1.9, 2e10, 1500.0)
    one = task_dose(aerosol, "light_exercise", "mixed", t1 + t2, pf)
    a = task_dose(aerosol, "light_exercise", "mixed", t1, pf)
    b = task_dose(aerosol, "light_exercise", "mixed", t2, pf)
    for region in one.result.regions:
        for w in ("number", "surface", "mass"):
            whole = one.result.doses[region][w]
            assert a.result.doses[region][w] + b.result.doses[region][w] == pytest.approx(
                whole, rel=1e-9
            )
    # the protection factor divides what is inhaled
    bare = task_dose(aerosol, "light_exercise", "mixed", t1 + t2, 1.0)
    assert one.result.doses["AI"]["mass"] * pf == pytest.approx(
        bare.result.doses["AI"]["mass"], rel=1e-9
    )


def test_shift_dose_is_the_sum_of_its_tasks():
    times = [float(t) for t in range(0, 7200, 10)]
    values = [5e9 if t < 3600 else 2e10 for t in times]
    s = make_series(times, values)
    periods = [Period("a", "task", 0.0, 3600.0), Period("b", "task", 3600.0, 7200.0, "sitting")]
    shape = LognormalMode(60e-9, 1.7, 1.0)
    r = compose_shift(s, "0", periods, dose=DoseSetup("modes", shape=shape, scale_key="0"))
    assert len(r.dose.tasks) == 2
    for region in r.dose.regions:
        for w in ("number", "surface", "mass"):
            parts = sum(td.result.doses[region][w] for _, td in r.dose.tasks)
            assert r.dose.totals[region][w] == pytest.approx(parts, rel=1e-12)
    # each task's aerosol holds the task's measured number concentration
    assert r.dose.tasks[0][1].ambient.total("number") == pytest.approx(5e9, rel=1e-9)
    assert r.dose.tasks[1][1].ambient.total("number") == pytest.approx(2e10, rel=1e-9)


def test_peak15_both_ways_agree():
    # regular 10 s logging read whole (short path) and with the period cut mid-reading
    # (general sweep): each against a 1 s scan of the exact integral
    rng = np.random.default_rng(11)
    vals = rng.lognormal(6.0, 0.7, 720)
    times = [10.0 * k for k in range(720)]
    s = make_series(times, [float(v) for v in vals])
    edges = np.append(np.array(times), s.end)
    cum = np.concatenate([[0.0], np.cumsum(vals * 10.0)])
    for lo, hi in ((0.0, s.end), (5.0, s.end - 5.0)):
        r = stats_over(s, s.values["0"], [(lo, hi)])
        starts = np.arange(lo, hi - 900.0 + 1e-9, 1.0)
        scan = (np.interp(starts + 900.0, edges, cum) - np.interp(starts, edges, cum)) / 900.0
        assert r.peak15 == pytest.approx(scan.max(), rel=1e-9)
