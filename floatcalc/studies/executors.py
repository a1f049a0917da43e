"""Run the chunks of a study serially, on all local cores, or on a Dask cluster.

Every study splits its work into the same chunks whatever runs them (the chunk size is fixed
by the study, never by the number of workers), and each chunk carries its own seed, so the
results are identical on every executor. :func:`run_chunks` returns the chunk results in
chunk order.

* ``"serial"`` – in this process;
* ``"local"`` – a persistent :class:`concurrent.futures.ProcessPoolExecutor` on the local
  cores, started once per process (``fork`` on Linux when no other thread runs, else
  ``forkserver``), fed with groups of chunks that each run for ≥ ~0.2 s; once it runs, its
  workers start at once while the calling process times the first chunk; a run too small to
  gain from processes otherwise finishes in the calling process (see :func:`_run_local`);
* ``"dask"`` – an existing ``dask.distributed`` scheduler given by its address
  (``tcp://host:8786``), or a ``Client`` object. Dask is an optional dependency (the
  ``cluster`` extra), imported only here and only when asked for;
* ``"auto"`` – ``"local"`` when the caller marks the run as large and there is more than one
  chunk and core, else ``"serial"``.

A tiny progress bar on stderr shows chunks done when stderr is a terminal, or when asked.

>>> run_chunks(pow, [(2, 3), (3, 2)], executor="serial")
[8, 9]
"""

from __future__ import annotations

import math
import os
import sys
import time
from typing import Any, Callable, Sequence

from ..errors import input_error

EXECUTORS = ("auto", "serial", "local", "dask")


class Progress:
    """A one-line stderr progress bar: ``label [#####.....] 12/40 chunks 3.1 s``."""

    def __init__(self, total: int, label: str = "", enabled: bool | None = None, stream=None, width: int = 30):
        self.stream = sys.stderr if stream is None else stream
        if enabled is None:
            enabled = bool(getattr(self.stream, "isatty", lambda: False)())
        self.enabled = enabled and total > 0
        self.total, self.label, self.width = total, label, width
        self.done = 0
        self.t0 = time.perf_counter()

    def step(self, k: int = 1) -> None:
        self.done += k
        if not self.enabled:
            return
        frac = self.done / self.total
        bar = "#" * int(round(frac * self.width))
        self.stream.write(f"\r{self.label} [{bar:<{self.width}}] {self.done}/{self.total} chunks "
                          f"{time.perf_counter() - self.t0:.1f} s")
        if self.done >= self.total:
            self.stream.write("\n")
        self.stream.flush()


def resolve(executor: str | None, scheduler: Any = None, *, large: bool = False, n_chunks: int = 1,
            workers: int | None = None) -> str:
    """The executor that will run: checks the name and applies the ``"auto"`` rule."""
    ex = "auto" if executor is None else str(executor).lower()
    if scheduler is not None:
        if ex not in ("auto", "dask"):
            raise input_error("executor", "a scheduler address needs executor 'dask' (or 'auto')", repr(executor))
        return "dask"
    if ex not in EXECUTORS:
        raise input_error("executor", f"must be one of {', '.join(EXECUTORS)}", repr(executor))
    if ex == "dask":
        raise input_error("scheduler", "executor 'dask' needs a scheduler address such as tcp://127.0.0.1:8786", "none")
    if ex == "auto":
        cores = workers if workers is not None else (os.cpu_count() or 1)
        return "local" if (large and n_chunks > 1 and cores > 1) else "serial"
    return ex


def check_workers(workers: Any) -> int | None:
    """Number of local worker processes (1–256) or None for all cores."""
    if workers is None:
        return None
    try:
        w = int(str(workers))
    except ValueError:
        raise input_error("workers", "must be a whole number from 1 to 256", repr(workers)) from None
    if not 1 <= w <= 256:
        raise input_error("workers", "must be a whole number from 1 to 256", repr(workers))
    return w


def chunk_size(total: int, largest: int, smallest: int, parts: int = 16) -> int:
    """Items per chunk for a study of ``total`` items: about ``total / parts``, kept within
    [``smallest``, ``largest``]. Depends on the study size only (never on the executor or the
    machine), so seeded chunks, and therefore results, are the same everywhere; small studies
    still get several chunks to share among workers.

    >>> chunk_size(1000, 2000, 250), chunk_size(10_000, 2000, 250), chunk_size(10**6, 2000, 250)
    (250, 625, 2000)
    """
    return int(min(largest, max(smallest, math.ceil(total / parts))))


