"""Candidate changes at one gate: the single edits that give a net the value it needs.

``local_changes`` lists them most plausible first (another op, an inverted input, one more input,
an input from another net - nets most like the gate's own inputs first - then a constant input
or a description of a stuck net). Each carries the replacement gate, so a complete engine can
check the changed design (``verify.diagnosis.repair``). ``G`` is the index view of a netlist
built by ``verify.diagnosis.suspects``.
"""

from __future__ import annotations

from verify.diagnosis.repair import Change
from verify.model.netlist import Gate
from verify.model.ops import OPS


def _eval(op: str, xs, M: int) -> int:
    return OPS[op].evaluate(xs, M)


_SAME_ARITY = {1: ("buf", "not"), 2: ("and", "or", "xor", "nand", "nor", "xnor"),
               3: ("and", "or", "xor", "nand", "nor", "xnor", "mux", "maj")}


def local_change(G, base: list[int], k: int, required: int, care: int, M: int,
                  search: bool = True) -> tuple[str, str, int | None] | None:
    """The most plausible single change at the gate driving net k (text, kind, word), or None;
    ``local_changes`` lists them all."""
    found = local_changes(G, base, k, required, care, M, search, limit=1)
    return (found[0].text, found[0].kind, found[0].word) if found else None


def local_changes(G, base: list[int], k: int, required: int, care: int, M: int,
                   search: bool = True, limit: int = 6) -> list[Change]:
    """Changes at the gate driving net k that make it carry ``required`` on ``care``, most
    plausible first: another op, an inverted input, one more input, an input from another net
    (another bit's net, a wrong index), then a constant source or a description of a stuck net.

    ``search=False`` skips the tests that try every other net (the costly ones). Each change
    carries the replacement gate, so a complete engine can check the changed design."""
    gpos = k - G.first_gate
    g = G.gates[gpos]
    ins = G.gate_ins[gpos]
    want = required & care
    out: list[Change] = []

    def gives(word: int) -> bool:
        return (word & care) == want

    consts: list[Change] = []  # changes that leave the net constant: they disable the gate

    def add(change: Change) -> bool:
        if change.word in (0, M) and not g.op.startswith("const"):
            if len(consts) < limit:
                consts.append(change)
            return False
        out.append(change)
        return len(out) >= limit

    if base[k] & care in (0, care) and g.op in ("const0", "const1"):
        add(Change(f"it is tied to {0 if g.op == 'const0' else 1}: its value never changes",
                   "const"))
        return out
    stuck = (Change(f"it is stuck at {1 if base[k] else 0} over every vector", "stuck")
             if base[k] in (0, M) and not gives(base[k]) else None)
    if not ins:
        return [stuck] if stuck else []
    xs = [base[i] for i in ins]
    arity = len(xs) if len(xs) <= 3 else 2
    for op in _SAME_ARITY[arity]:
        if op != g.op and not (op in ("mux", "maj") and len(xs) != 3) and OPS[op].arity_ok(len(xs)):
            w = _eval(op, xs, M)
            if gives(w) and add(Change(f"its op should be {op}, not {g.op}", "op", Gate(op, g.inputs, g.output, g.source),
                                       word=w)):
                return out
    for pos in range(len(xs)):
        trial = list(xs)
        trial[pos] ^= M
        w = _eval(g.op, trial, M)
        if gives(w):
            inv = f"{g.output}__inverted_input_{pos + 1}"
            new_ins = tuple(inv if n == pos else x for n, x in enumerate(g.inputs))
            if add(Change(f"input {pos + 1} ({g.inputs[pos]}) should be inverted", "invert",
                          Gate(g.op, new_ins, g.output, g.source),
                          extra=(Gate("not", (g.inputs[pos],), inv, g.source),), word=w)):
                return out
    if not search:
        return (out + consts + ([stuck] if stuck else []))[:max(limit, 1)]
    downstream = {G.first_gate + gp for gp in G.cone(k)} | {k}
    ops = (g.op,) if g.op in ("and", "or", "xor", "nand", "nor", "xnor") else (
        ("and", "or", "xor") if g.op == "buf" else ())
    like = _Likeness(G, ins)
    fits: list[tuple[tuple, Change]] = []
    for op in ops:  # a forgotten input: one more net into the gate
        for other in range(2, len(G.nets)):
            if other in downstream or other in ins:
                continue
            w = _eval(op, [*xs, base[other]], M)
            if gives(w):
                what = (f"this {g.op} gate is missing an input: {G.nets[other]}" if op == g.op
                        else f"this buf should be an {op} with {G.nets[other]} as a second input")
                fits.append(((0, like.distance(other, ins)), Change(
                    what, "missing", Gate(op, (*g.inputs, G.nets[other]), g.output, g.source),
                    word=w)))
    for pos in range(len(xs)):
        trial = list(xs)
        for other in range(len(G.nets)):  # not from its own fan-out: that would be a loop
            if other == ins[pos] or other in downstream:
                continue
            trial[pos] = base[other]
            w = _eval(g.op, trial, M)
            if gives(w):
                new_ins = tuple(G.nets[other] if n == pos else x for n, x in enumerate(g.inputs))
                ch = Change(f"input {pos + 1} should come from {G.nets[other]}, not "
                            f"{G.nets[ins[pos]]}", "source" if other >= 2 else "source-const",
                            Gate(g.op, new_ins, g.output, g.source), word=w)
                if other < 2:  # a constant input disables the gate: the least likely repair
                    consts.append(ch)
                else:
                    fits.append(((0, like.distance(other, [ins[pos]])), ch))
    # nets most like the gate's own inputs first (another bit of the same kind of signal: the
    # forgotten propagate bit, the neighbouring index), in the order they were found otherwise
    fits.sort(key=lambda f: f[0])
    for _, ch in fits:
        if add(ch):
            return out
    out.extend(consts)
    if stuck:
        out.append(stuck)
    return out[:max(limit, 1)]


class _Likeness:
    """How much a net looks like a gate's inputs: the same op driving it, inputs from the same
    ports (by structure, not by name), then the distance in bit position."""

    def __init__(self, G, ins: list[int]):
        self.G = G

    def shape(self, k: int) -> tuple:
        G = self.G
        if k < G.first_gate:
            return ("input", G.nets[k].split("[")[0])
        g = G.gates[k - G.first_gate]
        return (g.op, len(g.inputs), tuple(sorted({self._port(G.index[i]) for i in g.inputs})))

    def _port(self, k: int) -> str:
        G = self.G
        return G.nets[k].split("[")[0] if 2 <= k < G.first_gate else "net"

    def distance(self, other: int, ins) -> tuple:
        mine = self.shape(other)
        same = sum(self.shape(i) == mine for i in ins)
        return (-same, other)
