"""Design studies: parameter sweeps, an optimiser, Monte Carlo uncertainty and calibration fits.

One design point is rarely the question. This package asks many:

* :mod:`.sweep` – one or two inputs varied over ranges, a table and a plot;
* :mod:`.optimise` – least support mass (or fewest legs) for a payload with a safety factor;
* :mod:`.uncertainty` – probability of sinking and payload-capacity percentiles from stated
  input distributions, seeded and reproducible;
* :mod:`.fit` – effective advancing contact angle (and optionally surface tension) from a
  measured force–depth curve, with a confidence interval;
* :mod:`.executors` – serial, all local cores, or a Dask cluster; identical results.

A study takes a :class:`~floatcalc.studies.models.Model`: a callable over a dict of named SI
inputs that returns a dict of named SI outputs. Long rods have a vectorised model
(:func:`~floatcalc.studies.models.rod_model`) built on :func:`floatcalc.core.rod2d.limit_force`,
so sweeps and Monte Carlo runs over rod designs are array operations, not Python loops.

Nothing heavy is imported here: submodules load SciPy, pint or matplotlib only when used.
"""

from __future__ import annotations

import importlib
from typing import Any

_EXPORTS = {
    "Model": "models", "rod_model": "models", "list_models": "models",
    "Axis": "ranges", "parse_axis": "ranges",
    "sweep": "sweep", "SweepResult": "sweep",
    "optimise_rods": "optimise", "OptimiseResult": "optimise",
    "uncertainty": "uncertainty", "UncertaintyResult": "uncertainty", "parse_distribution": "uncertainty",
    "fit_rod": "fit", "FitResult": "fit",
    "run_chunks": "executors",
    "read_table": "csvio", "write_table": "csvio",
}

__all__ = sorted(_EXPORTS)


def __getattr__(name: str) -> Any:
    try:
        module = _EXPORTS[name]
    except KeyError:
        raise AttributeError(f"module 'floatcalc.studies' has no attribute {name!r}") from None
    value = getattr(importlib.import_module(f".{module}", __name__), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return __all__
