"""Non-dominated (Pareto) filter for three objectives, all minimised.

A point dominates another when it is no worse in every objective and better in at least one.  The filter
works level by level in the third objective (in a search that is the flow, which takes few distinct values):

1. within one level the third objective ties, so a point survives only if no other point of the level is
   better in the first two: sort by (f1, f2) and compare f2 with the running minimum (O(n log n));
2. across levels, a point of a higher level is dominated when some point of a lower level has f1 and f2 no
   larger: a staircase of the lower levels' best f2 for each f1, searched with ``np.searchsorted``.

Exact duplicates dominate neither each other: all copies are kept.  Cost O(n log n + K·m log m) for K levels
and m survivors; ``tests/test_sizing_pareto.py`` checks it against the O(n²) definition.
"""
from __future__ import annotations

import numpy as np


def pareto_mask(F) -> np.ndarray:
    """Boolean mask of the non-dominated rows of ``F`` (n × 3, minimised)."""
    F = np.asarray(F, dtype=float)
    if F.ndim != 2 or F.shape[1] != 3:
        raise ValueError("pareto_mask needs an n x 3 array")
    n = F.shape[0]
    if n == 0:
        return np.zeros(0, dtype=bool)
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


def pareto_mask_brute_force(F) -> np.ndarray:
    """The definition, O(n²): for tests and small sets."""
    F = np.asarray(F, dtype=float)
    le = np.all(F[:, None, :] <= F[None, :, :], axis=2)  # le[j, i]: j no worse than i everywhere
    lt = np.any(F[:, None, :] < F[None, :, :], axis=2)
    return ~np.any(le & lt, axis=0)
