"""Whether path conditions can hold together, decided exactly in two-valued logic.

Used to see that an if/else-if chain or a case statement covers every value its conditions can
take (then a missing else or default is never reached and implies no latch). Only small cones
are decided; anything larger is "unknown", which keeps the latch refusal.
"""

from __future__ import annotations

from verify.model.netlist import CONST0, CONST1

MAX_CASE_LEAVES = 16
MAX_CASE_GATES = 4000

_EVAL = {
    "not": lambda i, m: ~i[0], "buf": lambda i, m: i[0],
    "and": lambda i, m: _fold(i, lambda a, b: a & b, m),
    "or": lambda i, m: _fold(i, lambda a, b: a | b, 0),
    "xor": lambda i, m: _fold(i, lambda a, b: a ^ b, 0),
    "nand": lambda i, m: ~_fold(i, lambda a, b: a & b, m),
    "nor": lambda i, m: ~_fold(i, lambda a, b: a | b, 0),
    "xnor": lambda i, m: ~_fold(i, lambda a, b: a ^ b, 0),
    "mux": lambda i, m: (i[0] & i[2]) | (~i[0] & i[1]),
    "maj": lambda i, m: (i[0] & i[1]) | (i[0] & i[2]) | (i[1] & i[2]),
    "const0": lambda i, m: 0, "const1": lambda i, m: m,
}


def impossible(b, literals: list[str]) -> bool:
    """True when the nets in ``literals`` can never all be 1 together, in two-valued logic.

    Decided exactly by evaluating their fan-in over every assignment of its leaves (nets
    no gate drives so far: inputs, placeholders), only when there are at most
    ``MAX_CASE_LEAVES`` leaves and ``MAX_CASE_GATES`` gates; otherwise False (unknown).
    """
    if any(x == CONST0 for x in literals):
        return True
    lits = [x for x in dict.fromkeys(literals) if x != CONST1]
    if not lits:
        return False
    ops = b._ops
    tainted = getattr(b, "tainted", ())  # nets that may carry x: leaves, never evaluated
    order: list = []
    leaves: dict[str, int] = {}
    done: set[str] = set()
    stack = [(x, False) for x in lits]
    while stack:
        net, expanded = stack.pop()
        if expanded:
            order.append(ops[net])
            continue
        if net in done or net in (CONST0, CONST1):
            continue
        done.add(net)
        g = ops.get(net)
        if g is None or net in tainted:
            leaves[net] = len(leaves)
            if len(leaves) > MAX_CASE_LEAVES:
                return False
            continue
        if len(done) > MAX_CASE_GATES:
            return False
        stack.append((net, True))
        stack.extend((i, False) for i in g.inputs if i not in done)
    n = len(leaves)
    size = 1 << n
    mask = (1 << size) - 1
    val = {CONST0: 0, CONST1: mask}
    for net, k in leaves.items():
        block = 1 << k
        pat = ((1 << block) - 1) << block  # ones where bit k of the assignment index is 1
        width = block * 2
        while width < size:
            pat |= pat << width
            width *= 2
        val[net] = pat & mask
    for g in order:
        ins = [val[i] for i in g.inputs]
        v = _EVAL.get(g.op)
        if v is None:
            return False  # an op this check does not know: no claim
        val[g.output] = v(ins, mask) & mask
    acc = mask
    for x in lits:
        acc &= val[x]
    return acc == 0



def _fold(values, fn, start):
    acc = start
    for v in values:
        acc = fn(acc, v)
    return acc
