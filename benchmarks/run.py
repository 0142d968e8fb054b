"""Run every benchmark in turn: python benchmarks/run.py. Exits 1 if any benchmark missed a floor."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
SCRIPTS = ["bench_engines.py", "bench_proofs.py", "bench_timing.py", "bench_batch.py",
           "bench_hard_faults.py", "bench_spec_z3.py", "bench_verilog.py", "bench_diagnose.py",
           "bench_gate.py"]


def main() -> int:
    worst = 0
    for name in SCRIPTS:
        print(f"==== {name}", flush=True)
        code = subprocess.call([sys.executable, str(HERE / name)])
        worst = worst or code
    return worst


if __name__ == "__main__":
    sys.exit(main())
