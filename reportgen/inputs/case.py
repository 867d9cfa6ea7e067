"""A case: a condition with the vessel it names, the exact bytes of both, and the checks that
need both files (tank ids and filling ranges, the criteria the vessel permits)."""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from functools import cached_property
from pathlib import Path

from reportgen.docinfo import approval_name
from reportgen.errors import InputError
from reportgen.files import not_a_file, read_input
from reportgen.inputs.condition import Condition
from reportgen.inputs.grain import check_grain
from reportgen.inputs.special import PASSENGER_SET
from reportgen.inputs.vessel import Vessel
from reportgen.inputs.yamlread import cyclic_gc_paused, key_lines, parse, validate, where


def parse_vessel(raw: bytes, name: str) -> Vessel:
    """The vessel model from the bytes of a vessel data file; `name` is used in messages.
    Tables that cannot belong to the ship (reportgen.inputs.tablecheck) are refused by the
    model's own validation."""
    return validate(Vessel, parse(raw, name), name, raw)


def load_vessel(path: str | Path) -> Vessel:
    path = Path(path)
    return parse_vessel(read_input(path, "vessel data file"), str(path))


@dataclass(frozen=True)
class Case:
    """A condition, the vessel it names, and the exact bytes both came from."""

    condition: Condition
    vessel: Vessel
    condition_bytes: bytes
    vessel_bytes: bytes
    condition_name: str  # basename of the condition file
    vessel_name: str  # basename of the vessel file
    vessel_approval: bytes | None = None  # the detached signature VESSEL.yaml.p7s, if present

    @cached_property  # the bytes never change: hashed once per case, not per evaluation
    def inputs_sha256(self) -> str:
        """SHA-256 of the condition file's bytes followed by the vessel file's bytes (SPEC)."""
        return hashlib.sha256(self.condition_bytes + self.vessel_bytes).hexdigest()

    @cached_property
    def vessel_sha256(self) -> str:
        """SHA-256 of the vessel file's bytes alone: the vessel data fingerprint (SPEC)."""
        return hashlib.sha256(self.vessel_bytes).hexdigest()

    @property
    def criteria_sets(self) -> list[str]:
        """The sets this condition is checked against: its own choice, else the vessel's."""
        chosen = self.condition.criteria
        return list(chosen) if chosen is not None else list(self.vessel.criteria)


def _check_fillings(cond: Condition, vessel: Vessel, name: str, raw: bytes) -> None:
    known = {t.id: t for t in vessel.tanks}
    for tank_id, filling in cond.tanks.items():
        tank = known.get(tank_id)
        if tank is None:
            listed = ", ".join(known) or "none"
            lines = key_lines(raw)
            raise InputError(f"{name}: {where(('tanks', tank_id), lines)}: unknown tank "
                             f"{tank_id!r} (tanks of this vessel: {listed})")
        if filling.kind == "ullage" and tank.ullage_reference is None:
            lines = key_lines(raw)
            raise InputError(f"{name}: {where(('tanks', tank_id, 'ullage'), lines)}: "
                             f"tank {tank_id} has no ullage_reference in the vessel file; give "
                             f"its sounding, volume, percent or mass instead")
        table = tank.table
        density = filling.density if filling.density is not None else tank.density
        ref = tank.ullage_reference or 0.0
        limits = {
            "volume": (0.0, table.volume[-1], "m³"),
            "sounding": (table.sounding[0], table.sounding[-1], "m"),
            "ullage": (ref - table.sounding[-1], ref - table.sounding[0], "m"),
            "mass": (0.0, table.volume[-1] * density, "t"),
        }
        if filling.kind in limits:
            low, high, unit = limits[filling.kind]
            if not (low - 1e-9 <= filling.value <= high + 1e-9):
                at = where(("tanks", tank_id, filling.kind), key_lines(raw))
                raise InputError(f"{name}: {at}: {filling.kind} {filling.value:g} {unit} is "
                                 f"outside the tank's range {low:g} to {high:g} {unit} "
                                 f"(tank {tank.name})")


def _check_criteria(cond: Condition, vessel: Vessel, name: str, raw: bytes) -> None:
    if cond.criteria is None:
        return
    allowed = list(vessel.criteria) + list(vessel.permitted_criteria)
    for i, sid in enumerate(cond.criteria):
        if sid not in allowed:
            lines = key_lines(raw)
            raise InputError(f"{name}: {where(('criteria', i), lines)}: the vessel "
                             f"does not permit the criteria set {sid!r} (its criteria and "
                             f"permitted_criteria: {', '.join(allowed)})")


def _check_observed(cond: Condition, vessel: Vessel, name: str, raw: bytes) -> None:
    if cond.observed is not None and vessel.draught_marks is None:
        at = where(("observed",), key_lines(raw))
        raise InputError(f"{name}: {at}: draughts read at the marks need the positions of "
                         f"the marks, and the vessel file has no draught_marks")


