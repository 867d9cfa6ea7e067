"""Tables from a spreadsheet export (CSV): the vessel file's YAML block of that table
(SPEC.md, "Setting up a ship": `reportgen import`).

A header row of key names; a unit may follow a name, in brackets or parentheses
(`draft (m)`, `mct [t·m/cm]`), and must then be the unit SPEC.md gives that column. For cross
curves the header holds the heels (deg) after a first cell naming the displacement column,
and each row is a displacement (t) followed by its KN values (m). Tables at several trims
(SPEC `trims`): a `trim` column (m, + by the stern; for cross curves the first column), the
rows of each trim together, trims increasing, every trim with the same draughts or
displacements. Offsets: columns x, y, z,
one row per point, the rows of a station together, from the keel to the deck edge. Comma,
semicolon or tab separated; with a semicolon or tab a decimal comma is read too. Every cell
must be a finite number; every error names the line and the column.
"""

from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Sequence
from dataclasses import dataclass

from reportgen.yamltext import flow, number

KINDS = ("hydrostatics", "cross-curves", "tank", "offsets")
_M = ("m",)
UNITS = {  # accepted spellings of each column's unit; () for a pure number
    "draft": _M, "lcb": _M, "lcf": _M, "kmt": _M, "lwl": _M,
    "displacement": ("t",), "tpc": ("t/cm",),
    "mct": ("t·m/cm", "tm/cm", "t.m/cm", "t m/cm", "t-m/cm", "t*m/cm"),
    "cb": (), "sounding": _M, "volume": ("m³", "m3", "m^3"), "lcg": _M, "vcg": _M, "tcg": _M,
    "fsi": ("m⁴", "m4", "m^4"), "x": _M, "y": _M, "z": _M, "heel": ("deg", "°", "degrees"),
    "trim": _M,
}
COLUMNS = {
    "hydrostatics": (("draft", "displacement", "lcb", "lcf", "kmt", "mct", "tpc"),
                     ("lwl", "cb")),
    "tank": (("sounding", "volume", "lcg", "vcg", "tcg", "fsi"), ()),
    "offsets": (("x", "y", "z"), ()),
}
INCREASING = ("draft", "displacement", "sounding", "volume")
POSITIVE = ("displacement", "kmt", "mct", "tpc", "lwl", "cb")
_HEADER = re.compile(r"^\s*([^\[\(]*?)\s*(?:[\[\(]\s*([^\]\)]*?)\s*[\]\)])?\s*$")


ASSUMED_TRIM = ("# assumed: the CSV does not say how the table was made; give --trim "
                "even_keel or fixed if the booklet says so")


class TableError(ValueError):
    """A problem in the CSV file; the message names the line and column."""


@dataclass(frozen=True)
class Sheet:
    header: list[str]
    rows: list[tuple[int, list[str]]]  # (line number, cells)
    decimal_comma: bool


def read_sheet(text: str) -> Sheet:
    """The header and the non-empty rows of a CSV text."""
    lines = text.splitlines()
    first = next((ln for ln in lines if ln.strip()), "")
    if not first:
        raise TableError("the file is empty (expected a header row of key names)")
    delim = max((";", "\t", ","), key=first.count) if any(c in first for c in ";\t,") else ","
    reader = csv.reader(io.StringIO(text), delimiter=delim)
    header: list[str] | None = None
    rows: list[tuple[int, list[str]]] = []
    try:
        for cells in reader:
            line = reader.line_num
            if not any(c.strip() for c in cells):
                continue
            cells = [c.strip() for c in cells]
            while cells and cells[-1] == "":
                cells.pop()
            if header is None:
                header = cells
            else:
                rows.append((line, cells))
    except csv.Error as exc:
        raise TableError(f"line {reader.line_num}: {exc}") from None
    if not rows:
        raise TableError("no rows under the header")
    if delim != ",":
        _one_decimal_mark(rows)
    return Sheet(header or [], rows, delim != ",")


_DECIMAL = {mark: re.compile(rf"[-+]?[0-9]*\{mark}[0-9]+") for mark in ",."}


