"""Which boxes overlap: the broad phase of the collision and plate checks.

Comparing every body with every other one is quadratic: a train of 2000 arbors has some
eight million pairs. Here each body is an axis-aligned box (a circle's square in the
plane, its z-range along the axes), and only boxes that overlap go on to the exact
tests. The boxes are swept along the coordinate in which they spread the most, so a
layout that is long in x or in y costs about as much as its bodies' near neighbours.
"""

from __future__ import annotations

import numpy as np

__all__ = ["overlapping_pairs"]


def overlapping_pairs(
    low: np.ndarray, high: np.ndarray, margin: float = 0.0
) -> list[tuple[int, int]]:
    """Index pairs ``(i, j)``, ``i < j``, of boxes that overlap by more than ``margin``.

    Parameters
    ----------
    low, high
        ``(n, k)`` arrays: the smallest and largest coordinate of each box in each of
        ``k`` dimensions (mm).
    margin
        Boxes must overlap by more than this in every dimension (mm); a negative margin
        also keeps boxes that stay within ``-margin`` of each other.

    Returns
    -------
    list of (int, int)
        In increasing order of ``i``, then ``j``: the order of a loop over all pairs.
    """
    low = np.asarray(low, dtype=float)
    high = np.asarray(high, dtype=float)
    if low.ndim != 2 or low.shape != high.shape:
        raise ValueError(
            f"'low' and 'high' must be (n, k) arrays of one shape, got {low.shape} "
            f"and {high.shape}"
        )
    n = len(low)
    if n < 2:
        return []
    spread = high.max(axis=0) - low.min(axis=0)
    axis = int(np.argmax(spread))
    order = np.argsort(low[:, axis], kind="stable")
    starts = low[order, axis]
    pairs: list[tuple[int, int]] = []
    for rank, i in enumerate(order):
        # boxes that start (in the sweep direction) before box i ends
        stop = int(np.searchsorted(starts, high[i, axis] - margin, side="left"))
        if stop <= rank + 1:
            continue
        cand = order[rank + 1 : stop]
        overlap = np.minimum(high[cand], high[i]) - np.maximum(low[cand], low[i])
        hit = cand[np.all(overlap > margin, axis=1)]
        pairs.extend((int(min(i, j)), int(max(i, j))) for j in hit)
    pairs.sort()
    return pairs
