"""The criteria sets, as data: id -> the module that holds its checks, and what the set needs.

This is the one list of sets. The input models check set ids against it without importing the
criteria themselves (no import cycle); reportgen.criteria.core.run imports the modules.
`needs` names the intermediate quantities a set reads (the pipeline computes only those).
"""

from __future__ import annotations

from typing import NamedTuple


class SetInfo(NamedTuple):
    module: str  # module with `checks(state) -> list[Check]`
    title: str  # what the set is, with its source
    needs: frozenset[str] = frozenset()  # quantities beyond the GZ curve: "weather", ...


SETS: dict[str, SetInfo] = {
    "is2008.general": SetInfo(
        "reportgen.criteria.general",
        "IMO 2008 IS Code (MSC.267(85)), Part A, 2.2: criteria regarding righting lever "
        "curve properties"),
    "is2008.weather": SetInfo(
        "reportgen.criteria.weather",
        "IMO 2008 IS Code (MSC.267(85)), Part A, 2.3: severe wind and rolling criterion",
        frozenset({"weather"})),
    "is2008.timber": SetInfo(
        "reportgen.criteria.timber",
        "IMO 2008 IS Code (MSC.267(85)), Part A, 3.3: cargo ships carrying timber deck cargoes"),
    "is2008.passenger": SetInfo(
        "reportgen.criteria.passenger",
        "IMO 2008 IS Code (MSC.267(85)), Part A, 3.1: passenger ships (crowding of passengers "
        "to one side, turning)",
        frozenset({"passengers"})),
    "grain.2008": SetInfo(
        "reportgen.criteria.grain",
        "International Grain Code (MSC.23(59)), A 7: intact stability of ships carrying grain "
        "in bulk, with the grain assumed to shift"),
    "booklet.limits": SetInfo(
        "reportgen.criteria.booklet",
        "The approved stability booklet's limiting KG (or minimum GM) curve, as the vessel "
        "file gives it",
        frozenset({"booklet"})),
}
