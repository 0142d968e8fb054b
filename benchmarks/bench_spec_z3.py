"""Seconds for z3 to prove an adder-subtractor against its spec, beside a baseline in the same run.

    python benchmarks/bench_spec_z3.py [WIDTH ...]

The design is tests/verilog/larkspur_addsub.v (b XOR sub, then one '+' with carry-in sub) at
each width; the spec is ``res = sub ? a - b : a + b``. Two right-hand sides are proven against
the same gate formulas (verify.engines.smt.design_terms):

- ``spec.to_z3``: the spec package's translation (subtraction as a + ~b + 1);
- baseline: the same spec written with z3's own ``a - b`` (bvsub), as the translation did before.

Each proof has a time limit (default 120 s); a row that hits it says so.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import z3  # noqa: E402

from verify.engines.smt import design_terms  # noqa: E402
from verify.formats import load  # noqa: E402
from verify.spec import parse  # noqa: E402

LIMIT_S = 120


def prove(got, want) -> tuple[str, float]:
    solver = z3.SolverFor("QF_BV")
    solver.set("timeout", LIMIT_S * 1000)
    solver.add(got != want)
    t = time.perf_counter()
    answer = solver.check()
    return str(answer), time.perf_counter() - t


FULL = ("res = sub ? a - b : a + b; cout = sub ? a >= b : (a + b) >> {w};"
        "ovf = (sub ? $signed(a) - $signed(b) : $signed(a) + $signed(b)) != $signed(res)")


def main(widths: list[int]) -> None:
    print(f"{'width':>5}  {'spec.to_z3 (a + ~b + 1)':>26}  {'baseline: z3 a - b':>22}  "
          f"{'all three outputs (res, cout by >=, ovf)':>42}")
    for w in widths:
        design = load(ROOT / "tests/verilog/larkspur_addsub.v", top="larkspur_addsub",
                      params={"W": w})
        spec = parse("res = sub ? a - b : a + b; cout = 0; ovf = 0", design)
        ins = {p.name: z3.BitVec(p.name, p.width) for p in design.inputs}
        terms = design_terms(design, ins)
        got = terms["res"]
        ours = spec.to_z3(ins)["res"]
        a, b, sub = ins["a"], ins["b"], ins["sub"]
        base = z3.If(sub == 1, a - b, a + b)
        r1, t1 = prove(got, ours)
        r2, t2 = prove(got, base)
        full = parse(FULL.format(w=w), design).to_z3(ins)
        r3, t3 = prove(z3.Concat(*[terms[p.name] for p in design.outputs]),
                       z3.Concat(*[full[p.name] for p in design.outputs]))
        print(f"{w:>5}  {r1:>7} {t1:>15.3f} s  {r2:>7} {t2:>11.3f} s  {r3:>20} {t3:>18.3f} s")


if __name__ == "__main__":
    main([int(x) for x in sys.argv[1:]] or [8, 16, 24, 32])
