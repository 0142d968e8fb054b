"""How many HARD faults the random engine kills at 64 bits and its default budget.

HARD faults (tests/support/hard_faults.py) change a reference adder on a tiny fraction of inputs
(each below 2^-12, counted exactly with a BDD). For every fault and every seed the random engine
runs with its default budget; the table gives the fraction killed per fault kind, the worst seed,
and a baseline measured in the same run: the same number of uniform random vectors.

    python benchmarks/bench_hard_faults.py [--seeds 20] [--per-kind 6]
"""

from __future__ import annotations

import argparse
import random
import sys
import time
from collections import defaultdict
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from tests.support.hard_faults import SPEC, hard_faults  # noqa: E402
from verify import spec as specmod  # noqa: E402
from verify.engines import DEFAULT_VECTORS, Options, randomized  # noqa: E402
from verify.sim import miter_of  # noqa: E402


def uniform_kills(design, spec, seed: int, budget: int) -> bool:
    miter = miter_of(design, spec.reference())
    rng = random.Random(seed)
    done, batch = 0, 4096
    while done < budget:
        k = min(batch, budget - done)
        words = [rng.getrandbits(k) for _ in design.input_bits]
        if miter.run(words, (1 << k) - 1):
            return True
        done += k
    return False


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--seeds", type=int, default=20)
    ap.add_argument("--per-kind", type=int, default=6)
    args = ap.parse_args()
    started = time.perf_counter()
    faults = hard_faults(64, 1, args.per_kind)
    made = time.perf_counter() - started
    killed = defaultdict(int)
    base = defaultdict(int)
    total = defaultdict(int)
    per_seed = defaultdict(lambda: defaultdict(int))
    for f, _ in faults:
        spec = specmod.parse(SPEC, f.design)
        for seed in range(1, args.seeds + 1):
            hit = randomized.run(f.design, spec, Options(seed=seed)).status == "fail"
            killed[f.kind] += hit
            per_seed[seed]["all"] += hit
            base[f.kind] += uniform_kills(f.design, spec, seed, DEFAULT_VECTORS)
            total[f.kind] += 1
    print(f"{len(faults)} HARD faults at 64 bits (made in {made:.0f} s), {args.seeds} seeds, "
          f"{DEFAULT_VECTORS:,} vectors each")
    print(f"{'kind':30} {'faults':>6} {'engine':>8} {'uniform':>8}")
    for kind in total:
        n = total[kind] // args.seeds
        print(f"{kind:30} {n:>6} {killed[kind] / total[kind]:>8.1%} {base[kind] / total[kind]:>8.1%}")
    worst = min(per_seed[s]["all"] for s in per_seed) / len(faults)
    print(f"worst seed: {worst:.1%} of the faults killed")


if __name__ == "__main__":
    main()
