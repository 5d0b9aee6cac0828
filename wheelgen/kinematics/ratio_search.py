"""Tooth counts for a wanted ratio: an exhaustive search over compound trains.

A train of ``k`` stages (1 <= k <= 4) has ``k`` driver wheels ``a_i`` and ``k`` driven
wheels ``b_i``; stage ``i``'s driven wheel shares an arbor with stage ``i + 1``'s
driver. Its ratio, *turns of the output per turn of the input*, is

    R = (a_1 * a_2 * ... * a_k) / (b_1 * b_2 * ... * b_k) = N / D.

Why the result is provably the best (not a heuristic)
------------------------------------------------------
1. *Separation.* Both wheels of stage ``i`` take their teeth from the same range, and
   every driver is chosen independently of every driven wheel. So the achievable
   numerators ``N`` and denominators ``D`` are the same set ``P_k`` (all products of
   one count from each stage's range) and every pair ``(N, D)`` in ``P_k x P_k`` is a
   train. The ratio error depends on ``(N, D)`` only; a limit on the total tooth
   count is met by some train with products ``(N, D)`` exactly when
   ``s(N) + s(D) <= limit``, where ``s(P)`` is the smallest sum of a factorisation
   of ``P`` in range. ``P_k`` and ``s`` are computed completely (meet in the middle:
   the table of ``ceil(k/2)`` stages times the table of ``floor(k/2)`` stages, as
   numpy outer products reduced to distinct values).
2. *An upper bound on the answer.* For each ``N`` the two ``D`` next to ``N / T``
   (``np.searchsorted``) are real trains; the ``top``-th smallest of their errors,
   ``tau``, bounds the error of the ``top``-th best train from above (more
   neighbours are taken while fewer than ``top`` of them meet the tooth-total limit).
3. *Everything under the bound.* ``|D T / N - 1| <= tau`` is an interval of ``D``
   for each ``N``; both ends are found by ``np.searchsorted`` and every pair inside
   is gathered. The interval is widened by a relative 1e-6 so float rounding
   cannot lose a pair; the gathered pairs are then ranked with exact ``Fraction``
   errors (float64 cannot tell ``N/D`` from ``N'/D'`` when ``D D'`` exceeds about
   1e16, which happens with four stages).
4. *Trains from pairs.* A pair's trains all have the pair's error; their tooth
   total is at least ``s(N) + s(D)``. Pairs are expanded into their factorisations
   (all orderings, stage-order duplicates removed) in order of
   ``(error, s(N) + s(D))`` until the next pair cannot beat the ``top``-th train.

So the list is exactly the ``top`` best trains in range under the ranking
``(|error|, wheels, total teeth, largest wheel, tooth counts)``.

Exact targets ``p/q`` (lowest terms): every exact train has ``N = p t``,
``D = q t``; the ``t`` are the intersection of ``{N / p : p | N}`` and
``{D / q : q | D}`` over ``P_k`` (numpy ``intersect1d``). If ``p`` or ``q`` has a
prime factor larger than every tooth count in range, there is none.

Cost: with ``n`` counts per range, the half table has about ``n**ceil(k/2) / c``
distinct products, building ``P_k`` costs ``|half|**2`` multiplications (chunked, so
memory stays at a few hundred MB) and the matching ``O(|P_k| log |P_k|)``. For
teeth 10..150: ``|P_2|`` = 6005, ``|P_3|`` about 0.3 million, ``|P_4|`` about 2.2
million. Doubling the range multiplies the 4-stage work by about 16 (``n**4``).
"""

from __future__ import annotations

import heapq
import itertools
import math
from dataclasses import dataclass, field, replace
from fractions import Fraction
from functools import lru_cache
from typing import Literal

import numpy as np

from .continued_fraction import prime_factors, simplest_between

__all__ = [
    "MAX_STAGES",
    "Limits",
    "Train",
    "search_trains",
    "exact_trains",
    "teeth_for_diameter",
    "stage_ranges",
    "Relaxation",
    "relaxations",
]

MAX_STAGES = 4

Sense = Literal["same", "opposite", "either"]

