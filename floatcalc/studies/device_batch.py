"""Batched study function of a device whose elements are all straight rods (kind ``rod``).

The scalar device model (:mod:`floatcalc.studies.device_model`) rebuilds the device for every
sample (:meth:`floatcalc.device.solve.Device.from_design`, element tables from
:mod:`floatcalc.core.rod2d` and :mod:`floatcalc.core.finite_rod`) and then calls
:func:`floatcalc.core.equilibrium.capacity`. Here the same steps run on arrays over all
samples of a block:

* the element laws of :class:`floatcalc.device.elements.RodKind` – the finite-rod limit
  (:func:`floatcalc.core.finite_rod.limit_many`, the same grid and parabola), the 241-point
  table from first contact to the limit, the end caps on the end segments, the cut at depth 0
  (:func:`~floatcalc.device.elements.from_first_contact`) and the resampling on a uniform
  depth grid of :class:`~floatcalc.core.equilibrium.Support`;
* the plan positions, offsets and the coupling matrix of the linearised outer fields (all
  lengths scale with 1/l_c, which varies with the sampled surface tension);
* the capacity at the centre of mass by :func:`floatcalc.core.equilibrium_batch.capacity_at_centre`.

Inputs and outputs are those of the scalar model (``contact_angle_shift``, ``surface_tension``,
``radius_factor``, ``length_factor``, ``body_mass``, ``payload_mass`` → ``max_payload``,
``payload_mass``, ``spare_payload``, ``weight``), and so are the numbers (tests/test_device_batch.py
compares the two on random perturbations).

Samples for which the batch cannot vouch for the scalar answer are handed to the scalar
model unchanged: footprints that come within rounding of overlapping, a centre of mass not
clearly inside the support polygon (the scalar model then gives its one-line InputError),
capacities that did not converge or devices that carry next to nothing, and samples whose rod
types get tables of different lengths (the scalar path stacks the tables of all elements, so it
needs equal lengths; it is left to decide what happens there).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

#: Element kinds the batch builds itself.
BATCH_KINDS = frozenset({"rod"})
#: Samples per block (bounds the memory of the coupling arrays).
BLOCK = 500
INPUTS = ("contact_angle_shift", "surface_tension", "radius_factor", "length_factor", "body_mass", "payload_mass")


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
    """Resampled tables of one rod type for S samples: dict of (S, points) arrays and n (S,)."""
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
    tabs = {}
    jl = np.maximum(i0 - 1, 0)
    for name, T in (("depth", D), ("mid", F_mid), ("end", F_end), ("contact", hd)):
        Tt = T[rows[:, None], src]
        if name == "depth":
            at0 = np.zeros(S)
        else:
            x0, x1 = D[rows, jl], D[rows, i0]
            y0, y1 = T[rows, jl], T[rows, i0]
            with np.errstate(divide="ignore", invalid="ignore"):
                at0 = np.where(x1 > x0, (y1 - y0) / np.where(x1 > x0, x1 - x0, 1.0) * (0.0 - x0) + y0, y0)
        Tt[:, 0] = np.where(cut, at0, Tt[:, 0])
        tabs[name] = Tt
    # resample on a uniform depth grid of the same number of points (as Support does)
    Dt = tabs["depth"]
    d0 = Dt[:, 0]
    d_last = Dt[rows, n_tab - 1]
    step = (d_last - d0) / (n_tab - 1)
    grid = d0[:, None] + step[:, None] * np.arange(points)
    grid = np.minimum(grid, d_last[:, None])
    mid, end, contact = _rows_interp(grid, Dt, (tabs["mid"], tabs["end"], tabs["contact"]), n_tab)
    return {"d0": d0, "step": step, "n": n_tab, "limit_depth": d_last, "mid": mid, "end": end,
            "contact": contact, "limit_mid": tabs["mid"][rows, n_tab - 1], "limit_end": tabs["end"][rows, n_tab - 1]}


def _field(X, Y, cx, cy, ux, uy, half, w):
    """Linearised outer field of a rod (as :func:`floatcalc.device.elements._rod_field`), arrays."""
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


@dataclass(frozen=True)
class _Layout:
    """What the batch needs of a design, computed once (picklable)."""

    types: tuple          # (radius, length, advancing, coating, segments) per rod type
    elem_type: np.ndarray  # (E,)
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
    row: np.ndarray        # (m,) table row: 2 t + (0 mid, 1 end)
    hull_corners: np.ndarray  # indices (into E*4 corners) of the nominal support polygon, ccw
    solved_pairs: np.ndarray = None  # (E, E) no superposition coupling (Device.solved_pairs, nominal)


def _corners(half_l, half_w, cx, cy, ux, uy):
    """Footprint corners (..., E, 4, 2) as the rod adapter draws them."""
    c0 = np.stack([-half_l, half_l, half_l, -half_l], axis=-1)
    c1 = np.stack([-half_w, -half_w, half_w, half_w], axis=-1)
    fx = cx[..., None] + c0 * ux[..., None] - c1 * uy[..., None]
    fy = cy[..., None] + c0 * uy[..., None] + c1 * ux[..., None]
    return np.stack([fx, fy], axis=-1)


def layout(design, shielding=None) -> _Layout:
    """Element types, geometry and point layout of an all-rod design.

    ``shielding``: each element's factor on its force table for neighbours that share its
    meniscus (:mod:`floatcalc.device.interact`), from the nominal design (default: solved here
    once); elements with different factors are different types.
    """
    from ..device.geometry import convex_hull

    from ..device.solve import Device

    dev = Device.from_design(design) if shielding is None else Device.from_design(design, shielding=shielding)
    shielding = dev.shielding
    keys, types, et = {}, [], []
    for p, f in zip(design.elements, shielding):
        c = p["coating"]
        key = (p["radius"], p["length"], c["advancing"], c.get("texture", "none"), c.get("roughness"),
               c.get("solid_fraction"), p["segments"], float(f))
        if key not in keys:
            keys[key] = len(types)
            types.append((p["radius"], p["length"], c["advancing"], dict(c), p["segments"], float(f)))
        et.append(keys[key])
    legs = design.elements
    arr = lambda f: np.array([f(p) for p in legs], dtype=float)  # noqa: E731
    owner, seg, row = [], [], []
    for e, p in enumerate(legs):
        n = p["segments"]
        for k in range(n):
            owner.append(e)
            seg.append(k)
            row.append(2 * et[e] + (1 if k in (0, n - 1) else 0))
    ux, uy = arr(lambda p: math.cos(p["heading"])), arr(lambda p: math.sin(p["heading"]))
    cx, cy = arr(lambda p: p["position"][0]), arr(lambda p: p["position"][1])
    corners = _corners(0.5 * arr(lambda p: p["length"]), arr(lambda p: p["radius"]), cx, cy, ux, uy).reshape(-1, 2)
    hull = convex_hull(corners)
    idx = np.array([int(np.argmin(np.hypot(*(corners - h).T))) for h in hull])
    return _Layout(types=tuple(types), elem_type=np.array(et), cx=cx, cy=cy, ux=ux, uy=uy,
                   tan_tilt=arr(lambda p: math.tan(p["tilt"])), mount=arr(lambda p: p["mount"]),
                   density=arr(lambda p: p["density"]), nseg=arr(lambda p: p["segments"]).astype(int),
                   owner=np.array(owner), seg_index=np.array(seg), row=np.array(row), hull_corners=idx,
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


def _geometry_clear(lay: _Layout, half_l, half_w, xb, yb) -> np.ndarray:
    """Per sample: no two footprints come near overlapping, and the body centre of mass lies
    clearly inside the support polygon (S,) bool. False means: ask the scalar model."""
    S, E = half_l.shape
    C = _corners(half_l, half_w, np.broadcast_to(lay.cx, (S, E)), np.broadcast_to(lay.cy, (S, E)),
                 np.broadcast_to(lay.ux, (S, E)), np.broadcast_to(lay.uy, (S, E)))   # (S, E, 4, 2)
    ok = np.ones(S, dtype=bool)
    if E > 1:
        i, j = np.triu_indices(E, 1)
        # separating axes of rectangles: each one's two edge directions (2E axes in all)
        axes = np.stack([lay.ux, lay.uy, -lay.uy, lay.ux], -1).reshape(2 * E, 2)
        proj = np.matmul(C, axes.T)                                   # (S, E, 4 corners, 2E axes)
        lo, hi = proj.min(axis=2), proj.max(axis=2)                   # (S, E, 2E)
        a = np.concatenate([2 * i[:, None] + [0, 1], 2 * j[:, None] + [0, 1]], axis=1)   # (P, 4)
        gap = np.maximum(lo[:, j[:, None], a] - hi[:, i[:, None], a], lo[:, i[:, None], a] - hi[:, j[:, None], a])
        scale = np.max(np.abs(C), axis=(1, 2, 3))
        ok &= np.all(np.max(gap, axis=-1) > 1e-9 * scale[:, None], axis=1)
    # the polygon of the nominal hull's corners lies inside this sample's hull: containing
    # the centre of mass clearly is enough (otherwise the scalar model decides)
    poly = C.reshape(S, -1, 2)[:, lay.hull_corners]
    ok &= _polygon_contains(poly, np.broadcast_to(np.array([xb, yb]), (S, 2)))
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
    S = x["surface_tension"].size
    sigma = x["surface_tension"]
    lc = np.sqrt(sigma / (liq.rho * g))
    fs = sigma * lc
    rf, lf = x["radius_factor"], x["length_factor"]
    E = len(design.elements)
    tab_rows = []  # one per rod type; each gives two table rows (middle and end segments)
    for t, (R0, L0, adv, coat, nseg, shield) in enumerate(lay.types):
        th = _effective_angle(np.minimum(np.maximum(adv + x["contact_angle_shift"], 0.0), math.pi), coat)
        tb = _rod_tables(R0 * rf / lc, th, L0 * lf / lc, nseg, 241)
        if shield != 1.0:  # neighbours' shared meniscus (nominal layout), as Device.from_design
            for k in ("mid", "end", "limit_mid", "limit_end"):
                tb[k] = tb[k] * shield
        tab_rows.append(tb)
    F = np.stack([tb[k] for tb in tab_rows for k in ("mid", "end")], axis=1)          # (S, 2T, w)
    H = np.stack([tb["contact"] for tb in tab_rows for _ in (0, 1)], axis=1)
    per_row = lambda k: np.stack([tb[k] for tb in tab_rows for _ in (0, 1)], axis=1)  # noqa: E731
    row = lay.row
    d0, step, n, lim_d = (per_row(k)[:, row] for k in ("d0", "step", "n", "limit_depth"))
    lim_f = np.stack([tb[k] for tb in tab_rows for k in ("limit_mid", "limit_end")], axis=1)[:, row]
    # geometry (SI, per sample), as the rod adapter and Device.support
    radius = np.stack([lay.types[t][0] * rf for t in lay.elem_type], axis=1)        # (S, E)
    length = np.stack([lay.types[t][1] * lf for t in lay.elem_type], axis=1)
    o = lay.owner
    nseg = lay.nseg[o]
    along = (lay.seg_index + 0.5)[None, :] / nseg[None, :] * length[:, o] - 0.5 * length[:, o]   # (S, m)
    px = lay.cx[o] + along * lay.ux[o]
    py = lay.cy[o] + along * lay.uy[o]
    offs = along * lay.tan_tilt[o] - lay.mount[o]
    X, Y = px / lc[:, None], py / lc[:, None]
    Rl, Ll = radius / lc[:, None], length / lc[:, None]
    Cpl = _field(X[:, :, None], Y[:, :, None], (lay.cx / lc[:, None])[:, None, :], (lay.cy / lc[:, None])[:, None, :],
                 lay.ux, lay.uy, 0.5 * Ll[:, None, :], Rl[:, None, :])
    Cpl = np.where(o[:, None] == np.arange(E)[None, :], 0.0, Cpl)
    if lay.solved_pairs is not None and lay.solved_pairs.any():  # as Device.support
        Cpl = np.where(lay.solved_pairs[o], 0.0, Cpl)
    bs = BatchSupport(x=X, y=Y, offset=offs / lc[:, None], d0=d0, step=step, n=n.astype(np.int64),
                      force=F, contact=H, row=row, limit_depth=lim_d, limit_force=lim_f, owner=o, coupling=Cpl)
    own = lay.density[None, :] * math.pi * radius**2 * length * g                   # (S, E)
    weight = x["body_mass"] * g + own.sum(axis=1)
    wb = x["body_mass"] * g
    xb, yb = design.body["centre_of_mass"]
    A = _avg(o, E)
    cxm, cym = px @ A.T, py @ A.T   # (S, E) mean of each element's points
    wt = wb + own.sum(axis=1)
    xgs = (wb * xb + (own * cxm).sum(axis=1)) / wt
    ygs = (wb * yb + (own * cym).sum(axis=1)) / wt
    clear = _geometry_clear(lay, 0.5 * length, radius, xb, yb)
    # Device.support stacks the element tables, so the scalar model needs tables of one length;
    # samples whose rods differ go to it as they are (it decides what happens).
    clear &= np.all(n == n[:, :1], axis=1)
    return bs, weight / fs, xgs / lc, ygs / lc, weight, fs, clear


def _avg(owner, E):
    A = np.zeros((E, owner.size))
    cnt = np.bincount(owner, minlength=E).astype(float)
    A[owner, np.arange(owner.size)] = 1.0 / cnt[owner]
    return A


@dataclass(frozen=True)
class DeviceBatchFunc:
    """Vectorised study callable of an all-rod design (see module docstring); picklable.

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
        lay = layout(self.design, self.shielding)
        for a in range(0, S, self.block):
            part = {k: v[a:a + self.block] for k, v in flat.items()}
            res = self._block(lay, part)
            for k in out:
                out[k][a:a + self.block] = res[k]
        return {k: v.reshape(shape) for k, v in out.items()}

    def _block(self, lay, x):
        from ..core.equilibrium_batch import capacity_at_centre

        g = self.design.liquid.g
        bs, W, xg, yg, weight, fs, clear = build(self.design, lay, x)
        P, _, ok = capacity_at_centre(bs, W, xg, yg)
        ok &= clear
        Pn = P * fs
        res = {"max_payload": Pn, "payload_mass": Pn / g, "spare_payload": Pn - x["payload_mass"] * g, "weight": weight}
        if not ok.all():
            from .device_model import _DeviceFunc

            scalar = _DeviceFunc(self.design)
            for i in np.flatnonzero(~ok):
                r = scalar({k: float(v[i]) for k, v in x.items()})
                for k in res:
                    res[k][i] = r[k]
        return res
