"""IMO 2008 IS Code (resolution MSC.267(85)), Part A, 3.3: cargo ships carrying timber deck
cargoes. The three criteria of 3.3.2 that may be applied instead of 2.2.1 to 2.2.4 (SPEC.md,
`is2008.timber`). Areas in m·rad, levers in m, angles in degrees.

Conservative readings (stated on the sheet): the buoyancy of the deck cargo (Part A 3.3.3, up to
25 % permeability) is not credited, the cross curves being those of the hull alone; the
maximum GZ is taken on the credited curve (up to θf when GZ beyond flooding is excluded); the
GM limit of 0.10 m is applied to the condition as given (departure or arrival, with the
arrival's water absorption, reportgen.allowances).

Sources: the limits are those of SPEC.md and of the same criteria in the Code's predecessor,
resolution A.749(18) 4.1.3 (published text read: 0.08 m·rad to 40° or θf, maximum GZ 0.25 m);
the 2008 paragraph numbers 3.3.2.1 to 3.3.2.3 and the 2008 wording of the GM limit ("at all
times during a voyage ... not less than 0.1 m", which A.749(18) set for departure only) are
recalled from memory.
"""

from __future__ import annotations

from reportgen.criteria.core import Check, State, at_least
from reportgen.stability import area_mrad, max_gz

SET = "is2008.timber"
REF_3_3_2_1 = "IS Code 2008, Part A, 3.3.2.1"
REF_3_3_2_2 = "IS Code 2008, Part A, 3.3.2.2"
REF_3_3_2_3 = "IS Code 2008, Part A, 3.3.2.3"

AREA_0_40_MRAD = 0.08  # 3.3.2.1
GZ_MAX_M = 0.25  # 3.3.2.2
GM0_M = 0.10  # 3.3.2.3


def timber_area_0_40(s: State) -> Check:
    """3.3.2.1: area under the GZ curve up to 40° or θf if less ≥ 0.08 m·rad."""
    end = min(40.0, s.flooding_deg)
    return at_least("timber_area_0_40", "Area under GZ, 0° to 40° or to flooding (timber)",
                    REF_3_3_2_1, AREA_0_40_MRAD, area_mrad(s.curve, 0.0, end), "m·rad", SET)


def timber_gz_max(s: State) -> Check:
    """3.3.2.2: the maximum GZ ≥ 0.25 m (on the credited curve)."""
    attained = max_gz(s.curve, 0.0, s.credited_to_deg)[1]
    return at_least("timber_gz_max", "Maximum GZ (timber)", REF_3_3_2_2, GZ_MAX_M, attained,
                    "m", SET)


def timber_gm0(s: State) -> Check:
    """3.3.2.3: GM corrected for free surface (and, where appropriate, water absorption by the
    deck cargo and ice accretion) ≥ 0.10 m."""
    return at_least("timber_gm0", "Initial GM, corrected for free surface (timber)",
                    REF_3_3_2_3, GM0_M, s.gm_fluid_m, "m", SET)


def checks(s: State) -> list[Check]:
    return [timber_area_0_40(s), timber_gz_max(s), timber_gm0(s)]
