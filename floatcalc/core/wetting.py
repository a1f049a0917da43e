"""Textured coatings on bare numbers: apparent contact angles and Cassie-to-Wenzel pressures.

Lengths in any one unit L (the project's core uses L = l_c); pressures then come out in σ/L
(for L = l_c, in ρ g l_c, since σ/l_c = ρ g l_c). Angles in radians, through the liquid. All
functions take NumPy arrays and broadcast.

Textures
--------
``posts``: square posts of side a on a square lattice of pitch p (p > a), height h.
``grooves``: parallel ridges of width a at pitch p, depth h (the gaps are p − a wide).

.. math::

    f_\\text{posts} = a^2/p^2,\\quad r_\\text{posts} = 1 + 4 a h / p^2,\\qquad
    f_\\text{grooves} = a/p,\\quad r_\\text{grooves} = 1 + 2h/p

(solid fraction f of the tops, roughness r = true area / projected area).

Apparent angles: Wenzel cos θ* = r cos θ; Cassie–Baxter cos θ* = f (cos θ + 1) − 1 [1]_ [2]_,
clipped to 0–180° (|r cos θ| > 1 means complete wetting or complete non-wetting).

Cassie-to-Wenzel transition under a pressure Δp of the liquid over the trapped air:

* depinning: the liquid–air interface slides down the post walls once it meets them at the
  advancing angle θ_a. Force balance on one cell (contact-line pull σ cos θ_a per length of
  post perimeter against the pressure on the free area):

  .. math:: \\Delta p_d = -\\sigma\\cos\\theta_a\\,\\frac{\\text{post perimeter per cell}}{\\text{free area per cell}}
            = \\frac{-4 a\\,\\sigma\\cos\\theta_a}{p^2 - a^2}\\ \\text{(posts)},\\quad
            \\frac{-2\\sigma\\cos\\theta_a}{p - a}\\ \\text{(grooves)}

  ([3]_ [4]_); zero for θ_a ≤ 90° (the texture then holds no pressure and floods);
* sag (touch-down) for shallow textures: the interface pinned at the tops bulges with
  curvature Δp/σ and touches the bottom when its sag reaches h [5]_ [6]_. With a circular arc
  (grooves, Δp = σ/R) or a spherical cap (posts, Δp = 2σ/R) over the half-span s,
  R = (h² + s²)/(2h):

  .. math:: \\Delta p_s = \\frac{2h\\,\\sigma}{h^2 + s^2}\\ \\text{(grooves, } s = (p-a)/2),\\qquad
            \\frac{4h\\,\\sigma}{h^2 + s^2}\\ \\text{(posts, } s = (p-a)/\\sqrt2)

  (s for posts: from the cell centre to the nearest post corners; an idealised cap over the
  real, non-spherical interface).

The texture floods at Δp_c = min(Δp_d, Δp_s). The equations are standard force balances and
elementary geometry; their forms are as recalled from [3]_–[6]_ (the originals could not be
consulted while writing; the groove form is checked in the tests against the geometry of a
circular meniscus meeting the walls at θ_a).

Validity: features much smaller than the capillary length (pressure uniform over a cell),
vertical walls with sharp top edges, air at ambient pressure (trapped air compressed in a
closed texture would add resistance: not included, safe side), static pressure; viscous and
inertial effects of a fast impact beyond ½ρv² not included.

References
----------
.. [1] R. N. Wenzel, Ind. Eng. Chem. 28, 988 (1936).
.. [2] A. B. D. Cassie, S. Baxter, Trans. Faraday Soc. 40, 546 (1944).
.. [3] C. W. Extrand, "Model for contact angles and hysteresis on rough and ultraphobic
   surfaces", Langmuir 18, 7991 (2002) (contact-line density criterion).
.. [4] Q.-S. Zheng, Y. Yu, Z.-H. Zhao, "Effects of hydraulic pressure on the stability and
   transition of wetting modes of superhydrophobic surfaces", Langmuir 21, 12207 (2005).
.. [5] C. W. Extrand, "Criteria for ultralyophobic surfaces", Langmuir 20, 5013 (2004).
.. [6] D. Bartolo et al., "Bouncing or sticky droplets: impalement transitions on
   superhydrophobic micropatterned surfaces", Europhys. Lett. 74, 299 (2006).
"""

from __future__ import annotations

import numpy as np

TEXTURES = ("posts", "grooves")
ANGLE_MODELS = ("none", "wenzel", "cassie")


def effective_angle(theta, texture: str = "none", roughness=None, solid_fraction=None):
    """Apparent contact angle [rad] of a textured surface (Wenzel or Cassie–Baxter).

    .. math:: \\cos\\theta^* = r\\cos\\theta\\ \\text{(wenzel)},\\qquad
              \\cos\\theta^* = f(\\cos\\theta + 1) - 1\\ \\text{(cassie)}

    Parameters
    ----------
    theta : array_like [rad]
        Intrinsic contact angle of the material.
    texture : ``"none"``, ``"wenzel"`` or ``"cassie"``
    roughness : array_like, for ``"wenzel"`` (r ≥ 1)
    solid_fraction : array_like, for ``"cassie"`` (0 < f ≤ 1)

    Returns
    -------
    ndarray or float [rad], clipped to 0–π.

    >>> round(float(np.degrees(effective_angle(np.radians(110), "cassie", solid_fraction=0.2))), 2)
    150.27
    >>> round(float(np.degrees(effective_angle(np.radians(110), "wenzel", roughness=3.0))), 2)
    180.0
    """
    c = np.cos(np.asarray(theta, dtype=float))
    if texture == "wenzel":
        c = np.asarray(roughness, dtype=float) * c
    elif texture == "cassie":
        c = np.asarray(solid_fraction, dtype=float) * (c + 1.0) - 1.0
    elif texture != "none":
        raise ValueError(f"texture must be one of {ANGLE_MODELS}, got {texture!r}")
    out = np.arccos(np.clip(c, -1.0, 1.0))
    return float(out) if out.ndim == 0 else out


