"""SMT engine: ask z3 for an input where the design's outputs differ from the spec.

The design becomes Boolean formulas, one per gate; the spec becomes z3 word-level bit-vector
arithmetic (``Spec.to_z3``), an independent statement of the same function. ``unsat`` means no
such input exists at this width: proven. ``sat`` gives a counterexample from the model, which is
then re-simulated. A timeout or ``unknown`` is undecided, never a pass.
"""

from __future__ import annotations

import time

import z3

from verify.engines import Options, confirmed
from verify.model.netlist import CONST0, CONST1, Netlist
from verify.model.ops import OPS
from verify.model.result import EngineOutcome


def design_terms(design: Netlist, inputs: dict[str, z3.BitVecRef]) -> dict[str, z3.BitVecRef]:
    """The design's output ports as z3 bit-vectors of the given input bit-vectors."""
    one = z3.BitVecVal(1, 1)
    term: dict[str, z3.BoolRef] = {CONST0: z3.BoolVal(False), CONST1: z3.BoolVal(True)}
    for p in design.inputs:
        for i, b in enumerate(p.bits):
            term[b] = z3.Extract(i, i, inputs[p.name]) == one
    for g in design.ordered_gates:
        a = [term[i] for i in g.inputs]
        term[g.output] = OPS[g.op].z3(a)
    outs = {}
    for p in design.outputs:
        bits = [z3.If(term[b], one, z3.BitVecVal(0, 1)) for b in reversed(p.bits)]
        outs[p.name] = bits[0] if len(bits) == 1 else z3.Concat(*bits)
    return outs


def run(design, spec, options: Options) -> EngineOutcome:
    started = time.perf_counter()
    ctx_inputs = {p.name: z3.BitVec(p.name, p.width) for p in design.inputs}
    got = design_terms(design, ctx_inputs)
    want = spec.to_z3(ctx_inputs)
    solver = z3.SolverFor("QF_BV")
    solver.set("timeout", max(1, int(options.timeout * 1000)))
    solver.set("random_seed", options.seed & 0xFFFFFFFF)
    solver.add(z3.Or(*[got[p.name] != want[p.name] for p in design.outputs]))
    answer = solver.check()
    seconds = time.perf_counter() - started
    bits = design.input_width
    details = {"solver": f"z3 {z3.get_version_string()}", "answer": str(answer)}
    if answer == z3.unsat:
        return EngineOutcome("smt", "pass", seconds,
                             f"z3: no value of the {bits} input bits makes any output differ from "
                             f"the spec (unsat)", details=details)
    if answer == z3.sat:
        model = solver.model()
        inputs = {n: model.eval(v, model_completion=True).as_long() for n, v in ctx_inputs.items()}
        cex = confirmed("smt", design, spec, inputs)
        return EngineOutcome("smt", "fail", seconds, "z3 found an input where an output differs (sat)",
                             counterexample=cex, details=details)
    reason = solver.reason_unknown() or "unknown"
    details["reason"] = reason
    if "timeout" in reason or "canceled" in reason:
        text = f"z3 gave no answer within the {options.timeout:g} s limit ({reason})"
    else:
        text = f"z3 answered unknown ({reason})"
    return EngineOutcome("smt", "undecided", seconds, text, details=details)
