"""Element kinds of a device: a small registry, kind name -> adapter.

An adapter turns the validated parameters of one support element (SI floats) into an
:class:`ElementModel`: force points in plan with their force–depth tables (precomputed once,
vectorised, interpolated later by :mod:`floatcalc.core.equilibrium`), own weight, limit force
and depth, contact perimeter, plan footprint (for drawing and overlap checks) and the outer
meniscus field used to superpose neighbours.

Adding a kind takes a few lines::

    from floatcalc.device.elements import ElementKind, Key, register_kind

    class MyKind(ElementKind):
        name = "my-foot"
        keys = {"radius": Key("length", required=True), **COMMON_KEYS}
        def model(self, p, liquid): ...          # return an ElementModel

    register_kind(MyKind())

Every kind shares ``position``, ``mount``, ``material`` / ``material_density`` and ``coating``
(see :data:`COMMON_KEYS`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Callable

import numpy as np

#: Number of points in every tabulated force–depth law.
TABLE_POINTS = 241


@dataclass(frozen=True)
class Key:
    """One key of an element table: value kind, whether required, default, allowed range."""

    kind: str                      # "length", "angle", "signed_angle", "position", "int", "material", "coating", "density", "str"
    required: bool = False
    default: Any = None
    help: str = ""
    lo: float | None = None        # SI lower bound (inclusive) for signed values
    hi: float | None = None


COMMON_KEYS: dict[str, Key] = {
    "kind": Key("str", required=True, help="element kind"),
    "name": Key("str", help="label shown in results"),
    "position": Key("position", required=True, help="[x, y] of the element centre in plan"),
    "mount": Key("signed_length", default=0.0, help="height of the element's lowest point above the device's "
                 "reference plane (a raised element touches later)", lo=-0.1, hi=0.1),
    "material": Key("material", help="material name, e.g. 'steel'"),
    "material_density": Key("density", help="material density, instead of a name"),
    "coating": Key("coating", required=True, help="contact angles and texture"),
}


@dataclass
class ElementModel:
    """What the equilibrium solve needs of one element (SI units).

    Attributes
    ----------
    points : ndarray (m, 2) [m]
        Plan positions of the element's force points (absolute).
    offsets : ndarray (m,) [m]
        Depth offsets of those points (added to heave + pitch·x + roll·y).
    depth : ndarray (m, n) [m]
        Depth of each point's lowest part, increasing, from first contact to the limit.
    force : ndarray (m, n) [N]
        Upward force of each point at those depths.
    contact : ndarray (m, n) [m]
        Contact-line depth below the undisturbed surface (drives the neighbours' coupling).
    own_weight : float [N]
    perimeter : float [m]
        Contact perimeter at the limit (for the Baudoin number).
    footprint : ndarray (k, 2) [m]
        Convex plan outline (for drawing and overlap checks).
    field : callable (x, y) -> ndarray
        Outer linearised meniscus depth at plan points [m], per unit contact-line depth.
    warnings : list of str
    model_name : str
    """

    points: np.ndarray
    offsets: np.ndarray
    depth: np.ndarray
    force: np.ndarray
    contact: np.ndarray
    own_weight: float
    perimeter: float
    footprint: np.ndarray
    field: Callable[[np.ndarray, np.ndarray], np.ndarray]
    warnings: list[str] = field(default_factory=list)
    model_name: str = ""

    @property
    def limit_force(self) -> float:
        return float(self.force[:, -1].sum())

    @property
    def limit_depth(self) -> float:
        return float(self.depth[:, -1].min())


class ElementKind:
    """Base adapter; subclasses set ``name``, ``keys`` and implement :meth:`model`."""

    name: str = ""
    keys: dict[str, Key] = {}
    summary: str = ""
    #: If set, the reason this kind cannot be used (reported when a design file names it).
    unavailable: str | None = None

    def check(self, p: dict[str, Any], path: str, problems: list[str]) -> None:
        """Extra checks across keys (append ``path.key: problem`` lines to ``problems``)."""

    def model(self, p: dict[str, Any], liquid) -> ElementModel:  # pragma: no cover - abstract
        raise NotImplementedError


_KINDS: dict[str, ElementKind] = {}


def register_kind(kind: ElementKind) -> None:
    """Add (or replace) an element kind in the registry."""
    _KINDS[kind.name] = kind


def get_kind(name: str) -> ElementKind | None:
    return _KINDS.get(name)


def kind_names() -> list[str]:
    """Names of the registered element kinds.

    >>> "rod" in kind_names()
    True
    """
    return list(_KINDS)


# ------------------------------------------------------------------------------------------
# Wetting: advancing and receding angles, optionally through a texture model.

def effective_angle(theta: float, coating: dict[str, Any]) -> float:
    """Apparent contact angle [rad] of a textured surface.

    Wenzel: cos θ* = r cos θ (roughness r ≥ 1); Cassie–Baxter: cos θ* = f (cos θ + 1) − 1
    (solid fraction 0 < f ≤ 1). The result is clipped to 0–180° (a Wenzel value |r cos θ| > 1
    means complete wetting or complete non-wetting).

    >>> round(math.degrees(effective_angle(math.radians(110), {"texture": "cassie", "solid_fraction": 0.2})), 2)
    150.27
    """
    tex = coating.get("texture", "none")
    c = math.cos(theta)
    if tex == "wenzel":
        c = coating["roughness"] * c
    elif tex == "cassie":
        c = coating["solid_fraction"] * (c + 1.0) - 1.0
    return math.acos(max(-1.0, min(1.0, c)))


# ------------------------------------------------------------------------------------------
# Rods

def _rod_field(cx, cy, ux, uy, half, w):
    """Linearised outer field of a straight rod per unit contact depth (see core.finite_rod)."""
    from scipy.special import k0e

    k0w = k0e(w)

    def f(x, y):
        x = np.asarray(x, dtype=float)
        y = np.asarray(y, dtype=float)
        a = (x - cx) * ux + (y - cy) * uy            # along the rod
        b = np.abs(-(x - cx) * uy + (y - cy) * ux)   # across
        beyond = np.maximum(np.abs(a) - half, 0.0)
        r = np.hypot(beyond, b)
        side = np.exp(-np.maximum(b - w, 0.0))
        rr = np.maximum(r, w)
        cap = k0e(rr) * np.exp(w - rr) / k0w
        return np.where(beyond > 0.0, cap, side)

    return f


class RodKind(ElementKind):
    """Straight rod lying in the surface: exact 2D law along it, end caps from core.finite_rod."""

    name = "rod"
    summary = "straight horizontal rod (wire leg) lying in the surface"
    keys = {
        **COMMON_KEYS,
        "radius": Key("length", required=True, help="rod radius"),
        "length": Key("length", required=True, help="wetted length"),
        "heading": Key("signed_angle", default=0.0, help="direction of the rod axis in plan, from +x",
                       lo=-2 * math.pi, hi=2 * math.pi),
        "tilt": Key("signed_angle", default=0.0, help="inclination of the axis to the horizontal; positive: the "
                    "end along the heading is lower", lo=-math.radians(30), hi=math.radians(30)),
        "segments": Key("int", default=5, help="force points along the rod (2–50)", lo=2, hi=50),
    }

    def check(self, p, path, problems):
        if "radius" in p and "length" in p and p["length"] < 4 * p["radius"]:
            problems.append(f"{path}.length: must be at least 4 radii for a rod (use a pin or ball for "
                            f"a stubby foot), got {p['length'] * 1e3:.4g} mm")

    def model(self, p, liquid):
        from ..core import finite_rod, rod2d

        lc, s = liquid.lc, liquid.sigma
        R, L = p["radius"] / lc, p["length"] / lc
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        lim = finite_rod.limit(R, th, L)
        phi = np.linspace(0.0, lim["phi"], TABLE_POINTS)
        f_st, f_p, D = rod2d.force_parts(phi, R, th)
        n = p["segments"]
        seg = L / n
        ends = 2.0 * finite_rod.end_length(R * np.sin(phi)) * f_st  # both ends together
        F = np.tile((f_st + f_p) * seg, (n, 1))
        F[0] += 0.5 * ends
        F[-1] += 0.5 * ends
        hd = 2.0 * np.sin(0.5 * (phi + th - np.pi))
        ux, uy = math.cos(p["heading"]), math.sin(p["heading"])
        along = (np.arange(n) + 0.5) / n * p["length"] - 0.5 * p["length"]   # [m]
        cx, cy = p["position"]
        pts = np.column_stack([cx + along * ux, cy + along * uy])
        offs = along * math.tan(p["tilt"]) - p["mount"]
        rho_s = p["density"]
        weight = rho_s * math.pi * p["radius"] ** 2 * p["length"] * liquid.g
        half_l, half_w = 0.5 * p["length"], p["radius"]
        corners = np.array([[-half_l, -half_w], [half_l, -half_w], [half_l, half_w], [-half_l, half_w]])
        foot = np.column_stack([cx + corners[:, 0] * ux - corners[:, 1] * uy,
                                cy + corners[:, 0] * uy + corners[:, 1] * ux])
        field_s = _rod_field(cx / lc, cy / lc, ux, uy, 0.5 * L, R)
        warnings = []
        if L < finite_rod.MIN_LENGTH:
            warnings.append(f"rod length {p['length'] * 1e3:.3g} mm is under {finite_rod.MIN_LENGTH:g} capillary "
                            f"lengths: the end-cap model assumes independent ends")
        if th < math.pi / 2:
            warnings.append("wetting rod (advancing angle below 90°): the limit is the liquid closing over the top")
        return ElementModel(
            points=pts,
            offsets=offs,
            depth=np.tile(D * lc, (n, 1)),
            force=F * s * lc,
            contact=np.tile(hd * lc, (n, 1)),
            own_weight=weight,
            perimeter=2.0 * p["length"] + 2.0 * math.pi * p["radius"],
            footprint=foot,
            field=lambda x, y, f=field_s: f(np.asarray(x) / lc, np.asarray(y) / lc),
            warnings=warnings,
            model_name="exact 2D rod law (Vella, Lee & Kim 2006) with end caps (core.finite_rod)",
        )


register_kind(RodKind())


class _PendingKind(ElementKind):
    """A round element kind whose model has not landed yet: refuses clearly instead of guessing."""

    def __init__(self, name: str, summary: str):
        self.name = name
        self.summary = summary + " (not yet available)"
        self.keys = {**COMMON_KEYS}
        self.unavailable = f"element kind '{name}' needs floatcalc.round, which this version does not have yet"

    def model(self, p, liquid):
        from ..errors import input_error

        raise input_error("kind", self.unavailable, repr(self.name))


for _n, _s in (("pin", "vertical pin"), ("ball", "ball foot"), ("pad", "flat pad"), ("ring", "wire ring")):
    register_kind(_PendingKind(_n, _s))