def special_problems(cond: Condition, vessel: Vessel, sets: list[str]) -> list[tuple[tuple, str]]:
    """(key path in the condition file, message) for each allowance or set the condition asks
    for that the vessel's data cannot give; empty when all is well."""
    out: list[tuple[tuple, str]] = []
    if cond.icing != "none" and vessel.icing is None:
        text = (f"icing {cond.icing} needs the vessel's icing block (deck_area, deck_lcg, "
                "deck_vcg), and the vessel file has none")
        out.append((("icing",), text))
    if cond.passengers is not None and vessel.passengers is None:
        text = "the vessel file has no passengers block (decks the passengers may crowd on)"
        out.append((("passengers",), text))
    if PASSENGER_SET in sets:
        needs = f"the criteria set {PASSENGER_SET} needs"
        if cond.passengers is None:
            out.append((("criteria",), (f"{needs} the number of passengers: passengers: "
                                       "{number: N}")))
        if vessel.passengers is None:
            out.append((("criteria",), (f"{needs} the vessel's passengers block (decks, "
                                       "mass_each, vcg_above_deck)")))
        if vessel.particulars.service_speed is None:
            out.append((("criteria",), (f"{needs} the vessel's particulars.service_speed "
                                       "(knots) for the turning moment of Part A 3.1")))
    return out


def _check_special(cond: Condition, vessel: Vessel, name: str, raw: bytes) -> None:
    sets = list(cond.criteria) if cond.criteria is not None else list(vessel.criteria)
    problems = special_problems(cond, vessel, sets)
    if problems:
        path, text = problems[0]
        at = where(path, key_lines(raw))
        raise InputError(f"{name}: {at}: {text}")


def case_from_bytes(cond_raw: bytes, vessel_raw: bytes, cond_name: str, vessel_name: str,
                    approval: bytes | None = None, cond_label: str | None = None,
                    vessel_label: str | None = None, cond_data: object = None) -> Case:
    """A case from file contents; the labels (default: the names) are used in messages.
    `cond_data`: the condition's YAML data when already parsed."""
    with cyclic_gc_paused():  # once for the whole case: the files' data are freed before
        return _case(cond_raw, vessel_raw, cond_name, vessel_name, approval,  # it resumes
                     cond_label or cond_name, vessel_label or vessel_name, cond_data)


def _case(cond_raw: bytes, vessel_raw: bytes, cond_name: str, vessel_name: str,
          approval: bytes | None, cond_label: str, vessel_label: str,
          cond_data: object) -> Case:
    if cond_data is None:
        cond_data = parse(cond_raw, cond_label)
    cond = validate(Condition, cond_data, cond_label, cond_raw)
    vessel = parse_vessel(vessel_raw, vessel_label)
    if not vessel.can_evaluate:
        raise InputError(f"{vessel_label}: no hydrostatics and cross_curves; make them from the "
                         f"hull offsets first with 'reportgen tables', or choose "
                         f"calculation.method: hull")
    untabled = [t.id for t in vessel.tanks if t.table is None]
    if untabled:
        raise InputError(f"{vessel_label}: tanks {', '.join(untabled)} have a geometry but no "
                         f"table; make the tables first with 'reportgen tables'")
    _check_fillings(cond, vessel, cond_label, cond_raw)
    _check_criteria(cond, vessel, cond_label, cond_raw)
    _check_observed(cond, vessel, cond_label, cond_raw)
    _check_special(cond, vessel, cond_label, cond_raw)
    check_grain(cond, vessel, cond_label, cond_raw)
    return Case(cond, vessel, cond_raw, vessel_raw, cond_name, vessel_name, approval)


def vessel_path(condition_path: Path, data: object, raw: bytes) -> Path:
    """The vessel file a condition names (relative to the condition file)."""
    ref = data.get("vessel") if isinstance(data, dict) else None
    if not isinstance(ref, str) or not ref:
        # Let the model report the missing or malformed key with its line.
        validate(Condition, data, str(condition_path), raw)
        raise InputError(f"{condition_path}: vessel: expected the path of the vessel data file")
    path = condition_path.parent / ref
    reason = not_a_file(path)
    if reason is not None:  # named with the key and line that give the path
        at = where(("vessel",), key_lines(raw))
        reason = "not found" if reason == "not found" else f"cannot be read: {reason}"
        raise InputError(f"{condition_path}: {at}: vessel data file {path} {reason}")
    return path


def load_case(condition_path: str | Path) -> Case:
    """Read a condition file, the vessel file it names and the vessel's approval beside it."""
    cpath = Path(condition_path)
    cond_raw = read_input(cpath, "condition file")
    data = parse(cond_raw, str(cpath))
    vpath = vessel_path(cpath, data, cond_raw)
    vessel_raw = read_input(vpath, "vessel data file")
    return case_from_bytes(cond_raw, vessel_raw, cpath.name, vpath.name,
                           approval_beside(vpath), str(cpath), str(vpath), data)


def approval_beside(vessel_path: Path) -> bytes | None:
    """The bytes of the vessel's approval VESSEL.yaml.p7s beside its file, None without one."""
    path = vessel_path.with_name(approval_name(vessel_path.name))
    return read_input(path, "vessel data approval") if path.is_file() else None


def load_case_bytes(condition_bytes: bytes, vessel_bytes: bytes, condition_name: str,
                    vessel_name: str, vessel_approval: bytes | None = None) -> Case:
    """A case from file contents (as embedded in a sheet); the names are used in messages."""
    return case_from_bytes(condition_bytes, vessel_bytes, condition_name, vessel_name,
                           vessel_approval)
