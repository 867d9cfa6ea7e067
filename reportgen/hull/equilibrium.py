"""Equilibrium waterplane of a hull at a given heel, and KN.

Units: lengths m, volumes m³, masses t, density t/m³, angles deg. Planes as in
reportgen.hull.hydrostatics (`Plane`: d_m, slope, heel_deg).

At a fixed heel θ the hull floats at the waterplane whose immersed volume is Δ/ρ
(Archimedes) and, with free trim, whose centre of buoyancy lies on the same vertical
transverse plane as G, i.e. xB = LCG (for small trim slopes the longitudinal lever is xB - LCG;
cross curves of a free-trimming ship are made this way with LCG = the even-keel upright
LCB at that displacement, so the ship floats upright at zero trim). The heeling moment is
not balanced: that is the righting lever the cross curves tabulate,
KN = yB·cosθ + zB·sinθ (the horizontal distance of B from the keel point K on the
centreline at the baseline, measured along the waterline direction; e.g. Rawson & Tupper,
Basic Ship Theory, ch. 4, cross curves of stability).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq, root

from reportgen.hull.hydrostatics import (
    HullGeometry,
    Plane,
    _axes,
    clip_sections,
    integrate,
)

_VOL_RTOL = 1e-10
_LCB_TOL_M = 1e-6


@dataclass(frozen=True)
class Equilibrium:
    """An equilibrium waterplane at heel and its centre of buoyancy (m from AP / CL / base)."""

    plane: Plane
    volume_m3: float
    lcb_m: float
    tcb_m: float
    vcb_m: float

    @property
    def kn_m(self) -> float:
        """KN = yB·cosθ + zB·sinθ, m (pole at the baseline on the centreline)."""
        t = np.radians(self.plane.heel_deg)
        return float(self.tcb_m * np.cos(t) + self.vcb_m * np.sin(t))


def d_bracket(geom: HullGeometry, heel_deg: float, slope: float) -> tuple[float, float]:
    """(d_lo, d_hi), m: at d_lo no point of the hull is immersed, at d_hi all are."""
    _, n = _axes(heel_deg)
    lever = slope * (0.5 * geom.length_bp_m - geom.x_m)
    lo, hi = np.inf, -np.inf
    for v, lv in zip(geom.vertices, lever, strict=True):
        if len(v):
            h = v @ n
            lo = min(lo, float(h.min() - lv))
            hi = max(hi, float(h.max() - lv))
    return lo, hi


def state_at(geom: HullGeometry, plane: Plane) -> Equilibrium:
    """The immersed volume and centre of buoyancy under a given waterplane."""
    it = integrate(geom, clip_sections(geom, plane))
    v = it.volume_m3
    return Equilibrium(plane, v, it.mx_m4 / v, it.my_m4 / v, it.mz_m4 / v)


def solve_draft(geom: HullGeometry, volume_m3: float, heel_deg: float, slope: float = 0.0
                ) -> Plane:
    """The plane at heel `heel_deg` and fixed `slope` immersing `volume_m3`, by brentq on d.

    Raises ValueError when the volume exceeds the closed hull's volume.
    """
    lo, hi = d_bracket(geom, heel_deg, slope)

    def f(d: float) -> float:
        p = Plane(d, slope, heel_deg)
        return integrate(geom, clip_sections(geom, p)).volume_m3 - volume_m3

    f_hi = f(hi)
    if f_hi < 0.0:
        raise ValueError(
            f"a displaced volume of {volume_m3:.3f} m³ exceeds the hull's closed volume "
            f"({volume_m3 + f_hi:.3f} m³)"
        )
    d = brentq(f, lo, hi, xtol=1e-10, rtol=1e-13, maxiter=200)
    return Plane(float(d), slope, heel_deg)


def _free_trim_residual(geom: HullGeometry, volume_m3: float, heel_deg: float, lcg_m: float):
    """F(d, τ) and its exact Jacobian, τ = slope·Lpp (m). dA/dc of a section is its waterline
    breadth b, so ∂V/∂d = ∫b dx and ∂V/∂τ = ∫b·(Lpp/2 - x)/Lpp dx (likewise for ∫A·x)."""
    lpp = geom.length_bp_m
    w, x = geom.weights, geom.x_m
    lever = (0.5 * lpp - x) / lpp

    last: list = [None, None]  # the last (z, result): a solve starts at the point just checked

    def fun(z: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        if last[0] is not None and np.array_equal(z, last[0]):
            return last[1]
        plane = Plane(float(z[0]), float(z[1]) / lpp, heel_deg)
        sl = clip_sections(geom, plane)
        a, b = sl.area_m2, sl.breadth_m
        vol = w @ a
        mx = w @ (a * x)
        f = np.array([vol / volume_m3 - 1.0, (mx - vol * lcg_m) / (volume_m3 * lpp)])
        dv = np.array([w @ b, w @ (b * lever)])
        dmx = np.array([w @ (b * x), w @ (b * x * lever)])
        jac = np.vstack([dv / volume_m3, (dmx - lcg_m * dv) / (volume_m3 * lpp)])
        last[0], last[1] = np.array(z, dtype=float), (f, jac)
        return f, jac

    return fun


def _converged(f: np.ndarray, lpp: float) -> bool:
    return abs(f[0]) < 10 * _VOL_RTOL and abs(f[1]) * lpp < _LCB_TOL_M


NEWTON_MAX_STEPS = 8


def _newton(fun, z0: np.ndarray, lpp: float) -> np.ndarray | None:
    """Newton's method on the free-trim residual from z0 with its exact Jacobian, stopped
    once converged and the step has fallen to hybrj's own tolerance (1e-10 of z); None when
    it does not get there in NEWTON_MAX_STEPS (hybrj is then run from z0)."""
    z = z0
    for _ in range(NEWTON_MAX_STEPS):
        f, jac = fun(z)
        try:
            step = np.linalg.solve(jac, f)
        except np.linalg.LinAlgError:
            return None
        if not np.all(np.isfinite(step)):
            return None
        z = z - step
        if _converged(f, lpp) and np.all(np.abs(step) <= 1e-10 * (np.abs(z) + 1e-10)):
            return z
    return None


def solve_free_trim(geom: HullGeometry, volume_m3: float, heel_deg: float, lcg_m: float,
                    guess: Plane | None = None) -> Plane:
    """The plane at heel `heel_deg` immersing `volume_m3` with xB = `lcg_m`.

    Newton's method with the exact Jacobian from the waterline breadths (from a nearby
    guess it converges in two or three steps); where it does not, scipy.optimize.root
    (MINPACK hybrj) with the same Jacobian; where neither converges, a nested brentq (trim
    outside, draught inside).
    """
    lpp = geom.length_bp_m
    if guess is None:
        guess = solve_draft(geom, volume_m3, heel_deg, 0.0)
    fun = _free_trim_residual(geom, volume_m3, heel_deg, lcg_m)
    z0 = np.array([guess.d_m, guess.slope * lpp])
    if _converged(fun(z0)[0], lpp):
        return Plane(guess.d_m, guess.slope, heel_deg)
    z = _newton(fun, z0, lpp)
    if z is not None:
        return Plane(float(z[0]), float(z[1]) / lpp, heel_deg)
    sol = root(fun, z0, jac=True, method="hybr",
               options={"xtol": 1e-10})
    # Accept on the residual itself: hybrj reports "not making good progress" when it
    # starts at (or reaches) the root to machine precision.
    if _converged(sol.fun, lpp):
        return Plane(float(sol.x[0]), float(sol.x[1]) / lpp, heel_deg)
    return _free_trim_nested(geom, volume_m3, heel_deg, lcg_m)


def _free_trim_nested(geom: HullGeometry, volume_m3: float, heel_deg: float, lcg_m: float
                      ) -> Plane:
    """Fallback: brentq on τ = slope·Lpp of (xB - LCG), each trial solving d by brentq."""
    lpp = geom.length_bp_m

    def g(tau: float) -> float:
        p = solve_draft(geom, volume_m3, heel_deg, tau / lpp)
        return state_at(geom, p).lcb_m - lcg_m

    lo, hi = -0.05 * lpp, 0.05 * lpp
    g_lo, g_hi = g(lo), g(hi)
    while g_lo * g_hi > 0.0 and hi < lpp:
        lo, hi = 2 * lo, 2 * hi
        g_lo, g_hi = g(lo), g(hi)
    if g_lo * g_hi > 0.0:
        raise ValueError(
            f"no free-trim equilibrium found at heel {heel_deg:g}° for LCG {lcg_m:.3f} m"
        )
    tau = brentq(g, lo, hi, xtol=1e-9)
    return solve_draft(geom, volume_m3, heel_deg, tau / lpp)


def equilibrium_plane(geom: HullGeometry, volume_m3: float, heel_deg: float,
                      lcg_m: float | None = None, guess: Plane | None = None) -> Plane:
    """The equilibrium waterplane at heel alone (as `equilibrium`, without integrating the
    centre of buoyancy there)."""
    if lcg_m is None:
        return solve_draft(geom, volume_m3, heel_deg, 0.0)
    g = None if guess is None else Plane(guess.d_m, guess.slope, heel_deg)
    return solve_free_trim(geom, volume_m3, heel_deg, lcg_m, g)


def equilibrium(geom: HullGeometry, volume_m3: float, heel_deg: float,
                lcg_m: float | None = None, guess: Plane | None = None) -> Equilibrium:
    """Equilibrium at heel: even keel (slope 0) when `lcg_m` is None, else free trim with
    xB = lcg_m. `guess` (a nearby plane at any heel) speeds up the free-trim solve."""
    return state_at(geom, equilibrium_plane(geom, volume_m3, heel_deg, lcg_m, guess))
