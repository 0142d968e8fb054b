"""Exact (floating-mode) delay by SAT, each figure beside the topological baseline of the same run.

    python benchmarks/bench_timing.py [--widths 8,16,32,64,128]

For each architecture and width: gates, the topological delay and the seconds it takes (one
longest-path pass: the baseline), the exact delay and the seconds the SAT search takes (every
output, binary search over its candidate times, CaDiCaL through python-sat), and the candidate
times of the widest net (what the encoding grows with). Unit delay model unless --delays.

Targets on a 2-core machine (the issue's, unit model): a 64-bit prefix adder (Kogge-Stone) in
under 10 s, a 64-bit carry-skip adder in under 30 s. The script prints whether each held and
exits 1 if one missed.
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from verify.library.architectures import generate  # noqa: E402
from verify.model import graph  # noqa: E402
from verify.timing.delays import resolve  # noqa: E402
from verify.timing.floating import Analysis  # noqa: E402

ARCHS = ["ripple", "carry-skip", "carry-select", "kogge-stone", "brent-kung", "sklansky"]
TARGETS = {("kogge-stone", 64): 10.0, ("carry-skip", 64): 30.0}


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--widths", default="8,16,32,64")
    ap.add_argument("--delays", default="unit")
    ap.add_argument("--archs", default=",".join(ARCHS))
    args = ap.parse_args()
    widths = [int(w) for w in args.widths.split(",")]
    model = resolve(args.delays)
    print(f"delays '{model.name}' ({model.unit}); times in seconds")
    print(f"{'architecture':<14}{'width':>6}{'gates':>7}{'topological':>13}{'top s':>9}"
          f"{'exact':>8}{'exact s':>9}{'x slower':>10}{'cands':>7}  target")
    missed = 0
    for arch in args.archs.split(","):
        for w in widths:
            d = generate(arch, w)
            t0 = time.perf_counter()
            delay = {g.output: model.ticks(g) for g in d.gates}
            arrival, _ = graph.arrival(d, lambda g: delay[g.output])
            top = max(arrival[o] for o in d.output_bits)
            t_top = time.perf_counter() - t0
            t0 = time.perf_counter()
            an = Analysis(d, model)
            exact = max(an.exact(o).exact for o in d.output_bits)
            t_exact = time.perf_counter() - t0
            cands = max(len(c) for c in an.candidates.values())
            an.close()
            target = TARGETS.get((arch, w)) if model.name == "unit" else None
            verdict = ""
            if target is not None:
                ok = t_exact < target
                missed += not ok
                verdict = f"< {target:g} s {'held' if ok else 'MISSED'}"
            print(f"{arch:<14}{w:>6}{len(d.gates):>7}{model.to_units(top):>13g}{t_top:>9.4f}"
                  f"{model.to_units(exact):>8g}{t_exact:>9.2f}{t_exact / max(t_top, 1e-9):>10.0f}"
                  f"{cands:>7}  {verdict}", flush=True)
    return 1 if missed else 0


if __name__ == "__main__":
    sys.exit(main())