# products are packed with their smallest factor sum into one int64 sort key
_INT64_LIMIT = 2**62
# half-table x half-table products; 2e9 takes minutes and is where we stop
_MAX_COMBINATIONS = 2_000_000_000


@dataclass(frozen=True, slots=True)
class Limits:
    """What a train may use.

    ``teeth`` is the overall tooth-count range (inclusive); ``stage_teeth`` optional
    ranges for stage 1, 2, ... (both wheels of the stage), intersected with ``teeth``.
    ``stages`` is the largest number of stages tried (1 to ``stages``).
    ``max_teeth_total`` limits the sum of all tooth counts, idler included.
    ``sense`` is the output's sense relative to the input: ``"same"``,
    ``"opposite"`` or ``"either"``; an idler on its own arbor reverses a train whose
    sense is wrong (it takes the smallest count allowed in the last stage).
    """

    teeth: tuple[int, int] = (10, 120)
    stages: int = 3
    stage_teeth: tuple[tuple[int, int], ...] = ()
    max_teeth_total: int | None = None
    sense: Sense = "either"

    def __post_init__(self) -> None:
        lo, hi = self.teeth
        if lo < 1 or hi < lo:
            raise ValueError(f"'teeth' must be 1 <= min <= max, got {lo}-{hi}")
        if not 1 <= self.stages <= MAX_STAGES:
            raise ValueError(f"'stages' must be 1 to {MAX_STAGES}, got {self.stages}")
        if len(self.stage_teeth) > self.stages:
            raise ValueError(
                f"{len(self.stage_teeth)} per-stage ranges given for at most "
                f"{self.stages} stages"
            )
        for i, (slo, shi) in enumerate(self.stage_teeth, 1):
            if slo < 1 or shi < slo:
                raise ValueError(
                    f"stage {i} teeth must be 1 <= min <= max, got {slo}-{shi}"
                )
        if self.max_teeth_total is not None and self.max_teeth_total < 2:
            raise ValueError(
                f"'max_teeth_total' must be at least 2, got {self.max_teeth_total}"
            )
        if self.sense not in ("same", "opposite", "either"):
            raise ValueError(
                "'sense' must be one of 'same', 'opposite', 'either', "
                f"got {self.sense!r}"
            )


@dataclass(frozen=True, slots=True)
class Train:
    """A compound train: ``stages`` as ``(driver_teeth, driven_teeth)`` from the input.

    ``ratio`` is turns of the output per turn of the input (exact), ``error`` the
    exact relative error of the output's period, ``target / ratio - 1`` (as
    ``wheelgen check`` reports it: positive when the output is slow); ``idler`` the
    tooth count of an idler
    added to reverse the output, or ``None``.
    """

    stages: tuple[tuple[int, int], ...]
    ratio: Fraction
    error: Fraction
    idler: int | None = None
    _key: tuple[object, ...] = field(default=(), compare=False, repr=False)

    @property
    def error_ppm(self) -> float:
        return float(self.error) * 1e6

    @property
    def wheels(self) -> int:
        return 2 * len(self.stages) + (self.idler is not None)

    @property
    def teeth_total(self) -> int:
        return sum(a + b for a, b in self.stages) + (self.idler or 0)

    @property
    def largest(self) -> int:
        return max(max(a, b) for a, b in self.stages)

    @property
    def widest(self) -> int:
        """Largest ``driver + driven`` of a stage (twice its centre distance / m)."""
        return _widest(self.stages)

    @property
    def reverses(self) -> bool:
        """True when the output turns the other way from the input."""
        return (len(self.stages) + (self.idler is not None)) % 2 == 1

    def rank_key(self) -> tuple[object, ...]:
        """``(|error|, wheels, total teeth, largest wheel, widest stage, stages)``."""
        return (
            abs(self.error),
            self.wheels,
            self.teeth_total,
            self.largest,
            self.widest,
            tuple(sorted(self.stages)),
        )


