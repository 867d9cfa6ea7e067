"""The package's appendix: the vessel data every condition rests on, laid out as a stability
booklet prints them (hydrostatic table per trim, cross curves per trim, tank capacities).

Values only: the numbers are the vessel file's own, read back from the model; the tank
capacity is the last row of each sounding table (the tank full) and the largest free-surface
moment is the largest FSI of the table times the tank's density (IS Code 2008 Part B 3.1:
FSM = ρ·i, t·m with ρ in t/m³ and i in m⁴). The words are in templates/package.html.j2.
"""

from __future__ import annotations

from typing import Any

from reportgen.inputs.vessel import rows_of

HYDRO_COLUMNS = ("displacement", "lcb", "lcf", "kmt", "mct", "tpc")


def hydrostatic_tables(vessel: Any) -> list[dict]:
    """One table per trim of the hydrostatic table: {"trim" (m or None), "rows": [{draft,
    displacement, lcb, lcf, kmt, mct, tpc}]}."""
    h = vessel.hydrostatics
    trims = h.trims or [None]
    columns = {name: rows_of(getattr(h, name), len(trims)) for name in HYDRO_COLUMNS}
    return [{"trim": trim,
             "rows": [dict({"draft": float(d)}, **{name: float(columns[name][k][i])
                                                   for name in HYDRO_COLUMNS})
                      for i, d in enumerate(h.draft)]}
            for k, trim in enumerate(trims)]


def cross_curve_tables(vessel: Any) -> list[dict]:
    """One table per trim of the cross curves: {"trim", "heel": [deg], "rows":
    [{"displacement", "kn": [m per heel]}]}."""
    cc = vessel.cross_curves
    tables = [cc.kn] if cc.trims is None else cc.kn
    trims = cc.trims or [None]
    return [{"trim": trim, "heel": [float(x) for x in cc.heel],
             "rows": [{"displacement": float(disp), "kn": [float(x) for x in row]}
                      for disp, row in zip(cc.displacement, table, strict=True)]}
            for trim, table in zip(trims, tables, strict=True)]


def tank_capacities(vessel: Any) -> list[dict]:
    """Each tank full: volume (m³), mass at its density (t), LCG, VCG, TCG (m), and its
    largest free-surface moment (t·m)."""
    out = []
    for tank in vessel.tanks:
        t = tank.table
        out.append({"id": tank.id, "name": tank.name, "content": tank.content,
                    "density": tank.density, "volume": t.volume[-1],
                    "mass": t.volume[-1] * tank.density, "lcg": t.lcg[-1], "vcg": t.vcg[-1],
                    "tcg": t.tcg[-1], "fsm_max": max(t.fsi) * tank.density})
    return out


def vessel_appendix(vessel: Any) -> dict:
    """The appendix tables (an empty list for a table the vessel file does not give)."""
    return {
        "hydrostatics": hydrostatic_tables(vessel) if vessel.hydrostatics else [],
        "cross_curves": cross_curve_tables(vessel) if vessel.cross_curves else [],
        "tanks": tank_capacities(vessel),
        "density": vessel.hydrostatics.density if vessel.hydrostatics else None,
        "cross_curves_trim": vessel.cross_curves.trim if vessel.cross_curves else None,
    }
