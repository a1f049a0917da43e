"""BLAS threads for the dense solves of the interaction model.

The solved meniscus (:mod:`floatcalc.core.interactions`) spends its time in many
matrix–vector products and triangular solves of a few hundred to a few thousand unknowns,
where OpenBLAS's threads cost more in synchronisation than they gain: the cold solve of a
48-leg device took 5.5 s with OpenBLAS's default two threads on a 2-core machine and 2.8 s
with one, measured side by side (load average about 2; tests/benchmarks/bench_device.py).
:func:`one_blas_thread` limits BLAS to one thread for the duration of a block with
threadpoolctl (a dependency); without it the block runs unchanged.
"""

from __future__ import annotations

import contextlib
import functools

_CONTROLLER = None


def one_blas_thread():
    """Context manager: BLAS libraries limited to one thread inside the block (nestable).

    >>> import numpy as np
    >>> with one_blas_thread():
    ...     float(np.ones((3, 3)) @ np.ones(3) @ np.ones(3))
    9.0
    """
    global _CONTROLLER
    try:
        if _CONTROLLER is None:
            from threadpoolctl import ThreadpoolController

            _CONTROLLER = ThreadpoolController()
        return _CONTROLLER.limit(limits=1, user_api="blas")
    except Exception:  # noqa: BLE001 - no threadpoolctl, or it cannot inspect this process
        return contextlib.nullcontext()


def single_blas_thread(fn):
    """Decorator: ``fn`` runs inside :func:`one_blas_thread`."""

    @functools.wraps(fn)
    def wrapped(*args, **kwargs):
        with one_blas_thread():
            return fn(*args, **kwargs)

    return wrapped