def teeth_for_diameter(module: float, max_diameter: float) -> int:
    """Largest tooth count whose tip circle fits ``max_diameter`` at ``module`` (mm).

    Uses the tip diameter of a standard unshifted wheel, ``d_a = m (z + 2)`` (ISO 21771:
    d = m z, h_a = m for the ISO 53 basic rack), so ``z <= D / m - 2``.
    """
    if module <= 0:
        raise ValueError(f"'module' must be positive, got {module}")
    if max_diameter <= 0:
        raise ValueError(f"'max_diameter' must be positive, got {max_diameter}")
    # a tiny allowance so 52 mm at module 0.5 still allows 102 teeth despite rounding
    return math.floor(max_diameter / module - 2 + 1e-9)


def stage_ranges(limits: Limits, k: int) -> tuple[tuple[int, int], ...] | None:
    """Tooth range of each of ``k`` stages, or ``None`` if one of them is empty."""
    lo, hi = limits.teeth
    out = []
    for i in range(k):
        slo, shi = limits.stage_teeth[i] if i < len(limits.stage_teeth) else (lo, hi)
        slo, shi = max(slo, lo), min(shi, hi)
        if shi < slo:
            return None
        out.append((slo, shi))
    return tuple(out)


# ---------------------------------------------------------------- product tables


def _reduce(keys: np.ndarray, shift: int) -> np.ndarray:
    """Sort packed ``product << shift | sum`` keys; keep each product's smallest sum."""
    keys.sort()
    values = keys >> shift
    first = np.ones(len(keys), dtype=bool)
    first[1:] = values[1:] != values[:-1]
    return keys[first]


