"""The linear solvers of the plate's field (:mod:`coldplate.plate.field`): M X = B, one column per source.

``solve(M, B, method)`` returns (X, Krylov iterations, the method used).  Methods:

- ``"auto"`` (the field's default): ``"direct"`` up to :data:`DIRECT_UP_TO` unknowns, ``"amg"`` above.
- ``"amg"``: restarted GMRES, right-preconditioned by one V-cycle of classical (Ruge-Stüben) algebraic multigrid
  from pyamg, to a relative residual of :data:`AMG_RTOL` on every column (checked on the true residual).  Should
  it not get there within :data:`AMG_MAX_ITERATIONS` (never seen on the examples: 17-21 iterations a source), the direct
  LU solves the system instead, so the answer is never less accurate.
- ``"direct"``: SuperLU (``splu``: minimum degree on A + A^T, symmetric mode with a :data:`DIAG_PIVOT` diagonal
  threshold), exact to round-off; a back-substitution per column.
- ``"gmres"``: GMRES with an incomplete LU (``spilu``), kept for comparison only (hundreds of iterations here).

Why multigrid (measured with ``benchmarks/field.py`` and by hand on this 2-core shared machine, one process; the
three-source example's default grid: 102,240 cells, 103,808 unknowns, 3 sources):

- The LU's fill grows faster than the cells: 35 million entries (47 times the matrix), 2.4-4.8 s to factorise and
  about 400 MB (the process's peak 513 MB).  No SuperLU option helps: ``relax`` 1-60 and ``panel_size`` 5-20
  within 10 %, COLAMD 12 s and 2.8 times the fill, partial pivoting 40 % slower; METIS nested dissection
  (pymetis, handed to SuperLU as a permutation) still 28 million entries, 1.6 s plus 0.7 s to order.
- pyamg's classical AMG with the options of :data:`AMG_OPTIONS`: setup 0.12 s, 19-20 GMRES iterations (about
  0.19 s) per source to 1e-11, a hierarchy of 2.7 times the matrix; the whole solve of 3 sources about 0.7 s and
  the process's peak 203 MB.  Smoothed aggregation took 33-39 iterations at its best and 2-18 s to set up with
  its strength options; AIR 15 s to set up; ILU-GMRES 589 iterations and 32 s for one source.  BiCGSTAB, a
  second coarsening pass, theta 0.5 and PMIS splitting were no better.
- The Krylov loop is our own, not pyamg's or scipy's, because those take their dot products and norms from the
  BLAS: OpenBLAS puts vectors of this length on threads, and with the other core busy (this shared machine)
  pyamg's own GMRES ran 5-8 times slower than single-threaded (3.5-7 s against 0.7 s, the same iterations).
  Here every vector operation is numpy's own loop (``einsum``, elementwise), so nothing depends on threads.
- Below :data:`DIRECT_UP_TO` unknowns the LU: there it takes milliseconds, exactly (one source: LU 3, 6, 18 ms
  against AMG 8, 11, 17 ms at 1,600, 2,800, 5,300 unknowns; 71 against 41 ms at 13,600; with several sources
  the crossing moves up, the LU's back-substitutions being cheap).
- Several sources (the coupling matrix needs each source's own field): the LU pays one back-substitution per
  source (a few per cent of its factorisation), the AMG one more GMRES solve per source.  Solving each at the
  loads' 1e-11 made the 8-source benchmark (87,120 cells) 4.8-5.2 times one right-hand side.  So
  :func:`solve_loads` solves the field at the loads to :data:`AMG_RTOL` and each source's own field, which only
  the coupling reads, to :data:`COUPLING_RTOL` (1e-3: 6 iterations a source from zero, 4 from the level below's
  fields; the coupling within 4.6e-5 of its largest entry, 1.1e-4 on the three-source example, against a grid
  uncertainty of about 3 %); the loads'
  solve then starts from the sources' fields at the loads (12 iterations instead of 17).  Measured with
  ``benchmarks/field.py --coupling-only`` (interleaved medians, one run): the 8-source benchmark's default solve
  with the coupling 1.02 s against 0.59 s without it (``coupling=False``), ratio 1.73 (1.84 in another run); the
  three-source example 1.10.  The LU would have the better ratio (1.02) but at 4.9 s and 358 MB of fill; the
  AMG is kept for every source count, which bounds the memory (peak 199 MB).  Tried and dropped: block GMRES
  over the sources (the same 6 steps per source, 2.5 times slower: the sources are local and share little), a
  single-precision V-cycle for the loose solves (7 % faster, eaten by the cast), smoothing the carried-up
  fields before GMRES (a sweep saves about its own cost), a pre- or post-smoother alone (1.7 and 12 times the
  iterations).
"""
from __future__ import annotations

