"""Independent finite-element reference solver of the Young–Laplace meniscus in plan (test-only).

This module is used only by the tests: it gives reference values where no published one exists
(finite strips, crossing strips, neighbours of different shapes) by a method that shares nothing
with floatcalc's own solvers: a general finite-element library (scikit-fem) on an unstructured
triangle mesh (Triangle, through the ``triangle`` package; footprint unions by ``shapely``).
The floatcalc package never imports it.

Scaled variables: lengths in capillary lengths l_c, σ = 1, ρg = 1, forces in σ l_c.

Equations
---------
The free surface is the graph z = −h(x, y) (h the depth below the undisturbed level, positive
down) on the plan domain Ω between the bodies' footprints and a far circle of radius R_d:

* linearised:  ∇²h = h;
* nonlinear (the surface stays a graph):  div(∇h / q) = h,  q = √(1 + |∇h|²),
  solved by Newton's method from the linearised solution (damped, with continuation in the
  boundary data when a full step fails).

Boundary conditions:

* on a body's contact line (the footprint boundary, pinned): h = h_c (Dirichlet);
* on the far circle r = R_d: the K₀ far field ∂ₙh = −h K₁(R_d)/K₀(R_d) (Robin; exact for the
  axisymmetric far mode, and the far field is O(e^{−R_d}) anyway);
* optionally, a thin horizontal rod of radius R, lowest point at depth D, contact angle θ
  (:func:`rod_body`), linearised about the contact position φ₀ = π − θ where the interface
  is level (ψ = φ + θ − π = 0), with half-width w₀ = R sin φ₀: from h_c = D − R(1 − cos φ)
  and ψ ≈ ∂ₙh (slope into the body) to first order,

  .. math:: h + w_0\\,\\partial_n h = D - R(1 - \\cos\\varphi_0) = D - R(1 + \\cos\\theta),

  with n the normal pointing from the liquid into the footprint (Robin, natural in the weak
  form). In the nonlinear problem the full condition is used instead, as a flux law:
  sin ψ = ∂ₙh/q = g(h) = c sin θ − cos θ √(1 − c²), c = (D − h)/R − 1 = cos(θ − ψ) (from the
  same two relations, exact). Either way the footprint is kept at half-width w₀: the contact
  line's plan position R sin φ moves by R(sin φ − sin φ₀), which is neglected (exact for one long
  rod, whose 2D meniscus is translation invariant; an O(R Δφ) shift of the gap to a neighbour
  and at the rod's ends otherwise).

Outputs
-------
Per body, the vertical surface-tension force F = ∮ sin ψ ds, sin ψ = ∂ₙh / q, computed

(a) ``line``: directly, from the gradient of the finite-element solution on the contact line;
(c) ``flux``: as the weak-form residual of the discrete solution tested with a function equal to
    1 on that body's contact line and 0 on the others (a variationally consistent flux, more
    accurate than (a));

and for all bodies together

(b) ``keller``: the volume displaced by the meniscus, ∫∫_Ω h dA plus the far-field volume beyond
    R_d (κ ∮ h ds, κ = K₁/K₀(R_d)). Keller's theorem [1]_: the total vertical surface-tension
    force on the bodies equals that volume, exactly, for the nonlinear problem too.

(a) and (b) are independent computations; (c) summed over the bodies equals (b) up to the
linear-solver tolerance (a property of the Galerkin method, not a check).

Mesh and accuracy: quadratic (P2) elements on curved (isoparametric P2) contact lines; Triangle
mesh graded from the contact lines, element size there = the local boundary spacing (``h_line``
= 0.1 l_c on straight parts, or gap/6 between bodies; arcs chorded at min(0.05 rad, h_line/r);
corners CORNER_FACTOR = 8 times finer), growing by ``grading`` = 0.25 per unit distance up to
``h_far`` = 1 l_c; ``level`` k divides every size by 2^k. Measured (tests/reference/
fem3d_study.py): the flux and the Keller volume converge as h⁴ (disc, r_c = 1: 7e-6, 4e-7, 3e-8,
2e-9 relative at levels 0–3), the contact-line integral as h² (6e-4, 6e-5, 1.3e-5, 3.4e-6); at
footprint corners (rectangles) the contact-line integral converges only about as h (the
gradient is singular there), the flux stays accurate. :func:`reference` solves at two or three
levels and returns an error estimate (the change between the last two levels) and the observed
order.

Validity: static, pinned contact lines (or the linearised rod condition), the surface a graph
over the plan (moderate slopes, ψ up to about 60°), footprints of disjoint bodies, R_d a few
capillary lengths beyond the bodies.

References
----------
.. [1] J. B. Keller, "Surface tension force on a partly submerged body", Phys. Fluids 10, 3009
   (1998).

Examples
--------
>>> import math
>>> round(disc_linear_force(1.0, 0.1), 6)   # 2π r_c h_c K₁(r_c)/K₀(r_c), closed form
0.89826
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field

import numpy as np

__all__ = [
    "stadium", "rectangle", "disc", "annulus", "Body", "dirichlet_body", "rod_body",
    "build_mesh", "solve", "reference", "disc_linear_force", "Solution", "finite_strip_force",
    "parallel_strips", "two_strips", "crossing_strips", "strip_beside_disc", "parallel_rods",
    "ball_body",
]

MAX_ARC_ANGLE = 0.05  # [rad] largest chord angle on arcs at level 0 (curved P2 geometry)
H_LINE = 0.1  # [l_c] default element size on straight contact lines at level 0
CORNER_FACTOR = 8.0  # elements this much smaller at footprint corners


# ----------------------------------------------------------------------------- footprints
def stadium(cx: float, cy: float, heading: float, length: float, half_width: float):
    """Stadium footprint (rod with rounded ends): centre, heading [rad], tip-to-tip length, w."""
    if not (half_width > 0 and length >= 2 * half_width):
        raise ValueError("stadium: need half_width > 0 and length >= 2 half_width")
    return ("stadium", float(cx), float(cy), float(heading), float(length), float(half_width))


def rectangle(cx: float, cy: float, heading: float, length: float, half_width: float):
    """Rectangle footprint: centre, heading of the long axis [rad], length, half-width."""
    if not (half_width > 0 and length > 0):
        raise ValueError("rectangle: need positive length and half_width")
    return ("rect", float(cx), float(cy), float(heading), float(length), float(half_width))


def disc(cx: float, cy: float, radius: float):
    """Disc footprint (round pad, ball foot contact line, pin)."""
    if not radius > 0:
        raise ValueError("disc: need radius > 0")
    return ("disc", float(cx), float(cy), float(radius))


def annulus(cx: float, cy: float, r_in: float, r_out: float):
    """Annulus footprint (ring footpad); the disc it encloses is free surface."""
    if not (0 < r_in < r_out):
        raise ValueError("annulus: need 0 < r_in < r_out")
    return ("annulus", float(cx), float(cy), float(r_in), float(r_out))


def _feature(shape) -> float:
    """Smallest length scale of a footprint (sets the default contact-line mesh size)."""
    kind = shape[0]
    if kind in ("stadium", "rect"):
        return shape[5]
    if kind == "disc":
        return shape[3]
    return min(0.5 * (shape[4] - shape[3]), shape[3])


def _geometry(shape, angle: float):
    """Shapely polygon of a footprint, arcs chorded at ``angle`` [rad] or finer."""
    from shapely import affinity
    from shapely.geometry import LineString, Point, box

    kind = shape[0]
    qs = max(4, int(math.ceil(0.5 * math.pi / angle)))  # segments per quarter circle
    if kind == "disc":
        return Point(shape[1], shape[2]).buffer(shape[3], quad_segs=qs)
    if kind == "annulus":
        c = Point(shape[1], shape[2])
        return c.buffer(shape[4], quad_segs=qs).difference(c.buffer(shape[3], quad_segs=qs))
    _, cx, cy, hd, L, w = shape
    if kind == "rect":
        g = box(-0.5 * L, -w, 0.5 * L, w)
    else:
        a = 0.5 * L - w
        g = Point(0, 0).buffer(w, quad_segs=qs) if a <= 0 else LineString([(-a, 0), (a, 0)]).buffer(w, quad_segs=qs)
    g = affinity.rotate(g, hd, origin=(0, 0), use_radians=True)
    return affinity.translate(g, cx, cy)


def _project(shape, p: np.ndarray):
    """Nearest points on the exact boundary of a footprint, and distances, for points p (2, n)."""
    kind = shape[0]
    c = np.array([[shape[1]], [shape[2]]])
    if kind in ("disc", "annulus"):
        d = p - c
        r = np.hypot(*d)
        rs = [shape[3]] if kind == "disc" else [shape[3], shape[4]]
        best = np.full(r.shape, np.inf)
        q = p.copy()
        for R in rs:
            dist = np.abs(r - R)
            sel = dist < best
            q[:, sel] = c + R * d[:, sel] / np.maximum(r[sel], 1e-300)
            best = np.where(sel, dist, best)
        return q, best
    _, cx, cy, hd, L, w = shape
    ch, sh = math.cos(hd), math.sin(hd)
    x = ch * (p[0] - cx) + sh * (p[1] - cy)
    y = -sh * (p[0] - cx) + ch * (p[1] - cy)
    if kind == "stadium":
        a = max(0.5 * L - w, 0.0)
        xs = np.clip(x, -a, a)
        dx, dy = x - xs, y
        r = np.maximum(np.hypot(dx, dy), 1e-300)
        xq, yq, dist = xs + w * dx / r, w * dy / r, np.abs(r - w)
    else:  # rectangle: straight sides, points stay where they are
        xq, yq = x, y
        dist = np.minimum(np.abs(np.abs(x) - 0.5 * L) + np.maximum(np.abs(y) - w, 0.0),
                          np.abs(np.abs(y) - w) + np.maximum(np.abs(x) - 0.5 * L, 0.0))
    q = np.vstack([cx + ch * xq - sh * yq, cy + sh * xq + ch * yq])
    return q, dist


def _project_body(body, p: np.ndarray) -> np.ndarray:
    """Project points lying on a body's (polygonal) contact line onto its exact curves."""
    best = np.full(p.shape[1], np.inf)
    q = p.copy()
    for s in body.shapes:
        qs, ds = _project(s, p)
        sel = ds < best
        q[:, sel] = qs[:, sel]
        best = np.where(sel, ds, best)
    return q


