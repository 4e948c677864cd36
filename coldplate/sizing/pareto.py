"""Non-dominated (Pareto) filter for three objectives, all minimised.

A point dominates another when it is no worse in every objective and better in at least one; copies of a row
dominate neither each other and share its verdict.  Two exact methods, chosen by the data:

* level by level in f3, when f3 takes few distinct values (in a search it is the flow, on a grid): within a
  level a row survives only if no row of the level is better in f1 and f2 (sort, running minimum); across
  levels a staircase of the lower levels' best f2 for each f1 is searched with ``np.searchsorted``.
  O(n log n + K·m log m) for K levels and m survivors.
* divide and conquer otherwise: after sorting by (f1, f2, f3) only an earlier distinct row can dominate a
  later one, and it does exactly when its f2 and f3 are no larger.  That two-dimensional question is split
  over the sorted order (Kung, Luccio & Preparata 1975): the earlier half sorted by f2 with a running
  minimum of f3, each row of the later half looked up with ``np.searchsorted``, blocks of :data:`BLOCK` rows
  compared pairwise.  O(n log² n), whatever the number of distinct values.

``tests/test_sizing_search.py`` checks both against the O(n²) definition.
"""
from __future__ import annotations

import numpy as np

#: Rows compared pairwise at the bottom of the divide and conquer.
BLOCK = 256
#: Up to this many distinct f3 values the level method is used.
MAX_LEVELS = 1024


def pareto_mask(F, method: str | None = None) -> np.ndarray:
    """Boolean mask of the non-dominated rows of ``F`` (n × 3, minimised).

    ``method``: "levels" or "divide" to force one (for tests); by default the level method when f3 takes at
    most :data:`MAX_LEVELS` distinct values.
    """
    F = np.asarray(F, dtype=float)
    if F.ndim != 2 or F.shape[1] != 3:
        raise ValueError("pareto_mask needs an n x 3 array")
    if F.shape[0] == 0:
        return np.zeros(0, dtype=bool)
    if method is None:
        method = "levels" if np.unique(F[:, 2]).size <= MAX_LEVELS else "divide"
    if method not in METHODS:
        raise ValueError(f"method must be one of {sorted(METHODS)}")
    return METHODS[method](F)


def _by_levels(F: np.ndarray) -> np.ndarray:
    """Level by level in f3: fast when f3 takes few distinct values (a search's flows)."""
    n = F.shape[0]
    order = np.lexsort((F[:, 1], F[:, 0], F[:, 2]))  # by level f3, then f1, then f2
    S = F[order]
    same = np.zeros(n, dtype=bool)
    same[1:] = np.all(S[1:] == S[:-1], axis=1)  # a copy of the row before it
    first = np.maximum.accumulate(np.where(same, 0, np.arange(n)))  # each row's first copy
    new_level = np.ones(n, dtype=bool)
    new_level[1:] = S[1:, 2] != S[:-1, 2]
    starts = np.flatnonzero(new_level)
    ends = np.append(starts[1:], n)
    keep_sorted = np.zeros(n, dtype=bool)
    stair_f1 = np.empty(0)
    stair_f2 = np.empty(0)  # running minimum of f2 over the lower levels, by ascending f1
    for a, b in zip(starts, ends):
        f1, f2 = S[a:b, 0], S[a:b, 1]
        # within the level (sorted by f1 then f2): a first copy is dominated iff an earlier row has f2 <= own
        prev_min = np.empty_like(f2)
        prev_min[0] = np.inf
        np.minimum.accumulate(f2[:-1], out=prev_min[1:])
        ok = f2 < prev_min
        if stair_f1.size:
            pos = np.searchsorted(stair_f1, f1, side="right")
            best = np.where(pos > 0, stair_f2[np.maximum(pos - 1, 0)], np.inf)
            ok &= ~(best <= f2)
        keep_sorted[a:b] = ok
        # fold this level's front into the staircase
        all_f1 = np.concatenate((stair_f1, f1[ok]))
        all_f2 = np.concatenate((stair_f2, f2[ok]))
        s = np.lexsort((all_f2, all_f1))
        all_f1, all_f2 = all_f1[s], np.minimum.accumulate(all_f2[s])
        last = np.ones(all_f1.size, dtype=bool)
        last[:-1] = all_f1[1:] != all_f1[:-1]  # keep the last (lowest f2) of equal f1
        stair_f1, stair_f2 = all_f1[last], all_f2[last]
    keep_sorted = keep_sorted[first]  # copies share their first copy's verdict
    keep = np.zeros(n, dtype=bool)
    keep[order] = keep_sorted
    return keep


def _divide_and_conquer(F: np.ndarray) -> np.ndarray:
    """Divide and conquer over the rows sorted by f1: any number of distinct values."""
    n = F.shape[0]
    order = np.lexsort((F[:, 2], F[:, 1], F[:, 0]))  # by f1, then f2, then f3
    S = F[order]
    copy = np.zeros(n, dtype=bool)
    copy[1:] = np.all(S[1:] == S[:-1], axis=1)
    first = np.maximum.accumulate(np.where(copy, 0, np.arange(n)))  # each row's first copy
    distinct = np.flatnonzero(~copy)
    U = S[distinct]
    dominated = np.zeros(U.shape[0], dtype=bool)
    _sweep(U[:, 1], U[:, 2], 0, U.shape[0], dominated)
    verdict = np.zeros(n, dtype=bool)
    verdict[distinct] = ~dominated
    keep = np.zeros(n, dtype=bool)
    keep[order] = verdict[first]
    return keep


def _sweep(f2, f3, lo, hi, dominated):
    """Mark rows lo..hi-1 dominated by an earlier row of the same range (f2 and f3 no larger)."""
    if hi - lo <= BLOCK:
        a, b = f2[lo:hi], f3[lo:hi]
        earlier = np.tri(hi - lo, k=-1, dtype=bool)  # earlier[i, j]: j < i
        dominated[lo:hi] |= np.any(earlier & (a[None, :] <= a[:, None]) & (b[None, :] <= b[:, None]), axis=1)
        return
    mid = (lo + hi) // 2
    _sweep(f2, f3, lo, mid, dominated)
    _sweep(f2, f3, mid, hi, dominated)
    s = np.argsort(f2[lo:mid], kind="stable")
    left_f2 = f2[lo:mid][s]
    left_min3 = np.minimum.accumulate(f3[lo:mid][s])
    pos = np.searchsorted(left_f2, f2[mid:hi], side="right")
    hit = pos > 0
    dominated[mid:hi] |= hit & (left_min3[np.maximum(pos - 1, 0)] <= f3[mid:hi])


METHODS = {"levels": _by_levels, "divide": _divide_and_conquer}


def pareto_mask_brute_force(F) -> np.ndarray:
    """The definition, O(n²): for tests and small sets."""
    F = np.asarray(F, dtype=float)
    le = np.all(F[:, None, :] <= F[None, :, :], axis=2)  # le[j, i]: j no worse than i everywhere
    lt = np.any(F[:, None, :] < F[None, :, :], axis=2)
    return ~np.any(le & lt, axis=0)