def run_chunks(fn: Callable[..., Any], tasks: Sequence[tuple], *, executor: str | None = "auto",
               scheduler: Any = None, workers: int | None = None, large: bool = False,
               progress: bool | None = None, label: str = "study",
               side: Callable[[], Any] | None = None) -> list[Any]:
    """Call ``fn(*task)`` for every task and return the results in task order.

    Parameters
    ----------
    fn : callable
        Must be picklable (a module-level function or a picklable object) for the ``local``
        and ``dask`` executors.
    tasks : sequence of argument tuples
    executor : {"auto", "serial", "local", "dask"}
    scheduler : str or dask.distributed.Client, optional
        Address of a running Dask scheduler (e.g. ``tcp://10.0.0.5:8786``) or a client.
    workers : int, optional
        Local processes (default: all cores).
    large : bool
        Hint for ``"auto"``: the run is big enough to be worth starting processes.
    progress : bool, optional
        Show the stderr bar; default only when stderr is a terminal.
    side : callable, optional
        Other work of the caller (no arguments; its result is dropped), called once in this
        process: while worker processes or a cluster run the tasks, else after them, so that
        the caller's own share of a study (its validity warnings, say) does not wait for them.
    """
    tasks = list(tasks)
    workers = check_workers(workers)
    kind = resolve(executor, scheduler, large=large, n_chunks=len(tasks), workers=workers)
    bar = Progress(len(tasks), label=label, enabled=progress)
    once = _Once(side)
    if kind == "serial" or not tasks:
        out = []
        for t in tasks:
            out.append(fn(*t))
            bar.step()
        once()
        return out
    if kind == "local":
        out = _run_local(fn, tasks, workers, bar, once)
    else:
        out = _run_dask(fn, tasks, scheduler, bar, once)
    once()
    return out


class _Once:
    """Call ``side`` at most once (see :func:`run_chunks`)."""

    def __init__(self, side):
        self.side = side

    def __call__(self):
        side, self.side = self.side, None
        if side is not None:
            side()


#: A local run whose estimated remaining work (first task's time × tasks left) is below this
#: many seconds finishes in the calling process: handing it to workers would cost more than it saves.
PARALLEL_MIN_S = 0.25
#: Tasks are grouped so that each submission to a worker runs for at least about this long.
TASK_MIN_S = 0.2

_POOL: dict[str, Any] = {"pool": None, "key": None}


def start_method() -> str:
    """Start method for local worker processes.

    ``"fork"`` where the platform has it and the calling process runs no other thread (cheap:
    a worker starts as a copy of this process, imports and caches included); else
    ``"forkserver"`` (safe when threads run, e.g. a Dask client or a web page) or ``"spawn"``.
    """
    import multiprocessing
    import threading

    methods = multiprocessing.get_all_start_methods()
    if "fork" in methods and threading.active_count() == 1:
        return "fork"
    return "forkserver" if "forkserver" in methods else "spawn"


def local_pool(workers: int):
    """The persistent local process pool with ``workers`` processes (started once, reused).

    A pool of another size, or one that broke, is shut down and replaced. See
    :func:`shutdown_pool`.
    """
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    pool = _POOL["pool"]
    if pool is not None and (_POOL["key"] != workers or getattr(pool, "_broken", False)):
        shutdown_pool()
        pool = None
    if pool is None:
        method = start_method()
        ctx = multiprocessing.get_context(method)
        if method == "forkserver":
            ctx.set_forkserver_preload(["numpy", "floatcalc.studies.uncertainty", "floatcalc.studies.sweep"])
        pool = ProcessPoolExecutor(max_workers=workers, mp_context=ctx)
        _POOL["pool"], _POOL["key"] = pool, workers
    return pool


def shutdown_pool() -> None:
    """Stop the persistent local pool, if one runs (it is also stopped at interpreter exit)."""
    pool = _POOL["pool"]
    _POOL["pool"] = _POOL["key"] = None
    if pool is not None:
        pool.shutdown(wait=True, cancel_futures=True)


def _run_group(fn, group):
    return [fn(*t) for t in group]


def _warm_pool(n: int):
    """The persistent pool if it already runs with ``n`` workers (else None: none is started)."""
    pool = _POOL["pool"]
    if pool is None or _POOL["key"] != n or getattr(pool, "_broken", False):
        return None
    return pool