# ----------------------------------------------------------------------------- bodies
@dataclass(frozen=True)
class Body:
    """A body: the union of its footprint shapes, with one contact-line condition.

    ``kind`` is ``"dirichlet"`` (pinned contact line at depth ``h_c``) or ``"rod"`` (the
    linearised contact-angle condition of a thin horizontal rod, see the module docstring).
    """

    shapes: tuple
    kind: str = "dirichlet"
    h_c: float = 0.0
    rod: tuple = ()  # (R, D, theta) for kind == "rod"
    name: str = ""
    #: "round" (the rod condition all round a stadium or rectangle), "flat": a rectangle whose
    #: two end edges are flat vertical end faces with the contact line pinned at their bottom
    #: rim (Dirichlet h = D there; the pinned rim point carries no vertical force), or "wall":
    #: the contact line on the end faces, meeting them at Young's angle, ψ = θ − π/2 (Neumann
    #: ∂ₙh = tan ψ there). For "flat" and "wall" the body's forces are those of the two long
    #: sides only (``line`` and ``flux``); the end faces' share is left out.
    ends: str = "round"
    #: slope ∂ₙh prescribed on "wall" end faces (default tan(θ − π/2))
    wall_slope: float | None = None
    #: rod footprint at half-width w₀ + shift; the side condition is carried over the shift by
    #: the 1D linear solution e^{−y} (as floatcalc.core.interactions carries its panel lines)
    shift: float = 0.0