def _one_decimal_mark(rows: list[tuple[int, list[str]]]) -> None:
    """TableError when a semicolon or tab separated sheet writes decimals both with a comma and
    with a point: one of them is then a thousands separator (1.500 meaning 1500 beside 0,5),
    and reading it as a decimal would take a number a thousand times too small."""
    first: dict[str, tuple[int, int, str]] = {}
    for line, cells in rows:
        for j, cell in enumerate(cells, start=1):
            for mark, pattern in _DECIMAL.items():
                if mark not in first and pattern.fullmatch(cell):
                    first[mark] = (line, j, cell)
        if len(first) == 2:
            (l1, j1, c1), (l2, j2, c2) = first[","], first["."]
            raise TableError(f"line {l2}, column {j2}: {c2!r} has a decimal point, while line "
                             f"{l1}, column {j1} has a decimal comma ({c1!r}); one of them would "
                             f"be a thousands separator: write every number with the same "
                             f"decimal mark and no thousands separator")


def name_and_unit(cell: str, column: int) -> tuple[str, str | None]:
    m = _HEADER.match(cell)
    if not m or not m.group(1):
        raise TableError(f"header, column {column}: {cell!r} is not a key name")
    return m.group(1).strip().lower(), (m.group(2).strip() if m.group(2) is not None else None)


def check_unit(name: str, unit: str | None, column: int) -> None:
    if unit is None:
        return
    allowed = UNITS.get(name, ())
    if unit.lower() not in [u.lower() for u in allowed] and not (not allowed and unit in "-"):
        want = ", ".join(allowed) if allowed else "none (a pure number)"
        raise TableError(f"header, column {column} ({name}): unit {unit!r}, expected {want}")


def cell_number(text: str, line: int, column: int, name: str, decimal_comma: bool) -> float:
    t = text.replace(",", ".") if decimal_comma else text
    try:
        v = float(t)
    except ValueError:
        v = math.nan
    if not math.isfinite(v) or len(t) > 40:
        raise TableError(f"line {line}, column {column} ({name}): {text!r} is not a number")
    return v


def columns_of(sheet: Sheet, kind: str) -> dict[str, tuple[list[float], list[int]]]:
    """name -> (values, line numbers), the columns of a hydrostatics, tank or offsets sheet."""
    required, optional = COLUMNS[kind]
    names = []
    for j, cell in enumerate(sheet.header, start=1):
        name, unit = name_and_unit(cell, j)
        if name not in required + optional:
            raise TableError(f"header, column {j}: unknown key {name!r} for {kind} (keys: "
                             f"{', '.join(required + optional)})")
        if name in names:
            raise TableError(f"header, column {j}: {name} given twice")
        check_unit(name, unit, j)
        names.append(name)
    missing = [n for n in required if n not in names]
    if missing:
        raise TableError(f"header: missing column(s) {', '.join(missing)}")
    out: dict[str, tuple[list[float], list[int]]] = {n: ([], []) for n in names}
    for line, cells in sheet.rows:
        if len(cells) != len(names):
            raise TableError(f"line {line}: {len(cells)} cells, the header has {len(names)}")
        for j, (name, text) in enumerate(zip(names, cells, strict=True), start=1):
            out[name][0].append(cell_number(text, line, j, name, sheet.decimal_comma))
            out[name][1].append(line)
    for j, name in enumerate(names, start=1):
        values, lines = out[name]
        if name in INCREASING:
            for i in range(1, len(values)):
                if values[i] <= values[i - 1]:
                    raise TableError(f"line {lines[i]}, column {j} ({name}): {values[i]:g} does "
                                     f"not increase on {values[i - 1]:g} (line {lines[i - 1]})")
        bad = [i for i, v in enumerate(values) if (name in POSITIVE and v <= 0)
               or (name == "fsi" and v < 0) or (name == "cb" and v > 1)
               or (name in ("volume", "draft", "sounding") and v < 0)]
        if bad:
            i = bad[0]
            want = ("at most 1" if name == "cb" and values[i] > 1 else
                    "positive" if name in POSITIVE else "not negative")
            raise TableError(f"line {lines[i]}, column {j} ({name}): {values[i]:g} must be {want}")
    return out


