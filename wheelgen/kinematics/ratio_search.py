"""Tooth counts for a wanted ratio: an exhaustive search over compound trains.

A train of ``k`` stages (1 <= k <= 4) has ``k`` driver wheels ``a_i`` and ``k`` driven
wheels ``b_i``; stage ``i``'s driven wheel shares an arbor with stage ``i + 1``'s
driver. Its ratio, *turns of the output per turn of the input*, is

    R = (a_1 * a_2 * ... * a_k) / (b_1 * b_2 * ... * b_k) = N / D.

Tooth counts
------------
Each stage takes its counts from a *set*: a range (10-120), a list (12, 15, 84), a
range and a list together, or what is left of them after a filter (for example the
counts a dividing head indexes simply), intersected with the set for every stage. The
argument below never uses that a set is an interval, only that both wheels of a stage
take their counts from the same set.

Why the result is provably the best (not a heuristic)
------------------------------------------------------
1. *Separation.* Both wheels of stage ``i`` take their teeth from the same set, and
   every driver is chosen independently of every driven wheel. So the achievable
   numerators ``N`` and denominators ``D`` are the same set ``P_k`` (all products of
   one count from each stage's set) and every pair ``(N, D)`` in ``P_k x P_k`` is a
   train. The ratio error depends on ``(N, D)`` only; a limit on the total tooth
   count is met by some train with products ``(N, D)`` exactly when
   ``s(N) + s(D) <= limit``, where ``s(P)`` is the smallest sum of a factorisation
   of ``P`` in the sets. ``P_k`` and ``s`` are computed completely (meet in the
   middle: the table of ``ceil(k/2)`` stages times the table of ``floor(k/2)``
   stages, as numpy outer products reduced to distinct values).
2. *An upper bound on the answer.* For each ``N`` the ``2 j`` values of ``D`` next to
   ``N / T`` (``np.searchsorted``) are real trains; the ``top``-th smallest of their
   errors, ``tau``, bounds the error of the ``top``-th best train from above (``j`` is
   raised while fewer than ``top`` of them meet the tooth-total limit). Distinct pairs
   are distinct trains (their wheel sets differ), so ``top`` pairs give ``top`` trains.
3. *Everything under the bound, in two passes.* ``|D T / N - 1| <= tau`` is an
   interval of ``D`` for each ``N``; both ends are found by ``np.searchsorted``. Pass
   one streams every pair inside these intervals (in chunks of rows, so memory stays
   bounded) and keeps the ``top`` smallest float errors among those within the
   tooth-total limit; the largest of them, ``kth``, is the ``top``-th smallest pair
   error of all. Pass two gathers every pair whose float error is at most ``kth``
   widened by a relative 1e-6 and an absolute 1e-12 (float64 computes ``D T / N - 1``
   to within about 1e-15, so no pair at or below the exact ``kth`` is lost). These
   pairs, about ``top`` of them plus ties, are ranked exactly: the exact ones
   (``N q = D p``, told by divisibility in integers) first, ordered by their totals in
   numpy (an exact target can have hundreds of thousands of them), the rest by exact
   ``Fraction`` errors (float64 cannot tell ``N/D`` from ``N'/D'`` when ``D D'``
   exceeds about 1e16, which happens with four stages). The work of both passes grows
   with ``top`` and the number of ties, not with its square.
4. *Trains from pairs.* A pair's trains all have the pair's error; their tooth
   total is at least ``s(N) + s(D)``. Pairs are expanded into their factorisations
   (all orderings, stage-order duplicates removed) in order of
   ``(error, s(N) + s(D))`` until the next pair cannot beat the ``top``-th train.

So the list is exactly the ``top`` best trains in the sets under the ranking
``(|error|, wheels, spread, total teeth, largest wheel, widest stage, tooth counts)``
(``spread`` is 0 except for coaxial trains, below).

Exact targets ``p/q`` (lowest terms): every exact train has ``N = p t``,
``D = q t``; the ``t`` are the intersection of ``{N / p : p | N}`` and
``{D / q : q | D}`` over ``P_k`` (both sorted: a binary search). If ``p`` or ``q`` has a
prime factor larger than every tooth count in the sets, there is none.

Coaxial (reverted) trains
-------------------------
Two stages whose output axis comes back to the input axis: the lay arbor stands at
the same distance from both, so the centre distances are equal,
``m_1 (a_1 + b_1) / 2 = m_2 (a_2 + b_2) / 2`` (``m_i`` the stage modules; one module:
equal tooth sums). Where the user allows profile shift, the stage with the shorter
centre distance may be opened to the longer one, as far as ``reach(S, m)`` (the
largest centre distance a stage of tooth sum ``S`` reaches with the allowed shift,
given by the caller from the involute geometry; it is at least ``m S / 2`` and grows
with ``S``). The tooth sums are finite, so the admissible sum pairs ``(S_1, S_2)``
are listed completely, and every coaxial train belongs to exactly one of them, as
``(a_1, S_1 - a_1), (a_2, S_2 - a_2)``. For one sum pair the stage ratios
``u = a_1 / (S_1 - a_1)`` and ``v = a_2 / (S_2 - a_2)`` increase with ``a_1`` and
``a_2``, so they are sorted by the driver's count and steps 2 and 3 apply with
``(u, v)`` in place of ``(N, D)``: the ``K``-th smallest error among the two
neighbours of ``T / u`` in every sum pair bounds the ``K``-th best train, and every
train under that bound is gathered by interval search and ranked exactly. ``K`` is
``4 top``: a train appears once per stage order, and with ``one_pairing`` up to four
trains share one wheel set (all with the same error, so a cut on the error keeps
all of them or none). Ties on the error go to the smaller ``spread``
(``|m_1 S_1 - m_2 S_2| / 2`` mm, what the shift must make up).

Cost and budget
---------------
With ``n`` counts per set, the half table has about ``n**ceil(k/2) / c`` distinct
products, building ``P_k`` costs ``|half|**2`` multiplications (half of that when
both halves are the same table, since products commute) and the matching
``O(|P_k| log |P_k|)``. For teeth 10..150: ``|P_2|`` = 6005, ``|P_3|`` about 0.14
million, ``|P_4|`` about 2.2 million. Doubling the range multiplies the 4-stage work
by about 16 (``n**4``). Before a table is built, its number of multiplications is
known exactly from the half tables; a search whose estimate exceeds
:data:`SEARCH_TIME_BUDGET_S` is refused with :class:`SearchTooLarge` (which says what
it would cost), and a table whose distinct products would not fit
:data:`SEARCH_MEMORY_BUDGET` stops while it is built, so memory stays bounded.
"""

