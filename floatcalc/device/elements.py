"""Element kinds of a device: re-exports of the one registry in :mod:`floatcalc.elements`.

Kept so that ``from floatcalc.device.elements import ...`` goes on working; new code imports
from :mod:`floatcalc.elements`.
"""

from __future__ import annotations

from ..elements._registry import (COMMON_FIELDS, EXAMPLE_ROD, TABLE_POINTS, ElementKind, ElementModel, Field,
                                  effective_angle, from_first_contact, get_kind, kind_names, kinds,
                                  register_kind)

__all__ = ["COMMON_FIELDS", "EXAMPLE_ROD", "TABLE_POINTS", "ElementKind", "ElementModel", "Field",
           "effective_angle", "from_first_contact", "get_kind", "kind_names", "kinds", "register_kind"]
