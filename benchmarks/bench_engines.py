"""Engine throughput, each figure beside a baseline measured in the same run.

    python benchmarks/bench_engines.py

- exhaustive: the compiled miter over numpy words on a 12-bit Kogge-Stone adder, beside a plain
  interpreter that walks the gate list once per vector (measured on a sample, scaled);
- random: vectors/s on 64- and 1024-bit adders, beside the same per-vector interpreter;
- smt: seconds to prove 32- and 64-bit ripple and Kogge-Stone adders, beside a plain hand-written
  z3 miter of the same netlist (bit-vector inputs, one Boolean per gate, bvadd on the other side).

Floors on a 2-core machine (the issue's targets): exhaustive >= 2e10 gate evaluations/s, random
>= 1e6 vectors/s on a 64-bit ripple adder, 64-bit ripple proof < 1 s. The script prints each
figure, its floor and whether it held; it exits 1 if a floor was missed.
"""

from __future__ import annotations

import random
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import z3  # noqa: E402

from verify.library.architectures import generate  # noqa: E402
from verify.engines import Options, exhaustive, randomized, smt  # noqa: E402
from verify.spec import parse  # noqa: E402

ADD = "{cout, sum} = a + b + cin"
_OPS = {
    "and": lambda v: all(v), "or": lambda v: any(v), "xor": lambda v: sum(v) & 1,
    "nand": lambda v: not all(v), "nor": lambda v: not any(v), "xnor": lambda v: not sum(v) & 1,
    "not": lambda v: not v[0], "buf": lambda v: v[0], "mux": lambda v: v[2] if v[0] else v[1],
    "maj": lambda v: sum(v) >= 2, "const0": lambda v: 0, "const1": lambda v: 1,
}


def interpret(design, vector):
    """Baseline: walk the gate list for one vector (what the compiled simulator replaces)."""
    val = {"0": 0, "1": 1}
    for p in design.inputs:
        for i, b in enumerate(p.bits):
            val[b] = vector[p.name] >> i & 1
    for g in design.ordered_gates:
        val[g.output] = int(_OPS[g.op]([val[i] for i in g.inputs]))
    return val


def baseline_rate(design, seconds=0.5):
    rng = random.Random(0)
    n, t0 = 0, time.perf_counter()
    while time.perf_counter() - t0 < seconds:
        interpret(design, {p.name: rng.getrandbits(p.width) for p in design.inputs})
        n += 1
    return n / (time.perf_counter() - t0)


def plain_miter_seconds(design, width):
    """A hand-written z3 miter of the same netlist: the baseline for the smt engine."""
    a, b, c = z3.BitVec("a", width), z3.BitVec("b", width), z3.BitVec("cin", 1)
    t0 = time.perf_counter()
    term = {"0": z3.BoolVal(False), "1": z3.BoolVal(True)}
    for name, bv in (("a", a), ("b", b)):
        for i in range(width):
            term[f"{name}[{i}]"] = z3.Extract(i, i, bv) == 1
    term["cin"] = c == 1
    ops = {"and": z3.And, "or": z3.Or, "not": z3.Not, "buf": lambda x: x,
           "xor": lambda *x: z3.Xor(x[0], x[1]) if len(x) == 2 else z3.Xor(x[0], ops["xor"](*x[1:])),
           "maj": lambda x, y, w: z3.Or(z3.And(x, y), z3.And(w, z3.Or(x, y))),
           "mux": lambda s, d0, d1: z3.If(s, d1, d0)}
    for g in design.ordered_gates:
        term[g.output] = ops[g.op](*[term[i] for i in g.inputs])
    total = z3.ZeroExt(1, a) + z3.ZeroExt(1, b) + z3.ZeroExt(width, c)
    s = z3.Solver()
    s.add(z3.Or([term[f"sum[{i}]"] != (z3.Extract(i, i, total) == 1) for i in range(width)]
                + [term["cout"] != (z3.Extract(width, width, total) == 1)]))
    assert s.check() == z3.unsat
    return time.perf_counter() - t0


def main() -> int:
    ok = True

    def floor(label, value, target, better="higher"):
        nonlocal ok
        held = value >= target if better == "higher" else value < target
        ok &= held
        return f"floor {target:.3g} {'held' if held else 'MISSED'}"

    print("exhaustive engine")
    d = generate("kogge-stone", 12)
    spec = parse(ADD, d)
    spec.reference()
    o = exhaustive.run(d, spec, Options())
    assert o.status == "pass"
    vps, gps = o.details["vectors_per_second"], o.details["gate_evaluations_per_second"]
    base = baseline_rate(d)
    print(f"  12-bit kogge-stone ({len(d.gates)} gates, 2^25 vectors): {o.seconds:.3f} s, "
          f"{vps:.3g} vectors/s, {gps:.3g} gate evaluations/s (miter: design + reference)  "
          f"[{floor('exh', gps, 2e10)}]")
    print(f"  baseline, per-vector gate-list interpreter: {base:.3g} vectors/s "
          f"-> compiled is {vps / base:,.0f}x faster")

    print("random engine")
    for arch, width, n in (("ripple", 64, 400_000), ("kogge-stone", 64, 400_000),
                           ("ripple", 1024, 20_000), ("kogge-stone", 1024, 20_000)):
        d = generate(arch, width)
        spec = parse(ADD, d)
        spec.reference()
        t0 = time.perf_counter()
        o = randomized.run(d, spec, Options(vectors=n))
        rate = o.vectors / (time.perf_counter() - t0)
        base = baseline_rate(d, 0.3)
        extra = f"  [{floor('rnd', rate, 1e6)}]" if (arch, width) == ("ripple", 64) else ""
        print(f"  {width}-bit {arch} ({len(d.gates)} gates): {rate:,.0f} vectors/s; baseline "
              f"interpreter {base:,.0f} vectors/s ({rate / base:,.0f}x){extra}")

    print("smt engine (z3)")
    for arch in ("ripple", "kogge-stone"):
        for width in (32, 64):
            d = generate(arch, width)
            spec = parse(ADD, d)
            o = smt.run(d, spec, Options(timeout=120))
            assert o.status == "pass", o
            plain = plain_miter_seconds(d, width)
            extra = f"  [{floor('smt', o.seconds, 1.0, 'lower')}]" if (arch, width) == ("ripple", 64) else ""
            print(f"  {width}-bit {arch}: {o.seconds:.3f} s; plain hand-written miter {plain:.3f} s "
                  f"(ratio {o.seconds / plain:.2f}){extra}")
    print("all floors held" if ok else "SOME FLOORS MISSED")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