def dirichlet_body(*shapes, h_c: float, name: str = "") -> Body:
    """Body whose contact line is pinned on its footprint boundary at depth ``h_c`` [l_c]."""
    return Body(tuple(shapes), "dirichlet", float(h_c), (), name)


def rod_body(center, heading: float, length: float, R: float, D: float, theta: float,
             *, ends: str = "stadium", name: str = "", wall_slope: float | None = None,
             line_at_radius: bool = False) -> Body:
    """Thin horizontal rod (radius R, lowest point at depth D, contact angle θ [rad]).

    Footprint: stadium (``ends="stadium"``, the rod condition all round), rectangle
    (``"rect"``, the rod condition on all four edges) or ``"flat"``: a rectangle whose end edges
    are flat end faces pinned at their bottom rim (h = D there, no force), or ``"wall"``: flat
    end faces met at Young's angle (∂ₙh = tan(θ − π/2)), as the end faces of
    floatcalc.core.interactions while their contact line lies on the face (forces: the long
    sides only); half-width w₀ = R sin(π − θ); contact-line condition
    h + w₀ ∂ₙh = D − R(1 + cos θ) in the linear problem (linearised about the level-contact
    position φ₀ = π − θ), sin ψ = g(h) in the nonlinear one (module docstring). Needs
    0 < θ < π (w₀ > 0); linear: small slopes (|ψ| ≪ 1); footprint fixed at w₀ (see above).
    """
    w0 = R * math.sin(math.pi - theta)
    half = R if line_at_radius else w0
    shape = (stadium if ends == "stadium" else rectangle)(center[0], center[1], heading, length, half)
    return Body((shape,), "rod", 0.0, (float(R), float(D), float(theta)), name,
                ends if ends in ("flat", "wall") else "round", wall_slope, half - w0)


def ball_body(center, a: float, D: float, theta: float, r_c: float, *, name: str = "") -> Body:
    """Sphere of radius a (lowest point at depth D, contact angle θ [rad]) on a disc footprint
    of radius r_c, held fixed (the contact line's plan radius a sin φ moves with φ; neglected,
    as for rods): the sphere's section through its axis is the rod's circle, so its contact
    condition is the rod's flux law sin ψ = g(h) with R → a (module docstring). Nonlinear
    problem only (the linear initial guess uses the rod's Robin form with w₀ = a sin(π − θ))."""
    return Body((disc(center[0], center[1], r_c),), "rod", 0.0, (float(a), float(D), float(theta)), name)


def _end_facets(md, body, facets):
    """Split a flat-ended rod's contact-line facets into (sides, ends) by their midpoints."""
    _, cx, cy, hd, L, w = body.shapes[0]
    m = md.mesh_lin
    mid = m.p[:, m.facets[:, facets]].mean(axis=1)
    x = math.cos(hd) * (mid[0] - cx) + math.sin(hd) * (mid[1] - cy)
    end = np.abs(x) > 0.5 * L - 1e-9 * max(L, 1.0)
    return facets[~end], facets[end]


# ----------------------------------------------------------------------------- mesh
def _rings(geom):
    """Closed rings (exterior and interiors) of a (multi)polygon, as (n, 2) arrays (open)."""
    polys = list(geom.geoms) if hasattr(geom, "geoms") else [geom]
    out = []
    for p in polys:
        for ring in [p.exterior, *p.interiors]:
            xy = np.asarray(ring.coords)[:-1]
            out.append(xy)
    return polys, out


def _resample(xy: np.ndarray, step: float) -> np.ndarray:
    """Subdivide the edges of a closed polygon so that none is longer than ``step``, after
    dropping vertices closer than step/1000 to the previous kept one (near-duplicates that a
    union leaves where footprints touch would force needlessly tiny elements)."""
    keep = [0]
    for k in range(1, len(xy)):
        if np.hypot(*(xy[k] - xy[keep[-1]])) > 1e-3 * step:
            keep.append(k)
    if len(keep) > 2 and np.hypot(*(xy[keep[-1]] - xy[0])) <= 1e-3 * step:
        keep.pop()
    xy = xy[keep]
    nxt = np.roll(xy, -1, axis=0)
    pts = []
    for a, b in zip(xy, nxt):
        n = max(1, int(math.ceil(np.hypot(*(b - a)) / step - 1e-9)))
        t = np.arange(n)[:, None] / n
        pts.append(a + t * (b - a))
    return np.vstack(pts)


@dataclass
class MeshData:
    mesh: object
    body_facets: list
    outer_facets: np.ndarray
    center: tuple
    radius: float
    contact_length: list
    mesh_lin: object = None


