"""The two input files (SPEC.md): models, validation and loading.

Every problem found here is raised as `InputError` with one message naming the file, the key
path and, where YAML gives it, the line. Units are those of SPEC.md: t, m, t/m³, deg, m², m⁴.
"""

from __future__ import annotations

import datetime as _dt
import hashlib
from dataclasses import dataclass
from pathlib import Path
from typing import Annotated, Any, Literal

import numpy as np
import yaml
from pydantic import (
    AfterValidator,
    BaseModel,
    BeforeValidator,
    ConfigDict,
    Field,
    ValidationError,
    model_validator,
)
from shapely.geometry import Polygon

from reportgen.errors import InputError
from reportgen.files import read_input

VESSEL_FORMAT = "reportgen/vessel-1"
CONDITION_FORMAT = "reportgen/condition-1"


# --- field types -------------------------------------------------------------------------------


def _strictly_increasing(values: list[float]) -> list[float]:
    if len(values) < 2:
        raise ValueError("needs at least two rows")
    steps = np.diff(np.asarray(values, dtype=float))
    if np.any(steps <= 0):
        i = int(np.argmax(steps <= 0))
        raise ValueError(f"must be strictly increasing (row {i + 1}: {values[i]}, row {i + 2}: "
                         f"{values[i + 1]})")
    return values


def _finite(value: float) -> float:
    if not np.isfinite(value):
        raise ValueError("must be a finite number")
    return value


def _to_iso_date(value: Any) -> Any:
    if isinstance(value, _dt.datetime):
        return value.date().isoformat()
    if isinstance(value, _dt.date):
        return value.isoformat()
    return value


Num = Annotated[float, AfterValidator(_finite)]
Positive = Annotated[float, Field(gt=0), AfterValidator(_finite)]
NonNegative = Annotated[float, Field(ge=0), AfterValidator(_finite)]
Density = Annotated[float, Field(ge=0.5, le=2.5)]
WaterDensity = Annotated[float, Field(ge=0.99, le=1.05)]
Column = list[Num]
Increasing = Annotated[list[Num], AfterValidator(_strictly_increasing)]
IsoDate = Annotated[str, BeforeValidator(_to_iso_date)]
Text = Annotated[str, Field(min_length=1)]


class _Model(BaseModel):
    model_config = ConfigDict(extra="forbid", strict=True, frozen=True)


def _equal_lengths(model: BaseModel, names: list[str]) -> None:
    lengths = {n: len(getattr(model, n)) for n in names if getattr(model, n) is not None}
    if len(set(lengths.values())) > 1:
        listed = ", ".join(f"{n}: {k}" for n, k in lengths.items())
        raise ValueError(f"columns must have the same number of rows ({listed})")


# --- vessel data file --------------------------------------------------------------------------


class VesselId(_Model):
    name: Text
    identifier: Text
    type: Text = "cargo"


class Particulars(_Model):
    length_bp: Positive  # Lpp, m
    breadth: Positive  # moulded B, m
    depth: Positive  # moulded depth to the freeboard deck at side, m
    summer_draft: Positive  # moulded summer load line draught, m
    keel_thickness: NonNegative = 0.0  # m
    bilge: Literal["round", "sharp"] = "round"
    bilge_keel_area: NonNegative = 0.0  # Ak, m²

    @model_validator(mode="after")
    def _draft_below_depth(self) -> Particulars:
        if self.summer_draft >= self.depth:
            raise ValueError("summer_draft must be less than depth")
        return self


class Lightship(_Model):
    mass: Positive  # t
    lcg: Num  # m from AP
    vcg: Num  # m above base
    tcg: Num = 0.0  # m, + starboard


class Hydrostatics(_Model):
    density: Density = 1.025  # t/m³, the density the table was made at
    draft: Increasing  # moulded, m
    displacement: Increasing  # t
    lcb: Column
    lcf: Column
    kmt: list[Positive]
    mct: list[Positive]  # t·m/cm
    tpc: list[Positive]  # t/cm
    lwl: list[Positive] | None = None
    cb: list[Annotated[float, Field(gt=0, le=1)]] | None = None

    @model_validator(mode="after")
    def _rows(self) -> Hydrostatics:
        _equal_lengths(self, ["draft", "displacement", "lcb", "lcf", "kmt", "mct", "tpc", "lwl",
                              "cb"])
        if self.draft[0] < 0:
            raise ValueError("draft must not be negative")
        return self


