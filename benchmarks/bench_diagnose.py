"""How often the diagnosis points at the injected fault.

Single faults are injected into generated adders of several architectures and widths: an input
taken from the wrong net, a wrong gate op, an inverted input (a new inverter in front of one gate
input), a gate output stuck at 0 or 1. A fault is kept when some vector shows it: every input
vector up to 17 input bits, else 8,192 aimed and random vectors (so a fault only rare vectors
show is dropped at 32 bits and up: a bias toward faults that are easy to see). One failing vector,
picked at random, is diagnosed, and the benchmark reports how often the injected gate is the
first suspect and how often it is among the first three. For an inverted input, the injected
gate is the gate whose input was inverted; the new inverter counts too (it is the wrong wire).
Aim: first three in at least 90% of cases.

Two more kinds measure what lies outside the issue's list: ``dropped-input`` (a gate loses one
input: a forgotten term) and ``double`` (two faults at two gates; a hit is either of them).

    python benchmarks/bench_diagnose.py [--faults-per-design 12] [--seed 1] [--quick]
        [--widths 4,8,16,32] [--kinds wrong-input,wrong-op,...] [--show-misses]

Figures on 2 cores (first suspect / in first three / random pick of 3 in the failing cone):
issue's kinds, seed 1, widths 4..32, 528 faults: 99.8% / 100% / 31.6%, median 0.025 s each;
seed 3, 352 faults: 99.1% / 100%; width 64, seed 2, 66 faults: 98.5% / 100% / 13.0%, median
0.36 s; dropped-input 89.2% / 97.3%; double 93.6% / 98.3%.
"""

from __future__ import annotations

import argparse
import random
import sys
import time
from collections import defaultdict
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from verify import spec as specmod  # noqa: E402
from verify.library import architectures  # noqa: E402
from verify.render.dot import cone  # noqa: E402
from verify.diagnosis.suspects import analyse  # noqa: E402
from verify.model.netlist import Gate, Netlist  # noqa: E402
from verify.sim import Miter, pack, vector_of  # noqa: E402

from tests.support.faults import (ARCHS, KINDS, SPEC, WIDTHS, find_failure,  # noqa: E402,F401
                                  inject, inject_two)


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--faults-per-design", type=int, default=12)
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--quick", action="store_true", help="widths 4 and 8 only")
    ap.add_argument("--widths", help="comma-separated widths (default 4,8,16,32)")
    ap.add_argument("--kinds", help="comma-separated fault kinds (default: the issue's five; "
                    "also dropped-input, a forgotten gate input, and double, two faults at once)")
    ap.add_argument("--show-misses", action="store_true")
    args = ap.parse_args(argv)
    rng = random.Random(args.seed)
    kinds = args.kinds.split(",") if args.kinds else KINDS
    widths = [4, 8] if args.quick else WIDTHS
    if args.widths:
        widths = [int(x) for x in args.widths.split(",")]
    tally = defaultdict(lambda: [0, 0, 0])  # key -> [cases, first, top3]
    seconds = []
    misses = []
    guess = []  # (chance first, chance in first three) of a random pick in the failing cone
    for arch in ARCHS:
        for w in widths:
            design = architectures.generate(arch, w)
            spec = specmod.parse(SPEC, design)
            made = 0
            tries = 0
            while made < args.faults_per_design and tries < 10 * args.faults_per_design:
                tries += 1
                kind = kinds[made % len(kinds)]
                got = inject_two(design, rng) if kind == "double" else inject(design, kind, rng)
                if got is None:
                    continue
                faulty, hit = got
                cex = find_failure(faulty, spec, rng)
                if cex is None:
                    continue
                made += 1
                t0 = time.perf_counter()
                an = analyse(faulty, spec, [cex], top=3)
                seconds.append(time.perf_counter() - t0)
                names = [s.net for s in an.suspects]
                # baseline: three gates picked at random in the fan-in cone of a wrong output
                wrong = next(b for b in faulty.output_bits
                             if (an.values[b] ^ an.expected[b]) & 1) if an.failing & 1 else None
                if wrong is not None:
                    size = sum(1 for n in cone(faulty, wrong) if n in faulty.driver)
                    guess.append((min(1.0, 1 / size), min(1.0, 3 / size)))
                first = bool(names) and names[0] in hit
                top3 = any(n in hit for n in names[:3])
                for key in ("all", f"arch {arch}", f"width {w}", f"fault {kind}"):
                    t = tally[key]
                    t[0] += 1
                    t[1] += first
                    t[2] += top3
                if not first:
                    misses.append((arch, w, kind, sorted(hit), names))
    print(f"diagnosis of injected faults {','.join(kinds)} (seed {args.seed}, "
          f"{args.faults_per_design} per design, widths {widths})")
    print(f"{'group':<24} {'cases':>6} {'first':>8} {'top 3':>8}")
    for key in ["all"] + sorted(k for k in tally if k != "all"):
        n, f, t = tally[key]
        print(f"{key:<24} {n:>6} {100 * f / n:>7.1f}% {100 * t / n:>7.1f}%")
    if guess:
        print(f"{'baseline: random pick':<24} {len(guess):>6} "
              f"{100 * sum(g[0] for g in guess) / len(guess):>7.1f}% "
              f"{100 * sum(g[1] for g in guess) / len(guess):>7.1f}%   (gates in the fan-in cone "
              f"of a wrong output)")
    seconds.sort()
    if seconds:
        print(f"diagnosis time: median {seconds[len(seconds) // 2]:.3f} s, "
              f"max {seconds[-1]:.3f} s over {len(seconds)} cases")
    n, f, t = tally["all"]
    print(f"aim: first three in >= 90% of cases: {'met' if t >= 0.9 * n else 'NOT met'} "
          f"({100 * t / n:.1f}%)")
    if args.show_misses:
        for m in misses:
            print("not first:", *m)
    # the floor (benchmarks/run.py exits 1 on a miss): the aim, for the kinds
    return 0 if t >= 0.9 * n or set(kinds) - set(KINDS) else 1


if __name__ == "__main__":
    sys.exit(main())