def build_mesh(bodies, *, h_line: float | None = None, grading: float = 0.25, h_far: float = 1.0,
               margin: float = 10.0, level: int = 0, passes: int = 3, curved: bool = True) -> MeshData:
    """Graded triangle mesh of the free surface around the bodies' footprints.

    Size function s(x) = min(h_far, min_j (s_j + grading·|x − x_j|)) / 2^level over the contact-
    line vertices x_j, s_j their local spacing (shorter adjacent edge, divided by CORNER_FACTOR at
    corners). ``h_line`` (spacing on straight contact lines) defaults to min(0.1, gap/6), gap the
    smallest distance between bodies; arcs of radius r are chorded at min(0.05, h_line/r) rad.
    Contact-line nodes and edge midpoints are then moved onto the exact curves (P2 geometry).
    """
    import shapely
    import triangle as tr
    from scipy.spatial import cKDTree
    from shapely.ops import unary_union
    from skfem import MeshTri, MeshTri2

    geoms0 = [unary_union([_geometry(s, MAX_ARC_ANGLE) for s in b.shapes]) for b in bodies]
    for i in range(len(geoms0)):
        for j in range(i):
            if geoms0[i].intersects(geoms0[j]):
                raise ValueError(f"bodies {j} and {i} overlap: join them into one body")
    if h_line is None:
        h_line = H_LINE
        if len(geoms0) > 1:
            gap = min(geoms0[i].distance(geoms0[j]) for i in range(len(geoms0)) for j in range(i))
            h_line = min(h_line, gap / 6.0)  # at least six elements across the narrowest gap
    scale = 0.5 ** level
    hl, hf = h_line * scale, h_far * scale
    geoms = [unary_union([_geometry(s, min(MAX_ARC_ANGLE, h_line / _feature(s)) * scale) for s in b.shapes])
             for b in bodies]
    allg = unary_union(geoms)
    x0, y0, x1, y1 = allg.bounds
    cx, cy = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
    reach = max(np.max(np.hypot(r[:, 0] - cx, r[:, 1] - cy)) for g in geoms for r in _rings(g)[1])
    Rd = reach + margin

    verts, segs, marks, holes, lengths, sizes = [], [], [], [], [], []
    n0 = 0
    for i, g in enumerate(geoms):
        polys, rings = _rings(g)
        lengths.append(float(g.length))
        for p in polys:
            rp = p.representative_point()
            holes.append((rp.x, rp.y))
        for r in rings:
            xy = _resample(r, hl)
            m = len(xy)
            # Local size at each contact-line vertex: its shorter edge (arcs are chorded finely),
            # and CORNER_FACTOR smaller at corners (turning > 0.3 rad) where the solution is singular.
            ev = np.roll(xy, -1, axis=0) - xy
            le = np.hypot(ev[:, 0], ev[:, 1])
            loc = np.minimum(le, np.roll(le, 1))
            ang = np.abs(np.angle(np.exp(1j * (np.arctan2(ev[:, 1], ev[:, 0])
                                               - np.roll(np.arctan2(ev[:, 1], ev[:, 0]), 1)))))
            loc = np.where(ang > 0.3, loc / CORNER_FACTOR, loc)
            sizes.append(loc)
            verts.append(xy)
            idx = n0 + np.arange(m)
            segs.append(np.column_stack([idx, np.roll(idx, -1)]))
            marks.append(np.full(m, 3 + i))
            n0 += m
    line_pts = np.vstack(verts)
    line_size = np.concatenate(sizes)
    n_out = max(64, int(math.ceil(2 * math.pi * Rd / hf)))
    t = 2 * math.pi * np.arange(n_out) / n_out
    verts.append(np.column_stack([cx + Rd * np.cos(t), cy + Rd * np.sin(t)]))
    idx = n0 + np.arange(n_out)
    segs.append(np.column_stack([idx, np.roll(idx, -1)]))
    marks.append(np.full(n_out, 2))
    pslg = {"vertices": np.vstack(verts), "segments": np.vstack(segs),
            "segment_markers": np.concatenate(marks)[:, None], "holes": np.array(holes)}
    area = lambda s: (math.sqrt(3) / 4) * s * s  # noqa: E731
    out = tr.triangulate(pslg, f"pq30a{area(hf):.12g}")
    tree = cKDTree(line_pts)
    k = min(16, len(line_pts))
    for _ in range(passes):
        p, tri = out["vertices"], out["triangles"]
        cen = p[tri].mean(axis=1)
        d, j = tree.query(cen, k=k)
        d, j = d.reshape(len(cen), -1), j.reshape(len(cen), -1)
        target = np.min(line_size[j] + grading * scale * d, axis=1)
        target = np.minimum(target, hf)
        e1, e2 = p[tri[:, 1]] - p[tri[:, 0]], p[tri[:, 2]] - p[tri[:, 0]]
        a = 0.5 * np.abs(e1[:, 0] * e2[:, 1] - e1[:, 1] * e2[:, 0])
        if np.all(a <= 1.3 * area(target)):
            break
        inp = dict(out)
        inp["triangle_max_area"] = area(target)
        inp["holes"] = pslg["holes"]
        out = tr.triangulate(inp, "rpq30a")
    p, tri, vm = out["vertices"], out["triangles"], out["vertex_markers"].ravel()
    mesh = MeshTri(p.T.copy(), tri.T.copy())
    mesh_lin = mesh
    bf = mesh.boundary_facets()
    fm = vm[mesh.facets[:, bf]]
    same = fm[0] == fm[1]
    body_facets = [bf[same & (fm[0] == 3 + i)] for i in range(len(bodies))]
    outer = bf[same & (fm[0] == 2)]
    if sum(len(f) for f in body_facets) + len(outer) != len(bf):
        raise RuntimeError("fem3d mesh: boundary facets without a consistent marker")
    if curved:  # quadratic (isoparametric) geometry: boundary nodes on the exact curves
        m2 = MeshTri2.from_mesh(mesh)
        nv = mesh.p.shape[1]
        dl = m2.doflocs.copy()
        for i, body in enumerate(bodies):
            f = body_facets[i]
            vs = np.unique(mesh.facets[:, f])
            dl[:, vs] = _project_body(body, dl[:, vs])
            dl[:, nv + f] = _project_body(body, dl[:, nv + f])
        dl[:, nv + outer] = np.array([[cx], [cy]]) + Rd * (dl[:, nv + outer] - np.array([[cx], [cy]])) / np.hypot(
            dl[0, nv + outer] - cx, dl[1, nv + outer] - cy)
        mesh = MeshTri2(dl, mesh.t)
        # The library's inverse isoparametric map asks for 1e-12 in reference coordinates, which
        # round-off cannot reach for elements of size ~1e-4 at coordinates ~10: loosen to 1e-9.
        from skfem.mapping import MappingIsoparametric

        class _Iso(MappingIsoparametric):
            def invF(self, x, tind=None, newton_max_iters=50, newton_tol=1e-9):
                return super().invF(x, tind=tind, newton_max_iters=newton_max_iters, newton_tol=newton_tol)

        mesh._cached_mapping = _Iso(mesh, mesh.elem(), mesh.bndelem)
    return MeshData(mesh, body_facets, outer, (cx, cy), Rd, lengths, mesh_lin)


