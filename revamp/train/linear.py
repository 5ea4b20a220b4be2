"""The linear step of the train solve: with every exchanger's outlets a linear map of its two inlets, the whole
network's port temperatures follow from one linear system per case (see :mod:`revamp.train.solver`).

:func:`_linear_solve` eliminates the outlets and solves for the inlets (the reduced system);
:func:`_linear_solve_dense` keeps every port (the reference form, which gives the same solution). Internal.
"""
from __future__ import annotations

import numpy as np

from .outcome import _SIDES


def _linear_solve(plan, x, coefs, idx):
    """One linear solve of the network: exchanger outlets ``J @ inlets + c``, routes and remixes at ``x``.

    Every inlet is a route expression of outlets (or a fixed supply), ``in = L @ out + d``, and every outlet the
    exchanger's map of its own two inlets, so the outlets are eliminated: ``(I - L J) in = d + L c``, a system of the
    2·(exchangers) inlets per case (a quarter of the entries and an eighth of the factorization work of the dense
    system of all ports, :func:`_linear_solve_dense`, which gives the same solution), then ``out = J in + c``. From
    :data:`_SPARSE_CASES` cases on, a network without splits builds the sparse entries straight from its feeds
    (:func:`_linear_solve_fed`).
    """
    n, nc = plan.n, len(idx)
    m, nx = n // 2, n // 4  # inlets (and outlets): port p = 4i + 2s (+1 for the outlet) is unknown 2i + s
    fed = plan.fed()
    if fed is not None and nc >= _SPARSE_CASES:
        return _linear_solve_fed(plan, coefs, idx, fed)
    Jb = np.zeros((nc, nx, 2, 2))  # J is block diagonal: exchanger i's 2x2 block maps its inlets to its outlets
    cv = np.zeros((nc, m))
    for tag, (J, c) in coefs.items():
        i = plan.index[tag]
        for k in range(2):
            Jb[:, i, k, 0] = J[k][0]
            Jb[:, i, k, 1] = J[k][1]
            cv[:, 2 * i + k] = c[k]
    # the rows of A = I - L J and b = d + L c from the route expressions: L is sparse (an inlet is fed by one
    # outlet, or by the remix of a split's branch ends), each term adds the feeding exchanger's row of J
    A = np.zeros((nc, m, m))
    A[:, np.arange(m), np.arange(m)] = 1.0
    b = np.zeros((nc, m))
    if fed is not None:  # no splits: each inlet is fed by one outlet or a fixed temperature, the same every pass
        rows, e, k, const_rows, consts = fed
        A[:, rows, 2 * e] = -Jb[:, e, k, 0]  # (row, column) pairs are distinct: an inlet has one feed
        A[:, rows, 2 * e + 1] = -Jb[:, e, k, 1]
        b[:, rows] = cv[:, 2 * e + k]
        b[:, const_rows] = consts[idx]
    else:
        links, _, _, _ = plan.walk(x, idx=idx)
        for port, expr in links:
            row = port // 2  # an inlet port (even) -> its unknown
            b[:, row] += expr.const
            for i, c in expr.coefs.items():  # outlet ports (odd) only: a route runs from outlets to inlets
                u = i // 2  # the outlet's unknown 2e + k: row k of exchanger e's block
                e, k = divmod(u, 2)
                A[:, row, 2 * e] -= c * Jb[:, e, k, 0]
                A[:, row, 2 * e + 1] -= c * Jb[:, e, k, 1]
                b[:, row] += c * cv[:, u]
    t_in, bad = _solve_cases(A, b)
    with np.errstate(all="ignore"):
        t_out = np.einsum("cikj,cij->cik", Jb, t_in.reshape(nc, nx, 2)).reshape(nc, m) + cv
    sol = np.empty((nc, n))
    sol[:, 0::2], sol[:, 1::2] = t_in, t_out
    return sol, bad | ~np.all(np.isfinite(sol), axis=1)


