"""Exact solution of first-order compartment kinetics on an acyclic network.

Interface: :class:`Network` (compartments and transfer rates; eigen decomposition done once)
and the work-pattern blocks :class:`On`, :class:`Off`, :class:`Seq`, :class:`Repeat`, whose
response to a constant input is evaluated in closed form at any time.

The amounts x [unit] in n compartments obey dx/dt = A x + s(t) u, with A the rate matrix
(A_ij = k_{j->i} for a transfer from j to i, A_ii = -(sum of the rates out of i)), u the
input rate during exposure [unit/s] and s(t) = 1 during exposure, 0 otherwise. When the
transfers never lead back to a compartment already passed (an acyclic network, as the
particle-transport model of the ICRP respiratory tract model is), the compartments can be
ordered so that A is lower triangular: its eigenvalues are its diagonal entries, and its
eigenvectors follow by forward substitution (Golub & Van Loan 2013, §7.6.4 for the
triangular eigenvector recursion). With A = V diag(lambda) W, W = V^-1, the modal amounts
y = W x decouple:

    dy_k/dt = lambda_k y_k + s(t) (W u)_k,

so y_k(t) = (W u)_k g_k(t), with g_k(t) = integral_0^t exp(lambda_k (t - t')) s(t') dt'
for a lung that starts clean. For a schedule built from on/off blocks repeated N times the
integral is a geometric sum, summed in closed form with expm1 (no time stepping):

    block of length T, repeated N times: g_N = g_1 (1 - a^N) / (1 - a), a = exp(lambda T),
    = g_1 expm1(N lambda T) / expm1(lambda T) (= N g_1 for lambda = 0).

The decomposition exists when two compartments on one path never have the same removal
rate (otherwise A is defective); :class:`Network` checks this and refuses such networks.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from functools import lru_cache

__all__ = ["Network", "Off", "On", "Repeat", "Seq", "block_duration"]


@dataclass(frozen=True)
class On:
    """Exposure at the constant input rate for ``duration`` [s]."""

    duration: float


@dataclass(frozen=True)
class Off:
    """No exposure for ``duration`` [s]."""

    duration: float


@dataclass(frozen=True)
class Seq:
    """Blocks one after another."""

    blocks: tuple


@dataclass(frozen=True)
class Repeat:
    """``block`` repeated ``count`` times (count >= 1)."""

    count: int
    block: object


Block = On | Off | Seq | Repeat


@lru_cache(maxsize=512)
def block_duration(b: Block) -> float:
    """Total duration of a block. [s]"""
    if isinstance(b, (On, Off)):
        return b.duration
    if isinstance(b, Seq):
        return math.fsum(block_duration(c) for c in b.blocks)
    if isinstance(b, Repeat):
        return b.count * block_duration(b.block)
    raise TypeError(f"not a schedule block: {type(b).__name__}")


def exposure_time(b: Block, t: float | None = None) -> float:
    """Time spent exposed in a block, over all of it or up to ``t`` [s] from its start. [s]"""
    total = block_duration(b)
    if t is None or t >= total:
        t = total
    if t <= 0.0:
        return 0.0
    if isinstance(b, On):
        return t
    if isinstance(b, Off):
        return 0.0
    if isinstance(b, Seq):
        out, start = 0.0, 0.0
        for c in b.blocks:
            d = block_duration(c)
            out += exposure_time(c, min(t - start, d))
            start += d
            if start >= t:
                break
        return out
    d1 = block_duration(b.block)
    k = min(int(t // d1), b.count)
    rest = t - k * d1
    return k * exposure_time(b.block) + (exposure_time(b.block, rest) if k < b.count else 0.0)


def _phi(lam: float, t: float) -> float:
    """integral_0^t exp(lam s) ds, exact also for lam -> 0. [s]"""
    x = lam * t
    if x == 0.0:
        return t
    return math.expm1(x) / lam


def _geometric(lam: float, period: float, count: int) -> float:
    """sum_{m=0}^{count-1} exp(lam period m), by expm1 (exact for lam = 0). [-]"""
    x = lam * period
    if x == 0.0:
        return float(count)
    den = math.expm1(x)
    if den == -1.0:  # exp(lam period) underflows: only the last term counts
        return 1.0
    return math.expm1(x * count) / den


@lru_cache(maxsize=4096)
def _full(b: Block, lam: float) -> tuple[float, float]:
    """(exp(lam T), response at the end of the block to unit input) of a whole block."""
    if isinstance(b, On):
        return math.exp(lam * b.duration), _phi(lam, b.duration)
    if isinstance(b, Off):
        return math.exp(lam * b.duration), 0.0
    if isinstance(b, Seq):
        a, g = 1.0, 0.0
        for c in b.blocks:
            ac, gc = _full(c, lam)
            a, g = a * ac, g * ac + gc
        return a, g
    if isinstance(b, Repeat):
        _, g1 = _full(b.block, lam)
        d1 = block_duration(b.block)
        return math.exp(lam * d1 * b.count), g1 * _geometric(lam, d1, b.count)
    raise TypeError(f"not a schedule block: {type(b).__name__}")


def _partial(b: Block, lam: float, t: float) -> float:
    """Response at time ``t`` (0 <= t <= block duration) from the start of the block."""
    if t <= 0.0:
        return 0.0
    if isinstance(b, On):
        return _phi(lam, min(t, b.duration))
    if isinstance(b, Off):
        return 0.0
    if isinstance(b, Seq):
        g, start = 0.0, 0.0
        for c in b.blocks:
            d = block_duration(c)
            if t <= start + d:
                return g * math.exp(lam * (t - start)) + _partial(c, lam, t - start)
            _, gc = _full(c, lam)
            g = g * math.exp(lam * d) + gc
            start += d
        return g * math.exp(lam * (t - start))
    if isinstance(b, Repeat):
        d1 = block_duration(b.block)
        k = min(int(t // d1), b.count - 1)
        rest = t - k * d1
        _, g1 = _full(b.block, lam)
        before = g1 * _geometric(lam, d1, k) if k > 0 else 0.0
        if rest > d1:  # past the end of the last repeat
            end = before * math.exp(lam * d1) + g1
            return end * math.exp(lam * (rest - d1))
        return before * math.exp(lam * rest) + _partial(b.block, lam, rest)
    raise TypeError(f"not a schedule block: {type(b).__name__}")


def response(b: Block, lam: float, t: float) -> float:
    """g(t) = integral_0^t exp(lam (t - t')) s(t') dt' for schedule ``b`` from time 0. [s]

    After the schedule ends (t beyond its duration) the exposure has stopped and the
    response decays as exp(lam (t - T)).
    """
    total = block_duration(b)
    if t <= total:
        return _partial(b, lam, t)
    _, g = _full(b, lam)
    return g * math.exp(lam * (t - total))


@dataclass
class Network:
    """Compartments linked by first-order transfers, solved exactly by eigen decomposition.

    Parameters
    ----------
    compartments : sequence of str
        Names, in any order.
    transfers : sequence of (str, str, float)
        (from, to, rate [1/s]); the network must be acyclic.

    Raises
    ------
    ValueError
        If the transfers form a cycle, name an unknown compartment, have a negative or
        non-finite rate, or if two compartments on one path share a removal rate (the
        rate matrix would then not be diagonalisable).

    """

    compartments: Sequence[str]
    transfers: Sequence[tuple[str, str, float]]
    order: tuple[str, ...] = field(init=False)
    eigenvalues: tuple[float, ...] = field(init=False)
    V: list[list[float]] = field(init=False)
    W: list[list[float]] = field(init=False)

    def __post_init__(self) -> None:
        """Order the compartments and decompose the rate matrix."""
        names = list(self.compartments)
        if len(set(names)) != len(names):
            raise ValueError("compartment names must be unique")
        out: dict[str, list[tuple[str, float]]] = {c: [] for c in names}
        for src, dst, k in self.transfers:
            if src not in out or dst not in out:
                raise ValueError(f"unknown compartment in transfer {src!r} -> {dst!r}")
            if not (k >= 0.0 and math.isfinite(k)):
                raise ValueError("transfer rates must be finite and non-negative")
            if src == dst:
                raise ValueError("a transfer must lead to another compartment")
            out[src].append((dst, k))
        # topological order (Kahn), keeping the given order among equals
        indeg = dict.fromkeys(names, 0)
        for src in names:
            for dst, _ in out[src]:
                indeg[dst] += 1
        ready = [c for c in names if indeg[c] == 0]
        order: list[str] = []
        while ready:
            c = ready.pop(0)
            order.append(c)
            for dst, _ in out[c]:
                indeg[dst] -= 1
                if indeg[dst] == 0:
                    ready.append(dst)
        if len(order) != len(names):
            raise ValueError("the transfers form a cycle; this solver needs an acyclic network")
        self.order = tuple(order)
        idx = {c: i for i, c in enumerate(order)}
        n = len(order)
        A = [[0.0] * n for _ in range(n)]
        for src in names:
            i = idx[src]
            for dst, k in out[src]:
                A[idx[dst]][i] += k
                A[i][i] -= k
        lam = [A[i][i] for i in range(n)]
        scale = max((abs(x) for x in lam), default=0.0) or 1.0
        # right eigenvectors: V[:, k] with V[k][k] = 1, zero above, forward substitution below
        V = [[0.0] * n for _ in range(n)]
        for k in range(n):
            V[k][k] = 1.0
            for i in range(k + 1, n):
                s = math.fsum(A[i][j] * V[j][k] for j in range(k, i))
                if s == 0.0:
                    continue
                gap = lam[k] - lam[i]
                if abs(gap) <= 1e-9 * scale:
                    raise ValueError(
                        f"compartments {order[k]!r} and {order[i]!r} lie on one path with "
                        "the same removal rate; the exact solver cannot decompose this network"
                    )
                V[i][k] = s / gap
        # inverse of the unit lower-triangular V
        W = [[0.0] * n for _ in range(n)]
        for k in range(n):
            W[k][k] = 1.0
            for i in range(k + 1, n):
                W[i][k] = -math.fsum(V[i][j] * W[j][k] for j in range(k, i))
        self.eigenvalues = tuple(lam)
        self.V = V
        self.W = W
        self._idx = idx

    def index(self, name: str) -> int:
        """Position of a compartment in :attr:`order`."""
        return self._idx[name]

    def modal_input(self, rates: dict[str, float]) -> list[float]:
        """W u for input rates by compartment name ([unit/s]; absent names get 0)."""
        n = len(self.order)
        u = [0.0] * n
        for name, r in rates.items():
            u[self._idx[name]] = r
        return [math.fsum(self.W[k][j] * u[j] for j in range(k + 1)) for k in range(n)]

    def amounts(self, z: list[float], g: list[float]) -> list[float]:
        """Amounts x = V (g * z) by compartment (in :attr:`order`) from modal responses.

        A negative amount no larger than the rounding bound of its sum (1e-12 of the sum of
        the magnitudes of its terms) is rounding noise of a true zero and returned as 0.
        """
        n = len(z)
        y = [g[k] * z[k] for k in range(n)]
        out = []
        for i in range(n):
            terms = [self.V[i][k] * y[k] for k in range(i + 1)]
            x = math.fsum(terms)
            if x < 0.0 and -x <= 1e-12 * math.fsum(abs(t) for t in terms):
                x = 0.0
            out.append(x)
        return out

    def responses(self, schedule: Block, t: float) -> list[float]:
        """g_k(t) for every mode k (see the module docstring). [s]"""
        if not (t >= 0.0 and math.isfinite(t)):
            raise ValueError("times must be finite and non-negative")
        return [response(schedule, lam, t) for lam in self.eigenvalues]

    def solve(
        self, rates: dict[str, float], schedule: Block, times: Sequence[float]
    ) -> list[dict[str, float]]:
        """Amounts in every compartment at ``times`` [s] for a clean start at time 0.

        Parameters
        ----------
        rates : dict
            Input rate into each compartment during exposure. [unit/s]
        schedule : On, Off, Seq or Repeat
            When the exposure is on; after it ends, the amounts evolve without input.
        times : sequence of float
            Times from the start of the schedule, >= 0. [s]

        Returns
        -------
        list of dict
            ``{compartment: amount}`` per time. [unit]

        """
        z = self.modal_input(rates)
        out = []
        for t in times:
            x = self.amounts(z, self.responses(schedule, t))
            out.append(dict(zip(self.order, x, strict=True)))
        return out