# ----------------------------------------------------------------------------- solver
@dataclass
class Solution:
    """Solved meniscus and its forces (see the module docstring for the three force values)."""

    line: np.ndarray  # per body, contact-line integral of sin ψ [σ l_c]
    flux: np.ndarray  # per body, weak-residual flux [σ l_c]
    keller: float  # all bodies, displaced volume (domain + far field) [l_c³]
    volume_far: float  # part of ``keller`` beyond R_d
    contact_length: list  # per body [l_c]
    max_slope: float  # largest |∇h| on the contact lines
    ndofs: int
    seconds: float
    newton_steps: int
    data: MeshData = field(repr=False)
    basis: object = field(repr=False)
    h: np.ndarray = field(repr=False)
    warnings: tuple = ()  # validity notes (steep slopes, rod contact line off the rod)

    def evaluate(self, x, y):
        """Depth h [l_c] at plan points (x, y) inside the mesh (for drawing and probes)."""
        pts = np.vstack([np.ravel(x), np.ravel(y)]).astype(float)
        b = self.basis
        cells = self.data.mesh_lin.element_finder()(*pts)  # straight-sided mesh: same cells
        X = b.mapping.invF(pts[:, :, None], tind=cells)
        val = np.zeros(pts.shape[1])
        for k in range(b.Nbfun):
            phi = b.elem.gbasis(b.mapping, X, k, tind=cells)[0]
            val += np.ravel(np.asarray(phi)) * self.h[b.element_dofs[k, cells]]
        return val.reshape(np.shape(x))

    def triangulation(self):
        """Vertices x, y [l_c], triangles (n, 3) and the depth h at the vertices, for drawing
        (e.g. ``matplotlib.pyplot.tricontourf(x, y, tri, h)``)."""
        ml = self.data.mesh_lin
        nv = ml.p.shape[1]
        return ml.p[0], ml.p[1], ml.t.T, self.h[:nv]


def _factor(M):
    """Sparse LU of a symmetric matrix (SuperLU in symmetric mode, minimum-degree ordering)."""
    from scipy.sparse.linalg import splu

    return splu(M.tocsc(), permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0,
                options={"SymmetricMode": True})


def _dot(a, b) -> float:
    """Dot product without BLAS: threaded BLAS calls on short vectors stall on a loaded machine."""
    return float(np.add.reduce(a * b))


def _norm(a) -> float:
    return math.sqrt(_dot(a, a))


def _interp(basis, x):
    """Value and gradient of the finite-element function ``x`` at the quadrature points (what
    ``basis.interpolate`` gives, without its per-call search for solution components)."""
    from skfem.element import DiscreteField

    ed = basis.element_dofs
    val = 0.0
    grd = 0.0
    for i in range(basis.Nbfun):
        phi = basis.basis[i][0]
        xi = x[ed[i]][:, None]
        val = val + xi * np.asarray(phi)
        grd = grd + xi * phi.grad
    return DiscreteField(val, grd)


def _newton_step(J, rhs, lu, rtol: float = 1e-11, maxiter: int = 20):
    """Solve J x = rhs by conjugate gradients preconditioned with an earlier factorisation ``lu``
    of a nearby Jacobian (J is symmetric positive definite); refactor when that is missing or
    when CG does not converge within ``maxiter`` iterations."""
    if lu is not None:
        x = lu.solve(rhs)
        r = rhs - J @ x
        z = lu.solve(r)
        p = z.copy()
        rz = _dot(r, z)
        bn = _norm(rhs)
        for _ in range(maxiter):
            if _norm(r) <= rtol * bn:
                return x, lu
            Jp = J @ p
            alpha = rz / _dot(p, Jp)
            x += alpha * p
            r -= alpha * Jp
            z = lu.solve(r)
            rz_new = _dot(r, z)
            p = z + (rz_new / rz) * p
            rz = rz_new
        if _norm(r) <= rtol * bn:
            return x, lu
    lu = _factor(J)
    return lu.solve(rhs), lu


def _rod_flux(h, R: float, D: float, theta: float):
    """Contact-angle condition of a horizontal rod as a flux law: sin ψ = g(h) and g'(h).

    From h = D − R(1 − cos φ) and ψ = φ + θ − π: with c = (D − h)/R − 1 = cos(θ − ψ),
    g = sin ψ = c sin θ − cos θ √(1 − c²) and g' = −(sin θ + cos θ c/√(1 − c²))/R. c is kept
    inside (−1, 1) (the contact line between the lowest point and the top of the rod)."""
    c = np.clip((D - np.asarray(h)) / R - 1.0, -1.0 + 1e-9, 1.0 - 1e-9)
    sq = np.sqrt(1.0 - c * c)
    st, ct = math.sin(theta), math.cos(theta)
    return c * st - ct * sq, -(st + ct * c / sq) / R