def _linear_solve_fed(plan, coefs, idx, fed):
    """:func:`_linear_solve` for many cases of a network without splits: the entries of ``I - L J`` and ``d + L c``
    built straight from the feeds (each inlet row: its feeding outlet's row of ``J``), then the sparse elimination
    of :func:`_sparse_solve` on them (no dense matrix, except for the few cases it declines)."""
    nc, m = idx.size, plan.n // 2
    rows, es, ks, const_rows, consts = fed
    maps = [None] * (m // 2)
    for tag, coef in coefs.items():
        maps[plan.index[tag]] = coef
    ones = np.ones(nc)
    a = {(r, r): ones for r in range(m)}
    rhs = [np.zeros(nc)] * m

    def entry(v):
        if type(v) is np.ndarray and v.shape == (nc,) and v.dtype == np.float64 and v.flags.c_contiguous:
            return v
        return np.ascontiguousarray(np.broadcast_to(np.asarray(v, dtype=float), (nc,)))

    total = np.zeros(nc)  # the sum of every entry: not finite where any entry is not (NaN and inf propagate)
    for row, e, k in zip(rows.tolist(), es.tolist(), ks.tolist()):
        J, c = maps[e]
        for col, v in ((2 * e, J[k][0]), (2 * e + 1, J[k][1])):
            v = entry(v)
            total += v
            a[(row, col)] = a[(row, col)] - v if (row, col) in a else -v
        rhs[row] = entry(c[k])
        total += rhs[row]
    for j, row in enumerate(const_rows.tolist()):
        rhs[row] = np.ascontiguousarray(consts[idx, j])
        total += rhs[row]
    bad = ~np.isfinite(total)
    pattern = np.zeros((m, m), dtype=bool)
    for i, j in a:
        pattern[i, j] = True
    prog = _program(pattern)  # computed once per structure
    dense_a, dense_b = dict(a), list(rhs)  # the entries as built (elimination replaces, never changes, arrays)
    t_in, weak = _eliminate(prog, a, rhs, nc)
    weak &= ~bad
    if weak.any():
        A = np.zeros((int(np.count_nonzero(weak)), m, m))
        for (i, j), v in dense_a.items():
            A[:, i, j] = v[weak]
        t_in[weak] = _dense_cases(A, np.stack([v[weak] for v in dense_b], axis=1))
    t_in[bad] = np.nan
    sol = np.empty((nc, plan.n))
    sol[:, 0::2] = t_in
    with np.errstate(all="ignore"):
        for e, (J, c) in enumerate(maps):
            for k in range(2):
                sol[:, 4 * e + 2 * k + 1] = J[k][0] * t_in[:, 2 * e] + J[k][1] * t_in[:, 2 * e + 1] + c[k]
    return sol, bad | ~np.all(np.isfinite(sol), axis=1)


def _linear_solve_dense(plan, x, coefs, idx):
    """:func:`_linear_solve` on the dense system of all ports (outlet rows kept): the reference form."""
    n, nc = plan.n, len(idx)
    A = np.zeros((nc, n, n))
    b = np.zeros((nc, n))
    for tag, (J, c) in coefs.items():
        ins = (plan.port(tag, "shell"), plan.port(tag, "tube"))
        for k, side in enumerate(_SIDES):
            row = plan.port(tag, side, out=True)
            A[:, row, row] = 1.0
            A[:, row, ins[0]] -= J[k][0]
            A[:, row, ins[1]] -= J[k][1]
            b[:, row] += c[k]
    links, _, _, _ = plan.walk(x, idx=idx)
    for port, expr in links:
        A[:, port, port] += 1.0
        for i, c in expr.coefs.items():
            A[:, port, i] -= c
        b[:, port] += expr.const
    sol, bad = _solve_cases(A, b)
    return sol, bad | ~np.all(np.isfinite(sol), axis=1)


_SPARSE_CASES = 64  # from this many cases a network's sparse elimination beats one dense LAPACK solve per case
_PIVOT_MIN = 1e-9  # a pivot smaller than this (relative to its row) sends the case to the dense solve
_PROGRAMS: dict = {}  # structure of A (bytes) -> its elimination program (see _program)


def _program(pattern):
    """The elimination program of a sparse structure (``(m, m)`` bool, the diagonal set): the pivot order (greedy
    Markowitz: each step the pivot whose row and column counts give the fewest new entries, fill-in counted), and per
    pivot the rows it eliminates from and the columns of its row after it. A network's system has a unit diagonal and
    one feeding outlet's two entries per inlet row, so its fill-in is small (the 10-exchanger interlinked train of the
    benchmark: 26 row operations on 20 unknowns)."""
    key = (pattern.shape[0], pattern.tobytes())
    prog = _PROGRAMS.get(key)
    if prog is None:
        P = pattern.copy()
        remaining = list(range(P.shape[0]))
        prog = []
        while remaining:
            k = min(remaining, key=lambda r: (int(np.count_nonzero(P[r, remaining])) - 1)
                    * (int(np.count_nonzero(P[remaining, r])) - 1))
            remaining.remove(k)
            rows = [i for i in remaining if P[i, k]]
            cols = [j for j in remaining if P[k, j]]
            for i in rows:
                P[i, cols] = True
            prog.append((k, rows, cols))
        if len(_PROGRAMS) > 64:
            _PROGRAMS.clear()
        _PROGRAMS[key] = prog
    return prog


def _sparse_solve(A, b):
    """``A x = b`` for every case by Gaussian elimination on the structure shared by all cases (see :func:`_program`),
    each step one numpy operation over the cases, no pivoting. Returns ``x`` and the cases to solve densely instead
    (a pivot below :data:`_PIVOT_MIN` of its row's largest entry, or a result that is not finite).

    A network's matrix ``I - L J`` has a unit diagonal and, for effectiveness-NTU maps, non-negative feeds whose
    row sums are at most one (an M-matrix, for which elimination without pivoting is stable); the Newton maps stay
    close to that. Agrees with LAPACK's solve to rounding (tested on the benchmark's train and the test trains)."""
    nc, m = b.shape
    pattern = np.any(A != 0.0, axis=0)
    pattern[np.arange(m), np.arange(m)] = True
    prog = _program(pattern)
    a = {}  # (row, col) -> the entry over the cases (contiguous)
    for i, j in zip(*np.nonzero(pattern)):
        a[(int(i), int(j))] = np.ascontiguousarray(A[:, i, j])
    rhs = [np.ascontiguousarray(b[:, i]) for i in range(m)]
    x, weak = _eliminate(prog, a, rhs, nc)
    return x, weak | ~np.all(np.isfinite(x), axis=1)


def _eliminate(prog, a, rhs, nc):
    """The elimination of :func:`_sparse_solve` on the entries ``a`` ((row, col) -> values over the cases, changed
    here) and right-hand sides ``rhs`` (a list of the rows' values): the solution ``(nc, m)`` and the cases whose
    pivot was weak."""
    m = len(rhs)
    weak = np.zeros(nc, dtype=bool)
    with np.errstate(all="ignore"):
        for k, rows, cols in prog:
            piv = a[(k, k)]
            scale = np.abs(piv)
            for j in cols:
                scale = np.maximum(scale, np.abs(a[(k, j)]))
            weak |= ~(np.abs(piv) >= _PIVOT_MIN * scale)
            for i in rows:
                f = a.pop((i, k)) / piv
                for j in cols:
                    e = a.get((i, j))
                    a[(i, j)] = -f * a[(k, j)] if e is None else e - f * a[(k, j)]
                rhs[i] = rhs[i] - f * rhs[k]
        x = [None] * m
        for k, rows, cols in reversed(prog):
            v = rhs[k]
            for j in cols:
                v = v - a[(k, j)] * x[j]
            x[k] = v / a[(k, k)]
    return np.stack(x, axis=1), weak


def _solve_cases(A, b):
    """``A x = b`` for every case (stacked ``(nc, m, m)`` and ``(nc, m)``) and the cases whose system is not finite
    (their ``x`` is NaN; ``A`` and ``b`` are changed there). A singular case is solved alone: NaN where singular.
    Many cases are solved by the sparse elimination (:func:`_sparse_solve`), the few it declines by LAPACK."""
    nc, m = b.shape
    bad = ~np.all(np.isfinite(A), axis=(1, 2)) | ~np.all(np.isfinite(b), axis=1)
    A[bad] = np.eye(m)
    b[bad] = np.nan
    if nc >= _SPARSE_CASES:
        x, dense = _sparse_solve(A, b)
        dense &= ~bad
        if dense.any():
            x[dense] = _dense_cases(A[dense], b[dense])
        x[bad] = np.nan
        return x, bad
    return _dense_cases(A, b), bad


def _dense_cases(A, b):
    """``A x = b`` by LAPACK for every case; a singular case is solved alone (NaN where singular)."""
    nc, m = b.shape
    with np.errstate(all="ignore"):
        try:
            return np.linalg.solve(A, b[..., None])[..., 0]
        except np.linalg.LinAlgError:  # a singular case: solve one by one, NaN where singular
            x = np.full((nc, m), np.nan)
            for i in range(nc):
                try:
                    x[i] = np.linalg.solve(A[i], b[i])
                except np.linalg.LinAlgError:
                    pass
            return x
