"""The load line in the condition's water: fresh water and dock water allowances, the
permissible midships draught, and the deadweight still available to the marks.

Units: draughts m, allowances mm in the formulas and m in the results, masses t, TPC t/cm,
densities t/m³.

FWA = Δs/(4·TPCs) mm, Δs and TPCs the displacement (t) and TPC (t/cm) in salt water at the
summer load line draught (International Convention on Load Lines, 1966, Annex I, regulation
40(4); the fresh water allowance of common practice). DWA = FWA·(1.025 − ρ)/0.025 for water of
density ρ, the dock water allowance of common practice (linear between salt water 1.025 and
fresh water 1.000 t/m³). The permissible midships draught = summer draught + DWA.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

SALT_WATER_T_M3 = 1.025
FRESH_WATER_T_M3 = 1.000


def fresh_water_allowance_mm(displacement_summer_t: float, tpc_summer_t_cm: float) -> float:
    """FWA = Δs/(4·TPCs) mm (Load Line Convention 1966, Annex I, reg. 40(4))."""
    return displacement_summer_t / (4.0 * tpc_summer_t_cm)


def dock_water_allowance_mm(fwa_mm: float, density_t_m3: float) -> float:
    """DWA = FWA·(1.025 − ρ)/0.025 mm (common practice; zero in salt water, FWA in fresh)."""
    return fwa_mm * (SALT_WATER_T_M3 - density_t_m3) / (SALT_WATER_T_M3 - FRESH_WATER_T_M3)


@dataclass(frozen=True)
class LoadLine:
    summer_draft: float  # m, moulded
    fwa: float  # m
    dwa: float  # m
    permissible_draft: float  # m, moulded, at midships in the condition's water
    deadweight_to_marks: float  # t: what may still be loaded before the permissible draught
    overloaded: bool


def load_line(summer_draft_m: float, displacement_summer_t: float, tpc_summer_t_cm: float,
              density_t_m3: float, draft_mid_m: float, tpc_t_cm: float) -> LoadLine:
    """The load line of a condition floating at `draft_mid_m` (m) in water of `density_t_m3`
    with TPC `tpc_t_cm` there. Overloaded when the midships draught exceeds the permissible
    one by at least 1 mm (the draughts compared in whole millimetres)."""
    fwa = fresh_water_allowance_mm(displacement_summer_t, tpc_summer_t_cm)
    dwa = dock_water_allowance_mm(fwa, density_t_m3)
    permissible = summer_draft_m + dwa / 1000.0
    spare_cm = (permissible - draft_mid_m) * 100.0
    over = round(draft_mid_m * 1000.0) > round(permissible * 1000.0)
    return LoadLine(summer_draft_m, fwa / 1000.0, dwa / 1000.0, permissible,
                    float(spare_cm * tpc_t_cm), over)


def summer_row(draft: np.ndarray, displacement: np.ndarray, tpc: np.ndarray,
               summer_draft_m: float) -> tuple[float, float]:
    """(Δs t, TPCs t/cm) read from an even-keel table row at the summer draught."""
    return (float(np.interp(summer_draft_m, draft, displacement)),
            float(np.interp(summer_draft_m, draft, tpc)))
