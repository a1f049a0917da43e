"""Solved 3D meniscus of many floating elements at once: inner–outer matching, in scaled variables.

Lengths in capillary lengths l_c, forces in σ l_c (per unit length in σ), depth h below the
undisturbed surface z = 0 (positive down). Conventions as in :mod:`floatcalc.core.rod2d`: φ is
the contact position on a rod's circular section from its lowest point, ψ = φ + θ − π the
interface inclination at the contact line (positive for a depressed meniscus).

Method
------
**Outer region.** A few contact-line widths away from every element the meniscus is small and
obeys the linearised Young–Laplace equation ∇²h = h. It is represented by a single layer of
K₀ sources, G(r) = K₀(r)/(2π), on straight panels along every rod's contact line (both long
sides at the fixed lateral offset R from the axis, graded finer towards the ends, and the two
end faces), see :mod:`floatcalc.core.bem_k0`. Collocation at the panel midpoints gives the
matrices S (depth per unit source) and N = −I/2 + K (outward normal slope), so the outer
field's Dirichlet-to-Neumann map is M = N S⁻¹, formed once per layout.

**Inner region.** Across each contact-line panel the meniscus is taken as locally 1D and
nonlinear. Its true contact state (h_s, ψ_s) is mapped onto *virtual linear contact data*
(h_v, ∂ₙh_v) at the panel line by :mod:`floatcalc.core.inner2d`: the linear 1D solution with
the same first integral E = 2(1 − cos ψ) − h² and the same distance to the turning point
(E < 0) or zero crossing (E > 0), or the same far tail (E = 0), carried by the exact 1D linear
solution over the offset δ = R(1 − sin φ) from the contact line to the panel line. The
matching conditions are

.. math:: \\partial_n h_v(\\phi) = M\\, h_v(\\phi) + W B,

one per panel, with one unknown per panel: the contact position φ of a side panel, or the
contact height of an end panel. For infinitely long parallel rods this reproduces the exact 2D
shared meniscus (Vella, Lee & Kim [1]_) at any gap, and the exact isolated rod; the tests
check both. All φ are solved together by Newton's method with the dense Jacobian
diag(∂ₙh_v′) − M diag(h_v′) and warm starts.

**Forces.** A side panel of length ℓ carries ℓ [sin ψ + R c sin φ + R²(φ/2 + sin 2φ/4)] (the
vertical pull of its contact line and the hydrostatic pressure on that side's half of the
wetted arc; c = D − R is the local centre depth, D the local lowest-point depth; as
:func:`floatcalc.core.parallel2d.side_force`).

**End faces.** The end of a cut rod is a flat vertical disc of radius R with a sharp rim. Its
contact line is a horizontal chord at depth h_e on the face, where the interface meets the
vertical face at ψ = θ − π/2 (Young's angle on a vertical wall); when h_e would leave the face
the line pins at the rim (Gibbs' inequality) and ψ varies instead, from θ − π at the bottom
to θ at the top. The unknown u runs through the three stages: u < 0 pinned at the bottom
(ψ = θ − π/2 + u/R), 0 ≤ u ≤ 2R on the face (h_e = D − u), u > 2R pinned at the top. The face
carries chord × sin ψ, chord = 2√(u(2R − u)) (zero when pinned), and no vertical pressure.
The ends therefore come out of the same solve; no end-cap formula is added on top.

**Round bodies** (ball, pad, pin, ring footpad): mode-0 (axisymmetric) coupling. Each is
represented by its exact isolated axisymmetric law (:mod:`floatcalc.core.round_bodies`,
tabulated once per body) and an outgoing far field B K₀(r) whose amplitude B is the isolated
solution's own (read from the far-field start of the axisymmetric shooting,
:func:`floatcalc.core.axisym.solve`). The neighbours' incoming field averaged over a circle of
radius ρ round the body (its radius), h_in, is the mode-0 part α I₀(r) of a regular wave of
∇²h = h with α = h_in/I₀(ρ). At a fixed contact state the body's meniscus re-adjusts to it (it
scatters β K₀, β = α I₁(r_c)/K₁(r_c), so that its contact slope stays), and its contact depth
moves by α W, W = I₀(r_c) + I₁(r_c)K₀(r_c)/K₁(r_c) (small-slope response; a nonlinear
axisymmetric shot gives 1.130 where W = 1.126 for the ball of the FEM check): the body's state
is its isolated state at D_eff = D − κ h_in, κ = W/I₀(ρ) (1.08 there), and its far amplitude is
B_iso(D_eff) + β. κ and β are taken at the body's own depth D (they vary slowly with r_c).
Rings (a meniscus inside as well) keep κ = 1, β = 0. Taking the incoming field as a plain level
(κ = 1, β = 0, the model before) put a ball 0.5 l_c from a rod 4.4 % above the finite-element
reference; with the scattering it is within 0.4 % (tests/reference). The pressure gain of sitting in a depressed region (h_in > 0)
is left out (safe side, at most h_in × the body's wetted projection); a loss (h_in < 0) is
kept. The angular modes m ≥ 1 of the incoming field are neglected (and a round body
scatters its neighbours' fields only through its own mode 0): a gradient across the body tilts
its meniscus, whose vertical force changes only at second order, so the coupling term carries
a relative error of order (a |∇h_in| / h_in)² ≈ a² (a in l_c; for a neighbour a few l_c away
|∇h_in|/h_in = K₁/K₀ → 1). The nonlinear gap effect that lowers the limit of two close rods
is not captured for round bodies: under this scheme a round body's limit force with
neighbours equals its limit alone (only its limit depth shifts); rods get the full effect.

**Solution and limits.** Newton's method on all unknowns at once. The Jacobian
J = diag(∂ₙh_v′) − M diag(h_v′) (plus the round bodies' rows) is factorised in single precision
and kept between solves: chord steps with it while they contract the residual at least 0.3×
a step; past that, exact Newton steps, on systems of 1000 unknowns and more by GMRES (Saad &
Schultz [4]_) on the exact Jacobian applied without forming it, the kept factors as the
preconditioner, and on smaller systems by a fresh factorisation. The factors are renewed
when the GMRES work on them has cost as much as a factorisation (rent or buy). From 1000
unknowns the full factorisation is not formed at all while it can be avoided: GMRES is
preconditioned by the inverses of the Jacobian's diagonal blocks, one per rod (block Jacobi,
rebuilt at every Newton step in about a millisecond; the rods couple only through K₀ between
them, so 4–5 iterations reach 1e-4 on the 48-rod benchmark ring), and a layout where that
does not converge falls back to the full LU. Every residual
is evaluated in double precision, so the precision of the factors affects only the number of
steps, not the solution. The derivatives of the inner map are central differences (step
1e-4 while far from the solution, 1e-7 close to it: the exact map has an E ln|E| term at the
isolated state E = 0, whose log-singular slope would mislead Newton there). dF/dD follows from
the implicit-function theorem on the same Jacobian (GMRES to 1e-9 for one direction).
:func:`limit` raises a body's depth (or all depths together) until dF/dD turns negative, the
steps lengthened while the rods' sections are far from their own 2D limit states and aimed
just past the root predicted by a parabola through the last slopes, then finds the root
(secant steps inside the bracket, Illinois regula falsi where they leave it, stopped once a
step could gain less than 1e-10 of the force); a branch that folds (no solution deeper, as in
narrow gaps) or a rod section that floods (φ → π) ends the search there.

Findings and accuracy (tests/core/test_interactions.py, tests/benchmarks):

* 2D mode (exact line-source kernel) against the exact shared meniscus
  (:mod:`floatcalc.core.parallel2d`): limit force of 2 and 3 rods within 5e-7 at gaps 0.5–6 l_c;
  single rod: the exact 2D law to 1e-12.
* 3D: a long rod's (F(40) − F(20))/20 is the 2D law to 1e-4; two parallel rods' limit
  difference (L = 24 and 12) per length is the exact 2D pair's to 6e-4.
* Rod ends: at the limit an end contributes −0.03 to −0.2 σ l_c (the finite rod carries 0.2–1.6 %
  *less* than f_2D L): near the ends the meniscus spreads in 3D, so near-end sections pass their
  optimum (or flood) at a shallower depth. The superposition model it replaces added +0.6 to
  +2.3 σ l_c per end (rods 4.7–11 % above f_2D L).
* Round bodies alone reproduce their axisymmetric laws to 1e-8 (tabulation).
* Mesh: the default rod mesh (1 panel per l_c, 2R at the ends, growth 2, one panel across
  each end face) puts the twelve-leg skimmer's limit 8e-5 above a mesh four times finer (an
  overstatement of that size); at a rod's limit its ends come out within 0.01 σ l_c per end of
  a fine mesh (4 per l_c, 0.25R, growth 1.3, 8 across the face). In the linear range the coarse
  ends understate: the sides' force of a 2 l_c rod 4 % low, 0.4 % at 40 l_c.
* Against the independent finite-element reference (tests/reference/fem3d.py, same flat end
  faces, linear range): finite rods of 2–40 l_c within 0.8 % on the fine mesh
  (tests/reference/test_interactions_vs_fem.py).

Use: ``lay = Layout(bodies)`` once per geometry (:class:`RodBody`, :class:`RoundBody`; 2D
mode :meth:`Layout.parallel_2d`), then ``st = lay.solve(depth, tilt, start=previous_state)``
(:class:`State`: forces and parts per body, contact lengths, ``dforce_ddepth``,
``dforce_along(direction)``, panel data, ``meniscus(x, y)``), :func:`limit` for a body's (or all
bodies') breakthrough, :func:`isolated_limit` for a body alone. ``lay.warnings`` carries the
validity warnings of the layout.

Validity: rods straight, horizontal up to a small tilt along the axis, length ≥ 4 R; menisci
locally 1D across each panel (panel line a distance R from the axis; the lateral offset is
carried exactly in 1D); contact-line geometry of the outer problem fixed at the panel lines
(errors O(R × curvature of the outer field)); elements not overlapping in plan; static.

References
----------
.. [1] D. Vella, D.-G. Lee, H.-Y. Kim, "The load supported by small floating objects",
   Langmuir 22, 5979 (2006).
.. [2] J. B. Keller, "Surface tension force on a partly submerged body", Phys. Fluids 10,
   3009 (1998).
.. [3] J. W. Gibbs, The Scientific Papers, vol. 1, p. 326 (1906) (pinning at sharp edges).
.. [4] Y. Saad, M. H. Schultz, "GMRES: a generalized minimal residual algorithm for solving
   nonsymmetric linear systems", SIAM J. Sci. Stat. Comput. 7, 856 (1986).
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field
from typing import Sequence

import numpy as np

from . import bem_k0, inner2d
from ._threads import single_blas_thread as _one_thread

PI = math.pi
NODES = 16          # Gauss–Legendre nodes of the inner map inside the solve (about 2e-8 relative)
_FD = 1e-4          # difference step of the inner map's derivatives (see _panel_map)
_FD_FINE = 1e-7     # ... once the residual is small
_HMIN = 2.0         # smallest side panel near a rod end, in rod radii
_CHORD_RATE = 0.3   # refresh the factorised Jacobian when a chord step contracts less
_GROWTH = 2.0       # growth of the side panels away from a rod end
_END_FACE = 1       # panels across a rod's end face (at least)
_KRYLOV_RTOL = 1e-4  # relative residual of an inexact Newton step solved by GMRES
_KRYLOV_MAX = 25    # GMRES iterations before the Jacobian is factorised afresh
_KRYLOV_RENT = 1.0 / 60.0  # a factorisation costs about n/60 GMRES iterations (measured, n = 1344)
_KRYLOV_MIN = 1000  # unknowns from which exact Newton steps use GMRES rather than a fresh LU
#                     (below, a factorisation costs a few GMRES-Newton steps: benchmark script)
_BLOCKS_MIN = 1000  # unknowns from which GMRES is preconditioned by the diagonal blocks (_Blocks)


_HALVES_ROWS = 1000    # matrix rows from which a product with M is split over two threads
_HALVES_POINTS = 4000  # inner-map points from which their evaluation is split over two threads


def _mul(A, v):
    """A @ v, on a large layout by halves of A's rows side by side (:func:`_threads.in_halves`:
    1.5 ms for M at n = 1344 in one thread, memory-bound; each half reads half of it)."""
    if A.shape[0] < _HALVES_ROWS:
        return A @ v
    from ._threads import in_halves

    return np.concatenate(in_halves(lambda a, b: A[a:b] @ v, A.shape[0], at_least=2))


def _amplitudes(h, psi):
    """inner2d.amplitudes at NODES, by halves side by side when there are many points (the
    5n points of a large layout's difference quotients)."""
    if h.size < _HALVES_POINTS:
        return inner2d.amplitudes(h, psi, NODES)
    from ._threads import in_halves

    parts = in_halves(lambda a, b: inner2d.amplitudes(h[a:b], psi[a:b], NODES), h.size, at_least=2)
    return np.concatenate([p[0] for p in parts]), np.concatenate([p[1] for p in parts])


def _factor(J):
    """LU factors of a Jacobian in single precision: they serve as a preconditioner and for
    chord steps only (every residual is evaluated in double precision, so the solution is not
    affected); half the memory traffic of the double-precision factors and twice as fast."""
    from scipy.linalg import lu_factor

    return lu_factor(J.astype(np.float32), check_finite=False)


def _psolve(lu, v):
    """Solve with the single-precision factors of :func:`_factor` (double in, double out), or
    apply a :class:`_Blocks` preconditioner."""
    if isinstance(lu, _Blocks):
        return lu.apply(v)
    from scipy.linalg import lu_solve

    return lu_solve(lu, np.asarray(v, dtype=np.float32), check_finite=False).astype(np.float64)


class _Blocks:
    """Block-Jacobi preconditioner of a large layout's Jacobian: the inverses of its diagonal
    blocks, one per rod (its panels among themselves) and one 1 × 1 block per round body.

    The outer field couples the rods only through K₀ between them, so the blocks carry most of
    the Jacobian: GMRES preconditioned by them reaches 1e-4 in 4–5 iterations and 1e-9 in
    8–11 on the 48-rod ring (gaps 1.6 l_c), against 3–7 for an older full LU; built afresh at
    every Newton step in about a millisecond, where the full single-precision LU costs about
    40 ms at n = 1344 (measured, tests/benchmarks/bench_interactions.py). A layout whose blocks
    do not precondition well enough (GMRES not converged) falls back to the full LU."""

    def __init__(self, layout: "Layout", aux):
        idx, Mb = layout._block_parts()
        n, nb = layout.n_panels, layout.round_idx.size
        gx = np.empty(n + nb + 1)
        hx = np.zeros(n + nb + 1)
        gx[:n] = aux["gv_x"]
        hx[:n] = aux["hv_x"]
        if nb:
            gx[n:n + nb] = 1.0 + aux["dB"] * np.diag(layout.Z)
        gx[-1] = 1.0   # padding: identity
        Jb = Mb * (-hx[idx])[:, None, :]
        k = np.arange(idx.shape[1])
        Jb[:, k, k] += gx[idx]
        self.inv = np.linalg.inv(Jb)   # LinAlgError on a singular block: the caller factorises
        self.idx = idx
        self.valid = idx < n + nb
        self.size = n + nb

    def apply(self, v):
        ext = np.zeros(self.size + 1)
        ext[:self.size] = v
        y = np.matmul(self.inv, ext[self.idx][:, :, None])[:, :, 0]
        out = np.empty(self.size)
        out[self.idx[self.valid]] = y[self.valid]
        return out


def _gmres(matvec, psolve, b, rtol, maxit):
    """Flexible right-preconditioned GMRES without restarts for J y = b (Saad & Schultz 1986;
    the flexible form, Saad 1993, keeps the preconditioned vectors z_j, so that y = Σ z_j c_j
    is exact to double precision however roughly ``psolve`` is computed).

    ``matvec(v)`` = J v, ``psolve(v)`` ≈ J⁻¹ v (here an older factorised Jacobian in single
    precision). Classical Gram–Schmidt applied twice, Givens rotations for the residual norm.
    Returns (y, converged):
    converged when |b − J y| ≤ rtol |b| (the rotated estimate), or on a lucky breakdown.
    The number of iterations taken is left in ``_gmres.last``.
    """
    from scipy.linalg import solve_triangular

    beta = float(np.linalg.norm(b))
    _gmres.last = 0
    if beta == 0.0:
        return np.zeros_like(b), True
    V = np.empty((maxit + 1, b.size))
    Zs = np.empty((maxit, b.size))
    H = np.zeros((maxit + 1, maxit))
    cs, sn = np.zeros(maxit), np.zeros(maxit)
    g = np.zeros(maxit + 1)
    g[0] = beta
    V[0] = b / beta
    k, ok = 0, False
    for j in range(maxit):
        Zs[j] = psolve(V[j])
        w = matvec(Zs[j])
        h = V[:j + 1] @ w
        w = w - V[:j + 1].T @ h
        h2 = V[:j + 1] @ w
        w = w - V[:j + 1].T @ h2
        h += h2
        hn = float(np.linalg.norm(w))
        H[:j + 1, j] = h
        H[j + 1, j] = hn
        for i in range(j):
            t = cs[i] * H[i, j] + sn[i] * H[i + 1, j]
            H[i + 1, j] = -sn[i] * H[i, j] + cs[i] * H[i + 1, j]
            H[i, j] = t
        d = math.hypot(H[j, j], H[j + 1, j])
        if d == 0.0:
            break
        cs[j], sn[j] = H[j, j] / d, H[j + 1, j] / d
        H[j, j], H[j + 1, j] = d, 0.0
        g[j + 1] = -sn[j] * g[j]
        g[j] = cs[j] * g[j]
        k = j + 1
        if abs(g[j + 1]) <= rtol * beta or hn <= 1e-300:
            ok = True
            break
        V[j + 1] = w / hn
    _gmres.last = k
    if k == 0:
        return np.zeros_like(b), False
    y = solve_triangular(H[:k, :k], g[:k], check_finite=False)
    return Zs[:k].T @ y, ok


@dataclass(frozen=True)
class RodBody:
    """Straight horizontal rod lying in the surface (scaled: lengths in l_c, angles in rad)."""

    cx: float
    cy: float
    heading: float
    length: float
    radius: float
    theta: float


@dataclass(frozen=True)
class RoundBody:
    """Ball, flat pad, vertical pin or ring footpad with a vertical axis (scaled geometry).

    ``params``: ball ``radius``, ``theta``; pad ``radius``, ``thickness``, ``theta``; pin
    ``radius``, ``length``, ``theta``; ring ``ring_radius``, ``wire_radius``, ``theta``.
    """

    cx: float
    cy: float
    kind: str
    params: dict = field(default_factory=dict)

    def key(self):
        return (self.kind, tuple(sorted((k, float(v)) for k, v in self.params.items())))


# ---------------------------------------------------------------------------------------------
# Isolated laws of round bodies (tabulated once per geometry)


def _far_amplitude(rc, psi, d):
    """Far-field amplitude B of an isolated axisymmetric meniscus, h ≈ B K₀(r) far away."""
    from scipy.special import k0, k1

    from . import axisym

    rc = np.asarray(rc, dtype=float)
    psi = np.asarray(psi, dtype=float)
    B = np.zeros_like(rc)
    ok = rc > 0
    big = ok & (np.abs(psi) > axisym.PSI_START)
    if np.any(big):
        out = axisym.solve(rc[big], psi[big], tight=False, steps=200)
        B[big] = np.sign(psi[big]) * np.tan(axisym.PSI_START) / k1(out["start"])
    small = ok & ~big
    B[small] = d[small] / k0(rc[small])
    return B


@functools.lru_cache(maxsize=64)
def _round_table(key):
    """Push-down branch of a round body alone: arrays over its depth and its averaging radius."""
    from . import round_bodies as rb

    kind, items = key
    p = dict(items)
    th = p["theta"]
    if kind == "ball":
        R = p["radius"]
        cur = rb.ball_curve(R, th, n=241)
        rc = cur["rc"]
        length = 2 * PI * rc
        proj = PI * np.where(cur["phi"] > PI / 2, R, rc) ** 2
        B = _far_amplitude(rc, cur["psi"], cur["d"])
        a = R
    elif kind in ("pad", "pin"):
        R = p["radius"]
        if kind == "pad":
            cur = rb.pad_curve(R, p["thickness"], th, n=120)
        else:
            cur = rb.pad_curve(R, np.inf, th, n=120, depth_max=p["length"])
            keep = cur["depth"] <= p["length"] + 1e-12
            cur = {k: v[keep] for k, v in cur.items()}
        rc = np.full_like(cur["depth"], R)
        length = 2 * PI * rc
        proj = PI * rc ** 2
        B = _far_amplitude(rc, cur["psi"], cur["d"])
        a = R
    elif kind == "ring":
        Rr, b = p["ring_radius"], p["wire_radius"]
        cur = rb.ring_curve(Rr, b, th, n=61)
        rco = Rr + b * np.sin(cur["phi_outer"])
        rci = Rr - b * np.sin(cur["phi_inner"])
        length = 2 * PI * (rco + rci)
        proj = 2 * PI * Rr * b * (np.sin(cur["phi_outer"]) + np.sin(cur["phi_inner"]))
        B = _far_amplitude(rco, cur["psi_outer"], cur["d_outer"])
        a = Rr + b
    else:
        raise ValueError(f"kind: one of ball, pad, pin, ring, got {kind!r}")
    D = np.asarray(cur["depth"], dtype=float)
    keep = np.concatenate([[True], np.diff(D) > 1e-12])
    tab = {"depth": D[keep], "force": cur["force"][keep], "surface_tension": cur["surface_tension"][keep],
           "pressure": cur["pressure"][keep], "length": length[keep], "proj": proj[keep], "B": B[keep]}
    return tab, a


class _RoundLaw:
    """Cubic-spline interpolation of a round body's isolated law in its depth."""

    def __init__(self, body: RoundBody):
        from scipy.interpolate import CubicSpline

        tab, self.radius = _round_table(body.key())
        self.tab = tab
        D = tab["depth"]
        self.lo, self.hi = float(D[0]), float(D[-1])
        self.sp = {k: CubicSpline(D, tab[k]) for k in ("force", "surface_tension", "pressure", "length",
                                                        "proj", "B")}
        # mode-0 scattering (module docstring): an incoming wave α I₀(r), whose mean on the
        # averaging circle of radius ρ is h̄ = α I₀(ρ), moves a body's contact depth at a fixed
        # contact state by α W, W = I₀(r_c) + I₁(r_c) K₀(r_c)/K₁(r_c) (the re-adjusting meniscus
        # adds β K₀ outside, β = α I₁(r_c)/K₁(r_c), so that the contact slope stays): so
        # D_eff = D − κ h̄ with κ = W/I₀(ρ), and the far amplitude gains β = h̄ I₁/(K₁ I₀(ρ)).
        # Small-slope response: a nonlinear axisymmetric shot of the ball of the FEM check gives
        # 1.130 where W = 1.126. Rings (a meniscus inside as well) keep the level (κ = 1, β = 0).
        from scipy.special import i0, i1, k0, k1

        if body.kind == "ring":
            kap, bet = np.ones_like(D), np.zeros_like(D)
        else:
            rc = np.maximum(tab["length"] / (2 * PI), 1e-12)
            W = i0(rc) + i1(rc) * k0(rc) / k1(rc)
            kap = W / i0(self.radius)
            bet = i1(rc) / k1(rc) / i0(self.radius)
        self.sp["kappa"] = CubicSpline(D, kap)
        self.sp["beta"] = CubicSpline(D, bet)

    def __call__(self, name, D, nu=0):
        Dc = np.clip(D, self.lo, self.hi)
        out = self.sp[name](Dc, nu)
        if nu:
            out = np.where((D >= self.lo) & (D <= self.hi), out, 0.0)
        return out


# ---------------------------------------------------------------------------------------------
# Panels


def _graded_nodes(L, h_min, h_max, growth=1.5):
    """Panel break points on [−L/2, L/2], size h_min at both ends growing to h_max."""
    sizes = []
    h = h_min
    while h < h_max and 2 * (sum(sizes) + h) < L:
        sizes.append(h)
        h *= growth
    rem = L - 2 * sum(sizes)
    n_mid = max(1, int(math.ceil(rem / h_max - 1e-9)))
    mid = [rem / n_mid] * n_mid
    allsz = sizes + mid + sizes[::-1]
    return -0.5 * L + np.concatenate([[0.0], np.cumsum(allsz)])


def _rod_panels(rod: RodBody, ppl: float, end_panel: float = None, growth: float = None,
                end_face: int = None):
    """Panels of one rod: side panels on both long sides, then end-face panels."""
    R, L = rod.radius, rod.length
    h_max = 1.0 / ppl
    h_min = min(h_max, max((end_panel or _HMIN) * R, 0.02 * h_max))
    s = _graded_nodes(L, h_min, h_max, growth or _GROWTH)
    tx, ty = math.cos(rod.heading), math.sin(rod.heading)
    nx, ny = -ty, tx
    out = {k: [] for k in ("ax", "ay", "bx", "by", "nx", "ny", "s", "kind", "w")}
    for side in (1.0, -1.0):
        a, b = s[:-1], s[1:]
        out["ax"].append(rod.cx + a * tx + side * R * nx)
        out["ay"].append(rod.cy + a * ty + side * R * ny)
        out["bx"].append(rod.cx + b * tx + side * R * nx)
        out["by"].append(rod.cy + b * ty + side * R * ny)
        out["nx"].append(np.full(a.size, side * nx))
        out["ny"].append(np.full(a.size, side * ny))
        out["s"].append(0.5 * (a + b))
        out["kind"].append(np.zeros(a.size, dtype=int))
        out["w"].append(np.ones(a.size))
    n_end = max(end_face or _END_FACE, int(math.ceil(2 * R / h_max - 1e-9)))
    y = np.linspace(-R, R, n_end + 1)
    for end in (1.0, -1.0):
        e = 0.5 * L * end
        out["ax"].append(rod.cx + e * tx + y[:-1] * nx)
        out["ay"].append(rod.cy + e * ty + y[:-1] * ny)
        out["bx"].append(rod.cx + e * tx + y[1:] * nx)
        out["by"].append(rod.cy + e * ty + y[1:] * ny)
        out["nx"].append(np.full(n_end, end * tx))
        out["ny"].append(np.full(n_end, end * ty))
        out["s"].append(np.full(n_end, e))
        out["kind"].append(np.ones(n_end, dtype=int))
        out["w"].append(np.full(n_end, 1.0 / n_end))
    return {k: np.concatenate(v) for k, v in out.items()}


@functools.lru_cache(maxsize=32)
def _self_block(length, radius, ppl, mesh):
    """S and K among the panels of one rod (of this shape and mesh), placed anywhere: the
    entries depend on distances and on normals that turn with the rod only."""
    pan = _rod_panels(RodBody(0.0, 0.0, 0.0, length, radius, 0.5 * PI), ppl, *mesh)
    px, py = 0.5 * (pan["ax"] + pan["bx"]), 0.5 * (pan["ay"] + pan["by"])
    S, K = bem_k0.panel_matrices(px, py, pan["nx"], pan["ny"], pan["ax"], pan["ay"], pan["bx"], pan["by"])
    S.setflags(write=False)
    K.setflags(write=False)
    return S, K


# ---------------------------------------------------------------------------------------------
# The solved state


@dataclass
class State:
    """Result of one :meth:`Layout.solve` (scaled: forces in σ l_c, or σ per length in 2D)."""

    force: np.ndarray
    surface_tension: np.ndarray
    pressure: np.ndarray
    contact_length: np.ndarray
    panel_x: np.ndarray
    panel_y: np.ndarray
    panel_h: np.ndarray
    panel_psi: np.ndarray
    converged: bool
    x: np.ndarray                 # solved unknowns (contact positions, round amplitudes): warm start
    iterations: int
    layout: "Layout" = field(repr=False, default=None)
    virtual_h: np.ndarray = field(repr=False, default=None)
    virtual_slope: np.ndarray = field(repr=False, default=None)
    B: np.ndarray = field(repr=False, default=None)
    depth: np.ndarray = field(repr=False, default=None)
    effective_depth: np.ndarray = field(repr=False, default=None)   # round bodies: D − h_in
    _lazy: tuple = field(repr=False, default=None)
    _derivs: tuple = field(repr=False, default=None)
    _dirs: tuple = field(repr=False, default=None)
    _aux: dict = field(repr=False, default=None)

    @property
    def dforce_ddepth(self) -> np.ndarray:
        """(n_bodies, n_bodies) dF_i/dD_j [σ] with all contact positions re-solved (computed
        on first access: implicit-function theorem on the Newton Jacobian)."""
        if self._derivs is None:
            self._derivs = self.layout._derivatives(self)
        return self._derivs[1]

    def dforce_along(self, direction) -> np.ndarray:
        """(n_bodies,) dF/dt when the depths move as depth + t·direction [σ] (one linear
        solve instead of n_bodies; cached, and used as the next warm start's predictor)."""
        v = np.asarray(direction, dtype=float).reshape(-1)
        if self._derivs is not None:
            return self._derivs[1] @ v
        key = v.tobytes()
        if self._dirs is None or self._dirs[0] != key:
            dx, dF = self.layout._derivatives(self, v[:, None])
            self._dirs = (key, v, dx[:, 0] if dx is not None else None, dF[:, 0])
        return self._dirs[3]

    @property
    def dx_ddepth(self) -> np.ndarray | None:
        """Sensitivity of the solved unknowns to the depths (computed on first access)."""
        if self._derivs is None:
            self._derivs = self.layout._derivatives(self)
        return self._derivs[0]

    def meniscus(self, x, y=None) -> np.ndarray:
        """Outer linear field (depth [l_c]) at plan points (in 2D mode: at positions x)."""
        return self.layout._field(self, x, y)


class Layout:
    """Geometry of a device's support elements, built once (panels, DtN matrix, caches).

    Parameters
    ----------
    bodies : sequence of RodBody | RoundBody
        Elements in plan (scaled).
    panels_per_lc : float
        Side panels per capillary length in the middle of a rod (finer towards the ends).
    end_panel, growth : float, optional
        Length of the side panels next to a rod end, in rod radii (default 2), and their growth
        factor away from the end (default 2). The defaults keep the skimmer's limit within
        about 1e-4 of a mesh four times finer (benchmark script).
    end_face : int, optional
        Fewest panels across a rod's end face (default 1; 8 resolve the end in the linear
        range, see the module docstring).

    Attributes
    ----------
    warnings : tuple of str
        Validity warnings of the layout (round bodies with a neighbour closer than 3 l_c).

    >>> lay = Layout([RodBody(0.0, 0.0, 0.0, 10.0, 0.05, math.radians(115))])
    >>> st = lay.solve(np.array([0.5]))
    >>> bool(st.converged and st.force[0] > 0)
    True
    """

    @_one_thread
    def __init__(self, bodies: Sequence[RodBody | RoundBody], panels_per_lc: float = 1.0, *,
                 end_panel: float | None = None, growth: float | None = None, end_face: int | None = None,
                 _two_d=None):
        self._mesh = (end_panel, growth, end_face)
        self.bodies = list(bodies)
        self.n_bodies = len(self.bodies)
        self.two_d = _two_d is not None
        if self.two_d:
            self._build_2d(*_two_d)
        else:
            self._build(panels_per_lc)
        self._prepare()

    # -- geometry -------------------------------------------------------------------------------
    def _check(self):
        """Reject bad geometry and overlapping footprints (InputError, one line)."""
        from ..errors import input_error

        for i, b in enumerate(self.bodies):
            if isinstance(b, RodBody):
                if not (b.radius > 0 and b.length >= 4 * b.radius and 0 <= b.theta <= PI):
                    raise input_error(f"bodies[{i}]", "rod needs radius > 0, length >= 4 radii, "
                                      "0 <= theta <= pi", b)
            elif isinstance(b, RoundBody):
                if b.kind not in ("ball", "pad", "pin", "ring"):
                    raise input_error(f"bodies[{i}].kind", "one of ball, pad, pin, ring", b.kind)
            else:
                raise input_error(f"bodies[{i}]", "a RodBody or RoundBody", type(b).__name__)

        def seg(b):
            if isinstance(b, RodBody):
                h = 0.5 * b.length
                c, t = np.array([b.cx, b.cy]), np.array([math.cos(b.heading), math.sin(b.heading)])
                return c - h * t, c + h * t, b.radius
            p = b.params
            a = {"ball": p.get("radius"), "pad": p.get("radius"), "pin": p.get("radius"),
                 "ring": p.get("ring_radius", 0.0) + p.get("wire_radius", 0.0)}[b.kind]
            c = np.array([b.cx, b.cy])
            return c, c, float(a)

        def pt_seg(p, a, b):
            d = b - a
            L2 = float(d @ d)
            t = 0.0 if L2 == 0 else min(1.0, max(0.0, float((p - a) @ d) / L2))
            return float(np.hypot(*(p - a - t * d)))

        def dist(p1, q1, p2, q2):
            """Shortest distance between the plan segments p1q1 and p2q2."""
            d1, d2, r = q1 - p1, q2 - p2, p2 - p1
            den = d1[0] * d2[1] - d1[1] * d2[0]
            if abs(den) > 1e-14:  # proper crossing?
                t = (r[0] * d2[1] - r[1] * d2[0]) / den
                u = (r[0] * d1[1] - r[1] * d1[0]) / den
                if 0.0 <= t <= 1.0 and 0.0 <= u <= 1.0:
                    return 0.0
            return min(pt_seg(p1, p2, q2), pt_seg(q1, p2, q2), pt_seg(p2, p1, q1), pt_seg(q2, p1, q1))

        segs = [seg(b) for b in self.bodies]
        self._segs, self._dist = segs, dist
        # bounding circles first: only pairs whose circles meet can overlap
        cen = np.array([0.5 * (p + q) for p, q, _ in segs]).reshape(-1, 2)
        ext = np.array([0.5 * float(np.hypot(*(q - p))) + r for p, q, r in segs])
        cd = np.hypot(cen[:, None, 0] - cen[None, :, 0], cen[:, None, 1] - cen[None, :, 1])
        for i, j in zip(*np.nonzero(np.triu(cd <= ext[:, None] + ext[None, :] + 1e-12, 1))):
            p1, q1, r1 = segs[i]
            p2, q2, r2 = segs[j]
            if dist(p1, q1, p2, q2) < r1 + r2:
                raise input_error(f"bodies[{int(i)}], bodies[{int(j)}]", "footprints must not overlap in plan",
                                  "overlapping elements")

    def _round_warnings(self):
        """Warnings for round bodies with a neighbour closer than 3 l_c (mode-0 blind spot)."""
        from . import parallel2d, rod2d

        out = []
        for i in self.round_idx:
            b = self.bodies[i]
            p1, q1, r1 = self._segs[i]
            gaps = [self._dist(p1, q1, p2, q2) - r1 - r2 for j, (p2, q2, r2) in enumerate(self._segs) if j != i]
            if not gaps or min(gaps) >= 3.0:
                continue
            g = max(min(gaps), 0.05)
            th = b.params["theta"]
            a = min(r1, 0.5)
            ratio = parallel2d.row_limit(a, th, g + 2 * a, 2)["force"] / (2 * float(rod2d.limit_force(a, th)["force"]))
            out.append(f"bodies[{i}] ({b.kind}): a neighbour {g:.3g} l_c away shares its meniscus; the "
                       f"axisymmetric (mode-0) coupling does not lower its limit, which a shared meniscus "
                       f"does (two long rods of radius {a:.3g} l_c at that gap: {100 * (1 - ratio):.2g} % lower), "
                       "and leaves out the neighbour's slope across it (a ball 0.5 l_c from a rod: its force "
                       "within 0.4 % of a finite-element reference at moderate depth)")
        return tuple(out)

    def _build(self, ppl):
        self._check()
        from scipy.special import k0, k1

        rods = [i for i, b in enumerate(self.bodies) if isinstance(b, RodBody)]
        self.round_idx = np.array([i for i, b in enumerate(self.bodies) if isinstance(b, RoundBody)], dtype=int)
        parts = []
        for i in rods:
            pan = _rod_panels(self.bodies[i], ppl, *self._mesh)
            pan["owner"] = np.full(pan["s"].size, i)
            rod = self.bodies[i]
            pan["R"] = np.full(pan["s"].size, rod.radius)
            pan["theta"] = np.full(pan["s"].size, rod.theta)
            parts.append(pan)
        if parts:
            P = {k: np.concatenate([p[k] for p in parts]) for k in parts[0]}
        else:
            P = {k: np.zeros(0) for k in ("ax", "ay", "bx", "by", "nx", "ny", "s", "w", "R", "theta")}
            P["kind"] = np.zeros(0, dtype=int)
            P["owner"] = np.zeros(0, dtype=int)
        self.P = P
        self.px = 0.5 * (P["ax"] + P["bx"])
        self.py = 0.5 * (P["ay"] + P["by"])
        self.plen = np.hypot(P["bx"] - P["ax"], P["by"] - P["ay"])
        n = self.px.size
        if n:
            # each rod's own block depends only on its shape and mesh: computed once per shape
            # (the near-singular pairs of a rod are most of the quadrature work), the pairs of
            # different rods here
            own = P["owner"]
            S, K = bem_k0.panel_matrices(self.px, self.py, P["nx"], P["ny"], P["ax"], P["ay"], P["bx"], P["by"],
                                         skip=(own, own))
            for i in rods:
                rod = self.bodies[i]
                idx = np.flatnonzero(own == i)
                Ss, Ks = _self_block(rod.length, rod.radius, ppl, self._mesh)
                S[np.ix_(idx, idx)] = Ss
                K[np.ix_(idx, idx)] = Ks
        else:
            S, K = np.zeros((0, 0)), np.zeros((0, 0))
        self.S = S
        self.N = K - 0.5 * np.eye(n)
        # round bodies: mode-0 sources B K0(|x − c|)
        nb = self.round_idx.size
        self.laws = [_RoundLaw(self.bodies[i]) for i in self.round_idx]
        cx = np.array([self.bodies[i].cx for i in self.round_idx])
        cy = np.array([self.bodies[i].cy for i in self.round_idx])
        self.rcx, self.rcy = cx, cy
        U = np.zeros((n, nb))
        V = np.zeros((n, nb))
        Pbr = np.zeros((nb, n))
        Pbb = np.zeros((nb, nb))
        ang = np.linspace(0, 2 * PI, 24, endpoint=False)
        for j in range(nb):
            dx, dy = self.px - cx[j], self.py - cy[j]
            r = np.hypot(dx, dy)
            U[:, j] = k0(r)
            V[:, j] = -k1(r) * (dx * P["nx"] + dy * P["ny"]) / r
            a = self.laws[j].radius
            sx, sy = cx[j] + a * np.cos(ang), cy[j] + a * np.sin(ang)
            if n:
                Ss, _ = bem_k0.panel_matrices(sx, sy, np.ones_like(sx), np.zeros_like(sx),
                                              P["ax"], P["ay"], P["bx"], P["by"])
                Pbr[j] = Ss.mean(axis=0)
            for k in range(nb):
                if k != j:
                    Pbb[j, k] = np.mean(k0(np.hypot(sx - cx[k], sy - cy[k])))
        self.U, self.V, self.Pbr, self.Pbb = U, V, Pbr, Pbb
        self.warnings = self._round_warnings()

    def _build_2d(self, centres, R, theta):
        """Infinitely long parallel rods: line panels at x_c ± R, kernel e^{−|x|}/2 (exact 2D)."""
        centres = np.asarray(centres, dtype=float)
        self.bodies = [RodBody(float(c), 0.0, PI / 2, np.inf, R, theta) for c in centres]
        self.n_bodies = centres.size
        self.round_idx = np.zeros(0, dtype=int)
        xs = np.concatenate([[c + R, c - R] for c in centres])
        ns = np.tile([1.0, -1.0], centres.size)
        own = np.repeat(np.arange(centres.size), 2)
        d = xs[:, None] - xs[None, :]
        E = 0.5 * np.exp(-np.abs(d))
        self.S = E
        self.N = -ns[:, None] * np.sign(d) * E - 0.5 * np.eye(xs.size)
        m = xs.size
        self.P = {"kind": np.zeros(m, dtype=int), "owner": own, "s": np.zeros(m), "w": np.ones(m),
                  "R": np.full(m, R), "theta": np.full(m, theta), "nx": ns, "ny": np.zeros(m)}
        self.px, self.py, self.plen = xs, np.zeros(m), np.ones(m)
        self.laws = []
        self.warnings = ()
        self.U = self.V = np.zeros((m, 0))
        self.Pbr = np.zeros((0, m))
        self.Pbb = np.zeros((0, 0))

    @classmethod
    def parallel_2d(cls, centres, radius: float, theta: float) -> "Layout":
        """Layout of infinitely long parallel rods (2D mode, forces per unit length [σ]).

        >>> lay = Layout.parallel_2d([0.0], 0.1, math.radians(120))
        >>> st = lay.solve(np.array([0.8]))
        >>> from floatcalc.core import rod2d
        >>> phi = np.linspace(0, np.pi, 20001); D = rod2d.force_parts(phi, 0.1, math.radians(120))[2]
        >>> f = rod2d.force(np.interp(0.8, D, phi), 0.1, math.radians(120))
        >>> bool(abs(st.force[0] - f) < 1e-6)
        True
        """
        return cls([], _two_d=(centres, radius, theta))

    def _prepare(self):
        self._lu = None
        self._krylov_work = 0.0
        self._blocks = None      # see _block_parts
        self._blocks_ok = True   # False once the blocks failed to precondition this layout
        n = self.px.size
        self.n_panels = n
        if n:
            # M = N S⁻¹ and Q = P S⁻¹ from one LU of Sᵀ (S⁻¹ itself is never formed: about a
            # third fewer operations than the inverse and a product)
            from scipy.linalg import lu_factor, lu_solve

            self._S_lu = lu_factor(self.S, check_finite=False)
            NT = self.N.T
            if n >= 256:
                # the triangular solves for halves of M's rows side by side (two cores); each
                # half with its own copy of the pivots: SciPy 1.17's lu_solve is not safe on one
                # pivot array shared between threads (heap corruption, measured)
                from ._threads import in_halves

                lu, piv = self._S_lu
                self.M = np.vstack([h.T for h in in_halves(
                    lambda a, b: lu_solve((lu, piv.copy()), NT[:, a:b], trans=1, check_finite=False), n,
                    at_least=2)])
            else:
                self.M = lu_solve(self._S_lu, NT, trans=1, check_finite=False).T
            self.Q = lu_solve(self._S_lu, self.Pbr.T, trans=1, check_finite=False).T
        else:
            self._S_lu = None
            self.M = np.zeros((0, 0))
            self.Q = np.zeros((self.Pbr.shape[0], 0))
        self.M32 = self.M.astype(np.float32)
        self.W = self.V - self.M @ self.U
        self.Z = self.Pbb - self.Q @ self.U
        self.side = self.P["kind"] == 0
        self.end = ~self.side
        self.owner = self.P["owner"].astype(int)
        nb = self.n_bodies
        self.E = np.zeros((n, nb))
        if n:
            self.E[np.arange(n), self.owner] = 1.0
        self.Eb = np.zeros((self.round_idx.size, nb))
        self.Eb[np.arange(self.round_idx.size), self.round_idx] = 1.0
        R, th = self.P["R"], self.P["theta"]
        self.lo = np.where(self.side, 1e-9, -0.5 * PI * R)
        self.hi = np.where(self.side, PI, 2 * R + 0.5 * PI * R)
        self.maxstep = np.where(self.side, 0.25, 0.25 * R)
        # isolated 2D guess tables per distinct (R, θ)
        self._guess = {}
        for key in set(zip(R.tolist(), th.tolist())):
            from . import rod2d

            phi = np.linspace(1e-9, PI, 2001)
            D = rod2d.force_parts(phi, key[0], key[1])[2]
            self._guess[key] = (D, phi)

    def _block_parts(self):
        """Index array (blocks × largest block, padded with the index n + n_round) and the
        blocks of M, for :class:`_Blocks` (formed once per layout)."""
        if getattr(self, "_blocks", None) is None:
            n, nb = self.n_panels, self.round_idx.size
            groups = [np.flatnonzero(self.owner == i) for i in range(self.n_bodies)]
            groups = [g for g in groups if g.size] + [np.array([n + j]) for j in range(nb)]
            smax = max(g.size for g in groups)
            idx = np.full((len(groups), smax), n + nb, dtype=np.intp)
            Mb = np.zeros((len(groups), smax, smax))
            for k, g in enumerate(groups):
                idx[k, :g.size] = g
                if g[0] < n:
                    Mb[k, :g.size, :g.size] = self.M[np.ix_(g, g)]
            self._blocks = (idx, Mb)
        return self._blocks

    # -- panel maps -----------------------------------------------------------------------------
    def _contact(self, xr, Dloc):
        """Contact depth h, inclination ψ, offset δ and their x-derivatives, per rod panel."""
        R, th = self.P["R"], self.P["theta"]
        sd = self.side
        h = np.empty_like(xr)
        psi = np.empty_like(xr)
        delta = np.zeros_like(xr)
        hx = np.zeros_like(xr)
        px = np.zeros_like(xr)
        dx = np.zeros_like(xr)
        # sides: x = φ
        phi = xr[sd]
        h[sd] = Dloc[sd] - R[sd] * (1.0 - np.cos(phi))
        psi[sd] = phi + th[sd] - PI
        delta[sd] = R[sd] * (1.0 - np.sin(phi))
        hx[sd] = -R[sd] * np.sin(phi)
        px[sd] = 1.0
        dx[sd] = -R[sd] * np.cos(phi)
        # ends: x = u (three stages)
        e = self.end
        if np.any(e):
            u, Re, te = xr[e], R[e], th[e]
            pw = te - 0.5 * PI
            st0, st2 = u < 0.0, u > 2.0 * Re
            he = Dloc[e] - np.clip(u, 0.0, 2.0 * Re)
            pe = pw + np.where(st0, u / Re, 0.0) + np.where(st2, (u - 2.0 * Re) / Re, 0.0)
            h[e], psi[e] = he, pe
            hx[e] = np.where(st0 | st2, 0.0, -1.0)
            px[e] = np.where(st0 | st2, 1.0 / Re, 0.0)
        return h, psi, delta, hx, px, dx

    def _panel_map(self, xr, Dloc, derivs=True, fd=_FD):
        h, psi, delta, hx, px, dx = self._contact(xr, Dloc)
        em, ep = np.exp(-delta), np.exp(delta)
        if not derivs:
            a, b = _amplitudes(h, psi)
            return a * em + b * ep, -a * em + b * ep, h, psi
        # central differences over a step that smooths the map's E ln|E| kink at E = 0 (the
        # isolated-meniscus state, where the exact derivative is log-singular): Newton then
        # sees the secant slope on that scale and converges robustly
        hh = np.concatenate([h, h + fd, h - fd, h, h])
        pp = np.concatenate([psi, psi, psi, psi + fd, psi - fd])
        A, Bm = _amplitudes(hh, pp)
        n = h.size
        a, b = A[:n], Bm[:n]
        ah = (A[n:2 * n] - A[2 * n:3 * n]) / (2 * fd)
        bh = (Bm[n:2 * n] - Bm[2 * n:3 * n]) / (2 * fd)
        ap = (A[3 * n:4 * n] - A[4 * n:]) / (2 * fd)
        bp = (Bm[3 * n:4 * n] - Bm[4 * n:]) / (2 * fd)
        hv = a * em + b * ep
        gv = -a * em + b * ep
        ax_ = ah * hx + ap * px
        bx_ = bh * hx + bp * px
        hv_x = ax_ * em + bx_ * ep + gv * dx
        gv_x = -ax_ * em + bx_ * ep + hv * dx
        hv_D = ah * em + bh * ep
        gv_D = -ah * em + bh * ep
        return hv, gv, h, psi, hv_x, gv_x, hv_D, gv_D

    def _forces(self, xr, Dloc, h, psi):
        """Per-panel force parts, contact length and derivatives ∂f/∂x, ∂f/∂D."""
        R = self.P["R"]
        sd, e = self.side, self.end
        ell = self.plen
        fst = np.zeros_like(xr)
        fp = np.zeros_like(xr)
        clen = np.zeros_like(xr)
        fx = np.zeros_like(xr)
        fD = np.zeros_like(xr)
        phi = xr[sd]
        Rs = R[sd]
        c = Dloc[sd] - Rs
        sp, cp = np.sin(phi), np.cos(phi)
        fst[sd] = ell[sd] * np.sin(psi[sd])
        fp[sd] = ell[sd] * (Rs * c * sp + Rs * Rs * (0.5 * phi + 0.25 * np.sin(2 * phi)))
        clen[sd] = ell[sd]
        fx[sd] = ell[sd] * (np.cos(psi[sd]) + Rs * c * cp + Rs * Rs * (0.5 + 0.5 * np.cos(2 * phi)))
        fD[sd] = ell[sd] * Rs * sp
        if np.any(e):
            u, Re, w = xr[e], R[e], self.P["w"][e]
            on = (u > 0.0) & (u < 2.0 * Re)
            uu = np.clip(u, 0.0, 2.0 * Re)
            chord = 2.0 * np.sqrt(uu * (2.0 * Re - uu))
            spe = np.sin(psi[e])
            fst[e] = w * chord * spe
            clen[e] = w * chord
            with np.errstate(divide="ignore", invalid="ignore"):
                dch = np.where(on, 2.0 * (Re - uu) / np.maximum(0.5 * chord, 1e-12 * Re), 0.0)
            fx[e] = w * (dch * spe + chord * np.cos(psi[e]) * np.where(on, 0.0, 1.0 / Re))
        return fst, fp, clen, fx, fD

    def _guess_x(self, Dloc):
        R, th = self.P["R"], self.P["theta"]
        x = np.empty(self.n_panels)
        for key, (D, phi) in self._guess.items():
            m = self.side & (R == key[0]) & (th == key[1])
            x[m] = np.interp(Dloc[m], D, phi)
        e = self.end
        if np.any(e):
            pw = th[e] - 0.5 * PI
            hw = 2.0 * np.sin(0.5 * pw)
            u = Dloc[e] - hw
            low = u < 0
            # pinned at the bottom rim: 2 sin(ψ/2) = D
            psi0 = 2.0 * np.arcsin(np.clip(0.5 * Dloc[e], -1.0, 1.0))
            u = np.where(low, R[e] * (psi0 - pw), u)
            x[e] = np.clip(u, self.lo[e], self.hi[e])
        return x

    # -- solve ----------------------------------------------------------------------------------
    def _residual(self, x, depth, Dloc, derivs=True, fd=_FD, dense=False):
        """Residual r(x) and its parts; with ``derivs`` the diagonal parts of the Jacobian
        (``hv_x``, ``gv_x``, ``dB``: see :meth:`_jmul`), and with ``dense`` the Jacobian
        itself as ``aux["J"]`` (formed only to be factorised)."""
        n = self.n_panels
        xr, B = x[:n], x[n:]
        if derivs:
            hv, gv, h, psi, hv_x, gv_x, hv_D, gv_D = self._panel_map(xr, Dloc, fd=fd)
        else:
            hv, gv, h, psi = self._panel_map(xr, Dloc, derivs=False)
        rr = gv - _mul(self.M, hv) - self.W @ B
        out = {"hv": hv, "gv": gv, "h": h, "psi": psi}
        if self.round_idx.size:
            hin = self.Q @ hv + self.Z @ B
            Dn = depth[self.round_idx]
            kap = np.array([law("kappa", d) for law, d in zip(self.laws, Dn)])
            bet = np.array([law("beta", d) for law, d in zip(self.laws, Dn)])
            Deff = Dn - kap * hin
            Biso = np.array([law("B", d) for law, d in zip(self.laws, Deff)])
            rb = B - Biso - bet * hin
            out.update(hin=hin, Deff=Deff, kap=kap, bet=bet)
        else:
            rb = np.zeros(0)
        r = np.concatenate([rr, rb])
        if derivs:
            nb = self.round_idx.size
            dBiso = np.array([law("B", d, 1) for law, d in zip(self.laws, out["Deff"])]) if nb else np.zeros(0)
            # ∂r_b/∂h_in: the coefficient of the incoming mean in each round body's row
            dB = dBiso * out["kap"] - out["bet"] if nb else np.zeros(0)
            out.update(hv_x=hv_x, gv_x=gv_x, hv_D=hv_D, gv_D=gv_D, dB=dB, dBiso=dBiso, fd=fd)
            if dense:
                J = np.empty((n + nb, n + nb))
                J[:n, :n] = -self.M * hv_x[None, :]
                J[np.arange(n), np.arange(n)] += gv_x
                if nb:
                    J[:n, n:] = -self.W
                    J[n:, :n] = dB[:, None] * (self.Q * hv_x[None, :])
                    J[n:, n:] = np.eye(nb) + dB[:, None] * self.Z
                out["J"] = J
        return r, out

    def _jmul(self, aux, Y, low=False):
        """Jacobian times Y (vector or columns) without forming it:
        J = [[diag(gv_x) − M diag(hv_x), −W], [diag(dB) Q diag(hv_x), I + diag(dB) Z]]."""
        n = self.n_panels
        one = Y.ndim == 1
        Y2 = Y[:, None] if one else Y
        yr, yb = Y2[:n], Y2[n:]
        hy = aux["hv_x"][:, None] * yr
        if low:   # single-precision M: enough for an inexact Newton step (relative 1e-4)
            top = aux["gv_x"][:, None] * yr - _mul(self.M32, hy.astype(np.float32)).astype(np.float64)
        else:
            top = aux["gv_x"][:, None] * yr - _mul(self.M, hy)
        if self.round_idx.size:
            top = top - self.W @ yb
            bot = yb + aux["dB"][:, None] * (self.Q @ hy + self.Z @ yb)
            out = np.concatenate([top, bot])
        else:
            out = top
        return out[:, 0] if one else out

    def _local_depth(self, depth, tilt):
        D = depth[self.owner] if self.n_panels else np.zeros(0)
        if tilt is not None and self.n_panels:
            D = D + tilt[self.owner] * self.P["s"]
        return D

    @_one_thread
    def solve(self, depth, tilt=None, start=None, *, tol: float = 1e-10, max_iter: int = 60) -> State:
        """Solve all contact positions together at the given depths.

        Parameters
        ----------
        depth : (n_bodies,) array [l_c]
            Lowest-point depth of each body at its centre.
        tilt : (n_bodies,) array, optional
            Slope of each rod's axis (the end along the heading lower for positive tilt).
        start : State or array, optional
            Warm start (a nearby solved state).

        Without a warm start, a solve that fails from the built-in first guess (the isolated
        2D state of every section) is retried by continuation: from all bodies at the
        shallowest of the depths, in 4 and then 16 steps, warm-starting each.
        """
        st = self._solve(depth, tilt, start, tol, max_iter)
        if st.converged or start is not None:
            return st
        depth = np.asarray(depth, dtype=float).reshape(self.n_bodies)
        base = np.full(self.n_bodies, float(np.min(depth)))
        for k in (4, 16):
            s = self._solve(base, tilt, None, tol, max_iter)
            for t in np.linspace(0.0, 1.0, k + 1)[1:]:
                if not s.converged:
                    break
                s = self._solve(base + t * (depth - base), tilt, s, tol, max_iter)
            if s.converged:
                return s
        return st

    def _solve(self, depth, tilt, start, tol, max_iter) -> State:
        depth = np.asarray(depth, dtype=float).reshape(self.n_bodies)
        tilt = None if tilt is None else np.asarray(tilt, dtype=float).reshape(self.n_bodies)
        Dloc = self._local_depth(depth, tilt)
        n, nb = self.n_panels, self.round_idx.size
        if isinstance(start, State):
            x = np.array(start.x, dtype=float)
            dd = depth - start.depth
            if start._derivs is not None and start._derivs[0] is not None:
                x = x + start._derivs[0] @ dd  # first-order predictor
            elif start._dirs is not None and start._dirs[2] is not None:
                v = start._dirs[1]
                t = float(dd @ v) / float(v @ v)
                if np.allclose(dd, t * v, rtol=0, atol=1e-12 + 1e-9 * abs(t)):
                    x = x + start._dirs[2] * t  # predictor along the last direction
        elif start is not None:
            x = np.array(start, dtype=float)
        else:
            xr = self._guess_x(Dloc)
            B0 = np.array([law("B", d) for law, d in zip(self.laws, depth[self.round_idx])])
            x = np.concatenate([xr, B0])
        lo = np.concatenate([self.lo, np.full(nb, -np.inf)])
        hi = np.concatenate([self.hi, np.full(nb, np.inf)])
        mstep = np.concatenate([self.maxstep, np.full(nb, np.inf)])
        x = np.clip(x, lo, hi)
        converged = False
        it = 0
        r, aux = self._residual(x, depth, Dloc, derivs=False)
        nr = float(np.max(np.abs(r))) if r.size else 0.0
        n2 = float(r @ r)
        lu = self._lu if (self._lu is not None and start is not None) else None
        fresh = False    # the factorised Jacobian is this point's own
        big_system = x.size >= _KRYLOV_MIN
        krylov = False   # Newton steps by GMRES on the exact Jacobian, the older one preconditioning
        blocks = x.size >= _BLOCKS_MIN and self._blocks_ok   # GMRES preconditioned by the diagonal blocks
        if blocks:
            lu = None
        for it in range(1, max_iter + 1):
            if nr < tol:
                converged = True
                break
            fd = _FD if nr > 1e-5 else _FD_FINE
            # the Jacobian's parts at x: those of the accepted trial point when it carried them
            auxj = aux if aux.get("fd") == fd else None
            if blocks:
                if auxj is None:
                    _, auxj = self._residual(x, depth, Dloc, fd=fd)
                try:
                    lu = _Blocks(self, auxj)
                    krylov = True
                except np.linalg.LinAlgError:
                    blocks, lu = False, None
            if lu is None:
                _, auxj = self._residual(x, depth, Dloc, fd=fd, dense=True)
                try:
                    lu = _factor(auxj["J"])
                except (ValueError, np.linalg.LinAlgError):
                    break
                if not np.all(np.isfinite(lu[0])):
                    break
                fresh, krylov = True, False
                self._krylov_work = 0.0
                dx = -_psolve(lu, r)
            elif krylov:
                if auxj is None:
                    _, auxj = self._residual(x, depth, Dloc, fd=fd)
                dx, ok_k = _gmres(lambda v, a_=auxj: self._jmul(a_, v, low=True),
                                  lambda v, f_=lu: _psolve(f_, v), -r, _KRYLOV_RTOL, _KRYLOV_MAX)
                if not ok_k:
                    if blocks:   # the blocks do not precondition this layout: full LU from now on
                        blocks = self._blocks_ok = False
                    lu = None  # the old Jacobian no longer preconditions: factorise afresh
                    continue
                self._krylov_work += _gmres.last + 2   # + the Jacobian's diagonal parts
            else:
                dx = -_psolve(lu, r)
            newton = fresh or krylov
            big = np.max(np.abs(dx) / mstep) if dx.size else 0.0
            if big > 1.0:
                dx = dx / big
            lam = 1.0
            ok = False
            for _ in range(12 if newton else 1):
                xn = np.clip(x + lam * dx, lo, hi)
                # a full GMRES-Newton step is nearly always taken, and the next step needs the
                # Jacobian's parts there: evaluated with the residual (the central values are
                # the same numbers), at the difference step the next residual will likely ask for
                ahead = krylov and lam == 1.0
                rn, auxn = self._residual(xn, depth, Dloc, derivs=ahead, fd=_FD_FINE if nr <= 1e-3 else _FD)
                nrn = float(np.max(np.abs(rn)))
                n2n = float(rn @ rn)
                # Newton step: Armijo on ½|r|²; chord step (older Jacobian): a clear contraction
                if nrn < tol or n2n < ((1.0 - 1e-4 * lam) if newton else 0.64) * n2:
                    ok = True
                    break
                lam *= 0.5
            if not ok:
                if fresh:
                    break
                if blocks:   # no descent along the inexact step: a full LU for the rest of this solve
                    blocks = False
                if krylov or not big_system:
                    lu = None  # refresh the Jacobian at the current point and retry
                krylov = big_system
                continue
            if not newton and nrn > _CHORD_RATE * nr:
                # slow contraction: exact Newton steps from here on, by GMRES on a large system
                # (a factorisation costs tens of its iterations there), else by a fresh LU
                if big_system:
                    krylov = True
                else:
                    lu = None
            x, r, nr, n2, aux = xn, rn, nrn, n2n, auxn
            fresh = False
        else:
            converged = nr < tol
        # rent or buy: once the GMRES work on this factorisation has cost as much as a fresh
        # one, the next solve factorises afresh (at most twice the cost of the better choice)
        self._lu = None if self._krylov_work > max(8.0, _KRYLOV_RENT * x.size) else lu
        return self._state(x, depth, Dloc, aux, converged, it, lu)

    def _state(self, x, depth, Dloc, aux, converged, it, lu=None):
        n = self.n_panels
        xr, B = x[:n], x[n:]
        fst, fp, clen, _, _ = self._forces(xr, Dloc, aux["h"], aux["psi"])
        nbod = self.n_bodies
        own = self.owner
        F_st = np.bincount(own, fst, minlength=nbod) if n else np.zeros(nbod)
        F_p = np.bincount(own, fp, minlength=nbod) if n else np.zeros(nbod)
        C = np.bincount(own, clen, minlength=nbod) if n else np.zeros(nbod)
        if self.round_idx.size:
            Deff, hin = aux["Deff"], aux["hin"]
            for j, (law, i) in enumerate(zip(self.laws, self.round_idx)):
                d = Deff[j]
                F_st[i] = law("surface_tension", d)
                F_p[i] = law("pressure", d) + min(hin[j], 0.0) * law("proj", d)
                C[i] = law("length", d)
        st = State(force=F_st + F_p, surface_tension=F_st, pressure=F_p, contact_length=C,
                   panel_x=self.px.copy(), panel_y=self.py.copy(),
                   panel_h=aux["h"], panel_psi=aux["psi"], converged=bool(converged), x=x,
                   iterations=it, layout=self, virtual_h=aux["hv"], virtual_slope=aux["gv"], B=B,
                   depth=depth.copy(), effective_depth=aux.get("Deff", np.zeros(0)))
        st._lazy = (Dloc, lu)
        if "hv_x" in aux:
            st._aux = aux   # the Jacobian's parts at x, for _derivatives
        return st

    @_one_thread
    def _derivatives(self, st: State, V=None):
        """dx/dD·V and dF/dD·V of a solved state for depth directions V (n_bodies × k; all
        bodies when None), by the implicit-function theorem on the Jacobian."""
        Dloc, lu = st._lazy
        x, depth = st.x, st.depth
        n, nb = self.n_panels, self.round_idx.size
        nbod = self.n_bodies
        if V is None:
            V = np.eye(nbod)
        k = V.shape[1]
        if st._aux is not None and st._aux.get("fd") == _FD_FINE:
            aux = dict(st._aux)
        else:
            _, aux = self._residual(x, depth, Dloc, fd=_FD_FINE)
        aux["_at"] = (x, depth, Dloc)
        _, _, _, fx, fD = self._forces(x[:n], Dloc, aux["h"], aux["psi"])
        own = self.owner
        EV = self.E @ V                      # (n, k): depth change of each panel's owner
        # ∂F/∂x (nbod × nx); ∂F/∂D·V (nbod × k) at fixed x; ∂r/∂D·V (nx × k)
        Fx = np.zeros((nbod, n + nb))
        FDV = np.zeros((nbod, k))
        rDV = np.zeros((n + nb, k))
        if n:
            Fx[own, np.arange(n)] = fx
            FDV += self.E.T @ (fD[:, None] * EV)
            rDV[:n] = aux["gv_D"][:, None] * EV - self.M @ (aux["hv_D"][:, None] * EV)
        if nb:
            Deff, hin, kap = aux["Deff"], aux["hin"], aux["kap"]
            hinDV = self.Q @ (aux["hv_D"][:, None] * EV)     # ∂h_in/∂D·V at fixed x
            Dn = depth[self.round_idx]
            dkap = np.array([law("kappa", d, 1) for law, d in zip(self.laws, Dn)])
            dbet = np.array([law("beta", d, 1) for law, d in zip(self.laws, Dn)])
            own_D = 1.0 - dkap * hin                          # ∂D_eff/∂D of the body's own depth
            for j, (law, i) in enumerate(zip(self.laws, self.round_idx)):
                d = Deff[j]
                dF = law("force", d, 1)
                dFh = -dF * kap[j] + (law("proj", d) if hin[j] < 0 else 0.0)   # ∂F/∂h_in
                # h_in = Q hv(x) + Z B
                Fx[i, :n] += dFh * self.Q[j] * aux["hv_x"]
                Fx[i, n:] += dFh * self.Z[j]
                FDV[i] += dF * own_D[j] * V[i] + dFh * hinDV[j]
            Vb = self.Eb @ V
            rDV[n:] = (-(aux["dBiso"] * own_D + dbet * hin)[:, None] * Vb + aux["dB"][:, None] * hinDV)
        dxdV = self._sensitivity(aux, rDV, lu)
        dFV = FDV + Fx @ dxdV if dxdV is not None else np.full((nbod, k), np.nan)
        return dxdV, dFV

    def _sensitivity(self, aux, rD, lu):
        """dx/dD = −J⁻¹ ∂r/∂D: GMRES (one column) or iterative refinement (several) on the
        exact Jacobian, preconditioned by the factorised (possibly older) one; a fresh
        factorisation if that does not converge."""
        from scipy.linalg import lu_factor, lu_solve

        if rD.size == 0:
            return np.zeros_like(rD)
        scale = float(np.max(np.abs(rD))) or 1.0
        if lu is not None:
            if rD.shape[1] == 1:
                y, ok = _gmres(lambda v: self._jmul(aux, v), lambda v: _psolve(lu, v), -rD[:, 0], 1e-9, 40)
                if self._lu is lu:
                    self._krylov_work += _gmres.last
                    if self._krylov_work > max(8.0, _KRYLOV_RENT * rD.shape[0]):
                        self._lu = None  # the next solve factorises afresh (see _solve)
                if ok:
                    return y[:, None]
            else:
                y = -_psolve(lu, rD)
                for _ in range(30):
                    res = -rD - self._jmul(aux, y)
                    if float(np.max(np.abs(res))) < 1e-10 * scale:
                        return y
                    y = y + _psolve(lu, res)
        x, depth, Dloc = aux["_at"]
        _, auxj = self._residual(x, depth, Dloc, fd=_FD_FINE, dense=True)
        try:
            return -lu_solve(lu_factor(auxj["J"], check_finite=False), rD, check_finite=False)
        except (ValueError, np.linalg.LinAlgError):
            return None

    # -- field ----------------------------------------------------------------------------------
    def _field(self, st: State, x, y):
        n, nb = self.n_panels, self.round_idx.size
        if n:
            from scipy.linalg import lu_solve

            q = lu_solve(self._S_lu, st.virtual_h - self.U @ st.B, check_finite=False)
        else:
            q = np.zeros(0)
        x = np.asarray(x, dtype=float)
        if self.two_d:
            d = x[..., None] - self.px
            return 0.5 * np.exp(-np.abs(d)) @ q
        from scipy.special import k0

        y = np.asarray(y, dtype=float)
        x, y = np.broadcast_arrays(x, y)
        out = np.zeros(x.shape)
        if n:
            P = self.P
            out += bem_k0.field(x, y, P["ax"], P["ay"], P["bx"], P["by"], q)
        for j in range(nb):
            out += st.B[j] * k0(np.maximum(np.hypot(x - self.rcx[j], y - self.rcy[j]), 1e-300))
        return out


# ---------------------------------------------------------------------------------------------
# Limits


@_one_thread
def limit(layout: Layout, depth, body, tilt=None, *, step: float = 0.1, tol: float = 1e-6,
          ftol: float = 1e-10, start=None) -> dict:
    """Depth and force of body ``body`` at its limit (largest force over its own depth).

    The other bodies are held at ``depth``. With ``body="all"`` every depth moves together
    (depth + t, a level device pushed down) and the total force is maximised instead.

    The depth is raised from a shallow start in steps (warm-started solves) until the force's
    slope dF/dD (implicit-function theorem, :attr:`State.dforce_ddepth`) turns negative, or
    until no solution exists beyond a fold of the branch or a rod floods (φ → π); the limit is
    then the root of the slope (secant steps inside the bracket, Illinois regula falsi where
    they leave it, to ``tol`` in depth or until the next step could gain less than ``ftol`` of
    the force: it is stationary there), or the last solvable depth at a fold (bisection). The
    force returned is the largest of the solved points (never an extrapolation). While the
    rods' sections are far from their own 2D limit states the steps grow towards them
    (:func:`_next_step`): 4–6 solves on rows, pairs, the skimmer and the 48-rod ring (before: 5–11).

    Returns
    -------
    dict: ``depth`` [l_c] (of the body; with "all" the depth offset t added to ``depth``),
    ``force`` [σ l_c] (of the body; with "all" the total), ``forces`` of all bodies there,
    ``state`` (the solved State), ``at_fold`` (True if the limit is the end of the branch).
    """
    depth = np.array(depth, dtype=float).reshape(layout.n_bodies)
    if isinstance(body, str) and body == "all":
        dirn = np.ones(layout.n_bodies)
        base = depth.copy()
        d0 = _common_start(layout)

        def obj(s):
            return float(np.sum(s.force))

        flood_check = range(layout.n_bodies)
    else:
        b = int(body)
        dirn = np.zeros(layout.n_bodies)
        dirn[b] = 1.0
        base = depth.copy()
        base[b] = 0.0
        d0 = _start_depth(layout, b)

        def obj(s):
            return float(s.force[b])

        flood_check = [b]

    def run(d, st):
        s = layout.solve(base + d * dirn, tilt, start=st)
        if not s.converged and st is not None:
            # one cold attempt from the built-in guess, without the continuation of
            # Layout.solve: past a fold nothing converges, and a solvable point the warm start
            # missed is reached by the bisection's shorter warm-started steps
            s = layout._solve(base + d * dirn, tilt, None, 1e-10, 60)
        elif not s.converged:
            s = layout.solve(base + d * dirn, tilt)
        ok = s.converged and all(_not_flooded(layout, s, i) for i in flood_check)
        return s, ok

    st, ok = run(d0, start)
    for _ in range(4):  # a round body pushed off its branch by the neighbours' field: shift
        if ok or not (isinstance(body, (int, np.integer)) and layout.bodies[b] is not None
                      and isinstance(layout.bodies[b], RoundBody) and st.converged):
            break
        j = int(np.flatnonzero(layout.round_idx == b)[0])
        law = layout.laws[j]
        d0 += (law.lo + 0.3 * (law.hi - law.lo)) - st.effective_depth[j]
        st, ok = run(d0, None)
    if not ok:
        raise _conv_error(f"limit: no solution at the start depth {d0:.4g} of body {body}")
    def slope(s_):
        g_ = s_.dforce_along(dirn)
        return float(np.sum(g_)) if isinstance(body, str) else float(g_[b])

    pts = [(d0, obj(st), st)]
    g = slope(st)
    d = d0
    while g < 0 and d > d0 - 2.0:  # started beyond the maximum: step back
        d -= step
        st, ok = run(d, st)
        if not ok:
            break
        pts.append((d, obj(st), st))
        g = slope(st)
    lo_pt = (d, g, st)
    rising = [(d, g)]
    hi_pt = None
    while hi_pt is None:
        d_new = lo_pt[0] + _next_step(rising, step, _phi_ahead(layout, lo_pt[2], dirn))
        s_new, ok = run(d_new, lo_pt[2])
        if not ok:  # fold or flooding: bisect the end of the branch
            good, bad, sg = lo_pt[0], d_new, lo_pt[2]
            while bad - good > tol:
                mid = 0.5 * (good + bad)
                sm, okm = run(mid, sg)
                if okm:
                    good, sg = mid, sm
                    pts.append((mid, obj(sm), sm))
                    gm = slope(sm)
                    if gm < 0:  # the maximum lies before the end of the branch after all
                        hi_pt = (mid, gm, sm)
                        break
                    lo_pt = (mid, gm, sm)
                else:
                    bad = mid
            if hi_pt is None:
                return _lim(max(pts, key=lambda p: p[1]), True)
            break
        pts.append((d_new, obj(s_new), s_new))
        g_new = slope(s_new)
        if g_new < 0:
            hi_pt = (d_new, g_new, s_new)
        else:
            lo_pt = (d_new, g_new, s_new)
            rising.append((d_new, g_new))
        if lo_pt[0] > d0 + 20.0:
            raise _conv_error("limit: force still rising 20 l_c below the start depth")
    # the root of dF/dD in the bracket [lo, hi] (slope + to −): the secant through the last two
    # points where it falls inside the bracket, else Illinois regula falsi; stopped when the
    # next step could gain less than ftol of the force (stationary there: the gain is below
    # |g Δd|), or the bracket is shorter than tol
    (xa, ga, sa), (xb, gb, sb) = lo_pt, hi_pt
    latest = pts[-1][0]
    last = sorted([(xa, ga, obj(sa)), (xb, gb, obj(sb))], key=lambda p: p[0] == latest)   # latest last
    side = 0
    x_prev = None
    for _ in range(60):
        xm = xb - gb * (xb - xa) / (gb - ga)
        (x1, g1, _), (x2, g2, f2) = last[-2], last[-1]
        if g1 != g2:
            xs = x2 - g2 * (x2 - x1) / (g2 - g1)
            if min(xa, xb) < xs < max(xa, xb):
                xm = xs
        if x_prev is not None and abs(xm - x_prev) < tol:
            break
        if abs(g2 * (xm - x2)) <= ftol * abs(f2):
            break
        x_prev = xm
        sm, okm = run(xm, sa if abs(xm - xa) < abs(xm - xb) else sb)
        if not okm:
            xm = 0.5 * (xa + xb)
            sm, okm = run(xm, sa)
            if not okm:
                break
        gm = slope(sm)
        pts.append((xm, obj(sm), sm))
        last.append((xm, gm, pts[-1][1]))
        if abs(xb - xa) < tol or gm == 0.0:
            break
        if gm > 0:
            xa, ga, sa = xm, gm, sm
            if side == -1:
                gb *= 0.5
            side = -1
        else:
            xb, gb, sb = xm, gm, sm
            if side == 1:
                ga *= 0.5
            side = 1
        if abs(xb - xa) < tol:
            break
    return _lim(max(pts, key=lambda p: p[1]), False)


def _next_step(rising, step, ahead_phi=None):
    """Depth step towards the root of the slope from the last rising points (d, dF/dD > 0).

    The slope falls ever faster towards the end of a branch (it tends to −∞ at a fold, which
    can lie just past the maximum: 0.02 l_c past it for 48 rods in a ring), so a full step
    often overshoots into no solution. Once the slope falls, the next point aims just beyond
    its root extrapolated by the parabola through the last three points (the secant through
    two): that point usually brackets the root closely. Never less than 5 % of ``step``.

    ``ahead_phi`` (:func:`_phi_ahead`, the distance at which the rod sections reach their own
    2D limit states) lengthens the steps while the limit is far, to at most four steps and
    80 % of that distance, and shortens the secant's estimate: the secant through points on
    a concave slope overshoots, the sections' estimate does not while the sections are far
    apart (the mean section reaches the 2D limit state within 0.01 rad on the benchmark ring
    and skimmer), and comes out too far when neighbours are close (gaps under ~1 l_c), where
    the secant and the cap of one step decide.
    """
    cap = step
    if ahead_phi is not None and ahead_phi > 0.0:
        cap = min(4.0 * step, max(step, 0.8 * ahead_phi))
    if len(rising) < 2 or not rising[-2][1] > rising[-1][1] > 0:
        return cap
    (d1, g1), (d2, g2) = rising[-2], rising[-1]
    ahead = g2 * (d2 - d1) / (g1 - g2)   # secant
    if len(rising) >= 3 and rising[-3][1] > g1:
        d0_, g0_ = rising[-3]
        # parabola through the three points, in t = d − d2: g = g2 + b t + c t²
        t0, t1 = d0_ - d2, d1 - d2
        c = ((g0_ - g2) / t0 - (g1 - g2) / t1) / (t0 - t1)
        b = (g1 - g2) / t1 - c * t1
        disc = b * b - 4.0 * c * g2
        if c != 0.0 and disc >= 0.0:
            roots = [(-b + sgn * math.sqrt(disc)) / (2.0 * c) for sgn in (1.0, -1.0)]
            roots = [r for r in roots if r > 0.0]
            if roots:
                ahead = min(ahead, min(roots))
    if ahead_phi is not None and ahead_phi > 0.0:
        ahead = min(ahead, ahead_phi)
    return min(cap, max(0.05 * step, 1.05 * ahead + 0.01 * step))


def _phi_ahead(layout: Layout, st: State, dirn) -> float | None:
    """Depth offset along ``dirn`` at which the length-weighted mean contact position of the
    moving rods' side panels reaches their isolated 2D limit positions φ* (Vella, Lee & Kim's
    2D law, :func:`floatcalc.core.rod2d.limit`), extrapolated linearly with dφ/dt from the
    state's depth sensitivity; None without rod sides or before that sensitivity exists."""
    n = layout.n_panels
    if not n or st._dirs is None or st._dirs[2] is None:
        return None
    if not np.allclose(st._dirs[1], dirn, rtol=0, atol=1e-12):
        return None
    m = layout.side & (np.asarray(dirn)[layout.owner] != 0.0)
    if not np.any(m):
        return None
    star = getattr(layout, "_phi_star", None)
    if star is None:
        from . import rod2d

        star = np.asarray(rod2d.limit(layout.P["R"], layout.P["theta"]), dtype=float)
        layout._phi_star = star
    w = layout.plen[m]
    rate = float(w @ st._dirs[2][:n][m])
    if not rate > 0.0:
        return None
    return float(w @ (star[m] - st.x[:n][m])) / rate


def _lim(p, fold):
    d, f, st = p
    return {"depth": float(d), "force": float(f), "forces": st.force.copy(), "state": st, "at_fold": bool(fold)}


def _conv_error(msg):
    from ..errors import ConvergenceError

    return ConvergenceError(msg)


def _not_flooded(layout: Layout, st: State, b: int) -> bool:
    """False if a side panel of rod b floods (φ = π) or round body b leaves its branch."""
    j = np.flatnonzero(layout.round_idx == b)
    if j.size:
        law = layout.laws[int(j[0])]
        return bool(law.lo <= st.effective_depth[j[0]] <= law.hi)
    n = layout.n_panels
    m = (layout.owner == b) & layout.side
    return not np.any(st.x[:n][m] >= PI - 1e-9)


def _start_depth(layout: Layout, b: int) -> float:
    """A depth safely before body b's limit alone (0.85 of the way to it)."""
    body = layout.bodies[b]
    if isinstance(body, RodBody):
        from . import rod2d

        return 0.85 * float(rod2d.limit_force(body.radius, body.theta)["depth"])
    law = layout.laws[int(np.flatnonzero(layout.round_idx == b)[0])]
    D, F = law.tab["depth"], law.tab["force"]
    d_max = float(D[int(np.argmax(F))])
    return max(law.lo + 1e-6, law.lo + 0.85 * (d_max - law.lo))


def _common_start(layout: Layout) -> float:
    """Start depth for all bodies pushed together: the shallowest body's start, but no
    shallower than any round body's first contact or 0.02 l_c."""
    d0 = min(_start_depth(layout, i) for i in range(layout.n_bodies))
    floor = max([0.02] + [law.lo + 1e-6 for law in layout.laws])
    return max(d0, floor)


def isolated_force(body: RodBody | RoundBody, panels_per_lc: float = 2.0) -> float:
    """The limit force of :func:`isolated_limit` [σ l_c]; a rod's is kept per shape and mesh
    (it does not depend on where the rod lies or which way it points), so that a device's
    shielding factors do not re-solve a rod alone for every layout of the same legs.

    >>> rod = RodBody(3.0, 1.0, 0.7, 10.0, 0.05, math.radians(115))
    >>> f = isolated_force(rod, 1.0)
    >>> bool(abs(f - isolated_limit(rod, 1.0)["force"]) < 1e-9 * f)
    True
    """
    if isinstance(body, RodBody):
        return _isolated_rod_force(float(body.length), float(body.radius), float(body.theta), float(panels_per_lc))
    return float(isolated_limit(body, panels_per_lc)["force"])


@functools.lru_cache(maxsize=64)
def _isolated_rod_force(length: float, radius: float, theta: float, ppl: float) -> float:
    return float(isolated_limit(RodBody(0.0, 0.0, 0.5 * PI, length, radius, theta), ppl)["force"])


def isolated_limit(body: RodBody | RoundBody, panels_per_lc: float = 2.0) -> dict:
    """Limit of one body alone: rods by the solved model, round bodies by their exact law.

    >>> rod = RodBody(0.0, 0.0, 0.0, 10.0, 0.05, math.radians(115))
    >>> from floatcalc.core import rod2d
    >>> lim = isolated_limit(rod)
    >>> f2 = float(rod2d.limit_force(0.05, math.radians(115))["force"])
    >>> bool(abs(lim["force"] - 10 * f2) < 2 * (2 * np.pi * 0.05 + np.pi * 0.05 ** 2 * lim["depth"]))
    True
    """
    if isinstance(body, RodBody):
        lay = Layout([body], panels_per_lc)
        return limit(lay, np.zeros(1), 0)
    from . import round_bodies as rb

    p = body.params
    th = p["theta"]
    if body.kind == "ball":
        best, _ = rb.ball_limit(p["radius"], th)
    elif body.kind == "pad":
        best, _ = rb.pad_limit(p["radius"], p["thickness"], th)
    elif body.kind == "pin":
        cur = rb.pad_curve(p["radius"], np.inf, th, n=120, depth_max=p["length"])
        st = rb.pin_state(p["radius"], th, p["length"])
        best = {"force": st["force"], "depth": p["length"]}
        k = int(np.argmax(cur["force"]))
        if cur["force"][k] > best["force"]:
            best = {"force": float(cur["force"][k]), "depth": float(cur["depth"][k])}
    elif body.kind == "ring":
        best, _ = rb.ring_limit(p["ring_radius"], p["wire_radius"], th)
    else:
        raise ValueError(f"kind: one of ball, pad, pin, ring, got {body.kind!r}")
    return {"depth": float(best["depth"]), "force": float(best["force"])}
