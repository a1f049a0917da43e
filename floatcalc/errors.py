"""Exception and warning classes shared by every floatcalc module.

All input problems raise :class:`InputError` (a :class:`ValueError`), whose message is a single
line naming the field, the value received and what is allowed. Solvers that cannot converge raise
:class:`ConvergenceError`. Results outside a model's validity range carry a
:class:`ModelRangeWarning`; result objects also keep the text of their warnings in a ``warnings``
tuple so that the CLI and the page can show them.
"""

from __future__ import annotations


class FloatcalcError(Exception):
    """Base class of every error floatcalc raises on purpose."""


class InputError(FloatcalcError, ValueError):
    """A user-supplied value is wrong: message says what, the value, and what is allowed."""


class ConvergenceError(FloatcalcError, RuntimeError):
    """A numerical solver failed to reach its tolerance."""


class ModelRangeWarning(UserWarning):
    """A result was computed outside the stated validity range of its model."""


def input_error(field: str, problem: str, value: object | None = None) -> InputError:
    """Build an :class:`InputError` with the house message format.

    >>> str(input_error("radius", "must be positive", "-0.1 mm"))
    'radius: must be positive, got -0.1 mm'
    """
    text = f"{field}: {problem}"
    if value is not None:
        text += f", got {value}"
    return InputError(text)
