"""Time to sign and to verify a demo sheet (target: under 1.5 s each).

Renders the first demo condition (conditions/*.yaml) once, then times, over a few runs:
the first (certifying) signature, a second (approval) signature, and verify_sheet of the
two-signature sheet with both certificates trusted. Prints the timings; exit status 1 when a
target is missed or the sheet does not verify.
"""

from __future__ import annotations

import statistics
import sys
import tempfile
import time
from pathlib import Path

from reportgen import signing
from reportgen.inputs import load_case
from reportgen.pipeline import evaluate
from reportgen.report.render import render_sheet

TARGET_S = 1.5
RUNS = 3
ROOT = Path(__file__).resolve().parent.parent


def main() -> int:
    conditions = sorted((ROOT / "conditions").glob("*.yaml"))
    if not conditions:
        print("no demo condition in conditions/*.yaml", file=sys.stderr)
        return 1
    case = load_case(conditions[0])
    sheet_bytes = render_sheet(case, evaluate(case))
    with tempfile.TemporaryDirectory() as tmp:
        base = Path(tmp)
        sheet = base / "sheet.pdf"
        sheet.write_bytes(sheet_bytes)
        signing.keygen("Bench Preparer", base / "a")
        signing.keygen("Bench Checker", base / "b")
        trust = [base / "a" / "cert.pem", base / "b" / "cert.pem"]
        times: dict[str, list[float]] = {"sign (certify)": [], "sign (approve)": [],
                                         "verify": []}
        ok = True
        for run in range(RUNS):
            one, two = base / f"one{run}.pdf", base / f"two{run}.pdf"
            start = time.perf_counter()
            signing.sign_sheet(sheet, one, "prepared", key_path=base / "a" / "key.pem",
                               cert_path=base / "a" / "cert.pem")
            times["sign (certify)"].append(time.perf_counter() - start)
            start = time.perf_counter()
            signing.sign_sheet(one, two, "checked", key_path=base / "b" / "key.pem",
                               cert_path=base / "b" / "cert.pem")
            times["sign (approve)"].append(time.perf_counter() - start)
            start = time.perf_counter()
            report = signing.verify_sheet(two, trust)
            times["verify"].append(time.perf_counter() - start)
            ok = ok and bool(report["ok"])
    print(f"demo sheet: {conditions[0].name} ({len(sheet_bytes) / 1024:.0f} KiB), {RUNS} runs")
    missed = False
    for label, values in times.items():
        median = statistics.median(values)
        missed = missed or median >= TARGET_S
        print(f"  {label:15s} median {median:6.3f} s   best {min(values):6.3f} s   "
              f"target < {TARGET_S} s {'met' if median < TARGET_S else 'MISSED'}")
    print(f"  two-signature sheet verifies: {'yes' if ok else 'NO'}")
    return 0 if ok and not missed else 1


if __name__ == "__main__":
    sys.exit(main())
