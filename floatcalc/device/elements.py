"""Element kinds of a device: a small registry, kind name -> adapter.

An adapter turns the validated parameters of one support element (SI floats) into an
:class:`ElementModel`: force points in plan with their force–depth tables (precomputed once,
vectorised, interpolated later by :mod:`floatcalc.core.equilibrium`), own weight, limit force
and depth, contact perimeter, plan footprint (for drawing and overlap checks) and the outer
meniscus field used to superpose neighbours. :meth:`ElementModel.force_at_depth` gives the
element's force at a depth and tilt in SI, for plotting or checks outside the device solve.

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
from dataclasses import dataclass, field, replace
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
        """Force at the limit [N] (all points at their limit depths)."""
        return float(self.force[:, -1].sum())

    def force_at_depth(self, depth, tilt: float = 0.0) -> np.ndarray:
        """Total force [N] at depths [m] of the element's reference point, with the element
        tilted by ``tilt`` [rad] along the direction in which its force points are spread (for
        a rod: its axis; the points further along that direction go deeper).

        Points not yet touching give zero; points past their limit are held at their limit
        force (the element has then given way).

        >>> m = get_kind("rod").model(_EXAMPLE_ROD, __import__("floatcalc").water())
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
        D0 = D
        D, hd = from_first_contact(D0, hd)
        F = np.array([from_first_contact(D0, row)[1] for row in F])
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

#: A rod for examples (SI values, as the design loader produces them).
_EXAMPLE_ROD = {"kind": "rod", "name": "", "position": (0.0, 0.0), "mount": 0.0, "radius": 1.5e-4, "length": 0.02,
                "heading": 0.0, "tilt": 0.0, "segments": 5, "density": 7850.0,
                "coating": {"advancing": math.radians(115), "texture": "none"}}


class RodRowKind(ElementKind):
    """N long parallel rods at equal spacing on one frame: exact 2D shared menisci.

    Uses :mod:`floatcalc.core.parallel2d` (turning-point first integral in each gap), whose law
    holds for a row level across its rods; if the device rolls across the row, each rod's force
    is taken from that law at its own depth (an approximation for small tilts). Outer rods carry an outer
    and an inner side, inner rods two inner sides. Seen from outside, the row's meniscus is that
    of a strip as wide as the row. End effects are not included (long rods; a warning below
    20 l_c).
    """

    name = "rod_row"
    summary = "row of long parallel rods sharing their menisci (exact 2D)"
    keys = {
        **COMMON_KEYS,
        "radius": Key("length", required=True, help="rod radius"),
        "length": Key("length", required=True, help="wetted length of each rod"),
        "count": Key("int", required=True, help="number of rods (2–50)", lo=2, hi=50),
        "spacing": Key("length", required=True, help="centre-to-centre spacing, more than 2 radii"),
        "heading": Key("signed_angle", default=0.0, help="direction of the rods' axes in plan, from +x",
                       lo=-2 * math.pi, hi=2 * math.pi),
        "segments": Key("int", default=5, help="force points along each rod (2–50)", lo=2, hi=50),
    }

    def check(self, p, path, problems):
        if p["spacing"] <= 2 * p["radius"]:
            problems.append(f"{path}.spacing: must exceed twice the radius ({2 * p['radius'] * 1e3:.4g} mm): "
                            f"the rods would overlap, got {p['spacing'] * 1e3:.4g} mm")
        if p["length"] < 4 * p["radius"]:
            problems.append(f"{path}.length: must be at least 4 radii, got {p['length'] * 1e3:.4g} mm")

    def model(self, p, liquid):
        from ..core import parallel2d

        lc, s = liquid.lc, liquid.sigma
        R, L, S, N = p["radius"] / lc, p["length"] / lc, p["spacing"] / lc, p["count"]
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        po, co, fo = parallel2d.outer_side(R, th, 1201)
        pi_, ci, fi, _ = parallel2d.inner_side(R, th, S, 1201)
        row = parallel2d.row_curve(R, th, S, N, n=2401)
        c_lim = row["depth"][row["i_max"]] - R
        c0 = max(co[0], ci[0], -R)
        c = np.linspace(c0, c_lim, TABLE_POINTS)
        f_out = np.interp(c, co, fo)
        f_in = np.interp(c, ci, fi)
        psi_o = np.interp(c, co, po) + th - np.pi
        h_out = 2.0 * np.sin(0.5 * psi_o)
        D = c + R
        D, h_out, f_out, f_in = from_first_contact(D, h_out, f_out, f_in)
        n = p["segments"]
        seg = L / n
        ux, uy = math.cos(p["heading"]), math.sin(p["heading"])
        vx, vy = -uy, ux
        cx, cy = p["position"]
        along = (np.arange(n) + 0.5) / n * p["length"] - 0.5 * p["length"]
        across = (np.arange(N) - 0.5 * (N - 1)) * p["spacing"]
        pts, rows = [], []
        for k, a in enumerate(across):
            per_len = (f_out + f_in) if k in (0, N - 1) else 2.0 * f_in
            for b in along:
                pts.append((cx + b * ux + a * vx, cy + b * uy + a * vy))
                rows.append(per_len * seg)
        m = N * n
        half_w = 0.5 * (N - 1) * p["spacing"] + p["radius"]
        half_l = 0.5 * p["length"]
        corners = np.array([[-half_l, -half_w], [half_l, -half_w], [half_l, half_w], [-half_l, half_w]])
        foot = np.column_stack([cx + corners[:, 0] * ux + corners[:, 1] * vx,
                                cy + corners[:, 0] * uy + corners[:, 1] * vy])
        field_s = _rod_field(cx / lc, cy / lc, ux, uy, 0.5 * L, half_w / lc)
        warnings = []
        if L < 20.0:
            warnings.append(f"rod length {p['length'] * 1e3:.3g} mm is under 20 capillary lengths: end effects "
                            "of the row are not included")
        weight = N * p["density"] * math.pi * p["radius"] ** 2 * p["length"] * liquid.g
        return ElementModel(
            points=np.array(pts), offsets=np.full(m, -p["mount"]),
            depth=np.tile(D * lc, (m, 1)), force=np.array(rows) * s * lc, contact=np.tile(h_out * lc, (m, 1)),
            own_weight=weight, perimeter=N * (2.0 * p["length"] + 2.0 * math.pi * p["radius"]),
            footprint=foot, field=lambda x, y, f=field_s: f(np.asarray(x) / lc, np.asarray(y) / lc),
            warnings=warnings, model_name="exact 2D parallel rods (core.parallel2d)",
        )