@lru_cache(maxsize=16)
def _products(ranges: tuple[tuple[int, int], ...]) -> tuple[np.ndarray, np.ndarray]:
    """Distinct products ``P`` of one count per range, sorted, and their smallest sums.

    Meet in the middle: the first half of the ranges times the second half, as chunked
    outer products, each chunk reduced to distinct products at once (so memory holds
    distinct values, not all combinations).
    """
    if len(ranges) == 1:
        lo, hi = ranges[0]
        values = np.arange(lo, hi + 1, dtype=np.int64)
        return _frozen(values), _frozen(values.copy())
    shift = int(sum(hi for _, hi in ranges)).bit_length()
    if math.prod(hi for _, hi in ranges) >= _INT64_LIMIT >> shift:
        raise ValueError(
            f"tooth ranges {ranges} are too large for the search "
            f"(products over 2**{62 - shift})"
        )
    half = (len(ranges) + 1) // 2
    va, sa = _products(ranges[:half])
    vb, sb = _products(ranges[half:])
    if len(va) * len(vb) > _MAX_COMBINATIONS:
        raise ValueError(
            f"tooth ranges {ranges} give {len(va) * len(vb):.3g} combinations to "
            f"search (at most {_MAX_COMBINATIONS:.0e}); narrow the tooth range or "
            "use fewer stages"
        )
    # chunk so that one outer product holds about 4 million combinations
    rows = max(1, 4_000_000 // len(vb))
    parts = []
    for start in range(0, len(va), rows):
        prod = va[start : start + rows, None] * vb[None, :]
        sums = sa[start : start + rows, None] + sb[None, :]
        parts.append(_reduce(((prod << shift) | sums).ravel(), shift))
    keys = _reduce(np.concatenate(parts), shift)
    return _frozen(keys >> shift), _frozen(keys & ((1 << shift) - 1))


def _frozen(a: np.ndarray) -> np.ndarray:
    a.flags.writeable = False
    return a


def _factorisations(
    n: int, ranges: tuple[tuple[int, int], ...], ascending: bool
) -> list[tuple[int, ...]]:
    """Every tuple ``x`` with ``x_i`` in ``ranges[i]`` and ``prod(x) == n``.

    ``ascending`` (all ranges equal): only non-decreasing tuples, one per multiset.
    """
    k = len(ranges)
    rest_lo = [math.prod(lo for lo, _ in ranges[i + 1 :]) for i in range(k)]
    rest_hi = [math.prod(hi for _, hi in ranges[i + 1 :]) for i in range(k)]
    out: list[tuple[int, ...]] = []

    def walk(m: int, i: int, low: int, head: tuple[int, ...]) -> None:
        lo, hi = ranges[i]
        if i == k - 1:
            if max(lo, low) <= m <= hi:
                out.append(head + (m,))
            return
        # x must leave a cofactor reachable by the remaining stages
        x_lo = max(lo, low, -(-m // rest_hi[i]))
        x_hi = min(hi, m // rest_lo[i])
        for x in range(x_lo, x_hi + 1):
            if m % x == 0:
                walk(m // x, i + 1, x if ascending else 0, head + (x,))

    walk(n, 0, 0, ())
    return out


# ---------------------------------------------------------------- the search


@dataclass(slots=True)
class _Stage:
    """Everything about one stage count that the pair search needs."""

    k: int
    ranges: tuple[tuple[int, int], ...]
    idler: int | None
    budget: int | None  # tooth total left for the 2k wheels, or None
    values: np.ndarray
    sums: np.ndarray


def _stage_setups(limits: Limits) -> list[_Stage]:
    out = []
    for k in range(1, limits.stages + 1):
        ranges = stage_ranges(limits, k)
        if ranges is None:
            continue
        reverses = k % 2 == 1
        need_idler = (limits.sense == "same" and reverses) or (
            limits.sense == "opposite" and not reverses
        )
        idler = ranges[-1][0] if need_idler else None
        budget = None
        if limits.max_teeth_total is not None:
            budget = limits.max_teeth_total - (idler or 0)
        values, sums = _products(ranges)
        if budget is not None:
            keep = sums + sums.min() <= budget
            values, sums = values[keep], sums[keep]
        if len(values):
            out.append(_Stage(k, ranges, idler, budget, values, sums))
    return out


def _tau(st: _Stage, target: float, top: int) -> float:
    """An upper bound on the ``top``-th smallest relative pair error (neighbours)."""
    v, s = st.values, st.sums
    fv = v.astype(np.float64)
    n = len(v)
    j = 1
    chunk = 1 << 19
    while True:
        best = np.empty(0)
        for start in range(0, n, chunk):
            num = fv[start : start + chunk]
            pos = np.searchsorted(fv, num / target)
            offsets = np.arange(-j, j)
            idx = pos[:, None] + offsets[None, :]
            ok = (idx >= 0) & (idx < n)
            idx = np.clip(idx, 0, n - 1)
            err = np.abs(fv[idx] * target / num[:, None] - 1.0)
            if st.budget is not None:
                ok &= s[start : start + chunk, None] + s[idx] <= st.budget
            err = err[ok]
            if len(err) > top:
                err = np.partition(err, top - 1)[:top]
            best = np.concatenate([best, err])
            if len(best) > top:
                best = np.partition(best, top - 1)[:top]
        if len(best) >= top:
            return float(np.max(best))
        if 2 * j >= n:
            # every pair has been looked at: fewer than `top` trains exist at all
            return math.inf
        j *= 4


def _pairs_within(
    st: _Stage, target: float, tau: float
) -> tuple[np.ndarray, np.ndarray]:
    """Indices ``(i, j)`` of every pair with relative error <= ``tau`` (widened)."""
    fv = st.values.astype(np.float64)
    n = len(fv)
    # widen: the float error of these bounds is ~1e-16 relative; 1e-6 is ample
    wide = tau * (1 + 1e-6) + 1e-12
    low = fv * (1 - wide) / target
    high = fv * (1 + wide) / target
    start = np.searchsorted(fv, low, side="left")
    stop = np.searchsorted(fv, high, side="right")
    counts = stop - start
    i = np.repeat(np.arange(n), counts)
    # j runs from start to stop-1 for each i: a ramp restarted at each i
    ramp = np.arange(len(i)) - np.repeat(np.cumsum(counts) - counts, counts)
    j = np.repeat(start, counts) + ramp
    if st.budget is not None:
        ok = st.sums[i] + st.sums[j] <= st.budget
        i, j = i[ok], j[ok]
    return i, j


def _trains_of_pairs(
    st: _Stage,
    pairs: list[tuple[Fraction, int, int, int]],
    target: Fraction,
    top: int | None,
    one_pairing: bool,
) -> list[Train]:
    """Expand ``(|error|, min total, N, D)`` pairs into trains, best ``top`` first.

    Pairs must be sorted. A pair's trains share its error and have at least its
    minimum tooth total, so expansion stops at the first pair whose
    ``(|error|, min total)`` is worse than the ``top``-th train found so far.
    """
    ascending = len(set(st.ranges)) == 1
    idler_teeth = st.idler or 0
    found: dict[object, Train] = {}
    kth: tuple[Fraction, int, int] | None = (
        None  # (|error|, total, largest) of the top-th
    )
    for abs_err, min_total, num, den in pairs:
        if kth is not None and (abs_err, min_total + idler_teeth) > kth[:2]:
            break
        ratio = Fraction(num, den)
        error = target / ratio - 1
        combos = sorted(
            (sum(a) + sum(b), max(a[-1] if ascending else max(a), max(b)), a, b)
            for a in _factorisations(num, st.ranges, ascending)
            for b in _factorisations(den, st.ranges, ascending)
        )
        added = 0
        last = (abs_err, 0, 0)
        for total, largest, a, b in combos:
            if st.budget is not None and total > st.budget:
                break
            here = (abs_err, total + idler_teeth, largest)
            if kth is not None and here > kth:
                break
            if top is not None and added >= top and here > last:
                break
            orders = sorted(set(itertools.permutations(b))) if ascending else [b]
            trains = [tuple(zip(a, bb, strict=True)) for bb in orders]
            if one_pairing:
                # one train per wheel set: the pairing with the smallest widest stage
                trains = [min(trains, key=lambda t: (_widest(t), sorted(t)))]
            for stages in trains:
                canon = tuple(sorted(stages))
                key = (tuple(sorted(a)), tuple(sorted(b))) if one_pairing else canon
                if key not in found:
                    shown = canon if ascending else stages
                    found[key] = Train(shown, ratio, error, st.idler)
                    added += 1
                    last = here
        if top is not None and len(found) >= top:
            worst = heapq.nsmallest(top, found.values(), key=Train.rank_key)[-1]
            kth = (abs(worst.error), worst.teeth_total, worst.largest)
    ranked = sorted(found.values(), key=Train.rank_key)
    return ranked if top is None else ranked[:top]


def _widest(stages: tuple[tuple[int, int], ...]) -> int:
    return max(a + b for a, b in stages)


def _check_target(target: Fraction) -> Fraction:
    target = Fraction(target)
    if target <= 0:
        raise ValueError(f"'target' must be a positive ratio, got {target}")
    return target


def search_trains(
    target: Fraction, limits: Limits, top: int = 10, one_pairing: bool = False
) -> list[Train]:
    """The ``top`` trains closest to ``target`` within ``limits``, best first.

    ``target`` is turns of the output per turn of the input (exact). Ranking:
    ``|error|``, then number of wheels, total teeth, largest wheel, widest stage,
    tooth counts. Trains that differ only in the order of their stages appear once.
    ``one_pairing`` keeps one train per set of drivers and set of driven wheels (the
    pairing whose widest stage is smallest) instead of every way of pairing them.
    Exhaustive: see the module docstring for the argument.
    """
    target = _check_target(target)
    if top < 1:
        raise ValueError(f"'top' must be at least 1, got {top}")
    t_float = float(target)
    results: list[Train] = []
    for st in _stage_setups(limits):
        tau = _tau(st, t_float, top)
        i, j = _pairs_within(st, t_float, tau)
        nums, dens = st.values[i].tolist(), st.values[j].tolist()
        totals = (st.sums[i] + st.sums[j]).tolist()
        pairs = sorted(
            (abs(target * Fraction(d, n) - 1), s, n, d)
            for n, d, s in zip(nums, dens, totals, strict=True)
        )
        results.extend(_trains_of_pairs(st, pairs, target, top, one_pairing))
    results.sort(key=Train.rank_key)
    return results[:top]


def exact_trains(
    target: Fraction,
    limits: Limits,
    limit: int | None = None,
    one_pairing: bool = False,
) -> list[Train]:
    """Every train whose ratio equals ``target`` exactly, best (fewest wheels) first.

    ``limit`` caps the list (the best ``limit`` by the usual ranking); ``None`` lists
    them all. Found by divisibility, not by floats: ``N = p t``, ``D = q t``.
    ``one_pairing`` as in :func:`search_trains`.
    """
    target = _check_target(target)
    if limit is not None and limit < 1:
        raise ValueError(f"'limit' must be at least 1, got {limit}")
    p, q = target.numerator, target.denominator
    results: list[Train] = []
    for st in _stage_setups(limits):
        v = st.values
        t_num = v[v % p == 0] // p
        t_den = v[v % q == 0] // q
        t = np.intersect1d(t_num, t_den)
        nums, dens = t * p, t * q
        totals = st.sums[np.searchsorted(v, nums)] + st.sums[np.searchsorted(v, dens)]
        ok = totals <= st.budget if st.budget is not None else np.ones(len(t), bool)
        pairs = sorted(
            (Fraction(0), int(s), int(n), int(d))
            for n, d, s in zip(nums[ok], dens[ok], totals[ok], strict=True)
        )
        results.extend(_trains_of_pairs(st, pairs, target, limit, one_pairing))
    results.sort(key=Train.rank_key)
    return results if limit is None else results[:limit]


@dataclass(frozen=True, slots=True)
class Relaxation:
    """One limit that, relaxed alone, lets a train meet the tolerance.

    ``limit`` is ``"stages"``, ``"teeth_max"``, ``"max_teeth_total"``, ``"sense"`` or
    ``"simplest"`` (no train: the simplest ratio within tolerance, for information;
    ``value`` is then that fraction and ``train`` is ``None``).
    """

    limit: str
    value: object
    train: Train | None
    note: str = ""


def relaxations(
    target: Fraction, limits: Limits, tolerance: Fraction
) -> list[Relaxation]:
    """Which single limit to relax so that a train comes within ``tolerance``.

    ``tolerance`` is relative (``Fraction(10, 10**6)`` for 10 ppm). Tried, each on its
    own: one more stage (up to 4), twice the largest tooth count or the largest
    prime factor of the simplest fraction within tolerance (for 3 stages or fewer),
    no tooth-total limit, either sense. The first entry is always the simplest
    fraction (smallest denominator) within the tolerance with its prime factors: a
    prime factor above the largest tooth count cannot be cut.
    """
    target = _check_target(target)
    if tolerance < 0:
        raise ValueError(f"'tolerance' must be at least 0, got {tolerance}")
    # period error T/R - 1 within +-tol  <=>  R in [T/(1+tol), T/(1-tol)]
    low = target / (1 + tolerance)
    high = target / (1 - tolerance) if tolerance < 1 else target * 10**9
    simplest = simplest_between(low, high)
    big = max(
        [*prime_factors(simplest.numerator), *prime_factors(simplest.denominator), 1]
    )
    note = ""
    if big > limits.teeth[1]:
        note = (
            f"its prime factor {big} is above the largest tooth count {limits.teeth[1]}"
        )
    out = [Relaxation("simplest", simplest, None, note)]

    def meets(lim: Limits) -> Train | None:
        try:
            found = search_trains(target, lim, top=1)
        except ValueError:  # a relaxed range too large to search: not a useful hint
            return None
        if found and abs(found[0].error) <= tolerance:
            return found[0]
        return None

    tries: list[tuple[str, object, Limits]] = []
    if limits.stages < MAX_STAGES:
        tries.append(
            ("stages", limits.stages + 1, replace(limits, stages=limits.stages + 1))
        )
    if limits.stages <= 3:
        # twice the range, or up to the prime the simplest fraction needs
        top_count = max(2 * limits.teeth[1], big if big <= 1000 else 0)
        wider = (limits.teeth[0], top_count)
        stage_teeth = tuple((lo, max(hi, wider[1])) for lo, hi in limits.stage_teeth)
        tries.append(
            ("teeth_max", None, replace(limits, teeth=wider, stage_teeth=stage_teeth))
        )
    if limits.max_teeth_total is not None:
        tries.append(("max_teeth_total", None, replace(limits, max_teeth_total=None)))
    if limits.sense != "either":
        tries.append(("sense", "either", replace(limits, sense="either")))
    for name, value, lim in tries:
        train = meets(lim)
        if train is None:
            continue
        if name == "teeth_max":
            value = train.largest
        elif name == "max_teeth_total":
            value = train.teeth_total
        out.append(Relaxation(name, value, train))
    return out
