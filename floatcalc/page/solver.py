"""Solves for the page: cached by the design's canonical text, run under a time budget.

A solve that takes longer than its budget keeps running in one background worker and is
cached when done; the page meanwhile says so and shows the last good results. No Streamlit
here (testable alone); no physics (it calls :func:`floatcalc.device.solve.solve_device` and
the element kinds' own ``solve``).
"""

from __future__ import annotations

import json
import threading
from collections import OrderedDict
from concurrent.futures import Future, ThreadPoolExecutor
from concurrent.futures import TimeoutError as _Timeout
from typing import Any, Callable

#: Seconds the page waits for one solve before showing the last results (the solve goes on).
SOLVE_BUDGET_S = 20.0
#: Seconds a sweep may take in all before it stops with the points it has.
SWEEP_BUDGET_S = 90.0
_MAX_ENTRIES = 256

_lock = threading.Lock()
_cache: "OrderedDict[str, Any]" = OrderedDict()
_pending: dict[str, Future] = {}
_pool = ThreadPoolExecutor(max_workers=1, thread_name_prefix="floatcalc-solve")


class SolveTimeout(Exception):
    """The solve is still running after its budget."""


def design_key(data: dict) -> str:
    """Canonical text of a design's data (the cache key)."""
    return json.dumps(data, sort_keys=True, ensure_ascii=False)


def _store(key: str, value: Any) -> None:
    with _lock:
        _cache[key] = value
        _cache.move_to_end(key)
        while len(_cache) > _MAX_ENTRIES:
            _cache.popitem(last=False)


def remember(key: str, value: Any) -> Any:
    """Store ``value`` under ``key`` and return it (for results computed outside :func:`run`)."""
    _store(key, value)
    return value


def cached(key: str):
    with _lock:
        if key in _cache:
            _cache.move_to_end(key)
            return _cache[key]
    return None


def run(key: str, fn: Callable[[], Any], budget: float | None = SOLVE_BUDGET_S):
    """``fn()`` cached under ``key``; raises :class:`SolveTimeout` after ``budget`` seconds
    (the computation goes on and is cached when it ends). Exceptions of ``fn`` propagate (and
    are not cached). ``fn`` runs on the one worker thread: it must not call :func:`run` itself
    (it would wait for itself)."""
    hit = cached(key)
    if hit is not None:
        return hit
    with _lock:
        fut = _pending.get(key)
        if fut is None:
            def task():
                try:
                    out = fn()
                    _store(key, out)
                    return out
                finally:
                    with _lock:
                        _pending.pop(key, None)

            fut = _pool.submit(task)
            _pending[key] = fut
    try:
        return fut.result(timeout=budget)
    except _Timeout:
        raise SolveTimeout(key) from None


def pending(key: str) -> bool:
    with _lock:
        return key in _pending


def design_of(data: dict, source_text: str | None = None):
    """The validated :class:`~floatcalc.design.Design` of page data (cached; InputError if invalid)."""
    from ..design import design_from_data

    key = "design:" + design_key(data)
    hit = cached(key)
    if hit is not None:
        return hit
    d = design_from_data(json.loads(json.dumps(data)), "design", source_text=source_text)
    _store(key, d)
    return d


def solve(data: dict, budget: float | None = SOLVE_BUDGET_S):
    """(design, DeviceResult) of page data: :func:`~floatcalc.device.solve.solve_device`."""
    from ..device.solve import solve_device

    d = design_of(data)
    return d, run("solve:" + design_key(data), lambda: solve_device(d, placement=False), budget)


def solve_element(kind, p: dict, liquid, budget: float | None = SOLVE_BUDGET_S):
    """The kind's public result for one element (``kind.solve(p, liquid)``), cached."""
    from ..output.tables import signature

    return run("element:" + signature(p, liquid), lambda: kind.solve(p, liquid), budget)


def clear() -> None:
    with _lock:
        _cache.clear()


__all__ = ["SOLVE_BUDGET_S", "SWEEP_BUDGET_S", "SolveTimeout", "design_key", "cached", "remember", "run", "pending",
           "design_of", "solve", "solve_element", "clear"]