register_kind(RodRowKind())


class FlexibleLegKind(ElementKind):
    """Wire leg clamped at ``position`` that bends under its load (floatcalc.flexleg)."""

    name = "flexible_leg"
    summary = "flexible wire leg clamped to the body, bending under its capillary load"
    keys = {
        **COMMON_KEYS,
        "radius": Key("length", required=True, help="wire radius"),
        "length": Key("length", required=True, help="leg length from the clamp to the tip"),
        "heading": Key("signed_angle", default=0.0, help="direction of the leg from its clamp in plan, from +x",
                       lo=-2 * math.pi, hi=2 * math.pi),
        "clamp_angle": Key("signed_angle", default=0.0, help="slope at the clamp below horizontal",
                           lo=-math.radians(45), hi=math.radians(45)),
        "toe_angle": Key("angle", default=0.0, help="upturned toe over the last 10 % of the leg (0-90 deg)"),
        "youngs_modulus": Key("str", help="Young's modulus, e.g. '200 GPa' (default: from the material)"),
    }

    def check(self, p, path, problems):
        from ..errors import InputError
        from ..materials import youngs_modulus

        if p.get("youngs_modulus") is not None:
            try:
                youngs_modulus(p["youngs_modulus"])
            except InputError as exc:
                problems.append(f"{path}.{exc}")
        elif p.get("material_name") is None:
            problems.append(f"{path}.youngs_modulus: required when no material name is given "
                            f"(e.g. '200 GPa'), got neither")

    def model(self, p, liquid):
        from ..flexleg import flexible_leg_curve

        E = p.get("youngs_modulus")
        mat = p.get("material_name")
        if E is None and mat is None:
            from ..errors import input_error

            raise input_error("youngs_modulus", "a flexible_leg needs a material name or a Young's modulus",
                              "neither")
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        c = flexible_leg_curve(p["radius"], p["length"], th, youngs_modulus=E, material=mat,
                               clamp_angle=p["clamp_angle"], toe_angle=p["toe_angle"] or None,
                               material_density=p["density"], liquid=liquid, points=25, start="touch")
        D = c.clamp_depth.to("m").magnitude
        F = c.force.to("N").magnitude
        H = c.contact_depth.to("m").magnitude
        grid = np.linspace(D[0], D[-1], TABLE_POINTS)
        ux, uy = math.cos(p["heading"]), math.sin(p["heading"])
        cx, cy = p["position"]
        lc = liquid.lc
        half_w = p["radius"]
        corners = np.array([[0.0, -half_w], [p["length"], -half_w], [p["length"], half_w], [0.0, half_w]])
        foot = np.column_stack([cx + corners[:, 0] * ux - corners[:, 1] * uy,
                                cy + corners[:, 0] * uy + corners[:, 1] * ux])
        mid = (cx + 0.5 * p["length"] * ux, cy + 0.5 * p["length"] * uy)
        field_s = _rod_field(mid[0] / lc, mid[1] / lc, ux, uy, 0.5 * p["length"] / lc, p["radius"] / lc)
        return ElementModel(
            points=np.array([[cx, cy]]),
            offsets=np.array([-p["mount"]]),
            depth=grid[None, :],
            force=np.interp(grid, D, F)[None, :],
            contact=np.interp(grid, D, H)[None, :],
            own_weight=c.own_weight.to("N").magnitude,
            perimeter=2.0 * p["length"] + 2.0 * math.pi * p["radius"],
            footprint=foot,
            field=lambda x, y, f=field_s: f(np.asarray(x) / lc, np.asarray(y) / lc),
            warnings=[*c.warnings, "flexible leg: its force acts at the clamp in the device balance (the clamp "
                      "moment is not passed to pitch and roll); depth is the clamp's"],
            model_name="elastica on the exact 2D rod law (floatcalc.flexleg; Vella, Lee & Kim 2006; Hetényi 1946)",
        )


