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
