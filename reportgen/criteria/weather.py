"""IMO 2008 IS Code (resolution MSC.267(85)), Part A, 2.3: severe wind and rolling criterion
(weather criterion): the wind heeling levers (2.3.2.2, 2.3.2.3), the angles and areas of
figure 2.3.1 (2.3.2), and the two checks (2.3.1.2, 2.3.1.4). θ1 is in
reportgen.criteria.rolling (2.3.4).

Units: lengths m, areas m², mass t, pressure N/m², angles deg (radians inside the area
integrals), areas under the curve m·rad.
"""

from __future__ import annotations

from dataclasses import dataclass

import shapely
import shapely.affinity
from shapely.geometry import Polygon

from reportgen.criteria.core import Check, State
from reportgen.criteria.rolling import Roll
from reportgen.errors import InputError
from reportgen.stability import GZCurve, area_mrad, crossings, on_grid

SET = "is2008.weather"
REF_2_3_1_2 = "IS Code 2008, Part A, 2.3.1.2"
REF_2_3_1_4 = "IS Code 2008, Part A, 2.3.1.4"

WIND_PRESSURE_N_M2 = 504.0  # P, 2.3.2.2
GRAVITY_M_S2 = 9.81  # g, 2.3.2.2
LW2_FACTOR = 1.5  # lw2 = 1.5·lw1, 2.3.2.3
THETA0_LIMIT_DEG = 16.0  # 2.3.1.2
DECK_EDGE_FRACTION = 0.8  # 2.3.1.2
THETA2_LIMIT_DEG = 50.0  # 2.3.2 (figure 2.3.1: θ2 = min(θf, 50°, θc))


def wind_lever_m(pressure_n_m2: float, area_m2: float, lever_m: float,
                 displacement_t: float) -> float:
    """lw1 = P·A·Z/(1000·g·Δ) (m), IS Code 2008 2.3.2.2."""
    return pressure_n_m2 * area_m2 * lever_m / (1000.0 * GRAVITY_M_S2 * displacement_t)


@dataclass(frozen=True)
class Profile:
    """Lateral areas about the waterline: above (m², centroid z m) and below (None if empty)."""

    area_above_m2: float
    z_above_m: float
    area_below_m2: float
    z_below_m: float | None
    x_above_m: float | None = None  # centroid of the area above, m from AP (None if empty)


def split_profile(profile: Polygon, draft_mid_m: float, trim: float, lpp_m: float) -> Profile:
    """The lateral profile (x, z) above and below the trimmed waterline
    z = T_mid + t·(Lpp/2 − x)/Lpp.

    The profile is sheared by z' = z − (waterline height at x), which keeps areas (a shear
    has determinant 1) and maps centroids to centroids, so the waterline becomes z' = 0 and
    shapely.clip_by_rect splits it; each centroid is sheared back.
    """
    slope = trim / lpp_m
    moved = shapely.affinity.affine_transform(
        profile, [1.0, 0.0, slope, 1.0, 0.0, -draft_mid_m - 0.5 * trim])
    x0, z0, x1, z1 = moved.bounds
    out = []
    for lo, hi in ((0.0, max(z1, 0.0) + 1.0), (min(z0, 0.0) - 1.0, 0.0)):
        part = shapely.clip_by_rect(moved, x0 - 1.0, lo, x1 + 1.0, hi)
        area = float(part.area)
        if area > 0.0:
            c = part.centroid
            out.append((area, float(c.y + draft_mid_m + 0.5 * trim - slope * c.x), float(c.x)))
        else:
            out.append((0.0, None, None))
    (a_up, z_up, x_up), (a_dn, z_dn, _) = out
    return Profile(a_up, 0.0 if z_up is None else z_up, a_dn, z_dn, x_up)


@dataclass(frozen=True)
class Wind:
    """The steady wind of 2.3.2.2: lateral area A (m²) and its centre (m above base), the
    lever Z (m) and how it was taken, lw1 and lw2 (m)."""

    area_m2: float
    z_m: float
    lever_m: float
    z_method: str
    lw1: float
    lw2: float


def wind(profile: Polygon, item_wind: list[tuple[float, float]], draft_mid_m: float,
         trim: float, lpp_m: float, displacement_t: float, z_method: str) -> Wind:
    """A: the profile above the waterline plus the items' windage (area m², centroid z m);
    Z from the centre of A to half the mean draught, or to the centre of the underwater
    lateral area (2.3.2.2); lw1 (2.3.2.2) and lw2 = 1.5·lw1 (2.3.2.3)."""
    p = split_profile(profile, draft_mid_m, trim, lpp_m)
    area = p.area_above_m2 + sum(a for a, _ in item_wind)
    if area <= 0.0:
        raise InputError("windage.profile: no lateral area above the waterline")
    z = (p.area_above_m2 * p.z_above_m + sum(a * zz for a, zz in item_wind)) / area
    if z_method == "underwater_centre":
        if p.z_below_m is None:
            raise InputError("windage.profile: calculation.wind_lever is underwater_centre but "
                             "the profile has no area below the waterline")
        lever = z - p.z_below_m
    else:
        lever = z - 0.5 * draft_mid_m
    lw1 = wind_lever_m(WIND_PRESSURE_N_M2, area, lever, displacement_t)
    return Wind(area, z, lever, z_method, lw1, LW2_FACTOR * lw1)


