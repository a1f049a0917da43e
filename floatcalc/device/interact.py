"""Neighbours in a device: limits lowered by shared menisci, from the solved interaction model.

The device equilibrium (:mod:`floatcalc.core.equilibrium`) superposes linearised menisci, which
only shifts each element's depth and cannot lower its limit. Elements whose footprints come
within :data:`REACH_LC` capillary lengths of each other are therefore solved together with the
solved 3D meniscus of :mod:`floatcalc.core.interactions` (inner–outer matching: K₀ boundary
elements outside, the exact 1D nonlinear first integral across each contact-line panel; exact
for parallel rods in 2D, Vella, Lee & Kim, Langmuir 22, 5979, 2006):

* the level cluster of rods is pushed down until its total force is largest
  (:func:`floatcalc.core.interactions.limit` with ``"all"``), and each element's force there,
  over its limit alone in the same model, is its *shielding factor*
  s_i = F_i(cluster at its limit) / F_i(alone) ≤ 1 (a ratio of one model, so that a rod's
  ends, which the device's rod law bounds, cancel: core.finite_rod);
* the element's force–depth table in the device is scaled by s_i, so its limit (and the
  device's capacity) falls with spacing as the shared meniscus says;
* within such a cluster the solved meniscus replaces the superposed linear menisci for the
  rods: the device drops the superposition coupling a cluster's rod receives from the members
  within :data:`REACH_LC` of it (:func:`solved_groups`, ``Device.support``). Kept, it would
  count the neighbours twice: a middle rod between two others is shielded in s_i and, through
  the superposed depression, also reaches its limit later than the outer ones, so the device
  would fail on the outer rods with the middle one short of its limit (three rods at a
  0.5 l_c gap: 3.7 % below the exact 2D row, 5 % below the solved cluster). Checked on the
  tilted twelve-leg skimmer at its capacity: the device carries the solved meniscus's force
  at the same depths to +0.3 % (superposition alone: 5 % below).
  Round bodies keep the coupling they receive: the mode-0 model does not lower their limit
  (only shifts the depth at which they reach it), which the superposed depression gives.
  They are left out of the solved limit (:func:`solved_groups` says why), so the rods of a
  cluster keep the superposed coupling from its round members too.

A factor above 1 (an element standing in a neighbour's depression gains a little pressure) is
not used: s_i is capped at 1 (safe side). Element kinds the interaction model does not solve
(rod rows, which carry their own exact shared menisci, and flexible legs) keep s = 1 and a
warning names them when they are close to a neighbour.
"""

from __future__ import annotations

import math

import numpy as np

#: Footprints closer than this [capillary lengths] are solved together.
REACH_LC = 2.5
#: Shielding factors of layouts already solved (bodies in scaled units, so the liquid is in the key).
_CACHE: dict = {}
#: Largest cluster solved together (cost guard: the solve is dense in the number of panels).
MAX_CLUSTER = 48
_SOLVED = ("rod", "ball", "pad", "pin", "ring")


def _body(m, kind, lc):
    from ..core import interactions as I

    g = m.geometry
    c = m.points.mean(axis=0)
    if kind == "rod":
        return I.RodBody(float(c[0] / lc), float(c[1] / lc), float(g["heading"]), g["length"] / lc,
                         g["radius"] / lc, float(g["theta"]))
    params = {k: v / lc for k, v in g.items() if k in ("radius", "thickness", "length", "ring_radius", "wire_radius")}
    params["theta"] = float(g["theta"])
    return I.RoundBody(float(c[0] / lc), float(c[1] / lc), kind, params)


