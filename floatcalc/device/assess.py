"""The one verdict, safety factor and cautions of a design (used by the CLI, the page, the
report and Python alike).

Vocabulary (also the README glossary):

* **weight** — the device's own weight (body and elements) [N];
* **payload** — extra load put on the device (an input) [N or kg];
* **load** — weight + payload;
* **capacity** — the largest load the device carries with every element intact;
* **max payload** — capacity − weight (``max_payload_N``: at the centre of mass, or where the
  payload sits);
* **sinking payload** — the largest payload before the device sinks, elements breaking through
  one by one (``sinking_payload_N``);
* **safety factor** — capacity / load (achieved); the required one is an input
  (``[load] safety_factor``);
* **utilisation** — an element's force / its limit force (0–1);
* **verdict** — one of :data:`VERDICTS`; a safety factor under the required one is a separate
  flag, ``below_required_safety_factor``.

floatcalc does not use the word "margin".
"""

from __future__ import annotations

import math
from typing import Any

from ..errors import input_error

#: The one verdict set.
VERDICTS = ("floats", "floats with elements broken through", "capsizes", "sinks")

ELECTRONICS_CAUTION = (
    "If the device carries batteries, motors or electronics: keep chargers and mains-powered instruments "
    "away from the bath, and dry the device before powering it again after it has been in the liquid."
)
HOT_CAUTION = "Hot liquid: risk of scalds and of vapour; handle the bath with care."
STATIC_CAUTION = ("Results are static estimates: a leg stroke, a drop or a ripple can break a meniscus that "
                  "holds at rest.")


def verdict(payload: float, max_payload: float, sinking_payload: float, capsizes: bool = False) -> str:
    """The verdict for a payload [N] given the device's max and sinking payloads [N].

    >>> verdict(1.0, 2.0, 3.0), verdict(2.5, 2.0, 3.0), verdict(4.0, 2.0, 3.0), verdict(1.0, 2.0, 3.0, True)
    ('floats', 'floats with elements broken through', 'sinks', 'capsizes')
    """
    if payload > sinking_payload + 1e-12 * max(1.0, abs(sinking_payload)):
        return VERDICTS[3]
    if capsizes:
        return VERDICTS[2]
    if payload > max_payload + 1e-12 * max(1.0, abs(max_payload)):
        return VERDICTS[1]
    return VERDICTS[0]


def safety_factor(value: Any) -> float:
    """A required safety factor: a plain number from 1 to 100.

    >>> safety_factor("1.5")
    1.5
    """
    try:
        sf = float(value)
    except (TypeError, ValueError):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(value)) from None
    if not (math.isfinite(sf) and 1.0 <= sf <= 100.0):
        raise input_error("safety_factor", "must be a number from 1 to 100", repr(value))
    return sf


def cautions_for(design) -> tuple[str, ...]:
    """Cautions for a design's scenario: the liquid's own (clean surface; flammable liquids),
    hot liquid above 50 °C, and the electronics caution when the body has a mass (a device that
    may carry electronics; a bare needle or wire demonstration does not get it)."""
    liq = design.liquid
    out = list(liq.cautions)
    out.append(STATIC_CAUTION)
    if liq.T - 273.15 > 50.0 and not any(c.lower().startswith("hot") for c in out):
        out.append(HOT_CAUTION)
    if design.body.get("mass", 0.0) > 0.0:
        out.append(ELECTRONICS_CAUTION)
    return tuple(dict.fromkeys(out))