def solid_fraction(texture: str, post_size, pitch):
    """Solid fraction f of the tops: a²/p² (posts), a/p (grooves).

    >>> solid_fraction("posts", 1.0, 4.0), solid_fraction("grooves", 1.0, 4.0)
    (0.0625, 0.25)
    """
    a, p = np.asarray(post_size, dtype=float), np.asarray(pitch, dtype=float)
    out = (a / p) ** 2 if texture == "posts" else a / p
    return _out(out, texture)


def roughness(texture: str, post_size, pitch, post_height):
    """Roughness r (true over projected area): 1 + 4ah/p² (posts), 1 + 2h/p (grooves).

    >>> roughness("posts", 1.0, 4.0, 2.0)
    1.5
    """
    a, p, h = (np.asarray(x, dtype=float) for x in (post_size, pitch, post_height))
    out = 1.0 + 4.0 * a * h / p**2 if texture == "posts" else 1.0 + 2.0 * h / p + 0.0 * a
    return _out(out, texture)


def depinning_pressure(texture: str, post_size, pitch, theta_a):
    """Pressure [σ/L] at which the interface slides down the walls (see module docstring).

    .. math:: \\Delta p_d = -\\sigma\\cos\\theta_a \\times \\text{perimeter} / \\text{free area}

    Zero where θ_a ≤ 90°.

    >>> round(float(depinning_pressure("posts", 1.0, 3.0, np.radians(120))), 6)   # 4·0.5/8
    0.25
    """
    a, p, th = (np.asarray(x, dtype=float) for x in (post_size, pitch, theta_a))
    c = np.cos(th)
    if texture == "posts":
        out = -4.0 * a * c / (p**2 - a**2)
    else:
        out = -2.0 * c / (p - a)
    return _out(np.maximum(out, 0.0), texture)


def sag_pressure(texture: str, post_size, pitch, post_height):
    """Pressure [σ/L] at which the pinned interface sags down to the bottom (module docstring).

    >>> round(float(sag_pressure("grooves", 1.0, 3.0, 1.0)), 6)   # arc over a 2-wide gap, depth 1: R = 1
    1.0
    """
    a, p, h = (np.asarray(x, dtype=float) for x in (post_size, pitch, post_height))
    if texture == "posts":
        s = (p - a) / np.sqrt(2.0)
        out = 4.0 * h / (h**2 + s**2)
    else:
        s = 0.5 * (p - a)
        out = 2.0 * h / (h**2 + s**2)
    return _out(out, texture)


def critical_pressure(texture: str, post_size, pitch, post_height, theta_a):
    """Cassie-to-Wenzel pressure Δp_c = min(Δp_d, Δp_s) [σ/L] and which mechanism sets it.

    Returns
    -------
    pressure : ndarray or float [σ/L]
    by_sag : ndarray or bool
        True where the sag (touch-down) pressure is the smaller.

    >>> p, sag = critical_pressure("posts", 1.0, 3.0, 10.0, np.radians(120))
    >>> round(float(p), 3), bool(sag)
    (0.25, False)
    """
    d = depinning_pressure(texture, post_size, pitch, theta_a)
    s = sag_pressure(texture, post_size, pitch, post_height)
    out = np.minimum(d, s)
    by_sag = np.asarray(s < d)
    return (float(out), bool(by_sag)) if np.ndim(out) == 0 else (out, by_sag)


def texture_state(texture: str, post_size, pitch, post_height, theta_a, pressure):
    """Cassie or Wenzel state of a texture under a pressure, and the apparent angle.

    Parameters
    ----------
    texture : ``"posts"`` or ``"grooves"``
    post_size, pitch, post_height : array_like [L]
    theta_a : array_like [rad]
        Advancing angle of the material (intrinsic).
    pressure : array_like [σ/L]
        Liquid pressure over the air in the texture (hydrostatic plus dynamic).

    Returns
    -------
    dict
        ``floods`` (pressure ≥ Δp_c), ``angle`` (Cassie angle where dry, Wenzel angle where
        flooded) [rad], ``cassie_angle``, ``wenzel_angle`` [rad], ``critical_pressure`` [σ/L],
        ``by_sag``, ``solid_fraction``, ``roughness``.

    >>> st = texture_state("posts", 1.0, 3.0, 2.0, np.radians(115), [0.05, 0.5])
    >>> st["floods"].tolist()
    [False, True]
    """
    f = solid_fraction(texture, post_size, pitch)
    r = roughness(texture, post_size, pitch, post_height)
    pc, by_sag = critical_pressure(texture, post_size, pitch, post_height, theta_a)
    cas = effective_angle(theta_a, "cassie", solid_fraction=f)
    wen = effective_angle(theta_a, "wenzel", roughness=r)
    floods = np.asarray(pressure, dtype=float) >= pc
    angle = np.where(floods, wen, cas)
    return {"floods": floods, "angle": angle, "cassie_angle": cas, "wenzel_angle": wen,
            "critical_pressure": pc, "by_sag": by_sag, "solid_fraction": f, "roughness": r}


def _out(x, texture):
    if texture not in TEXTURES:
        raise ValueError(f"texture must be one of {TEXTURES}, got {texture!r}")
    x = np.asarray(x, dtype=float)
    return float(x) if x.ndim == 0 else x