import math

import numpy as np

#: Up to this many unknowns the direct LU (its factorisation is then faster than the AMG's setup, and exact).
DIRECT_UP_TO = 8_000
#: SuperLU's diagonal pivot threshold: the diagonal is taken unless under this share of its column's largest entry.
DIAG_PIVOT = 0.01
#: Relative residual ||b - M x|| / ||b|| the AMG-preconditioned GMRES reaches on every column (the temperatures then
#: agree with the LU's to about 1e-11 of the rise: measured 1e-11 on the three-source example).
AMG_RTOL = 1e-11
#: pyamg's classical AMG as set up here: strength of connection theta 0.25 and Ruge-Stüben splitting (pyamg's
#: defaults), direct interpolation, one forward Gauss-Seidel sweep before the coarse correction and one backward
#: after (a symmetric cycle at half the sweeps of pyamg's default symmetric-symmetric); measured 15-20 % less CPU
#: time than pyamg's defaults on the three-source example (58 iterations for its 3 sources against 45), up to 20 %
#: on the other examples.
AMG_OPTIONS = dict(interpolation="direct", presmoother=("gauss_seidel", {"sweep": "forward"}),
                   postsmoother=("gauss_seidel", {"sweep": "backward"}))
#: Relative residual each source's own field per watt reaches with the AMG when there are several sources (those
#: fields make the coupling matrix only; the field at the loads is solved to AMG_RTOL): see :func:`solve_loads`.
COUPLING_RTOL = 1e-3
#: The same for the level below's own fields when they serve only to start the requested level's (their error
#: there is the coarser grid's anyway: measured the same iterations on the requested level as from 1e-3).
START_RTOL = 1e-2
#: What the coupling then promises: every entry within this share of the matrix's largest entry of the LU's
#: (measured 4.6e-5 on the 8-source benchmark and 1.1e-4 on the three-source example; tests/test_field.py).
COUPLING_ACCURACY = 3e-4
#: GMRES restart length and the most iterations per column before the direct LU takes over.
AMG_RESTART, AMG_MAX_ITERATIONS = 30, 150
#: Gram-Schmidt's second pass is taken when the first leaves less than this share of the vector's norm (the
#: "twice is enough" criterion with Kahan's and Parlett's 1/sqrt(2), from memory).
_REORTHOGONALISE = 0.7071
#: Tolerance of the ILU-preconditioned GMRES ("gmres", for comparison; relative residual).
GMRES_RTOL = 1e-11

METHODS = ("auto", "amg", "direct", "gmres")


def solve(M, B, method: str = "auto"):
    """Solve ``M X = B`` (M sparse, B (n, k) dense); returns (X, Krylov iterations over all columns, method used:
    "direct", "amg" or "gmres")."""
    if method not in METHODS:
        raise ValueError(f"unknown method {method!r}: one of {', '.join(METHODS)}")
    if method == "auto":
        method = "direct" if M.shape[0] <= DIRECT_UP_TO else "amg"
    if method == "amg":
        X, iterations = amg(M, B)
        if X is not None:
            return X, iterations, "amg"
        method = "direct"  # not converged: the LU, exact (a slower answer, never a less accurate one)
    if method == "direct":
        return direct(M, B), 0, "direct"
    X, iterations = ilu_gmres(M, B)
    return X, iterations, "gmres"


def solve_loads(M, B, loads, method: str = "auto", guess=None, column_rtol=None):
    """Solve for several sources at once: ``M x = B loads`` (the field at the loads) and ``M X = B`` (each
    source's field per watt, for the coupling).  Returns (x, X, Krylov iterations, method used).

    The LU is exact for both (x = X loads).  With the AMG, x is solved to :data:`AMG_RTOL` and each column of X
    to :data:`COUPLING_RTOL` (it serves the coupling matrix only: within :data:`COUPLING_ACCURACY` of the largest
    entry, against a grid uncertainty of about 3 % on the 8-source benchmark), x starting from X loads; then X
    is moved by the least change that gives X loads = x exactly (``X += (x - X q) q^T / q^T q``), so the
    coupling reproduces the sources' mean faces and no column moves further from its own solution (a projection
    onto matrices that satisfy a relation the exact X satisfies).  One source: X = x / load, both to
    :data:`AMG_RTOL`.  ``guess`` (n, N): where the AMG's columns start (the level below's columns carried up:
    measured a third fewer iterations on the 8-source benchmark); ``column_rtol``: the columns' tolerance
    instead of :data:`COUPLING_RTOL` (:data:`START_RTOL` for a level that only starts the next); the LU ignores
    both."""
    q = np.asarray(loads, float)
    if method not in METHODS:
        raise ValueError(f"unknown method {method!r}: one of {', '.join(METHODS)}")
    if method == "auto":
        method = "direct" if M.shape[0] <= DIRECT_UP_TO else "amg"
    if method == "amg":
        x, X, iterations = amg_loads(M, B, q, guess, column_rtol)
        if x is not None:
            return x, X, iterations, "amg"
        method = "direct"  # not converged: the LU, exact (a slower answer, never a less accurate one)
    if method == "direct":
        X = direct(M, B)
        return X @ q, X, 0, "direct"
    X, iterations = ilu_gmres(M, B)
    return X @ q, X, iterations, "gmres"


