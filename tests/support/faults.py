"""Single-fault injection into generated adders, shared by the tests and benchmarks/.

``inject(design, kind, rng)`` makes one fault of a kind (wrong-input, wrong-op, inverted-input,
stuck-at-0, stuck-at-1, dropped-input) at a random gate and says which nets count as hitting it;
``inject_two`` makes two; ``find_failure`` finds a failing vector (every vector up to 17 input
bits, else 8,192 aimed and random ones).
"""

from __future__ import annotations

import random

from verify.model.netlist import Gate, Netlist
from verify.sim import Miter, pack, vector_of

ARCHS = ["ripple", "ripple-maj", "carry-lookahead", "carry-skip", "carry-select",
         "conditional-sum", "sklansky", "kogge-stone", "brent-kung", "han-carlson",
         "ladner-fischer"]
WIDTHS = [4, 8, 16, 32]
KINDS = ["wrong-input", "wrong-op", "inverted-input", "stuck-at-0", "stuck-at-1"]
SPEC = "{cout, sum} = a + b + cin"

_SWAP = {"and": ["or", "xor", "nand"], "or": ["and", "xor", "nor"], "xor": ["xnor", "or", "and"],
         "nand": ["and", "nor"], "nor": ["or", "nand"], "xnor": ["xor"], "not": ["buf"],
         "buf": ["not"], "mux": ["maj"], "maj": ["mux", "xor"]}


def inject(design: Netlist, kind: str, rng: random.Random) -> tuple[Netlist, set[str]] | None:
    """One fault of ``kind`` at a random gate: (faulty netlist, the nets that count as a hit)."""
    gates = list(design.ordered_gates)
    k = rng.randrange(len(gates))
    g = gates[k]
    if g.op in ("const0", "const1"):
        return None
    hit = {g.output}
    if kind == "wrong-input":
        earlier = list(design.input_bits) + [x.output for x in gates[:k]]
        pos = rng.randrange(len(g.inputs))
        choices = [n for n in earlier if n not in g.inputs]
        if not choices:
            return None
        ins = list(g.inputs)
        ins[pos] = rng.choice(choices)
        new = Gate(g.op, tuple(ins), g.output, g.source)
        extra = []
    elif kind == "wrong-op":
        ops = [o for o in _SWAP.get(g.op, []) if not (o in ("mux", "maj") and len(g.inputs) != 3)]
        if not ops:
            return None
        new = Gate(rng.choice(ops), g.inputs, g.output, g.source)
        extra = []
    elif kind == "inverted-input":
        pos = rng.randrange(len(g.inputs))
        inv = f"{g.inputs[pos]}_fault_inv".replace("[", "_").replace("]", "_")
        if inv in design.driver:
            return None
        ins = list(g.inputs)
        ins[pos] = inv
        new = Gate(g.op, tuple(ins), g.output, g.source)
        extra = [Gate("not", (g.inputs[pos],), inv, "injected inverter")]
        hit.add(inv)
    elif kind == "dropped-input":  # not one of the classes: a forgotten term
        if len(g.inputs) < 2 or g.op in ("mux", "maj"):
            return None
        pos = rng.randrange(len(g.inputs))
        ins = g.inputs[:pos] + g.inputs[pos + 1:]
        new = Gate(g.op if len(ins) > 1 else "buf", ins, g.output, g.source)
        extra = []
    else:
        new = Gate("const0" if kind == "stuck-at-0" else "const1", (), g.output, g.source)
        extra = []
    out = [new if x is g else x for x in design.gates] + extra
    return Netlist(design.name + "_faulty", design.inputs, design.outputs, tuple(out),
                   design.origin).validate(), hit


def inject_two(design: Netlist, rng: random.Random) -> tuple[Netlist, set[str]] | None:
    """Two faults of the issue's classes at two gates ("double"; a hit is either gate)."""
    first = inject(design, rng.choice(KINDS), rng)
    if first is None:
        return None
    second = inject(first[0], rng.choice(KINDS), rng)
    if second is None or second[1] & first[1]:
        return None
    return second[0], first[1] | second[1]


def find_failure(faulty: Netlist, spec, rng: random.Random) -> dict | None:
    """A failing vector: every vector for up to 17 input bits, else 8192 random + propagate runs."""
    miter = Miter(faulty, spec.reference())
    bits = faulty.input_width
    if bits <= 17:
        total = 1 << bits
        words = []
        for i in range(bits):  # bit t of word i is bit i of the vector index t
            step = 2 << i
            block = ((1 << (1 << i)) - 1) << (1 << i)
            words.append(block * (((1 << total) - 1) // ((1 << step) - 1)))
        diff = miter.run(words, (1 << total) - 1)
        if not diff:
            return None
        # spread the choice: take a random failing vector, not always the smallest
        ones = [t for t in range(total) if diff >> t & 1]
        j = rng.choice(ones)
        return vector_of(faulty, words, j)
    from verify.diagnosis.suspects import make_vectors
    from verify.diagnosis.reference import detect
    vecs = make_vectors(faulty, [], detect(faulty, spec), 8192, rng.randrange(1 << 30))
    diff = miter.run(pack(faulty, vecs), (1 << len(vecs)) - 1)
    if not diff:
        return None  # unchanged or too rare to matter here; the benchmark keeps found ones only
    ones = [t for t in range(len(vecs)) if diff >> t & 1]
    return vecs[rng.choice(ones)]
