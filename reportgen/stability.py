"""Righting lever curve (GZ) from the cross curves; areas, intercepts and the greatest lever.

Units: angles in degrees at the interface, radians inside the integrals; lengths m; mass t;
areas under the GZ curve m·rad.

GZ(θ) = KN(θ) − KG_fluid·sin θ − TCG·cos θ (θ + to starboard), KN the cross-curve lever from
the baseline pole K on the centreline (e.g. Rawson & Tupper, Basic Ship Theory, ch. 4, "cross
curves of stability"); KG_fluid from reportgen.particulars (free surface as a rise of KG).

KN is interpolated smoothly in heel (scipy CubicSpline through the table's heels, extended to
negative heels by symmetry KN(−θ) = −KN(θ)) and linearly in displacement and in trim between
table rows. Areas are exact integrals of that curve: the KN spline by its antiderivative
(scipy PPoly), the sine and cosine terms in closed form.

"Towards a side": with a list (TCG ≠ 0) the criteria are taken towards the side of the list.
The curve towards port is the mirror of the curve, GZ_port(φ) = −GZ(−φ), φ the heel to port;
as KN is odd, that is the same KN with the sign of TCG reversed (GZCurve.towards).
"""

from __future__ import annotations

import math
from bisect import bisect_left, bisect_right
from dataclasses import dataclass, field
from functools import cache, cached_property
from typing import Literal

import numpy as np
from scipy.interpolate import CubicSpline, PPoly

from reportgen.floating import outside, range_error, table_axis

GRID_STEP_DEG = 0.25  # grid on which sign changes and maxima are first located
NEWTON_STEPS = 3  # refinements of each root or maximum from the grid (quadratic convergence)
DEG = np.pi / 180.0


def odd_spline(heel_deg: np.ndarray, kn: np.ndarray) -> CubicSpline:
    """Cubic splines (not-a-knot) over −θmax..θmax through KN rows given from 0° (or from a
    first heel above 0°) on the last axis, extended by KN(−θ) = −KN(θ)."""
    h = np.asarray(heel_deg, dtype=float)
    kn = np.asarray(kn, dtype=float)
    if h[0] == 0.0:
        heel = np.concatenate([-h[:0:-1], h])
        full = np.concatenate([-kn[..., :0:-1], kn], axis=-1)
    else:
        heel = np.concatenate([-h[::-1], [0.0], h])
        full = np.concatenate([-kn[..., ::-1], np.zeros(kn.shape[:-1] + (1,)), kn], axis=-1)
    return CubicSpline(heel, full, axis=-1)


def _weights(value: float, axis: list[float]) -> tuple[int, float]:
    """(i, w): `value` lies w of the way from axis[i] to axis[i + 1] (w clamped to 0..1;
    axis strictly increasing, at least two entries), in floats."""
    i = min(max(bisect_left(axis, value) - 1, 0), len(axis) - 2)
    w = (value - axis[i]) / (axis[i + 1] - axis[i])
    return i, min(max(w, 0.0), 1.0)


@dataclass(frozen=True, eq=False)  # arrays: == has no truth value; compared by identity
class CrossCurves:
    """KN tables: heel_deg (from 0), displacement t (at the hydrostatic table's density),
    trims m (None: one table), kn (k, n_disp, n_heel) m.

    The spline in heel of every row is made once (`_rows`): spline interpolation is linear in
    the data, so the spline through a linear blend of rows is the same blend of the rows'
    spline coefficients.
    """

    heel_deg: np.ndarray
    displacement: np.ndarray
    trims: np.ndarray | None
    kn: np.ndarray
    _rows: CubicSpline = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "_rows", odd_spline(self.heel_deg, self.kn))

    @cached_property
    def _axes(self) -> tuple[tuple, tuple | None]:
        """The displacement and trim axes as (list, least, largest), made once."""
        return (table_axis(self.displacement),
                None if self.trims is None else table_axis(self.trims))

    @property
    def heel_max_deg(self) -> float:
        return float(self.heel_deg[-1])

    def kn_spline(self, displacement_table_t: float, trim_m: float = 0.0) -> PPoly:
        """KN(θ°) at Δ_t and trim: the spline through the rows interpolated linearly in
        displacement and (with trims) in trim; odd by symmetry. Never extrapolated."""
        (disp, lo, hi), trims = self._axes
        if outside(displacement_table_t, lo, hi):
            raise range_error(displacement_table_t, lo, hi, "cross curves")
        i, w = _weights(displacement_table_t, disp)
        c = self._rows.c  # (4, intervals, k, n_disp)
        rows = (1.0 - w) * c[..., i] + w * c[..., i + 1]  # (4, intervals, k)
        if trims is None:
            coef = rows[..., 0]
        else:
            if outside(trim_m, trims[1], trims[2]):
                raise range_error(trim_m, trims[1], trims[2], "cross curves' trims", unit="m")
            k, v = _weights(trim_m, trims[0])
            coef = (1.0 - v) * rows[..., k] + v * rows[..., k + 1]
        return PPoly.construct_fast(np.ascontiguousarray(coef), self._rows.x)