def direct(M, B):
    """SuperLU: minimum degree on A + A^T, symmetric mode with a small diagonal threshold (the pivots stay on the
    diagonal: the rows are diagonally dominant but for the coolant's, so the ordering is kept as chosen;
    measured 15-20 % faster than partial pivoting, equal to 3e-15)."""
    from scipy.sparse import csc_matrix
    from scipy.sparse.linalg import splu

    lu = splu(csc_matrix(M), permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=DIAG_PIVOT,
              options=dict(SymmetricMode=True))
    return lu.solve(B)


def amg(M, B):
    """GMRES with a classical AMG V-cycle on every column; (X, iterations), or (None, iterations) when a column
    does not reach :data:`AMG_RTOL` within :data:`AMG_MAX_ITERATIONS`."""
    from scipy.sparse import csr_matrix
    from pyamg import ruge_stuben_solver

    A = csr_matrix(M)
    ml = ruge_stuben_solver(A, **AMG_OPTIONS)
    precondition = _v_cycle(ml)
    X = np.zeros((A.shape[0], B.shape[1]))
    total = 0
    for m in range(B.shape[1]):
        x, its = _gmres(A, np.ascontiguousarray(B[:, m], dtype=float), precondition, AMG_RTOL, AMG_RESTART,
                        AMG_MAX_ITERATIONS)
        total += its
        if x is None:
            return None, total
        X[:, m] = x
    return X, total


def amg_loads(M, B, q, guess=None, column_rtol=None):
    """The AMG half of :func:`solve_loads`: (x, X, iterations), or (None, None, iterations) when a solve does
    not converge."""
    from scipy.sparse import csr_matrix
    from pyamg import ruge_stuben_solver

    A = csr_matrix(M)
    precondition = _v_cycle(ruge_stuben_solver(A, **AMG_OPTIONS))
    n, N = B.shape
    b = np.ascontiguousarray(B @ q, dtype=float)
    if N == 1 and q[0] != 0.0:
        x, its = _gmres(A, b, precondition, AMG_RTOL, AMG_RESTART, AMG_MAX_ITERATIONS)
        return (None, None, its) if x is None else (x, (x / q[0])[:, None], its)
    X = np.zeros((n, N))
    total = 0
    for m in range(N):
        col, its = _gmres(A, np.ascontiguousarray(B[:, m], dtype=float), precondition,
                          COUPLING_RTOL if column_rtol is None else column_rtol,
                          AMG_RESTART, AMG_MAX_ITERATIONS, x0=None if guess is None else guess[:, m])
        total += its
        if col is None:
            return None, None, total
        X[:, m] = col
    x, its = _gmres(A, b, precondition, AMG_RTOL, AMG_RESTART, AMG_MAX_ITERATIONS, x0=X @ q)
    total += its
    if x is None:
        return None, None, total
    qq = float(q @ q)
    if qq > 0.0:
        X += np.outer(x - X @ q, q / qq)
    return x, X, total


def _v_cycle(ml):
    """One V-cycle of pyamg's hierarchy from a zero guess, as a function of the right-hand side (a fixed linear
    operator).  Written out over ``ml.levels`` rather than through ``ml.aspreconditioner()``, which computes two
    residual norms per application (two more products and BLAS norms)."""
    levels, coarse = ml.levels, ml.coarse_solver

    def cycle(b, lvl=0):
        level = levels[lvl]
        A = level.A
        x = np.zeros_like(b)
        level.presmoother(A, x, b)
        coarse_b = level.R @ (b - A @ x)
        if lvl == len(levels) - 2:
            coarse_x = np.asarray(coarse(levels[-1].A, coarse_b), float).ravel()
        else:
            coarse_x = cycle(coarse_b, lvl + 1)
        x += level.P @ coarse_x
        level.postsmoother(A, x, b)
        return x

    if len(levels) == 1:
        return lambda b: np.asarray(coarse(levels[0].A, b), float).ravel()
    return cycle