def by_trim(sheet: Sheet) -> list[tuple[float, Sheet]] | None:
    """With a `trim` column (m, + by the stern): the rows of each trim as a sheet without that
    column, trims in increasing order, the rows of a trim together; None without one."""
    names = [name_and_unit(c, j)[0] for j, c in enumerate(sheet.header, start=1)]
    if "trim" not in names:
        return None
    k = names.index("trim")
    check_unit("trim", name_and_unit(sheet.header[k], k + 1)[1], k + 1)
    header = sheet.header[:k] + sheet.header[k + 1:]
    groups: list[tuple[float, Sheet]] = []
    for line, cells in sheet.rows:
        if len(cells) != len(sheet.header):
            raise TableError(f"line {line}: {len(cells)} cells, the header has "
                             f"{len(sheet.header)}")
        t = cell_number(cells[k], line, k + 1, "trim", sheet.decimal_comma)
        if not groups or t != groups[-1][0]:
            if groups and t < groups[-1][0]:
                raise TableError(f"line {line}, column {k + 1} (trim): {t:g} comes after "
                                 f"{groups[-1][0]:g}; give the trims in increasing order, the "
                                 f"rows of each together")
            groups.append((t, Sheet(header, [], sheet.decimal_comma)))
        groups[-1][1].rows.append((line, cells[:k] + cells[k + 1:]))
    return groups


def _same_rows(name: str, first: list[float], other: list[float], lines: list[int],
               trim: float) -> None:
    if other != first:
        i = next((i for i, (a, b) in enumerate(zip(first, other, strict=False)) if a != b),
                 min(len(first), len(other)) - 1)
        raise TableError(f"line {lines[i]}: the {name}s at trim {trim:g} m differ from those at "
                         f"the first trim; every trim needs the same {name}s")


def hydrostatics_block(sheet: Sheet, density: float) -> str:
    groups = by_trim(sheet)
    lines = ["hydrostatics:", f"  density: {number(density)}"]
    if groups is None:
        cols = columns_of(sheet, "hydrostatics")
        lines += [f"  {n}: {flow(v)}" for n, (v, _) in cols.items()]
        return "\n".join(lines) + "\n"
    per = [(t, columns_of(g, "hydrostatics")) for t, g in groups]
    first = per[0][1]["draft"][0]
    for t, cols in per[1:]:
        _same_rows("draft", first, cols["draft"][0], cols["draft"][1], t)
    lines += [f"  trims: {flow([t for t, _ in per])}", f"  draft: {flow(first)}"]
    for name in per[0][1]:
        if name != "draft":
            lines.append(f"  {name}:")
            lines += [f"    - {flow(cols[name][0])}" for _, cols in per]
    return "\n".join(lines) + "\n"


def tank_block(sheet: Sheet) -> str:
    cols = columns_of(sheet, "tank")
    order = COLUMNS["tank"][0]
    return "table:\n" + "".join(f"  {n}: {flow(cols[n][0])}\n" for n in order)


def offsets_block(sheet: Sheet, density: float) -> str:
    cols = columns_of(sheet, "offsets")
    (xs, lines), (ys, _), (zs, _) = cols["x"], cols["y"], cols["z"]
    stations: list[tuple[float, list[tuple[float, float]]]] = []
    for x, y, z, line in zip(xs, ys, zs, lines, strict=True):
        if y < 0:
            raise TableError(f"line {line}, column y: {y:g} is negative (the starboard "
                             f"half-section has y ≥ 0)")
        if not stations or x != stations[-1][0]:
            if stations and x < stations[-1][0]:
                raise TableError(f"line {line}, column x: station {x:g} comes after station "
                                 f"{stations[-1][0]:g}; give the stations from aft forward, "
                                 f"the rows of each together")
            stations.append((x, []))
        pts = stations[-1][1]
        if pts and z < pts[-1][1]:
            raise TableError(f"line {line}, column z: {z:g} is below the row before "
                             f"({pts[-1][1]:g}); give each station from the keel to the deck "
                             f"edge, z rising")
        pts.append((y, z))
    if len(stations) < 3:
        raise TableError(f"{len(stations)} station(s); the hull needs at least three")
    for x, pts in stations:
        if len(pts) < 2:
            raise TableError(f"station x = {x:g} has one point; a station needs two or more "
                             f"(keel to deck edge)")
    out = ["hull:", f"  density: {number(density)}", "  stations:"]
    for x, pts in stations:
        out += [f"    - x: {number(x)}",
                "      points: [" + ", ".join(f"[{number(y)}, {number(z)}]" for y, z in pts)
                + "]"]
    return "\n".join(out) + "\n"


