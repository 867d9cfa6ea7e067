"""Loading: lightship, tank fillings and items -> totals and free-surface moments.

Units throughout this module: mass t, lengths m (x from AP, y + starboard, z from base),
volume m³, density t/m³, moments of inertia m⁴, free-surface moments t·m, fillings in percent
of the tank's capacity (the last volume of its sounding table).

Tank properties come from the tank's even-keel sounding table by linear interpolation in the
sounding (common practice for pre-programmed tank tables: the table values are returned exactly
at the table rows, MSC.1/Circ.1229 "results from pre-programmed tables").

Free surface (IS Code 2008, Part B, 3.1 "Free surface effects"): the free-surface moment of a
slack tank is FSM = i · ρ (t·m), i the transverse moment of inertia of the free surface (m⁴).
`actual` takes i at the tank's filling, `maximum` the largest i of the tank's table.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Literal

import numpy as np

from reportgen.errors import InputError

if TYPE_CHECKING:
    from reportgen.inputs import Condition, Tank, Vessel


SLACK_TOLERANCE_PERCENT = 1e-9


@dataclass(frozen=True)
class TankTable:
    """A tank's sounding table as arrays: sounding m, volume m³, lcg/vcg/tcg m, fsi m⁴."""

    sounding: np.ndarray
    volume: np.ndarray
    lcg: np.ndarray
    vcg: np.ndarray
    tcg: np.ndarray
    fsi: np.ndarray

    @classmethod
    def from_columns(cls, *columns: list[float]) -> TankTable:
        """From the columns sounding, volume, lcg, vcg, tcg, fsi, in that order."""
        cols = [np.asarray(c, dtype=float) for c in columns]
        return cls(*cols)

    @property
    def capacity_m3(self) -> float:
        return float(self.volume[-1])


@dataclass(frozen=True)
class TankState:
    """A tank at one filling: sounding m, volume m³, percent of capacity, mass t, centre m,
    fsi_m4 at the filling and the largest fsi_max_m4 of the table."""

    sounding: float
    volume: float
    percent: float
    mass: float
    lcg: float
    vcg: float
    tcg: float
    fsi_m4: float
    fsi_max_m4: float


def sounding_from_volume(table: TankTable, volume_m3: float) -> float:
    """Sounding (m) at a volume (m³), inverse linear interpolation in the sounding table."""
    return float(np.interp(volume_m3, table.volume, table.sounding))


def volume_from_sounding(table: TankTable, sounding_m: float) -> float:
    """Volume (m³) at a sounding (m), linear interpolation in the sounding table."""
    return float(np.interp(sounding_m, table.sounding, table.volume))


def tank_state(table: TankTable, density_t_m3: float, kind: str, value: float,
               label: str = "tank") -> TankState:
    """The tank at a filling given as `kind` = percent | volume | sounding | mass.

    percent: of the capacity (m³); a mass (t) gives the volume mass/density, then the sounding.
    A filling outside the table raises InputError naming `label`.
    """
    cap = table.capacity_m3
    if kind == "percent":
        volume = value / 100.0 * cap
    elif kind == "volume":
        volume = value
    elif kind == "mass":
        volume = value / density_t_m3
    elif kind == "sounding":
        if not table.sounding[0] - 1e-9 <= value <= table.sounding[-1] + 1e-9:
            raise InputError(f"{label}: sounding {value:g} m is outside the tank's table "
                             f"({table.sounding[0]:g} to {table.sounding[-1]:g} m)")
        volume = volume_from_sounding(table, value)
    else:
        raise InputError(f"{label}: unknown kind of filling {kind!r}")
    if not table.volume[0] - 1e-9 <= volume <= cap * (1 + 1e-9) + 1e-9:
        raise InputError(f"{label}: {kind} {value:g} gives {volume:.3f} m³, outside the tank's "
                         f"table ({table.volume[0]:g} to {cap:g} m³)")
    sounding = value if kind == "sounding" else sounding_from_volume(table, volume)
    at = (sounding, table.sounding)
    return TankState(
        sounding=float(sounding),
        volume=float(volume),
        percent=float(100.0 * volume / cap),
        mass=float(volume * density_t_m3),
        lcg=float(np.interp(*at, table.lcg)),
        vcg=float(np.interp(*at, table.vcg)),
        tcg=float(np.interp(*at, table.tcg)),
        fsi_m4=float(np.interp(*at, table.fsi)),
        fsi_max_m4=float(np.max(table.fsi)),
    )