def _dot(a, b) -> float:
    return float(np.einsum("i,i->", a, b))


def _gmres(A, b, precondition, rtol=AMG_RTOL, restart=AMG_RESTART, maxiter=AMG_MAX_ITERATIONS, x0=None):
    """Restarted GMRES, right-preconditioned (x = P y, the residual of A x minimised), from ``x0`` (None: zero);
    classical Gram-Schmidt with a second pass where the first left less than :data:`_REORTHOGONALISE` of the
    vector's norm (Daniel, Gragg, Kaufman and Stewart 1976); numpy's own loops only (no BLAS: see the module's
    docstring).  The preconditioned directions are kept, so the answer costs no further V-cycle.  ``rtol`` is
    relative to ``||b||``.  (x, iterations) or (None, iterations)."""
    n = b.size
    nb = math.sqrt(_dot(b, b))
    if nb == 0.0:
        return np.zeros(n), 0
    target = rtol * nb
    if x0 is None:
        x, r, beta = np.zeros(n), b.copy(), nb
    else:
        x = np.array(x0, dtype=float)
        r = b - A @ x
        beta = math.sqrt(_dot(r, r))
        if not math.isfinite(beta):
            return None, 0
        if beta <= target:
            return x, 0
    total = 0
    V = np.empty((restart + 1, n))
    Z = np.empty((restart, n))
    while total < maxiter:
        H = np.zeros((restart + 1, restart))
        cs, sn = np.zeros(restart), np.zeros(restart)
        g = np.zeros(restart + 1)
        g[0] = beta
        V[0] = r / beta
        k = 0
        for j in range(min(restart, maxiter - total)):
            Z[j] = precondition(V[j])
            w = A @ Z[j]
            before = math.sqrt(_dot(w, w))
            for _ in range(2):
                h = np.einsum("ij,j->i", V[:j + 1], w)
                w -= np.einsum("i,ij->j", h, V[:j + 1])
                H[:j + 1, j] += h
                norm_w = math.sqrt(_dot(w, w))
                if norm_w > _REORTHOGONALISE * before:
                    break
                before = norm_w
            H[j + 1, j] = norm_w
            if norm_w > 0.0:
                V[j + 1] = w / norm_w
            for i in range(j):  # the earlier Givens rotations on the new column
                H[i, j], H[i + 1, j] = cs[i] * H[i, j] + sn[i] * H[i + 1, j], -sn[i] * H[i, j] + cs[i] * H[i + 1, j]
            rho = math.hypot(H[j, j], H[j + 1, j])
            k = j + 1
            if rho == 0.0:  # no progress possible in this space: the true residual below decides
                break
            cs[j], sn[j] = H[j, j] / rho, H[j + 1, j] / rho
            H[j, j], H[j + 1, j] = rho, 0.0
            g[j + 1], g[j] = -sn[j] * g[j], cs[j] * g[j]
            if not math.isfinite(g[j + 1]):
                return None, total + k
            if abs(g[j + 1]) <= target or norm_w == 0.0:
                break
        total += k
        y = np.zeros(k)
        for i in range(k - 1, -1, -1):  # back-substitution with the triangular H
            y[i] = (g[i] - H[i, i + 1:k] @ y[i + 1:]) / H[i, i] if H[i, i] != 0.0 else 0.0
        x += np.einsum("i,ij->j", y, Z[:k])
        r = b - A @ x
        beta = math.sqrt(_dot(r, r))
        if not math.isfinite(beta):
            return None, total
        if beta <= target:
            return x, total
    return None, total


def ilu_gmres(M, B):
    """scipy's GMRES with an incomplete LU (drop 1e-4, restart 50) to :data:`GMRES_RTOL`; (X, iterations)."""
    from scipy.sparse import csc_matrix
    from scipy.sparse.linalg import LinearOperator, gmres, spilu

    M = csc_matrix(M)
    ilu = spilu(M, drop_tol=1e-4, fill_factor=10)
    P = LinearOperator(M.shape, ilu.solve)
    X = np.zeros_like(B, dtype=float)
    total = 0
    for m in range(B.shape[1]):
        count = [0]

        def tick(_, count=count):
            count[0] += 1

        x, info = gmres(M, B[:, m], M=P, rtol=GMRES_RTOL, atol=0.0, restart=50, maxiter=200,
                        callback=tick, callback_type="pr_norm")
        if info != 0:
            from coldplate.design.errors import SolveError

            raise SolveError(f"the field's GMRES did not converge ({count[0]} iterations)")
        X[:, m] = x
        total += count[0]
    return X, total
