"""Candidates proven per minute: a design-space search's stream of 64-bit prefix adders.

    python benchmarks/bench_batch.py [--count 60] [--engine smt] [--seed 1] [--width 64]

A seeded generator makes random legal prefix networks (every position's span grows by merging
with the span just below it, in a random order, until it reaches bit 0: the result is a valid
parallel-prefix adder of some depth and size), and breaks a share of them (10% by default) by
moving one input wire of one prefix gate to another, earlier net. The same candidates are checked
with ``verify.check_many`` three ways in one run, side by side:

- one process (``jobs=1``): the baseline;
- a local pool of 2 worker processes (``jobs=2``);
- a local Dask cluster of 2 single-threaded worker processes (``local:2``).

The rate counts candidates with a result (proven, or a counterexample for a broken one) per
minute of wall time from the first submission to the last result; starting the pool or the
cluster is timed on its own. The target is 1,000 64-bit candidates per minute on a 2-core
machine; the script prints whether it held and exits 1 if it did not. ``--engine`` takes any
engine name ``verify.check`` knows, so the figure can be measured again for new engines.
"""

from __future__ import annotations

import argparse
import dataclasses
import os
import random
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from verify.batch import check_many  # noqa: E402
from verify.manifest.executors import DaskCluster, InProcess, LocalPool  # noqa: E402
from verify.model.builder import GateBuilder  # noqa: E402
from verify.model.netlist import Gate, Port, bit_name  # noqa: E402
from verify.model.result import Verdict  # noqa: E402

ADD = "{cout, sum} = a + b + cin"
TARGET_PER_MINUTE = 1000


def random_prefix_adder(rng: random.Random, width: int, name: str):
    """A random legal prefix adder: ``{cout, sum} = a + b + cin`` by construction."""
    b = GateBuilder("n", fold=False, share=False)
    a_bits = [bit_name("a", i, width) for i in range(width)]
    b_bits = [bit_name("b", i, width) for i in range(width)]
    p = [b.gate("xor", a_bits[i], b_bits[i], out=f"p{i}") for i in range(width)]
    g = [b.gate("and", a_bits[i], b_bits[i], out=f"g{i}") for i in range(width)]
    g0 = b.gate("or", g[0], b.gate("and", p[0], "cin", out="t0_cin"), out="g0_cin")
    # position i holds the group (generate, propagate, low end) of span [i:low]
    cur = [(g0, None, 0)] + [(g[i], p[i], i) for i in range(1, width)]
    open_ = [i for i in range(1, width)]
    while open_:
        # any open position may grow next: depths range from log-like to ripple-like chains
        i = rng.choice(open_)
        gi, pi, lo = cur[i]
        gj, pj, lo_j = cur[lo - 1]  # the span just below [i:lo] is held at position lo - 1
        G = b.gate("or", gi, b.gate("and", pi, gj, out=f"G{i}_{lo_j}_t"), out=f"G{i}_{lo_j}")
        P = b.gate("and", pi, pj, out=f"P{i}_{lo_j}") if lo_j > 0 else None
        cur[i] = (G, P, lo_j)
        if lo_j == 0:
            open_.remove(i)
    carries = ["cin"] + [cur[i][0] for i in range(width)]
    sums = [b.gate("xor", p[i], carries[i], out=f"s{i}") for i in range(width)]
    inputs = [Port("a", width), Port("b", width), Port("cin", 1)]
    return b.netlist(name, inputs, {"sum": sums, "cout": [carries[width]]},
                     origin=f"random prefix network, width {width}")


def break_one_wire(rng: random.Random, design):
    """The design with one input of one prefix gate moved to another net computed before it."""
    gates = list(design.ordered_gates)
    prefix = [k for k, gt in enumerate(gates) if gt.output.startswith(("G", "P"))]
    k = rng.choice(prefix)
    gt = gates[k]
    earlier = [x.output for x in gates[:k]] + [bit for port in design.inputs for bit in port.bits]
    pos = rng.randrange(len(gt.inputs))
    choices = [n for n in earlier if n not in gt.inputs]
    ins = list(gt.inputs)
    ins[pos] = rng.choice(choices)
    gates[k] = Gate(gt.op, tuple(ins), gt.output, gt.source)
    return dataclasses.replace(design, name=design.name + "_broken", gates=tuple(gates)).validate()


def candidates(seed: int, count: int, width: int, broken_share: float):
    rng = random.Random(seed)
    out = []
    for n in range(count):
        d = random_prefix_adder(rng, width, f"cand{n}")
        broken = rng.random() < broken_share
        out.append((break_one_wire(rng, d) if broken else d, broken))
    return out


