"""Time to sign and to verify a demo sheet (verify, re-rendering included: under 3 s).

Renders the first demo condition that names its signatories once, then times, over a few
runs: the first (certifying) signature, a second (approval) signature, and verify of the
two-signature sheet with both certificates trusted. Each run starts with an empty cache of
renderings, so every sign and verify renders the sheet afresh as a new process would. Prints
the timings; exit status 1 when a target is missed or the sheet does not verify.
"""

from __future__ import annotations

import statistics
import sys
import tempfile
import time
from pathlib import Path

from reportgen.inputs import load_case
from reportgen.pipeline import evaluate
from reportgen.report.render import render_sheet
from reportgen.signing import keygen, sign_document, verify_document
from reportgen.signing.recompute import rebuild

TARGETS_S = {"sign (certify)": 4.0, "sign (approve)": 4.0, "verify": 3.0}
RUNS = 3
ROOT = Path(__file__).resolve().parent.parent


def main() -> int:
    condition = ROOT / "conditions" / "ballast-departure.yaml"
    case = load_case(condition)
    names = case.condition.signatories
    sheet_bytes = render_sheet(case, evaluate(case))
    with tempfile.TemporaryDirectory() as tmp:
        base = Path(tmp)
        sheet = base / "sheet.pdf"
        sheet.write_bytes(sheet_bytes)
        keygen(names.prepared_by, base / "a")
        keygen(names.checked_by, base / "b")
        trust = [base / "a" / "cert.pem", base / "b" / "cert.pem"]
        times: dict[str, list[float]] = {label: [] for label in TARGETS_S}
        ok = True
        for run in range(RUNS):
            one, two = base / f"one{run}.pdf", base / f"two{run}.pdf"
            steps = (
                ("sign (certify)", sign_document, (sheet, one, "prepared"),
                 {"key_path": base / "a" / "key.pem", "cert_path": base / "a" / "cert.pem"}),
                ("sign (approve)", sign_document, (one, two, "checked"),
                 {"key_path": base / "b" / "key.pem", "cert_path": base / "b" / "cert.pem"}),
                ("verify", verify_document, (two, trust), {}),
            )
            for label, call, args, kwargs in steps:
                rebuild.cache_clear()
                start = time.perf_counter()
                result = call(*args, **kwargs)
                times[label].append(time.perf_counter() - start)
                if label == "verify":
                    ok = ok and bool(result["ok"])
    print(f"demo sheet: {condition.name} ({len(sheet_bytes) / 1024:.0f} KiB), {RUNS} runs, "
          f"each sign and verify rendering the sheet afresh")
    missed = False
    for label, values in times.items():
        median, target = statistics.median(values), TARGETS_S[label]
        missed = missed or median >= target
        print(f"  {label:15s} median {median:6.3f} s   best {min(values):6.3f} s   "
              f"target < {target} s {'met' if median < target else 'MISSED'}")
    print(f"  two-signature sheet verifies: {'yes' if ok else 'NO'}")
    return 0 if ok and not missed else 1


if __name__ == "__main__":
    sys.exit(main())
