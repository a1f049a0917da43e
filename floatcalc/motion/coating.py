"""Textured coatings under pressure: does a posts or grooves coating stay dry (Cassie) or flood?

Public API over :mod:`floatcalc.core.wetting`. A coating texture is a dict (SI floats; the keys
a design file's coating table can carry)::

    {"texture": "posts",        # or "grooves"
     "post_size": 10e-6,        # post side (posts) or ridge width (grooves) [m]
     "pitch": 30e-6,            # centre-to-centre spacing [m], more than post_size
     "post_height": 20e-6}      # post height or groove depth [m]

:func:`check_texture` validates such a dict (one problem line per key, the design-file style);
:func:`coating_under_pressure` compares the Cassie-to-Wenzel pressure of the texture with the
pressure under an element: hydrostatic ρ g D at the depth D of its deepest point plus the
dynamic pressure ½ ρ v² of a stroke or a landing at speed v. Past it the texture floods and the
element falls back to the Wenzel angle (and stays there: the reverse transition needs the
liquid removed).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import input_error
from ..results import Result, field, qfield
from ..units import Q_

TEXTURE_KEYS = ("texture", "post_size", "pitch", "post_height")
#: Features larger than this many capillary lengths get a warning (pressure not uniform over a
#: cell, and the Cassie–Baxter average needs many cells under a contact line; common practice).
MAX_PITCH_LC = 0.1
REFERENCES = (
    "Wenzel, Ind. Eng. Chem. 28, 988 (1936); Cassie & Baxter, Trans. Faraday Soc. 40, 546 (1944)",
    "Extrand, Langmuir 18, 7991 (2002) and 20, 5013 (2004): contact-line density and sag criteria",
    "Zheng, Yu & Zhao, Langmuir 21, 12207 (2005): depinning pressure of posts",
    "Bartolo et al., Europhys. Lett. 74, 299 (2006): depinning and sag (touch-down) impalement",
)


def check_texture(tex: Any, path: str = "coating") -> list[str]:
    """Problems of a texture dict, one line each (``path.key: what is allowed, got VALUE``).

    >>> check_texture({"texture": "posts", "post_size": 1e-5, "pitch": 5e-6, "post_height": 1e-5})
    ['coating.pitch: must be larger than post_size (10 µm), got 5 µm']
    """
    problems: list[str] = []
    if not isinstance(tex, dict):
        return [f"{path}: must be a table with {', '.join(TEXTURE_KEYS)}, got {tex!r}"]
    for k in tex:
        if k not in TEXTURE_KEYS:
            problems.append(f"{path}.{k}: unknown texture key; allowed: {', '.join(TEXTURE_KEYS)}")
    kind = tex.get("texture")
    if kind not in ("posts", "grooves"):
        problems.append(f"{path}.texture: must be 'posts' or 'grooves', got {kind!r}")
    for k in ("post_size", "pitch", "post_height"):
        x = tex.get(k)
        if x is None:
            problems.append(f"{path}.{k}: required (a length in metres)")
        elif isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x) or not (0 < x <= 1e-3):
            problems.append(f"{path}.{k}: must be a length above 0 and at most 1 mm, got {x!r}")
    if not problems and tex["pitch"] <= tex["post_size"]:
        problems.append(f"{path}.pitch: must be larger than post_size ({tex['post_size'] * 1e6:.4g} µm), "
                        f"got {tex['pitch'] * 1e6:.4g} µm")
    return problems


def texture_from_args(kind, post_size, pitch, post_height) -> dict | None:
    """Texture dict from unit strings (CLI), or None when ``kind`` is None."""
    from ..units import to_si

    if kind is None:
        if any(x is not None for x in (post_size, pitch, post_height)):
            raise input_error("texture", "give --texture posts|grooves with --post-size, --pitch and --post-height")
        return None
    tex = {"texture": kind}
    for key, val in (("post_size", post_size), ("pitch", pitch), ("post_height", post_height)):
        if val is None:
            raise input_error(key, f"required with --texture {kind}")
        tex[key] = to_si(val, "length", key)
    problems = check_texture(tex, "texture")
    if problems:
        raise input_error(problems[0].split(":", 1)[0], problems[0].split(": ", 1)[1])
    return tex


@dataclass(frozen=True, kw_only=True)
class CoatingState(Result):
    """A textured coating under a pressure (see :func:`coating_under_pressure`)."""

    texture: str = field()
    floods: bool = field()
    state: str = field()
    mechanism: str = field()
    contact_angle: Any = qfield("deg")
    cassie_angle: Any = qfield("deg")
    wenzel_angle: Any = qfield("deg")
    solid_fraction: float = field()
    roughness: float = field()
    critical_pressure: Any = qfield("Pa")
    depinning_pressure: Any = qfield("Pa")
    sag_pressure: Any = qfield("Pa")
    hydrostatic_pressure: Any = qfield("Pa")
    dynamic_pressure: Any = qfield("Pa")
    pressure: Any = qfield("Pa")
    flooding_speed: Any = qfield("m/s", default=None)
    warnings: tuple[str, ...] = field(default=())
    references: tuple[str, ...] = field(default=REFERENCES)


def coating_under_pressure(texture: dict, contact_angle: Any, liquid, depth: Any = 0.0,
                           speed: Any = 0.0) -> CoatingState:
    """Does a textured coating stay in the Cassie state at a depth and speed?

    .. math::

        p = \\rho g D + \\tfrac12 \\rho v^2 \\quad\\text{against}\\quad
        \\Delta p_c = \\min(\\Delta p_d, \\Delta p_s)

    (:mod:`floatcalc.core.wetting` for Δp_d, Δp_s). ``flooding_speed`` is the speed at which the
    dynamic pressure floods the texture at this depth (None if the depth alone floods it).

    Parameters
    ----------
    texture : dict
        See the module docstring (SI floats).
    contact_angle : [rad]
        Advancing angle of the coating material (intrinsic, smooth).
    liquid : Liquid
    depth : [m]
        Depth of the element's deepest wetted point below the undisturbed surface.
    speed : [m/s]
        Speed of a stroke or a landing.

    >>> from floatcalc.liquids import water
    >>> tex = {"texture": "posts", "post_size": 10e-6, "pitch": 40e-6, "post_height": 30e-6}
    >>> s = coating_under_pressure(tex, "115 deg", water(), depth="4 mm", speed="0.5 m/s")
    >>> s.state, round(s.critical_pressure.to("Pa").magnitude)
    ('cassie', 820)
    >>> coating_under_pressure(tex, "115 deg", water(), depth="4 mm", speed="2 m/s").state
    'wenzel'
    """
    from .. import _validate as v
    from ..core import wetting
    from ..units import to_si

    problems = check_texture(texture, "texture")
    if problems:
        raise input_error(problems[0].split(":", 1)[0], problems[0].split(": ", 1)[1])
    th = v.angle(contact_angle, "contact_angle")
    D = to_si(depth, "length", "depth")
    U = to_si(speed, "speed", "speed")
    if D < 0:
        raise input_error("depth", "must be zero or positive", f"{D * 1e3:g} mm")
    if U < 0:
        raise input_error("speed", "must be zero or positive", f"{U:g} m/s")
    kind = texture["texture"]
    a, p, h = texture["post_size"], texture["pitch"], texture["post_height"]
    s, rho, g = liquid.sigma, liquid.rho, liquid.g
    st = wetting.texture_state(kind, a, p, h, th, 0.0)  # geometry and angles (lengths in m: σ/m = Pa)
    pd = s * wetting.depinning_pressure(kind, a, p, th)
    ps = s * wetting.sag_pressure(kind, a, p, h)
    pc = min(pd, ps)
    p_h = rho * g * D
    p_d = 0.5 * rho * U**2
    ptot = p_h + p_d
    floods = bool(ptot >= pc)
    warnings = []
    if th <= math.pi / 2:
        warnings.append(f"advancing angle {math.degrees(th):.4g}° ≤ 90°: the texture holds no pressure, the liquid "
                        "fills it (Wenzel state)")
    if p > MAX_PITCH_LC * liquid.lc:
        warnings.append(f"pitch {p * 1e6:.4g} µm is above {MAX_PITCH_LC:g} capillary lengths: pressure varies over a "
                        "cell and the Cassie–Baxter average is rough")
    if floods:
        warnings.append(f"the texture floods: pressure {ptot:.4g} Pa (hydrostatic {p_h:.4g} Pa + dynamic "
                        f"{p_d:.4g} Pa) reaches its Cassie-to-Wenzel pressure {pc:.4g} Pa "
                        f"({'sag' if ps < pd else 'depinning'}); the element falls back to the Wenzel angle "
                        f"{math.degrees(st['wenzel_angle']):.4g}°")
    v_flood = None if p_h >= pc else math.sqrt(2.0 * (pc - p_h) / rho)
    return CoatingState(
        texture=kind, floods=floods, state="wenzel" if floods else "cassie",
        mechanism="sag" if ps < pd else "depinning",
        contact_angle=Q_(math.degrees(st["wenzel_angle"] if floods else st["cassie_angle"]), "deg"),
        cassie_angle=Q_(math.degrees(st["cassie_angle"]), "deg"),
        wenzel_angle=Q_(math.degrees(st["wenzel_angle"]), "deg"),
        solid_fraction=float(st["solid_fraction"]), roughness=float(st["roughness"]),
        critical_pressure=Q_(pc, "Pa"), depinning_pressure=Q_(pd, "Pa"), sag_pressure=Q_(ps, "Pa"),
        hydrostatic_pressure=Q_(p_h, "Pa"), dynamic_pressure=Q_(p_d, "Pa"), pressure=Q_(ptot, "Pa"),
        flooding_speed=None if v_flood is None else Q_(v_flood, "m/s"),
        warnings=tuple(warnings),
    )


_ = np


def textured_heave_law(design, texture: dict | None, speed: float):
    """Heave law of a design whose elements all carry ``texture``, after the flooding check.

    Each element's coating material keeps its advancing angle; dry, the texture gives the
    Cassie–Baxter angle. The pressure under each element at the device's limit (its deepest
    point's hydrostatic pressure, the largest it meets before breaking through) plus ½ρv² at
    ``speed`` [m/s] is compared with the texture's Cassie-to-Wenzel pressure; flooded elements
    fall back to the Wenzel angle and the law is rebuilt (safe side: flooding is taken to happen
    before the limit is reached).

    Returns
    -------
    law : HeaveLaw
    states : list of CoatingState (one per element; empty without a texture)
    notes : list of str
    """
    from ..core import wetting
    from ._device import heave_law, intrinsic_angles, with_coating

    if texture is None:
        return heave_law(design), [], []
    kind, a, p, h = texture["texture"], texture["post_size"], texture["pitch"], texture["post_height"]
    f = wetting.solid_fraction(kind, a, p)
    r = wetting.roughness(kind, a, p, h)
    th = intrinsic_angles(design)
    law = heave_law(with_coating(design, ("cassie", f)))
    states = [coating_under_pressure(texture, float(t), law.liquid, depth=max(float(d), 0.0), speed=speed)
              for t, d in zip(th, law.element_depths)]
    flooded = [s.floods for s in states]
    notes = []
    if any(flooded):
        law_w = heave_law(with_coating(design, [("wenzel", r) if fl else ("cassie", f) for fl in flooded]))
        names = [n for n, fl in zip(law.element_names, flooded) if fl]
        notes.append(
            f"textured coating floods on {len(names)} element(s) ({', '.join(names[:4])}{'…' if len(names) > 4 else ''}): "
            f"pressure {max(s.pressure.to('Pa').magnitude for s in states):.4g} Pa reaches the Cassie-to-Wenzel "
            f"pressure {states[0].critical_pressure.to('Pa').magnitude:.4g} Pa; they fall back to the Wenzel angle "
            f"and the limit force drops from {law.limit_force * 1e3:.4g} mN to {law_w.limit_force * 1e3:.4g} mN")
        law = law_w
    return law, states, notes


def design_texture(design) -> dict | None:
    """The posts or grooves texture a design file gives its elements' coating (the first one
    found; design-file keys ``texture = "posts" | "grooves"``, ``post_size``, ``pitch``,
    ``post_height``), or None. Used by jumps and strokes when no texture is given on the command line.
    """
    from ._device import as_design

    for p in as_design(design).elements:
        c = p.get("coating") or {}
        if c.get("texture") in ("posts", "grooves"):
            return {"texture": c["texture"], "post_size": c["post_size"], "pitch": c["pitch"],
                    "post_height": c["post_height"]}
    return None
