"""How strong a ``tested`` verdict is: the same random vectors run against faulty copies of the
user's own design.

Single faults are injected at random gates (a wrong op, an input from a wrong net, an inverted
input, a net stuck at 0 or 1, a dropped input). Each faulty copy runs through the random engine
with the same budget and seed as the check. A fault it catches changes the function (the failing
vector is re-simulated against the spec on integers); for one it misses, a complete engine
decides whether the fault changes the function at all (every input when they are few, else z3
within a short limit): faults that do not change it are not counted, and neither are those no
engine could settle in time. The result is the fraction of function-changing faults caught: an
estimate of the vectors' strength on this design, not a proof of anything.
"""

from __future__ import annotations

import random
from dataclasses import replace

from verify.engines import Options
from verify.model.netlist import Gate, Netlist
from verify.model.ops import OPS

#: faults listed by name when missed, at most
MAX_LISTED = 20
#: seconds z3 gets to decide whether one missed fault changes the function
SETTLE_SECONDS = 5.0
#: input bits up to which a missed fault is settled by simulating every input
SETTLE_EXHAUSTIVE_BITS = 20
KINDS = ("wrong op", "wrong input", "inverted input", "stuck", "dropped input")
_OTHER_OPS = {"and": ("or", "xor", "nand"), "or": ("and", "xor", "nor"),
              "xor": ("xnor", "or", "and"), "nand": ("and", "nor"), "nor": ("or", "nand"),
              "xnor": ("xor",), "not": ("buf",), "buf": ("not",), "mux": ("maj",),
              "maj": ("mux",)}
NOTE = ("an estimate of how strong these vectors are on this design (faults injected into a "
        "copy of it), not a proof")


def inject(design: Netlist, rng: random.Random) -> tuple[Netlist, str] | None:
    """One random single fault: (faulty design, a description), or None when the draw fits no
    fault (a constant gate, a loop)."""
    gates = list(design.ordered_gates)
    if not gates:
        return None
    k = rng.randrange(len(gates))
    g = gates[k]
    kind = rng.choice(KINDS)
    extra: list[Gate] = []
    if kind == "stuck":
        v = rng.randrange(2)
        new, what = Gate(f"const{v}", (), g.output, g.source), f"{g.output} stuck at {v}"
    elif not g.inputs:
        return None
    elif kind == "wrong op":
        ops = [o for o in _OTHER_OPS.get(g.op, ()) if OPS[o].arity_ok(len(g.inputs))]
        if not ops:
            return None
        op = rng.choice(ops)
        new, what = Gate(op, g.inputs, g.output, g.source), f"{g.output}: {op} instead of {g.op}"
    elif kind == "wrong input":
        earlier = [*design.input_bits, *(x.output for x in gates[:k])]
        pos = rng.randrange(len(g.inputs))
        choices = [n for n in earlier if n != g.inputs[pos]]
        if not choices:
            return None
        src = rng.choice(choices)
        ins = tuple(src if n == pos else x for n, x in enumerate(g.inputs))
        new = Gate(g.op, ins, g.output, g.source)
        what = f"{g.output}: input {pos + 1} from {src} instead of {g.inputs[pos]}"
    elif kind == "inverted input":
        pos = rng.randrange(len(g.inputs))
        inv = f"{g.output}__fault_not_{pos}"
        if inv in design.driver:
            return None
        ins = tuple(inv if n == pos else x for n, x in enumerate(g.inputs))
        new, what = Gate(g.op, ins, g.output, g.source), f"{g.output}: input {pos + 1} " \
                                                          f"({g.inputs[pos]}) inverted"
        extra.append(Gate("not", (g.inputs[pos],), inv, "injected"))
    else:  # dropped input
        if len(g.inputs) < 2 or g.op in ("mux", "maj"):
            return None
        pos = rng.randrange(len(g.inputs))
        ins = g.inputs[:pos] + g.inputs[pos + 1:]
        op = g.op if OPS[g.op].arity_ok(len(ins)) else ("not" if g.op in ("nand", "nor", "xnor")
                                                          else "buf")
        new, what = Gate(op, ins, g.output, g.source), f"{g.output}: input {g.inputs[pos]} dropped"
    out = tuple(new if x is g else x for x in design.gates) + tuple(extra)
    try:
        return Netlist(design.name, design.inputs, design.outputs, out, design.origin).validate(), what
    except Exception:  # a fault that makes no valid netlist is not drawn
        return None


def _changes_function(faulty: Netlist, spec) -> bool | None:
    """True/False when a complete engine decides whether ``faulty`` differs from the spec, None
    when it cannot say in time."""
    from verify.engines import exhaustive, smt

    if faulty.input_width <= SETTLE_EXHAUSTIVE_BITS:
        out = exhaustive.run(faulty, spec, Options(exhaustive_limit=SETTLE_EXHAUSTIVE_BITS))
    else:
        out = smt.run(faulty, spec, Options(timeout=SETTLE_SECONDS))
    return {"fail": True, "pass": False}.get(out.status)


def estimate(design: Netlist, spec, *, faults: int, seed: int, vectors: int,
             time_limit: float = 60.0) -> dict:
    """Inject up to ``faults`` function-changing single faults and count those the random engine
    (``vectors`` vectors, ``seed``) catches. Returns {faults, caught, fraction, missed, ...}."""
    from verify.engines import randomized

    rng = random.Random(seed * 7919 + len(design.gates))
    opts = Options(seed=seed, vectors=vectors, timeout=time_limit)
    kept = caught = equivalent = unsettled = draws = 0
    missed: list[str] = []
    while kept < faults and draws < faults * 4:
        draws += 1
        got = inject(design, rng)
        if got is None:
            continue
        faulty, what = got
        run = randomized.run(faulty, spec, replace(opts))
        if run.status == "fail":
            kept += 1
            caught += 1
            continue
        changes = _changes_function(faulty, spec)
        if changes is None:
            unsettled += 1
        elif not changes:
            equivalent += 1
        else:
            kept += 1
            missed.append(what)
    return {"faults": kept, "caught": caught,
            "fraction": round(caught / kept, 6) if kept else None,
            "missed": missed[:MAX_LISTED], "missed_count": len(missed),
            "equivalent_dropped": equivalent, "unsettled_dropped": unsettled,
            "vectors": vectors, "seed": seed, "note": NOTE}


def describe(s: dict) -> list[str]:
    """Lines for the text report."""
    if not s["faults"]:
        return [f"strength: no injected fault changed the function of this design ({NOTE})"]
    lines = [f"strength: this sample of {s['vectors']:,} vectors (seed {s['seed']}) catches "
             f"{s['fraction']:.1%} of {s['faults']:,} injected single faults that change the "
             f"function; {NOTE}"]
    if s["missed"]:
        more = s["missed_count"] - len(s["missed"])
        lines.append("  missed: " + "; ".join(s["missed"]) + (f"; and {more} more" if more else ""))
    dropped = s["equivalent_dropped"] + s["unsettled_dropped"]
    if dropped:
        lines.append(f"  not counted: {s['equivalent_dropped']} faults that leave the function "
                     f"unchanged, {s['unsettled_dropped']} no engine could settle in time")
    return lines