register_kind(FlexibleLegKind())


def _circle(cx, cy, r, k=24):
    t = np.linspace(0.0, 2.0 * np.pi, k, endpoint=False)
    return np.column_stack([cx + r * np.cos(t), cy + r * np.sin(t)])


def _axisym_field(cx, cy, rc):
    """Linearised outer field K₀(r)/K₀(r_c) of a round element per unit contact depth [lengths in l_c]."""
    from scipy.special import k0e

    k0c = k0e(rc)

    def f(x, y):
        r = np.maximum(np.hypot(np.asarray(x, dtype=float) - cx, np.asarray(y, dtype=float) - cy), rc)
        return k0e(r) * np.exp(rc - r) / k0c

    return f


class _RoundKind(ElementKind):
    """Adapter over :mod:`floatcalc.round`: one force point with the element's force–depth curve.

    The curve is cut at the element's limit (``depth_at_max``). The contact-line depth that
    drives the neighbours is taken from the surface-tension part through Keller's theorem for
    the linearised outer meniscus, F_st = 2π σ r_c h₀ K₁(r_c/l_c)/(l_c K₀(r_c/l_c)), with r_c the
    outer contact radius at the limit (an approximation for a ring, whose inner line pulls on
    enclosed liquid that does not spread outward).
    """

    geometry: dict[str, Key] = {}

    def __init__(self):
        self.keys = {**COMMON_KEYS, **self.geometry}

    def compute(self, p, th, liquid):  # pragma: no cover - abstract
        raise NotImplementedError

    def outer_radius(self, p, res) -> float:
        return float(res.contact_radius_at_max.to("m").magnitude)

    def perimeter(self, p, rc) -> float:
        return 2.0 * math.pi * rc

    def model(self, p, liquid):
        from scipy.special import k0e, k1e

        lc, s = liquid.lc, liquid.sigma
        th = effective_angle(p["coating"]["advancing"], p["coating"])
        res = self.compute(p, th, liquid)
        c = res.curve
        D = c.depth.to("m").magnitude
        F = c.force.to("N").magnitude
        Fst = c.surface_tension.to("N").magnitude
        d_lim = self.limit_depth(p, res, D)
        keep = D < d_lim
        f_lim = float(np.interp(d_lim, D, F))
        st_lim = float(np.interp(d_lim, D, Fst))
        D = np.append(D[keep], d_lim)
        F = np.append(F[keep], f_lim)
        Fst = np.append(Fst[keep], st_lim)
        D, F, Fst = from_first_contact(D, F, Fst)
        grid = np.linspace(D[0], D[-1], TABLE_POINTS)
        Fg = np.interp(grid, D, F)
        rc = max(self.outer_radius(p, res), 1e-9)
        h0 = np.interp(grid, D, Fst) * lc / (s * 2.0 * math.pi * rc * k1e(rc / lc) / k0e(rc / lc))
        cx, cy = p["position"]
        field_s = _axisym_field(cx / lc, cy / lc, rc / lc)
        return ElementModel(
            points=np.array([[cx, cy]]), offsets=np.array([-p["mount"]]),
            depth=grid[None, :], force=Fg[None, :], contact=h0[None, :],
            own_weight=float(res.own_weight.to("N").magnitude), perimeter=self.perimeter(p, rc),
            footprint=_circle(cx, cy, self.footprint_radius(p)),
            field=lambda x, y, f=field_s: f(np.asarray(x) / lc, np.asarray(y) / lc),
            warnings=[w for w in res.warnings if "material density" not in w],
            model_name=f"axisymmetric meniscus (floatcalc.round.{self.name})",
        )

    def limit_depth(self, p, res, D) -> float:
        return float(res.depth_at_max.to("m").magnitude)

    def footprint_radius(self, p) -> float:
        return p["radius"]