def close_pairs(footprints, dist: float) -> list[tuple[int, int]]:
    """Index pairs (i < j) of convex footprints (vertex arrays) closer than ``dist`` [m].

    The smallest distance between two disjoint polygons is reached at a vertex of one and an
    edge of the other; all vertex–edge distances of the candidate pairs (bounding circles
    within ``dist``, :func:`~floatcalc.device.geometry.near_pairs`) are taken at once on
    arrays (polygons padded to a common vertex count by repeating their last vertex, which
    adds only zero-length edges). Overlapping footprints, refused before, count as close
    (:func:`~floatcalc.device.geometry.polygons_overlap`).

    >>> sq = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], float)
    >>> close_pairs([sq, sq + [1.5, 0.0], sq + [3.2, 0.0]], 0.6)
    [(0, 1)]
    """
    from .geometry import near_pairs, polygons_overlap

    cand = near_pairs(footprints, dist)
    if not cand:
        return []
    k = max(len(f) for f in footprints)
    P = np.array([np.vstack([f, np.repeat(np.asarray(f, float)[-1:], k - len(f), axis=0)]) for f in footprints])
    i, j = np.array(cand).T

    def vertex_edge(A, B):   # (c, k, 2) vertices of A against (c, k, 2) edges of B: (c,)
        a, b = B, np.roll(B, -1, axis=1)
        ab = (b - a)[:, None, :, :]                     # (c, 1, k, 2)
        ap = A[:, :, None, :] - a[:, None, :, :]        # (c, k, k, 2)
        t = np.clip(np.sum(ap * ab, -1) / np.maximum(np.sum(ab * ab, -1), 1e-300), 0.0, 1.0)
        d = ap - t[..., None] * ab
        return np.sqrt(np.min(np.sum(d * d, -1), axis=(1, 2)))

    d = np.minimum(vertex_edge(P[i], P[j]), vertex_edge(P[j], P[i]))
    out = []
    for a, b, dd in zip(i.tolist(), j.tolist(), d.tolist()):
        if dd < dist or polygons_overlap(footprints[a], footprints[b]):
            out.append((a, b))
    return out


def clusters(models, lc: float, reach: float = REACH_LC) -> list[list[int]]:
    """Groups of element indices whose footprints come within ``reach`` l_c (transitively)."""
    n = len(models)
    parent = list(range(n))

    def root(i):
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i

    for i, j in close_pairs([m.footprint for m in models], reach * lc):
        parent[root(i)] = root(j)
    groups: dict[int, list[int]] = {}
    for i in range(n):
        groups.setdefault(root(i), []).append(i)
    return [g for g in groups.values() if len(g) > 1]


def solved_groups(models, kinds, lc: float) -> list[list[int]]:
    """Element indices of each cluster that :func:`shielding` solves together, by geometry:
    the rods of a cluster (at least two, at most :data:`MAX_CLUSTER`).

    Round elements are left out of the solved limit: the cluster's limit is taken with every
    member pushed down together, and a small ball foot or pad reaches its own limit (or the end
    of its branch) long before a rod does, so the rod's force there is only part of its limit and
    would read as a large shielding (36 % for a 20 mm rod 1.8 l_c from a 0.5 mm steel ball).
    Round elements keep the superposed linear coupling with the rods instead, and a warning
    gives the size of what that leaves out."""
    out = []
    for group in clusters(models, lc):
        rods = [i for i in group if kinds[i] == "rod"]
        if 2 <= len(rods) <= MAX_CLUSTER:
            out.append(rods)
    return out


