"""The element-kind registry: the one table every consumer reads.

Each support-element kind (rod, rod row, flexible leg, pin, ball, pad, ring) is one module in
:mod:`floatcalc.elements` that defines a subclass of :class:`ElementKind` and registers it. A
kind owns

* its input schema :attr:`ElementKind.fields` (name → :class:`Field`: value kind and unit,
  allowed range, default, help text), from which the design-file loader, the CLI options and
  the page widgets are generated;
* its cross-field checks (:meth:`ElementKind.check`, e.g. the ring rule R ≥ 2b);
* its public function (:meth:`ElementKind.solve`, the same computation as ``floatcalc.rod``,
  ``floatcalc.ball``, ...), whose result carries the limit force, depth, force parts, own
  weight, contact perimeter and Bond number with its length;
* its device adapter (:meth:`ElementKind.model`) returning an :class:`ElementModel` for the
  device solve (force–depth tables, footprint, outer meniscus field, post-breakthrough force).

Adding a kind is one module (see ``DEVELOPERS.md``, "Adding a support element")::

    from floatcalc.elements._registry import ElementKind, Field, register_kind

    class Foot(ElementKind):
        name = "foot"
        label = "foot"
        fields = {"radius": Field("length", "mm", required=True, help="foot radius")}
        def solve(self, p, liquid): ...        # public result
        def model(self, p, liquid): ...        # device adapter

    register_kind(Foot())
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Callable

import numpy as np

#: Number of points in every tabulated force–depth law.
TABLE_POINTS = 241


@dataclass(frozen=True)
class Field:
    """One input of an element kind.

    ``kind`` is the value type: ``length`` (positive), ``signed_length``, ``angle`` (0–180°),
    ``signed_angle``, ``position`` ([x, y]), ``int``, ``material``, ``coating``, ``modulus``
    (Young's modulus, text with a unit) or ``str``. ``unit`` is the display unit (CLI help,
    page widgets); ``lo``/``hi`` bound signed values and integers (SI); ``example`` is shown
    in messages and as a placeholder.
    """

    kind: str
    unit: str = ""
    required: bool = False
    default: Any = None
    help: str = ""
    lo: float | None = None
    hi: float | None = None
    example: str = ""


#: Keys every element table has (placement, material, coating).
COMMON_FIELDS: dict[str, Field] = {
    "kind": Field("str", required=True, help="element kind"),
    "name": Field("str", help="label shown in results"),
    "position": Field("position", "mm", help="[x, y] of the element centre in plan (or give count and layout)",
                      example='["10 mm", "0 mm"]'),
    "mount": Field("signed_length", "mm", default=0.0, lo=-0.1, hi=0.1, example="0 mm",
                   help="height of the element's lowest point above the body's reference plane "
                        "(a raised element touches later)"),
    "material": Field("material", help="material name, e.g. 'steel' (or material_density)"),
    "material_density": Field("density", "kg/m^3", help="material density, instead of a name",
                              example="7850 kg/m^3"),
    "coating": Field("coating", required=True, help="contact angles (advancing sets the limit) and texture",
                     example='{ advancing = "115 deg", receding = "95 deg" }'),
}


@dataclass
class ElementModel:
    """What the device solve needs of one element (SI units).

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
        Contact perimeter at the limit (for the Baudoin number); the same number as the kind's
        public result (:meth:`ElementKind.contact_perimeter`).
    footprint : ndarray (k, 2) [m]
        Convex plan outline (for drawing and overlap checks).
    field : callable (x, y) -> ndarray
        Outer linearised meniscus depth at plan points [m], per unit contact-line depth.
    broken_force : float [N]
        Upward force the element still gives once it has broken through (the buoyancy of its
        submerged volume, ρ g V; the meniscus no longer carries it).
    warnings : list of str
    model_name : str
    geometry : dict
        Kind-specific SI geometry (for the interaction model and drawings).
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
    broken_force: float = 0.0
    warnings: list[str] = field(default_factory=list)
    model_name: str = ""
    geometry: dict = field(default_factory=dict)

    @property
    def limit_force(self) -> float:
        """Force at the limit [N] (all points at their limit depths)."""
        return float(self.force[:, -1].sum())

    def force_at_depth(self, depth, tilt: float = 0.0) -> np.ndarray:
        """Total force [N] at depths [m] of the element's reference point, with the element
        tilted by ``tilt`` [rad] along the direction in which its force points are spread (for
        a rod: its axis; the points further along that direction go deeper).

        Points not yet touching give zero; points past their limit are held at their limit
        force (the element has then given way).

        >>> from floatcalc.elements import get_kind
        >>> m = get_kind("rod").model(EXAMPLE_ROD, __import__("floatcalc").water())
        >>> bool(m.force_at_depth(0.5e-3) < m.force_at_depth(1.0e-3) <= m.limit_force)
        True
        """
        d = np.atleast_1d(np.asarray(depth, dtype=float))
        c = self.points.mean(axis=0)
        rel = self.points - c
        spread = rel[np.argmax(np.hypot(rel[:, 0], rel[:, 1]))] if len(rel) > 1 else np.array([1.0, 0.0])
        nrm = np.hypot(*spread)
        u = spread / nrm if nrm > 0 else np.array([1.0, 0.0])
        off = self.offsets + math.tan(tilt) * (rel @ u)
        out = np.zeros(d.shape)
        for j in range(len(self.points)):
            e = d + off[j]
            f = np.interp(e, self.depth[j], self.force[j], left=0.0, right=self.force[j, -1])
            out += np.where(e < self.depth[j, 0], 0.0, f)
        return out if np.ndim(depth) else float(out[0])

    @property
    def limit_depth(self) -> float:
        return float(self.depth[:, -1].min())


