"""floatcalc: load that small objects carry on a liquid surface by surface tension and meniscus pressure.

The top-level names are loaded lazily so that ``import floatcalc`` stays light (no pint, SciPy,
matplotlib or Streamlit until they are needed).

>>> import floatcalc
>>> r = floatcalc.rod("0.25 mm", "40 mm", "150 deg")
>>> r.max_force.units
<Unit('newton')>
"""

from __future__ import annotations

import importlib
from typing import Any

__version__ = "0.1.0"

_EXPORTS = {
    # errors
    "FloatcalcError": "errors", "InputError": "errors", "ConvergenceError": "errors",
    "ModelRangeWarning": "errors",
    # units
    "registry": "units", "Q_": "units",
    # liquids
    "Liquid": "liquids", "liquid": "liquids", "water": "liquids", "seawater": "liquids",
    "custom_liquid": "liquids", "contaminated": "liquids", "list_liquids": "liquids",
    # dimensionless groups
    "capillary_length": "dimensionless", "bond_number": "dimensionless", "baudoin_number": "dimensionless",
    "weber_number": "dimensionless", "reynolds_number": "dimensionless", "min_wave_speed": "dimensionless",
    # rods
    "rod": "rods", "rod_limit": "rods", "RodResult": "rods",
    # round support elements (axisymmetric meniscus)
    "pin": "round", "ball": "round", "pad": "round", "ring": "round",
    "PinResult": "round", "RoundResult": "round", "RoundForceCurve": "round",
    # flexible wire legs and leg materials
    "flexible_leg": "flexleg", "flexible_leg_curve": "flexleg", "FlexLegResult": "flexleg",
    "leg_material": "materials", "custom_leg_material": "materials", "list_leg_materials": "materials",
    "LegMaterial": "materials",
    # vertical wall
    "wall_meniscus": "wall", "WallMeniscusResult": "wall",
    # whole devices (design files, equilibrium) and parallel rods sharing menisci
    "solve_device": "device", "Device": "device", "DeviceResult": "device", "load_design": "device",
    "save_design": "device", "device_example": "device", "list_device_examples": "device",
    "parallel_rods": "device", "ParallelRodsResult": "device",
    # design studies: sweeps, optimiser, Monte Carlo uncertainty, calibration fits
    "sweep": "studies.sweep", "optimise_rods": "studies.optimise", "uncertainty": "studies.uncertainty",
    "optimise_device_scale": "studies.optimise",
    "fit_rod": "studies.fit", "fit": "studies.fit", "fit_csv": "studies.fit", "FitResult": "studies.fit",
    # motion: jumps and strokes against the meniscus limit, coatings under pressure
    "jump": "motion.jump", "JumpResult": "motion.jump", "stroke": "motion.stroke", "StrokeResult": "motion.stroke",
    "coating_under_pressure": "motion.coating", "rod_model": "studies.models", "device_model": "studies.device_model",
}

__all__ = sorted(_EXPORTS) + ["__version__"]


def __getattr__(name: str) -> Any:
    try:
        module = _EXPORTS[name]
    except KeyError:
        raise AttributeError(f"module 'floatcalc' has no attribute {name!r}") from None
    value = getattr(importlib.import_module(f".{module}", __name__), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return __all__