@dataclass(frozen=True)
class Areas:
    """The angles (deg) and areas (m·rad) of figure 2.3.1; None where they do not exist."""

    theta0: float | None
    theta_lw2: float | None
    thetac: float | None
    theta2: float | None
    theta_start: float | None
    area_a: float | None
    area_b: float | None
    missing: tuple[str, ...] = ()  # why areas a and b do not exist (missing_reasons)


def missing_reasons(theta0: float | None, theta_lw2: float | None,
                    theta1_deg: float | None) -> tuple[str, ...]:
    """Why the areas of figure 2.3.1 do not exist, as codes: `no_theta0` (GZ never reaches
    lw1: no steady heel θ0, where area a would start), `no_lw2` (GZ never reaches lw2: no
    intercept to end area a and start area b), `no_roll` (no angle of roll θ1: with GM not
    positive the roll period T = 2·C·B/√GM of 2.3.4 does not exist). Empty when they exist."""
    out = []
    if theta0 is None:
        out.append("no_theta0")
    if theta_lw2 is None:
        out.append("no_lw2")
    if theta1_deg is None:
        out.append("no_roll")
    return tuple(out)


def areas(curve: GZCurve, w: Wind, theta1_deg: float | None, flooding_deg: float) -> Areas:
    """θ0 (first intercept of lw1), the first intercept of lw2 and θc (its second), θ2 =
    min(θf, 50°, θc), and areas a (from θ0 − θ1 to the lw2 intercept) and b (from there to
    θ2), IS Code 2008 Part A 2.3.2 and figure 2.3.1."""
    top = curve.heel_max_deg
    grid = on_grid(curve, 0.0, top)  # both levels are sought on the same points
    up1 = crossings(curve, w.lw1, 0.0, top, "up", grid)
    theta0 = up1[0] if up1 else None
    up2 = crossings(curve, w.lw2, 0.0, top, "up", grid)
    theta_lw2 = up2[0] if up2 else None
    thetac = None
    if theta_lw2 is not None:
        down2 = crossings(curve, w.lw2, theta_lw2, top, "down")
        thetac = down2[0] if down2 else None
    theta2 = min(flooding_deg, THETA2_LIMIT_DEG, *([thetac] if thetac is not None else []))
    start = area_a = area_b = None
    if theta0 is not None and theta1_deg is not None:
        start = theta0 - theta1_deg
        if theta_lw2 is not None:
            if abs(start) > top + 1e-9:
                raise InputError(f"the angle of roll to windward θ0 − θ1 ({start:.1f}°) is "
                                 f"beyond the cross curves' largest heel ({top:g}°)")
            area_a = -area_mrad(curve, start, theta_lw2, level_m=w.lw2)
            area_b = (area_mrad(curve, theta_lw2, theta2, level_m=w.lw2)
                      if theta2 > theta_lw2 else 0.0)
    missing = missing_reasons(theta0, theta_lw2, theta1_deg) if area_b is None else ()
    if area_b is None:
        theta2 = None  # θ2 ends area b: it belongs to no area that exists
    return Areas(theta0, theta_lw2, thetac, theta2, start, area_a, area_b, missing)


@dataclass(frozen=True)
class Weather:
    """Every quantity of 2.3 for one condition."""

    wind: Wind
    roll: Roll
    areas: Areas
    roll_angle_source: str | None


def weather_warnings(wx: Weather) -> list[str]:
    out = []
    if wx.roll.outside:
        tail = (f"θ1 is taken from the roll angle given ({wx.roll_angle_source})."
                if wx.roll_angle_source is not None else
                "Consider θ1 from model tests (MSC.1/Circ.1200), given as weather.roll_angle.")
        out.append("Weather criterion: " + "; ".join(wx.roll.outside) + ", outside the range "
                   "the roll-angle tables of IS Code 2008 Part A 2.3 were derived for. " + tail)
    if wx.areas.theta0 is None:
        out.append("Weather criterion: the GZ curve does not reach the wind heeling lever lw1; "
                   "there is no steady heel angle θ0.")
    return out


def weather_heel(s: State) -> Check:
    """2.3.1.2: the steady heel θ0 under the steady wind ≤ 16° and ≤ 80 % of the angle of
    deck edge immersion."""
    required = min(THETA0_LIMIT_DEG, DECK_EDGE_FRACTION * s.deck_edge_deg)
    attained = s.weather.areas.theta0
    passed = attained is not None and attained <= required
    return Check("weather_heel", "Steady heel under wind", REF_2_3_1_2, required, attained,
                 "deg", passed, SET, limit="at_most")


def weather_area(s: State) -> Check:
    """2.3.1.4: area b ≥ area a (required = a, attained = b)."""
    a, b = s.weather.areas.area_a, s.weather.areas.area_b
    passed = a is not None and b is not None and b >= a
    return Check("weather_area", "Wind and rolling, area b against area a", REF_2_3_1_4, a, b,
                 "m·rad", passed, SET)


def checks(s: State) -> list[Check]:
    return [weather_heel(s), weather_area(s)]