class CrossCurves(_Model):
    trim: Literal["free", "even_keel"]
    heel: Increasing  # deg
    displacement: Increasing  # t
    kn: list[Column]  # m, kn[i][j] at displacement[i], heel[j]

    @model_validator(mode="after")
    def _shape(self) -> CrossCurves:
        if self.heel[0] != 0:
            raise ValueError("heel must start at 0 (negative heels follow by symmetry)")
        if self.heel[-1] < 60 or self.heel[-1] > 90:
            raise ValueError("heel must reach at least 60 deg and not exceed 90 deg")
        if len(self.kn) != len(self.displacement):
            raise ValueError(f"kn has {len(self.kn)} rows, displacement has "
                             f"{len(self.displacement)}: one row per displacement")
        for i, row in enumerate(self.kn):
            if len(row) != len(self.heel):
                raise ValueError(f"kn row {i + 1} has {len(row)} values, heel has "
                                 f"{len(self.heel)}: one value per heel")
        return self


class AngleTable(_Model):
    displacement: Increasing  # t
    angle: list[Annotated[float, Field(gt=0, le=90)]]  # deg

    @model_validator(mode="after")
    def _rows(self) -> AngleTable:
        _equal_lengths(self, ["displacement", "angle"])
        return self


class Opening(_Model):
    name: Text
    x: Num  # m from AP
    y: Num  # m from centreline, + starboard
    z: Num  # m above base


class Windage(_Model):
    profile: list[Annotated[list[Num], Field(min_length=2, max_length=2)]]  # [x, z], m

    @model_validator(mode="after")
    def _polygon(self) -> Windage:
        if len(self.profile) < 3:
            raise ValueError("profile needs at least three points")
        poly = Polygon(self.profile)
        if not poly.is_valid or poly.area <= 0:
            raise ValueError("profile must be a simple closed polygon with positive area")
        return self


class TankTable(_Model):
    sounding: Increasing  # m
    volume: Increasing  # m³
    lcg: Column  # m from AP
    vcg: Column  # m above base
    tcg: Column  # m, + starboard
    fsi: list[NonNegative]  # m⁴

    @model_validator(mode="after")
    def _rows(self) -> TankTable:
        _equal_lengths(self, ["sounding", "volume", "lcg", "vcg", "tcg", "fsi"])
        if self.volume[0] < 0:
            raise ValueError("volume must not be negative")
        return self


class Tank(_Model):
    id: Text
    name: Text
    content: Text
    density: Density  # t/m³
    table: TankTable


class Station(_Model):
    x: Num  # m from AP
    points: list[Annotated[list[Num], Field(min_length=2, max_length=2)]]  # [y, z], m

    @model_validator(mode="after")
    def _offsets(self) -> Station:
        pts = np.asarray(self.points, dtype=float).reshape(-1, 2)
        if len(pts) < 2:
            raise ValueError("a station needs at least two points (keel to deck edge)")
        if np.any(pts[:, 0] < 0):
            raise ValueError("half-breadths y must not be negative (starboard half-section)")
        if np.any(np.diff(pts[:, 1]) < 0):
            raise ValueError("points must run from the keel to the deck edge, z not decreasing")
        return self


class HullOffsets(_Model):
    density: Density = 1.025  # t/m³, for the tables made from the offsets
    stations: list[Station]

    @model_validator(mode="after")
    def _stations(self) -> HullOffsets:
        if len(self.stations) < 3:
            raise ValueError("needs at least three stations")
        _strictly_increasing([s.x for s in self.stations])
        return self


class Calculation(_Model):
    slack_below_percent: Annotated[float, Field(ge=0, lt=50)] = 2.0
    slack_above_percent: Annotated[float, Field(gt=50, le=100)] = 98.0
    wind_lever: Literal["half_draft", "underwater_centre"] = "half_draft"