def _kappa(Rd: float) -> float:
    from scipy.special import k0e, k1e

    return float(k1e(Rd) / k0e(Rd))


def solve(bodies, *, nonlinear: bool = False, h_line: float | None = None, grading: float = 0.25,
          h_far: float = 1.0, margin: float = 10.0, level: int = 0, tol: float = 1e-10,
          max_newton: int = 40) -> Solution:
    """Solve the meniscus around ``bodies`` (a list of :class:`Body`) on one mesh level."""
    from skfem import Basis, BilinearForm, ElementTriP2, FacetBasis, Functional, LinearForm, asm
    from skfem.helpers import dot, grad

    t0 = time.perf_counter()
    md = build_mesh(bodies, h_line=h_line, grading=grading, h_far=h_far, margin=margin, level=level)
    e = ElementTriP2()
    basis = Basis(md.mesh, e, intorder=4)
    kap = _kappa(md.radius)
    fb_out = FacetBasis(md.mesh, e, facets=md.outer_facets, intorder=4)
    if nonlinear and any(b.kind == "rod" and (b.ends == "wall" or b.shift) for b in bodies):
        raise ValueError("rod ends 'wall' and line_at_radius: linearised problem only")
    flat = {i: _end_facets(md, b, md.body_facets[i]) for i, b in enumerate(bodies)
            if b.kind == "rod" and b.ends in ("flat", "wall")}
    fbs = [FacetBasis(md.mesh, e, facets=(flat[i][0] if i in flat else f), intorder=4)
           for i, f in enumerate(md.body_facets)]

    @BilinearForm
    def lin(u, v, w):
        return dot(grad(u), grad(v)) + u * v

    @BilinearForm
    def mass(u, v, w):
        return u * v

    N = basis.N
    A = asm(lin, basis) + kap * asm(mass, fb_out)
    b = np.zeros(N)
    D, Dval = [], []
    for i, (body, fbi) in enumerate(zip(bodies, fbs)):
        dofs = basis.get_dofs(facets=md.body_facets[i]).all()
        if body.kind == "dirichlet":
            D.append(dofs)
            Dval.append(np.full(dofs.size, body.h_c))
        elif body.kind == "rod":
            R, Dd, th = body.rod
            w0 = R * math.sin(math.pi - th)
            D0 = Dd - R * (1.0 + math.cos(th))
            A = A + (1.0 / w0) * asm(mass, fbi)
            b = b + (D0 * math.exp(-body.shift) / w0) * asm(LinearForm(lambda v, w: v), fbi)
            if i in flat and body.ends == "flat":  # end faces pinned at the bottom rim: h = D
                ed = basis.get_dofs(facets=flat[i][1]).all()
                D.append(ed)
                Dval.append(np.full(ed.size, Dd))
            elif i in flat:  # end faces met at Young's angle: natural condition ∂ₙh = tan ψ_w
                fe = FacetBasis(md.mesh, e, facets=flat[i][1], intorder=4)
                g = math.tan(th - 0.5 * math.pi) if body.wall_slope is None else body.wall_slope
                b = b + g * asm(LinearForm(lambda v, w: v), fe)
        else:
            raise ValueError(f"body kind must be 'dirichlet' or 'rod', got {body.kind!r}")
    A = A.tocsr()
    Dall = np.concatenate(D) if D else np.zeros(0, dtype=int)
    Dv = np.concatenate(Dval) if D else np.zeros(0)
    free = np.setdiff1d(np.arange(N), Dall)

    h = np.zeros(N)
    h[Dall] = Dv
    lu = _factor(A[free][:, free])
    h[free] = lu.solve((b - A @ h)[free])
    steps = 0
    if nonlinear:
        @BilinearForm
        def jac(u, v, w):
            g = w["h"].grad
            q = np.sqrt(1.0 + dot(g, g))
            return dot(grad(u), grad(v)) / q - dot(g, grad(u)) * dot(g, grad(v)) / q ** 3 + u * v

        @LinearForm
        def res(v, w):
            g = w["h"].grad
            q = np.sqrt(1.0 + dot(g, g))
            return dot(g, grad(v)) / q + w["h"] * v

        # Boundary parts linear in h: the far-field Robin term. Rod contact lines take the full
        # contact-angle condition sin ψ = g(h) (see _rod_flux) instead of its linearisation.
        Bnd = (kap * asm(mass, fb_out)).tocsr()
        rods = [(fbi, bodies[i].rod) for i, fbi in enumerate(fbs) if bodies[i].kind == "rod"]

        def residual(x):
            r = asm(res, basis, h=_interp(basis, x)) + Bnd @ x
            for fbi, rod in rods:
                r = r - asm(LinearForm(lambda v, w: _rod_flux(w["h"], *rod)[0] * v), fbi, h=fbi.interpolate(x))
            return r

        def jacobian(x):
            J = asm(jac, basis, h=_interp(basis, x)) + Bnd
            for fbi, rod in rods:
                J = J - asm(BilinearForm(lambda u, v, w: _rod_flux(w["h"], *rod)[1] * u * v), fbi,
                            h=fbi.interpolate(x))
            return J

        r = residual(h)
        rn = rn0 = _norm(r[free])
        for steps in range(1, max_newton + 1):
            J = jacobian(h).tocsr()[free][:, free]
            dh = np.zeros(N)
            eta = max(1e-12, 0.1 * min(1e-3, rn / rn0))  # inexact Newton: looser early solves
            dh[free], lu = _newton_step(J, -r[free], lu, rtol=eta)
            lam = 1.0
            while True:
                hn = h + lam * dh
                rn_new = _norm(residual(hn)[free])
                if rn_new < (1 - 1e-4 * lam) * rn or lam < 1e-3:
                    break
                lam *= 0.5
            h = hn
            r = residual(h)
            rn = _norm(r[free])
            if np.max(np.abs(lam * dh)) < tol * max(1.0, np.max(np.abs(h))):
                break
        else:
            from floatcalc.errors import ConvergenceError

            raise ConvergenceError(f"fem3d: Newton did not converge in {max_newton} steps "
                                   f"(residual {rn:.3g}); slopes too steep for the graph formulation?")
        full = r  # residual including boundary rows: the reaction at the body DOFs
    else:
        full = A @ h - b

    hI = _interp(basis, h)
    vol = float(asm(Functional(lambda w: w["h"]), basis, h=hI))
    fo = fb_out.interpolate(h)
    vol_far = kap * float(asm(Functional(lambda w: w["h"]), fb_out, h=fo))

    def sinpsi(w):
        g = w["h"].grad
        gn = dot(g, w.n)
        return gn / np.sqrt(1.0 + dot(g, g)) if nonlinear else gn

    line, flux, smax = [], [], 0.0
    for i, fbi in enumerate(fbs):
        hi = fbi.interpolate(h)
        line.append(float(asm(Functional(sinpsi), fbi, h=hi)))
        dofs = basis.get_dofs(facets=md.body_facets[i]).all()
        if bodies[i].kind == "dirichlet":
            flux.append(float(np.sum(full[dofs])))
        elif nonlinear:  # rod: flux of the natural condition, ∮ g(h) ds
            rod = bodies[i].rod
            flux.append(float(asm(Functional(lambda w: _rod_flux(w["h"], *rod)[0]), fbi, h=hi)))
        else:  # rod, linearised: ∮ (D0 − h)/w0 ds
            R, Dd, th = bodies[i].rod
            w0 = R * math.sin(math.pi - th)
            D0 = Dd - R * (1.0 + math.cos(th))
            ex = math.exp(bodies[i].shift)
            flux.append(float(asm(Functional(lambda w: (D0 - ex * w["h"]) / w0), fbi, h=hi)))
        g = hi.grad
        smax = max(smax, float(np.max(np.sqrt(g[0] ** 2 + g[1] ** 2))))
    notes = []
    if nonlinear and smax > math.tan(math.radians(85.0)):
        # The discrete problem always has a solution; a near-vertical one means the continuous
        # graph problem has none (contact line deeper than a graph meniscus can reach).
        from floatcalc.errors import ConvergenceError

        raise ConvergenceError(f"fem3d: contact-line slope reaches {math.degrees(math.atan(smax)):.1f} deg: "
                               "no graph meniscus for these contact depths (too deep)")
    if nonlinear and smax > math.tan(math.radians(60.0)):
        notes.append(f"contact-line slope up to {math.degrees(math.atan(smax)):.0f} deg: the graph "
                     "formulation loses accuracy beyond about 60 deg (and fails at 90 deg)")
    if not nonlinear and smax > 0.3:
        notes.append(f"linearised model with contact-line slope up to {smax:.2f}: nonlinear terms "
                     "of relative size slope^2 are missing")
    for i, body in enumerate(bodies):
        if body.kind == "rod":
            R, Dd, th = body.rod
            hb = fbs[i].interpolate(h)
            c = (Dd - np.asarray(hb)) / R - 1.0
            if np.any(np.abs(c) >= 1.0 - 1e-9):
                notes.append(f"body {i}: rod contact line leaves the rod (below its lowest point or "
                             "above its top) somewhere; the condition was clipped there")
    return Solution(np.array(line), np.array(flux), vol + vol_far, vol_far, md.contact_length, smax,
                    int(N), time.perf_counter() - t0, steps, md, basis, h, tuple(notes))


