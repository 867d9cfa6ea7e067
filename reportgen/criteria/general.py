"""IMO 2008 IS Code (resolution MSC.267(85)), Part A, 2.2: criteria regarding righting lever
curve properties. Areas in m·rad, levers in m, angles in degrees."""

from __future__ import annotations

from reportgen.criteria.core import Check, State, at_least
from reportgen.stability import area_mrad, max_gz

SET = "is2008.general"
REF_2_2_1 = "IS Code 2008, Part A, 2.2.1"
REF_2_2_2 = "IS Code 2008, Part A, 2.2.2"
REF_2_2_3 = "IS Code 2008, Part A, 2.2.3"
REF_2_2_4 = "IS Code 2008, Part A, 2.2.4"

AREA_0_30_MRAD = 0.055  # 2.2.1
AREA_0_40_MRAD = 0.090  # 2.2.1
AREA_30_40_MRAD = 0.030  # 2.2.1
GZ_30_M = 0.20  # 2.2.2
GZ_30_FROM_DEG = 30.0  # 2.2.2
GZ_MAX_ANGLE_DEG = 25.0  # 2.2.3
GM0_M = 0.15  # 2.2.4


def area_0_30(s: State) -> Check:
    """2.2.1: area under the GZ curve up to 30° ≥ 0.055 m·rad, to 30° whatever θf, as 2.2.1
    and SPEC.md write it (θf bounds the areas to 40° only). With θf below 30° the area from
    30° to θf is nil and area_30_40 fails, so such a ship never passes 2.2.1."""
    return at_least("area_0_30", "Area under GZ, 0° to 30°", REF_2_2_1, AREA_0_30_MRAD,
                    area_mrad(s.curve, 0.0, 30.0), "m·rad", SET)


def area_0_40(s: State) -> Check:
    """2.2.1: area up to 40° or the angle of flooding θf if less ≥ 0.090 m·rad."""
    end = min(40.0, s.flooding_deg)
    return at_least("area_0_40", "Area under GZ, 0° to 40° or to flooding", REF_2_2_1,
                    AREA_0_40_MRAD, area_mrad(s.curve, 0.0, end), "m·rad", SET)


def area_30_40(s: State) -> Check:
    """2.2.1: area between 30° and 40° or θf if less ≥ 0.030 m·rad (0 when θf ≤ 30°)."""
    end = min(40.0, s.flooding_deg)
    attained = area_mrad(s.curve, 30.0, end) if end > 30.0 else 0.0
    return at_least("area_30_40", "Area under GZ, 30° to 40° or to flooding", REF_2_2_1,
                    AREA_30_40_MRAD, attained, "m·rad", SET)


def gz_30(s: State) -> Check:
    """2.2.2: GZ ≥ 0.20 m at an angle of heel ≥ 30°; attained = the largest GZ from 30° to the
    end of the credited curve (θf when GZ beyond flooding is excluded); none when that end is
    below 30°."""
    end = s.credited_to_deg
    attained = max_gz(s.curve, GZ_30_FROM_DEG, end)[1] if end >= GZ_30_FROM_DEG else None
    return at_least("gz_30", "GZ at 30° or more", REF_2_2_2, GZ_30_M, attained, "m", SET)


def gz_max_angle(s: State) -> Check:
    """2.2.3: the maximum GZ occurs at an angle of heel ≥ 25° (on the credited curve)."""
    return at_least("gz_max_angle", "Angle of maximum GZ", REF_2_2_3, GZ_MAX_ANGLE_DEG,
                    s.gz_max_deg, "deg", SET)


def gm0(s: State) -> Check:
    """2.2.4: initial metacentric height GM0, corrected for free surface, ≥ 0.15 m."""
    return at_least("gm0", "Initial GM, corrected for free surface", REF_2_2_4, GM0_M,
                    s.gm_fluid_m, "m", SET)


def checks(s: State) -> list[Check]:
    return [area_0_30(s), area_0_40(s), area_30_40(s), gz_30(s), gz_max_angle(s), gm0(s)]
