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
from bisect import bisect_right
from collections.abc import Sequence
from dataclasses import dataclass, field

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


class _Node:
    """A schedule block compiled once: durations, child start times, per-rate memo."""

    __slots__ = ("child", "children", "count", "dur", "exposed", "kind", "memo", "starts")

    def __init__(self, b: Block) -> None:
        self.memo: dict[float, tuple[float, float]] = {}
        self.children: list[_Node] = []
        self.starts: list[float] = []
        self.child: _Node | None = None
        self.count = 1
        if isinstance(b, (On, Off)):
            if not (b.duration >= 0.0 and math.isfinite(b.duration)):
                raise ValueError("block durations must be finite and non-negative")
            self.kind = "on" if isinstance(b, On) else "off"
            self.dur = float(b.duration)
            self.exposed = self.dur if self.kind == "on" else 0.0
        elif isinstance(b, Seq):
            self.kind = "seq"
            self.children = [_compile(c) for c in b.blocks]
            t = 0.0
            for c in self.children:
                self.starts.append(t)
                t += c.dur
            self.dur = t
            self.exposed = math.fsum(c.exposed for c in self.children)
        elif isinstance(b, Repeat):
            if not (isinstance(b.count, int) and b.count >= 1):
                raise ValueError("a repeat count must be a whole number >= 1")
            self.kind = "rep"
            self.child = _compile(b.block)
            self.count = b.count
            self.dur = self.child.dur * b.count
            self.exposed = self.child.exposed * b.count
        else:
            raise TypeError(f"not a schedule block: {type(b).__name__}")

    def full(self, lam: float) -> tuple[float, float]:
        """(exp(lam T), response at the end of the block to unit input)."""
        hit = self.memo.get(lam)
        if hit is not None:
            return hit
        if self.kind == "on":
            out = (math.exp(lam * self.dur), _phi(lam, self.dur))
        elif self.kind == "off":
            out = (math.exp(lam * self.dur), 0.0)
        elif self.kind == "seq":
            a, g = 1.0, 0.0
            for c in self.children:
                ac, gc = c.full(lam)
                a, g = a * ac, g * ac + gc
            out = (a, g)
        else:
            assert self.child is not None
            _, g1 = self.child.full(lam)
            d1 = self.child.dur
            out = (math.exp(lam * self.dur), g1 * _geometric(lam, d1, self.count))
        self.memo[lam] = out
        return out

    def partial(self, lam: float, t: float) -> float:
        """Response at ``t`` (0 <= t <= duration) from the start of the block."""
        if t <= 0.0:
            return 0.0
        if t >= self.dur:
            return self.full(lam)[1] * (math.exp(lam * (t - self.dur)) if t > self.dur else 1.0)
        if self.kind == "on":
            return _phi(lam, t)
        if self.kind == "off":
            return 0.0
        if self.kind == "seq":
            i = bisect_right(self.starts, t) - 1
            g = 0.0
            for c in self.children[:i]:
                ac, gc = c.full(lam)
                g = g * ac + gc
            start = self.starts[i]
            return g * math.exp(lam * (t - start)) + self.children[i].partial(lam, t - start)
        assert self.child is not None
        d1 = self.child.dur
        k = min(int(t // d1), self.count - 1)
        rest = t - k * d1
        g1 = self.child.full(lam)[1]
        before = g1 * _geometric(lam, d1, k) if k > 0 else 0.0
        return before * math.exp(lam * rest) + self.child.partial(lam, rest)

    def exposure(self, t: float) -> float:
        """Time exposed from the start of the block to ``t``. [s]"""
        if t <= 0.0:
            return 0.0
        if t >= self.dur:
            return self.exposed
        if self.kind == "on":
            return t
        if self.kind == "off":
            return 0.0
        if self.kind == "seq":
            i = bisect_right(self.starts, t) - 1
            done = math.fsum(c.exposed for c in self.children[:i])
            return done + self.children[i].exposure(t - self.starts[i])
        assert self.child is not None
        k = min(int(t // self.child.dur), self.count - 1)
        return k * self.child.exposed + self.child.exposure(t - k * self.child.dur)


_COMPILED: dict[int, tuple[Block, _Node]] = {}


def _compile(b: Block) -> _Node:
    """The compiled form of a block, kept for the blocks used most recently."""
    hit = _COMPILED.get(id(b))
    if hit is not None and hit[0] is b:
        return hit[1]
    node = _Node(b)
    if len(_COMPILED) > 64:
        _COMPILED.clear()
    _COMPILED[id(b)] = (b, node)
    return node


def block_duration(b: Block) -> float:
    """Total duration of a block. [s]

    Parameters
    ----------
    b : On, Off, Seq or Repeat
        The exposure schedule.
    """
    return _compile(b).dur


def exposure_time(b: Block, t: float | None = None) -> float:
    """Time spent exposed in a block, over all of it or up to ``t`` from its start. [s]

    Parameters
    ----------
    b : On, Off, Seq or Repeat
        The exposure schedule.
    t : float, optional
        Time from the block's start [s]; the whole block when None.
    """
    node = _compile(b)
    return node.exposed if t is None else node.exposure(t)


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
    if den == -1.0:  # exp(lam period) underflows: only the first term counts
        return 1.0
    return math.expm1(x * count) / den


def response(b: Block, lam: float, t: float) -> float:
    """g(t) = integral_0^t exp(lam (t - t')) s(t') dt' for schedule ``b`` from time 0. [s]

    After the schedule ends (t beyond its duration) the exposure has stopped and the
    response decays as exp(lam (t - T)).

    Parameters
    ----------
    b : On, Off, Seq or Repeat
        The exposure schedule s(t) (1 while exposed, else 0).
    lam : float
        Eigenvalue of the compartment network, 0 or negative [1/s].
    t : float
        Time from the schedule's start [s].
    """
    return _compile(b).partial(lam, t)


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
        the magnitudes of its terms, or below 1e-300) is rounding noise of a true zero and
        returned as 0.
        """
        n = len(z)
        y = [g[k] * z[k] for k in range(n)]
        out = []
        for i in range(n):
            terms = [self.V[i][k] * y[k] for k in range(i + 1)]
            x = math.fsum(terms)
            if x < 0.0 and -x <= 1e-12 * math.fsum(abs(t) for t in terms) + 1e-300:
                x = 0.0
            out.append(x)
        return out

    def responses(self, schedule: Block, t: float) -> list[float]:
        """g_k(t) for every mode k (see the module docstring). [s]"""
        if not (t >= 0.0 and math.isfinite(t)):
            raise ValueError("times must be finite and non-negative")
        node = _compile(schedule)
        return [node.partial(lam, t) for lam in self.eigenvalues]

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
