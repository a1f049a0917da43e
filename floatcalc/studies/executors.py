"""Run the chunks of a study serially, on all local cores, or on a Dask cluster.

Every study splits its work into the same chunks whatever runs them (the chunk size is fixed
by the study, never by the number of workers), and each chunk carries its own seed, so the
results are identical on every executor. :func:`run_chunks` returns the chunk results in
chunk order.

* ``"serial"`` – in this process;
* ``"local"`` – :class:`concurrent.futures.ProcessPoolExecutor` on the local cores;
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


def run_chunks(fn: Callable[..., Any], tasks: Sequence[tuple], *, executor: str | None = "auto",
               scheduler: Any = None, workers: int | None = None, large: bool = False,
               progress: bool | None = None, label: str = "study") -> list[Any]:
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
    """
    tasks = list(tasks)
    workers = check_workers(workers)
    kind = resolve(executor, scheduler, large=large, n_chunks=len(tasks), workers=workers)
    bar = Progress(len(tasks), label=label, enabled=progress)
    if kind == "serial" or not tasks:
        out = []
        for t in tasks:
            out.append(fn(*t))
            bar.step()
        return out
    if kind == "local":
        return _run_local(fn, tasks, workers, bar)
    return _run_dask(fn, tasks, scheduler, bar)


def _run_local(fn, tasks, workers, bar) -> list[Any]:
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor, as_completed

    n = min(workers or os.cpu_count() or 1, len(tasks))
    # "spawn": safe even when the calling process runs threads (a Dask client, a web page).
    ctx = multiprocessing.get_context("spawn")
    results: list[Any] = [None] * len(tasks)
    with ProcessPoolExecutor(max_workers=n, mp_context=ctx) as pool:
        futs = {pool.submit(fn, *t): i for i, t in enumerate(tasks)}
        for f in as_completed(futs):
            results[futs[f]] = f.result()
            bar.step()
    return results


def _run_dask(fn, tasks, scheduler, bar) -> list[Any]:
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
        results: list[Any] = []
        for f in futs:  # in chunk order (each future knows its client; no default client needed)
            results.append(f.result())
            bar.step()
        return results
    finally:
        if own:
            client.close()
