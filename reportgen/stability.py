"""Righting lever curve (GZ) from the cross curves; areas, intercepts and angles.

Units: angles in degrees at the interface, radians inside the integrals; lengths m; mass t;
areas under the GZ curve m·rad.

GZ(θ) = KN(θ) − KG_fluid·sin θ − TCG·cos θ (θ + to starboard), KG_fluid = KG + ΣFSM/Δ: the
free-surface correction applied as a rise of KG at all heels (IS Code 2008, Part B, 3.1; the
usual practice, SPEC.md). KN is the cross-curve lever from the baseline pole K on the
centreline (e.g. Rawson & Tupper, Basic Ship Theory, ch. 4, "cross curves of stability").

KN is interpolated smoothly in heel (scipy CubicSpline through the table's heels, extended to
negative heels by symmetry KN(−θ) = −KN(θ)) and linearly in displacement between table rows.

"Towards a side": with a list (TCG ≠ 0) the criteria are taken towards the side of the list.
The curve towards port is the mirror of the curve, GZ_port(φ) = −GZ(−φ), φ the heel to port;
both read GZ_side(φ) = KN(φ) − KG_fluid·sin φ − |TCG|·cos φ for the side of the list.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Literal

import numpy as np
from scipy.integrate import simpson
from scipy.interpolate import CubicSpline, PPoly
from scipy.optimize import brentq, minimize_scalar

from reportgen.errors import InputError
from reportgen.floating import check_in_range

if TYPE_CHECKING:
    from reportgen.inputs import CrossCurves as InputCrossCurves
    from reportgen.inputs import Opening

SCAN_STEP_DEG = 0.25  # grid on which sign changes and maxima are first located
AREA_POINTS = 241  # odd: Simpson's rule points per area integral


@dataclass(frozen=True)
class CrossCurves:
    """KN table: heel_deg (from 0), displacement t (at the table density), kn (n_disp, n_heel) m.

    The cubic splines in heel of every displacement row are made once, when the table is made
    (`_rows`): spline interpolation is linear in the data, so the spline through a linear
    blend of two rows is the same blend of the two rows' spline coefficients.
    """

    heel_deg: np.ndarray
    displacement: np.ndarray
    kn: np.ndarray
    _rows: CubicSpline = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        h = self.heel_deg
        if h[0] == 0.0:
            heel = np.concatenate([-h[:0:-1], h])
            kn = np.concatenate([-self.kn[:, :0:-1], self.kn], axis=1)
        else:
            zero = np.zeros((self.kn.shape[0], 1))
            heel = np.concatenate([-h[::-1], [0.0], h])
            kn = np.concatenate([-self.kn[:, ::-1], zero, self.kn], axis=1)
        # KN(−θ) = −KN(θ): one spline per displacement row over −θmax..θmax.
        object.__setattr__(self, "_rows", CubicSpline(heel, kn, axis=1))

    @classmethod
    def from_model(cls, cc: InputCrossCurves) -> CrossCurves:
        return cls(np.asarray(cc.heel, dtype=float), np.asarray(cc.displacement, dtype=float),
                   np.asarray(cc.kn, dtype=float))

    @property
    def heel_max_deg(self) -> float:
        return float(self.heel_deg[-1])

    def _weights(self, displacement_table_t: float) -> tuple[int, float]:
        check_in_range(displacement_table_t, self.displacement, "cross curves")
        d = self.displacement
        i = int(np.clip(np.searchsorted(d, displacement_table_t) - 1, 0, len(d) - 2))
        w = (displacement_table_t - d[i]) / (d[i + 1] - d[i])
        return i, min(max(w, 0.0), 1.0)

    def kn_row(self, displacement_table_t: float) -> np.ndarray:
        """KN at the table's heels for Δ_t (t), linear between displacement rows."""
        i, w = self._weights(displacement_table_t)
        return (1.0 - w) * self.kn[i] + w * self.kn[i + 1]

    def kn_spline(self, displacement_table_t: float) -> PPoly:
        """KN(θ°) at Δ_t: the cubic spline (not-a-knot) over −θmax..θmax through the row
        interpolated linearly in displacement; odd by symmetry."""
        i, w = self._weights(displacement_table_t)
        c = self._rows.c
        return PPoly.construct_fast((1.0 - w) * c[:, :, i] + w * c[:, :, i + 1], self._rows.x)


