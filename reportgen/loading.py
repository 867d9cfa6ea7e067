"""Loading: lightship, tank fillings and items -> loading lines and totals.

Units: mass t, lengths m (x from AP, y + starboard, z from base), volume m³, density t/m³,
moments of inertia m⁴, free-surface moments t·m, fillings in percent of the tank's capacity
(the last volume of its sounding table).

Tank properties come from the tank's even-keel sounding table by linear interpolation in the
sounding (common practice for pre-programmed tank tables: the table values are returned exactly
at the table rows, MSC.1/Circ.1229 "results from pre-programmed tables"). Which free surfaces
count is decided by reportgen.freesurface (IS Code 2008 Part B 3.1).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from math import isnan
from typing import TYPE_CHECKING, Literal, NamedTuple

import numpy as np

from reportgen.errors import InputError
from reportgen.interp import interp, interp_columns

if TYPE_CHECKING:  # imported where it is used (reportgen.freesurface)
    from reportgen.freesurface import TankSurface


@dataclass(frozen=True, eq=False)  # arrays: == has no truth value; compared by identity
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
        return cls(*(np.asarray(c, dtype=float) for c in columns))

    @cached_property
    def capacity_m3(self) -> float:
        return float(self.volume[-1])

    @cached_property
    def fsi_max_m4(self) -> float:
        """The largest free-surface inertia of the table, m⁴ (Part B 3.1.3.2)."""
        return float(np.max(self.fsi))

    @cached_property
    def as_lists(self) -> tuple[list[float], list[float], list[list[float]]]:
        """(sounding, volume, [lcg, vcg, tcg, fsi]) as lists, for reportgen.interp."""
        return (self.sounding.tolist(), self.volume.tolist(),
                [c.tolist() for c in (self.lcg, self.vcg, self.tcg, self.fsi)])


class TankState(NamedTuple):  # an immutable record, made at every tank of every condition
    """A tank at one filling: sounding m, volume m³, percent of capacity, mass t, centre m,
    fsi_m4 at the filling."""

    sounding: float
    volume: float
    percent: float
    mass: float
    lcg: float
    vcg: float
    tcg: float
    fsi_m4: float


def sounding_from_ullage(ullage_m: float, ullage_reference_m: float) -> float:
    """Sounding = reference height − ullage (m): the ullage is measured down from the
    reference point (ullage_reference, m above the sounding zero) to the liquid."""
    return ullage_reference_m - ullage_m


def tank_volume(table: TankTable, density_t_m3: float, kind: str, value: float,
                ullage_reference_m: float | None, label: str) -> tuple[float, float]:
    """(volume m³, sounding m or nan) of a filling given as `kind` = percent | volume |
    sounding | ullage | mass; InputError naming `label` when it lies outside the table."""
    sounding = float("nan")
    if kind == "percent":
        volume = value / 100.0 * table.capacity_m3
    elif kind == "volume":
        volume = value
    elif kind == "mass":
        volume = value / density_t_m3
    else:
        sounding = value if kind == "sounding" else sounding_from_ullage(value,
                                                                         ullage_reference_m)
        lo, hi = float(table.sounding[0]), float(table.sounding[-1])
        if not lo - 1e-9 <= sounding <= hi + 1e-9:
            given = (f"sounding {value:g} m" if kind == "sounding" else
                     f"ullage {value:g} m (sounding {sounding:.3f} m)")
            raise InputError(f"{label}: {given} is outside the tank's sounding table "
                             f"({lo:g} to {hi:g} m)")
        volume = interp(sounding, *table.as_lists[:2])
    cap = table.capacity_m3
    if not table.volume[0] - 1e-9 <= volume <= cap * (1 + 1e-9) + 1e-9:
        raise InputError(f"{label}: {kind} {value:g} gives {volume:.3f} m³, outside the tank's "
                         f"table ({table.volume[0]:g} to {cap:g} m³)")
    return volume, sounding


def tank_state(table: TankTable, density_t_m3: float, kind: str, value: float,
               ullage_reference_m: float | None = None, label: str = "tank") -> TankState:
    """The tank at a filling (see tank_volume); the sounding follows from the volume by
    inverse interpolation, and the centres and fsi at that sounding."""
    volume, sounding = tank_volume(table, density_t_m3, kind, value, ullage_reference_m, label)
    soundings, volumes, columns = table.as_lists
    if isnan(sounding):
        sounding = interp(volume, volumes, soundings)
    lcg, vcg, tcg, fsi = interp_columns(sounding, soundings, columns)
    return TankState(
        sounding=float(sounding),
        volume=float(volume),
        percent=float(100.0 * volume / table.capacity_m3),
        mass=float(volume * density_t_m3),
        lcg=lcg, vcg=vcg, tcg=tcg, fsi_m4=fsi,
    )


class Line(NamedTuple):  # an immutable record (a NamedTuple: made several times a condition)
    """One line of the loading table (the results' loading.lines entry).

    fsm: the free-surface moment counted for the line, t·m; fs_basis: why it counts
    (reportgen.freesurface reasons) or None; slack: whether the tank is slack.
    """

    kind: Literal["lightship", "tank", "item", "grain", "allowance"]
    id: str | None
    name: str
    content: str | None
    percent: float | None
    sounding: float | None  # m
    ullage: float | None  # m, when the filling was given by ullage
    volume: float | None  # m³
    density: float | None  # t/m³
    mass: float  # t
    lcg: float  # m from AP
    vcg: float  # m above base
    tcg: float  # m, + starboard
    fsm: float  # t·m
    slack: bool | None
    fs_basis: str | None = None
    role: str | None = None  # fixed | consumable (tanks)


@dataclass(frozen=True)
class Centre:
    """Mass (t), centre of gravity (m; None without mass) and free-surface moment (t·m)."""

    mass: float
    lcg: float | None
    vcg: float | None
    tcg: float | None
    fsm: float


def _masses(lines: list[Line]) -> tuple[np.ndarray, float]:
    """The lines' masses (t) as an array, and Σm."""
    m = np.array([ln.mass for ln in lines], dtype=float)
    return m, float(m.sum())


def centre_of(lines: list[Line]) -> Centre:
    """Σm and the mass-weighted centre Σ(m·g)/Σm of lines (the moment sum); ΣFSM."""
    m, mass = _masses(lines)
    fsm = float(sum(ln.fsm for ln in lines))
    if mass <= 0.0:
        return Centre(mass, None, None, None, fsm)
    g = np.array([[ln.lcg, ln.vcg, ln.tcg] for ln in lines], dtype=float)
    lcg, vcg, tcg = (m @ g) / mass
    return Centre(mass, float(lcg), float(vcg), float(tcg), fsm)


@dataclass(frozen=True)
class Totals:
    """Loading totals: masses t, centre of gravity m, total free-surface moment t·m; and the
    deadweight's own centre."""

    lightship: float
    deadweight: Centre
    displacement: float
    lcg: float
    vcg: float
    tcg: float
    fsm: float


def totals(lines: list[Line]) -> Totals:
    """Δ = Σm; LCG, VCG, TCG = Σ(m·g)/Δ; FSM = ΣFSM (t·m); deadweight = Δ − lightship."""
    whole = centre_of(lines)
    if whole.lcg is None:
        raise InputError("the condition has no displacement")
    _, light = _masses([ln for ln in lines if ln.kind == "lightship"])
    return Totals(light, centre_of([ln for ln in lines if ln.kind != "lightship"]),
                  whole.mass, whole.lcg, whole.vcg, whole.tcg, whole.fsm)


def lightship_line(mass: float, lcg: float, vcg: float, tcg: float) -> Line:
    return Line("lightship", None, "Lightship", None, None, None, None, None, None,
                float(mass), float(lcg), float(vcg), float(tcg), 0.0, None)


def item_line(name: str, mass: float, lcg: float, vcg: float, tcg: float,
              content: str | None = None) -> Line:
    return Line("item", None, name, content, None, None, None, None, None,
                float(mass), float(lcg), float(vcg), float(tcg), 0.0, None)


def grain_line(compartment_id: str, name: str, volume_m3: float, stowage_factor_m3_t: float,
               mass: float, lcg: float, vcg: float) -> Line:
    """A grain compartment's line: its bulk density 1/SF (t/m³), on the centreline, with no
    free-surface moment (the grain's shift is the heeling arm of the Grain Code, A 7)."""
    return Line("grain", compartment_id, name, "grain", None, None, None, float(volume_m3),
                1.0 / stowage_factor_m3_t, float(mass), float(lcg), float(vcg), 0.0, 0.0, None)


def tank_line(tank_id: str, name: str, content: str, role: str, density_t_m3: float,
              state: TankState, ullage: float | None, slack: bool, fsm: float,
              fs_basis: str | None) -> Line:
    return Line("tank", tank_id, name, content, state.percent, state.sounding, ullage,
                state.volume, float(density_t_m3), state.mass, state.lcg, state.vcg,
                state.tcg, float(fsm), slack, fs_basis, role)


# --- the condition's loading (reads the file models) -------------------------------------------


@dataclass(frozen=True)
class Loading:
    """The loading of a condition: its lines, totals and the free surfaces counted."""

    lines: tuple[Line, ...]
    totals: Totals
    counted: tuple  # reportgen.freesurface.Counted, in the vessel's tank order
    rule: str  # code | actual | maximum


@dataclass(frozen=True, eq=False)  # holds arrays: compared by identity
class VesselTank:
    """A tank of the vessel as the loading reads it, made once per vessel
    (reportgen.vesseldata): its file facts, its table, and its free surface and state when a
    condition leaves it empty (reportgen.freesurface.TankSurface; the state made when first
    needed, as a table that does not start at 0 m³ refuses it)."""

    id: str
    name: str
    content: str
    role: str  # fixed | consumable (the tank's role, or its content's default)
    pair: str | None
    density: float  # t/m³
    ullage_reference: float | None  # m
    table: TankTable
    empty_surface: TankSurface  # at 0 %

    @cached_property
    def empty_state(self) -> TankState:
        return tank_state(self.table, self.density, "volume", 0.0)


def vessel_tank(tank, table: TankTable) -> VesselTank:
    """The VesselTank of a vessel file's tank model and its table's arrays."""
    from reportgen.freesurface import TankSurface

    role, density = tank.fs_role, tank.density
    return VesselTank(tank.id, tank.name, tank.content, role, tank.pair, density,
                      tank.ullage_reference, table,
                      TankSurface(tank.id, tank.content, role, tank.pair, 0.0, 0.0 * density,
                                  table.fsi_max_m4 * density))


def condition_loading(vessel, condition, tanks: tuple[VesselTank, ...]) -> Loading:
    """Loading lines of a condition: the lightship, every tank named in the condition or whose
    free surface counts (in the vessel's tank order), then the items in the condition's order.

    vessel, condition: reportgen.inputs models; tanks: the vessel's tanks (vessel_tank), in
    the vessel's order.
    """
    from reportgen.freesurface import TankSurface, counted_tanks, is_slack

    full = vessel.calculation.full_percent
    states: dict[str, tuple[TankState, float, float | None]] = {}
    surfaces: list[TankSurface] = []
    fillings = condition.tanks
    for t in tanks:
        filling = fillings.get(t.id)
        if filling is None:
            surfaces.append(t.empty_surface)
            continue
        density = filling.density if filling.density is not None else t.density
        kind = filling.kind
        value = getattr(filling, kind)
        state = tank_state(t.table, density, kind, value, t.ullage_reference,
                           label=f"tanks.{t.id}")
        states[t.id] = (state, density, value if kind == "ullage" else None)
        surfaces.append(TankSurface(t.id, t.content, t.role, t.pair, state.percent,
                                    state.fsi_m4 * density, t.table.fsi_max_m4 * density))
    counted = {c.id: c for c in counted_tanks(surfaces, condition.free_surface, full)}

    ls = vessel.lightship
    lines = [lightship_line(ls.mass, ls.lcg, ls.vcg, ls.tcg)]
    for t in tanks:
        if t.id in states:
            state, density, ullage = states[t.id]
        elif t.id in counted:  # empty, but its free surface counts (Part B 3.1.4, or maximum)
            state, density, ullage = t.empty_state, t.density, None
        else:
            continue
        c = counted.get(t.id)
        lines.append(tank_line(t.id, t.name, t.content, t.role, density, state, ullage,
                               is_slack(state.percent, full),
                               c.fsm_tm if c else 0.0, c.reason if c else None))
    if condition.grain is not None:  # the grain modules are imported only for grain
        from reportgen.grainload import grain_cargo

        cargo = grain_cargo(vessel, condition)
        for g in cargo.loads:
            lines.append(grain_line(g.id, g.name, g.volume, cargo.stowage_factor, g.mass,
                                    g.lcg, g.vcg))
    for it in condition.items:
        lines.append(item_line(it.name, it.mass, it.lcg, it.vcg, it.tcg))
    return Loading(tuple(lines), totals(lines), tuple(counted.values()),
                   condition.free_surface)