from __future__ import annotations

import bisect
import heapq
import itertools
import math
from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass, field, replace
from fractions import Fraction
from functools import lru_cache
from typing import Literal

import numpy as np

from ..design.bounds import bound
from ..design.model import RelativeSense
from ..design.train_tables import MAX_TEETH
from .continued_fraction import prime_factors, simplest_between

__all__ = [
    "MAX_STAGES",
    "MAX_TOP",
    "MAX_PRODUCTS",
    "MIN_MODULE",
    "MAX_MODULE",
    "MAX_SHIFT_SUM",
    "MAX_TOLERANCE_PPM",
    "MAX_HEAD_RATIO",
    "MAX_TARGET_CHARS",
    "MAX_TARGET_EXPONENT",
    "SEARCH_MEMORY_BUDGET",
    "SEARCH_TIME_BUDGET_S",
    "Teeth",
    "Sense",
    "Coaxial",
    "Limits",
    "Train",
    "SearchCost",
    "SearchTooLarge",
    "search_cost",
    "duration_text",
    "search_trains",
    "exact_trains",
    "teeth_for_diameter",
    "stage_counts",
    "Relaxation",
    "relaxations",
]

# ---------------------------------------------------------------- limits and budget
# The limits of the search; the user-facing ones live with their reasons in the bounds
# table (design/bounds.py), the budget's own figures here.

#: Stages of a compound train (``option.ratio.stages`` of the bounds table).
MAX_STAGES = int(bound("option.ratio.stages").high)
#: Longest list of trains (``option.ratio.top``): the cost of a list grows with its
#: length (two passes over about ``top`` pairs, then sorting).
MAX_TOP = int(bound("option.ratio.top").high)
#: Memory the product tables and the pair search may take together: 2 GiB, so a
#: search fits beside the operating system on a small workshop computer.
SEARCH_MEMORY_BUDGET = 2 * 1024**3
#: A search estimated to take longer than this is refused before it starts (s): a
#: command-line search should answer while one waits; the message says which limit
#: to narrow.
SEARCH_TIME_BUDGET_S = 20.0
# Measured with benchmarks/bench_ratio.py on a 2-core machine (1 core busy): building
# P_4 for teeth 10..150 forms 1.8e7 products in about 2.9 s, the pair search then
# takes about a quarter of that again; 200 ns per product covers both with a margin
# for a machine that is shared.
_NS_PER_PRODUCT = 200.0
# Peak bytes per distinct product of the final table: the table and its sums (16), a
# float copy (8) and the pair search's per-row arrays (about 10 x 8); measured peak
# RSS over |P_4| for teeth 10..150 is about 110.
_BYTES_PER_PRODUCT = 128
#: Distinct products a table may hold within :data:`SEARCH_MEMORY_BUDGET`.
MAX_PRODUCTS = SEARCH_MEMORY_BUDGET // _BYTES_PER_PRODUCT
#: A target is typed by a person; ``Fraction("1e999999")`` would first build a huge
#: integer (and ``int()`` refuses more than 4300 digits with a message about Python
#: internals), so its length and exponent are bounded before any arithmetic
#: (``option.ratio.target_chars`` and ``target_exponent``). The value itself must lie
#: where a target of the train format may (``MIN_TURNS`` to ``MAX_TURNS`` of ``design/train_tables.py``).
MAX_TARGET_CHARS = int(bound("option.ratio.target_chars").high)
MAX_TARGET_EXPONENT = int(bound("option.ratio.target_exponent").high)
#: Module range of ``wheelgen ratio`` (mm): that of a train file.
MIN_MODULE, MAX_MODULE = float(bound("module").low), float(bound("module").high)
#: Largest profile-shift sum ``x1 + x2`` a coaxial stage may take
#: (``option.ratio.shift_sum``).
MAX_SHIFT_SUM = float(bound("option.ratio.shift_sum").high)
#: Largest tolerance (ppm), as for a target of the train format.
MAX_TOLERANCE_PPM = int(bound("tolerance_ppm").high)
#: Largest worm ratio of a dividing head, as for ``wheelgen index --ratio``.
MAX_HEAD_RATIO = int(bound("option.index.ratio").high)
# products are packed with their smallest factor sum into one int64 sort key
_INT64_LIMIT = 2**62
# one outer product of a chunk holds about this many products (64 MB as int64)
_CHUNK = 4_000_000
# pairs gathered at once by the pair search (about 100 MB of index arrays)
_PAIR_CHUNK = 2_000_000

#: The output's sense relative to the input that a search asks for: the train model's
#: relative sense, or either.
Sense = RelativeSense | Literal["either"]
#: Tooth counts of a stage: an inclusive range ``(min, max)`` or a set of counts.
Teeth = tuple[int, int] | frozenset[int]


class SearchTooLarge(ValueError):
    """The search would take longer or more memory than its budget allows.

    ``cost`` is the estimate that was refused (``None`` when the memory guard stopped
    a table while it was built).
    """

    def __init__(self, message: str, cost: SearchCost | None = None) -> None:
        super().__init__(message)
        self.cost = cost


def _count_set(spec: Teeth, what: str) -> tuple[int, ...]:
    """The sorted counts of a range or set; checks every count is 1 to MAX_TEETH."""
    if isinstance(spec, frozenset):
        values = sorted(spec)
        bad = [
            v for v in values if isinstance(v, bool) or not isinstance(v, int) or v < 1
        ]
        if bad or not values:
            raise ValueError(f"{what} must be whole numbers >= 1, got {sorted(spec)}")
        if values[-1] > MAX_TEETH:
            raise ValueError(
                f"{what}: {values[-1]} teeth is above the largest count {MAX_TEETH}"
            )
        return tuple(values)
    lo, hi = spec
    if lo < 1 or hi < lo:
        raise ValueError(f"{what} must be 1 <= min <= max, got {lo}-{hi}")
    if hi > MAX_TEETH:
        raise ValueError(f"{what}: {hi} teeth is above the largest count {MAX_TEETH}")
    return tuple(range(lo, hi + 1))