@cache
def _grid(heel_max_deg: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The GRID_STEP_DEG grid over −θmax..θmax (deg) with its sines and cosines: read-only
    arrays, made once per θmax (a pure function of it; benchmarks/bench_check.py says so)."""
    n = round(2.0 * heel_max_deg / GRID_STEP_DEG) + 1
    heel = np.linspace(-heel_max_deg, heel_max_deg, n)
    out = (heel, np.sin(heel * DEG), np.cos(heel * DEG))
    for a in out:
        a.flags.writeable = False
    return out


class KNCurve:
    """KN(θ°) of one displacement and trim (m), θ over −θmax..θmax: the spline, with its
    derivatives, its antiderivative and its values on the GRID_STEP_DEG grid made once, so
    that the GZ curve at another KG (the limits search) costs a few array operations."""

    def __init__(self, spline: PPoly, heel_max_deg: float) -> None:
        self.spline = spline
        self.heel_max_deg = float(heel_max_deg)
        self.grid_heel, self.grid_sin, self.grid_cos = _grid(self.heel_max_deg)
        self.grid_kn = spline(self.grid_heel)
        self._breaks = spline.x.tolist()
        self._pieces = np.asarray(spline.c).T.tolist()  # per piece: cubic .. constant term
        # ∫KN dθ° (m·deg), the spline's antiderivative: per piece quartic .. constant term
        self._integral_pieces = np.asarray(spline.antiderivative().c).T.tolist()

    def __call__(self, heel_deg: float | np.ndarray) -> np.ndarray:
        return self.spline(heel_deg)

    def local(self, heel_deg: float) -> tuple[float, float, float]:
        """KN (m), dKN/dθ (m/deg) and d²KN/dθ² (m/deg²) at one heel, from the spline's own
        cubic piece (the one scipy's PPoly takes: x_i ≤ θ < x_i+1, the end pieces extended)
        by Horner's rule in floats: the searches for roots and maxima call this thousands of
        times per condition, where an array call costs twenty times more."""
        i, x = self._piece(heel_deg)
        c3, c2, c1, c0 = self._pieces[i]
        return ((c3 * x + c2) * x + c1) * x + c0, (3.0 * c3 * x + 2.0 * c2) * x + c1, \
            6.0 * c3 * x + 2.0 * c2

    def integral_at(self, heel_deg: float) -> float:
        """∫KN dθ° from −θmax to θ (m·deg), from the antiderivative's own piece as `local`."""
        i, x = self._piece(heel_deg)
        c4, c3, c2, c1, c0 = self._integral_pieces[i]
        return (((c4 * x + c3) * x + c2) * x + c1) * x + c0

    def _piece(self, heel_deg: float) -> tuple[int, float]:
        """The index of the piece PPoly evaluates at θ, and θ less its start (deg)."""
        b = self._breaks
        i = bisect_right(b, heel_deg) - 1
        if i < 0:
            i = 0
        elif i > len(b) - 2:
            i = len(b) - 2
        return i, heel_deg - b[i]


@dataclass(frozen=True)
class GZCurve:
    """GZ(θ) = KN(θ) − KG_fluid·sin θ − TCG·cos θ (m), θ in degrees, + to starboard."""

    kn: KNCurve
    kg_fluid_m: float
    tcg_m: float

    @property
    def heel_max_deg(self) -> float:
        return self.kn.heel_max_deg

    def __call__(self, heel_deg: float | np.ndarray) -> np.ndarray:
        t = np.asarray(heel_deg, dtype=float) * DEG
        return self.kn.spline(heel_deg) - self.kg_fluid_m * np.sin(t) - self.tcg_m * np.cos(t)

    def local(self, heel_deg: float) -> tuple[float, float, float]:
        """GZ (m), dGZ/dθ (m/deg) and d²GZ/dθ² (m/deg²) at one heel (deg): the derivatives
        of GZ = KN − KG·sin θ − TCG·cos θ."""
        kn, d1, d2 = self.kn.local(heel_deg)
        t = heel_deg * DEG
        s, c = math.sin(t), math.cos(t)
        g, y = self.kg_fluid_m, self.tcg_m
        return kn - g * s - y * c, d1 - DEG * (g * c - y * s), d2 + DEG * DEG * (g * s + y * c)

    @cached_property
    def grid(self) -> tuple[np.ndarray, np.ndarray]:
        """(heel deg, GZ m) on a GRID_STEP_DEG grid over −θmax..θmax."""
        k = self.kn
        return k.grid_heel, k.grid_kn - self.kg_fluid_m * k.grid_sin - self.tcg_m * k.grid_cos

    def towards(self, side: Literal["starboard", "port"]) -> GZCurve:
        """The curve with heel measured towards `side`: GZ_side(φ) = s·GZ(s·φ), s = ±1; as KN
        is odd (odd data, symmetric knots), the port curve is KN with TCG reversed."""
        if side == "starboard":
            return self
        return GZCurve(self.kn, self.kg_fluid_m, -self.tcg_m)


def gz_curve(kn: KNCurve, kg_fluid_m: float, tcg_m: float) -> GZCurve:
    """The GZ curve of a KN curve for KG_fluid and TCG (m)."""
    return GZCurve(kn, float(kg_fluid_m), float(tcg_m))


LIST_TCG_TOLERANCE_M = 1e-6  # |TCG| at or below this is no list (rounding of symmetric loads)


def has_list(tcg_m: float) -> bool:
    """True when the TCG (m) puts the ship on a list (beyond LIST_TCG_TOLERANCE_M)."""
    return abs(tcg_m) > LIST_TCG_TOLERANCE_M


def list_side(tcg_m: float) -> Literal["starboard", "port"]:
    """The side the criteria are taken towards: that of the list; starboard with none."""
    return "port" if has_list(tcg_m) and tcg_m < 0 else "starboard"


def area_mrad(curve: GZCurve, start_deg: float, end_deg: float, level_m: float = 0.0) -> float:
    """∫ (GZ − level) dθ from start to end, θ in radians: m·rad, exact for the curve:
    ∫KN by the spline's antiderivative, ∫KG·sin θ and ∫TCG·cos θ in closed form."""
    if end_deg == start_deg:
        return 0.0
    a, b = start_deg * DEG, end_deg * DEG
    kn_part = DEG * (curve.kn.integral_at(end_deg) - curve.kn.integral_at(start_deg))
    return (kn_part - curve.kg_fluid_m * (math.cos(a) - math.cos(b))
            - curve.tcg_m * (math.sin(b) - math.sin(a)) - level_m * (b - a))


def on_grid(curve: GZCurve, start_deg: float, end_deg: float) -> tuple[np.ndarray, np.ndarray]:
    """(heel deg, GZ m) at start, at the grid points strictly between, and at end."""
    gh, gv = curve.grid
    lo = int(gh.searchsorted(start_deg, "right"))
    n = max(int(gh.searchsorted(end_deg, "left")) - lo, 0)
    heel, gz = np.empty(n + 2), np.empty(n + 2)
    heel[0], heel[1:-1], heel[-1] = start_deg, gh[lo:lo + n], end_deg
    gz[0], gz[1:-1], gz[-1] = curve.local(start_deg)[0], gv[lo:lo + n], curve.local(end_deg)[0]
    return heel, gz


def _newton_root(curve: GZCurve, x: float, lo: float, hi: float, level_m: float) -> float:
    """Newton's method on GZ − level from x, kept within [lo, hi] (deg)."""
    for _ in range(NEWTON_STEPS):
        f, d, _ = curve.local(x)
        if d == 0.0:
            break
        x = min(max(x - (f - level_m) / d, lo), hi)
    return x


def crossings(curve: GZCurve, level_m: float, start_deg: float, end_deg: float,
              direction: Literal["up", "down"],
              grid: tuple[np.ndarray, np.ndarray] | None = None) -> list[float]:
    """Angles in [start, end] where GZ crosses `level` upwards or downwards (deg).

    Located on the curve's grid (and at the ends), then refined by Newton's method within the
    bracket. "up": GZ − level goes from ≤ 0 to > 0 with increasing heel; "down": from > 0 to
    ≤ 0. `grid`: on_grid(curve, start, end) when the caller has it already.
    """
    heel, f = on_grid(curve, start_deg, end_deg) if grid is None else grid
    f = f - level_m
    if direction == "up":
        idx = np.nonzero((f[:-1] <= 0) & (f[1:] > 0))[0]
    else:
        idx = np.nonzero((f[:-1] > 0) & (f[1:] <= 0))[0]
    roots = []
    for i in idx.tolist():
        a, b, fa, fb = float(heel[i]), float(heel[i + 1]), float(f[i]), float(f[i + 1])
        if fa == 0.0 or fb == 0.0:
            roots.append(a if fa == 0.0 else b)
        else:
            roots.append(_newton_root(curve, a - fa * (b - a) / (fb - fa), a, b, level_m))
    return roots


def max_gz(curve: GZCurve, start_deg: float, end_deg: float) -> tuple[float, float]:
    """(angle deg, GZ m) of the largest GZ on [start, end]: on the grid, then Newton's method
    on dGZ/dθ = 0 within the neighbouring grid points (kept only if it is higher)."""
    heel, f = on_grid(curve, start_deg, end_deg)
    i = int(np.argmax(f))
    best_a, best_f = float(heel[i]), float(f[i])
    lo, hi = float(heel[max(i - 1, 0)]), float(heel[min(i + 1, len(heel) - 1)])
    x = best_a
    for _ in range(NEWTON_STEPS):
        _, slope, c = curve.local(x)
        if c >= 0.0:
            break
        x = min(max(x - slope / c, lo), hi)
    fx = curve.local(x)[0]
    if fx > best_f:
        best_a, best_f = x, fx
    return best_a, best_f


def equilibrium_heel(curve: GZCurve) -> float | None:
    """Static heel (deg, + starboard): the stable zero of GZ (GZ rising through 0) nearest
    upright; on a tie the starboard one. None when there is none within the table."""
    roots = crossings(curve, 0.0, -curve.heel_max_deg, curve.heel_max_deg, "up")
    if not roots:
        return None
    return min(roots, key=lambda r: (abs(r), -r))


def vanishing_angle(curve: GZCurve, gz_max_deg: float) -> float | None:
    """First angle beyond the maximum where GZ falls to zero (deg); None when GZ stays
    positive to the end of the table (SPEC.md). With no positive GZ at all: 0."""
    if float(curve(gz_max_deg)) <= 0.0:
        return 0.0
    down = crossings(curve, 0.0, gz_max_deg, curve.heel_max_deg, "down")
    return down[0] if down else None


def gz_arrays(curve: GZCurve) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The GZ curve on a 1° grid from −min(60°, θmax) to θmax: heel (deg, + starboard), GZ
    (m) and the KN (m) it is made from."""
    top = int(np.floor(curve.heel_max_deg + 1e-9))
    bottom = -min(60, top)
    heel = np.arange(bottom, top + 1, dtype=float)
    return heel, curve(heel), curve.kn(heel)


# --- initial stability ---------------------------------------------------------------------------


def free_surface_correction(fsm_tm: float, displacement_t: float) -> float:
    """FSC = ΣFSM/Δ (m), the virtual rise of G for the free surfaces (IS Code 2008 Part B
    3.1; e.g. Rawson & Tupper, Basic Ship Theory, ch. 4, free surface effect)."""
    return fsm_tm / displacement_t


def kg_corrected(kg_m: float, fsc_m: float) -> float:
    """KG corrected for free surface = KG + FSC (m), applied as a rise of KG at all heels
    (the usual practice, SPEC.md)."""
    return kg_m + fsc_m


def metacentric_height(kmt_m: float, kg_m: float) -> float:
    """GM = KMt − KG (m), the initial metacentric height (Rawson & Tupper, ch. 4)."""
    return kmt_m - kg_m


def curve_towards_side(heel_deg: list[float] | np.ndarray, values: list[float] | np.ndarray,
                       side: str) -> tuple[np.ndarray, np.ndarray]:
    """A curve sampled at heels (deg, + to starboard) of a quantity odd in heel (GZ, KN), as
    seen towards `side`: towards port both the angle and the value change sign (the mirror
    GZ_port(φ) = −GZ(−φ) of GZCurve.towards, on samples). Returns (heel deg, value),
    heel increasing."""
    sign = -1.0 if side == "port" else 1.0
    heel = sign * np.asarray(heel_deg, dtype=float)
    value = sign * np.asarray(values, dtype=float)
    order = np.argsort(heel)
    return heel[order], value[order]