def _known_sets(values: list[str]) -> list[str]:
    from reportgen.criteria import criteria_sets

    known = criteria_sets()
    if not values:
        raise ValueError("choose at least one criteria set")
    for v in values:
        if v not in known:
            raise ValueError(f"unknown criteria set {v!r}; known: {', '.join(known)}")
    if len(set(values)) != len(values):
        raise ValueError("a criteria set is listed twice")
    return values


class Vessel(_Model):
    format: Literal["reportgen/vessel-1"]
    vessel: VesselId
    particulars: Particulars
    lightship: Lightship
    hydrostatics: Hydrostatics | None = None
    cross_curves: CrossCurves | None = None
    deck_edge: AngleTable | None = None
    openings: list[Opening] = []
    flooding_angle: AngleTable | None = None
    windage: Windage
    tanks: list[Tank] = []
    criteria: Annotated[list[str], AfterValidator(_known_sets)]
    hull: HullOffsets | None = None
    calculation: Calculation = Calculation()
    notes: Any = None

    @model_validator(mode="after")
    def _whole(self) -> Vessel:
        has_tables = self.hydrostatics is not None and self.cross_curves is not None
        if (self.hydrostatics is None) != (self.cross_curves is None):
            raise ValueError("hydrostatics and cross_curves go together: give both or neither")
        if not has_tables and self.hull is None:
            raise ValueError("give hydrostatics with cross_curves, or hull offsets")
        ids = [t.id for t in self.tanks]
        dup = sorted({i for i in ids if ids.count(i) > 1})
        if dup:
            raise ValueError(f"tank id listed twice: {', '.join(dup)}")
        return self

    @property
    def has_tables(self) -> bool:
        return self.hydrostatics is not None and self.cross_curves is not None


# --- condition file ----------------------------------------------------------------------------


class ConditionInfo(_Model):
    title: Text
    voyage: str | None = None
    date: IsoDate | None = None
    water_density: WaterDensity = 1.025  # t/m³


class Filling(_Model):
    percent: Annotated[float, Field(ge=0, le=100)] | None = None  # of the tank's capacity
    volume: NonNegative | None = None  # m³
    sounding: NonNegative | None = None  # m
    mass: NonNegative | None = None  # t

    @model_validator(mode="after")
    def _exactly_one(self) -> Filling:
        given = [k for k in ("percent", "volume", "sounding", "mass") if getattr(self, k) is not None]
        if len(given) != 1:
            raise ValueError("give exactly one of percent, volume, sounding or mass"
                             + (f" (given: {', '.join(given)})" if given else ""))
        return self

    @property
    def kind(self) -> str:
        return next(k for k in ("percent", "volume", "sounding", "mass")
                    if getattr(self, k) is not None)

    @property
    def value(self) -> float:
        return getattr(self, self.kind)


class Item(_Model):
    name: Text
    mass: Positive  # t
    lcg: Num  # m from AP
    vcg: Num  # m above base
    tcg: Num = 0.0  # m, + starboard
    wind_area: NonNegative | None = None  # m², adds to the lateral windage
    wind_z: Num | None = None  # m, centroid of wind_area above base

    @model_validator(mode="after")
    def _wind(self) -> Item:
        if self.wind_area and self.wind_z is None:
            raise ValueError("wind_area needs wind_z (its centroid above base, m)")
        return self


class Weather(_Model):
    roll_angle: Annotated[float, Field(gt=0, le=60)] | None = None  # θ1, deg
    roll_angle_source: Text | None = None

    @model_validator(mode="after")
    def _source(self) -> Weather:
        if self.roll_angle is not None and self.roll_angle_source is None:
            raise ValueError("roll_angle needs roll_angle_source (the report it comes from)")
        if self.roll_angle is None and self.roll_angle_source is not None:
            raise ValueError("roll_angle_source is given without roll_angle")
        return self


class Signatories(_Model):
    prepared_by: str | None = None
    checked_by: str | None = None
    reviewed_by: str | None = None


