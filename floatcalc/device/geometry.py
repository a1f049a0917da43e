"""Plan geometry of device footprints: convex hull, point inside, overlap and distance.

Footprints are convex polygons given as (k, 2) arrays of vertices in order.

>>> sq = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], float)
>>> inside_convex(convex_hull(sq), (0.5, 0.5)), polygons_overlap(sq, sq + 2.0)
(True, False)
"""

from __future__ import annotations

import numpy as np


def convex_hull(points) -> np.ndarray:
    """Convex hull (counter-clockwise) by Andrew's monotone chain."""
    pts = sorted(map(tuple, np.asarray(points, dtype=float)))
    if len(pts) <= 2:
        return np.array(pts)

    def cross(o, a, b):
        return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])

    lower, upper = [], []
    for p in pts:
        while len(lower) >= 2 and cross(lower[-2], lower[-1], p) <= 0:
            lower.pop()
        lower.append(p)
    for p in reversed(pts):
        while len(upper) >= 2 and cross(upper[-2], upper[-1], p) <= 0:
            upper.pop()
        upper.append(p)
    return np.array(lower[:-1] + upper[:-1])


def inside_convex(hull, point) -> bool:
    """True if ``point`` lies inside or on a counter-clockwise convex polygon."""
    h = np.asarray(hull, dtype=float)
    if len(h) < 3:
        return False
    a = h
    b = np.roll(h, -1, axis=0)
    cr = (b[:, 0] - a[:, 0]) * (point[1] - a[:, 1]) - (b[:, 1] - a[:, 1]) * (point[0] - a[:, 0])
    return bool(np.all(cr >= -1e-15))


def polygons_overlap(p, q) -> bool:
    """Separating-axis test for two convex polygons (touching counts as no overlap)."""
    for poly in (np.asarray(p, float), np.asarray(q, float)):
        edges = np.roll(poly, -1, axis=0) - poly
        normals = np.column_stack([-edges[:, 1], edges[:, 0]])
        for n in normals:
            a = np.asarray(p, float) @ n
            b = np.asarray(q, float) @ n
            if a.max() <= b.min() or b.max() <= a.min():
                return False
    return True


def _point_segment(pt, a, b):
    ab = b - a
    t = np.clip(np.dot(pt - a, ab) / max(np.dot(ab, ab), 1e-300), 0.0, 1.0)
    return float(np.hypot(*(a + t * ab - pt)))


def polygon_distance(p, q) -> float:
    """Smallest distance between two convex polygons (0 if they overlap)."""
    p = np.asarray(p, float)
    q = np.asarray(q, float)
    if polygons_overlap(p, q):
        return 0.0
    best = np.inf
    for P, Q in ((p, q), (q, p)):
        for i in range(len(Q)):
            a, b = Q[i], Q[(i + 1) % len(Q)]
            for pt in P:
                best = min(best, _point_segment(pt, a, b))
    return float(best)


def near_pairs(footprints, reach: float = 0.0):
    """Index pairs (i < j) of footprints whose bounding circles come within ``reach``.

    A vectorised first pass (centre distance against the sum of circumradii), so that the
    exact polygon tests run only on pairs that can be close: O(n²) arithmetic on arrays instead
    of O(n²) polygon loops.

    >>> sq = np.array([[0, 0], [1, 0], [1, 1], [0, 1]], float)
    >>> near_pairs([sq, sq + 1.5, sq + 10.0], reach=1.0)
    [(0, 1)]
    """
    if len(footprints) < 2:
        return []
    c = np.array([np.asarray(f, float).mean(axis=0) for f in footprints])
    r = np.array([float(np.max(np.hypot(*(np.asarray(f, float) - cc).T))) for f, cc in zip(footprints, c)])
    d = np.hypot(c[:, None, 0] - c[None, :, 0], c[:, None, 1] - c[None, :, 1])
    i, j = np.nonzero(np.triu(d - r[:, None] - r[None, :] <= reach, 1))
    return list(zip(i.tolist(), j.tolist()))