def from_first_contact(D, *tables):
    """Cut tabulated laws so they start at depth 0 (first contact when pushed down from above).

    Parts of a force–depth curve at negative depth (liquid clinging to an element held above
    the surface) belong to the lifting (receding) branch and are not reached by a device set
    down on the liquid. The value at depth 0 is interpolated; a negative force there is the
    real snap-in pull of a freshly wetted element.
    """
    D = np.asarray(D, dtype=float)
    if D[0] >= 0.0 or D[-1] <= 0.0:
        return (D, *tables)
    keep = D > 0.0
    out = [np.concatenate([[0.0], D[keep]])]
    for T in tables:
        T = np.asarray(T, dtype=float)
        out.append(np.concatenate([[np.interp(0.0, D, T)], T[keep]]))
    return tuple(out)


class ElementKind:
    """Base of every element kind; subclasses set the class attributes and implement
    :meth:`solve` and :meth:`model`.

    Parameters handed to the methods (``p``) are the validated SI values of one element table:
    every field of :attr:`fields` (defaults filled in), ``density`` [kg/m³] and
    ``material_name`` (or None), ``position`` (x, y) [m] and, for oriented kinds, ``heading``.
    """

    #: kind name as written in design files (``kind = "rod"``)
    name: str = ""
    #: short noun for people ("long leg", "ball foot"); ``plural`` if not label + "s"
    label: str = ""
    plural: str = ""
    #: one-line description (help texts, the page's kind chooser)
    summary: str = ""
    #: kind-specific inputs (geometry); :data:`COMMON_FIELDS` are added by :attr:`all_fields`
    fields: dict[str, Field] = {}
    #: the field whose value is the length of the Bond number, and its name in words
    bond_field: str = "radius"
    bond_words: str = "radius"
    #: True if the kind has an axis in plan (``heading``) that a layout points outward
    oriented: bool = False
    #: CLI command name for the single-element command (None: no command)
    command: str | None = None
    #: If set, the reason this kind cannot be used (reported when a design file names it).
    unavailable: str | None = None

    @property
    def all_fields(self) -> dict[str, Field]:
        return {**COMMON_FIELDS, **self.fields}

    def noun(self, n: int) -> str:
        """``"1 ball foot"``, ``"4 ball feet"``."""
        return f"{n} {self.label if n == 1 else (self.plural or self.label + 's')}"

    def check(self, p: dict[str, Any], path: str, problems: list[str]) -> None:
        """Extra checks across keys (append ``path.key: problem`` lines to ``problems``)."""

    def bond_length(self, p: dict[str, Any]) -> float:
        """Length [m] of the element's Bond number."""
        return float(p[self.bond_field])

    def footprint_radius(self, p: dict[str, Any]) -> float:
        """Radius [m] of a circle round the element's plan outline (layouts keep these apart)."""
        return float(p.get("radius", 0.0))

    def solve(self, p: dict[str, Any], liquid):  # pragma: no cover - abstract
        """The kind's public result (same numbers as its public function)."""
        raise NotImplementedError

    def model(self, p: dict[str, Any], liquid) -> ElementModel:  # pragma: no cover - abstract
        raise NotImplementedError


_KINDS: dict[str, ElementKind] = {}


def register_kind(kind: ElementKind) -> None:
    """Add (or replace) an element kind in the registry."""
    _KINDS[kind.name] = kind


def get_kind(name: str) -> ElementKind | None:
    _load_all()
    return _KINDS.get(name)


def kinds() -> list[ElementKind]:
    """Every registered kind, in registry order."""
    _load_all()
    return list(_KINDS.values())