@dataclass(frozen=True)
class GZCurve:
    """GZ(θ) = KN(θ) − KG_fluid·sin θ − TCG·cos θ (m), θ in degrees, + to starboard."""

    kn: PPoly
    kg_fluid_m: float
    tcg_m: float
    heel_max_deg: float

    def __call__(self, heel_deg: float | np.ndarray) -> np.ndarray:
        t = np.radians(heel_deg)
        return self.kn(heel_deg) - self.kg_fluid_m * np.sin(t) - self.tcg_m * np.cos(t)

    def towards(self, side: Literal["starboard", "port"]) -> GZCurve:
        """The curve with heel measured towards `side`: GZ_side(φ) = s·GZ(s·φ), s = ±1.

        KN is odd (the spline through odd data with symmetric knots is odd), so the port curve
        is the same KN with the sign of TCG reversed.
        """
        if side == "starboard":
            return self
        return GZCurve(self.kn, self.kg_fluid_m, -self.tcg_m, self.heel_max_deg)


def gz_curve(cross: CrossCurves, displacement_table_t: float, kg_fluid_m: float,
             tcg_m: float) -> GZCurve:
    """The GZ curve at Δ_t (t, the cross curves' density) for KG_fluid and TCG (m)."""
    return GZCurve(cross.kn_spline(displacement_table_t), float(kg_fluid_m), float(tcg_m),
                   cross.heel_max_deg)


LIST_TCG_TOLERANCE_M = 1e-6  # |TCG| at or below this is no list (rounding of symmetric loads)


def has_list(tcg_m: float) -> bool:
    """True when the TCG (m) puts the ship on a list (beyond LIST_TCG_TOLERANCE_M)."""
    return abs(tcg_m) > LIST_TCG_TOLERANCE_M


def list_side(tcg_m: float) -> Literal["starboard", "port"]:
    """The side the criteria are taken towards: that of the list; starboard with none."""
    return "port" if has_list(tcg_m) and tcg_m < 0 else "starboard"


def area_mrad(curve: GZCurve, start_deg: float, end_deg: float, level_m: float = 0.0) -> float:
    """∫ (GZ − level) dθ from start to end, θ in radians: m·rad (Simpson's rule, fine grid)."""
    if end_deg == start_deg:
        return 0.0
    heel = np.linspace(start_deg, end_deg, AREA_POINTS)
    return float(simpson(curve(heel) - level_m, x=np.radians(heel)))


def crossings(curve: GZCurve, level_m: float, start_deg: float, end_deg: float,
              direction: Literal["up", "down"]) -> list[float]:
    """Angles in [start, end] where GZ crosses `level` upwards or downwards (deg).

    Located on a SCAN_STEP_DEG grid, refined by scipy's brentq. "up": GZ − level goes from
    ≤ 0 to > 0 with increasing heel; "down": from > 0 to ≤ 0.
    """
    n = max(int(np.ceil((end_deg - start_deg) / SCAN_STEP_DEG)), 1) + 1
    heel = np.linspace(start_deg, end_deg, n)
    f = curve(heel) - level_m
    if direction == "up":
        idx = np.nonzero((f[:-1] <= 0) & (f[1:] > 0))[0]
    else:
        idx = np.nonzero((f[:-1] > 0) & (f[1:] <= 0))[0]
    out = []
    for i in idx:
        a, b = heel[i], heel[i + 1]
        if f[i] == 0.0:
            out.append(float(a))
        elif f[i + 1] == 0.0:
            out.append(float(b))
        else:
            out.append(float(brentq(lambda x: float(curve(x)) - level_m, a, b, xtol=1e-10)))
    return out


def equilibrium_heel(curve: GZCurve) -> float | None:
    """Static heel (deg, + starboard): the stable zero of GZ (GZ rising through 0) nearest
    upright; on a tie the starboard one. None when there is none within the table."""
    roots = crossings(curve, 0.0, -curve.heel_max_deg, curve.heel_max_deg, "up")
    if not roots:
        return None
    return min(roots, key=lambda r: (abs(r), -r))


