"""Small pure-Python numerical tools (root finding, spacing, the normal distribution,
Gauss-Hermite quadrature).

The browser core cannot use scipy, so the few numerical tools it needs live here; the
tests compare them with scipy as an independent reference.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from functools import lru_cache


def brent_root(
    f: Callable[[float], float],
    a: float,
    b: float,
    xtol: float = 1e-15,
    rtol: float = 1e-12,
    maxiter: int = 200,
) -> float:
    """Find a root of ``f`` bracketed by ``[a, b]`` with Brent's method.

    Parameters
    ----------
    f : callable
        Continuous function with ``f(a)`` and ``f(b)`` of opposite sign.
    a, b : float
        Bracket ends [unit of the argument of ``f``].
    xtol : float
        Absolute tolerance on the root [unit of the argument of ``f``].
    rtol : float
        Relative tolerance on the root [-].
    maxiter : int
        Iteration limit [-].

    Returns
    -------
    float
        The root.

    Notes
    -----
    Brent, R. P. (1973), Algorithms for Minimization without Derivatives, ch. 4: inverse
    quadratic interpolation safeguarded by bisection. This follows the classic ``zeroin``
    structure.

    """
    fa, fb = f(a), f(b)
    if fa == 0.0:
        return a
    if fb == 0.0:
        return b
    if (fa > 0) == (fb > 0):
        raise ValueError("root is not bracketed")
    c, fc = a, fa
    d = e = b - a
    for _ in range(maxiter):
        if (fb > 0) == (fc > 0):
            c, fc = a, fa
            d = e = b - a
        if abs(fc) < abs(fb):
            a, b, c = b, c, b
            fa, fb, fc = fb, fc, fb
        tol = 2.0 * rtol * abs(b) + 0.5 * xtol
        m = 0.5 * (c - b)
        if abs(m) <= tol or fb == 0.0:
            return b
        if abs(e) >= tol and abs(fa) > abs(fb):
            s = fb / fa
            if a == c:
                p, q = 2.0 * m * s, 1.0 - s
            else:
                q, r = fa / fc, fb / fc
                p = s * (2.0 * m * q * (q - r) - (b - a) * (r - 1.0))
                q = (q - 1.0) * (r - 1.0) * (s - 1.0)
            if p > 0:
                q = -q
            else:
                p = -p
            if 2.0 * p < min(3.0 * m * q - abs(tol * q), abs(e * q)):
                e, d = d, p / q
            else:
                d = e = m
        else:
            d = e = m
        a, fa = b, fb
        b += d if abs(d) > tol else math.copysign(tol, m)
        fb = f(b)
    raise RuntimeError("brent_root did not converge")


def newton_bracketed(
    f_df: Callable[[float], tuple[float, float]],
    a: float,
    b: float,
    x0: float,
    step_tol: float = 1e-7,
    maxiter: int = 100,
) -> float:
    """Root of an increasing function known to lie in ``[a, b]``, by safeguarded Newton steps.

    Parameters
    ----------
    f_df : callable
        ``x -> (f(x), f'(x))`` for a smooth, strictly increasing ``f``.
    a, b : float
        Bracket, ``a < b``, known to hold the root (``f(a) <= 0 <= f(b)``); the ends are not
        evaluated [unit of the argument of ``f_df``].
    x0 : float
        First guess (moved to the middle of the bracket if outside it) [unit of the argument].
    step_tol : float
        Step length [unit of the argument of ``f_df``]: the iteration ends with the first
        Newton step shorter than this; the point it reaches is returned. Near a simple root
        the error after a step of length h is of order h^2 f''/(2 f'), so the default 1e-7
        leaves an error of order 1e-14 for functions with f''/f' of order one.
    maxiter : int
        Iteration limit [-].

    Returns
    -------
    float
        The root.

    Notes
    -----
    Newton's method kept inside a shrinking bracket, as in ``rtsafe`` (Press, Teukolsky,
    Vetterling & Flannery 2007, Numerical Recipes, 3rd ed., section 9.4): every evaluation
    moves one end of the bracket to the iterate (the sign of ``f`` says which), and a Newton
    step that would leave the bracket, or a non-positive slope, is replaced by bisection. So
    the iteration cannot diverge, and it converges quadratically near a simple root. The
    iteration also ends when the bracket itself is shorter than ``step_tol`` squared.

    """
    if not a < b:
        raise ValueError("bracket must satisfy a < b")
    x = x0 if a < x0 < b else 0.5 * (a + b)
    for _ in range(maxiter):
        fx, dfx = f_df(x)
        if fx == 0.0:
            return x
        if fx < 0.0:
            a = x
        else:
            b = x
        new = x - fx / dfx if dfx > 0.0 else a - 1.0
        if a < new < b:
            if abs(new - x) < step_tol:
                return new
        else:
            new = 0.5 * (a + b)
            if b - a <= step_tol * step_tol:
                return new
        x = new
    raise RuntimeError("newton_bracketed did not converge")


def logspace(start: float, stop: float, num: int) -> list[float]:
    """Return ``num`` values spaced evenly on a log scale from ``start`` to ``stop``.

    Both ends are included exactly (like ``numpy.geomspace``); ``num`` 0 gives an empty
    list and 1 gives ``[start]``, as numpy does.

    Parameters
    ----------
    start, stop : float
        First and last value, both above 0 [unit of the values].
    num : int
        Number of values [-].
    """
    if num < 0:
        raise ValueError(f"number of points must be non-negative, got {num}")
    if num < 2:
        return [start][:num]
    a, b = math.log(start), math.log(stop)
    step = (b - a) / (num - 1)
    values = [math.exp(a + i * step) for i in range(num)]
    values[0], values[-1] = start, stop
    return values


def normal_cdf(x: float) -> float:
    """Return the standard normal cumulative distribution function, 0.5 erfc(-x/sqrt 2). [-]

    Parameters
    ----------
    x : float
        Standard normal deviate [-].
    """
    return 0.5 * math.erfc(-x / math.sqrt(2.0))


@lru_cache(maxsize=16)
def gauss_hermite(n: int) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """Nodes and weights of ``n``-point Gauss–Hermite quadrature (weight exp(-x^2)).

    Parameters
    ----------
    n : int
        Number of nodes (2 to 200).

    Returns
    -------
    tuple
        (nodes, weights), ascending nodes; sum(w f(x)) approximates the integral of
        exp(-x^2) f(x) over the real line.

    Notes
    -----
    Newton iteration on the orthonormal Hermite recurrence with the classic initial guesses
    (Press et al. 2007, Numerical Recipes, 3rd ed., section 4.6, routine ``gauher``).
    The tests compare with ``numpy.polynomial.hermite.hermgauss``.

    """
    if not 2 <= n <= 200:
        raise ValueError("n must be between 2 and 200")
    pim4 = math.pi**-0.25
    m = (n + 1) // 2
    x = [0.0] * n
    w = [0.0] * n
    z = 0.0
    for i in range(m):
        if i == 0:
            z = math.sqrt(2.0 * n + 1.0) - 1.85575 * (2.0 * n + 1.0) ** (-0.16667)
        elif i == 1:
            z -= 1.14 * n**0.426 / z
        elif i == 2:
            z = 1.86 * z - 0.86 * x[0]
        elif i == 3:
            z = 1.91 * z - 0.91 * x[1]
        else:
            z = 2.0 * z - x[i - 2]
        pp = 0.0
        for _ in range(100):
            p1, p2 = pim4, 0.0
            for j in range(n):
                p3 = p2
                p2 = p1
                p1 = z * math.sqrt(2.0 / (j + 1)) * p2 - math.sqrt(j / (j + 1)) * p3
            pp = math.sqrt(2.0 * n) * p2
            z1 = z
            z = z1 - p1 / pp
            if abs(z - z1) <= 1e-15 * max(1.0, abs(z)):
                break
        x[i] = z
        x[n - 1 - i] = -z
        w[i] = w[n - 1 - i] = 2.0 / (pp * pp)
    pairs = sorted(zip(x, w, strict=True))
    return tuple(p[0] for p in pairs), tuple(p[1] for p in pairs)


@lru_cache(maxsize=8)
def gauss_legendre(n: int) -> tuple[tuple[float, ...], tuple[float, ...]]:
    """Nodes and weights of ``n``-point Gauss–Legendre quadrature on [-1, 1].

    Parameters
    ----------
    n : int
        Number of nodes (1 to 100).

    Returns
    -------
    tuple
        (nodes, weights), ascending nodes; sum(w f(x)) approximates the integral of f over
        [-1, 1], exactly for polynomials of degree up to 2n - 1.

    Notes
    -----
    Newton iteration on the Legendre recurrence from the classic initial guesses
    cos(pi (i + 3/4) / (n + 1/2)) (Press et al. 2007, Numerical Recipes, 3rd ed., section
    4.6, routine ``gauleg``). The tests compare with ``numpy.polynomial.legendre.leggauss``.

    """
    if not 1 <= n <= 100:
        raise ValueError("n must be between 1 and 100")
    x = [0.0] * n
    w = [0.0] * n
    for i in range((n + 1) // 2):
        z = math.cos(math.pi * (i + 0.75) / (n + 0.5))
        pp = 1.0
        for _ in range(100):
            p1, p2 = 1.0, 0.0
            for j in range(n):
                p3 = p2
                p2 = p1
                p1 = ((2.0 * j + 1.0) * z * p2 - j * p3) / (j + 1.0)
            pp = n * (z * p1 - p2) / (z * z - 1.0)
            z1 = z
            z = z1 - p1 / pp
            if abs(z - z1) <= 1e-15:
                break
        x[i], x[n - 1 - i] = -z, z
        w[i] = w[n - 1 - i] = 2.0 / ((1.0 - z * z) * pp * pp)
    return tuple(x), tuple(w)