def shielding(models, kinds, liquid, names, groups_out: list | None = None) -> tuple[np.ndarray, list[str]]:
    """Shielding factor s_i ≤ 1 of every element and the warnings (see module docstring).

    ``groups_out``, if given, receives the element indices of every cluster solved (whose
    rods' superposition coupling the device replaces by the solved meniscus).
    """
    from ..core import interactions as I
    from ..errors import ConvergenceError, InputError

    lc = liquid.lc
    n = len(models)
    s = np.ones(n)
    warnings: list[str] = []
    for group in clusters(models, lc):
        solved = [i for i in group if kinds[i] == "rod"]
        rounds = [i for i in group if kinds[i] in _SOLVED and kinds[i] != "rod"]
        other = [i for i in group if kinds[i] not in _SOLVED]
        if other:
            warnings.append(", ".join(names[i] for i in other) + " (rod rows and flexible legs) are within "
                            f"{REACH_LC:g} capillary lengths of a neighbour: their limits do not include the "
                            "shared meniscus with it")
        if rounds:
            # round elements keep the superposed linear coupling (solved_groups says why); their
            # limits are not lowered by a neighbour; the superposition takes a neighbour's field as
            # a level, as the solved model's mode-0 coupling did when it measured 4.4 % high for a
            # ball 0.5 l_c from a rod against a finite-element reference (with its scattering now
            # within 0.4 %, tests/reference; the device's own figure is not measured)
            warnings.append(", ".join(names[i] for i in rounds[:6]) + ("…" if len(rounds) > 6 else "") +
                            f": round elements within {REACH_LC:g} capillary lengths of a neighbour; their "
                            "meniscus is coupled to it by linear superposition only, which does not lower their "
                            "limits (a ball 0.5 l_c from a rod: up to 4.4 % high against a finite-element "
                            "reference; two close rods lose up to 25 % at a 0.5 l_c gap): keep round feet a few "
                            "capillary lengths from their neighbours")
        if len(solved) < 2:
            continue
        if len(solved) > MAX_CLUSTER:
            warnings.append(f"{len(solved)} elements within {REACH_LC:g} capillary lengths of each other: more than "
                            f"{MAX_CLUSTER} are not solved together (cost); their limits are those of elements far "
                            "apart, which overstates close neighbours (up to 25 % for rods at a 0.5 l_c gap)")
            continue
        try:
            bodies = [_body(models[i], kinds[i], lc) for i in solved]
            key = (tuple((b.cx, b.cy, b.key()) if isinstance(b, I.RoundBody) else b for b in bodies),
                   tuple(round(float(models[i].offsets.mean() / lc), 12) for i in solved))
            if key in _CACHE:   # same layout, e.g. only the payload or body mass changed
                f_cached, w_cached = _CACHE[key]
                for k, f in zip(solved, f_cached):
                    s[k] = f
                warnings += w_cached
                if groups_out is not None:
                    groups_out.append(list(solved))
                continue
            lay = I.Layout(bodies)
            warnings += list(getattr(lay, "warnings", ()))
            lim = I.limit(lay, np.array([models[i].offsets.mean() / lc for i in solved]), "all")
            alone = {}
            for k, b in zip(solved, bodies):
                akey = (type(b).__name__, tuple(round(float(v), 12) for v in
                                                (b.length, b.radius, b.theta) if not isinstance(b, I.RoundBody))
                        if not isinstance(b, I.RoundBody) else b.key())
                if akey not in alone:
                    alone[akey] = I.isolated_force(b, 1.0)   # the cluster's mesh: errors cancel in s
                f = float(lim["forces"][solved.index(k)]) / alone[akey]
                s[k] = min(1.0, f) if math.isfinite(f) and f > 0 else 1.0
        except (ConvergenceError, InputError, np.linalg.LinAlgError) as exc:
            warnings.append(f"the shared meniscus of {', '.join(names[i] for i in solved)} could not be solved "
                            f"({str(exc).splitlines()[0]}); their limits are those of elements far apart")
            continue
        mine = []
        for k in solved:
            if s[k] < 0.999:
                mine.append(f"{names[k]}: neighbours within {REACH_LC:g} capillary lengths share its meniscus "
                            f"and lower its limit by {100 * (1 - s[k]):.2g} % (solved meniscus, "
                            "floatcalc.core.interactions)")
        warnings += mine
        if groups_out is not None:
            groups_out.append(list(solved))
        if len(_CACHE) >= 64:
            _CACHE.pop(next(iter(_CACHE)))
        _CACHE[key] = ([float(s[k]) for k in solved], mine)
    return s, warnings
