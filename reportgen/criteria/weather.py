"""IMO 2008 IS Code (resolution MSC.267(85)), Part A, 2.3: severe wind and rolling criterion
(weather criterion).

Units: lengths m, areas m², mass t, pressure N/m², angles deg (radians inside the area
integrals), areas under the curve m·rad, period s. The formulas and factor tables are those of
2.3.2 to 2.3.4 as written in SPEC.md ("Criteria"); each is written once below with its
paragraph.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from shapely.geometry import Polygon

from reportgen.criteria import Check, State
from reportgen.errors import InputError
from reportgen.floating import waterline_height
from reportgen.stability import GZCurve, area_mrad, crossings, require_heel_range

SET = "is2008.weather"
REF_2_3_1_2 = "IS Code 2008, Part A, 2.3.1.2"
REF_2_3_1_4 = "IS Code 2008, Part A, 2.3.1.4"

WIND_PRESSURE_N_M2 = 504.0  # P, 2.3.2.2
GRAVITY_M_S2 = 9.81  # g, 2.3.2.2
LW2_FACTOR = 1.5  # lw2 = 1.5·lw1, 2.3.2.3
THETA0_LIMIT_DEG = 16.0  # 2.3.1.2
DECK_EDGE_FRACTION = 0.8  # 2.3.1.2
THETA2_LIMIT_DEG = 50.0  # 2.3.2 (figure: θ2 = min(θf, 50°, θc))

# 2.3.4, tables 2.3.4-1 to 2.3.4-4: (argument, factor); linear between entries, constant
# beyond the ends (SPEC.md).
X1_TABLE = ((2.4, 1.00), (2.5, 0.98), (2.6, 0.96), (2.7, 0.95), (2.8, 0.93), (2.9, 0.91),
            (3.0, 0.90), (3.1, 0.88), (3.2, 0.86), (3.4, 0.82), (3.5, 0.80))  # by B/d
X2_TABLE = ((0.45, 0.75), (0.50, 0.82), (0.55, 0.89), (0.60, 0.95), (0.65, 0.97),
            (0.70, 1.00))  # by CB
K_TABLE = ((0.0, 1.00), (1.0, 0.98), (1.5, 0.95), (2.0, 0.88), (2.5, 0.79), (3.0, 0.74),
           (3.5, 0.72), (4.0, 0.70))  # by Ak·100/(L·B)
S_TABLE = ((6.0, 0.100), (7.0, 0.098), (8.0, 0.093), (12.0, 0.065), (14.0, 0.053),
           (16.0, 0.044), (18.0, 0.038), (20.0, 0.035))  # by T, s
K_SHARP_BILGE = 0.7  # 2.3.4: ship having sharp bilge
K_NO_KEELS = 1.0  # 2.3.4: round-bilged ship having no bilge or bar keels

# Range of the tables (SPEC.md; IS Code 2008 Part A 2.3 and MSC.1/Circ.1200).
B_OVER_D_LIMIT = 3.5
KG_D_RANGE = (-0.3, 0.5)
ROLL_PERIOD_LIMIT_S = 20.0


def _table(table: tuple[tuple[float, float], ...], x: float) -> float:
    arg, val = zip(*table, strict=True)
    return float(np.interp(x, arg, val))


def factor_x1(b_over_d: float) -> float:
    """X1 by B/d, IS Code 2008 2.3.4 table 2.3.4-1."""
    return _table(X1_TABLE, b_over_d)


def factor_x2(cb: float) -> float:
    """X2 by the block coefficient CB, IS Code 2008 2.3.4 table 2.3.4-2."""
    return _table(X2_TABLE, cb)


def factor_k(bilge: str, bilge_keel_area_m2: float, lwl_m: float, breadth_m: float) -> float:
    """k, IS Code 2008 2.3.4: 1.0 round bilge without bilge or bar keels, 0.7 sharp bilge,
    otherwise table 2.3.4-3 by Ak·100/(L·B), L the waterline length (m)."""
    if bilge == "sharp":
        return K_SHARP_BILGE
    if bilge_keel_area_m2 <= 0.0:
        return K_NO_KEELS
    return _table(K_TABLE, bilge_keel_area_m2 * 100.0 / (lwl_m * breadth_m))


def factor_s(roll_period_s: float) -> float:
    """s by the rolling period T (s), IS Code 2008 2.3.4 table 2.3.4-4."""
    return _table(S_TABLE, roll_period_s)


def factor_r(og_m: float, draft_m: float) -> float:
    """r = 0.73 + 0.6·OG/d, IS Code 2008 2.3.4."""
    return 0.73 + 0.6 * og_m / draft_m


def coefficient_c(breadth_m: float, draft_m: float, lwl_m: float) -> float:
    """C = 0.373 + 0.023·(B/d) − 0.043·(Lwl/100), IS Code 2008 2.3.4."""
    return 0.373 + 0.023 * (breadth_m / draft_m) - 0.043 * (lwl_m / 100.0)


def roll_period_s(c: float, breadth_m: float, gm_m: float) -> float:
    """T = 2·C·B/√GM (s), IS Code 2008 2.3.4; GM corrected for free surface."""
    return 2.0 * c * breadth_m / np.sqrt(gm_m)


def roll_angle_deg(k: float, x1: float, x2: float, r: float, s: float) -> float:
    """θ1 = 109·k·X1·X2·√(r·s) (deg), IS Code 2008 2.3.4."""
    return 109.0 * k * x1 * x2 * float(np.sqrt(r * s))


def wind_lever_m(pressure_n_m2: float, area_m2: float, lever_m: float,
                 displacement_t: float) -> float:
    """lw1 = P·A·Z/(1000·g·Δ) (m), IS Code 2008 2.3.2.2."""
    return pressure_n_m2 * area_m2 * lever_m / (1000.0 * GRAVITY_M_S2 * displacement_t)


@dataclass(frozen=True)
class Windage:
    """Lateral areas about the waterline: above (m², centroid z m) and below (None if empty)."""

    area_above_m2: float
    z_above_m: float
    area_below_m2: float
    z_below_m: float | None


def split_profile(profile: Polygon, draft_mid_m: float, trim: float, lpp_m: float) -> Windage:
    """Clip the lateral profile (x, z) at the trimmed waterline z = T_mid + t·(Lpp/2 − x)/Lpp
    (shapely intersection with the half-planes above and below the line)."""
    x0, z0, x1, z1 = profile.bounds
    xa, xb = x0 - 1.0, x1 + 1.0
    za, zb = (float(waterline_height(x, draft_mid_m, trim, lpp_m)) for x in (xa, xb))
    top = max(z1, za, zb) + 1.0
    bottom = min(z0, za, zb) - 1.0
    above = profile.intersection(Polygon([(xa, za), (xb, zb), (xb, top), (xa, top)]))
    below = profile.intersection(Polygon([(xa, bottom), (xb, bottom), (xb, zb), (xa, za)]))
    z_above = above.centroid.y if above.area > 0 else 0.0
    z_below = below.centroid.y if below.area > 0 else None
    return Windage(float(above.area), float(z_above), float(below.area),
                   None if z_below is None else float(z_below))


@dataclass(frozen=True)
class WeatherValues:
    """Every intermediate quantity of 2.3 (SPEC.md results "weather" plus the contract's
    extension keys). Angles deg; None where the quantity does not exist."""

    wind_pressure: float
    wind_area: float
    wind_z: float
    lever: float
    z_method: str
    lw1: float
    lw2: float
    theta0: float | None
    theta1: float | None
    theta1_formula: float | None
    roll_angle_source: str | None
    theta2: float | None
    thetac: float | None
    theta_lw2: float | None
    theta_start: float | None
    area_a: float | None
    area_b: float | None
    roll_period: float | None
    c: float
    s: float | None
    r: float
    og: float
    x1: float
    x2: float
    k: float
    b_over_d: float
    cb: float
    kg_over_d_minus_1: float

    def as_dict(self) -> dict:
        order = ["wind_pressure", "wind_area", "wind_z", "lw1", "lw2", "theta0", "theta1",
                 "theta2", "thetac", "area_a", "area_b", "roll_period", "c", "s", "r", "og",
                 "x1", "x2", "k", "lever", "z_method", "theta1_formula", "roll_angle_source",
                 "b_over_d", "cb", "kg_over_d_minus_1", "theta_lw2", "theta_start"]
        return {k: getattr(self, k) for k in order}


def weather_values(curve: GZCurve, *, profile: Polygon, item_wind: list[tuple[float, float]],
                   draft_mid_m: float, trim: float, lpp_m: float, breadth_m: float,
                   lwl_m: float, cb: float, displacement_t: float, kg_fluid_m: float,
                   gm_fluid_m: float, bilge: str, bilge_keel_area_m2: float,
                   flooding_deg: float, z_method: str, roll_angle: float | None,
                   roll_angle_source: str | None) -> tuple[WeatherValues, list[str]]:
    """The weather-criterion quantities and their warnings.

    curve: GZ towards the side of the list (deg -> m). item_wind: (area m², centroid z m) of
    items carrying windage. d is the mean moulded draught (at midships).
    """
    warnings: list[str] = []
    d = draft_mid_m
    # A and its centroid: the profile above the waterline plus the items' windage (2.3.2.2).
    wind = split_profile(profile, d, trim, lpp_m)
    areas = [wind.area_above_m2] + [a for a, _ in item_wind]
    moments = [wind.area_above_m2 * wind.z_above_m] + [a * z for a, z in item_wind]
    area = float(sum(areas))
    if area <= 0.0:
        raise InputError("windage.profile: no lateral area above the waterline")
    wind_z = float(sum(moments)) / area
    # Z: to half the mean draught, or to the centre of the underwater lateral area (2.3.2.2).
    if z_method == "underwater_centre":
        if wind.z_below_m is None:
            raise InputError("windage.profile: calculation.wind_lever is underwater_centre but "
                             "the profile has no area below the waterline")
        lever = wind_z - wind.z_below_m
    else:
        lever = wind_z - 0.5 * d
    lw1 = wind_lever_m(WIND_PRESSURE_N_M2, area, lever, displacement_t)
    lw2 = LW2_FACTOR * lw1

    # θ1 (2.3.4).
    b_over_d = breadth_m / d
    og = kg_fluid_m - d
    r = factor_r(og, d)
    c = coefficient_c(breadth_m, d, lwl_m)
    x1, x2 = factor_x1(b_over_d), factor_x2(cb)
    k = factor_k(bilge, bilge_keel_area_m2, lwl_m, breadth_m)
    if gm_fluid_m > 0.0:
        period = float(roll_period_s(c, breadth_m, gm_fluid_m))
        s = factor_s(period)
        theta1_formula = roll_angle_deg(k, x1, x2, r, s) if r * s >= 0 else None
    else:
        period, s, theta1_formula = None, None, None
    theta1 = roll_angle if roll_angle is not None else theta1_formula

    kg_d = kg_fluid_m / d - 1.0
    outside = []
    if b_over_d >= B_OVER_D_LIMIT:
        outside.append(f"B/d = {b_over_d:.2f} is not below {B_OVER_D_LIMIT:g}")
    if not KG_D_RANGE[0] <= kg_d <= KG_D_RANGE[1]:
        outside.append(f"KG/d − 1 = {kg_d:.3f} is outside {KG_D_RANGE[0]:g} to "
                       f"{KG_D_RANGE[1]:g}")
    if period is not None and period >= ROLL_PERIOD_LIMIT_S:
        outside.append(f"the roll period T = {period:.1f} s is not below "
                       f"{ROLL_PERIOD_LIMIT_S:g} s")
    if outside:
        tail = (f"θ1 is taken from the roll angle given ({roll_angle_source})."
                if roll_angle is not None else
                "Consider θ1 from model tests (MSC.1/Circ.1200), given as weather.roll_angle.")
        warnings.append("Weather criterion: " + "; ".join(outside) + ", outside the range the "
                        "roll-angle tables of IS Code 2008 Part A 2.3 were derived for. " + tail)

    # Intercepts with the wind levers (2.3.2, figure 2.3.1).
    top = curve.heel_max_deg
    up1 = crossings(curve, lw1, 0.0, top, "up")
    theta0 = up1[0] if up1 else None
    up2 = crossings(curve, lw2, 0.0, top, "up")
    theta_lw2 = up2[0] if up2 else None
    thetac = None
    if theta_lw2 is not None:
        down2 = crossings(curve, lw2, theta_lw2, top, "down")
        thetac = down2[0] if down2 else None
    theta2 = min(flooding_deg, THETA2_LIMIT_DEG, *( [thetac] if thetac is not None else []))

    theta_start = area_a = area_b = None
    if theta0 is not None and theta1 is not None:
        theta_start = theta0 - theta1
        if theta_lw2 is not None:
            require_heel_range(curve, theta_start, "angle of roll to windward θ0 − θ1")
            area_a = -area_mrad(curve, theta_start, theta_lw2, level_m=lw2)
            area_b = area_mrad(curve, theta_lw2, theta2, level_m=lw2) if theta2 > theta_lw2 \
                else 0.0
    if theta0 is None:
        warnings.append("Weather criterion: the GZ curve does not reach the wind heeling lever "
                        "lw1; there is no steady heel angle θ0.")

    values = WeatherValues(
        wind_pressure=WIND_PRESSURE_N_M2, wind_area=area, wind_z=wind_z, lever=lever,
        z_method=z_method, lw1=lw1, lw2=lw2, theta0=theta0, theta1=theta1,
        theta1_formula=theta1_formula, roll_angle_source=roll_angle_source, theta2=theta2,
        thetac=thetac, theta_lw2=theta_lw2, theta_start=theta_start, area_a=area_a,
        area_b=area_b, roll_period=period, c=c, s=s, r=r, og=og, x1=x1, x2=x2, k=k,
        b_over_d=b_over_d, cb=cb, kg_over_d_minus_1=kg_d)
    return values, warnings


def weather_heel(s: State) -> Check:
    """2.3.1.2: the steady heel θ0 under the steady wind ≤ 16° and ≤ 80 % of the angle of
    deck edge immersion."""
    required = min(THETA0_LIMIT_DEG, DECK_EDGE_FRACTION * s.deck_edge_deg)
    attained = s.weather.theta0
    passed = attained is not None and attained <= required
    return Check("weather_heel", "Steady heel under wind", REF_2_3_1_2, required, attained,
                 "deg", passed, SET, limit="at_most")


def weather_area(s: State) -> Check:
    """2.3.1.4: area b ≥ area a (required = a, attained = b)."""
    a, b = s.weather.area_a, s.weather.area_b
    passed = a is not None and b is not None and b >= a
    return Check("weather_area", "Wind and rolling, area b against area a", REF_2_3_1_4, a, b,
                 "m·rad", passed, SET)


def checks(s: State) -> list[Check]:
    return [weather_heel(s), weather_area(s)]
