"""HARD faults: single changes to reference adders that only a tiny fraction of inputs shows.

Built from ``verify.library.architectures`` by finding gates through their ``source`` text (what
the generator says each gate is), independently of the random engine's code. Kinds:

* ``skip-missing-propagate``: a carry-skip block's skip condition leaves out one interior
  propagate bit (blocks of 16 bits);
* ``lookahead-missing-propagate``: an AND term of a lookahead carry or group generate leaves out
  one of its propagate inputs;
* ``select-wrong-carry``: a carry-select block's multiplexers choose on the previous block's
  carry-out computed for a carry-in of 0 (or of 1) instead of the block's real carry;
* ``field-match``: a sum bit flips only when a 12-bit field of ``a`` equals a constant and one
  bit of ``b`` is 1.

``failing_fraction`` counts the failing inputs exactly with a BDD (the ``dd`` package, CUDD): the
design and the spec's reference become BDDs over the input bits (interleaved a0 b0 a1 b1 ...),
and the count of inputs where some output differs, over 2^bits, is the fraction. A BDD count is a
complete method: a fraction above 0 proves the fault changes the function.
"""

from __future__ import annotations

import random
from dataclasses import dataclass

from verify.library import architectures
from verify.model.netlist import Gate, Netlist

SPEC = "{cout, sum} = a + b + cin"
#: the largest failing fraction a HARD fault may have
HARD = 2.0 ** -12


@dataclass
class Fault:
    kind: str
    where: str
    design: Netlist


def _replace(design: Netlist, old: Gate, new: list[Gate], tag: str) -> Netlist:
    gates = [g for g in design.gates if g is not old] + new
    return Netlist(f"{design.name}_{tag}", design.inputs, design.outputs, tuple(gates),
                   design.origin).validate()


def skip_missing_propagate(width: int, rng: random.Random, count: int) -> list[Fault]:
    d = architectures.generate("carry-skip", width, block=16)
    skips = [g for g in d.gates if g.op == "and" and (g.source or "").endswith(" skip")]
    out = []
    for g in rng.sample(skips, min(count, len(skips))):
        k = rng.randrange(1, len(g.inputs) - 1)  # an interior bit: not the lowest nor highest
        new = Gate("and", g.inputs[:k] + g.inputs[k + 1:], g.output, g.source)
        out.append(Fault("skip-missing-propagate", f"{g.output} without {g.inputs[k]}",
                         _replace(d, g, [new], f"skip_{g.output}_{k}")))
    return out


def lookahead_missing_propagate(width: int, rng: random.Random, count: int) -> list[Fault]:
    d = architectures.generate("carry-lookahead", width, block=4)
    # the AND terms of lookahead carries: group propagates (P_*) and generates (G_*), 3+ inputs
    terms = [g for g in d.gates if g.op == "and" and len(g.inputs) >= 3
             and (g.source or "").startswith("lookahead level")
             and sum(i.startswith("P_") for i in g.inputs) >= 2]
    out = []
    for g in rng.sample(terms, len(terms)):
        ps = [k for k, i in enumerate(g.inputs) if i.startswith("P_")]
        k = rng.choice(ps)
        new = Gate("and", g.inputs[:k] + g.inputs[k + 1:], g.output, g.source)
        out.append(Fault("lookahead-missing-propagate", f"{g.output} without {g.inputs[k]}",
                         _replace(d, g, [new], f"cla_{g.output}_{k}")))
        if len(out) >= count:
            break
    return out


def select_wrong_carry(width: int, rng: random.Random, count: int) -> list[Fault]:
    d = architectures.generate("carry-select", width, block=16)
    by_block: dict[str, list[Gate]] = {}
    for g in d.gates:
        if g.op == "mux" and (g.source or "").endswith("multiplexers"):
            by_block.setdefault(g.inputs[0], []).append(g)
    out = []
    for sel, muxes in by_block.items():
        lo = int(sel[1:])  # the block carry c<lo>
        for assume in (0, 1):
            wrong = f"c{lo}_if{assume}"  # the previous block's carry-out for carry-in 0 / 1
            if wrong not in d.driver:
                continue
            new = [Gate("mux", (wrong, *g.inputs[1:]), g.output, g.source) for g in muxes]
            gates = [g for g in d.gates if g not in muxes] + new
            bad = Netlist(f"{d.name}_sel_{lo}_{assume}", d.inputs, d.outputs, tuple(gates),
                          d.origin).validate()
            out.append(Fault("select-wrong-carry", f"block at bit {lo} selects on {wrong}", bad))
    rng.shuffle(out)
    return out[:count]