@dataclass(frozen=True, slots=True)
class Coaxial:
    """The output's axis comes back to the input's: a two-stage reverted train.

    ``modules`` are the two stages' modules in mm, exact. Without shift the centre
    distances are equal: ``m1 (a1 + b1) = m2 (a2 + b2)``. ``reach(tooth_sum, module)``,
    if given, is the largest centre distance in mm that a stage of that tooth sum and
    module may be opened to by the profile shift the user allows (at least
    ``module * tooth_sum / 2``, growing with the sum); the stage with the shorter centre
    distance is then opened to the other's.
    """

    modules: tuple[Fraction, Fraction] = (Fraction(1), Fraction(1))
    reach: Callable[[int, Fraction], float] | None = field(default=None, compare=False)

    def __post_init__(self) -> None:
        if len(self.modules) != 2 or any(Fraction(m) <= 0 for m in self.modules):
            raise ValueError(
                f"'modules' must be two positive modules, got {self.modules}"
            )


@dataclass(frozen=True, slots=True)
class Limits:
    """What a train may use.

    ``teeth`` is the overall tooth-count range ``(min, max)`` (inclusive) or a set of
    counts (``frozenset``); ``stage_teeth`` optional ranges or sets for stage 1, 2, ...
    (both wheels of the stage), intersected with ``teeth``.
    ``stages`` is the largest number of stages tried (1 to ``stages``).
    ``max_teeth_total`` limits the sum of all tooth counts, idler included.
    ``sense`` is the output's sense relative to the input: ``"same"``,
    ``"opposite"`` or ``"either"``; an idler on its own arbor reverses a train whose
    sense is wrong (it takes the smallest count allowed in the last stage).
    ``coaxial`` asks for two-stage trains whose output comes back to the input's
    axis (``stages`` must then be 2; such a train keeps the input's sense).
    """

    teeth: Teeth = (10, 120)
    stages: int = 3
    stage_teeth: tuple[Teeth, ...] = ()
    max_teeth_total: int | None = None
    sense: Sense = "either"
    coaxial: Coaxial | None = None

    def __post_init__(self) -> None:
        _count_set(self.teeth, "'teeth'")
        if not 1 <= self.stages <= MAX_STAGES:
            raise ValueError(f"'stages' must be 1 to {MAX_STAGES}, got {self.stages}")
        if len(self.stage_teeth) > self.stages:
            raise ValueError(
                f"{len(self.stage_teeth)} per-stage ranges given for at most "
                f"{self.stages} stages"
            )
        for i, spec in enumerate(self.stage_teeth, 1):
            _count_set(spec, f"stage {i} teeth")
        if self.max_teeth_total is not None and self.max_teeth_total < 2:
            raise ValueError(
                f"'max_teeth_total' must be at least 2, got {self.max_teeth_total}"
            )
        if self.sense not in ("same", "opposite", "either"):
            raise ValueError(
                "'sense' must be one of 'same', 'opposite', 'either', "
                f"got {self.sense!r}"
            )
        if self.coaxial is not None:
            if self.stages != 2:
                raise ValueError(
                    f"a coaxial train has two stages; 'stages' is {self.stages}"
                )
            if self.sense == "opposite":
                raise ValueError(
                    "a coaxial train of two external stages turns its output the same "
                    "way as its input, so the opposite sense cannot be met"
                )

    @property
    def teeth_low(self) -> int:
        """The smallest count of ``teeth``."""
        return _count_set(self.teeth, "'teeth'")[0]

    @property
    def teeth_high(self) -> int:
        """The largest count of ``teeth``."""
        return _count_set(self.teeth, "'teeth'")[-1]