class Condition(_Model):
    format: Literal["reportgen/condition-1"]
    vessel: Text  # path of the vessel data file, relative to the condition file
    condition: ConditionInfo
    tanks: dict[str, Filling] = {}
    items: list[Item]
    free_surface: Literal["actual", "maximum"] = "actual"
    weather: Weather | None = None
    signatories: Signatories | None = None
    notes: Any = None


# --- YAML with line numbers --------------------------------------------------------------------


def _parse_yaml(text: str, name: str) -> tuple[Any, dict[tuple, int]]:
    """YAML data and the 1-based line of every key path; duplicate keys are refused."""
    loader = yaml.CSafeLoader(text) if hasattr(yaml, "CSafeLoader") else yaml.SafeLoader(text)
    try:
        node = loader.get_single_node()
        lines: dict[tuple, int] = {}
        if node is not None:
            _walk(node, (), lines, name)
        data = loader.construct_document(node) if node is not None else None
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        where = f" (line {mark.line + 1}, column {mark.column + 1})" if mark else ""
        raise InputError(f"{name}: not valid YAML{where}: {exc.problem or exc}") from None
    except yaml.YAMLError as exc:
        raise InputError(f"{name}: not valid YAML: {exc}") from None
    finally:
        loader.dispose()
    return data, lines


def _walk(node: yaml.Node, path: tuple, lines: dict[tuple, int], name: str) -> None:
    lines[path] = node.start_mark.line + 1
    if isinstance(node, yaml.MappingNode):
        seen: dict[Any, int] = {}
        for key_node, value_node in node.value:
            key = key_node.value
            line = key_node.start_mark.line + 1
            if key in seen:
                where = ".".join(str(p) for p in (*path, key))
                raise InputError(f"{name}: {where} (line {line}): key given twice "
                                 f"(first on line {seen[key]})")
            seen[key] = line
            _walk(value_node, (*path, key), lines, name)
            lines[(*path, key)] = line
    elif isinstance(node, yaml.SequenceNode):
        for i, item in enumerate(node.value):
            _walk(item, (*path, i), lines, name)


def _where(path: tuple, lines: dict[tuple, int]) -> str:
    """'a.b[2].c (line 7)' for a key path, with the line of the deepest known prefix."""
    text = ""
    for p in path:
        text += f"[{p}]" if isinstance(p, int) else (f".{p}" if text else str(p))
    for k in range(len(path), -1, -1):
        if path[:k] in lines:
            return f"{text or '(top level)'} (line {lines[path[:k]]})"
    return text or "(top level)"


def _validate(model: type[_Model], data: Any, name: str, lines: dict[tuple, int]) -> Any:
    expected = model.model_fields["format"].annotation.__args__[0]
    if not isinstance(data, dict):
        raise InputError(f"{name}: expected a YAML mapping starting with 'format: {expected}'")
    if data.get("format") != expected:
        found = data.get("format")
        raise InputError(f"{name}: {_where(('format',), lines)}: expected 'format: {expected}'"
                         + (f", found {found!r}" if found is not None else ", key missing"))
    try:
        return model.model_validate(data)
    except ValidationError as exc:
        errors = exc.errors(include_url=False)
        # A misspelt key is reported before the "missing" it causes.
        err = min(errors, key=lambda e: e["type"] != "extra_forbidden")
        loc = tuple(p for p in err["loc"] if not (isinstance(p, str) and "[" in p))
        msg = err["msg"].removeprefix("Value error, ")
        if err["type"] == "extra_forbidden":
            msg = "unknown key (check the spelling; free text goes under notes:)"
        elif err["type"] == "missing":
            msg = "required key is missing"
        more = f" (and {exc.error_count() - 1} more problems)" if exc.error_count() > 1 else ""
        raise InputError(f"{name}: {_where(loc, lines)}: {msg}{more}") from None


def _decode(raw: bytes, name: str) -> str:
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputError(f"{name}: not UTF-8 text (byte {exc.start})") from None


def parse_vessel(raw: bytes, name: str) -> Vessel:
    """Vessel model from the bytes of a vessel data file; name is used in messages."""
    data, lines = _parse_yaml(_decode(raw, name), name)
    return _validate(Vessel, data, name, lines)


