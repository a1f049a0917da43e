"""Whole floating devices: design files, element kinds, equilibrium and margins.

* :mod:`.design` reads and writes the TOML design format (``load_design``, ``save_design``,
  built-in examples),
* :mod:`.elements` holds the registry of element kinds (``register_kind``),
* :mod:`.solve` solves heave, pitch and roll and reports margins (``solve_device``),
* :mod:`.parallel` gives the exact 2D limit of N parallel rods (``parallel_rods``).
"""

from __future__ import annotations

from .design import (Design, design_text, example, example_path, list_examples, load_design,
                     save_design)
from .elements import ElementKind, ElementModel, Field, kind_names, register_kind
from .parallel import ParallelRodsResult, parallel_rods
from .solve import Device, DeviceResult, ElementState, solve_device

#: Top-level aliases (``floatcalc.device_example``, ``floatcalc.list_device_examples``).
device_example = example
list_device_examples = list_examples

__all__ = [
    "Design", "design_text", "example", "example_path", "list_examples", "load_design", "save_design",
    "ElementKind", "ElementModel", "Field", "kind_names", "register_kind",
    "ParallelRodsResult", "parallel_rods",
    "Device", "DeviceResult", "ElementState", "solve_device", "device_example", "list_device_examples",
]