@dataclass(frozen=True, slots=True)
class Train:
    """A compound train: ``stages`` as ``(driver_teeth, driven_teeth)`` from the input.

    ``ratio`` is turns of the output per turn of the input (exact), ``error`` the
    exact relative error of the output's period, ``target / ratio - 1`` (as
    ``wheelgen check`` reports it: positive when the output is slow); ``idler`` the
    tooth count of an idler added to reverse the output, or ``None``.
    For a coaxial train ``centre`` is the common centre distance of its two stages
    (mm, exact) and ``spread`` how far the shorter stage must be opened by profile
    shift to reach it (mm, 0 when the centre distances are equal).
    """

    stages: tuple[tuple[int, int], ...]
    ratio: Fraction
    error: Fraction
    idler: int | None = None
    spread: Fraction = Fraction(0)
    centre: Fraction | None = None
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

    @property
    def coaxial(self) -> bool:
        """True when the output comes back to the input's axis."""
        return self.centre is not None

    def rank_key(self) -> tuple[object, ...]:
        """``(|error|, wheels, spread, total teeth, largest, widest stage, stages)``."""
        return (
            abs(self.error),
            self.wheels,
            self.spread,
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
    if not module > 0 or not math.isfinite(module):
        raise ValueError(f"'module' must be positive and finite, got {module}")
    if not max_diameter > 0 or not math.isfinite(max_diameter):
        raise ValueError(
            f"'max_diameter' must be positive and finite, got {max_diameter}"
        )
    # a tiny allowance so 52 mm at module 0.5 still allows 102 teeth despite rounding
    return math.floor(min(max_diameter / module, 1e9) - 2 + 1e-9)


def stage_counts(limits: Limits, k: int) -> tuple[tuple[int, ...], ...] | None:
    """Sorted tooth counts of each of ``k`` stages, or ``None`` if one is empty."""
    overall = set(_count_set(limits.teeth, "'teeth'"))
    out = []
    for i in range(k):
        if i < len(limits.stage_teeth):
            own = _count_set(limits.stage_teeth[i], f"stage {i + 1} teeth")
            counts = tuple(z for z in own if z in overall)
        else:
            counts = tuple(sorted(overall))
        if not counts:
            return None
        out.append(counts)
    return tuple(out)


def _describe(sets: tuple[tuple[int, ...], ...]) -> str:
    """``teeth 10-300`` or ``teeth 12-84 (31 counts)`` for the refusal messages."""
    counts = sorted(set(itertools.chain.from_iterable(sets)))
    lo, hi = counts[0], counts[-1]
    whole = len(counts) == hi - lo + 1
    return f"teeth {lo}-{hi}" + ("" if whole else f" ({len(counts)} counts)")


# ---------------------------------------------------------------- product tables


def _reduce(keys: np.ndarray, shift: int) -> np.ndarray:
    """Sort packed ``product << shift | sum`` keys; keep each product's smallest sum."""
    keys.sort()
    values = keys >> shift
    first = np.ones(len(keys), dtype=bool)
    first[1:] = values[1:] != values[:-1]
    return keys[first]


def _halves(
    sets: tuple[tuple[int, ...], ...],
) -> tuple[tuple[tuple[int, ...], ...], tuple[tuple[int, ...], ...]]:
    half = (len(sets) + 1) // 2
    return sets[:half], sets[half:]


def _combinations(sets: tuple[tuple[int, ...], ...]) -> int:
    """Products formed to build the table of ``sets`` from its two halves (exact)."""
    if len(sets) == 1:
        return len(sets[0])
    first, second = _halves(sets)
    na, nb = len(_products(first)[0]), len(_products(second)[0])
    if first == second:
        return na * (na + 1) // 2
    return na * nb


@lru_cache(maxsize=16)
def _products(sets: tuple[tuple[int, ...], ...]) -> tuple[np.ndarray, np.ndarray]:
    """Distinct products ``P`` of one count per set, sorted, and their smallest sums.

    Meet in the middle: the first half of the sets times the second half, as chunked
    outer products, each chunk reduced to distinct products at once and merged into
    the table as it grows (so memory holds distinct values, not all combinations).
    When both halves are the same table only one triangle of the outer product is
    formed. Raises :class:`SearchTooLarge` when the table would exceed
    :data:`MAX_PRODUCTS`.
    """
    if len(sets) == 1:
        values = np.array(sets[0], dtype=np.int64)
        return _frozen(values), _frozen(values.copy())
    shift = int(sum(s[-1] for s in sets)).bit_length()
    if math.prod(s[-1] for s in sets) >= _INT64_LIMIT >> shift:
        raise SearchTooLarge(
            f"{_describe(sets)} with {len(sets)} stages gives products over "
            f"2**{62 - shift}, too large to search"
        )
    first, second = _halves(sets)
    va, sa = _products(first)
    vb, sb = _products(second)
    same = first == second
    acc = np.empty(0, dtype=np.int64)
    pending: list[np.ndarray] = []
    held = 0
    rows = max(1, _CHUNK // len(vb))
    for start in range(0, len(va), rows):
        # with equal halves, a * b = b * a: columns before the block's first row were
        # formed already (as rows), so each block starts at its own first column
        col = start if same else 0
        prod = va[start : start + rows, None] * vb[None, col:]
        sums = sa[start : start + rows, None] + sb[None, col:]
        part = _reduce(((prod << shift) | sums).ravel(), shift)
        pending.append(part)
        held += len(part)
        if held >= max(len(acc), _CHUNK):
            acc = _reduce(np.concatenate([acc, *pending]), shift)
            pending, held = [], 0
            _guard_products(acc, sets)
    keys = _reduce(np.concatenate([acc, *pending]), shift)
    _guard_products(keys, sets)
    return _frozen(keys >> shift), _frozen(keys & ((1 << shift) - 1))


def _guard_products(keys: np.ndarray, sets: tuple[tuple[int, ...], ...]) -> None:
    if len(keys) > MAX_PRODUCTS:
        gib = SEARCH_MEMORY_BUDGET / 1024**3
        raise SearchTooLarge(
            f"{len(sets)} stages with {_describe(sets)} give more than "
            f"{MAX_PRODUCTS:,} distinct tooth products, which needs more than "
            f"{gib:g} GiB"
        )


def _frozen(a: np.ndarray) -> np.ndarray:
    a.flags.writeable = False
    return a


def _factorisations(
    n: int, sets: tuple[tuple[int, ...], ...], ascending: bool
) -> list[tuple[int, ...]]:
    """Every tuple ``x`` with ``x_i`` in ``sets[i]`` and ``prod(x) == n``.

    ``ascending`` (all sets equal): only non-decreasing tuples, one per multiset.
    """
    k = len(sets)
    rest_lo = [math.prod(s[0] for s in sets[i + 1 :]) for i in range(k)]
    rest_hi = [math.prod(s[-1] for s in sets[i + 1 :]) for i in range(k)]
    out: list[tuple[int, ...]] = []

    def walk(m: int, i: int, low: int, head: tuple[int, ...]) -> None:
        counts = sets[i]
        if i == k - 1:
            j = bisect.bisect_left(counts, m)
            if m >= low and j < len(counts) and counts[j] == m:
                out.append(head + (m,))
            return
        # x must leave a cofactor reachable by the remaining stages
        x_lo = max(low, -(-m // rest_hi[i]))
        x_hi = m // rest_lo[i]
        for x in counts[
            bisect.bisect_left(counts, x_lo) : bisect.bisect_right(counts, x_hi)
        ]:
            if m % x == 0:
                walk(m // x, i + 1, x if ascending else 0, head + (x,))

    walk(n, 0, 0, ())
    return out


# ---------------------------------------------------------------- cost


@dataclass(frozen=True, slots=True)
class SearchCost:
    """What a search will cost before it runs.

    ``products`` is the work (products formed, or the like), ``seconds`` the time it
    takes at a measured rate, ``memory`` an upper bound on the bytes the largest table
    may take (its distinct products are at most the products formed and at most the
    integers between its smallest and largest product). ``stages`` is the stage count
    that costs the most, ``describe`` its tooth sets in words (for messages).
    """

    products: int
    seconds: float
    memory: int
    stages: int
    describe: str


# A coaxial search in units of one product (200 ns): numpy work of about 50 ns per
# driver of a sum pair, and some 100 microseconds of Python per sum pair (measured
# with benchmarks/bench_ratio.py, teeth 3..2000).
_DRIVERS_PER_PRODUCT = 4
_SUM_PAIR_OVERHEAD = 500


def search_cost(limits: Limits) -> SearchCost:
    """Estimate the work of a search within ``limits`` without doing it.

    The number of products is exact (the half tables are built, which is cheap: at
    most ``n**2`` for two stages; for a coaxial search the sum pairs are listed); the
    time follows from a measured rate per product.
    """
    total, worst, worst_k, words, memory = 0, -1, 1, "", 0
    ks = (2,) if limits.coaxial is not None else range(1, limits.stages + 1)
    for k in ks:
        sets = stage_counts(limits, k)
        if sets is None:
            continue
        if limits.coaxial is not None:
            # two passes over the drivers of every admissible sum pair
            pairs = _sum_pairs(limits, limits.coaxial)
            drivers = sum(len(p.a1) + len(p.a2) for p in pairs)
            work = drivers // _DRIVERS_PER_PRODUCT + _SUM_PAIR_OVERHEAD * len(pairs)
            distinct = 0
        else:
            work = _combinations(sets) + (len(sets[0]) if k == 1 else 0)
            span = math.prod(s[-1] for s in sets) - math.prod(s[0] for s in sets) + 1
            distinct = min(work, span)
        total += work
        memory = max(memory, distinct * _BYTES_PER_PRODUCT)
        if work > worst:
            worst, worst_k, words = work, k, _describe(sets)
    seconds = total * _NS_PER_PRODUCT * 1e-9
    return SearchCost(total, seconds, memory, worst_k, words)


def _check_cost(limits: Limits, budget_s: float) -> None:
    cost = search_cost(limits)
    if cost.seconds > budget_s:
        memory = f" and up to {_gib(cost.memory)}" if cost.memory else ""
        raise SearchTooLarge(
            f"{cost.stages} stages with {cost.describe} means forming about "
            f"{cost.products:.2g} tooth products: {duration_text(cost.seconds)}"
            f"{memory}, beyond the search's budget of {budget_s:g} s and "
            f"{_gib(SEARCH_MEMORY_BUDGET)}",
            cost,
        )


def _gib(size: float) -> str:
    gib = size / 1024**3
    return f"{gib:.0f} GiB" if gib >= 10 else f"{gib:.1g} GiB"


def duration_text(seconds: float) -> str:
    """``"about 40 s"``, ``"about 6 minutes"``, ``"under a second"``: for messages."""
    if seconds < 1:
        return "under a second"
    if seconds < 90:
        return f"about {seconds:.0f} s"
    if seconds < 5400:
        return f"about {seconds / 60:.0f} minutes"
    return f"about {seconds / 3600:.1f} hours"


# ---------------------------------------------------------------- the search


@dataclass(slots=True)
class _Stage:
    """Everything about one stage count that the pair search needs."""

    k: int
    sets: tuple[tuple[int, ...], ...]
    idler: int | None
    budget: int | None  # tooth total left for the 2k wheels, or None
    values: np.ndarray
    sums: np.ndarray


def _stage_setups(limits: Limits, budget_s: float) -> list[_Stage]:
    _check_cost(limits, budget_s)
    out = []
    for k in range(1, limits.stages + 1):
        sets = stage_counts(limits, k)
        if sets is None:
            continue
        reverses = k % 2 == 1
        need_idler = (limits.sense == "same" and reverses) or (
            limits.sense == "opposite" and not reverses
        )
        idler = sets[-1][0] if need_idler else None
        budget = None
        if limits.max_teeth_total is not None:
            budget = limits.max_teeth_total - (idler or 0)
        values, sums = _products(sets)
        if budget is not None:
            keep = sums + sums.min() <= budget
            values, sums = values[keep], sums[keep]
        if len(values):
            out.append(_Stage(k, sets, idler, budget, values, sums))
    return out


def _tau(st: _Stage, target: float, top: int) -> float:
    """An upper bound on the ``top``-th smallest relative pair error (neighbours)."""
    v, s = st.values, st.sums
    fv = v.astype(np.float64)
    n = len(v)
    # only rows whose N / T lies inside the table have close neighbours; take enough
    # neighbours per such row that about 4 top of them are looked at
    inside = int(np.count_nonzero((fv / target >= fv[0]) & (fv / target <= fv[-1])))
    wanted = -(-4 * top // max(2 * inside, 1))
    j = max(1, min(wanted, max(1, _PAIR_CHUNK // n)))
    chunk = max(1, _PAIR_CHUNK // (2 * j))
    while True:
        best = np.empty(0)
        offsets = np.arange(-j, j)
        for start in range(0, n, chunk):
            num = fv[start : start + chunk]
            pos = np.searchsorted(fv, num / target)
            idx = pos[:, None] + offsets[None, :]
            ok = (idx >= 0) & (idx < n)
            idx = np.clip(idx, 0, n - 1)
            err = np.abs(fv[idx] * target / num[:, None] - 1.0)
            if st.budget is not None:
                ok &= s[start : start + chunk, None] + s[idx] <= st.budget
            err = err[ok]
            best = _smallest(np.concatenate([best, err]), top)
        if len(best) >= top:
            return float(np.max(best))
        if 2 * j >= n:
            # every pair has been looked at: fewer than `top` trains exist at all
            return math.inf
        j *= 4


def _smallest(values: np.ndarray, count: int) -> np.ndarray:
    """The ``count`` smallest of ``values`` (unordered)."""
    if len(values) > count:
        return np.partition(values, count - 1)[:count]
    return values


def _row_chunks(counts: np.ndarray, limit: int) -> Iterator[tuple[int, int]]:
    """Row ranges ``[a, b)`` whose ``counts`` sum to at most ``limit`` (or one row)."""
    ends = np.cumsum(counts)
    a, n = 0, len(counts)
    while a < n:
        base = ends[a - 1] if a else 0
        b = int(np.searchsorted(ends, base + limit, side="right"))
        b = min(max(b, a + 1), n)
        yield a, b
        a = b


def _ramp(start: np.ndarray, stop: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Row and column of every pair with ``start[i] <= j < stop[i]``."""
    counts = stop - start
    i = np.repeat(np.arange(len(start)), counts)
    # j runs from start to stop-1 for each i: a ramp restarted at each i
    ramp = np.arange(len(i)) - np.repeat(np.cumsum(counts) - counts, counts)
    return i, np.repeat(start, counts) + ramp


def _widen(tau: float) -> float:
    # the float error of D T / N - 1 is ~1e-15 absolute; these margins are ample
    return tau * (1 + 1e-6) + 1e-12


def _pairs_within(
    st: _Stage, target: float, tau: float
) -> Iterator[tuple[np.ndarray, np.ndarray, np.ndarray]]:
    """``(i, j, |float error|)`` of every pair with error <= ``tau`` (widened), in
    chunks, within the tooth-total limit."""
    fv = st.values.astype(np.float64)
    n = len(fv)
    if math.isinf(tau):
        start, stop = np.zeros(n, dtype=np.int64), np.full(n, n, dtype=np.int64)
    else:
        wide = _widen(tau)
        start = np.searchsorted(fv, fv * (1 - wide) / target, side="left")
        stop = np.searchsorted(fv, fv * (1 + wide) / target, side="right")
    for a, b in _row_chunks(stop - start, _PAIR_CHUNK):
        i, j = _ramp(start[a:b], stop[a:b])
        i += a
        if st.budget is not None:
            ok = st.sums[i] + st.sums[j] <= st.budget
            i, j = i[ok], j[ok]
        err = np.abs(fv[j] * target / fv[i] - 1.0)
        yield i, j, err


def _best_pairs(
    st: _Stage, target: Fraction, top: int
) -> Iterator[tuple[Fraction, int, int, int]]:
    """``(|error|, min total, N, D)`` of the ``top`` best pairs and every tie, sorted.

    Steps 2 and 3 of the module docstring: the neighbour bound, pass one (the
    ``top``-th smallest float error), pass two (everything up to it, widened).
    """
    t = float(target)
    tau = _tau(st, t, top)
    best = np.empty(0)
    for _, _, err in _pairs_within(st, t, tau):
        best = _smallest(np.concatenate([best, err]), top)
    kth = float(np.max(best)) if len(best) >= top else tau
    parts = [
        (i[err <= _widen(kth)], j[err <= _widen(kth)])
        for i, j, err in _pairs_within(st, t, kth)
    ]
    i = np.concatenate([a for a, _ in parts]) if parts else np.empty(0, np.int64)
    j = np.concatenate([b for _, b in parts]) if parts else np.empty(0, np.int64)
    return _sorted_pairs(target, st.values[i], st.values[j], st.sums[i] + st.sums[j])


_ZERO = Fraction(0)


def _sorted_pairs(
    target: Fraction, nums: np.ndarray, dens: np.ndarray, totals: np.ndarray
) -> Iterator[tuple[Fraction, int, int, int]]:
    """The pairs as ``(|error|, min total, N, D)`` in increasing order, one at a time.

    Exact pairs (``N q = D p``, told by divisibility in integers) come first, ordered
    by total in numpy: an exact target can have hundreds of thousands of them, and the
    expansion usually stops after a few. The others are few (about ``top`` plus ties)
    and are ranked by their exact ``Fraction`` errors.
    """
    p, q = target.numerator, target.denominator
    exact = (nums % p == 0) & (dens % q == 0)
    exact[exact] = nums[exact] // p == dens[exact] // q
    zn, zd, zs = nums[exact], dens[exact], totals[exact]
    order = np.lexsort((zd, zn, zs))
    for start in range(0, len(order), 4096):
        rows = order[start : start + 4096]
        for n, d, s in zip(
            zn[rows].tolist(), zd[rows].tolist(), zs[rows].tolist(), strict=True
        ):
            yield (_ZERO, s, n, d)
    rest = ~exact
    # |T D / N - 1| = |p D - q N| / (q N), exact in integers
    yield from sorted(
        (Fraction(abs(p * d - q * n), q * n), s, n, d)
        for n, d, s in zip(
            nums[rest].tolist(), dens[rest].tolist(), totals[rest].tolist(), strict=True
        )
    )


def _trains_of_pairs(
    st: _Stage,
    pairs: Iterable[tuple[Fraction, int, int, int]],
    target: Fraction,
    top: int | None,
    one_pairing: bool,
) -> list[Train]:
    """Expand ``(|error|, min total, N, D)`` pairs into trains, best ``top`` first.

    Pairs must be sorted. A pair's trains share its error and have at least its
    minimum tooth total, so expansion stops at the first pair whose
    ``(|error|, min total)`` is worse than the ``top``-th train found so far. That
    train is looked up again only when the list has grown by a quarter, so the cost
    stays proportional to the list (a stale ``top``-th is worse, so still a bound).
    """
    ascending = len(set(st.sets)) == 1
    idler_teeth = st.idler or 0
    found: dict[object, Train] = {}
    # (|error|, total, largest) of the top-th train found so far
    kth: tuple[Fraction, int, int] | None = None
    looked_at = 0
    for abs_err, min_total, num, den in pairs:
        if kth is not None and (abs_err, min_total + idler_teeth) > kth[:2]:
            break
        ratio = Fraction(num, den)
        error = target / ratio - 1
        combos = sorted(
            (sum(a) + sum(b), max(a[-1] if ascending else max(a), max(b)), a, b)
            for a in _factorisations(num, st.sets, ascending)
            for b in _factorisations(den, st.sets, ascending)
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
        if top is not None and len(found) >= top and len(found) >= looked_at * 5 // 4:
            looked_at = len(found)
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


# ---------------------------------------------------------------- coaxial trains


@dataclass(frozen=True, slots=True)
class _SumPair:
    """One admissible pair of stage tooth sums and the drivers each allows."""

    s1: int
    s2: int
    a1: np.ndarray  # stage 1 drivers, ascending (so a1 / (s1 - a1) ascends)
    a2: np.ndarray
    spread: Fraction  # mm
    centre: Fraction  # mm


def _splits(counts: tuple[int, ...]) -> dict[int, np.ndarray]:
    """Tooth sum ``S`` -> the drivers ``a`` with ``a`` and ``S - a`` in ``counts``."""
    values = np.array(counts, dtype=np.int64)
    member = np.zeros(counts[-1] + 1, dtype=bool)
    member[values] = True
    out = {}
    for s in range(2 * counts[0], 2 * counts[-1] + 1):
        rest = s - values
        ok = (rest >= 1) & (rest <= counts[-1])
        ok[ok] = member[rest[ok]]
        if ok.any():
            out[s] = values[ok]
    return out


def _sum_pairs(limits: Limits, coaxial: Coaxial) -> list[_SumPair]:
    sets = stage_counts(limits, 2)
    if sets is None:
        return []
    m1, m2 = (Fraction(m) for m in coaxial.modules)
    first, second = _splits(sets[0]), _splits(sets[1])
    sums2 = np.array(sorted(second), dtype=np.int64)
    reach2 = None
    if coaxial.reach is not None:
        reach2 = np.array([coaxial.reach(int(s), m2) for s in sums2])
    total = limits.max_teeth_total
    out = []
    for s1, a1 in first.items():
        c1 = m1 * s1 / 2
        s2_equal = c1 * 2 / m2
        chosen: list[int] = []
        if s2_equal.denominator == 1 and int(s2_equal) in second:
            chosen.append(int(s2_equal))
        if coaxial.reach is not None and reach2 is not None:
            c2 = sums2 * float(m2) / 2
            reach1 = coaxial.reach(s1, m1)
            # the shorter stage is opened to the longer one's centre distance
            ok = ((c2 > float(c1)) & (c2 <= reach1 + 1e-9)) | (
                (c2 < float(c1)) & (reach2 >= float(c1) - 1e-9)
            )
            chosen += [int(s) for s in sums2[ok] if m2 * int(s) != 2 * c1]
        for s2 in sorted(set(chosen)):
            if total is not None and s1 + s2 > total:
                continue
            c2_exact = m2 * s2 / 2
            out.append(
                _SumPair(s1, s2, a1, second[s2], abs(c1 - c2_exact), max(c1, c2_exact))
            )
    return out


def _coaxial_trains(
    target: Fraction,
    limits: Limits,
    top: int | None,
    one_pairing: bool,
    exact_only: bool,
) -> list[Train]:
    """The coaxial search of the module docstring (two stages, exhaustive)."""
    coaxial = limits.coaxial
    assert coaxial is not None
    pairs = _sum_pairs(limits, coaxial)
    t = float(target)
    keep = None if top is None else 4 * top
    if exact_only:
        tau = 0.0
    elif keep is None:
        tau = math.inf
    else:
        # step 2: the two neighbours of T / u in every sum pair are real trains
        best = np.empty(0)
        for sp in pairs:
            u = sp.a1 / (sp.s1 - sp.a1)
            v = sp.a2 / (sp.s2 - sp.a2)
            pos = np.searchsorted(v, t / u)
            for idx in (pos - 1, pos):
                ok = (idx >= 0) & (idx < len(v))
                err = np.abs(t / (u[ok] * v[idx[ok]]) - 1.0)
                best = _smallest(np.concatenate([best, err]), keep)
        tau = float(np.max(best)) if len(best) >= keep else math.inf
    # step 3: every train whose float error is within the bound (widened)
    found: list[tuple[float, int, int, int]] = []
    for n, sp in enumerate(pairs):
        u = sp.a1 / (sp.s1 - sp.a1)
        v = sp.a2 / (sp.s2 - sp.a2)
        if math.isinf(tau):
            start = np.zeros(len(u), dtype=np.int64)
            stop = np.full(len(u), len(v), dtype=np.int64)
        else:
            wide = _widen(tau)
            start = np.searchsorted(v, t / (u * (1 + wide)), side="left")
            high = t / (u * (1 - wide)) if wide < 1 else np.full(len(u), np.inf)
            stop = np.searchsorted(v, high, side="right")
        i, j = _ramp(start, stop)
        err = np.abs(t / (u[i] * v[j]) - 1.0)
        found += zip(
            err.tolist(),
            [n] * len(i),
            sp.a1[i].tolist(),
            sp.a2[j].tolist(),
            strict=True,
        )
    if keep is not None and len(found) > keep:
        kth = heapq.nsmallest(keep, (f[0] for f in found))[-1]
        found = [f for f in found if f[0] <= _widen(kth)]
    ranked: list[Train] = []
    for _, n, a1, a2 in found:
        sp = pairs[n]
        stages = ((a1, sp.s1 - a1), (a2, sp.s2 - a2))
        ratio = Fraction(a1 * a2, (sp.s1 - a1) * (sp.s2 - a2))
        error = target / ratio - 1
        if exact_only and error != 0:
            continue
        ranked.append(Train(stages, ratio, error, None, sp.spread, sp.centre))
    ranked.sort(key=lambda tr: (tr.rank_key(), tr.stages))
    # one train per stage order (when both stages are alike), or per wheel set
    alike = (
        len(set(stage_counts(limits, 2) or ())) == 1 and len(set(coaxial.modules)) == 1
    )
    seen: set[object] = set()
    out = []
    for tr in ranked:
        drivers = tuple(sorted(a for a, _ in tr.stages))
        driven = tuple(sorted(b for _, b in tr.stages))
        key: object = tuple(sorted(tr.stages)) if alike else tr.stages
        if one_pairing:
            key = (drivers, driven) if alike else (key, drivers, driven)
            if not alike:
                key = (tr.stages[0][0], tr.stages[1][0], drivers, driven)
        if key in seen:
            continue
        seen.add(key)
        out.append(tr)
    return out if top is None else out[:top]


# ---------------------------------------------------------------- public entry points


def search_trains(
    target: Fraction,
    limits: Limits,
    top: int = 10,
    one_pairing: bool = False,
    budget_s: float = SEARCH_TIME_BUDGET_S,
) -> list[Train]:
    """The ``top`` trains closest to ``target`` within ``limits``, best first.

    ``target`` is turns of the output per turn of the input (exact). Ranking:
    ``|error|``, then number of wheels, spread, total teeth, largest wheel, widest
    stage, tooth counts. Trains that differ only in the order of their stages appear
    once. ``one_pairing`` keeps one train per set of drivers and set of driven wheels
    (the pairing whose widest stage is smallest) instead of every way of pairing them.
    Exhaustive: see the module docstring for the argument. Raises
    :class:`SearchTooLarge` when the estimated time exceeds ``budget_s`` seconds or
    the tables would exceed the memory budget.
    """
    target = _check_target(target)
    if not 1 <= top <= MAX_TOP:
        raise ValueError(f"'top' must be 1 to {MAX_TOP:,}, got {top}")
    if limits.coaxial is not None:
        _check_cost(limits, budget_s)
        return _coaxial_trains(target, limits, top, one_pairing, exact_only=False)
    results: list[Train] = []
    for st in _stage_setups(limits, budget_s):
        pairs = _best_pairs(st, target, top)
        results.extend(_trains_of_pairs(st, pairs, target, top, one_pairing))
    results.sort(key=Train.rank_key)
    return results[:top]


def exact_trains(
    target: Fraction,
    limits: Limits,
    limit: int | None = None,
    one_pairing: bool = False,
    budget_s: float = SEARCH_TIME_BUDGET_S,
) -> list[Train]:
    """Every train whose ratio equals ``target`` exactly, best (fewest wheels) first.

    ``limit`` caps the list (the best ``limit`` by the usual ranking); ``None`` lists
    them all. Found by divisibility, not by floats: ``N = p t``, ``D = q t``.
    ``one_pairing`` and ``budget_s`` as in :func:`search_trains`.
    """
    target = _check_target(target)
    if limit is not None and limit < 1:
        raise ValueError(f"'limit' must be at least 1, got {limit}")
    if limits.coaxial is not None:
        _check_cost(limits, budget_s)
        return _coaxial_trains(target, limits, limit, one_pairing, exact_only=True)
    p, q = target.numerator, target.denominator
    results: list[Train] = []
    for st in _stage_setups(limits, budget_s):
        v = st.values
        # both sorted and distinct (v is): membership by binary search
        t_num = v[v % p == 0] // p
        t_den = v[v % q == 0] // q
        at = np.minimum(np.searchsorted(t_den, t_num), max(len(t_den) - 1, 0))
        t = t_num[t_den[at] == t_num] if len(t_den) else t_den
        nums, dens = t * p, t * q
        totals = st.sums[np.searchsorted(v, nums)] + st.sums[np.searchsorted(v, dens)]
        ok = totals <= st.budget if st.budget is not None else np.ones(len(t), bool)
        pairs = _sorted_pairs(target, nums[ok], dens[ok], totals[ok])
        results.extend(_trains_of_pairs(st, pairs, target, limit, one_pairing))
    results.sort(key=Train.rank_key)
    return results if limit is None else results[:limit]


@dataclass(frozen=True, slots=True)
class Relaxation:
    """One limit that, relaxed alone, lets a train meet the tolerance.

    ``limit`` is ``"stages"``, ``"teeth_max"``, ``"max_teeth_total"``, ``"sense"``,
    ``"coaxial"`` or ``"simplest"`` (no train: the simplest ratio within tolerance, for
    information; ``value`` is then that fraction and ``train`` is ``None``).
    """

    limit: str
    value: object
    train: Train | None
    note: str = ""


def relaxations(
    target: Fraction,
    limits: Limits,
    tolerance: Fraction,
    budget_s: float = SEARCH_TIME_BUDGET_S / 4,
) -> list[Relaxation]:
    """Which single limit to relax so that a train comes within ``tolerance``.

    ``tolerance`` is relative (``Fraction(10, 10**6)`` for 10 ppm). Tried, each on its
    own: one more stage (up to 4; not for coaxial trains), twice the largest tooth
    count or the largest prime factor of the simplest fraction within tolerance (for
    3 stages or fewer, and a range of counts), no tooth-total limit, either sense, not
    coaxial. A try whose search would take more than ``budget_s`` seconds is left out.
    The first entry is always the simplest fraction (smallest denominator) within the
    tolerance with its prime factors: a prime factor above the largest tooth count
    cannot be cut.
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
    if big > limits.teeth_high:
        note = (
            f"its prime factor {big} is above the largest tooth count "
            f"{limits.teeth_high}"
        )
    out = [Relaxation("simplest", simplest, None, note)]

    def meets(lim: Limits) -> Train | None:
        try:
            found = search_trains(target, lim, top=1, budget_s=budget_s)
        except ValueError:  # a relaxed range too large to search: not a useful hint
            return None
        if found and abs(found[0].error) <= tolerance:
            return found[0]
        return None

    tries: list[tuple[str, object, Limits]] = []
    if limits.stages < MAX_STAGES and limits.coaxial is None:
        tries.append(
            ("stages", limits.stages + 1, replace(limits, stages=limits.stages + 1))
        )
    if limits.stages <= 3 and not isinstance(limits.teeth, frozenset):
        # twice the range, or up to the prime the simplest fraction needs
        lo, hi = limits.teeth
        wider = (lo, min(MAX_TEETH, max(2 * hi, big if big <= 1000 else 0)))
        stage_teeth = tuple(
            s if isinstance(s, frozenset) else (s[0], max(s[1], wider[1]))
            for s in limits.stage_teeth
        )
        if wider[1] > hi:
            tries.append(
                (
                    "teeth_max",
                    None,
                    replace(limits, teeth=wider, stage_teeth=stage_teeth),
                )
            )
    if limits.max_teeth_total is not None:
        tries.append(("max_teeth_total", None, replace(limits, max_teeth_total=None)))
    if limits.sense != "either":
        tries.append(("sense", "either", replace(limits, sense="either")))
    if limits.coaxial is not None:
        tries.append(("coaxial", None, replace(limits, coaxial=None)))
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
