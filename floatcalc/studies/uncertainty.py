"""Monte Carlo uncertainty of a design: probability of sinking and payload-capacity percentiles.

Inputs of a study model (see :mod:`floatcalc.studies.models`) are drawn from stated
distributions: normal, uniform, or a uniform tolerance band about a nominal value. A
contaminated surface is modelled as a mixture: with probability p the surface tension is
lowered by a uniformly distributed amount. Each sample is one design; the model gives its
``spare_payload`` (payload minus the weight of the design payload) and its payload capacity.

Reproducibility: the run is cut into chunks whose size depends only on the number of samples
(about N/16 within :data:`CHUNK_MIN`–:data:`CHUNK`, or :data:`CHUNK_SLOW` for point-by-point
models), chunk i draws from
``numpy.random.default_rng(SeedSequence(seed).spawn(n_chunks)[i])``, and inputs are drawn in
a fixed order, so the samples, and therefore every figure, are identical whichever executor
(serial, local processes, Dask) runs the chunks and in whatever order they finish.

Estimates and their convergence:

* probability of sinking :math:`\\hat p = k/N` (spare payload < 0) with binomial standard error
  :math:`\\sqrt{\\hat p(1-\\hat p)/N}`; when no sample sinks, the one-sided 95 % upper bound
  3/N ("rule of three", Hanley & Lippman-Hand 1983) is given instead;
* percentiles of the payload capacity (:func:`numpy.percentile`, linear interpolation) with
  a batch-means standard error: the sample is cut into B = min(20, N/50) (at least 2)
  consecutive batches, the percentile is taken in each, and SE = sd(batch values)/sqrt(B) (Law & Kelton,
  Simulation Modeling and Analysis).

Validity: that of the model at every sample; the model's validity warnings for the base
design are attached. Inputs drawn outside their allowed range are clipped to it, and the
number clipped is reported as a warning.

>>> from floatcalc.studies.models import rod_model
>>> m = rod_model(count=4.0, payload_mass=1.5e-3)
>>> r = uncertainty(m, {"contact_angle": parse_distribution("normal:150deg:8deg", "angle", "contact_angle")},
...                 samples=2000, seed=1)
>>> r.probability_of_sinking, r.samples
(0.0, 2000)
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import input_error
from ..results import Result, field, qfield
from ..units import KINDS, format_si, to_si
from .executors import chunk_size, run_chunks
from .models import Model

CHUNK = 2000          # samples per chunk, vectorised models (at most)
CHUNK_MIN = 250       # and at least: about N/16 in between (executors.chunk_size)
CHUNK_SLOW = 25       # samples per chunk, point-by-point models (e.g. whole devices)
BATCHES = 20          # at most; fewer for small runs so that each batch has ≥ 50 samples
MAX_SAMPLES = 10_000_000
MIN_SAMPLES = 100
PERCENTILES = (1.0, 5.0, 50.0, 95.0, 99.0)
LARGE = 200_000  # samples above which "auto" uses all local cores (vectorised models)
LARGE_SLOW = 200


@dataclass(frozen=True)
class Distribution:
    """``normal`` (a = mean, b = sd), ``uniform`` (a = low, b = high) or ``fixed`` (a), SI."""

    kind: str
    a: float
    b: float = 0.0

    def sample(self, rng: np.random.Generator, n: int) -> np.ndarray:
        if self.kind == "normal":
            return rng.normal(self.a, self.b, n)
        if self.kind == "uniform":
            return rng.uniform(self.a, self.b, n)
        return np.full(n, self.a)

    def describe(self, kind: str, unit: str) -> str:
        f = (lambda x: f"{x:g}") if kind not in KINDS else (lambda x: format_si(x, kind, unit))
        if self.kind == "normal":
            return f"normal, mean {f(self.a)}, sd {f(self.b)}"
        if self.kind == "uniform":
            return f"uniform {f(self.a)} to {f(self.b)}"
        return f"fixed {f(self.a)}"


@dataclass(frozen=True)
class Contamination:
    """With ``probability``, the surface tension drops by U(``drop_low``, ``drop_high``) [N/m]."""

    probability: float
    drop_low: float
    drop_high: float


def parse_distribution(text: str, kind: str, field: str) -> Distribution:
    """Parse ``normal:MEAN:SD``, ``uniform:LOW:HIGH``, ``tol:NOMINAL:TOL`` or a single value.

    >>> parse_distribution("tol:0.2mm:0.01mm", "length", "radius")
    Distribution(kind='uniform', a=0.00019, b=0.00021)
    """
    if not isinstance(text, str):
        raise input_error(field, "must be a text such as normal:150deg:5deg", repr(text))
    parts = [p.strip() for p in text.split(":")]
    conv = (lambda s, what: _count(s, f"{field} {what}")) if kind in ("count", "ratio") else \
        (lambda s, what: to_si(s, kind, f"{field} {what}"))
    if len(parts) == 1:
        return Distribution("fixed", conv(parts[0], "value"))
    if len(parts) != 3 or parts[0].lower() not in ("normal", "uniform", "tol"):
        raise input_error(field, "must be normal:MEAN:SD, uniform:LOW:HIGH, tol:NOMINAL:TOL or one value", repr(text))
    form = parts[0].lower()
    a, b = conv(parts[1], "first value"), conv(parts[2], "second value")
    if form == "normal":
        if b <= 0:
            raise input_error(field, "standard deviation must be positive", repr(parts[2]))
        return Distribution("normal", a, b)
    if form == "tol":
        if b <= 0:
            raise input_error(field, "tolerance must be positive", repr(parts[2]))
        return Distribution("uniform", a - b, a + b)
    if not b > a:
        raise input_error(field, "uniform needs LOW < HIGH", repr(text))
    return Distribution("uniform", a, b)


def _whole(value: Any, field: str, lo: int, hi: int) -> int:
    """A whole number in [lo, hi] from an int or a text such as '10000' or '1e4'."""
    try:
        f = float(value)
    except (TypeError, ValueError):
        f = float("nan")
    if not (math.isfinite(f) and f == int(f) and lo <= f <= hi) or isinstance(value, bool):
        raise input_error(field, f"must be a whole number from {lo} to {hi}", repr(value))
    return int(f)


def _count(s: str, field: str) -> float:
    try:
        return float(s)
    except ValueError:
        raise input_error(field, "must be a number", repr(s)) from None


def parse_contamination(text: str) -> Contamination:
    """Parse ``P:DROP_LOW:DROP_HIGH``, e.g. ``0.2:5mN/m:20mN/m``.

    >>> parse_contamination("0.2:5mN/m:20mN/m")
    Contamination(probability=0.2, drop_low=0.005, drop_high=0.02)
    """
    parts = [p.strip() for p in str(text).split(":")]
    if len(parts) != 3:
        raise input_error("contamination", "must be PROBABILITY:DROP_LOW:DROP_HIGH, e.g. 0.2:5mN/m:20mN/m", repr(text))
    try:
        p = float(parts[0])
    except ValueError:
        raise input_error("contamination", "probability must be a number from 0 to 1", repr(parts[0])) from None
    if not 0.0 <= p <= 1.0:
        raise input_error("contamination", "probability must be a number from 0 to 1", repr(parts[0]))
    lo = to_si(parts[1], "surface_tension", "contamination drop_low")
    hi = to_si(parts[2], "surface_tension", "contamination drop_high")
    if not 0.0 <= lo <= hi:
        raise input_error("contamination", "needs 0 ≤ DROP_LOW ≤ DROP_HIGH", repr(text))
    return Contamination(p, lo, hi)


@dataclass(frozen=True, kw_only=True)
class UncertaintyResult(Result):
    """Outcome of :func:`uncertainty` (SI quantities; JSON keys end in their unit)."""

    model: str = field(default="")
    samples: int = field(default=0)
    seed: int = field(default=0)
    chunk_size: int = field(default=CHUNK)
    executor: str = field(default="serial")
    design_payload_mass: Any = qfield("kg")
    nominal_payload_capacity: Any = qfield("kg")
    probability_of_sinking: float = field(default=0.0)
    probability_standard_error: float = field(default=0.0)
    probability_upper_95: float | None = field(default=None)
    percentiles: tuple[float, ...] = field(default=PERCENTILES)
    payload_capacity_percentiles: Any = qfield("kg")
    payload_capacity_percentile_standard_error: Any = qfield("kg")
    mean_payload_capacity: Any = qfield("kg")
    inputs: tuple[str, ...] = field(default=())
    capacity_samples: Any = field(default=None, json=False)
    warnings: tuple[str, ...] = field(default=())
    cautions: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=())


def _chunk(model: Model, fixed: dict[str, float], dists: tuple[tuple[str, Distribution], ...],
           contamination: Contamination | None, seed: np.random.SeedSequence, n: int,
           capacity_output: str):
    rng = np.random.default_rng(seed)
    x: dict[str, np.ndarray] = {}
    clipped = 0
    for name, d in dists:  # fixed order: sorted by name
        x[name] = d.sample(rng, n)
    if contamination is not None:
        hit = rng.random(n) < contamination.probability
        drop = rng.uniform(contamination.drop_low, contamination.drop_high, n)
        sig = x["surface_tension"] if "surface_tension" in x else np.full(n, fixed["surface_tension"])
        x["surface_tension"] = np.where(hit, sig - drop, sig)
    for name, arr in x.items():
        q = model.inputs[name]
        lo = q.lo if q.lo is not None else -np.inf
        if q.positive:
            lo = max(lo, np.nextafter(0.0, 1.0) if q.kind != "length" else 1e-9)
        hi = q.hi if q.hi is not None else np.inf
        if q.kind == "count":
            arr = np.round(arr)
        c = np.clip(arr, lo, hi)
        clipped += int(np.count_nonzero(c != arr))
        x[name] = c
    out = model.evaluate({**fixed, **x})
    return out[capacity_output], out[model.limit_output], clipped


def uncertainty(model: Model, distributions: dict[str, Distribution], *, values: dict[str, Any] | None = None,
                contamination: Contamination | None = None, samples: int = 10_000, seed: int = 0,
                capacity_output: str = "payload_mass", percentiles: tuple[float, ...] = PERCENTILES,
                executor: str | None = "auto", scheduler: Any = None, workers: int | None = None,
                progress: bool | None = None) -> UncertaintyResult:
    """Probability of sinking at the design payload and percentiles of the payload capacity.

    Parameters
    ----------
    model : Model
        Its ``limit_output`` (for rods ``spare_payload`` [N]) < 0 means the sample sinks; its
        ``capacity_output`` (for rods ``payload_mass`` [kg]) is summarised by percentiles.
    distributions : dict
        Input name -> :class:`Distribution` (SI) or the CLI's text (``"normal:150deg:5deg"``,
        ``"uniform:LOW:HIGH"``, ``"tol:NOMINAL:TOL"``). Inputs not named stay at ``values`` or
        the model's base values.
    values : dict, optional
        Base values (SI) of the other inputs, e.g. the design ``payload_mass`` [kg].
    contamination : Contamination, optional
        Mixture lowering the surface tension (model input ``surface_tension`` [N/m]).
    samples : int
        100 to 10⁷.
    seed : int
        Seed of the :class:`numpy.random.SeedSequence` (≥ 0).
    executor, scheduler, workers, progress
        See :func:`floatcalc.studies.executors.run_chunks`; results do not depend on them.

    Returns
    -------
    UncertaintyResult

    References
    ----------
    .. [1] J. A. Hanley, A. Lippman-Hand, "If nothing goes wrong, is everything all right?",
       JAMA 249, 1743 (1983) (rule of three).
    .. [2] A. M. Law, W. D. Kelton, Simulation Modeling and Analysis, McGraw-Hill (batch means).
    """
    if not isinstance(model, Model):
        raise input_error("model", "must be a study model (floatcalc.rod_model or floatcalc.device_model)",
                          type(model).__name__)
    N = _whole(samples, "samples", MIN_SAMPLES, MAX_SAMPLES)
    s = _whole(seed, "seed", 0, 2**63 - 1)
    if not isinstance(distributions, dict):
        raise input_error("distributions", "must be a dict of input name -> distribution", type(distributions).__name__)
    for name in distributions:
        if name not in model.inputs:
            raise input_error("distribution", f"unknown input; known: {', '.join(sorted(model.inputs))}", repr(name))
    distributions = {k: (parse_distribution(d, model.inputs[k].kind, k) if isinstance(d, str) else d)
                     for k, d in distributions.items()}
    if contamination is not None and "surface_tension" not in model.inputs:
        raise input_error("contamination", f"model '{model.name}' has no surface_tension input", None)
    fixed_all = model.merged(dict(values or {}))
    fixed = {k: float(v) for k, v in fixed_all.items() if k not in distributions}
    dists = tuple(sorted(distributions.items()))
    cheap = model.vectorised and not model.costly
    chunk = chunk_size(N, CHUNK, CHUNK_MIN) if cheap else CHUNK_SLOW
    n_chunks = math.ceil(N / chunk)
    children = np.random.SeedSequence(s).spawn(n_chunks)
    sizes = [min(chunk, N - i * chunk) for i in range(n_chunks)]
    tasks = [(model, fixed, dists, contamination, children[i], sizes[i], capacity_output) for i in range(n_chunks)]
    large = N > (LARGE if cheap else LARGE_SLOW)
    from .executors import resolve

    kind = resolve(executor, scheduler, large=large, n_chunks=n_chunks, workers=workers)
    own: dict[str, Any] = {}

    def side():  # this process's share (validity of the base design, nominal capacity), done while workers run
        own["warnings"] = list(model.warnings(fixed_all))
        own["nominal"] = float(model.evaluate(dict(values or {}))[capacity_output])

    parts = run_chunks(_chunk, tasks, executor=kind if kind != "dask" else "auto", scheduler=scheduler,
                       workers=workers, large=large, progress=progress, label="uncertainty", side=side)
    cap = np.concatenate([p[0] for p in parts])
    spare = np.concatenate([p[1] for p in parts])
    clipped = sum(p[2] for p in parts)
    if not (np.all(np.isfinite(cap)) and np.all(np.isfinite(spare))):
        from ..errors import ConvergenceError

        raise ConvergenceError(f"model '{model.name}' returned non-finite values for some samples")
    k = int(np.count_nonzero(spare < 0))
    p = k / N
    se = math.sqrt(p * (1 - p) / N)
    pct = np.asarray(percentiles, dtype=float)
    q = np.percentile(cap, pct)
    nb = max(2, min(BATCHES, N // 50))
    batches = np.array_split(cap, nb)
    qb = np.array([np.percentile(b, pct) for b in batches])
    qse = qb.std(axis=0, ddof=1) / math.sqrt(nb)
    warnings = own["warnings"]
    if clipped:
        warnings.append(f"{clipped} sampled input value(s) fell outside their allowed range and were clipped to it")
    if k and k < 30:
        warnings.append(f"only {k} of {N} samples sink: the probability is rough; use more samples")
    nominal = own["nominal"]
    from ..units import Q_

    desc = [f"{name}: {d.describe(model.inputs[name].kind, model.inputs[name].unit)}" for name, d in dists]
    if contamination is not None:
        desc.append(f"contamination: probability {contamination.probability:g}, surface tension lowered by "
                    f"{contamination.drop_low * 1e3:g} to {contamination.drop_high * 1e3:g} mN/m (uniform)")
    return UncertaintyResult(
        model=model.name, samples=N, seed=s, chunk_size=chunk, executor=kind,
        design_payload_mass=Q_(float(fixed_all.get("payload_mass", 0.0)), "kg"),
        nominal_payload_capacity=Q_(nominal, "kg"),
        probability_of_sinking=p, probability_standard_error=se,
        probability_upper_95=(3.0 / N if k == 0 else None),
        percentiles=tuple(float(x) for x in pct),
        payload_capacity_percentiles=Q_(q, "kg"), payload_capacity_percentile_standard_error=Q_(qse, "kg"),
        mean_payload_capacity=Q_(float(cap.mean()), "kg"), inputs=tuple(desc), capacity_samples=cap,
        warnings=tuple(warnings), cautions=model.cautions,
        references=(*model.references, "Hanley & Lippman-Hand, JAMA 249, 1743 (1983): rule of three",
                    "Law & Kelton, Simulation Modeling and Analysis: batch means"),
    )
