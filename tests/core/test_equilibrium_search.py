"""The root searches of floatcalc.core.equilibrium: newton_crossing on closed-form margins, and a
solve without any balance failing fast.

References: the roots are closed forms (ln 2 for e^t − 2; the cube root for t³ − a); a rigid
plate on four linear springs with a weight beyond its moment capacity has no balance (statics:
the load's line of action must lie where the springs' largest forces can hold its moment).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from floatcalc.core import equilibrium as eq
from floatcalc.errors import ConvergenceError


@pytest.mark.parametrize("g, dg, root", [
    (lambda t: math.exp(t) - 2.0, math.exp, math.log(2.0)),                 # convex: overshoots first
    (lambda t: t ** 3 - 5.0, lambda t: 3 * t * t, 5.0 ** (1 / 3)),
    (lambda t: math.atan(t - 1.3), lambda t: 1 / (1 + (t - 1.3) ** 2), 1.3),  # concave past the root
])
def test_newton_crossing_finds_closed_form_roots_on_the_safe_side(g, dg, root):
    calls = []

    def state(t):
        calls.append(t)
        return g(t), dg(t)

    t, (a, b), settled = eq.newton_crossing(state, g(0.0), dg(0.0), xtol=1e-10, hi=10.0,
                                            probe=lambda a, ga: a + 1.0)
    assert settled and abs(t - root) < 1e-9
    assert g(t) <= 0.0 or abs(t - root) < 1e-12      # never past the root beyond rounding
    assert a <= root <= b + 1e-12
    assert len(calls) < 15


def test_newton_crossing_without_slopes_bisects_and_reports_no_crossing():
    t, bracket, settled = eq.newton_crossing(lambda t: (t - 2.0, None), -2.0, None, xtol=1e-9, hi=8.0,
                                             probe=lambda a, ga: a + 1.0)
    assert settled and abs(t - 2.0) <= 1e-9 and t <= 2.0
    t, bracket, _ = eq.newton_crossing(lambda t: (-1.0, 0.0), -1.0, 0.0, xtol=1e-9, hi=3.0,
                                       probe=lambda a, ga: a + 1.0)
    assert t is None and bracket is None


@pytest.fixture
def evaluations(monkeypatch):
    """A counter of the equilibrium's state-and-sensitivity evaluations (one list item)."""
    count = [0]
    real = eq._state_and_sensitivity

    def counted(*a):
        count[0] += 1
        return real(*a)

    monkeypatch.setattr(eq, "_state_and_sensitivity", counted)
    return count


def _plate():
    D = np.tile(np.linspace(0.0, 1.0, 11), (4, 1))
    return eq.Support(x=np.array([1.0, -1, 1, -1]), y=np.array([1.0, 1, -1, -1]), offset=np.zeros(4),
                      depth=D, force=2.0 * D, contact=D, owner=np.arange(4), coupling=np.zeros((4, 4)))


def test_a_load_beyond_the_moment_capacity_fails_fast(evaluations):
    """Springs at x = ±1 that push but cannot pull: a load at x = 1.2 lies outside them, and its
    moment about x = 1 cannot be held by any spring force >= 0 (statics): no balance. The solve
    says so in a few dozen evaluations (not 2 × 80)."""
    sup = _plate()
    u, _ = eq.solve(sup, 3.0, 0.0, 0.0)            # the centred load has a balance
    assert u[0] == pytest.approx(3.0 / 8.0)
    evaluations[0] = 0
    with pytest.raises(ConvergenceError):
        eq.solve(sup, 3.0, 1.2, 0.0, start=u)
    assert evaluations[0] < 60, evaluations[0]


def test_no_balance_under_a_far_off_load_is_found_in_few_evaluations(evaluations):
    """The invented skimmer with twice its weight centred 4 capillary lengths off to -x: the legs
    on that side pass their limits and the rest cannot hold the moment (a balance exists at 1).
    The stalled Newton iteration stops after ten steps that remove less than nine tenths of the
    residual: under 40 evaluations for both Jacobians (the previous rule ran up to 80 each: 150
    in all, measured)."""
    from floatcalc.device import Device, example

    dev = Device.from_design(example("skimmer"))
    sup = dev.support()
    W = 2.0 * dev.weight / (dev.liquid.sigma * dev.liquid.lc)
    eq.solve(sup, W, -1.0, 0.0)
    evaluations[0] = 0
    with pytest.raises(ConvergenceError):
        eq.solve(sup, W, -4.0, 0.0)
    assert evaluations[0] < 40, evaluations[0]


@pytest.mark.parametrize("order", ["by element", "shuffled"])
def test_factored_coupling_equals_the_full_product(order):
    """Support.couple (C · per-element means, for points listed element by element) against the
    plain product C · A · v with the averaging matrix A written out (linear algebra), for a
    vector and for columns; shuffled points use the full product itself."""
    rng = np.random.default_rng(3)
    owner = np.repeat(np.arange(6), [1, 30, 50, 20, 40, 1])   # 142 points: the factored form
    if order == "shuffled":
        owner = rng.permutation(owner)
    m = owner.size
    D = np.tile(np.linspace(0.0, 1.0, 9), (m, 1))
    C = rng.uniform(0.0, 0.1, (m, 6))
    sup = eq.Support(x=rng.normal(size=m), y=rng.normal(size=m), offset=np.zeros(m), depth=D, force=2 * D,
                     contact=D, owner=owner, coupling=C)
    assert (sup._runs is not None) == (order == "by element")
    A = np.zeros((6, m))
    for j, e in enumerate(owner):
        A[e, j] = 1.0 / np.count_nonzero(owner == e)
    v, V = rng.normal(size=m), rng.normal(size=(m, 3))
    np.testing.assert_allclose(sup.couple(v), C @ (A @ v), rtol=1e-13, atol=1e-15)
    np.testing.assert_allclose(sup.couple(V), C @ (A @ V), rtol=1e-13, atol=1e-15)