def max_gz(curve: GZCurve, start_deg: float, end_deg: float) -> tuple[float, float]:
    """(angle deg, GZ m) of the largest GZ on [start, end]: grid search refined by scipy's
    bounded scalar minimisation."""
    n = max(int(np.ceil((end_deg - start_deg) / SCAN_STEP_DEG)), 1) + 1
    heel = np.linspace(start_deg, end_deg, n)
    f = curve(heel)
    i = int(np.argmax(f))
    lo, hi = heel[max(i - 1, 0)], heel[min(i + 1, n - 1)]
    best_a, best_f = float(heel[i]), float(f[i])
    if hi > lo:
        res = minimize_scalar(lambda x: -float(curve(x)), bounds=(lo, hi), method="bounded",
                              options={"xatol": 1e-6})
        if -res.fun > best_f:
            best_a, best_f = float(res.x), float(-res.fun)
    return best_a, best_f


def vanishing_angle(curve: GZCurve, gz_max_deg: float) -> float | None:
    """First angle beyond the maximum where GZ falls to zero (deg); None when GZ stays
    positive to the end of the table (SPEC.md). With no positive GZ at all: 0."""
    if float(curve(gz_max_deg)) <= 0.0:
        return 0.0
    down = crossings(curve, 0.0, gz_max_deg, curve.heel_max_deg, "down")
    return down[0] if down else None


def gz_grid(curve: GZCurve) -> tuple[list[float], list[float], list[float]]:
    """The GZ curve on a 1° grid from −min(60°, θmax) to θmax: heel (deg, + starboard), GZ
    (m) and the KN (m) it is made from."""
    top = int(np.floor(curve.heel_max_deg + 1e-9))
    bottom = -min(60, top)
    heel = np.arange(bottom, top + 1, dtype=float)
    return heel.tolist(), [float(v) for v in curve(heel)], [float(v) for v in curve.kn(heel)]


# --- angles of deck edge immersion and of flooding ----------------------------------------------


def angle_from_table(displacement_table_t: float, displacement: np.ndarray, angle: np.ndarray,
                     what: str) -> float:
    """An angle (deg) from a displacement -> angle table, linear, never extrapolated."""
    check_in_range(displacement_table_t, displacement, what)
    return float(np.interp(displacement_table_t, displacement, angle))


def deck_edge_formula(depth_m: float, draft_mid_m: float, breadth_m: float) -> float:
    """Deck edge immersion angle atan((D − T)/(B/2)) (deg), wall-sided approximation at
    midships with the mean draught (common practice when no table is given)."""
    return float(np.degrees(np.arctan2(depth_m - draft_mid_m, 0.5 * breadth_m)))


@dataclass(frozen=True)
class OpeningAngle:
    name: str
    angle_deg: float
    submerged: bool


def opening_angles(openings: list[Opening], draft_mid_m: float, trim: float, lpp_m: float,
                   ) -> list[OpeningAngle]:
    """Immersion angle of each opening: tan θ = (z − T_x)/|y| (deg), T_x the height of the
    trimmed waterline at the opening's x.

    Approximation (common practice, stated on the sheet): the waterline turns about its
    intersection with the centreline at x, as for a wall-sided ship; an opening on the
    centreline gives 90°. An opening at or below the waterline gives 0°.
    """
    from reportgen.floating import waterline_height

    out = []
    for op in openings:
        t_x = float(waterline_height(op.x, draft_mid_m, trim, lpp_m))
        ang = float(np.degrees(np.arctan2(op.z - t_x, abs(op.y))))
        out.append(OpeningAngle(op.name, max(ang, 0.0), op.z <= t_x))
    return out


def require_heel_range(curve: GZCurve, angle_deg: float, what: str) -> None:
    """InputError when an angle needed by a criterion lies beyond the cross curves' heels."""
    if abs(angle_deg) > curve.heel_max_deg + 1e-9:
        raise InputError(f"the {what} ({angle_deg:.1f}°) is beyond the cross curves' largest "
                         f"heel ({curve.heel_max_deg:g}°)")