# ----------------------------------------------------------------------------- refinement
def reference(bodies, *, nonlinear: bool = False, levels=(0, 1), **kw) -> dict:
    """Solve on successive uniformly refined levels and estimate the error of the finest.

    Returns a dict: ``line``, ``flux`` (per body, finest level), ``keller`` (total),
    ``err_line``, ``err_flux``, ``err_keller`` (error estimates), ``order`` (observed order of the
    flux from three levels, else NaN), ``seconds`` and ``solutions`` (all levels).

    Error estimate: the change between the last two levels, |F_n − F_{n−1}|. It bounds the error
    of F_n whenever refinement at least halves the error (observed orders: about 2 for the
    contact-line integral, about 4 for the flux and the Keller volume on smooth footprints, about
    1 for the contact-line integral at footprint corners); the observed order is reported from
    three levels.
    """
    sols = [solve(bodies, nonlinear=nonlinear, level=k, **kw) for k in levels]

    def est(vals):
        vals = [np.atleast_1d(np.asarray(v, dtype=float)) for v in vals]
        if len(vals) < 2:
            return np.full(vals[0].shape, np.nan), np.full(vals[0].shape, np.nan)
        err = np.abs(vals[-1] - vals[-2])
        p = np.full(vals[0].shape, np.nan)
        if len(vals) >= 3:
            with np.errstate(divide="ignore", invalid="ignore"):
                p = np.log2(np.abs(vals[-2] - vals[-3]) / err)
        return err, p

    el, pl = est([s.line for s in sols])
    ef, pf = est([s.flux for s in sols])
    ek, pk = est([s.keller for s in sols])
    fin = sols[-1]
    return {"line": fin.line, "flux": fin.flux, "keller": fin.keller, "err_line": el,
            "err_flux": ef, "err_keller": float(ek[0]), "order_line": pl, "order": pf,
            "order_keller": float(pk[0]), "seconds": sum(s.seconds for s in sols),
            "solutions": sols}