def _cpu() -> float:
    """CPU seconds of this process and of its finished child processes (pool and Dask workers
    are counted once they have exited, i.e. after the executor is closed)."""
    t = os.times()
    return t.user + t.system + t.children_user + t.children_system


def measure(label, designs, broken, engine, make_executor, timeout):
    cpu0 = _cpu()
    t0 = time.perf_counter()
    executor = make_executor()
    startup = time.perf_counter() - t0
    try:
        t1 = time.perf_counter()
        verdicts = {}
        for item in check_many(designs, spec=ADD, engine=engine, executor=executor,
                               timeout=timeout):
            verdicts[item.index] = item.verdict
        seconds = time.perf_counter() - t1
    finally:
        executor.close()
    cpu = _cpu() - cpu0
    proven = sum(v in (Verdict.PROVEN, Verdict.EXHAUSTIVE) for v in verdicts.values())
    caught = sum(verdicts[i] is Verdict.FAIL for i in range(len(designs)) if broken[i])
    wrong = [i for i in range(len(designs)) if not broken[i] and verdicts[i] is Verdict.FAIL]
    decided = sum(v in (Verdict.PROVEN, Verdict.EXHAUSTIVE, Verdict.FAIL) for v in verdicts.values())
    return dict(label=label, startup=startup, seconds=seconds, cpu=cpu, proven=proven, caught=caught,
                undecided=len(designs) - decided, wrong=wrong,
                rate=60 * decided / seconds if seconds > 0 else float("inf"))


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--count", type=int, default=60, help="candidates (default 60)")
    ap.add_argument("--width", type=int, default=64, help="adder width (default 64)")
    ap.add_argument("--engine", default="smt", help="engine for every candidate (default smt)")
    ap.add_argument("--seed", type=int, default=1)
    ap.add_argument("--broken", type=float, default=0.1, help="share of broken candidates")
    ap.add_argument("--timeout", type=float, default=60.0, help="seconds per candidate")
    args = ap.parse_args()

    load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    print(f"{os.cpu_count()} CPUs, load average {load:.1f} at the start")
    t0 = time.perf_counter()
    pairs = candidates(args.seed, args.count, args.width, args.broken)
    made = time.perf_counter() - t0
    designs = [d for d, _ in pairs]
    broken = [b for _, b in pairs]
    gates = sum(len(d.gates) for d in designs) / len(designs)
    print(f"{len(designs)} random {args.width}-bit prefix adders ({sum(broken)} with one wrong "
          f"wire), {gates:.0f} gates on average, generated in {made:.2f} s; engine {args.engine}, "
          f"seed {args.seed}")
    rows = [
        measure("one process (baseline)", designs, broken, args.engine, InProcess, args.timeout),
        measure("local pool, 2 processes", designs, broken, args.engine, lambda: LocalPool(2),
                args.timeout),
        measure("local Dask cluster, 2 workers", designs, broken, args.engine,
                lambda: DaskCluster("local:2"), args.timeout),
    ]
    base = rows[0]["rate"]
    print()
    print(f"{'where':32} {'startup s':>9} {'checks s':>9} {'proven':>7} {'caught':>7} "
          f"{'undecided':>9} {'per minute':>11} {'vs baseline':>11} {'CPU s each':>10}")
    for r in rows:
        print(f"{r['label']:32} {r['startup']:9.2f} {r['seconds']:9.2f} {r['proven']:7d} "
              f"{str(r['caught']) + '/' + str(sum(broken)):>7} {r['undecided']:9d} "
              f"{r['rate']:11.0f} {r['rate'] / base:10.2f}x {r['cpu'] / len(designs):10.3f}")
    print("(per minute: candidates with a verdict per minute of wall time, startup excluded; "
          "CPU s each: CPU time of all processes, startup and shutdown included, per candidate)")
    bad = [r for r in rows if r["wrong"]]
    for r in bad:
        print(f"ERROR: {r['label']}: candidates built correct got a counterexample: {r['wrong']}")
    best = max(r["rate"] for r in rows)
    held = best >= TARGET_PER_MINUTE
    print(f"\ntarget: {TARGET_PER_MINUTE:,} {args.width}-bit candidates per minute; best "
          f"{best:,.0f}: {'held' if held else 'MISSED'}")
    return 0 if held and not bad else 1


if __name__ == "__main__":
    sys.exit(main())
