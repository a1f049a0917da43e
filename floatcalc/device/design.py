"""Design files of devices: re-exports of :mod:`floatcalc.design` (the one format and reader).

Kept so that ``from floatcalc.device.design import ...`` goes on working.
"""

from __future__ import annotations

from ..design import (SCHEMA_VERSION, Design, design_from_data, design_text, example, example_names,
                      example_path, example_text, list_examples, load_design, save_design)
from ..design.read import MAX_BYTES, MAX_KEY_PARTS, check_key_depth, parse_toml, read_text
from ..design.schema import MAX_ELEMENTS, MAX_LISTED_PROBLEMS

MAX_LEGS = MAX_ELEMENTS

__all__ = ["SCHEMA_VERSION", "Design", "design_from_data", "design_text", "example", "example_names",
           "example_path", "example_text", "list_examples", "load_design", "save_design", "MAX_BYTES",
           "MAX_KEY_PARTS", "check_key_depth", "parse_toml", "read_text", "MAX_ELEMENTS", "MAX_LEGS",
           "MAX_LISTED_PROBLEMS"]
