"""Executors: serial, local processes and a local Dask cluster give identical results."""

from __future__ import annotations

import functools
import io
import math

import numpy as np
import pytest

from floatcalc.errors import InputError
from floatcalc.studies.executors import Progress, resolve, run_chunks
from floatcalc.studies.models import rod_model
from floatcalc.studies.sweep import sweep
from floatcalc.studies.uncertainty import Contamination, parse_distribution, uncertainty


def _study(**kw):
    m = rod_model(count=4.0, payload_mass=2.2e-3)
    d = {"contact_angle": parse_distribution("normal:150deg:8deg", "angle", "contact_angle"),
         "radius": parse_distribution("tol:0.2mm:0.02mm", "length", "radius")}
    # 7000 samples: sixteen chunks of 438 (executors.chunk_size), the last one short, so chunk
    # bookkeeping is exercised.
    return uncertainty(m, d, contamination=Contamination(0.3, 5e-3, 20e-3), samples=7000, seed=99, **kw)


def _same(a, b):
    assert np.array_equal(a.capacity_samples, b.capacity_samples)
    assert a.probability_of_sinking == b.probability_of_sinking
    assert np.array_equal(a.payload_capacity_percentiles.magnitude, b.payload_capacity_percentiles.magnitude)


def test_local_processes_equal_serial(monkeypatch):
    from floatcalc.studies import executors

    s = _study(executor="serial")
    p = _study(executor="local", workers=2)   # small: the local executor keeps it in-process
    assert p.executor == "local"
    _same(s, p)
    # force the pool path (and groups of several chunks) for the same study
    monkeypatch.setattr(executors, "PARALLEL_MIN_S", 0.0)
    monkeypatch.setattr(executors, "TASK_MIN_S", 1e-9)
    _same(s, _study(executor="local", workers=2))
    monkeypatch.setattr(executors, "TASK_MIN_S", 10.0)   # groups as large as allowed
    _same(s, _study(executor="local", workers=2))


def _pid_after(x):
    import os
    import time

    time.sleep(0.02)
    return x, os.getpid()


def test_local_pool_is_persistent_and_used(monkeypatch):
    import os

    from floatcalc.studies import executors

    monkeypatch.setattr(executors, "PARALLEL_MIN_S", 0.0)
    monkeypatch.setattr(executors, "TASK_MIN_S", 1e-9)
    executors.shutdown_pool()
    a = run_chunks(_pid_after, [(k,) for k in range(12)], executor="local", workers=2)
    assert [x for x, _ in a] == list(range(12))                 # task order kept
    assert any(pid != os.getpid() for _, pid in a)              # worker processes did run tasks
    pool = executors._POOL["pool"]
    assert pool is not None
    b = run_chunks(_pid_after, [(k,) for k in range(12)], executor="local", workers=2)
    assert executors._POOL["pool"] is pool                      # started once, reused
    workers = set(pool._processes)                              # the pool's own processes
    assert {p for _, p in a + b} - {os.getpid()} <= workers
    executors.shutdown_pool()
    assert executors._POOL["pool"] is None


def test_small_local_runs_stay_in_process():
    import os

    from floatcalc.studies import executors

    executors.shutdown_pool()
    out = run_chunks(_pid_after, [(k,) for k in range(3)], executor="local", workers=2)  # ~0.06 s of work
    assert {p for _, p in out} == {os.getpid()} and executors._POOL["pool"] is None


def test_chunk_size_depends_on_study_size_only():
    from floatcalc.studies.executors import chunk_size

    assert chunk_size(1000, 2000, 250) == 250       # several chunks even for small studies
    assert chunk_size(10_000, 2000, 250) == 625
    assert chunk_size(10**7, 2000, 250) == 2000


@pytest.mark.slow
def test_dask_process_cluster_equals_serial():
    """Dask workers in separate processes (pickled tasks, as on a real cluster); ~2 s."""
    distributed = pytest.importorskip("distributed", reason="dask.distributed is in the test extra; "
                                      "skipped only where it is not installed")
    with distributed.LocalCluster(n_workers=2, processes=True, threads_per_worker=1, dashboard_address=None,
                                  host="127.0.0.1", protocol="tcp") as cluster:
        d = _study(scheduler=cluster.scheduler_address)
        assert d.executor == "dask"
        _same(_study(executor="serial"), d)


