"""2D meniscus against a flat vertical wall, in scaled variables (lengths in l_c).

A flat vertical wall stands in a liquid whose free surface is flat (z = 0) far away; the liquid
meets the wall at contact angle θ measured through the liquid. The interface leaves the wall at
an angle ψ_w = π/2 − θ above the horizontal (positive: the liquid climbs the wall). The 2D
Young–Laplace equation, z = κ (in l_c), has the first integral

.. math:: 1 - \\cos\\psi = z^2 / 2 ,

so the contact height is

.. math:: h = 2\\sin\\left(\\frac{\\psi_w}{2}\\right) = \\operatorname{sign}(\\cos\\theta)\\,\\sqrt{2(1 - \\sin\\theta)},

positive (raised) for θ < 90° and negative (depressed) for θ > 90°, with |h| ≤ √2. Integrating
once more gives the closed-form profile as distance from the wall against height,

.. math:: x(z) = \\left[\\operatorname{arcosh}\\frac{2}{|z|} - \\sqrt{4 - z^2}\\right]
                 - \\left[\\operatorname{arcosh}\\frac{2}{|h|} - \\sqrt{4 - h^2}\\right].

Since |ψ| ≤ π/2 at a vertical wall, z is monotone in x and the profile never overhangs.

Validity: static, wall wide and liquid deep compared with l_c, 0 ≤ θ ≤ π.

References
----------
.. [1] P.-G. de Gennes, F. Brochard-Wyart, D. Quéré, Capillarity and Wetting Phenomena,
   Springer (2004), ch. 1 (meniscus on a vertical plate).
.. [2] L. D. Landau, E. M. Lifshitz, Fluid Mechanics, 2nd ed., Pergamon (1987), §61, problem 1.
"""

from __future__ import annotations

import numpy as np

PI = np.pi


def contact_height(theta):
    """Signed height of the contact line on the wall [l_c], h = 2 sin((π/2 − θ)/2).

    Parameters
    ----------
    theta : array_like [rad]
        Contact angle, 0 ≤ θ ≤ π.

    Returns
    -------
    ndarray [l_c]
        Positive for a raised meniscus (θ < 90°).

    >>> float(round(contact_height(0.0), 12))  # perfect wetting: sqrt(2)
    1.414213562373
    >>> float(round(contact_height(np.pi), 12))
    -1.414213562373
    """
    return 2.0 * np.sin(0.5 * (0.5 * PI - np.asarray(theta, dtype=float)))


def distance_from_wall(z, h):
    """Horizontal distance [l_c] from the wall where the meniscus of contact height h reaches z.

    ``z`` must lie between 0 (exclusive) and ``h`` (inclusive) with the sign of ``h``.

    >>> float(distance_from_wall(1.0, 1.0))
    0.0
    """
    z = np.abs(np.asarray(z, dtype=float))
    h = np.abs(np.asarray(h, dtype=float))

    def g(u):
        return np.arccosh(2.0 / u) - np.sqrt(4.0 - u * u)

    return g(z) - g(h)


def profile(theta: float, extent: float = 6.0, n: int = 200):
    """Closed-form meniscus profile from the wall (x = 0) out to about ``extent`` [l_c].

    Returns
    -------
    x, z : ndarray [l_c]
        Distance from the wall and height of the interface; ``z[0]`` is the contact height.

    >>> x, z = profile(np.radians(30.0))
    >>> bool(x[0] == 0.0 and z[0] > 0 and abs(z[-1]) < 1e-2)
    True
    """
    h = float(contact_height(theta))
    if abs(h) < 1e-12:
        x = np.linspace(0.0, extent, 2)
        return x, np.zeros_like(x)
    # For small |z|, x ≈ ln(4/|z|) − 2 − g(h): pick the smallest height inside the extent.
    g_h = float(np.arccosh(2.0 / abs(h)) - np.sqrt(4.0 - h * h))
    z_end = min(abs(h), 4.0 * np.exp(-(extent + g_h + 2.0)))
    mag = np.geomspace(abs(h), z_end, n)
    x = distance_from_wall(mag, h)
    x[0] = 0.0
    return x, np.sign(h) * mag