def is_slack(percent: float, slack_below_percent: float, slack_above_percent: float) -> bool:
    """A tank is slack unless filled below `slack_below_percent` or above `slack_above_percent`
    (vessel calculation settings, SPEC.md; defaults 2 % and 98 %). The limits hold to within
    SLACK_TOLERANCE_PERCENT, so a filling given as a mass or volume equal to a limit percentage
    is classed as that percentage is."""
    tol = SLACK_TOLERANCE_PERCENT
    return slack_below_percent - tol <= percent <= slack_above_percent + tol


def free_surface_moment(state: TankState, density_t_m3: float,
                        method: Literal["actual", "maximum"]) -> float:
    """FSM = i · ρ (t·m), IS Code 2008 Part B 3.1; i at the filling or the table's largest."""
    fsi = state.fsi_m4 if method == "actual" else state.fsi_max_m4
    return fsi * density_t_m3


@dataclass(frozen=True)
class Line:
    """One line of the loading table (the contract's loading.lines entry)."""

    kind: Literal["lightship", "tank", "item"]
    id: str | None
    name: str
    content: str | None
    percent: float | None
    sounding: float | None
    volume: float | None  # m³
    density: float | None  # t/m³
    mass: float  # t
    lcg: float  # m from AP
    vcg: float  # m above base
    tcg: float  # m, + starboard
    fsm: float  # t·m, 0 when not slack
    slack: bool | None

    def as_dict(self) -> dict:
        return dict(self.__dict__)


@dataclass(frozen=True)
class Totals:
    """Loading totals: masses t, centre of gravity m, total free-surface moment t·m."""

    lightship: float
    deadweight: float
    displacement: float
    lcg: float
    vcg: float
    tcg: float
    fsm: float


def totals(lines: list[Line]) -> Totals:
    """Δ = Σm; LCG, VCG, TCG = Σ(m·g)/Δ; FSM = Σ FSM (t·m); deadweight = Δ − lightship."""
    m = np.array([ln.mass for ln in lines])
    disp = float(m.sum())
    if disp <= 0:
        raise InputError("the condition has no displacement")
    light = float(sum(ln.mass for ln in lines if ln.kind == "lightship"))
    return Totals(
        lightship=light,
        deadweight=disp - light,
        displacement=disp,
        lcg=float(m @ np.array([ln.lcg for ln in lines]) / disp),
        vcg=float(m @ np.array([ln.vcg for ln in lines]) / disp),
        tcg=float(m @ np.array([ln.tcg for ln in lines]) / disp),
        fsm=float(sum(ln.fsm for ln in lines)),
    )


def lightship_line(mass: float, lcg: float, vcg: float, tcg: float) -> Line:
    return Line("lightship", None, "Lightship", None, None, None, None, None,
                float(mass), float(lcg), float(vcg), float(tcg), 0.0, None)


def item_line(name: str, mass: float, lcg: float, vcg: float, tcg: float) -> Line:
    return Line("item", None, name, None, None, None, None, None,
                float(mass), float(lcg), float(vcg), float(tcg), 0.0, None)


def tank_line(tank_id: str, name: str, content: str, density_t_m3: float, state: TankState,
              slack: bool, fsm: float) -> Line:
    return Line("tank", tank_id, name, content, state.percent, state.sounding, state.volume,
                float(density_t_m3), state.mass, state.lcg, state.vcg, state.tcg,
                float(fsm) if slack else 0.0, slack)


def condition_lines(vessel: Vessel, condition: Condition) -> list[Line]:
    """Loading lines of a condition: the lightship, every tank named in the condition (in the
    vessel's tank order), then the items in the condition's order."""
    ls = vessel.lightship
    lines = [lightship_line(ls.mass, ls.lcg, ls.vcg, ls.tcg)]
    calc = vessel.calculation
    for tank in vessel.tanks:
        filling = condition.tanks.get(tank.id)
        if filling is None:
            continue
        state = tank_state(tank_table(tank), tank.density, filling.kind, filling.value,
                           label=f"tanks.{tank.id}")
        slack = is_slack(state.percent, calc.slack_below_percent, calc.slack_above_percent)
        fsm = free_surface_moment(state, tank.density, condition.free_surface)
        lines.append(tank_line(tank.id, tank.name, tank.content, tank.density, state, slack, fsm))
    unknown = sorted(set(condition.tanks) - {t.id for t in vessel.tanks})
    if unknown:
        raise InputError(f"tanks: unknown tank {unknown[0]!r}")
    for it in condition.items:
        lines.append(item_line(it.name, it.mass, it.lcg, it.vcg, it.tcg))
    return lines


def tank_table(tank: Tank) -> TankTable:
    """The arrays of an inputs.Tank's sounding table."""
    t = tank.table
    return TankTable.from_columns(t.sounding, t.volume, t.lcg, t.vcg, t.tcg, t.fsi)