def _heels(sheet: Sheet) -> list[float]:
    name, unit = name_and_unit(sheet.header[0], 1)
    if name != "displacement":
        raise TableError(f"header, column 1: {sheet.header[0]!r}; the first column holds the "
                         f"displacements (header 'displacement' or 'displacement (t)')")
    check_unit(name, unit, 1)
    heels: list[float] = []
    for j, cell in enumerate(sheet.header[1:], start=2):
        text = re.sub(r"\s*(°|deg|degrees)\s*$", "", cell, flags=re.IGNORECASE)
        heels.append(cell_number(text, 1, j, "heel", sheet.decimal_comma))
    if len(heels) < 2 or heels[0] != 0:
        raise TableError("header: the heels (deg) after the first cell must start at 0")
    for j in range(1, len(heels)):
        if heels[j] <= heels[j - 1]:
            raise TableError(f"header, column {j + 2}: heel {heels[j]:g} does not increase on "
                             f"{heels[j - 1]:g}")
    if not 60 <= heels[-1] <= 90:
        raise TableError(f"header: the heels must reach at least 60° and at most 90° "
                         f"(last: {heels[-1]:g})")
    return heels


def _kn_rows(sheet: Sheet, heels: list[float]) -> tuple[list[float], list[list[float]], list[int]]:
    disps: list[float] = []
    kn: list[list[float]] = []
    lines: list[int] = []
    for line, cells in sheet.rows:
        if len(cells) != len(heels) + 1:
            raise TableError(f"line {line}: {len(cells)} cells, the header has "
                             f"{len(heels) + 1}")
        d = cell_number(cells[0], line, 1, "displacement", sheet.decimal_comma)
        if d <= 0 or (disps and d <= disps[-1]):
            raise TableError(f"line {line}, column 1 (displacement): {d:g} must be positive "
                             f"and increase on the row before")
        disps.append(d)
        lines.append(line)
        kn.append([cell_number(c, line, j, f"KN at {heels[j - 2]:g}°", sheet.decimal_comma)
                   for j, c in enumerate(cells[1:], start=2)])
    return disps, kn, lines


def cross_curves_block(sheet: Sheet, trim: str) -> str:
    """Cross curves; with a first column `trim` (m), one table per trim (SPEC `trims`)."""
    first_name = name_and_unit(sheet.header[0], 1)[0]
    groups = by_trim(sheet) if first_name == "trim" else None
    if groups is None:
        if trim == "fixed":
            raise TableError("--trim fixed needs the trims: a first column 'trim'")
        heels = _heels(sheet)
        disps, kn, _ = _kn_rows(sheet, heels)
        lines = ["cross_curves:", f"  trim: {trim}", f"  heel: {flow(heels)}",
                 f"  displacement: {flow(disps)}", "  kn:"]
        lines += [f"    - {flow(row)}" for row in kn]
        return "\n".join(lines) + "\n"
    heels = _heels(groups[0][1])
    tables = [(t, _kn_rows(g, heels)) for t, g in groups]
    for t, (disps, _, lines_of) in tables[1:]:
        _same_rows("displacement", tables[0][1][0], disps, lines_of, t)
    lines = ["cross_curves:", f"  trim: {trim}", f"  trims: {flow([t for t, _ in tables])}",
             f"  heel: {flow(heels)}", f"  displacement: {flow(tables[0][1][0])}", "  kn:"]
    for _, (_, kn, _) in tables:
        lines += [f"    - - {flow(kn[0])}"] + [f"      - {flow(row)}" for row in kn[1:]]
    return "\n".join(lines) + "\n"


def block(kind: str, text: str, *, density: float = 1.025, trim: str | None = None) -> str:
    """The YAML block of `kind` (one of KINDS) from the CSV text. TableError on a bad sheet."""
    sheet = read_sheet(text)
    if kind == "hydrostatics":
        return hydrostatics_block(sheet, density)
    if kind == "tank":
        return tank_block(sheet)
    if kind == "offsets":
        return offsets_block(sheet, density)
    if trim is None:  # SPEC's default basis, said in the block itself
        return cross_curves_block(sheet, "free").replace(
            "  trim: free\n", f"  trim: free    {ASSUMED_TRIM}\n", 1)
    return cross_curves_block(sheet, trim)


def as_csv(header: Sequence[str], rows: Sequence[Sequence[float]]) -> str:
    """A CSV text of the header and rows (numbers in shortest round-trip form)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(header)
    w.writerows([[number(v) for v in r] for r in rows])
    return buf.getvalue()
