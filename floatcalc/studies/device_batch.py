"""Batched study function of a device of any element kinds (rods, rod rows, ball feet, pads, pins, rings, flexible legs).

The scalar device model (:mod:`floatcalc.studies.device_model`) rebuilds the device for every
sample (:meth:`floatcalc.device.solve.Device.from_design`, each element's force–depth table
from its kind's adapter) and then calls :func:`floatcalc.core.equilibrium.capacity`. Here the
same steps run on arrays over all samples of a block:

* rods (kind ``rod``, the adapter of :mod:`floatcalc.elements.rod`): the finite-rod limit
  (:func:`floatcalc.core.finite_rod.limit_many`, the same grid and parabola), the 241-point
  table from first contact to the limit, the end caps on the end segments and the cut at
  depth 0 (:func:`~floatcalc.elements._registry.from_first_contact`);
* rod rows (kind ``rod_row``, the adapter of :mod:`floatcalc.elements.rod_row`): the shared
  2D menisci of :mod:`floatcalc.core.parallel2d` on the same grids, batched by
  :mod:`floatcalc.core.parallel2d_batch` (a faster root finder for the turning depth, the same
  root to about 1e-14), one table for the outer and one for the inner rods;
* ball feet, pads, pins and rings (the round adapter of :mod:`floatcalc.elements._round`):
  :func:`floatcalc.round.element_tables` called once per element type with arrays over the
  samples (the very function the adapter calls with one row), the last force raised to the
  refined limit force as the adapter does, and the outer contact radius of each sample for
  the K₀ field;
* flexible legs (kind ``flexible_leg``): the table of the kind's own adapter
  (:meth:`~floatcalc.elements.flexible_leg.FlexibleLegKind.model`, the scalar model's call, so
  the very same numbers) once per distinct sample (:func:`_unique` on the inputs that reach
  the leg) and per group of legs alike but for heading, position and mount (a symmetric
  device solves one elastica per sample, not one per leg); the rod's outer field about the
  middle of each leg and its rectangle from the clamp, as the adapter has them;
* every table resampled on a uniform depth grid with as many points as the longest table of
  the sample (what :func:`floatcalc.device.solve._common_tables` and
  :class:`~floatcalc.core.equilibrium.Support` do together), the neighbours' shielding
  factors of the nominal layout applied (studies reuse them, as the scalar model does);
* the plan positions, offsets and the coupling matrix of the linearised outer fields (rod:
  e^(−(b − w)) beside it, K₀ beyond its ends; round: K₀(r)/K₀(r_c); all lengths scale with
  1/l_c, which varies with the sampled surface tension);
* the capacity at the centre of mass by :func:`floatcalc.core.equilibrium_batch.capacity_at_centre`.

Inputs and outputs are those of the scalar model (``contact_angle_shift``, ``surface_tension``,
``radius_factor``, ``length_factor``, ``body_mass``, ``payload_mass`` → ``max_payload``,
``payload_mass``, ``spare_payload``, ``weight``), and so are the numbers
(tests/test_device_batch.py and tests/test_device_batch_mixed.py compare the two on seeded
random perturbations). As in the scalar model, ``radius_factor`` multiplies every ``radius``
field (rod, ball, pad and pin radius; not a ring's radii or a pad's thickness) and
``length_factor`` every ``length`` field (rod length, pin protrusion).

Samples for which the batch cannot vouch for the scalar answer are handed to the scalar
model unchanged: footprints that come within rounding of overlapping, a centre of mass not
clearly inside the support polygon (the scalar model then gives its one-line InputError),
capacities that did not converge or devices that carry next to nothing; and a whole block
whose element tables refuse an input (an element outside the range of its law), so that the
scalar model raises its own error for the first such sample.

Kinds that stay on the scalar path (:data:`SCALAR_KINDS`, with the reason): none. The
flexible leg's elastica is not vectorised over samples: its limit is a continuation in clamp
depth with adaptive steps, wetting-history events, regula falsi and jumps past folds
(:func:`floatcalc.core.beam.limit`), different for every sample, and a tabulation in its seven
dimensionless groups (R/l_c, L/l_c, E I/(σ l_c³), clamp and toe angles, two contact angles)
cannot reach 1e-8. What is batched is the rest: the 24 curve points of each leg in one stacked
Newton solve (:func:`floatcalc.core.beam.solve_many`, the same steps as one by one: the same
bytes), one elastica for all legs alike and for repeated samples, and the whole device around
it. A distinct sample of a leg still costs about 0.1 s (tests/benchmarks/bench_device_mixed.py,
``device_flexleg_samples_per_s``).
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass
from typing import Any

import numpy as np

#: Element kinds the batch builds itself.
BATCH_KINDS = frozenset({"rod", "rod_row", "ball", "pad", "pin", "ring", "flexible_leg"})
#: Round kinds (one force point, tables from floatcalc.round.element_tables).
ROUND_KINDS = ("ball", "pad", "pin", "ring")
#: Kinds left to the scalar model, and why.
SCALAR_KINDS: dict[str, str] = {}
#: Samples per block (bounds the memory of the coupling arrays). Every sample is solved on its
#: own, so the block changes no number beyond round-off (the batched linear algebra may sum in
#: another order: 5e-16 seen between blocks of 7 and 250); its size sets how much stays in cache: a
#: (250, 241) table of doubles is 0.48 MB, about one core's L2 on the 2-core test machine, and
#: the mixed rig of tests/benchmarks/bench_device_mixed.py ran 1.3x faster in blocks of 250 than
#: of 500 there (interleaved, best of 10; 200 about the same as 250).
BLOCK = 250
INPUTS = ("contact_angle_shift", "surface_tension", "radius_factor", "length_factor", "body_mass", "payload_mass")
#: Points of every table (as floatcalc.elements._registry.TABLE_POINTS).
POINTS = 241
#: Vertices of a round footprint (as floatcalc.elements._registry.circle).
_K = 24
#: Kinds with a heading (a rectangular footprint along it).
_HEADED = ("rod", "rod_row", "flexible_leg")


def batchable(design) -> bool:
    """True if every element of ``design`` is of a kind the batch builds (:data:`BATCH_KINDS`)."""
    return all(p["kind"] in BATCH_KINDS for p in design.elements)


def _effective_angle(theta, coating):
    """The one texture model (:func:`floatcalc.elements.effective_angle`) on arrays."""
    from ..elements import effective_angle

    return effective_angle(theta, coating)


def _rows_interp(xq, X, tables, n_valid):
    """Row-wise linear interpolation (as :func:`numpy.interp`) of each table in ``tables``
    (rows of X increasing over their first ``n_valid`` entries) at queries xq (same rows)."""
    S, w = X.shape
    col = np.arange(w)
    Xv = np.where(col < n_valid[:, None], X, X[np.arange(S), n_valid - 1][:, None])
    span = float(np.max(Xv) - np.min(Xv)) + 1.0
    off = np.arange(S)[:, None] * span
    keys = (Xv + off).ravel()
    j = np.searchsorted(keys, (xq + off).ravel(), side="right").reshape(xq.shape) - 1 - (np.arange(S)[:, None] * w)
    j = np.clip(j, 0, np.maximum(n_valid - 2, 0)[:, None])
    r = np.arange(S)[:, None]
    x0, x1 = X[r, j], X[r, j + 1]
    out = []
    for T in tables:
        y0, y1 = T[r, j], T[r, j + 1]
        out.append((y1 - y0) / (x1 - x0) * (xq - x0) + y0)
    return out


def _rod_tables(R, th, L, nseg, points):
    """Tables of one rod type for S samples, from first contact to the limit, before resampling:
    dict of depth, mid, end, contact (S, points) [l_c, σ l_c] valid over their first n (S,) entries."""
    from ..core import finite_rod, rod2d

    S = R.size
    lim = finite_rod.limit_many(R, th, L)
    phi = np.linspace(0.0, lim, points, axis=-1)
    Rc, tc = R[:, None], th[:, None]
    f_st, f_p, D = rod2d.force_parts(phi, Rc, tc)
    seg = (L / nseg)[:, None]
    ends = 2.0 * finite_rod.end_force(phi, Rc, f_st)
    F_mid = (f_st + f_p) * seg
    F_end = F_mid + 0.5 * ends
    hd = 2.0 * np.sin(0.5 * (phi + tc - np.pi))
    # from_first_contact: keep depths > 0 and prepend the value interpolated at depth 0
    rows = np.arange(S)
    cut = (D[:, 0] < 0.0) & (D[:, -1] > 0.0)
    i0 = np.where(cut, np.argmax(D > 0.0, axis=1), 0)
    src = np.clip(np.where(cut, i0 - 1, 0)[:, None] + np.arange(points), 0, points - 1)
    n_tab = np.where(cut, points + 1 - i0, points)
    tabs = {"n": n_tab}
    jl = np.maximum(i0 - 1, 0)
    flat = (src + (rows * points)[:, None]).ravel()    # one flat gather per table (as T[rows, src])
    for name, T in (("depth", D), ("mid", F_mid), ("end", F_end), ("contact", hd)):
        Tt = np.take(np.broadcast_to(T, (S, points)).reshape(-1), flat).reshape(S, points)
        if name == "depth":
            at0 = np.zeros(S)
        else:
            x0, x1 = D[rows, jl], D[rows, i0]
            y0, y1 = T[rows, jl], T[rows, i0]
            with np.errstate(divide="ignore", invalid="ignore"):
                at0 = np.where(x1 > x0, (y1 - y0) / np.where(x1 > x0, x1 - x0, 1.0) * (0.0 - x0) + y0, y0)
        Tt[:, 0] = np.where(cut, at0, Tt[:, 0])
        tabs[name] = Tt
    return tabs


def _unique(*cols):
    """Samples with equal element-law inputs (a sweep that varies the body mass, say) share one
    table: indices of the distinct rows and, if there are repeats, each sample's row in them
    (else None). Equal inputs give equal tables, so this changes no number."""
    A = np.stack(np.broadcast_arrays(*cols), axis=1)
    _, first, inv = np.unique(A, axis=0, return_index=True, return_inverse=True)
    if first.size == A.shape[0]:
        return slice(None), None
    return first, inv.ravel()


def _flex_tables(design, ty, x):
    """Tables of one flexible-leg type for S samples, each from the kind's own device adapter
    (:meth:`floatcalc.elements.flexible_leg.FlexibleLegKind.model`, the call the scalar model
    makes) on the element perturbed exactly as the scalar model perturbs it: depth, force,
    contact (S, POINTS) [m, N, m], own weight [N] and length [m] (S,).

    The elastica (:func:`floatcalc.core.beam.limit`, a continuation with adaptive steps, events
    and folds) is solved sample by sample; its curve points are solved together
    (:func:`floatcalc.core.beam.solve_many`). The batch saves the rest: one solve per sample
    for all legs alike (a symmetric device), one for repeated samples (a sweep of the body
    mass), and the vectorised tables, coupling and capacity of the whole device.
    """
    from dataclasses import replace

    from ..elements import get_kind
    from .device_model import perturbed_element

    kind = get_kind("flexible_leg")
    p0 = design.elements[ty.element]
    liq0 = design.liquid
    S = x["surface_tension"].size
    D, F, H = (np.empty((S, POINTS)) for _ in range(3))
    w, L = np.empty(S), np.empty(S)
    for i in range(S):
        xi = {k: float(v[i]) for k, v in x.items()}
        q = perturbed_element(p0, xi)
        liq = liq0 if xi["surface_tension"] == liq0.sigma else replace(liq0, sigma=xi["surface_tension"])
        m = kind.model(q, liq)
        D[i], F[i], H[i] = m.depth[0], m.force[0], m.contact[0]
        w[i], L[i] = m.own_weight, q["length"]
    return D, F, H, w, L


def _round_tables(kind, geo, th, sigma, liquid, density):
    """Tables of one round type for S samples, as the round adapter builds them from
    :func:`floatcalc.round.element_tables`, in SI: depth, force, contact (S, points), outer
    contact radius of the K₀ field and own weight (S,)."""
    from ..round import element_tables

    t = element_tables(kind, contact_angle=th, liquid=liquid, surface_tension=sigma, material_density=density,
                       points=POINTS, **geo)
    F = t.force_N.copy()
    F[:, -1] = np.maximum(t.max_force_N, F[:, -1])   # end at the refined limit force
    if kind == "ring":
        rc = np.broadcast_to(geo["ring_radius"] + geo["wire_radius"], sigma.shape).astype(float)
    else:
        rc = np.maximum(t.contact_radius_m, 1e-9)
    return t.depth_m, F, t.contact_depth_m, rc, t.own_weight_N


def _resample(groups, S):
    """Every table row on a uniform depth grid of its own with as many points as the longest
    table of its sample (as ``_common_tables`` and ``Support`` do together).

    ``groups``: list of (depth, forces, contact, n): (S, w) depth and contact tables and a
    tuple of force tables on that depth, valid over their first n (S,) entries, or n None for
    tables already on POINTS even depths (round elements: no resampling needed, N is then
    POINTS). Returns d0, step (S, r), N (S,), force, contact (S, r, POINTS), limit depth and
    force (S, r), with one row per force table.
    """
    N = np.full(S, 2, dtype=np.int64)
    for _, _, _, n in groups:
        N = np.maximum(N, POINTS if n is None else n)
    cols = np.arange(POINTS)
    Nc = (N - 1)[:, None]
    r = np.arange(S)
    d0s, steps, Fs, Hs, lds, lfs = [], [], [], [], [], []
    for D, forces, H, n in groups:
        d0 = D[:, 0]
        if n is None:       # already even (np.linspace per row): the grid is the table's own
            d_last = D[:, -1]
            step = (d_last - d0) / (POINTS - 1)
            Fr, Hr, last = list(forces), H, [F[:, -1] for F in forces]
        else:
            n = n.astype(np.int64)
            d_last = D[r, n - 1]
            step = (d_last - d0) / (N - 1)
            grid = np.minimum(d0[:, None] + step[:, None] * np.minimum(cols, Nc), d_last[:, None])
            *Fr, Hr = _rows_interp(grid, D, (*forces, H), n)
            last = [F[r, n - 1] for F in forces]
        for F, lf in zip(Fr, last):
            d0s.append(d0), steps.append(step), Fs.append(F), Hs.append(Hr), lds.append(d_last), lfs.append(lf)
    st = lambda a: np.stack(a, axis=1)  # noqa: E731
    return st(d0s), st(steps), N, st(Fs), st(Hs), st(lds), st(lfs)


def _field(X, Y, cx, cy, ux, uy, half, w):
    """Linearised outer field of a rod (as :func:`floatcalc.elements._registry.rod_field`), arrays."""
    from scipy.special import k0e

    a = (X - cx) * ux + (Y - cy) * uy
    b = np.abs(-(X - cx) * uy + (Y - cy) * ux)
    beyond = np.maximum(np.abs(a) - half, 0.0)
    k0w = np.broadcast_to(k0e(w), beyond.shape)      # w varies by element, not by point
    w = np.broadcast_to(w, beyond.shape)
    out = np.exp(-np.maximum(b - w, 0.0))            # beside the rod
    end = beyond > 0.0                                # round its ends
    wb = w[end]
    rr = np.maximum(np.hypot(beyond[end], b[end]), wb)
    out[end] = k0e(rr) * np.exp(wb - rr) / k0w[end]
    return out


def _round_field(X, Y, cx, cy, rc):
    """Linearised outer field K₀(r)/K₀(r_c) of a round element (as
    :func:`floatcalc.elements._registry.axisym_field`), arrays [l_c]."""
    from scipy.special import k0e

    r = np.maximum(np.hypot(X - cx, Y - cy), rc)
    return k0e(r) * np.exp(rc - r) / k0e(rc)


@dataclass(frozen=True)
class _Type:
    """Elements that share one table (picklable)."""

    kind: str
    geo: tuple            # ((field, SI value), ...) of the kind's geometry
    advancing: float
    coating: dict
    density: float
    shield: float
    nseg: int = 1
    element: int = 0      # index of its first element in the design


@dataclass(frozen=True)
class _Layout:
    """What the batch needs of a design, computed once (picklable)."""

    types: tuple          # _Type per element type
    first_row: tuple      # first table row of each type (rods: 2 rows, middle and end segments)
    elem_type: np.ndarray  # (E,)
    is_rod: np.ndarray     # (E,) bool
    cx: np.ndarray
    cy: np.ndarray
    ux: np.ndarray
    uy: np.ndarray
    tan_tilt: np.ndarray
    mount: np.ndarray
    density: np.ndarray
    nseg: np.ndarray
    owner: np.ndarray      # (m,)
    seg_index: np.ndarray  # (m,) segment k of each point
    row: np.ndarray        # (m,) table row
    across: np.ndarray     # (m,) offset across the heading (rods of a row) [m]
    rods: np.ndarray       # (E,) rods of the element (a row: its count; else 1)
    # footprints: vertex = centre + P1 s1 + P2 s2 (s1, s2 the sizes of each sample)
    P1: np.ndarray         # (E, K, 2)
    P2: np.ndarray
    size0: np.ndarray      # (E, 2) nominal sizes (rod: half length, radius; round: footprint radius, 0)
    size_by: np.ndarray    # (E, 2) which factor scales each size: 0 none, 1 radius, 2 length
    size_add: np.ndarray   # (E, 2) fixed part of each size (a row's half spread)
    axes: np.ndarray       # (E, 12, 2) edge normals of each footprint
    hull_corners: np.ndarray  # indices (into E*K vertices) of the nominal support polygon, ccw
    centres_hold: bool     # the body's centre of mass lies clearly inside the hull of element centres
    shielding: tuple       # the factors used (those of the nominal layout)
    solved_pairs: np.ndarray = None  # (E, E) no superposition coupling (Device.solved_pairs, nominal)
    is_flex: np.ndarray = None       # (E,) bool: flexible legs (one force point at the clamp, a rod's field)


def _footprint(kind, p, ux, uy):
    """Unit vertex offsets P1, P2 (K, 2), sizes, size factors and edge normals (12, 2)."""
    if kind in ("rod", "rod_row", "flexible_leg"):
        # a flexible leg's rectangle runs from its clamp (the element's position) outward
        a = np.array([0.0, 2.0, 2.0, 0.0]) if kind == "flexible_leg" else np.array([-1.0, 1.0, 1.0, -1.0])
        b = np.array([-1.0, -1.0, 1.0, 1.0])
        P1 = np.column_stack([a * ux, a * uy])
        P2 = np.column_stack([-b * uy, b * ux])
        idx = np.minimum(np.arange(_K), 3)           # padded with the last corner
        axes = np.array([[ux, uy], [-uy, ux]])[np.arange(12) % 2]
        return P1[idx], P2[idx], (0.5 * p["length"], p["radius"]), (2, 1), axes
    from ..elements import get_kind

    t = np.linspace(0.0, 2.0 * np.pi, _K, endpoint=False)
    P1 = np.column_stack([np.cos(t), np.sin(t)])
    e = np.roll(P1, -1, axis=0) - P1
    axes = np.column_stack([-e[:, 1], e[:, 0]])[:12]
    axes = axes / np.hypot(axes[:, 0], axes[:, 1])[:, None]
    r = get_kind(kind).footprint_radius(p)
    return P1, np.zeros_like(P1), (r, 0.0), (0 if kind == "ring" else 1, 0), axes


def layout(design, shielding=None) -> _Layout:
    """Element types, geometry and point layout of a design of :data:`BATCH_KINDS`.

    ``shielding``: each element's factor on its force table for neighbours that share its
    meniscus (:mod:`floatcalc.device.interact`), from the nominal design (default: solved here
    once); elements with different factors are different types.
    """
    from ..device.geometry import convex_hull
    from ..elements import get_kind

    from ..device.solve import Device

    dev = Device.from_design(design) if shielding is None else Device.from_design(design, shielding=shielding)
    shielding = dev.shielding
    keys, types, et, first, nrows = {}, [], [], [], 0
    legs = design.elements
    for p, f in zip(legs, shielding):
        kind, c = p["kind"], p["coating"]
        if kind == "rod":
            geo = (("radius", p["radius"]), ("length", p["length"]))
            nseg, dens = p["segments"], 0.0   # a rod's own weight is computed here, not in its table
        elif kind == "rod_row":
            geo = (("radius", p["radius"]), ("length", p["length"]), ("rods", p["rods"]), ("spacing", p["spacing"]))
            nseg, dens = p["segments"], 0.0
        elif kind == "flexible_leg":
            # legs alike but for heading, position and mount share one elastica per sample
            geo = tuple((k, p.get(k)) for k in (*get_kind(kind).fields, "material_name") if k != "heading")
            nseg, dens = 1, float(p["density"])
        else:
            geo = tuple((k, p[k]) for k in get_kind(kind).fields)
            nseg, dens = 1, float(p["density"])
        shield = float(f) if f < 1.0 else 1.0
        # factors of like elements differ in their last digits (a symmetric layout solved
        # numerically): one table serves them all, with an error of at most 1e-12 relative
        key = (kind, geo, json.dumps(c, sort_keys=True, default=str), dens, nseg, float(f"{shield:.12e}"))
        if key not in keys:
            keys[key] = len(types)
            types.append(_Type(kind, geo, float(c["advancing"]), dict(c), dens, shield, nseg, len(et)))
            first.append(nrows)
            nrows += 2 if kind in ("rod", "rod_row") else 1
        et.append(keys[key])
    arr = lambda f: np.array([f(p) for p in legs], dtype=float)  # noqa: E731
    is_rod = np.array([p["kind"] in ("rod", "rod_row") for p in legs])
    owner, seg, row, across = [], [], [], []
    for e, p in enumerate(legs):
        n = types[et[e]].nseg
        if p["kind"] == "rod_row":   # rod k of the row, segment j; outer rods on the first table row
            N = p["rods"]
            for k in range(N):
                for j in range(n):
                    owner.append(e)
                    seg.append(j)
                    across.append((k - 0.5 * (N - 1)) * p["spacing"])
                    row.append(first[et[e]] + (0 if k in (0, N - 1) else 1))
            continue
        for k in range(n):
            owner.append(e)
            seg.append(k)
            across.append(0.0)
            row.append(first[et[e]] + (1 if is_rod[e] and k in (0, n - 1) else 0))
    ux = arr(lambda p: math.cos(p["heading"]) if p["kind"] in _HEADED else 1.0)
    uy = arr(lambda p: math.sin(p["heading"]) if p["kind"] in _HEADED else 0.0)
    cx, cy = arr(lambda p: p["position"][0]), arr(lambda p: p["position"][1])
    fp = [_footprint(p["kind"], p, u, v) for p, u, v in zip(legs, ux, uy)]
    P1 = np.stack([f[0] for f in fp])
    P2 = np.stack([f[1] for f in fp])
    size0 = np.array([f[2] for f in fp], dtype=float)
    size_by = np.array([f[3] for f in fp], dtype=np.int64)
    axes = np.stack([f[4] for f in fp])
    # a row's half width: half the spread of its rods (fixed) plus the rod radius (scaled)
    add = arr(lambda p: 0.5 * (p["rods"] - 1) * p["spacing"] if p["kind"] == "rod_row" else 0.0)
    size_add = np.column_stack([np.zeros_like(add), add])
    C = np.stack([cx, cy], axis=-1)[:, None, :]
    sz = size0 + size_add
    V = (C + P1 * sz[:, 0, None, None] + P2 * sz[:, 1, None, None]).reshape(-1, 2)
    hull = convex_hull(V)
    idx = np.array([int(np.argmin(np.hypot(*(V - h).T))) for h in hull])
    xb, yb = design.body["centre_of_mass"]
    ch = convex_hull(np.column_stack([cx, cy]))
    centres_hold = bool(len(ch) >= 3 and _polygon_contains(ch[None], np.array([[xb, yb]]))[0])
    is_flex = np.array([p["kind"] == "flexible_leg" for p in legs])
    return _Layout(types=tuple(types), first_row=tuple(first), elem_type=np.array(et), is_rod=is_rod, is_flex=is_flex,
                   cx=cx, cy=cy, ux=ux, uy=uy,
                   tan_tilt=arr(lambda p: math.tan(p["tilt"]) if p["kind"] == "rod" else 0.0),
                   mount=arr(lambda p: p["mount"]), density=arr(lambda p: p["density"]), nseg=np.array([types[t].nseg for t in et], dtype=np.int64),
                   owner=np.array(owner), seg_index=np.array(seg), row=np.array(row),
                   across=np.array(across, dtype=float), rods=arr(lambda p: p.get("rods", 1) if p["kind"] == "rod_row" else 1),
                   P1=P1, P2=P2, size0=size0, size_by=size_by, size_add=size_add, axes=axes, hull_corners=idx,
                   centres_hold=centres_hold, shielding=tuple(float(f) for f in shielding),
                   solved_pairs=dev.solved_pairs())


def _polygon_contains(poly, pt, rel: float = 1e-9):
    """Per sample: polygon (S, k, 2) convex, counter-clockwise and containing pt (S, 2), each
    by more than ``rel`` times its size (a clear answer; borderline cases give False)."""
    a = poly
    b = np.roll(poly, -1, axis=1)
    c = np.roll(poly, -2, axis=1)
    size = np.max(np.abs(poly), axis=(1, 2)) + np.max(np.abs(pt), axis=1) + 1e-300
    tol = rel * size[:, None] ** 2
    turn = (b[..., 0] - a[..., 0]) * (c[..., 1] - b[..., 1]) - (b[..., 1] - a[..., 1]) * (c[..., 0] - b[..., 0])
    side = (b[..., 0] - a[..., 0]) * (pt[:, None, 1] - a[..., 1]) - (b[..., 1] - a[..., 1]) * (pt[:, None, 0] - a[..., 0])
    return np.all(turn > tol, axis=1) & np.all(side > tol, axis=1)


def _geometry_clear(lay: _Layout, rf, lf, xb, yb) -> np.ndarray:
    """Per sample: no two footprints come near overlapping, and the body centre of mass lies
    clearly inside the support polygon (S,) bool. False means: ask the scalar model."""
    S = rf.size
    E = lay.cx.size
    factor = np.stack([np.ones(S), rf, lf], axis=1)                     # (S, 3)
    size = lay.size0[None] * factor[:, lay.size_by] + lay.size_add[None]   # (S, E, 2)
    ok = np.ones(S, dtype=bool)
    scale = max(float(np.max(np.abs(np.concatenate([lay.cx, lay.cy])))), 1e-300) + np.max(size, axis=(1, 2))
    if E > 1:
        i, j = np.triu_indices(E, 1)
        dist = np.hypot(lay.cx[j] - lay.cx[i], lay.cy[j] - lay.cy[i])
        circ = np.hypot(size[..., 0] * np.hypot(*lay.P1[:, 0].T), size[..., 1] * np.hypot(*lay.P2[:, 0].T))
        if lay.is_flex is not None and lay.is_flex.any():   # from the clamp: the far corners
            circ[:, lay.is_flex] = np.hypot(size[:, lay.is_flex, 0] * 2.0, size[:, lay.is_flex, 1])
        far = dist[None] > (circ[:, i] + circ[:, j]) * (1.0 + 1e-9)    # circumcircles apart
        near = ~np.all(far, axis=0)
        if near.any():
            i, j = i[near], j[near]
            A = np.concatenate([lay.axes[i], lay.axes[j]], axis=1)      # (P, 24, 2) axes of both
            def ext(e, f=np.max):  # extent of footprint e from its position on each axis:
                # s1 max(P1·a) + s2 max(P2·a), and with min the other way (a flexible leg's
                # rectangle starts at its position; the other footprints are symmetric about it)
                g1 = f(np.einsum("pkc,pac->pka", lay.P1[e], A), axis=1)
                g2 = f(np.einsum("pkc,pac->pka", lay.P2[e], A), axis=1)
                return size[:, e, 0, None] * g1[None] + size[:, e, 1, None] * g2[None]   # (S, P, 24)
            dc = np.einsum("pc,pac->pa", np.stack([lay.cx[j] - lay.cx[i], lay.cy[j] - lay.cy[i]], -1), A)[None]
            # the separation of the two projections on each axis (|dc| − ext i − ext j when symmetric)
            gap = np.maximum((dc - ext(i)) + ext(j, np.min), (-dc + ext(i, np.min)) - ext(j))
            ok &= np.all(np.max(gap, axis=-1) > 1e-9 * scale[:, None], axis=1)
    if not lay.centres_hold:
        # the polygon of the nominal hull's corners lies inside this sample's hull: containing
        # the centre of mass clearly is enough (otherwise the scalar model decides)
        V = (np.stack([lay.cx, lay.cy], -1)[None, :, None, :] + lay.P1[None] * size[..., 0, None, None]
             + lay.P2[None] * size[..., 1, None, None]).reshape(S, -1, 2)
        ok &= _polygon_contains(V[:, lay.hull_corners], np.broadcast_to(np.array([xb, yb]), (S, 2)))
    return ok


def build(design, lay: _Layout, x: dict[str, np.ndarray]):
    """Batch support and scaled loads for the samples ``x`` (1-D SI arrays of :data:`INPUTS`).

    Returns
    -------
    bs : BatchSupport
    W, xg, yg : ndarray (S,) [σ l_c, l_c]
        Own weight and centre of mass, scaled.
    weight, fs : ndarray (S,) [N]
        Own weight [N] and force scale σ l_c [N].
    clear : ndarray (S,) bool
        Geometry checks passed clearly (see :func:`_geometry_clear`).
    """
    from ..core.equilibrium_batch import BatchSupport

    liq = design.liquid
    g = liq.g
    sigma = x["surface_tension"]
    S = sigma.size
    lc = np.sqrt(sigma / (liq.rho * g))
    fs = sigma * lc
    rf, lf = x["radius_factor"], x["length_factor"]
    E = lay.cx.size
    rows = []
    rc = np.zeros((S, E))            # outer contact radius of round elements [m]
    own = np.zeros((S, E))           # own weight [N]
    flex_len = np.zeros((S, E))      # length of flexible legs [m]
    lcc, fsc = lc[:, None], fs[:, None]
    for t, ty in enumerate(lay.types):
        th = _effective_angle(np.minimum(np.maximum(ty.advancing + x["contact_angle_shift"], 0.0), math.pi),
                              ty.coating)
        members = lay.elem_type == t
        if ty.kind == "rod":
            geo = dict(ty.geo)
            Rs, Ls = geo["radius"] * rf / lc, geo["length"] * lf / lc
            u, inv = _unique(Rs, th, Ls)
            tb = _rod_tables(Rs[u], th[u], Ls[u], ty.nseg, POINTS)
            if inv is not None:
                tb = {k: v[inv] for k, v in tb.items()}
            mid, end = tb["mid"], tb["end"]
            if ty.shield < 1.0:  # neighbours' shared meniscus (nominal layout), as Device.from_design
                mid, end = mid * ty.shield, end * ty.shield
            rows.append((tb["depth"], (mid, end), tb["contact"], tb["n"]))
        elif ty.kind == "rod_row":
            from ..core.parallel2d_batch import row_tables

            geo = dict(ty.geo)
            Rs, Ls = geo["radius"] * rf / lc, geo["length"] * lf / lc
            Sp = geo["spacing"] / lc
            u, inv = _unique(Rs, th, Ls, Sp)
            tb = row_tables(Rs[u], th[u], Sp[u], int(geo["rods"]), Ls[u], ty.nseg, POINTS)
            if inv is not None:
                tb = {k: v[inv] for k, v in tb.items()}
            outer, inner = tb["outer"], tb["inner"]
            if ty.shield < 1.0:
                outer, inner = outer * ty.shield, inner * ty.shield
            rows.append((tb["depth"], (outer, inner), tb["contact"], tb["n"]))
        elif ty.kind == "flexible_leg":
            u, inv = _unique(x["contact_angle_shift"], sigma, rf, lf)
            out = _flex_tables(design, ty, {k: v[u] for k, v in x.items()})
            D, F, H, w, L = out if inv is None else (v[inv] for v in out)
            if ty.shield < 1.0:
                F = F * ty.shield
            rows.append((D / lcc, (F / fsc,), H / lcc, None))
            own[:, members] = w[:, None]
            flex_len[:, members] = L[:, None]
        else:
            geo = {k: np.broadcast_to(v * (rf if k == "radius" else lf if k == "length" else 1.0), (S,))
                   for k, v in ty.geo}
            u, inv = _unique(th, sigma, *geo.values())
            out = _round_tables(ty.kind, {k: v[u] for k, v in geo.items()}, th[u], sigma[u], liq, ty.density)
            D, F, H, r_c, w = out if inv is None else (v[inv] for v in out)
            if ty.shield < 1.0:
                F = F * ty.shield
            rows.append((D / lcc, (F / fsc,), H / lcc, None))
            rc[:, members] = r_c[:, None]
            own[:, members] = w[:, None]
    d0r, stepr, N, F, H, ldr, lfr = _resample(rows, S)
    row = lay.row
    d0, step, lim_d, lim_f = d0r[:, row], stepr[:, row], ldr[:, row], lfr[:, row]
    n = np.broadcast_to(N[:, None], d0.shape).astype(np.int64)
    # geometry (SI, per sample), as the adapters and Device.support
    R0 = np.array([dict(lay.types[t].geo).get("radius", 0.0) for t in lay.elem_type])
    L0 = np.array([dict(lay.types[t].geo)["length"] if lay.is_rod[e] else 0.0 for e, t in enumerate(lay.elem_type)])
    radius = R0[None, :] * rf[:, None]                    # rods only are used below
    length = L0[None, :] * lf[:, None]                    # zero for round elements (one central point)
    o = lay.owner
    nseg = lay.nseg[o]
    along = (lay.seg_index + 0.5)[None, :] / nseg[None, :] * length[:, o] - 0.5 * length[:, o]   # (S, m)
    px = lay.cx[o] + along * lay.ux[o] + lay.across * -lay.uy[o]
    py = lay.cy[o] + along * lay.uy[o] + lay.across * lay.ux[o]
    offs = along * lay.tan_tilt[o] - lay.mount[o]
    X, Y = px / lcc, py / lcc
    Cpl = np.zeros((S, o.size, E))
    rods = np.flatnonzero(lay.is_rod)
    if rods.size:
        half_w = radius[:, rods] + lay.size_add[rods, 1][None, :]      # a row: its half width
        Rl, Ll = half_w / lcc, length[:, rods] / lcc
        Cpl[:, :, rods] = _field(X[:, :, None], Y[:, :, None], (lay.cx[rods] / lcc)[:, None, :],
                                 (lay.cy[rods] / lcc)[:, None, :], lay.ux[rods], lay.uy[rods],
                                 0.5 * Ll[:, None, :], Rl[:, None, :])
        own[:, rods] = (lay.rods[rods] * lay.density[rods])[None, :] * math.pi * radius[:, rods] ** 2 * length[:, rods] * g
    is_flex = lay.is_flex if lay.is_flex is not None else np.zeros(E, dtype=bool)
    flex = np.flatnonzero(is_flex)
    if flex.size:   # a rod's field about the middle of the leg (as the adapter's rod_field)
        R0f = np.array([dict(lay.types[lay.elem_type[e]].geo)["radius"] for e in flex])
        Lf = flex_len[:, flex]
        mx = (lay.cx[flex][None, :] + 0.5 * Lf * lay.ux[flex][None, :]) / lcc
        my = (lay.cy[flex][None, :] + 0.5 * Lf * lay.uy[flex][None, :]) / lcc
        Cpl[:, :, flex] = _field(X[:, :, None], Y[:, :, None], mx[:, None, :], my[:, None, :], lay.ux[flex],
                                 lay.uy[flex], 0.5 * (Lf / lcc)[:, None, :], (R0f[None, :] * rf[:, None] / lcc)[:, None, :])
    rnd = np.flatnonzero(~lay.is_rod & ~is_flex)
    if rnd.size:
        Cpl[:, :, rnd] = _round_field(X[:, :, None], Y[:, :, None], (lay.cx[rnd] / lcc)[:, None, :],
                                      (lay.cy[rnd] / lcc)[:, None, :], (rc[:, rnd] / lcc)[:, None, :])
    Cpl = np.where(o[:, None] == np.arange(E)[None, :], 0.0, Cpl)
    if lay.solved_pairs is not None and lay.solved_pairs.any():  # as Device.support
        Cpl = np.where(lay.solved_pairs[o], 0.0, Cpl)
    bs = BatchSupport(x=X, y=Y, offset=offs / lcc, d0=d0, step=step, n=n,
                      force=F, contact=H, row=row, limit_depth=lim_d, limit_force=lim_f, owner=o, coupling=Cpl)
    wb = x["body_mass"] * g
    weight = wb + own.sum(axis=1)
    xb, yb = design.body["centre_of_mass"]
    A = _avg(o, E)
    cxm, cym = px @ A.T, py @ A.T   # (S, E) mean of each element's points
    xgs = (wb * xb + (own * cxm).sum(axis=1)) / weight
    ygs = (wb * yb + (own * cym).sum(axis=1)) / weight
    clear = _geometry_clear(lay, rf, lf, xb, yb)
    return bs, weight / fs, xgs / lc, ygs / lc, weight, fs, clear


def _avg(owner, E):
    A = np.zeros((E, owner.size))
    cnt = np.bincount(owner, minlength=E).astype(float)
    A[owner, np.arange(owner.size)] = 1.0 / cnt[owner]
    return A


@dataclass(frozen=True)
class DeviceBatchFunc:
    """Vectorised study callable of a design of :data:`BATCH_KINDS` (see module docstring); picklable.

    The layout of the nominal device is built on the first call and kept (it solves every
    element once, a flexible leg's elastica too).

    Takes the inputs of :data:`INPUTS` as broadcastable SI arrays and returns arrays of the
    broadcast shape.

    >>> from floatcalc.device import example
    >>> d = example("twin_rod")
    >>> f = DeviceBatchFunc(d)
    >>> out = f({"contact_angle_shift": np.radians([-10.0, 0.0, 10.0]), "surface_tension": d.liquid.sigma,
    ...          "radius_factor": 1.0, "length_factor": 1.0, "body_mass": 8e-4, "payload_mass": 0.0})
    >>> out["max_payload"].shape, bool(np.all(np.diff(out["max_payload"]) > 0))
    ((3,), True)
    """

    design: Any
    block: int = BLOCK
    shielding: tuple | None = None

    def __call__(self, x: dict[str, Any]) -> dict[str, np.ndarray]:
        arrays = np.broadcast_arrays(*(np.asarray(x[k], dtype=float) for k in INPUTS))
        shape = arrays[0].shape
        flat = {k: np.ascontiguousarray(a).ravel() for k, a in zip(INPUTS, arrays)}
        S = flat[INPUTS[0]].size
        out = {k: np.empty(S) for k in ("max_payload", "payload_mass", "spare_payload", "weight")}
        lay = self.prepared()._layout
        for a in range(0, S, self.block):
            part = {k: v[a:a + self.block] for k, v in flat.items()}
            res = self._block(lay, part)
            for k in out:
                out[k][a:a + self.block] = res[k]
        return {k: v.reshape(shape) for k, v in out.items()}

    def prepared(self) -> "DeviceBatchFunc":
        """This function with the layout of the nominal device built and kept (it goes with
        the function when a study sends it to worker processes); returns ``self``."""
        if self.__dict__.get("_layout") is None:
            object.__setattr__(self, "_layout", layout(self.design, self.shielding))
        return self

    def _scalar(self, lay, x, idx, res):
        from .device_model import _DeviceFunc

        scalar = _DeviceFunc(self.design, shielding=lay.shielding)
        for i in idx:
            r = scalar({k: float(v[i]) for k, v in x.items()})
            for k in res:
                res[k][i] = r[k]
        return res

    def _block(self, lay, x):
        from ..core.equilibrium_batch import capacity_at_centre
        from ..errors import ConvergenceError, InputError

        g = self.design.liquid.g
        S = x[INPUTS[0]].size
        try:
            bs, W, xg, yg, weight, fs, clear = build(self.design, lay, x)
        except (InputError, ConvergenceError):
            # an element law refused (or, a flexible leg, failed on) some sample: the scalar
            # model raises its own error for it
            res = {k: np.empty(S) for k in ("max_payload", "payload_mass", "spare_payload", "weight")}
            return self._scalar(lay, x, range(S), res)
        P, _, ok = capacity_at_centre(bs, W, xg, yg)
        ok &= clear
        Pn = P * fs
        res = {"max_payload": Pn, "payload_mass": Pn / g, "spare_payload": Pn - x["payload_mass"] * g, "weight": weight}
        if not ok.all():
            self._scalar(lay, x, np.flatnonzero(~ok), res)
        return res