def _run_local(fn, tasks, workers, bar, side=lambda: None) -> list[Any]:
    """Tasks on the persistent pool, in groups of about :data:`TASK_MIN_S` seconds each.

    The first task runs here and is timed. If the pool already runs, each worker starts at
    once on one of the next tasks meanwhile (so that nothing waits for the timing; their
    results are used whatever the timing says). If the rest would then take less than
    :data:`PARALLEL_MIN_S` seconds it also runs here (starting and feeding processes would
    cost more; a cold pool is then not started). Otherwise the rest is cut into consecutive
    groups, each at least :data:`TASK_MIN_S` long by that estimate and at least two per worker
    while there are enough tasks, so that transfer costs are paid once per group, not per
    task. One group is in flight per worker; while they run, this process does the caller's
    ``side`` work (:func:`run_chunks`) and then takes groups from the back of the queue
    itself. Grouping never changes a result: each task keeps its own
    arguments (and seed), and results come back in task order. If the pool breaks (a worker
    killed), the groups not yet done run here.
    """
    from collections import deque
    from concurrent.futures import FIRST_COMPLETED, wait
    from concurrent.futures.process import BrokenProcessPool

    n = min(workers or os.cpu_count() or 1, len(tasks))
    warm = _warm_pool(n) if n > 1 and len(tasks) > 1 else None
    early: list[list[tuple]] = []
    inflight: dict[Any, int] = {}
    if warm is not None:
        try:
            for i in range(1, min(n, len(tasks) - 1) + 1):
                inflight[warm.submit(_run_group, fn, [tasks[i]])] = len(early)
                early.append([tasks[i]])
        except (BrokenProcessPool, RuntimeError):
            shutdown_pool()
            inflight.clear()
            early = []
    t = time.perf_counter()
    first = fn(*tasks[0])
    t_first = time.perf_counter() - t
    bar.step()
    rest = tasks[1 + len(early):]
    if n <= 1 or not rest or t_first * len(rest) < PARALLEL_MIN_S:
        groups = early + [[task] for task in rest]
        pending = deque()
        local_only = range(len(early), len(groups))
    else:
        per = max(1, math.ceil(TASK_MIN_S / max(t_first, 1e-9)))
        per = min(per, max(1, len(rest) // (2 * n)))  # keep every worker busy to the end
        groups = early + [rest[i:i + per] for i in range(0, len(rest), per)]
        pending = deque(range(len(early), len(groups)))
        local_only = range(0)
    done: list[Any] = [None] * len(groups)
    try:
        for i in local_only:
            done[i] = _run_group(fn, groups[i])
            bar.step(len(groups[i]))
        pool = local_pool(n) if pending else None
        while pending or inflight:
            while pending and len(inflight) < n:
                i = pending.popleft()
                inflight[pool.submit(_run_group, fn, groups[i])] = i
            side()   # the caller's own work while the workers run (once)
            if pending:  # help: run the last waiting group here
                i = pending.pop()
                done[i] = _run_group(fn, groups[i])
                bar.step(len(groups[i]))
                finished = [f for f in inflight if f.done()]
            else:
                finished, _ = wait(inflight, return_when=FIRST_COMPLETED)
            for f in finished:
                i = inflight.pop(f)
                done[i] = f.result()
                bar.step(len(groups[i]))
    except BrokenProcessPool:
        shutdown_pool()
        for i, g in enumerate(groups):
            if done[i] is None:
                done[i] = _run_group(fn, g)
                bar.step(len(g))
    return [first] + [r for grp in done for r in grp]


def _run_dask(fn, tasks, scheduler, bar, side=lambda: None) -> list[Any]:
    try:
        from dask.distributed import Client
    except ImportError:
        raise input_error("scheduler", "needs Dask: pip install 'floatcalc[cluster]'", repr(scheduler)) from None
    own = False
    if isinstance(scheduler, str):
        if "://" not in scheduler:
            raise input_error("scheduler", "must be an address such as tcp://127.0.0.1:8786", repr(scheduler))
        try:
            client = Client(scheduler, timeout="10s", set_as_default=False)
        except (OSError, TimeoutError) as exc:
            raise input_error("scheduler", f"could not connect ({type(exc).__name__})", repr(scheduler)) from None
        own = True
    else:
        client = scheduler
    try:
        futs = [client.submit(fn, *t, pure=False) for t in tasks]
        side()   # the caller's own work while the cluster runs (once)
        results: list[Any] = []
        for f in futs:  # in chunk order (each future knows its client; no default client needed)
            results.append(f.result())
            bar.step()
        return results
    finally:
        if own:
            client.close()