class BallKind(_RoundKind):
    name = "ball"
    summary = "ball foot (sphere) pressed into the surface"
    geometry = {"radius": Key("length", required=True, help="ball radius")}

    def compute(self, p, th, liquid):
        from .. import round as rd

        return rd.ball(p["radius"], th, liquid=liquid, material_density=p["density"])


class PadKind(_RoundKind):
    name = "pad"
    summary = "flat circular pad with sharp edges"
    geometry = {"radius": Key("length", required=True, help="pad radius"),
                "thickness": Key("length", required=True, help="pad thickness")}

    def compute(self, p, th, liquid):
        from .. import round as rd

        return rd.pad(p["radius"], p["thickness"], th, liquid=liquid, material_density=p["density"])


class RingKind(_RoundKind):
    name = "ring"
    summary = "closed wire ring lying flat in the surface"
    geometry = {"ring_radius": Key("length", required=True, help="radius of the ring's centre line"),
                "wire_radius": Key("length", required=True, help="radius of the wire")}

    def check(self, p, path, problems):
        if p["wire_radius"] >= p["ring_radius"]:
            problems.append(f"{path}.wire_radius: must be smaller than ring_radius "
                            f"({p['ring_radius'] * 1e3:.4g} mm), got {p['wire_radius'] * 1e3:.4g} mm")

    def compute(self, p, th, liquid):
        from .. import round as rd

        return rd.ring(p["ring_radius"], p["wire_radius"], th, liquid=liquid, material_density=p["density"])

    def outer_radius(self, p, res):
        return p["ring_radius"] + p["wire_radius"]

    def perimeter(self, p, rc):
        return 4.0 * math.pi * p["ring_radius"]

    def footprint_radius(self, p):
        return p["ring_radius"] + p["wire_radius"]


class PinKind(_RoundKind):
    """Vertical pin dipped tip-first. It does not sink by meniscus failure: its force keeps
    rising until the body reaches the surface, so its limit is taken at tip depth = ``length``
    (the pin's protrusion below the body), or the end of the computed curve if shorter."""

    name = "pin"
    summary = "vertical pin (fibre) dipped tip-first"
    geometry = {"radius": Key("length", required=True, help="pin radius"),
                "length": Key("length", required=True, help="protrusion of the pin below the body")}

    def compute(self, p, th, liquid):
        from .. import round as rd

        res = rd.pin(p["radius"], th, length=p["length"], liquid=liquid, material_density=p["density"])
        # the device uses the force over tip depth (its curve includes the tip pressure), so
        # the single-depth note about a tip taken far below does not apply here
        return replace(res, warnings=tuple(w for w in res.warnings if not w.startswith("tip depth not given")))

    def limit_depth(self, p, res, D):
        return float(min(p["length"], D[-1]))

    def outer_radius(self, p, res):
        return p["radius"]


for _k in (BallKind(), PadKind(), RingKind(), PinKind()):
    register_kind(_k)


class PendingKind(ElementKind):
    """Placeholder for a kind whose model is not available: design files naming it get a clear
    ``legs[i].kind: element kind 'NAME' needs MODULE ...`` line instead of a guess.

    ``register_kind(PendingKind("flexible_rod", "flexible wire leg", "floatcalc.flexleg"))``
    """

    def __init__(self, name: str, summary: str, needs: str = "floatcalc.round"):
        self.name = name
        self.summary = summary + " (not yet available)"
        self.keys = {**COMMON_KEYS}
        self.unavailable = f"element kind '{name}' needs {needs}, which this version does not have yet"

    def model(self, p, liquid):
        from ..errors import input_error

        raise input_error("kind", self.unavailable, repr(self.name))


