"""BLAS threads for the dense solves of the interaction model.

The solved meniscus (:mod:`floatcalc.core.interactions`) and the device equilibrium spend their
time in many matrix–vector products and triangular solves of a few hundred to a few thousand
unknowns, where OpenBLAS's threads cost more in synchronisation than they gain: the cold solve
of a 48-leg device took 5.5 s with OpenBLAS's default two threads on a 2-core machine and
2.8 s with one, measured side by side (load average about 2; tests/benchmarks/bench_device.py).

On first use, :func:`single_blas_thread` limits the process's BLAS libraries to one thread, once
and for good (threadpoolctl, a dependency). It is not undone after each call: the setting is
process-wide, and toggling it from the several threads of the served page (one per session)
while another thread is inside a BLAS call is not safe. Set the environment variable
``FLOATCALC_BLAS_THREADS=keep`` to leave the BLAS thread count alone.

The second core is used instead where one large job splits into independent halves
(:func:`in_halves`: the boundary-element rows, the triangular solve for the outer map, the
products with it and the inner map's points of a large layout), each half single-threaded in
its own Python thread: the cold 48-leg layout's build went from 0.62 to 0.42 s and its limit
search from 0.30 to 0.21 s on the 2-core benchmark machine. SciPy 1.17's ``lu_solve`` is
not safe on one pivot array shared by two threads (measured here: four threads solving with one
factorisation corrupted the heap within 20 tries); with its own copy of the pivots each,
200 concurrent solves gave identical results (tests/core/test_interactions.py repeats that
check in a subprocess), so every half gets its own copy.
"""

from __future__ import annotations

import functools
import os
import threading

_DONE = False
_LOCK = threading.Lock()
_LIMITER = None   # kept: the limit holds while this object lives (it is never exited)


def _limit_once() -> None:
    global _DONE, _LIMITER
    if _DONE:
        return
    with _LOCK:
        if _DONE:
            return
        _DONE = True
        if os.environ.get("FLOATCALC_BLAS_THREADS", "").strip().lower() == "keep":
            return
        try:
            import scipy.linalg  # noqa: F401 - load SciPy's own BLAS too, so that it is limited as well
            from threadpoolctl import threadpool_limits

            _LIMITER = threadpool_limits(limits=1, user_api="blas")
        except Exception:  # noqa: BLE001 - no threadpoolctl, or it cannot inspect this process
            _LIMITER = None


def single_blas_thread(fn):
    """Decorator: BLAS limited to one thread (once, see the module docstring) before ``fn`` runs.

    >>> import numpy as np
    >>> @single_blas_thread
    ... def f():
    ...     return float(np.ones((3, 3)) @ np.ones(3) @ np.ones(3))
    >>> f()
    9.0
    """

    @functools.wraps(fn)
    def wrapped(*args, **kwargs):
        _limit_once()
        return fn(*args, **kwargs)

    return wrapped


# ---------------------------------------------------------------------------------------------
# Two halves side by side

_POOL = None
_POOL_LOCK = threading.Lock()


def _forget_pool() -> None:
    """In a forked child the worker thread does not exist: a new pool is made on first use
    (a copy of the parent's would queue the half forever)."""
    global _POOL, _POOL_LOCK
    _POOL = None
    _POOL_LOCK = threading.Lock()   # (it may have been held by another thread at the fork)


if hasattr(os, "register_at_fork"):
    os.register_at_fork(after_in_child=_forget_pool)


def _cores() -> int:
    try:
        return len(os.sched_getaffinity(0))
    except (AttributeError, OSError):   # not on Linux
        return os.cpu_count() or 1


def in_halves(fn, n: int, *, at_least: int) -> list:
    """``[fn(0, h), fn(h, n)]`` with h = n // 2, the second half in a worker thread while the
    calling thread does the first, when the work is large (n ≥ ``at_least``) and the process
    may use two cores or more; else ``[fn(0, n)]`` in the calling thread.

    For independent halves of one large NumPy/LAPACK job (rows of the boundary-element
    matrices, columns of a triangular solve): NumPy's loops and SciPy's LAPACK calls release
    the GIL, so the halves run on two cores (1.7–2x on the 2-core benchmark machine). The
    halves must write disjoint outputs. One worker thread serves the process (a served page's
    sessions queue for it; a half never waits for another). ``FLOATCALC_THREADS=1`` keeps
    everything in the calling thread.

    >>> in_halves(lambda a, b: sum(range(a, b)), 10, at_least=4) in ([45], [10, 35])
    True
    """
    global _POOL
    if n < at_least or n < 2 or _cores() < 2 or os.environ.get("FLOATCALC_THREADS", "").strip() == "1":
        return [fn(0, n)]
    if _POOL is None:
        with _POOL_LOCK:
            if _POOL is None:
                from concurrent.futures import ThreadPoolExecutor

                _POOL = ThreadPoolExecutor(max_workers=1, thread_name_prefix="floatcalc-half")
    h = n // 2
    second = _POOL.submit(fn, h, n)
    try:
        first = fn(0, h)
    except BaseException:
        from concurrent.futures import wait

        wait([second])   # never leave the worker writing into the caller's arrays
        raise
    return [first, second.result()]