@functools.cache
def _device_study():
    """An invented rig of three ball feet and a rod, far apart (no shared menisci to solve)."""
    from floatcalc.design import design_from_data
    from floatcalc.studies.device_model import device_model

    legs = [{"kind": "ball", "position": [f"{9 * math.cos(a):.6f} mm", f"{9 * math.sin(a):.6f} mm"],
             "radius": "1 mm", "material": "nylon", "coating": {"advancing": "150 deg"}} for a in (0.0, 2.1, 4.2)]
    legs.append({"kind": "rod", "position": ["-30 mm", "0 mm"], "heading": "90 deg", "radius": "0.2 mm",
                 "length": "20 mm", "material": "steel", "coating": {"advancing": "150 deg"}})
    design = design_from_data({"schema_version": 2, "description": "Invented test rig", "invented": True,
                               "liquid": {"name": "water"},
                               "body": {"mass": "0.1 g", "centre_of_mass": ["-5 mm", "0 mm"]}, "elements": legs})
    dists = {"contact_angle_shift": parse_distribution("normal:-3deg:3deg", "angle", "contact_angle_shift"),
             "radius_factor": parse_distribution("tol:1:0.03", "ratio", "radius_factor")}
    return device_model(design), dists


@pytest.mark.slow
def test_local_processes_equal_serial_for_a_batched_device():
    """~5 s: two device studies and a pool of worker processes."""
    from floatcalc.studies import executors

    m, dists = _device_study()
    a = uncertainty(m, dists, samples=600, seed=4, executor="serial")
    executors.local_pool(2)   # a warm pool: its workers start while the first chunk is timed
    b = uncertainty(m, dists, samples=600, seed=4, executor="local", workers=2)
    executors.shutdown_pool()
    assert b.executor == "local"
    _same(a, b)


def test_local_dask_cluster_equals_serial():
    distributed = pytest.importorskip("distributed", reason="dask.distributed is in the test extra; "
                                      "skipped only where it is not installed")
    with distributed.LocalCluster(n_workers=2, processes=False, threads_per_worker=1, dashboard_address=None,
                                  host="127.0.0.1", protocol="tcp") as cluster:
        d = _study(scheduler=cluster.scheduler_address)      # connects by address, like --scheduler
        assert d.executor == "dask"
        _same(_study(executor="serial"), d)
        # a batched device model (ball feet and a rod: floatcalc.studies.device_batch),
        # identical seeded samples
        m, dists = _device_study()
        assert m.vectorised
        a = uncertainty(m, dists, samples=300, seed=5, executor="serial")
        b = uncertainty(m, dists, samples=300, seed=5, scheduler=cluster.scheduler_address)
        assert b.executor == "dask"
        _same(a, b)
        # a sweep too, through a client object
        with distributed.Client(cluster) as client:
            m = rod_model(count=3.0)
            a = sweep(m, ["radius=0.05mm:0.5mm:30", "length=10mm:60mm:20"], executor="serial")
            b = sweep(m, ["radius=0.05mm:0.5mm:30", "length=10mm:60mm:20"], scheduler=client)
            for k in a.outputs:
                assert np.array_equal(a.outputs[k], b.outputs[k])


def test_order_kept_and_resolution_rules():
    assert run_chunks(math.pow, [(2, k) for k in range(6)], executor="local", workers=2) == [2.0**k for k in range(6)]
    assert resolve("auto", large=False, n_chunks=10) == "serial"
    assert resolve("auto", large=True, n_chunks=10, workers=2) == "local"
    assert resolve("auto", "tcp://x:1") == "dask"
    for bad in ("cloud", "dask"):
        with pytest.raises(InputError):
            resolve(bad)
    with pytest.raises(InputError):
        run_chunks(math.pow, [(2, 1)], scheduler="not-an-address")
    with pytest.raises(InputError):
        run_chunks(math.pow, [(2, 1)], workers=0)


def test_progress_bar_only_when_asked():
    buf = io.StringIO()
    bar = Progress(4, label="x", enabled=True, stream=buf)
    for _ in range(4):
        bar.step()
    assert "4/4" in buf.getvalue() and buf.getvalue().endswith("\n")
    quiet = io.StringIO()
    Progress(4, enabled=None, stream=quiet).step()   # not a terminal: silent
    assert quiet.getvalue() == ""


def test_side_work_runs_once_on_every_executor(monkeypatch):
    """run_chunks(side=...) runs the caller's own work exactly once, in this process, whether
    the tasks run here or on a pool (and the results are those of the tasks)."""
    import os

    from floatcalc.studies import executors

    calls = []
    side = lambda: calls.append(os.getpid())  # noqa: E731
    tasks = [(k,) for k in range(8)]
    assert [x for x, _ in run_chunks(_pid_after, tasks, executor="serial", side=side)] == list(range(8))
    monkeypatch.setattr(executors, "PARALLEL_MIN_S", 0.0)
    monkeypatch.setattr(executors, "TASK_MIN_S", 1e-9)
    executors.shutdown_pool()
    out = run_chunks(_pid_after, tasks, executor="local", workers=2, side=side)      # cold pool
    out += run_chunks(_pid_after, tasks, executor="local", workers=2, side=side)     # warm pool
    executors.shutdown_pool()
    assert [x for x, _ in out] == list(range(8)) * 2
    assert calls == [os.getpid()] * 3