def kind_names() -> list[str]:
    """Names of the registered element kinds.

    >>> "rod" in kind_names() and "ring" in kind_names()
    True
    """
    _load_all()
    return list(_KINDS)


_BUILTIN = ("rod", "rod_row", "flexible_leg", "pin", "ball", "pad", "ring")
_loaded = False


def _load_all() -> None:
    global _loaded
    if _loaded:
        return
    _loaded = True
    import importlib

    for m in _BUILTIN:
        importlib.import_module(f"floatcalc.elements.{m}")


# ------------------------------------------------------------------------------------------
# Shared pieces for the kinds' adapters


def circle(cx, cy, r, k=24):
    """(k, 2) plan outline of a circle."""
    t = np.linspace(0.0, 2.0 * np.pi, k, endpoint=False)
    return np.column_stack([cx + r * np.cos(t), cy + r * np.sin(t)])


def rectangle(cx, cy, ux, uy, half_l, half_w, start=None):
    """(4, 2) plan outline of a rectangle along (ux, uy); centred, or from ``start`` = 0."""
    a0, a1 = (-half_l, half_l) if start is None else (0.0, 2.0 * half_l)
    corners = np.array([[a0, -half_w], [a1, -half_w], [a1, half_w], [a0, half_w]])
    return np.column_stack([cx + corners[:, 0] * ux - corners[:, 1] * uy,
                            cy + corners[:, 0] * uy + corners[:, 1] * ux])


def rod_field(cx, cy, ux, uy, half, w):
    """Linearised outer field of a straight rod per unit contact depth [lengths in l_c].

    Beside the rod 2D decay e^(−(b − w)); beyond its ends the axisymmetric K₀(r)/K₀(w).
    """
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


def axisym_field(cx, cy, rc):
    """Linearised outer field K₀(r)/K₀(r_c) of a round element per unit contact depth [l_c]."""
    from scipy.special import k0e

    k0c = k0e(rc)

    def f(x, y):
        r = np.maximum(np.hypot(np.asarray(x, dtype=float) - cx, np.asarray(y, dtype=float) - cy), rc)
        return k0e(r) * np.exp(rc - r) / k0c

    return f


def scaled_field(f, lc):
    """A field in SI plan coordinates from one in capillary lengths."""
    return lambda x, y: f(np.asarray(x) / lc, np.asarray(y) / lc)


#: A rod for examples (SI values, as the design loader produces them).
EXAMPLE_ROD = {"kind": "rod", "name": "", "position": (0.0, 0.0), "mount": 0.0, "radius": 1.5e-4, "length": 0.02,
               "heading": 0.0, "tilt": 0.0, "segments": 5, "density": 7850.0, "material_name": "steel",
               "coating": {"advancing": math.radians(115), "texture": "none"}}


def effective_angle(theta, coating: dict[str, Any]):
    """Apparent advancing contact angle [rad] of a coating, through its texture model.

    Wenzel: cos θ* = r cos θ (roughness r ≥ 1); Cassie–Baxter: cos θ* = f (cos θ + 1) − 1
    (solid fraction 0 < f ≤ 1) [1]_ [2]_; posts or grooves (``post_size`` a, ``pitch`` p,
    ``post_height``): Cassie–Baxter with the tops' solid fraction f = a²/p² (posts) or a/p
    (grooves), the unflooded state at rest (:mod:`floatcalc.core.wetting`; whether a load or
    a stroke floods it is :mod:`floatcalc.motion.coating`'s question). The result is clipped to
    0–180°. Works on arrays of θ. The one place the texture models are applied (design files,
    devices, studies); the formulas live in :func:`floatcalc.core.wetting.effective_angle`.

    References
    ----------
    .. [1] R. N. Wenzel, Ind. Eng. Chem. 28, 988 (1936).
    .. [2] A. B. D. Cassie, S. Baxter, Trans. Faraday Soc. 40, 546 (1944).

    >>> round(math.degrees(effective_angle(math.radians(110), {"texture": "cassie", "solid_fraction": 0.2})), 2)
    150.27
    >>> round(math.degrees(effective_angle(math.radians(110), {"texture": "posts", "post_size": 1e-5,
    ...                                                          "pitch": 4e-5, "post_height": 2e-5})), 1)
    163.5
    """
    from ..core import wetting

    tex = coating.get("texture", "none")
    if tex in wetting.TEXTURES:
        f = wetting.solid_fraction(tex, coating["post_size"], coating["pitch"])
        return wetting.effective_angle(theta, "cassie", solid_fraction=f)
    return wetting.effective_angle(theta, tex, roughness=coating.get("roughness"),
                                   solid_fraction=coating.get("solid_fraction"))
