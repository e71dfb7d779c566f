"""Equivalent diameters of one particle: aerodynamic, volume-equivalent and mobility.

The aerodynamic and volume-equivalent diameters are related by equal settling velocity
(Hinds 1999, eq. 3.30 with slip), the mobility diameter by equal mechanical mobility (Hinds
1999, eqs. 3.16 and 3.25); each is solved in ln d inside the bracket between the continuum
and free-molecular limits.
"""

from __future__ import annotations

import math
from collections import OrderedDict
from collections.abc import Sequence

from .. import gas
from .._numerics import brent_root, newton_bracketed
from ..constants import P_DEFAULT, T_DEFAULT, WATER_DENSITY
from .slip import SLIP_MODELS, _slip_and_log_slope, slip_correction


def aerodynamic_diameter(
    d: float, density: float, shape_factor: float = 1.0, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Aerodynamic diameter of a particle of volume-equivalent diameter ``d``.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Aerodynamic diameter (unit-density sphere with the same settling velocity). [m]

    Notes
    -----
    Solves d_ae^2 Cc(d_ae) rho_0 = d^2 Cc(d) rho_p / chi with rho_0 = 1000 kg/m^3
    (Hinds 1999, eq. 3.30 with slip) by Newton's method in ln d_ae, kept inside the bracket
    between the continuum and free-molecular limits (:func:`driftdose._numerics.newton_bracketed`).

    Examples
    --------
    In the continuum limit d_ae = d sqrt(rho_p / (rho_0 chi)) (Hinds 1999, eq. 3.27); a
    10 um sphere of density 4000 kg/m^3 is about 20 um aerodynamic (slip adds a little):

    >>> round(aerodynamic_diameter(10e-6, 4000.0) * 1e6, 1)
    20.1

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return d
    ratio = density / (WATER_DENSITY * shape_factor)
    return _solve_equal_settling(d, ratio, T, P)


def aerodynamic_diameters(
    ds: Sequence[float],
    density: float,
    shape_factor: float = 1.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> list[float]:
    """:func:`aerodynamic_diameter` of many sizes at once (a size grid of a curve or quadrature).

    Parameters
    ----------
    ds : sequence of float
        Volume-equivalent diameters, best in increasing or decreasing order. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    list of float
        Aerodynamic diameters, one per size. [m]

    Notes
    -----
    The same equation and the same safeguarded Newton iteration as
    :func:`aerodynamic_diameter` (Hinds 1999, eq. 3.30 with slip), each solve started from
    the solutions at the two sizes before it (ln d_ae - ln d extrapolated linearly in ln d)
    instead of the continuum limit: on a grid of neighbouring sizes it needs two slip
    evaluations instead of three to five. The sizes' own side, d^2 Cc(d), is kept per grid
    and air (an edit of the density finds it), and above about 5.5 um, where the exponential
    of the slip correction is below double precision, the relation is a quadratic solved in
    closed form. The results differ from one solve at a time by about 1e-14 relative (the
    iteration's own precision).
    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return list(ds)
    return _equal_settling_grid(ds, density / (WATER_DENSITY * shape_factor), T, P)


def volume_equivalent_diameters(
    d_aes: Sequence[float],
    density: float,
    shape_factor: float = 1.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> list[float]:
    """:func:`volume_equivalent_diameter` of many aerodynamic sizes at once (a size grid).

    Parameters
    ----------
    d_aes : sequence of float
        Aerodynamic diameters, best in increasing or decreasing order. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    list of float
        Volume-equivalent diameters, one per size. [m]

    Notes
    -----
    The relation of :func:`aerodynamic_diameters` (Hinds 1999, eq. 3.30 with slip) solved for
    d, each Newton solve started from its neighbours' solutions as there; within about 1e-14
    relative of one solve at a time.

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return list(d_aes)
    return _equal_settling_grid(d_aes, WATER_DENSITY * shape_factor / density, T, P)


GRID_TERMS_KEPT = 16
"""Size grids whose slip terms :func:`_equal_settling_grid` keeps (least recently used dropped)."""

_grid_terms_kept: OrderedDict[tuple, tuple[tuple[float, ...], ...]] = OrderedDict()


def _grid_terms(
    ds: Sequence[float], two_lambda: float, T: float, P: float
) -> tuple[tuple[float, ...], ...]:
    """The logarithm ln d [-], d^2 Cc(d) [m^2] and its logarithm at every size of ``ds`` [m].

    These sides of the equal-settling relation depend on the sizes and the air (``T`` [K],
    ``P`` [Pa]; ``two_lambda`` [m] twice the mean free path of the Kim et al. 2005 set) only,
    not on the density: an edit of the density or shape factor finds them kept.
    """
    key = (tuple(ds), T, P)
    kept = _grid_terms_kept.get(key)
    if kept is not None:
        _grid_terms_kept.move_to_end(key)
        return kept
    alpha, beta, gamma = SLIP_MODELS["kim2005"]
    exp, log = math.exp, math.log
    lns, d2ccs, ln_d2ccs = [], [], []
    for d in key[0]:
        kn = two_lambda / d
        d2cc = d * d * (1.0 + kn * (alpha + beta * exp(-gamma / kn)))
        lns.append(log(d))
        d2ccs.append(d2cc)
        ln_d2ccs.append(log(d2cc))
    kept = _grid_terms_kept[key] = (tuple(lns), tuple(d2ccs), tuple(ln_d2ccs))
    while len(_grid_terms_kept) > GRID_TERMS_KEPT:
        _grid_terms_kept.popitem(last=False)
    return kept


SLIP_EXPONENT_NEGLIGIBLE = 40.0
"""gamma / Kn above which the exponential of the slip correction, exp(-gamma / Kn) < 4.3e-18,
changes d^2 Cc by less than the rounding of a double: there d^2 Cc = d^2 + 2 lambda alpha d
exactly to double precision, and the equal-settling relation is a quadratic in d."""


def _equal_settling_grid(ds: Sequence[float], r: float, T: float, P: float) -> list[float]:
    """d_x [m] with d_x^2 Cc(d_x) = ``r`` d^2 Cc(d) at every ``ds`` [m], from neighbours.

    The right-hand sides d^2 Cc(d) come from :func:`_grid_terms` (kept per grid). Where
    the solution is so large that the exponential of the slip correction (Kim et al. 2005,
    eq. 9) is below double precision (gamma / Kn > :data:`SLIP_EXPONENT_NEGLIGIBLE`, above
    about 5.5 um at 1 atm), the relation d_x^2 + 2 lambda alpha d_x = q is solved in closed
    form, d_x = 2 q / (2 lambda alpha + sqrt((2 lambda alpha)^2 + 4 q)). Elsewhere Newton
    steps in u = ln d_x on ln(d_x^2 Cc(d_x)) - ln q (slope 2 + d ln Cc / d ln d, between 1
    and 2) kept inside the bracket of :func:`_ratio_bracket`, as in
    :func:`driftdose._numerics.newton_bracketed` (step tolerance 1e-7, ending with the
    first shorter step), each started from the solutions at the two sizes before it
    (ln d_x - ln d extrapolated linearly in ln d; after a closed-form size, from the continuum
    limit), written out in this loop: in the page's
    engine a function call per step costs more than the arithmetic. Within 1e-13 relative
    of :func:`_solve_equal_settling` (the iteration's own precision).
    """
    two_lambda = 2.0 * gas.mean_free_path(T, P, reference="kim2005")
    alpha, beta, gamma = SLIP_MODELS["kim2005"]
    lns, d2ccs, ln_d2ccs = _grid_terms(ds, two_lambda, T, P)
    log_r = math.log(r)
    half_log_r = 0.5 * log_r
    lo_shift = math.log(min(r, math.sqrt(r), 1.0) * 0.5)
    hi_shift = math.log(max(r, math.sqrt(r), 1.0) * 2.0)
    b_lin = two_lambda * alpha  # d^2 Cc = d^2 + b_lin d where the exponential is negligible
    d_big = SLIP_EXPONENT_NEGLIGIBLE * two_lambda / gamma
    q_big = d_big * (d_big + b_lin)  # the quadratic at d_big: larger q, larger solution
    tol = 1e-7  # newton_bracketed's default step tolerance
    exp, log, sqrt = math.exp, math.log, math.sqrt
    out = []
    last = before = None  # (ln d, ln d_x - ln d) of the two sizes solved last by Newton
    for ln_d, d2cc, ln_d2cc in zip(lns, d2ccs, ln_d2ccs, strict=True):
        q = r * d2cc
        if q > q_big:
            out.append(2.0 * q / (b_lin + sqrt(b_lin * b_lin + 4.0 * q)))
            last = before = None  # the next Newton solve starts from the continuum limit
            continue
        target = log_r + ln_d2cc
        offset = half_log_r  # the continuum limit
        if last is not None:
            offset = last[1]
            if before is not None and last[0] != before[0]:
                offset += (last[1] - before[1]) * (ln_d - last[0]) / (last[0] - before[0])
        a, b = ln_d + lo_shift, ln_d + hi_shift
        x0 = ln_d + offset
        x = x0 if a < x0 < b else 0.5 * (a + b)
        for _ in range(100):
            kn = two_lambda / exp(x)
            e = beta * exp(-gamma / kn)
            cc = 1.0 + kn * (alpha + e)
            fx = 2.0 * x + log(cc) - target
            if fx == 0.0:
                break
            if fx < 0.0:
                a = x
            else:
                b = x
            dfx = 2.0 + (-kn * (alpha + e) - gamma * e) / cc
            new = x - fx / dfx if dfx > 0.0 else a - 1.0
            if a < new < b:
                if abs(new - x) < tol:
                    x = new
                    break
            else:
                new = 0.5 * (a + b)
                if b - a <= tol * tol:
                    x = new
                    break
            x = new
        else:
            raise RuntimeError("newton_bracketed did not converge")
        before, last = last, (ln_d, x - ln_d)
        out.append(exp(x))
    return out


def volume_equivalent_diameter(
    d_ae: float,
    density: float,
    shape_factor: float = 1.0,
    T: float = T_DEFAULT,
    P: float = P_DEFAULT,
) -> float:
    """Volume-equivalent diameter of a particle of aerodynamic diameter ``d_ae``.

    Parameters
    ----------
    d_ae : float
        Aerodynamic diameter. [m]
    density : float
        Particle density. [kg/m^3]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        Volume-equivalent diameter. [m]

    Notes
    -----
    Inverse of :func:`aerodynamic_diameter`, the same relation (Hinds 1999, eq. 3.30)
    solved for d, by the same safeguarded Newton iteration.

    """
    if density == WATER_DENSITY and shape_factor == 1.0:
        return d_ae
    ratio = WATER_DENSITY * shape_factor / density
    return _solve_equal_settling(d_ae, ratio, T, P)


def mobility_diameter(
    d: float, shape_factor: float = 1.0, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Diameter of the sphere with the same mechanical mobility as a particle.

    Parameters
    ----------
    d : float
        Volume-equivalent diameter. [m]
    shape_factor : float
        Dynamic shape factor chi. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        d_m with Cc(d_m) / d_m = Cc(d) / (d chi) (Hinds 1999, eqs. 3.16 and 3.25: equal
        B = Cc / (3 pi mu d chi)); d chi in the continuum limit, d sqrt(chi) in the
        free-molecular one. Solved by Brent's method in ln d_m. [m]

    Examples
    --------
    Near the continuum limit d chi = 15 um; slip, smaller at 15 um than at 10 um, takes a
    little off:

    >>> round(mobility_diameter(10e-6, 1.5) * 1e6, 2)
    14.92

    """
    if shape_factor == 1.0:
        return d
    return equal_mobility_diameter(d, shape_factor, T, P)


def equal_mobility_diameter(
    d: float, ratio: float, T: float = T_DEFAULT, P: float = P_DEFAULT
) -> float:
    """Diameter whose d / Cc(d) is ``ratio`` times that of a sphere of diameter ``d``.

    Parameters
    ----------
    d : float
        Diameter of the given sphere. [m]
    ratio : float
        Wanted ratio of d_x / Cc(d_x) to d / Cc(d): the shape factor chi for the mobility
        diameter of a particle of volume-equivalent diameter ``d``, 1 / chi for the
        volume-equivalent diameter of a particle of mobility diameter ``d``. [-]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        d_x with Cc(d_x) / d_x = Cc(d) / (ratio d): spheres of equal mechanical mobility
        B = Cc / (3 pi mu d chi) (Hinds 1999, eqs. 3.16 and 3.25) when ``ratio`` carries the
        shape factor. d ratio in the continuum limit, d sqrt(ratio) in the free-molecular
        one; found by Brent's method in ln d_x inside :func:`_ratio_bracket`. [m]

    """
    target = slip_correction(d, T, P) / (d * ratio)

    def f(log_dx: float) -> float:
        dx = math.exp(log_dx)
        return math.log(slip_correction(dx, T, P) / dx / target)

    lo, hi = _ratio_bracket(d, ratio)
    return math.exp(brent_root(f, lo, hi, xtol=1e-13))


def _solve_equal_settling(d: float, r: float, T: float, P: float) -> float:
    """Diameter d_x [m] with d_x^2 Cc(d_x) = r d^2 Cc(d), ``d`` [m], ``r`` [-].

    Newton's method in u = ln d_x on g(u) = ln(d_x^2 Cc(d_x)) - ln(r d^2 Cc(d)), whose slope
    2 + d ln Cc / d ln d lies between 1 (free-molecular) and 2 (continuum), so g is
    increasing; the iterates stay inside :func:`_ratio_bracket`. Starts from the continuum
    solution d sqrt(r). The slip correction is that of :func:`slip_correction` (default set).
    """
    two_lambda = 2.0 * gas.mean_free_path(T, P, reference="kim2005")
    cc_d, _ = _slip_and_log_slope(d, two_lambda)
    lo, hi = _ratio_bracket(d, r)
    guess = math.log(d) + 0.5 * math.log(r)
    return _solve_d2cc(math.log(r * d * d * cc_d), lo, hi, guess, two_lambda)


def _solve_d2cc(log_target: float, lo: float, hi: float, guess: float, two_lambda: float) -> float:
    """Diameter d_x [m] with ln(d_x^2 Cc(d_x)) = ``log_target``, inside [lo, hi] in ln d.

    Newton's method in u = ln d_x (:func:`driftdose._numerics.newton_bracketed`) on
    g(u) = ln(d_x^2 Cc(d_x)) - ``log_target``, slope 2 + d ln Cc / d ln d, between 1 and 2;
    ``guess`` [-] is the first ln d_x, ``two_lambda`` [m] twice the mean free path of the
    Kim et al. (2005) slip set.
    """

    def g(u: float) -> tuple[float, float]:
        x = math.exp(u)
        cc, slope = _slip_and_log_slope(x, two_lambda)
        return math.log(x * x * cc) - log_target, 2.0 + slope

    return math.exp(newton_bracketed(g, lo, hi, guess))


def diameter_with_d2cc(d2cc: float, T: float = T_DEFAULT, P: float = P_DEFAULT) -> float:
    """Diameter whose d^2 Cc(d) equals ``d2cc``.

    Parameters
    ----------
    d2cc : float
        Wanted product d^2 Cc(d), e.g. 9 mu W Stk50 / (rho_p U) at an impactor's cut
        (Hinds 1999, ch. 5, with slip). [m^2]
    T : float
        Temperature. [K]
    P : float
        Pressure. [Pa]

    Returns
    -------
    float
        The diameter [m]: the relation of :func:`aerodynamic_diameter` (d^2 Cc fixed by the
        settling velocity, Hinds 1999, eq. 3.30 with slip), solved by the same Newton
        iteration. The slip correction is that of :func:`slip_correction` (default set).

    Notes
    -----
    Since Cc >= 1, sqrt(d2cc) (the continuum solution) bounds the root from above; since
    d^2 Cc <= d^2 + 2 lambda (alpha + beta) d, half of the smaller of sqrt(d2cc) and
    d2cc / (2 lambda (alpha + beta)) bounds it from below.

    Examples
    --------
    >>> d = diameter_with_d2cc(1e-12)  # 1 um^2: slip puts the diameter below 1 um
    >>> d < 1e-6, round(d * d * slip_correction(d) / 1e-12, 12)
    (True, 1.0)

    """
    two_lambda = 2.0 * gas.mean_free_path(T, P, reference="kim2005")
    alpha, beta, _ = SLIP_MODELS["kim2005"]
    d_continuum = math.sqrt(d2cc)
    d_low = 0.5 * min(d_continuum, d2cc / (two_lambda * (alpha + beta)))
    lo, hi = math.log(d_low), math.log(d_continuum)
    return _solve_d2cc(math.log(d2cc), lo, hi, 0.5 * (lo + hi), two_lambda)


def _ratio_bracket(d: float, r: float) -> tuple[float, float]:
    """Bracket (in ln d) the solution of d_x^2 Cc(d_x) = r d^2 Cc(d) or d_x / Cc(d_x) = r d / Cc(d).

    Between the limits of the two relations, continuum (Cc = 1) and free-molecular
    (Cc proportional to 1 / d): factors sqrt(r) and r of ``d``.
    """
    lo = min(r, math.sqrt(r), 1.0)
    hi = max(r, math.sqrt(r), 1.0)
    return math.log(d * lo * 0.5), math.log(d * hi * 2.0)
