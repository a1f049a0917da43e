"""Executors: serial, local processes and a local Dask cluster give identical results."""

from __future__ import annotations

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
    # 7000 samples: four chunks, the last one short, so chunk bookkeeping is exercised.
    return uncertainty(m, d, contamination=Contamination(0.3, 5e-3, 20e-3), samples=7000, seed=99, **kw)


def _same(a, b):
    assert np.array_equal(a.capacity_samples, b.capacity_samples)
    assert a.probability_of_sinking == b.probability_of_sinking
    assert np.array_equal(a.payload_capacity_percentiles.magnitude, b.payload_capacity_percentiles.magnitude)


def test_local_processes_equal_serial():
    s = _study(executor="serial")
    p = _study(executor="local", workers=2)
    assert p.executor == "local"
    _same(s, p)


def test_local_dask_cluster_equals_serial():
    distributed = pytest.importorskip("distributed", reason="dask.distributed is in the test extra; "
                                      "skipped only where it is not installed")
    with distributed.LocalCluster(n_workers=2, processes=False, threads_per_worker=1, dashboard_address=None,
                                  host="127.0.0.1", protocol="tcp") as cluster:
        d = _study(scheduler=cluster.scheduler_address)      # connects by address, like --scheduler
        assert d.executor == "dask"
        _same(_study(executor="serial"), d)
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
