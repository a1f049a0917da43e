"""Support-element kinds: one module per kind, listed in the registry.

:mod:`floatcalc.elements._registry` holds the registry (:func:`get_kind`, :func:`kinds`,
:func:`kind_names`), the input schema type :class:`Field`, the device adapter result
:class:`ElementModel` and the helpers the kinds share (the texture model
:func:`effective_angle`, plan outlines and outer meniscus fields). Kinds: ``rod``,
``rod_row``, ``flexible_leg``, ``pin``, ``ball``, ``pad``, ``ring``.
"""

from __future__ import annotations

from ._registry import (COMMON_FIELDS, EXAMPLE_ROD, TABLE_POINTS, ElementKind, ElementModel, Field,
                        effective_angle, from_first_contact, get_kind, kind_names, kinds, register_kind)

__all__ = ["COMMON_FIELDS", "EXAMPLE_ROD", "TABLE_POINTS", "ElementKind", "ElementModel", "Field",
           "effective_angle", "from_first_contact", "get_kind", "kind_names", "kinds", "register_kind"]