def load_vessel(path: str | Path) -> Vessel:
    path = Path(path)
    return parse_vessel(read_input(path, "vessel data file"), str(path))


# --- the case: a condition with its vessel -----------------------------------------------------


@dataclass(frozen=True)
class Case:
    """A condition, the vessel it names, and the exact bytes both came from."""

    condition: Condition
    vessel: Vessel
    condition_bytes: bytes
    vessel_bytes: bytes
    condition_name: str  # basename of the condition file
    vessel_name: str  # basename of the vessel file

    @property
    def inputs_sha256(self) -> str:
        """SHA-256 of the condition file's bytes followed by the vessel file's bytes (SPEC.md)."""
        return hashlib.sha256(self.condition_bytes + self.vessel_bytes).hexdigest()


def _check_fillings(cond: Condition, vessel: Vessel, name: str, lines: dict[tuple, int]) -> None:
    known = {t.id: t for t in vessel.tanks}
    for tank_id, filling in cond.tanks.items():
        where = _where(("tanks", tank_id), lines)
        tank = known.get(tank_id)
        if tank is None:
            listed = ", ".join(known) or "none"
            raise InputError(f"{name}: {where}: unknown tank {tank_id!r} (tanks of this vessel: "
                             f"{listed})")
        table = tank.table
        limits = {
            "volume": (0.0, table.volume[-1], "m³"),
            "sounding": (table.sounding[0], table.sounding[-1], "m"),
            "mass": (0.0, table.volume[-1] * tank.density, "t"),
        }
        if filling.kind in limits:
            low, high, unit = limits[filling.kind]
            if not (low - 1e-9 <= filling.value <= high + 1e-9):
                raise InputError(
                    f"{name}: {_where(('tanks', tank_id, filling.kind), lines)}: {filling.kind} "
                    f"{filling.value:g} {unit} is outside the tank's range {low:g} to {high:g} "
                    f"{unit} (tank {tank.name})")


def _case(cond_raw: bytes, vessel_raw: bytes, cond_name: str, vessel_name: str,
          cond_label: str, vessel_label: str) -> Case:
    data, lines = _parse_yaml(_decode(cond_raw, cond_label), cond_label)
    cond = _validate(Condition, data, cond_label, lines)
    vessel = parse_vessel(vessel_raw, vessel_label)
    if not vessel.has_tables:
        raise InputError(f"{vessel_label}: no hydrostatics and cross_curves; make them from the "
                         f"hull offsets first with 'reportgen tables'")
    _check_fillings(cond, vessel, cond_label, lines)
    return Case(cond, vessel, cond_raw, vessel_raw, cond_name, vessel_name)


def load_case(condition_path: str | Path) -> Case:
    """Read a condition file and the vessel file it names (relative to the condition file)."""
    cpath = Path(condition_path)
    cond_raw = read_input(cpath, "condition file")
    data, lines = _parse_yaml(_decode(cond_raw, str(cpath)), str(cpath))
    vessel_ref = data.get("vessel") if isinstance(data, dict) else None
    if not isinstance(vessel_ref, str) or not vessel_ref:
        # Let the model report the missing or malformed key with its line.
        _validate(Condition, data, str(cpath), lines)
        raise InputError(f"{cpath}: vessel: expected the path of the vessel data file")
    vpath = cpath.parent / vessel_ref
    if not vpath.is_file():
        raise InputError(f"{cpath}: {_where(('vessel',), lines)}: vessel data file {vpath} "
                         f"not found")
    vessel_raw = read_input(vpath, "vessel data file")
    return _case(cond_raw, vessel_raw, cpath.name, vpath.name, str(cpath), str(vpath))


def load_case_bytes(condition_bytes: bytes, vessel_bytes: bytes, condition_name: str,
                    vessel_name: str) -> Case:
    """A case from file contents (as embedded in a sheet); the names are used in messages."""
    return _case(condition_bytes, vessel_bytes, condition_name, vessel_name, condition_name,
                 vessel_name)