def field_match(width: int, rng: random.Random, count: int) -> list[Fault]:
    d = architectures.generate(rng.choice(["ripple", "kogge-stone", "brent-kung"]), width)
    out = []
    for _ in range(count):
        lo = rng.randrange(0, width - 12)
        k = rng.getrandbits(12)
        bit = rng.randrange(width)
        bpos = rng.randrange(width)
        target = d.driver[f"sum[{bit}]"]
        tag = f"fm{lo}_{k:x}_{bit}"
        lits = []
        extra = []
        for i in range(12):
            net = f"a[{lo + i}]"
            if k >> i & 1:
                lits.append(net)
            else:
                inv = f"{tag}_n{i}"
                extra.append(Gate("not", (net,), inv, "injected"))
                lits.append(inv)
        lits.append(f"b[{bpos}]")
        extra.append(Gate("and", tuple(lits), f"{tag}_hit", "injected"))
        inner = f"{tag}_orig"
        extra.append(Gate(target.op, target.inputs, inner, target.source))
        extra.append(Gate("xor", (inner, f"{tag}_hit"), target.output, "injected"))
        out.append(Fault("field-match", f"sum[{bit}] flips when a[{lo + 11}:{lo}] == {k:#x} and "
                         f"b[{bpos}] = 1", _replace(d, target, extra, tag)))
    return out


KINDS = {"skip-missing-propagate": skip_missing_propagate,
         "lookahead-missing-propagate": lookahead_missing_propagate,
         "select-wrong-carry": select_wrong_carry,
         "field-match": field_match}


def failing_fraction(design: Netlist, spec) -> float:
    """Exact fraction of inputs where some output differs from the spec (a BDD count)."""
    from dd import cudd

    bdd = cudd.BDD()
    order = []
    widths = {p.name: p.width for p in design.inputs}
    for i in range(max(widths.values())):
        for p in design.inputs:
            if i < p.width:
                order.append(p.bits[i])
    names = {b: f"x{k}" for k, b in enumerate(order)}
    bdd.declare(*names.values())

    def build(net: Netlist) -> dict:
        val = {"0": bdd.false, "1": bdd.true}
        val.update({b: bdd.var(names[b]) for b in net.input_bits})
        for g in net.ordered_gates:
            xs = [val[i] for i in g.inputs]
            val[g.output] = _bdd_op(bdd, g.op, xs)
        return val

    mine, ref_net = build(design), spec.reference()
    ref = build(ref_net)
    diff = bdd.false
    for b in design.output_bits:
        diff = diff | bdd.apply('xor', mine[b], ref[b])
    return bdd.count(diff, nvars=len(order)) / 2.0 ** len(order)


def _bdd_op(bdd, op: str, xs: list):
    # gate meanings: common practice (the truth tables in verify/model/ops.py say the same)
    if op in ("and", "nand"):
        r = bdd.true
        for x in xs:
            r = r & x
        return r if op == "and" else ~r
    if op in ("or", "nor"):
        r = bdd.false
        for x in xs:
            r = r | x
        return r if op == "or" else ~r
    if op in ("xor", "xnor"):
        r = bdd.false
        for x in xs:
            r = bdd.apply('xor', r, x)
        return r if op == "xor" else ~r
    if op == "not":
        return ~xs[0]
    if op == "buf":
        return xs[0]
    if op == "mux":
        return bdd.ite(xs[0], xs[2], xs[1])
    if op == "maj":
        a, b, c = xs
        return (a & b) | (a & c) | (b & c)
    if op == "const0":
        return bdd.false
    if op == "const1":
        return bdd.true
    raise ValueError(op)


def hard_faults(width: int = 64, seed: int = 1, per_kind: int = 6) -> list[tuple[Fault, float]]:
    """(fault, exact failing fraction) for faults whose fraction is in (0, 2^-12)."""
    from verify import spec as specmod

    rng = random.Random(seed)
    out = []
    for kind, make in KINDS.items():
        got = 0
        for f in make(width, rng, per_kind * 3):
            frac = failing_fraction(f.design, specmod.parse(SPEC, f.design))
            if 0 < frac < HARD:
                out.append((f, frac))
                got += 1
                if got >= per_kind:
                    break
    return out