# ----------------------------------------------------------------------------- closed forms
def disc_linear_force(r_c: float, h_c: float) -> float:
    """Linearised force [σ l_c] on a disc contact line of radius r_c at depth h_c:
    2π r_c h_c K₁(r_c)/K₀(r_c) (from h = h_c K₀(r)/K₀(r_c))."""
    from scipy.special import k0e, k1e

    return float(2 * math.pi * r_c * h_c * k1e(r_c) / k0e(r_c))


# ----------------------------------------------------------------------------- convenience
def _summary(bodies, nonlinear: bool, levels, **kw) -> dict:
    """Reference forces of ``bodies`` with error estimates (see :func:`reference`)."""
    ref = reference(bodies, nonlinear=nonlinear, levels=levels, **kw)
    return {"force": ref["flux"], "err": ref["err_flux"], "line": ref["line"],
            "err_line": ref["err_line"], "keller": ref["keller"], "err_keller": ref["err_keller"],
            "seconds": ref["seconds"], "ndofs": ref["solutions"][-1].ndofs, "bodies": bodies,
            "solution": ref["solutions"][-1]}


def finite_strip_force(length: float, half_width: float, h_c: float, *, nonlinear: bool = False,
                       ends: str = "stadium", levels=(0, 1), **kw) -> dict:
    """Vertical surface-tension force [σ l_c] on one straight strip footprint (tip-to-tip
    ``length``, ``half_width``, rounded ``"stadium"`` or square ``"rect"`` ends) pinned at depth
    ``h_c``.

    Returns a dict: ``force`` (array of one: the weak-residual flux of the finest level), ``err``
    (its error estimate), ``line`` / ``err_line`` (the contact-line integral), ``keller`` /
    ``err_keller`` (displaced volume), ``seconds``, ``ndofs``, ``solution``.
    """
    shape = (stadium if ends == "stadium" else rectangle)(0.0, 0.0, 0.0, length, half_width)
    return _summary([dirichlet_body(shape, h_c=h_c)], nonlinear, levels, **kw)


def parallel_strips(n: int, length: float, half_width: float, gap: float, h_c, *,
                    nonlinear: bool = False, levels=(0, 1), **kw) -> dict:
    """``n`` parallel stadium strips side by side, ``gap`` between facing contact lines, each
    pinned at depth ``h_c`` (a number or one per strip). Forces per strip, as
    :func:`finite_strip_force`; strip k is centred at y = k (2w + gap)."""
    hs = np.broadcast_to(np.asarray(h_c, dtype=float), (n,))
    pitch = 2 * half_width + gap
    bodies = [dirichlet_body(stadium(0.0, k * pitch, 0.0, length, half_width), h_c=float(hs[k]),
                             name=f"strip{k}") for k in range(n)]
    return _summary(bodies, nonlinear, levels, **kw)


def two_strips(length: float, half_width: float, gap: float, h_c, **kw) -> dict:
    """Two parallel strips (see :func:`parallel_strips`)."""
    return parallel_strips(2, length, half_width, gap, h_c, **kw)


def crossing_strips(length_a: float, length_b: float, half_width: float, h_c: float, *,
                    angle: float = 0.5 * math.pi, kind: str = "X", nonlinear: bool = False,
                    levels=(0, 1), **kw) -> dict:
    """Two stadium strips joined into one footprint (one body): ``kind="X"`` crossing at their
    centres, ``"T"`` with strip b starting on strip a's centre line (its rounded end hidden in a,
    so b shows length_b − 1.5 w beyond a's edge), at ``angle`` between them."""
    a = stadium(0.0, 0.0, 0.0, length_a, half_width)
    if kind == "X":
        b = stadium(0.0, 0.0, angle, length_b, half_width)
    elif kind == "T":
        # Strip b's cap centre half a width from strip a's axis, so that its rounded end lies
        # hidden inside strip a (a cap centred on the axis would touch a's far edge tangentially,
        # a degenerate union).
        c = 0.5 * length_b - 0.5 * half_width
        b = stadium(c * math.cos(angle), c * math.sin(angle), angle, length_b, half_width)
    else:
        raise ValueError(f"kind must be 'X' or 'T', got {kind!r}")
    return _summary([dirichlet_body(a, b, h_c=h_c)], nonlinear, levels, **kw)


def strip_beside_disc(length: float, half_width: float, radius: float, gap: float, h_strip: float,
                      h_disc: float, *, nonlinear: bool = False, levels=(0, 1), **kw) -> dict:
    """A stadium strip (along x, centred at the origin) and a disc beside its middle, ``gap``
    between the contact lines; forces [strip, disc]."""
    bodies = [dirichlet_body(stadium(0.0, 0.0, 0.0, length, half_width), h_c=h_strip, name="strip"),
              dirichlet_body(disc(0.0, half_width + gap + radius, radius), h_c=h_disc, name="disc")]
    return _summary(bodies, nonlinear, levels, **kw)


def parallel_rods(n: int, length: float, R: float, D: float, theta: float, gap: float, *,
                  nonlinear: bool = False, levels=(0, 1), **kw) -> dict:
    """``n`` parallel horizontal rods with the contact-angle condition of :func:`rod_body`
    (linearised, or the full one with ``nonlinear=True``), all at lowest-point depth D, ``gap``
    between facing contact lines (footprint half-width w₀ = R sin θ, fixed); forces per rod as
    :func:`finite_strip_force` (surface-tension part only; the pressure on the rods is not
    included)."""
    w0 = R * math.sin(math.pi - theta)
    pitch = 2 * w0 + gap
    bodies = [rod_body((0.0, k * pitch), 0.0, length, R, D, theta, name=f"rod{k}") for k in range(n)]
    return _summary(bodies, nonlinear, levels, **kw)
